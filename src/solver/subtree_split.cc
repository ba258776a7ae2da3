#include "solver/subtree_split.h"

#include <algorithm>

namespace gradeline {
namespace {

// Marks the ancestors (at or above m) of the rows below m, and returns their work.
double mark_top(const std::vector<int>& parent, const std::vector<double>& work, int m,
                std::vector<char>* in_top) {
  std::fill(in_top->begin(), in_top->end(), 0);
  double sum = 0.0;
  for (int k = 0; k < m; ++k) {
    // Only a row whose parent lies at or above m starts a new path; each path stops at the
    // first ancestor already marked.
    for (int j = parent[k]; j >= m && !(*in_top)[j]; j = parent[j]) {
      (*in_top)[j] = 1;
      sum += work[j];
    }
  }
  return sum;
}

}  // namespace

SubtreeSplit split_subtrees(const std::vector<int>& parent, const std::vector<double>& work,
                            double max_time_share) {
  const int n = static_cast<int>(parent.size());
  if (n < 2 || work.size() != parent.size()) return {};
  for (int k = 0; k < n; ++k) {
    if (parent[k] != -1 && (parent[k] <= k || parent[k] >= n)) return {};
  }
  std::vector<double> prefix(parent.size() + 1, 0.0);
  for (int k = 0; k < n; ++k) prefix[k + 1] = prefix[k] + work[k];
  const double total = prefix[n];
  if (!(total > 0.0)) return {};
  // The prefix should take half of what the top leaves; the top depends on where the prefix
  // ends, so the end is settled in a few rounds.
  std::vector<char> in_top(parent.size(), 0);
  int m = 0;
  double top = 0.0;
  for (int round = 0; round < 4; ++round) {
    const double target = 0.5 * (total - top);
    const int next = static_cast<int>(std::lower_bound(prefix.begin() + 1, prefix.end(), target) -
                                      prefix.begin());
    const int at = std::clamp(next, 1, n - 1);
    if (at == m) break;
    m = at;
    top = mark_top(parent, work, m, &in_top);
  }
  SubtreeSplit split;
  split.prefix_end = m;
  split.prefix_work = prefix[m];
  split.top_work = top;
  split.second_work = total - prefix[m] - top;
  if (std::max(split.prefix_work, split.second_work) + split.top_work > max_time_share * total) {
    return {};
  }
  for (int k = m; k < n;) {
    const int begin = k;
    const char kind = in_top[k];
    while (k < n && in_top[k] == kind) ++k;
    (kind ? split.top : split.second).emplace_back(begin, k);
  }
  return split;
}

}  // namespace gradeline
