// Loops over the elements of a network, on every core when there are enough of them.
//
// An OpenMP region costs about 0.2 us even when its `if` clause keeps it on one thread (the
// runtime still sets up and tears down a team). A sizing run solves a small network hundreds
// of thousands of times, entering some twenty regions per solve, so below the threshold these
// helpers run a plain loop and never enter one.
#pragma once

#include <cstddef>

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

}  // namespace gradeline
