// trivet: the direct stiffness method. See stiffness.h.
//
// Element degrees of freedom, in the beam.h conventions: deflection v
// (down +) and rotation theta = dv/dx (clockwise +) at each end. With
// forces down + and couples clockwise + as the work-conjugate actions, the
// element stiffness is the usual EI/h^3 [12 6h -12 6h; 6h 4h^2 -6h 2h^2;
// -12 -6h 12 -6h; 6h 2h^2 -6h 4h^2], and EI v'''' = w (load down +).
//
// One element per span. Its end forces F = k u - f (f: the work-equivalent
// loads of all the span's loads) are the actions of the nodes ON the element
// (down +, clockwise +), so by the jump rules of beam.h the shear and moment
// just inside the span's left end, before any load at local 0, are
// V0 = -F1 and M0 = +F2; statics of the span carries them to any x. With
// Hermite cubics (the exact homogeneous solutions of EI v'''' = 0) these end
// forces are exact, not approximations: -f are the exact fixed-end forces.
//
// The derivation by file: stiffness_loads.h, the element load terms (the
// consistent nodal loads and the clamped-clamped particular solution of
// each load type); this file, the element stiffness, the DOF numbering,
// assembly, solve (the band LDL^T in stiffness_band.h) and end forces;
// stiffness_recovery.h, the answer anywhere inside a span; and
// stiffness_checks.h, the scope checks (plumbing). The fast path for
// rotations-only elements and tridiagonal systems (kFast) differs from the
// general one only in its assembly and factorisation; both call the same
// load-term functions.
#include "methods/stiffness/stiffness.h"

#include <algorithm>
#include <cmath>
#include <exception>
#include <limits>
#include <memory>
#include <string>
#include <utility>
#include <vector>

#include "methods/stiffness/stiffness_band.h"
#include "methods/stiffness/stiffness_checks.h"
#include "methods/stiffness/stiffness_loads.h"
#include "methods/stiffness/stiffness_recovery.h"

