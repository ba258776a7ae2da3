// Sparse Cholesky factorisation of the symmetric positive definite global-gradient matrix.
// The interface hides the backend; the symbolic analysis (fill-reducing ordering and the
// pattern of the factor) is done once by analyze(), and every Newton iteration calls only the
// numeric factorize() and solve() on a matrix with the same pattern.
#pragma once

#include <Eigen/Sparse>
#include <memory>
#include <string>
#include <vector>

namespace gradeline {

// Only the upper triangle (column-compressed, row <= column) is stored and read. CHOLMOD then
// factorises a matrix already in pivot order (natural ordering) without any transpose.
using SymmetricMatrix = Eigen::SparseMatrix<double, Eigen::ColMajor, int>;

class SparseCholesky {
 public:
  virtual ~SparseCholesky() = default;
  virtual bool analyze(const SymmetricMatrix& pattern) = 0;
  virtual bool factorize(const SymmetricMatrix& matrix) = 0;
  virtual bool solve(const Eigen::VectorXd& rhs, Eigen::VectorXd* x) = 0;
  virtual const char* backend() const = 0;
  // After analyze(): the factorisation's flops per nonzero of L (CHOLMOD's measure of how
  // "dense" the factor is: about 3 on tree-like networks, over 100 on large grids); 0 if the
  // backend does not say.
  virtual double flops_per_entry() const { return 0.0; }
};

enum class CholeskyBackend {
  kCholmodSimplicial,  // CHOLMOD LDL^T (SuiteSparse)
  kCholmodAuto,        // CHOLMOD, supernodal when the analysis finds at least
                       // kSupernodalFlopsPerEntry flops per nonzero of L, else simplicial LDL^T;
                       // with the natural ordering, large simplicial refactorisations and their
                       // solves shared between two cores (src/solver/cholmod_ldlt.h)
  kCholmodAutoOneCore, // the same through CHOLMOD's own calls only, on one core (the floor's
                       // reference, tools/floor.cc)
  kEigenSimplicial,    // Eigen's own LDL^T with AMD ordering, for cross-checks
};

// Supernodal (dense blocks through the BLAS) pays only on factors this dense. Measured on the
// benchmark grids (docs/performance.md): at 115 flops per entry (a 10^5-pipe grid) simplicial
// LDL^T factorised 1.3x faster than supernodal even with OpenBLAS; at 371 (10^6 pipes)
// supernodal was 3.1x faster with OpenBLAS and no slower with the reference BLAS. Tree-like
// networks sit near 3.
inline constexpr double kSupernodalFlopsPerEntry = 200.0;

// Which ordering the backend applies in analyze(): AMD (Amestoy, Davis & Duff 1996), or none
// for a matrix whose unknowns are already numbered in a fill-reducing order.
enum class Ordering { kAmd, kNatural };

std::unique_ptr<SparseCholesky> make_sparse_cholesky(
    CholeskyBackend backend = CholeskyBackend::kCholmodAuto, Ordering ordering = Ordering::kAmd);

}  // namespace gradeline
