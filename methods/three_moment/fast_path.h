// trivet three-moment method: the fast path for the usual beam.
//
// Private to methods/three_moment. The usual beam: every support pinned or
// roller, no hinge, no node load, span loads listed span by span. Then the
// unknowns are the interior support moments alone, the end moments are
// zero, and the three-moment equation at each interior support (see
// three_moment.cpp) is a tridiagonal system. This path does in three passes
// what the tridiagonal path of three_moment.cpp does in several:
//   (1) checks, load copies, load terms (load_terms.h) and the Thomas forward
//       sweep, each row eliminated as soon as its two spans are read;
//   (2) back substitution;
//   (3) span statics, rotations and deflections, node results.
// It uses the same load terms and the same formulas as the other paths;
// they agree to 1e-13 relative (not bit for bit: tests/three_moment_test.cpp,
// ThreeMomentFastPath). Anything it does not cover, a fault or a bad pivot
// makes it return false, and solve() takes another path, which gives its
// usual answer or reason.
#pragma once

#include "methods/three_moment/span_state.h"

namespace trivet::three_moment::detail {

template <class R>
struct ThomasRow {
  R cp, dp;  // Thomas: modified super-diagonal, right-hand side
};

template <class R>
bool solve_fast(const BasicBeam<R>& beam, BasicSolution<R>& out) {
  const std::size_t n = beam.spans.size();
  const auto* const sup = beam.supports.data();
  const auto* const spans = beam.spans.data();
  const BasicLoad<R>* const bl = beam.loads.data();
  const std::size_t nl = beam.loads.size();
  auto plain = [&](std::size_t i) TM_INLINE {
    return (sup[i].type == SupportType::Pinned || sup[i].type == SupportType::Roller) && !sup[i].hinge;
  };
  // Both ends first, before anything is allocated.
  if (!plain(0) || !plain(n)) return false;
  auto st = std::make_shared<State<R>>();
  const Consts<R>& K = st->K;
  reserve_huge(st->seg, n);
  st->loads.allocate(nl);
  SpanLoad<R>* const loads = st->loads.data();
  FreshArray<ThomasRow<R>> rows;
  rows.allocate(n + 1);
  ThomasRow<R>* const rw = rows.data();

  // ---- Pass 1. Row 0: M_0 = 0.
  rw[0].cp = R(0);
  rw[0].dp = R(0);
  std::size_t li = 0, nload = 0;
  bool many_loads = false;  // a span with loads enough for an index (span_state.h)
  R pgl6{0}, pf{0}, ppsi{0};  // terms of the span left of node g
  // Anything out of scope returns at once, before it is divided by.
  for (std::size_t g = 0; g < n; ++g) {
    const R& L = spans[g].length;
    const R& EI = spans[g].EI;
    if (!(plain(g + 1) && L > R(0) && EI > R(0) && finite(L) && finite(EI))) return false;
    st->seg.emplace_back();
    Segment<R>& sg = st->seg.back();
    sg.L = L;
    sg.invEI = R(1) / EI;
    sg.v0 = sup[g].settlement;
    sg.first = nload;
    const R L2 = L * L;
    R FL6{0}, FR6{0};
    for (; li < nl && bl[li].index == g; ++li) {
      const BasicLoad<R>& l = bl[li];
      if (l.on_node) return false;
      if (l.type == LoadType::Point || l.type == LoadType::Couple) {
        if (l.at < R(0) || L < l.at) return false;
      } else if (l.from < R(0) || !(l.from < l.to) || L < l.to) {
        return false;
      }
      SpanLoad<R>& sl = loads[nload++];
      set_span_load(sl, l);
      add_terms6(FL6, FR6, sl, L, L2, K);
    }
    sg.last = nload;
    many_loads = many_loads || nload - sg.first >= kIndexFrom;
    // The next load, if any, must be on a later span.
    if (li < nl && !(bl[li].index > g && bl[li].index < n)) return false;
    sg.invL = R(1) / L;
    const R q = sg.invEI * sg.invL;
    const R gl6 = FL6 * q, gr6 = FR6 * q, f = L * sg.invEI;
    const R psi = (sup[g + 1].settlement - sup[g].settlement) * sg.invL;
    if (g > 0) {  // the three-moment equation at support g
      const R d = -pgl6 - gr6 + K.six * (ppsi - psi);
      const R a = pf, b = K.two * (pf + f);
      const R piv = b - a * rw[g - 1].cp;
      if (is_zero(piv) || !finite(piv)) return false;
      rw[g].cp = f / piv;
      rw[g].dp = (d - a * rw[g - 1].dp) / piv;
    }
    pgl6 = gl6;
    pf = f;
    ppsi = psi;
  }
  rw[n].cp = R(0);  // row n: M_n = 0
  rw[n].dp = R(0);

  // ---- Pass 2: back substitution (a non-finite moment is caught in pass 3).
  for (std::size_t i = n; i-- > 0;) rw[i].dp = rw[i].dp - rw[i].cp * rw[i + 1].dp;

  // ---- Pass 3: span statics, rotations and deflections, node results.
  reserve_huge(out.nodes, n + 1);
  bool bad = false;
  R x{0};
  BasicPointValues<R> lv;  // values just left of node g
  auto node = [&](std::size_t i, const R& settlement, const R& left_shear, const R& right_shear) TM_INLINE
      -> BasicNodeResult<R>& {
    out.nodes.emplace_back();
    BasicNodeResult<R>& nr = out.nodes.back();
    nr.x = x;
    nr.deflection = settlement;
    nr.reaction_force = (i < n ? right_shear : R(0)) - (i > 0 ? left_shear : R(0));
    return nr;
  };
  // The node's values and the support moment `Ms` at it are finite. For
  // built-in floats one test of a sum of x - x (0 for a finite x, else NaN).
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
    const EndSums<R> es = end_sums(loads + sg.first, loads + sg.last, L, K);
    const R& vA = sg.v0;
    const R& vB = g + 1 < n ? st->seg[g + 1].v0 : sup[n].settlement;
    // Statics of the span: M(L) = MA + V0 L + Mc(L) = MB.
    sg.MA = MA;
    sg.V0 = (MB - MA - (es.s.M + es.CL)) * sg.invL;
    const R L2 = L * L;
    const R I1 = MA * L + sg.V0 * L2 * K.half + es.s.I1;
    const R I2 = MA * L2 * K.half + sg.V0 * L2 * L * K.sixth + es.s.I2;
    sg.theta0 = (vB - vA) * sg.invL + I2 * sg.invEI * sg.invL;  // from v(L) = vB
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
    MA = MB;
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
  out.status = MethodStatus::Ok;
  set_at(out, std::move(st), many_loads);
  return true;
}

}  // namespace trivet::three_moment::detail
