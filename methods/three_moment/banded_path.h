// trivet three-moment method on any beam: springs, guided supports,
// rotational springs, hinges and unsupported nodes anywhere.
//
// Private to methods/three_moment. Conventions of methods/beam/beam.h:
// M sagging +, v down +, rotation clockwise +, reactions up +, reaction
// couples counter-clockwise +, applied couples clockwise +.
//
// Derivation (our own; the span relations are those of three_moment.cpp).
// Every node i gets three unknowns: ML_i, the moment just left of it (the
// node-side moment MB of span i - 1), MR_i, the moment just right of it (MA
// of span i), and its deflection v_i. For span s between nodes s and s + 1
// (length L, rigidity EI, load terms FL, FR of load_terms.h), integrating
// EI v'' = -M with M = MA (1 - x/L) + MB x/L + M0(x):
//
//   theta_s(0) =  MA L/(3EI) + MB L/(6EI) + FR/(EI L) + (v_{s+1} - v_s)/L,
//   theta_s(L) = -MA L/(6EI) - MB L/(3EI) - FL/(EI L) + (v_{s+1} - v_s)/L,
//
// and its statics give the shear just right of its left end and just left
// of its right end (after every load of the span, Mc = moment at L of the
// span's loads as on a cantilever built in at L, W = their total):
//
//   V0_s = (MB - MA - Mc)/L,    Vend_s = V0_s - W.
//
// At node i (span i - 1 on its left, span i on its right; beyond the ends
// the missing terms are zero) the reaction force and reaction couple are,
// by the jump rules (V jumps by +R - P, M by +C - Rm),
//
//   R_i  = V0_i - Vend_{i-1} + P_i,     Rm_i = ML_i + C_i - MR_i.
//
// Three equations per node close the system:
//   rotation (two at an interior node, one at an end):
//     no rotational restraint:  theta_{i-1}(L) = theta_i(0) (the classical
//                               three-moment equation) and Rm_i = 0;
//     fixed or guided:          theta_{i-1}(L) = 0 and theta_i(0) = 0;
//     rotational spring kr:     theta_{i-1}(L) = theta_i(0) and
//                               Rm_i = kr theta_i (a clockwise turn meets a
//                               counter-clockwise couple);
//     hinge:                    ML_i = 0 and MR_i = 0 (the two sides turn
//                               apart, so no rotation equation);
//     at an end, the one side's condition (free or pinned end: Rm = 0).
//   deflection:
//     fixed, pinned, roller:    v_i = settlement;
//     vertical spring k:        R_i = k (v_i - settlement);
//     free, guided:             R_i = 0 (vertical equilibrium of the node).
// With a spring at every interior node, substituting R_i, which holds the
// moments of nodes i - 1 .. i + 1, into the spring's deflection and that
// into the three-moment equations at i - 1, i, i + 1 gives the five-moment
// equation for beams on elastic supports (derived here, as above). Here it
// is not eliminated by hand: the unknowns are kept mixed,
// so each equation holds the unknowns of at most three neighbouring nodes.
// In the order ML_0, MR_0, v_0, ML_1, ... the system is banded (4 below and
// 5 above the diagonal at most) and the banded solve is O(n).
//
// Scaling (for double: partial pivoting compares rows): each node's
// deflection is carried as u_i = v_i / c_i with c_i = L^2/EI of a span
// beside it, rotation rows are multiplied by EI/L and equilibrium rows by
// L of that span, so every coefficient is of the order of the span ratios
// and k L^3/EI. In exact arithmetic the scaling changes nothing.
#pragma once

#include <memory>
#include <string>
#include <vector>

#include "methods/three_moment/band_solve.h"
#include "methods/three_moment/span_state.h"

