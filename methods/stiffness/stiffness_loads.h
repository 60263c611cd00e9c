// trivet, direct stiffness method, private header: the load terms.
//
// Part one of the derivation: what each load type puts into the element
// equations, and what it adds inside its span for exact recovery. Every
// function here is the one place its formula is written; the general and
// the fast path of the solve both call them.
//
// Conventions (beam.h): x along the span from its left end (m), loads down +
// (force N, distributed load N/m), couples clockwise + (N m), deflection v
// down + (m), rotation theta = dv/dx (rad). Element end DOFs in the order
// (v0, theta0, v1, theta1); their work-conjugate actions are end forces
// (down +) and end couples (clockwise +).
//
// Sources:
//   Hermite cubics and consistent loads: derived (the Hermite cubics are
//   the exact homogeneous solutions of EI v'''' = 0 with unit end values;
//   the consistent load of a load is its virtual work through each shape
//   function: f_i = integral of w N_i dx, P N_i(a), C N_i'(a)). The same
//   result is in finite-element texts on beam elements (e.g. R. D. Cook et
//   al., "Concepts and Applications of Finite Element Analysis", 4th ed.,
//   Wiley, 2002, ch. 2, from memory).
//   Clamped-clamped Green's function: [Roark] W. C. Young, R. G. Budynas,
//   "Roark's Formulas for Stress and Strain", 7th ed., McGraw-Hill, 2002,
//   Table 8.1 case 1d (from memory); its derivatives are derived.
#pragma once

#include "methods/beam/beam.h"

