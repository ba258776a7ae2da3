#include "solver/sparse_cholesky.h"

#include <Eigen/CholmodSupport>
#include <Eigen/SparseCholesky>

namespace gradeline {
namespace {

class CholmodCholesky final : public SparseCholesky {
 public:
  CholmodCholesky() {
    cholmod_common& c = solver_.cholmod();
    c.nmethods = 1;  // do not try several orderings: AMD analyses fastest on network matrices
    c.method[0].ordering = CHOLMOD_AMD;
    c.postorder = 1;
  }
  bool analyze(const LowerMatrix& pattern) override {
    solver_.analyzePattern(pattern);
    return solver_.info() == Eigen::Success;
  }
  bool factorize(const LowerMatrix& matrix) override {
    solver_.factorize(matrix);
    return solver_.info() == Eigen::Success;
  }
  bool solve(const Eigen::VectorXd& rhs, Eigen::VectorXd* x) override {
    *x = solver_.solve(rhs);
    return solver_.info() == Eigen::Success;
  }
  const char* backend() const override { return "cholmod-simplicial-ldlt"; }

 private:
  Eigen::CholmodSimplicialLDLT<LowerMatrix, Eigen::Lower> solver_;
};

// CHOLMOD choosing supernodal or simplicial from its analysis (supernodal when the flop count
// per nonzero of L reaches CHOLMOD's supernodal_switch, 40 by default): grids go supernodal,
// tree-like networks stay simplicial.
class CholmodAutoCholesky final : public SparseCholesky {
 public:
  CholmodAutoCholesky() {
    solver_.setMode(Eigen::CholmodAuto);
    cholmod_common& c = solver_.cholmod();
    c.nmethods = 1;
    c.method[0].ordering = CHOLMOD_AMD;
    c.postorder = 1;
  }
  bool analyze(const LowerMatrix& pattern) override {
    solver_.analyzePattern(pattern);
    return solver_.info() == Eigen::Success;
  }
  bool factorize(const LowerMatrix& matrix) override {
    solver_.factorize(matrix);
    return solver_.info() == Eigen::Success;
  }
  bool solve(const Eigen::VectorXd& rhs, Eigen::VectorXd* x) override {
    *x = solver_.solve(rhs);
    return solver_.info() == Eigen::Success;
  }
  const char* backend() const override { return "cholmod-auto"; }

 private:
  Eigen::CholmodDecomposition<LowerMatrix, Eigen::Lower> solver_;
};

class EigenCholesky final : public SparseCholesky {
 public:
  bool analyze(const LowerMatrix& pattern) override {
    solver_.analyzePattern(pattern);
    return solver_.info() == Eigen::Success;
  }
  bool factorize(const LowerMatrix& matrix) override {
    solver_.factorize(matrix);
    return solver_.info() == Eigen::Success;
  }
  bool solve(const Eigen::VectorXd& rhs, Eigen::VectorXd* x) override {
    *x = solver_.solve(rhs);
    return solver_.info() == Eigen::Success;
  }
  const char* backend() const override { return "eigen-simplicial-ldlt"; }

 private:
  Eigen::SimplicialLDLT<LowerMatrix, Eigen::Lower, Eigen::AMDOrdering<int>> solver_;
};

}  // namespace

std::unique_ptr<SparseCholesky> make_sparse_cholesky(CholeskyBackend backend) {
  if (backend == CholeskyBackend::kEigenSimplicial) return std::make_unique<EigenCholesky>();
  if (backend == CholeskyBackend::kCholmodAuto) return std::make_unique<CholmodAutoCholesky>();
  return std::make_unique<CholmodCholesky>();
}

}  // namespace gradeline
