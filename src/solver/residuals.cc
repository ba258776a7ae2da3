#include "solver/residuals.h"

#include <cmath>

namespace gradeline {

ResidualNorms compute_residuals(const Network& net, const std::vector<double>& flow,
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
  balance.assign(net.nodes.size(), 0.0);
  if (link_residual) link_residual->assign(net.pipes.size(), 0.0);
  for (std::size_t k = 0; k < net.pipes.size(); ++k) {
    const Pipe& p = net.pipes[k];
    balance[p.from] -= flow[k];
    balance[p.to] += flow[k];
    if (!active[k]) continue;
    const double e = headloss[k] - (head[p.from] - head[p.to]);
    if (link_residual) (*link_residual)[k] = e;
    if (!std::isfinite(e)) r.finite = false;
    r.energy_sum_squares += e * e;
    if (std::abs(e) > r.max_energy_m) {
      r.max_energy_m = std::abs(e);
      r.worst_link = k;
    }
  }
  for (std::size_t n = 0; n < net.nodes.size(); ++n) {
    if (net.nodes[n].is_fixed_head() || !supplied[n]) {
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
