#include "analysis/self_check.h"

#include <cmath>
#include <sstream>

#include "hydraulics/link_law.h"
#include "model/parallel.h"

namespace gradeline {

namespace {

constexpr std::ptrdiff_t kParallelLinks = kParallelElements;

// Why link k fails the check, or "" when it passes.
std::string link_failure(const Network& net, const SolveResult& r, const SolveOptions& options,
                         std::size_t k) {
  const LinkState& l = r.links[k];
  const Pipe& p = net.pipes[k];
  if (!std::isfinite(l.flow_m3s) || !std::isfinite(l.headloss_m) || !std::isfinite(l.velocity_ms)) {
    return "pipe '" + p.id + "' has a non-finite flow or head loss";
  }
  if (!l.open && l.flow_m3s != 0.0) return "closed pipe '" + p.id + "' carries flow";
  PipeLaw law = make_pipe_law(p, net.headloss, net.fluid, options.hw_regularisation_flow_m3s);
  if (!l.open) {
    const NodeState &a = r.nodes[p.from], &b = r.nodes[p.to];
    const bool at_empty_tank = net.nodes[p.from].receives_only() || net.nodes[p.to].receives_only();
    if (l.closed_by_check_valve && p.check_valve && !at_empty_tank && a.supplied && b.supplied &&
        a.head_m - b.head_m - law.zero_flow_headloss_m() > kSelfCheckSlack * options.energy_tolerance_m) {
      return std::string(p.is_pump() ? "pump '" : "check valve '") + p.id +
             "' is closed with a head favouring forward flow";
    }
    return "";
  }
  if (l.valve_mode == ValveMode::kActive) {
    // An active control valve holds its setting instead of obeying a loss law.
    const double tol_h = kSelfCheckSlack * 1e-6;
    const double held = p.kind == LinkKind::kPrv ? r.nodes[p.to].head_m - p.control().valve_head_m
                        : p.kind == LinkKind::kPsv ? r.nodes[p.from].head_m - p.control().valve_head_m
                                                   : 0.0;
    if (!(std::abs(held) <= tol_h) ||
        (p.kind == LinkKind::kFcv && std::abs(l.flow_m3s - p.control().valve_flow_m3s) >
                                         kSelfCheckSlack * options.continuity_tolerance_m3s)) {
      return std::string(link_kind_name(p.kind)) + " '" + p.id + "' does not hold its setting";
    }
    return "";
  }
  // The reported friction factor only starts the Colebrook iteration (Newton converges to the
  // one root from any start, F being increasing and concave), so the loss is still recomputed
  // from the flow alone, in fewer steps.
  double x = l.regime == FlowRegime::kTurbulent && l.friction_factor > 0.0
                 ? 1.0 / std::sqrt(l.friction_factor)
                 : 0.0;
  const double h = evaluate_pipe(law, l.flow_m3s, &x).headloss_m;
  const double e = h - (r.nodes[p.from].head_m - r.nodes[p.to].head_m);
  const double tolerance = kSelfCheckSlack * options.energy_tolerance_m;
  if (!(std::abs(e) <= tolerance)) {
    std::ostringstream m;
    m << "pipe '" << p.id << "' energy residual " << e << " m exceeds " << tolerance << " m";
    return m.str();
  }
  return "";
}

}  // namespace

SelfCheck check_result(const Network& net, const std::vector<double>& demand,
                       const SolveResult& r, const SolveOptions& options) {
  SelfCheck out;
  auto fail = [&](const std::string& what) {
    out.ok = false;
    out.failure = what;
    return out;
  };
  if (r.nodes.size() != net.nodes.size() || r.links.size() != net.pipes.size()) {
    return fail("the result does not cover the network");
  }
  // Every link is checked on its own, so large networks share them among the cores; the first
  // failing link in file order is the one reported, however they were shared.
  const std::ptrdiff_t links = static_cast<std::ptrdiff_t>(net.pipes.size());
  std::ptrdiff_t first = links;
  auto fails = [&](std::ptrdiff_t k) {
    return !link_failure(net, r, options, static_cast<std::size_t>(k)).empty();
  };
  if (links >= kParallelLinks) {
#pragma omp parallel for schedule(static) reduction(min : first)
    for (std::ptrdiff_t k = 0; k < links; ++k) {
      if (k < first && fails(k)) first = k;
    }
  } else {
    for (std::ptrdiff_t k = 0; k < links && first == links; ++k) {  // no OpenMP region
      if (fails(k)) first = k;
    }
  }
  if (first < links) return fail(link_failure(net, r, options, static_cast<std::size_t>(first)));
  const std::vector<double> balance = sum_by_index(
      net.nodes.size(), links, [&](std::ptrdiff_t k, double* into) {
        into[net.pipes[k].from] -= r.links[k].flow_m3s;
        into[net.pipes[k].to] += r.links[k].flow_m3s;
      });
  const double tolerance = kSelfCheckSlack * options.continuity_tolerance_m3s;
  auto node_passes = [&](std::size_t n) {
    const NodeState& ns = r.nodes[n];
    if (net.nodes[n].is_fixed_head() || !ns.supplied) return true;
    return std::isfinite(ns.head_m) && std::isfinite(ns.pressure_pa) &&
           std::abs(balance[n] - demand[n]) <= tolerance;
  };
  const std::vector<std::size_t> failing =
      indices_where(static_cast<std::ptrdiff_t>(net.nodes.size()),
                    [&](std::ptrdiff_t n) { return !node_passes(static_cast<std::size_t>(n)); });
  if (!failing.empty()) {  // the first failing node in file order is the one reported
    const std::size_t n = failing.front();
    const NodeState& ns = r.nodes[n];
    if (!std::isfinite(ns.head_m) || !std::isfinite(ns.pressure_pa)) {
      return fail("node '" + net.nodes[n].id + "' has a non-finite head");
    }
    std::ostringstream m;
    m << "node '" << net.nodes[n].id << "' continuity residual " << balance[n] - demand[n]
      << " m3/s exceeds " << tolerance << " m3/s";
    return fail(m.str());
  }
  return out;
}

}  // namespace gradeline
