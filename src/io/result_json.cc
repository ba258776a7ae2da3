#include "io/result_json.h"

#include <cmath>

#include "report/result_totals.h"

namespace gradeline {
namespace {

nlohmann::json number_or_null(double v) {
  return std::isfinite(v) ? nlohmann::json(v) : nlohmann::json(nullptr);
}

}  // namespace

nlohmann::json result_to_json(const Network& net, const SolveResult& r) {
  using nlohmann::json;
  const SolveSummary& s = r.summary;
  ResultTotals totals = result_totals(net, r);
  json sources = json::array();
  for (const SourceFlow& f : totals.sources) {
    sources.push_back({{"id", net.nodes[f.node].id}, {"inflow_m3s", f.inflow_m3s}});
  }
  json summary = {
      {"converged", s.converged()},
      {"termination", termination_name(s.termination)},
      {"iterations", s.iterations},
      {"max_continuity_residual_m3s", s.max_continuity_residual_m3s},
      {"max_energy_residual_m", s.max_energy_residual_m},
      {"total_demand_m3s", totals.demand_m3s},
      {"undelivered_demand_m3s", totals.undelivered_demand_m3s},
      {"unsupplied_nodes", s.unsupplied_nodes},
      {"sources", sources},
      {"fluid", {{"density_kgm3", net.fluid.density_kgm3},
                 {"kinematic_viscosity_m2s", net.fluid.kinematic_viscosity_m2s}}},
      {"headloss", net.headloss.law == HeadlossLaw::kDarcyWeisbach ? "darcy-weisbach"
                                                                    : "hazen-williams"},
  };
  json nodes = json::array();
  for (std::size_t n = 0; n < net.nodes.size(); ++n) {
    const Node& node = net.nodes[n];
    const NodeState& ns = r.nodes[n];
    nodes.push_back({{"id", node.id},
                     {"kind", node.is_fixed_head() ? "reservoir" : "node"},
                     {"elevation_m", node.elevation_m},
                     {"head_m", number_or_null(ns.head_m)},
                     {"pressure_m", number_or_null(ns.pressure_m)},
                     {"pressure_kPa", number_or_null(ns.pressure_pa * 1e-3)},
                     {"demand_m3s", ns.demand_m3s},
                     {"supplied", ns.supplied}});
  }
  json links = json::array();
  for (std::size_t k = 0; k < net.pipes.size(); ++k) {
    const Pipe& p = net.pipes[k];
    const LinkState& ls = r.links[k];
    const char* status = ls.open ? "open" : (ls.closed_by_check_valve ? "closed-by-check-valve"
                                             : p.status == LinkStatus::kClosed ? "closed"
                                                                               : "unsupplied");
    links.push_back({{"id", p.id},
                     {"kind", "pipe"},
                     {"from", net.nodes[p.from].id},
                     {"to", net.nodes[p.to].id},
                     {"flow_m3s", ls.flow_m3s},
                     {"velocity_ms", ls.velocity_ms},
                     {"headloss_m", ls.headloss_m},
                     {"headloss_m_per_km", ls.headloss_m / p.length_m * 1e3},
                     {"reynolds", ls.reynolds},
                     {"friction_factor", ls.friction_factor},
                     {"regime", regime_name(ls.regime)},
                     {"status", status}});
  }
  return json{{"summary", summary}, {"nodes", nodes}, {"links", links}};
}

}  // namespace gradeline
