// Tests of the three-moment equation method (methods/three_moment).
//
// Every expected number comes from a published closed-form case or table
// (source beside it; "from memory" where the source is recalled, not at
// hand) or from a general law (equilibrium, compatibility, superposition,
// Maxwell-Betti reciprocity, symmetry). Signs are those of beam.h: loads
// down +, M sagging +, reactions up +, reaction couples counter-clockwise +,
// deflection down +, rotation clockwise +. Handbooks print magnitudes; the
// signs below follow from those conventions.

// GCC 12 reports a false -Wmaybe-uninitialized inside boost::rational
// (boost/rational.hpp); silence it for the boost headers only.
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

#include <gtest/gtest.h>

#include <algorithm>
#include <cstdio>
#include <random>
#include <ctime>
#include <cmath>
#include <string>
#include <vector>

namespace {

using namespace trivet;
namespace tmm = trivet::three_moment;
using ST = SupportType;

template <class R>
BasicBeam<R> make_beam(const std::vector<R>& lengths, const std::vector<ST>& types, R EI = R(1)) {
  BasicBeam<R> b;
  for (const R& L : lengths) b.spans.push_back({L, EI});
  for (std::size_t i = 0; i < types.size(); ++i) {
    BasicSupport<R> s;
    s.type = types[i];
    b.supports.push_back(s);
    b.labels.push_back(i < 26 ? std::string(1, char('A' + i)) : "N" + std::to_string(i));
  }
  return b;
}

template <class R>
BasicLoad<R> span_udl(std::size_t span, R w, R from, R to) {
  BasicLoad<R> l;
  l.type = LoadType::Udl; l.index = span; l.w1 = w; l.w2 = w; l.from = from; l.to = to;
  return l;
}
template <class R>
void add_udl(BasicBeam<R>& b, std::size_t span, R w) {
  b.loads.push_back(span_udl(span, w, R(0), b.spans[span].length));
}
template <class R>
void add_linear(BasicBeam<R>& b, std::size_t span, R w1, R w2, R from, R to) {
  BasicLoad<R> l;
  l.type = LoadType::Linear; l.index = span; l.w1 = w1; l.w2 = w2; l.from = from; l.to = to;
  b.loads.push_back(l);
}
template <class R>
void add_point(BasicBeam<R>& b, std::size_t span, R P, R at) {
  BasicLoad<R> l;
  l.type = LoadType::Point; l.index = span; l.P = P; l.at = at;
  b.loads.push_back(l);
}
template <class R>
void add_couple(BasicBeam<R>& b, std::size_t span, R C, R at) {
  BasicLoad<R> l;
  l.type = LoadType::Couple; l.index = span; l.C = C; l.at = at;
  b.loads.push_back(l);
}
template <class R>
void add_node_point(BasicBeam<R>& b, std::size_t node, R P) {
  BasicLoad<R> l;
  l.type = LoadType::Point; l.on_node = true; l.index = node; l.P = P;
  b.loads.push_back(l);
}
template <class R>
void add_node_couple(BasicBeam<R>& b, std::size_t node, R C) {
  BasicLoad<R> l;
  l.type = LoadType::Couple; l.on_node = true; l.index = node; l.C = C;
  b.loads.push_back(l);
}

template <class R>
BasicSolution<R> run(const BasicBeam<R>& b) {
  return tmm::solve(b, build_stations(b, b.stations_per_span));
}

// General laws checked on every double solution:
//  - equilibrium: vertical forces, and moments about the left end;
//  - compatibility: deflection continuous at every node and equal to the
//    settlement at restrained nodes; rotation continuous except at hinges,
//    zero at fixed supports;
//  - the jump rules of beam.h at every node (V jumps by +R - P, M by
//    +C - reaction couple; zero beyond the ends). The beams here carry no
//    span couple exactly at a span end, so the node limits are the
//    node-side values.
void check_laws(const Beam& b, const Solution& s, double tol) {
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  const std::size_t n = b.spans.size();
  ASSERT_EQ(s.nodes.size(), n + 1);
  double F = 0, Mo = 0;  // sum of upward forces, ccw moments about x = 0
  std::vector<double> P(n + 1, 0), C(n + 1, 0);
  for (const auto& l : b.loads) {
    if (l.on_node) {
      const double x = b.node_x(l.index);
      if (l.type == LoadType::Point) { F -= l.P; Mo -= l.P * x; P[l.index] += l.P; }
      else { Mo -= l.C; C[l.index] += l.C; }
      continue;
    }
    const double x0 = b.node_x(l.index);
    switch (l.type) {
      case LoadType::Point: F -= l.P; Mo -= l.P * (x0 + l.at); break;
      case LoadType::Couple: Mo -= l.C; break;
      case LoadType::Udl:
      case LoadType::Linear: {
        const double w2 = l.type == LoadType::Udl ? l.w1 : l.w2;
        const double c = x0 + l.from, d = x0 + l.to, sl = (w2 - l.w1) / (d - c);
        F -= (l.w1 + w2) / 2 * (d - c);
        Mo -= l.w1 * (d * d - c * c) / 2 + sl * ((d * d * d - c * c * c) / 3 - c * (d * d - c * c) / 2);
        break;
      }
    }
  }
  for (std::size_t i = 0; i <= n; ++i) {
    F += s.nodes[i].reaction_force;
    Mo += s.nodes[i].reaction_force * s.nodes[i].x + s.nodes[i].reaction_moment;
  }
  EXPECT_NEAR(F, 0.0, tol) << "vertical equilibrium";
  EXPECT_NEAR(Mo, 0.0, tol) << "moment equilibrium about the left end";
  for (std::size_t i = 0; i <= n; ++i) {
    const auto& sp = b.supports[i];
    const auto& nr = s.nodes[i];
    PointValues left{}, right{};
    if (i > 0) left = s.at(i - 1, b.spans[i - 1].length, false);
    if (i < n) right = s.at(i, 0.0, false);
    if (i > 0 && i < n) {
      EXPECT_NEAR(left.deflection, right.deflection, tol) << "deflection continuity at " << b.labels[i];
      if (!sp.hinge) {
        EXPECT_NEAR(left.rotation, right.rotation, tol) << "rotation continuity at " << b.labels[i];
      }
    }
    if (restrains_deflection(sp.type)) {
      if (i > 0) { EXPECT_NEAR(left.deflection, sp.settlement, tol) << "support " << b.labels[i]; }
      if (i < n) { EXPECT_NEAR(right.deflection, sp.settlement, tol) << "support " << b.labels[i]; }
    }
    if (restrains_rotation(sp.type)) {
      if (i > 0) { EXPECT_NEAR(left.rotation, 0.0, tol) << "fixed or guided " << b.labels[i]; }
      if (i < n) { EXPECT_NEAR(right.rotation, 0.0, tol) << "fixed or guided " << b.labels[i]; }
    }
    const double Vl = i > 0 ? left.shear : 0.0, Vr = i < n ? right.shear : 0.0;
    const double Ml = i > 0 ? left.moment : 0.0, Mr = i < n ? right.moment : 0.0;
    EXPECT_NEAR(Vr - Vl, nr.reaction_force - P[i], tol) << "shear jump at " << b.labels[i];
    EXPECT_NEAR(Mr - Ml, C[i] - nr.reaction_moment, tol) << "moment jump at " << b.labels[i];
    if (i > 0) { EXPECT_NEAR(*nr.moment_left, left.moment, tol); }
    if (i < n) { EXPECT_NEAR(*nr.moment_right, right.moment, tol); }
    EXPECT_NEAR(nr.deflection, i < n ? right.deflection : left.deflection, tol);
    if (sp.type == ST::Spring) {  // a spring's force and couple follow its own law
      EXPECT_NEAR(nr.reaction_force, sp.k * (nr.deflection - sp.settlement), tol) << "spring " << b.labels[i];
      EXPECT_NEAR(nr.reaction_moment, sp.kr * nr.rotation_right, tol) << "spring " << b.labels[i];
    } else {
      if (!restrains_deflection(sp.type)) { EXPECT_NEAR(nr.reaction_force, 0.0, 0.0); }
      if (!restrains_rotation(sp.type)) { EXPECT_NEAR(nr.reaction_moment, 0.0, 0.0); }
    }
  }
}

// ---------------------------------------------------------------------------
// Single spans: closed-form cases.

// Simply supported, uniform load: M = wL^2/8 at midspan, deflection
// 5wL^4/(384EI), reactions wL/2, end rotations wL^3/(24EI).
// T. G. Hicks, "Civil Engineering Formulas", McGraw-Hill (edition not
// checked; from memory), ch. 2, beam formulas, simple beam, uniform load.
TEST(ThreeMomentSingleSpan, SimplySupportedUniform) {
  const double L = 6, w = 2, EI = 1000;
  Beam b = make_beam<double>({L}, {ST::Pinned, ST::Roller}, EI);
  add_udl(b, 0, w);
  const Solution s = run(b);
  check_laws(b, s, 1e-9);
  const PointValues mid = s.at(0, L / 2, false);
  EXPECT_NEAR(mid.moment, w * L * L / 8, 1e-12);  // formula exact; rounding only
  EXPECT_NEAR(mid.deflection, 5 * w * L * L * L * L / (384 * EI), 1e-12);
  EXPECT_NEAR(mid.shear, 0.0, 1e-12);
  EXPECT_NEAR(s.nodes[0].reaction_force, w * L / 2, 1e-12);
  EXPECT_NEAR(s.nodes[1].reaction_force, w * L / 2, 1e-12);
  EXPECT_NEAR(s.nodes[0].rotation_right, w * L * L * L / (24 * EI), 1e-12);
  EXPECT_NEAR(s.nodes[1].rotation_left, -w * L * L * L / (24 * EI), 1e-12);
}

// Simply supported, central point load: M = PL/4, deflection PL^3/(48EI).
// Hicks, "Civil Engineering Formulas", ch. 2 (from memory).
TEST(ThreeMomentSingleSpan, SimplySupportedCentralPoint) {
  const double L = 5, P = 7, EI = 300;
  Beam b = make_beam<double>({L}, {ST::Pinned, ST::Roller}, EI);
  add_point(b, 0, P, L / 2);
  const Solution s = run(b);
  check_laws(b, s, 1e-9);
  EXPECT_NEAR(s.at(0, L / 2, false).moment, P * L / 4, 1e-12);
  EXPECT_NEAR(s.at(0, L / 2, false).deflection, P * L * L * L / (48 * EI), 1e-12);
  // The shear jumps by -P across the load (beam.h jump rule).
  EXPECT_NEAR(s.at(0, L / 2, false).shear, P / 2, 1e-12);
  EXPECT_NEAR(s.at(0, L / 2, true).shear, -P / 2, 1e-12);
}

// Fixed-fixed, uniform load: end moments wL^2/12 hogging, midspan wL^2/24,
// midspan deflection wL^4/(384EI). Hicks, "Civil Engineering Formulas",
// ch. 2, beam fixed at both ends, uniform load (from memory).
TEST(ThreeMomentSingleSpan, FixedFixedUniform) {
  const double L = 8, w = 3, EI = 2000;
  Beam b = make_beam<double>({L}, {ST::Fixed, ST::Fixed}, EI);
  add_udl(b, 0, w);
  const Solution s = run(b);
  check_laws(b, s, 1e-9);
  EXPECT_NEAR(*s.nodes[0].moment_right, -w * L * L / 12, 1e-11);
  EXPECT_NEAR(*s.nodes[1].moment_left, -w * L * L / 12, 1e-11);
  EXPECT_NEAR(s.at(0, L / 2, false).moment, w * L * L / 24, 1e-11);
  EXPECT_NEAR(s.at(0, L / 2, false).deflection, w * L * L * L * L / (384 * EI), 1e-12);
  EXPECT_NEAR(s.nodes[0].reaction_force, w * L / 2, 1e-11);
  // Reaction couples: the left wall turns the beam counter-clockwise.
  EXPECT_NEAR(s.nodes[0].reaction_moment, w * L * L / 12, 1e-11);
  EXPECT_NEAR(s.nodes[1].reaction_moment, -w * L * L / 12, 1e-11);
}

// Fixed-fixed, point load P at a (b = L - a): M_A = Pab^2/L^2,
// M_B = Pa^2b/L^2 (hogging), R_A = Pb^2(3a + b)/L^3, R_B = Pa^2(a + 3b)/L^3,
// deflection under the load Pa^3b^3/(3EIL^3). Hicks, "Civil Engineering
// Formulas", ch. 2, fixed-end beam with concentrated load (from memory).
TEST(ThreeMomentSingleSpan, FixedFixedPoint) {
  const double L = 10, a = 3, bb = 7, P = 12, EI = 5000;
  Beam b = make_beam<double>({L}, {ST::Fixed, ST::Fixed}, EI);
  add_point(b, 0, P, a);
  const Solution s = run(b);
  check_laws(b, s, 1e-9);
  EXPECT_NEAR(*s.nodes[0].moment_right, -P * a * bb * bb / (L * L), 1e-11);
  EXPECT_NEAR(*s.nodes[1].moment_left, -P * a * a * bb / (L * L), 1e-11);
  EXPECT_NEAR(s.nodes[0].reaction_force, P * bb * bb * (3 * a + bb) / (L * L * L), 1e-11);
  EXPECT_NEAR(s.nodes[1].reaction_force, P * a * a * (a + 3 * bb) / (L * L * L), 1e-11);
  EXPECT_NEAR(s.at(0, a, false).deflection, P * a * a * a * bb * bb * bb / (3 * EI * L * L * L), 1e-13);
}

// Propped cantilever (fixed at one end, simply supported at the other),
// uniform load: R_fixed = 5wL/8, R_prop = 3wL/8, M_fixed = -wL^2/8, maximum
// sagging 9wL^2/128 at 3L/8 from the prop (where V = 0). Hicks, "Civil
// Engineering Formulas", ch. 2, beam fixed at one end, supported at other,
// uniform load (from memory). Both orientations, so both fixed-end
// equations are exercised.
TEST(ThreeMomentSingleSpan, ProppedCantileverUniform) {
  const double L = 4, w = 5, EI = 100;
  for (int flip = 0; flip < 2; ++flip) {
    Beam b = make_beam<double>({L}, flip ? std::vector<ST>{ST::Roller, ST::Fixed}
                                         : std::vector<ST>{ST::Fixed, ST::Roller}, EI);
    add_udl(b, 0, w);
    const Solution s = run(b);
    check_laws(b, s, 1e-9);
    const std::size_t fx = flip ? 1 : 0, pr = 1 - fx;
    EXPECT_NEAR(s.nodes[fx].reaction_force, 5 * w * L / 8, 1e-11);
    EXPECT_NEAR(s.nodes[pr].reaction_force, 3 * w * L / 8, 1e-11);
    const double Mf = flip ? *s.nodes[1].moment_left : *s.nodes[0].moment_right;
    EXPECT_NEAR(Mf, -w * L * L / 8, 1e-11);
    const double xm = flip ? 3 * L / 8 : 5 * L / 8;
    EXPECT_NEAR(s.at(0, xm, false).moment, 9 * w * L * L / 128, 1e-11);
    EXPECT_NEAR(s.at(0, xm, false).shear, 0.0, 1e-11);
  }
}

// Propped cantilever, central point load: R_prop = 5P/16, R_fixed = 11P/16,
// M_fixed = -3PL/16, M under the load 5PL/32, deflection under the load
// 7PL^3/(768EI). AISC, "Steel Construction Manual", Beam Diagrams and
// Formulas, beam fixed at one end, supported at other, concentrated load at
// center (from memory).
TEST(ThreeMomentSingleSpan, ProppedCantileverCentralPoint) {
  const double L = 6, P = 16, EI = 900;
  Beam b = make_beam<double>({L}, {ST::Roller, ST::Fixed}, EI);
  add_point(b, 0, P, L / 2);
  const Solution s = run(b);
  check_laws(b, s, 1e-9);
  EXPECT_NEAR(s.nodes[0].reaction_force, 5 * P / 16, 1e-11);
  EXPECT_NEAR(s.nodes[1].reaction_force, 11 * P / 16, 1e-11);
  EXPECT_NEAR(*s.nodes[1].moment_left, -3 * P * L / 16, 1e-11);
  EXPECT_NEAR(s.at(0, L / 2, false).moment, 5 * P * L / 32, 1e-11);
  EXPECT_NEAR(s.at(0, L / 2, false).deflection, 7 * P * L * L * L / (768 * EI), 1e-12);
}

// Cantilever, load P at the free end: deflection PL^3/(3EI), rotation
// PL^2/(2EI), wall moment PL; uniform load: tip deflection wL^4/(8EI),
// wall moment wL^2/2. Hicks, "Civil Engineering Formulas", ch. 2,
// cantilever beams (from memory). Both orientations.
TEST(ThreeMomentSingleSpan, Cantilever) {
  const double L = 3, P = 4, w = 2, EI = 50;
  for (int flip = 0; flip < 2; ++flip) {
    const std::size_t fx = flip ? 1 : 0, tip = 1 - fx;
    Beam b = make_beam<double>({L}, flip ? std::vector<ST>{ST::Free, ST::Fixed}
                                         : std::vector<ST>{ST::Fixed, ST::Free}, EI);
    add_node_point(b, tip, P);
    Solution s = run(b);
    check_laws(b, s, 1e-9);
    EXPECT_NEAR(s.nodes[tip].deflection, P * L * L * L / (3 * EI), 1e-12);
    // The tip turns away from the wall: clockwise at a right-hand tip.
    EXPECT_NEAR(s.nodes[tip].rotation_left, (flip ? -1 : 1) * P * L * L / (2 * EI), 1e-12);
    EXPECT_NEAR(s.nodes[fx].reaction_force, P, 1e-12);
    EXPECT_NEAR(s.nodes[fx].reaction_moment, (flip ? -1 : 1) * P * L, 1e-12);
    EXPECT_NEAR(flip ? *s.nodes[1].moment_left : *s.nodes[0].moment_right, -P * L, 1e-12);

    Beam u = make_beam<double>({L}, flip ? std::vector<ST>{ST::Free, ST::Fixed}
                                         : std::vector<ST>{ST::Fixed, ST::Free}, EI);
    add_udl(u, 0, w);
    s = run(u);
    check_laws(u, s, 1e-9);
    EXPECT_NEAR(s.nodes[tip].deflection, w * L * L * L * L / (8 * EI), 1e-12);
    EXPECT_NEAR(flip ? *s.nodes[1].moment_left : *s.nodes[0].moment_right, -w * L * L / 2, 1e-12);
  }
}

// A cantilever whose length is made of two spans joined at an unsupported
// node (merged into one span): tip load P gives PL^3/(3EI) at the tip and
// P a^2 (3L - a)/(6EI) at distance a from the wall (Hicks, ch. 2,
// cantilever with end load, from memory).
TEST(ThreeMomentSingleSpan, CantileverOfTwoSpans) {
  const double a = 2, c = 3, L = a + c, P = 5, EI = 70;
  Beam b = make_beam<double>({a, c}, {ST::Fixed, ST::Free, ST::Free}, EI);
  add_node_point(b, 2, P);
  const Solution s = run(b);
  check_laws(b, s, 1e-9);
  EXPECT_NEAR(s.nodes[2].deflection, P * L * L * L / (3 * EI), 1e-12);
  EXPECT_NEAR(s.nodes[1].deflection, P * a * a * (3 * L - a) / (6 * EI), 1e-12);
  EXPECT_NEAR(*s.nodes[1].moment_left, -P * c, 1e-12);
  EXPECT_NEAR(s.nodes[0].reaction_moment, P * L, 1e-12);
}

// Simply supported, load increasing linearly from 0 to w: R = wL/6 and wL/3,
// maximum moment wL^2/(9 sqrt 3) at x = L/sqrt 3, maximum deflection
// 0.00652 wL^4/EI at x = 0.5193 L. AISC, "Steel Construction Manual", Beam
// Diagrams and Formulas, simple beam - load increasing uniformly to one end
// (from memory). Deflection tolerance: half a unit of the printed 0.00652.
TEST(ThreeMomentSingleSpan, SimplySupportedTriangular) {
  const double L = 9, w = 4, EI = 700;
  Beam b = make_beam<double>({L}, {ST::Pinned, ST::Roller}, EI);
  add_linear(b, 0, 0.0, w, 0.0, L);
  const Solution s = run(b);
  check_laws(b, s, 1e-9);
  EXPECT_NEAR(s.nodes[0].reaction_force, w * L / 6, 1e-11);
  EXPECT_NEAR(s.nodes[1].reaction_force, w * L / 3, 1e-11);
  const double xm = L / std::sqrt(3.0);
  EXPECT_NEAR(s.at(0, xm, false).moment, w * L * L / (9 * std::sqrt(3.0)), 1e-10);
  EXPECT_NEAR(s.at(0, xm, false).shear, 0.0, 1e-10);
  EXPECT_NEAR(s.at(0, 0.5193 * L, false).deflection, 0.00652 * w * L * L * L * L / EI,
              0.000005 * w * L * L * L * L / EI);
}

// Fixed-fixed, load increasing linearly from 0 to w: M = wL^2/30 at the
// light end, wL^2/20 at the heavy end (hogging); R = 3wL/20 and 7wL/20.
// AISC, "Steel Construction Manual", Beam Diagrams and Formulas, beam fixed
// at both ends - load increasing uniformly to one end (from memory). Exact
// arithmetic: the fractions themselves.
TEST(ThreeMomentSingleSpan, FixedFixedTriangularExact) {
  const Exact L(6), w(5), EI(11);
  BasicBeam<Exact> b = make_beam<Exact>({L}, {ST::Fixed, ST::Fixed}, EI);
  add_linear(b, 0, Exact(0), w, Exact(0), L);
  const BasicSolution<Exact> s = run(b);
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  EXPECT_EQ(*s.nodes[0].moment_right, -w * L * L / 30);
  EXPECT_EQ(*s.nodes[1].moment_left, -w * L * L / 20);
  EXPECT_EQ(s.nodes[0].reaction_force, Exact(3) * w * L / 20);
  EXPECT_EQ(s.nodes[1].reaction_force, Exact(7) * w * L / 20);
}

// Fixed-fixed uniform load in exact arithmetic: -wL^2/12, wL^2/24,
// wL^4/(384EI) exactly (Hicks, ch. 2, as above, from memory).
TEST(ThreeMomentSingleSpan, FixedFixedUniformExact) {
  const Exact L(4), w(3), EI(7);
  BasicBeam<Exact> b = make_beam<Exact>({L}, {ST::Fixed, ST::Fixed}, EI);
  add_udl(b, 0, w);
  const BasicSolution<Exact> s = run(b);
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  EXPECT_EQ(*s.nodes[0].moment_right, -w * L * L / 12);
  EXPECT_EQ(*s.nodes[1].moment_left, -w * L * L / 12);
  EXPECT_EQ(s.at(0, L / 2, false).moment, w * L * L / 24);
  EXPECT_EQ(s.at(0, L / 2, false).deflection, w * L * L * L * L / (Exact(384) * EI));
  EXPECT_EQ(s.at(0, L, false).deflection, Exact(0));
  EXPECT_EQ(s.at(0, L, false).rotation, Exact(0));
}

// ---------------------------------------------------------------------------
// Continuous beams.

// Hicks, "Civil Engineering Formulas", McGraw-Hill, Table 2.1 "Uniformly
// loaded continuous beams over equal spans" (edition from memory; values as
// given in the task brief): coefficients of wL^2 (moments) and wL
// (reactions). Tolerance: half a unit of the last printed digit times the
// multiplier.
struct Coef {
  double value, tol;  // tol: half a unit of the last printed place
};
struct HicksRow {
  int spans;
  std::vector<Coef> M;   // support moments B, C, ... (hogging, printed +)
  std::vector<Coef> Rx;  // reactions A, B, C, ...
};

TEST(ThreeMomentContinuous, HicksTable21) {
  const double L = 5, w = 3, EI = 1;
  const std::vector<HicksRow> rows = {
      {2, {{0.125, 0.0005}}, {{0.375, 0.0005}, {1.25, 0.005}}},
      {3, {{0.100, 0.0005}}, {{0.4, 0.05}, {1.1, 0.05}}},
      {4, {{0.1071, 0.00005}, {0.0714, 0.00005}}, {{0.393, 0.0005}, {1.143, 0.0005}, {0.929, 0.0005}}},
      {5, {{0.1053, 0.00005}, {0.0789, 0.00005}}, {{0.395, 0.0005}, {1.132, 0.0005}, {0.974, 0.0005}}},
  };
  for (const auto& row : rows) {
    std::vector<ST> t(row.spans + 1, ST::Roller);
    t[0] = ST::Pinned;
    Beam b = make_beam<double>(std::vector<double>(row.spans, L), t, EI);
    for (int sp = 0; sp < row.spans; ++sp) add_udl(b, sp, w);
    const Solution s = run(b);
    check_laws(b, s, 1e-9);
    const double wL2 = w * L * L, wL = w * L;
    for (std::size_t k = 0; k < row.M.size(); ++k) {
      EXPECT_NEAR(*s.nodes[k + 1].moment_left, -row.M[k].value * wL2, row.M[k].tol * wL2) << row.spans;
      // The table covers half the beam; the other half is its mirror image.
      EXPECT_NEAR(*s.nodes[row.spans - 1 - k].moment_left, -row.M[k].value * wL2, row.M[k].tol * wL2);
    }
    for (std::size_t k = 0; k < row.Rx.size(); ++k) {
      EXPECT_NEAR(s.nodes[k].reaction_force, row.Rx[k].value * wL, row.Rx[k].tol * wL) << row.spans;
      EXPECT_NEAR(s.nodes[row.spans - k].reaction_force, row.Rx[k].value * wL, row.Rx[k].tol * wL);
    }
  }
}

// The exact fractions that Hicks's Table 2.1 decimals round (as named in the
// task brief for 4 spans; the others are the fractions whose decimals the
// table prints: 3/8, 5/4; 1/10, 2/5, 11/10; 3/28, 1/14, 11/28, 8/7, 13/14;
// 2/19, 3/38, 15/38, 43/38, 37/38 - from memory, each checked against the
// printed decimals), in exact rational arithmetic.
TEST(ThreeMomentContinuous, HicksTable21Exact) {
  const Exact L(5), w(3);
  struct Row { int spans; std::vector<Exact> M, Rx; };
  const std::vector<Row> rows = {
      {2, {Exact(1) / 8}, {Exact(3) / 8, Exact(5) / 4}},
      {3, {Exact(1) / 10}, {Exact(2) / 5, Exact(11) / 10}},
      {4, {Exact(3) / 28, Exact(1) / 14}, {Exact(11) / 28, Exact(8) / 7, Exact(13) / 14}},
      {5, {Exact(2) / 19, Exact(3) / 38}, {Exact(15) / 38, Exact(43) / 38, Exact(37) / 38}},
  };
  for (const auto& row : rows) {
    std::vector<ST> t(row.spans + 1, ST::Roller);
    t[0] = ST::Pinned;
    BasicBeam<Exact> b = make_beam<Exact>(std::vector<Exact>(row.spans, L), t, Exact(2));
    for (int sp = 0; sp < row.spans; ++sp) add_udl(b, sp, w);
    const BasicSolution<Exact> s = run(b);
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    for (std::size_t k = 0; k < row.M.size(); ++k)
      EXPECT_EQ(*s.nodes[k + 1].moment_left, -row.M[k] * w * L * L) << row.spans;
    for (std::size_t k = 0; k < row.Rx.size(); ++k)
      EXPECT_EQ(s.nodes[k].reaction_force, row.Rx[k] * w * L) << row.spans;
  }
}

// The same 5-span case in 50-digit arithmetic, to 1e-40 relative.
TEST(ThreeMomentContinuous, HicksTable21Extended) {
  const Extended L(5), w(3);
  std::vector<ST> t(6, ST::Roller);
  t[0] = ST::Pinned;
  BasicBeam<Extended> b = make_beam<Extended>(std::vector<Extended>(5, L), t, Extended(2));
  for (int sp = 0; sp < 5; ++sp) add_udl(b, sp, w);
  const BasicSolution<Extended> s = run(b);
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  const Extended wL2 = w * L * L, tol("1e-40");
  using std::abs;
  EXPECT_LT(abs(*s.nodes[1].moment_left + Extended(2) / 19 * wL2), tol * wL2);
  EXPECT_LT(abs(*s.nodes[2].moment_left + Extended(3) / 38 * wL2), tol * wL2);
  EXPECT_LT(abs(s.nodes[1].reaction_force - Extended(43) / 38 * w * L), tol * w * L);
}

// Two equal spans, uniform load on one span only: R = 7/16, 5/8, -1/16 wL,
// M_B = -wL^2/16. M. R. Lindeburg, "Civil Engineering Reference Manual",
// Professional Publications (from memory),
// continuous-beam table. Checked in double and exactly.
TEST(ThreeMomentContinuous, LindeburgOneSpanLoaded) {
  {
    const double L = 7, w = 2;
    Beam b = make_beam<double>({L, L}, {ST::Pinned, ST::Roller, ST::Roller}, 30.0);
    add_udl(b, 0, w);
    const Solution s = run(b);
    check_laws(b, s, 1e-9);
    EXPECT_NEAR(s.nodes[0].reaction_force, 7 * w * L / 16, 1e-11);
    EXPECT_NEAR(s.nodes[1].reaction_force, 5 * w * L / 8, 1e-11);
    EXPECT_NEAR(s.nodes[2].reaction_force, -w * L / 16, 1e-11);
    EXPECT_NEAR(*s.nodes[1].moment_left, -w * L * L / 16, 1e-11);
  }
  const Exact L(7), w(2);
  BasicBeam<Exact> b = make_beam<Exact>({L, L}, {ST::Pinned, ST::Roller, ST::Roller}, Exact(30));
  add_udl(b, 0, w);
  const BasicSolution<Exact> s = run(b);
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  EXPECT_EQ(s.nodes[0].reaction_force, Exact(7) * w * L / 16);
  EXPECT_EQ(s.nodes[1].reaction_force, Exact(5) * w * L / 8);
  EXPECT_EQ(s.nodes[2].reaction_force, -w * L / 16);
  EXPECT_EQ(*s.nodes[1].moment_left, -w * L * L / 16);
}

// Two equal spans, point load P at the centre of one span:
// R = 13P/32, 11P/16, -3P/32; M_B = -3PL/32; M under the load 13PL/64.
// AISC, "Steel Construction Manual", Beam Diagrams and Formulas, continuous
// beam - two equal spans - concentrated load at center of one span (from
// memory).
TEST(ThreeMomentContinuous, TwoSpansCentralPointOneSpan) {
  const double L = 4, P = 32;
  Beam b = make_beam<double>({L, L}, {ST::Pinned, ST::Roller, ST::Roller}, 10.0);
  add_point(b, 0, P, L / 2);
  const Solution s = run(b);
  check_laws(b, s, 1e-9);
  EXPECT_NEAR(s.nodes[0].reaction_force, 13 * P / 32, 1e-11);
  EXPECT_NEAR(s.nodes[1].reaction_force, 11 * P / 16, 1e-11);
  EXPECT_NEAR(s.nodes[2].reaction_force, -3 * P / 32, 1e-11);
  EXPECT_NEAR(*s.nodes[1].moment_left, -3 * P * L / 32, 1e-11);
  EXPECT_NEAR(s.at(0, L / 2, false).moment, 13 * P * L / 64, 1e-11);
}

// Beam overhanging one support: span L, overhang a.
//  - load P at the end of the overhang: R1 = Pa/L (downward), R2 = P(L+a)/L,
//    M at R2 = -Pa, tip deflection Pa^2(L+a)/(3EI);
//  - uniform load on the overhang only: R1 = wa^2/(2L) (downward),
//    R2 = wa(2L+a)/(2L), M at R2 = -wa^2/2, tip deflection wa^3(4L+3a)/(24EI).
// AISC, "Steel Construction Manual", Beam Diagrams and Formulas, beam
// overhanging one support (edition and case numbers from memory). Both
// orientations (overhang right, overhang left).
TEST(ThreeMomentOverhang, PointAndUniformOnOverhang) {
  const double L = 6, a = 2, P = 9, w = 3, EI = 400;
  for (int flip = 0; flip < 2; ++flip) {
    const std::vector<double> len = flip ? std::vector<double>{a, L} : std::vector<double>{L, a};
    const std::vector<ST> t = flip ? std::vector<ST>{ST::Free, ST::Roller, ST::Pinned}
                                   : std::vector<ST>{ST::Pinned, ST::Roller, ST::Free};
    const std::size_t far = flip ? 2 : 0, near = 1, tip = flip ? 0 : 2, ov = flip ? 0 : 1;
    Beam b = make_beam<double>(len, t, EI);
    add_node_point(b, tip, P);
    Solution s = run(b);
    check_laws(b, s, 1e-9);
    EXPECT_NEAR(s.nodes[far].reaction_force, -P * a / L, 1e-11);
    EXPECT_NEAR(s.nodes[near].reaction_force, P * (L + a) / L, 1e-11);
    EXPECT_NEAR(*s.nodes[near].moment_left, -P * a, 1e-11);
    EXPECT_NEAR(s.nodes[tip].deflection, P * a * a * (L + a) / (3 * EI), 1e-12);

    Beam u = make_beam<double>(len, t, EI);
    add_udl(u, ov, w);
    s = run(u);
    check_laws(u, s, 1e-9);
    EXPECT_NEAR(s.nodes[far].reaction_force, -w * a * a / (2 * L), 1e-11);
    EXPECT_NEAR(s.nodes[near].reaction_force, w * a * (2 * L + a) / (2 * L), 1e-11);
    EXPECT_NEAR(*s.nodes[near].moment_right, -w * a * a / 2, 1e-11);
    EXPECT_NEAR(s.nodes[tip].deflection, w * a * a * a * (4 * L + 3 * a) / (24 * EI), 1e-12);
  }
}

// ---------------------------------------------------------------------------
// Settlement.

// Fixed-fixed span, one end settled by D: end moments 6EI D/L^2 (hogging at
// the end that stays, sagging at the end that settles), shear 12EI D/L^3.
// The fixed-end moment due to a relative end displacement, as in R. C.
// Hibbeler, "Structural Analysis", Pearson, slope-deflection equation
// (edition from memory).
TEST(ThreeMomentSettlement, FixedFixedEndSettles) {
  const double L = 5, EI = 2e4, D = 0.01;
  Beam b = make_beam<double>({L}, {ST::Fixed, ST::Fixed}, EI);
  b.supports[1].settlement = D;
  const Solution s = run(b);
  check_laws(b, s, 1e-9);
  EXPECT_NEAR(*s.nodes[0].moment_right, -6 * EI * D / (L * L), 1e-10);
  EXPECT_NEAR(*s.nodes[1].moment_left, 6 * EI * D / (L * L), 1e-10);
  EXPECT_NEAR(s.nodes[0].reaction_force, 12 * EI * D / (L * L * L), 1e-10);
  EXPECT_NEAR(s.nodes[1].reaction_force, -12 * EI * D / (L * L * L), 1e-10);
  EXPECT_NEAR(s.at(0, L / 2, false).deflection, D / 2, 1e-14);  // antisymmetry
}

// Two equal spans, middle support settled by D, no load. The support must
// pull the beam down by D: a simple beam of span 2L under a central force F
// deflects F(2L)^3/(48EI) (Hicks, ch. 2, from memory), so F = 6EI D/L^3 and
// the moment at the middle is F(2L)/4 = 3EI D/L^2 - SAGGING in our
// convention (the brief's "-3EI D/L^2" is the same magnitude with hogging
// taken positive; it reduces the hogging moment of any load).
TEST(ThreeMomentSettlement, MiddleSupportOfTwoSpansSettles) {
  const double L = 4, EI = 3e4, D = 0.02;
  Beam b = make_beam<double>({L, L}, {ST::Pinned, ST::Roller, ST::Roller}, EI);
  b.supports[1].settlement = D;
  const Solution s = run(b);
  check_laws(b, s, 1e-9);
  EXPECT_NEAR(*s.nodes[1].moment_left, 3 * EI * D / (L * L), 1e-10);
  EXPECT_NEAR(s.nodes[1].reaction_force, -6 * EI * D / (L * L * L), 1e-10);
  EXPECT_NEAR(s.nodes[0].reaction_force, 3 * EI * D / (L * L * L), 1e-10);
}

// ---------------------------------------------------------------------------
// Couples, hinges, unsupported nodes.

// Simply supported beam with a clockwise couple C at its left end: end
// rotations CL/(3EI) (near end) and CL/(6EI) (far end). Hicks, "Civil
// Engineering Formulas", ch. 2, and W. C. Young, "Roark's Formulas for
// Stress and Strain", McGraw-Hill, 7th ed., Table 8.1 (from memory). As a
// node couple and as a span couple at local 0: the same beam.
TEST(ThreeMomentCouple, EndCoupleOnSimpleSpan) {
  const double L = 6, C = 10, EI = 200;
  for (int on_node = 0; on_node < 2; ++on_node) {
    Beam b = make_beam<double>({L}, {ST::Pinned, ST::Roller}, EI);
    if (on_node) add_node_couple(b, 0, C);
    else add_couple(b, 0, C, 0.0);
    const Solution s = run(b);
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    if (on_node) { check_laws(b, s, 1e-9); }
    EXPECT_NEAR(s.nodes[0].rotation_right, C * L / (3 * EI), 1e-12);
    EXPECT_NEAR(s.nodes[1].rotation_left, -C * L / (6 * EI), 1e-12);
    EXPECT_NEAR(*s.nodes[0].moment_right, C, 1e-12);
    EXPECT_NEAR(s.nodes[0].reaction_force, -C / L, 1e-12);
    EXPECT_NEAR(s.nodes[1].reaction_force, C / L, 1e-12);
  }
}

// A clockwise couple C at midspan of a simple span, applied at an
// unsupported node between two equal-EI spans (merged into one span):
// reactions -C/L, +C/L; the moment jumps from -C/2 to +C/2 (Roark's
// Formulas, 7th ed., Table 8.1, concentrated moment, from memory);
// deflection zero at midspan (antisymmetry).
TEST(ThreeMomentCouple, CoupleAtUnsupportedMidNode) {
  const double h = 3, C = 8, EI = 50;
  Beam b = make_beam<double>({h, h}, {ST::Pinned, ST::Free, ST::Roller}, EI);
  add_node_couple(b, 1, C);
  const Solution s = run(b);
  check_laws(b, s, 1e-9);
  EXPECT_NEAR(s.nodes[0].reaction_force, -C / (2 * h), 1e-12);
  EXPECT_NEAR(s.nodes[2].reaction_force, C / (2 * h), 1e-12);
  EXPECT_NEAR(*s.nodes[1].moment_left, -C / 2, 1e-12);
  EXPECT_NEAR(*s.nodes[1].moment_right, C / 2, 1e-12);
  EXPECT_NEAR(s.nodes[1].deflection, 0.0, 1e-14);
}

// A couple at an interior support: the jump rule and the general laws on a
// three-span beam, fixed at one end, with an overhang.
TEST(ThreeMomentCouple, CoupleAtInteriorSupport) {
  Beam b = make_beam<double>({4, 5, 3, 1.5}, {ST::Fixed, ST::Pinned, ST::Roller, ST::Roller, ST::Free}, 80.0);
  add_node_couple(b, 1, 12.0);
  add_node_couple(b, 2, -5.0);
  add_udl(b, 1, 2.0);
  add_node_point(b, 4, 3.0);
  const Solution s = run(b);
  check_laws(b, s, 1e-9);
  EXPECT_NEAR(*s.nodes[1].moment_right - *s.nodes[1].moment_left, 12.0, 1e-12);
  EXPECT_NEAR(*s.nodes[2].moment_right - *s.nodes[2].moment_left, -5.0, 1e-12);
  EXPECT_NEAR(*s.nodes[3].moment_right, -3.0 * 1.5, 1e-12);  // overhang statics
}

// Point load at an unsupported interior node of a simple span (two equal-EI
// spans merged): PL/4 and PL^3/(48EI) there (Hicks, ch. 2, from memory).
TEST(ThreeMomentUnsupportedNode, PointAtMergedNode) {
  const double h = 2.5, P = 6, EI = 120, L = 2 * h;
  Beam b = make_beam<double>({h, h}, {ST::Pinned, ST::Free, ST::Roller}, EI);
  add_node_point(b, 1, P);
  const Solution s = run(b);
  check_laws(b, s, 1e-9);
  EXPECT_NEAR(*s.nodes[1].moment_left, P * L / 4, 1e-12);
  EXPECT_NEAR(s.nodes[1].deflection, P * L * L * L / (48 * EI), 1e-12);
  EXPECT_NEAR(s.at(0, h, false).shear, P / 2, 1e-12);
  EXPECT_NEAR(s.at(1, 0.0, false).shear, -P / 2, 1e-12);
  EXPECT_NEAR(s.nodes[1].reaction_force, 0.0, 0.0);
}

// A hinge at the middle support of two spans makes two simple spans:
// M_B = 0, midspan wL^2/8 and 5wL^4/(384EI), end rotations +-wL^3/(24EI)
// either side of the hinge (Hicks, ch. 2, from memory).
TEST(ThreeMomentHinge, HingeAtInteriorSupport) {
  const double L = 5, w = 4, EI = 600;
  Beam b = make_beam<double>({L, L}, {ST::Pinned, ST::Roller, ST::Roller}, EI);
  b.supports[1].hinge = true;
  add_udl(b, 0, w);
  add_udl(b, 1, w);
  const Solution s = run(b);
  check_laws(b, s, 1e-9);
  EXPECT_NEAR(*s.nodes[1].moment_left, 0.0, 1e-12);
  EXPECT_NEAR(s.at(1, L / 2, false).moment, w * L * L / 8, 1e-11);
  EXPECT_NEAR(s.at(0, L / 2, false).deflection, 5 * w * L * L * L * L / (384 * EI), 1e-12);
  EXPECT_NEAR(s.nodes[1].rotation_left, -w * L * L * L / (24 * EI), 1e-12);
  EXPECT_NEAR(s.nodes[1].rotation_right, w * L * L * L / (24 * EI), 1e-12);
}

// ---------------------------------------------------------------------------
// General laws on a mixed beam: fixed end, fixed interior support, varying
// EI, an unsupported node, a settlement and an overhang.

Beam mixed_beam() {
  Beam b = make_beam<double>({4, 2, 3, 6, 5, 2}, {ST::Fixed, ST::Roller, ST::Free, ST::Pinned, ST::Fixed,
                                                   ST::Roller, ST::Free});
  const double EI[] = {300, 500, 500, 250, 800, 400};
  for (int i = 0; i < 6; ++i) b.spans[i].EI = EI[i];
  b.supports[3].settlement = 0.004;
  return b;
}

// Superposition (linearity): a full uniform load equals two partial uniform
// loads side by side, and equals a "linear" load with w1 = w2.
TEST(ThreeMomentLaws, SuperpositionOfPartialLoads) {
  Beam full = mixed_beam(), split = mixed_beam(), lin = mixed_beam();
  full.supports[3].settlement = split.supports[3].settlement = lin.supports[3].settlement = 0;
  add_udl(full, 3, 2.0);
  split.loads.push_back(span_udl<double>(3, 2.0, 0.0, 2.2));
  split.loads.push_back(span_udl<double>(3, 2.0, 2.2, 6.0));
  add_linear(lin, 3, 2.0, 2.0, 0.0, 6.0);
  const Solution a = run(full), b = run(split), c = run(lin);
  check_laws(full, a, 1e-9);
  check_laws(split, b, 1e-9);
  for (std::size_t i = 0; i < a.nodes.size(); ++i) {
    EXPECT_NEAR(a.nodes[i].reaction_force, b.nodes[i].reaction_force, 1e-10);
    EXPECT_NEAR(a.nodes[i].reaction_moment, b.nodes[i].reaction_moment, 1e-10);
    EXPECT_NEAR(a.nodes[i].deflection, b.nodes[i].deflection, 1e-12);
    EXPECT_NEAR(a.nodes[i].reaction_force, c.nodes[i].reaction_force, 1e-10);
  }
  for (double x : {0.5, 2.2, 4.9}) {
    EXPECT_NEAR(a.at(3, x, false).moment, b.at(3, x, false).moment, 1e-10);
    EXPECT_NEAR(a.at(3, x, false).deflection, b.at(3, x, false).deflection, 1e-12);
  }
}

// Maxwell-Betti reciprocity: the deflection at j due to a unit load at i
// equals the deflection at i due to a unit load at j.
TEST(ThreeMomentLaws, MaxwellBettiReciprocity) {
  struct Pt { std::size_t span; double x; };
  const Pt pts[] = {{0, 1.5}, {1, 0.7}, {2, 1.2}, {3, 4.1}, {4, 2.5}, {5, 1.3}};
  std::vector<Solution> sol;
  for (const Pt& p : pts) {
    Beam b = mixed_beam();
    b.supports[3].settlement = 0;
    add_point(b, p.span, 1.0, p.x);
    sol.push_back(run(b));
    check_laws(b, sol.back(), 1e-9);
  }
  for (std::size_t i = 0; i < sol.size(); ++i)
    for (std::size_t j = i + 1; j < sol.size(); ++j) {
      const double dij = sol[i].at(pts[j].span, pts[j].x, false).deflection;
      const double dji = sol[j].at(pts[i].span, pts[i].x, false).deflection;
      EXPECT_NEAR(dij, dji, 1e-14 + 1e-10 * std::fabs(dij)) << i << " " << j;
    }
}

// All load types at once, with a settlement: equilibrium and compatibility.
TEST(ThreeMomentLaws, AllLoadTypesWithSettlement) {
  Beam b = mixed_beam();
  add_point(b, 0, 5.0, 1.0);
  b.loads.push_back(span_udl<double>(1, 3.0, 0.5, 1.5));
  add_linear(b, 3, 1.0, 4.0, 1.0, 5.5);
  add_couple(b, 4, 7.0, 2.0);
  add_node_point(b, 2, 2.0);   // on the unsupported node
  add_node_couple(b, 2, -3.0);
  add_node_point(b, 6, 1.5);   // at the free end
  add_node_couple(b, 5, 4.0);
  const Solution s = run(b);
  check_laws(b, s, 1e-9);
  // The unsupported node C (index 2) lies inside a merged span: the shear
  // there jumps by -P and the moment by +C (beam.h jump rules).
  EXPECT_NEAR(s.at(1, 2.0, false).shear - s.at(2, 0.0, false).shear, 2.0, 1e-10);
  EXPECT_NEAR(s.at(2, 0.0, false).moment - s.at(1, 2.0, false).moment, -3.0, 1e-10);
  // Interior point loads: shear jumps by -P across, moment continuous.
  EXPECT_NEAR(s.at(0, 1.0, false).shear - s.at(0, 1.0, true).shear, 5.0, 1e-10);
  EXPECT_NEAR(s.at(0, 1.0, false).moment, s.at(0, 1.0, true).moment, 1e-10);
  EXPECT_NEAR(s.at(4, 2.0, true).moment - s.at(4, 2.0, false).moment, 7.0, 1e-10);
}

// Exact arithmetic on the mixed beam: the support deflections come out as
// the settlements exactly and rotation is exactly continuous (compatibility
// holds exactly, not to rounding).
TEST(ThreeMomentLaws, ExactCompatibility) {
  BasicBeam<Exact> b = beam_cast<Exact>(mixed_beam());
  b.supports[3].settlement = Exact(1) / 250;
  add_point<Exact>(b, 0, Exact(5), Exact(1));
  add_linear<Exact>(b, 3, Exact(1), Exact(4), Exact(1), Exact(11) / 2);
  add_couple<Exact>(b, 4, Exact(7), Exact(2));
  add_node_point<Exact>(b, 6, Exact(3) / 2);
  const BasicSolution<Exact> s = run(b);
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  EXPECT_EQ(s.at(3, Exact(0), false).deflection, Exact(1) / 250);
  EXPECT_EQ(s.at(2, Exact(3), false).deflection, Exact(1) / 250);
  EXPECT_EQ(s.at(4, Exact(0), false).rotation, Exact(0));
  EXPECT_EQ(s.at(3, Exact(6), false).rotation, Exact(0));
  EXPECT_EQ(s.at(0, Exact(4), false).rotation, s.at(1, Exact(0), false).rotation);
  EXPECT_EQ(s.at(4, Exact(5), false).rotation, s.at(5, Exact(0), false).rotation);
  EXPECT_EQ(s.at(4, Exact(5), false).deflection, Exact(0));
  Exact F(0);
  for (const auto& nr : s.nodes) F += nr.reaction_force;
  EXPECT_EQ(F, Exact(5) + (Exact(1) + Exact(4)) / 2 * (Exact(11) / 2 - Exact(1)) + Exact(3) / 2);
}

// ---------------------------------------------------------------------------
// Scope.

// ---------------------------------------------------------------------------
// Springs, guided supports, unsupported nodes of different EI: closed forms
// derived here (each derivation beside its test), checked on every number
// type, with the general laws (check_laws) on the double solutions.

// A cantilever built in at A, propped at its tip B by a vertical spring k,
// uniform load w. Closed form derived here: cut the spring; the tip of the
// cantilever deflects w L^4/(8EI) under the load and R L^3/(3EI) upward
// under the spring force R (Hicks, ch. 2, cantilever formulas, from
// memory), and the spring shortens by R/k:
//   w L^4/(8EI) - R L^3/(3EI) = R/k  =>  R = (3wL/8) / (1 + 3EI/(k L^3)).
// Statics: R_A = w L - R; the moment at A is R L - w L^2/2 (hogging), so the
// reaction couple (counter-clockwise +) is w L^2/2 - R L; tip deflection R/k.
// Limits: k -> infinity gives the propped cantilever (R = 3wL/8, Hicks,
// ch. 2, from memory); k -> 0 the plain cantilever (R = 0).
template <class R>
BasicBeam<R> spring_propped(const R& L, const R& EI, const R& w, const R& k) {
  BasicBeam<R> b = make_beam<R>({L}, {ST::Fixed, ST::Spring}, EI);
  b.supports[1].k = k;
  add_udl(b, 0, w);
  return b;
}
TEST(ThreeMomentSpring, CantileverProppedBySpring) {
  const double L = 4, EI = 2e4, w = 6;
  for (double ratio : {0.3, 3.0, 30.0}) {  // k L^3 / (3 EI)
    const double k = ratio * 3 * EI / (L * L * L);
    const Beam b = spring_propped(L, EI, w, k);
    const Solution s = run(b);
    check_laws(b, s, 1e-9);
    const double R = (3 * w * L / 8) / (1 + 3 * EI / (k * L * L * L));
    EXPECT_NEAR(s.nodes[1].reaction_force, R, 1e-12 * w * L) << ratio;
    EXPECT_NEAR(s.nodes[0].reaction_force, w * L - R, 1e-12 * w * L) << ratio;
    EXPECT_NEAR(s.nodes[0].reaction_moment, w * L * L / 2 - R * L, 1e-12 * w * L * L) << ratio;
    EXPECT_NEAR(*s.nodes[0].moment_right, R * L - w * L * L / 2, 1e-12 * w * L * L) << ratio;
    EXPECT_NEAR(s.nodes[1].deflection, R / k, 1e-12 * w * L * L * L * L / EI) << ratio;
  }
  // The limits.
  const Solution stiff = run(spring_propped(L, EI, w, 1e12 * EI / (L * L * L)));
  ASSERT_EQ(stiff.status, MethodStatus::Ok) << stiff.reason;
  EXPECT_NEAR(stiff.nodes[1].reaction_force, 3 * w * L / 8, 1e-9 * w * L);
  EXPECT_NEAR(*stiff.nodes[0].moment_right, -w * L * L / 8, 1e-9 * w * L * L);
  const Solution soft = run(spring_propped(L, EI, w, 1e-12 * EI / (L * L * L)));
  ASSERT_EQ(soft.status, MethodStatus::Ok) << soft.reason;
  EXPECT_NEAR(soft.nodes[1].reaction_force, 0.0, 1e-9 * w * L);
  EXPECT_NEAR(*soft.nodes[0].moment_right, -w * L * L / 2, 1e-9 * w * L * L);
  EXPECT_NEAR(soft.at(0, L, false).deflection, w * L * L * L * L / (8 * EI), 1e-9 * w * L * L * L * L / EI);
}
TEST(ThreeMomentSpring, CantileverProppedBySpringExact) {
  const Exact L(4), EI(20000), w(6), k = Exact(1875) / 2;
  const BasicSolution<Exact> s = run(spring_propped(L, EI, w, k));
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  const Exact R = (Exact(3) * w * L / 8) / (1 + Exact(3) * EI / (k * L * L * L));
  EXPECT_EQ(s.nodes[1].reaction_force, R);
  EXPECT_EQ(s.nodes[1].deflection, R / k);
  EXPECT_EQ(s.nodes[0].reaction_moment, w * L * L / 2 - R * L);
  const BasicSolution<Extended> e = run(spring_propped(Extended(4), Extended(20000), Extended(6), Extended(937.5)));
  ASSERT_EQ(e.status, MethodStatus::Ok) << e.reason;
  EXPECT_LT(abs(e.nodes[1].reaction_force - static_cast<Extended>(R)), Extended(1e-40));
}

// Two equal spans, pinned ends, a vertical spring k under the middle node,
// uniform load w on both. Closed form derived here: without the spring the
// simple span 2L deflects 5 w (2L)^4/(384 EI) = 5 w L^4/(24 EI) at its
// middle, and R (2L)^3/(48 EI) = R L^3/(6 EI) upward under a middle force R
// (Hicks, ch. 2, simple beam formulas, from memory); the spring shortens by
// R/k:  5 w L^4/(24 EI) - R L^3/(6 EI) = R/k, so
//   R = (5wL/4) / (1 + 6 EI/(k L^3)),  end reactions (2wL - R)/2,
//   moment over the spring  M_B = w L^2/2 - R L/2  (statics of the half),
// and k -> infinity gives the two-span beam (R = 5wL/4, M_B = -wL^2/8).
// A settlement s of the spring's base adds k s to the spring's share: the
// same compatibility with R/k + s on the right.
TEST(ThreeMomentSpring, TwoSpansOnACentralSpring) {
  const double L = 5, EI = 3e4, w = 4;
  for (double ratio : {0.5, 2.0, 50.0}) {  // k L^3 / (6 EI)
    for (double settle : {0.0, 0.002}) {
      const double k = ratio * 6 * EI / (L * L * L);
      Beam b = make_beam<double>({L, L}, {ST::Pinned, ST::Spring, ST::Roller}, EI);
      b.supports[1].k = k;
      b.supports[1].settlement = settle;
      add_udl(b, 0, w);
      add_udl(b, 1, w);
      const Solution s = run(b);
      check_laws(b, s, 1e-9);
      // 5wL^4/(24EI) - R L^3/(6EI) = R/k + settle.
      const double R = (5 * w * L * L * L * L / (24 * EI) - settle) / (1 / k + L * L * L / (6 * EI));
      EXPECT_NEAR(s.nodes[1].reaction_force, R, 1e-12 * w * L) << ratio;
      EXPECT_NEAR(s.nodes[0].reaction_force, (2 * w * L - R) / 2, 1e-12 * w * L) << ratio;
      EXPECT_NEAR(*s.nodes[1].moment_left, w * L * L / 2 - R * L / 2, 1e-12 * w * L * L) << ratio;
      EXPECT_NEAR(s.nodes[1].deflection, R / k + settle, 1e-12 * w * L * L * L * L / EI) << ratio;
    }
  }
}

// A beam built in at one end and guided at the other (no rotation, free to
// deflect), uniform load w. Closed form derived here: the guided end has
// zero slope and zero shear, which is the middle of a fixed-fixed beam of
// twice the span under the same load, so the moments are those of the
// fixed-fixed beam of span 2L (Hicks, ch. 2, from memory):
//   M_fixed = -w (2L)^2/12 = -w L^2/3,  M_guided = w (2L)^2/24 = w L^2/6,
//   deflection of the guided end w (2L)^4/(384 EI) = w L^4/(24 EI),
//   reaction w L at the fixed end, none at the guided end.
// Both orientations.
TEST(ThreeMomentGuided, FixedGuidedUniform) {
  const double L = 3, EI = 1e4, w = 12;
  for (int flip = 0; flip < 2; ++flip) {
    Beam b = make_beam<double>({L}, flip ? std::vector<ST>{ST::Guided, ST::Fixed} : std::vector<ST>{ST::Fixed, ST::Guided}, EI);
    add_udl(b, 0, w);
    const Solution s = run(b);
    check_laws(b, s, 1e-9);
    const std::size_t f = flip ? 1 : 0, g = 1 - f;
    const double Mf = flip ? *s.nodes[f].moment_left : *s.nodes[f].moment_right;
    const double Mg = flip ? *s.nodes[g].moment_right : *s.nodes[g].moment_left;
    EXPECT_NEAR(Mf, -w * L * L / 3, 1e-12 * w * L * L) << flip;
    EXPECT_NEAR(Mg, w * L * L / 6, 1e-12 * w * L * L) << flip;
    EXPECT_NEAR(s.nodes[g].deflection, w * L * L * L * L / (24 * EI), 1e-12 * w * L * L * L * L / EI) << flip;
    EXPECT_NEAR(s.nodes[f].reaction_force, w * L, 1e-12 * w * L) << flip;
    EXPECT_NEAR(s.nodes[g].reaction_force, 0.0, 0.0) << flip;
    EXPECT_NEAR(s.at(0, L / 2, false).moment, -w * L * L / 3 + w * L * L / 2 - w * L * L / 8, 1e-12 * w * L * L);
  }
  // Exact arithmetic: the fractions themselves.
  BasicBeam<Exact> e = make_beam<Exact>({Exact(3)}, {ST::Fixed, ST::Guided}, Exact(10000));
  add_udl(e, 0, Exact(12));
  const BasicSolution<Exact> s = run(e);
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  EXPECT_EQ(*s.nodes[0].moment_right, Exact(-36));
  EXPECT_EQ(*s.nodes[1].moment_left, Exact(18));
  EXPECT_EQ(s.nodes[1].deflection, Exact(12 * 81) / Exact(24 * 10000));
  EXPECT_EQ(s.nodes[1].reaction_moment, Exact(18));
}

// A cantilever of two segments of different EI, built in at A, an
// unsupported node B where the section changes, tip load P at C. Closed
// form derived here by the moment-area method: M(x) = -P (L - x), so the
// tip deflection is the first moment of M/EI about the tip,
//   v_C = P (L^3 - b^3)/(3 EI1) + P b^3/(3 EI2),   L = a + b,
// the tip rotation its area, P (L^2 - b^2)/(2 EI1) + P b^2/(2 EI2), and the
// deflection at B, P a^2 (3L - a)/(6 EI1).
TEST(ThreeMomentUnsupportedNode, CantileverWithAStepInEI) {
  const double a = 2, b2 = 3, L = a + b2, EI1 = 4e4, EI2 = 1.5e4, P = 9;
  Beam b = make_beam<double>({a, b2}, {ST::Fixed, ST::Free, ST::Free});
  b.spans[0].EI = EI1;
  b.spans[1].EI = EI2;
  add_node_point(b, 2, P);
  const Solution s = run(b);
  check_laws(b, s, 1e-9);
  const double vC = P * (L * L * L - b2 * b2 * b2) / (3 * EI1) + P * b2 * b2 * b2 / (3 * EI2);
  const double tC = P * (L * L - b2 * b2) / (2 * EI1) + P * b2 * b2 / (2 * EI2);
  EXPECT_NEAR(s.nodes[2].deflection, vC, 1e-12 * vC);
  EXPECT_NEAR(s.nodes[2].rotation_left, tC, 1e-12 * tC);
  EXPECT_NEAR(s.nodes[1].deflection, P * a * a * (3 * L - a) / (6 * EI1), 1e-12 * vC);
  EXPECT_NEAR(s.nodes[0].reaction_moment, P * L, 1e-12 * P * L);
  EXPECT_NEAR(s.nodes[0].reaction_force, P, 1e-12 * P);
  // Exact arithmetic.
  BasicBeam<Exact> e = make_beam<Exact>({Exact(2), Exact(3)}, {ST::Fixed, ST::Free, ST::Free});
  e.spans[0].EI = Exact(40000);
  e.spans[1].EI = Exact(15000);
  add_node_point(e, 2, Exact(9));
  const BasicSolution<Exact> x = run(e);
  ASSERT_EQ(x.status, MethodStatus::Ok) << x.reason;
  EXPECT_EQ(x.nodes[2].deflection, Exact(9) * (Exact(125) - 27) / (3 * Exact(40000)) + Exact(9 * 27) / (3 * Exact(15000)));
}

// One span, pinned at B, and at A a spring of vertical stiffness k and
// rotational stiffness kr, uniform load w. Closed form derived here from
// the relations of three_moment.cpp: with theta the rotation at A, the
// moment at A is M_A = -kr theta (the spring's couple), the chord turns by
// -v_A/L, and
//   theta = -v_A/L + w L^3/(24 EI) + M_A L/(3 EI),
//   R_A = w L/2 - M_A/L = k v_A.
// Eliminating M_A and v_A:
//   theta = (w L^3/(24 EI) - w/(2k)) / (1 + kr L/(3 EI) + kr/(k L^2)).
// Limits: kr -> 0 a simple span on a spring (theta = w L^3/(24EI) - w/(2k),
// M_A = 0); kr and k -> infinity the propped cantilever (M_A = -w L^2/8,
// Hicks, ch. 2, from memory).
TEST(ThreeMomentSpring, RotationalSpringAtAnEnd) {
  const double L = 6, EI = 5e4, w = 7;
  auto beam = [&](double k, double kr) {
    Beam b = make_beam<double>({L}, {ST::Spring, ST::Pinned}, EI);
    b.supports[0].k = k;
    b.supports[0].kr = kr;
    add_udl(b, 0, w);
    return b;
  };
  const double k = 2 * EI / (L * L * L);
  for (double rk : {0.2, 1.0, 8.0}) {  // kr L / EI
    const double kr = rk * EI / L;
    const Beam b = beam(k, kr);
    const Solution s = run(b);
    check_laws(b, s, 1e-9);
    const double th = (w * L * L * L / (24 * EI) - w / (2 * k)) / (1 + kr * L / (3 * EI) + kr / (k * L * L));
    EXPECT_NEAR(s.nodes[0].rotation_right, th, 1e-12 * std::abs(th)) << rk;
    EXPECT_NEAR(*s.nodes[0].moment_right, -kr * th, 1e-12 * w * L * L) << rk;
    EXPECT_NEAR(s.nodes[0].reaction_moment, kr * th, 1e-12 * w * L * L) << rk;
    EXPECT_NEAR(s.nodes[0].reaction_force, w * L / 2 + kr * th / L, 1e-12 * w * L) << rk;
    EXPECT_NEAR(s.nodes[0].deflection, (w * L / 2 + kr * th / L) / k, 1e-12 * w * L * L * L * L / EI) << rk;
  }
  const Solution loose = run(beam(k, 1e-9 * EI / L));
  ASSERT_EQ(loose.status, MethodStatus::Ok) << loose.reason;
  EXPECT_NEAR(loose.nodes[0].rotation_right, w * L * L * L / (24 * EI) - w / (2 * k), 1e-9 * w * L * L * L / EI);
  EXPECT_NEAR(*loose.nodes[0].moment_right, 0.0, 1e-9 * w * L * L);
  const Solution stiff = run(beam(1e12 * EI / (L * L * L), 1e12 * EI / L));
  ASSERT_EQ(stiff.status, MethodStatus::Ok) << stiff.reason;
  EXPECT_NEAR(*stiff.nodes[0].moment_right, -w * L * L / 8, 1e-9 * w * L * L);
  EXPECT_NEAR(stiff.nodes[0].rotation_right, 0.0, 1e-9 * w * L * L * L / EI);
}

// What stays out of scope: a hinge where the rotation is restrained (the
// reader refuses it; the method names it if it comes anyway), and a couple
// on a hinge.
TEST(ThreeMomentScope, NotApplicable) {
  {
    Beam b = make_beam<double>({3, 3}, {ST::Pinned, ST::Fixed, ST::Roller});
    b.supports[1].hinge = true;
    const Solution s = run(b);
    EXPECT_EQ(s.status, MethodStatus::NotApplicable);
    EXPECT_NE(s.reason.find("hinge at fixed support node B"), std::string::npos) << s.reason;
  }
  {
    Beam b = make_beam<double>({3, 3}, {ST::Fixed, ST::Free, ST::Roller});
    b.supports[1].hinge = true;
    add_node_couple(b, 1, 2.0);
    const Solution s = run(b);
    EXPECT_EQ(s.status, MethodStatus::NotApplicable);
    EXPECT_NE(s.reason.find("couple at hinge node B"), std::string::npos) << s.reason;
  }
}

// Internal faults and mechanisms come back as Failed with a reason, never
// as numbers.
TEST(ThreeMomentScope, Failed) {
  {
    Beam b = make_beam<double>({3, 3}, {ST::Pinned, ST::Roller, ST::Roller});
    add_point(b, 0, std::nan(""), 1.0);
    const Solution s = run(b);
    EXPECT_EQ(s.status, MethodStatus::Failed);
    EXPECT_FALSE(s.reason.empty());
  }
  {
    Beam b = make_beam<double>({2, 3}, {ST::Free, ST::Pinned, ST::Free});  // one pin: a mechanism
    add_node_point(b, 0, 1.0);
    const Solution s = run(b);
    EXPECT_EQ(s.status, MethodStatus::Failed);
    EXPECT_NE(s.reason.find("mechanism"), std::string::npos) << s.reason;
  }
}

// ---------------------------------------------------------------------------
// Size: a million equal spans, uniform load, pinned ends. Far from the ends
// every support has zero rotation by symmetry, so an interior span acts as
// fixed-fixed: support moment -wL^2/12 (Hicks, ch. 2, as above, from
// memory); the end effect decays by a factor of about 0.27 per span.
TEST(ThreeMomentSize, MillionSpans) {
  const std::size_t n = 1000000;
  const double L = 2, w = 3;
  Beam b;
  b.spans.assign(n, Span{L, 100.0});
  b.supports.assign(n + 1, Support{});
  b.labels.assign(n + 1, "N");
  b.loads.reserve(n);
  for (std::size_t i = 0; i < n; ++i) add_udl(b, i, w);
  // Speed is measured by the benchmarks, not asserted here.
  const Solution s = tmm::solve(b, {});
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  EXPECT_NEAR(*s.nodes[n / 2].moment_left, -w * L * L / 12, 1e-9);
  EXPECT_NEAR(s.at(n / 2, L / 2, false).moment, w * L * L / 24, 1e-9);
  double F = 0;
  for (const auto& nr : s.nodes) F += nr.reaction_force;
  EXPECT_NEAR(F, w * L * double(n), 1e-6 * w * L * double(n));
}

// ---------------------------------------------------------------------------
// Closed forms derived in our own words (the same beams are reference cases
// of `trivet selfcheck`, in references/cases/).

// A span built in at A with an overhang past its roller B, UDL w throughout
// (derived): the overhang's statics give M_B = -w a^2/2; the three-moment
// equation with the fixed end as an added span of zero length,
// 2 M_A L + M_B L = -w L^3/4, gives M_A = -w L^2/8 + w a^2/4.
TEST(ThreeMomentPublished, FixedEndAndOverhangDerived) {
  const double L = 6, a = 1.5, w = 10;
  Beam b = make_beam<double>({L, a}, {ST::Fixed, ST::Roller, ST::Free}, 30000.0);
  add_udl(b, 0, w);
  add_udl(b, 1, w);
  const Solution s = run(b);
  check_laws(b, s, 1e-9);
  EXPECT_NEAR(*s.nodes[1].moment_left, -w * a * a / 2, 1e-9 * w * L * L);
  EXPECT_NEAR(*s.nodes[0].moment_right, -w * L * L / 8 + w * a * a / 4, 1e-9 * w * L * L);
}

// Two unequal spans with a central point load on each (derived): for a
// central load on a simple span 6 A a/L = 3 P L^2/8, so
// M_B = -3 (P1 L1^2 + P2 L2^2) / (16 (L1 + L2)), and R_A = P1/2 + M_B/L1.
TEST(ThreeMomentPublished, UnequalSpansCentralPointsDerived) {
  const double L1 = 5, L2 = 7, P1 = 30, P2 = 20;
  Beam b = make_beam<double>({L1, L2}, {ST::Pinned, ST::Roller, ST::Roller}, 40000.0);
  add_point(b, 0, P1, L1 / 2);
  add_point(b, 1, P2, L2 / 2);
  const Solution s = run(b);
  check_laws(b, s, 1e-9);
  const double MB = -3 * (P1 * L1 * L1 + P2 * L2 * L2) / (16 * (L1 + L2));
  EXPECT_NEAR(*s.nodes[1].moment_left, MB, 1e-9 * std::abs(MB));
  EXPECT_NEAR(s.nodes[0].reaction_force, P1 / 2 + MB / L1, 1e-9 * P1);
}

}  // namespace

