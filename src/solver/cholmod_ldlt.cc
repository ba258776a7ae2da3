#include "solver/cholmod_ldlt.h"

#include <Eigen/CholmodSupport>
#include <algorithm>
#include <vector>

#include "solver/subtree_split.h"

namespace gradeline {
namespace {

// Eigen's CHOLMOD wrapper, with one more way to factorise: shared by subtrees (its factor
// and workspace are the wrapper's own, reached as a derived class may).
class SharedCholmod : public Eigen::CholmodDecomposition<SymmetricMatrix, Eigen::Upper> {
 public:
  cholmod_factor* factor() const { return m_cholmodFactor; }

  // After a factorisation whose pattern is complete: rows [0, prefix_end) on this thread's
  // workspace, the other subtrees on `second`'s, side by side; then the rows above both.
  bool factorize_shared(const SymmetricMatrix& matrix, const SubtreeSplit& split,
                        cholmod_common* second) {
    cholmod_sparse a = Eigen::viewAsCholmod(matrix.selfadjointView<Eigen::Upper>());
    cholmod_factor* f = m_cholmodFactor;
    // What cholmod_rowfac does itself before a whole refactorisation: every column back to
    // its diagonal entry alone.
    f->minor = f->n;
    int* column_count = static_cast<int*>(f->nz);
    for (std::size_t k = 0; k < f->n; ++k) column_count[k] = 1;
    int ok_prefix = 1, ok_second = 1;
#pragma omp parallel sections num_threads(2)
    {
#pragma omp section
      ok_prefix = cholmod_rowfac(&a, nullptr, m_shiftOffset, 0,
                                 static_cast<std::size_t>(split.prefix_end), f, &cholmod());
#pragma omp section
      for (const SubtreeSplit::Run& run : split.second) {
        if (!cholmod_rowfac(&a, nullptr, m_shiftOffset, static_cast<std::size_t>(run.first),
                            static_cast<std::size_t>(run.second), f, second)) {
          ok_second = 0;
          break;
        }
      }
    }
    bool ok = ok_prefix && ok_second;
    for (const SubtreeSplit::Run& run : split.top) {
      if (!ok) break;
      ok = cholmod_rowfac(&a, nullptr, m_shiftOffset, static_cast<std::size_t>(run.first),
                          static_cast<std::size_t>(run.second), f, &cholmod());
    }
    // A zero pivot (or any failure) is found again by one serial factorisation, which reports
    // it as CHOLMOD does. (A core that meets one records it in the factor's `minor`, which the
    // other core reads as it goes: that core's rows are then wrong, and redone here.)
    if (!ok || f->minor != f->n) {
      factorize(matrix);
      return info() == Eigen::Success;
    }
    m_info = Eigen::Success;
    m_factorizationIsOk = true;
    return true;
  }
};

// The solves L D L^T x = b with a simplicial LDL^T factor in CHOLMOD's layout (column j: D(j,j)
// first, then L(i,j) for its rows i > j), shared between two cores by `split` (`in_top` marks
// the top's rows). Forward, L D y = b column by column: a core's column j updates only the
// rows of j's ancestors, in its own share or in the top; its updates of top rows are summed
// in `acc` (one array per core, zero outside the solve) and applied after both, then the top's
// columns follow. Backward, L^T x = y from the last row down: the top first, then both shares
// side by side, each reading only its own rows and the top's. The result does not depend on
// how the cores' work interleaves.
void solve_shared(const cholmod_factor& f, const SubtreeSplit& split,
                  const std::vector<char>& in_top, std::vector<double> (&acc)[2], double* x) {
  const int* lp = static_cast<const int*>(f.p);
  const int* li = static_cast<const int*>(f.i);
  const int* lnz = static_cast<const int*>(f.nz);
  const double* lx = static_cast<const double*>(f.x);
  auto forward = [&](int j, double* top_sums) {
    const int begin = lp[j], end = begin + lnz[j];
    const double y = x[j];
    x[j] = y / lx[begin];
    for (int p = begin + 1; p < end; ++p) {
      const int i = li[p];
      if (top_sums != nullptr && in_top[i]) {
        top_sums[i] += lx[p] * y;
      } else {
        x[i] -= lx[p] * y;
      }
    }
  };
  auto backward = [&](int j) {
    const int begin = lp[j], end = begin + lnz[j];
    double y = x[j];
    for (int p = begin + 1; p < end; ++p) y -= lx[p] * x[li[p]];
    x[j] = y;
  };
#pragma omp parallel sections num_threads(2)
  {
#pragma omp section
    for (int j = 0; j < split.prefix_end; ++j) forward(j, acc[0].data());
#pragma omp section
    for (const SubtreeSplit::Run& run : split.second) {
      for (int j = run.first; j < run.second; ++j) forward(j, acc[1].data());
    }
  }
  for (const SubtreeSplit::Run& run : split.top) {
    for (int i = run.first; i < run.second; ++i) {
      x[i] -= acc[0][i] + acc[1][i];
      acc[0][i] = acc[1][i] = 0.0;
    }
  }
  for (const SubtreeSplit::Run& run : split.top) {
    for (int j = run.first; j < run.second; ++j) forward(j, nullptr);
  }
  for (auto run = split.top.rbegin(); run != split.top.rend(); ++run) {
    for (int j = run->second - 1; j >= run->first; --j) backward(j);
  }
#pragma omp parallel sections num_threads(2)
  {
#pragma omp section
    for (int j = split.prefix_end - 1; j >= 0; --j) backward(j);
#pragma omp section
    for (auto run = split.second.rbegin(); run != split.second.rend(); ++run) {
      for (int j = run->second - 1; j >= run->first; --j) backward(j);
    }
  }
}

}  // namespace

struct CholmodNaturalLdlt::Impl {
  SharedCholmod solver;
  cholmod_common second;  // the workspace of the second core
  SubtreeSplit split;
  std::vector<char> in_top;    // per row: in split.top
  std::vector<double> acc[2];  // per core: its sums into the top's rows in a solve
  bool planned = false;        // split is planned (after the first successful factorisation)
  double flops_per_entry = 0.0;

