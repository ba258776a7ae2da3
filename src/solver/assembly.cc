#include "solver/assembly.h"

#include <algorithm>

#include <amd.h>

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

std::vector<int> junction_order(const Topology& t) {
  std::vector<int> unknown(t.fixed_head.size(), -1);
  int n = 0;
  for (std::size_t i = 0; i < t.fixed_head.size(); ++i) {
    if (!t.fixed_head[i]) unknown[i] = n++;
  }
  // The full pattern (both triangles, no diagonal) in compressed columns; AMD accepts the
  // duplicate entries that parallel links make.
  std::vector<int> start(n + 1, 0);
  for (std::size_t k = 0; k < t.from.size(); ++k) {
    const int a = unknown[t.from[k]], b = unknown[t.to[k]];
    if (a >= 0 && b >= 0 && a != b) {
      ++start[a + 1];
      ++start[b + 1];
    }
  }
  for (int j = 0; j < n; ++j) start[j + 1] += start[j];
  std::vector<int> rows(start[n]);
  std::vector<int> next(start.begin(), start.end() - 1);
  for (std::size_t k = 0; k < t.from.size(); ++k) {
    const int a = unknown[t.from[k]], b = unknown[t.to[k]];
    if (a >= 0 && b >= 0 && a != b) {
      rows[next[a]++] = b;
      rows[next[b]++] = a;
    }
  }
  std::vector<int> order(n);
  if (n == 0) return order;
  double control[AMD_CONTROL], info[AMD_INFO];
  amd_defaults(control);
  const int status = amd_order(n, start.data(), rows.data(), order.data(), control, info);
  if (status != AMD_OK && status != AMD_OK_BUT_JUMBLED) order.clear();
  return order;
}

AssemblyPlan plan_assembly(const Topology& t, const std::vector<int>& order) {
  AssemblyPlan plan;
  plan.unknown_of_node.assign(t.fixed_head.size(), -1);
  for (std::size_t i = 0; i < t.fixed_head.size(); ++i) {
    if (!t.fixed_head[i]) plan.unknown_of_node[i] = plan.unknowns++;
  }
  if (!order.empty()) {  // renumber: the junction eliminated k-th becomes unknown k
    std::vector<int> position(order.size());
    for (std::size_t k = 0; k < order.size(); ++k) position[order[k]] = static_cast<int>(k);
    for (int& u : plan.unknown_of_node) {
      if (u >= 0) u = position[u];
    }
  }
  // The upper triangle in compressed columns, built directly: column j holds the rows i < j of
  // the links between junctions i and j (parallel links share one entry), then the diagonal.
  const int n = plan.unknowns;
  const std::size_t links = t.from.size();
  std::vector<int> start(n + 1, 0);
  for (std::size_t k = 0; k < links; ++k) {
    const int a = plan.unknown_of_node[t.from[k]], b = plan.unknown_of_node[t.to[k]];
    if (a >= 0 && b >= 0 && a != b) ++start[std::max(a, b) + 1];
  }
  for (int j = 0; j < n; ++j) start[j + 1] += start[j] + 1;  // + 1: the diagonal
  std::vector<int> rows(start[n]);
  std::vector<int> fill(start.begin(), start.end() - 1);
  for (std::size_t k = 0; k < links; ++k) {
    const int a = plan.unknown_of_node[t.from[k]], b = plan.unknown_of_node[t.to[k]];
    if (a >= 0 && b >= 0 && a != b) rows[fill[std::max(a, b)]++] = std::min(a, b);
  }
  std::vector<int> outer(n + 1, 0);
  int nnz = 0;
  for (int j = 0; j < n; ++j) {  // sort each column, drop repeats, end with the diagonal
    int* first = rows.data() + start[j];
    int* last = rows.data() + fill[j];
    std::sort(first, last);
    last = std::unique(first, last);
    outer[j] = nnz;
    for (int* r = first; r != last; ++r) rows[nnz++] = *r;
    rows[nnz++] = j;
  }
  outer[n] = nnz;
  plan.matrix.resize(n, n);
  plan.matrix.resizeNonZeros(nnz);
  std::copy(outer.begin(), outer.end(), plan.matrix.outerIndexPtr());
  std::copy(rows.begin(), rows.begin() + nnz, plan.matrix.innerIndexPtr());
  std::fill(plan.matrix.valuePtr(), plan.matrix.valuePtr() + nnz, 0.0);

  plan.diagonal_slot.resize(n);
  for (int u = 0; u < n; ++u) plan.diagonal_slot[u] = outer[u + 1] - 1;
  plan.from_slot.assign(links, kNoSlot);
  plan.to_slot.assign(links, kNoSlot);
  plan.off_slot.assign(links, kNoSlot);
  for (std::size_t k = 0; k < links; ++k) {
    const int a = plan.unknown_of_node[t.from[k]];
    const int b = plan.unknown_of_node[t.to[k]];
    if (a >= 0) plan.from_slot[k] = plan.diagonal_slot[a];
    if (b >= 0) plan.to_slot[k] = plan.diagonal_slot[b];
    if (a >= 0 && b >= 0 && a != b) plan.off_slot[k] = slot_of(plan.matrix, std::min(a, b), std::max(a, b));
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
