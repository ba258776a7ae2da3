// CHOLMOD's factorisation of a matrix already numbered in a fill-reducing order (natural
// ordering), through Eigen's CholmodSupport, with one addition: a simplicial LDL^T
// refactorisation is shared between two cores by subtrees of the elimination tree
// (src/solver/subtree_split.h). Each core calls CHOLMOD's own up-looking kernel,
// cholmod_rowfac, on its rows of the wrapper's factor, with a workspace of its own; then one
// core factorises the few rows above both. Every row is computed by the same arithmetic, in
// the same order, as in one serial cholmod_factorize, so the factor is the same to the bit.
//
// The first factorisation after an analysis (whose pattern gives the elimination tree),
// supernodal factors (dense matrices, through the BLAS) and small matrices (kSplitFromUnknowns,
// kSplitFromWork) go through the wrapper's factorize as before. A factorisation that meets a
// zero pivot is redone serially, so that a failure is reported as CHOLMOD reports it.
//
// The triangular solves of a shared factor are shared the same way (solve_shared in the .cc):
// the updates of the top's rows are summed per core, so the solution differs from CHOLMOD's
// serial solve by round-off (measured: 1e-13 of the largest unknown at most).
#pragma once

#include <memory>

#include "solver/sparse_cholesky.h"

namespace gradeline {

// A simplicial refactorisation is shared between two cores from this many unknowns and this
// much estimated work (the sum over the rows of 2 + the square of the row's column count in
// L): the core of the 10^5-pipe "distribution" benchmark has 24,527 unknowns and about 280,000
// units, and its serial factorisation takes about 0.7 ms. Below, waking the second core costs
// more than it saves, and on this virtual machine it now and then takes milliseconds: on a
// 484-unknown grid (60 microseconds serially) a shared factorisation took 1 ms, and on the
// 4,900-unknown grid one solve in six took 8 ms instead of 0.8. Networks this large also share
// their per-link work, which keeps the second core awake.
inline constexpr int kSplitFromUnknowns = 20000;
inline constexpr double kSplitFromWork = 50000.0;

// Supernodal when CHOLMOD's analysis finds at least `supernodal_flops_per_entry` flops per
// nonzero of L, else simplicial LDL^T.
class CholmodNaturalLdlt final : public SparseCholesky {
 public:
  explicit CholmodNaturalLdlt(double supernodal_flops_per_entry);
  ~CholmodNaturalLdlt() override;
  CholmodNaturalLdlt(const CholmodNaturalLdlt&) = delete;
  CholmodNaturalLdlt& operator=(const CholmodNaturalLdlt&) = delete;

  bool analyze(const SymmetricMatrix& pattern) override;
  bool factorize(const SymmetricMatrix& matrix) override;
  bool solve(const Eigen::VectorXd& rhs, Eigen::VectorXd* x) override;
  const char* backend() const override;
  double flops_per_entry() const override;
  // Whether refactorisations (and their solves) are now shared between two cores: planned at
  // the second factorisation after an analysis, from the first one's pattern.
  bool shared() const;
  // The solve through CHOLMOD's own triangular solves, never shared (for checks).
  bool solve_with_cholmod(const Eigen::VectorXd& rhs, Eigen::VectorXd* x);

 private:
  struct Impl;
  std::unique_ptr<Impl> impl_;
};

}  // namespace gradeline
