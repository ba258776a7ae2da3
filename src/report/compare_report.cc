#include "report/compare_report.h"

#include <cmath>
#include <cstdio>

#include "model/units.h"
#include "report/criteria_report.h"
#include "report/text_report.h"

namespace gradeline {
namespace {

std::string id_list(const std::vector<std::string>& ids) {
  if (ids.empty()) return "none";
  std::string out;
  for (std::size_t i = 0; i < ids.size(); ++i) {
    if (i == 30) return out + ", ... (" + std::to_string(ids.size()) + " in all)";
    out += (i ? ", " : "") + ids[i];
  }
  return out;
}

std::string pressure_cell(double pa, const DisplayUnit& unit) {
  if (std::isnan(pa)) return "unsupplied";
  char cell[32];
  std::snprintf(cell, sizeof cell, "%.1f", pa * unit.per_si);
  return cell;
}

}  // namespace

std::string compare_text(const Network& net, const Comparison& cmp, const std::string& title,
                         std::size_t max_rows) {
  const DisplayUnit pres = display_pressure(net.units);
  const DisplayUnit len = display_length(net.units);
  const DisplayUnit dia = display_diameter(net.units);
  std::string out = "gradeline compare  " + title + "\n";
  char line[256];
  for (const CaseComparison& c : cmp.cases) {
    out += "\ncase " + c.case_name + "\n";
    if (!c.solved()) {
      const CaseOutcome& bad = c.before.result.summary.converged() ? c.after : c.before;
      out += std::string("  NOT SOLVED (") + (&bad == &c.before ? "before" : "after") +
             "): " + bad.result.summary.message + "\n";
      continue;
    }
    std::snprintf(line, sizeof line, "  solved before in %d and after in %d Newton iterations\n",
                  c.before.result.summary.iterations, c.after.result.summary.iterations);
    out += line;
    std::string criteria = criteria_line(net, c.after.criteria);
    if (!criteria.empty()) out += "  " + criteria;
    std::snprintf(line, sizeof line, "  %-14s %14s %14s %14s\n", "node",
                  ("before " + std::string(pres.name)).c_str(),
                  ("after " + std::string(pres.name)).c_str(),
                  ("change " + std::string(pres.name)).c_str());
    out += line;
    for (std::size_t i = 0; i < c.nodes.size() && i < max_rows; ++i) {
      const NodeChange& n = c.nodes[i];
      const double delta = n.after_pressure_pa - n.before_pressure_pa;
      std::snprintf(line, sizeof line, "  %-14s %14s %14s %14s\n", n.id.c_str(),
                    pressure_cell(n.before_pressure_pa, pres).c_str(),
                    pressure_cell(n.after_pressure_pa, pres).c_str(),
                    std::isnan(delta) ? "-" : pressure_cell(delta, pres).c_str());
      out += line;
    }
    if (c.nodes.size() > max_rows) {
      out += "  ... " + std::to_string(c.nodes.size() - max_rows) + " more nodes (see --json)\n";
    }
    out += "  fixed          " + id_list(c.fixed) + "\n";
    out += "  still failing  " + id_list(c.still_failing) + "\n";
    out += "  newly failing  " + id_list(c.newly_failing) + "\n";
  }
  out += "\nnew or resized pipe\n";
  double total = 0.0, cost = 0.0;
  int unpriced = 0;
  for (const LengthByDiameter& d : cmp.new_or_resized) {
    std::snprintf(line, sizeof line, "  D %7.1f %-3s %10.1f %-3s (%d pipes)", d.diameter_m * dia.per_si,
                  dia.name, d.length_m * len.per_si, len.name, d.pipes);
    out += line;
    if (d.cost) {
      std::snprintf(line, sizeof line, "  cost %.0f", *d.cost);
      out += line;
      cost += *d.cost;
    } else if (cmp.priced) {
      out += "  no catalogue item of this diameter";
      unpriced += d.pipes;
    }
    out += "\n";
    total += d.length_m;
  }
  std::snprintf(line, sizeof line, "  total       %10.1f %s\n", total * len.per_si, len.name);
  out += line;
  if (!cmp.priced) {
    out += "  cost: not computed (give --catalogue)\n\n";
  } else {
    std::snprintf(line, sizeof line, "  cost        %.0f%s\n\n", cost,
                  unpriced ? " (some pipes unpriced)" : "");
    out += line;
  }
  out += kCaution;
  return out;
}

void write_compare_json(const Comparison& cmp, JsonStream* j) {
  j->begin_object();
  j->key("cases");
  j->begin_object();
  for (const CaseComparison& c : cmp.cases) {
    j->key(c.case_name);
    j->begin_object();
    j->field("solved", c.solved());
    j->key("nodes");
    j->begin_array();
    for (const NodeChange& n : c.nodes) {
      j->begin_object();
      j->field("id", n.id);
      j->field("before_pressure_kPa", n.before_pressure_pa * 1e-3);
      j->field("after_pressure_kPa", n.after_pressure_pa * 1e-3);
      j->field("delta_kPa", (n.after_pressure_pa - n.before_pressure_pa) * 1e-3);
      j->field("before_pressure_m", n.before_pressure_m);
      j->field("after_pressure_m", n.after_pressure_m);
      j->end_object();
    }
    j->end_array();
    for (const auto& [key, ids] : {std::pair{"fixed", &c.fixed},
                                   std::pair{"still_failing", &c.still_failing},
                                   std::pair{"newly_failing", &c.newly_failing}}) {
      j->key(key);
      j->begin_array();
      for (const std::string& id : *ids) j->value(id);
      j->end_array();
    }
    j->end_object();
  }
  j->end_object();
  j->key("new_or_resized_pipes");
  j->begin_array();
  for (const LengthByDiameter& d : cmp.new_or_resized) {
    j->begin_object();
    j->field("diameter_m", d.diameter_m);
    j->field("length_m", d.length_m);
    j->field("pipes", d.pipes);
    j->key("cost");
    if (d.cost) j->value(*d.cost); else j->null();
    j->end_object();
  }
  j->end_array();
  j->end_object();
}

}  // namespace gradeline
