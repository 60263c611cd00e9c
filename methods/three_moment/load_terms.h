// trivet three-moment method: the load terms, one function per load type.
//
// Private to methods/three_moment (included by three_moment.cpp only).
// Conventions of methods/beam/beam.h: loads down +, couples clockwise +,
// M sagging +, V = dM/dx. Positions are local to a span of length L, from
// its left end.
//
// Two kinds of term per load, both derived here (our own derivation; the
// method itself is Clapeyron's, as in any text on indeterminate beams):
//
// 1. The load terms of the three-moment equation. The "free" moment
//    diagram M0 is that of the span simply supported under its own loads.
//    FL = integral of M0(x) x dx (its first moment about the LEFT end, the
//    area A times the centroid distance a-bar from the left), FR = integral
//    of M0(x) (L - x) dx (about the RIGHT end). The functions return 6 FL
//    and 6 FR (units F*L^3): the three-moment equation carries 6 A a-bar/L
//    = 6 FL/L, and the factor 6 keeps the point-load terms free of
//    fractions.
//
// 2. The values inside a span. For a point x of the span, the effects of the
//    loads to the LEFT of x as on a cantilever built in at x: the shear V
//    (F), the moment M (F*L), and its integrals I1 = int_0^x M (F*L^2) and
//    I2 = int_0^x int_0^xi M (F*L^3). With the span's left-end moment MA and
//    shear V0, the moment in the span is MA + V0 x + M(x), and the rotation
//    and deflection follow from EI theta' = -M by I1 and I2
//    (span_state.h, eval).
#pragma once

#include <cmath>
#include <type_traits>
#include <utility>

#include "methods/beam/beam.h"

