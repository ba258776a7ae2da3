#include "solver/reduction.h"

namespace gradeline {
namespace {

enum : char { kCore = 0, kLeaf = 1, kInterior = 2 };

// Per node: how many live links meet it, how many of those are eliminable, and the XOR of
// their indices. A node with one live link finds it as `xor_links` without a scan of its
// incidence, and one with two finds the other as `xor_links ^ came_by`. The three live side by
// side (one record per node), since every step of the counting and peeling touches all three
// of a node reached at random.
struct LiveNode {
  std::int32_t degree = 0;
  std::int32_t eliminable_degree = 0;
  std::uint32_t xor_links = 0;
};

struct LiveLinks {
  std::vector<LiveNode> node;

  void remove(std::uint32_t n, std::uint32_t link) {
    LiveNode& v = node[n];
    --v.degree;
    --v.eliminable_degree;
    v.xor_links ^= link;
  }
};

LiveLinks count_links(const Topology& t, const std::vector<char>& eliminable) {
  LiveLinks live{std::vector<LiveNode>(t.fixed_head.size())};
  for (std::uint32_t k = 0; k < t.from.size(); ++k) {
    for (std::uint32_t n : {t.from[k], t.to[k]}) {
      LiveNode& v = live.node[n];
      ++v.degree;
      v.eliminable_degree += eliminable[k];
      v.xor_links ^= k;
    }
  }
  return live;
}

std::uint32_t other_end(const Topology& t, std::uint32_t k, std::uint32_t node) {
  return t.from[k] == node ? t.to[k] : t.from[k];
}

// Peels dead-end branches: a junction with one live link, that link eliminable, goes; leaves
// are taken last found, first peeled.
void peel_trees(const Topology& t, const std::vector<char>& eliminable, LiveLinks* live,
                std::vector<char>* link_live, std::vector<char>* role, Reduction* r) {
  const std::size_t nodes = t.fixed_head.size();
  std::vector<std::uint32_t> stack;
  for (std::size_t n = 0; n < nodes; ++n) {
    if (!t.fixed_head[n] && live->node[n].degree == 1) stack.push_back(static_cast<std::uint32_t>(n));
  }
  while (!stack.empty()) {
    const std::uint32_t leaf = stack.back();
    stack.pop_back();
    if (live->node[leaf].degree != 1 || (*role)[leaf] != kCore) continue;
    const std::uint32_t link = live->node[leaf].xor_links;
    if (!eliminable[link]) continue;
    const std::uint32_t parent = other_end(t, link, leaf);
    (*link_live)[link] = 0;
    (*role)[leaf] = kLeaf;
    live->remove(leaf, link);
    live->remove(parent, link);
    r->tree_link.push_back(link);
    r->tree_leaf.push_back(leaf);
    r->tree_parent.push_back(parent);
    if (live->node[parent].degree == 1 && !t.fixed_head[parent]) stack.push_back(parent);
  }
}

// Collapses series chains. A chain is walked from its end that is not interior, link by
// link, until it reaches another such node; a walk that comes back to its start (a ring) is
// kept as it is, and so are rings of interior nodes only, which no walk reaches.
void collapse_chains(const Topology& t, const std::vector<char>& eliminable,
                     const std::vector<char>& link_live, const LiveLinks& live,
                     const std::vector<char>& interior, std::vector<char>* role,
                     std::vector<char>* in_chain, Reduction* r) {
  std::vector<char> walked(t.from.size(), 0);
  std::vector<std::uint32_t> links, ends;
  for (std::uint32_t first = 0; first < t.from.size(); ++first) {
    if (!link_live[first] || !eliminable[first] || walked[first]) continue;
    std::uint32_t a = t.from[first];
    if (interior[a]) a = t.to[first];
    if (interior[a] || !interior[other_end(t, first, a)]) continue;  // mid-chain, or one link
    links.clear();
    ends.clear();
    std::uint32_t at = a, k = first;
    while (true) {
      walked[k] = 1;
      links.push_back(k);
      at = other_end(t, k, at);
      ends.push_back(at);
      if (!interior[at]) break;
      k = live.node[at].xor_links ^ k;
    }
    if (at == a) continue;  // a ring hanging from one node: kept
    const std::uint32_t c_start = static_cast<std::uint32_t>(r->member_link.size());
    std::uint32_t prev = a;
    for (std::size_t i = 0; i < links.size(); ++i) {
      r->member_link.push_back(links[i]);
      r->member_end.push_back(ends[i]);
      r->member_sign.push_back(t.from[links[i]] == prev ? 1 : -1);
      (*in_chain)[links[i]] = 1;
      if (i + 1 < links.size()) (*role)[ends[i]] = kInterior;
      prev = ends[i];
    }
    r->chain_from.push_back(a);
    r->chain_to.push_back(at);
    r->chain_start.push_back(c_start + static_cast<std::uint32_t>(links.size()));
  }
}

}  // namespace

std::vector<char> eliminable_links(const Network& net) {
  // The tank flags first, in one pass over the nodes, so the pass over the links reads a
  // byte per end instead of a whole node.
  // Each slot is written once, so large networks fill them on every core.
  const std::ptrdiff_t nodes = static_cast<std::ptrdiff_t>(net.nodes.size());
  const std::ptrdiff_t links = static_cast<std::ptrdiff_t>(net.pipes.size());
  std::vector<char> tank(net.nodes.size());
#pragma omp parallel for schedule(static) if (nodes >= kParallelElements)
  for (std::ptrdiff_t n = 0; n < nodes; ++n) tank[n] = net.nodes[n].kind == NodeKind::kTank;
  std::vector<char> out(net.pipes.size(), 0);
#pragma omp parallel for schedule(static) if (links >= kParallelElements)
  for (std::ptrdiff_t k = 0; k < links; ++k) {
    const Pipe& p = net.pipes[k];
    out[k] = p.kind == LinkKind::kPipe && p.status == LinkStatus::kOpen && !p.check_valve &&
             p.from != p.to && !tank[p.from] && !tank[p.to];
  }
  return out;
}

Reduction reduce_topology(const Network& net, const Topology& t,
                          const std::vector<char>& eliminable) {
  Reduction r;
  const std::size_t nodes = net.nodes.size();
  const std::size_t links = net.pipes.size();
  LiveLinks live = count_links(t, eliminable);
  std::vector<char> link_live(links, 1), role(nodes, kCore), in_chain(links, 0);
  peel_trees(t, eliminable, &live, &link_live, &role, &r);

  // Interior: a core junction whose only two live links are both eliminable.
  std::vector<char> interior(nodes, 0);
  for (std::size_t n = 0; n < nodes; ++n) {
    interior[n] = role[n] == kCore && !t.fixed_head[n] && live.node[n].degree == 2 &&
                  live.node[n].eliminable_degree == 2;
  }
  collapse_chains(t, eliminable, link_live, live, interior, &role, &in_chain, &r);

  r.core_of_node.assign(nodes, kEliminated);
  for (std::size_t n = 0; n < nodes; ++n) {
    if (role[n] != kCore) continue;
    r.core_of_node[n] = static_cast<std::int32_t>(r.core_nodes.size());
    r.core_nodes.push_back(static_cast<std::uint32_t>(n));
  }
  for (std::size_t k = 0; k < links; ++k) {
    if (link_live[k] && !in_chain[k]) r.kept_links.push_back(static_cast<std::uint32_t>(k));
  }
  return r;
}

}  // namespace gradeline
