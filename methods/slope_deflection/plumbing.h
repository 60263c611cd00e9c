// trivet, slope-deflection: plumbing that is not mechanics (comparisons
// that work for every number type, large-array memory hints, names).
#pragma once

#include <cmath>
#include <cstddef>
#include <cstdint>
#include <string>
#include <type_traits>
#include <vector>

#if defined(__linux__)
#include <sys/mman.h>
#endif

// For the few per-load and per-span helpers of the solve's one pass: the
// compiler would otherwise leave some of them as calls, and with their
// results out of registers the pass ran measurably slower.
#if defined(__GNUC__)
#define TRIVET_SD_INLINE inline __attribute__((always_inline))
#define TRIVET_SD_INLINE_LAMBDA __attribute__((always_inline))
#else
#define TRIVET_SD_INLINE inline
#define TRIVET_SD_INLINE_LAMBDA
#endif

namespace trivet::slope_deflection::detail {

// Zero without ==, for every number type (-Wfloat-equal).
template <class R>
TRIVET_SD_INLINE bool is_zero(const R& d) {
  return !(d < R(0)) && !(d > R(0));
}

// Finite: x - x is 0 for a finite number and NaN for inf or NaN (the same
// test as std::isfinite, which the built-in floating types use).
template <class R>
TRIVET_SD_INLINE bool is_finite(const R& x) {
  if constexpr (std::is_floating_point_v<R>) {
    return std::isfinite(x);
  } else {
    const R d = x - x;
    return d <= R(0) && d >= R(0);
  }
}

// Large arrays: ask the kernel for transparent huge pages before the first
// touch. A beam of a million spans needs a few hundred megabytes, and with
// 4 KiB pages the first-touch page faults cost more than the whole solve.
// Only the 2 MiB-aligned inside of the block is advised; a hint, never
// required (ignored where unsupported or refused).
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

// Reserves room for `count` elements (none touched yet) and advises it.
template <class T>
void reserve_huge(std::vector<T>& v, std::size_t count) {
  v.reserve(count);
  advise_huge(v.data(), count * sizeof(T));
}

// The node's label for a reason text, or "#i" where it has none.
inline std::string node_name(const std::vector<std::string>& labels, std::size_t i) {
  if (i < labels.size() && !labels[i].empty()) return labels[i];
  return "#" + std::to_string(i);
}

}  // namespace trivet::slope_deflection::detail