namespace trivet::three_moment::detail {

// The helpers below are called from the loops over every span; GCC would
// otherwise keep some out of line, and the calls cost more than the bodies.
#if defined(__GNUC__)
#define TM_INLINE __attribute__((always_inline))
#else
#define TM_INLINE
#endif

template <class R>
TM_INLINE inline bool same(const R& a, const R& b) {
  return !(a < b) && !(b < a);
}
template <class R>
TM_INLINE inline bool is_zero(const R& a) {
  return same(a, R(0));
}
// False for NaN and infinities (x - x is NaN there; NaN compares false).
template <class R>
TM_INLINE inline bool finite(const R& a) {
  if constexpr (std::is_floating_point_v<R>) {
    return std::isfinite(a);
  } else {
    const R d = a - a;
    return d <= R(0) && d >= R(0);
  }
}
// True for an exact zero (false for NaN): a uniform load's slope.
template <class R>
TM_INLINE inline bool flat(const R& s) {
  return s <= R(0) && s >= R(0);
}

// Reciprocals of the small integers of the formulas, made once per solve so
// that the loops multiply instead of divide (exact in rational arithmetic;
// one rounding in floating point).
template <class R>
struct Consts {
  R two = R(2), three = R(3), six = R(6);
  R half = R(1) / R(2), third = R(1) / R(3), quarter = R(1) / R(4), fifth = R(1) / R(5);
  R sixth = R(1) / R(6), r24 = R(1) / R(24), r120 = R(1) / R(120);
};

enum class Kind { Point, Couple, Ramp };

// One load of a span, local positions. No default member values: arrays of
// them are allocated uninitialised and written whole before they are read.
template <class R>
struct SpanLoad {
  Kind kind;
  R a;   // Point, Couple: position; Ramp: start c
  R d;   // Ramp: end
  R p;   // Point: P; Couple: C; Ramp: w1 (intensity at c)
  R w2;  // Ramp: intensity at d
  R s;   // Ramp: slope (w2 - w1)/(d - c)
};

// ---------------------------------------------------------------------------
// 1. Three-moment load terms: 6 FL and 6 FR, added to FL6 and FR6.

// Point force P (F, down +) at a, b = L - a. Simply supported, M0 is a
// triangle of peak P a b/L at a: area A = P a b/2, centroid (L + a)/3 from
// the left end and (L + b)/3 from the right, so
//   6 FL = P a b (L + a),   6 FR = P a b (L + b).
template <class R>
TM_INLINE inline void point_terms6(R& FL6, R& FR6, const R& P, const R& a, const R& L) {
  const R b = L - a;
  const R pab = P * a * b;
  FL6 += pab * (L + a);
  FR6 += pab * (L + b);
}

// Clockwise couple C (F*L) at a, 0 <= a <= L. Simply supported, the
// reactions are -C/L (left) and +C/L (right), so M0 = -C x/L for x < a and
// C (1 - x/L) for x > a. Integrating x M0 and (L - x) M0 over the span:
//   6 FL = C (L^2 - 3 a^2),   6 FR = C (2 L^2 - 6 a L + 3 a^2).
template <class R>
TM_INLINE inline void couple_terms6(R& FL6, R& FR6, const R& C, const R& a, const R& L2, const R& L,
                                    const Consts<R>& k) {
  const R a2 = a * a;
  FL6 += C * (L2 - k.three * a2);
  FR6 += C * (k.two * L2 - k.six * a * L + k.three * a2);
}

// Distributed load q(t) = w1 + s (t - c) (F/L, down +) from c to d. It is
// the integral of point loads q(t) dt, whose terms (point_terms6 over 6)
// are gL(t) = t (L^2 - t^2)/6 and gR(t) = gL(L - t) per unit force. With
// t = c + tau, delta = d - c and the load's moments
// m_k = int_0^delta q tau^k dtau = w1 delta^(k+1)/(k+1) + s delta^(k+2)/(k+2),
// expanding gL and gR in powers of tau:
//   6 FL = (L^2 c - c^3) m0 + (L^2 - 3 c^2) m1 - 3 c m2 - m3,
//   6 FR = (L^2 e - e^3) m0 - (L^2 - 3 e^2) m1 - 3 e m2 + m3,   e = L - c.
// (A full-span uniform load gives 6 FL = 6 FR = w L^4/4, the classical
// 6 A a-bar/L = w L^3/4.)
template <class R>
TM_INLINE inline void ramp_terms6(R& FL6, R& FR6, const R& w1, const R& s, const R& c, const R& d, const R& L2,
                                  const R& L, const Consts<R>& k) {
  const R e = L - c, dl = d - c;
  const R d2 = dl * dl, d3 = d2 * dl, d4 = d3 * dl;
  R m0 = w1 * dl, m1 = w1 * d2 * k.half, m2 = w1 * d3 * k.third, m3 = w1 * d4 * k.quarter;
  if (!flat(s)) {
    const R d5 = d4 * dl;
    m0 += s * d2 * k.half;
    m1 += s * d3 * k.third;
    m2 += s * d4 * k.quarter;
    m3 += s * d5 * k.fifth;
  }
  const R c2 = c * c, e2 = e * e;
  FL6 += (L2 * c - c2 * c) * m0 + (L2 - k.three * c2) * m1 - k.three * c * m2 - m3;
  FR6 += (L2 * e - e2 * e) * m0 - (L2 - k.three * e2) * m1 - k.three * e * m2 + m3;
}

// One load's terms, by its kind (L2 = L * L).
template <class R>
TM_INLINE inline void add_terms6(R& FL6, R& FR6, const SpanLoad<R>& l, const R& L, const R& L2, const Consts<R>& k) {
  switch (l.kind) {
    case Kind::Point: point_terms6(FL6, FR6, l.p, l.a, L); break;
    case Kind::Couple: couple_terms6(FL6, FR6, l.p, l.a, L2, L, k); break;
    case Kind::Ramp: ramp_terms6(FL6, FR6, l.p, l.s, l.a, l.d, L2, L, k); break;
  }
}

// {6 FL, 6 FR} of the loads [l, end) of a span of length L.
template <class R>
TM_INLINE inline std::pair<R, R> free_moments6(const SpanLoad<R>* l, const SpanLoad<R>* end, const R& L,
                                               const Consts<R>& k) {
  const R L2 = L * L;
  R FL6{0}, FR6{0};
  for (; l != end; ++l) add_terms6(FL6, FR6, *l, L, L2, k);
  return {std::move(FL6), std::move(FR6)};
}

// ---------------------------------------------------------------------------
// 2. Effects at x of the loads left of x (cantilever built in at x).

template <class R>
struct Sums {
  R V{0}, M{0}, I1{0}, I2{0};
};

// Point force P at distance t = x - a >= 0 left of x: V = -P, M = -P t,
// and integrating M (zero left of the load) once and twice from the load:
// I1 = -P t^2/2, I2 = -P t^3/6.
template <class R>
TM_INLINE inline void point_effects(Sums<R>& s, const R& P, const R& t, const Consts<R>& k) {
  const R pt2 = P * t * t;
  s.V -= P;
  s.M -= P * t;
  s.I1 -= pt2 * k.half;
  s.I2 -= pt2 * t * k.sixth;
}

// Clockwise couple C at distance t left of x: no shear, M = +C (the moment
// jumps by +C across a clockwise couple), I1 = C t, I2 = C t^2/2.
template <class R>
TM_INLINE inline void couple_effects(Sums<R>& s, const R& C, const R& t, const Consts<R>& k) {
  s.M += C;
  s.I1 += C * t;
  s.I2 += C * t * t * k.half;
}

// A load q(tau) = w + slope tau starting u > 0 left of x and running on to
// x: V = -(w u + slope u^2/2), M = -(w u^2/2 + slope u^3/6),
// I1 = -(w u^3/6 + slope u^4/24), I2 = -(w u^4/24 + slope u^5/120).
// A load from c to d is this from c, minus its continuation w2 + slope tau'
// from d (`remove`: the signs turned).
template <class R>
TM_INLINE inline void ramp_effects(Sums<R>& s, const R& u, const R& w, const R& slope, bool flat_load, bool remove,
                                   const Consts<R>& k) {
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
    s.V += dV; s.M += dM; s.I1 += d1; s.I2 += d2;
  } else {
    s.V -= dV; s.M -= dM; s.I1 -= d1; s.I2 -= d2;
  }
}