// ---------------------------------------------------------------------------
// The fast path (pinned/roller supports, no hinge, no node load, span loads
// in span order; methods/three_moment/fast_path.h) against the tridiagonal
// path on the same beams, reached through the test-only seam
// three_moment::detail::solve_general, which never takes the fast path. Every span load type (full and partial UDL, linear,
// point, couple inside and at a span end), settlements, varying EI. The two
// use the same load terms and formulas; they agree to 1e-13 relative (not
// bit for bit).
namespace {

Beam random_plain_beam(std::mt19937& rng) {
  std::uniform_real_distribution<double> U(0.0, 1.0);
  std::uniform_int_distribution<int> N(1, 12), K(0, 3), T(0, 5);
  const std::size_t n = static_cast<std::size_t>(N(rng));
  Beam b;
  for (std::size_t i = 0; i < n; ++i) b.spans.push_back({1.0 + 9.0 * U(rng), 1e3 * (0.5 + 4.0 * U(rng))});
  for (std::size_t i = 0; i <= n; ++i) {
    Support s;
    s.type = U(rng) < 0.5 ? ST::Pinned : ST::Roller;
    if (U(rng) < 0.3) s.settlement = 0.01 * (U(rng) - 0.5);
    b.supports.push_back(s);
    b.labels.push_back("N" + std::to_string(i));
  }
  for (std::size_t i = 0; i < n; ++i) {
    const double L = b.spans[i].length;
    const int k = K(rng);
    for (int j = 0; j < k; ++j) {
      const double a = L * U(rng), c = L * U(rng);
      const double lo = std::min(a, c), hi = std::max(a, c) + 1e-3 * L;
      switch (T(rng)) {
        case 0: add_udl(b, i, 20.0 * (U(rng) - 0.3)); break;
        case 1: b.loads.push_back(span_udl(i, 15.0 * U(rng), lo, std::min(hi, L))); break;
        case 2: add_linear(b, i, 10.0 * U(rng), -5.0 + 20.0 * U(rng), lo, std::min(hi, L)); break;
        case 3: add_point(b, i, 50.0 * (U(rng) - 0.2), L * (0.05 + 0.9 * U(rng))); break;
        case 4: add_couple(b, i, 40.0 * (U(rng) - 0.5), L * (0.05 + 0.9 * U(rng))); break;
        default: add_couple(b, i, 30.0 * (U(rng) - 0.5), U(rng) < 0.5 ? 0.0 : L); break;
      }
    }
  }
  return b;
}

void expect_rel(double a, double b, double scale, const std::string& what) {
  EXPECT_LE(std::fabs(a - b), 1e-13 * (std::fabs(a) + std::fabs(b) + scale)) << what << ": " << a << " vs " << b;
}

}  // namespace