namespace trivet::stiffness {
namespace {

using namespace internal;

// --- The element stiffness (part two of the derivation: assembly and solve) --------

// Element stiffness times end displacements.
template <class R>
inline __attribute__((always_inline)) void stiffness_times(const R& EI, const R& h, const R u[4], R out[4]) {
  const R c = EI / (h * h * h);
  const R h2 = h * h;
  out[0] = c * (R(12) * u[0] + R(6) * h * u[1] - R(12) * u[2] + R(6) * h * u[3]);
  out[1] = c * (R(6) * h * u[0] + R(4) * h2 * u[1] - R(6) * h * u[2] + R(2) * h2 * u[3]);
  out[2] = c * (-R(12) * u[0] - R(6) * h * u[1] + R(12) * u[2] - R(6) * h * u[3]);
  out[3] = c * (R(6) * h * u[0] + R(2) * h2 * u[1] - R(6) * h * u[2] + R(4) * h2 * u[3]);
}

// The element stiffness matrix itself (symmetric).
template <class R>
inline __attribute__((always_inline)) void element_matrix(const R& EI, const R& h, R k[4][4]) {
  const R c = EI / (h * h * h);
  const R a = R(12) * c, b = R(6) * h * c, d = R(4) * h * h * c, e = R(2) * h * h * c;
  const R m[4][4] = {{a, b, -a, b}, {b, d, -b, e}, {-a, -b, a, -b}, {b, e, -b, d}};
  for (int i = 0; i < 4; ++i)
    for (int j = 0; j < 4; ++j) k[i][j] = m[i][j];
}

// --- The solver -------------------------------------------------------------------
//
// Few passes over the beam, since for a long beam the passes over memory,
// not the arithmetic, set the time: one over the supports and spans
// (scope, DOF numbering, bandwidth), one over the spans with their loads
// (scope of each load, the span's loads in local coordinates, consistent
// loads, assembly, the load side of the equilibrium check), the band
// solve, and one over the spans and nodes (end forces, node results, the
// reaction side of the equilibrium check). Any input outside the scope is
// reported by check_scope, so the message is the one of the full check.
// Loads that do not come in span order are regrouped (stably) and the
// assembly pass is run again on them.

// A span with more loads than this is recovered from sums by position
// (SpanIndex, stiffness_recovery.h: O(log m) a call), one with this many or
// fewer by the loop over its loads (O(m) a call, no set-up and no memory
// beyond the loads). Measured on one span with point loads and partial
// UDLs, solve plus every station: the loop is faster at 4 loads (1.5 against
// 2.0 us), the sums from 8 on (2.7 against 4.0 us; at 32, 8.3 against 32 us).
constexpr std::size_t kIndexAbove = 6;

// kFast false: the special cases for rotations-only elements and
// tridiagonal systems turned off (detail::solve_general, for the tests).
// index_above: spans with more loads than this get the sums by position
// (detail::solve_with_index_above, for the tests).
template <class R, bool kFast = true>
BasicSolution<R> solve_impl(const BasicBeam<R>& beam, std::size_t index_above = kIndexAbove) {
  using std::abs;
  using std::sqrt;
  const std::size_t n = beam.spans.size();
  if (n == 0 || beam.supports.size() != n + 1) return not_applicable<R>(reason_id::kFeature, check_scope(beam));

  // Degrees of freedom, only at the beam's nodes, and only the free ones
  // numbered: at node i v, theta (left side) and, at a hinge, theta of the
  // right side, each unless restrained. A restrained DOF has no number; its
  // prescribed value goes to the right-hand side during assembly.
  constexpr std::size_t kNone = static_cast<std::size_t>(-1);
  std::vector<std::size_t> base(n + 1);
  struct Dofs { std::size_t v, thL, thR; };
  auto node_dofs = [&](std::size_t i) __attribute__((always_inline)) {
    const BasicSupport<R>& sp = beam.supports[i];
    std::size_t c = base[i];
    Dofs d;
    d.v = restrains_deflection(sp.type) ? kNone : c++;
    d.thL = restrains_rotation(sp.type) ? kNone : c++;
    d.thR = sp.hinge ? c++ : d.thL;
    return d;
  };
  // The element of span s: DOFs and prescribed values of (v, theta) at its
  // left end (node s, right side) and right end (node s + 1, left side).
  // a and b: node_dofs(s) and node_dofs(s + 1).
  auto element_dofs = [&](std::size_t s, const Dofs& a, const Dofs& b, std::size_t d[4], R g[4]) __attribute__((always_inline)) {
    d[0] = a.v; d[1] = a.thR; d[2] = b.v; d[3] = b.thL;
    g[0] = a.v == kNone ? beam.supports[s].settlement : R(0);
    g[2] = b.v == kNone ? beam.supports[s + 1].settlement : R(0);
    g[1] = g[3] = R(0);  // a restrained rotation is held at zero
  };

  // Pass 1, supports and spans: scope, DOF numbers and the half-bandwidth
  // (the widest spread of one element's numbered DOFs; they increase along
  // d[0..3]).
  std::size_t ndof = 0, width = 0;
  bool in_scope = true;
  Dofs prev_dofs{};
  for (std::size_t i = 0; i <= n; ++i) {
    const BasicSupport<R>& sp = beam.supports[i];
    if (i < n) in_scope = in_scope && R(0) < beam.spans[i].length && R(0) < beam.spans[i].EI;
    in_scope = in_scope && support_in_scope(sp, i, n);
    base[i] = ndof;
    ndof += (restrains_deflection(sp.type) ? 0 : 1) + (restrains_rotation(sp.type) ? 0 : 1) + (sp.hinge ? 1 : 0);
    const Dofs b = node_dofs(i);
    if (i == 0) {
      prev_dofs = b;
      continue;
    }
    const Dofs a = prev_dofs;
    prev_dofs = b;
    const std::size_t lo = a.v != kNone ? a.v : a.thR != kNone ? a.thR : b.v != kNone ? b.v : b.thL;
    const std::size_t hi = b.thL != kNone ? b.thL : b.v != kNone ? b.v : a.thR != kNone ? a.thR : a.v;
    if (lo != kNone && hi - lo > width) width = hi - lo;
  }
  if (!in_scope) return not_applicable<R>(reason_id::kFeature, check_scope(beam));

  // Pass 2, spans with their loads. The actions applied at the nodes (down
  // +, clockwise +) are kept in a list, by node; in pass 3 each node result
  // starts with them and the element end forces are subtracted, which
  // leaves the reactions (beam.h signs) where restrained. Each span's consistent nodal loads f_e are
  // kept in its end displacement fields (v0, th0, v1, th1) until pass 3
  // reads them there before it writes the displacements. Prescribed
  // displacements move to the right-hand side. A spring at a node is added
  // once both its elements are in (node s after element s).
  auto st = std::make_shared<State<R>>();
  BasicSolution<R> sol;
  struct NodeAction {
    std::size_t node;
    bool couple;
    R value;
  };
  std::vector<NodeAction> actions;
  std::vector<R> f(ndof, R(0));
  Band<R> K(ndof, width);  // zero, as f: cleared again only for a second assembly pass
  bool assembled_once = false;
  st->first.reset(new std::size_t[n + 1]);
  st->spans.allocate(n);
  st->loads.allocate(beam.loads.size());
  // Equilibrium (a fault check, see below): the loads' resultant (down +)
  // and moment about x = 0 (clockwise +) and the sizes involved. The moment
  // of the forces applied at the nodes is added in pass 3, where the
  // node's x is known.
  // Summed in locals of each pass (through references the compiler kept
  // them in memory: the stores into f and K might alias them).
  struct Sums {
    R force{0}, moment{0}, scale{0}, mscale{0};
  };
  Sums sums;
  auto add_spring = [&](std::size_t i) {
    const BasicSupport<R>& sp = beam.supports[i];
    if (sp.type != SupportType::Spring) return;
    const Dofs d = node_dofs(i);  // a spring restrains nothing outright
    K.at(d.v, d.v) += sp.k;
    f[d.v] += sp.k * sp.settlement;
    K.at(d.thL, d.thL) += sp.kr;  // no hinge here when kr > 0 (checked)
  };
  // A load on a node; false when outside the scope.
  auto node_load = [&](const BasicLoad<R>& l, Sums& acc) __attribute__((always_inline)) {
    if (l.index > n) return false;
    if (l.type != LoadType::Point && l.type != LoadType::Couple) return false;
    if (l.type == LoadType::Couple && beam.supports[l.index].hinge) return false;
    const Dofs d = node_dofs(l.index);
    if (l.type == LoadType::Point) {
      if (d.v != kNone) f[d.v] += l.P;
      actions.push_back({l.index, false, l.P});
      acc.force += l.P;
      acc.scale += abs(l.P);
    } else {  // not at a hinge (checked), so one rotation
      if (d.thL != kNone) f[d.thL] += l.C;
      actions.push_back({l.index, true, l.C});
      acc.moment += l.C;
      acc.mscale += abs(l.C);
    }
    return true;
  };
  // The pass over loads load_at(0 .. m-1); false when a load is outside
  // the scope or out of span order (span loads of a span after those of a
  // later span).
  auto assemble = [&](auto&& load_at, std::size_t m) {
    st->spans.count = 0;
    st->loads.count = 0;  // m <= beam.loads.size(), the capacity
    actions.clear();
    if (assembled_once) {
      std::fill(f.begin(), f.end(), R(0));
      std::fill(K.a.begin(), K.a.end(), R(0));
    }
    assembled_once = true;
    Sums acc;
    std::size_t k = 0;
    R x0(0);
    Dofs right = node_dofs(0);
    for (std::size_t s = 0; s < n; ++s) {
      const Dofs left = right;
      right = node_dofs(s + 1);
      const R& L = beam.spans[s].length;
      st->first[s] = st->loads.size();
      const R invL = R(1) / L;
      R fe[4] = {R(0), R(0), R(0), R(0)};
      bool loaded = false;
      for (; k < m; ++k) {
        const BasicLoad<R>& l = load_at(k);
        if (l.on_node) {
          if (!node_load(l, acc)) return false;
          continue;
        }
        if (l.index != s) {
          if (l.index < s) return false;
          break;  // a later span's (or beyond the beam: left over at the end)
        }
        // Built in place (a copy from the stack was a 16-byte reload of
        // fresh 8-byte stores, a store-forwarding stall, for every load).
        SpanLoad<R>& t = st->loads.push();
        t.type = l.type;
        switch (l.type) {
          case LoadType::Point:
            if (l.at < R(0) || L < l.at || !is_finite(l.at)) return false;
            t.value = l.P; t.a = t.b = l.at; t.wa = t.wb = R(0);
            acc.force += l.P;
            acc.moment += l.P * (x0 + l.at);
            acc.scale += abs(l.P);
            break;
          case LoadType::Couple:
            if (l.at < R(0) || L < l.at || !is_finite(l.at)) return false;
            t.value = l.C; t.a = t.b = l.at; t.wa = t.wb = R(0);
            acc.moment += l.C;
            acc.mscale += abs(l.C);
            break;
          case LoadType::Udl: case LoadType::Linear: {
            if (l.from < R(0) || L < l.to || !(l.from < l.to)) return false;
            t.value = R(0);
            t.a = l.from;
            t.b = l.to;
            t.wa = l.w1;
            t.wb = l.type == LoadType::Udl ? l.w1 : l.w2;
            const R c = t.b - t.a;
            const R W = (t.wa + t.wb) / R(2) * c;
            acc.force += W;
            acc.moment += (x0 + t.a) * W + c * c * (t.wa + R(2) * t.wb) / R(6);
            acc.scale += (abs(t.wa) + abs(t.wb)) * c;
            break;
          }
          default:
            return false;
        }
        add_consistent(t, L, invL, fe);
        loaded = true;
      }
      SpanState<R>& sp = st->spans.push();  // in place, as the loads
      sp.L = L;
      sp.EI = beam.spans[s].EI;
      sp.v0 = fe[0]; sp.th0 = fe[1]; sp.v1 = fe[2]; sp.th1 = fe[3];
      sp.V0 = sp.M0 = R(0);  // pass 3's
      std::size_t d[4];
      R g[4];
      element_dofs(s, left, right, d, g);
      R ke[4][4];
      element_matrix(sp.EI, sp.L, ke);
      if (kFast && d[0] == kNone && d[2] == kNone && d[1] != kNone && d[3] != kNone) {
        // Only the rotations free (pinned, roller or hinge at both ends):
        // the loop below unrolled for this pattern. Equal to it to 1e-13 of
        // the largest value (tests/stiffness_test.cpp, FastPath).
        const std::size_t d1 = d[1], d3 = d[3];
        R f1 = f[d1], f3 = f[d3];
        if (nonzero(g[0])) {
          f1 -= ke[1][0] * g[0];
          f3 -= ke[3][0] * g[0];
        }
        K.at(d1, d1) += ke[1][1];
        K.at(d3, d1) += ke[3][1];
        if (nonzero(g[2])) {
          f1 -= ke[1][2] * g[2];
          f3 -= ke[3][2] * g[2];
        }
        K.at(d3, d3) += ke[3][3];
        if (loaded) {
          f1 += fe[1];
          f3 += fe[3];
        }
        f[d1] = f1;
        f[d3] = f3;
      } else {
        for (int c = 0; c < 4; ++c) {
          const bool known = d[c] == kNone;
          if (known && !nonzero(g[c])) continue;
          for (int r = 0; r < 4; ++r) {
            if (d[r] == kNone) continue;
            if (known) f[d[r]] -= ke[r][c] * g[c];
            else if (d[c] <= d[r]) K.at(d[r], d[c]) += ke[r][c];
          }
        }
        if (loaded)
          for (int r = 0; r < 4; ++r)
            if (d[r] != kNone) f[d[r]] += fe[r];
      }
      add_spring(s);
      x0 += L;
    }
    st->first[n] = st->loads.size();
    add_spring(n);
    for (; k < m; ++k) {  // what is left: node loads, or loads out of order or beyond the beam
      const BasicLoad<R>& l = load_at(k);
      if (!l.on_node || !node_load(l, acc)) return false;
    }
    sums = acc;
    return true;
  };
  const std::vector<BasicLoad<R>>& loads = beam.loads;
  if (!assemble([&](std::size_t k) -> const BasicLoad<R>& { return loads[k]; }, loads.size())) {
    if (std::string why = check_scope(beam); !why.empty()) return not_applicable<R>(reason_id::kFeature, why);
    // In scope, so the loads are out of span order: group them by span,
    // in their own order within a span, the node loads first.
    std::vector<std::size_t> off(n + 2, 0);
    auto key = [](const BasicLoad<R>& l) { return l.on_node ? 0 : l.index + 1; };
    for (const BasicLoad<R>& l : loads) ++off[key(l) + 1];
    for (std::size_t s = 0; s <= n; ++s) off[s + 1] += off[s];
    std::vector<const BasicLoad<R>*> grouped(loads.size());
    for (const BasicLoad<R>& l : loads) grouped[off[key(l)]++] = &l;
    if (!assemble([&](std::size_t k) -> const BasicLoad<R>& { return *grouped[k]; }, grouped.size()))
      return failed<R>(reason_id::kInternal, "internal fault: the loads could not be grouped by span");
  }
  if (width > kMaxBand) return failed<R>(reason_id::kInternal, "internal fault: DOF numbering wider than the band solve");

  if (const std::size_t bad = factor_solve<kFast>(K, f); bad < ndof)
    return failed<R>(reason_id::kSingular, "zero or negative pivot in the stiffness solve (degree of freedom " +
                     std::to_string(bad) + "): the beam is unstable or ill-conditioned");
  const std::vector<R>& u = f;
  for (std::size_t i = 0; i < ndof; ++i)
    if (!is_finite(u[i])) return failed<R>(reason_id::kNonFinite, "non-finite displacement in the stiffness solve");

  // Pass 3: end displacements and end forces F = k u - f of every element;
  // at the nodes the reactions are the applied actions minus the sum of F
  // (the right end's of span i - 1, then the left end's of span i). Node i
  // is finished once the spans on both sides are recovered.
  // The node actions by node, in their own order at a node.
  if (!std::is_sorted(actions.begin(), actions.end(),
                      [](const NodeAction& p, const NodeAction& q) { return p.node < q.node; }))
    std::stable_sort(actions.begin(), actions.end(),
                     [](const NodeAction& p, const NodeAction& q) { return p.node < q.node; });
  sol.nodes.reserve(n + 1);
  R x(0), react_force(0), react_moment(0);
  R load_moment = sums.moment, scale = sums.scale, mscale = sums.mscale;
  R F2prev(0), F3prev(0);  // span i - 1's end forces at node i
  R Mprev(0);               // span i - 1's moment at its right end
  std::size_t next_action = 0;
  Dofs next = node_dofs(0);
  for (std::size_t i = 0; i <= n; ++i) {
    BasicNodeResult<R>& r = sol.nodes.emplace_back();
    for (; next_action < actions.size() && actions[next_action].node == i; ++next_action) {
      const NodeAction& a = actions[next_action];
      if (a.couple) r.reaction_moment += a.value;
      else r.reaction_force += a.value;
    }
    load_moment += r.reaction_force * x;  // the forces applied at the node
    if (i > 0) {
      r.reaction_force -= F2prev;
      r.reaction_moment -= F3prev;
    }
    if (i < n) {
      SpanState<R>& sp = st->spans[i];
      std::size_t d[4];
      R g[4];
      const Dofs prev = next;
      next = node_dofs(i + 1);
      element_dofs(i, prev, next, d, g);
      const R fe[4] = {sp.v0, sp.th0, sp.v1, sp.th1};
      R ue[4];
      for (int c = 0; c < 4; ++c) ue[c] = d[c] == kNone ? g[c] : u[d[c]];
      sp.v0 = ue[0]; sp.th0 = ue[1]; sp.v1 = ue[2]; sp.th1 = ue[3];
      R F[4];
      stiffness_times(sp.EI, sp.L, ue, F);
      // Unconditionally: a span without loads has fe = +0, and F - (+0)
      // is F, bit for bit (-0 included).
      for (int c = 0; c < 4; ++c) F[c] -= fe[c];
      sp.V0 = -F[0];
      sp.M0 = F[1];
      r.reaction_force -= F[0];
      r.reaction_moment -= F[1];
      F2prev = F[2];
      F3prev = F[3];
      R Mleft, Mright;
      end_moments(*st, i, Mleft, Mright);
      if (const std::size_t count = st->first[i + 1] - st->first[i]; count > index_above) {
        if (st->index.empty()) st->index.resize(n);
        st->index[i] = build_span_index(&st->loads[st->first[i]], count, sp.L);
      }
      if (i > 0) r.moment_left = Mprev;
      r.moment_right = Mleft;
      Mprev = Mright;
    } else {
      r.moment_left = Mprev;
    }
    const BasicSupport<R>& sp = beam.supports[i];
    r.x = x;
    if (i < n) x += beam.spans[i].length;
    const SpanState<R>* left = i > 0 ? &st->spans[i - 1] : nullptr;
    const SpanState<R>* right = i < n ? &st->spans[i] : nullptr;
    r.deflection = right ? right->v0 : left->v1;
    r.rotation_left = left ? left->th1 : right->th0;
    r.rotation_right = right ? right->th0 : left->th1;
    // Where nothing restrains, the sum is the solve's residual: zero.
    if (!restrains_deflection(sp.type)) r.reaction_force = R(0);
    if (!restrains_rotation(sp.type)) r.reaction_moment = R(0);
    if (sp.type == SupportType::Spring) {
      r.reaction_force = sp.k * (r.deflection - sp.settlement);
      r.reaction_moment = sp.kr * r.rotation_left;
    }
    if (!is_finite(r.reaction_force) || !is_finite(r.reaction_moment))
      return failed<R>(reason_id::kNonFinite, "non-finite reaction at " + node_name(beam, i));
    react_force += r.reaction_force;
    react_moment += r.reaction_force * r.x + r.reaction_moment;
    scale += abs(r.reaction_force);
    mscale += abs(r.reaction_moment);
  }

  // Global equilibrium of the result, a fault check: the reactions (spring
  // forces included) balance the loads, vertically and in moment about the
  // left end, to within sqrt(epsilon) of the sizes involved. With one
  // element per span the residual is a few ulps; this catches a fault, it
  // is not the accuracy claim.
  {
    const R force = sums.force - react_force, moment = load_moment - react_moment;
    const R length = sol.nodes[n].x;
    const R tol = sqrt(std::numeric_limits<R>::epsilon());
    // The end forces the displacements alone make (k u, term by term) are
    // counted too: a beam moved without bending (a settlement of a
    // statically determinate beam) has reactions of rounding size only,
    // and their rounding is measured against these, not against themselves.
    R moved(0);
    for (std::size_t i = 0; i < n; ++i) {
      const SpanState<R>& sp = st->spans[i];
      const R k3 = sp.EI / (sp.L * sp.L * sp.L), k2 = sp.EI / (sp.L * sp.L);
      moved += R(12) * k3 * (abs(sp.v0) + abs(sp.v1)) + R(6) * k2 * (abs(sp.th0) + abs(sp.th1));
    }
    for (std::size_t i = 0; i <= n; ++i) {
      const BasicSupport<R>& sp = beam.supports[i];
      if (sp.type == SupportType::Spring)
        moved += sp.k * (abs(sol.nodes[i].deflection) + abs(sp.settlement)) + sp.kr * abs(sol.nodes[i].rotation_left) / length;
    }
    const R fscale = scale + mscale / length + moved;  // couples count as forces over the beam's length
    if (tol * fscale < abs(force))
      return failed<R>(reason_id::kEquilibrium, "equilibrium residual in force exceeds sqrt(epsilon) of the loads");
    if (tol * fscale * length < abs(moment))
      return failed<R>(reason_id::kEquilibrium, "equilibrium residual in moment exceeds sqrt(epsilon) of the loads");
  }
  sol.status = MethodStatus::Ok;
  std::shared_ptr<const State<R>> frozen = std::move(st);
  sol.at = [frozen](std::size_t span, const R& local, bool after) {
    return evaluate(*frozen, span, local, after);
  };
  return sol;
}

}  // namespace

// `stations` is not needed: the answer is exact anywhere in a span without
// an element node there (see stiffness.h); kept for the common signature.
template <class R>
BasicSolution<R> solve(const BasicBeam<R>& beam, const std::vector<BasicStation<R>>& /*stations*/) {
  try {
    return solve_impl(beam);
  } catch (const std::exception& ex) {
    return failed<R>(reason_id::kInternal, std::string("internal fault in the stiffness solve: ") + ex.what());
  }
}

template BasicSolution<double> solve<double>(const BasicBeam<double>&,
                                             const std::vector<BasicStation<double>>&);

namespace detail {
template <class R>
BasicSolution<R> solve_general(const BasicBeam<R>& beam) {
  try {
    return solve_impl<R, false>(beam);
  } catch (const std::exception& ex) {
    return failed<R>(reason_id::kInternal, std::string("internal fault in the stiffness solve: ") + ex.what());
  }
}
template BasicSolution<double> solve_general<double>(const BasicBeam<double>&);

template <class R>
BasicSolution<R> solve_with_index_above(const BasicBeam<R>& beam, std::size_t index_above) {
  try {
    return solve_impl<R, true>(beam, index_above);
  } catch (const std::exception& ex) {
    return failed<R>(reason_id::kInternal, std::string("internal fault in the stiffness solve: ") + ex.what());
  }
}
template BasicSolution<double> solve_with_index_above<double>(const BasicBeam<double>&, std::size_t);
template BasicSolution<Extended> solve_with_index_above<Extended>(const BasicBeam<Extended>&, std::size_t);
}  // namespace detail
template BasicSolution<Extended> solve<Extended>(const BasicBeam<Extended>&,
                                                 const std::vector<BasicStation<Extended>>&);

}  // namespace trivet::stiffness