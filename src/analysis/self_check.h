// The self-check of a result before it is printed or written: continuity at every supplied
// junction and energy on every open pipe are recomputed from the reported flows and heads alone
// (not from the Newton solver's internal state), every reported number must be finite, and no
// closed check valve may have a head across it that favours forward flow. A result that fails
// is refused (exit code 3) with the element that fails named.
#pragma once

#include <string>
#include <vector>

#include "gradeline/network.h"
#include "gradeline/solve_options.h"
#include "gradeline/solve_summary.h"

namespace gradeline {

// How far above the solver's own tolerances the recomputed residuals may lie (round-off in
// re-evaluating the laws from rounded-trip values).
inline constexpr double kSelfCheckSlack = 10.0;

struct SelfCheck {
  bool ok = true;
  std::string failure;  // which element fails, and by how much
};

SelfCheck check_result(const Network& network, const std::vector<double>& demand_m3s,
                       const SolveResult& result, const SolveOptions& options);

}  // namespace gradeline
