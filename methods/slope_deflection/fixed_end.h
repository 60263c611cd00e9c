// trivet, slope-deflection: the closed forms of each span load, one
// function per load type. Everything the method knows about a load is here:
//
//   *_terms(...)   what the load gives its span as a whole: the fixed-end
//                  moments, and the simple-beam sums at the right end from
//                  which the span's reactions and elastic curve follow.
//   *_inside(...)  the load's part of the simple-beam diagrams at a point x
//                  of the span (the "particular" values).
//   *_moments(...) a distributed load's moments about its two ends, which
//                  both of the above need.
//
// Units: lengths L, forces F; P in F, C in F*L, w in F/L; moments F*L.
// Positions are local to the span, 0 at its left end i, L at its right end j.
//
// Sign conventions. Loads as in methods/beam/beam.h: P and w downward +,
// C clockwise +. Fixed-end moments in the member-end convention of the
// slope-deflection method: moments acting ON the member ends, clockwise +
// (a downward load gives M_ij < 0 and M_ji > 0). The "inside" values are
// those of the span as a simple beam with the left reaction left out:
//
//   m0(x) = R_i0 x + moment(x)        (sagging +, R_i0 the left reaction)
//   V0(x) = R_i0 + shear(x)           (V = dM/dx)
//   slope(x) = integral_0^x moment,   curve(x) = integral_0^x slope
//
// For one load, with I_n(x) = integral over t < x of w(t) (x - t)^n dt:
//   shear = -I_0, moment = -I_1, slope = -I_2 / 2, curve = -I_3 / 6,
// a point force being w = P delta(t - a), so I_n = P (x - a)^n, and a
// clockwise couple C at a being w = -C delta'(t - a), so I_n = -n C (x-a)^(n-1).
//
// Sources of the fixed-end moments: R. C. Hibbeler, "Structural Analysis",
// 8th ed., Pearson Prentice Hall, 2012, table of fixed-end moments inside
// the back cover (point load, uniform load, triangular load); T. G. Hicks,
// "Civil Engineering Formulas", 2nd ed., McGraw-Hill, 2010, fixed-end
// moment table (couple). Both from memory; every formula here is also
// derived in its comment (the point-load values integrated or
// differentiated), and the tests check each against the span's elastic
// curve by compatibility (tests/slope_deflection_test.cpp, FixedEndMoments).
#pragma once

#include "methods/slope_deflection/plumbing.h"
#include "methods/slope_deflection/slope_deflection.h"