// One load's effects at x; the loads exactly at x count when `incl`.
template <class R>
TM_INLINE inline void add_effects(Sums<R>& s, const SpanLoad<R>& l, const R& x, bool incl, const Consts<R>& k) {
  switch (l.kind) {
    case Kind::Point:
      if (l.a < x || (incl && same(l.a, x))) point_effects(s, l.p, R(x - l.a), k);
      break;
    case Kind::Couple:
      if (l.a < x || (incl && same(l.a, x))) couple_effects(s, l.p, R(x - l.a), k);
      break;
    case Kind::Ramp: {
      const bool fl = flat(l.s);
      if (l.a < x) ramp_effects(s, R(x - l.a), l.p, l.s, fl, false, k);
      if (l.d < x) ramp_effects(s, R(x - l.d), l.w2, l.s, fl, true, k);
      break;
    }
  }
}

// The effects at x of the loads [l, end).
template <class R>
Sums<R> sums(const SpanLoad<R>* l, const SpanLoad<R>* end, const R& x, bool incl, const Consts<R>& k) {
  Sums<R> s;
  for (; l != end; ++l) add_effects(s, *l, x, incl, k);
  return s;
}

// What the statics of a span and its node values need: the effects at L of
// the loads left of L (a force or couple exactly at L left out), and the
// point forces and couples exactly at L and exactly at 0.
template <class R>
struct EndSums {
  Sums<R> s;
  R PL{0}, CL{0}, P0{0}, C0{0};
};
// (The sums are kept in locals while the loads are read: registers, for
// double; measured faster than summing into the returned struct.)
template <class R>
TM_INLINE inline EndSums<R> end_sums(const SpanLoad<R>* l, const SpanLoad<R>* end, const R& L, const Consts<R>& k) {
  Sums<R> s;
  R PL{0}, CL{0}, P0{0}, C0{0};
  for (; l != end; ++l) {
    switch (l->kind) {
      case Kind::Point:
        if (l->a < L) point_effects(s, l->p, R(L - l->a), k);
        else if (same(l->a, L)) PL += l->p;
        if (is_zero(l->a)) P0 += l->p;
        break;
      case Kind::Couple:
        if (l->a < L) couple_effects(s, l->p, R(L - l->a), k);
        else if (same(l->a, L)) CL += l->p;
        if (is_zero(l->a)) C0 += l->p;
        break;
      case Kind::Ramp: {
        const bool fl = flat(l->s);
        if (l->a < L) ramp_effects(s, R(L - l->a), l->p, l->s, fl, false, k);
        if (l->d < L) ramp_effects(s, R(L - l->d), l->w2, l->s, fl, true, k);
        break;
      }
    }
  }
  return EndSums<R>{std::move(s), std::move(PL), std::move(CL), std::move(P0), std::move(C0)};
}

// A span load of the beam file as a SpanLoad, positions local to its span.
template <class R>
TM_INLINE inline void set_span_load(SpanLoad<R>& sl, const BasicLoad<R>& l) {
  switch (l.type) {
    case LoadType::Point:
      sl.kind = Kind::Point; sl.a = l.at; sl.p = l.P; sl.d = sl.w2 = sl.s = R(0);
      break;
    case LoadType::Couple:
      sl.kind = Kind::Couple; sl.a = l.at; sl.p = l.C; sl.d = sl.w2 = sl.s = R(0);
      break;
    case LoadType::Udl:
    case LoadType::Linear: {
      const R& w2 = l.type == LoadType::Udl ? l.w1 : l.w2;
      sl.kind = Kind::Ramp;
      sl.a = l.from;
      sl.d = l.to;
      sl.p = l.w1;
      sl.w2 = w2;
      if (l.type == LoadType::Udl) sl.s = R(0);  // (w - w)/(to - from), without the division
      else sl.s = (w2 - l.w1) / (l.to - l.from);
      break;
    }
  }
}
// The same, its positions moved by `off` (a span that is part of a longer
// segment, starting `off` from the segment's left end).
template <class R>
TM_INLINE inline void set_span_load(SpanLoad<R>& sl, const BasicLoad<R>& l, const R& off) {
  set_span_load(sl, l);
  sl.a += off;
  if (sl.kind == Kind::Ramp) sl.d += off;
}

}  // namespace trivet::three_moment::detail
