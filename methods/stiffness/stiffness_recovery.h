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

#include <algorithm>
#include <cstddef>
#include <memory>
#include <vector>

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
struct SpanIndex;

template <class R>
struct State {
  FreshArray<SpanState<R>> spans;
  // Per span + 1: the span's loads are loads[first[s] .. first[s+1]).
  // Written by index in the assembly pass, so not filled before.
  std::unique_ptr<std::size_t[]> first;
  FreshArray<SpanLoad<R>> loads;
  // Per span, the sums by position of a span with many loads (SpanIndex,
  // below); empty when no span has more than the solve's threshold, and a
  // null entry for a span recovered by the loop over its loads.
  std::vector<std::unique_ptr<const SpanIndex<R>>> index;
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

// --- Many loads on a span: the recovery by sorted positions ---------------------------
//
// The loop of span_statics and of the particular solution costs O(m) per
// call for a span with m loads, and the station grid asks for about 2m
// points: O(m^2) per span. For a span with many loads the same sums are
// kept by position, built once in the solve (O(m log m)), so that a call
// costs O(log m):
//   - point forces and couples sorted by position, with prefix sums of P,
//     P a and C (statics: V = V0 - sum P, M = M0 + V0 x - (x sum P -
//     sum P a) + sum C over the loads left of x), prefix sums of their
//     mirror-side Green's coefficients (loads left of x) and suffix sums of
//     their own-side ones (loads at or right of x; green_coefficients);
//   - the distributed loads summed into one intensity W, linear between
//     consecutive ends of loads ("pieces"), with prefix sums over the
//     pieces of the integrals of W, t W and W times the mirror-side
//     coefficients, and suffix sums of W times the own-side ones; the piece
//     that holds x is integrated at the call, split at x, by the Gauss rule
//     (W linear, coefficients cubic: degree 4, exact).
// All of this is the same superposition as the loop, in another order of
// summation: equal to it to rounding (tests/stiffness_test.cpp,
// ManyLoads.IndexEqualsTheLoop).
template <class R>
struct SpanIndex {
  R L;
  // Point forces and couples: positions in increasing order, and sums over
  // the first k of them (index k, k = 0 .. m) or over the rest (suffix).
  std::vector<R> at;
  std::vector<R> P, Pa, C;       // prefix: forces, forces times position, couples
  std::vector<R> left2, left3;   // prefix: mirror-side coefficients
  std::vector<R> right2, right3; // suffix: own-side coefficients
  // Distributed loads: piece ends q[0..K], W at the two ends of piece j
  // (wl[j] just right of q[j], wr[j] just left of q[j + 1]), and integrals
  // over [0, q[j]] (prefix) or [q[j], L] (suffix).
  std::vector<R> q, wl, wr;
  std::vector<R> I0, I1, Ileft2, Ileft3;  // prefix: W, t W, W times the mirror-side coefficients
  std::vector<R> Iright2, Iright3;        // suffix: W times the own-side coefficients
};

// The value at p of the line through (l, A) and (r, B), l < r.
template <class R>
R line_at(const R& A, const R& B, const R& l, const R& r, const R& p) {
  return A + (B - A) * ((p - l) / (r - l));
}

// Sums of the distributed intensity over the pieces. Each load covers a
// run of consecutive pieces; it is added to the O(log K) nodes of a
// segment tree that cover that run exactly, as its values at the ends of
// each node's range, and the nodes are then pushed down to the pieces.
// So the W of a piece is a sum of the loads that cover it only: a short,
// steep load leaves no rounding residue on the pieces it does not cover
// (which a running sum of slopes along the span would).
template <class R>
struct IntensityTree {
  const std::vector<R>& q;
  std::vector<R> A, B;  // per node: sum of the loads' values at the node's two ends
  IntensityTree(const std::vector<R>& ends, std::size_t pieces) : q(ends), A(4 * pieces, R(0)), B(4 * pieces, R(0)) {}
  void add(std::size_t node, std::size_t lo, std::size_t hi, std::size_t j1, std::size_t j2, const SpanLoad<R>& l) {
    if (j2 <= lo || hi <= j1) return;
    if (j1 <= lo && hi <= j2) {
      A[node] += line_at(l.wa, l.wb, l.a, l.b, q[lo]);
      B[node] += line_at(l.wa, l.wb, l.a, l.b, q[hi]);
      return;
    }
    const std::size_t mid = lo + (hi - lo) / 2;
    add(2 * node, lo, mid, j1, j2, l);
    add(2 * node + 1, mid, hi, j1, j2, l);
  }
  // Writes W at both ends of every piece: the node's own sums plus those
  // of its ancestors (a, b: their sum at q[lo] and q[hi]).
  void push(std::size_t node, std::size_t lo, std::size_t hi, const R& a, const R& b, std::vector<R>& wl,
            std::vector<R>& wr) const {
    const R ta = a + A[node], tb = b + B[node];
    if (hi - lo == 1) {
      wl[lo] = ta;
      wr[lo] = tb;
      return;
    }
    const std::size_t mid = lo + (hi - lo) / 2;
    const R tm = line_at(ta, tb, q[lo], q[hi], q[mid]);
    push(2 * node, lo, mid, ta, tm, wl, wr);
    push(2 * node + 1, mid, hi, tm, tb, wl, wr);
  }
};

// Integrals over [p, r] (inside one piece, where W is linear: wp at p, wr at
// r) by the Gauss rule: of W, t W, W times the mirror-side coefficients
// (at L - t) and W times the own-side ones (at t). Added to out[0..5].
template <class R>
void piece_integrals(const R& p, const R& r, const R& wp, const R& wr, const R& L, R out[6]) {
  if (!(p < r)) return;
  const GaussRule<R>& g = gauss_rule<R>();
  const R half = (r - p) / R(2), mid = (p + r) / R(2);
  const R wmid = (wp + wr) / R(2), wslope = (wr - wp) / R(2);
  for (int k = 0; k < kGaussPoints; ++k) {
    const R t = mid + half * g.x[k];
    const R c = g.w[k] * half * (wmid + wslope * g.x[k]);
    const GreenCoefficients<R> own = green_coefficients(t, L), mirror = green_coefficients(L - t, L);
    out[0] += c;
    out[1] += c * t;
    out[2] += c * mirror.g2;
    out[3] += c * mirror.g3;
    out[4] += c * own.g2;
    out[5] += c * own.g3;
  }
}

// Builds the sums of the `count` loads at `loads` of a span of length L.
template <class R>
std::unique_ptr<const SpanIndex<R>> build_span_index(const SpanLoad<R>* loads, std::size_t count, const R& L) {
  auto ix = std::make_unique<SpanIndex<R>>();
  ix->L = L;
  std::vector<const SpanLoad<R>*> concentrated, distributed;
  for (std::size_t k = 0; k < count; ++k) (loads[k].distributed() ? distributed : concentrated).push_back(&loads[k]);

  std::stable_sort(concentrated.begin(), concentrated.end(),
                   [](const SpanLoad<R>* p, const SpanLoad<R>* r) { return p->a < r->a; });
  const std::size_t m = concentrated.size();
  ix->at.resize(m);
  for (auto* v : {&ix->P, &ix->Pa, &ix->C, &ix->left2, &ix->left3, &ix->right2, &ix->right3}) v->assign(m + 1, R(0));
  for (std::size_t k = 0; k < m; ++k) {
    const SpanLoad<R>& l = *concentrated[k];
    ix->at[k] = l.a;
    const GreenCoefficients<R> mirror = green_coefficients(L - l.a, L);
    const bool point = l.type == LoadType::Point;
    ix->P[k + 1] = ix->P[k] + (point ? l.value : R(0));
    ix->Pa[k + 1] = ix->Pa[k] + (point ? l.value * l.a : R(0));
    ix->C[k + 1] = ix->C[k] + (point ? R(0) : l.value);
    // Mirror side: P G = P (x'^2 g2 + x'^3 g3); C dG/dt = -C (x'^2 g2t + x'^3 g3t).
    ix->left2[k + 1] = ix->left2[k] + (point ? l.value * mirror.g2 : -(l.value * mirror.g2t));
    ix->left3[k + 1] = ix->left3[k] + (point ? l.value * mirror.g3 : -(l.value * mirror.g3t));
  }
  for (std::size_t k = m; k-- > 0;) {
    const SpanLoad<R>& l = *concentrated[k];
    const GreenCoefficients<R> own = green_coefficients(l.a, L);
    const bool point = l.type == LoadType::Point;
    ix->right2[k] = ix->right2[k + 1] + l.value * (point ? own.g2 : own.g2t);
    ix->right3[k] = ix->right3[k + 1] + l.value * (point ? own.g3 : own.g3t);
  }

  if (distributed.empty()) return ix;
  std::vector<R>& q = ix->q;
  q.reserve(2 * distributed.size() + 2);
  q.push_back(R(0));
  q.push_back(L);
  for (const SpanLoad<R>* l : distributed) {
    q.push_back(l->a);
    q.push_back(l->b);
  }
  std::sort(q.begin(), q.end());
  q.erase(std::unique(q.begin(), q.end(), [](const R& p, const R& r) { return !(p < r) && !(r < p); }), q.end());
  const std::size_t K = q.size() - 1;  // >= 1: some load has a < b, inside [0, L]
  IntensityTree<R> tree(q, K);
  for (const SpanLoad<R>* l : distributed) {
    const std::size_t j1 = static_cast<std::size_t>(std::lower_bound(q.begin(), q.end(), l->a) - q.begin());
    const std::size_t j2 = static_cast<std::size_t>(std::lower_bound(q.begin(), q.end(), l->b) - q.begin());
    tree.add(1, 0, K, j1, j2, *l);
  }
  ix->wl.resize(K);
  ix->wr.resize(K);
  tree.push(1, 0, K, R(0), R(0), ix->wl, ix->wr);
  for (auto* v : {&ix->I0, &ix->I1, &ix->Ileft2, &ix->Ileft3, &ix->Iright2, &ix->Iright3}) v->assign(K + 1, R(0));
  for (std::size_t j = 0; j < K; ++j) {
    R in[6] = {R(0), R(0), R(0), R(0), R(0), R(0)};
    piece_integrals(q[j], q[j + 1], ix->wl[j], ix->wr[j], L, in);
    ix->I0[j + 1] = ix->I0[j] + in[0];
    ix->I1[j + 1] = ix->I1[j] + in[1];
    ix->Ileft2[j + 1] = ix->Ileft2[j] + in[2];
    ix->Ileft3[j + 1] = ix->Ileft3[j] + in[3];
  }
  for (std::size_t j = K; j-- > 0;) {
    R in[6] = {R(0), R(0), R(0), R(0), R(0), R(0)};
    piece_integrals(q[j], q[j + 1], ix->wl[j], ix->wr[j], L, in);
    ix->Iright2[j] = ix->Iright2[j + 1] + in[4];
    ix->Iright3[j] = ix->Iright3[j + 1] + in[5];
  }
  return ix;
}

// Shear and moment (statics, as span_statics) and the particular solution
// times EI (vp, thp) at x in [0, L] from the sums: O(log m).
template <class R>
void indexed_values(const SpanIndex<R>& ix, const SpanState<R>& sp, const R& x, bool after, R& V, R& M, R& vp,
                    R& thp) {
  const R& L = ix.L;
  // Point forces and couples: [0, k) strictly left of x; [0, ki) those the
  // limit asked for includes (`included`: at x too, at local 0 or for the
  // limit after x).
  const std::size_t k = static_cast<std::size_t>(std::lower_bound(ix.at.begin(), ix.at.end(), x) - ix.at.begin());
  std::size_t ki = k;
  if (!(R(0) < x) || (after && x < L))
    ki = static_cast<std::size_t>(std::upper_bound(ix.at.begin(), ix.at.end(), x) - ix.at.begin());
  R W0 = ix.P[ki], W1 = ix.Pa[ki];  // resultant of the loads left of x, and its moment about 0
  R S2L = ix.left2[k], S3L = ix.left3[k], S2R = ix.right2[k], S3R = ix.right3[k];
  R couples = ix.C[ki];
  if (!ix.q.empty()) {
    const std::size_t K = ix.q.size() - 1;
    std::size_t j = static_cast<std::size_t>(std::upper_bound(ix.q.begin(), ix.q.end(), x) - ix.q.begin());
    j = j == 0 ? 0 : j - 1;
    if (j >= K) j = K - 1;
    const R& p = ix.q[j];
    const R& r = ix.q[j + 1];
    const R wx = line_at(ix.wl[j], ix.wr[j], p, r, x);
    R lft[6] = {ix.I0[j], ix.I1[j], ix.Ileft2[j], ix.Ileft3[j], R(0), R(0)};
    R rgt[6] = {R(0), R(0), R(0), R(0), ix.Iright2[j + 1], ix.Iright3[j + 1]};
    piece_integrals(p, x, ix.wl[j], wx, L, lft);
    piece_integrals(x, r, wx, ix.wr[j], L, rgt);
    W0 += lft[0];
    W1 += lft[1];
    S2L += lft[2];
    S3L += lft[3];
    S2R += rgt[4];
    S3R += rgt[5];
  }
  V = sp.V0 - W0;
  M = sp.M0 + sp.V0 * x - (x * W0 - W1) + couples;
  const R xm = L - x;
  vp = x * x * (S2R + x * S3R) + xm * xm * (S2L + xm * S3L);
  thp = x * (R(2) * S2R + R(3) * x * S3R) - xm * (R(2) * S2L + R(3) * xm * S3L);
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

  // Clamped-clamped particular solution (times EI) of the span's loads.
  R vp(0), thp(0);
  const SpanIndex<R>* ix = s < st.index.size() ? st.index[s].get() : nullptr;
  if (ix) {
    indexed_values(*ix, sp, x, after, out.shear, out.moment, vp, thp);
  } else {
    span_statics(st, s, x, after, out.shear, out.moment);
    for (std::size_t k = st.first[s]; k < st.first[s + 1]; ++k) add_particular(st.loads[k], x, L, vp, thp);
  }

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