  explicit Impl(double supernodal_flops_per_entry) {
    cholmod_start(&second);
    solver.setMode(Eigen::CholmodAuto);
    for (cholmod_common* c : {&solver.cholmod(), &second}) {
      c->nmethods = 1;  // the matrix is already in pivot order: no ordering, no postorder
      c->method[0].ordering = CHOLMOD_NATURAL;
      c->postorder = 0;
      c->supernodal_switch = supernodal_flops_per_entry;
      c->print = 0;  // failures are returned, not printed (only main prints)
    }
  }
  ~Impl() { cholmod_finish(&second); }

  // The split of a simplicial factor with every column complete: the parent of column j in
  // the elimination tree is the row of its first entry below the diagonal (as cholmod_rowfac
  // itself finds it). A row's cost grows with the length of the columns it updates: about
  // the square of its own column's count, plus a little per row.
  void plan() {
    const cholmod_factor* factor = solver.factor();
    split = SubtreeSplit{};
    planned = factor->minor == factor->n;  // after a failure, plan at the next success
    if (!planned) return;
    const int n = static_cast<int>(factor->n);
    const int* lp = static_cast<const int*>(factor->p);
    const int* li = static_cast<const int*>(factor->i);
    const int* count = static_cast<const int*>(factor->nz);
    std::vector<int> parent(static_cast<std::size_t>(n));
    std::vector<double> work(static_cast<std::size_t>(n));
    double total = 0.0;
    for (int j = 0; j < n; ++j) {
      parent[j] = count[j] > 1 ? li[lp[j] + 1] : -1;
      work[j] = 2.0 + static_cast<double>(count[j]) * count[j];
      total += work[j];
    }
    if (n >= kSplitFromUnknowns && total >= kSplitFromWork) split = split_subtrees(parent, work);
    if (split.prefix_end == 0) return;
    in_top.assign(parent.size(), 0);
    for (const SubtreeSplit::Run& run : split.top) {
      std::fill(in_top.begin() + run.first, in_top.begin() + run.second, 1);
    }
    for (std::vector<double>& a : acc) a.assign(parent.size(), 0.0);
  }
};

CholmodNaturalLdlt::CholmodNaturalLdlt(double supernodal_flops_per_entry)
    : impl_(std::make_unique<Impl>(supernodal_flops_per_entry)) {}

CholmodNaturalLdlt::~CholmodNaturalLdlt() = default;

bool CholmodNaturalLdlt::analyze(const SymmetricMatrix& pattern) {
  Impl& m = *impl_;
  m.split = SubtreeSplit{};
  m.planned = false;
  m.solver.analyzePattern(pattern);
  if (m.solver.info() != Eigen::Success || m.solver.factor() == nullptr) return false;
  const cholmod_common& c = m.solver.cholmod();
  m.flops_per_entry = c.lnz > 0 ? c.fl / c.lnz : 0.0;
  return true;
}

bool CholmodNaturalLdlt::factorize(const SymmetricMatrix& matrix) {
  Impl& m = *impl_;
  const cholmod_factor* f = m.solver.factor();
  if (f == nullptr) return false;
  // The first factorisation allocates the factor's numeric part (exactly sized) serially; its
  // pattern then gives the elimination tree, from which the split is planned.
  if (f->xtype != CHOLMOD_PATTERN && !f->is_super) {
    if (!m.planned) m.plan();
    if (m.split.prefix_end > 0) return m.solver.factorize_shared(matrix, m.split, &m.second);
  }
  m.solver.factorize(matrix);
  return m.solver.info() == Eigen::Success;
}

bool CholmodNaturalLdlt::solve(const Eigen::VectorXd& rhs, Eigen::VectorXd* x) {
  Impl& m = *impl_;
  const cholmod_factor* f = m.solver.factor();
  if (m.split.prefix_end > 0 && f != nullptr && !f->is_super && !f->is_ll &&
      f->xtype == CHOLMOD_REAL && f->minor == f->n && m.solver.info() == Eigen::Success &&
      static_cast<std::size_t>(rhs.size()) == f->n) {
    *x = rhs;
    solve_shared(*f, m.split, m.in_top, m.acc, x->data());
    return true;
  }
  return solve_with_cholmod(rhs, x);
}

bool CholmodNaturalLdlt::solve_with_cholmod(const Eigen::VectorXd& rhs, Eigen::VectorXd* x) {
  *x = impl_->solver.solve(rhs);
  return impl_->solver.info() == Eigen::Success;
}

const char* CholmodNaturalLdlt::backend() const {
  const cholmod_factor* f = impl_->solver.factor();
  if (f == nullptr) return "cholmod-auto";
  return f->is_super ? "cholmod-supernodal" : "cholmod-simplicial-ldlt";
}

double CholmodNaturalLdlt::flops_per_entry() const { return impl_->flops_per_entry; }

bool CholmodNaturalLdlt::shared() const { return impl_->split.prefix_end > 0; }

}  // namespace gradeline
