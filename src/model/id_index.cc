#include "gradeline/id_index.h"

#include <omp.h>

#include <algorithm>
#include <atomic>

namespace gradeline {
namespace {

// Below this many elements the parts and their bookkeeping cost more than they save.
constexpr std::size_t kBulkFrom = 65536;
// Slots per part: 64 KiB of table, which stays in a core's cache while it is filled.
constexpr std::size_t kPartSlots = 4096;

}  // namespace

bool IdIndex::insert_all(const std::vector<Staged>& staged,
                         const std::function<std::string_view(std::size_t)>& id_of) {
  const std::size_t n = staged.size();
  if (count_ != 0 || n < kBulkFrom) {
    for (const Staged& e : staged) {
      if (!insert(id_of(e.index), e.index, id_of).second) return false;
    }
    return true;
  }
  reserve(n);
  const std::size_t capacity = slots_.size();
  const std::size_t parts = std::max<std::size_t>(1, capacity / kPartSlots);
  const std::size_t part_slots = capacity / parts;  // both powers of two
  int shift = 0;
  while ((std::size_t{1} << shift) < part_slots) ++shift;
  auto part_of = [&](const Staged& e) { return (e.tag & mask()) >> shift; };
  auto same = [&](const Slot& slot, const Staged& e) {
    if (slot.length != kLongId) {
      return e.length == slot.length && std::memcmp(slot.chars, e.chars, e.length) == 0;
    }
    return e.length == kLongId && id_of(slot.index) == id_of(e.index);
  };
  // The elements in order of their parts, and in index order within each (a stable counting
  // sort, each core counting and dealing a contiguous share).
  const int threads = std::max(1, std::min(omp_get_max_threads(), 8));
  std::vector<std::size_t> counts(static_cast<std::size_t>(threads) * parts, 0);
  std::vector<std::uint32_t> order(n);
  std::vector<std::size_t> part_begin(parts + 1, 0);
  std::vector<std::vector<std::uint32_t>> deferred(static_cast<std::size_t>(threads));
  std::atomic<bool> duplicate{false};
#pragma omp parallel num_threads(threads)
  {
    const std::size_t t = static_cast<std::size_t>(omp_get_thread_num());
    const std::size_t share = static_cast<std::size_t>(omp_get_num_threads());
    const std::size_t begin = n * t / share, end = n * (t + 1) / share;
    std::size_t* count = counts.data() + t * parts;
    for (std::size_t i = begin; i < end; ++i) ++count[part_of(staged[i])];
#pragma omp barrier
#pragma omp single
    {
      std::size_t at = 0;
      for (std::size_t p = 0; p < parts; ++p) {
        part_begin[p] = at;
        for (std::size_t u = 0; u < share; ++u) {
          const std::size_t c = counts[u * parts + p];
          counts[u * parts + p] = at;
          at += c;
        }
      }
      part_begin[parts] = at;
    }
    for (std::size_t i = begin; i < end; ++i) {
      order[count[part_of(staged[i])]++] = static_cast<std::uint32_t>(i);
    }
#pragma omp barrier
    // Each part filled by one core, its probes kept inside it.
#pragma omp for schedule(dynamic, 16)
    for (std::ptrdiff_t p = 0; p < static_cast<std::ptrdiff_t>(parts); ++p) {
      const std::size_t last = (static_cast<std::size_t>(p) + 1) * part_slots;
      for (std::size_t o = part_begin[p]; o < part_begin[p + 1]; ++o) {
        const Staged& e = staged[order[o]];
        for (std::size_t s = e.tag & mask();; ++s) {
          if (s == last) {  // would leave the part: placed after
            deferred[t].push_back(order[o]);
            break;
          }
          Slot& slot = slots_[s];
          if (slot.index == kEmpty) {
            place(&slot, e);
            break;
          }
          if (slot.tag == e.tag && same(slot, e)) {
            duplicate.store(true, std::memory_order_relaxed);
            break;
          }
        }
      }
    }
  }
  if (duplicate.load()) return false;
  std::vector<std::uint32_t> rest;
  for (const std::vector<std::uint32_t>& d : deferred) rest.insert(rest.end(), d.begin(), d.end());
  std::sort(rest.begin(), rest.end());
  for (std::uint32_t i : rest) {
    const Staged& e = staged[i];
    std::size_t s = e.tag & mask();
    for (; slots_[s].index != kEmpty; s = (s + 1) & mask()) {
      if (slots_[s].tag == e.tag && same(slots_[s], e)) return false;
    }
    place(&slots_[s], e);
  }
  count_ = n;
  return true;
}

}  // namespace gradeline
