#include "model/topology.h"

namespace gradeline {

Topology build_topology(const Network& net) {
  Topology t = build_link_ends(net);
  add_incidence(&t);
  return t;
}

void add_incidence(Topology* t) {
  const std::size_t n = t->fixed_head.size();
  t->offsets.assign(n + 1, 0);
  for (std::size_t k = 0; k < t->from.size(); ++k) {
    ++t->offsets[t->from[k] + 1];
    ++t->offsets[t->to[k] + 1];
  }
  for (std::size_t i = 0; i < n; ++i) t->offsets[i + 1] += t->offsets[i];
  t->links.resize(t->offsets[n]);
  std::vector<std::size_t> next(t->offsets.begin(), t->offsets.end() - 1);
  for (std::size_t k = 0; k < t->from.size(); ++k) {
    t->links[next[t->from[k]]++] = k;
    t->links[next[t->to[k]]++] = k;
  }
}

Topology build_link_ends(const Network& net) {
  // Each slot is written once, so large networks fill them on every core.
  Topology t;
  const std::ptrdiff_t links = static_cast<std::ptrdiff_t>(net.pipes.size());
  const std::ptrdiff_t nodes = static_cast<std::ptrdiff_t>(net.nodes.size());
  t.from.resize(net.pipes.size());
  t.to.resize(net.pipes.size());
  t.fixed_head.resize(net.nodes.size());
#pragma omp parallel if (links >= kParallelElements)
  {
#pragma omp for schedule(static) nowait
    for (std::ptrdiff_t k = 0; k < links; ++k) {
      t.from[k] = static_cast<std::uint32_t>(net.pipes[k].from);
      t.to[k] = static_cast<std::uint32_t>(net.pipes[k].to);
    }
#pragma omp for schedule(static) nowait
    for (std::ptrdiff_t i = 0; i < nodes; ++i) t.fixed_head[i] = net.nodes[i].is_fixed_head();
  }
  return t;
}

namespace {

// Breadth-first labelling from the seeds in `queue`, marking reached nodes with `label`.
void flood(const Topology& t, const std::vector<char>& link_open, std::vector<std::size_t>& queue,
           std::vector<std::size_t>& mark, std::size_t label) {
  for (std::size_t head = 0; head < queue.size(); ++head) {
    const std::size_t node = queue[head];
    for (std::size_t e = t.offsets[node]; e < t.offsets[node + 1]; ++e) {
      const std::size_t k = t.links[e];
      if (!link_open[k]) continue;
      const std::size_t other = t.from[k] == node ? t.to[k] : t.from[k];
      if (mark[other] == static_cast<std::size_t>(-1)) {
        mark[other] = label;
        queue.push_back(other);
      }
    }
  }
}

}  // namespace

std::vector<char> find_supplied(const Network& net, const Topology& t,
                                const std::vector<char>& link_open) {
  const std::size_t none = static_cast<std::size_t>(-1);
  std::vector<std::size_t> mark(net.nodes.size(), none);
  std::vector<std::size_t> queue;
  queue.reserve(net.nodes.size());
  for (std::size_t i = 0; i < net.nodes.size(); ++i) {
    if (t.fixed_head[i]) {
      mark[i] = 0;
      queue.push_back(i);
    }
  }
  flood(t, link_open, queue, mark, 0);
  std::vector<char> supplied(net.nodes.size());
  for (std::size_t i = 0; i < mark.size(); ++i) supplied[i] = mark[i] != none;
  return supplied;
}

Islands find_islands(const Network& net, const Topology& t, const std::vector<char>& link_open) {
  const std::size_t none = static_cast<std::size_t>(-1);
  Islands out;
  out.island.assign(net.nodes.size(), none);
  std::vector<std::size_t> queue;
  for (std::size_t i = 0; i < net.nodes.size(); ++i) {
    if (out.island[i] != none) continue;
    out.island[i] = out.count;
    queue.assign(1, i);
    flood(t, link_open, queue, out.island, out.count);
    ++out.count;
  }
  return out;
}

std::vector<char> links_open_in_file(const Network& net) {
  std::vector<char> open(net.pipes.size());
  for_each_index(static_cast<std::ptrdiff_t>(net.pipes.size()),
                 [&](std::ptrdiff_t k) { open[k] = net.pipes[k].status == LinkStatus::kOpen; });
  return open;
}

}  // namespace gradeline
