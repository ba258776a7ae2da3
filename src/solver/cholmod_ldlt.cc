#include "solver/cholmod_ldlt.h"

#include <cholmod.h>

#include <vector>

#include "solver/subtree_split.h"

namespace gradeline {

struct CholmodNaturalLdlt::Impl {
  cholmod_common common[2];  // one workspace per core
  cholmod_factor* factor = nullptr;
  cholmod_dense* x = nullptr;  // the solve's result and workspaces, kept from solve to solve
  cholmod_dense* y = nullptr;
  cholmod_dense* e = nullptr;
  SubtreeSplit split;
  bool planned = false;  // split is planned (after the first successful factorisation)
  double flops_per_entry = 0.0;

  explicit Impl(double supernodal_flops_per_entry) {
    for (cholmod_common& c : common) {
      cholmod_start(&c);
      c.nmethods = 1;  // the matrix is already in pivot order: no ordering, no postorder
      c.method[0].ordering = CHOLMOD_NATURAL;
      c.postorder = 0;
      c.supernodal = CHOLMOD_AUTO;
      c.supernodal_switch = supernodal_flops_per_entry;
      c.final_asis = 1;  // leave the factor as the factorisation makes it
      c.print = 0;       // failures are returned, not printed (only main prints)
    }
  }
  ~Impl() {
    cholmod_free_dense(&x, &common[0]);
    cholmod_free_dense(&y, &common[0]);
    cholmod_free_dense(&e, &common[0]);
    cholmod_free_factor(&factor, &common[0]);
    for (cholmod_common& c : common) cholmod_finish(&c);
  }

  // A view of the upper triangle (no copy).
  static cholmod_sparse view(const SymmetricMatrix& m) {
    cholmod_sparse a{};
    a.nrow = static_cast<std::size_t>(m.rows());
    a.ncol = static_cast<std::size_t>(m.cols());
    a.nzmax = static_cast<std::size_t>(m.nonZeros());
    a.p = const_cast<int*>(m.outerIndexPtr());
    a.i = const_cast<int*>(m.innerIndexPtr());
    a.nz = const_cast<int*>(m.innerNonZeroPtr());
    a.x = const_cast<double*>(m.valuePtr());
    a.stype = 1;
    a.itype = CHOLMOD_INT;
    a.xtype = CHOLMOD_REAL;
    a.dtype = CHOLMOD_DOUBLE;
    a.sorted = 1;
    a.packed = m.isCompressed() ? 1 : 0;
    return a;
  }

  // The split of a simplicial factor with every column complete: the parent of column j in
  // the elimination tree is the row of its first entry below the diagonal (as cholmod_rowfac
  // itself finds it). A row's cost grows with the length of the columns it updates: about
  // the square of its own column's count, plus a little per row.
  void plan() {
    planned = true;
    split = SubtreeSplit{};
    const int n = static_cast<int>(factor->n);
    if (factor->minor != factor->n) {  // after a failure, plan at the next success
      planned = false;
      return;
    }
    const int* lp = static_cast<const int*>(factor->p);
    const int* li = static_cast<const int*>(factor->i);
    const int* count = static_cast<const int*>(factor->nz);
    std::vector<int> parent(static_cast<std::size_t>(n));
    std::vector<double> work(static_cast<std::size_t>(n));
    for (int j = 0; j < n; ++j) {
      parent[j] = count[j] > 1 ? li[lp[j] + 1] : -1;
      work[j] = 2.0 + static_cast<double>(count[j]) * count[j];
    }
    double total = 0.0;
    for (double w : work) total += w;
    if (n >= kSplitFromUnknowns && total >= kSplitFromWork) split = split_subtrees(parent, work);
  }

  bool factorize_serial(cholmod_sparse* a) {
    cholmod_factorize(a, factor, &common[0]);
    return factor->minor == factor->n;
  }

