// Demand cases: the demand of every node in a named case.
//   q_n = factor_c(category of n) * base_n + sum of the case's draws at n,
// where factor_c is the case's factor for that category when it gives one, else its factor.
// With no case defined, the base demands form one case named "base".
#pragma once

#include <string>
#include <vector>

#include "gradeline/network.h"

namespace gradeline {

inline constexpr const char* kBaseCaseName = "base";

// The cases to solve: those of the network, or the single base case.
std::vector<DemandCase> cases_of(const Network& network);

std::vector<double> case_demands(const Network& network, const DemandCase& demand_case);

// The criteria in force for a case: the network-wide ones, overridden field by field.
Criteria criteria_for(const Network& network, const std::string& case_name);

}  // namespace gradeline
