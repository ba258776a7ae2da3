#include "analysis/case_run.h"

#include "analysis/self_check.h"
#include "io/diagnostics.h"
#include "model/demand_cases.h"

namespace gradeline {

bool select_cases(const Network& net, const std::string& selection,
                  std::vector<DemandCase>* cases, std::string* error) {
  std::vector<DemandCase> all = cases_of(net);
  if (selection == "all") {
    *cases = all;
    return true;
  }
  if (selection.empty()) {
    *cases = {all.front()};
    return true;
  }
  std::vector<std::string> names;
  for (const DemandCase& c : all) {
    if (c.name == selection) {
      *cases = {c};
      return true;
    }
    names.push_back(c.name);
  }
  *error = "no case '" + selection + "' in the network";
  std::string near = nearest_word(selection, names);
  if (!near.empty()) *error += " (did you mean '" + near + "'?)";
  return false;
}

CaseOutcome run_case(const Network& net, const DemandCase& c, const SolveOptions& options,
                     const CriteriaOverride& o, SolverSession* session,
                     const std::vector<double>* initial_flows, bool list_violations) {
  CaseOutcome out;
  out.demand_case = c;
  out.criteria = criteria_for(net, c.name);
  if (o.min_pressure_m) out.criteria.min_pressure_m = o.min_pressure_m;
  if (o.max_pressure_m) out.criteria.max_pressure_m = o.max_pressure_m;
  if (o.max_velocity_ms) out.criteria.max_velocity_ms = o.max_velocity_ms;
  const std::vector<double> demand = case_demands(net, c);
  out.result = session ? session->solve(net, options, demand, initial_flows)
                       : solve(net, options, demand);
  if (out.result.summary.converged()) {
    SelfCheck check = check_result(net, demand, out.result, options);
    if (!check.ok) {
      // Never present a result that does not satisfy its own equations.
      out.result.summary.termination = Termination::kSelfCheckFailed;
      out.result.summary.message = "self-check failed: " + check.failure;
      return out;
    }
    if (list_violations) out.violations = find_violations(net, c.name, out.result, out.criteria);
  }
  return out;
}

}  // namespace gradeline
