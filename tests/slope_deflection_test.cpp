// Tests of the slope-deflection method.
//
// Published checks cite their source beside them ("from memory" where the
// value or edition is remembered, not re-read). The rest are general laws:
// equilibrium, the jump rules of beam.h, compatibility, Maxwell-Betti
// reciprocity, and the differential relations V = dM/dx, theta = dv/dx,
// EI dtheta/dx = -M. Couples on a span are also checked against a direct
// integration of EI v'' = -M written in this file (SpanCouple section),
// which shares no code with the method.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <random>
#include <string>
#include <thread>
#include <vector>

#include "methods/beam/stability.h"
#include "methods/slope_deflection/fused.h"
#include "methods/slope_deflection/slope_deflection.h"

namespace trivet {
namespace {

namespace sd = slope_deflection;
using T = SupportType;

template <class R = double>
BasicBeam<R> make(const std::vector<T>& types, const std::vector<R>& lengths, R EI = R(1000)) {
  BasicBeam<R> b;
  for (const R& L : lengths) b.spans.push_back({L, EI});
  for (std::size_t i = 0; i < types.size(); ++i) {
    BasicSupport<R> s;
    s.type = types[i];
    b.supports.push_back(s);
    b.labels.push_back(std::string(1, static_cast<char>('A' + i)));
  }
  return b;
}

template <class R>
BasicLoad<R> span_point(std::size_t s, R a, R P) {
  BasicLoad<R> l; l.type = LoadType::Point; l.index = s; l.at = a; l.P = P; return l;
}
template <class R>
BasicLoad<R> span_couple(std::size_t s, R a, R C) {
  BasicLoad<R> l; l.type = LoadType::Couple; l.index = s; l.at = a; l.C = C; return l;
}
template <class R>
BasicLoad<R> span_udl(std::size_t s, R from, R to, R w) {
  BasicLoad<R> l; l.type = LoadType::Udl; l.index = s; l.from = from; l.to = to; l.w1 = w; l.w2 = w; return l;
}
template <class R>
BasicLoad<R> span_linear(std::size_t s, R from, R to, R w1, R w2) {
  BasicLoad<R> l; l.type = LoadType::Linear; l.index = s; l.from = from; l.to = to; l.w1 = w1; l.w2 = w2; return l;
}
template <class R>
BasicLoad<R> node_point(std::size_t i, R P) {
  BasicLoad<R> l; l.type = LoadType::Point; l.on_node = true; l.index = i; l.P = P; return l;
}
template <class R>
BasicLoad<R> node_couple(std::size_t i, R C) {
  BasicLoad<R> l; l.type = LoadType::Couple; l.on_node = true; l.index = i; l.C = C; return l;
}

Solution run(const Beam& b) {
  Solution s = sd::solve(b, build_stations(b, 10));
  EXPECT_EQ(s.status, MethodStatus::Ok) << s.reason;
  return s;
}

// Equilibrium of the whole beam (law of statics): sum of vertical forces and
// of moments about x = 0 (counter-clockwise +) vanish. `tol` is relative to
// the size of the loads.
void expect_equilibrium(const Beam& b, const Solution& s, double tol = 1e-9) {
  ASSERT_EQ(s.status, MethodStatus::Ok);
  double F = 0, M = 0, scale = 1e-300, mscale = 1e-300;
  std::vector<double> x0(b.node_count(), 0.0);
  for (std::size_t i = 1; i < x0.size(); ++i) x0[i] = x0[i - 1] + b.spans[i - 1].length;
  const double total_len = x0.back();
  for (const auto& l : b.loads) {
    if (l.on_node) {
      if (l.type == LoadType::Point) { F -= l.P; M -= l.P * x0[l.index]; scale += std::fabs(l.P); }
      else { M -= l.C; mscale += std::fabs(l.C); }
      continue;
    }
    const double X = x0[l.index];
    switch (l.type) {
      case LoadType::Point: F -= l.P; M -= l.P * (X + l.at); scale += std::fabs(l.P); break;
      case LoadType::Couple: M -= l.C; mscale += std::fabs(l.C); break;
      case LoadType::Udl:
      case LoadType::Linear: {
        const double h = l.to - l.from;
        const double W = 0.5 * (l.w1 + l.w2) * h;
        // moment of a trapezoid about x = 0: uniform w1 part plus triangle part
        const double Mw = l.w1 * h * (X + l.from + h / 2) + 0.5 * (l.w2 - l.w1) * h * (X + l.from + 2 * h / 3);
        F -= W; M -= Mw; scale += std::fabs(W);
        break;
      }
    }
  }
  for (std::size_t i = 0; i < s.nodes.size(); ++i) {
    F += s.nodes[i].reaction_force;
    M += s.nodes[i].reaction_force * x0[i] + s.nodes[i].reaction_moment;
    scale += std::fabs(s.nodes[i].reaction_force);
    mscale += std::fabs(s.nodes[i].reaction_moment);
  }
  EXPECT_NEAR(F, 0.0, tol * (scale + mscale / total_len)) << "vertical equilibrium";
  EXPECT_NEAR(M, 0.0, tol * (scale * total_len + mscale)) << "moment equilibrium";
}

// Node results agree with the span functions, and the jump rules of beam.h
// hold at every node (V jumps by reaction - P, M by C - reaction moment).
void expect_node_consistency(const Beam& b, const Solution& s, double tol = 1e-9) {
  ASSERT_EQ(s.status, MethodStatus::Ok);
  const std::size_t n = b.spans.size();
  std::vector<double> P(n + 1, 0.0), C(n + 1, 0.0);
  for (const auto& l : b.loads) {
    if (l.on_node) (l.type == LoadType::Point ? P : C)[l.index] += (l.type == LoadType::Point ? l.P : l.C);
    // A span couple at a span end lies beyond the node's inside limit on
    // that side, so it joins the node's jump.
    if (!l.on_node && l.type == LoadType::Couple) {
      if (!(l.at > 0.0)) C[l.index] += l.C;
      if (!(l.at < b.spans[l.index].length)) C[l.index + 1] += l.C;
    }
  }
  double fs = 1e-12, ms = 1e-12, vs = 1e-300, rs = 1e-300;
  for (const auto& nr : s.nodes) {
    fs += std::fabs(nr.reaction_force);
    ms += std::fabs(nr.reaction_moment);
    vs = std::max(vs, std::fabs(nr.deflection));
    rs = std::max(rs, std::max(std::fabs(nr.rotation_left), std::fabs(nr.rotation_right)));
  }
  for (double p : P) fs += std::fabs(p);
  for (double c : C) ms += std::fabs(c);
  double Lmin = b.spans[0].length;
  for (const auto& sp : b.spans) Lmin = std::min(Lmin, sp.length);
  fs += ms / Lmin;  // a couple-only case still has shears of order C / L
  for (std::size_t i = 0; i <= n; ++i) {
    const auto& nr = s.nodes[i];
    double Vl = 0, Vr = 0, Ml = 0, Mr = 0;
    if (i > 0) {
      const double L = b.spans[i - 1].length;
      const PointValues pv = s.at(i - 1, L, false);
      Vl = pv.shear; Ml = pv.moment;
      EXPECT_NEAR(pv.deflection, nr.deflection, tol * vs + 1e-14);
      EXPECT_NEAR(pv.rotation, nr.rotation_left, tol * rs + 1e-14);
      ASSERT_TRUE(nr.moment_left.has_value());
      EXPECT_NEAR(*nr.moment_left, Ml, tol * ms + 1e-12);
    } else {
      EXPECT_FALSE(nr.moment_left.has_value());
    }
    if (i < n) {
      const PointValues pv = s.at(i, 0.0, false);
      Vr = pv.shear; Mr = pv.moment;
      EXPECT_NEAR(pv.deflection, nr.deflection, tol * vs + 1e-14);
      EXPECT_NEAR(pv.rotation, nr.rotation_right, tol * rs + 1e-14);
      ASSERT_TRUE(nr.moment_right.has_value());
      EXPECT_NEAR(*nr.moment_right, Mr, tol * ms + 1e-12);
    } else {
      EXPECT_FALSE(nr.moment_right.has_value());
    }
    EXPECT_NEAR(Vr - Vl, nr.reaction_force - P[i], tol * fs) << "shear jump at node " << i;
    EXPECT_NEAR(Mr - Ml, C[i] - nr.reaction_moment, tol * (ms + fs * 10)) << "moment jump at node " << i;
    if (b.supports[i].hinge) {
      EXPECT_NEAR(Ml, 0.0, tol * (ms + fs * 10)) << "hinge moment left of node " << i;
      EXPECT_NEAR(Mr, 0.0, tol * (ms + fs * 10)) << "hinge moment right of node " << i;
    }
  }
}

// ---------------------------------------------------------------------------
// Fixed-end moments.

// R. C. Hibbeler, "Structural Analysis", 8th ed., Pearson Prentice Hall,
// 2012, fixed-end moment table inside the back cover (from memory):
// UDL wL^2/12; point load P a b^2/L^2 and P a^2 b/L^2; triangular load
// (zero at A, w at B) wL^2/30 at A and wL^2/20 at B; support settlement
// 6 EI D / L^2. Couple M0 at a: M0 b(2a-b)/L^2 and M0 a(2b-a)/L^2
// (T. G. Hicks, "Civil Engineering Formulas", McGraw-Hill, 2nd ed., 2010,
// fixed-end moment table, from memory; signs derived here for a clockwise
// couple: the point-load values differentiated in a). In the member-end
// convention (clockwise +) the left value is negative for a downward load.
TEST(FixedEndMoments, TableFormulas) {
  const double L = 7.0, w = 3.0, P = 5.0, a = 2.0, b = L - a, C = 11.0;
  const double tol = 1e-12 * 100;  // rounding of a few operations on O(100) values
  auto fem = [&](const Load& l) { return sd::detail::fixed_end_moments(l, L); };
  auto e = fem(span_udl<double>(0, 0, L, w));
  EXPECT_NEAR(e.left, -w * L * L / 12, tol);
  EXPECT_NEAR(e.right, w * L * L / 12, tol);
  e = fem(span_point<double>(0, a, P));
  EXPECT_NEAR(e.left, -P * a * b * b / (L * L), tol);
  EXPECT_NEAR(e.right, P * a * a * b / (L * L), tol);
  e = fem(span_linear<double>(0, 0, L, 0, w));
  EXPECT_NEAR(e.left, -w * L * L / 30, tol);
  EXPECT_NEAR(e.right, w * L * L / 20, tol);
  e = fem(span_linear<double>(0, 0, L, w, 0));
  EXPECT_NEAR(e.left, -w * L * L / 20, tol);
  EXPECT_NEAR(e.right, w * L * L / 30, tol);
  e = fem(span_couple<double>(0, a, C));
  EXPECT_NEAR(e.left, C * b * (2 * a - b) / (L * L), tol);
  EXPECT_NEAR(e.right, C * a * (2 * b - a) / (L * L), tol);
}

// The same table in exact arithmetic: the fractions themselves.
TEST(FixedEndMoments, TableFormulasExact) {
  using X = Exact;
  const X L = 7, w = 3, P = 5, a = 2, b = L - a, C = 11;
  auto fem = [&](const BasicLoad<X>& l) { return sd::detail::fixed_end_moments(l, L); };
  auto e = fem(span_udl<X>(0, X(0), L, w));
  EXPECT_TRUE(e.left == -w * L * L / X(12));
  EXPECT_TRUE(e.right == w * L * L / X(12));
  e = fem(span_point<X>(0, a, P));
  EXPECT_TRUE(e.left == -P * a * b * b / (L * L));
  EXPECT_TRUE(e.right == P * a * a * b / (L * L));
  e = fem(span_linear<X>(0, X(0), L, X(0), w));
  EXPECT_TRUE(e.left == -w * L * L / X(30));
  EXPECT_TRUE(e.right == w * L * L / X(20));
  e = fem(span_couple<X>(0, a, C));
  EXPECT_TRUE(e.left == C * b * (X(2) * a - b) / (L * L));
  EXPECT_TRUE(e.right == C * a * (X(2) * b - a) / (L * L));
}

// Compatibility (law): a fixed-fixed span is the simple span plus end
// moments that cancel its end rotations, so FEM_ij = -(2EI/L)(2 t_i + t_j)
// and FEM_ji = -(2EI/L)(t_i + 2 t_j) with t the simple-span end rotations.
// The fixed-end moments and the elastic curve are coded separately, so this
// checks one against the other for every load type, partial loads included.
TEST(FixedEndMoments, AgreeWithTheElasticCurve) {
  const double L = 6.5, EI = 1234.0;
  std::mt19937 rng(20240611u);
  std::uniform_real_distribution<double> u(0.0, 1.0);
  for (int trial = 0; trial < 200; ++trial) {
    Load l;
    const int kind = trial % 4;
    const double p = L * u(rng), q = L * u(rng);
    const double lo = std::min(p, q), hi = std::max(p, q) + 1e-3 * L;
    if (kind == 0) l = span_point<double>(0, lo + 1e-3, 10 * u(rng) - 5);
    if (kind == 1) l = span_couple<double>(0, lo, 10 * u(rng) - 5);
    if (kind == 2) l = span_udl<double>(0, lo, std::min(hi, L), 10 * u(rng) - 5);
    if (kind == 3) l = span_linear<double>(0, lo, std::min(hi, L), 10 * u(rng) - 5, 10 * u(rng) - 5);
    const auto f = sd::detail::fixed_end_moments(l, L);
    const auto t = sd::detail::simple_span_end_rotations(l, L, EI);
    const double k = 2 * EI / L;
    EXPECT_NEAR(f.left, -k * (2 * t.left + t.right), 1e-10 * 50) << "trial " << trial;
    EXPECT_NEAR(f.right, -k * (t.left + 2 * t.right), 1e-10 * 50) << "trial " << trial;
  }
}

// The same table through the whole solver: a fixed-fixed span; the end
// reaction moments (counter-clockwise +) are minus the member-end moments,
// and the rotations at both ends, from the span's elastic curve, vanish.
TEST(FixedEndMoments, ThroughTheSolverOnAFixedFixedSpan) {
  const double L = 7.0, w = 3.0, P = 5.0, a = 2.0, b = L - a, C = 11.0, EI = 1000.0, D = 0.01;
  const double tol = 1e-9;  // relative rounding of the solve, values O(10)
  struct Case { const char* name; Load load; double left, right; };
  std::vector<Case> cases = {
      {"udl", span_udl<double>(0, 0, L, w), w * L * L / 12, -w * L * L / 12},
      {"point", span_point<double>(0, a, P), P * a * b * b / (L * L), -P * a * a * b / (L * L)},
      {"triangle up", span_linear<double>(0, 0, L, 0, w), w * L * L / 30, -w * L * L / 20},
      {"couple", span_couple<double>(0, a, C), -C * b * (2 * a - b) / (L * L), -C * a * (2 * b - a) / (L * L)},
  };
  for (const auto& c : cases) {
    Beam bm = make({T::Fixed, T::Fixed}, {L}, EI);
    bm.loads = {c.load};
    const Solution s = run(bm);
    EXPECT_NEAR(s.nodes[0].reaction_moment, c.left, tol * 100) << c.name;
    EXPECT_NEAR(s.nodes[1].reaction_moment, c.right, tol * 100) << c.name;
    EXPECT_NEAR(s.at(0, 0.0, false).rotation, 0.0, 1e-12) << c.name;
    EXPECT_NEAR(s.at(0, L, false).rotation, 0.0, 1e-12) << c.name;
    expect_equilibrium(bm, s);
    expect_node_consistency(bm, s);
  }
  // Settlement D of the right support: both member-end moments -6EI D/L^2,
  // so both reaction moments +6EI D/L^2; end forces +-12 EI D / L^3.
  Beam bm = make({T::Fixed, T::Fixed}, {L}, EI);
  bm.supports[1].settlement = D;
  const Solution s = run(bm);
  EXPECT_NEAR(s.nodes[0].reaction_moment, 6 * EI * D / (L * L), 1e-10);
  EXPECT_NEAR(s.nodes[1].reaction_moment, 6 * EI * D / (L * L), 1e-10);
  EXPECT_NEAR(s.nodes[0].reaction_force, 12 * EI * D / (L * L * L), 1e-10);
  EXPECT_NEAR(s.at(0, L, false).deflection, D, 1e-15);
  EXPECT_NEAR(s.at(0, L / 2, false).deflection, D / 2, 1e-15);  // antisymmetric curve
  expect_equilibrium(bm, s);
}

// ---------------------------------------------------------------------------
// Single spans. Closed forms from W. C. Young, R. G. Budynas, "Roark's
// Formulas for Stress and Strain", 7th ed., McGraw-Hill, 2002, Table 8.1
// (from memory; the standard beam formulas, case numbers not checked).

TEST(SingleSpan, SimplySupportedUdlAndCentralPoint) {
  const double L = 8.0, w = 2.5, P = 7.0, EI = 2000.0;
  Beam bm = make({T::Pinned, T::Roller}, {L}, EI);
  bm.loads = {span_udl<double>(0, 0, L, w)};
  Solution s = run(bm);
  EXPECT_NEAR(s.at(0, L / 2, false).moment, w * L * L / 8, 1e-10);                  // wL^2/8
  EXPECT_NEAR(s.at(0, L / 2, false).deflection, 5 * w * L * L * L * L / (384 * EI), 1e-13);  // 5wL^4/384EI
  EXPECT_NEAR(s.nodes[0].reaction_force, w * L / 2, 1e-10);
  expect_equilibrium(bm, s);
  expect_node_consistency(bm, s);
  bm.loads = {span_point<double>(0, L / 2, P)};
  s = run(bm);
  EXPECT_NEAR(s.at(0, L / 2, false).moment, P * L / 4, 1e-10);                    // PL/4
  EXPECT_NEAR(s.at(0, L / 2, false).deflection, P * L * L * L / (48 * EI), 1e-13);  // PL^3/48EI
  EXPECT_NEAR(s.at(0, L / 2, false).shear, P / 2, 1e-12);
  EXPECT_NEAR(s.at(0, L / 2, true).shear, -P / 2, 1e-12);
  expect_equilibrium(bm, s);
  expect_node_consistency(bm, s);
}

TEST(SingleSpan, FixedFixedUdl) {
  const double L = 6.0, w = 4.0, EI = 1500.0;
  Beam bm = make({T::Fixed, T::Fixed}, {L}, EI);
  bm.loads = {span_udl<double>(0, 0, L, w)};
  const Solution s = run(bm);
  EXPECT_NEAR(s.at(0, 0.0, false).moment, -w * L * L / 12, 1e-10);   // -wL^2/12
  EXPECT_NEAR(s.at(0, L, false).moment, -w * L * L / 12, 1e-10);
  EXPECT_NEAR(s.at(0, L / 2, false).moment, w * L * L / 24, 1e-10);  // wL^2/24
  EXPECT_NEAR(s.at(0, L / 2, false).deflection, w * L * L * L * L / (384 * EI), 1e-13);  // wL^4/384EI
  expect_equilibrium(bm, s);
  expect_node_consistency(bm, s);
}

TEST(SingleSpan, ProppedCantileverUdl) {
  const double L = 5.0, w = 3.0, EI = 800.0;
  Beam bm = make({T::Fixed, T::Roller}, {L}, EI);
  bm.loads = {span_udl<double>(0, 0, L, w)};
  const Solution s = run(bm);
  EXPECT_NEAR(s.nodes[0].reaction_force, 5 * w * L / 8, 1e-10);  // 5wL/8
  EXPECT_NEAR(s.nodes[1].reaction_force, 3 * w * L / 8, 1e-10);  // 3wL/8
  EXPECT_NEAR(s.at(0, 0.0, false).moment, -w * L * L / 8, 1e-10);  // -wL^2/8
  EXPECT_NEAR(s.at(0, L - 3 * L / 8, false).moment, 9 * w * L * L / 128, 1e-10);  // 9wL^2/128, 3L/8 from the prop
  EXPECT_NEAR(s.at(0, L - 3 * L / 8, false).shear, 0.0, 1e-10);  // the maximum
  expect_equilibrium(bm, s);
  expect_node_consistency(bm, s);
}

TEST(SingleSpan, CantileverTipLoadUdlAndTipCouple) {
  const double L = 4.0, P = 6.0, w = 2.0, C = 5.0, EI = 900.0;
  Beam bm = make({T::Fixed, T::Free}, {L}, EI);
  bm.loads = {node_point<double>(1, P)};
  Solution s = run(bm);
  EXPECT_NEAR(s.nodes[0].reaction_moment, P * L, 1e-10);  // PL (counter-clockwise)
  EXPECT_NEAR(s.at(0, 0.0, false).moment, -P * L, 1e-10);
  EXPECT_NEAR(s.nodes[1].deflection, P * L * L * L / (3 * EI), 1e-13);  // PL^3/3EI
  EXPECT_NEAR(s.nodes[1].rotation_left, P * L * L / (2 * EI), 1e-13);   // PL^2/2EI
  EXPECT_NEAR(s.at(0, L, false).shear, P, 1e-12);  // jump rule: V(L+) = V(L-) - P = 0
  expect_equilibrium(bm, s);
  expect_node_consistency(bm, s);
  bm.loads = {span_udl<double>(0, 0, L, w)};
  s = run(bm);
  EXPECT_NEAR(s.nodes[1].deflection, w * L * L * L * L / (8 * EI), 1e-13);  // wL^4/8EI
  EXPECT_NEAR(s.nodes[0].reaction_moment, w * L * L / 2, 1e-10);
  expect_equilibrium(bm, s);
  expect_node_consistency(bm, s);
  // Clockwise couple C at the free tip: M = -C throughout (jump rule), tip
  // deflection C L^2 / 2EI (Roark, as above, from memory).
  bm.loads = {node_couple<double>(1, C)};
  s = run(bm);
  EXPECT_NEAR(s.at(0, L, false).moment, -C, 1e-12);
  EXPECT_NEAR(s.at(0, L / 3, false).moment, -C, 1e-12);
  EXPECT_NEAR(s.nodes[1].deflection, C * L * L / (2 * EI), 1e-13);
  expect_equilibrium(bm, s);
  expect_node_consistency(bm, s);
}

// ---------------------------------------------------------------------------
// T. G. Hicks, "Civil Engineering Formulas", McGraw-Hill, 2nd ed., 2010,
// Table 2.1 "Uniformly loaded continuous beams over equal spans" (edition
// and table number from memory). Tolerance: half a unit of the last printed
// digit times the multiplier (wL^2 or wL).

TEST(Hicks, TwoEqualSpansUdl) {
  const double L = 5.0, w = 2.0;
  Beam bm = make({T::Pinned, T::Roller, T::Roller}, {L, L});
  bm.loads = {span_udl<double>(0, 0, L, w), span_udl<double>(1, 0, L, w)};
  const Solution s = run(bm);
  EXPECT_NEAR(*s.nodes[1].moment_left, -0.125 * w * L * L, 0.0005 * w * L * L);  // printed -0.125
  EXPECT_NEAR(s.nodes[0].reaction_force, 0.375 * w * L, 0.0005 * w * L);  // printed 0.375
  EXPECT_NEAR(s.nodes[1].reaction_force, 1.25 * w * L, 0.005 * w * L);    // printed 1.25
  EXPECT_NEAR(s.nodes[2].reaction_force, 0.375 * w * L, 0.0005 * w * L);
  expect_equilibrium(bm, s);
  expect_node_consistency(bm, s);
}

TEST(Hicks, ThreeEqualSpansUdl) {
  const double L = 5.0, w = 2.0;
  Beam bm = make({T::Pinned, T::Roller, T::Roller, T::Roller}, {L, L, L});
  for (std::size_t i = 0; i < 3; ++i) bm.loads.push_back(span_udl<double>(i, 0, L, w));
  const Solution s = run(bm);
  EXPECT_NEAR(*s.nodes[1].moment_left, -0.100 * w * L * L, 0.0005 * w * L * L);  // printed -0.100
  EXPECT_NEAR(*s.nodes[2].moment_left, -0.100 * w * L * L, 0.0005 * w * L * L);
  EXPECT_NEAR(s.nodes[0].reaction_force, 0.4 * w * L, 0.05 * w * L);  // printed 0.4
  EXPECT_NEAR(s.nodes[1].reaction_force, 1.1 * w * L, 0.05 * w * L);  // printed 1.1
  EXPECT_NEAR(s.nodes[2].reaction_force, 1.1 * w * L, 0.05 * w * L);
  EXPECT_NEAR(s.nodes[3].reaction_force, 0.4 * w * L, 0.05 * w * L);
  expect_equilibrium(bm, s);
  expect_node_consistency(bm, s);
}

// Exact arithmetic: the same table's values are the fractions -1/8 and
// -1/10 (Hicks, as above, from memory), and 3/8, 5/4 and 2/5, 11/10 wL;
// and -wL^2/12 for a fixed-fixed span (Hibbeler table, as above).
TEST(Hicks, ExactFractions) {
  using X = Exact;
  const X L = 5, w = 3;
  {
    auto bm = make<X>({T::Pinned, T::Roller, T::Roller}, {L, L}, X(7));
    bm.loads = {span_udl<X>(0, X(0), L, w), span_udl<X>(1, X(0), L, w)};
    const auto s = sd::solve(bm, std::vector<BasicStation<X>>{});
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    EXPECT_TRUE(*s.nodes[1].moment_left == -w * L * L / X(8));
    EXPECT_TRUE(*s.nodes[1].moment_right == -w * L * L / X(8));
    EXPECT_TRUE(s.nodes[0].reaction_force == X(3) * w * L / X(8));
    EXPECT_TRUE(s.nodes[1].reaction_force == X(5) * w * L / X(4));
    // Rotation at A: wL^3/48EI, the propped cantilever's rotation at the
    // prop (each half acts as one by symmetry; Roark, as above, from memory).
    EXPECT_TRUE(s.nodes[0].rotation_right == w * L * L * L / (X(48) * X(7)));
  }
  {
    auto bm = make<X>({T::Pinned, T::Roller, T::Roller, T::Roller}, {L, L, L}, X(7));
    for (std::size_t i = 0; i < 3; ++i) bm.loads.push_back(span_udl<X>(i, X(0), L, w));
    const auto s = sd::solve(bm, std::vector<BasicStation<X>>{});
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    EXPECT_TRUE(*s.nodes[1].moment_left == -w * L * L / X(10));
    EXPECT_TRUE(*s.nodes[2].moment_right == -w * L * L / X(10));
    EXPECT_TRUE(s.nodes[0].reaction_force == X(2) * w * L / X(5));
    EXPECT_TRUE(s.nodes[1].reaction_force == X(11) * w * L / X(10));
  }
  {
    auto bm = make<X>({T::Fixed, T::Fixed}, {L}, X(7));
    bm.loads = {span_udl<X>(0, X(0), L, w)};
    const auto s = sd::solve(bm, std::vector<BasicStation<X>>{});
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    EXPECT_TRUE(s.at(0, X(0), false).moment == -w * L * L / X(12));
    EXPECT_TRUE(s.at(0, L / X(2), false).moment == w * L * L / X(24));
    EXPECT_TRUE(s.at(0, L / X(2), false).deflection == w * L * L * L * L / (X(384) * X(7)));
  }
}

TEST(Hicks, ExtendedPrecision) {
  using X = Extended;
  const X L = 5, w = 3;
  auto bm = make<X>({T::Pinned, T::Roller, T::Roller, T::Roller}, {L, L, L}, X(7));
  for (std::size_t i = 0; i < 3; ++i) bm.loads.push_back(span_udl<X>(i, X(0), L, w));
  const auto s = sd::solve(bm, std::vector<BasicStation<X>>{});
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  const X err = *s.nodes[1].moment_left + w * L * L / X(10);  // Hicks: -0.100 wL^2 = -wL^2/10 exactly
  EXPECT_LT(abs(err), X(1e-45));  // 50 digits, a few dozen operations
  const X err2 = s.nodes[1].reaction_force - X(11) * w * L / X(10);
  EXPECT_LT(abs(err2), X(1e-45));
}

// ---------------------------------------------------------------------------
// Springs, guided supports and hinges.

// A simple span L with a vertical spring k at midspan under UDL w. By
// compatibility (superposition of the two simple-beam closed forms, Roark
// as above, from memory): the midspan deflection 5wL^4/384EI - F L^3/48EI
// equals F/k, so F = (5wL^4/384EI) / (1/k + L^3/48EI).
TEST(Springs, CentralSpringUnderUdl) {
  const double L = 10.0, w = 2.0, EI = 5000.0, k = 300.0;
  Beam bm = make({T::Pinned, T::Spring, T::Roller}, {L / 2, L / 2}, EI);
  bm.supports[1].k = k;
  bm.loads = {span_udl<double>(0, 0, L / 2, w), span_udl<double>(1, 0, L / 2, w)};
  const Solution s = run(bm);
  const double F = (5 * w * L * L * L * L / (384 * EI)) / (1 / k + L * L * L / (48 * EI));
  EXPECT_NEAR(s.nodes[1].reaction_force, F, 1e-10 * F);
  EXPECT_NEAR(s.nodes[1].deflection, F / k, 1e-10 * F / k);
  expect_equilibrium(bm, s);
  expect_node_consistency(bm, s);
}

// Settlement of a spring's base under a statically determinate beam
// (pinned - spring), no load: the beam turns as a rigid body, the spring
// stays unstrained (law of statics: no load, no reaction).
TEST(Springs, SettlementOfASpringBaseUnderADeterminateBeam) {
  const double L = 4.0, s0 = 0.02;
  Beam bm = make({T::Pinned, T::Spring}, {L});
  bm.supports[1].k = 250.0;
  bm.supports[1].settlement = s0;
  const Solution s = run(bm);
  EXPECT_NEAR(s.nodes[1].reaction_force, 0.0, 1e-12);
  EXPECT_NEAR(s.nodes[1].deflection, s0, 1e-15);
  EXPECT_NEAR(s.at(0, L / 4, false).deflection, s0 / 4, 1e-15);
  EXPECT_NEAR(s.at(0, L / 4, false).rotation, s0 / L, 1e-15);
  EXPECT_NEAR(s.at(0, L / 2, false).moment, 0.0, 1e-12);
}

// Fixed at A, guided at B (no rotation, free to translate), tip load P:
// tip deflection PL^3/12EI, end moments PL/2 (Roark, as above, from memory).
TEST(Springs, FixedGuidedTipLoad) {
  const double L = 3.0, P = 9.0, EI = 700.0;
  Beam bm = make({T::Fixed, T::Guided}, {L}, EI);
  bm.loads = {node_point<double>(1, P)};
  const Solution s = run(bm);
  EXPECT_NEAR(s.nodes[1].deflection, P * L * L * L / (12 * EI), 1e-13);
  EXPECT_NEAR(s.nodes[0].reaction_moment, P * L / 2, 1e-10);
  EXPECT_NEAR(s.nodes[1].reaction_moment, P * L / 2, 1e-10);
  EXPECT_NEAR(s.at(0, 0.0, false).moment, -P * L / 2, 1e-10);
  EXPECT_NEAR(s.at(0, L, false).moment, P * L / 2, 1e-10);
  EXPECT_NEAR(s.nodes[1].reaction_force, 0.0, 1e-15);
  EXPECT_NEAR(s.nodes[1].rotation_left, 0.0, 1e-15);
  expect_equilibrium(bm, s);
  expect_node_consistency(bm, s);
}

// Fixed A - span L1 - hinge at an unsupported node B - span L2 - pinned C,
// UDL w on both spans. Statics: BC is a simple span, so R_C and the hinge
// shear are wL2/2; AB is a cantilever carrying wL1 and the hinge force.
// Rotations: cantilever tip wL1^3/6EI + V L1^2/2EI, deflection
// wL1^4/8EI + V L1^3/3EI; BC rotates by its chord plus wL2^3/24EI (Roark,
// as above, from memory).
TEST(Hinges, FixedHingePinned) {
  const double L1 = 4.0, L2 = 6.0, w = 2.0, EI = 1000.0;
  Beam bm = make({T::Fixed, T::Free, T::Pinned}, {L1, L2}, EI);
  bm.supports[1].hinge = true;
  bm.loads = {span_udl<double>(0, 0, L1, w), span_udl<double>(1, 0, L2, w)};
  const Solution s = run(bm);
  const double V = w * L2 / 2;
  EXPECT_NEAR(s.nodes[2].reaction_force, V, 1e-10);
  EXPECT_NEAR(s.nodes[0].reaction_force, w * L1 + V, 1e-10);
  EXPECT_NEAR(s.nodes[0].reaction_moment, w * L1 * L1 / 2 + V * L1, 1e-10);
  EXPECT_NEAR(*s.nodes[1].moment_left, 0.0, 1e-10);
  EXPECT_NEAR(*s.nodes[1].moment_right, 0.0, 1e-10);
  const double dB = w * L1 * L1 * L1 * L1 / (8 * EI) + V * L1 * L1 * L1 / (3 * EI);
  EXPECT_NEAR(s.nodes[1].deflection, dB, 1e-12);
  EXPECT_NEAR(s.nodes[1].rotation_left, w * L1 * L1 * L1 / (6 * EI) + V * L1 * L1 / (2 * EI), 1e-12);
  EXPECT_NEAR(s.nodes[1].rotation_right, -dB / L2 + w * L2 * L2 * L2 / (24 * EI), 1e-12);
  expect_equilibrium(bm, s);
  expect_node_consistency(bm, s);
}

// ---------------------------------------------------------------------------
// Random beams: equilibrium, the jump rules, the differential relations and
// Maxwell-Betti reciprocity.

struct RandomBeams {
  std::mt19937 rng{12345u};
  double uni(double a, double b) { return std::uniform_real_distribution<double>(a, b)(rng); }
  int pick(int n) { return std::uniform_int_distribution<int>(0, n - 1)(rng); }