TEST(ThreeMomentFastPath, SameAsGeneralPathOnRandomBeams) {
  std::mt19937 rng(20261202);
  for (int trial = 0; trial < 400; ++trial) {
    const Beam b = random_plain_beam(rng);
    const std::vector<Station> stations = build_stations(b, 4);
    // detail::solve_general never takes the fast path (test-only seam).
    const Solution fast = tmm::solve(b, stations), slow = tmm::detail::solve_general(b, stations);
    ASSERT_EQ(fast.status, MethodStatus::Ok) << fast.reason;
    ASSERT_EQ(slow.status, MethodStatus::Ok) << slow.reason;
    ASSERT_EQ(fast.nodes.size(), slow.nodes.size());
    // Scales: a small absolute floor per quantity, so exact zeros compare.
    double Ms = 0, Fs = 0, rs = 0, vs = 0;
    for (const auto& nr : slow.nodes) {
      Ms = std::max({Ms, std::fabs(nr.moment_left.value_or(0)), std::fabs(nr.moment_right.value_or(0))});
      Fs = std::max(Fs, std::fabs(nr.reaction_force));
      rs = std::max({rs, std::fabs(nr.rotation_left), std::fabs(nr.rotation_right)});
      vs = std::max(vs, std::fabs(nr.deflection));
    }
    Ms *= 1e-3; Fs *= 1e-3; rs *= 1e-3; vs *= 1e-3;
    const std::string t = "trial " + std::to_string(trial);
    for (std::size_t i = 0; i < fast.nodes.size(); ++i) {
      const auto &p = fast.nodes[i], &q = slow.nodes[i];
      const std::string w = t + " node " + std::to_string(i);
      EXPECT_EQ(p.x, q.x) << w;
      ASSERT_EQ(p.moment_left.has_value(), q.moment_left.has_value()) << w;
      ASSERT_EQ(p.moment_right.has_value(), q.moment_right.has_value()) << w;
      if (p.moment_left) expect_rel(*p.moment_left, *q.moment_left, Ms, w + " moment_left");
      if (p.moment_right) expect_rel(*p.moment_right, *q.moment_right, Ms, w + " moment_right");
      expect_rel(p.reaction_force, q.reaction_force, Fs, w + " reaction");
      expect_rel(p.reaction_moment, q.reaction_moment, Ms, w + " reaction moment");
      expect_rel(p.rotation_left, q.rotation_left, rs, w + " rotation_left");
      expect_rel(p.rotation_right, q.rotation_right, rs, w + " rotation_right");
      expect_rel(p.deflection, q.deflection, vs, w + " deflection");
    }
    double Vs = 0;
    for (const auto& sn : stations) Vs = std::max(Vs, std::fabs(slow.at(sn.span, sn.local, sn.after).shear));
    Vs *= 1e-3;
    for (const auto& sn : stations) {
      const PointValues p = fast.at(sn.span, sn.local, sn.after), q = slow.at(sn.span, sn.local, sn.after);
      const std::string w = t + " span " + std::to_string(sn.span) + " at " + std::to_string(sn.local);
      expect_rel(p.shear, q.shear, Vs, w + " shear");
      expect_rel(p.moment, q.moment, Ms, w + " moment");
      expect_rel(p.rotation, q.rotation, rs, w + " rotation");
      expect_rel(p.deflection, q.deflection, vs, w + " deflection");
    }
  }
}

