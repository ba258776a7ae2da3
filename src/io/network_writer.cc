#include "io/network_writer.h"

#include <charconv>
#include <sstream>
#include <string_view>

#include "model/parallel.h"

namespace gradeline {

namespace {

// The shortest text that reads back to exactly `value`, appended to `t`.
void put_number(std::string* t, double value) {
  char buffer[32];
  const auto [end, error] = std::to_chars(buffer, buffer + sizeof buffer, value);
  t->append(buffer, static_cast<std::size_t>(end - buffer));
}

}  // namespace

std::string exact_number(double value) {
  std::string text;
  put_number(&text, value);
  return text;
}

namespace {

std::string with_unit(double value, const char* unit) { return exact_number(value) + unit; }

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

// Room reserved for the element lines: about what a pipe line with roughness takes (a longer
// text only grows the string).
constexpr std::size_t kBytesPerLine = 72;

// One element's line, appended to `t`: every value as the shortest text that reads back to it,
// with its SI unit.
void put(std::string* t, const char* key, double value, const char* unit = "") {
  *t += key;
  put_number(t, value);
  *t += unit;
}

void put_ends(std::string* t, const Network& net, const Pipe& p) {
  *t += p.id;
  *t += ' ';
  *t += net.nodes[p.from].id;
  *t += ' ';
  *t += net.nodes[p.to].id;
}

void write_node(const Node& n, std::string* t) {
  if (n.kind == NodeKind::kTank) {
    *t += "tank ";
    *t += n.id;
    put(t, " bottom=", n.elevation_m, "m");
    put(t, " level=", n.levels().level_m, "m");
    put(t, " min_level=", n.levels().min_level_m, "m");
    if (n.levels().max_level_m) put(t, " max_level=", *n.levels().max_level_m, "m");
    if (n.levels().tank_diameter_m) put(t, " diameter=", *n.levels().tank_diameter_m, "m");
  } else if (n.is_fixed_head()) {
    *t += "reservoir ";
    *t += n.id;
    put(t, " head=", n.head_m, "m");
    put(t, " elevation=", n.elevation_m, "m");
  } else {
    *t += "node ";
    *t += n.id;
    put(t, " elevation=", n.elevation_m, "m");
    if (n.demand_m3s != 0.0 || !n.demand_category.empty()) {
      put(t, " demand=", n.demand_m3s, "m3/s");
      if (!n.demand_category.empty()) {
        *t += ':';
        *t += n.demand_category.str();
      }
    }
  }
  if (n.at) {
    put(t, " at=", n.at->x);
    put(t, ",", n.at->y);
  }
  *t += '\n';
}

void write_link(const Network& net, const Pipe& p, std::string* t) {
  if (p.is_pump()) {
    *t += "pump ";
    put_ends(t, net, p);
    *t += " curve=";
    const auto& points = p.control().curve.points;
    for (std::size_t i = 0; i < points.size(); ++i) {
      put(t, i ? "," : "", points[i].first, "m3/s");
      put(t, ":", points[i].second, "m");
    }
    if (p.control().speed != 1.0) put(t, " speed=", p.control().speed);
    if (p.control().efficiency) put(t, " efficiency=", *p.control().efficiency);
    if (p.status == LinkStatus::kClosed) *t += " status=off";
    *t += '\n';
    return;
  }
  if (p.is_valve()) {
    *t += "valve ";
    put_ends(t, net, p);
    *t += " type=";
    *t += link_kind_name(p.kind);
    put(t, " diameter=", p.diameter_m, "m");
    if (p.kind == LinkKind::kPrv || p.kind == LinkKind::kPsv) {
      put(t, " head=", p.control().valve_head_m, "m");
    }
    if (p.kind == LinkKind::kFcv) put(t, " flow=", p.control().valve_flow_m3s, "m3/s");
    if (p.minor_k != 0.0) put(t, " minor=", p.minor_k);
    if (p.control().valve_loss_m != 0.0) put(t, " loss=", p.control().valve_loss_m, "m");
    if (p.status == LinkStatus::kClosed) *t += " status=closed";
    *t += '\n';
    return;
  }
  *t += "pipe ";
  put_ends(t, net, p);
  put(t, " length=", p.length_m, "m");
  put(t, " diameter=", p.diameter_m, "m");
  if (p.roughness_m) put(t, " roughness=", *p.roughness_m, "m");
  if (p.cfactor) put(t, " cfactor=", *p.cfactor);
  if (p.minor_k != 0.0) put(t, " minor=", p.minor_k);
  if (p.status == LinkStatus::kClosed) *t += " status=closed";
  if (p.check_valve) *t += " check=yes";
  if (p.resizable) *t += " resize=yes";
  *t += '\n';
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
  // The elements, formed in blocks on every core for a large network.
  std::string text = out.str();
  text.reserve(text.size() + kBytesPerLine * (net.nodes.size() + net.pipes.size()));
  auto take = [&](std::string_view piece) { text += piece; };
  text_in_order(
      net.nodes.size(), [&](std::size_t n, std::string* t) { write_node(net.nodes[n], t); }, take);
  text_in_order(
      net.pipes.size(), [&](std::size_t k, std::string* t) { write_link(net, net.pipes[k], t); },
      take);
  out.str("");
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
  text += out.str();
  return text;
}

}  // namespace gradeline
