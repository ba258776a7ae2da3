// Helpers shared by the tests: paths to committed data, reference tables, and invariants that
// every solved network must satisfy.
#pragma once

#include <string>
#include <vector>

#include "gradeline/network.h"
#include "gradeline/solve_summary.h"
#include "hydraulics/link_law.h"

namespace gradeline::testing {

std::string source_path(const std::string& relative);  // under the repository root

// Rows of a committed CSV table; lines starting with '#' and the header row are skipped.
std::vector<std::vector<double>> read_csv(const std::string& relative);

// Parses a network from tests/ or networks/; fails the test on any error.
Network load(const std::string& relative);
Network parse_or_fail(const std::string& text);

// The law of a 350 m pipe of diameter d_m (roughness 0.2 mm, C = 120, minor loss K) under
// `kind`, in water of 1.1e-6 m^2/s.
PipeLaw pipe_law(HeadlossLaw kind, double d_m, double minor = 0.0);

// The base demand of every node (m^3/s), as a demand vector for solve().
std::vector<double> base_demand(const Network& network);

// Largest |sum of signed head losses| around the fundamental cycles of the open links (m).
double max_loop_headloss_m(const Network& network, const SolveResult& result);

// Largest |inflow - outflow - demand| at a supplied junction, from the reported flows and the
// demands of that solve (m^3/s).
double max_continuity_m3s(const Network& network, const SolveResult& result);

struct CommandResult {
  int exit_code = -1;
  std::string out;
  std::string err;
};

// Runs build/gradeline with `arguments` (shell words) from the repository root.
CommandResult run_gradeline(const std::string& arguments);

std::string temp_dir();

}  // namespace gradeline::testing
