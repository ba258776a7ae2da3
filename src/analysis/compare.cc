#include "analysis/compare.h"

#include <algorithm>
#include <cmath>
#include <map>

#include "design/catalogue.h"
#include "model/demand_cases.h"

namespace gradeline {
namespace {

DemandCase case_named(const Network& net, const std::string& name) {
  for (const DemandCase& c : cases_of(net)) {
    if (c.name == name) return c;
  }
  DemandCase missing;
  missing.name = name;
  return missing;
}

CaseComparison compare_case(const Network& before, const Network& after, const std::string& name,
                            const SolveOptions& options, const CriteriaOverride& o,
                            SolverSession* before_session, SolverSession* after_session) {
  CaseComparison c;
  c.case_name = name;
  c.before = run_case(before, case_named(before, name), options, o, before_session);
  // The changed network starts from the flows before the changes when its links line up with
  // them (resized or closed pipes, changed settings); a warm start moves only where the Newton
  // iterations begin, not where they end.
  std::vector<double> start;
  if (c.before.result.summary.converged() && before.pipes.size() == after.pipes.size()) {
    for (const LinkState& l : c.before.result.links) start.push_back(l.flow_m3s);
  }
  c.after = run_case(after, case_named(after, name), options, o, after_session,
                     start.empty() ? nullptr : &start);
  if (!c.solved()) return c;
  const SolveResult& rb = c.before.result;
  const SolveResult& ra = c.after.result;
  for (std::size_t n = 0; n < before.nodes.size(); ++n) {
    const Node& node = before.nodes[n];
    if (node.is_fixed_head()) continue;
    auto m = after.find_node(node.id);
    if (!m) continue;
    NodeChange change;
    change.id = node.id;
    change.before_pressure_m = rb.nodes[n].pressure_m;
    change.after_pressure_m = ra.nodes[*m].pressure_m;
    change.before_pressure_pa = rb.nodes[n].pressure_pa;
    change.after_pressure_pa = ra.nodes[*m].pressure_pa;
    c.nodes.push_back(change);
    const bool failed = node_fails(before, n, rb, c.before.criteria);
    const bool fails = node_fails(after, *m, ra, c.after.criteria);
    if (failed && !fails) c.fixed.push_back(node.id);
    if (failed && fails) c.still_failing.push_back(node.id);
    if (!failed && fails) c.newly_failing.push_back(node.id);
  }
  for (std::size_t m = 0; m < after.nodes.size(); ++m) {  // junctions the changes added
    const Node& node = after.nodes[m];
    if (node.is_fixed_head() || before.find_node(node.id)) continue;
    if (node_fails(after, m, ra, c.after.criteria)) c.newly_failing.push_back(node.id);
  }
  std::stable_sort(c.nodes.begin(), c.nodes.end(), [](const NodeChange& a, const NodeChange& b) {
    const double da = std::abs(a.delta_m()), db = std::abs(b.delta_m());
    if (std::isnan(da) != std::isnan(db)) return std::isnan(db);
    return da > db;
  });
  return c;
}

}  // namespace

Comparison compare_networks(const Network& before, const Network& after,
                            const std::vector<std::string>& case_names,
                            const SolveOptions& options, const CriteriaOverride& o) {
  Comparison out;
  SolverSession before_session, after_session;  // one symbolic analysis per side
  for (const std::string& name : case_names) {
    out.cases.push_back(compare_case(before, after, name, options, o, &before_session, &after_session));
  }
  std::map<double, LengthByDiameter> by_diameter;
  for (const Pipe& p : after.pipes) {
    if (p.is_pump()) continue;
    auto old = before.find_pipe(p.id);
    if (old && before.pipes[*old].diameter_m == p.diameter_m) continue;
    LengthByDiameter& entry = by_diameter[p.diameter_m];
    entry.diameter_m = p.diameter_m;
    entry.length_m += p.length_m;
    ++entry.pipes;
  }
  for (const auto& [d, entry] : by_diameter) out.new_or_resized.push_back(entry);
  return out;
}

}  // namespace gradeline

namespace gradeline {

void price_changes(const Catalogue& catalogue, Comparison* cmp) {
  cmp->priced = true;
  for (LengthByDiameter& d : cmp->new_or_resized) {
    for (const CatalogueItem& item : catalogue.items) {
      if (std::abs(item.diameter_m - d.diameter_m) <= 1e-6) {
        d.cost = item.cost_per_m * d.length_m + catalogue.mobilisation_cost * d.pipes;
        break;
      }
    }
  }
}

}  // namespace gradeline
