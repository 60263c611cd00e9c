// trivet, slope-deflection: the symmetric banded system of the node
// equations and its one elimination.
//
// Unknowns are numbered node by node, so a span's four unknowns (rotation
// and translation at each end) lie within 4 consecutive numbers and the
// half-bandwidth hb is at most 3 (1 for a beam whose nodes only rotate: the
// tridiagonal case). The matrix is the stiffness of the beam: symmetric,
// and positive definite when the beam is stable, so Gaussian elimination
// needs no row exchanges and every pivot must come out positive.
//
// Storage: row r keeps its diagonal and the hb entries right of it
// (a[r * (hb + 1) + (c - r)]); an entry left of the diagonal is the upper
// entry of the row above (symmetry).
//
// The elimination goes row by row as the rows become complete, so the
// solve can reduce a node's rows right after the last span that touches
// them is added (one pass over the beam), then substitute back:
//   reduce row r:  for k = r - hb .. r - 1:  f = a(k, r) / pivot_k,
//                    a(r, j) -= f a(k, j) (j = r .. k + hb),  b_r -= f b_k
//   back:          x_r = (b_r - sum_{j > r} a(r, j) x_j) / pivot_r
// (the rows k are already reduced, so a(k, r) / pivot_k is the multiplier
// L(r, k) of the LU factors). O(n hb^2), written once for every hb; the
// half-bandwidth is a template argument only so that the loops unroll.
// Only + - * /, so exact in exact arithmetic.
#pragma once

#include <cstddef>
#include <limits>
#include <memory>
#include <type_traits>
#include <vector>

#include "methods/beam/numbers.h"
#include "methods/slope_deflection/plumbing.h"

namespace trivet::slope_deflection::detail {

template <class R>
struct Band {
  std::size_t n = 0, hb = 0, w = 1;
  // See above; after reduce_row the diagonal holds 1 / pivot. Not cleared
  // by init: the solve clears each row (clear_row) before it adds to it,
  // so the rows are written while they are in cache.
  std::unique_ptr<R[]> a;
  std::unique_ptr<R[]> rhs;  // right-hand side; after back substitution, the solution

  void init(std::size_t rows, std::size_t half) {
    n = rows;
    hb = half;
    w = half + 1;
    a.reset(new R[n * w]);
    advise_huge(a.get(), n * w * sizeof(R));
    rhs.reset(new R[n]);
    advise_huge(rhs.get(), n * sizeof(R));
  }
  void clear_row(std::size_t r) {
    for (std::size_t j = 0; j < w; ++j) a[r * w + j] = R(0);
    rhs[r] = R(0);
  }
  TRIVET_SD_INLINE R& at(std::size_t r, std::size_t c) { return a[r * w + (c - r)]; }

  // Adds c * (unknown `col`) to row `row`; where the value is known
  // (col < 0: a settlement, or a restrained rotation, 0) its product
  // moves to the right-hand side. Only entries on or right of the
  // diagonal are kept (the rest is their mirror). row < 0: no equation.
  TRIVET_SD_INLINE void add(long row, long col, const R& c, const R& known) {
    if (row < 0) return;
    if (col >= 0) {
      if (col >= row) at(static_cast<std::size_t>(row), static_cast<std::size_t>(col)) += c;
    } else if (!is_zero(known)) {
      rhs[static_cast<std::size_t>(row)] -= c * known;
    }
  }
};

// Below this fraction of the row's original diagonal a pivot is mostly
// rounding: a (near) mechanism, never a trustworthy answer. Exact: zero.
template <class R>
R pivot_tolerance() {
  if constexpr (std::is_same_v<R, Exact>) {
    return R(0);
  } else {
    return std::numeric_limits<R>::epsilon() * R(1024);
  }
}

// Reduces row r (complete, the rows before it reduced); false when its
// pivot is not positive or is mostly rounding. HB is the half-bandwidth.
template <std::size_t HB, class R>
TRIVET_SD_INLINE bool reduce_row_hb(Band<R>& m, std::size_t r, const R& tol) {
  const std::size_t w = HB + 1;
  R* ar = &m.a[r * w];
  const R original = ar[0];
  for (std::size_t back = (r < HB ? r : HB); back > 0; --back) {
    const std::size_t k = r - back;
    const R* ak = &m.a[k * w];
    const R& u = ak[back];  // a(k, r)
    if (is_zero(u)) continue;
    const R f = u * ak[0];  // ak[0] holds 1 / pivot_k
    for (std::size_t j = 0; j + back <= HB; ++j) ar[j] -= f * ak[back + j];
    m.rhs[r] -= f * m.rhs[k];
  }
  const R& p = ar[0];
  if (!(p > original * tol) || !(p > R(0)) || !is_finite(p)) return false;
  ar[0] = R(1) / p;
  return true;
}

// Solves row r for its unknown (the rows after it solved), in place in rhs.
template <std::size_t HB, class R>
TRIVET_SD_INLINE void back_substitute_hb(Band<R>& m, std::size_t r) {
  const R* ar = &m.a[r * (HB + 1)];
  R s = m.rhs[r];
  for (std::size_t j = 1; j <= HB && r + j < m.n; ++j) s -= ar[j] * m.rhs[r + j];
  m.rhs[r] = s * ar[0];
}

}  // namespace trivet::slope_deflection::detail
