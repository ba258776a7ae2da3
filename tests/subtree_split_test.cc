// Sharing the up-looking factorisation by subtrees: the split's rows depend only on rows
// scheduled before them or on the same core (Liu 1990: row k of L needs exactly the rows of
// k's descendants in the elimination tree).
#include "solver/subtree_split.h"

#include <doctest/doctest.h>

#include <algorithm>
#include <random>
#include <vector>

using namespace gradeline;

namespace {

// A random tree of n nodes numbered in a postorder: built top down, children numbered before
// their parents, each subtree's nodes in one range.
std::vector<int> random_postordered_tree(int n, unsigned seed) {
  std::mt19937 rng(seed);
  std::vector<int> parent(static_cast<std::size_t>(n), -1);
  // Split the range [first, root) below `root` into child subtrees of random sizes.
  struct Range {
    int first, root;
  };
  std::vector<Range> todo = {{0, n - 1}};
  while (!todo.empty()) {
    const Range r = todo.back();
    todo.pop_back();
    int end = r.root;  // the children's subtrees fill [r.first, r.root)
    int begin = r.first;
    while (begin < end) {
      const int size = 1 + static_cast<int>(rng() % static_cast<unsigned>(end - begin));
      const int child_root = begin + size - 1;
      parent[child_root] = r.root;
      todo.push_back({begin, child_root});
      begin += size;
    }
  }
  return parent;
}

bool is_descendant_or_self(const std::vector<int>& parent, int d, int a) {
  for (int j = d; j != -1; j = parent[j]) {
    if (j == a) return true;
  }
  return false;
}

// A random tree numbered children first but in no particular order otherwise (each node's
// parent a random later node, within `reach`).
std::vector<int> random_tree(int n, int reach, unsigned seed) {
  std::mt19937 rng(seed);
  std::vector<int> parent(static_cast<std::size_t>(n), -1);
  for (int k = 0; k + 1 < n; ++k) {
    parent[k] = k + 1 + static_cast<int>(rng() % static_cast<unsigned>(std::min(reach, n - 1 - k)));
  }
  return parent;
}

void check_split(const std::vector<int>& parent, const SubtreeSplit& s) {
  const int n = static_cast<int>(parent.size());
  std::vector<int> owner(parent.size(), -1);  // 0, 1: a core; 2: the top
  for (int k = 0; k < s.prefix_end; ++k) owner[k] = 0;
  for (const auto& run : s.second) {
    for (int k = run.first; k < run.second; ++k) owner[k] = 1;
  }
  int previous_top = -1;
  for (const auto& run : s.top) {
    for (int k = run.first; k < run.second; ++k) {
      REQUIRE(owner[k] == -1);
      owner[k] = 2;
      CHECK(k > previous_top);  // in increasing order
      previous_top = k;
    }
  }
  // The smallest row in each subtree: a row is in the top exactly when its subtree reaches
  // below the prefix's end while it does not.
  std::vector<int> lowest(parent.size());
  for (int k = 0; k < n; ++k) lowest[k] = k;
  for (int k = 0; k < n; ++k) {
    if (parent[k] != -1) lowest[parent[k]] = std::min(lowest[parent[k]], lowest[k]);
  }
  for (int k = 0; k < n; ++k) {
    REQUIRE(owner[k] != -1);
    // A row's children are on its own core (a top row's may be anywhere).
    if (parent[k] != -1 && owner[parent[k]] != 2) CHECK(owner[parent[k]] == owner[k]);
    CHECK((owner[k] == 2) == (k >= s.prefix_end && lowest[k] < s.prefix_end));
  }
}

}  // namespace

TEST_CASE("each core's rows depend only on its own rows, and the top is what lies above both") {
  for (unsigned seed : {1u, 2u, 3u}) {
    CAPTURE(seed);
    const std::vector<int> postordered = random_postordered_tree(20000, seed);
    const SubtreeSplit a = split_subtrees(postordered, std::vector<double>(20000, 1.0), 2.0);
    REQUIRE(a.prefix_end > 0);
    check_split(postordered, a);
    const std::vector<int> any = random_tree(20000, 30, seed);
    const SubtreeSplit b = split_subtrees(any, std::vector<double>(20000, 1.0), 2.0);
    REQUIRE(b.prefix_end > 0);
    check_split(any, b);
  }
}

TEST_CASE("the two cores get about the same work") {
  constexpr double kBalance = 0.01;  // of the total, at unit work per row
  const std::vector<int> parent = random_postordered_tree(50000, 11);
  const SubtreeSplit s = split_subtrees(parent, std::vector<double>(parent.size(), 1.0));
  REQUIRE(s.prefix_end > 0);
  const double total = s.prefix_work + s.second_work + s.top_work;
  CHECK(total == doctest::Approx(50000.0));
  CHECK(std::abs(s.prefix_work - s.second_work) < kBalance * total + s.top_work);
}

TEST_CASE("a path, which has no disjoint subtrees, is not split; nor is what is not a tree") {
  std::vector<int> path(1000);
  for (int k = 0; k < 1000; ++k) path[k] = k + 1 < 1000 ? k + 1 : -1;
  CHECK(split_subtrees(path, std::vector<double>(path.size(), 1.0)).prefix_end == 0);
  CHECK(split_subtrees({-1, 0}, std::vector<double>(2, 1.0), 2.0).prefix_end == 0);  // parent first
  CHECK(split_subtrees({1, 5, -1}, std::vector<double>(3, 1.0), 2.0).prefix_end ==
        0);  // out of range
}
