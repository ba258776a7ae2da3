// Filling the page tables of a large fresh allocation before it is first written.
//
// A freshly allocated block of memory is mapped page by page as it is first written: one page
// fault, and one trip through the kernel, for every 4 KiB. At 10^6 pipes the network's records
// alone are about 470 MB, some 115,000 faults, which took 0.17-0.27 s when the parser sized its
// vectors. Linux (5.14 and later) fills the page tables of a whole range in one call,
// madvise(MADV_POPULATE_WRITE), for a third of that; here on both cores. The contents are left
// as they are, so the call is only ever a hint: where the kernel does not have it, or for small
// blocks, nothing is done.
#pragma once

#include <cstddef>
#include <vector>

namespace gradeline {

// Blocks smaller than this are left to fault page by page.
inline constexpr std::size_t kPrefaultBytes = std::size_t{4} << 20;

// Maps every whole page of [data, data + bytes) writable.
void prefault(void* data, std::size_t bytes);

// The same for the whole capacity of `v` (call after reserve, before the elements are written).
template <typename T>
void prefault_capacity(std::vector<T>& v) {
  prefault(v.data(), v.capacity() * sizeof(T));
}

// v.resize(n), with the pages of a new, larger block mapped first.
template <typename T>
void resize_prefaulted(std::vector<T>& v, std::size_t n) {
  if (n > v.capacity()) {
    v.reserve(n);
    prefault_capacity(v);
  }
  v.resize(n);
}

}  // namespace gradeline
