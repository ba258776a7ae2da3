#include "report/criteria_report.h"

#include <cmath>
#include <cstdio>

#include "model/units.h"

namespace gradeline {
namespace {

const char* element_id(const Network& net, const Violation& v) {
  return v.quantity == LimitQuantity::kPressure ? net.nodes[v.element].id.c_str()
                                                : net.pipes[v.element].id.c_str();
}

}  // namespace

std::string criteria_line(const Network& net, const Criteria& c) {
  if (!has_criteria(c)) return "";
  const DisplayUnit pres = display_pressure(net.units);
  const DisplayUnit vel = display_velocity(net.units);
  const double to_display = net.fluid.density_kgm3 * kGravity_ms2 * pres.per_si;
  std::string out = "criteria   ";
  char part[128];
  if (c.min_pressure_m) {
    std::snprintf(part, sizeof part, " pressure >= %.1f %s", *c.min_pressure_m * to_display, pres.name);
    out += part;
  }
  if (c.max_pressure_m) {
    std::snprintf(part, sizeof part, " pressure <= %.1f %s", *c.max_pressure_m * to_display, pres.name);
    out += part;
  }
  if (c.max_velocity_ms) {
    std::snprintf(part, sizeof part, " velocity <= %.2f %s", *c.max_velocity_ms * vel.per_si, vel.name);
    out += part;
  }
  return out + "\n";
}

std::string violations_text(const Network& net, const std::vector<Violation>& violations,
                            std::size_t max_rows) {
  const DisplayUnit pres = display_pressure(net.units);
  const DisplayUnit vel = display_velocity(net.units);
  const double to_display = net.fluid.density_kgm3 * kGravity_ms2 * pres.per_si;
  std::string out;
  char line[256];
  if (violations.empty()) return "criteria    all met\n";
  std::snprintf(line, sizeof line, "criteria    %zu VIOLATIONS (failing nodes first, worst first)\n",
                violations.size());
  out += line;
  std::snprintf(line, sizeof line, "  %-12s %-14s %-9s %-4s %12s %12s %12s\n", "case", "element",
                "quantity", "", "value", "limit", "margin");
  out += line;
  for (std::size_t i = 0; i < violations.size() && i < max_rows; ++i) {
    const Violation& v = violations[i];
    const bool pressure = v.quantity == LimitQuantity::kPressure;
    const double scale = pressure ? to_display : vel.per_si;
    const char* unit = pressure ? pres.name : vel.name;
    if (v.unsupplied) {
      std::snprintf(line, sizeof line, "  %-12s %-14s %-9s %-4s %12s %8.1f %-3s %12s\n",
                    v.case_name.c_str(), element_id(net, v), "pressure", "min", "unsupplied",
                    v.limit * scale, unit, "-");
    } else {
      std::snprintf(line, sizeof line, "  %-12s %-14s %-9s %-4s %8.2f %-3s %8.2f %-3s %8.2f %-3s\n",
                    v.case_name.c_str(), element_id(net, v), pressure ? "pressure" : "velocity",
                    v.kind == LimitKind::kMin ? "min" : "max", v.value * scale, unit,
                    v.limit * scale, unit, v.margin * scale, unit);
    }
    out += line;
  }
  if (violations.size() > max_rows) {
    out += "  ... " + std::to_string(violations.size() - max_rows) + " more (see --json)\n";
  }
  return out;
}

void write_violations_json(const Network& net, const std::vector<Violation>& violations,
                           JsonStream* j) {
  const double pa_per_m = net.fluid.density_kgm3 * kGravity_ms2;
  j->key("violations");
  j->begin_array();
  for (const Violation& v : violations) {
    const bool pressure = v.quantity == LimitQuantity::kPressure;
    j->begin_object();
    j->field("case", v.case_name);
    j->field("id", element_id(net, v));
    j->field("element", pressure ? "node" : "pipe");
    j->field("quantity", pressure ? "pressure" : "velocity");
    j->field("kind", v.kind == LimitKind::kMin ? "min" : "max");
    j->field("unit", pressure ? "m" : "m/s");
    j->field("value", v.value);
    j->field("limit", v.limit);
    j->field("margin", v.margin);
    if (pressure) {
      j->field("value_kPa", v.value * pa_per_m * 1e-3);
      j->field("limit_kPa", v.limit * pa_per_m * 1e-3);
    }
    j->field("unsupplied", v.unsupplied);
    j->end_object();
  }
  j->end_array();
}

}  // namespace gradeline
