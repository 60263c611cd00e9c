// trivet, slope-deflection: the values inside a span once its end moments
// and end deflections are known (what `Solution::at` returns).
//
// Local x from 0 (node i) to L (node j). M_i = M_ij is the sagging moment
// at the very left end and M_j = -M_ji the one at the very right end, both
// outside every span load; D_i, D_j the end deflections (downward +).
//
// Statics of the span (moments about either end):
//   M(x) = M_i (L - x)/L + M_j x/L + m0(x),   m0(x) = R_i0 x + moment(x)
//   V(x) = (M_j - M_i)/L + R_i0 + shear(x)
// with R_i0 the simple-beam left reaction of the span loads and moment(x),
// shear(x) their "inside" parts (fixed_end.h).
//
// Elastic curve: EI v'' = -M with v(0) = D_i, v(L) = D_j. Integrating the
// end-moment part twice and the load part through F(x) = curve(x) +
// R_i0 x^3/6 (F(0) = F'(0) = 0, F'' = m0):
//   v(x) = D_i (L-x)/L + D_j x/L + M_i x (L-x)(2L-x)/(6EIL)
//          + M_j x (L-x)(L+x)/(6EIL) - (F(x) - x F(L)/L)/EI
//   theta(x) = v'(x) = (D_j - D_i)/L + (M_i (2L^2 - 6Lx + 3x^2)
//          + M_j (L^2 - 3x^2))/(6EIL) - (F'(x) - F(L)/L)/EI.
//
// The load parts at x. A span with at most kDirectLoads loads sums the
// loads' inside values one by one (fixed_end.h, *_inside). A span with
// more keeps its loads as running sums sorted by position, made once in
// the solve, so that a value at x costs one binary search and a few
// products, O(log N) for N loads:
//   every load is one or two "events" along the span: a point force P at
//   a adds P to mu_0 at a; a couple C at a adds -C to mu_1 at a (as
//   I_n = -n C (x-a)^(n-1), see fixed_end.h); a linear load p at a to q at
//   b starts a running intensity p with slope s = (q - p)/(b - a) at a and
//   ends it (-q, -s) at b. At each event position e the sums hold
//     mu_k = integral over t < e of w(t) (e - t)^k dt   (k = 0..3),
//     W, S: the running intensity just past e and its slope,
//   carried from one position to the next (e -> e + delta) by
//     mu_k <- sum_m C(k,m) delta^(k-m) mu_m + c_k,
//     c_k = delta^(k+1) (W + S delta + (k+1) W) / ((k+1)(k+2))
//   (the running load over [e, e + delta] as a linear load: the moments
//   c_k of fixed_end.h about its end), and W <- W + S delta. At x past
//   the last event e at or before x, with d = x - e:
//     I_n(x) = sum_k C(n,k) d^(n-k) mu_k + W d^(n+1)/(n+1)
//              + S d^(n+2)/((n+1)(n+2)).
//   The same integrals as the load-by-load sum, grouped differently: equal
//   in exact arithmetic (the tests check it with cpp_rational), equal to
//   rounding in floating point. The running slope is summed with its
//   rounding error kept (two-sum), and W and S restart at exactly zero
//   where no distributed load is active, so a short steep load leaves no
//   residue behind it.
#pragma once

#include <algorithm>
#include <cstddef>
#include <type_traits>
#include <vector>

#include "methods/slope_deflection/fixed_end.h"
#include "methods/slope_deflection/plumbing.h"

