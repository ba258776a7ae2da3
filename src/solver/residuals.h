// Residuals of the steady-state equations for a given set of flows and heads:
//   continuity at supplied junction n:  sum(Q into n) - sum(Q out of n) - demand_n   [m^3/s]
//   energy on active link k:            h_k(Q_k) - (H_from - H_to)                    [m]
// The solver judges convergence on these, and the final result is checked with them again,
// computed straight from the reported flows and heads.
#pragma once

#include <cstddef>
#include <vector>

#include "gradeline/network.h"
#include "hydraulics/link_law.h"
#include "model/topology.h"

namespace gradeline {

struct ResidualNorms {
  double max_continuity_m3s = 0.0;
  std::size_t worst_node = 0;
  double max_energy_m = 0.0;
  std::size_t worst_link = 0;
  double energy_sum_squares = 0.0;
  bool finite = true;
};

// `headloss` holds h_k(Q_k) for every active link. Per-element residuals are written to
// node_residual and link_residual when they are not null.
ResidualNorms compute_residuals(const Topology& topology, const std::vector<double>& flow_m3s,
                                const std::vector<double>& headloss_m,
                                const std::vector<double>& head_m,
                                const std::vector<double>& demand_m3s,
                                const std::vector<char>& supplied,
                                const std::vector<char>& active,
                                std::vector<double>* node_residual,
                                std::vector<double>* link_residual);

}  // namespace gradeline
