#include "io/network_writer.h"

#include <charconv>
#include <sstream>

namespace gradeline {

std::string exact_number(double value) {
  char buffer[64];
  auto [end, ec] = std::to_chars(buffer, buffer + sizeof buffer, value);
  return std::string(buffer, end);
}

namespace {

std::string with_unit(double value, const char* unit) { return exact_number(value) + unit; }

void write_at(std::ostringstream& out, const Node& n) {
  if (n.at) out << " at=" << exact_number(n.at->x) << "," << exact_number(n.at->y);
}

void write_limits(std::ostringstream& out, const Criteria& c, const std::string& case_name) {
  const std::string suffix = case_name.empty() ? "" : " case=" + case_name;
  if (c.min_pressure_m || c.max_pressure_m) {
    out << "limit pressure";
    if (c.min_pressure_m) out << " min=" << with_unit(*c.min_pressure_m, "m");
    if (c.max_pressure_m) out << " max=" << with_unit(*c.max_pressure_m, "m");
    out << suffix << "\n";
  }
  if (c.max_velocity_ms) {
    out << "limit velocity max=" << with_unit(*c.max_velocity_ms, "m/s") << suffix << "\n";
  }
}

}  // namespace

std::string write_network(const Network& net) {
  std::ostringstream out;
  out << "# gradeline network, format version 1 (values in SI units)\n";
  if (!net.title.empty()) out << "title " << net.title << "\n";
  out << "units " << (net.units == UnitSystem::kSI ? "SI" : "US") << "\n";
  if (net.headloss.law == HeadlossLaw::kDarcyWeisbach) {
    out << "headloss darcy-weisbach\n";
  } else {
    out << "headloss hazen-williams coefficient=" << exact_number(net.headloss.hw_coefficient)
        << " flow_exponent=" << exact_number(net.headloss.hw_flow_exponent)
        << " diameter_exponent=" << exact_number(net.headloss.hw_diameter_exponent) << "\n";
  }
  if (net.fluid.temperature_c) {
    out << "fluid water temperature=" << with_unit(*net.fluid.temperature_c, "C") << "\n";
  } else {
    out << "fluid viscosity=" << with_unit(net.fluid.kinematic_viscosity_m2s, "m2/s")
        << " density=" << with_unit(net.fluid.density_kgm3, "kg/m3") << "\n";
  }
  for (const Node& n : net.nodes) {
    if (n.kind == NodeKind::kTank) {
      out << "tank " << n.id << " bottom=" << with_unit(n.elevation_m, "m")
          << " level=" << with_unit(n.levels().level_m, "m") << " min_level=" << with_unit(n.levels().min_level_m, "m");
      if (n.levels().max_level_m) out << " max_level=" << with_unit(*n.levels().max_level_m, "m");
      if (n.levels().tank_diameter_m) out << " diameter=" << with_unit(*n.levels().tank_diameter_m, "m");
    } else if (n.is_fixed_head()) {
      out << "reservoir " << n.id << " head=" << with_unit(n.head_m, "m")
          << " elevation=" << with_unit(n.elevation_m, "m");
    } else {
      out << "node " << n.id << " elevation=" << with_unit(n.elevation_m, "m");
      if (n.demand_m3s != 0.0 || !n.demand_category.empty()) {
        out << " demand=" << with_unit(n.demand_m3s, "m3/s");
        if (!n.demand_category.empty()) out << ":" << n.demand_category;
      }
    }
    write_at(out, n);
    out << "\n";
  }
  for (const Pipe& p : net.pipes) {
    if (p.is_pump()) {
      out << "pump " << p.id << " " << net.nodes[p.from].id << " " << net.nodes[p.to].id << " curve=";
      for (std::size_t i = 0; i < p.control().curve.points.size(); ++i) {
        out << (i ? "," : "") << with_unit(p.control().curve.points[i].first, "m3/s") << ":"
            << with_unit(p.control().curve.points[i].second, "m");
      }
      if (p.control().speed != 1.0) out << " speed=" << exact_number(p.control().speed);
      if (p.control().efficiency) out << " efficiency=" << exact_number(*p.control().efficiency);
      if (p.status == LinkStatus::kClosed) out << " status=off";
      out << "\n";
      continue;
    }
    if (p.is_valve()) {
      out << "valve " << p.id << " " << net.nodes[p.from].id << " " << net.nodes[p.to].id
          << " type=" << link_kind_name(p.kind) << " diameter=" << with_unit(p.diameter_m, "m");
      if (p.kind == LinkKind::kPrv || p.kind == LinkKind::kPsv) out << " head=" << with_unit(p.control().valve_head_m, "m");
      if (p.kind == LinkKind::kFcv) out << " flow=" << with_unit(p.control().valve_flow_m3s, "m3/s");
      if (p.minor_k != 0.0) out << " minor=" << exact_number(p.minor_k);
      if (p.control().valve_loss_m != 0.0) out << " loss=" << with_unit(p.control().valve_loss_m, "m");
      if (p.status == LinkStatus::kClosed) out << " status=closed";
      out << "\n";
      continue;
    }
    out << "pipe " << p.id << " " << net.nodes[p.from].id << " " << net.nodes[p.to].id
        << " length=" << with_unit(p.length_m, "m") << " diameter=" << with_unit(p.diameter_m, "m");
    if (p.roughness_m) out << " roughness=" << with_unit(*p.roughness_m, "m");
    if (p.cfactor) out << " cfactor=" << exact_number(*p.cfactor);
    if (p.minor_k != 0.0) out << " minor=" << exact_number(p.minor_k);
    if (p.status == LinkStatus::kClosed) out << " status=closed";
    if (p.check_valve) out << " check=yes";
    if (p.resizable) out << " resize=yes";
    out << "\n";
  }
  for (const DemandCase& c : net.cases) {
    out << "case " << c.name << " factor=" << exact_number(c.factor);
    for (const auto& [category, f] : c.category_factors) {
      out << " factor." << category << "=" << exact_number(f);
    }
    for (const auto& [node, q] : c.draws_m3s) {
      out << " draw=" << net.nodes[node].id << ":" << with_unit(q, "m3/s");
    }
    out << "\n";
  }
  write_limits(out, net.limits, "");
  for (const CaseCriteria& c : net.case_limits) write_limits(out, c.criteria, c.case_name);
  return out.str();
}

}  // namespace gradeline
