// gradeline public API: the steady-state solve of a network.
#pragma once

#include <vector>

#include "gradeline/network.h"
#include "gradeline/solve_options.h"
#include "gradeline/solve_summary.h"

namespace gradeline {

// Solves the node-continuity and link-energy equations of `network` with the global gradient
// method (Todini & Pilati, 1988). Never throws for hydraulic reasons: a failure is reported in
// SolveResult::summary.
SolveResult solve(const Network& network, const SolveOptions& options = {});

// The same with the demand of every node given (m^3/s, one entry per node; entries of fixed-head
// nodes are ignored), for demand cases.
SolveResult solve(const Network& network, const SolveOptions& options,
                  const std::vector<double>& demand_m3s);

}  // namespace gradeline
