// gradeline public API: options of a steady-state solve.
#pragma once

#include <string>

namespace gradeline {

struct SolveOptions {
  int max_iterations = 50;
  // Convergence is judged on the residuals themselves: every link's energy residual
  // |h(Q) - (H_from - H_to)| and every node's continuity residual |inflow - outflow - demand|.
  // The continuity tolerance (0.01 mL/s) sits above the round-off floor of large models: a
  // head is known to about 1e-14 m, and times the conductance of a short, nearly idle main
  // (up to 1e5 m2/s) that already makes 1e-9 m3/s, so a tighter default only adds iterations
  // that chase round-off on 10^5-10^6-pipe networks.
  double energy_tolerance_m = 1e-8;
  double continuity_tolerance_m3s = 1e-8;
  // Newton steps that raise the residual are halved, at most this many times per iteration.
  int max_step_halvings = 8;
  // Hazen-Williams regularisation: below this flow the |Q|^n law is smoothed (see link_law.h).
  double hw_regularisation_flow_m3s = 1e-8;
  // Eliminate dead-end branches and series chains of plain pipes before the Newton iterations
  // and recover them exactly afterwards (see docs/solver.md). Applied to networks of at least
  // reduction_min_nodes nodes when it removes at least 1% of them: below that a solve takes
  // well under a millisecond either way, and in sizing, which repeats it 10^4-10^5 times, the
  // bookkeeping cost more than it saved (two-loop benchmark, 7 nodes: 1.65 s -> 2.11 s).
  bool topological_reduction = true;
  int reduction_min_nodes = 1000;
  // Time each stage of the Newton iterations into SolveSummary::timing (topology, symbolic,
  // factor, solve, assembly); left at zero otherwise. The total is always timed. Reading the
  // clock costs about 20 ns, some forty times per solve, which sizing's 10^5 small solves notice.
  bool stage_timing = false;

  // Returns an empty string when the options are usable, or the reason they are not.
  std::string validate() const;
};

}  // namespace gradeline