// The fast path refuses what it does not cover; another path's answer
// (and reason) stands: out-of-order span loads, a fixed end, a hinge.
TEST(ThreeMomentFastPath, OutOfScopeFallsBack) {
  Beam b = make_beam<double>({4.0, 5.0, 3.0}, {ST::Pinned, ST::Roller, ST::Roller, ST::Roller}, 2e3);
  add_udl(b, 2, 3.0);
  add_point(b, 0, 7.0, 1.5);
  add_udl(b, 1, 2.0);
  Beam sorted = make_beam<double>({4.0, 5.0, 3.0}, {ST::Pinned, ST::Roller, ST::Roller, ST::Roller}, 2e3);
  add_point(sorted, 0, 7.0, 1.5);
  add_udl(sorted, 1, 2.0);
  add_udl(sorted, 2, 3.0);
  const Solution a = run(b), c = run(sorted);
  ASSERT_EQ(a.status, MethodStatus::Ok) << a.reason;
  ASSERT_EQ(c.status, MethodStatus::Ok) << c.reason;
  for (std::size_t i = 0; i < a.nodes.size(); ++i) {
    EXPECT_NEAR(a.nodes[i].reaction_force, c.nodes[i].reaction_force, 1e-12);
    EXPECT_NEAR(a.nodes[i].rotation_left, c.nodes[i].rotation_left, 1e-15);
  }
  Beam bad = sorted;
  bad.loads.push_back(span_udl<double>(5, 1.0, 0.0, 1.0));
  EXPECT_EQ(run(bad).status, MethodStatus::Failed);
  Beam far = sorted;
  add_point(far, 1, 1.0, 6.0);  // outside span 2
  const Solution f = run(far);
  EXPECT_EQ(f.status, MethodStatus::Failed);
  EXPECT_NE(f.reason.find("outside span 2"), std::string::npos) << f.reason;
}

