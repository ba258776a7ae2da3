#include "gradeline/prefault.h"

#include <cstdint>

#if defined(__linux__)
#include <sys/mman.h>
#endif

namespace gradeline {

void prefault(void* data, std::size_t bytes) {
#if defined(__linux__) && defined(MADV_POPULATE_WRITE)
  if (data == nullptr || bytes < kPrefaultBytes) return;
  constexpr std::uintptr_t kPage = 4096;
  const std::uintptr_t begin = (reinterpret_cast<std::uintptr_t>(data) + kPage - 1) & ~(kPage - 1);
  const std::uintptr_t end = (reinterpret_cast<std::uintptr_t>(data) + bytes) & ~(kPage - 1);
  if (end <= begin) return;
  // Two parts, one per core (the machines this runs on have two or more).
  const std::uintptr_t middle = begin + (((end - begin) / 2) & ~(kPage - 1));
  const std::uintptr_t from[2] = {begin, middle};
  const std::uintptr_t to[2] = {middle, end};
#pragma omp parallel for schedule(static)
  for (int part = 0; part < 2; ++part) {
    if (to[part] > from[part]) {
      // A refusal (an older kernel: EINVAL) leaves the pages to fault one by one, as without.
      (void)madvise(reinterpret_cast<void*>(from[part]), to[part] - from[part],
                    MADV_POPULATE_WRITE);
    }
  }
#else
  (void)data;
  (void)bytes;
#endif
}

}  // namespace gradeline