namespace trivet::slope_deflection::detail {

// A load's part of the simple-beam diagrams at one point (see above).
template <class R>
struct LoadParts {
  R shear{0};   // part of V0(x)
  R moment{0};  // part of m0(x)
  R slope{0};   // its integral from 0
  R curve{0};   // its double integral from 0
};

// What one load gives its span as a whole.
template <class R>
struct LoadTerms {
  R fem_i{0};   // fixed-end moment M_ij^F at the left end, clockwise +
  R fem_j{0};   // fixed-end moment M_ji^F at the right end, clockwise +
  R force{0};   // total downward force W; the simple-beam reactions are
  R moment{0};  //   R_i0 = moment / L and R_j0 = W - R_i0, where moment is
                //   minus m0's load part just past L: sum of P (L - a),
                //   minus sum of C, plus the distributed loads' share
  R curve{0};   // curve(L+), the load part of the double integral at L
};

// Sums the terms of loads on one span.
template <class R>
TRIVET_SD_INLINE void add_terms(LoadTerms<R>& to, const LoadTerms<R>& t) {
  to.fem_i += t.fem_i;
  to.fem_j += t.fem_j;
  to.force += t.force;
  to.moment += t.moment;
  to.curve += t.curve;
}

// Fixed-end shears: the upward end forces on the span fixed at both ends,
// by statics of the span under the loads and the fixed-end moments:
//   V_i^F = R_i0 - (M_ij^F + M_ji^F) / L,   V_j^F = W - V_i^F.
// `invL` is 1 / L.
template <class R>
TRIVET_SD_INLINE EndPair<R> fixed_end_shears(const LoadTerms<R>& t, const R& invL) {
  EndPair<R> v;
  v.left = (t.moment - t.fem_i - t.fem_j) * invL;
  v.right = t.force - v.left;
  return v;
}

// ---------------------------------------------------------------------------
// Point force P (down +) at a, 0 < a < L, b = L - a.
//
// Fixed-end moments (Hibbeler's table): M_ij^F = -P a b^2 / L^2,
// M_ji^F = +P a^2 b / L^2. Derived: the simple-span end rotations
// (Roark's Table 8.1, from memory) are theta_i = P a b (L + b) / (6 EI L),
// theta_j = -P a b (L + a) / (6 EI L); end moments cancelling them solve
// (2EI/L)(2 t_i + t_j) = -M_ij^F, (2EI/L)(t_i + 2 t_j) = -M_ji^F.
// `invL2` is 1 / L^2.
template <class R>
TRIVET_SD_INLINE LoadTerms<R> point_terms(const R& P, const R& a, const R& L, const R& invL2) {
  const R b = L - a;
  const R Pab = P * a * b;
  LoadTerms<R> t;
  t.fem_i = -Pab * b * invL2;
  t.fem_j = Pab * a * invL2;
  t.force = P;
  t.moment = P * b;
  t.curve = -P * b * b * b * (R(1) / R(6));  // -P (L - a)^3 / 6
  return t;
}

// Inside values: past the force (x > a, or x == a with `after`), d = x - a:
// V -= P, m0 -= P d, slope -= P d^2 / 2, curve -= P d^3 / 6.
template <class R>
void point_inside(const R& P, const R& a, const R& x, bool after, LoadParts<R>& out) {
  const R d = x - a;
  if (!(d > R(0)) && !(after && !(d < R(0)))) return;
  out.shear -= P;
  out.moment -= P * d;
  out.slope -= P * d * d / R(2);
  out.curve -= P * d * d * d / R(6);
}

// ---------------------------------------------------------------------------
// Couple C (clockwise +) at a, 0 <= a <= L, b = L - a.
//
// Fixed-end moments (Hicks's table): M_ij^F = C b (2a - b) / L^2,
// M_ji^F = C a (2b - a) / L^2. Derived: a clockwise couple C at a is the
// limit of a downward force C/e at a + e/2 and an upward one at a - e/2,
// so its values are C times the derivative in a of the point-load values
// per unit force: d/da (-a b^2 / L^2) = b (2a - b) / L^2 and
// d/da (a^2 b / L^2) = a (2b - a) / L^2.
template <class R>
TRIVET_SD_INLINE LoadTerms<R> couple_terms(const R& C, const R& a, const R& L, const R& invL2) {
  const R b = L - a;
  LoadTerms<R> t;
  t.fem_i = C * b * (R(2) * a - b) * invL2;
  t.fem_j = C * a * (R(2) * b - a) * invL2;
  t.moment = -C;
  t.curve = C * b * b * (R(1) / R(2));  // C (L - a)^2 / 2
  return t;
}

// Inside values: past the couple (x > a, or x == a with `after`), d = x - a:
// m0 += C, slope += C d, curve += C d^2 / 2; no shear.
template <class R>
void couple_inside(const R& C, const R& a, const R& x, bool after, LoadParts<R>& out) {
  const R d = x - a;
  if (!(d > R(0)) && !(after && !(d < R(0)))) return;
  out.moment += C;
  out.slope += C * d;
  out.curve += C * d * d / R(2);
}

// The end-couple correction, the one place it is written. The internal
// moment limits at a node are taken from inside the adjoining span
// (beam.h), and a couple acting exactly at a span end lies on the far side
// of one of them: a couple at local 0 acts before the inside limit at 0, a
// couple at local L after the inside limit at L. So the limits are
//   M(0+) = M_ij + (couples at 0),   M(L-) = -M_ji - (couples at L).
// Adds the couple C at a to the sums of the span's end couples.
template <class R>
void add_end_couple(const R& C, const R& a, const R& L, R& at_start, R& at_end) {
  if (!(a > R(0))) at_start += C;
  if (!(a < L)) at_end += C;
}

// ---------------------------------------------------------------------------
// Distributed loads: w(x) from x1 to x2 (h = x2 - x1 >= 0), linear in x.
//
// Fixed-end moments: the point-load values integrated over the load,
//   M_ij^F = -(1/L^2) int w(x) x (L - x)^2 dx,
//   M_ji^F = +(1/L^2) int w(x) x^2 (L - x) dx.
// With x = x1 + u and b1 = L - x1, expanded in u, they need only the
// moments m_k = int_0^h w(x1 + u) u^k du of the load about its start:
//   int w x (L-x)^2   = x1 b1^2 m0 + (b1^2 - 2 x1 b1) m1 + (x1 - 2 b1) m2 + m3
//   int w x^2 (L-x)   = x1^2 b1 m0 + (2 x1 b1 - x1^2) m1 + (b1 - 2 x1) m2 - m3
// (every product of lengths at most L^3, no division by h, nothing
// cancelling a larger term for a load that is short or far from an end).
// The inside values need the moments c_k = int_0^h w(x2 - s) s^k ds about
// its end, in the same way.
template <class R>
struct SpreadMoments {
  R about_start[4];  // m_k
  R about_end[4];    // c_k
};

template <class R>
TRIVET_SD_INLINE LoadTerms<R> spread_terms(const SpreadMoments<R>& mo, const R& x1, const R& x2, const R& L, const R& invL2) {
  const R* m = mo.about_start;
  const R* c = mo.about_end;
  const R b1 = L - x1;
  LoadTerms<R> t;
  const R left = x1 * b1 * b1 * m[0] + (b1 * b1 - R(2) * x1 * b1) * m[1] + (x1 - R(2) * b1) * m[2] + m[3];
  const R right = x1 * x1 * b1 * m[0] + (R(2) * x1 * b1 - x1 * x1) * m[1] + (b1 - R(2) * x1) * m[2] - m[3];
  t.fem_i = -left * invL2;
  t.fem_j = right * invL2;
  // At L, E = L - x2 past the load's end: I_n(L) = sum_k C(n,k) E^(n-k) c_k.
  const R E = L - x2;
  t.force = c[0];
  t.moment = E * c[0] + c[1];
  t.curve = -(E * E * E * c[0] + R(3) * E * E * c[1] + R(3) * E * c[2] + c[3]) * (R(1) / R(6));
  return t;
}

// Partial uniform load w from x1 to x2 (Hibbeler's table gives the whole
// span's case, M_ij^F = -w L^2 / 12, M_ji^F = +w L^2 / 12, which this is
// at x1 = 0, x2 = L). Moments of a uniform load about either end:
// m_k = c_k = w h^(k+1) / (k+1).
template <class R>
TRIVET_SD_INLINE SpreadMoments<R> udl_moments(const R& w, const R& x1, const R& x2) {
  const R h = x2 - x1;
  SpreadMoments<R> mo;
  R hk = h;  // h^(k+1)
  for (int k = 0; k < 4; ++k) {
    mo.about_start[k] = mo.about_end[k] = w * hk * (R(1) / R(k + 1));
    hk = hk * h;
  }
  return mo;
}

template <class R>
TRIVET_SD_INLINE LoadTerms<R> udl_terms(const R& w, const R& x1, const R& x2, const R& L, const R& invL2) {
  return spread_terms(udl_moments(w, x1, x2), x1, x2, L, invL2);
}

// Linear (trapezoidal, triangular) load, w1 at x1 to w2 at x2 (Hibbeler's
// table: a triangle rising from 0 at i to w at j over the whole span gives
// M_ij^F = -w L^2 / 30, M_ji^F = +w L^2 / 20). Moments about the start, w
// rising from w1 to w2 over h:
//   m_k = int_0^h (w1 + (w2 - w1) u / h) u^k du = h^(k+1) (w1 + (k+1) w2) / ((k+1)(k+2)),
// and about the end the same with w1 and w2 exchanged.
template <class R>
TRIVET_SD_INLINE SpreadMoments<R> linear_moments(const R& w1, const R& w2, const R& x1, const R& x2) {
  const R h = x2 - x1;
  SpreadMoments<R> mo;
  R hk = h;
  for (int k = 0; k < 4; ++k) {
    const R inv_den = R(1) / R((k + 1) * (k + 2));
    mo.about_start[k] = hk * (w1 + R(k + 1) * w2) * inv_den;
    mo.about_end[k] = hk * (w2 + R(k + 1) * w1) * inv_den;
    hk = hk * h;
  }
  return mo;
}

template <class R>
TRIVET_SD_INLINE LoadTerms<R> linear_terms(const R& w1, const R& w2, const R& x1, const R& x2, const R& L, const R& invL2) {
  return spread_terms(linear_moments(w1, w2, x1, x2), x1, x2, L, invL2);
}

// Inside values of a linear load p at a to q at b (a uniform load is
// p == q): I_n(x) = integral over the load, t < x, of w(t) (x - t)^n dt.
//   a < x <= b, d = x - a, w(t) = p + (q - p)(t - a)/h:
//     I_n = p d^(n+1)/(n+1) + (q - p)(d/h) d^(n+1)/((n+1)(n+2));
//   x > b, E = x - b, (x - t)^n = (E + s)^n with s = b - t:
//     I_n = sum_k C(n,k) E^(n-k) c_k.
template <class R>
void spread_inside(const R& p, const R& q, const R& a, const R& b, const R& x, LoadParts<R>& out) {
  if (!(x > a)) return;
  R I[4];
  const R h = b - a;
  if (!(x > b)) {
    const R d = x - a;
    const R r = (q - p) * (d / h);
    R dn = d;  // d^(n+1)
    for (int n = 0; n < 4; ++n) {
      I[n] = p * dn / R(n + 1) + r * dn / R((n + 1) * (n + 2));
      dn = dn * d;
    }
  } else {
    const R E = x - b;
    R c[4];
    R hk = h;
    for (int k = 0; k < 4; ++k) {
      c[k] = hk * (q + R(k + 1) * p) / R((k + 1) * (k + 2));
      hk = hk * h;
    }
    I[0] = c[0];
    I[1] = E * c[0] + c[1];
    I[2] = E * E * c[0] + R(2) * E * c[1] + c[2];
    I[3] = E * E * E * c[0] + R(3) * E * E * c[1] + R(3) * E * c[2] + c[3];
  }
  out.shear -= I[0];
  out.moment -= I[1];
  out.slope -= I[2] / R(2);
  out.curve -= I[3] / R(6);
}

}  // namespace trivet::slope_deflection::detail
