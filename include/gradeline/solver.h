// gradeline public API: the steady-state solve of a network.
#pragma once

#include "gradeline/network.h"
#include "gradeline/solve_options.h"
#include "gradeline/solve_summary.h"

namespace gradeline {

// Solves the node-continuity and link-energy equations of `network` with the global gradient
// method (Todini & Pilati, 1988). Never throws for hydraulic reasons: a failure is reported in
// SolveResult::summary.
SolveResult solve(const Network& network, const SolveOptions& options = {});

}  // namespace gradeline
