// Sparse Cholesky factorisation of the symmetric positive definite global-gradient matrix.
// The interface hides the backend; the symbolic analysis (fill-reducing ordering and the
// pattern of the factor) is done once by analyze(), and every Newton iteration calls only the
// numeric factorize() and solve() on a matrix with the same pattern.
#pragma once

#include <Eigen/Sparse>
#include <memory>
#include <string>

namespace gradeline {

// Only the lower triangle (column-compressed) is read.
using LowerMatrix = Eigen::SparseMatrix<double, Eigen::ColMajor, int>;

class SparseCholesky {
 public:
  virtual ~SparseCholesky() = default;
  virtual bool analyze(const LowerMatrix& pattern) = 0;
  virtual bool factorize(const LowerMatrix& matrix) = 0;
  virtual bool solve(const Eigen::VectorXd& rhs, Eigen::VectorXd* x) = 0;
  virtual const char* backend() const = 0;
};

enum class CholeskyBackend {
  kCholmodSimplicial,  // CHOLMOD LDL^T with AMD ordering (SuiteSparse)
  kCholmodAuto,        // CHOLMOD, supernodal or simplicial as its analysis decides
  kEigenSimplicial,    // Eigen's own LDL^T with AMD ordering, for cross-checks
};

std::unique_ptr<SparseCholesky> make_sparse_cholesky(
    CholeskyBackend backend = CholeskyBackend::kCholmodSimplicial);

}  // namespace gradeline
