// trivet: the fast path of the three-moment method for the usual beam.
// Private: included by three_moment.cpp only. Conventions of beam.h.
#pragma once

#include <cstddef>
#include <memory>
#include <vector>

#include "methods/beam/beam.h"
#include "methods/three_moment/three_moment_detail.h"
#include "methods/three_moment/three_moment_loads.h"
#include "methods/three_moment/three_moment_state.h"

namespace trivet::three_moment {
namespace {

// ---- The lean path: the usual beam (every support pinned or roller, no
// hinge, no node load, span loads listed span by span) in three passes
// instead of seven: (1) validation, segments, load copies, load terms and
// the Thomas forward sweep, each row eliminated as soon as its two spans
// are read; (2) back substitution; (3) span statics and node results. It
// uses the same load-term functions (copy_point ... copy_linear, add_free_moments6,
// end_sums) as the general path and equals it to 1e-13 of the largest value
// of each kind (tests/three_moment_test.cpp compares them through
// detail::solve_general); anything it does not cover, a fault or a bad
// pivot makes it return false, and solve() runs the general path, which
// gives its usual answer and reason.
template <class R>
struct LeanRow {
  R cp, dp;  // Thomas: modified super-diagonal, right-hand side
};

template <class R>
TM_NOINLINE bool solve_lean(const BasicBeam<R>& beam, BasicSolution<R>& out) {
  const std::size_t n = beam.spans.size();
  const auto* const sup = beam.supports.data();
  const auto* const spans = beam.spans.data();
  const BasicLoad<R>* const bl = beam.loads.data();
  const std::size_t nl = beam.loads.size();
  const Consts<R> K;
  auto plain = [&](std::size_t i) TM_INLINE {
    return (sup[i].type == SupportType::Pinned || sup[i].type == SupportType::Roller) && !sup[i].hinge;
  };
  // Both ends first, before anything is allocated: a fixed or free end
  // (the commonest refusal) then costs the general path no wasted pass.
  if (!plain(0) || !plain(n)) return false;
  auto st = std::make_shared<State<R>>();
  reserve_fresh(st->seg, n);
  st->loads.allocate(nl);
  SpanLoad<R>* const loads = st->loads.data();
  FreshArray<LeanRow<R>> rows;
  rows.allocate(n + 1);
  LeanRow<R>* const rw = rows.data();

  // ---- Pass 1.
  // Node 0: a pinned or roller end with no couple, M = 0 (row 1 x = 0).
  rw[0].cp = R(0);
  rw[0].dp = R(0);
  std::size_t li = 0, nload = 0;
  R pgl6{0}, pf{0}, ppsi{0};  // terms of the segment left of node g
  // Anything out of scope returns at once, before it is divided by (a
  // zero division throws in rational arithmetic).
  for (std::size_t g = 0; g < n; ++g) {
    const R& len = spans[g].length;
    const R& EI = spans[g].EI;
    if (!(plain(g + 1) && len > R(0) && EI > R(0) && finite(len) && finite(EI))) return false;
    st->seg.emplace_back();
    Segment<R>& sg = st->seg.back();
    sg.L = len;
    sg.invEI = R(1) / EI;
    sg.v0 = sup[g].settlement;
    sg.first = nload;
    // free_moments6 of the segment, each load's terms added as it is copied.
    const R L2 = sg.L * sg.L;
    R FL6{0}, FR6{0};
    for (; li < nl && bl[li].index == g; ++li) {
      const BasicLoad<R>& l = bl[li];
      if (l.on_node) return false;
      SpanLoad<R>& sl = loads[nload++];
      // One switch on the type: validate, then copy (the general path's
      // per-kind copy functions).
      auto at_ok = [&]() TM_INLINE { return !(l.at < R(0) || len < l.at); };
      auto range_ok = [&]() TM_INLINE { return !(l.from < R(0) || !(l.from < l.to) || len < l.to); };
      switch (l.type) {
        case LoadType::Point: if (!at_ok()) return false; copy_point(sl, l); break;
        case LoadType::Couple: if (!at_ok()) return false; copy_couple(sl, l); break;
        case LoadType::Udl: if (!range_ok()) return false; copy_udl(sl, l); break;
        case LoadType::Linear: if (!range_ok()) return false; copy_linear(sl, l); break;
      }
      add_free_moments6(FL6, FR6, &sl, sg.L, L2, K);
    }
    sg.last = nload;
    // The next load, if any, must be on a later span.
    if (li < nl && !(bl[li].index > g && bl[li].index < n)) return false;
    // terms(g).
    sg.invL = R(1) / sg.L;
    const R& invL = sg.invL;
    const R q = sg.invEI * invL;
    const R gl6 = FL6 * q, gr6 = FR6 * q, f = sg.L * sg.invEI;
    const R psi = (sup[g + 1].settlement - sup[g].settlement) * invL;
    if (g > 0) {  // the three-moment equation at support g
      const R d = -pgl6 - gr6 + K.six * (ppsi - psi);
      const R a = pf, b = K.two * (pf + f);
      const R piv = b - a * rw[g - 1].cp;
      if (is_zero(piv) || !finite(piv)) return false;
      const R rhs = d - a * rw[g - 1].dp;
      rw[g].cp = f / piv;
      rw[g].dp = rhs / piv;
    }
    pgl6 = gl6;
    pf = f;
    ppsi = psi;
  }
  // Node n: likewise M = 0 (row 1 x = 0).
  rw[n].cp = R(0);
  rw[n].dp = R(0);

  // ---- Pass 2: back substitution. The general path refuses a non-finite
  // support moment; here each one is tested in pass 3 with its node.
  for (std::size_t i = n; i-- > 0;) rw[i].dp = rw[i].dp - rw[i].cp * rw[i + 1].dp;

  // ---- Pass 3: span statics, rotations and deflections, node results.
  reserve_fresh(out.nodes, n + 1);
  bool bad = false;
  R x{0};
  BasicPointValues<R> lv;  // values just left of node g
  auto node = [&](std::size_t i, const R& settlement, const R& left_shear, const R& right_shear) TM_INLINE
      -> BasicNodeResult<R>& {
    out.nodes.emplace_back();
    BasicNodeResult<R>& nr = out.nodes.back();
    nr.x = x;
    nr.deflection = settlement;
    const R Vl = i > 0 ? left_shear : R(0);
    const R Vr = i < n ? right_shear : R(0);
    nr.reaction_force = Vr - Vl;  // V jumps by +R
    return nr;
  };
  // The node's values and the support moment `Ms` at it are finite (the
  // general path tests both; reaction_moment stays 0 here). For built-in
  // floats one test of a sum of x - x, which is 0 for a finite x and NaN
  // otherwise (NaN then propagates through the sum).
  auto check = [&](const BasicNodeResult<R>& nr, const R& Ms) TM_INLINE {
    bool fin;
    if constexpr (std::is_floating_point_v<R>) {
      fin = std::isfinite(((nr.deflection - nr.deflection) + (nr.reaction_force - nr.reaction_force)) +
                          ((nr.rotation_left - nr.rotation_left) + (nr.rotation_right - nr.rotation_right)) +
                          (Ms - Ms));
    } else {
      fin = finite(nr.deflection) & finite(nr.reaction_force) & finite(nr.rotation_left) &
            finite(nr.rotation_right) & finite(Ms);
    }
    bad = bad | !fin;
  };
  R MA = rw[0].dp;
  for (std::size_t g = 0; g < n; ++g) {
    Segment<R>& sg = st->seg[g];
    const R& L = sg.L;
    const R MB = rw[g + 1].dp;
    const R& invL = sg.invL;
    const EndSums<R> es = end_sums(loads + sg.first, loads + sg.last, L, K);
    const R& vA = sg.v0;  // the settlement of node g, set in pass 1
    const R& vB = g + 1 < n ? st->seg[g + 1].v0 : sup[n].settlement;
    sg.MA = MA;
    sg.V0 = (MB - MA - (es.s.M + es.CL)) * invL;
    const R L2 = L * L;
    const R I1 = MA * L + sg.V0 * L2 * K.half + es.s.I1;
    const R I2 = MA * L2 * K.half + sg.V0 * L2 * L * K.sixth + es.s.I2;
    sg.theta0 = (vB - vA) * invL + I2 * sg.invEI * invL;
    // Node g: left values `lv` (from segment g - 1), right ones at 0 of g.
    BasicNodeResult<R>& nr = node(g, vA, lv.shear, R(sg.V0 - es.P0));
    if (g > 0) nr.moment_left = lv.moment;
    nr.moment_right = MA + es.C0;
    nr.rotation_left = g > 0 ? lv.rotation : sg.theta0;
    nr.rotation_right = sg.theta0;
    check(nr, MA);
    x += L;
    lv.shear = sg.V0 + es.s.V;
    lv.moment = sg.MA + sg.V0 * L + es.s.M;
    lv.rotation = sg.theta0 - I1 * sg.invEI;
    lv.deflection = sg.v0 + sg.theta0 * L - I2 * sg.invEI;
    MA = MB;  // no couple on the node
  }
  {
    BasicNodeResult<R>& nr = node(n, sup[n].settlement, lv.shear, lv.shear);
    nr.moment_left = lv.moment;
    nr.rotation_left = lv.rotation;
    nr.rotation_right = lv.rotation;
    check(nr, MA);
  }
  rows.release();
  if (bad) {
    out.nodes.clear();
    return false;
  }
  std::shared_ptr<const State<R>> cst = std::move(st);
  out.status = MethodStatus::Ok;
  out.at = [cst](std::size_t span, const R& local, bool after) { return eval_span(*cst, span, local, after); };
  return true;
}


}  // namespace
}  // namespace trivet::three_moment
