// Sharing an up-looking sparse factorisation between two cores by subtrees of the elimination
// tree.
//
// In the up-looking (row by row) LDL^T factorisation, row k of L needs only the rows of k's
// descendants in the elimination tree, and it writes only the columns of those descendants
// (Liu 1990, "The role of elimination trees in sparse factorization", SIAM J. Matrix Anal.
// Appl. 11(1)). Rows whose subtrees are disjoint can therefore be factorised side by side.
// Every node of the tree is numbered after its descendants, so rows [0, m) hold whole
// subtrees; the rows of [m, n) that are not ancestors of a row below m hold whole subtrees
// too, disjoint from the first. So one core takes [0, m), the other the rest of [m, n) but
// those ancestors, and the ancestors (the top: one path when the numbering is a postorder of
// the tree, as AMD's nearly is) are factorised after both, in increasing order. m is chosen
// so that both cores get about the same estimated work.
#pragma once

#include <cstddef>
#include <utility>
#include <vector>

namespace gradeline {

struct SubtreeSplit {
  using Run = std::pair<int, int>;  // rows [first, second)
  int prefix_end = 0;               // one core: rows [0, prefix_end)
  std::vector<Run> second;          // the other core: these runs, in order
  std::vector<Run> top;             // then, after both: the ancestors of rows below prefix_end
  double prefix_work = 0.0, second_work = 0.0, top_work = 0.0;
};

// The split of rows 0..n-1, with parent[k] (> k, or -1 for a root) the elimination tree and
// work[k] the estimated cost of row k; none (empty result: prefix_end == 0) when `parent` is
// not such a tree, or when the split's estimated time, the larger share of the two cores
// plus the top, exceeds `max_time_share` of the serial work.
SubtreeSplit split_subtrees(const std::vector<int>& parent, const std::vector<double>& work,
                            double max_time_share = 0.85);

}  // namespace gradeline
