// trivet: advice to the kernel on large fresh arrays.
//
// Plumbing shared by the methods (not mechanics: the independence rule in
// DEVELOPERS.md lets it be shared). At a million spans most of the cost of
// a method's big arrays is the page faults of fresh memory; transparent
// huge pages take one fault per 2 MiB instead of per 4 KiB. Only a hint:
// nothing depends on it, and it is ignored where unsupported or refused.
#pragma once

#include <cstddef>
#include <cstdint>
#include <vector>

#if defined(__linux__)
#include <sys/mman.h>
#endif

namespace trivet {

// Advises the 2 MiB-aligned inside of a block of `bytes` at `p` (from
// 4 MiB up), before its first touch.
inline void advise_huge(const void* p, std::size_t bytes) {
#if defined(__linux__) && defined(MADV_HUGEPAGE)
  constexpr std::size_t kHugeFrom = std::size_t(4) << 20;
  if (bytes < kHugeFrom) return;
  constexpr std::uintptr_t kHuge = std::uintptr_t(2) << 20;
  const std::uintptr_t b = reinterpret_cast<std::uintptr_t>(p);
  const std::uintptr_t lo = (b + kHuge - 1) & ~(kHuge - 1);
  const std::uintptr_t hi = (b + bytes) & ~(kHuge - 1);
  if (hi > lo) (void)madvise(reinterpret_cast<void*>(lo), hi - lo, MADV_HUGEPAGE);
#else
  (void)p;
  (void)bytes;
#endif
}

// Reserves room for `count` elements of `v` (none touched yet) and advises it.
template <class T>
void reserve_huge(std::vector<T>& v, std::size_t count) {
  v.reserve(count);
  advise_huge(v.data(), count * sizeof(T));
}

}  // namespace trivet
