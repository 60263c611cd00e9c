// trivet: the slope-deflection method (see slope_deflection.h), laid out as
// its derivation:
//
//   1. Each span load gives fixed-end moments and simple-beam sums
//      (fixed_end.h, one function per load type); they are summed per span.
//   2. The slope-deflection equations of each span (member-end convention,
//      clockwise +; theta clockwise +, D downward +, k = 2EI/L):
//        M_ij = k (2 theta_i + theta_j - 3 psi) + M_ij^F
//        M_ji = k (theta_i + 2 theta_j - 3 psi) + M_ji^F,  psi = (D_j - D_i)/L
//      and the end forces by statics of the span (upward on the member):
//        Y_i = V_i^F - (M_ij + M_ji - M_ij^F - M_ji^F)/L,  Y_j = V_j^F + (...)/L
//      with V^F the fixed-end shears (fixed_end.h).
//   3. Equilibrium of each node, one equation per unknown:
//        rotation:     sum of M at the member ends + kr theta = C_node
//        hinge side:   M at that member end = 0
//        translation:  -(sum of Y at the member ends) + k D = P_node + k s
//      Signs chosen so that the matrix is the beam's stiffness (band.h).
//   4. One pass over the spans adds each span's equations (one routine,
//      add_span) and reduces a node's rows as soon as they are complete;
//      one pass back solves the unknowns and, node by node, gives each
//      span's end moments and each node's reactions.
//   5. Values inside a span: span_curve.h.
//
// solve() first tries the fused route of the common beam (fused.h: pinned,
// roller and fixed supports, no hinge, no node load, loads in span order),
// steps 1 to 4 in one forward and one backward sweep; everything else, and
// every refusal with its reason, is the general path below
// (detail::solve_general).
#include "methods/slope_deflection/slope_deflection.h"

#include <algorithm>
#include <cstdint>
#include <memory>
#include <string>
#include <utility>

#include "methods/slope_deflection/band.h"
#include "methods/beam/status.h"
#include "methods/slope_deflection/fixed_end.h"
#include "methods/slope_deflection/fused.h"
#include "methods/slope_deflection/plumbing.h"
#include "methods/slope_deflection/span_curve.h"

