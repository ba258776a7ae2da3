// Connectivity of a network: which links meet at each node, which nodes can reach a fixed
// head through open links, and the islands of the network.
#pragma once

#include <cstddef>
#include <cstdint>
#include <vector>

#include "gradeline/network.h"
#include "model/parallel.h"

namespace gradeline {

// Node-to-link incidence in compressed rows: the links at node n are
// links[offsets[n]] .. links[offsets[n + 1] - 1].
// Also each link's end nodes and each node's fixed-head flag, in flat arrays, for the loops of
// the solver that visit every link per iteration.
struct Topology {
  std::vector<std::size_t> offsets;
  std::vector<std::size_t> links;
  std::vector<std::uint32_t> from, to;  // per link
  std::vector<char> fixed_head;         // per node
};

Topology build_topology(const Network& network);
// Only the flat link ends and fixed-head flags (offsets and links left empty), for passes that
// need no incidence lists.
Topology build_link_ends(const Network& network);
// The incidence lists (offsets, links) of a topology whose link ends are filled: the links at
// each node in increasing order. build_topology is build_link_ends, then this.
void add_incidence(Topology* topology);

// supplied[n] is 1 when node n reaches a fixed-head node through links whose link_open is 1.
std::vector<char> find_supplied(const Network& network, const Topology& topology,
                                const std::vector<char>& link_open);

// Connected components through the links whose link_open is 1; island[n] numbers them from 0.
struct Islands {
  std::size_t count = 0;
  std::vector<std::size_t> island;
};

Islands find_islands(const Network& network, const Topology& topology,
                     const std::vector<char>& link_open);

// 1 for every link the file leaves open, 0 for closed ones.
std::vector<char> links_open_in_file(const Network& network);

}  // namespace gradeline
