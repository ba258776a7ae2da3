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

struct ReductionCache;  // solver/reduced_solve.h

struct SolverCache {
  Topology topology;
  AssemblyPlan plan;
  std::unique_ptr<SparseCholesky> cholesky;
  bool analysed = false;
  int analyses = 0;
  // The topological reduction of the last network, and the cache of its core.
  std::shared_ptr<ReductionCache> reduction;
  // What the topology depends on: node count, fixed-head flags and pipe endpoints.
  std::vector<std::size_t> signature;
  static void signature_of(const Network& net, std::vector<std::size_t>* s) {
    s->clear();
    s->reserve(2 + net.nodes.size() + 2 * net.pipes.size());
    s->push_back(net.nodes.size());
    s->push_back(net.pipes.size());
    for (const Node& n : net.nodes) s->push_back(n.is_fixed_head());
    for (const Pipe& p : net.pipes) {
      s->push_back(p.from);
      s->push_back(p.to);
    }
  }
  // Compared in place, without building the new network's signature.
  bool matches(const Network& net) const {
    if (!cholesky || signature.size() != 2 + net.nodes.size() + 2 * net.pipes.size() ||
        signature[0] != net.nodes.size() || signature[1] != net.pipes.size()) {
      return false;
    }
    std::size_t i = 2;
    for (const Node& n : net.nodes) {
      if (signature[i++] != static_cast<std::size_t>(n.is_fixed_head())) return false;
    }
    for (const Pipe& p : net.pipes) {
      if (signature[i++] != p.from || signature[i++] != p.to) return false;
    }
    return true;
  }
  void remember(const Network& net) { signature_of(net, &signature); }
};

}  // namespace gradeline
