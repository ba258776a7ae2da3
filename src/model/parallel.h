// Loops over the elements of a network, on every core when there are enough of them.
//
// An OpenMP region costs about 0.2 us even when its `if` clause keeps it on one thread (the
// runtime still sets up and tears down a team). A sizing run solves a small network hundreds
// of thousands of times, entering some twenty regions per solve, so below the threshold these
// helpers run a plain loop and never enter one.
#pragma once

#include <algorithm>
#include <cstddef>
#include <string>
#include <vector>

namespace gradeline {

// Loops over at least this many nodes or links run on every core; below it, starting the
// threads costs more than they save.
inline constexpr std::ptrdiff_t kParallelElements = 20000;

// body(i) for every i in [0, count), each i exactly once; from kParallelElements on, the
// indices are shared among the cores in contiguous halves (a static schedule), so body must
// touch nothing another index writes.
template <typename Body>
void for_each_index(std::ptrdiff_t count, Body&& body) {
  if (count >= kParallelElements) {
#pragma omp parallel for schedule(static)
    for (std::ptrdiff_t i = 0; i < count; ++i) body(i);
  } else {
    for (std::ptrdiff_t i = 0; i < count; ++i) body(i);
  }
}

// The indices i in [0, count) for which pred(i) holds, in increasing order. A report or a
// check that scans a million elements for the few that need a line is then a parallel scan
// and a short serial loop over what it found, with the same result as one serial loop.
template <typename Pred>
std::vector<std::size_t> indices_where(std::ptrdiff_t count, Pred&& pred) {
  std::vector<std::size_t> out;
  if (count < kParallelElements) {
    for (std::ptrdiff_t i = 0; i < count; ++i) {
      if (pred(i)) out.push_back(static_cast<std::size_t>(i));
    }
    return out;
  }
  // Contiguous parts, each found on one core, joined in order.
  constexpr std::ptrdiff_t kParts = 16;
  std::vector<std::size_t> found[kParts];
  const std::ptrdiff_t per_part = (count + kParts - 1) / kParts;
#pragma omp parallel for schedule(static)
  for (std::ptrdiff_t part = 0; part < kParts; ++part) {
    const std::ptrdiff_t end = count < (part + 1) * per_part ? count : (part + 1) * per_part;
    for (std::ptrdiff_t i = part * per_part; i < end; ++i) {
      if (pred(i)) found[part].push_back(static_cast<std::size_t>(i));
    }
  }
  for (const std::vector<std::size_t>& f : found) out.insert(out.end(), f.begin(), f.end());
  return out;
}

// Sums contributions indexed by element into `size` totals: add(i, totals) adds those of index
// i in [0, count) to the array `totals`. From kParallelElements on, the first and the second
// half of the indices add into separate arrays on two cores, summed after; below, one pass in
// index order. Either way the order of the additions depends only on `count`, not on the
// number of cores, so the totals are reproducible.
template <typename Add>
std::vector<double> sum_by_index(std::size_t size, std::ptrdiff_t count, Add&& add) {
  std::vector<double> totals(size, 0.0);
  if (count < kParallelElements) {
    for (std::ptrdiff_t i = 0; i < count; ++i) add(i, totals.data());
    return totals;
  }
  std::vector<double> second(size, 0.0);
  const std::ptrdiff_t half = count / 2;
#pragma omp parallel for schedule(static, 1)
  for (int part = 0; part < 2; ++part) {
    double* into = part == 0 ? totals.data() : second.data();
    for (std::ptrdiff_t i = part == 0 ? 0 : half; i < (part == 0 ? half : count); ++i) add(i, into);
  }
  for_each_index(static_cast<std::ptrdiff_t>(size),
                 [&](std::ptrdiff_t n) { totals[n] += second[n]; });
  return totals;
}

// Text for the elements [0, count), in order: write(i, &text) appends element i's text (or
// nothing), and take(text) receives it piece by piece. From kParallelElements on, blocks of
// elements are formed on every core, a group of blocks at a time, and handed over in order, so
// the whole text is never held at once; the text is the same as from one loop.
template <typename Write, typename Take>
void text_in_order(std::size_t count, const Write& write, const Take& take) {
  constexpr std::size_t kPerBlock = 4096;
  constexpr std::size_t kBlocksPerGroup = 32;
  if (static_cast<std::ptrdiff_t>(count) < kParallelElements) {
    std::string text;
    for (std::size_t i = 0; i < count; ++i) write(i, &text);
    take(text);
    return;
  }
  std::vector<std::string> block(kBlocksPerGroup);
  const std::size_t blocks = (count + kPerBlock - 1) / kPerBlock;
  for (std::size_t first = 0; first < blocks; first += kBlocksPerGroup) {
    const std::ptrdiff_t in_group =
        static_cast<std::ptrdiff_t>(std::min(kBlocksPerGroup, blocks - first));
#pragma omp parallel for schedule(dynamic, 1)
    for (std::ptrdiff_t b = 0; b < in_group; ++b) {
      std::string& text = block[b];
      text.clear();
      const std::size_t begin = (first + b) * kPerBlock;
      const std::size_t end = std::min(count, begin + kPerBlock);
      for (std::size_t i = begin; i < end; ++i) write(i, &text);
    }
    for (std::ptrdiff_t b = 0; b < in_group; ++b) take(block[b]);
  }
}

}  // namespace gradeline
