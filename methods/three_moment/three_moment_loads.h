// trivet: the load terms of the three-moment method, one load at a time.
// Private: included by three_moment.cpp only.
//
// Conventions of methods/beam/beam.h: loads down +, couples clockwise +,
// M sagging +, V = dM/dx. Positions are local to the (possibly merged)
// span, lengths in the beam's length unit, forces in its force unit.
//
// Area-moment load terms, derived by superposing point loads. A unit load at
// a on the simply supported span gives the triangle M0 with peak a(L-a)/L at
// a: area a(L-a)/2, centroid (L+a)/3 from the left, so
//   FL = P a b (L + a)/6,   FR = P a b (L + b)/6,   b = L - a.
// A distributed load q(t) over [c, d] is the integral of these point terms:
//   FL = int q(t) gL(t) dt,  gL(t) = t (L^2 - t^2)/6,  FR uses gR(t) = gL(L-t).
// With t = c + tau, q = w1 + s tau (s = (w2 - w1)/(d - c)), delta = d - c and
// m_k = int_0^delta q tau^k dtau = w1 delta^{k+1}/(k+1) + s delta^{k+2}/(k+2):
//   6 FL = (L^2 c - c^3) m0 + (L^2 - 3c^2) m1 - 3 c m2 - m3,
//   6 FR = (L^2 e - e^3) m0 - (L^2 - 3e^2) m1 - 3 e m2 + m3,  e = L - c.
// A clockwise couple C at a: reactions -C/L, +C/L, so M0 = -C x/L (x < a)
// and C (1 - x/L) (x > a); integrating,
//   FL = C (L^2 - 3 a^2)/6,   FR = C (2 L^2 - 6 a L + 3 a^2)/6.
//
#pragma once

#include <cstddef>
#include <utility>

#include "methods/beam/beam.h"
#include "methods/three_moment/three_moment_detail.h"