// The fast path is the same template on the number type: in exact
// arithmetic it gives exactly the tridiagonal path's numbers.
TEST(ThreeMomentFastPath, SameAsGeneralPathExact) {
  std::mt19937 rng(7);
  for (int trial = 0; trial < 8; ++trial) {
    Beam d = random_plain_beam(rng);
    if (d.spans.size() > 4) {  // keep the rationals small
      d.spans.resize(4);
      d.supports.resize(5);
      d.labels.resize(5);
      std::vector<Load> kept;
      for (const auto& l : d.loads)
        if (l.index < 4) kept.push_back(l);
      d.loads = kept;
    }
    const BasicBeam<Exact> b = beam_cast<Exact>(d);
    BasicBeam<Exact> g = b;
    add_node_point(g, 1, Exact(0));
    const BasicSolution<Exact> fast = tmm::solve(b, {}), slow = tmm::solve(g, {});
    ASSERT_EQ(fast.status, MethodStatus::Ok) << fast.reason;
    ASSERT_EQ(slow.status, MethodStatus::Ok) << slow.reason;
    ASSERT_EQ(fast.nodes.size(), slow.nodes.size());
    for (std::size_t i = 0; i < fast.nodes.size(); ++i) {
      const auto &p = fast.nodes[i], &q = slow.nodes[i];
      EXPECT_TRUE(p.moment_left == q.moment_left && p.moment_right == q.moment_right) << trial << " node " << i;
      EXPECT_TRUE(p.reaction_force == q.reaction_force && p.deflection == q.deflection) << trial << " node " << i;
      EXPECT_TRUE(p.rotation_left == q.rotation_left && p.rotation_right == q.rotation_right) << trial << " node " << i;
    }
    for (std::size_t s = 0; s < b.spans.size(); ++s) {
      const Exact x = b.spans[s].length * Exact(3) / Exact(7);
      const auto p = fast.at(s, x, false), q = slow.at(s, x, false);
      EXPECT_TRUE(p.moment == q.moment && p.shear == q.shear && p.rotation == q.rotation && p.deflection == q.deflection)
          << trial << " span " << s;
    }
  }
}

