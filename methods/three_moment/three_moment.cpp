// trivet: the three-moment equation (Clapeyron) method.
//
// Conventions are those of methods/beam/beam.h: loads down +, couples
// clockwise +, M sagging +, V = dM/dx, v down +, rotation clockwise + with
// rotation = dv/dx and EI v'' = -M.
//
// ---------------------------------------------------------------------------
// Derivation (our own, kept here so it can be checked line by line).
//
// One span of length L, rigidity EI, end deflections vA, vB, "node-side" end
// moments MA, MB (the moments between the span and its end nodes; a couple
// applied inside the span at local 0 or L belongs to the span's loads). The
// moment is M(x) = MA (1 - x/L) + MB x/L + M0(x), where M0 is the moment of
// the same span simply supported under its own loads (the "free" diagram).
// Integrating EI v'' = -M twice with v(0) = vA, v(L) = vB (Green's function
// of the simply supported span) gives the end rotations
//
//   EI L theta(0) =  FR + MA L^2/3 + MB L^2/6 + EI L psi,
//   EI L theta(L) = -FL - MA L^2/6 - MB L^2/3 + EI L psi,
//
// with psi = (vB - vA)/L the chord rotation (clockwise + when the right end
// settles more), FL = A0 * xbar the first moment of the free diagram about
// the LEFT end and FR = A0 * (L - xbar) its first moment about the RIGHT end.
//
// Three-moment equation at an interior support i between span 1 (left,
// ends i-1, i) and span 2 (right, ends i, i+1): theta_1(L1) = theta_2(0).
// Multiplying by 6 and writing f = L/EI:
//
//   f1 M_{i-1} + 2 (f1 + f2) M_i + f2 M_{i+1}
//      = -6 FL1 / (EI1 L1) - 6 FR2 / (EI2 L2) + 6 (psi1 - psi2).
//
// FL1 is A1 a1 (centroid distance a1 from the outer left end of the pair),
// FR2 is A2 b2 (distance b2 from the outer right end). Settlement enters as
// 6 (psi1 - psi2): a support that settles more than its neighbours makes
// psi1 > 0 and psi2 < 0, and its moment moves toward sagging.
//
// Fixed end: an imaginary span of infinite I (f = 0, psi = 0) beside it, so
//   left end fixed  (theta(0) = 0):  2 f MA + f MB = -6 FR/(EI L) - 6 psi,
//   right end fixed (theta(L) = 0):  f MA + 2 f MB = -6 FL/(EI L) + 6 psi.
// A fixed interior support does both, one per side: the moments either side
// are separate unknowns (the reaction couple takes the difference).
//
// The load terms FL and FR of every load type (areas and centroids of the
// free diagrams) and the values inside a span are in load_terms.h, one
// function per load type with its derivation.
//
// After the support moments are known, each span is evaluated from its left
// end: M(x) = MA + V0 x + Mc(x), V(x) = V0 + Vc(x), where Mc and Vc are the
// moment and shear at x of the loads to the left of x (as on a cantilever
// built in at x), V0 = (MB - MA - Mc(L))/L. Rotation and deflection are the
// exact integrals: EI theta = EI theta0 - int_0^x M,
// EI v = EI vA + EI theta0 x - int_0^x (x - t) M(t) dt, each load term in
// closed form (polynomials of degree up to 5). theta0 follows from v(L) = vB.
// An overhang (free end) is statically determinate: its moment and shear
// come from statics; its rotation and deflection are integrated outward
// from the supported node's rotation and settlement.
//
// Where the files are (a reading order):
//   load_terms.h   the load terms (6 FL, 6 FR) and the values inside a span,
//                  one function per load type;
//   span_state.h   the solved spans and `at` (values at any point; a span
//                  with many loads gets prefix sums of its loads, so `at`
//                  costs O(log N) there instead of O(N));
//   fast_path.h    the usual beam (pinned/roller supports, span loads only):
//                  the three-moment equations, tridiagonal, in three passes;
//   this file      the tridiagonal path for rigid supports (fixed ends and
//                  interior fixed supports, overhangs, hinges at supports,
//                  unsupported nodes between spans of equal EI merged into
//                  one span, node loads), and the choice of path;
//   banded_path.h  every other beam the reader accepts: vertical and
//                  rotational springs (the five-moment equation), guided
//                  supports, hinges anywhere, unsupported nodes of any EI,
//                  with node deflections and moments as mixed unknowns;
//   band_solve.h   the banded solve of that system.
// Every path uses the same load terms and span relations. They agree to
// rounding, not bit for bit: the fast and tridiagonal paths to 1e-13
// relative (tests/three_moment_test.cpp), and every path matches an exact
// solution to 1e-9 in double and exactly in rationals
// (tests/methods_test.cpp, RandomBeams).
// ---------------------------------------------------------------------------

