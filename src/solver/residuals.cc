#include "solver/residuals.h"

#include <cmath>

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