// ---------------------------------------------------------------------------
// A span with many loads (more than methods/three_moment/span_state.h's
// kIndexFrom = 32) is evaluated through prefix sums of its loads, in
// O(log N) a point. Superposition (a law): the beam under all its loads
// equals the sum of the beam under each load alone (each of those has one
// load, so it is evaluated load by load). On each path: pinned ends (fast
// path), a fixed end (tridiagonal path), a spring (banded path).
namespace {
template <class R>
BasicBeam<R> many_loads_beam(int variant, std::vector<BasicLoad<R>>& loads) {
  BasicBeam<R> b = make_beam<R>({R(6), R(4)},
                                variant == 0   ? std::vector<ST>{ST::Pinned, ST::Roller, ST::Roller}
                                : variant == 1 ? std::vector<ST>{ST::Fixed, ST::Roller, ST::Free}
                                               : std::vector<ST>{ST::Pinned, ST::Spring, ST::Roller},
                                R(20000));
  b.supports[1].k = R(3000);
  b.spans[1].EI = R(30000);
  std::mt19937 rng(11 + variant);
  std::uniform_int_distribution<int> pos(1, 59), kind(0, 3);
  loads.clear();
  for (int i = 0; i < 45; ++i) {
    BasicLoad<R> l;
    l.index = 0;
    const R a = R(pos(rng)) / R(10);
    switch (kind(rng)) {
      case 0: l.type = LoadType::Point; l.P = R(pos(rng)) / R(7); l.at = a; break;
      case 1: l.type = LoadType::Couple; l.C = R(pos(rng) - 30) / R(3); l.at = a; break;
      case 2: l.type = LoadType::Udl; l.w1 = l.w2 = R(pos(rng)) / R(20); l.from = a / R(2); l.to = a; break;
      default:
        l.type = LoadType::Linear; l.w1 = R(pos(rng)) / R(20); l.w2 = R(pos(rng) - 20) / R(20);
        l.from = a / R(3); l.to = a; break;
    }
    loads.push_back(l);
  }
  return b;
}
}  // namespace

