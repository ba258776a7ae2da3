#include "solver/reduction.h"

namespace gradeline {
namespace {

constexpr std::uint32_t kNone = static_cast<std::uint32_t>(-1);

enum : char { kCore = 0, kLeaf = 1, kInterior = 2 };

std::uint32_t other_end(const Topology& t, std::uint32_t k, std::uint32_t node) {
  return t.from[k] == node ? t.to[k] : t.from[k];
}

// Peels dead-end branches: a junction with one live link, that link eliminable, goes.
void peel_trees(const Topology& t, const std::vector<char>& eliminable, std::vector<int>* degree,
                std::vector<char>* link_live, std::vector<char>* role, Reduction* r) {
  const std::size_t nodes = t.fixed_head.size();
  std::vector<std::uint32_t> stack;
  for (std::size_t n = 0; n < nodes; ++n) {
    if (!t.fixed_head[n] && (*degree)[n] == 1) stack.push_back(static_cast<std::uint32_t>(n));
  }
  while (!stack.empty()) {
    const std::uint32_t leaf = stack.back();
    stack.pop_back();
    if ((*degree)[leaf] != 1 || (*role)[leaf] != kCore) continue;
    std::uint32_t link = kNone;
    for (std::size_t e = t.offsets[leaf]; e < t.offsets[leaf + 1]; ++e) {
      if ((*link_live)[t.links[e]]) link = static_cast<std::uint32_t>(t.links[e]);
    }
    if (link == kNone || !eliminable[link]) continue;
    const std::uint32_t parent = other_end(t, link, leaf);
    (*link_live)[link] = 0;
    (*role)[leaf] = kLeaf;
    (*degree)[leaf] = 0;
    r->tree_link.push_back(link);
    r->tree_leaf.push_back(leaf);
    r->tree_parent.push_back(parent);
    if (--(*degree)[parent] == 1 && !t.fixed_head[parent]) stack.push_back(parent);
  }
}

// The other live link at an interior candidate, or kNone.
std::uint32_t next_link(const Topology& t, const std::vector<char>& link_live, std::uint32_t node,
                        std::uint32_t came_by) {
  for (std::size_t e = t.offsets[node]; e < t.offsets[node + 1]; ++e) {
    const std::uint32_t k = static_cast<std::uint32_t>(t.links[e]);
    if (link_live[k] && k != came_by) return k;
  }
  return kNone;
}

// Collapses series chains between branch nodes. `interior[n]`: n could be interior (a core
// junction with exactly two live links, both eliminable).
void collapse_chains(const Topology& t, const std::vector<char>& eliminable,
                     const std::vector<char>& link_live, const std::vector<char>& interior,
                     std::vector<char>* role, std::vector<char>* in_chain, Reduction* r) {
  const std::size_t nodes = t.fixed_head.size();
  std::vector<char> walked(t.from.size(), 0);
  std::vector<std::uint32_t> links, ends;
  for (std::uint32_t a = 0; a < nodes; ++a) {
    if ((*role)[a] != kCore || interior[a]) continue;
    for (std::size_t e = t.offsets[a]; e < t.offsets[a + 1]; ++e) {
      std::uint32_t k = static_cast<std::uint32_t>(t.links[e]);
      if (!link_live[k] || !eliminable[k] || walked[k]) continue;
      links.clear();
      ends.clear();
      std::uint32_t at = a;
      while (true) {
        walked[k] = 1;
        links.push_back(k);
        at = other_end(t, k, at);
        ends.push_back(at);
        if (!interior[at]) break;
        k = next_link(t, link_live, at, k);
      }
      if (links.size() < 2 || at == a) continue;  // a plain link, or a ring: kept
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
}

}  // namespace

std::vector<char> eliminable_links(const Network& net) {
  // The tank flags first, in one pass over the nodes, so the pass over the links reads a
  // byte per end instead of a whole node.
  std::vector<char> tank(net.nodes.size());
  for (std::size_t n = 0; n < net.nodes.size(); ++n) tank[n] = net.nodes[n].kind == NodeKind::kTank;
  std::vector<char> out(net.pipes.size(), 0);
  for (std::size_t k = 0; k < net.pipes.size(); ++k) {
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
  std::vector<int> degree(nodes);
  for (std::size_t n = 0; n < nodes; ++n) {
    degree[n] = static_cast<int>(t.offsets[n + 1] - t.offsets[n]);
  }
  std::vector<char> link_live(links, 1), role(nodes, kCore), in_chain(links, 0);
  peel_trees(t, eliminable, &degree, &link_live, &role, &r);

  std::vector<char> interior(nodes, 0);
  for (std::size_t n = 0; n < nodes; ++n) {
    if (role[n] != kCore || t.fixed_head[n] || degree[n] != 2) continue;
    int usable = 0;
    for (std::size_t e = t.offsets[n]; e < t.offsets[n + 1]; ++e) {
      const std::size_t k = t.links[e];
      usable += link_live[k] && eliminable[k];
    }
    interior[n] = usable == 2;
  }
  collapse_chains(t, eliminable, link_live, interior, &role, &in_chain, &r);

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
