// What a solve can keep for the next solve of a network with the same topology (the same
// nodes, fixed-head nodes and pipe endpoints): the incidence, the assembly plan and the
// symbolic factorisation. Diameters, roughness, statuses and demands may all change.
#pragma once

#include <memory>
#include <vector>

#include "gradeline/network.h"
#include "model/topology.h"
#include "solver/assembly.h"
#include "solver/sparse_cholesky.h"

namespace gradeline {

struct SolverCache {
  Topology topology;
  AssemblyPlan plan;
  std::unique_ptr<SparseCholesky> cholesky;
  bool analysed = false;
  int analyses = 0;
  std::vector<std::size_t> signature;  // node count, fixed-head flags, pipe endpoints

  static std::vector<std::size_t> signature_of(const Network& net) {
    std::vector<std::size_t> s;
    s.reserve(2 + net.nodes.size() + 2 * net.pipes.size());
    s.push_back(net.nodes.size());
    s.push_back(net.pipes.size());
    for (const Node& n : net.nodes) s.push_back(n.is_fixed_head());
    for (const Pipe& p : net.pipes) {
      s.push_back(p.from);
      s.push_back(p.to);
    }
    return s;
  }
  bool matches(const Network& net) const { return cholesky && signature == signature_of(net); }
  void remember(const Network& net) { signature = signature_of(net); }
};

}  // namespace gradeline