TEST(ThreeMomentManyLoads, SuperpositionOfSingleLoads) {
  for (int variant = 0; variant < 3; ++variant) {
    std::vector<Load> loads;
    Beam all = many_loads_beam<double>(variant, loads);
    all.loads = loads;
    const Solution s = run(all);
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    std::vector<Solution> parts;
    for (const auto& l : loads) {
      Beam one = all;
      one.loads = {l};
      parts.push_back(run(one));
      ASSERT_EQ(parts.back().status, MethodStatus::Ok) << parts.back().reason;
    }
    double Ms = 0, Vs = 0, vs = 0, ts = 0;
    const auto stations = build_stations(all, 10);
    for (const auto& sn : stations) {
      const PointValues p = s.at(sn.span, sn.local, sn.after);
      Ms = std::max(Ms, std::fabs(p.moment)); Vs = std::max(Vs, std::fabs(p.shear));
      vs = std::max(vs, std::fabs(p.deflection)); ts = std::max(ts, std::fabs(p.rotation));
    }
    for (const auto& sn : stations) {
      const PointValues p = s.at(sn.span, sn.local, sn.after);
      PointValues q{};
      for (const auto& part : parts) {
        const PointValues r = part.at(sn.span, sn.local, sn.after);
        q.shear += r.shear; q.moment += r.moment; q.deflection += r.deflection; q.rotation += r.rotation;
      }
      EXPECT_NEAR(p.shear, q.shear, 1e-12 * Vs) << variant << " at " << sn.x;
      EXPECT_NEAR(p.moment, q.moment, 1e-12 * Ms) << variant << " at " << sn.x;
      EXPECT_NEAR(p.deflection, q.deflection, 1e-12 * vs) << variant << " at " << sn.x;
      EXPECT_NEAR(p.rotation, q.rotation, 1e-12 * ts) << variant << " at " << sn.x;
    }
  }
}

