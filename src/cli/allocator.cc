#include "cli/allocator.h"

#include <cstdlib>  // defines __GLIBC__ where the C library is glibc

#if defined(__GLIBC__)
#include <malloc.h>
#endif

namespace gradeline {

void configure_allocator() {
#if defined(__GLIBC__)
  // Blocks up to 1 GiB come from the heap rather than from a mapping of their own, and the
  // heap keeps up to 1 GiB of freed memory at its top instead of returning it to the kernel.
  constexpr int kOneGiB = 1 << 30;
  (void)mallopt(M_MMAP_THRESHOLD, kOneGiB);
  (void)mallopt(M_TRIM_THRESHOLD, kOneGiB);
#endif
}

}  // namespace gradeline
