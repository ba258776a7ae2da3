#include "solver/residuals.h"

#include <cmath>

#include "model/parallel.h"

namespace gradeline {
namespace {

struct ResidualInputs {
  const Topology& t;
  const std::vector<double>& flow;
  const std::vector<double>& headloss;
  const std::vector<double>& head;
  const std::vector<double>& demand;
  const std::vector<char>& supplied;
  const std::vector<char>& active;
};

// One pass over the links forming the continuity residuals (kContinuity), the energy residuals
// (kEnergy) or both, then one over the nodes for continuity. Each writes only its own fields
// of *r and its own output vector, so the two kinds may run on two cores at once; either way
// every sum is formed in link order.
template <bool kContinuity, bool kEnergy>
void residual_pass(const ResidualInputs& in, std::vector<double>* balance,
                   std::vector<double>* link_residual, ResidualNorms* r, bool* finite) {
  const Topology& t = in.t;
  if (kContinuity) balance->assign(t.fixed_head.size(), 0.0);
  if (kEnergy && link_residual) link_residual->assign(t.from.size(), 0.0);
  for (std::size_t k = 0; k < t.from.size(); ++k) {
    const std::uint32_t from = t.from[k], to = t.to[k];
    if (kContinuity) {
      (*balance)[from] -= in.flow[k];
      (*balance)[to] += in.flow[k];
    }
    if (!kEnergy || !in.active[k]) continue;
    const double e = in.headloss[k] - (in.head[from] - in.head[to]);
    if (link_residual) (*link_residual)[k] = e;
    if (!std::isfinite(e)) *finite = false;
    r->energy_sum_squares += e * e;
    if (std::abs(e) > r->max_energy_m) {
      r->max_energy_m = std::abs(e);
      r->worst_link = k;
    }
  }
  if (!kContinuity) return;
  for (std::size_t n = 0; n < t.fixed_head.size(); ++n) {
    double& b = (*balance)[n];
    if (t.fixed_head[n] || !in.supplied[n]) {
      b = 0.0;
      continue;
    }
    b -= in.demand[n];
    if (!std::isfinite(b)) *finite = false;
    if (std::abs(b) > r->max_continuity_m3s) {
      r->max_continuity_m3s = std::abs(b);
      r->worst_node = n;
    }
  }
}

}  // namespace

ResidualNorms compute_residuals(const Topology& t, const std::vector<double>& flow,
                                const std::vector<double>& headloss,
                                const std::vector<double>& head,
                                const std::vector<double>& demand,
                                const std::vector<char>& supplied,
                                const std::vector<char>& active,
                                std::vector<double>* node_residual,
                                std::vector<double>* link_residual) {
  const ResidualInputs in{t, flow, headloss, head, demand, supplied, active};
  ResidualNorms r;
  std::vector<double> local;
  std::vector<double>* balance = node_residual ? node_residual : &local;
  if (static_cast<std::ptrdiff_t>(t.from.size()) < kParallelElements) {
    // Small networks (a sizing run solves them by the hundred thousand): one pass.
    residual_pass<true, true>(in, balance, link_residual, &r, &r.finite);
    return r;
  }
  bool continuity_finite = true, energy_finite = true;
#pragma omp parallel sections num_threads(2)
  {
#pragma omp section
    residual_pass<true, false>(in, balance, nullptr, &r, &continuity_finite);
#pragma omp section
    residual_pass<false, true>(in, nullptr, link_residual, &r, &energy_finite);
  }
  r.finite = continuity_finite && energy_finite;
  return r;
}

}  // namespace gradeline
