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
};

enum class CholeskyBackend {
  kCholmodSimplicial,  // CHOLMOD LDL^T (SuiteSparse)
  kCholmodAuto,        // CHOLMOD, supernodal or simplicial as its analysis decides
  kEigenSimplicial,    // Eigen's own LDL^T with AMD ordering, for cross-checks
};

// Which ordering the backend applies in analyze(): AMD (Amestoy, Davis & Duff 1996), or none
// for a matrix whose unknowns are already numbered in a fill-reducing order.
enum class Ordering { kAmd, kNatural };

std::unique_ptr<SparseCholesky> make_sparse_cholesky(
    CholeskyBackend backend = CholeskyBackend::kCholmodSimplicial, Ordering ordering = Ordering::kAmd);

}  // namespace gradeline