  // A stable beam with every support type, springs (some with kr), hinges
  // and free interior nodes; no loads.
  Beam beam() {
    for (;;) {
      const int n = 1 + pick(6);
      Beam b;
      for (int i = 0; i < n; ++i) b.spans.push_back({uni(2, 8), uni(500, 3000)});
      const T kinds[] = {T::Fixed, T::Pinned, T::Roller, T::Free, T::Spring, T::Guided};
      for (int i = 0; i <= n; ++i) {
        Support s;
        s.type = kinds[pick(6)];
        if (s.type == T::Spring) {
          s.k = uni(10, 1000);
          if (pick(2) == 0) s.kr = uni(100, 5000);
        }
        const bool interior = i > 0 && i < n;
        const bool can_hinge = interior && !restrains_rotation(s.type) && !(s.type == T::Spring && s.kr > 0);
        s.hinge = can_hinge && pick(3) == 0;
        b.supports.push_back(s);
        b.labels.push_back("N" + std::to_string(i));
      }
      if (!find_mechanism(b)) return b;
    }
  }
  // A random point strictly inside a span (away from its ends).
  std::pair<std::size_t, double> point(const Beam& b) {
    const std::size_t s = static_cast<std::size_t>(pick(static_cast<int>(b.spans.size())));
    return {s, b.spans[s].length * uni(0.05, 0.95)};
  }
  // Random loads of every kind, settlements where allowed.
  void load(Beam& b) {
    const std::size_t n = b.spans.size();
    for (int k = 0; k < 6; ++k) {
      const std::size_t s = static_cast<std::size_t>(pick(static_cast<int>(n)));
      const double L = b.spans[s].length;
      const double p = uni(0, L), q = uni(0, L);
      const double lo = std::min(p, q), hi = std::max(p, q);
      switch (pick(4)) {
        case 0: b.loads.push_back(span_point<double>(s, L * uni(0.05, 0.95), uni(-10, 10))); break;
        case 1: {
          // Sometimes at the span's very start, unless a hinge is there.
          const bool at_start = pick(4) == 0 && !b.supports[s].hinge;
          b.loads.push_back(span_couple<double>(s, at_start ? 0.0 : L * uni(0.01, 0.99), uni(-10, 10)));
          break;
        }
        case 2: b.loads.push_back(span_udl<double>(s, lo, hi + 1e-3, uni(-5, 5))); b.loads.back().to = std::min(b.loads.back().to, L); break;
        case 3: b.loads.push_back(span_linear<double>(s, lo, std::min(hi + 1e-3, L), uni(-5, 5), uni(-5, 5))); break;
      }
    }
    for (std::size_t i = 0; i <= n; ++i) {
      if (pick(3) == 0) b.loads.push_back(node_point<double>(i, uni(-10, 10)));
      if (!b.supports[i].hinge && pick(3) == 0) b.loads.push_back(node_couple<double>(i, uni(-10, 10)));
      const T t = b.supports[i].type;
      if ((restrains_deflection(t) || t == T::Spring) && pick(3) == 0) b.supports[i].settlement = uni(-0.01, 0.01);
    }
  }
};

TEST(RandomBeams, EquilibriumJumpsAndDifferentialRelations) {
  RandomBeams gen;
  int points = 0, hinges = 0, springs = 0, guided = 0, free_inside = 0;
  for (int trial = 0; trial < 300; ++trial) {
    Beam b = gen.beam();
    gen.load(b);
    const Solution s = sd::solve(b, build_stations(b, 10));
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    for (std::size_t i = 0; i < b.supports.size(); ++i) {
      hinges += b.supports[i].hinge;
      springs += b.supports[i].type == T::Spring;
      guided += b.supports[i].type == T::Guided;
      free_inside += b.supports[i].type == T::Free && i > 0 && i + 1 < b.supports.size();
    }
    expect_equilibrium(b, s, 1e-8);
    expect_node_consistency(b, s, 1e-8);
    // V = dM/dx, theta = dv/dx, EI dtheta/dx = -M by central differences
    // at points clear of point forces and couples; the pieces are
    // polynomials of degree <= 5, so the O(h^2) error is tiny.
    for (int k = 0; k < 5; ++k) {
      auto [sp, x] = gen.point(b);
      const double L = b.spans[sp].length, h = 1e-4 * L;
      bool clear = true;
      for (const auto& l : b.loads)
        if (!l.on_node && l.index == sp && (l.type == LoadType::Point || l.type == LoadType::Couple) &&
            std::fabs(l.at - x) < 3 * h)
          clear = false;
      if (!clear) continue;
      const PointValues m = s.at(sp, x - h, false), c = s.at(sp, x, false), p = s.at(sp, x + h, false);
      const double Ms = 1 + std::fabs(m.moment) + std::fabs(p.moment);
      EXPECT_NEAR((p.moment - m.moment) / (2 * h), c.shear, 1e-6 * Ms) << "trial " << trial;
      const double vs = 1e-6 + std::fabs(m.deflection) + std::fabs(p.deflection);
      EXPECT_NEAR((p.deflection - m.deflection) / (2 * h), c.rotation, 1e-6 * vs / L * 100) << "trial " << trial;
      EXPECT_NEAR(b.spans[sp].EI * (p.rotation - m.rotation) / (2 * h), -c.moment, 1e-6 * Ms) << "trial " << trial;
      ++points;
    }
  }
  // The generator did reach the features it is meant to exercise.
  EXPECT_GT(points, 1000);
  EXPECT_GT(hinges, 50);
  EXPECT_GT(springs, 50);
  EXPECT_GT(guided, 50);
  EXPECT_GT(free_inside, 50);
}

// Maxwell-Betti in exact arithmetic: the two sides agree exactly. The
// random double beams are converted exactly (each double is a binary
// fraction).
TEST(RandomBeams, MaxwellBettiExact) {
  using X = Exact;
  RandomBeams gen;
  for (int trial = 0; trial < 25; ++trial) {
    const Beam b = gen.beam();
    auto [s1, x1] = gen.point(b);
    auto [s2, x2] = gen.point(b);
    auto b1 = beam_cast<X>(b), b2 = beam_cast<X>(b), bc = beam_cast<X>(b);
    b1.loads = {span_point<X>(s1, X(x1), X(1))};
    b2.loads = {span_point<X>(s2, X(x2), X(1))};
    bc.loads = {span_couple<X>(s1, X(x1), X(1))};
    const auto r1 = sd::solve(b1, {}), r2 = sd::solve(b2, {}), rc = sd::solve(bc, {});
    ASSERT_EQ(r1.status, MethodStatus::Ok) << r1.reason;
    ASSERT_EQ(r2.status, MethodStatus::Ok) << r2.reason;
    ASSERT_EQ(rc.status, MethodStatus::Ok) << rc.reason;
    EXPECT_TRUE(r1.at(s2, X(x2), false).deflection == r2.at(s1, X(x1), false).deflection) << "trial " << trial;
    EXPECT_TRUE(r2.at(s1, X(x1), false).rotation == rc.at(s2, X(x2), false).deflection) << "trial " << trial;
  }
}

// Maxwell-Betti (law): the deflection at 2 due to a unit force at 1 equals
// the deflection at 1 due to a unit force at 2; and the rotation at 1 due to
// a unit force at 2 equals the deflection at 2 due to a unit couple at 1.
TEST(RandomBeams, MaxwellBettiReciprocity) {
  RandomBeams gen;
  int compared = 0;
  for (int trial = 0; trial < 300; ++trial) {
    Beam b = gen.beam();
    auto [s1, x1] = gen.point(b);
    auto [s2, x2] = gen.point(b);
    Beam b1 = b, b2 = b, bc = b;
    b1.loads = {span_point<double>(s1, x1, 1.0)};
    b2.loads = {span_point<double>(s2, x2, 1.0)};
    bc.loads = {span_couple<double>(s1, x1, 1.0)};
    const Solution r1 = sd::solve(b1, {}), r2 = sd::solve(b2, {}), rc = sd::solve(bc, {});
    ASSERT_EQ(r1.status, MethodStatus::Ok) << r1.reason;
    ASSERT_EQ(r2.status, MethodStatus::Ok) << r2.reason;
    ASSERT_EQ(rc.status, MethodStatus::Ok) << rc.reason;
    const double d21 = r1.at(s2, x2, false).deflection, d12 = r2.at(s1, x1, false).deflection;
    // Floor: rounding relative to a unit load's typical deflection L^3/EI.
    double floor = 0;
    for (const auto& sp : b.spans) floor = std::max(floor, sp.length * sp.length * sp.length / sp.EI);
    floor *= 1e-12;
    EXPECT_NEAR(d21, d12, 1e-9 * (std::fabs(d21) + std::fabs(d12)) + floor) << "trial " << trial;
    const double t12 = r2.at(s1, x1, false).rotation, d2c = rc.at(s2, x2, false).deflection;
    EXPECT_NEAR(t12, d2c, 1e-9 * (std::fabs(t12) + std::fabs(d2c)) + floor) << "trial " << trial;
    ++compared;
  }
  EXPECT_EQ(compared, 300);
}

// `at` is pure: calls from several threads give the serial answers.
TEST(RandomBeams, AtIsThreadSafe) {
  RandomBeams gen;
  Beam b = gen.beam();
  while (b.spans.size() < 3) b = gen.beam();
  gen.load(b);
  const Solution s = sd::solve(b, {});
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  std::vector<std::pair<std::size_t, double>> pts;
  for (int k = 0; k < 2000; ++k) pts.push_back(gen.point(b));
  std::vector<PointValues> serial;
  for (const auto& p : pts) serial.push_back(s.at(p.first, p.second, false));
  std::vector<PointValues> out1(pts.size()), out2(pts.size());
  auto work = [&](std::vector<PointValues>& out) {
    for (int rep = 0; rep < 20; ++rep)
      for (std::size_t k = 0; k < pts.size(); ++k) out[k] = s.at(pts[k].first, pts[k].second, false);
  };
  std::thread t1(work, std::ref(out1)), t2(work, std::ref(out2));
  t1.join();
  t2.join();
  for (std::size_t k = 0; k < pts.size(); ++k) {
    // Same code, same inputs: the results are the same to the last bit.
    EXPECT_NEAR(out1[k].moment, serial[k].moment, 0.0);
    EXPECT_NEAR(out2[k].deflection, serial[k].deflection, 0.0);
  }
}

// ---------------------------------------------------------------------------
// Couples on a span. The fixed-end moments and the span's elastic curve of a
// couple are checked here against statics, the jump rules of beam.h,
// moment-area integrals and published closed forms, and against an
// independent direct integration (below), never against each other.

// An independent solution: direct integration of EI v'' = -M span by span
// (Macaulay's closed forms for each load, written here afresh, not taken
// from the method), with the node conditions of beam.h as one dense linear
// system. Unknowns: per node the deflection, the rotations left and right,
// the reaction force and the reaction couple; per span the shear V0 and
// the moment M0 at its very left end (before any couple at local 0). A
// hinge sets the moment at the very end of the span on its right to zero.
// It shares nothing with the slope-deflection code but beam.h, and in
// Exact it is exact, so the method's Exact answer must equal it exactly.
template <class R>
struct DirectParts {
  R V{0}, M{0}, F1{0}, F2{0};  // load parts of V, M, int M, int int M (from 0)
};

// One span load's parts at local x; `after` includes a force or couple
// acting exactly at x.
template <class R>
void direct_add(const BasicLoad<R>& l, const R& x, bool after, DirectParts<R>& o) {
  if (l.type == LoadType::Point || l.type == LoadType::Couple) {
    if (x < l.at || (!after && !(x > l.at))) return;
    const R d = x - l.at;
    if (l.type == LoadType::Point) {
      o.V -= l.P; o.M -= l.P * d; o.F1 -= l.P * d * d / R(2); o.F2 -= l.P * d * d * d / R(6);
    } else {
      o.M += l.C; o.F1 += l.C * d; o.F2 += l.C * d * d / R(2);
    }
    return;
  }
  // w(t) = w1 + g (t - from) on [from, min(x, to)]. With s = x - t,
  // w = A - g s, A = w1 + g (x - from), so J_n = int w (x - t)^n dt
  // = [A s^(n+1)/(n+1) - g s^(n+2)/(n+2)] from s = x - min(x, to) to x - from.
  if (!(x > l.from) || !(l.to > l.from)) return;
  const R g = (l.w2 - l.w1) / (l.to - l.from);
  const R u = x < l.to ? x : l.to;
  const R A = l.w1 + g * (x - l.from);
  const R s1 = x - l.from, s0 = x - u;
  R J[4];
  R p1 = s1, p0 = s0;  // s^(n+1)
  for (int n = 0; n < 4; ++n) {
    J[n] = A * (p1 - p0) / R(n + 1) - g * (p1 * s1 - p0 * s0) / R(n + 2);
    p1 = p1 * s1;
    p0 = p0 * s0;
  }
  o.V -= J[0]; o.M -= J[1]; o.F1 -= J[2] / R(2); o.F2 -= J[3] / R(6);
}

template <class R>
struct Direct {
  bool ok = false;
  std::vector<R> v, thL, thR, Rf, Rm;  // per node
  std::vector<R> V0, M0;               // per span
  BasicBeam<R> beam;
  // Same limits as BasicSolution::at.
  BasicPointValues<R> at(std::size_t s, const R& x, bool after) const {
    DirectParts<R> p;
    const R& EI = beam.spans[s].EI;
    if (!(x > R(0))) after = true;
    if (!(x < beam.spans[s].length)) after = false;
    for (const auto& l : beam.loads)
      if (!l.on_node && l.index == s) direct_add(l, x, after, p);
    BasicPointValues<R> pv;
    pv.shear = V0[s] + p.V;
    pv.moment = M0[s] + V0[s] * x + p.M;
    pv.rotation = thR[s] - (M0[s] * x + V0[s] * x * x / R(2) + p.F1) / EI;
    pv.deflection = v[s] + thR[s] * x - (M0[s] * x * x / R(2) + V0[s] * x * x * x / R(6) + p.F2) / EI;
    return pv;
  }
};

template <class R>
Direct<R> direct_solve(const BasicBeam<R>& b) {
  using std::abs;
  Direct<R> d;
  d.beam = b;
  const std::size_t n = b.spans.size(), N = n + 1, nu = 5 * N + 2 * n;
  auto iv = [](std::size_t i) { return 5 * i; };
  auto itl = [](std::size_t i) { return 5 * i + 1; };
  auto itr = [](std::size_t i) { return 5 * i + 2; };
  auto irf = [](std::size_t i) { return 5 * i + 3; };
  auto irm = [](std::size_t i) { return 5 * i + 4; };
  auto iV = [N](std::size_t s) { return 5 * N + 2 * s; };
  auto iM = [N](std::size_t s) { return 5 * N + 2 * s + 1; };
  std::vector<std::vector<R>> A;
  std::vector<R> rhs;
  auto row = [&]() { A.emplace_back(nu, R(0)); rhs.emplace_back(0); return A.size() - 1; };
  std::vector<DirectParts<R>> end(n);  // load parts at each span's very right end
  for (std::size_t s = 0; s < n; ++s)
    for (const auto& l : b.loads)
      if (!l.on_node && l.index == s) direct_add(l, b.spans[s].length, true, end[s]);
  std::vector<R> P(N, R(0)), C(N, R(0));
  for (const auto& l : b.loads) {
    if (l.on_node && l.type == LoadType::Point) P[l.index] += l.P;
    if (l.on_node && l.type == LoadType::Couple) C[l.index] += l.C;
  }
  for (std::size_t s = 0; s < n; ++s) {
    const R L = b.spans[s].length, EI = b.spans[s].EI;
    std::size_t r = row();  // v at the right end of the span = v of node s + 1
    A[r][iv(s)] = R(1); A[r][itr(s)] = L; A[r][iM(s)] = -L * L / (R(2) * EI);
    A[r][iV(s)] = -L * L * L / (R(6) * EI); A[r][iv(s + 1)] = R(-1); rhs[r] = end[s].F2 / EI;
    r = row();  // rotation at the right end = rotation left of node s + 1
    A[r][itr(s)] = R(1); A[r][iM(s)] = -L / EI; A[r][iV(s)] = -L * L / (R(2) * EI);
    A[r][itl(s + 1)] = R(-1); rhs[r] = end[s].F1 / EI;
  }
  for (std::size_t i = 0; i < N; ++i) {
    const BasicSupport<R>& sp = b.supports[i];
    // Shear: V right - V left = reaction - P.
    std::size_t r = row();
    if (i < n) A[r][iV(i)] += R(1);
    if (i > 0) { A[r][iV(i - 1)] -= R(1); rhs[r] += end[i - 1].V; }
    A[r][irf(i)] = R(-1); rhs[r] -= P[i];
    // Moment: M right - M left = C - reaction couple.
    r = row();
    if (i < n) A[r][iM(i)] += R(1);
    if (i > 0) {
      A[r][iM(i - 1)] -= R(1);
      A[r][iV(i - 1)] -= b.spans[i - 1].length;
      rhs[r] += end[i - 1].M;
    }
    A[r][irm(i)] = R(1); rhs[r] += C[i];
    // Deflection: prescribed, a spring, or no reaction force.
    r = row();
    if (restrains_deflection(sp.type)) { A[r][iv(i)] = R(1); rhs[r] = sp.settlement; }
    else if (sp.type == SupportType::Spring) { A[r][irf(i)] = R(1); A[r][iv(i)] = -sp.k; rhs[r] = -sp.k * sp.settlement; }
    else A[r][irf(i)] = R(1);
    // Rotation: zero, a rotational spring, or no reaction couple.
    r = row();
    if (restrains_rotation(sp.type)) A[r][itl(i)] = R(1);
    else if (sp.type == SupportType::Spring) { A[r][irm(i)] = R(1); A[r][itl(i)] = -sp.kr; }
    else A[r][irm(i)] = R(1);
    // One rotation, or a hinge: no moment at the very end of the span on its right.
    r = row();
    if (sp.hinge) A[r][iM(i)] = R(1);
    else { A[r][itr(i)] = R(1); A[r][itl(i)] = R(-1); }
  }
  // Gaussian elimination with partial pivoting (exact in Exact).
  for (std::size_t k = 0; k < nu; ++k) {
    std::size_t p = k;
    for (std::size_t i = k + 1; i < nu; ++i)
      if (abs(A[i][k]) > abs(A[p][k])) p = i;
    if (!(abs(A[p][k]) > R(0))) return d;  // a mechanism
    std::swap(A[p], A[k]);
    std::swap(rhs[p], rhs[k]);
    for (std::size_t i = k + 1; i < nu; ++i) {
      if (!(abs(A[i][k]) > R(0))) continue;
      const R f = A[i][k] / A[k][k];
      for (std::size_t j = k; j < nu; ++j) A[i][j] -= f * A[k][j];
      rhs[i] -= f * rhs[k];
    }
  }
  std::vector<R> x(nu, R(0));
  for (std::size_t k = nu; k-- > 0;) {
    R s = rhs[k];
    for (std::size_t j = k + 1; j < nu; ++j) s -= A[k][j] * x[j];
    x[k] = s / A[k][k];
  }
  for (std::size_t i = 0; i < N; ++i) {
    d.v.push_back(x[iv(i)]); d.thL.push_back(x[itl(i)]); d.thR.push_back(x[itr(i)]);
    d.Rf.push_back(x[irf(i)]); d.Rm.push_back(x[irm(i)]);
  }
  for (std::size_t s = 0; s < n; ++s) { d.V0.push_back(x[iV(s)]); d.M0.push_back(x[iM(s)]); }
  d.ok = true;
  return d;
}

// The direct integration itself, on a closed form it must reproduce: a
// cantilever with a tip force, PL^3/3EI and PL^2/2EI (Roark, as above, from
// memory), so a mistake in it cannot hide behind agreement with the method.
TEST(DirectIntegration, ReproducesACantilever) {
  using X = Exact;
  const X L = 4, P = 6, EI = 900;
  auto bm = make<X>({T::Fixed, T::Free}, {L}, EI);
  bm.loads = {node_point<X>(1, P)};
  const Direct<X> d = direct_solve(bm);
  ASSERT_TRUE(d.ok);
  EXPECT_TRUE(d.v[1] == P * L * L * L / (X(3) * EI));
  EXPECT_TRUE(d.thL[1] == P * L * L / (X(2) * EI));
  EXPECT_TRUE(d.Rf[0] == P);
  EXPECT_TRUE(d.Rm[0] == P * L);
}

// Exact method values equal the direct integration's, at the nodes and at
// every station (both limits).
void expect_exactly_direct(const BasicBeam<Exact>& bx, const char* what) {
  const auto sx = sd::solve(bx, std::vector<BasicStation<Exact>>{});
  ASSERT_EQ(sx.status, MethodStatus::Ok) << what << ": " << sx.reason;
  const Direct<Exact> d = direct_solve(bx);
  ASSERT_TRUE(d.ok) << what;
  for (std::size_t i = 0; i < bx.node_count(); ++i) {
    const auto& nr = sx.nodes[i];
    EXPECT_TRUE(nr.reaction_force == d.Rf[i]) << what << " node " << i;
    EXPECT_TRUE(nr.reaction_moment == d.Rm[i]) << what << " node " << i;
    EXPECT_TRUE(nr.deflection == d.v[i]) << what << " node " << i;
    EXPECT_TRUE(nr.rotation_left == d.thL[i]) << what << " node " << i;
    EXPECT_TRUE(nr.rotation_right == d.thR[i]) << what << " node " << i;
  }
  for (const auto& st : build_stations(bx, 4)) {
    const auto p = sx.at(st.span, st.local, st.after), q = d.at(st.span, st.local, st.after);
    EXPECT_TRUE(p.shear == q.shear && p.moment == q.moment && p.deflection == q.deflection &&
                p.rotation == q.rotation)
        << what << " span " << st.span << " at " << static_cast<double>(st.local) << (st.after ? " after" : "");
  }
}

// Simple span L, clockwise couple C at a (b = L - a).
// Statics (law): R_A = -C/L, R_B = +C/L; M = -Cx/L left of the couple,
// C(L-x)/L right of it, so M(a-) = -Ca/L and M(a+) = Cb/L (a jump of +C).
// Moment-area (law): theta_A = (1/EIL) int (L-x) M dx
//   = C (2b^3 - 3a^2 b - a^3) / (6EIL^2) = C (3b^2 - L^2) / (6EIL),
// theta_B = theta_A - (1/EI) int M dx = theta_A - C(b - a)/(2EI)
//   = -C (L^2 - 3a^2) / (6EIL), v(a) = theta_A a + C a^3/(6EIL)
//   = C a b (b - a) / (3EIL).
// Roark (as above, Table 8.1, simply supported beam with an intermediate
// couple, from memory): end slopes of magnitude M0 |L^2 - 3b^2| / (6EIL)
// and M0 |L^2 - 3a^2| / (6EIL); the signs are the moment-area ones above
// (clockwise +: a couple near A turns A its own way).
template <class R>
void simple_span_couple_values(R& thA, R& thB, R& va, const R& L, const R& a, const R& C, const R& EI) {
  const R b = L - a;
  thA = (R(2) * b * b * b - R(3) * a * a * b - a * a * a) * C / (R(6) * EI * L * L);  // moment-area
  thB = thA - C * (b - a) / (R(2) * EI);
  va = thA * a + C * a * a * a / (R(6) * EI * L);
}

TEST(SpanCouple, SimpleSpanStaticsMomentAreaAndRoark) {
  const double L = 5.0, a = 2.0, b = 3.0, C = 10.0, EI = 1e4;  // tests/data/accuracy/simple-span-couple.json
  Beam bm = make({T::Pinned, T::Roller}, {L}, EI);
  bm.loads = {span_couple<double>(0, a, C)};
  const Solution s = run(bm);
  double thA = 0, thB = 0, va = 0;
  simple_span_couple_values(thA, thB, va, L, a, C, EI);
  // The moment-area values agree with Roark's magnitudes and with v(a) above.
  EXPECT_NEAR(std::fabs(thA), C * std::fabs(L * L - 3 * b * b) / (6 * EI * L), 1e-18);
  EXPECT_NEAR(std::fabs(thB), C * std::fabs(L * L - 3 * a * a) / (6 * EI * L), 1e-18);
  EXPECT_NEAR(va, C * a * b * (b - a) / (3 * EI * L), 1e-18);
  EXPECT_NEAR(s.nodes[0].reaction_force, -C / L, 1e-12);  // -2
  EXPECT_NEAR(s.nodes[1].reaction_force, C / L, 1e-12);   // +2
  EXPECT_NEAR(s.at(0, a, false).moment, -C * a / L, 1e-12);  // -4
  EXPECT_NEAR(s.at(0, a, true).moment, C * b / L, 1e-12);    // +6
  EXPECT_NEAR(s.at(0, a, false).shear, -C / L, 1e-12);
  EXPECT_NEAR(s.at(0, a, true).shear, -C / L, 1e-12);  // a couple does not move the shear
  EXPECT_NEAR(s.nodes[0].rotation_right, thA, 1e-18);  // +6.667e-5 (1/15000)
  EXPECT_NEAR(s.nodes[1].rotation_left, thB, 1e-18);   // -4.333e-4 (-13/30000)
  EXPECT_NEAR(s.at(0, a, false).deflection, va, 1e-18);  // 4e-4
  EXPECT_NEAR(s.at(0, a, true).deflection, va, 1e-18);   // continuous
  EXPECT_NEAR(s.at(0, a, true).rotation, s.at(0, a, false).rotation, 1e-18);
  expect_equilibrium(bm, s);
  expect_node_consistency(bm, s);
  // Several positions, both signs of the couple, a couple off the rational grid.
  for (double pos : {0.3, 1.0, 2.5, 2.9, 4.6}) {
    for (double c : {7.5, -3.25}) {
      bm.loads = {span_couple<double>(0, pos, c)};
      const Solution r = run(bm);
      simple_span_couple_values(thA, thB, va, L, pos, c, EI);
      EXPECT_NEAR(r.nodes[0].reaction_force, -c / L, 1e-12) << pos;
      EXPECT_NEAR(r.nodes[0].rotation_right, thA, 1e-12 * std::fabs(c) * L / EI) << pos;
      EXPECT_NEAR(r.nodes[1].rotation_left, thB, 1e-12 * std::fabs(c) * L / EI) << pos;
      EXPECT_NEAR(r.at(0, pos, true).deflection, va, 1e-12 * std::fabs(c) * L * L / EI) << pos;
      EXPECT_NEAR(r.at(0, pos, true).moment - r.at(0, pos, false).moment, c, 1e-12 * std::fabs(c)) << pos;
      expect_node_consistency(bm, r);
    }
  }
}

TEST(SpanCouple, SimpleSpanExact) {
  using X = Exact;
  const X L = 5, a = 2, C = 10, EI = 10000;
  auto bm = make<X>({T::Pinned, T::Roller}, {L}, EI);
  bm.loads = {span_couple<X>(0, a, C)};
  const auto s = sd::solve(bm, std::vector<BasicStation<X>>{});
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  EXPECT_TRUE(s.nodes[0].reaction_force == X(-2));
  EXPECT_TRUE(s.nodes[1].reaction_force == X(2));
  EXPECT_TRUE(s.at(0, a, false).moment == X(-4));
  EXPECT_TRUE(s.at(0, a, true).moment == X(6));
  EXPECT_TRUE(s.nodes[0].rotation_right == X(1) / X(15000));
  EXPECT_TRUE(s.nodes[1].rotation_left == X(-13) / X(30000));
  EXPECT_TRUE(s.at(0, a, true).deflection == X(1) / X(2500));
  X thA, thB, va;
  simple_span_couple_values(thA, thB, va, L, a, C, EI);
  EXPECT_TRUE(thA == X(1) / X(15000) && thB == X(-13) / X(30000) && va == X(1) / X(2500));
}

// Fixed-fixed span, clockwise couple C at a: member-end moments
// C b(2a-b)/L^2 at A and C a(2b-a)/L^2 at B, both clockwise on the member,
// end shears 6Cab/L^3 (R. C. Hibbeler, "Structural Analysis", 8th ed.,
// fixed-end moment table, from memory; signs derived in our conventions).
// The supports apply those moments to the member, so the reaction couples
// (counter-clockwise +) are -C b(2a-b)/L^2 and -C a(2b-a)/L^2. Statics:
// R_B L + RM_A + RM_B - C = 0 (moments about A, CCW +) gives
// R_B = (C + C(4ab - a^2 - b^2)/L^2)/L = 6Cab/L^3 and R_A = -R_B.
// Jump rules: M(0+) = -RM_A, M(L-) = RM_B. For L = 5, a = 2, C = 10:
// R = -/+ 72/25, RM_A = -6/5, RM_B = -16/5 (tests/data/accuracy/
// fixed-span-couple.json). Deflection at the couple C a^2 b^2 (b-a)/(2EIL^3)
// (derived here: the simple-span v(a) above plus the end moments' curves;
// 9/62500 here).
TEST(SpanCouple, FixedFixedTableAndStatics) {
  const double L = 5.0, a = 2.0, b = 3.0, C = 10.0, EI = 1e4;
  Beam bm = make({T::Fixed, T::Fixed}, {L}, EI);
  bm.loads = {span_couple<double>(0, a, C)};
  const Solution s = run(bm);
  const auto& A = s.nodes[0];
  const auto& B = s.nodes[1];
  EXPECT_NEAR(A.reaction_force, -2.88, 1e-12);
  EXPECT_NEAR(B.reaction_force, 2.88, 1e-12);
  EXPECT_NEAR(A.reaction_moment, -1.2, 1e-12);
  EXPECT_NEAR(B.reaction_moment, -3.2, 1e-12);
  EXPECT_NEAR(A.reaction_force + B.reaction_force, 0.0, 1e-12);
  EXPECT_NEAR(B.reaction_force * L + A.reaction_moment + B.reaction_moment - C, 0.0, 1e-11);
  EXPECT_NEAR(s.at(0, 0.0, false).moment, -A.reaction_moment, 1e-12);
  EXPECT_NEAR(s.at(0, L, false).moment, B.reaction_moment, 1e-12);
  EXPECT_NEAR(s.at(0, a, false).moment, -4.56, 1e-12);
  EXPECT_NEAR(s.at(0, a, true).moment, 5.44, 1e-12);
  EXPECT_NEAR(A.rotation_right, 0.0, 1e-18);
  EXPECT_NEAR(B.rotation_left, 0.0, 1e-18);
  EXPECT_NEAR(s.at(0, 0.0, false).rotation, 0.0, 1e-17);  // the elastic curve meets the clamp
  EXPECT_NEAR(s.at(0, L, false).rotation, 0.0, 1e-17);
  EXPECT_NEAR(s.at(0, L, false).deflection, 0.0, 1e-17);
  EXPECT_NEAR(s.at(0, a, false).deflection, C * a * a * b * b * (b - a) / (2 * EI * L * L * L), 1e-17);
  expect_equilibrium(bm, s);
  expect_node_consistency(bm, s);
}

// The same in exact arithmetic, for the couple at L/8 steps from one end to
// the other (ends included: at a = 0 the clamp at A takes the couple whole).
TEST(SpanCouple, FixedFixedExactAlongTheSpan) {
  using X = Exact;
  const X L = 5, C = 10, EI = 10000;
  for (int k = 0; k <= 8; ++k) {
    const X a = L * X(k) / X(8), b = L - a;
    auto bm = make<X>({T::Fixed, T::Fixed}, {L}, EI);
    bm.loads = {span_couple<X>(0, a, C)};
    const auto s = sd::solve(bm, std::vector<BasicStation<X>>{});
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    const X RB = X(6) * C * a * b / (L * L * L);
    EXPECT_TRUE(s.nodes[0].reaction_force == -RB) << k;
    EXPECT_TRUE(s.nodes[1].reaction_force == RB) << k;
    EXPECT_TRUE(s.nodes[0].reaction_moment == -C * b * (X(2) * a - b) / (L * L)) << k;
    EXPECT_TRUE(s.nodes[1].reaction_moment == -C * a * (X(2) * b - a) / (L * L)) << k;
    EXPECT_TRUE(s.at(0, L, false).rotation == X(0) && s.at(0, X(0), false).rotation == X(0)) << k;
    EXPECT_TRUE(s.at(0, a, true).deflection == C * a * a * b * b * (b - a) / (X(2) * EI * L * L * L)) << k;
    expect_exactly_direct(bm, "fixed-fixed couple");
  }
  auto bm = make<X>({T::Fixed, T::Fixed}, {L}, EI);
  bm.loads = {span_couple<X>(0, X(2), C)};
  const auto s = sd::solve(bm, std::vector<BasicStation<X>>{});
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  EXPECT_TRUE(s.nodes[0].reaction_force == X(-72) / X(25));
  EXPECT_TRUE(s.nodes[1].reaction_force == X(72) / X(25));
  EXPECT_TRUE(s.nodes[0].reaction_moment == X(-6) / X(5));
  EXPECT_TRUE(s.nodes[1].reaction_moment == X(-16) / X(5));
  EXPECT_TRUE(s.at(0, X(2), true).deflection == X(9) / X(62500));
}

// A couple exactly at a span end. `at` at local 0 is the limit after it, at
// local L the limit before it; moment_right / moment_left are the same
// limits. A couple at local 0 acts on the beam as a couple on the node:
// same reactions and rotations. Simple span, end couple C0 at A: slopes
// C0 L/3EI at A and C0 L/6EI at B (Roark, as above, from memory); signs
// by moment-area: theta_A = +C L/3EI, theta_B = -C L/6EI (at A), and
// theta_A = -C L/6EI, theta_B = +C L/3EI (at B).
TEST(SpanCouple, AtTheSpanEnds) {
  using X = Exact;
  const X L = 6, C = 9, EI = 4000;
  {
    auto bm = make<X>({T::Pinned, T::Roller}, {L}, EI);
    bm.loads = {span_couple<X>(0, X(0), C)};
    const auto s = sd::solve(bm, std::vector<BasicStation<X>>{});
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    EXPECT_TRUE(s.nodes[0].reaction_force == -C / L);
    EXPECT_TRUE(s.nodes[1].reaction_force == C / L);
    EXPECT_TRUE(s.at(0, X(0), false).moment == C);  // after the couple
    EXPECT_TRUE(*s.nodes[0].moment_right == C);
    EXPECT_TRUE(s.at(0, L / X(3), false).moment == C * X(2) / X(3));
    EXPECT_TRUE(s.nodes[0].rotation_right == C * L / (X(3) * EI));
    EXPECT_TRUE(s.nodes[1].rotation_left == -C * L / (X(6) * EI));
    auto bn = bm;
    bn.loads = {node_couple<X>(0, C)};
    const auto sn = sd::solve(bn, std::vector<BasicStation<X>>{});
    ASSERT_EQ(sn.status, MethodStatus::Ok) << sn.reason;
    for (std::size_t i = 0; i < 2; ++i) {
      EXPECT_TRUE(sn.nodes[i].reaction_force == s.nodes[i].reaction_force);
      EXPECT_TRUE(sn.nodes[i].rotation_left == s.nodes[i].rotation_left);
    }
    EXPECT_TRUE(sn.at(0, L / X(2), false).deflection == s.at(0, L / X(2), false).deflection);
    expect_exactly_direct(bm, "couple at local 0");
  }
  {
    auto bm = make<X>({T::Pinned, T::Roller}, {L}, EI);
    bm.loads = {span_couple<X>(0, L, C)};
    const auto s = sd::solve(bm, std::vector<BasicStation<X>>{});
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    EXPECT_TRUE(s.nodes[0].reaction_force == -C / L);
    EXPECT_TRUE(s.at(0, L, false).moment == -C);  // before the couple
    EXPECT_TRUE(*s.nodes[1].moment_left == -C);
    EXPECT_TRUE(s.nodes[0].rotation_right == -C * L / (X(6) * EI));
    EXPECT_TRUE(s.nodes[1].rotation_left == C * L / (X(3) * EI));
    expect_exactly_direct(bm, "couple at local L");
  }
  {
    // Fixed-fixed, couple at local 0: the clamp at A takes it all
    // (member-end moments -C and 0 from the table above at a = 0):
    // RM_A = +C, nothing else moves.
    auto bm = make<X>({T::Fixed, T::Fixed}, {L}, EI);
    bm.loads = {span_couple<X>(0, X(0), C)};
    auto s = sd::solve(bm, std::vector<BasicStation<X>>{});
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    EXPECT_TRUE(s.nodes[0].reaction_moment == C);
    EXPECT_TRUE(s.nodes[1].reaction_moment == X(0));
    EXPECT_TRUE(s.nodes[0].reaction_force == X(0));
    EXPECT_TRUE(s.at(0, X(0), false).moment == X(0));
    EXPECT_TRUE(s.at(0, L / X(2), false).deflection == X(0));
    bm.loads = {span_couple<X>(0, L, C)};
    s = sd::solve(bm, std::vector<BasicStation<X>>{});
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    EXPECT_TRUE(s.nodes[1].reaction_moment == C);
    EXPECT_TRUE(s.nodes[0].reaction_moment == X(0));
    EXPECT_TRUE(s.at(0, L, false).moment == X(0));
  }
  {
    // Two spans, couples at the end of span 1 and the start of span 2 over
    // the middle support: their sum acts as a node couple there.
    auto bm = make<X>({T::Pinned, T::Roller, T::Roller}, {L, X(4)}, EI);
    bm.loads = {span_couple<X>(0, L, X(5)), span_couple<X>(1, X(0), X(-2))};
    auto bn = bm;
    bn.loads = {node_couple<X>(1, X(3))};
    const auto s = sd::solve(bm, std::vector<BasicStation<X>>{});
    const auto sn = sd::solve(bn, std::vector<BasicStation<X>>{});
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    ASSERT_EQ(sn.status, MethodStatus::Ok) << sn.reason;
    for (std::size_t i = 0; i < 3; ++i) {
      EXPECT_TRUE(s.nodes[i].reaction_force == sn.nodes[i].reaction_force) << i;
      EXPECT_TRUE(s.nodes[i].rotation_left == sn.nodes[i].rotation_left) << i;
    }
    // The inside limits are before the couple at L and after the one at 0,
    // so they are the node-couple case's limits.
    EXPECT_TRUE(*s.nodes[1].moment_left == *sn.nodes[1].moment_left);
    EXPECT_TRUE(*s.nodes[1].moment_right == *sn.nodes[1].moment_right);
    EXPECT_FALSE(*s.nodes[1].moment_left == *s.nodes[1].moment_right);
    expect_exactly_direct(bm, "couples at the span ends over a support");
  }
}

// A couple in a continuous beam, by compatibility (law): pinned A - roller
// B - roller C, spans L1 (EI1) and L2 (EI2), clockwise C at a in span 1.
// Cut the beam over B into two simple spans joined by the support moment
// M_B (sagging +). Rotation at B of span 1: the couple's
// -C (L1^2 - 3a^2)/(6 EI1 L1) (moment-area, above) less M_B L1/(3 EI1);
// of span 2: M_B L2/(3 EI2) (end couple slopes L/3EI and L/6EI, Roark, as
// above, from memory). Equal rotations give M_B; statics the reactions:
// R_A = (M_B - C)/L1, R_C = M_B/L2, R_B = -R_A - R_C. For L1 = 6, a = 2,
// L2 = 4, C = 9, EI1 = 2000, EI2 = 3000: M_B = -27/13, R_A = -24/13,
// R_B = 123/52, R_C = -27/52, theta_B = -3/3250, theta_A = theta_C = 3/6500.
template <class R>
BasicBeam<R> two_span_couple_beam() {
  BasicBeam<R> bm = make<R>({T::Pinned, T::Roller, T::Roller}, {R(6), R(4)});
  bm.spans[0].EI = R(2000);
  bm.spans[1].EI = R(3000);
  bm.loads = {span_couple<R>(0, R(2), R(9))};
  return bm;
}

TEST(SpanCouple, ContinuousBeamByCompatibility) {
  using X = Exact;
  const X L1 = 6, L2 = 4, a = 2, C = 9, EI1 = 2000, EI2 = 3000;
  const X thB1 = -C * (L1 * L1 - X(3) * a * a) / (X(6) * EI1 * L1);
  const X MB = thB1 / (L1 / (X(3) * EI1) + L2 / (X(3) * EI2));
  const X RA = (MB - C) / L1, RC = MB / L2, RB = -RA - RC;
  const X thB = MB * L2 / (X(3) * EI2);
  const X thA = C * (X(3) * (L1 - a) * (L1 - a) - L1 * L1) / (X(6) * EI1 * L1) + MB * L1 / (X(6) * EI1);
  const X thC = -MB * L2 / (X(6) * EI2);
  // The closed forms give the fractions quoted above, and satisfy statics.
  EXPECT_TRUE(MB == X(-27) / X(13) && RA == X(-24) / X(13) && RB == X(123) / X(52) && RC == X(-27) / X(52));
  EXPECT_TRUE(thB == X(-3) / X(3250) && thA == X(3) / X(6500) && thC == X(3) / X(6500));
  EXPECT_TRUE(RB * L1 + RC * (L1 + L2) - C == X(0));
  {
    const auto bm = two_span_couple_beam<X>();
    const auto s = sd::solve(bm, std::vector<BasicStation<X>>{});
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    EXPECT_TRUE(*s.nodes[1].moment_left == MB);
    EXPECT_TRUE(*s.nodes[1].moment_right == MB);
    EXPECT_TRUE(s.nodes[0].reaction_force == RA);
    EXPECT_TRUE(s.nodes[1].reaction_force == RB);
    EXPECT_TRUE(s.nodes[2].reaction_force == RC);
    EXPECT_TRUE(s.nodes[0].rotation_right == thA);
    EXPECT_TRUE(s.nodes[1].rotation_left == thB && s.nodes[1].rotation_right == thB);
    EXPECT_TRUE(s.nodes[2].rotation_left == thC);
    // Both spans' elastic curves meet at B with that rotation.
    EXPECT_TRUE(s.at(0, L1, false).rotation == thB && s.at(1, X(0), false).rotation == thB);
    EXPECT_TRUE(s.at(0, a, true).moment - s.at(0, a, false).moment == C);
    expect_exactly_direct(bm, "two spans, couple in span 1");
  }
  {
    const Beam bm = two_span_couple_beam<double>();
    const Solution s = run(bm);
    const double tol = 1e-12;
    EXPECT_NEAR(*s.nodes[1].moment_left, static_cast<double>(MB), tol);
    EXPECT_NEAR(s.nodes[0].reaction_force, static_cast<double>(RA), tol);
    EXPECT_NEAR(s.nodes[1].reaction_force, static_cast<double>(RB), tol);
    EXPECT_NEAR(s.nodes[2].reaction_force, static_cast<double>(RC), tol);
    EXPECT_NEAR(s.nodes[1].rotation_left, static_cast<double>(thB), 1e-17);
    EXPECT_NEAR(s.nodes[0].rotation_right, static_cast<double>(thA), 1e-17);
    EXPECT_NEAR(s.nodes[2].rotation_left, static_cast<double>(thC), 1e-17);
    expect_equilibrium(bm, s);
    expect_node_consistency(bm, s);
  }
}

// Maxwell-Betti with a couple as one of the two actions (law; the work of a
// clockwise couple through a clockwise rotation and of a downward force
// through a downward deflection are both positive): the rotation at i due
// to a unit force at j equals the deflection at j due to a unit couple at
// i; the rotation at i due to a unit couple at j equals the rotation at j
// due to a unit couple at i. Exact, so both sides agree exactly; span
// couples and node couples, on beams with a hinge, a guided support and a
// rotational spring.
TEST(SpanCouple, MaxwellBettiWithCouplesExact) {
  using X = Exact;
  struct Pt { std::size_t s; X x; };
  std::vector<BasicBeam<X>> beams;
  {
    auto b = make<X>({T::Fixed, T::Pinned, T::Free, T::Roller}, {X(5), X(4), X(3)}, X(2000));
    b.supports[2].hinge = true;
    b.spans[1].EI = X(3500);
    beams.push_back(b);
  }
  {
    auto b = make<X>({T::Roller, T::Guided, T::Pinned}, {X(6), X(19) / X(2)}, X(4200));
    beams.push_back(b);
  }
  {
    auto b = make<X>({T::Pinned, T::Spring, T::Free}, {X(4), X(5) / X(2)}, X(1500));
    b.supports[1].k = X(800);
    b.supports[1].kr = X(2500);
    beams.push_back(b);
  }
  int compared = 0;
  for (const auto& b : beams) {
    const std::vector<Pt> pts = {{0, b.spans[0].length / X(3)}, {b.spans.size() - 1, b.spans.back().length * X(3) / X(4)},
                                 {b.spans.size() - 1, b.spans.back().length / X(5)}};
    for (const Pt& i : pts) {
      for (const Pt& j : pts) {
        if (i.s == j.s && i.x == j.x) continue;
        auto bf = b, bc = b, bcj = b;
        bf.loads = {span_point<X>(j.s, j.x, X(1))};
        bc.loads = {span_couple<X>(i.s, i.x, X(1))};
        bcj.loads = {span_couple<X>(j.s, j.x, X(1))};
        const auto rf = sd::solve(bf, {}), rc = sd::solve(bc, {}), rcj = sd::solve(bcj, {});
        ASSERT_EQ(rf.status, MethodStatus::Ok) << rf.reason;
        ASSERT_EQ(rc.status, MethodStatus::Ok) << rc.reason;
        ASSERT_EQ(rcj.status, MethodStatus::Ok) << rcj.reason;
        const X t_i = rf.at(i.s, i.x, false).rotation, v_j = rc.at(j.s, j.x, false).deflection;
        EXPECT_TRUE(t_i == v_j) << static_cast<double>(t_i) << " vs " << static_cast<double>(v_j);
        EXPECT_FALSE(t_i == X(0));  // the pair is not trivially zero
        EXPECT_TRUE(rcj.at(i.s, i.x, false).rotation == rc.at(j.s, j.x, false).rotation);
        ++compared;
      }
      // A unit couple on node 0 (not a hinge) against a unit force at i.
      auto bn = b, bf = b;
      bn.loads = {node_couple<X>(0, X(1))};
      bf.loads = {span_point<X>(i.s, i.x, X(1))};
      const auto rn = sd::solve(bn, {}), rf = sd::solve(bf, {});
      ASSERT_EQ(rn.status, MethodStatus::Ok) << rn.reason;
      ASSERT_EQ(rf.status, MethodStatus::Ok) << rf.reason;
      EXPECT_TRUE(rf.nodes[0].rotation_right == rn.at(i.s, i.x, false).deflection);
    }
  }
  EXPECT_EQ(compared, 18);
}

// Simple span, closed form on both sides of Maxwell-Betti (law; values from
// the moment-area results above and the point-load slope of Roark, as above,
// from memory: theta(x) for P at c, x < c, is P (L-c)(L^2 - (L-c)^2 - 3x^2)/(6EIL)):
// the rotation at x = a due to a unit force at c equals the deflection at c
// due to a unit couple at a.
TEST(SpanCouple, MaxwellBettiSimpleSpanClosedForm) {
  using X = Exact;
  const X L = 8, EI = 3000, a = 2, c = 5;
  auto bf = make<X>({T::Pinned, T::Roller}, {L}, EI), bc = bf;
  bf.loads = {span_point<X>(0, c, X(1))};
  bc.loads = {span_couple<X>(0, a, X(1))};
  const auto rf = sd::solve(bf, {}), rc = sd::solve(bc, {});
  ASSERT_EQ(rf.status, MethodStatus::Ok) << rf.reason;
  ASSERT_EQ(rc.status, MethodStatus::Ok) << rc.reason;
  const X d = L - c;
  const X theta = d * (L * L - d * d - X(3) * a * a) / (X(6) * EI * L);
  EXPECT_TRUE(rf.at(0, a, false).rotation == theta);
  EXPECT_TRUE(rc.at(0, c, false).deflection == theta);
}

// The five beams of tests/data/accuracy/ (typed in from the files: spans,
// supports, loads with 0-based spans here). The method's double answer agrees
// with the exact direct integration to 1e-9 relative (scale: the largest
// value of each kind on the beam) at the nodes and along the stations; its
// Exact answer equals it exactly; equilibrium and the jump rules hold.
Beam accuracy_beam(int which) {
  Beam b;
  auto sup = [](T t, double settle = 0.0, bool hinge = false) {
    Support s; s.type = t; s.settlement = settle; s.hinge = hinge; return s;
  };
  switch (which) {
    case 0:  // simple-span-couple.json
      b.spans = {{5.0, 10000}};
      b.supports = {sup(T::Pinned), sup(T::Roller)};
      b.loads = {span_couple<double>(0, 2.0, 10.0)};
      break;
    case 1:  // fixed-span-couple.json
      b.spans = {{5.0, 10000}};
      b.supports = {sup(T::Fixed), sup(T::Fixed)};
      b.loads = {span_couple<double>(0, 2.0, 10.0)};
      break;
    case 2:  // free-overhang-close-couples.json
      b.spans = {{9.2277585535571021, 73432.872784448671}, {7.1065350784265453, 73432.872784448671},
                 {5.1236612350712143, 73432.872784448671}, {2.3306022189715261, 73432.872784448671}};
      b.supports = {sup(T::Free), sup(T::Free), sup(T::Pinned, 0.0045764700000000), sup(T::Free), sup(T::Pinned)};
      b.loads = {span_couple<double>(3, 1.62697, 7.19583), span_couple<double>(3, 1.67999, -5.82176)};
      break;
    case 3:  // guided-span-couple.json
      b.spans = {{6.0399718278674666, 42200.317919708861}, {9.5119833698834935, 81282.776130045037}};
      b.supports = {sup(T::Roller), sup(T::Guided), sup(T::Pinned)};
      b.loads = {span_couple<double>(1, 1.59116, 4.62593), span_linear<double>(1, 2.23834, 8.65713, -5.93064, -0.971222),
                 span_point<double>(0, 5.28907, -11.0459), span_udl<double>(1, 0.0, 9.5119833698834935, -1.8732)};
      break;
    default:  // hinge-span-couple.json
      b.spans = {{7.7406965301116211, 23729.396277116164}, {2.1220732890886174, 22310.112531602786},
                 {9.9950759921237609, 9234.2309126742493}};
      b.supports = {sup(T::Roller), sup(T::Pinned, -0.000206226, true), sup(T::Pinned), sup(T::Fixed)};
      b.loads = {span_udl<double>(0, 3.19067, 3.74573, 13.6418), span_udl<double>(1, 1.32152, 1.81433, 13.9191),
                 node_point<double>(2, 21.679), span_couple<double>(2, 8.83851, 2.61038),
                 span_point<double>(0, 2.23366, 29.5678), span_udl<double>(2, 0.756365, 7.92845, 4.39836),
                 node_point<double>(2, 24.3681), span_udl<double>(2, 0.0, 9.9950759921237609, 9.28491)};
      break;
  }
  for (std::size_t i = 0; i < b.supports.size(); ++i) b.labels.push_back(std::string(1, static_cast<char>('A' + i)));
  return b;
}

TEST(SpanCouple, AccuracyBeamsAgainstDirectIntegration) {
  const char* names[] = {"simple-span-couple", "fixed-span-couple", "free-overhang-close-couples",
                         "guided-span-couple", "hinge-span-couple"};
  for (int w = 0; w < 5; ++w) {
    const Beam b = accuracy_beam(w);
    ASSERT_FALSE(find_mechanism(b)) << names[w];
    const Solution s = run(b);
    expect_equilibrium(b, s);
    expect_node_consistency(b, s);
    const auto bx = beam_cast<Exact>(b);
    expect_exactly_direct(bx, names[w]);
    const Direct<Exact> d = direct_solve(bx);
    ASSERT_TRUE(d.ok) << names[w];
    auto D = [](const Exact& e) { return static_cast<double>(e); };
    double fmax = 0, mmax = 0, vmax = 0, tmax = 0, Lmin = b.spans[0].length, Lmax = 0;
    for (const auto& sp : b.spans) { Lmin = std::min(Lmin, sp.length); Lmax = std::max(Lmax, sp.length); }
    for (std::size_t i = 0; i < b.node_count(); ++i) {
      fmax = std::max(fmax, std::fabs(D(d.Rf[i])));
      mmax = std::max(mmax, std::fabs(D(d.Rm[i])));
      vmax = std::max(vmax, std::fabs(D(d.v[i])));
      tmax = std::max({tmax, std::fabs(D(d.thL[i])), std::fabs(D(d.thR[i]))});
    }
    const auto st = build_stations(b, 10);
    std::vector<BasicPointValues<Exact>> ex;
    double Vs = 0, Ms = 0;
    for (const auto& p : st) {
      ex.push_back(d.at(p.span, Exact(p.local), p.after));
      Vs = std::max(Vs, std::fabs(D(ex.back().shear)));
      Ms = std::max(Ms, std::fabs(D(ex.back().moment)));
      vmax = std::max(vmax, std::fabs(D(ex.back().deflection)));
      tmax = std::max(tmax, std::fabs(D(ex.back().rotation)));
    }
    const double rel = 1e-9;
    const double fs = fmax + mmax / Lmin, ms = mmax + fmax * Lmax, vs = vmax + tmax * Lmax, ts = tmax + vmax / Lmin;
    for (std::size_t i = 0; i < b.node_count(); ++i) {
      const auto& nr = s.nodes[i];
      EXPECT_NEAR(nr.reaction_force, D(d.Rf[i]), rel * fs) << names[w] << " node " << i;
      EXPECT_NEAR(nr.reaction_moment, D(d.Rm[i]), rel * ms) << names[w] << " node " << i;
      EXPECT_NEAR(nr.deflection, D(d.v[i]), rel * vs) << names[w] << " node " << i;
      EXPECT_NEAR(nr.rotation_left, D(d.thL[i]), rel * ts) << names[w] << " node " << i;
      EXPECT_NEAR(nr.rotation_right, D(d.thR[i]), rel * ts) << names[w] << " node " << i;
    }
    for (std::size_t k = 0; k < st.size(); ++k) {
      const PointValues pv = s.at(st[k].span, st[k].local, st[k].after);
      EXPECT_NEAR(pv.shear, D(ex[k].shear), rel * Vs) << names[w] << " station " << k;
      EXPECT_NEAR(pv.moment, D(ex[k].moment), rel * Ms) << names[w] << " station " << k;
      EXPECT_NEAR(pv.deflection, D(ex[k].deflection), rel * vs) << names[w] << " station " << k;
      EXPECT_NEAR(pv.rotation, D(ex[k].rotation), rel * ts) << names[w] << " station " << k;
    }
  }
  // The two simple beams against their closed forms as well (above).
  Solution s = run(accuracy_beam(0));
  EXPECT_NEAR(s.nodes[0].rotation_right, 1.0 / 15000, 1e-18);
  s = run(accuracy_beam(1));
  EXPECT_NEAR(s.nodes[0].reaction_force, -2.88, 1e-12);
  EXPECT_NEAR(s.nodes[0].reaction_moment, -1.2, 1e-12);
}

// Random beams (every support type, springs, hinges, settlements, every
// load type, couples inside spans and at span ends): the Exact method equals
// the exact direct integration.
TEST(SpanCouple, RandomBeamsExactAgainstDirectIntegration) {
  RandomBeams gen;
  gen.rng.seed(777u);
  int couples = 0, at_ends = 0;
  for (int trial = 0; trial < 20; ++trial) {
    Beam b = gen.beam();
    gen.load(b);
    // Couples at span ends, away from hinges.
    for (std::size_t s = 0; s < b.spans.size(); ++s) {
      if (gen.pick(2) == 0 && !b.supports[s + 1].hinge) {
        b.loads.push_back(span_couple<double>(s, b.spans[s].length, gen.uni(-10, 10)));
        ++at_ends;
      }
      if (gen.pick(3) == 0 && !b.supports[s].hinge) {
        b.loads.push_back(span_couple<double>(s, 0.0, gen.uni(-10, 10)));
        ++at_ends;
      }
    }
    for (const auto& l : b.loads) couples += !l.on_node && l.type == LoadType::Couple;
    expect_exactly_direct(beam_cast<Exact>(b), ("trial " + std::to_string(trial)).c_str());
  }
  EXPECT_GT(couples, 30);
  EXPECT_GT(at_ends, 10);
}

// ---------------------------------------------------------------------------
// What the method refuses, and faults.

TEST(Refusals, MechanismFailsWithAReason) {
  // Free-free (no support): a mechanism. The reader never passes one; the
  // solver must say Failed, not return numbers.
  Beam bm = make({T::Free, T::Free}, {4.0});
  bm.loads = {span_udl<double>(0, 0, 4.0, 1.0)};
  Solution s = sd::solve(bm, {});
  EXPECT_EQ(s.status, MethodStatus::Failed);
  EXPECT_NE(s.reason.find("pivot"), std::string::npos) << s.reason;
  // Pinned - hinge at a roller-less free node - pinned: a mechanism, exactly.
  auto bx = make<Exact>({T::Pinned, T::Free, T::Pinned}, {Exact(3), Exact(4)});
  bx.supports[1].hinge = true;
  const auto sx = sd::solve(bx, {});
  EXPECT_EQ(sx.status, MethodStatus::Failed);
  EXPECT_FALSE(sx.reason.empty());
}

TEST(Refusals, OutOfScopeIsNotApplicableAndNamed) {
  Beam bm = make({T::Pinned, T::Roller}, {4.0});
  bm.supports[0].hinge = true;  // the reader allows hinges only inside
  Solution s = sd::solve(bm, {});
  EXPECT_EQ(s.status, MethodStatus::NotApplicable);
  EXPECT_NE(s.reason.find("node A"), std::string::npos) << s.reason;
  Beam bg = make({T::Fixed, T::Guided, T::Roller}, {4.0, 4.0});
  bg.supports[1].hinge = true;
  s = sd::solve(bg, {});
  EXPECT_EQ(s.status, MethodStatus::NotApplicable);
  EXPECT_NE(s.reason.find("guided"), std::string::npos) << s.reason;
}

// ---------------------------------------------------------------------------
// Scale: one million equal spans under UDL, solved once and checked by
// statics only (speed is measured by benchmarks, not by unit tests). Far
// from the ends each span acts as fixed-fixed by symmetry (law), so the
// middle support moment is -wL^2/12 (Hibbeler table, as above).
TEST(Scale, OneMillionSpansEquilibrium) {
  const std::size_t n = 1000000;
  const double L = 3.0, w = 2.0;
  Beam bm;
  bm.spans.assign(n, {L, 1000.0});
  bm.supports.assign(n + 1, Support{});
  bm.labels.assign(n + 1, "");
  for (std::size_t i = 0; i < n; ++i) bm.loads.push_back(span_udl<double>(i, 0, L, w));
  const Solution s = sd::solve(bm, {});
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  ASSERT_EQ(s.nodes.size(), n + 1);
  expect_equilibrium(bm, s);
  EXPECT_NEAR(*s.nodes[n / 2].moment_left, -w * L * L / 12, 1e-9);
  EXPECT_NEAR(s.nodes[n / 2].reaction_force, w * L, 1e-9);
}

// Many loads on one span. A span with more than 16 loads is evaluated by
// `at` from running sums sorted by position (O(log N) a call); a span with
// fewer sums its loads one by one. Superposition (law): the beam under all
// the loads equals the sum of the beam under each load alone, and each of
// those has one load, so this compares the running sums against the
// load-by-load sums through the public solve. In exact arithmetic the two
// must agree exactly, at every station, on both sides of every load.
template <class R>
BasicBeam<R> many_loads_beam(unsigned seed, int count, bool shuffle) {
  std::mt19937 rng(seed);
  auto frac = [&](int den) { return R(static_cast<int>(rng() % static_cast<unsigned>(den - 1)) + 1) / R(den); };
  BasicBeam<R> b = make<R>({T::Fixed, T::Roller, T::Free}, {R(6), R(2)}, R(1000));
  const R L = b.spans[0].length;
  for (int i = 0; i < count; ++i) {
    const R a = L * frac(64), c = a + (L - a) * frac(16);
    const R w = R(static_cast<int>(rng() % 19u) - 9) / R(4);
    switch (i % 6) {
      case 0: case 1: b.loads.push_back(span_point<R>(0, a, w + R(5))); break;
      case 2: b.loads.push_back(span_couple<R>(0, i % 12 == 2 ? R(0) : (i % 12 == 8 ? L : a), w)); break;
      case 3: b.loads.push_back(span_udl<R>(0, a, c, w)); break;
      case 4: b.loads.push_back(span_linear<R>(0, a, c, w, R(2) - w)); break;
      default: b.loads.push_back(span_point<R>(0, L / R(2), R(3))); break;  // several at one position
    }
  }
  b.loads.push_back(span_udl<R>(1, R(0), R(2), R(1)));
  b.loads.push_back(node_point<R>(2, R(4)));
  if (shuffle) std::shuffle(b.loads.begin(), b.loads.end(), rng);
  return b;
}

TEST(ManyLoadsOnASpan, RunningSumsEqualTheLoadByLoadSumExactly) {
  using X = Exact;
  for (unsigned seed : {1u, 2u}) {
    const BasicBeam<X> all = many_loads_beam<X>(seed, 40, seed == 2u);
    const auto st = build_stations(all, 3);
    const auto s = sd::solve(all, st);
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    std::vector<BasicSolution<X>> parts;
    for (const auto& l : all.loads) {
      BasicBeam<X> one = all;
      one.loads = {l};
      parts.push_back(sd::solve(one, st));
      ASSERT_EQ(parts.back().status, MethodStatus::Ok) << parts.back().reason;
    }
    std::size_t checked = 0;
    for (const auto& x : st) {
      BasicPointValues<X> sum;
      for (const auto& p : parts) {
        const auto v = p.at(x.span, x.local, x.after);
        sum.shear += v.shear; sum.moment += v.moment; sum.deflection += v.deflection; sum.rotation += v.rotation;
      }
      const auto v = s.at(x.span, x.local, x.after);
      EXPECT_TRUE(v.shear == sum.shear) << "seed " << seed << " x " << x.x;
      EXPECT_TRUE(v.moment == sum.moment) << "seed " << seed << " x " << x.x;
      EXPECT_TRUE(v.deflection == sum.deflection) << "seed " << seed << " x " << x.x;
      EXPECT_TRUE(v.rotation == sum.rotation) << "seed " << seed << " x " << x.x;
      ++checked;
    }
    EXPECT_GT(checked, 40u);  // every division, load point and both sides of each
    for (std::size_t i = 0; i < all.node_count(); ++i) {
      X ml{0}, mr{0}, r{0};
      for (const auto& p : parts) {
        ml += p.nodes[i].moment_left.value_or(X(0));
        mr += p.nodes[i].moment_right.value_or(X(0));
        r += p.nodes[i].reaction_force;
      }
      EXPECT_TRUE(s.nodes[i].moment_left.value_or(X(0)) == ml) << "node " << i;
      EXPECT_TRUE(s.nodes[i].moment_right.value_or(X(0)) == mr) << "node " << i;
      EXPECT_TRUE(s.nodes[i].reaction_force == r) << "node " << i;
    }
  }
}

// The same in double, with a short steep linear load among the others (the
// running slope must leave no residue behind it): to rounding, 1e-12 of
// the largest magnitude of each quantity.
TEST(ManyLoadsOnASpan, RunningSumsAgreeToRoundingInDouble) {
  Beam all = beam_cast<double>(many_loads_beam<Exact>(3u, 60, false));
  all.loads.push_back(span_linear<double>(0, 2.0, 2.0 + 1e-4, 50.0, -30.0));
  const auto st = build_stations(all, 5);
  const Solution s = sd::solve(all, st);
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  std::vector<Solution> parts;
  for (const auto& l : all.loads) {
    Beam one = all;
    one.loads = {l};
    parts.push_back(sd::solve(one, st));
    ASSERT_EQ(parts.back().status, MethodStatus::Ok) << parts.back().reason;
  }
  std::vector<PointValues> sums;
  double vs = 1e-300, ms = 1e-300, ds = 1e-300, rs = 1e-300;
  for (const auto& x : st) {
    PointValues sum;
    for (const auto& p : parts) {
      const PointValues v = p.at(x.span, x.local, x.after);
      sum.shear += v.shear; sum.moment += v.moment; sum.deflection += v.deflection; sum.rotation += v.rotation;
    }
    vs = std::max(vs, std::abs(sum.shear)); ms = std::max(ms, std::abs(sum.moment));
    ds = std::max(ds, std::abs(sum.deflection)); rs = std::max(rs, std::abs(sum.rotation));
    sums.push_back(sum);
  }
  for (std::size_t k = 0; k < st.size(); ++k) {
    const PointValues v = s.at(st[k].span, st[k].local, st[k].after);
    EXPECT_NEAR(v.shear, sums[k].shear, 1e-12 * vs) << "x " << st[k].x;
    EXPECT_NEAR(v.moment, sums[k].moment, 1e-12 * ms) << "x " << st[k].x;
    EXPECT_NEAR(v.deflection, sums[k].deflection, 1e-12 * ds) << "x " << st[k].x;
    EXPECT_NEAR(v.rotation, sums[k].rotation, 1e-12 * rs) << "x " << st[k].x;
  }
}

// ---------------------------------------------------------------------------
// Two fixed ends, a roller between, equal spans L, a UDL w on the first span
// only (derived by the slope-deflection equations, clockwise member-end
// moments +): M_BA + M_BC = 0 with M_BA = (4EI/L) theta_B + wL^2/12 and
// M_BC = (4EI/L) theta_B gives theta_B = -wL^3/(96 EI); then
// M_AB = (2EI/L) theta_B - wL^2/12 = -5wL^2/48, M_BA = wL^2/24,
// M_CB = (2EI/L) theta_B = -wL^2/48. In our convention (sagging +) the
// internal moment is M_ij at a span's left end and -M_ji at its right end:
// -5wL^2/48 at A, -wL^2/24 over B, and +wL^2/48 (sagging) at the far fixed
// end C of the unloaded span.
TEST(SlopeDeflectionPublished, TwoFixedEndsOneSpanLoadedDerived) {
  const double EI = 30000, L = 6, w = 10, wL2 = w * L * L;
  Beam b = make<double>({T::Fixed, T::Roller, T::Fixed}, {L, L}, EI);
  b.loads = {span_udl<double>(0, 0.0, L, w)};
  const Solution s = run(b);
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  EXPECT_NEAR(*s.nodes[0].moment_right, -5 * wL2 / 48, 1e-9 * wL2);
  EXPECT_NEAR(*s.nodes[1].moment_left, -wL2 / 24, 1e-9 * wL2);
  EXPECT_NEAR(*s.nodes[1].moment_right, -wL2 / 24, 1e-9 * wL2);
  EXPECT_NEAR(*s.nodes[2].moment_left, wL2 / 48, 1e-9 * wL2);
  const double theta = -w * L * L * L / (96 * EI);
  EXPECT_NEAR(s.nodes[1].rotation_left, theta, 1e-9 * std::abs(theta));
}


// ---------------------------------------------------------------------------
// The fused route of the common beam (fused.h) against the general path
// (detail::solve_general) on seeded random common beams: pinned, roller and
// fixed supports with settlements, every span load type in span order
// (points, couples also at the span ends, partial and whole uniform loads,
// linear loads), some spans with more than 16 loads (the running sums of
// span_curve.h). Node results and `at` at every station are compared. In
// double both routes do the same operations in the same order, but the
// check does not rely on that: each value within 1e-13 of the largest
// magnitude of its quantity over the beam (not bitwise). In exact
// arithmetic both give the beam's one exact solution: exactly equal.

struct CommonBeams {
  std::mt19937 rng{20261204u};
  double uni(double a, double b) { return std::uniform_real_distribution<double>(a, b)(rng); }
  int pick(int n) { return std::uniform_int_distribution<int>(0, n - 1)(rng); }

