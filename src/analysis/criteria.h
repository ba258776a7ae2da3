// Checking a solved case against design criteria: minimum and maximum pressure at every
// supplied junction and maximum velocity in every open pipe. An unsupplied junction with a
// demand fails any minimum-pressure criterion (its pressure is not defined).
#pragma once

#include <string>
#include <vector>

#include "gradeline/network.h"
#include "gradeline/solve_summary.h"

namespace gradeline {

enum class LimitKind { kMin, kMax };
enum class LimitQuantity { kPressure, kVelocity };

struct Violation {
  std::string case_name;
  std::size_t element = 0;  // node index for pressure, pipe index for velocity
  LimitQuantity quantity = LimitQuantity::kPressure;
  LimitKind kind = LimitKind::kMin;
  double value = 0.0;   // pressure head (m) or speed (m/s); NaN when the node is unsupplied
  double limit = 0.0;
  double margin = 0.0;  // negative: by how much the value fails the limit (m or m/s)
  bool unsupplied = false;
};

// The violations of one case, failing nodes first (unsupplied, then worst margin first), then
// pipes, worst first.
std::vector<Violation> find_violations(const Network& network, const std::string& case_name,
                                       const SolveResult& result, const Criteria& criteria);

bool has_criteria(const Criteria& c);

// True when node n fails the criteria in `result` (used by compare).
bool node_fails(const Network& network, std::size_t n, const SolveResult& result,
                const Criteria& criteria);

// True when find_violations would find any, found without listing or sorting them.
bool any_violation(const Network& network, const SolveResult& result, const Criteria& criteria);

}  // namespace gradeline
