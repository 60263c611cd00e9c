// trivet, slope-deflection: plumbing that is not mechanics (comparisons
// that work for every number type, large-array memory hints, names).
#pragma once

#include <cmath>
#include <cstddef>
#include <cstdint>
#include <string>
#include <type_traits>
#include <vector>

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

#include "methods/beam/memory_advice.h"

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

// Large arrays: the kernel's huge pages (methods/beam/memory_advice.h).
using trivet::advise_huge;
using trivet::reserve_huge;

// The node's label for a reason text, or "#i" where it has none.
inline std::string node_name(const std::vector<std::string>& labels, std::size_t i) {
  if (i < labels.size() && !labels[i].empty()) return labels[i];
  return "#" + std::to_string(i);
}

}  // namespace trivet::slope_deflection::detail
