// Totals drawn from a solve result, shared by the text and JSON reports.
#pragma once

#include <cstddef>
#include <cstdint>
#include <vector>

#include "gradeline/network.h"
#include "gradeline/solve_summary.h"
#include "model/parallel.h"

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

// The sources are found, and the links at them, on every core; the flows are then summed in
// link order for each source, as a single pass over every link would.
inline ResultTotals result_totals(const Network& net, const SolveResult& r) {
  ResultTotals t;
  const std::ptrdiff_t nodes = static_cast<std::ptrdiff_t>(net.nodes.size());
  const std::ptrdiff_t links = static_cast<std::ptrdiff_t>(net.pipes.size());
  const std::vector<std::size_t> fixed =
      indices_where(nodes, [&](std::ptrdiff_t n) { return net.nodes[n].is_fixed_head(); });
  std::vector<std::uint32_t> source_of(net.nodes.size(), 0);  // 1 + position in t.sources
  for (std::size_t n : fixed) {
    t.sources.push_back({n, 0.0});
    source_of[n] = static_cast<std::uint32_t>(t.sources.size());
  }
  const std::vector<std::size_t> at_sources = indices_where(links, [&](std::ptrdiff_t k) {
    return source_of[net.pipes[k].from] != 0 || source_of[net.pipes[k].to] != 0;
  });
  for (std::size_t k : at_sources) {
    if (const std::uint32_t s = source_of[net.pipes[k].from]) t.sources[s - 1].inflow_m3s += r.links[k].flow_m3s;
    if (const std::uint32_t s = source_of[net.pipes[k].to]) t.sources[s - 1].inflow_m3s -= r.links[k].flow_m3s;
  }
  for (std::size_t n = 0; n < net.nodes.size(); ++n) {
    if (source_of[n] != 0) continue;
    if (r.nodes[n].supplied) {
      t.demand_m3s += r.nodes[n].demand_m3s;
    } else {
      t.undelivered_demand_m3s += r.nodes[n].demand_m3s;
    }
  }
  return t;
}

}  // namespace gradeline