  Beam beam(int max_spans, int max_loads) {
    const int n = 1 + pick(max_spans);
    Beam b;
    for (int i = 0; i < n; ++i) b.spans.push_back({uni(2, 8), uni(500, 3000)});
    const T kinds[] = {T::Fixed, T::Pinned, T::Roller};
    for (int i = 0; i <= n; ++i) {
      Support s;
      s.type = kinds[pick(3)];
      if (pick(3) == 0) s.settlement = uni(-0.01, 0.01);
      b.supports.push_back(s);
      b.labels.push_back("N" + std::to_string(i));
    }
    for (int s = 0; s < n; ++s) {
      const double L = b.spans[static_cast<std::size_t>(s)].length;
      const std::size_t us = static_cast<std::size_t>(s);
      const int count = pick(5) == 0 ? 17 + pick(8) : pick(max_loads + 1);
      for (int k = 0; k < count; ++k) {
        const double p = uni(0, L), q = uni(0, L);
        const double lo = std::min(p, q), hi = std::max(p, q);
        switch (pick(5)) {
          case 0: b.loads.push_back(span_point<double>(us, L * uni(0.05, 0.95), uni(-10, 10))); break;
          case 1: {
            const int where = pick(4);  // 0: at the start, 1: at the end, else inside
            const double a = where == 0 ? 0.0 : where == 1 ? L : L * uni(0.01, 0.99);
            b.loads.push_back(span_couple<double>(us, a, uni(-10, 10)));
            break;
          }
          case 2: b.loads.push_back(span_udl<double>(us, lo, hi, uni(-5, 5))); break;
          case 3: b.loads.push_back(span_udl<double>(us, 0.0, L, uni(-5, 5))); break;
          case 4: b.loads.push_back(span_linear<double>(us, lo, hi, uni(-5, 5), uni(-5, 5))); break;
        }
      }
    }
    return b;
  }
};

// Largest magnitude of each node quantity and each station quantity.
template <class R>
std::vector<R> node_fields(const BasicNodeResult<R>& nr) {
  return {nr.x, nr.moment_left.value_or(R(0)), nr.moment_right.value_or(R(0)), nr.reaction_force,
          nr.reaction_moment, nr.deflection, nr.rotation_left, nr.rotation_right};
}
template <class R>
std::vector<R> point_fields(const BasicPointValues<R>& v) {
  return {v.shear, v.moment, v.deflection, v.rotation};
}

TEST(FusedRoute, AgreesWithTheGeneralPathInDouble) {
  CommonBeams gen;
  int running = 0, fixed = 0, settled = 0, end_couples = 0;
  for (int trial = 0; trial < 400; ++trial) {
    const Beam b = gen.beam(8, 6);
    const std::vector<Station> st = build_stations(b, 5);
    Solution fast;
    ASSERT_TRUE(sd::detail::solve_fused(b, fast)) << "trial " << trial;
    const Solution gen_s = sd::detail::solve_general(b, st);
    ASSERT_EQ(fast.status, MethodStatus::Ok);
    ASSERT_EQ(gen_s.status, MethodStatus::Ok) << gen_s.reason;
    ASSERT_EQ(fast.nodes.size(), gen_s.nodes.size());
    for (std::size_t i = 0; i < b.supports.size(); ++i) {
      fixed += b.supports[i].type == T::Fixed;
      settled += std::fabs(b.supports[i].settlement) > 0;
      EXPECT_EQ(fast.nodes[i].moment_left.has_value(), gen_s.nodes[i].moment_left.has_value());
      EXPECT_EQ(fast.nodes[i].moment_right.has_value(), gen_s.nodes[i].moment_right.has_value());
    }
    for (std::size_t s = 0; s < b.spans.size(); ++s) {
      std::size_t on = 0;
      for (const auto& l : b.loads) {
        on += l.index == s;
        if (l.index == s && l.type == LoadType::Couple && (!(l.at > 0) || !(l.at < b.spans[s].length))) ++end_couples;
      }
      running += on > 16;
    }
    // Nodes: 8 quantities; stations: 4.
    std::vector<double> nmax(8, 0.0), pmax(4, 0.0);
    std::vector<std::vector<double>> nf, ng, pf, pg;
    for (std::size_t i = 0; i < fast.nodes.size(); ++i) {
      nf.push_back(node_fields(fast.nodes[i]));
      ng.push_back(node_fields(gen_s.nodes[i]));
    }
    for (const Station& x : st) {
      pf.push_back(point_fields(fast.at(x.span, x.local, x.after)));
      pg.push_back(point_fields(gen_s.at(x.span, x.local, x.after)));
    }
    for (std::size_t i = 0; i < nf.size(); ++i)
      for (std::size_t q = 0; q < 8; ++q) nmax[q] = std::max({nmax[q], std::fabs(nf[i][q]), std::fabs(ng[i][q])});
    for (std::size_t i = 0; i < pf.size(); ++i)
      for (std::size_t q = 0; q < 4; ++q) pmax[q] = std::max({pmax[q], std::fabs(pf[i][q]), std::fabs(pg[i][q])});
    for (std::size_t i = 0; i < nf.size(); ++i)
      for (std::size_t q = 0; q < 8; ++q)
        EXPECT_NEAR(nf[i][q], ng[i][q], 1e-13 * nmax[q]) << "trial " << trial << " node " << i << " quantity " << q;
    for (std::size_t i = 0; i < pf.size(); ++i)
      for (std::size_t q = 0; q < 4; ++q)
        EXPECT_NEAR(pf[i][q], pg[i][q], 1e-13 * pmax[q]) << "trial " << trial << " station " << i << " quantity " << q;
  }
  // The generator reached what it is meant to exercise.
  EXPECT_GT(running, 50);
  EXPECT_GT(fixed, 300);
  EXPECT_GT(settled, 300);
  EXPECT_GT(end_couples, 100);
}

TEST(FusedRoute, EqualsTheGeneralPathExactly) {
  using X = Exact;
  CommonBeams gen;
  for (int trial = 0; trial < 40; ++trial) {
    const auto b = beam_cast<X>(gen.beam(4, 3));
    const auto st = build_stations(b, 3);
    BasicSolution<X> fast;
    ASSERT_TRUE(sd::detail::solve_fused(b, fast)) << "trial " << trial;
    const auto gen_s = sd::detail::solve_general(b, st);
    ASSERT_EQ(gen_s.status, MethodStatus::Ok) << gen_s.reason;
    ASSERT_EQ(fast.nodes.size(), gen_s.nodes.size());
    for (std::size_t i = 0; i < fast.nodes.size(); ++i)
      EXPECT_TRUE(node_fields(fast.nodes[i]) == node_fields(gen_s.nodes[i])) << "trial " << trial << " node " << i;
    for (const auto& x : st)
      EXPECT_TRUE(point_fields(fast.at(x.span, x.local, x.after)) == point_fields(gen_s.at(x.span, x.local, x.after)))
          << "trial " << trial << " span " << x.span;
  }
}

// What the fused route leaves to the general path: the same answers as
// before through solve() (the general path gives the reasons), and the
// route itself declines.
TEST(FusedRoute, DeclinesWhatItDoesNotCover) {
  Beam b = make({T::Pinned, T::Roller, T::Roller}, {4.0, 5.0});
  b.loads = {span_udl<double>(0, 0.0, 4.0, 2.0), span_point<double>(1, 2.0, 3.0)};
  Solution out;
  EXPECT_TRUE(sd::detail::solve_fused(b, out));
  Beam hinge = b;
  hinge.supports[1].type = T::Free;
  hinge.supports[1].hinge = true;
  Beam node_load = b;
  node_load.loads.push_back(node_point<double>(1, 1.0));
  Beam out_of_order = b;
  std::swap(out_of_order.loads[0], out_of_order.loads[1]);
  Beam spring = b;
  spring.supports[1].type = T::Spring;
  spring.supports[1].k = 100;
  Beam bad_load = b;
  bad_load.loads[1].at = 5.0;  // at the span's end: the general path names it
  for (const Beam* d : {&hinge, &node_load, &out_of_order, &spring, &bad_load}) {
    Solution o;
    EXPECT_FALSE(sd::detail::solve_fused(*d, o));
  }
  // Out of order, the general path gives the answer of the ordered loads.
  const Solution a = sd::solve(b, {}), c = sd::solve(out_of_order, {});
  ASSERT_EQ(c.status, MethodStatus::Ok) << c.reason;
  EXPECT_NEAR(*a.nodes[1].moment_left, *c.nodes[1].moment_left, 1e-12 * std::fabs(*a.nodes[1].moment_left));
  const Solution e = sd::solve(bad_load, {});
  EXPECT_EQ(e.status, MethodStatus::NotApplicable);
  EXPECT_NE(e.reason.find("span 2"), std::string::npos) << e.reason;
}

}  // namespace
}  // namespace trivet
