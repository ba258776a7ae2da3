// The global gradient algorithm (Todini & Pilati, 1988, "A gradient algorithm for the analysis
// of pipe networks", in Computer Applications in Water Supply, vol. 1, Research Studies Press).
//
// Unknowns: link flows Q (m^3/s) and junction heads H (m). With B the link-node incidence over
// junctions, B0 H0 the fixed heads, h(Q) the link laws and G = diag(dh/dQ), Newton's method on
//     h(Q) - B H - B0 H0 = 0      (energy, one per link)
//     B^T Q + d = 0               (continuity, one per junction; d = demands)
// eliminates dQ and solves the symmetric positive definite Schur complement
//     (B^T G^-1 B) H' = -d - B^T Q + B^T G^-1 (h(Q) - B0 H0)
// for the new heads, then updates the flows
//     Q' = Q + G^-1 (B H' + B0 H0 - h(Q)).
// After the first step continuity holds to round-off along every later Newton direction, so a
// step that raises the energy residual norm is halved (a backtracking safeguard). Check valves
// close when their flow turns negative and reopen when the head across them favours forward
// flow; a solve is converged only when no status changed in its last iteration.
#pragma once

#include "gradeline/solver.h"

namespace gradeline {

inline constexpr double kInitialVelocity_ms = 0.3;  // cold-start flow in every open link

struct ChainLaws;

// The gradient method itself, on the network as given. When `chains` is not null, the last
// chains->size() links of `network` stand for series chains (solver/reduction.h) and obey the
// chain laws instead of their own.
SolveResult run_gradient_method(const Network& network, const SolveOptions& options,
                                const std::vector<double>& demand_m3s, SolverCache* cache,
                                const std::vector<double>* initial_flows, ChainLaws* chains);

}  // namespace gradeline
