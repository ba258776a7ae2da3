#include "model/demand_cases.h"

#include "model/parallel.h"

namespace gradeline {

std::vector<DemandCase> cases_of(const Network& net) {
  if (!net.cases.empty()) return net.cases;
  DemandCase base;
  base.name = kBaseCaseName;
  return {base};
}

std::vector<double> case_demands(const Network& net, const DemandCase& c) {
  std::vector<double> q(net.nodes.size(), 0.0);
  for_each_index(static_cast<std::ptrdiff_t>(net.nodes.size()), [&](std::ptrdiff_t n) {
    const Node& node = net.nodes[n];
    if (node.is_fixed_head()) return;
    double factor = c.factor;
    for (const auto& [category, f] : c.category_factors) {
      if (category == node.demand_category) factor = f;
    }
    q[n] = factor * node.demand_m3s;
  });
  for (const auto& [node, flow] : c.draws_m3s) q[node] += flow;
  return q;
}

Criteria criteria_for(const Network& net, const std::string& case_name) {
  Criteria out = net.limits;
  for (const CaseCriteria& c : net.case_limits) {
    if (c.case_name != case_name) continue;
    if (c.criteria.min_pressure_m) out.min_pressure_m = c.criteria.min_pressure_m;
    if (c.criteria.max_pressure_m) out.max_pressure_m = c.criteria.max_pressure_m;
    if (c.criteria.max_velocity_ms) out.max_velocity_ms = c.criteria.max_velocity_ms;
  }
  return out;
}

}  // namespace gradeline
