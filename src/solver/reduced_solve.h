// The solve of a network through its topological reduction (solver/reduction.h): dead-end
// branches and series chains are taken out, the gradient method runs on the looped core with
// the chains as single links, and the eliminated flows and heads are recovered exactly.
//
// Per solve, with d the demands (m^3/s):
//   branches  Q_link = d_leaf + (what the leaf passes on), summed leaves first; the parent
//             takes the whole branch's demand;
//   chains    S_i = interior demand before pipe i (with the branches hanging there), and the
//             chain's end node takes the chain's whole interior demand;
//   recovery  interior heads walk down each chain from its start, branch heads outward from
//             the core, H_next = H - h(Q) along the flow.
// The result covers every node and link of the network as given, with continuity and energy
// residuals recomputed on the full network, so a reduced solve reports and is checked exactly
// like an unreduced one.
#pragma once

#include <optional>
#include <vector>

#include "gradeline/solver.h"
#include "hydraulics/chain_law.h"
#include "model/topology.h"
#include "solver/reduction.h"
#include "solver/solver_cache.h"

namespace gradeline {

// Eliminated nodes as a share of all nodes below which the reduction is not worth a copy.
inline constexpr double kMinReducedShare = 0.01;

// What the gradient method solves after the reduction: the core as a network of its own (the
// kept nodes and links, then one link per chain, a copy of the chain's first pipe between the
// chain's ends whose law the chain's replaces), the chain laws, and the demands gathered down
// the branches and chains.
struct CoreProblem {
  Network network;
  ChainLaws chains;
  std::vector<double> demand_m3s;   // per core node
  std::vector<double> carried_m3s;  // per node of the full network: own demand plus its branches
};

// Kept in SolverCache between solves of one network shape.
struct ReductionCache {
  Topology topology;          // link ends of the full network (no incidence lists)
  std::vector<char> eliminable;
  Reduction reduction;
  bool worthwhile = false;
  SolverCache core;           // the core network's own cache (plan, symbolic factorisation)
  CoreProblem problem;        // the last core problem, refreshed in place by the next solve
  bool matches(const Network& net, const std::vector<char>& eliminable_now) const;
};

CoreProblem make_core_problem(const Network& network, const Reduction& reduction,
                              const SolveOptions& options, const std::vector<double>& demand_m3s);
// The same written over `problem`, reusing its storage when it holds a problem of this shape.
void make_core_problem(const Network& network, const Reduction& reduction,
                       const SolveOptions& options, const std::vector<double>& demand_m3s,
                       CoreProblem* problem);

// The solve through the reduction, or nullopt when the reduction would remove too little.
std::optional<SolveResult> solve_reduced(const Network& network, const SolveOptions& options,
                                         const std::vector<double>& demand_m3s,
                                         SolverCache* cache,
                                         const std::vector<double>* initial_flows);

}  // namespace gradeline
