#include "solver/sparse_cholesky.h"

#include <Eigen/CholmodSupport>
#include <Eigen/SparseCholesky>

namespace gradeline {
namespace {

// One backend over any Eigen sparse Cholesky class with analyzePattern/factorize/solve.
template <typename Solver>
class EigenBackedCholesky final : public SparseCholesky {
 public:
  explicit EigenBackedCholesky(const char* name) : name_(name) {}
  Solver& solver() { return solver_; }
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
  const char* backend() const override { return name_; }

 private:
  Solver solver_;
  const char* name_;
};

// One ordering only: AMD analyses fastest on network matrices, and CHOLMOD's default of trying
// several orderings costs more than it saves here.
void use_amd(cholmod_common& c) {
  c.nmethods = 1;
  c.method[0].ordering = CHOLMOD_AMD;
  c.postorder = 1;
}

}  // namespace

std::unique_ptr<SparseCholesky> make_sparse_cholesky(CholeskyBackend backend) {
  switch (backend) {
    case CholeskyBackend::kEigenSimplicial:
      return std::make_unique<EigenBackedCholesky<
          Eigen::SimplicialLDLT<LowerMatrix, Eigen::Lower, Eigen::AMDOrdering<int>>>>(
          "eigen-simplicial-ldlt");
    case CholeskyBackend::kCholmodAuto: {
      // Supernodal or simplicial as CHOLMOD's analysis decides (supernodal when the flops per
      // nonzero of L reach its supernodal_switch, 40 by default).
      auto b = std::make_unique<EigenBackedCholesky<Eigen::CholmodDecomposition<LowerMatrix, Eigen::Lower>>>(
          "cholmod-auto");
      b->solver().setMode(Eigen::CholmodAuto);
      use_amd(b->solver().cholmod());
      return b;
    }
    case CholeskyBackend::kCholmodSimplicial:
      break;
  }
  auto b = std::make_unique<EigenBackedCholesky<Eigen::CholmodSimplicialLDLT<LowerMatrix, Eigen::Lower>>>(
      "cholmod-simplicial-ldlt");
  use_amd(b->solver().cholmod());
  return b;
}

}  // namespace gradeline
