// The law of a series chain of pipes with demands taken off between them, as one link.
//
// A chain from node A to node B carries Q (m^3/s) out of A; pipe i of the chain carries
// Q - S_i along the chain, where S_i is the demand of the chain's interior nodes before pipe i
// (S_0 = 0). With h_i the law of pipe i (link_law.h),
//     h(Q)  = sum_i h_i(Q - S_i)          [m]
//     dh/dQ = sum_i h_i'(Q - S_i)         [s/m^2],  > 0 because every h_i' > 0.
// h is not odd in Q when S_i != 0, which the gradient method does not need: it needs h
// continuous and strictly increasing, which it is. Each pipe's law is odd, so a pipe that
// points against the chain contributes the same h_i(Q - S_i) to the chain's drop.
// Valid wherever the pipe laws are (Darcy-Weisbach over every regime, Hazen-Williams).
// Reference: Giustolisi, Laucelli, Berardi & Savic (2012), J. Hydraul. Eng. 138(4) (details from
// memory; see docs/solver.md).
#pragma once

#include <cstdint>
#include <vector>

#include "hydraulics/link_law.h"

namespace gradeline {

struct ChainLaws {
  // Chain c's pipes are entries start[c] .. start[c + 1] - 1 of the per-pipe arrays.
  std::vector<std::uint32_t> start{0};
  std::vector<PipeLaw> law;
  std::vector<double> offset_m3s;   // S_i
  std::vector<signed char> sign;    // +1 where the pipe points along the chain
  std::vector<double> colebrook_x;  // per pipe: warm start of its Colebrook root (see friction.h)

  std::size_t size() const { return start.size() - 1; }
  // h and dh/dQ of chain c at chain flow Q. Only chain c's warm starts are touched, so
  // different chains may be evaluated on different threads.
  LinkEval evaluate(std::size_t c, double flow_m3s);
  // A cold-start chain flow: the Q whose pipe flows Q - S_i come closest, in least squares
  // weighted by each pipe's resistance scale L/D^5, to the velocity v in each pipe's own
  // direction (the cold start of an unreduced solve). The weights keep a narrow, long pipe,
  // whose flow the loss law pins hardest, near its own start.
  double cold_start_flow(std::size_t c, double velocity_ms) const;
};

}  // namespace gradeline