namespace trivet::slope_deflection {
namespace {

using detail::is_finite;
using detail::is_zero;
using detail::LoadFault;
using detail::take_load;

std::string fault_text(LoadFault f, std::size_t span) {
  const char* what = "";
  switch (f) {
    case LoadFault::None: break;
    // The reader moves a point force at a span end onto the node.
    case LoadFault::PointNotInside: what = "point load not strictly inside its span"; break;
    case LoadFault::CoupleOutside: what = "couple outside its span"; break;
    case LoadFault::SpreadOutside: what = "distributed load outside its span"; break;
    case LoadFault::UnequalUdl: what = "uniform load with unequal end intensities"; break;
  }
  return what + (" on span " + std::to_string(span + 1));
}


// The unknowns of a node (-1: none, the value is known).
struct NodeUnknowns {
  std::int32_t thL = -1;  // rotation left of the node (the only one without a hinge)
  std::int32_t dv = -1;   // deflection
  std::int32_t thR = -1;  // rotation right of the node (= thL unless a hinge)
};

// Step 2 into the system: the slope-deflection equations of one span, as
// rows and columns of its unknowns u = (theta_i, D_i, theta_j, D_j) (-1:
// known, value `known`), with kL = 6EI/L^2 = 3k/L and kLL = 12EI/L^3:
//   M_ij  = [ 2k   kL   k   -kL ] u + M_ij^F    (row of theta_i)
//   -Y_i  = [ kL  kLL   kL  -kLL] u - V_i^F     (row of D_i)
//   M_ji  = [ k    kL   2k  -kL ] u + M_ji^F    (row of theta_j)
//   -Y_j  = [-kL -kLL  -kL   kLL] u - V_j^F     (row of D_j)
// (-Y from Y = V^F - (M_ij + M_ji - M_ij^F - M_ji^F)/L and the first and
// third rows). The constant goes to the right-hand side with its sign
// changed. Which of the four are unknowns is a template argument (bit r:
// u[r] is one), so that the compiler drops the tests for known values;
// add_span picks it. One routine for every kind of node.
template <unsigned Free, class R>
TRIVET_SD_INLINE void add_span_as(detail::Band<R>& sys, const long u[4], const R known[4], const R K[4][4],
                                  const R f[4]) {
  for (int r = 0; r < 4; ++r) {
    if (!((Free >> r) & 1u)) continue;
    for (int c = 0; c < 4; ++c) sys.add(u[r], ((Free >> c) & 1u) ? u[c] : -1, K[r][c], known[c]);
    sys.rhs[static_cast<std::size_t>(u[r])] -= f[r];
  }
}

template <class R>
TRIVET_SD_INLINE void add_span(detail::Band<R>& sys, const long u[4], const R known[4], const R& k, const R& kL,
                               const R& kLL, const R f[4]) {
  const R twok = R(2) * k;
  const R K[4][4] = {{twok, kL, k, -kL}, {kL, kLL, kL, -kLL}, {k, kL, twok, -kL}, {-kL, -kLL, -kL, kLL}};
  const unsigned free = (u[0] >= 0 ? 1u : 0u) | (u[1] >= 0 ? 2u : 0u) | (u[2] >= 0 ? 4u : 0u) | (u[3] >= 0 ? 8u : 0u);
  switch (free) {
#define TRIVET_SD_CASE(m) case m: add_span_as<m>(sys, u, known, K, f); break;
    TRIVET_SD_CASE(0) TRIVET_SD_CASE(1) TRIVET_SD_CASE(2) TRIVET_SD_CASE(3)
    TRIVET_SD_CASE(4) TRIVET_SD_CASE(5) TRIVET_SD_CASE(6) TRIVET_SD_CASE(7)
    TRIVET_SD_CASE(8) TRIVET_SD_CASE(9) TRIVET_SD_CASE(10) TRIVET_SD_CASE(11)
    TRIVET_SD_CASE(12) TRIVET_SD_CASE(13) TRIVET_SD_CASE(14) TRIVET_SD_CASE(15)
#undef TRIVET_SD_CASE
    default: break;
  }
}

// What steps 2 to 4 start from.
template <class R>
struct Problem {
  const BasicBeam<R>& beam;
  std::shared_ptr<detail::SolvedSpans<R>> state;  // spans and terms; end values filled by the solve
  std::vector<detail::SpanLoads<R>> sums;         // each span's load sums
  std::vector<R> nodeP, nodeC;                    // node loads (empty: none)
  std::vector<NodeUnknowns> un;
  std::size_t nu = 0;                             // number of unknowns
  bool running_sums = false;                      // some span has more than kDirectLoads loads
};

// Steps 2 to 4 for a system of half-bandwidth HB (band.h).
template <std::size_t HB, class R>
BasicSolution<R> solve_band(Problem<R>& pb) {
  using MS = MethodStatus;
  using detail::reserve_huge;
  const BasicBeam<R>& beam = pb.beam;
  const std::size_t n = beam.spans.size();
  const std::size_t N = n + 1;
  auto name = [&](std::size_t i) { return detail::node_name(beam.labels, i); };
  auto& spans = pb.state->spans;
  const std::vector<detail::SpanLoads<R>>& sums = pb.sums;
  const std::vector<R>& nodeP = pb.nodeP;
  const std::vector<R>& nodeC = pb.nodeC;
  const std::vector<NodeUnknowns>& un = pb.un;
  const std::size_t nu = pb.nu;
  // Steps 2 to 4, forward: each span's equations, then the node terms
  // (springs, node loads), then node s's rows are complete and reduced.
  detail::Band<R> sys;
  sys.init(nu, HB);
  const R tol = detail::pivot_tolerance<R>();
  const R zero(0);
  auto node_terms = [&](std::size_t i) {
    const BasicSupport<R>& sp = beam.supports[i];
    const bool spring = sp.type == SupportType::Spring;
    const NodeUnknowns& u = un[i];
    if (u.thL >= 0 && !sp.hinge) {
      if (!nodeC.empty()) sys.rhs[static_cast<std::size_t>(u.thL)] += nodeC[i];
      if (spring) sys.add(u.thL, u.thL, sp.kr, zero);
    }
    if (u.dv >= 0) {
      if (!nodeP.empty()) sys.rhs[static_cast<std::size_t>(u.dv)] += nodeP[i];
      if (spring) {
        sys.add(u.dv, u.dv, sp.k, zero);
        sys.rhs[static_cast<std::size_t>(u.dv)] += sp.k * sp.settlement;
      }
    }
  };
  // Reduces node i's rows; the row that fails, or -1.
  auto reduce_node = [&](std::size_t i) -> long {
    const NodeUnknowns& u = un[i];
    const std::int32_t rows[3] = {u.thL, u.dv, u.thR != u.thL ? u.thR : -1};
    for (std::int32_t r : rows)
      if (r >= 0 && !detail::reduce_row_hb<HB>(sys, static_cast<std::size_t>(r), tol)) return r;
    return -1;
  };
  // The band is filled just in time: node i's rows are cleared before the
  // first span that touches them is added.
  auto zero_rows = [&](std::size_t i) {
    const NodeUnknowns& u = un[i];
    for (std::int32_t r : {u.thL, u.dv, u.thR})
      if (r >= 0) sys.clear_row(static_cast<std::size_t>(r));
  };
  auto known_defl = [&](std::size_t i) -> const R& { return un[i].dv < 0 ? beam.supports[i].settlement : zero; };
  BasicSolution<R> out;
  reserve_huge(out.nodes, N);
  out.nodes.resize(N);
  R xpos{0};
  zero_rows(0);
  long bad = -1;
  for (std::size_t s = 0; s < n && bad < 0; ++s) {
    out.nodes[s].x = xpos;
    xpos += beam.spans[s].length;
    zero_rows(s + 1);
    detail::SpanCurve<R>& sc = spans[s];
    const detail::LoadTerms<R>& ld = sums[s].load;
    const R& invL = sc.invL;
    detail::set_simple_beam(sc, ld);
    const R k = R(2) * sc.EI * invL;  // 2EI/L
    const R kL = R(3) * k * invL;     // 6EI/L^2
    const R kLL = R(2) * kL * invL;   // 12EI/L^3
    const detail::EndPair<R> V = detail::fixed_end_shears(ld, invL);
    const long u[4] = {un[s].thR, un[s].dv, un[s + 1].thL, un[s + 1].dv};
    const R known[4] = {zero, known_defl(s), zero, known_defl(s + 1)};
    const R f[4] = {ld.fem_i, R(-V.left), ld.fem_j, R(-V.right)};
    add_span(sys, u, known, k, kL, kLL, f);
    node_terms(s);
    bad = reduce_node(s);
  }
  if (bad < 0) {
    out.nodes[n].x = xpos;
    node_terms(n);
    bad = reduce_node(n);
  }
  if (bad >= 0) {
    // The unknown's node and kind (only on failure: O(n) once).
    std::size_t node = 0;
    const char* what = "unknown";
    for (std::size_t i = 0; i < N; ++i) {
      if (un[i].thL == bad) { node = i; what = beam.supports[i].hinge ? "rotation left of the hinge" : "rotation"; break; }
      if (un[i].dv == bad) { node = i; what = "deflection"; break; }
      if (un[i].thR == bad) { node = i; what = "rotation right of the hinge"; break; }
    }
    return give_up<R>(MS::Failed, reason_id::kSingular, std::string("zero or non-positive pivot at the ") + what + " of node " +
                                      name(node) + " (a mechanism, or too ill-conditioned)");
  }

  // Backward: node i's unknowns, then span i's end moments, then node i + 1
  // complete (span i + 1 was done the step before). Y and M of the member
  // ends: Y_i = R_i0 + (M_j - M_i)/L, Y_j = R_j0 - (M_j - M_i)/L in sagging
  // end moments M_i = M_ij, M_j = -M_ji; the reactions are P + sum of Y
  // and C - sum of member-end moments.
  const R* const x = sys.rhs.get();
  auto value = [&](long idx, const R& known) -> const R& { return idx >= 0 ? x[static_cast<std::size_t>(idx)] : known; };
  // Node i's sums from the span on its right: Y_i and M_ij.
  R Y_right{0}, M_right{0};
  auto finish_node = [&](std::size_t i, const R& Y_left, const R& M_left) TRIVET_SD_INLINE_LAMBDA {
    const BasicSupport<R>& sp = beam.supports[i];
    BasicNodeResult<R>& nr = out.nodes[i];
    R Y = nodeP.empty() ? R(0) : nodeP[i];
    R Cn = nodeC.empty() ? R(0) : nodeC[i];
    if (i > 0) { Y += Y_left; Cn -= M_left; }
    if (i < n) { Y += Y_right; Cn -= M_right; }
    nr.deflection = value(un[i].dv, sp.settlement);
    const R& rl = value(un[i].thL, zero);
    const R& rr = value(un[i].thR, zero);
    nr.rotation_left = (i == 0) ? rr : rl;
    nr.rotation_right = (i == n) ? rl : rr;
    if (i > 0) nr.moment_left = spans[i - 1].M_j - sums[i - 1].couple_at_end;
    if (i < n) nr.moment_right = spans[i].M_i + sums[i].couple_at_start;
    if (restrains_deflection(sp.type)) nr.reaction_force = std::move(Y);
    else if (sp.type == SupportType::Spring) nr.reaction_force = sp.k * (nr.deflection - sp.settlement);
    if (restrains_rotation(sp.type)) nr.reaction_moment = std::move(Cn);
    else if (sp.type == SupportType::Spring) nr.reaction_moment = sp.kr * rr;
  };
  for (std::size_t i = N; i-- > 0;) {
    const NodeUnknowns& u = un[i];
    if (u.thR >= 0 && u.thR != u.thL) detail::back_substitute_hb<HB>(sys, static_cast<std::size_t>(u.thR));
    if (u.dv >= 0) detail::back_substitute_hb<HB>(sys, static_cast<std::size_t>(u.dv));
    if (u.thL >= 0) detail::back_substitute_hb<HB>(sys, static_cast<std::size_t>(u.thL));
    if (i == n) continue;
    // Span i's end moments (step 2 with the solved unknowns).
    detail::SpanCurve<R>& sc = spans[i];
    const detail::LoadTerms<R>& ld = sums[i].load;
    const R& invL = sc.invL;
    const R k = R(2) * sc.EI * invL;
    const R& ti = value(un[i].thR, zero);
    const R& tj = value(un[i + 1].thL, zero);
    sc.D_i = value(un[i].dv, beam.supports[i].settlement);
    sc.D_j = value(un[i + 1].dv, beam.supports[i + 1].settlement);
    const R psi = (sc.D_j - sc.D_i) * invL;
    const R M_ij = k * (R(2) * ti + tj - R(3) * psi) + ld.fem_i;
    const R M_ji = k * (ti + R(2) * tj - R(3) * psi) + ld.fem_j;
    if (!is_finite(M_ij) || !is_finite(M_ji)) {
      for (std::size_t r = 0; r < nu; ++r)
        if (!is_finite(x[r])) return give_up<R>(MS::Failed, reason_id::kNonFinite, "non-finite value in the solution");
      return give_up<R>(MS::Failed, reason_id::kNonFinite, "non-finite end moment");
    }
    sc.M_i = M_ij;
    sc.M_j = -M_ji;
    const R dV = (sc.M_j - sc.M_i) * invL;
    const R Y_i = sc.R_i0 + dV;
    const R Y_j = (ld.force - sc.R_i0) - dV;
    finish_node(i + 1, Y_j, M_ji);
    Y_right = Y_i;
    M_right = M_ij;
  }
  finish_node(0, zero, zero);

  // Step 5: the running sums of the spans with many loads (span_curve.h).
  if (pb.running_sums) detail::build_running_sums(*pb.state);

  std::shared_ptr<const detail::SolvedSpans<R>> frozen = std::move(pb.state);
  out.at = [frozen](std::size_t span, const R& local, bool after) {
    return detail::span_values(*frozen, span, local, after);
  };
  out.status = MS::Ok;
  return out;
}


}  // namespace

template <class R>
BasicSolution<R> solve(const BasicBeam<R>& beam, const std::vector<BasicStation<R>>& stations) {
  if (!beam.spans.empty() && beam.supports.size() == beam.spans.size() + 1) {
    BasicSolution<R> fast;
    if (detail::solve_fused(beam, fast)) return fast;
  }
  return detail::solve_general(beam, stations);
}

namespace detail {

template <class R>
BasicSolution<R> solve_general(const BasicBeam<R>& beam, const std::vector<BasicStation<R>>& stations) {
  (void)stations;  // exact at any point; no grid needed
  using MS = MethodStatus;
  using detail::reserve_huge;
  const std::size_t n = beam.spans.size();
  if (n == 0) return give_up<R>(MS::Failed, reason_id::kInput, "invalid beam: no span");
  const std::size_t N = n + 1;
  if (beam.supports.size() != N) return give_up<R>(MS::Failed, reason_id::kInput, "invalid beam: support count is not spans + 1");
  auto name = [&](std::size_t i) { return detail::node_name(beam.labels, i); };

  auto state = std::make_shared<detail::SolvedSpans<R>>();
  auto& spans = state->spans;
  auto& terms = state->terms;
  reserve_huge(spans, n);
  std::vector<detail::SpanLoads<R>> sums(n);

  // The spans, and the unknowns node by node: [rotation left (= right
  // unless hinge), deflection, rotation right at a hinge]; with them what
  // is out of the method's scope.
  std::vector<NodeUnknowns> un;
  reserve_huge(un, N);
  un.resize(N);
  long next = 0;
  std::size_t hb = 0;
  for (std::size_t i = 0; i < N; ++i) {
    if (i < n) {
      const BasicSpan<R>& bs = beam.spans[i];
      if (!(bs.length > R(0)) || !is_finite(bs.length))
        return give_up<R>(MS::Failed, reason_id::kInput, "invalid beam: length of span " + std::to_string(i + 1) + " is not positive");
      if (!(bs.EI > R(0)) || !is_finite(bs.EI))
        return give_up<R>(MS::Failed, reason_id::kInput, "invalid beam: EI of span " + std::to_string(i + 1) + " is not positive");
      spans.emplace_back(bs.length, bs.EI);
    }
    const BasicSupport<R>& sp = beam.supports[i];
    const SupportType t = sp.type;
    if (t == SupportType::Spring && (sp.k < R(0) || sp.kr < R(0)))
      return give_up<R>(MS::NotApplicable, reason_id::kFeature, "negative spring stiffness at node " + name(i));
    if ((t == SupportType::Free || t == SupportType::Guided) && !is_zero(sp.settlement))
      return give_up<R>(MS::NotApplicable, reason_id::kFeature, "settlement on a " + std::string(support_type_name(t)) + " node " + name(i));
    if (sp.hinge) {
      if (i == 0 || i == n) return give_up<R>(MS::NotApplicable, reason_id::kFeature, "hinge at end node " + name(i));
      if (restrains_rotation(t))
        return give_up<R>(MS::NotApplicable, reason_id::kFeature, "hinge on a " + std::string(support_type_name(t)) + " support at node " + name(i));
      if (t == SupportType::Spring && sp.kr > R(0))
        return give_up<R>(MS::NotApplicable, reason_id::kFeature, "hinge on a rotational spring at node " + name(i));
    }
    const bool rotates = !restrains_rotation(t);
    NodeUnknowns& u = un[i];
    if (rotates) u.thL = u.thR = static_cast<std::int32_t>(next++);
    if (!restrains_deflection(t)) u.dv = static_cast<std::int32_t>(next++);
    if (rotates && sp.hinge) u.thR = static_cast<std::int32_t>(next++);
    if (next > 2000000000L) return give_up<R>(MS::NotApplicable, reason_id::kSize, "more than 2e9 unknowns");
    if (i > 0) {
      // Half-bandwidth: the spread of span i-1's unknowns (at most 3).
      const NodeUnknowns& v = un[i - 1];
      const std::int32_t ends[4] = {v.thR, v.dv, u.thL, u.dv};
      std::int32_t lo = -1, hi = -1;
      for (std::int32_t e : ends) {
        if (e < 0) continue;
        if (lo < 0 || e < lo) lo = e;
        if (e > hi) hi = e;
      }
      if (lo >= 0 && hi > lo) hb = std::max(hb, static_cast<std::size_t>(hi - lo));
    }
  }
  const std::size_t nu = static_cast<std::size_t>(next);

  // Step 1: the loads, in one pass in the order of the file. Each span
  // load's closed forms are summed into its span; its term is kept for
  // `at`. Node loads only when there are any (empty: none).
  std::vector<R> nodeP, nodeC;
  reserve_huge(terms, beam.loads.size());
  bool grouped = true;         // every span's loads together, spans in order
  std::size_t most_loads = 0;  // on one span
  std::size_t run_span = 0, run_count = 0;  // the loads of one span in a row
  auto end_run = [&]() {
    if (run_count == 0) return;
    detail::SpanCurve<R>& sc = spans[run_span];
    sc.first = terms.size() - run_count;  // the span's terms, if grouped
    sc.last = terms.size();
    most_loads = std::max(most_loads, run_count);
  };
  R invL2 = spans[0].invL * spans[0].invL;
  for (const auto& l : beam.loads) {
    if (l.on_node) {
      if (l.index >= N) return give_up<R>(MS::NotApplicable, reason_id::kFeature, "load on a node outside the beam");
      if (l.type != LoadType::Point && l.type != LoadType::Couple)
        return give_up<R>(MS::NotApplicable, reason_id::kFeature, std::string(load_type_name(l.type)) + " load on node " + name(l.index));
      if (nodeP.empty()) {
        nodeP.assign(N, R(0));
        nodeC.assign(N, R(0));
      }
      if (l.type == LoadType::Point) nodeP[l.index] += l.P;
      else nodeC[l.index] += l.C;
      continue;
    }
    const std::size_t s = l.index;
    if (s >= n) return give_up<R>(MS::NotApplicable, reason_id::kFeature, "load on a span outside the beam");
    if (s != run_span) {
      end_run();
      run_count = 0;
      if (s < run_span || spans[s].last > 0) grouped = false;
      run_span = s;
      invL2 = spans[s].invL * spans[s].invL;
    }
    detail::Term<R>& t = terms.emplace_back();
    const LoadFault f = take_load(l, spans[s].L, invL2, t, sums[s]);
    if (f != LoadFault::None) return give_up<R>(MS::NotApplicable, reason_id::kFeature, fault_text(f, s));
    ++run_count;
  }
  end_run();
  if (!nodeC.empty())
    for (std::size_t i = 0; i < N; ++i)
      if (beam.supports[i].hinge && !is_zero(nodeC[i]))
        return give_up<R>(MS::NotApplicable, reason_id::kFeature, "couple at hinge node " + name(i));
  if (!grouped) {
    // A stable counting sort of the terms by span (the loads jump back and
    // forth between spans).
    std::vector<std::size_t> count(n, 0);
    for (const auto& l : beam.loads)
      if (!l.on_node) ++count[l.index];
    std::size_t total = 0;
    most_loads = 0;
    for (std::size_t s = 0; s < n; ++s) {
      spans[s].first = spans[s].last = total;
      total += count[s];
      most_loads = std::max(most_loads, count[s]);
    }
    std::vector<detail::Term<R>> sorted(total);
    std::size_t i = 0;
    for (const auto& l : beam.loads)
      if (!l.on_node) sorted[spans[l.index].last++] = std::move(terms[i++]);
    terms = std::move(sorted);
  }

  Problem<R> pb{beam, std::move(state), std::move(sums), std::move(nodeP), std::move(nodeC), std::move(un), nu,
                most_loads > detail::kDirectLoads};
  switch (hb) {
    case 0: return solve_band<0>(pb);
    case 1: return solve_band<1>(pb);
    case 2: return solve_band<2>(pb);
    default: return solve_band<3>(pb);
  }
}

template <class R>
EndPair<R> fixed_end_moments(const BasicLoad<R>& l, const R& L) {
  const R invL2 = R(1) / (L * L);
  LoadTerms<R> t;
  switch (l.type) {
    case LoadType::Point: t = point_terms(l.P, l.at, L, invL2); break;
    case LoadType::Couple: t = couple_terms(l.C, l.at, L, invL2); break;
    case LoadType::Udl: t = udl_terms(l.w1, l.from, l.to, L, invL2); break;
    case LoadType::Linear: t = linear_terms(l.w1, l.w2, l.from, l.to, L, invL2); break;
  }
  return {t.fem_i, t.fem_j};
}

// A simple span (end moments and deflections zero) under the one load,
// through span_curve.h: the elastic curve's end slopes.
template <class R>
EndPair<R> simple_span_end_rotations(const BasicLoad<R>& l, const R& L, const R& EI) {
  SolvedSpans<R> st;
  Term<R> t;
  SpanCurve<R> s(L, EI);
  SpanLoads<R> sums;
  if (take_load(l, L, R(s.invL * s.invL), t, sums) != LoadFault::None) return {};
  st.terms.push_back(t);
  s.first = 0;
  s.last = 1;
  s.M_i = s.M_j = s.D_i = s.D_j = R(0);
  set_simple_beam(s, sums.load);
  st.spans.push_back(s);
  return {span_values(st, 0, R(0), true).rotation, span_values(st, 0, L, false).rotation};
}

}  // namespace detail

template BasicSolution<double> solve<double>(const BasicBeam<double>&, const std::vector<BasicStation<double>>&);
template BasicSolution<Extended> solve<Extended>(const BasicBeam<Extended>&,
                                                 const std::vector<BasicStation<Extended>>&);
template BasicSolution<Exact> solve<Exact>(const BasicBeam<Exact>&, const std::vector<BasicStation<Exact>>&);

namespace detail {
template BasicSolution<double> solve_general<double>(const BasicBeam<double>&,
                                                     const std::vector<BasicStation<double>>&);
template BasicSolution<Extended> solve_general<Extended>(const BasicBeam<Extended>&,
                                                         const std::vector<BasicStation<Extended>>&);
template BasicSolution<Exact> solve_general<Exact>(const BasicBeam<Exact>&, const std::vector<BasicStation<Exact>>&);
template EndPair<double> fixed_end_moments<double>(const BasicLoad<double>&, const double&);
template EndPair<Extended> fixed_end_moments<Extended>(const BasicLoad<Extended>&, const Extended&);
template EndPair<Exact> fixed_end_moments<Exact>(const BasicLoad<Exact>&, const Exact&);
template EndPair<double> simple_span_end_rotations<double>(const BasicLoad<double>&, const double&, const double&);
template EndPair<Extended> simple_span_end_rotations<Extended>(const BasicLoad<Extended>&, const Extended&,
                                                               const Extended&);
template EndPair<Exact> simple_span_end_rotations<Exact>(const BasicLoad<Exact>&, const Exact&, const Exact&);
}  // namespace detail

}  // namespace trivet::slope_deflection
