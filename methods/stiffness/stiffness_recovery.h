// trivet, direct stiffness method, private header: recovery inside a span.
//
// Part three of the derivation. Once the end displacements and end forces
// of a span are known, anything inside it follows exactly:
//   shear and moment by statics of the free body [0, x] from the left end
//   force (V0 = -F1, M0 = +F2, see stiffness.cpp), beam.h jump rules at a
//   point force or couple (the `after` limit);
//   deflection and rotation as the Hermite interpolation of the end values
//   plus the clamped-clamped particular solution of the span's own loads
//   (stiffness_loads.h), divided by EI.
// Units and signs as beam.h: x (m), V (N) = dM/dx, M (N m) sagging +,
// v (m) down +, theta = dv/dx (rad).
#pragma once

#include <cstddef>
#include <memory>

#include "methods/beam/beam.h"
#include "methods/stiffness/stiffness_loads.h"

namespace trivet::stiffness::internal {

// --- Solved state ---------------------------------------------------------------

template <class R>
struct SpanState {
  R L, EI;                // no initialisers, as SpanLoad
  R v0, th0, v1, th1;      // end displacements (this span's side at a hinge)
  R V0, M0;                // shear and moment from the left end force (before loads at 0)
};

// An array of `size` elements written by index, allocated once for its
// largest size and not filled first (for double the elements are left
// uninitialised by new T[]: nothing reads them before they are written).
template <class T>
struct FreshArray {
  std::unique_ptr<T[]> p;
  std::size_t count = 0;
  void allocate(std::size_t capacity) {
    p.reset(new T[capacity]);
    count = 0;
  }
  std::size_t size() const { return count; }
  T& operator[](std::size_t i) { return p[i]; }
  const T& operator[](std::size_t i) const { return p[i]; }
  T& push() { return p[count++]; }
};

template <class R>
struct State {
  FreshArray<SpanState<R>> spans;
  // Per span + 1: the span's loads are loads[first[s] .. first[s+1]).
  // Written by index in the assembly pass, so not filled before.
  std::unique_ptr<std::size_t[]> first;
  FreshArray<SpanLoad<R>> loads;
};


// True when a point force or couple at `a` is on the near (left) side of
// the limit asked for at x: before x, or at x when the limit is the one
// after it (always at local 0, never at L; beam.h).
template <class R>
bool included(const R& a, const R& x, const R& L, bool after) {
  if (a < x) return true;
  if (x < a) return false;
  return !(R(0) < x) || (after && x < L);
}

// Shear and moment at x (already clamped to [0, L]) of span s by statics
// from its left end: the end force, then every load to the left (the
// statics of the free body [0, x]; derived).
template <class R>
void span_statics(const State<R>& st, std::size_t s, const R& x, bool after, R& V_out, R& M_out) {
  const SpanState<R>& sp = st.spans[s];
  const R& L = sp.L;
  R V = sp.V0;  // in locals: stores through V_out and M_out would reload the loads
  R M = sp.M0 + sp.V0 * x;
  for (std::size_t k = st.first[s]; k < st.first[s + 1]; ++k) {
    const SpanLoad<R>& l = st.loads[k];
    if (l.distributed()) {
      if (l.a < x) {
        const R e = x < l.b ? x : l.b;
        const R c = e - l.a;
        const R we = l.wa + (l.wb - l.wa) * (c / (l.b - l.a));
        const R W = (l.wa + we) / R(2) * c;
        V -= W;
        M -= (x - e) * W + c * c * (R(2) * l.wa + we) / R(6);
      }
    } else if (included(l.a, x, L, after)) {
      if (l.type == LoadType::Point) {
        V -= l.value;
        M -= l.value * (x - l.a);
      } else {
        M += l.value;
      }
    }
  }
  V_out = V;
  M_out = M;
}

template <class R>
BasicPointValues<R> evaluate(const State<R>& st, std::size_t s, const R& local, bool after) {
  BasicPointValues<R> out;
  if (s >= st.spans.size()) return out;
  const SpanState<R>& sp = st.spans[s];
  const R& L = sp.L;
  R x = local;
  if (x < R(0)) x = R(0);
  if (L < x) x = L;

  span_statics(st, s, x, after, out.shear, out.moment);
  // Clamped-clamped particular solution (times EI) of the span's loads.
  R vp(0), thp(0);
  for (std::size_t k = st.first[s]; k < st.first[s + 1]; ++k) add_particular(st.loads[k], x, L, vp, thp);

  // Hermite interpolation of the end values plus the particular solution.
  R N[4], D[4];
  const R sN = x / L;
  hermite(sN, L, N);
  hermite_slope(sN, L, D);
  out.deflection = N[0] * sp.v0 + N[1] * sp.th0 + N[2] * sp.v1 + N[3] * sp.th1 + vp / sp.EI;
  out.rotation = D[0] * sp.v0 + D[1] * sp.th0 + D[2] * sp.v1 + D[3] * sp.th1 + thp / sp.EI;
  return out;
}

// The limits of the moment just inside span s at its left end (after any
// load at local 0) and at its right end (before any load at L): the
// statics of span_statics at x = 0 and at x = L in one pass over the
// span's loads. At x = 0 only the couples at local 0 count (a point force
// there has no lever arm, and none of a distributed load lies left of 0);
// at x = L every load except a point force or couple at L. Equal to
// `evaluate` at the span ends to rounding.
template <class R>
inline __attribute__((always_inline)) void end_moments(const State<R>& st, std::size_t s, R& M_left, R& M_right) {
  const SpanState<R>& sp = st.spans[s];
  const R L = sp.L;
  R ML = sp.M0;
  R MR = sp.M0 + sp.V0 * L;
  for (std::size_t k = st.first[s]; k < st.first[s + 1]; ++k) {
    const SpanLoad<R>& l = st.loads[k];
    if (l.distributed()) {
      if (l.a < L) {
        const R e = L < l.b ? L : l.b;
        const R c = e - l.a;
        const R we = l.wa + (l.wb - l.wa) * (c / (l.b - l.a));
        const R W = (l.wa + we) / R(2) * c;
        MR -= (L - e) * W + c * c * (R(2) * l.wa + we) / R(6);
      }
      continue;
    }
    const bool point = l.type == LoadType::Point;
    if (!point && !(R(0) < l.a)) ML += l.value;  // a couple at local 0
    if (l.a < L) {  // included(l.a, L, L, false)
      if (point) MR -= l.value * (L - l.a);
      else MR += l.value;
    }
  }
  M_left = ML;
  M_right = MR;
}

}  // namespace trivet::stiffness::internal
