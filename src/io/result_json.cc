#include "io/result_json.h"

#include <algorithm>

#include "report/pump_point.h"
#include "report/result_totals.h"

namespace gradeline {
namespace {

const char* link_status(const Pipe& p, const LinkState& ls) {
  if (ls.open) return "open";
  if (ls.closed_by_check_valve) return "closed-by-check-valve";
  return p.status == LinkStatus::kClosed ? "closed" : "unsupplied";
}

void write_summary(const Network& net, const SolveResult& r, JsonStream* j) {
  const SolveSummary& s = r.summary;
  ResultTotals totals = result_totals(net, r);
  j->key("summary");
  j->begin_object();
  j->field("converged", s.converged());
  j->field("termination", termination_name(s.termination));
  j->field("iterations", s.iterations);
  j->field("max_continuity_residual_m3s", s.max_continuity_residual_m3s);
  j->field("max_energy_residual_m", s.max_energy_residual_m);
  j->field("total_demand_m3s", totals.demand_m3s);
  j->field("undelivered_demand_m3s", totals.undelivered_demand_m3s);
  j->field("unsupplied_nodes", s.unsupplied_nodes);
  j->key("sources");
  j->begin_array();
  for (const SourceFlow& f : totals.sources) {
    j->begin_object();
    j->field("id", net.nodes[f.node].id);
    j->field("inflow_m3s", f.inflow_m3s);
    j->end_object();
  }
  j->end_array();
  j->key("fluid");
  j->begin_object();
  j->field("density_kgm3", net.fluid.density_kgm3);
  j->field("kinematic_viscosity_m2s", net.fluid.kinematic_viscosity_m2s);
  j->end_object();
  j->field("headloss", net.headloss.law == HeadlossLaw::kDarcyWeisbach ? "darcy-weisbach"
                                                                        : "hazen-williams");
  j->end_object();
}

// Elements below this count are written in turn; above, in blocks formatted on every core and
// appended in order, so the text is the same either way.
constexpr std::size_t kParallelElements = 50000;
constexpr std::size_t kElementBlock = 8192;
constexpr std::size_t kBlocksAtOnce = 8;

template <typename WriteOne>
void write_elements(JsonStream* j, std::size_t count, const WriteOne& write_one) {
  if (count < kParallelElements) {
    for (std::size_t i = 0; i < count; ++i) write_one(j, i);
    return;
  }
  const std::size_t blocks = (count + kElementBlock - 1) / kElementBlock;
  std::vector<std::string> text(kBlocksAtOnce);
  for (std::size_t first = 0; first < blocks; first += kBlocksAtOnce) {
    const std::ptrdiff_t batch = static_cast<std::ptrdiff_t>(std::min(kBlocksAtOnce, blocks - first));
    const bool empty = j->container_empty();
#pragma omp parallel for schedule(static)
    for (std::ptrdiff_t b = 0; b < batch; ++b) {
      text[b].clear();
      JsonStream part = j->continuation(&text[b], empty && b == 0);
      const std::size_t begin = (first + static_cast<std::size_t>(b)) * kElementBlock;
      const std::size_t end = std::min(count, begin + kElementBlock);
      for (std::size_t i = begin; i < end; ++i) write_one(&part, i);
    }
    for (std::ptrdiff_t b = 0; b < batch; ++b) j->append_elements(text[b]);
  }
}

}  // namespace

void write_result_json(const Network& net, const SolveResult& r, JsonStream* j,
                       const std::function<void(JsonStream*)>& more) {
  j->begin_object();
  write_summary(net, r, j);
  j->key("nodes");
  j->begin_array();
  write_elements(j, net.nodes.size(), [&](JsonStream* j, std::size_t n) {
    const Node& node = net.nodes[n];
    const NodeState& ns = r.nodes[n];
    j->begin_object();
    j->field("id", node.id);
    j->field("kind", node.kind == NodeKind::kTank      ? "tank"
                     : node.kind == NodeKind::kReservoir ? "reservoir"
                                                         : "node");
    if (node.kind == NodeKind::kTank) {
      j->field("level_m", node.levels().level_m);
      j->field("can_supply", !node.receives_only());
    }
    j->field("elevation_m", node.elevation_m);
    j->field("head_m", ns.head_m);
    j->field("pressure_m", ns.pressure_m);
    j->field("pressure_kPa", ns.pressure_pa * 1e-3);
    j->field("demand_m3s", ns.demand_m3s);
    j->field("supplied", ns.supplied);
    j->end_object();
  });
  j->end_array();
  j->key("links");
  j->begin_array();
  write_elements(j, net.pipes.size(), [&](JsonStream* j, std::size_t k) {
    const Pipe& p = net.pipes[k];
    const LinkState& ls = r.links[k];
    j->begin_object();
    j->field("id", p.id);
    j->field("kind", link_kind_name(p.kind));
    j->field("from", net.nodes[p.from].id);
    j->field("to", net.nodes[p.to].id);
    j->field("flow_m3s", ls.flow_m3s);
    j->field("velocity_ms", ls.velocity_ms);
    j->field("headloss_m", ls.headloss_m);
    j->field("headloss_m_per_km", ls.headloss_m / p.length_m * 1e3);
    j->field("reynolds", ls.reynolds);
    j->field("friction_factor", ls.friction_factor);
    j->field("regime", regime_name(ls.regime));
    j->field("status", link_status(p, ls));
    if (p.is_pump()) {
      const PumpPoint pp = pump_point(net, p, ls);
      j->field("mode", pp.mode);
      j->field("head_gain_m", pp.head_gain_m);
      j->field("hydraulic_power_kW", pp.hydraulic_power_w * 1e-3);
      j->key("shaft_power_kW");
      if (p.control().efficiency) j->value(pp.hydraulic_power_w / *p.control().efficiency * 1e-3); else j->null();
      j->field("on_curve", pp.on_curve);
    } else if (p.is_control_valve()) {
      j->field("mode", ls.open || ls.valve_mode != ValveMode::kClosed ? valve_mode_name(ls.valve_mode)
                                                                      : "closed");
      j->field("setting", p.kind == LinkKind::kFcv ? p.control().valve_flow_m3s : p.control().valve_head_m);
      j->field("setting_unit", p.kind == LinkKind::kFcv ? "m3/s" : "m (head)");
    } else {
      j->field("mode", ls.open ? "open" : "closed");
    }
    j->end_object();
  });
  j->end_array();
  if (more) more(j);
  j->end_object();
}

std::string result_json_text(const Network& net, const SolveResult& r) {
  std::string text;
  text.reserve(256 * (net.nodes.size() + net.pipes.size()) + 1024);
  JsonStream j(&text);
  write_result_json(net, r, &j);
  return text;
}

}  // namespace gradeline
