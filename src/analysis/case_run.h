// Solving the demand cases of a network and checking each against its criteria.
#pragma once

#include <string>
#include <vector>

#include "analysis/criteria.h"
#include "gradeline/solver.h"

namespace gradeline {

struct CaseOutcome {
  DemandCase demand_case;
  Criteria criteria;
  SolveResult result;
  std::vector<Violation> violations;  // empty unless the case converged
};

// Criteria given on the command line; a field set here overrides the file for every case.
using CriteriaOverride = Criteria;

// `selection` is a case name, "all", or empty (the first case, or "base" when there are none).
// False with a message when a named case does not exist.
bool select_cases(const Network& network, const std::string& selection,
                  std::vector<DemandCase>* cases, std::string* error);

// With a session, the symbolic analysis of earlier solves of the same topology is reused, and
// `initial_flows_m3s` (when given) warm-starts the Newton iterations. Without
// `list_violations` the violations are left empty (a caller that judges the result itself,
// as sizing does for each trial design, need not have them sorted and listed).
CaseOutcome run_case(const Network& network, const DemandCase& demand_case,
                     const SolveOptions& options, const CriteriaOverride& override_criteria,
                     SolverSession* session = nullptr,
                     const std::vector<double>* initial_flows_m3s = nullptr,
                     bool list_violations = true);

}  // namespace gradeline