namespace trivet::three_moment::detail {

// A linear form sum coef_j * x[col_j] + c over at most 8 unknowns.
template <class R>
struct Lin {
  std::size_t col[8];
  R coef[8];
  int n = 0;
  R c{0};
  void term(std::size_t j, const R& v) {
    for (int t = 0; t < n; ++t)
      if (col[t] == j) { coef[t] += v; return; }
    col[n] = j;
    coef[n++] = v;
  }
  Lin& add(const Lin& o, const R& scale) {
    for (int t = 0; t < o.n; ++t) term(o.col[t], R(o.coef[t] * scale));
    c += o.c * scale;
    return *this;
  }
};

template <class R>
BasicSolution<R> solve_banded(const BasicBeam<R>& beam) {
  const std::size_t n = beam.spans.size();
  const auto& sup = beam.supports;
  auto label = [&](std::size_t i) { return "node " + beam.labels[i]; };
  if (BasicSolution<R> why; !spans_sound(beam, &why)) return why;
  for (std::size_t i = 0; i <= n; ++i) {
    const auto& s = sup[i];
    if (s.type == SupportType::Spring && (s.k < R(0) || s.kr < R(0) || !finite(s.k) || !finite(s.kr)))
      return failed<R>(reason_id::kInput, "negative or non-finite spring stiffness at " + label(i));
    const bool turns = s.type == SupportType::Fixed || s.type == SupportType::Guided ||
                       (s.type == SupportType::Spring && R(0) < s.kr);
    if (s.hinge && turns)
      return not_applicable<R>(reason_id::kFeature, std::string("hinge at ") + support_type_name(s.type) + " support " + label(i) +
                               " (a release where the rotation is restrained)");
  }

  // ---- Loads, bucketed by span; node loads summed.
  auto st = std::make_shared<State<R>>();
  const Consts<R>& K = st->K;
  std::vector<R> P(n + 1, R(0)), C(n + 1, R(0));
  st->seg.resize(n);
  for (const auto& l : beam.loads) {
    if (BasicSolution<R> why; !load_sound(beam, l, &why)) return why;
    if (l.on_node) {
      if (l.type == LoadType::Point) P[l.index] += l.P;
      else C[l.index] += l.C;
      continue;
    }
    ++st->seg[l.index].last;  // a count for now
  }
  for (std::size_t i = 1; i < n; ++i)
    if (sup[i].hinge && !is_zero(C[i])) return not_applicable<R>(reason_id::kFeature, "couple at hinge " + label(i));
  std::size_t total = 0;
  for (auto& sg : st->seg) {
    const std::size_t count = sg.last;
    sg.first = sg.last = total;
    total += count;
  }
  st->loads.allocate(total);
  for (const auto& l : beam.loads)
    if (!l.on_node) set_span_load(st->loads[st->seg[l.index].last++], l);
  const SpanLoad<R>* const loads = st->loads.data();

  // ---- Span terms.
  struct Terms {
    R FL6, FR6, Mc, W;
    EndSums<R> es;
  };
  std::vector<Terms> tm;
  tm.reserve(n);
  for (std::size_t s = 0; s < n; ++s) {
    Segment<R>& sg = st->seg[s];
    sg.L = beam.spans[s].length;
    sg.invL = R(1) / sg.L;
    sg.invEI = R(1) / beam.spans[s].EI;
    auto fm = free_moments6(loads + sg.first, loads + sg.last, sg.L, K);
    EndSums<R> es = end_sums(loads + sg.first, loads + sg.last, sg.L, K);
    R Mc = es.s.M + es.CL, W = es.PL - es.s.V;
    tm.push_back({std::move(fm.first), std::move(fm.second), std::move(Mc), std::move(W), std::move(es)});
  }

  // ---- Unknowns and their scales.
  auto ML = [](std::size_t i) { return 3 * i; };
  auto MR = [](std::size_t i) { return 3 * i + 1; };
  auto VV = [](std::size_t i) { return 3 * i + 2; };
  std::vector<R> cv(n + 1), Lr(n + 1), EIr(n + 1);  // deflection scale, reference span
  for (std::size_t i = 0; i <= n; ++i) {
    const std::size_t s = i < n ? i : n - 1;
    Lr[i] = beam.spans[s].length;
    EIr[i] = beam.spans[s].EI;
    cv[i] = Lr[i] * Lr[i] / EIr[i];
  }
  // theta_s(0), theta_s(L), V0_s and Vend_s as linear forms.
  auto chord = [&](Lin<R>& f, std::size_t s) {
    const R& iL = st->seg[s].invL;
    f.term(VV(s), R(-cv[s] * iL));
    f.term(VV(s + 1), R(cv[s + 1] * iL));
  };
  auto theta0 = [&](std::size_t s) {
    const Segment<R>& sg = st->seg[s];
    const R f = sg.L * sg.invEI;
    Lin<R> r;
    r.term(MR(s), R(f * K.third));
    r.term(ML(s + 1), R(f * K.sixth));
    chord(r, s);
    r.c = tm[s].FR6 * K.sixth * sg.invEI * sg.invL;
    return r;
  };
  auto thetaL = [&](std::size_t s) {
    const Segment<R>& sg = st->seg[s];
    const R f = sg.L * sg.invEI;
    Lin<R> r;
    r.term(MR(s), R(-f * K.sixth));
    r.term(ML(s + 1), R(-f * K.third));
    chord(r, s);
    r.c = -tm[s].FL6 * K.sixth * sg.invEI * sg.invL;
    return r;
  };
  auto shear0 = [&](std::size_t s) {
    const R& iL = st->seg[s].invL;
    Lin<R> r;
    r.term(ML(s + 1), iL);
    r.term(MR(s), R(-iL));
    r.c = -tm[s].Mc * iL;
    return r;
  };

  // ---- The equations, three rows per node.
  BandSystem<R> sys(3 * (n + 1), 4, 5);
  auto put = [&](std::size_t row, const Lin<R>& f, const R& scale) {
    for (int t = 0; t < f.n; ++t) sys.add(row, f.col[t], R(f.coef[t] * scale));
    sys.add_rhs(row, R(-f.c * scale));
  };
  auto unit = [&](std::size_t row, std::size_t col, const R& value) {
    sys.add(row, col, R(1));
    sys.add_rhs(row, value);
  };
  const R one{1};
  for (std::size_t i = 0; i <= n; ++i) {
    const auto& s = sup[i];
    const bool hasL = i > 0, hasR = i < n;
    const bool rot_fixed = s.type == SupportType::Fixed || s.type == SupportType::Guided;
    const R kr = s.type == SupportType::Spring ? s.kr : R(0);
    const bool rot_spring = R(0) < kr;
    const R rs = EIr[i] / Lr[i];  // rotation rows: times EI/L
    Lin<R> thL, thR, Rf, Rm;
    if (hasL) thL = thetaL(i - 1);
    if (hasR) thR = theta0(i);
    if (hasR) Rf.add(shear0(i), one);
    if (hasL) {
      Rf.add(shear0(i - 1), R(-1));
      Rf.c += tm[i - 1].W;
      Rm.term(ML(i), one);
    }
    Rf.c += P[i];
    if (hasR) Rm.term(MR(i), R(-1));
    Rm.c += C[i];
    if (!hasL) unit(ML(i), ML(i), R(0));
    if (!hasR) unit(MR(i), MR(i), R(0));
    if (hasL && hasR) {
      if (s.hinge) {
        unit(ML(i), ML(i), R(0));
        unit(MR(i), MR(i), R(0));
      } else if (rot_fixed) {
        put(ML(i), thL, rs);
        put(MR(i), thR, rs);
      } else {
        Lin<R> cont = thL;
        put(ML(i), cont.add(thR, R(-1)), rs);
        if (rot_spring) Rm.add(thR, R(-kr));
        put(MR(i), Rm, one);
      }
    } else {
      const std::size_t row = hasR ? MR(i) : ML(i);
      const Lin<R>& th = hasR ? thR : thL;
      if (rot_fixed) {
        put(row, th, rs);
      } else {
        if (rot_spring) Rm.add(th, R(-kr));
        put(row, Rm, one);
      }
    }
    if (restrains_deflection(s.type)) {
      unit(VV(i), VV(i), R(s.settlement / cv[i]));
    } else {
      if (s.type == SupportType::Spring) {
        Rf.term(VV(i), R(-s.k * cv[i]));
        Rf.c += s.k * s.settlement;
      }
      put(VV(i), Rf, Lr[i]);
    }
  }
  std::size_t bad_col = 0;
  const auto x = sys.solve(bad_col);
  if (!x) {
    const std::size_t i = bad_col / 3 <= n ? bad_col / 3 : n;
    return failed<R>(reason_id::kSingular, "the three-moment system is singular near " + label(i) + " (a mechanism?)");
  }

  // ---- Span statics, rotations and deflections (as on the other paths).
  std::vector<R> v(n + 1);
  for (std::size_t i = 0; i <= n; ++i)
    v[i] = restrains_deflection(sup[i].type) ? sup[i].settlement : R(cv[i] * (*x)[VV(i)]);
  for (std::size_t s = 0; s < n; ++s) {
    Segment<R>& sg = st->seg[s];
    const R& L = sg.L;
    const R& MA = (*x)[MR(s)];
    const R& MB = (*x)[ML(s + 1)];
    sg.MA = MA;
    sg.V0 = (MB - MA - tm[s].Mc) * sg.invL;
    const R L2 = L * L;
    const R I2 = MA * L2 * K.half + sg.V0 * L2 * L * K.sixth + tm[s].es.s.I2;
    sg.v0 = v[s];
    sg.theta0 = (v[s + 1] - v[s]) * sg.invL + I2 * sg.invEI * sg.invL;  // from v(L) = v_{s+1}
  }

  // ---- Node results.
  BasicSolution<R> out;
  out.nodes.reserve(n + 1);
  R xg{0};
  for (std::size_t i = 0; i <= n; ++i) {
    const auto& s = sup[i];
    const bool hasL = i > 0, hasR = i < n;
    BasicPointValues<R> left, right;
    if (hasL) left = eval(*st, i - 1, st->seg[i - 1].L, false);
    if (hasR) right = eval(*st, i, R(0), false);
    BasicNodeResult<R> nr;
    nr.x = xg;
    if (hasR) xg += st->seg[i].L;
    if (hasL) nr.moment_left = left.moment;
    if (hasR) nr.moment_right = right.moment;
    nr.rotation_left = hasL ? left.rotation : right.rotation;
    nr.rotation_right = hasR ? right.rotation : left.rotation;
    nr.deflection = v[i];
    if (restrains_deflection(s.type) || s.type == SupportType::Spring) {
      nr.reaction_force = (hasR ? st->seg[i].V0 : R(0)) - (hasL ? R(st->seg[i - 1].V0 - tm[i - 1].W) : R(0)) + P[i];
    }
    const bool rot_fixed = restrains_rotation(s.type);
    if (rot_fixed || (s.type == SupportType::Spring && R(0) < s.kr)) {
      nr.reaction_moment = (hasL ? (*x)[ML(i)] : R(0)) + C[i] - (hasR ? (*x)[MR(i)] : R(0));
    }
    if (rot_fixed) nr.rotation_left = nr.rotation_right = R(0);
    if (!(finite(nr.deflection) && finite(nr.reaction_force) && finite(nr.reaction_moment) &&
          finite(nr.rotation_left) && finite(nr.rotation_right)))
      return failed<R>(reason_id::kNonFinite, "non-finite result at " + label(i));
    out.nodes.push_back(std::move(nr));
  }
  out.status = MethodStatus::Ok;
  set_at(out, std::move(st));
  return out;
}

}  // namespace trivet::three_moment::detail