  // Rows [0, prefix_end) on one core and the other subtrees on the other, then the path above.
  bool factorize_shared(cholmod_sparse* a) {
    const int n = static_cast<int>(factor->n);
    // What cholmod_rowfac does itself before a whole refactorisation: every column back to
    // its diagonal entry alone.
    factor->minor = factor->n;
    int* column_count = static_cast<int*>(factor->nz);
    for (int k = 0; k < n; ++k) column_count[k] = 1;
    double beta[2] = {0.0, 0.0};
    int ok_prefix = 1, ok_second = 1;
#pragma omp parallel sections num_threads(2)
    {
#pragma omp section
      ok_prefix = cholmod_rowfac(a, nullptr, beta, 0, static_cast<std::size_t>(split.prefix_end),
                                 factor, &common[0]);
#pragma omp section
      for (const SubtreeSplit::Run& run : split.second) {
        if (!cholmod_rowfac(a, nullptr, beta, static_cast<std::size_t>(run.first),
                            static_cast<std::size_t>(run.second), factor, &common[1])) {
          ok_second = 0;
          break;
        }
      }
    }
    bool ok = ok_prefix && ok_second;
    for (const SubtreeSplit::Run& run : split.top) {
      if (!ok) break;
      ok = cholmod_rowfac(a, nullptr, beta, static_cast<std::size_t>(run.first),
                          static_cast<std::size_t>(run.second), factor, &common[0]);
    }
    // A zero pivot (or any failure) is found again by one serial factorisation, which reports
    // it as CHOLMOD does. (A core that meets one records it in the factor's `minor`, which the
    // other core reads as it goes: that core's rows are then wrong, and redone here.)
    if (!ok || factor->minor != factor->n) return factorize_serial(a);
    return true;
  }
};

CholmodNaturalLdlt::CholmodNaturalLdlt(double supernodal_flops_per_entry)
    : impl_(std::make_unique<Impl>(supernodal_flops_per_entry)) {}

CholmodNaturalLdlt::~CholmodNaturalLdlt() = default;

bool CholmodNaturalLdlt::analyze(const SymmetricMatrix& pattern) {
  Impl& m = *impl_;
  cholmod_free_factor(&m.factor, &m.common[0]);
  m.split = SubtreeSplit{};
  cholmod_sparse a = Impl::view(pattern);
  m.factor = cholmod_analyze(&a, &m.common[0]);
  if (m.factor == nullptr || m.common[0].status != CHOLMOD_OK) return false;
  m.flops_per_entry = m.common[0].lnz > 0 ? m.common[0].fl / m.common[0].lnz : 0.0;
  m.planned = false;
  return true;
}

bool CholmodNaturalLdlt::factorize(const SymmetricMatrix& matrix) {
  Impl& m = *impl_;
  if (m.factor == nullptr) return false;
  cholmod_sparse a = Impl::view(matrix);
  // The first factorisation allocates the factor's numeric part (exactly sized): serially.
  // Its pattern then gives the elimination tree, from which the split is planned.
  if (m.factor->xtype == CHOLMOD_PATTERN || m.factor->is_super) return m.factorize_serial(&a);
  if (!m.planned) m.plan();
  if (m.split.prefix_end == 0) return m.factorize_serial(&a);
  return m.factorize_shared(&a);
}

bool CholmodNaturalLdlt::solve(const Eigen::VectorXd& rhs, Eigen::VectorXd* x) {
  Impl& m = *impl_;
  if (m.factor == nullptr || m.factor->minor != m.factor->n ||
      static_cast<std::size_t>(rhs.size()) != m.factor->n) {
    return false;
  }
  cholmod_dense b{};
  b.nrow = m.factor->n;
  b.ncol = 1;
  b.nzmax = b.nrow;
  b.d = b.nrow;
  b.x = const_cast<double*>(rhs.data());
  b.xtype = CHOLMOD_REAL;
  b.dtype = CHOLMOD_DOUBLE;
  if (!cholmod_solve2(CHOLMOD_A, m.factor, &b, nullptr, &m.x, nullptr, &m.y, &m.e, &m.common[0])) {
    return false;
  }
  *x = Eigen::Map<const Eigen::VectorXd>(static_cast<const double*>(m.x->x), rhs.size());
  return true;
}

const char* CholmodNaturalLdlt::backend() const {
  if (impl_->factor == nullptr) return "cholmod-auto";
  return impl_->factor->is_super ? "cholmod-supernodal" : "cholmod-simplicial-ldlt";
}

double CholmodNaturalLdlt::flops_per_entry() const { return impl_->flops_per_entry; }

bool CholmodNaturalLdlt::shared() const { return impl_->split.prefix_end > 0; }

}  // namespace gradeline
