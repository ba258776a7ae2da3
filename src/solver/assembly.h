// Assembly of the global-gradient (Schur complement) matrix
//     A = B^T G^-1 B    over the free (junction) nodes,
// where B is the link-node incidence matrix (+1 at a link's `from` node, -1 at its `to` node)
// and G = diag(dh/dQ). Link k adds its conductance c_k = 1/G_k to the diagonal at both ends and
// -c_k off the diagonal. A unit diagonal stands in for each unsupplied node, whose head is not
// defined, so the matrix stays positive definite without changing its pattern.
//
// The pattern holds every link, closed or open, so it never changes during a solve: a link
// that closes only gets c_k = 0. The plan maps each link straight to its slots in the value
// array, so numeric assembly is one pass over the links with no search and no allocation.
#pragma once

#include <cstddef>
#include <vector>

#include "gradeline/network.h"
#include "model/topology.h"
#include "solver/sparse_cholesky.h"

namespace gradeline {

inline constexpr int kNoSlot = -1;

struct AssemblyPlan {
  int unknowns = 0;                 // number of junctions
  std::vector<int> unknown_of_node; // -1 for fixed-head nodes
  std::vector<int> diagonal_slot;   // per unknown
  std::vector<int> from_slot;       // per link: diagonal slot of `from`, or kNoSlot if fixed
  std::vector<int> to_slot;
  std::vector<int> off_slot;        // per link: off-diagonal slot, kNoSlot unless both free
  SymmetricMatrix matrix;               // the pattern; values are overwritten by assemble_matrix
};

// The fill-reducing order of the junctions for the matrix's pattern: AMD (Amestoy, Davis &
// Duff 1996), whose permutation comes postordered by its assembly tree. order[k] is the
// junction (numbered in file order among the junctions) to eliminate k-th. Numbering the
// unknowns this way and factorising with the natural ordering gives AMD's fill, and every step
// of the factorisation and the solve then walks memory in order. Empty if AMD fails.
std::vector<int> junction_order(const Topology& topology);

// Both read the links' ends and the fixed-head flags from `topology` (build_topology or
// build_link_ends), which keeps them in flat arrays.
// Unknowns are the junctions in file order, or, when `order` is given (one entry per
// junction, as from junction_order), numbered so that junction order[k] is unknown k.
AssemblyPlan plan_assembly(const Topology& topology, const std::vector<int>& order = {});

// Writes the values of A into plan->matrix. `conductance` has one entry per link (0 for an
// inactive link); `unsupplied` one per node.
void assemble_matrix(const std::vector<double>& conductance, const std::vector<char>& unsupplied,
                     AssemblyPlan* plan);

}  // namespace gradeline
