// Topological reduction of a network before the gradient method, exact, in the manner of the
// enhanced global gradient algorithm (Giustolisi, Laucelli, Berardi & Savic 2012) and of
// forest-core partitioning (Simpson, Elhay & Alexander 2014); references in docs/solver.md.
//
// Dead-end trees. A junction met by one link only is a leaf: continuity alone fixes that link's
// flow (the leaf's demand, plus what the leaf passes on), so the leaf and its link leave the
// Newton system and its demand moves to the neighbour. Repeating this peels every dead-end
// branch down to the looped core ("forest" and "core"). After the core solve, the branch heads
// follow outward from the core:  H_leaf = H_parent - h(Q)  along the flow direction.
//
// Series chains. A core junction met by exactly two pipes is interior to a chain: the chain's
// pipes carry one flow Q less the demands taken off before each pipe, so the chain from node A
// to node B is one link with the law
//     H_A - H_B = sum_i h_i(Q - S_i),      dh/dQ = sum_i h_i'(Q - S_i) > 0,
// where S_i is the demand (m^3/s) of the interior nodes upstream of pipe i, and node B takes
// the chain's whole interior demand. The interior heads follow from A pipe by pipe.
//
// Only plain open pipes are eliminated: no pump, valve, check valve, closed pipe, self-loop or
// pipe at a tank takes part, so the status logic of the solver meets only the links it knows. A
// chain that returns to its own start (a ring hanging from one node) is left as it is.
// The reduction depends on the topology and on which links are eliminable, never on the
// demands, diameters or roughness, so it is computed once and reused across cases and designs.
#pragma once

#include <cstddef>
#include <cstdint>
#include <vector>

#include "gradeline/network.h"
#include "model/topology.h"

namespace gradeline {

inline constexpr std::int32_t kEliminated = -1;

struct Reduction {
  // Core nodes in file order and, per full node, its core index or kEliminated.
  std::vector<std::uint32_t> core_nodes;
  std::vector<std::int32_t> core_of_node;
  // Core links: first the kept full-network links in file order, then one per chain.
  std::vector<std::uint32_t> kept_links;
  // Chain c runs from full node chain_from[c] to chain_to[c] through the members
  // member_link[chain_start[c]] .. member_link[chain_start[c + 1] - 1], in order. A member's
  // sign is +1 when the pipe points along the chain; member_end[i] is the node at the
  // downstream end of member i (chain_to[c] for the last member).
  std::vector<std::uint32_t> chain_start{0};
  std::vector<std::uint32_t> chain_from, chain_to;
  std::vector<std::uint32_t> member_link, member_end;
  std::vector<signed char> member_sign;
  // Dead-end links in elimination order (leaves first): link, the leaf it was removed with, and
  // the neighbour the leaf hung from.
  std::vector<std::uint32_t> tree_link, tree_leaf, tree_parent;

  std::size_t chains() const { return chain_from.size(); }
  std::size_t eliminated_nodes() const { return core_of_node.size() - core_nodes.size(); }
};

// 1 for each link the reduction may eliminate: an open pipe (not a pump or valve) without a
// check valve, between two different nodes, neither of them a tank.
std::vector<char> eliminable_links(const Network& network);

// Reads only the link ends and fixed-head flags of `topology` (build_link_ends suffices).
Reduction reduce_topology(const Network& network, const Topology& topology,
                          const std::vector<char>& eliminable);

}  // namespace gradeline
