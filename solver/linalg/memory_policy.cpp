#include "solver/linalg/memory_policy.hpp"

#include <climits>
#include <cstdint>

#if defined(__GLIBC__)
#include <malloc.h>
#endif
#if defined(__linux__)
#include <sys/mman.h>
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

void prefer_huge_pages(void* data, std::size_t bytes) {
#if defined(__linux__) && defined(MADV_HUGEPAGE)
  constexpr std::uintptr_t huge = std::uintptr_t{2} << 20;
  const auto at = reinterpret_cast<std::uintptr_t>(data);
  const std::uintptr_t begin = (at + huge - 1) & ~(huge - 1), end = (at + bytes) & ~(huge - 1);
  if (end > begin) madvise(reinterpret_cast<void*>(begin), end - begin, MADV_HUGEPAGE);
#else
  (void)data, (void)bytes;
#endif
}

}  // namespace oxystrat