namespace trivet::stiffness::internal {

// --- Gauss-Legendre rule computed in R ---------------------------------------

constexpr int kGaussPoints = 3;  // exact to degree 5; loads are linear, shapes cubic: degree 4.

template <class R>
struct GaussRule {
  R x[kGaussPoints];  // abscissae on [-1, 1]
  R w[kGaussPoints];  // weights
};

// P_n(x) and P_n'(x) by the three-term recurrence.
template <class R>
void legendre(int n, const R& x, R& p, R& dp) {
  R p0(1), p1 = x;
  for (int k = 2; k <= n; ++k) {
    R p2 = (R(2 * k - 1) * x * p1 - R(k - 1) * p0) / R(k);
    p0 = p1;
    p1 = p2;
  }
  p = p1;
  dp = R(n) * (x * p1 - p0) / (x * x - R(1));
}

// Roots of P_n bracketed on a grid (odd count, so no grid point is 0), then
// bisection and Newton, all in R.
template <class R>
GaussRule<R> make_gauss_rule() {
  GaussRule<R> rule;
  const int n = kGaussPoints;
  const int grid = 64 * n + 1;
  int found = 0;
  R a(-1), pa, da;
  legendre(n, a, pa, da);
  for (int i = 1; i <= grid && found < n; ++i) {
    R b = R(-1) + R(2 * i) / R(grid);
    R pb, db;
    legendre(n, b, pb, db);
    if ((pa < R(0)) != (pb < R(0))) {
      R lo = a, hi = b, plo = pa;
      for (int it = 0; it < 20; ++it) {
        R mid = (lo + hi) / R(2), pm, dm;
        legendre(n, mid, pm, dm);
        if ((pm < R(0)) == (plo < R(0))) {
          lo = mid;
          plo = pm;
        } else {
          hi = mid;
        }
      }
      R x = (lo + hi) / R(2);
      for (int it = 0; it < 12; ++it) {  // quadratic convergence: far past 50 digits
        R p, dp;
        legendre(n, x, p, dp);
        x -= p / dp;
      }
      R p, dp;
      legendre(n, x, p, dp);
      rule.x[found] = x;
      rule.w[found] = R(2) / ((R(1) - x * x) * dp * dp);
      ++found;
    }
    a = b;
    pa = pb;
  }
  return rule;
}

template <class R>
const GaussRule<R>& gauss_rule() {
  static const GaussRule<R> rule = make_gauss_rule<R>();
  return rule;
}

// --- Hermite cubics on an element of length h (s = xi / h) --------------------

template <class R>
void hermite(const R& s, const R& h, R N[4]) {
  const R s2 = s * s, s3 = s2 * s;
  N[0] = R(1) - R(3) * s2 + R(2) * s3;
  N[1] = h * (s - R(2) * s2 + s3);
  N[2] = R(3) * s2 - R(2) * s3;
  N[3] = h * (s3 - s2);
}

template <class R>
void hermite_slope(const R& s, const R& h, R D[4]) {
  const R s2 = s * s;
  D[0] = (R(6) * s2 - R(6) * s) / h;
  D[1] = R(1) - R(4) * s + R(3) * s2;
  D[2] = (R(6) * s - R(6) * s2) / h;
  D[3] = R(3) * s2 - R(2) * s;
}

// --- One load inside a span ------------------------------------------------------

// One load inside a span, local coordinates. Point: `value` = P (N) at `a`.
// Couple: `value` = C (N m) at `a`. Distributed (Udl and Linear alike): wa
// (N/m) at `a` varying linearly to wb at `b`.
template <class R>
struct SpanLoad {
  // No default member initialisers: the solver's arrays of these are made
  // without a fill pass (every field is written before it is read).
  LoadType type;
  R value, a, b, wa, wb;
  bool distributed() const { return type == LoadType::Udl || type == LoadType::Linear; }
};

// --- Consistent (work-equivalent) nodal loads, one function per load type ----------
//
// Each adds to f[0..3] = (force at 0 (N, down +), couple at 0 (N m,
// clockwise +), force at L, couple at L) of the element of length L (m).
// With the Hermite cubics these are exactly minus the fixed-end forces of
// the load (derived: the cubics solve EI v'''' = 0, so the virtual work of
// the load through them is the clamped-end reaction, by Betti).

// A point force P at a: f_i = P N_i(a/L). Derived (virtual work).
template <class R>
inline __attribute__((always_inline)) void consistent_point(const R& P, const R& a, const R& L, const R& invL,
                                                            R f[4]) {
  R N[4];
  hermite(a * invL, L, N);
  for (int i = 0; i < 4; ++i) f[i] += P * N[i];
}

// A clockwise couple C at a: f_i = C N_i'(a/L) (the couple does work
// through the rotation dv/dx). Derived (virtual work).
template <class R>
inline __attribute__((always_inline)) void consistent_couple(const R& C, const R& a, const R& L, const R& invL,
                                                             R f[4]) {
  R D[4];
  hermite_slope(a * invL, L, D);
  for (int i = 0; i < 4; ++i) f[i] += C * D[i];
}

// A uniform load w over the whole span, in closed form: (wL/2, wL^2/12,
// wL/2, -wL^2/12), the integral of consistent_linear done by hand
// (derived; the fixed-end moment wL^2/12 is also [Roark] Table 8.1, the
// fixed-fixed uniform load case, from memory). Other rounding than the
// Gauss rule, the same value.
template <class R>
inline __attribute__((always_inline)) void consistent_full_udl(const R& w, const R& L, R f[4]) {
  const R half_W = w * L / R(2), fm = w * L * L / R(12);
  f[0] += half_W;
  f[1] += fm;
  f[2] += half_W;
  f[3] -= fm;
}

// A load varying linearly from wa at a to wb at b (partial UDL: wa = wb;
// linear or triangular: any wa, wb): f_i = integral over [a, b] of
// w(t) N_i(t/L) dt by the 3-point Gauss-Legendre rule (w linear, N_i cubic:
// degree 4 <= 5, so exact). Derived (virtual work).
template <class R>
inline __attribute__((always_inline)) void consistent_linear(const R& wa, const R& wb, const R& a, const R& b,
                                                             const R& L, const R& invL, R f[4]) {
  const GaussRule<R>& g = gauss_rule<R>();
  const R half = (b - a) / R(2), mid = (a + b) / R(2);
  const R wmid = (wa + wb) / R(2), wslope = (wb - wa) / R(2);
  R N[4];
  for (int q = 0; q < kGaussPoints; ++q) {
    const R xi = g.x[q];
    const R t = mid + half * xi;
    const R w = wmid + wslope * xi;
    hermite(t * invL, L, N);
    const R c = g.w[q] * half * w;
    for (int i = 0; i < 4; ++i) f[i] += c * N[i];
  }
}

// The consistent loads of one span load, by its type (invL = 1 / L, made
// once per span). Added to f. Summed in locals: through the pointer f
// every store would make the compiler read the load's fields again.
template <class R>
inline __attribute__((always_inline)) void add_consistent(const SpanLoad<R>& l, const R& L, const R& invL, R f[4]) {
  R acc[4] = {f[0], f[1], f[2], f[3]};
  if (l.type == LoadType::Point) {
    consistent_point(l.value, l.a, L, invL, acc);
  } else if (l.type == LoadType::Couple) {
    consistent_couple(l.value, l.a, L, invL, acc);
  } else if (!(R(0) < l.a) && !(l.b < L) && !(l.wa < l.wb) && !(l.wb < l.wa)) {  // a == 0, b == L, uniform
    consistent_full_udl(l.wa, L, acc);
  } else {
    consistent_linear(l.wa, l.wb, l.a, l.b, L, invL, acc);
  }
  for (int i = 0; i < 4; ++i) f[i] = acc[i];
}

// --- Clamped-clamped particular solution (exact recovery inside a span) -------------



// The clamped-clamped Green's function of a span of length L (EI = 1):
// G(x, t) is the deflection (down +) at x due to a unit downward force at
// t, zero with zero slope at both ends. For x <= t ([Roark] Table 8.1
// case 1d, from memory; b = L - t):
//   G = b^2 x^2 (3 t L - (2 t + L) x) / (6 L^3),
// and G(x, t) = G(L - x, L - t) for x >= t (mirror image). Returned with
// dG/dx, dG/dt and d2G/dxdt: a clockwise couple C at t deflects the beam by
// C dG/dt (a downward force just right of t and an upward one just left).
template <class R>
struct Green {
  R g, gx, gt, gxt;
};

template <class R>
Green<R> green_left(const R& x, const R& t, const R& L) {  // x <= t
  const R b = L - t, L3 = L * L * L, two_t_L = R(2) * t + L, tL = t * L;
  Green<R> r;
  r.g = b * b * x * x * (R(3) * tL - two_t_L * x) / (R(6) * L3);
  r.gx = b * b * x * (R(2) * tL - two_t_L * x) / (R(2) * L3);
  r.gt = b * x * x * (L * L - R(3) * tL + R(2) * t * x) / (R(2) * L3);
  r.gxt = b * x * (L * L - R(3) * tL + R(3) * t * x) / L3;
  return r;
}

template <class R>
Green<R> green(const R& x, const R& t, const R& L) {
  if (!(t < x)) return green_left(x, t, L);
  Green<R> m = green_left(L - x, L - t, L);
  m.gx = -m.gx;
  m.gt = -m.gt;
  return m;
}

// The same Green's function as a cubic in x with coefficients in t, for
// x <= t: G(x, t) = x^2 g2(t) + x^3 g3(t), with (expanding green_left;
// derived, b = L - t)
//   g2 = b^2 t / (2 L^2),  g3 = -b^2 (2 t + L) / (6 L^3),
// and their t-derivatives g2t = b (L - 3 t) / (2 L^2), g3t = b t / L^3 (so a
// couple C at t gives C (x^2 g2t + x^3 g3t)). For x >= t the mirror image:
// G = x'^2 g2(t') + x'^3 g3(t') with x' = L - x, t' = L - t, and dG/dt =
// -(x'^2 g2t(t') + x'^3 g3t(t')). The coefficients depend on t only, so the
// loads on each side of x sum into four numbers (the recovery by sorted
// positions, stiffness_recovery.h).
template <class R>
struct GreenCoefficients {
  R g2, g3, g2t, g3t;
};

template <class R>
GreenCoefficients<R> green_coefficients(const R& t, const R& L) {
  const R b = L - t, L2 = L * L, L3 = L2 * L;
  GreenCoefficients<R> c;
  c.g2 = b * b * t / (R(2) * L2);
  c.g3 = -(b * b * (R(2) * t + L)) / (R(6) * L3);
  c.g2t = b * (L - R(3) * t) / (R(2) * L2);
  c.g3t = b * t / L3;
  return c;
}

// The particular solution of each load type: EI v and EI v' (N m^3 and
// N m^2; down +, clockwise +) at x of the span clamped at both ends under
// that load alone, added to v and th. Added to the Hermite interpolation
// of the end displacements they give the exact deflection anywhere in the
// span (superposition; derived).

// A point force P at a: P G(x, a).
template <class R>
void particular_point(const R& P, const R& a, const R& x, const R& L, R& v, R& th) {
  const Green<R> G = green(x, a, L);
  v += P * G.g;
  th += P * G.gx;
}

// A clockwise couple C at a: C dG/dt(x, a) (derived: the limit of a
// downward force C/e at a + e/2 and an upward one at a - e/2).
template <class R>
void particular_couple(const R& C, const R& a, const R& x, const R& L, R& v, R& th) {
  const Green<R> G = green(x, a, L);
  v += C * G.gt;
  th += C * G.gxt;
}

// The part over [p, q] (on one side of x) of a load varying linearly from
// wa at a to wb at b: integral over [p, q] of w(t) G(x, t) dt by the Gauss
// rule. G is cubic in t on each side of x and w linear, so degree 4 is
// integrated exactly; hence the split at x.
template <class R>
void particular_linear_part(const R& wa, const R& wb, const R& a, const R& b, const R& p, const R& q, const R& x,
                            const R& L, R& v, R& th) {
  if (!(p < q)) return;
  const GaussRule<R>& g = gauss_rule<R>();
  const R half = (q - p) / R(2), mid = (p + q) / R(2);
  const R slope = (wb - wa) / (b - a);
  for (int k = 0; k < kGaussPoints; ++k) {
    const R t = mid + half * g.x[k];
    const R w = wa + slope * (t - a);
    const Green<R> G = green(x, t, L);
    const R c = g.w[k] * half * w;
    v += c * G.g;
    th += c * G.gx;
  }
}

// A distributed load (full or partial UDL, linear): its parts left and
// right of x.
template <class R>
void particular_linear(const R& wa, const R& wb, const R& a, const R& b, const R& x, const R& L, R& v, R& th) {
  particular_linear_part(wa, wb, a, b, a, x < b ? x : b, x, L, v, th);
  particular_linear_part(wa, wb, a, b, a < x ? x : a, b, x, L, v, th);
}

// The particular solution of one span load, by its type.
template <class R>
void add_particular(const SpanLoad<R>& l, const R& x, const R& L, R& v, R& th) {
  if (l.distributed()) particular_linear(l.wa, l.wb, l.a, l.b, x, L, v, th);
  else if (l.type == LoadType::Point) particular_point(l.value, l.a, x, L, v, th);
  else particular_couple(l.value, l.a, x, L, v, th);
}

}  // namespace trivet::stiffness::internal
