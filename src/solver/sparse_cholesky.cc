#include "solver/sparse_cholesky.h"

#include <Eigen/CholmodSupport>
#include <Eigen/SparseCholesky>
#include <string_view>
#include <type_traits>

#include "solver/cholmod_ldlt.h"

namespace gradeline {
namespace {

// One backend over any Eigen sparse Cholesky class with analyzePattern/factorize/solve.
template <typename Solver>
class EigenBackedCholesky final : public SparseCholesky {
  static constexpr bool kIsCholmod = !std::is_same_v<
      Solver, Eigen::SimplicialLDLT<SymmetricMatrix, Eigen::Upper, Eigen::NaturalOrdering<int>>> &&
      !std::is_same_v<Solver, Eigen::SimplicialLDLT<SymmetricMatrix, Eigen::Upper, Eigen::AMDOrdering<int>>>;

 public:
  explicit EigenBackedCholesky(const char* name) : name_(name) {}
  Solver& solver() { return solver_; }
  bool analyze(const SymmetricMatrix& pattern) override {
    solver_.analyzePattern(pattern);
    return solver_.info() == Eigen::Success;
  }
  bool factorize(const SymmetricMatrix& matrix) override {
    solver_.factorize(matrix);
    return solver_.info() == Eigen::Success;
  }
  bool solve(const Eigen::VectorXd& rhs, Eigen::VectorXd* x) override {
    *x = solver_.solve(rhs);
    return solver_.info() == Eigen::Success;
  }
  const char* backend() const override {
    if (std::string_view(name_) != "cholmod-auto" || flops_per_entry() == 0.0) return name_;
    return flops_per_entry() >= kSupernodalFlopsPerEntry ? "cholmod-supernodal"
                                                         : "cholmod-simplicial-ldlt";
  }
  double flops_per_entry() const override {
    if constexpr (kIsCholmod) {
      auto& c = const_cast<Solver&>(solver_).cholmod();
      return c.lnz > 0 ? c.fl / c.lnz : 0.0;
    } else {
      return 0.0;
    }
  }

 private:
  Solver solver_;
  const char* name_;
};

// One ordering only: AMD analyses fastest on network matrices, and CHOLMOD's default of trying
// several orderings costs more than it saves here. A matrix already in pivot order is taken as
// it is (no postorder either, which would renumber it again).
void set_ordering(cholmod_common& c, Ordering ordering) {
  c.nmethods = 1;
  c.method[0].ordering = ordering == Ordering::kNatural ? CHOLMOD_NATURAL : CHOLMOD_AMD;
  c.postorder = ordering == Ordering::kNatural ? 0 : 1;
}

}  // namespace

std::unique_ptr<SparseCholesky> make_sparse_cholesky(CholeskyBackend backend, Ordering ordering) {
  switch (backend) {
    case CholeskyBackend::kEigenSimplicial:
      if (ordering == Ordering::kNatural) {
        return std::make_unique<EigenBackedCholesky<
            Eigen::SimplicialLDLT<SymmetricMatrix, Eigen::Upper, Eigen::NaturalOrdering<int>>>>(
            "eigen-simplicial-ldlt");
      }
      return std::make_unique<EigenBackedCholesky<
          Eigen::SimplicialLDLT<SymmetricMatrix, Eigen::Upper, Eigen::AMDOrdering<int>>>>(
          "eigen-simplicial-ldlt");
    case CholeskyBackend::kCholmodAuto:
      // A matrix already in pivot order: refactorisations shared between two cores by subtrees
      // (src/solver/cholmod_ldlt.h).
      if (ordering == Ordering::kNatural) {
        return std::make_unique<CholmodNaturalLdlt>(kSupernodalFlopsPerEntry);
      }
      [[fallthrough]];
    case CholeskyBackend::kCholmodAutoOneCore: {
      // Supernodal or simplicial as CHOLMOD's analysis decides, by the flops per nonzero of L.
      auto b = std::make_unique<EigenBackedCholesky<Eigen::CholmodDecomposition<SymmetricMatrix, Eigen::Upper>>>(
          "cholmod-auto");
      b->solver().setMode(Eigen::CholmodAuto);
      b->solver().cholmod().supernodal_switch = kSupernodalFlopsPerEntry;
      set_ordering(b->solver().cholmod(), ordering);
      return b;
    }
    case CholeskyBackend::kCholmodSimplicial:
      break;
  }
  auto b = std::make_unique<EigenBackedCholesky<Eigen::CholmodSimplicialLDLT<SymmetricMatrix, Eigen::Upper>>>(
      "cholmod-simplicial-ldlt");
  set_ordering(b->solver().cholmod(), ordering);
  return b;
}

}  // namespace gradeline
