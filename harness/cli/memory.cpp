#include "harness/cli/memory.h"

#include <cstddef>
#include <cstdint>
#include <cstdlib>

#include <malloc.h>
#include <sys/mman.h>
#include <unistd.h>

namespace trivet::cli {

void prefer_huge_pages() {
  // Large blocks from the heap too, not from mappings of their own: a
  // mapping is handed back on free and faulted in afresh next time (a
  // million-span solve paid that on every call).
  mallopt(M_MMAP_MAX, 0);
  mallopt(M_TRIM_THRESHOLD, -1);  // never shrink the heap (that would drop the marked part)
  // Almost 2 GiB (mallopt takes an int): a million-span beam with three
  // methods' results needs about 1.3 GB.
  constexpr std::size_t kStep = (std::size_t{1} << 31) - (std::size_t{2} << 20);
  mallopt(M_TOP_PAD, static_cast<int>(kStep));
  const auto before = reinterpret_cast<std::uintptr_t>(sbrk(0));
  // More than the heap has, so it grows by the step (volatile: a malloc and
  // free pair the compiler could see through would be removed).
  void* volatile p = std::malloc(std::size_t{1} << 20);
  std::free(p);
  const auto after = reinterpret_cast<std::uintptr_t>(sbrk(0));
  mallopt(M_TOP_PAD, 16 << 20);
#ifdef MADV_HUGEPAGE
  constexpr std::uintptr_t kHuge = std::uintptr_t{2} << 20;
  const std::uintptr_t from = (before + kHuge - 1) & ~(kHuge - 1), to = after & ~(kHuge - 1);
  if (to > from) madvise(reinterpret_cast<void*>(from), to - from, MADV_HUGEPAGE);
#endif
}

}  // namespace trivet::cli
