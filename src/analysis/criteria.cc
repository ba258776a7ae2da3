#include "analysis/criteria.h"

#include <algorithm>
#include <cmath>
#include <limits>

#include "model/parallel.h"

namespace gradeline {

bool has_criteria(const Criteria& c) {
  return c.min_pressure_m || c.max_pressure_m || c.max_velocity_ms;
}

namespace {

// Whether node n fails; each failure is recorded in `out` when it is not null. A record is made
// only for a failure (a run over every node of a large network, or over every trial design of
// a sizing search, mostly meets nodes that pass).
bool node_violations(std::size_t n, const std::string& case_name, const SolveResult& r,
                     const Criteria& c, std::vector<Violation>* out) {
  const NodeState& ns = r.nodes[n];
  bool failed = false;
  auto add = [&](LimitKind kind, double value, double limit, double margin, bool unsupplied) {
    failed = true;
    if (out == nullptr) return;
    Violation v;
    v.case_name = case_name;
    v.element = n;
    v.quantity = LimitQuantity::kPressure;
    v.kind = kind;
    v.value = value;
    v.limit = limit;
    v.margin = margin;
    v.unsupplied = unsupplied;
    out->push_back(std::move(v));
  };
  if (!ns.supplied) {
    if (c.min_pressure_m && ns.demand_m3s > 0.0) {
      add(LimitKind::kMin, std::numeric_limits<double>::quiet_NaN(), *c.min_pressure_m,
          -std::numeric_limits<double>::infinity(), true);
    }
    return failed;
  }
  if (c.min_pressure_m && ns.pressure_m < *c.min_pressure_m) {
    add(LimitKind::kMin, ns.pressure_m, *c.min_pressure_m, ns.pressure_m - *c.min_pressure_m,
        false);
  }
  if (c.max_pressure_m && ns.pressure_m > *c.max_pressure_m) {
    add(LimitKind::kMax, ns.pressure_m, *c.max_pressure_m, *c.max_pressure_m - ns.pressure_m,
        false);
  }
  return failed;
}

}  // namespace

std::vector<Violation> find_violations(const Network& net, const std::string& case_name,
                                       const SolveResult& r, const Criteria& c) {
  std::vector<Violation> nodes, pipes;
  if (!has_criteria(c)) return nodes;
  // The failing elements are found on every core, then recorded in order.
  const std::vector<std::size_t> failing =
      indices_where(static_cast<std::ptrdiff_t>(net.nodes.size()), [&](std::ptrdiff_t n) {
        return node_fails(net, static_cast<std::size_t>(n), r, c);
      });
  for (std::size_t n : failing) node_violations(n, case_name, r, c, &nodes);
  if (c.max_velocity_ms) {
    const std::vector<std::size_t> fast =
        indices_where(static_cast<std::ptrdiff_t>(net.pipes.size()), [&](std::ptrdiff_t k) {
          return r.links[k].open && std::abs(r.links[k].velocity_ms) > *c.max_velocity_ms;
        });
    for (std::size_t k : fast) {
      const double speed = std::abs(r.links[k].velocity_ms);
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
  static const std::string kNoCase;
  return !net.nodes[n].is_fixed_head() && node_violations(n, kNoCase, r, c, nullptr);
}

bool any_violation(const Network& net, const SolveResult& r, const Criteria& c) {
  for (std::size_t n = 0; n < net.nodes.size(); ++n) {
    if (node_fails(net, n, r, c)) return true;
  }
  if (!c.max_velocity_ms) return false;
  for (const LinkState& l : r.links) {
    if (l.open && std::abs(l.velocity_ms) > *c.max_velocity_ms) return true;
  }
  return false;
}

}  // namespace gradeline
