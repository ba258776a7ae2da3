#include "solver/assembly.h"

#include <algorithm>

namespace gradeline {
namespace {

// Index of entry (row, col) in the compressed value array; the entry must exist.
int slot_of(const SymmetricMatrix& m, int row, int col) {
  const int* begin = m.innerIndexPtr() + m.outerIndexPtr()[col];
  const int* end = m.innerIndexPtr() + m.outerIndexPtr()[col + 1];
  const int* it = std::lower_bound(begin, end, row);
  return static_cast<int>(it - m.innerIndexPtr());
}

}  // namespace

AssemblyPlan plan_assembly(const Network& net, const std::vector<int>& order) {
  AssemblyPlan plan;
  plan.unknown_of_node.assign(net.nodes.size(), -1);
  for (std::size_t i = 0; i < net.nodes.size(); ++i) {
    if (!net.nodes[i].is_fixed_head()) plan.unknown_of_node[i] = plan.unknowns++;
  }
  if (!order.empty()) {  // renumber: the junction eliminated k-th becomes unknown k
    std::vector<int> position(order.size());
    for (std::size_t k = 0; k < order.size(); ++k) position[order[k]] = static_cast<int>(k);
    for (int& u : plan.unknown_of_node) {
      if (u >= 0) u = position[u];
    }
  }
  std::vector<Eigen::Triplet<double, int>> entries;
  entries.reserve(plan.unknowns + net.pipes.size());
  for (int u = 0; u < plan.unknowns; ++u) entries.emplace_back(u, u, 0.0);
  for (const Pipe& p : net.pipes) {
    const int a = plan.unknown_of_node[p.from];
    const int b = plan.unknown_of_node[p.to];
    if (a >= 0 && b >= 0) entries.emplace_back(std::min(a, b), std::max(a, b), 0.0);
  }
  plan.matrix.resize(plan.unknowns, plan.unknowns);
  plan.matrix.setFromTriplets(entries.begin(), entries.end());
  plan.matrix.makeCompressed();

  plan.diagonal_slot.resize(plan.unknowns);
  for (int u = 0; u < plan.unknowns; ++u) plan.diagonal_slot[u] = slot_of(plan.matrix, u, u);
  const std::size_t links = net.pipes.size();
  plan.from_slot.assign(links, kNoSlot);
  plan.to_slot.assign(links, kNoSlot);
  plan.off_slot.assign(links, kNoSlot);
  for (std::size_t k = 0; k < links; ++k) {
    const int a = plan.unknown_of_node[net.pipes[k].from];
    const int b = plan.unknown_of_node[net.pipes[k].to];
    if (a >= 0) plan.from_slot[k] = plan.diagonal_slot[a];
    if (b >= 0) plan.to_slot[k] = plan.diagonal_slot[b];
    if (a >= 0 && b >= 0) plan.off_slot[k] = slot_of(plan.matrix, std::min(a, b), std::max(a, b));
  }
  return plan;
}

void assemble_matrix(const std::vector<double>& conductance, const std::vector<char>& unsupplied,
                     AssemblyPlan* plan) {
  double* v = plan->matrix.valuePtr();
  std::fill(v, v + plan->matrix.nonZeros(), 0.0);
  for (std::size_t k = 0; k < conductance.size(); ++k) {
    const double c = conductance[k];
    if (c == 0.0) continue;
    if (plan->from_slot[k] != kNoSlot) v[plan->from_slot[k]] += c;
    if (plan->to_slot[k] != kNoSlot) v[plan->to_slot[k]] += c;
    if (plan->off_slot[k] != kNoSlot) v[plan->off_slot[k]] -= c;
  }
  for (std::size_t i = 0; i < unsupplied.size(); ++i) {
    const int u = plan->unknown_of_node[i];
    if (u >= 0 && unsupplied[i]) v[plan->diagonal_slot[u]] += 1.0;
  }
}

}  // namespace gradeline
