// trivet, slope-deflection: the common beam in two sweeps.
//
// The common beam: every support pinned, roller or fixed (settlements
// allowed), no hinge, no node load, the span loads in span order. Its
// unknowns are the rotations of the pinned and roller nodes, and its system
// (band.h) is tridiagonal. This is the general solve of slope_deflection.cpp
// (steps 1 to 4, the same closed forms of fixed_end.h through take_load,
// the same operations in the same order) fused into two sweeps:
//   forward:  each span's loads into its sums, its slope-deflection
//             equations into the rows of its two end nodes, and at once
//             the elimination of the row of its left node (now complete);
//   backward: each node's rotation, the span's end moments, the node's
//             results.
// Each span's data is touched once in each sweep. Whatever it does not
// cover, and any fault or bad pivot, it leaves to the general path (which
// then also gives the reason): it returns false and `out` is not used.
// tests/slope_deflection_test.cpp compares the two (detail::solve_general).
#pragma once

#include <cstddef>
#include <memory>
#include <vector>

#include "methods/slope_deflection/band.h"
#include "methods/slope_deflection/fixed_end.h"
#include "methods/slope_deflection/plumbing.h"
#include "methods/slope_deflection/span_curve.h"

namespace trivet::slope_deflection::detail {

// A support of the common beam.
template <class R>
TRIVET_SD_INLINE bool common_support(const BasicSupport<R>& sp) {
  return (sp.type == SupportType::Pinned || sp.type == SupportType::Roller || sp.type == SupportType::Fixed) &&
         !sp.hinge;
}

// One node's row of the tridiagonal system as the forward sweep leaves it,
// with what the backward sweep needs of span s's loads (row s goes with
// span s; a fixed node's row has ip = r = 0). The entry right of the
// diagonal is 2EI/L of span s, or 0 when node s + 1 is fixed: not stored,
// the backward sweep computes it again. Every field is written before it
// is read.
template <class R>
struct FusedRow {
  R ip;            // 1 / pivot
  R r;             // the reduced right-hand side
  R x;             // global x of the node
  R fem_i, fem_j;  // span s's fixed-end moments (fixed_end.h)
  R force;         // span s's total load
};

template <class R>
bool solve_fused(const BasicBeam<R>& beam, BasicSolution<R>& out) {
  const std::size_t n = beam.spans.size();
  const std::size_t N = n + 1;
  if (N > std::size_t(2000000000)) return false;
  if (!common_support(beam.supports[0])) return false;
  const auto& loads = beam.loads;
  const std::size_t nl = loads.size();
  auto state = std::make_shared<SolvedSpans<R>>();
  auto& spans = state->spans;
  auto& terms = state->terms;
  reserve_huge(spans, n);
  // Every span load becomes one term, in order: made here at once (a
  // call per term in the sweep would make the compiler spill the sweep's
  // running values around each call).
  reserve_huge(terms, nl);
  terms.resize(nl);
  const std::unique_ptr<FusedRow<R>[]> row_store(new FusedRow<R>[N]);
  FusedRow<R>* const rows = row_store.get();
  advise_huge(rows, N * sizeof(FusedRow<R>));
  const R tol = pivot_tolerance<R>();
  const R zero(0);
  std::size_t lp = 0;          // the next load
  std::size_t most_loads = 0;  // on one span
  bool end_couples = false;    // a couple at a span end (fixed_end.h, add_end_couple)
  R Dcur{0}, bcur{0};          // diagonal and right-hand side of node s's row, as assembled so far
  R c_prev{0}, ip_prev{0}, r_prev{0};  // the row before: entry right of its diagonal, 1 / pivot, right-hand side
  R xpos{0};
  // Node s's row is complete: reduce it by the row before it (band.h,
  // reduce_row_hb with HB = 1) and keep it; false for a bad pivot.
  auto finish_row = [&](std::size_t s, FusedRow<R>& row) TRIVET_SD_INLINE_LAMBDA -> bool {
    row.x = xpos;
    if (restrains_rotation(beam.supports[s].type)) {
      row.ip = row.r = ip_prev = r_prev = zero;
      return true;
    }
    R p = Dcur;
    if (!is_zero(c_prev)) {
      const R f = c_prev * ip_prev;
      p -= f * c_prev;
      bcur -= f * r_prev;
    }
    if (!(p > Dcur * tol) || !(p > R(0)) || !is_finite(p)) return false;
    row.ip = ip_prev = R(1) / p;
    row.r = r_prev = bcur;
    return true;
  };
  for (std::size_t s = 0; s < n; ++s) {
    const BasicSupport<R>& left = beam.supports[s];
    const BasicSupport<R>& right = beam.supports[s + 1];
    if (!common_support(right)) return false;
    const BasicSpan<R>& bs = beam.spans[s];
    if (!(bs.length > R(0)) || !is_finite(bs.length) || !(bs.EI > R(0)) || !is_finite(bs.EI)) return false;
    SpanCurve<R>& sc = spans.emplace_back(bs.length, bs.EI);
    // Step 1: the span's loads (they must come in span order).
    SpanLoads<R> sums;
    sc.first = lp;
    if (lp < nl && !loads[lp].on_node && loads[lp].index == s) {
      const R invL2 = sc.invL * sc.invL;
      do {
        if (take_load(loads[lp], sc.L, invL2, terms[lp], sums) != LoadFault::None) return false;
      } while (++lp < nl && !loads[lp].on_node && loads[lp].index == s);
    }
    sc.last = lp;
    // A node load, or a load of an earlier span next: not the common beam.
    if (lp < nl && (loads[lp].on_node || loads[lp].index <= s)) return false;
    if (sc.last - sc.first > most_loads) most_loads = sc.last - sc.first;
    if (!is_zero(sums.couple_at_start) || !is_zero(sums.couple_at_end)) end_couples = true;
    const LoadTerms<R>& ld = sums.load;
    set_simple_beam(sc, ld);
    // Step 2 into rows s and s + 1 (slope_deflection.cpp, add_span: the
    // rotation rows, the known deflections to the right-hand side).
    const R k = R(2) * sc.EI * sc.invL;  // 2EI/L
    const R twok = R(2) * k;
    const R& Di = left.settlement;
    const R& Dj = right.settlement;
    R bnext{0};
    if (!is_zero(Di) || !is_zero(Dj)) {
      const R kL = R(3) * k * sc.invL;  // 6EI/L^2
      if (!is_zero(Di)) bcur -= kL * Di;
      if (!is_zero(Dj)) bcur -= -kL * Dj;
      if (!is_zero(Di)) bnext -= kL * Di;
      if (!is_zero(Dj)) bnext -= -kL * Dj;
    }
    bcur -= ld.fem_i;
    bnext -= ld.fem_j;
    Dcur += twok;
    // Step 4, forward: node s's row is complete.
    FusedRow<R>& row = rows[s];
    row.fem_i = ld.fem_i;
    row.fem_j = ld.fem_j;
    row.force = ld.force;
    if (!finish_row(s, row)) return false;
    c_prev = restrains_rotation(right.type) ? zero : k;
    xpos += bs.length;
    Dcur = zero + twok;
    bcur = std::move(bnext);
  }
  if (lp != nl) return false;
  if (!finish_row(n, rows[n])) return false;

  // Backward: node i's rotation from node i + 1's, span i's end moments,
  // node i + 1 complete (span i + 1 was done the step before); as the
  // general path's back substitution and finish_node.
  reserve_huge(out.nodes, N);
  out.nodes.resize(N);
  // The sums of span s's couples at its ends, only where there are any.
  auto couple_ends = [&](std::size_t s, R& at_start, R& at_end) {
    at_start = at_end = zero;
    if (!end_couples) return;
    for (std::size_t q = spans[s].first; q < spans[s].last; ++q) {
      const Term<R>& t = terms[q];
      if (t.kind == TermKind::Couple) add_end_couple(t.p, t.a, spans[s].L, at_start, at_end);
    }
  };
  R tj = rows[n].r * rows[n].ip;  // rotation of node i + 1 (0 where fixed)
  if (restrains_rotation(beam.supports[n].type)) tj = zero;
  R Y_right{0}, M_right{0};  // node i + 1's sums from span i + 1: Y and M_ij
  R start_right{0};          // span i + 1's couples at its start
  auto finish_node = [&](std::size_t i, const R& Y_left, const R& M_left, const R& rot) TRIVET_SD_INLINE_LAMBDA {
    const BasicSupport<R>& sp = beam.supports[i];
    BasicNodeResult<R>& nr = out.nodes[i];
    R Y{0}, Cn{0};
    if (i > 0) { Y += Y_left; Cn -= M_left; }
    if (i < n) { Y += Y_right; Cn -= M_right; }
    nr.x = rows[i].x;
    nr.deflection = sp.settlement;
    nr.rotation_left = rot;
    nr.rotation_right = rot;
    if (i < n) nr.moment_right = spans[i].M_i + start_right;
    nr.reaction_force = std::move(Y);
    if (restrains_rotation(sp.type)) nr.reaction_moment = std::move(Cn);
  };
  for (std::size_t i = n; i-- > 0;) {
    const FusedRow<R>& row = rows[i];
    const BasicSupport<R>& left = beam.supports[i];
    const BasicSupport<R>& right = beam.supports[i + 1];
    SpanCurve<R>& sc = spans[i];
    const R& invL = sc.invL;
    const R k = R(2) * sc.EI * invL;
    const R c = restrains_rotation(right.type) ? zero : k;
    const R ti = restrains_rotation(left.type) ? zero : R((row.r - c * tj) * row.ip);
    sc.D_i = left.settlement;
    sc.D_j = right.settlement;
    const R psi = (sc.D_j - sc.D_i) * invL;
    const R M_ij = k * (R(2) * ti + tj - R(3) * psi) + row.fem_i;
    const R M_ji = k * (ti + R(2) * tj - R(3) * psi) + row.fem_j;
    if (!is_finite(M_ij) || !is_finite(M_ji)) return false;
    sc.M_i = M_ij;
    sc.M_j = -M_ji;
    const R dV = (sc.M_j - sc.M_i) * invL;
    const R Y_i = sc.R_i0 + dV;
    const R Y_j = (row.force - sc.R_i0) - dV;
    R at_start, at_end;
    couple_ends(i, at_start, at_end);
    out.nodes[i + 1].moment_left = sc.M_j - at_end;
    finish_node(i + 1, Y_j, M_ji, tj);
    Y_right = Y_i;
    M_right = M_ij;
    start_right = std::move(at_start);
    tj = ti;
  }
  finish_node(0, zero, zero, tj);

  // Step 5: the running sums of the spans with many loads (span_curve.h).
  if (most_loads > kDirectLoads) build_running_sums(*state);
  std::shared_ptr<const SolvedSpans<R>> frozen = std::move(state);
  out.at = [frozen](std::size_t span, const R& local, bool after) { return span_values(*frozen, span, local, after); };
  out.status = MethodStatus::Ok;
  return true;
}

}  // namespace trivet::slope_deflection::detail
