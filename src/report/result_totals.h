// Totals drawn from a solve result, shared by the text and JSON reports.
#pragma once

#include <cstddef>
#include <vector>

#include "gradeline/network.h"
#include "gradeline/solve_summary.h"

namespace gradeline {

struct SourceFlow {
  std::size_t node = 0;
  double inflow_m3s = 0.0;  // into the network; negative when the source is being filled
};

struct ResultTotals {
  double demand_m3s = 0.0;             // of supplied junctions
  double undelivered_demand_m3s = 0.0; // of unsupplied junctions
  std::vector<SourceFlow> sources;
};

inline ResultTotals result_totals(const Network& net, const SolveResult& r) {
  ResultTotals t;
  std::vector<double> inflow(net.nodes.size(), 0.0);
  for (std::size_t k = 0; k < net.pipes.size(); ++k) {
    inflow[net.pipes[k].from] += r.links[k].flow_m3s;
    inflow[net.pipes[k].to] -= r.links[k].flow_m3s;
  }
  for (std::size_t n = 0; n < net.nodes.size(); ++n) {
    if (net.nodes[n].is_fixed_head()) {
      t.sources.push_back({n, inflow[n]});
    } else if (r.nodes[n].supplied) {
      t.demand_m3s += r.nodes[n].demand_m3s;
    } else {
      t.undelivered_demand_m3s += r.nodes[n].demand_m3s;
    }
  }
  return t;
}

}  // namespace gradeline
