#include "report/text_report.h"

#include <cmath>
#include <cstdarg>
#include <cstdio>
#include <vector>

#include "gradeline/version.h"
#include "model/parallel.h"
#include "model/units.h"
#include "report/columns.h"
#include "report/pump_point.h"
#include "report/result_totals.h"

namespace gradeline {
namespace {

bool p_closed_note(const Pipe& p) { return p.status != LinkStatus::kClosed; }

void appendf(std::string* out, const char* format, ...) {
  char buffer[512];
  va_list args;
  va_start(args, format);
  std::vsnprintf(buffer, sizeof buffer, format, args);
  va_end(args);
  *out += buffer;
}

std::string rule(std::size_t width) { return std::string(width, '-') + "\n"; }

std::string pumps_text(const Network& net, const SolveResult& r) {
  const DisplayUnit flow = display_flow(net.units);
  const DisplayUnit len = display_length(net.units);
  std::string out;
  const std::vector<std::size_t> pumps = indices_where(
      static_cast<std::ptrdiff_t>(net.pipes.size()), [&](std::ptrdiff_t k) { return net.pipes[k].is_pump(); });
  for (std::size_t k : pumps) {
    const Pipe& p = net.pipes[k];
    if (out.empty()) {
      out = "\npumps\n";
      appendf(&out, "  %-10s %-10s %-10s %10s %9s %9s %9s %6s  %s\n", "id", "from", "to",
              ("flow " + std::string(flow.name)).c_str(), ("gain " + std::string(len.name)).c_str(),
              "hyd kW", "shaft kW", "speed", "mode");
    }
    const PumpPoint pp = pump_point(net, p, r.links[k]);
    char shaft[32] = "-";
    if (p.control().efficiency && r.links[k].open) {
      std::snprintf(shaft, sizeof shaft, "%.2f", pp.hydraulic_power_w / *p.control().efficiency * 1e-3);
    }
    appendf(&out, "  %-10s %-10s %-10s %10.3f %9.2f %9.2f %9s %6.2f  %s%s\n", p.id.c_str(),
            net.nodes[p.from].id.c_str(), net.nodes[p.to].id.c_str(),
            r.links[k].flow_m3s * flow.per_si, pp.head_gain_m * len.per_si,
            pp.hydraulic_power_w * 1e-3, shaft, p.control().speed, pp.mode,
            pp.on_curve ? "" : ", OUTSIDE CURVE RANGE");
  }
  return out;
}

std::string valves_text(const Network& net, const SolveResult& r) {
  const DisplayUnit flow = display_flow(net.units);
  const DisplayUnit len = display_length(net.units);
  std::string out;
  const std::vector<std::size_t> valves = indices_where(
      static_cast<std::ptrdiff_t>(net.pipes.size()), [&](std::ptrdiff_t k) { return net.pipes[k].is_valve(); });
  for (std::size_t k : valves) {
    const Pipe& p = net.pipes[k];
    if (out.empty()) {
      out = "\nvalves\n";
      appendf(&out, "  %-10s %-9s %-10s %-10s %10s %9s %12s  %s\n", "id", "kind", "from", "to",
              ("flow " + std::string(flow.name)).c_str(), ("hL " + std::string(len.name)).c_str(),
              "setting", "mode");
    }
    const LinkState& ls = r.links[k];
    char setting[48] = "-";
    if (p.kind == LinkKind::kFcv) {
      std::snprintf(setting, sizeof setting, "%.3f %s", p.control().valve_flow_m3s * flow.per_si, flow.name);
    } else if (p.kind != LinkKind::kThrottle) {
      std::snprintf(setting, sizeof setting, "%.2f %s", p.control().valve_head_m * len.per_si, len.name);
    }
    const char* mode = p.status == LinkStatus::kClosed ? "closed (by the file)"
                       : p.is_control_valve()          ? valve_mode_name(ls.valve_mode)
                       : ls.open                       ? "open"
                                                       : "unsupplied";
    appendf(&out, "  %-10s %-9s %-10s %-10s %10.3f %9.3f %12s  %s\n", p.id.c_str(),
            link_kind_name(p.kind), net.nodes[p.from].id.c_str(), net.nodes[p.to].id.c_str(),
            ls.flow_m3s * flow.per_si, ls.headloss_m * len.per_si, setting, mode);
  }
  return out;
}

}  // namespace

std::string solve_summary_text(const Network& net, const SolveResult& r, const std::string& file,
                               const std::string& case_name) {
  const SolveSummary& s = r.summary;
  const DisplayUnit flow = display_flow(net.units);
  std::string out;
  appendf(&out, "gradeline %s  steady-state hydraulic solve\n", kVersion);
  appendf(&out, "network     %s%s%s\n", file.c_str(), net.title.empty() ? "" : "  -  ",
          net.title.c_str());
  appendf(&out, "model       %zu nodes, %zu pipes, %s, fluid %.1f kg/m3, nu %.4g m2/s\n",
          net.nodes.size(), net.pipes.size(),
          net.headloss.law == HeadlossLaw::kDarcyWeisbach ? "Darcy-Weisbach (Colebrook-White)"
                                                          : "Hazen-Williams",
          net.fluid.density_kgm3, net.fluid.kinematic_viscosity_m2s);
  if (!case_name.empty()) appendf(&out, "case        %s\n", case_name.c_str());
  if (s.converged()) {
    appendf(&out, "status      SOLVED in %d Newton iterations\n", s.iterations);
  } else {
    appendf(&out, "status      NOT SOLVED (%s): %s\n", termination_name(s.termination),
            s.message.c_str());
  }
  appendf(&out, "residuals   continuity %.2e m3/s max", s.max_continuity_residual_m3s);
  if (!net.nodes.empty()) appendf(&out, " (node %s)", net.nodes[s.worst_continuity_node].id.c_str());
  appendf(&out, ", energy %.2e m max", s.max_energy_residual_m);
  if (!net.pipes.empty()) appendf(&out, " (pipe %s)", net.pipes[s.worst_energy_link].id.c_str());
  out += "\n";
  if (!s.converged()) return out;

  ResultTotals totals = result_totals(net, r);
  appendf(&out, "demand      %.3f %s delivered", totals.demand_m3s * flow.per_si, flow.name);
  if (s.unsupplied_nodes > 0) {
    appendf(&out, "; %zu unsupplied nodes, %.3f %s not delivered", s.unsupplied_nodes,
            totals.undelivered_demand_m3s * flow.per_si, flow.name);
  }
  out += "\n";
  for (const SourceFlow& f : totals.sources) {
    appendf(&out, "source      %-12s %10.3f %s %s\n", net.nodes[f.node].id.c_str(),
            std::abs(f.inflow_m3s) * flow.per_si, flow.name,
            f.inflow_m3s >= 0.0 ? "supplied" : "received");
  }
  return out;
}

void write_solve_report(const Network& net, const SolveResult& r, const std::string& file,
                        const ReportOptions& options, const TextSink& sink) {
  std::string out = solve_summary_text(net, r, file, options.case_name);
  if (!r.summary.converged()) {
    sink(out);
    return;
  }
  out += options.criteria_block;
  const DisplayUnit flow = display_flow(net.units);
  const DisplayUnit len = display_length(net.units);
  const DisplayUnit dia = display_diameter(net.units);
  const DisplayUnit pres = display_pressure(net.units);
  const DisplayUnit vel = display_velocity(net.units);

  // Each kind of warning lists its first kMaxListed elements, then a count of the rest.
  constexpr std::size_t kMaxListed = 20;
  std::string warnings;
  std::size_t unsupplied = 0, negative = 0, fast = 0, check_closed = 0;
  auto listed = [&](std::size_t* count) { return ++*count <= kMaxListed; };
  // The elements that may need a line are found on every core; the lines are written in order.
  const std::vector<std::size_t> odd_nodes =
      indices_where(static_cast<std::ptrdiff_t>(net.nodes.size()), [&](std::ptrdiff_t n) {
        return !net.nodes[n].is_fixed_head() && (!r.nodes[n].supplied || r.nodes[n].pressure_m < 0.0);
      });
  for (std::size_t n : odd_nodes) {
    const NodeState& ns = r.nodes[n];
    if (!ns.supplied) {
      if (listed(&unsupplied))
        appendf(&warnings, "  ! node %s has no open path to a source (unsupplied)\n",
                net.nodes[n].id.c_str());
    } else if (ns.pressure_m < 0.0) {
      if (listed(&negative))
        appendf(&warnings, "  ! node %s has NEGATIVE pressure %.2f %s (%.2f %s head)\n",
                net.nodes[n].id.c_str(), ns.pressure_pa * pres.per_si, pres.name,
                ns.pressure_m * len.per_si, len.name);
    }
  }
  const std::vector<std::size_t> odd_links =
      indices_where(static_cast<std::ptrdiff_t>(net.pipes.size()), [&](std::ptrdiff_t k) {
        const Pipe& p = net.pipes[k];
        const LinkState& ls = r.links[k];
        return std::abs(ls.velocity_ms) > kHighVelocity_ms || p.is_valve() || p.is_pump() ||
               ls.closed_by_check_valve;
      });
  for (std::size_t k : odd_links) {
    const LinkState& ls = r.links[k];
    if (std::abs(ls.velocity_ms) > kHighVelocity_ms && listed(&fast)) {
      appendf(&warnings, "  ! %s %s velocity %.2f %s is above %.1f %s\n", link_kind_name(net.pipes[k].kind), net.pipes[k].id.c_str(),
              std::abs(ls.velocity_ms) * vel.per_si, vel.name, kHighVelocity_ms * vel.per_si,
              vel.name);
    }
    if (net.pipes[k].is_control_valve() && ls.valve_mode == ValveMode::kOpen &&
        net.pipes[k].kind != LinkKind::kFcv) {
      appendf(&warnings, "  ! %s %s is fully open: the %s head cannot reach its setting\n",
              link_kind_name(net.pipes[k].kind), net.pipes[k].id.c_str(),
              net.pipes[k].kind == LinkKind::kPrv ? "upstream" : "upstream");
    }
    if (net.pipes[k].kind == LinkKind::kFcv && ls.valve_mode == ValveMode::kOpen) {
      appendf(&warnings, "  ! fcv %s is fully open: it cannot pass its set flow\n",
              net.pipes[k].id.c_str());
    }
    if (net.pipes[k].is_pump()) {
      const PumpPoint pp = pump_point(net, net.pipes[k], ls);
      if (ls.open && !pp.on_curve) {
        appendf(&warnings, "  ! pump %s runs outside its curve's range (%.2f %s)\n",
                net.pipes[k].id.c_str(), ls.flow_m3s * flow.per_si, flow.name);
      }
      if (!ls.open && p_closed_note(net.pipes[k])) {
        appendf(&warnings, "  - pump %s is %s\n", net.pipes[k].id.c_str(), pp.mode);
      }
      continue;
    }
    if (ls.closed_by_check_valve && listed(&check_closed)) {
      appendf(&warnings, "  - check valve on pipe %s is closed against reverse flow\n",
              net.pipes[k].id.c_str());
    }
  }
  const std::pair<std::size_t, const char*> more[] = {
      {unsupplied, "unsupplied nodes"},
      {negative, "nodes with negative pressure"},
      {fast, "pipes above the velocity limit"},
      {check_closed, "closed check valves"}};
  for (const auto& [count, what] : more) {
    if (count > kMaxListed) appendf(&warnings, "  ... %zu %s in all\n", count, what);
  }
  if (!warnings.empty()) out += "\nwarnings\n" + warnings;

  if (options.tables) {
    out += "\nnodes\n";
    char header[256];
    std::snprintf(header, sizeof header, "  %-14s %10s %10s %11s %11s %11s  %s\n", "id",
                  ("elev " + std::string(len.name)).c_str(), ("head " + std::string(len.name)).c_str(),
                  ("p-head " + std::string(len.name)).c_str(),
                  ("pressure " + std::string(pres.name)).c_str(),
                  ("demand " + std::string(flow.name)).c_str(), "note");
    out += header;
    out += "  " + rule(std::string(header).size() - 3);
    sink(out);
    out.clear();
    // "  %-14s %10.2f %10.2f %11.2f %11.1f %11.3f  %s\n", with "-" for the head and pressures
    // of an unsupplied node.
    text_in_order(net.nodes.size(), [&](std::size_t n, std::string* text) {
      const Node& node = net.nodes[n];
      const NodeState& ns = r.nodes[n];
      const char* note = node.kind == NodeKind::kTank  ? (node.receives_only() ? "tank, at min level"
                                                                                : "tank")
                         : node.is_fixed_head() ? "fixed head"
                         : !ns.supplied       ? "UNSUPPLIED"
                         : ns.pressure_m < 0  ? "NEGATIVE"
                                              : "";
      Columns row(text);
      row.text("  ").left(node.id, 14).text(" ").fixed(node.elevation_m * len.per_si, 10, 2);
      if (ns.supplied) {
        row.text(" ").fixed(ns.head_m * len.per_si, 10, 2).text(" ")
            .fixed(ns.pressure_m * len.per_si, 11, 2).text(" ")
            .fixed(ns.pressure_pa * pres.per_si, 11, 1);
      } else {
        row.text(" ").right("-", 10).text(" ").right("-", 11).text(" ").right("-", 11);
      }
      row.text(" ").fixed(ns.demand_m3s * flow.per_si, 11, 3).text("  ").text(note).text("\n");
    }, sink);

    out += "\npipes\n";
    std::snprintf(header, sizeof header, "  %-10s %-10s %-10s %9s %8s %10s %8s %8s %9s %9s %7s  %s\n",
                  "id", "from", "to", ("len " + std::string(len.name)).c_str(),
                  ("D " + std::string(dia.name)).c_str(), ("flow " + std::string(flow.name)).c_str(),
                  ("v " + std::string(vel.name)).c_str(), ("hL " + std::string(len.name)).c_str(),
                  "hL m/km", "Re", "f", "regime");
    out += header;
    out += "  " + rule(std::string(header).size() - 3);
    sink(out);
    out.clear();
    // "  %-10s %-10s %-10s %9.1f %8.1f %10.3f %8.3f %8.3f %9.3f %9.3g %7.4f  %s\n"; a link
    // that is not open shows a zero flow and "-" for the rest.
    text_in_order(net.pipes.size(), [&](std::size_t k, std::string* text) {
      const Pipe& p = net.pipes[k];
      const LinkState& ls = r.links[k];
      if (p.is_pump() || p.is_valve()) return;
      Columns row(text);
      row.text("  ").left(p.id, 10).text(" ").left(net.nodes[p.from].id, 10).text(" ")
          .left(net.nodes[p.to].id, 10).text(" ").fixed(p.length_m * len.per_si, 9, 1).text(" ")
          .fixed(p.diameter_m * dia.per_si, 8, 1).text(" ");
      if (!ls.open) {
        row.right("0", 10).text(" ").right("-", 8).text(" ").right("-", 8).text(" ").right("-", 9)
            .text(" ").right("-", 9).text(" ").right("-", 7).text("  ")
            .text(ls.closed_by_check_valve           ? "closed (check valve)"
                  : p.status == LinkStatus::kClosed ? "closed"
                                                    : "unsupplied")
            .text("\n");
        return;
      }
      row.fixed(ls.flow_m3s * flow.per_si, 10, 3).text(" ").fixed(ls.velocity_ms * vel.per_si, 8, 3)
          .text(" ").fixed(ls.headloss_m * len.per_si, 8, 3).text(" ")
          .fixed(ls.headloss_m / p.length_m * 1e3, 9, 3).text(" ").general(ls.reynolds, 9, 3)
          .text(" ").fixed(ls.friction_factor, 7, 4).text("  ").text(regime_name(ls.regime))
          .text("\n");
    }, sink);
  }
  if (options.tables) out += pumps_text(net, r) + valves_text(net, r);
  out += "\n";
  out += kCaution;
  sink(out);
}

std::string solve_report_text(const Network& net, const SolveResult& r, const std::string& file,
                              const ReportOptions& options) {
  std::string out;
  write_solve_report(net, r, file, options, [&](std::string_view piece) { out += piece; });
  return out;
}

}  // namespace gradeline