// GCC 12 reports a false -Wmaybe-uninitialized inside boost::rational's
// negate() (boost/rational.hpp, a local `zero` it does initialise). Silence
// it for the boost headers only, before anything else includes them.
#if defined(__GNUC__) && !defined(__clang__)
#pragma GCC diagnostic push
#pragma GCC diagnostic ignored "-Wmaybe-uninitialized"
#endif
#include <boost/multiprecision/cpp_bin_float.hpp>
#include <boost/multiprecision/cpp_int.hpp>
#if defined(__GNUC__) && !defined(__clang__)
#pragma GCC diagnostic pop
#endif

#include "methods/three_moment/three_moment.h"

#include <memory>
#include <string>
#include <utility>
#include <vector>

#include "methods/three_moment/banded_path.h"
#include "methods/three_moment/fast_path.h"
#include "methods/three_moment/load_terms.h"
#include "methods/three_moment/span_state.h"

namespace trivet::three_moment {
namespace {

using namespace detail;

// The tridiagonal path: rigid supports (fixed, pinned, roller), free ends,
// hinges at interior pinned or roller supports, unsupported interior nodes
// between spans of equal EI (merged into one segment), node loads. The
// unknowns are the support moments alone (two at an interior fixed support).
template <class R>
bool fits_tridiagonal(const BasicBeam<R>& beam) {
  const std::size_t n = beam.spans.size();
  const auto& sup = beam.supports;
  for (std::size_t i = 0; i <= n; ++i) {
    const bool interior = i > 0 && i < n;
    const SupportType t = sup[i].type;
    if (t == SupportType::Spring || t == SupportType::Guided) return false;
    if (sup[i].hinge && (!interior || t == SupportType::Free || t == SupportType::Fixed)) return false;
    if (t == SupportType::Free && !is_zero(sup[i].settlement)) return false;
    if (interior && t == SupportType::Free && !same(beam.spans[i - 1].EI, beam.spans[i].EI)) return false;
  }
  return true;
}

template <class R>
BasicSolution<R> solve_tridiagonal(const BasicBeam<R>& beam) {
  const std::size_t n = beam.spans.size();
  const auto& sup = beam.supports;
  auto label = [&](std::size_t i) { return "node " + beam.labels[i]; };
  if (BasicSolution<R> why; !spans_sound(beam, &why)) return why;
  std::size_t free_interior = 0, fixed_interior = 0;
  for (std::size_t i = 1; i < n; ++i) {
    if (sup[i].type == SupportType::Free) ++free_interior;
    if (sup[i].type == SupportType::Fixed) ++fixed_interior;
  }

  // ---- Segments: merge spans across unsupported interior nodes. Without
  // such nodes (the usual beam) a span is its own segment and `real` (the
  // original node at each segment end) is not stored.
  const bool merged = free_interior > 0;
  const std::size_t m = n - free_interior;  // segments
  std::vector<std::size_t> real;
  if (merged) {
    real.reserve(m + 1);
    real.push_back(0);
    for (std::size_t i = 1; i < n; ++i)
      if (sup[i].type != SupportType::Free) real.push_back(i);
    real.push_back(n);
  }
  auto real_of = [&](std::size_t g) TM_INLINE { return merged ? real[g] : g; };
  auto st = std::make_shared<State<R>>();
  reserve_huge(st->seg, m);
  if (merged) {
    st->span_seg.resize(n);
    st->span_off.resize(n);
    st->span_len.resize(n);
    st->span_last.resize(n);
  }
  for (std::size_t g = 0; g < m; ++g) {
    R off{0};
    for (std::size_t s = real_of(g); s < real_of(g + 1); ++s) {
      if (merged) {
        st->span_seg[s] = g;
        st->span_off[s] = off;
        st->span_len[s] = beam.spans[s].length;
        st->span_last[s] = s + 1 == real[g + 1];
      }
      off += beam.spans[s].length;
    }
    Segment<R> sg;
    sg.L = std::move(off);
    sg.invEI = R(1) / beam.spans[real_of(g)].EI;
    st->seg.push_back(std::move(sg));
  }
  auto seg_of = [&](std::size_t span) TM_INLINE { return merged ? st->span_seg[span] : span; };
  auto off_of = [&](std::size_t span) TM_INLINE { return merged ? st->span_off[span] : R(0); };
  // ---- Loads: validation; node loads summed (stored only if there are
  // any). Span loads listed span by span (the usual order) are stored as
  // they are read; in any other order, or with merged spans, they are
  // bucketed by segment afterwards.
  bool any_node_load = false;
  bool in_order = !merged;
  std::size_t last_span = 0;
  st->loads.allocate(beam.loads.size());  // written by index; cut to `nload` after
  std::size_t nload = 0;
  std::size_t next_span = 0;  // in order: spans before it have their `first`
  for (const auto& l : beam.loads) {
    if (BasicSolution<R> why; !load_sound(beam, l, &why)) return why;
    if (l.on_node) {
      any_node_load = true;
      continue;
    }
    if (!in_order) continue;
    if (l.index < last_span) {
      in_order = false;
      continue;
    }
    last_span = l.index;
    for (; next_span <= l.index; ++next_span) st->seg[next_span].first = st->seg[next_span].last = nload;
    set_span_load(st->loads[nload++], l);  // in order: nothing merged
    st->seg[l.index].last = nload;
  }
  std::vector<R> nodeP, nodeC;
  if (any_node_load) {
    nodeP.assign(n + 1, R(0));
    nodeC.assign(n + 1, R(0));
    for (const auto& l : beam.loads) {
      if (!l.on_node) continue;
      if (l.type == LoadType::Point) nodeP[l.index] += l.P;
      else nodeC[l.index] += l.C;
    }
  }
  auto node_P = [&](std::size_t i) TM_INLINE { return nodeP.empty() ? R(0) : nodeP[i]; };
  auto node_C = [&](std::size_t i) TM_INLINE { return nodeC.empty() ? R(0) : nodeC[i]; };
  if (any_node_load)  // (a couple at a hinge is a node load)
    for (std::size_t i = 1; i < n; ++i)
      if (sup[i].hinge && !is_zero(node_C(i))) return not_applicable<R>(reason_id::kFeature, "couple at hinge " + label(i));

  if (in_order) {  // the ranges are set; the spans after the last loaded one have none
    st->loads.shrink(nload);
    for (; next_span < m; ++next_span) st->seg[next_span].first = st->seg[next_span].last = nload;
  } else {  // bucket the loads by segment: count (in `last`), offsets, fill
    for (auto& sg : st->seg) sg.last = 0;
    for (const auto& l : beam.loads)
      if (!l.on_node) ++st->seg[seg_of(l.index)].last;
    if (merged)
      for (std::size_t i = 1; i < n; ++i)
        if (sup[i].type == SupportType::Free)
          st->seg[seg_of(i)].last += (is_zero(node_P(i)) ? 0 : 1) + (is_zero(node_C(i)) ? 0 : 1);
    std::size_t total = 0;
    for (auto& sg : st->seg) {
      const std::size_t count = sg.last;
      sg.first = sg.last = total;
      total += count;
    }
    st->loads.allocate(total);
    auto push = [&](std::size_t g, const SpanLoad<R>& sl) { st->loads[st->seg[g].last++] = sl; };
    for (const auto& l : beam.loads)
      if (!l.on_node) set_span_load(st->loads[st->seg[seg_of(l.index)].last++], l, off_of(l.index));
    // Loads on unsupported interior nodes become loads of the merged span.
    if (merged)
      for (std::size_t i = 1; i < n; ++i) {
        if (sup[i].type != SupportType::Free) continue;
        SpanLoad<R> sl{};
        sl.a = st->span_off[i];
        if (!is_zero(node_P(i))) { sl.kind = Kind::Point; sl.p = node_P(i); push(seg_of(i), sl); }
        if (!is_zero(node_C(i))) { sl.kind = Kind::Couple; sl.p = node_C(i); push(seg_of(i), sl); }
      }
  }
  const SpanLoad<R>* const loads = st->loads.data();
  const Consts<R> K;  // a local copy: the compiler folds the constants

  // ---- The tridiagonal system. Unknowns, in order along the beam: one
  // node-side moment per real node (MA of the segment to its right and MB
  // of the segment to its left are then tied by MA = MB + C), two at an
  // interior fixed node (MB left, MA right: the reaction couple takes the
  // difference). Each row is built and eliminated at once (Thomas forward
  // sweep), so no matrix is stored; each segment's load terms are made
  // once and serve the rows at both its ends.
  auto type_of = [&](std::size_t k) TM_INLINE { return sup[real_of(k)].type; };
  auto settle = [&](std::size_t k) TM_INLINE -> const R& { return sup[real_of(k)].settlement; };
  auto offA = [&](std::size_t g) TM_INLINE {  // MA_g = (unknown at node g) + offA(g)
    return g > 0 && type_of(g) != SupportType::Fixed ? node_C(real_of(g)) : R(0);
  };
  struct Terms {
    R gl6, gr6;  // 6 FL/(EI L), 6 FR/(EI L)
    R f;         // L/EI
    R psi;       // chord rotation (vB - vA)/L
  };
  auto terms = [&](std::size_t g) TM_INLINE {
    Segment<R>& sg = st->seg[g];
    sg.invL = R(1) / sg.L;
    const R& invL = sg.invL;
    const R& invEI = sg.invEI;
    const auto fm = free_moments6(loads + sg.first, loads + sg.last, sg.L, K);
    const R q = invEI * invL;
    return Terms{fm.first * q, fm.second * q, sg.L * invEI, (settle(g + 1) - settle(g)) * invL};
  };

  const bool left_free = type_of(0) == SupportType::Free;
  const bool right_free = type_of(m) == SupportType::Free;
  if (m == 1 && left_free && right_free) return failed<R>(reason_id::kSingular, "mechanism: no support");
  R V0_left{0}, V0_right{0}, MB_left{0}, MA_right{0};
  if (left_free) {
    // Overhang to the left, by statics from the free end: MA = C0, V0 = -P0.
    if (sup[real_of(1)].hinge) return failed<R>(reason_id::kSingular, "mechanism: hinge at " + label(real_of(1)) + " next to a free end");
    const Segment<R>& sg = st->seg[0];
    const Sums<R> s = sums(loads + sg.first, loads + sg.last, sg.L, true, K);
    V0_left = R(0) - node_P(real_of(0));
    MB_left = node_C(real_of(0)) + V0_left * sg.L + s.M;
  }
  if (right_free) {
    // Overhang to the right: MB = -Cm, V(L) = Pm.
    if (m > 1 && sup[real_of(m - 1)].hinge)
      return failed<R>(reason_id::kSingular, "mechanism: hinge at " + label(real_of(m - 1)) + " next to a free end");
    const Segment<R>& sg = st->seg[m - 1];
    const Sums<R> s = sums(loads + sg.first, loads + sg.last, sg.L, true, K);
    V0_right = node_P(real_of(m)) - s.V;
    MA_right = R(0) - node_C(real_of(m)) - V0_right * sg.L - s.M;
  }

  const std::size_t nv = m + 1 + fixed_interior;
  struct Row {
    R cp, dp;  // Thomas: modified super-diagonal, right-hand side
  };
  FreshArray<Row> rows;
  rows.allocate(nv);     // written by index, row `nrow` next
  std::size_t nrow = 0;
  bool ok = true;
  // One row a x[i-1] + b x[i] + c x[i+1] = d. No pivoting: the rows are
  // strictly diagonally dominant (2(f1+f2) > f1+f2; fixed rows 2f > f;
  // known rows 1 > 0), so no pivot vanishes.
  auto emit = [&](const R& a, const R& b, const R& c, const R& d) TM_INLINE {
    if (nrow == nv) {  // more rows than unknowns: cannot happen, refused below
      ok = false;
      return;
    }
    const R piv = nrow == 0 ? b : R(b - a * rows[nrow - 1].cp);
    if (is_zero(piv) || !finite(piv)) {
      ok = false;
      rows[nrow].cp = rows[nrow].dp = R(0);  // read by the next row
      ++nrow;
      return;
    }
    const R rhs = nrow == 0 ? d : R(d - a * rows[nrow - 1].dp);
    Row& r = rows[nrow++];
    r.cp = c / piv;
    r.dp = rhs / piv;
  };
  auto known = [&](const R& value) TM_INLINE { emit(R(0), R(1), R(0), value); };
  // theta(0) = 0 of segment g (fixed at its left end), unknown MA then MB.
  auto fixed_left_row = [&](const Terms& t) TM_INLINE {
    emit(R(0), K.two * t.f, t.f, R(-t.gr6 - K.six * t.psi));
  };
  // theta(L) = 0 of segment g (fixed at its right end), unknown MA then MB.
  auto fixed_right_row = [&](std::size_t g, const Terms& t) TM_INLINE {
    emit(t.f, K.two * t.f, R(0), R(-t.gl6 + K.six * t.psi - t.f * offA(g)));
  };
  Terms prev{}, cur = terms(0);  // the segments left and right of node k
  // Node 0.
  if (type_of(0) != SupportType::Fixed) known(node_C(real_of(0)));  // beyond the end M = 0
  else if (m == 1 && right_free) known(MA_right);                      // cantilever
  else fixed_left_row(cur);
  for (std::size_t k = 1; k < m; ++k) {
    std::swap(prev, cur);
    cur = terms(k);
    const bool lt = left_free && k == 1, rt = right_free && k == m - 1;
    if (type_of(k) == SupportType::Fixed) {
      if (lt) known(MB_left);
      else fixed_right_row(k - 1, prev);
      if (rt) known(MA_right);
      else fixed_left_row(cur);
      continue;
    }
    if (lt && rt) return failed<R>(reason_id::kSingular, "mechanism: overhangs either side of " + label(real_of(k)));
    if (lt) {
      known(MB_left);
    } else if (rt) {
      known(R(MA_right - node_C(real_of(k))));
    } else if (sup[real_of(k)].hinge) {
      known(R(0));
    } else {  // the three-moment equation at support k
      R d = -prev.gl6 - cur.gr6 + K.six * (prev.psi - cur.psi);
      if (any_node_load) d = d - prev.f * offA(k - 1) - K.two * cur.f * offA(k);
      emit(prev.f, K.two * (prev.f + cur.f), cur.f, d);
    }
  }
  // Node m.
  if (type_of(m) != SupportType::Fixed) known(R(R(0) - node_C(real_of(m))));
  else if (m == 1 && left_free) known(MB_left);
  else fixed_right_row(m - 1, cur);
  if (!ok || nrow != nv) return failed<R>(reason_id::kSingular, "zero or non-finite pivot in the three-moment system");
  if (!finite(rows[nv - 1].dp)) return failed<R>(reason_id::kNonFinite, "non-finite support moment");
  for (std::size_t i = nv - 1; i-- > 0;) {
    rows[i].dp = rows[i].dp - rows[i].cp * rows[i + 1].dp;
    if (!finite(rows[i].dp)) return failed<R>(reason_id::kNonFinite, "non-finite support moment");
  }
  if (right_free && type_of(m - 1) != SupportType::Fixed && (m - 1 == 0 || (m - 1 == 1 && left_free)))
    return failed<R>(reason_id::kSingular, "mechanism near " + label(real_of(m - 1)));
  if (left_free && type_of(1) != SupportType::Fixed && (m == 1 || (m == 2 && right_free)))
    return failed<R>(reason_id::kSingular, "mechanism near " + label(real_of(1)));

  // ---- Span statics from the support moments, rotations and deflections,
  // and the node results, in one pass along the beam. A left overhang
  // takes its rotation from segment 1, so segment 0 is finished (and its
  // nodes written) after segment 1.
  struct Done {
    EndSums<R> es;
    R MB;      // node-side moment at the right end
    R I1, I2;  // int_0^L M and int_0^L int M
  };
  auto finish = [&](std::size_t g, const R& MA, const R& MB) TM_INLINE {
    Segment<R>& sg = st->seg[g];
    const R& L = sg.L;
    Done d{end_sums(loads + sg.first, loads + sg.last, L, K), MB, R(0), R(0)};
    const R& invL = sg.invL;
    sg.MA = MA;
    if (g == 0 && left_free) sg.V0 = V0_left;
    else if (g == m - 1 && right_free) sg.V0 = V0_right;
    else sg.V0 = (MB - MA - (d.es.s.M + d.es.CL)) * invL;  // statics with the loads at L
    const R L2 = L * L;
    d.I1 = MA * L + sg.V0 * L2 * K.half + d.es.s.I1;
    d.I2 = MA * L2 * K.half + sg.V0 * L2 * L * K.sixth + d.es.s.I2;
    if (!((g == 0 && left_free) || (g == m - 1 && right_free))) {
      sg.v0 = settle(g);
      sg.theta0 = (settle(g + 1) - settle(g)) * invL + d.I2 * sg.invEI * invL;  // from v(L) = settlement
    }
    return d;
  };

  BasicSolution<R> out;
  reserve_huge(out.nodes, n + 1);
  bool bad = false;
  R x{0};                   // global x of the next node
  BasicPointValues<R> lv;   // values just left of the next node
  R Ml{0};                  // MB of the segment ending at the next node
  auto emit_node = [&](std::size_t i, const BasicPointValues<R>& left, const BasicPointValues<R>& right,
                       const R& Mr) TM_INLINE {
    out.nodes.emplace_back();
    BasicNodeResult<R>& nr = out.nodes.back();  // filled in place
    nr.x = x;
    if (i < n) x += beam.spans[i].length;
    if (i > 0) nr.moment_left = left.moment;
    if (i < n) nr.moment_right = right.moment;
    nr.rotation_left = i > 0 ? left.rotation : right.rotation;
    nr.rotation_right = i < n ? right.rotation : left.rotation;
    nr.deflection = i < n ? right.deflection : left.deflection;
    const SupportType t = sup[i].type;
    if (restrains_deflection(t)) {
      nr.deflection = sup[i].settlement;
      const R Vl = i > 0 ? left.shear : R(0);
      const R Vr = i < n ? right.shear : R(0);
      nr.reaction_force = Vr - Vl + node_P(i);  // V jumps by +R - P
    }
    if (t == SupportType::Fixed) {  // a fixed node ends segments: Ml, Mr are theirs
      nr.rotation_left = nr.rotation_right = R(0);
      nr.reaction_moment = (i > 0 ? Ml : R(0)) + node_C(i) - (i < n ? Mr : R(0));  // M jumps by +C - couple
    }
    // Without short-circuits: one test of the five, not five branches.
    const bool fin = finite(nr.deflection) & finite(nr.reaction_force) & finite(nr.reaction_moment) &
                     finite(nr.rotation_left) & finite(nr.rotation_right);
    bad = bad | !fin;
  };
  // The nodes from the left end of segment g up to (not including) its
  // right end; then `lv` and `Ml` for the node at its right end.
  auto emit_segment = [&](std::size_t g, const Done& d) TM_INLINE {
    const Segment<R>& sg = st->seg[g];
    const std::size_t i0 = real_of(g), i1 = real_of(g + 1);
    BasicPointValues<R> rv;  // inside segment g at 0: after the loads at 0
    rv.shear = sg.V0 - d.es.P0;
    rv.moment = sg.MA + d.es.C0;
    rv.rotation = sg.theta0;
    rv.deflection = sg.v0;
    emit_node(i0, lv, rv, sg.MA);
    for (std::size_t i = i0 + 1; i < i1; ++i)  // unsupported nodes inside a merged segment
      emit_node(i, eval_span(*st, i - 1, beam.spans[i - 1].length, false), eval_span(*st, i, R(0), true), R(0));
    // Inside segment g at L: before the loads at L.
    const R& L = sg.L;
    lv.shear = sg.V0 + d.es.s.V;
    lv.moment = sg.MA + sg.V0 * L + d.es.s.M;
    lv.rotation = sg.theta0 - d.I1 * sg.invEI;
    lv.deflection = sg.v0 + sg.theta0 * L - d.I2 * sg.invEI;
    Ml = d.MB;
  };

  {
    std::size_t v = 0;
    R MA = rows[v++].dp;  // MA of segment 0
    Done d0{};            // segment 0 when it is a left overhang
    for (std::size_t g = 0; g < m; ++g) {
      const std::size_t k = g + 1;  // the node at its right end
      R MB{0}, MA_next{0};
      if (k == m) {
        MB = rows[v].dp;
      } else if (type_of(k) == SupportType::Fixed) {
        MB = rows[v++].dp;
        MA_next = rows[v++].dp;
      } else {
        MB = rows[v++].dp;
        MA_next = MB + node_C(real_of(k));
      }
      Done d = finish(g, MA, MB);
      if (g == m - 1 && right_free) {  // integrate outward from the support's rotation
        Segment<R>& sg = st->seg[g];
        sg.theta0 = type_of(g) != SupportType::Fixed ? lv.rotation : R(0);
        sg.v0 = settle(g);
      }
      if (g == 0 && left_free && m > 1) {
        d0 = std::move(d);  // waits for segment 1
      } else {
        if (g == 0 && left_free) d0 = std::move(d);
        if ((g == 0 || g == 1) && left_free) {  // integrate back from the support's rotation
          Segment<R>& s0 = st->seg[0];
          const R th = type_of(1) != SupportType::Fixed ? st->seg[1].theta0 : R(0);
          s0.theta0 = th + d0.I1 * s0.invEI;
          s0.v0 = settle(1) - s0.theta0 * s0.L + d0.I2 * s0.invEI;
          emit_segment(0, d0);
        }
        if (!(g == 0 && left_free)) emit_segment(g, d);
      }
      MA = std::move(MA_next);
    }
    emit_node(n, lv, lv, R(0));
  }
  rows.release();
  if (bad) return failed<R>(reason_id::kNonFinite, "non-finite result");
  out.status = MethodStatus::Ok;
  set_at(out, std::move(st));
  return out;
}

}  // namespace

template <class R>
BasicSolution<R> solve(const BasicBeam<R>& beam, const std::vector<BasicStation<R>>& stations) {
  (void)stations;  // `at` is exact everywhere; the grid is not needed.
  const std::size_t n = beam.spans.size();
  if (n == 0) return failed<R>(reason_id::kInput, "beam has no spans");
  if (beam.supports.size() != n + 1 || beam.labels.size() != n + 1)
    return failed<R>(reason_id::kInput, "supports/labels do not match the number of spans");
  {
    BasicSolution<R> fast;
    if (solve_fast(beam, fast)) return fast;
  }
  if (fits_tridiagonal(beam)) return solve_tridiagonal(beam);
  return solve_banded(beam);
}

template BasicSolution<double> solve<double>(const BasicBeam<double>&, const std::vector<BasicStation<double>>&);
template BasicSolution<Extended> solve<Extended>(const BasicBeam<Extended>&,
                                                 const std::vector<BasicStation<Extended>>&);
template BasicSolution<Exact> solve<Exact>(const BasicBeam<Exact>&, const std::vector<BasicStation<Exact>>&);

namespace detail {

// For tests only: the same checks as `solve`, then always the general path
// (tridiagonal when it fits, banded otherwise), never the fast path.
template <class R>
BasicSolution<R> solve_general(const BasicBeam<R>& beam, const std::vector<BasicStation<R>>& stations) {
  (void)stations;
  const std::size_t n = beam.spans.size();
  if (n == 0) return failed<R>(reason_id::kInput, "beam has no spans");
  if (beam.supports.size() != n + 1 || beam.labels.size() != n + 1)
    return failed<R>(reason_id::kInput, "supports/labels do not match the number of spans");
  if (fits_tridiagonal(beam)) return solve_tridiagonal(beam);
  return solve_banded(beam);
}

template BasicSolution<double> solve_general<double>(const BasicBeam<double>&,
                                                     const std::vector<BasicStation<double>>&);
template BasicSolution<Extended> solve_general<Extended>(const BasicBeam<Extended>&,
                                                         const std::vector<BasicStation<Extended>>&);
template BasicSolution<Exact> solve_general<Exact>(const BasicBeam<Exact>&,
                                                   const std::vector<BasicStation<Exact>>&);

}  // namespace detail

}  // namespace trivet::three_moment
