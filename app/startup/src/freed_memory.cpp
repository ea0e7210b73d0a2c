#include "sharpey/startup/freed_memory.h"

#include <cstdlib>

#if defined(__GLIBC__)
#include <malloc.h>
#endif

namespace sharpey::startup {

void keep_freed_memory_for_reuse() {
#if defined(__GLIBC__)
  if (std::getenv("MALLOC_MMAP_MAX_") != nullptr ||
      std::getenv("MALLOC_TRIM_THRESHOLD_") != nullptr ||
      std::getenv("GLIBC_TUNABLES") != nullptr) {
    return;
  }
  // A failed heap extension still falls back to mmap inside glibc, so large requests keep working
  // when the heap cannot grow in place.
  mallopt(M_MMAP_MAX, 0);
  mallopt(M_TRIM_THRESHOLD, 0x7fffffff);
#endif
}

}  // namespace sharpey::startup
