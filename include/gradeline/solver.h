// gradeline public API: the steady-state solve of a network.
#pragma once

#include <memory>
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

struct SolverCache;

// Solves a sequence of networks that share one topology (demand cases, trial designs, change
// sets that only resize or close pipes): the incidence, the assembly plan and the symbolic
// factorisation are computed once and reused; a network of another topology is analysed afresh.
// The previous solution's flows may be given as a warm start.
class SolverSession {
 public:
  SolverSession();
  ~SolverSession();
  SolverSession(const SolverSession&) = delete;
  SolverSession& operator=(const SolverSession&) = delete;

  SolveResult solve(const Network& network, const SolveOptions& options,
                    const std::vector<double>& demand_m3s,
                    const std::vector<double>* initial_flows_m3s = nullptr);
  int symbolic_analyses() const;

 private:
  std::unique_ptr<SolverCache> cache_;
};

}  // namespace gradeline
