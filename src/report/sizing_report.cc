#include "report/sizing_report.h"

#include <cmath>
#include <cstdio>

#include "io/network_writer.h"
#include "model/units.h"
#include "report/criteria_report.h"
#include "report/text_report.h"

namespace gradeline {

std::string sizing_text(const Network& net, const Catalogue& cat, const SizingResult& r) {
  const DisplayUnit len = display_length(net.units);
  const DisplayUnit dia = display_diameter(net.units);
  const DisplayUnit pres = display_pressure(net.units);
  const double pa_per_m = net.fluid.density_kgm3 * kGravity_ms2;
  std::string out;
  char line[320];
  std::snprintf(line, sizeof line, "gradeline size  %s\n",
                r.feasible ? "FEASIBLE design found" : "NO FEASIBLE DESIGN: best effort below");
  out += line;
  std::snprintf(line, sizeof line, "method      %s\nsearch      %lld hydraulic solves in %.2f s (this design first met after %lld)\n",
                r.method.c_str(), r.solves, r.seconds, r.solves_to_best);
  out += line;
  std::snprintf(line, sizeof line, "cost        %.0f for %zu changed pipes\n", r.cost, r.changes.size());
  out += line;
  for (const auto& [name, p] : r.min_pressure_m) {
    std::snprintf(line, sizeof line, "case        %-12s lowest pressure %.1f %s (%.2f %s head)\n",
                  name.c_str(), p * pa_per_m * pres.per_si, pres.name, p * len.per_si, len.name);
    out += line;
  }
  std::snprintf(line, sizeof line, "margin      worst pressure margin %.2f %s head\n",
                r.min_margin_m * len.per_si, len.name);
  out += line;
  if (!r.feasible) {
    out += "these nodes cannot be brought to the criteria by the allowed pipes:\n";
    out += violations_text(net, r.remaining, 30);
  }
  out += "\nchanges\n";
  std::snprintf(line, sizeof line, "  %-10s %10s %10s %-8s %10s %12s  %s\n", "pipe",
                ("from " + std::string(dia.name)).c_str(), ("to " + std::string(dia.name)).c_str(),
                "item", ("length " + std::string(len.name)).c_str(), "cost",
                "one size smaller would");
  out += line;
  for (const PipeChange& c : r.changes) {
    const Pipe& p = net.pipes[c.pipe];
    const CatalogueItem& item = cat.items[c.item];
    std::string from = c.from_diameter_m ? std::to_string(*c.from_diameter_m * dia.per_si) : "new";
    if (c.from_diameter_m) {
      char f[32];
      std::snprintf(f, sizeof f, "%.1f", *c.from_diameter_m * dia.per_si);
      from = f;
    }
    std::string bought = "- (smallest size)";
    if (c.smaller_item) {
      char b[160];
      if (std::isfinite(c.margin_if_smaller_m)) {
        const double lost_kpa = (r.min_margin_m - c.margin_if_smaller_m) * pa_per_m * 1e-3;
        std::snprintf(b, sizeof b, "save %.0f, margin %.2f %s (%.1f per kPa)", c.saving_if_smaller,
                      c.margin_if_smaller_m * len.per_si, len.name,
                      lost_kpa > 0 ? c.saving_if_smaller / lost_kpa : 0.0);
      } else {
        std::snprintf(b, sizeof b, "save %.0f, but not solve", c.saving_if_smaller);
      }
      bought = b;
    }
    std::snprintf(line, sizeof line, "  %-10s %10s %10.1f %-8s %10.1f %12.0f  %s\n", p.id.c_str(),
                  from.c_str(), item.diameter_m * dia.per_si, item.id.c_str(), p.length_m * len.per_si,
                  c.cost, bought.c_str());
    out += line;
  }
  out += "\n";
  out += kCaution;
  return out;
}

void write_sizing_json(const Network& net, const Catalogue& cat, const SizingResult& r,
                       JsonStream* j) {
  j->begin_object();
  j->field("feasible", r.feasible);
  j->field("cost", r.cost);
  j->field("method", r.method);
  j->key("changes");
  j->begin_array();
  for (const PipeChange& c : r.changes) {
    j->begin_object();
    j->field("id", net.pipes[c.pipe].id);
    j->key("from_diameter_m");
    if (c.from_diameter_m) j->value(*c.from_diameter_m); else j->null();
    j->field("to_diameter_m", cat.items[c.item].diameter_m);
    j->field("item", cat.items[c.item].id);
    j->field("length_m", net.pipes[c.pipe].length_m);
    j->field("cost", c.cost);
    j->field("saving_if_one_size_smaller", c.saving_if_smaller);
    j->field("margin_if_one_size_smaller_m", c.margin_if_smaller_m);
    j->end_object();
  }
  j->end_array();
  j->key("min_pressure_m");
  j->begin_object();
  for (const auto& [name, p] : r.min_pressure_m) j->field(name, p);
  j->end_object();
  j->field("min_margin_m", r.min_margin_m);
  write_violations_json(net, r.remaining, j);
  j->field("solves", r.solves);
  j->field("solves_to_best", r.solves_to_best);
  j->field("seconds", r.seconds);
  j->end_object();
}

std::string sizing_change_set(const Network& net, const Catalogue& cat, const SizingResult& r,
                              const std::string& title) {
  std::string out = "# change set written by gradeline size\n";
  if (!r.feasible) out += "# BEST EFFORT ONLY: this design does NOT meet the criteria\n";
  out += "title " + title + "\n";
  char line[160];
  std::snprintf(line, sizeof line, "# total cost %.0f, %zu pipes\n", r.cost, r.changes.size());
  out += line;
  for (const PipeChange& c : r.changes) {
    const CatalogueItem& item = cat.items[c.item];
    out += "modify pipe " + net.pipes[c.pipe].id + " diameter=" + exact_number(item.diameter_m) + "m";
    if (item.roughness_m) out += " roughness=" + exact_number(*item.roughness_m) + "m";
    if (item.cfactor) out += " cfactor=" + exact_number(*item.cfactor);
    out += "    # " + item.id + "\n";
  }
  return out;
}

}  // namespace gradeline