namespace trivet::three_moment {
namespace {

enum class Kind { Point, Couple, Ramp };

// One load on a (possibly merged) span, local positions. No default
// member values: the array of them is allocated uninitialised (for
// built-in numbers) and every element is written whole before it is read;
// a lone one is made with `{}` (zeros).
template <class R>
struct SpanLoad {
  Kind kind;
  R a;   // Point/Couple: position; Ramp: start c
  R d;   // Ramp: end
  R p;   // Point: P; Couple: C; Ramp: w1 (intensity at c)
  R w2;  // Ramp: intensity at d
  R s;   // Ramp: slope (w2 - w1)/(d - c)
};

// Effects at x of the loads left of x (a cantilever built in at x):
// shear V, moment M, and the integrals I1 = int_0^x M, I2 = int_0^x int M.
template <class R>
struct Sums {
  R V{0}, M{0}, I1{0}, I2{0};
};

// A load q(tau) = w + k tau starting at tau = 0, integrated to u > 0.
// sign: +1 to add the load, -1 to remove it (the continuation past `d`).
template <class R>
void add_ramp(Sums<R>& s, const R& u, const R& w, const R& k, bool remove) {
  const R u2 = u * u, u3 = u2 * u, u4 = u3 * u, u5 = u4 * u;
  const R dV = w * u + k * u2 / R(2);
  const R dM = w * u2 / R(2) + k * u3 / R(6);
  const R d1 = w * u3 / R(6) + k * u4 / R(24);
  const R d2 = w * u4 / R(24) + k * u5 / R(120);
  if (remove) {
    s.V += dV; s.M += dM; s.I1 += d1; s.I2 += d2;
  } else {
    s.V -= dV; s.M -= dM; s.I1 -= d1; s.I2 -= d2;
  }
}

// Reciprocals of the small integers of the load formulas, made once per
// solve so that the loops over the spans multiply instead of divide (exact
// in rational arithmetic; a rounding in floating point).
template <class R>
struct Consts {
  R two = R(2), three = R(3), six = R(6);
  R half = R(1) / R(2), third = R(1) / R(3), quarter = R(1) / R(4), fifth = R(1) / R(5);
  R sixth = R(1) / R(6), r24 = R(1) / R(24), r120 = R(1) / R(120);
};

// True for an exact zero (false for NaN): a uniform load's slope.
template <class R>
TM_INLINE inline bool flat(const R& s) {
  return s <= R(0) && s >= R(0);
}

// ---- The load terms, one function per load type. Each adds one load's
// 6 FL and 6 FR to the sums FL6, FR6: six times the first moments of the
// load's free (simply supported) moment diagram about the span's left end
// (FL = A abar) and right end (FR = A bbar). Units: force x length^3 (the
// 6 A abar / L of the textbooks times L). Signs: loads down +, couples
// clockwise +, M0 sagging +, so a downward load gives FL, FR > 0. L2 = L*L.
// The three-moment equation (three_moment.cpp) divides them by EI L.

// A point load P at a (0 <= a <= L), b = L - a. Derived (file head): the
// free diagram is a triangle of peak P a b / L at a, area P a b / 2,
// centroid (L + a)/3 from the left end and (L + b)/3 from the right, so
//   6 FL = P a b (L + a),   6 FR = P a b (L + b).
// Check, from memory (the usual table of 6 A abar / L): P a b (L + a)/L.
template <class R>
TM_INLINE inline void add_point6(R& FL6, R& FR6, const R& P, const R& a, const R& L) {
  const R b = L - a;
  const R pab = P * a * b;
  FL6 += pab * (L + a);
  FR6 += pab * (L + b);
}

// A clockwise couple C at a (0 <= a <= L). Derived (file head): reactions
// -C/L at the left end and +C/L at the right (up +), so M0 = -C x / L for
// x < a and C (1 - x / L) for x > a; integrating x M0 and (L - x) M0,
//   6 FL = C (L^2 - 3 a^2),   6 FR = C (2 L^2 - 6 a L + 3 a^2).
// Check: at a = L/2, 6 FL = C L^2 / 4 = -6 FR (antisymmetric diagram).
template <class R>
TM_INLINE inline void add_couple6(R& FL6, R& FR6, const R& C, const R& a, const R& L, const R& L2,
                                  const Consts<R>& k) {
  const R a2 = a * a;
  FL6 += C * (L2 - k.three * a2);
  FR6 += C * (k.two * L2 - k.six * a * L + k.three * a2);
}

// The moments m_k = int_0^delta q(tau) tau^k dtau, k = 0..3, of a load
// q(tau) = w1 + s tau over delta = d - c, and from them the terms of a
// distributed load over [c, d]. Derived (file head): superposing point
// loads q(t) dt, FL = int_c^d q(t) t (L^2 - t^2)/6 dt and FR the mirror
// image; with t = c + tau and e = L - c,
//   6 FL = (L^2 c - c^3) m0 + (L^2 - 3 c^2) m1 - 3 c m2 - m3,
//   6 FR = (L^2 e - e^3) m0 - (L^2 - 3 e^2) m1 - 3 e m2 + m3.
template <class R>
TM_INLINE inline void add_distributed6(R& FL6, R& FR6, const R& c, const R& m0, const R& m1, const R& m2,
                                       const R& m3, const R& L, const R& L2, const Consts<R>& k) {
  const R e = L - c;
  const R c2 = c * c, e2 = e * e;
  FL6 += (L2 * c - c2 * c) * m0 + (L2 - k.three * c2) * m1 - k.three * c * m2 - m3;
  FR6 += (L2 * e - e2 * e) * m0 - (L2 - k.three * e2) * m1 - k.three * e * m2 + m3;
}

// The moments m0..m3 of a distributed load (above), for add_distributed6.
template <class R>
struct LoadMoments {
  R m0, m1, m2, m3;
};

// A uniform load w (force/length, down +) over [c, d], full (c = 0, d = L)
// or partial: m_k = w delta^{k+1}/(k+1). Check, from memory (the usual
// table of 6 A abar / L): a full span gives 6 FL = 6 FR = w L^4 / 4, that
// is w L^3 / 4 after the division by L (parabola of peak w L^2/8, area
// w L^3/12, centroid at mid-span).
template <class R>
TM_INLINE inline LoadMoments<R> udl_moments(const R& w, const R& c, const R& d, const Consts<R>& k) {
  const R dl = d - c;
  const R d2 = dl * dl, d3 = d2 * dl, d4 = d3 * dl;
  return {R(w * dl), R(w * d2 * k.half), R(w * d3 * k.third), R(w * d4 * k.quarter)};
}

// A linearly varying load from w1 at c to w1 + s (d - c) at d (force/length,
// down +; s its slope, force/length^2): m_k = w1 delta^{k+1}/(k+1)
// + s delta^{k+2}/(k+2). Derived (as above); s = 0 gives udl_moments.
template <class R>
TM_INLINE inline LoadMoments<R> linear_moments(const R& w1, const R& s, const R& c, const R& d, const Consts<R>& k) {
  const R dl = d - c;
  const R d2 = dl * dl, d3 = d2 * dl, d4 = d3 * dl, d5 = d4 * dl;
  return {R(w1 * dl + s * d2 * k.half), R(w1 * d2 * k.half + s * d3 * k.third),
          R(w1 * d3 * k.third + s * d4 * k.quarter), R(w1 * d4 * k.quarter + s * d5 * k.fifth)};
}

// One load's terms, by its kind (a ramp of slope exactly 0 is a UDL).
template <class R>
TM_INLINE inline void add_free_moments6(R& FL6, R& FR6, const SpanLoad<R>* l, const R& L, const R& L2,
                                        const Consts<R>& k) {
  switch (l->kind) {
    case Kind::Point: add_point6(FL6, FR6, l->p, l->a, L); break;
    case Kind::Couple: add_couple6(FL6, FR6, l->p, l->a, L, L2, k); break;
    case Kind::Ramp: {
      const LoadMoments<R> m =
          flat(l->s) ? udl_moments(l->p, l->a, l->d, k) : linear_moments(l->p, l->s, l->a, l->d, k);
      add_distributed6(FL6, FR6, l->a, m.m0, m.m1, m.m2, m.m3, L, L2, k);
      break;
    }
  }
}
// The sum over the loads [l, end), returned as {6 FL, 6 FR}.
template <class R>
TM_INLINE inline std::pair<R, R> free_moments6(const SpanLoad<R>* l, const SpanLoad<R>* end, const R& L, const Consts<R>& k) {
  const R L2 = L * L;
  R FL6{0}, FR6{0};
  for (; l != end; ++l) add_free_moments6(FL6, FR6, l, L, L2, k);
  return {std::move(FL6), std::move(FR6)};
}

// What the statics and the node values need of a segment's loads [l, end):
// the effects at x = L of the loads left of L (as `sums` with incl false:
// a force or couple exactly at L left out), and the point forces and
// couples exactly at L and exactly at 0.
template <class R>
struct EndSums {
  Sums<R> s;
  R PL{0}, CL{0}, P0{0}, C0{0};
};
// The sums are kept in locals (registers, for double) while the loads are
// read; a ramp's terms are those of add_ramp with the constants of `k`.
template <class R>
TM_INLINE inline EndSums<R> end_sums(const SpanLoad<R>* l, const SpanLoad<R>* end, const R& L, const Consts<R>& k) {
  R V{0}, M{0}, I1{0}, I2{0}, PL{0}, CL{0}, P0{0}, C0{0};
  // The load w + slope tau from tau = 0, integrated to u > 0; `remove` for
  // the continuation past its end, which is taken off again.
  auto ramp = [&](const R& u, const R& w, const R& slope, bool flat_load, bool remove) TM_INLINE {
    const R u2 = u * u, u3 = u2 * u, u4 = u3 * u;
    R dV = w * u, dM = w * u2 * k.half, d1 = w * u3 * k.sixth, d2 = w * u4 * k.r24;
    if (!flat_load) {
      const R u5 = u4 * u;
      dV += slope * u2 * k.half;
      dM += slope * u3 * k.sixth;
      d1 += slope * u4 * k.r24;
      d2 += slope * u5 * k.r120;
    }
    if (remove) {
      V += dV; M += dM; I1 += d1; I2 += d2;
    } else {
      V -= dV; M -= dM; I1 -= d1; I2 -= d2;
    }
  };
  for (; l != end; ++l) {
    switch (l->kind) {
      case Kind::Point:
        if (l->a < L) {
          const R t = L - l->a;
          const R pt2 = l->p * t * t;
          V -= l->p;
          M -= l->p * t;
          I1 -= pt2 * k.half;
          I2 -= pt2 * t * k.sixth;
        } else if (same(l->a, L)) {
          PL += l->p;
        }
        if (is_zero(l->a)) P0 += l->p;
        break;
      case Kind::Couple:
        if (l->a < L) {
          const R t = L - l->a;
          M += l->p;
          I1 += l->p * t;
          I2 += l->p * t * t * k.half;
        } else if (same(l->a, L)) {
          CL += l->p;
        }
        if (is_zero(l->a)) C0 += l->p;
        break;
      case Kind::Ramp: {
        const bool fl = flat(l->s);
        if (l->a < L) ramp(R(L - l->a), l->p, l->s, fl, false);
        if (l->d < L) ramp(R(L - l->d), l->w2, l->s, fl, true);
        break;
      }
    }
  }
  EndSums<R> r;
  r.s.V = std::move(V); r.s.M = std::move(M); r.s.I1 = std::move(I1); r.s.I2 = std::move(I2);
  r.PL = std::move(PL); r.CL = std::move(CL); r.P0 = std::move(P0); r.C0 = std::move(C0);
  return r;
}

// One span load of the input as a SpanLoad, positions local to its span
// (the caller adds the span's offset in a merged segment). Written in
// place: a copy of the finished struct costs more than filling it. One
// function per kind, so that a caller that has already switched on the
// load's type (the fast path, which validates in the same switch) does not
// test it again; copy_load dispatches for the general path.
template <class R>
TM_INLINE inline void copy_point(SpanLoad<R>& sl, const BasicLoad<R>& l) {
  sl.kind = Kind::Point; sl.a = l.at; sl.p = l.P; sl.d = sl.w2 = sl.s = R(0);  // all written
}
template <class R>
TM_INLINE inline void copy_couple(SpanLoad<R>& sl, const BasicLoad<R>& l) {
  sl.kind = Kind::Couple; sl.a = l.at; sl.p = l.C; sl.d = sl.w2 = sl.s = R(0);
}
// A uniform load: w2 = w1 and slope 0 ((w - w)/(to - from), without the division).
template <class R>
TM_INLINE inline void copy_udl(SpanLoad<R>& sl, const BasicLoad<R>& l) {
  sl.kind = Kind::Ramp; sl.a = l.from; sl.d = l.to; sl.p = l.w1; sl.w2 = l.w1; sl.s = R(0);
}
// A linearly varying load from w1 at `from` to w2 at `to`.
template <class R>
TM_INLINE inline void copy_linear(SpanLoad<R>& sl, const BasicLoad<R>& l) {
  sl.kind = Kind::Ramp; sl.a = l.from; sl.d = l.to; sl.p = l.w1; sl.w2 = l.w2;
  sl.s = (l.w2 - l.w1) / (l.to - l.from);
}
template <class R>
TM_INLINE inline void copy_load(SpanLoad<R>& sl, const BasicLoad<R>& l) {
  switch (l.type) {
    case LoadType::Point: copy_point(sl, l); break;
    case LoadType::Couple: copy_couple(sl, l); break;
    case LoadType::Udl: copy_udl(sl, l); break;
    case LoadType::Linear: copy_linear(sl, l); break;
  }
}

}  // namespace
}  // namespace trivet::three_moment
