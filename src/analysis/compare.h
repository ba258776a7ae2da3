// Before and after: the same demand cases solved on a network and on that network with change
// sets applied. For each case: the change of pressure at every junction both networks share,
// the junctions the changes fixed, those still failing and those newly failing the criteria;
// and, over all, the length of new or resized pipe by diameter.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "analysis/case_run.h"

namespace gradeline {

struct NodeChange {
  std::string id;
  double before_pressure_m = 0.0;  // NaN when unsupplied
  double after_pressure_m = 0.0;
  double before_pressure_pa = 0.0;
  double after_pressure_pa = 0.0;
  double delta_m() const { return after_pressure_m - before_pressure_m; }
};

struct CaseComparison {
  std::string case_name;
  CaseOutcome before;
  CaseOutcome after;
  std::vector<NodeChange> nodes;  // largest |change| first; unsupplied on either side last
  std::vector<std::string> fixed, still_failing, newly_failing;

  bool solved() const { return before.result.summary.converged() && after.result.summary.converged(); }
};

struct LengthByDiameter {
  double diameter_m = 0.0;
  double length_m = 0.0;
  int pipes = 0;
  std::optional<double> cost;  // from a catalogue item of this diameter, when one is given
};

struct Comparison {
  std::vector<CaseComparison> cases;
  std::vector<LengthByDiameter> new_or_resized;  // by diameter, smallest first
  bool priced = false;  // a catalogue was given
};

struct Catalogue;
// Prices the new or resized pipe from the catalogue item of the same diameter (cost per metre
// times length, plus mobilisation per pipe).
void price_changes(const Catalogue& catalogue, Comparison* comparison);

// `case_names` are looked up in each network.
Comparison compare_networks(const Network& before, const Network& after,
                            const std::vector<std::string>& case_names,
                            const SolveOptions& options, const CriteriaOverride& override_criteria);

}  // namespace gradeline
