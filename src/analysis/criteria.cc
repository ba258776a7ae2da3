#include "analysis/criteria.h"

#include <algorithm>
#include <cmath>
#include <limits>

namespace gradeline {

bool has_criteria(const Criteria& c) {
  return c.min_pressure_m || c.max_pressure_m || c.max_velocity_ms;
}

namespace {

void node_violations(std::size_t n, const std::string& case_name,
                     const SolveResult& r, const Criteria& c, std::vector<Violation>* out) {
  const NodeState& ns = r.nodes[n];
  Violation v;
  v.case_name = case_name;
  v.element = n;
  v.quantity = LimitQuantity::kPressure;
  if (!ns.supplied) {
    if (c.min_pressure_m && ns.demand_m3s > 0.0) {
      v.kind = LimitKind::kMin;
      v.value = std::numeric_limits<double>::quiet_NaN();
      v.limit = *c.min_pressure_m;
      v.margin = -std::numeric_limits<double>::infinity();
      v.unsupplied = true;
      out->push_back(v);
    }
    return;
  }
  v.value = ns.pressure_m;
  if (c.min_pressure_m && ns.pressure_m < *c.min_pressure_m) {
    v.kind = LimitKind::kMin;
    v.limit = *c.min_pressure_m;
    v.margin = ns.pressure_m - *c.min_pressure_m;
    out->push_back(v);
  }
  if (c.max_pressure_m && ns.pressure_m > *c.max_pressure_m) {
    v.kind = LimitKind::kMax;
    v.limit = *c.max_pressure_m;
    v.margin = *c.max_pressure_m - ns.pressure_m;
    out->push_back(v);
  }
}

}  // namespace

std::vector<Violation> find_violations(const Network& net, const std::string& case_name,
                                       const SolveResult& r, const Criteria& c) {
  std::vector<Violation> nodes, pipes;
  for (std::size_t n = 0; n < net.nodes.size(); ++n) {
    if (!net.nodes[n].is_fixed_head()) node_violations(n, case_name, r, c, &nodes);
  }
  if (c.max_velocity_ms) {
    for (std::size_t k = 0; k < net.pipes.size(); ++k) {
      const double speed = std::abs(r.links[k].velocity_ms);
      if (!r.links[k].open || speed <= *c.max_velocity_ms) continue;
      Violation v;
      v.case_name = case_name;
      v.element = k;
      v.quantity = LimitQuantity::kVelocity;
      v.kind = LimitKind::kMax;
      v.value = speed;
      v.limit = *c.max_velocity_ms;
      v.margin = *c.max_velocity_ms - speed;
      pipes.push_back(v);
    }
  }
  auto worst_first = [](const Violation& a, const Violation& b) {
    if (a.margin != b.margin) return a.margin < b.margin;
    return a.element < b.element;
  };
  std::stable_sort(nodes.begin(), nodes.end(), worst_first);
  std::stable_sort(pipes.begin(), pipes.end(), worst_first);
  nodes.insert(nodes.end(), pipes.begin(), pipes.end());
  return nodes;
}

bool node_fails(const Network& net, std::size_t n, const SolveResult& r, const Criteria& c) {
  if (net.nodes[n].is_fixed_head()) return false;
  std::vector<Violation> v;
  node_violations(n, "", r, c, &v);
  return !v.empty();
}

}  // namespace gradeline
