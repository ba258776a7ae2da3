#include "solver/residuals.h"

#include <cmath>

#include "model/parallel.h"

namespace gradeline {

ResidualNorms compute_residuals(const Topology& t, const std::vector<double>& flow,
                                const std::vector<double>& headloss,
                                const std::vector<double>& head,
                                const std::vector<double>& demand,
                                const std::vector<char>& supplied,
                                const std::vector<char>& active,
                                std::vector<double>* node_residual,
                                std::vector<double>* link_residual) {
  ResidualNorms r;
  std::vector<double> local;
  std::vector<double>& balance = node_residual ? *node_residual : local;
  // Continuity and energy are each one pass over the links, sharing nothing they write: on
  // large networks one core each, every sum still formed in link order, as in the single
  // pass below.
  bool continuity_finite = true, energy_finite = true;
  auto continuity = [&] {
    balance.assign(t.fixed_head.size(), 0.0);
    for (std::size_t k = 0; k < t.from.size(); ++k) {
      balance[t.from[k]] -= flow[k];
      balance[t.to[k]] += flow[k];
    }
    for (std::size_t n = 0; n < t.fixed_head.size(); ++n) {
      if (t.fixed_head[n] || !supplied[n]) {
        balance[n] = 0.0;
        continue;
      }
      balance[n] -= demand[n];
      if (!std::isfinite(balance[n])) continuity_finite = false;
      if (std::abs(balance[n]) > r.max_continuity_m3s) {
        r.max_continuity_m3s = std::abs(balance[n]);
        r.worst_node = n;
      }
    }
  };
  auto energy = [&] {
    if (link_residual) link_residual->assign(t.from.size(), 0.0);
    for (std::size_t k = 0; k < t.from.size(); ++k) {
      if (!active[k]) continue;
      const double e = headloss[k] - (head[t.from[k]] - head[t.to[k]]);
      if (link_residual) (*link_residual)[k] = e;
      if (!std::isfinite(e)) energy_finite = false;
      r.energy_sum_squares += e * e;
      if (std::abs(e) > r.max_energy_m) {
        r.max_energy_m = std::abs(e);
        r.worst_link = k;
      }
    }
  };
  if (static_cast<std::ptrdiff_t>(t.from.size()) >= kParallelElements) {
#pragma omp parallel sections num_threads(2)
    {
#pragma omp section
      continuity();
#pragma omp section
      energy();
    }
    r.finite = continuity_finite && energy_finite;
    return r;
  }
  // Small networks (a sizing run solves them by the hundred thousand): both in one pass.
  balance.assign(t.fixed_head.size(), 0.0);
  if (link_residual) link_residual->assign(t.from.size(), 0.0);
  for (std::size_t k = 0; k < t.from.size(); ++k) {
    const std::uint32_t from = t.from[k], to = t.to[k];
    balance[from] -= flow[k];
    balance[to] += flow[k];
    if (!active[k]) continue;
    const double e = headloss[k] - (head[from] - head[to]);
    if (link_residual) (*link_residual)[k] = e;
    if (!std::isfinite(e)) r.finite = false;
    r.energy_sum_squares += e * e;
    if (std::abs(e) > r.max_energy_m) {
      r.max_energy_m = std::abs(e);
      r.worst_link = k;
    }
  }
  for (std::size_t n = 0; n < t.fixed_head.size(); ++n) {
    if (t.fixed_head[n] || !supplied[n]) {
      balance[n] = 0.0;
      continue;
    }
    balance[n] -= demand[n];
    if (!std::isfinite(balance[n])) r.finite = false;
    if (std::abs(balance[n]) > r.max_continuity_m3s) {
      r.max_continuity_m3s = std::abs(balance[n]);
      r.worst_node = n;
    }
  }
  return r;
}

}  // namespace gradeline