// The same in exact arithmetic: equal to the last digit.
TEST(ThreeMomentManyLoads, SuperpositionExact) {
  for (int variant = 0; variant < 3; ++variant) {
    std::vector<BasicLoad<Exact>> loads;
    BasicBeam<Exact> all = many_loads_beam<Exact>(variant, loads);
    all.loads = loads;
    const BasicSolution<Exact> s = run(all);
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    std::vector<BasicSolution<Exact>> parts;
    for (const auto& l : loads) {
      BasicBeam<Exact> one = all;
      one.loads = {l};
      parts.push_back(tmm::solve(one, {}));
      ASSERT_EQ(parts.back().status, MethodStatus::Ok) << parts.back().reason;
    }
    for (const auto& sn : build_stations(all, 3)) {
      const BasicPointValues<Exact> p = s.at(sn.span, sn.local, sn.after);
      BasicPointValues<Exact> q{};
      for (const auto& part : parts) {
        const BasicPointValues<Exact> r = part.at(sn.span, sn.local, sn.after);
        q.shear += r.shear; q.moment += r.moment; q.deflection += r.deflection; q.rotation += r.rotation;
      }
      EXPECT_TRUE(p.shear == q.shear && p.moment == q.moment && p.deflection == q.deflection && p.rotation == q.rotation)
          << variant << " at " << static_cast<double>(sn.x);
    }
  }
}
