#include "solver/linalg/memory_policy.hpp"

#include <climits>

#if defined(__GLIBC__)
#include <malloc.h>
#endif

namespace oxystrat {

void retain_freed_memory() {
#if defined(__GLIBC__)
  // Blocks up to 32 MiB (glibc's largest mmap threshold: a vector of 4 10^6 doubles) come from the
  // heap and are reused after free; larger ones (allocated once per solve) are still mapped.
  mallopt(M_MMAP_THRESHOLD, 32 * 1024 * 1024);
  mallopt(M_TRIM_THRESHOLD, INT_MAX);  // do not give the heap top back between steps
#endif
}

}  // namespace oxystrat