namespace trivet::slope_deflection::detail {

// Spans with at most this many loads sum them one by one.
constexpr std::size_t kDirectLoads = 16;

// A span load as `at` needs it.
enum class TermKind : unsigned char { Point, Couple, Spread };

template <class R>
struct Term {
  TermKind kind = TermKind::Point;
  R a{0};  // Point, Couple: position. Spread: start.
  R b{0};  // Spread: end.
  R p{0};  // Point: force. Couple: couple. Spread: intensity at the start.
  R q{0};  // Spread: intensity at the end.
};

// The running sums at one event position (see the file comment).
template <class R>
struct RunningSums {
  R mu[4] = {R(0), R(0), R(0), R(0)};
  R W{0};
  R S{0};
};

// The sums of one span's loads: what the solve needs of them (the
// fixed-end moments and shears, the simple-beam values, the end couples),
// kept apart from SpanCurve so that the spans `at` keeps are small.
template <class R>
struct SpanLoads {
  LoadTerms<R> load;        // the sums of the span loads' terms (fixed_end.h)
  R couple_at_start{0};     // span couples at local 0 (fixed_end.h, add_end_couple)
  R couple_at_end{0};       // span couples at local L
};

// One span as `at` needs it: its data and, after the solve, its end
// values. The last six values are written by the solve (set_simple_beam,
// then the end values); the constructor leaves them alone, so that making
// the spans is not a clearing pass over memory.
template <class R>
struct SpanCurve {
  SpanCurve(const R& length, const R& ei) : L(length), EI(ei), invL(R(1) / length) {}
  R L, EI;
  R invL;                           // 1 / L
  std::size_t first = 0, last = 0;  // the span's terms: [first, last)
  R R_i0;                           // simple-beam left reaction of the span loads, upward +
  R F_L;                            // F(L) = load.curve + R_i0 L^3 / 6
  R M_i, M_j;                       // sagging moments at the very ends, outside all span loads
  R D_i, D_j;                       // end deflections, downward +
};

// The simple-beam values of the span from its load sums: R_i0 (moments
// about the right end) and F(L).
template <class R>
TRIVET_SD_INLINE void set_simple_beam(SpanCurve<R>& sc, const LoadTerms<R>& load) {
  sc.R_i0 = load.moment * sc.invL;
  sc.F_L = load.curve + sc.R_i0 * sc.L * sc.L * sc.L * (R(1) / R(6));
}

template <class R>
struct SolvedSpans {
  std::vector<SpanCurve<R>> spans;
  std::vector<Term<R>> terms;         // grouped by span, in the order of the beam's loads
  // Running sums, only when some span has more than kDirectLoads loads:
  // span s's are [ev_begin[s], ev_begin[s + 1]) (empty: summed one by one).
  std::vector<std::size_t> ev_begin;
  std::vector<R> ev_position;           // event positions, increasing within a span
  std::vector<RunningSums<R>> ev_sums;  // the sums just past each position
};

// Adds one term's inside values at x.
template <class R>
void add_inside(const Term<R>& t, const R& x, bool after, LoadParts<R>& out) {
  switch (t.kind) {
    case TermKind::Point: point_inside(t.p, t.a, x, after, out); break;
    case TermKind::Couple: couple_inside(t.p, t.a, x, after, out); break;
    case TermKind::Spread: spread_inside(t.p, t.q, t.a, t.b, x, out); break;
  }
}

// hi + lo += v, keeping the rounding error of the sum in lo (Knuth's
// two-sum; exact for binary floating point with round to nearest, and
// lo stays 0 in exact arithmetic).
template <class R>
void add_kept(R& hi, R& lo, const R& v) {
  const R s = hi + v;
  const R bv = s - hi;
  lo += (hi - (s - bv)) + (v - bv);
  hi = s;
}

// Appends the running sums of the terms [first, last) of one span to
// st.ev_position and st.ev_sums. O(N log N) for N terms (the sort).
template <class R>
void add_running_sums(SolvedSpans<R>& st, const SpanCurve<R>& sc) {
  enum class Ev : unsigned char { Point, Couple, Start, End };
  struct Event {
    R x;
    Ev kind;
    R value;  // P, C, p or q
    R slope;  // Start, End
  };
  std::vector<Event> ev;
  ev.reserve(2 * (sc.last - sc.first));
  for (std::size_t i = sc.first; i < sc.last; ++i) {
    const Term<R>& t = st.terms[i];
    switch (t.kind) {
      case TermKind::Point: ev.push_back({t.a, Ev::Point, t.p, R(0)}); break;
      case TermKind::Couple: ev.push_back({t.a, Ev::Couple, t.p, R(0)}); break;
      case TermKind::Spread: {
        if (!(t.b > t.a)) break;  // zero length: no load
        const R s = (t.q - t.p) / (t.b - t.a);
        ev.push_back({t.a, Ev::Start, t.p, s});
        ev.push_back({t.b, Ev::End, t.q, s});
        break;
      }
    }
  }
  std::stable_sort(ev.begin(), ev.end(), [](const Event& u, const Event& v) { return u.x < v.x; });
  RunningSums<R> rs;
  R S_lo{0};
  std::size_t active = 0;  // distributed loads running
  for (std::size_t i = 0; i < ev.size();) {
    const R& e = ev[i].x;
    if (i > 0) {
      // Carry the sums from the last position to e.
      const R delta = e - st.ev_position.back();
      R* mu = rs.mu;
      const R d2 = delta * delta;
      const R d3 = d2 * delta;
      mu[3] = mu[3] + R(3) * delta * mu[2] + R(3) * d2 * mu[1] + d3 * mu[0];
      mu[2] = mu[2] + R(2) * delta * mu[1] + d2 * mu[0];
      mu[1] = mu[1] + delta * mu[0];
      if (active > 0) {
        const R S = rs.S + S_lo;
        const R w_far = rs.W;              // at the last position
        const R w_near = rs.W + S * delta;  // at e
        R dk = delta;                       // delta^(k+1)
        for (int k = 0; k < 4; ++k) {
          mu[k] += dk * (w_near + R(k + 1) * w_far) / R((k + 1) * (k + 2));
          dk = dk * delta;
        }
        rs.W = w_near;
      }
    }
    // Every event at e.
    std::size_t j = i;
    for (; j < ev.size() && !(e < ev[j].x); ++j) {
      const Event& v = ev[j];
      switch (v.kind) {
        case Ev::Point: rs.mu[0] += v.value; break;
        case Ev::Couple: rs.mu[1] -= v.value; break;
        case Ev::Start: rs.W += v.value; add_kept(rs.S, S_lo, v.slope); ++active; break;
        case Ev::End: rs.W -= v.value; add_kept(rs.S, S_lo, R(-v.slope)); --active; break;
      }
    }
    if (active == 0) {
      rs.W = R(0);
      rs.S = R(0);
      S_lo = R(0);
    }
    st.ev_position.push_back(e);
    RunningSums<R> kept = rs;
    kept.S = rs.S + S_lo;
    st.ev_sums.push_back(kept);
    i = j;
  }
}

// Why a span load is out of the method's scope (None: it is not).
enum class LoadFault : unsigned char { None, PointNotInside, CoupleOutside, SpreadOutside, UnequalUdl };

// Checks one span load, gives its term (for `at`) and adds its closed
// forms (fixed_end.h) to its span's sums. `invL2` is 1 / L^2.
template <class R>
TRIVET_SD_INLINE LoadFault take_load(const BasicLoad<R>& l, const R& L, const R& invL2, detail::Term<R>& t,
                                     detail::SpanLoads<R>& sums) {
  using detail::TermKind;
  switch (l.type) {
    case LoadType::Point:
      if (!(l.at > R(0)) || !(l.at < L)) return LoadFault::PointNotInside;
      t.kind = TermKind::Point; t.a = l.at; t.p = l.P;
      detail::add_terms(sums.load, detail::point_terms(l.P, l.at, L, invL2));
      break;
    case LoadType::Couple:
      if (l.at < R(0) || l.at > L) return LoadFault::CoupleOutside;
      t.kind = TermKind::Couple; t.a = l.at; t.p = l.C;
      detail::add_terms(sums.load, detail::couple_terms(l.C, l.at, L, invL2));
      detail::add_end_couple(l.C, l.at, L, sums.couple_at_start, sums.couple_at_end);
      break;
    case LoadType::Udl:
      if (l.from < R(0) || l.to > L || l.to < l.from) return LoadFault::SpreadOutside;
      if (!is_zero(R(l.w1 - l.w2))) return LoadFault::UnequalUdl;
      t.kind = TermKind::Spread; t.a = l.from; t.b = l.to; t.p = l.w1; t.q = l.w2;
      detail::add_terms(sums.load, detail::udl_terms(l.w1, l.from, l.to, L, invL2));
      break;
    case LoadType::Linear:
      if (l.from < R(0) || l.to > L || l.to < l.from) return LoadFault::SpreadOutside;
      t.kind = TermKind::Spread; t.a = l.from; t.b = l.to; t.p = l.w1; t.q = l.w2;
      detail::add_terms(sums.load, detail::linear_terms(l.w1, l.w2, l.from, l.to, L, invL2));
      break;
  }
  return LoadFault::None;
}

// The running sums of every span with more than kDirectLoads loads.
template <class R>
void build_running_sums(SolvedSpans<R>& st) {
  st.ev_begin.assign(st.spans.size() + 1, 0);
  for (std::size_t s = 0; s < st.spans.size(); ++s) {
    const SpanCurve<R>& sc = st.spans[s];
    st.ev_begin[s] = st.ev_position.size();
    if (sc.last - sc.first > kDirectLoads) add_running_sums(st, sc);
  }
  st.ev_begin.back() = st.ev_position.size();
}

// The load parts of span `sc` at x (`after`: a point force or couple at
// exactly x is included).
template <class R>
LoadParts<R> load_parts(const SolvedSpans<R>& st, std::size_t span, const R& x, bool after) {
  LoadParts<R> lp;
  if (st.ev_begin.empty() || st.ev_begin[span] == st.ev_begin[span + 1]) {
    const SpanCurve<R>& sc = st.spans[span];
    for (std::size_t i = sc.first; i < sc.last; ++i) add_inside(st.terms[i], x, after, lp);
    return lp;
  }
  // The last position e < x (or e <= x with `after`).
  const auto b = st.ev_position.begin() + static_cast<std::ptrdiff_t>(st.ev_begin[span]);
  const auto e = st.ev_position.begin() + static_cast<std::ptrdiff_t>(st.ev_begin[span + 1]);
  const auto it = after ? std::upper_bound(b, e, x) : std::lower_bound(b, e, x);
  if (it == b) return lp;
  const std::size_t k = static_cast<std::size_t>(it - st.ev_position.begin()) - 1;
  const RunningSums<R>& rs = st.ev_sums[k];
  const R d = x - st.ev_position[k];
  const R d2 = d * d;
  const R d3 = d2 * d;
  const R* mu = rs.mu;
  R I[4];
  I[0] = mu[0];
  I[1] = mu[1] + d * mu[0];
  I[2] = mu[2] + R(2) * d * mu[1] + d2 * mu[0];
  I[3] = mu[3] + R(3) * d * mu[2] + R(3) * d2 * mu[1] + d3 * mu[0];
  if (!is_zero(rs.W) || !is_zero(rs.S)) {
    R dn = d;  // d^(n+1)
    for (int n = 0; n < 4; ++n) {
      I[n] += rs.W * dn / R(n + 1) + rs.S * dn * d / R((n + 1) * (n + 2));
      dn = dn * d;
    }
  }
  lp.shear = -I[0];
  lp.moment = -I[1];
  lp.slope = -I[2] / R(2);
  lp.curve = -I[3] / R(6);
  return lp;
}

// Shear, moment, deflection and rotation in span `span` at local x.
template <class R>
BasicPointValues<R> span_values(const SolvedSpans<R>& st, std::size_t span, const R& x, bool after) {
  BasicPointValues<R> pv;
  if (span >= st.spans.size()) return pv;
  const SpanCurve<R>& s = st.spans[span];
  const R& L = s.L;
  if (!(x > R(0))) after = true;  // at the left end: inside the span
  if (!(x < L)) after = false;    // at the right end: inside the span
  const LoadParts<R> lp = load_parts(st, span, x, after);
  const R Lx = L - x;
  pv.shear = (s.M_j - s.M_i) / L + s.R_i0 + lp.shear;
  pv.moment = (s.M_i * Lx + s.M_j * x) / L + s.R_i0 * x + lp.moment;
  const R F = s.R_i0 * x * x * x / R(6) + lp.curve;
  const R F1 = s.R_i0 * x * x / R(2) + lp.slope;
  const R sixEIL = R(6) * s.EI * L;
  pv.deflection = (s.D_i * Lx + s.D_j * x) / L +
                  (s.M_i * x * Lx * (L + Lx) + s.M_j * x * Lx * (L + x)) / sixEIL - (F - x * s.F_L / L) / s.EI;
  pv.rotation = (s.D_j - s.D_i) / L +
                (s.M_i * (R(2) * L * L - R(6) * L * x + R(3) * x * x) + s.M_j * (L * L - R(3) * x * x)) / sixEIL -
                (F1 - s.F_L / L) / s.EI;
  return pv;
}

}  // namespace trivet::slope_deflection::detail
