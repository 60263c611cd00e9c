// trivet, direct stiffness method, private header: the band solve.
//
// Part of the assembly and solve (part two of the derivation): the
// assembled stiffness matrix K is symmetric positive definite for a stable
// beam, banded by the DOF numbering of stiffness.cpp, and K u = f is solved
// by a banded LDL^T factorisation without pivoting (a standard algorithm:
// G. H. Golub, C. F. Van Loan, "Matrix Computations", 3rd ed., Johns
// Hopkins, 1996, sec. 4.1 and 4.3, from memory). O(n) in the DOFs.
#pragma once

#include <algorithm>
#include <cstddef>
#include <limits>
#include <vector>

#include "methods/stiffness/stiffness_checks.h"

namespace trivet::stiffness::internal {

// --- Banded symmetric LDL^T (no pivoting) --------------------------------------

constexpr std::size_t kMaxBand = 4;  // largest half-bandwidth of the DOF numbering below

// Row i holds K(i, i - c) at a[i * (w + 1) + c], c = 0 .. w, for the
// system's own half-bandwidth w <= kMaxBand (1 when only rotations are
// free, 3 with free deflections, 4 at a hinge).
template <class R>
struct Band {
  std::size_t n = 0, w = 0;
  std::vector<R> a;
  Band(std::size_t size, std::size_t width) : n(size), w(width), a(size * (width + 1), R(0)) {}
  __attribute__((always_inline)) R& at(std::size_t i, std::size_t j) {  // any order, |i - j| <= w
    return i >= j ? a[i * (w + 1) + (i - j)] : a[j * (w + 1) + (j - i)];
  }
};

// Factors K in place (L below the diagonal, D on it) and solves K u = b,
// u overwriting b, for half-bandwidth W fixed at compile time. The forward
// substitution of row i follows its factorisation in the same pass. Returns
// the first DOF with a pivot that is not clearly positive (b is then
// unfinished), or n when all are. Within the band the operations are those
// of any wider band: the terms it leaves out are exact zeros.
template <std::size_t W, bool kFast, class R>
std::size_t factor_solve_w(Band<R>& K, std::vector<R>& b) {
  constexpr std::size_t kRow = W + 1;
  const R tol = std::numeric_limits<R>::epsilon() * R(1024);
  const std::size_t n = K.n;
  R* const a = K.a.data();
  R* const x = b.data();
  if constexpr (W == 1 && kFast) {
    // Tridiagonal (only rotations free): the loops below with the previous
    // pivot and forward value carried in registers, not reloaded from
    // the row just stored (a store-forwarding round trip on the chain from
    // pivot to pivot). Equal to the general loops to 1e-13 of the largest
    // value (tests/stiffness_test.cpp, FastPath).
    R dprev(1), yprev(0);
    for (std::size_t i = 0; i < n; ++i) {
      R* const row = a + i * kRow;
      const R diag0 = row[0];
      R d = diag0, xi = x[i];
      if (i > 0) {
        const R k = row[1];   // L(i, i - 1) D(i - 1)
        const R l = k / dprev;  // L(i, i - 1)
        row[1] = l;
        d -= k * l;
        xi -= l * yprev;
      }
      if (!is_finite(d) || !(diag0 * tol < d)) return i;
      row[0] = d;
      x[i] = xi;
      dprev = d;
      yprev = xi;
    }
    R unext(0);
    for (std::size_t i = n; i-- > 0;) {
      R xi = x[i] / a[i * kRow];
      if (i + 1 < n) xi -= a[(i + 1) * kRow + 1] * unext;
      x[i] = xi;
      unext = xi;
    }
    return n;
  }
  R LD[kRow];  // L(i, k) * D(k) for the current row, by i - k
  for (std::size_t i = 0; i < n; ++i) {
    const std::size_t lo = i >= W ? i - W : 0;
    R* const row = a + i * kRow;
    const R diag0 = row[0];
    for (std::size_t j = lo; j < i; ++j) {
      const R* const rj = a + j * kRow;
      R sum = row[i - j];
      for (std::size_t k = lo; k < j; ++k) sum -= LD[i - k] * rj[j - k];
      LD[i - j] = sum;          // L(i, j) D(j)
      row[i - j] = sum / rj[0];  // L(i, j)
    }
    R d = diag0;
    for (std::size_t k = lo; k < i; ++k) d -= LD[i - k] * row[i - k];
    if (!is_finite(d) || !(diag0 * tol < d)) return i;
    row[0] = d;
    R xi = x[i];  // forward: L y = b
    for (std::size_t k = lo; k < i; ++k) xi -= row[i - k] * x[k];
    x[i] = xi;
  }
  for (std::size_t i = n; i-- > 0;) {  // back: L^T u = D^-1 y (the division by D in the same pass)
    const std::size_t hi = std::min(n - 1, i + W);
    R xi = x[i] / a[i * kRow];
    for (std::size_t k = i + 1; k <= hi; ++k) xi -= a[k * kRow + (k - i)] * x[k];
    x[i] = xi;
  }
  return n;
}

// kFast false: without the tridiagonal special case (detail::solve_general).
template <bool kFast, class R>
std::size_t factor_solve(Band<R>& K, std::vector<R>& b) {
  switch (K.w) {
    case 0: return factor_solve_w<0, kFast>(K, b);
    case 1: return factor_solve_w<1, kFast>(K, b);
    case 2: return factor_solve_w<2, kFast>(K, b);
    case 3: return factor_solve_w<3, kFast>(K, b);
    default: return factor_solve_w<kMaxBand, kFast>(K, b);
  }
}

}  // namespace trivet::stiffness::internal
