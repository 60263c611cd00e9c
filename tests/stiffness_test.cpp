// Tests of the direct stiffness method (methods/stiffness).
//
// Published checks cite their source beside them. Two texts are used, both
// from memory (edition details and case numbers as remembered, not looked
// up):
//   [Roark]  W. C. Young, R. G. Budynas, "Roark's Formulas for Stress and
//            Strain", 7th ed., McGraw-Hill, 2002, Table 8.1 (shear, moment,
//            slope and deflection formulas for elastic straight beams).
//   [Hicks]  T. G. Hicks, "Civil Engineering Formulas", McGraw-Hill,
//            chapter 2 (beam formulas), Fig. 2.2 cases and Table 2.1
//            "Uniformly loaded continuous beams over equal spans".
// Other checks are general laws: equilibrium, Maxwell-Betti reciprocity,
// symmetry, compatibility.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <random>
#include <string>
#include <thread>
#include <vector>

#include "methods/beam/beam.h"
#include "methods/beam/numbers.h"
#include "methods/beam/stability.h"
#include "methods/stiffness/stiffness.h"

namespace trivet {
namespace {

using T = SupportType;

template <class R>
BasicBeam<R> make_beam(const std::vector<R>& lengths, const R& EI, const std::vector<T>& types) {
  BasicBeam<R> b;
  for (const R& L : lengths) b.spans.push_back({L, EI});
  for (std::size_t i = 0; i < types.size(); ++i) {
    BasicSupport<R> s;
    s.type = types[i];
    b.supports.push_back(s);
    b.labels.push_back(std::string(1, static_cast<char>('A' + i % 26)));
  }
  return b;
}

template <class R>
BasicLoad<R> span_point(std::size_t span, R at, R P) {
  BasicLoad<R> l; l.type = LoadType::Point; l.index = span; l.at = at; l.P = P; return l;
}
template <class R>
BasicLoad<R> span_couple(std::size_t span, R at, R C) {
  BasicLoad<R> l; l.type = LoadType::Couple; l.index = span; l.at = at; l.C = C; return l;
}
template <class R>
BasicLoad<R> span_udl(std::size_t span, R from, R to, R w) {
  BasicLoad<R> l; l.type = LoadType::Udl; l.index = span; l.from = from; l.to = to; l.w1 = w; l.w2 = w; return l;
}
template <class R>
BasicLoad<R> span_linear(std::size_t span, R from, R to, R w1, R w2) {
  BasicLoad<R> l; l.type = LoadType::Linear; l.index = span; l.from = from; l.to = to; l.w1 = w1; l.w2 = w2; return l;
}
template <class R>
BasicLoad<R> node_point(std::size_t node, R P) {
  BasicLoad<R> l; l.type = LoadType::Point; l.on_node = true; l.index = node; l.P = P; return l;
}
template <class R>
BasicLoad<R> node_couple(std::size_t node, R C) {
  BasicLoad<R> l; l.type = LoadType::Couple; l.on_node = true; l.index = node; l.C = C; return l;
}

Solution solve(const Beam& b, bool with_stations = true) {
  return stiffness::solve(b, with_stations ? build_stations(b, 10) : std::vector<Station>{});
}

// Equilibrium (a general law): the reactions, spring forces included,
// balance the applied loads, and moments about the left end balance.
// `tol` is relative to the sum of |load| (times the beam length, for moments).
void expect_equilibrium(const Beam& b, const Solution& s, double tol = 1e-10) {
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  ASSERT_EQ(s.nodes.size(), b.node_count());
  std::vector<double> node_x(b.node_count(), 0.0);  // prefix sums: O(n)
  for (std::size_t i = 1; i < node_x.size(); ++i) node_x[i] = node_x[i - 1] + b.spans[i - 1].length;
  double load = 0, load_moment = 0, scale = 0;  // down +, clockwise + about x = 0
  for (const Load& l : b.loads) {
    const double x0 = node_x[l.index];  // the node, or the span's left end
    switch (l.type) {
      case LoadType::Point:
        load += l.P; load_moment += l.P * (x0 + (l.on_node ? 0.0 : l.at)); scale += std::fabs(l.P);
        break;
      case LoadType::Couple:
        load_moment += l.C; scale += std::fabs(l.C);
        break;
      case LoadType::Udl: case LoadType::Linear: {
        const double w2 = l.type == LoadType::Udl ? l.w1 : l.w2;
        const double c = l.to - l.from, a = x0 + l.from;
        const double W = (l.w1 + w2) / 2 * c;
        load += W;
        load_moment += a * W + c * c * (l.w1 + 2 * w2) / 6;
        scale += (std::fabs(l.w1) + std::fabs(w2)) * c;
      }
    }
  }
  double react = 0, react_moment = 0;
  for (std::size_t i = 0; i < s.nodes.size(); ++i) {
    react += s.nodes[i].reaction_force;
    react_moment += -s.nodes[i].reaction_force * s.nodes[i].x - s.nodes[i].reaction_moment;
    scale += std::fabs(s.nodes[i].reaction_force);
  }
  const double length = node_x.back();
  EXPECT_NEAR(react, load, tol * (scale + 1e-300)) << "vertical equilibrium";
  EXPECT_NEAR(load_moment + react_moment, 0.0, tol * (scale * length + 1e-300)) << "moment equilibrium";
}

// Relative tolerance for single published closed forms solved in double:
// the element solution is exact, so only rounding remains (a few hundred ulps).
constexpr double kRel = 1e-11;

// --- Single spans: published closed forms -------------------------------------

TEST(SingleSpan, SimplySupportedUdl) {
  // [Roark] Table 8.1 case 2e, uniform load on a simply supported beam;
  // [Hicks] Fig. 2.2 "simple beam, uniformly distributed load" (from memory):
  // M_max = wL^2/8, deflection 5wL^4/(384 EI), reactions wL/2.
  const double L = 6, EI = 2e4, w = 10;
  for (bool with_stations : {false, true}) {
    Beam b = make_beam<double>({L}, EI, {T::Pinned, T::Roller});
    b.loads = {span_udl<double>(0, 0, L, w)};
    Solution s = solve(b, with_stations);
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    const PointValues mid = s.at(0, L / 2, false);
    EXPECT_NEAR(mid.moment, w * L * L / 8, kRel * w * L * L);
    EXPECT_NEAR(mid.deflection, 5 * w * L * L * L * L / (384 * EI), kRel * w * L * L * L * L / EI);
    EXPECT_NEAR(mid.shear, 0.0, kRel * w * L);
    EXPECT_NEAR(s.nodes[0].reaction_force, w * L / 2, kRel * w * L);
    EXPECT_NEAR(s.nodes[1].reaction_force, w * L / 2, kRel * w * L);
    // [Roark] same case: end slope wL^3/(24 EI), clockwise at the left end.
    EXPECT_NEAR(s.nodes[0].rotation_right, w * L * L * L / (24 * EI), kRel * w * L * L * L / EI);
    EXPECT_FALSE(s.nodes[0].moment_left.has_value());
    EXPECT_FALSE(s.nodes[1].moment_right.has_value());
    expect_equilibrium(b, s);
  }
}

TEST(SingleSpan, SimplySupportedCentralPoint) {
  // [Roark] Table 8.1 case 1e; [Hicks] Fig. 2.2 "simple beam, concentrated
  // load at center" (from memory): M = PL/4, deflection PL^3/(48 EI).
  const double L = 5, EI = 3e4, P = 12;
  Beam b = make_beam<double>({L}, EI, {T::Pinned, T::Roller});
  b.loads = {span_point<double>(0, L / 2, P)};
  Solution s = solve(b, false);
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  const PointValues left = s.at(0, L / 2, false), right = s.at(0, L / 2, true);
  EXPECT_NEAR(left.moment, P * L / 4, kRel * P * L);
  EXPECT_NEAR(left.deflection, P * L * L * L / (48 * EI), kRel * P * L * L * L / EI);
  // Shear jumps by -P across the load (beam.h jump rule): +P/2 to -P/2.
  EXPECT_NEAR(left.shear, P / 2, kRel * P);
  EXPECT_NEAR(right.shear, -P / 2, kRel * P);
  EXPECT_NEAR(s.nodes[0].reaction_force, P / 2, kRel * P);
  expect_equilibrium(b, s);
}

TEST(SingleSpan, FixedFixedUdl) {
  // [Roark] Table 8.1 case 2d; [Hicks] Fig. 2.2 "beam fixed at both ends,
  // uniformly distributed load" (from memory): end moments -wL^2/12,
  // midspan +wL^2/24, midspan deflection wL^4/(384 EI).
  const double L = 7, EI = 5e4, w = 8;
  Beam b = make_beam<double>({L}, EI, {T::Fixed, T::Fixed});
  b.loads = {span_udl<double>(0, 0, L, w)};
  Solution s = solve(b, false);
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  EXPECT_NEAR(*s.nodes[0].moment_right, -w * L * L / 12, kRel * w * L * L);
  EXPECT_NEAR(*s.nodes[1].moment_left, -w * L * L / 12, kRel * w * L * L);
  EXPECT_NEAR(s.at(0, L / 2, false).moment, w * L * L / 24, kRel * w * L * L);
  EXPECT_NEAR(s.at(0, L / 2, false).deflection, w * L * L * L * L / (384 * EI), kRel * w * L * L * L * L / EI);
  // Reaction couples: counter-clockwise at the left end, clockwise at the right.
  EXPECT_NEAR(s.nodes[0].reaction_moment, w * L * L / 12, kRel * w * L * L);
  EXPECT_NEAR(s.nodes[1].reaction_moment, -w * L * L / 12, kRel * w * L * L);
  expect_equilibrium(b, s);
}

TEST(SingleSpan, FixedFixedPointLoad) {
  // [Roark] Table 8.1 case 1d; [Hicks] Fig. 2.2 "beam fixed at both ends,
  // concentrated load at any point" (from memory): M_A = -P a b^2 / L^2,
  // M_B = -P a^2 b / L^2 (hogging), R_A = P b^2 (3a + b) / L^3,
  // R_B = P a^2 (a + 3b) / L^3.
  const double a = 2, bb = 3, L = a + bb, EI = 1e4, P = 7;
  Beam b = make_beam<double>({L}, EI, {T::Fixed, T::Fixed});
  b.loads = {span_point<double>(0, a, P)};
  Solution s = solve(b);
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  EXPECT_NEAR(*s.nodes[0].moment_right, -P * a * bb * bb / (L * L), kRel * P * L);
  EXPECT_NEAR(*s.nodes[1].moment_left, -P * a * a * bb / (L * L), kRel * P * L);
  EXPECT_NEAR(s.nodes[0].reaction_force, P * bb * bb * (3 * a + bb) / (L * L * L), kRel * P);
  EXPECT_NEAR(s.nodes[1].reaction_force, P * a * a * (a + 3 * bb) / (L * L * L), kRel * P);
  // [Roark] same case: deflection under the load P a^3 b^3 / (3 EI L^3).
  EXPECT_NEAR(s.at(0, a, false).deflection, P * a * a * a * bb * bb * bb / (3 * EI * L * L * L),
              kRel * P * L * L * L / EI);
  expect_equilibrium(b, s);
}

TEST(SingleSpan, ProppedCantileverUdl) {
  // [Roark] Table 8.1 case 2c; [Hicks] Fig. 2.2 "beam fixed at one end,
  // supported at other, uniformly distributed load" (from memory):
  // R_fixed = 5wL/8, R_prop = 3wL/8, M_fixed = -wL^2/8, maximum sagging
  // moment 9wL^2/128 at 3L/8 from the prop.
  const double L = 8, EI = 4e4, w = 5;
  Beam b = make_beam<double>({L}, EI, {T::Fixed, T::Roller});
  b.loads = {span_udl<double>(0, 0, L, w)};
  Solution s = solve(b, false);
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  EXPECT_NEAR(s.nodes[0].reaction_force, 5 * w * L / 8, kRel * w * L);
  EXPECT_NEAR(s.nodes[1].reaction_force, 3 * w * L / 8, kRel * w * L);
  EXPECT_NEAR(*s.nodes[0].moment_right, -w * L * L / 8, kRel * w * L * L);
  const PointValues peak = s.at(0, L - 3 * L / 8, false);
  EXPECT_NEAR(peak.moment, 9 * w * L * L / 128, kRel * w * L * L);
  EXPECT_NEAR(peak.shear, 0.0, kRel * w * L);  // a maximum: dM/dx = 0
  expect_equilibrium(b, s);
}

TEST(SingleSpan, CantileverTipLoadAndUdl) {
  // [Roark] Table 8.1 cases 1a and 2a; [Hicks] Fig. 2.2 "cantilever beam,
  // concentrated load at free end" and "... uniformly distributed load"
  // (from memory): M_fixed = -PL, tip deflection PL^3/(3 EI);
  // M_fixed = -wL^2/2, tip deflection wL^4/(8 EI).
  const double L = 3, EI = 9e3, P = 4, w = 2;
  {
    Beam b = make_beam<double>({L}, EI, {T::Fixed, T::Free});
    b.loads = {node_point<double>(1, P)};
    Solution s = solve(b, false);
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    EXPECT_NEAR(*s.nodes[0].moment_right, -P * L, kRel * P * L);
    EXPECT_NEAR(s.nodes[1].deflection, P * L * L * L / (3 * EI), kRel * P * L * L * L / EI);
    EXPECT_NEAR(s.nodes[0].reaction_force, P, kRel * P);
    EXPECT_NEAR(s.nodes[0].reaction_moment, P * L, kRel * P * L);
    // At the free end the node force fixes the inside shear by the beam.h
    // jump rule: V(L-) - P = 0 beyond the end, so V = +P (M = -P (L - x)).
    EXPECT_NEAR(s.at(0, L, false).shear, P, kRel * P);
    EXPECT_NEAR(*s.nodes[1].moment_left, 0.0, kRel * P * L);
    expect_equilibrium(b, s);
  }
  {
    Beam b = make_beam<double>({L}, EI, {T::Free, T::Fixed});  // mirrored: free end on the left
    b.loads = {span_udl<double>(0, 0, L, w)};
    Solution s = solve(b, false);
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    EXPECT_NEAR(*s.nodes[1].moment_left, -w * L * L / 2, kRel * w * L * L);
    EXPECT_NEAR(s.nodes[0].deflection, w * L * L * L * L / (8 * EI), kRel * w * L * L * L * L / EI);
    EXPECT_NEAR(s.nodes[0].reaction_force, 0.0, kRel * w * L);  // free: no reaction
    expect_equilibrium(b, s);
  }
}

TEST(SingleSpan, SimplySupportedTriangularLoad) {
  // Load rising linearly from 0 at A to w at B. Reactions by statics: wL/6,
  // wL/3. Midspan deflection: a triangle plus its mirror image is the
  // uniform load, and midspan deflection is symmetric, so it is half of
  // 5wL^4/(384 EI) (symmetry and superposition, general laws). [Roark]
  // Table 8.1 case 2e with w_a = 0 (from memory): M_max = wL^2/(9 sqrt 3)
  // at x = L/sqrt 3.
  const double L = 6, EI = 2e4, w = 9;
  Beam b = make_beam<double>({L}, EI, {T::Pinned, T::Roller});
  b.loads = {span_linear<double>(0, 0, L, 0, w)};
  Solution s = solve(b, false);
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  EXPECT_NEAR(s.nodes[0].reaction_force, w * L / 6, kRel * w * L);
  EXPECT_NEAR(s.nodes[1].reaction_force, w * L / 3, kRel * w * L);
  EXPECT_NEAR(s.at(0, L / 2, false).deflection, 5 * w * L * L * L * L / (768 * EI), kRel * w * L * L * L * L / EI);
  const PointValues peak = s.at(0, L / std::sqrt(3.0), false);
  EXPECT_NEAR(peak.moment, w * L * L / (9 * std::sqrt(3.0)), kRel * w * L * L);
  EXPECT_NEAR(peak.shear, 0.0, kRel * w * L);
  expect_equilibrium(b, s);
}

TEST(SingleSpan, FixedFixedTriangularLoad) {
  // [Roark] Table 8.1 case 2d with w_a = 0 (from memory): load rising from
  // 0 at A to w at B; M_A = -wL^2/30, M_B = -wL^2/20, R_A = 3wL/20,
  // R_B = 7wL/20.
  const double L = 5, EI = 7e3, w = 6;
  Beam b = make_beam<double>({L}, EI, {T::Fixed, T::Fixed});
  b.loads = {span_linear<double>(0, 0, L, 0, w)};
  Solution s = solve(b, false);
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  EXPECT_NEAR(*s.nodes[0].moment_right, -w * L * L / 30, kRel * w * L * L);
  EXPECT_NEAR(*s.nodes[1].moment_left, -w * L * L / 20, kRel * w * L * L);
  EXPECT_NEAR(s.nodes[0].reaction_force, 3 * w * L / 20, kRel * w * L);
  EXPECT_NEAR(s.nodes[1].reaction_force, 7 * w * L / 20, kRel * w * L);
  expect_equilibrium(b, s);
}

TEST(SingleSpan, SimplySupportedCouple) {
  // Clockwise couple C at a on a simply supported span. By statics:
  // R_A = -C/L, R_B = +C/L; M just left of a = -C a/L, just right = C b/L
  // (the moment jumps by +C, beam.h). [Roark] Table 8.1 case 3e (from memory).
  const double L = 4, a = 1.5, EI = 1e4, C = 10;
  Beam b = make_beam<double>({L}, EI, {T::Pinned, T::Roller});
  b.loads = {span_couple<double>(0, a, C)};
  Solution s = solve(b, false);
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  EXPECT_NEAR(s.nodes[0].reaction_force, -C / L, kRel * C);
  EXPECT_NEAR(s.nodes[1].reaction_force, C / L, kRel * C);
  EXPECT_NEAR(s.at(0, a, false).moment, -C * a / L, kRel * C);
  EXPECT_NEAR(s.at(0, a, true).moment, C * (L - a) / L, kRel * C);
  expect_equilibrium(b, s);
}

// --- Settlement, guided end, spring ---------------------------------------------

TEST(Supports, FixedFixedSettlement) {
  // Right end of a fixed-fixed span settles by D. Slope-deflection fixed-end
  // moments for a chord rotation D/L: 6 EI D / L^2, shear 12 EI D / L^3
  // (e.g. R. C. Hibbeler, "Structural Analysis", slope-deflection
  // equations; from memory). Signs here: v = D (3s^2 - 2s^3), so
  // M(0) = -6EID/L^2 (hogging), M(L) = +6EID/L^2, V = +12EID/L^3.
  const double L = 5, EI = 2e4, D = 0.01;
  Beam b = make_beam<double>({L}, EI, {T::Fixed, T::Fixed});
  b.supports[1].settlement = D;
  Solution s = solve(b);
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  const double M = 6 * EI * D / (L * L), V = 12 * EI * D / (L * L * L);
  EXPECT_NEAR(*s.nodes[0].moment_right, -M, kRel * M);
  EXPECT_NEAR(*s.nodes[1].moment_left, M, kRel * M);
  EXPECT_NEAR(s.at(0, 1.7, false).shear, V, kRel * V);
  EXPECT_NEAR(s.nodes[0].reaction_force, V, kRel * V);
  EXPECT_NEAR(s.nodes[1].reaction_force, -V, kRel * V);
  EXPECT_NEAR(s.nodes[1].deflection, D, 1e-15);  // prescribed: returned exactly up to rounding
  EXPECT_NEAR(s.at(0, L / 2, false).deflection, D / 2, kRel * D);  // antisymmetry about midspan
  expect_equilibrium(b, s);
}

// A statically determinate beam moved by a settlement only: it moves as
// rigid bodies and every force is zero (statics). Its reactions are then
// of rounding size, and the method's own equilibrium check must measure
// their rounding against the forces the movement makes, not against
// themselves (it called this beam out of equilibrium before).
TEST(Supports, RigidBodySettlementOfADeterminateBeam) {
  Beam b = make_beam<double>({4.0, 6.0}, 1e4, {T::Pinned, T::Roller, T::Spring});
  b.supports[1].hinge = true;
  b.supports[2].k = 1e5;
  b.supports[2].settlement = 0.01;  // the spring's base
  Solution s = solve(b);
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  for (const auto& n : s.nodes) EXPECT_NEAR(n.reaction_force, 0.0, 1e-9);
  // Span 2 turns about B: the spring's base moved 0.01, the spring carries nothing.
  EXPECT_NEAR(s.nodes[2].deflection, 0.01, 1e-15);
  EXPECT_NEAR(s.at(1, 3.0, false).deflection, 0.005, 1e-15);
  EXPECT_NEAR(s.at(1, 3.0, false).moment, 0.0, 1e-9);
}

TEST(Supports, FixedGuidedTipLoad) {
  // Fixed at A, guided at B (rotation held, deflection free), load P at B.
  // [Roark] Table 8.1 case 1b (guided end, fixed end; from memory), and
  // derived from the slope-deflection equations with both end rotations
  // zero: tip deflection P L^3 / (12 EI), end moments -PL/2 at A and +PL/2
  // at B.
  const double L = 4, EI = 6e3, P = 9;
  Beam b = make_beam<double>({L}, EI, {T::Fixed, T::Guided});
  b.loads = {node_point<double>(1, P)};
  Solution s = solve(b);
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  EXPECT_NEAR(s.nodes[1].deflection, P * L * L * L / (12 * EI), kRel * P * L * L * L / EI);
  EXPECT_NEAR(*s.nodes[0].moment_right, -P * L / 2, kRel * P * L);
  EXPECT_NEAR(*s.nodes[1].moment_left, P * L / 2, kRel * P * L);
  EXPECT_NEAR(s.nodes[1].rotation_left, 0.0, 1e-15);
  EXPECT_NEAR(s.nodes[1].reaction_force, 0.0, 0.0 + 1e-300);  // guided: no force reaction, exactly 0
  EXPECT_NEAR(s.nodes[1].reaction_moment, P * L / 2, kRel * P * L);
  EXPECT_NEAR(s.nodes[0].reaction_force, P, kRel * P);
  expect_equilibrium(b, s);
}

TEST(Supports, CentralSpringUnderUdl) {
  // Simply supported span L with a spring k at midspan, uniform load w.
  // Derived by compatibility from the closed forms 5wL^4/(384 EI) and
  // PL^3/(48 EI) ([Roark] Table 8.1 cases 2e and 1e, from memory):
  // spring force F = (5wL^4/384EI) / (1/k + L^3/48EI); midspan deflection
  // F/k; end reactions (wL - F)/2 by statics.
  const double L = 10, EI = 3e4, w = 4, k = 30 * EI / (L * L * L);
  Beam b = make_beam<double>({L / 2, L / 2}, EI, {T::Pinned, T::Spring, T::Roller});
  b.supports[1].k = k;
  b.loads = {span_udl<double>(0, 0, L / 2, w), span_udl<double>(1, 0, L / 2, w)};
  Solution s = solve(b);
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  const double F = (5 * w * L * L * L * L / (384 * EI)) / (1 / k + L * L * L / (48 * EI));
  EXPECT_NEAR(s.nodes[1].reaction_force, F, kRel * w * L);
  EXPECT_NEAR(s.nodes[1].deflection, F / k, kRel * F / k);
  EXPECT_NEAR(s.nodes[0].reaction_force, (w * L - F) / 2, kRel * w * L);
  EXPECT_NEAR(s.nodes[2].reaction_force, (w * L - F) / 2, kRel * w * L);
  expect_equilibrium(b, s);
}

TEST(Supports, SpringBaseSettlement) {
  // Same beam, no load, the spring's base moves down by d. Compatibility:
  // the spring force R = k (v - d) acts upward on the beam, which deflects
  // v = -R L^3/(48 EI) ([Roark] Table 8.1 case 1e, from memory), so
  // R = -k d / (1 + k L^3/(48 EI)).
  const double L = 10, EI = 3e4, k = 30 * EI / (L * L * L), d = 0.02;
  Beam b = make_beam<double>({L / 2, L / 2}, EI, {T::Pinned, T::Spring, T::Roller});
  b.supports[1].k = k;
  b.supports[1].settlement = d;
  Solution s = solve(b);
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  const double R = -k * d / (1 + k * L * L * L / (48 * EI));
  EXPECT_NEAR(s.nodes[1].reaction_force, R, kRel * k * d);
  EXPECT_NEAR(s.nodes[1].deflection, -R * L * L * L / (48 * EI), kRel * d);
  EXPECT_NEAR(s.nodes[0].reaction_force, -R / 2, kRel * k * d);
  expect_equilibrium(b, s);
}

TEST(Supports, RotationalSpringReaction) {
  // Spring at A with both k and kr, roller at B, UDL. Checked against the
  // definitions in beam.h only (force k v, couple kr * rotation, the jump
  // rule at A) and equilibrium: no published value is used here.
  const double L = 6, EI = 1e4, w = 3;
  Beam b = make_beam<double>({L}, EI, {T::Spring, T::Roller});
  b.supports[0].k = 1e3;
  b.supports[0].kr = 2e4;
  b.loads = {span_udl<double>(0, 0, L, w)};
  Solution s = solve(b);
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  EXPECT_NEAR(s.nodes[0].reaction_moment, 2e4 * s.nodes[0].rotation_right, 1e-12 * w * L * L);
  EXPECT_NEAR(s.nodes[0].reaction_force, 1e3 * s.nodes[0].deflection, 1e-12 * w * L);
  // Moment just inside A = -(reaction couple) by the beam.h jump rule.
  EXPECT_NEAR(*s.nodes[0].moment_right, -s.nodes[0].reaction_moment, 1e-10 * w * L * L);
  expect_equilibrium(b, s);
}

// --- Continuous beams: [Hicks] Table 2.1 --------------------------------------------

TEST(Continuous, HicksTwoEqualSpansUdl) {
  // [Hicks] Table 2.1, 2 spans (from memory): reactions 0.375, 1.250, 0.375
  // wL; M_B = -0.125 wL^2; max positive 0.070 wL^2 (at 0.375 L from an end).
  // Tolerance: half a unit of the last printed place (0.0005).
  const double L = 5, EI = 2e4, w = 4;
  Beam b = make_beam<double>({L, L}, EI, {T::Pinned, T::Roller, T::Roller});
  b.loads = {span_udl<double>(0, 0, L, w), span_udl<double>(1, 0, L, w)};
  Solution s = solve(b);
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  const double wl = w * L, wl2 = w * L * L, t = 0.0005;
  EXPECT_NEAR(s.nodes[0].reaction_force, 0.375 * wl, t * wl);
  EXPECT_NEAR(s.nodes[1].reaction_force, 1.250 * wl, t * wl);
  EXPECT_NEAR(s.nodes[2].reaction_force, 0.375 * wl, t * wl);
  EXPECT_NEAR(*s.nodes[1].moment_left, -0.125 * wl2, t * wl2);
  EXPECT_NEAR(*s.nodes[1].moment_right, -0.125 * wl2, t * wl2);
  EXPECT_NEAR(s.at(0, 0.375 * L, false).moment, 0.070 * wl2, t * wl2);
  expect_equilibrium(b, s);
}

TEST(Continuous, HicksThreeEqualSpansUdl) {
  // [Hicks] Table 2.1, 3 spans (from memory): reactions 0.400, 1.100,
  // 1.100, 0.400 wL; M_B = M_C = -0.100 wL^2; max positive 0.080 wL^2 in the
  // end spans (at 0.4 L from the end) and 0.025 wL^2 at the middle of the
  // centre span. Tolerance: half a unit of the last printed place.
  const double L = 3, EI = 1e4, w = 6;
  Beam b = make_beam<double>({L, L, L}, EI, {T::Pinned, T::Roller, T::Roller, T::Roller});
  for (std::size_t i = 0; i < 3; ++i) b.loads.push_back(span_udl<double>(i, 0, L, w));
  Solution s = solve(b);
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  const double wl = w * L, wl2 = w * L * L, t = 0.0005;
  const double R[] = {0.400, 1.100, 1.100, 0.400};
  for (int i = 0; i < 4; ++i) EXPECT_NEAR(s.nodes[i].reaction_force, R[i] * wl, t * wl) << i;
  EXPECT_NEAR(*s.nodes[1].moment_left, -0.100 * wl2, t * wl2);
  EXPECT_NEAR(*s.nodes[2].moment_right, -0.100 * wl2, t * wl2);
  EXPECT_NEAR(s.at(0, 0.4 * L, false).moment, 0.080 * wl2, t * wl2);
  EXPECT_NEAR(s.at(1, 0.5 * L, false).moment, 0.025 * wl2, t * wl2);
  expect_equilibrium(b, s);
}

// --- Hinge ----------------------------------------------------------------------------

TEST(Hinge, GerberBeamByStatics) {
  // Fixed at A, hinge at B (no support), roller at C. Statics only: BC is
  // simply supported on the hinge and C; the hinge force loads the
  // cantilever AB at its tip. The moment at the hinge is zero.
  const double L1 = 4, L2 = 6, EI = 8e3, w = 3, P = 5, a = 2;
  Beam b = make_beam<double>({L1, L2}, EI, {T::Fixed, T::Free, T::Roller});
  b.supports[1].hinge = true;
  b.loads = {span_udl<double>(0, 0, L1, w), span_udl<double>(1, 0, L2, w), span_point<double>(1, a, P)};
  Solution s = solve(b);
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  const double RC = (w * L2 * L2 / 2 + P * a) / L2;
  const double VB = w * L2 + P - RC;  // force the hinge passes to AB, down on AB
  const double RA = w * L1 + VB, MA = -(w * L1 * L1 / 2 + VB * L1);
  const double scale = (w * (L1 + L2) + P);
  EXPECT_NEAR(s.nodes[2].reaction_force, RC, kRel * scale);
  EXPECT_NEAR(s.nodes[0].reaction_force, RA, kRel * scale);
  EXPECT_NEAR(*s.nodes[0].moment_right, MA, kRel * scale * (L1 + L2));
  EXPECT_NEAR(*s.nodes[1].moment_left, 0.0, kRel * scale * (L1 + L2));
  EXPECT_NEAR(*s.nodes[1].moment_right, 0.0, kRel * scale * (L1 + L2));
  EXPECT_NEAR(s.nodes[1].reaction_force, 0.0, 1e-300);
  // The two sides turn differently at a hinge (here by a finite amount).
  EXPECT_GT(std::fabs(s.nodes[1].rotation_left - s.nodes[1].rotation_right), 1e-6);
  // Deflection at B: the cantilever AB under its UDL and tip force VB,
  // [Roark] Table 8.1 cases 1a and 2a (from memory): wL^4/8EI + PL^3/3EI.
  EXPECT_NEAR(s.nodes[1].deflection, w * L1 * L1 * L1 * L1 / (8 * EI) + VB * L1 * L1 * L1 / (3 * EI),
              kRel * scale * L1 * L1 * L1 / EI);
  expect_equilibrium(b, s);
}

// --- Maxwell-Betti reciprocity on random beams ----------------------------------------

struct Features { int spring = 0, rot_spring = 0, hinge = 0, guided = 0, free = 0, fixed = 0; };

Beam random_beam(std::mt19937& rng, Features& seen) {
  std::uniform_int_distribution<int> spans(1, 4), type(0, 5);
  std::uniform_real_distribution<double> len(1.0, 6.0), stiff(0.5, 2.0), coin(0.0, 1.0);
  for (;;) {
    const int n = spans(rng);
    Beam b;
    for (int i = 0; i < n; ++i) b.spans.push_back({len(rng), 1e4 * stiff(rng)});
    const T types[] = {T::Fixed, T::Pinned, T::Roller, T::Free, T::Spring, T::Guided};
    for (int i = 0; i <= n; ++i) {
      Support s;
      s.type = types[type(rng)];
      if (s.type == T::Spring) {
        s.k = 1e3 * stiff(rng);
        if (coin(rng) < 0.5) s.kr = 1e4 * stiff(rng);
      }
      const bool can_hinge = i > 0 && i < n && !restrains_rotation(s.type) && !(s.type == T::Spring && s.kr > 0);
      s.hinge = can_hinge && coin(rng) < 0.4;
      b.supports.push_back(s);
      b.labels.push_back(std::string(1, static_cast<char>('A' + i)));
    }
    if (find_mechanism(b)) continue;
    for (const Support& s : b.supports) {
      seen.spring += s.type == T::Spring;
      seen.rot_spring += s.type == T::Spring && s.kr > 0;
      seen.hinge += s.hinge;
      seen.guided += s.type == T::Guided;
      seen.free += s.type == T::Free;
      seen.fixed += s.type == T::Fixed;
    }
    return b;
  }
}

TEST(Reciprocity, MaxwellBettiOnRandomBeams) {
  // Maxwell-Betti (a general law of linear elasticity): the deflection at i
  // due to a unit force at j equals the deflection at j due to a unit force
  // at i; and the rotation at i due to a unit force at j equals the
  // deflection at j due to a unit couple at i.
  std::mt19937 rng(20240611u);
  Features seen;
  std::uniform_real_distribution<double> frac(0.05, 0.95);
  for (int trial = 0; trial < 200; ++trial) {
    const Beam base = random_beam(rng, seen);
    const std::size_t n = base.spans.size();
    std::uniform_int_distribution<std::size_t> pick(0, n - 1);
    const std::size_t si = pick(rng), sj = pick(rng);
    const double ai = frac(rng) * base.spans[si].length, aj = frac(rng) * base.spans[sj].length;
    auto with = [&](const Load& l) { Beam b = base; b.loads = {l}; return b; };
    const Beam bi = with(span_point<double>(si, ai, 1.0)), bj = with(span_point<double>(sj, aj, 1.0));
    const Beam ci = with(span_couple<double>(si, ai, 1.0));
    const Solution s_i = stiffness::solve(bi, {}), s_j = stiffness::solve(bj, {}), c_i = stiffness::solve(ci, {});
    ASSERT_EQ(s_i.status, MethodStatus::Ok) << s_i.reason;
    ASSERT_EQ(s_j.status, MethodStatus::Ok) << s_j.reason;
    ASSERT_EQ(c_i.status, MethodStatus::Ok) << c_i.reason;
    const double dij = s_j.at(si, ai, false).deflection, dji = s_i.at(sj, aj, false).deflection;
    // Tolerance: rounding relative to the size of the flexibility terms.
    EXPECT_NEAR(dij, dji, 1e-9 * (std::fabs(dij) + std::fabs(dji)) + 1e-15) << "trial " << trial;
    const double rij = s_j.at(si, ai, false).rotation, dcj = c_i.at(sj, aj, false).deflection;
    EXPECT_NEAR(rij, dcj, 1e-9 * (std::fabs(rij) + std::fabs(dcj)) + 1e-15) << "trial " << trial;
    expect_equilibrium(bi, s_i);
    expect_equilibrium(ci, c_i);
  }
  // The draw must have covered the features the law is meant to test.
  RecordProperty("springs", seen.spring);
  RecordProperty("rotational_springs", seen.rot_spring);
  RecordProperty("hinges", seen.hinge);
  RecordProperty("guided", seen.guided);
  EXPECT_GT(seen.spring, 0);
  EXPECT_GT(seen.rot_spring, 0);
  EXPECT_GT(seen.hinge, 0);
  EXPECT_GT(seen.guided, 0);
  EXPECT_GT(seen.free, 0);
  EXPECT_GT(seen.fixed, 0);
}

// --- Extended precision -------------------------------------------------------------

using X = Extended;

X rel_err(const X& got, const X& want) {
  using std::abs;
  return abs(got - want) / abs(want);
}

TEST(ExtendedPrecision, FixedFixedPointLoad) {
  // [Roark] Table 8.1 case 1d (from memory), as in SingleSpan.FixedFixedPointLoad,
  // solved in 50 digits: agreement far beyond double (1e-40 relative).
  const X a = 2, bb = 3, L = a + bb, EI = 3, P = 7;
  BasicBeam<X> b = make_beam<X>({L}, EI, {T::Fixed, T::Fixed});
  b.loads = {span_point<X>(0, a, P)};
  const BasicSolution<X> s = stiffness::solve(b, build_stations(b, 10));
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  const X tol("1e-40");
  EXPECT_LT(rel_err(*s.nodes[0].moment_right, -P * a * bb * bb / (L * L)), tol);
  EXPECT_LT(rel_err(*s.nodes[1].moment_left, -P * a * a * bb / (L * L)), tol);
  EXPECT_LT(rel_err(s.nodes[0].reaction_force, P * bb * bb * (X(3) * a + bb) / (L * L * L)), tol);
  EXPECT_LT(rel_err(s.nodes[1].reaction_force, P * a * a * (a + X(3) * bb) / (L * L * L)), tol);
}

TEST(ExtendedPrecision, UdlAndTriangularLoadsUseGaussInFullPrecision) {
  // [Roark] Table 8.1 cases 2e and 2d (from memory): simply supported UDL
  // midspan deflection 5wL^4/(384 EI); fixed-fixed load rising from 0 to w:
  // M_A = -wL^2/30, M_B = -wL^2/20. The work-equivalent loads come from the
  // Gauss rule, so these would stall near 1e-16 with double Gauss constants.
  const X tol("1e-40");
  {
    const X L = 7, EI = 11, w = 3;
    BasicBeam<X> b = make_beam<X>({L}, EI, {T::Pinned, T::Roller});
    b.loads = {span_udl<X>(0, X(0), L, w)};
    const BasicSolution<X> s = stiffness::solve(b, build_stations(b, 10));
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    EXPECT_LT(rel_err(s.at(0, L / X(2), false).deflection, X(5) * w * L * L * L * L / (X(384) * EI)), tol);
    EXPECT_LT(rel_err(s.at(0, L / X(2), false).moment, w * L * L / X(8)), tol);
  }
  {
    const X L = 5, EI = 7, w = 6;
    BasicBeam<X> b = make_beam<X>({L}, EI, {T::Fixed, T::Fixed});
    b.loads = {span_linear<X>(0, X(0), L, X(0), w)};
    const BasicSolution<X> s = stiffness::solve(b, {});
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    EXPECT_LT(rel_err(*s.nodes[0].moment_right, -w * L * L / X(30)), tol);
    EXPECT_LT(rel_err(*s.nodes[1].moment_left, -w * L * L / X(20)), tol);
  }
}

// --- Double against Extended: the rounding of this method ------------------------------
//
// These compare the method in double with the same method in 50 digits on
// the same beam (beam_cast gives the exact binary values). They measure
// rounding, not correctness: correctness is checked above against published
// values and laws, and against the other methods elsewhere. "Of each kind":
// forces (reactions and shears), moments (reaction couples and bending
// moments), deflections, rotations; each difference is taken relative to the
// largest value of its kind on the beam (of the whole solution: every node
// result and the values at the sample points).

struct Values { std::vector<double> force, moment, deflection, rotation; };

template <class R>
Values collect(const BasicSolution<R>& s, const std::vector<Station>& pts) {
  Values v;
  auto d = [](const R& x) { return static_cast<double>(x); };
  for (const BasicNodeResult<R>& n : s.nodes) {
    v.force.push_back(d(n.reaction_force));
    v.moment.push_back(d(n.reaction_moment));
    v.moment.push_back(n.moment_left ? d(*n.moment_left) : 0.0);
    v.moment.push_back(n.moment_right ? d(*n.moment_right) : 0.0);
    v.deflection.push_back(d(n.deflection));
    v.rotation.push_back(d(n.rotation_left));
    v.rotation.push_back(d(n.rotation_right));
  }
  for (const Station& p : pts) {
    const BasicPointValues<R> q = s.at(p.span, static_cast<R>(p.local), p.after);
    v.force.push_back(d(q.shear));
    v.moment.push_back(d(q.moment));
    v.deflection.push_back(d(q.deflection));
    v.rotation.push_back(d(q.rotation));
  }
  return v;
}

struct Spread {
  double force = 0, moment = 0, deflection = 0, rotation = 0;
  double worst() const { return std::max(std::max(force, moment), std::max(deflection, rotation)); }
};

// max |got - want| over one kind, divided by `big`.
double spread_of(const std::vector<double>& got, const std::vector<double>& want, double big) {
  double diff = 0;
  for (std::size_t i = 0; i < got.size() && i < want.size(); ++i) diff = std::max(diff, std::fabs(got[i] - want[i]));
  return diff / std::max(big, 1e-300);
}

double largest(const std::vector<double>& v) {
  double m = 0;
  for (double x : v) m = std::max(m, std::fabs(x));
  return m;
}

// The grid stations (before and after every point load) plus `extra`
// evenly spaced points along the whole beam.
std::vector<Station> sample_points(const Beam& b, int extra) {
  std::vector<Station> pts = build_stations(b, 10);
  const double total = b.node_x(b.spans.size());
  std::size_t s = 0;
  double x0 = 0;
  for (int k = 0; k < extra; ++k) {
    const double x = total * k / (extra - 1);
    while (s + 1 < b.spans.size() && x0 + b.spans[s].length < x) x0 += b.spans[s++].length;
    const double local = std::min(std::max(x - x0, 0.0), b.spans[s].length);
    pts.push_back({x, s, local, false});
  }
  return pts;
}

// Solves `b` in double and in Extended and returns the spread per kind.
Spread double_vs_extended(const Beam& b, int extra_points, Solution* out = nullptr) {
  const Solution sd = stiffness::solve(b, build_stations(b, 10));
  const BasicBeam<X> bx = beam_cast<X>(b);
  const BasicSolution<X> sx = stiffness::solve(bx, build_stations(bx, 10));
  Spread r;
  r.force = r.moment = r.deflection = r.rotation = 1e300;  // reported if a solve fails
  EXPECT_EQ(sd.status, MethodStatus::Ok) << sd.reason;
  EXPECT_EQ(sx.status, MethodStatus::Ok) << sx.reason;
  if (sd.status != MethodStatus::Ok || sx.status != MethodStatus::Ok) return r;
  const std::vector<Station> pts = sample_points(b, extra_points);
  const Values vd = collect(sd, pts), vx = collect(sx, pts);
  // The largest value of each kind; a kind that is zero throughout (say,
  // no shear anywhere under couples alone) is measured against its partner
  // kind through the beam's length instead (moment / length, and so on).
  const double length = b.node_x(b.spans.size());
  const double bf = largest(vx.force), bm = largest(vx.moment);
  const double bv = largest(vx.deflection), br = largest(vx.rotation);
  r.force = spread_of(vd.force, vx.force, std::max(bf, bm / length));
  r.moment = spread_of(vd.moment, vx.moment, std::max(bm, bf * length));
  r.deflection = spread_of(vd.deflection, vx.deflection, std::max(bv, br * length));
  r.rotation = spread_of(vd.rotation, vx.rotation, std::max(br, bv / length));
  if (out) *out = sd;
  return r;
}

std::string describe(const Spread& s) {
  char buf[200];
  std::snprintf(buf, sizeof buf, "force %.2e, moment %.2e, deflection %.2e, rotation %.2e", s.force,
                s.moment, s.deflection, s.rotation);
  return buf;
}

TEST(Rounding, FreeOverhangCloseCouples) {
  // tests/data/accuracy/free-overhang-close-couples.json (kN, m), copied:
  // four spans, free - free - pinned (settled) - free - pinned, two couples
  // 0.053 m apart in span 4. With an element node at every station (the
  // earlier mesh) double differed from Extended here by 2.5e-6 in forces,
  // 2.3e-8 in moments, 2.7e-9 in deflections (relative to the largest of
  // each kind); with one element per span, by a few 1e-14 or less.
  const double EI = 73432.872784448671;
  Beam b = make_beam<double>({9.2277585535571021, 7.1065350784265453, 5.1236612350712143, 2.3306022189715261}, EI,
                             {T::Free, T::Free, T::Pinned, T::Free, T::Pinned});
  b.supports[2].settlement = 0.0045764700000000;
  b.loads = {span_couple<double>(3, 1.62697, 7.19583), span_couple<double>(3, 1.67999, -5.82176)};
  Solution s;
  const Spread sp = double_vs_extended(b, 50, &s);
  std::printf("[ measured ] free-overhang-close-couples, double vs Extended: %s\n", describe(sp).c_str());
  RecordProperty("spread", describe(sp));
  EXPECT_LT(sp.force, 1e-11);
  EXPECT_LT(sp.moment, 1e-11);
  EXPECT_LT(sp.deflection, 1e-11);
  EXPECT_LT(sp.rotation, 1e-11);
  expect_equilibrium(b, s, 1e-12);
}

struct Drawn {
  int spring = 0, rot_spring = 0, hinge = 0, guided = 0, free = 0, fixed = 0, settlement = 0;
  int point = 0, couple = 0, udl = 0, linear = 0, node_point = 0, node_couple = 0, close = 0, end_couple = 0;
};

// A random beam of up to 6 spans with every support kind and load type,
// including clusters of loads very close together.
Beam random_loaded_beam(std::mt19937& rng, Drawn& seen) {
  std::uniform_int_distribution<int> spans(1, 6), type(0, 5), count(0, 3), kind(0, 3);
  std::uniform_real_distribution<double> u(0.0, 1.0);
  auto logu = [&](double lo, double hi) { return lo * std::pow(hi / lo, u(rng)); };
  const T types[] = {T::Fixed, T::Pinned, T::Roller, T::Free, T::Spring, T::Guided};
  for (;;) {
    const int n = spans(rng);
    Beam b;
    const double EI0 = logu(1e3, 1e6);
    for (int i = 0; i < n; ++i) b.spans.push_back({logu(0.3, 12.0), EI0 * logu(0.2, 5.0)});
    for (int i = 0; i <= n; ++i) {
      Support s;
      s.type = types[type(rng)];
      const Span& near = b.spans[std::min<std::size_t>(static_cast<std::size_t>(i), b.spans.size() - 1)];
      if (s.type == T::Spring) {
        s.k = near.EI / (near.length * near.length * near.length) * logu(0.01, 100.0);
        if (u(rng) < 0.5) s.kr = near.EI / near.length * logu(0.01, 100.0);
      }
      if ((restrains_deflection(s.type) || s.type == T::Spring) && u(rng) < 0.3)
        s.settlement = (u(rng) < 0.5 ? -1 : 1) * logu(1e-4, 2e-2);
      const bool can_hinge = i > 0 && i < n && !restrains_rotation(s.type) && !(s.type == T::Spring && s.kr > 0);
      s.hinge = can_hinge && u(rng) < 0.3;
      b.supports.push_back(s);
      b.labels.push_back(std::string(1, static_cast<char>('A' + i)));
    }
    if (find_mechanism(b)) continue;
    auto value = [&] { return (u(rng) < 0.2 ? -1 : 1) * logu(0.5, 50.0); };
    for (int i = 0; i < n; ++i) {
      const double L = b.spans[i].length;
      const std::size_t si = static_cast<std::size_t>(i);
      const int m = count(rng);
      for (int k = 0; k < m; ++k) {
        const double a = L * (0.001 + 0.998 * u(rng));
        switch (kind(rng)) {
          case 0: b.loads.push_back(span_point<double>(si, a, value())); ++seen.point; break;
          case 1: {
            const double at = u(rng) < 0.15 ? (u(rng) < 0.5 ? 0.0 : L) : a;
            seen.end_couple += at <= 0 || at >= L;
            b.loads.push_back(span_couple<double>(si, at, value() * L));
            ++seen.couple;
            break;
          }
          case 2: {
            const double c = u(rng) < 0.3 ? L : L * u(rng);
            const double from = (L - c) * u(rng);
            b.loads.push_back(span_udl<double>(si, from, std::min(from + c, L), value() / L));
            ++seen.udl;
            break;
          }
          default: {
            const double c = L * logu(1e-3, 1.0), from = (L - c) * u(rng);
            b.loads.push_back(span_linear<double>(si, from, std::min(from + c, L), value() / L, value() / L));
            ++seen.linear;
          }
        }
      }
      if (u(rng) < 0.3) {  // a cluster: loads within 1e-6 .. 1e-2 of a span apart
        const double gap = L * logu(1e-6, 1e-2), a = L * (0.05 + 0.85 * u(rng));
        b.loads.push_back(span_point<double>(si, a, value()));
        b.loads.push_back(span_couple<double>(si, a + gap, value() * L));
        b.loads.push_back(span_couple<double>(si, a + 2 * gap, -value() * L));
        b.loads.push_back(span_linear<double>(si, a + gap, a + 3 * gap, value() / L, value() / L));
        b.loads.push_back(span_point<double>(si, a + 3.5 * gap, value()));
        ++seen.close;
      }
    }
    for (int i = 0; i <= n; ++i) {
      const std::size_t ni = static_cast<std::size_t>(i);
      if (u(rng) < 0.2) { b.loads.push_back(node_point<double>(ni, value())); ++seen.node_point; }
      if (!b.supports[ni].hinge && u(rng) < 0.2) { b.loads.push_back(node_couple<double>(ni, value())); ++seen.node_couple; }
    }
    bool any = false;
    for (const Support& s : b.supports) any = any || s.settlement > 0 || s.settlement < 0;
    if (b.loads.empty() && !any) b.loads.push_back(span_point<double>(0, b.spans[0].length / 3, 10.0));
    for (const Support& s : b.supports) {
      seen.spring += s.type == T::Spring;
      seen.rot_spring += s.type == T::Spring && s.kr > 0;
      seen.hinge += s.hinge;
      seen.guided += s.type == T::Guided;
      seen.free += s.type == T::Free;
      seen.fixed += s.type == T::Fixed;
      seen.settlement += s.settlement > 0 || s.settlement < 0;
    }
    return b;
  }
}

TEST(Rounding, RandomBeamsDoubleAgreesWithExtended) {
  std::mt19937 rng(914271u);
  Drawn seen;
  Spread worst;
  int worst_trial = -1;
  for (int trial = 0; trial < 200; ++trial) {
    const Beam b = random_loaded_beam(rng, seen);
    Solution s;
    const Spread sp = double_vs_extended(b, 50, &s);
    EXPECT_LT(sp.worst(), 1e-10) << "trial " << trial << ": " << describe(sp);
    if (worst_trial < 0 || worst.worst() < sp.worst()) worst_trial = trial;
    worst.force = std::max(worst.force, sp.force);
    worst.moment = std::max(worst.moment, sp.moment);
    worst.deflection = std::max(worst.deflection, sp.deflection);
    worst.rotation = std::max(worst.rotation, sp.rotation);
    if (s.status == MethodStatus::Ok) expect_equilibrium(b, s, 1e-12);
  }
  std::printf("[ measured ] 200 random beams, worst double vs Extended: %s (worst trial %d)\n",
              describe(worst).c_str(), worst_trial);
  RecordProperty("worst_spread", describe(worst));
  // The draw must have covered what it is meant to.
  EXPECT_GT(seen.spring, 0);
  EXPECT_GT(seen.rot_spring, 0);
  EXPECT_GT(seen.hinge, 0);
  EXPECT_GT(seen.guided, 0);
  EXPECT_GT(seen.free, 0);
  EXPECT_GT(seen.fixed, 0);
  EXPECT_GT(seen.settlement, 0);
  EXPECT_GT(seen.point, 0);
  EXPECT_GT(seen.couple, 0);
  EXPECT_GT(seen.end_couple, 0);
  EXPECT_GT(seen.udl, 0);
  EXPECT_GT(seen.linear, 0);
  EXPECT_GT(seen.node_point, 0);
  EXPECT_GT(seen.node_couple, 0);
  EXPECT_GT(seen.close, 0);
}

// --- Exact recovery inside a span ------------------------------------------------------

// The same beam with a free node (no support, no hinge) inserted at local x
// of span s: the same structure, with the loads of span s shared out.
Beam split_at(const Beam& b, std::size_t s, double x) {
  Beam r;
  const std::size_t n = b.spans.size();
  for (std::size_t i = 0; i < n; ++i) {
    if (i == s) {
      r.spans.push_back({x, b.spans[i].EI});
      r.spans.push_back({b.spans[i].length - x, b.spans[i].EI});
    } else {
      r.spans.push_back(b.spans[i]);
    }
  }
  for (std::size_t i = 0; i <= n; ++i) {
    r.supports.push_back(b.supports[i]);
    r.labels.push_back(b.labels[i]);
    if (i == s) {
      Support f;
      f.type = T::Free;
      r.supports.push_back(f);
      r.labels.push_back("split");
    }
  }
  for (const Load& l : b.loads) {
    Load t = l;
    if (l.on_node || l.index != s) {
      if (l.index > s) ++t.index;
      r.loads.push_back(t);
      continue;
    }
    if (l.type == LoadType::Point || l.type == LoadType::Couple) {
      if (x < l.at) { t.index = s + 1; t.at = l.at - x; }
      r.loads.push_back(t);
      continue;
    }
    const double w2 = l.type == LoadType::Udl ? l.w1 : l.w2;
    const double wx = l.w1 + (w2 - l.w1) * (x - l.from) / (l.to - l.from);
    if (l.from < x) {  // the part left of x
      Load p = span_linear<double>(s, l.from, std::min(l.to, x), l.w1, l.to < x ? w2 : wx);
      r.loads.push_back(p);
    }
    if (x < l.to) {  // the part right of x
      Load p = span_linear<double>(s + 1, std::max(l.from, x) - x, l.to - x, x < l.from ? l.w1 : wx, w2);
      r.loads.push_back(p);
    }
  }
  return r;
}

Beam recovery_beam() {
  Beam b = make_beam<double>({4, 6, 3}, 1.5e4, {T::Fixed, T::Spring, T::Roller, T::Free});
  b.supports[1].k = 2e3;
  b.supports[1].kr = 5e3;
  b.loads = {span_linear<double>(0, 0.5, 3.5, 2, 7), span_udl<double>(1, 0, 6, 3),
             span_point<double>(1, 2.2, 10),          span_couple<double>(1, 4.1, -6),
             span_point<double>(1, 4.15, 3),          span_linear<double>(1, 2.0, 5.0, -2, 4),
             span_couple<double>(1, 0, 2.5),          span_linear<double>(2, 0, 3, 5, 1),
             node_point<double>(3, 2)};
  return b;
}

TEST(Recovery, InsideSpanEqualsAFreeNodeInsertedThere) {
  // The solution inside a span is exact (Hermite interpolation plus the
  // clamped-clamped particular solution of the span's loads), so it must
  // equal, to rounding, the solution of the same structure with a free node
  // inserted at that point, which is solved there as a node. Several point
  // loads, a couple and partial loads share span 2, so the recovery handles
  // more than one load inside one element.
  const Beam b = recovery_beam();
  const Solution coarse = stiffness::solve(b, {});
  ASSERT_EQ(coarse.status, MethodStatus::Ok) << coarse.reason;
  // Scales per kind, from the coarse solution at many points.
  const Values all = collect(coarse, sample_points(b, 200));
  const double sv = largest(all.deflection), sr = largest(all.rotation), sm = largest(all.moment),
               sf = largest(all.force);
  std::mt19937 rng(7u);
  for (int k = 0; k < 30; ++k) {
    const std::size_t span = static_cast<std::size_t>(k % 3);
    const double L = b.spans[span].length;
    const double x = std::uniform_real_distribution<double>(0.01, 0.99)(rng) * L;
    const Beam split = split_at(b, span, x);
    ASSERT_FALSE(find_mechanism(split));
    const Solution fine = stiffness::solve(split, {});
    ASSERT_EQ(fine.status, MethodStatus::Ok) << fine.reason;
    const NodeResult& at_x = fine.nodes[span + 1];
    const PointValues c = coarse.at(span, x, false);
    const double t = 1e-11;
    EXPECT_NEAR(c.deflection, at_x.deflection, t * sv) << "k " << k;
    EXPECT_NEAR(c.rotation, at_x.rotation_left, t * sr) << "k " << k;
    EXPECT_NEAR(c.moment, *at_x.moment_left, t * sm) << "k " << k;
    EXPECT_NEAR(c.shear, fine.at(span, x, false).shear, t * sf) << "k " << k;
    // And at points on either side, now in two different spans.
    for (double f : {0.1, 0.5, 0.9}) {
      const double y1 = f * x, y2 = x + f * (L - x);
      const PointValues c1 = coarse.at(span, y1, false), f1 = fine.at(span, y1, false);
      const PointValues c2 = coarse.at(span, y2, false), f2 = fine.at(span + 1, y2 - x, false);
      EXPECT_NEAR(c1.deflection, f1.deflection, t * sv);
      EXPECT_NEAR(c2.deflection, f2.deflection, t * sv);
      EXPECT_NEAR(c1.rotation, f1.rotation, t * sr);
      EXPECT_NEAR(c2.rotation, f2.rotation, t * sr);
      EXPECT_NEAR(c1.moment, f1.moment, t * sm);
      EXPECT_NEAR(c2.moment, f2.moment, t * sm);
      EXPECT_NEAR(c1.shear, f1.shear, t * sf);
      EXPECT_NEAR(c2.shear, f2.shear, t * sf);
    }
    expect_equilibrium(split, fine);
  }
  expect_equilibrium(b, coarse);
}

TEST(Recovery, LimitsAtPointLoadsAndCouples) {
  // Jump rules of beam.h at loads inside one element: across a force P the
  // shear jumps by -P, across a clockwise couple C the moment jumps by +C;
  // deflection, rotation (and the other quantity) are continuous.
  const Beam b = recovery_beam();
  const Solution s = stiffness::solve(b, {});
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  const PointValues p0 = s.at(1, 2.2, false), p1 = s.at(1, 2.2, true);
  EXPECT_NEAR(p1.shear - p0.shear, -10.0, 1e-11 * 100);
  EXPECT_NEAR(p1.moment - p0.moment, 0.0, 1e-11 * 100);
  EXPECT_NEAR(p1.deflection - p0.deflection, 0.0, 1e-15);
  EXPECT_NEAR(p1.rotation - p0.rotation, 0.0, 1e-15);
  const PointValues c0 = s.at(1, 4.1, false), c1 = s.at(1, 4.1, true);
  EXPECT_NEAR(c1.moment - c0.moment, -6.0, 1e-11 * 100);
  EXPECT_NEAR(c1.shear - c0.shear, 0.0, 1e-11 * 100);
  // The limit just beside a load equals the value a little way off.
  const double e = 1e-7;
  EXPECT_NEAR(s.at(1, 2.2 - e, false).shear, p0.shear, 1e-4);
  EXPECT_NEAR(s.at(1, 2.2 + e, false).shear, p1.shear, 1e-4);
  EXPECT_NEAR(s.at(1, 4.1 - e, false).moment, c0.moment, 1e-4);
  EXPECT_NEAR(s.at(1, 4.1 + e, false).moment, c1.moment, 1e-4);
  // The couple at local 0 of span 2 is inside the span's limit at 0
  // (beam.h): moment_right of node B is the moment after it, and the moment
  // jumps across node B by +2.5 - (reaction couple of the spring).
  EXPECT_NEAR(*s.nodes[1].moment_right - *s.nodes[1].moment_left, 2.5 - s.nodes[1].reaction_moment, 1e-10 * 100);
}

TEST(Recovery, MomentIsMinusEIv2) {
  // Moment from statics agrees with -EI v'' (central difference of the
  // recovered rotation, a consistency law): tolerance from the difference step.
  const Beam b = recovery_beam();
  const Solution s = stiffness::solve(b, {});
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  const double EI = b.spans[1].EI, h = 1e-4;
  for (double x : {1.234, 3.0, 4.5}) {
    const double vpp = (s.at(1, x + h, false).rotation - s.at(1, x - h, false).rotation) / (2 * h);
    EXPECT_NEAR(s.at(1, x, false).moment, -EI * vpp, 1e-5 * std::fabs(s.at(1, x, false).moment) + 1e-6) << x;
  }
  // And the shear is dM/dx.
  const double x = 3.3;
  const double dm = (s.at(1, x + h, false).moment - s.at(1, x - h, false).moment) / (2 * h);
  EXPECT_NEAR(s.at(1, x, false).shear, dm, 1e-5 * std::fabs(dm) + 1e-6);
}

TEST(Recovery, AtIsPureAcrossThreads) {
  // at() is pure: several threads evaluating at once get the serial values.
  const Beam b = recovery_beam();
  const Solution s = stiffness::solve(b, {});
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  const std::vector<Station> pts = sample_points(b, 500);
  const Values serial = collect(s, pts);
  std::vector<Values> got(4);
  std::vector<std::thread> threads;
  for (std::size_t t = 0; t < got.size(); ++t) threads.emplace_back([&, t] { got[t] = collect(s, pts); });
  for (std::thread& t : threads) t.join();
  for (const Values& g : got) {
    ASSERT_EQ(g.moment.size(), serial.moment.size());
    for (std::size_t i = 0; i < g.moment.size(); ++i) EXPECT_DOUBLE_EQ(g.moment[i], serial.moment[i]);
    for (std::size_t i = 0; i < g.deflection.size(); ++i) EXPECT_DOUBLE_EQ(g.deflection[i], serial.deflection[i]);
  }
}

// --- Size -------------------------------------------------------------------------------

TEST(Size, HundredThousandSpans) {
  // 100,000 equal spans under uniform load. Equilibrium (general law); and
  // by symmetry an interior span far from the ends turns through no end
  // rotation, so it acts as fixed-fixed: support moment -wL^2/12 ([Roark]
  // Table 8.1 case 2d, from memory). The end effect decays by (2 - sqrt 3)
  // per span, so it is far below the tolerance in the middle.
  const std::size_t n = 100000;
  const double L = 4, EI = 1e4, w = 2;
  Beam b;
  for (std::size_t i = 0; i < n; ++i) {
    b.spans.push_back({L, EI});
    b.loads.push_back(span_udl<double>(i, 0, L, w));
  }
  for (std::size_t i = 0; i <= n; ++i) {
    Support s;
    s.type = i == 0 ? T::Pinned : T::Roller;
    b.supports.push_back(s);
    b.labels.push_back("N" + std::to_string(i));
  }
  const Solution s = stiffness::solve(b, {});
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  expect_equilibrium(b, s, 1e-9);
  EXPECT_NEAR(*s.nodes[n / 2].moment_left, -w * L * L / 12, 1e-9 * w * L * L);
  EXPECT_NEAR(s.nodes[n / 2].reaction_force, w * L, 1e-9 * w * L);
}

TEST(Size, MillionSpansMixed) {
  // 1,000,000 spans of varied length and EI with springs, hinges and every
  // load type: it solves, and the reactions balance the loads (equilibrium,
  // a general law). No time is asserted (speed is for the benchmarks).
  const std::size_t n = 1000000;
  Beam b;
  for (std::size_t i = 0; i < n; ++i) {
    const double L = 2 + 0.75 * static_cast<double>(i % 5);
    b.spans.push_back({L, 1e4 * static_cast<double>(1 + i % 3)});
    b.loads.push_back(span_udl<double>(i, 0, L, 2));
    if (i % 3 == 0) b.loads.push_back(span_point<double>(i, L / 3, 7));
    if (i % 7 == 0) b.loads.push_back(span_couple<double>(i, L / 2, 4));
    if (i % 11 == 0) b.loads.push_back(span_linear<double>(i, 0.2 * L, 0.8 * L, 1, 3));
  }
  for (std::size_t i = 0; i <= n; ++i) {
    Support s;
    s.type = i == 0 ? T::Pinned : T::Roller;
    if (i % 10 == 5) { s.type = T::Spring; s.k = 5e3; }
    else if (i % 13 == 0 && i > 0 && i < n) s.hinge = true;
    b.supports.push_back(s);
    b.labels.push_back("N" + std::to_string(i));
    if (i % 17 == 0) b.loads.push_back(node_point<double>(i, 3));
  }
  const Solution s = stiffness::solve(b, {});
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  expect_equilibrium(b, s, 1e-9);
}

// --- Out of scope and faults --------------------------------------------------------------

TEST(Scope, CoupleAtHingeIsNotApplicable) {
  Beam b = make_beam<double>({3, 3}, 1e4, {T::Fixed, T::Free, T::Roller});
  b.supports[1].hinge = true;
  b.loads = {node_couple<double>(1, 5)};
  const Solution s = stiffness::solve(b, {});
  EXPECT_EQ(s.status, MethodStatus::NotApplicable);
  EXPECT_NE(s.reason.find("hinge"), std::string::npos) << s.reason;
  EXPECT_NE(s.reason.find("node B"), std::string::npos) << s.reason;
}

TEST(Scope, NegativeSpringIsNotApplicable) {
  Beam b = make_beam<double>({3}, 1e4, {T::Fixed, T::Spring});
  b.supports[1].k = -5;
  const Solution s = stiffness::solve(b, {});
  EXPECT_EQ(s.status, MethodStatus::NotApplicable);
  EXPECT_NE(s.reason.find("spring"), std::string::npos) << s.reason;
}

TEST(Scope, LoadBeyondTheBeamAfterOthersIsNotApplicable) {
  // Found while the loads are taken span by span: the reason is the full check's.
  Beam b = make_beam<double>({3, 3}, 1e4, {T::Pinned, T::Roller, T::Roller});
  b.loads = {span_udl<double>(0, 0, 3, 2), span_point<double>(1, 1, 4), span_point<double>(2, 1, 4)};
  Solution s = stiffness::solve(b, {});
  EXPECT_EQ(s.status, MethodStatus::NotApplicable);
  EXPECT_NE(s.reason.find("span beyond the beam"), std::string::npos) << s.reason;
  b.loads = {span_point<double>(1, 1, 4), span_udl<double>(0, 0, 3, 2), node_point<double>(7, 1)};
  s = stiffness::solve(b, {});
  EXPECT_EQ(s.status, MethodStatus::NotApplicable);
  EXPECT_NE(s.reason.find("node beyond the beam"), std::string::npos) << s.reason;
  b.loads = {span_point<double>(0, 1, 4), span_udl<double>(1, 1, 4, 2)};
  s = stiffness::solve(b, {});
  EXPECT_EQ(s.status, MethodStatus::NotApplicable);
  EXPECT_NE(s.reason.find("load extent outside span 2"), std::string::npos) << s.reason;
}

TEST(Order, LoadsInAnyOrderGiveTheSameAnswer) {
  // Span loads out of span order and node loads anywhere (first, between,
  // last) are regrouped; within a span the order is kept.
  Beam b = make_beam<double>({4, 5, 3, 6}, 2e4, {T::Fixed, T::Roller, T::Spring, T::Free, T::Pinned});
  b.supports[2].k = 3e3;
  b.supports[2].kr = 1e3;
  b.supports[3].hinge = true;
  const std::vector<Load> in_order = {
      node_point<double>(3, 7), span_udl<double>(0, 0, 4, 3), span_point<double>(0, 1.5, 10),
      span_linear<double>(1, 1, 4, 2, 5), node_couple<double>(2, 4), span_couple<double>(2, 1, -6),
      span_point<double>(3, 2, 8), span_udl<double>(3, 1, 5, 1)};
  b.loads = in_order;
  const Solution a = solve(b, false);
  ASSERT_EQ(a.status, MethodStatus::Ok) << a.reason;
  b.loads = {in_order[6], in_order[1], in_order[4], in_order[7], in_order[3], in_order[2], in_order[5], in_order[0]};
  const Solution c = solve(b, false);
  ASSERT_EQ(c.status, MethodStatus::Ok) << c.reason;
  expect_equilibrium(b, c);
  ASSERT_EQ(a.nodes.size(), c.nodes.size());
  auto near = [](double x, double y) { return std::fabs(x - y) <= 1e-12 * (1 + std::fabs(x)); };
  for (std::size_t i = 0; i < a.nodes.size(); ++i) {
    EXPECT_TRUE(near(a.nodes[i].deflection, c.nodes[i].deflection)) << i;
    EXPECT_TRUE(near(a.nodes[i].rotation_left, c.nodes[i].rotation_left)) << i;
    EXPECT_TRUE(near(a.nodes[i].rotation_right, c.nodes[i].rotation_right)) << i;
    EXPECT_TRUE(near(a.nodes[i].reaction_force, c.nodes[i].reaction_force)) << i;
    EXPECT_TRUE(near(a.nodes[i].reaction_moment, c.nodes[i].reaction_moment)) << i;
  }
  for (std::size_t sp = 0; sp < b.spans.size(); ++sp)
    for (double t : {0.0, 0.37, 0.5, 1.0}) {
      const double x = t * b.spans[sp].length;
      const PointValues p = a.at(sp, x, false), q = c.at(sp, x, false);
      EXPECT_TRUE(near(p.moment, q.moment) && near(p.shear, q.shear) && near(p.deflection, q.deflection) &&
                  near(p.rotation, q.rotation)) << sp << " " << x;
    }
}

TEST(Faults, MechanismFailsWithAReason) {
  // Not stable (one pinned support): the reader would refuse it; the solver
  // must still not return a number.
  Beam b = make_beam<double>({3, 2}, 1e4, {T::Free, T::Pinned, T::Free});
  b.loads = {node_point<double>(0, 1)};
  const Solution s = stiffness::solve(b, {});
  EXPECT_EQ(s.status, MethodStatus::Failed);
  EXPECT_NE(s.reason.find("pivot"), std::string::npos) << s.reason;
}

TEST(Faults, NonFiniteLoadFails) {
  Beam b = make_beam<double>({3}, 1e4, {T::Pinned, T::Roller});
  b.loads = {span_point<double>(0, 1.0, std::nan(""))};
  const Solution s = stiffness::solve(b, {});
  EXPECT_EQ(s.status, MethodStatus::Failed);
  EXPECT_FALSE(s.reason.empty());
}


// --- Many loads on one span: the recovery by sorted positions ---------------------------
//
// A span with more than 6 loads is recovered from sums of its loads by
// position (O(log m) a call) instead of the loop over them (O(m) a call);
// stiffness_recovery.h, SpanIndex.

// n equal point loads P at a_i = i L / (n + 1), i = 1 .. n, on one span.
template <class R>
BasicBeam<R> evenly_loaded_span(int n, const R& L, const R& EI, const R& P, T left, T right) {
  BasicBeam<R> b = make_beam<R>({L}, EI, {left, right});
  for (int i = 1; i <= n; ++i) b.loads.push_back(span_point<R>(0, L * R(i) / R(n + 1), P));
  return b;
}

// Superposition of [Roark] Table 8.1 case 1e (from memory; also [Hicks]
// Fig. 2.2 "simple beam, concentrated load at any point"): a load P at a on
// a simply supported span, b = L - a, gives at x <= a the moment
// P b x / L and the deflection P b x (L^2 - b^2 - x^2) / (6 L EI), and the
// mirror image for x >= a; the left end rotates by P a b (L + b) / (6 L EI)
// and the left reaction is P b / L.
template <class R>
struct SimpleSpanSum {
  R moment{0}, deflection{0}, rotation_left{0}, reaction_left{0};
};
template <class R>
SimpleSpanSum<R> simple_span_sum(const BasicBeam<R>& b, const R& x) {
  const R L = b.spans[0].length, EI = b.spans[0].EI;
  SimpleSpanSum<R> r;
  for (const BasicLoad<R>& l : b.loads) {
    const R a = l.at, bb = L - a, P = l.P;
    if (!(a < x)) {
      r.moment += P * bb * x / L;
      r.deflection += P * bb * x * (L * L - bb * bb - x * x) / (R(6) * L * EI);
    } else {
      const R xm = L - x;
      r.moment += P * a * xm / L;
      r.deflection += P * a * xm * (L * L - a * a - xm * xm) / (R(6) * L * EI);
    }
    r.rotation_left += P * a * bb * (L + bb) / (R(6) * L * EI);
    r.reaction_left += P * bb / L;
  }
  return r;
}

TEST(ManyLoads, EqualPointLoadsOnASimpleSpanMatchTheHandbookBySuperposition) {
  // 2,000 equal loads (none at midspan: n even) and 2,001 (one at midspan).
  const double L = 9, EI = 4e4, P = 0.75;
  for (int n : {2000, 2001}) {
    const Beam b = evenly_loaded_span<double>(n, L, EI, P, T::Pinned, T::Roller);
    const Solution s = solve(b, false);
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    const double W = n * P;  // the total load
    // Reactions: W / 2 each (symmetry; and the superposition of P b / L).
    EXPECT_NEAR(s.nodes[0].reaction_force, W / 2, kRel * W);
    EXPECT_NEAR(s.nodes[1].reaction_force, W / 2, kRel * W);
    EXPECT_NEAR(s.nodes[0].reaction_force, simple_span_sum(b, 0.0).reaction_left, kRel * W);
    EXPECT_NEAR(s.nodes[0].rotation_right, simple_span_sum(b, 0.0).rotation_left, kRel * W * L * L / EI);
    // Midspan, and a few other points, both limits where a load sits.
    for (double x : {L / 2, L / 3, 0.1 * L, 0.97 * L, b.loads[7].at}) {
      const SimpleSpanSum<double> want = simple_span_sum(b, x);
      for (bool after : {false, true}) {
        const PointValues v = s.at(0, x, after);
        EXPECT_NEAR(v.moment, want.moment, kRel * W * L) << "n " << n << ", x " << x;
        EXPECT_NEAR(v.deflection, want.deflection, kRel * W * L * L * L / EI) << "n " << n << ", x " << x;
      }
    }
    // Shear at midspan: zero between loads (n even); +P/2 to -P/2 across
    // the middle load (n odd; the jump rule of beam.h).
    const double before = s.at(0, L / 2, false).shear, after = s.at(0, L / 2, true).shear;
    EXPECT_NEAR(before, n % 2 ? P / 2 : 0.0, kRel * W);
    EXPECT_NEAR(after, n % 2 ? -P / 2 : 0.0, kRel * W);
    expect_equilibrium(b, s);
  }
}

TEST(ManyLoads, EqualPointLoadsInFiftyDigits) {
  // The same superposition ([Roark] Table 8.1 case 1e, from memory), 300
  // loads, solved in 50 digits through the sums by position: 1e-40.
  const X L = 7, EI = 3, P = X(1) / X(3);
  const BasicBeam<X> b = evenly_loaded_span<X>(300, L, EI, P, T::Pinned, T::Roller);
  const BasicSolution<X> s = stiffness::solve(b, {});
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  const X tol("1e-40");
  for (const X& x : {L / X(2), L / X(7), X(3)}) {
    const SimpleSpanSum<X> want = simple_span_sum(b, x);
    const BasicPointValues<X> v = s.at(0, x, false);
    EXPECT_LT(rel_err(v.moment, want.moment), tol);
    EXPECT_LT(rel_err(v.deflection, want.deflection), tol);
  }
  EXPECT_LT(rel_err(s.nodes[0].rotation_right, simple_span_sum(b, X(0)).rotation_left), tol);
}

TEST(ManyLoads, EqualPointLoadsOnAFixedSpanMatchTheHandbookBySuperposition) {
  // [Roark] Table 8.1 case 1d (from memory): a load P at a on a span fixed
  // at both ends, b = L - a, has end moments -P a b^2 / L^2 (left) and
  // -P a^2 b / L^2 (right) and left reaction P b^2 (3a + b) / L^3.
  // Summed over 5,000 equal loads evenly spaced: the consistent loads of
  // the solve (not the recovery) with many loads.
  const double L = 6, EI = 2e4, P = 0.4;
  const int n = 5000;
  const Beam b = evenly_loaded_span<double>(n, L, EI, P, T::Fixed, T::Fixed);
  const Solution s = solve(b, false);
  ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
  double MA = 0, MB = 0, RA = 0;
  for (const Load& l : b.loads) {
    const double a = l.at, bb = L - a;
    MA -= P * a * bb * bb / (L * L);
    MB -= P * a * a * bb / (L * L);
    RA += P * bb * bb * (3 * a + bb) / (L * L * L);
  }
  const double W = n * P;
  EXPECT_NEAR(*s.nodes[0].moment_right, MA, kRel * W * L);
  EXPECT_NEAR(*s.nodes[1].moment_left, MB, kRel * W * L);
  EXPECT_NEAR(s.nodes[0].reaction_force, RA, kRel * W);
  EXPECT_NEAR(s.at(0, 0.0, false).moment, MA, kRel * W * L);
  EXPECT_NEAR(s.at(0, L, false).moment, MB, kRel * W * L);
  EXPECT_NEAR(s.at(0, L, false).deflection, 0.0, kRel * W * L * L * L / EI);
  expect_equilibrium(b, s);
}

// The sums by position against the loop over the loads (the recovery
// before them), on 150 seeded random beams of one to four spans with 17 to
// 300 loads a span of every type: point forces, couples (some at the span
// ends), full and partial UDLs, linear loads down to 1e-4 of the span long
// (short and steep), loads at equal positions (a force and a couple
// together, two forces together, loads starting where others end), every
// support kind. Values at the stations (both limits at every point load),
// at every load position and end, and at random points, agree to 1e-12 of
// the largest magnitude of their kind on the beam (both answers): the same
// superposition summed in another order, a general law (no expected
// numbers).
TEST(ManyLoads, IndexEqualsTheLoop) {
  std::mt19937 rng(20261204u);
  std::uniform_real_distribution<double> U(0.0, 1.0);
  auto logu = [&](double lo, double hi) { return lo * std::pow(hi / lo, U(rng)); };
  const T types[] = {T::Fixed, T::Pinned, T::Roller, T::Free, T::Spring, T::Guided};
  double worst = 0;
  int beams = 0, equal_positions = 0, short_linear = 0, end_couples = 0;
  while (beams < 150) {
    const std::size_t n = 1 + static_cast<std::size_t>(U(rng) * 4);
    Beam b;
    for (std::size_t i = 0; i < n; ++i) b.spans.push_back({logu(0.5, 12.0), 1e4 * logu(0.2, 5.0)});
    for (std::size_t i = 0; i <= n; ++i) {
      Support sp;
      sp.type = types[static_cast<int>(U(rng) * 6) % 6];
      if (sp.type == T::Spring) {
        const Span& near = b.spans[std::min(i, n - 1)];
        sp.k = near.EI / (near.length * near.length * near.length) * logu(0.1, 10.0);
      }
      if (restrains_deflection(sp.type) && U(rng) < 0.2) sp.settlement = 0.01 * (U(rng) - 0.5);
      b.supports.push_back(sp);
      b.labels.push_back(std::string(1, static_cast<char>('A' + i)));
    }
    if (find_mechanism(b)) continue;
    auto value = [&] { return (U(rng) < 0.25 ? -1 : 1) * logu(0.5, 50.0); };
    for (std::size_t s = 0; s < n; ++s) {
      const double L = b.spans[s].length;
      const int m = 17 + static_cast<int>(logu(1.0, 284.0));
      for (int k = 0; k < m; ++k) {
        const double a = L * U(rng), r = U(rng);
        if (r < 0.35) {
          b.loads.push_back(span_point<double>(s, a, value()));
        } else if (r < 0.55) {
          const double at = U(rng) < 0.1 ? (U(rng) < 0.5 ? 0.0 : L) : a;
          end_couples += at <= 0 || at >= L;
          b.loads.push_back(span_couple<double>(s, at, value() * L));
        } else if (r < 0.7) {
          const double from = U(rng) < 0.2 ? 0.0 : a * U(rng);
          const double to = U(rng) < 0.2 ? L : from + (L - from) * (0.05 + 0.95 * U(rng));
          b.loads.push_back(span_udl<double>(s, from, to, value() / L));
        } else if (r < 0.85) {
          const double c = L * logu(1e-4, 1.0), from = (L - c) * U(rng);
          short_linear += c < 1e-2 * L;
          b.loads.push_back(span_linear<double>(s, from, std::min(from + c, L), value() / L, value() / L));
        } else {  // loads at one position: a force and a couple, two forces, a load ending there
          double at = b.loads.empty() || b.loads.back().index != s
                          ? a : (b.loads.back().type == LoadType::Udl || b.loads.back().type == LoadType::Linear
                                     ? b.loads.back().to : b.loads.back().at);
          if (at <= 0 || at >= L) at = 0.5 * L;
          b.loads.push_back(span_point<double>(s, at, value()));
          b.loads.push_back(U(rng) < 0.5 ? span_couple<double>(s, at, value() * L) : span_point<double>(s, at, value()));
          b.loads.push_back(span_udl<double>(s, at, at + (L - at) * (0.01 + 0.99 * U(rng)), value() / L));
          ++equal_positions;
        }
      }
    }
    const Solution by_sums = stiffness::detail::solve_with_index_above<double>(b, 0);
    const Solution by_loop = stiffness::detail::solve_with_index_above<double>(b, static_cast<std::size_t>(-1));
    const Solution usual = stiffness::solve<double>(b, {});
    ASSERT_EQ(by_sums.status, MethodStatus::Ok) << by_sums.reason;
    ASSERT_EQ(by_loop.status, MethodStatus::Ok) << by_loop.reason;
    ASSERT_EQ(usual.status, MethodStatus::Ok) << usual.reason;
    ++beams;

    struct At { std::size_t span; double x; bool after; };
    std::vector<At> pts;
    for (const Station& st : build_stations(b, 10)) pts.push_back({st.span, st.local, st.after});
    for (const Load& l : b.loads) {
      if (l.on_node) continue;
      for (double x : {l.at, l.from, l.to})
        for (bool after : {false, true}) pts.push_back({l.index, x, after});
    }
    for (int k = 0; k < 200; ++k) {
      const std::size_t s = static_cast<std::size_t>(U(rng) * static_cast<double>(n)) % n;
      pts.push_back({s, b.spans[s].length * U(rng), U(rng) < 0.5});
    }
    enum Kind { kShear, kMoment, kDeflection, kRotation, kKinds };
    const char* const name[kKinds] = {"shear", "moment", "deflection", "rotation"};
    auto kinds = [](const PointValues& v) { return std::vector<double>{v.shear, v.moment, v.deflection, v.rotation}; };
    std::vector<std::vector<double>> loop_values, sum_values, usual_values;
    double big[kKinds] = {1e-300, 1e-300, 1e-300, 1e-300};
    for (const At& p : pts) {
      loop_values.push_back(kinds(by_loop.at(p.span, p.x, p.after)));
      sum_values.push_back(kinds(by_sums.at(p.span, p.x, p.after)));
      usual_values.push_back(kinds(usual.at(p.span, p.x, p.after)));
      for (int k = 0; k < kKinds; ++k)
        big[k] = std::max({big[k], std::abs(loop_values.back()[k]), std::abs(sum_values.back()[k])});
    }
    for (std::size_t i = 0; i < pts.size(); ++i)
      for (int k = 0; k < kKinds; ++k) {
        const double d = std::abs(sum_values[i][k] - loop_values[i][k]) / big[k];
        worst = std::max(worst, d);
        EXPECT_LE(d, 1e-12) << "beam " << beams << ", " << name[k] << " in span " << pts[i].span << " at "
                            << pts[i].x << (pts[i].after ? " (after)" : " (before)") << ": sums "
                            << sum_values[i][k] << ", loop " << loop_values[i][k] << ", largest " << big[k];
        // The usual solve takes the sums here (every span has more than 6 loads).
        EXPECT_LE(std::abs(usual_values[i][k] - sum_values[i][k]), 0.0) << "beam " << beams << ", " << name[k];
      }
    if (HasFailure()) return;
  }
  std::printf("[ measured ] 150 random beams, sums by position vs the loop over loads: worst %.2e of the largest\n",
              worst);
  EXPECT_GT(equal_positions, 100);
  EXPECT_GT(short_linear, 100);
  EXPECT_GT(end_couples, 20);
}

// The special cases for the common pinned/roller shape (rotations-only
// element assembly, tridiagonal factorisation) against the general path of
// the same solver (detail::solve_general: the same solve with the special
// cases switched off), on 300 seeded random beams: three in four of the
// fast path's shape (pinned and roller supports, hinges on rollers), the
// rest with a fixed left end and fixed, guided, spring, free, pinned or
// roller nodes, which the fast path does not take (or takes only for some
// elements). Every span load type (full and partial UDL, linear, point,
// couple, at the span ends too), node loads, settlements, varying L and EI.
// Each quantity agrees to 1e-13 of the largest magnitude of its kind over
// the beam (nodes and stations, both paths): a general law (two paths of
// one derivation), no expected numbers.
TEST(FastPath, RandomBeamsMatchTheGeneralPath) {
  std::mt19937 rng(20261202);
  std::uniform_real_distribution<double> U(0.0, 1.0);
  int fast_shaped = 0, other_shaped = 0;
  for (int trial = 0; trial < 300; ++trial) {
    const bool fast_shape = U(rng) < 0.75;
    (fast_shape ? fast_shaped : other_shaped) += 1;
    const std::size_t n = 1 + static_cast<std::size_t>(U(rng) * 12);
    Beam b;
    for (std::size_t s = 0; s < n; ++s) b.spans.push_back({1.0 + 9.0 * U(rng), 1e3 * (1.0 + 99.0 * U(rng))});
    b.supports.assign(n + 1, Support{});
    for (std::size_t i = 0; i <= n; ++i) {
      Support& sp = b.supports[i];
      if (fast_shape) {
        sp.type = U(rng) < 0.3 ? SupportType::Pinned : SupportType::Roller;
        if (U(rng) < 0.4) sp.settlement = 0.01 * (U(rng) - 0.5);
        if (i > 0 && i < n && sp.type == SupportType::Roller && U(rng) < 0.15) sp.hinge = true;
        continue;
      }
      // Node 0 fixed, so every choice after it is stable (no hinges).
      const double r = U(rng);
      sp.type = i == 0 ? SupportType::Fixed
                : r < 0.2 ? SupportType::Fixed
                : r < 0.35 ? SupportType::Guided
                : r < 0.5 ? SupportType::Spring
                : r < 0.65 ? SupportType::Free
                : r < 0.8 ? SupportType::Pinned
                          : SupportType::Roller;
      if (sp.type == SupportType::Spring) {
        sp.k = 1e2 * (1.0 + 999.0 * U(rng));
        sp.kr = U(rng) < 0.5 ? 0.0 : 1e3 * (1.0 + 99.0 * U(rng));
      }
      if (sp.type != SupportType::Free && sp.type != SupportType::Guided && U(rng) < 0.4)
        sp.settlement = 0.01 * (U(rng) - 0.5);
    }
    for (std::size_t s = 0; s < n; ++s) {
      const double L = b.spans[s].length;
      // At least one load on the first span: a beam with settlements only
      // can have reactions of rounding size only, which the equilibrium
      // check (relative to the loads and reactions) refuses.
      const int count = static_cast<int>(U(rng) * 5) + (s == 0 ? 1 : 0);
      for (int k = 0; k < count; ++k) {
        Load l;
        l.index = s;
        const double r = U(rng);
        if (r < 0.25) {
          l.type = LoadType::Udl; l.w1 = l.w2 = 20.0 * (U(rng) - 0.3);
          if (U(rng) < 0.5) {
            l.from = 0; l.to = L;
          } else {
            l.from = 0.5 * L * U(rng); l.to = l.from + (L - l.from) * (0.1 + 0.9 * U(rng));
          }
        } else if (r < 0.45) {
          l.type = LoadType::Linear; l.w1 = 20.0 * U(rng); l.w2 = 20.0 * (U(rng) - 0.5);
          l.from = 0.5 * L * U(rng); l.to = U(rng) < 0.3 ? L : l.from + (L - l.from) * (0.1 + 0.9 * U(rng));
        } else if (r < 0.75) {
          l.type = LoadType::Point; l.P = 50.0 * (U(rng) - 0.2);
          const double q = U(rng);
          l.at = q < 0.1 ? 0.0 : q < 0.2 ? L : L * U(rng);
        } else {
          l.type = LoadType::Couple; l.C = 40.0 * (U(rng) - 0.5);
          const double q = U(rng);
          l.at = q < 0.1 ? 0.0 : q < 0.2 ? L : L * U(rng);
        }
        b.loads.push_back(l);
      }
    }
    if (U(rng) < 0.5) {  // a node load: a force anywhere, a couple where no hinge is
      Load l;
      l.on_node = true;
      l.index = static_cast<std::size_t>(U(rng) * static_cast<double>(n + 1)) % (n + 1);
      if (b.supports[l.index].hinge || U(rng) < 0.5) {
        l.type = LoadType::Point; l.P = 30.0 * (U(rng) - 0.5);
      } else {
        l.type = LoadType::Couple; l.C = 30.0 * (U(rng) - 0.5);
      }
      b.loads.push_back(l);
    }
    const std::string beam_name = "beam " + std::to_string(trial) + (fast_shape ? " (pinned/roller)" : " (mixed supports)");
    const Solution fast = stiffness::solve<double>(b, {});
    const Solution general = stiffness::detail::solve_general<double>(b);
    ASSERT_EQ(fast.status, MethodStatus::Ok) << beam_name << ": " << fast.reason;
    ASSERT_EQ(general.status, MethodStatus::Ok) << beam_name << ": " << general.reason;
    ASSERT_EQ(fast.nodes.size(), general.nodes.size()) << beam_name;

    // The stations: nine per span and every span load position, each
    // with both limits.
    struct At { std::size_t span; double x; bool after; };
    std::vector<At> stations;
    for (std::size_t s = 0; s < n; ++s)
      for (int k = 0; k <= 8; ++k)
        for (bool after : {false, true}) stations.push_back({s, b.spans[s].length * k / 8.0, after});
    for (const Load& l : b.loads)
      if (!l.on_node && (l.type == LoadType::Point || l.type == LoadType::Couple))
        for (bool after : {false, true}) stations.push_back({l.index, l.at, after});

    // Largest magnitude of each kind, over both answers.
    enum Kind { kMoment, kShear, kReactionForce, kReactionMoment, kDeflection, kRotation, kKinds };
    const char* const kind_name[kKinds] = {"moment", "shear", "reaction force", "reaction moment", "deflection", "rotation"};
    double scale[kKinds];
    std::fill(scale, scale + kKinds, 1e-300);
    auto grow = [&](Kind k, double v) { scale[k] = std::max(scale[k], std::abs(v)); };
    for (const Solution* sol : {&fast, &general}) {
      for (const NodeResult& r : sol->nodes) {
        grow(kReactionForce, r.reaction_force);
        grow(kReactionMoment, r.reaction_moment);
        grow(kMoment, r.moment_left.value_or(0.0));
        grow(kMoment, r.moment_right.value_or(0.0));
        grow(kDeflection, r.deflection);
        grow(kRotation, r.rotation_left);
        grow(kRotation, r.rotation_right);
      }
      for (const At& a : stations) {
        const PointValues v = sol->at(a.span, a.x, a.after);
        grow(kMoment, v.moment);
        grow(kShear, v.shear);
        grow(kDeflection, v.deflection);
        grow(kRotation, v.rotation);
      }
    }
    auto check = [&](Kind k, double p, double q, const std::string& where) {
      EXPECT_LE(std::abs(p - q), 1e-13 * scale[k])
          << beam_name << ", " << kind_name[k] << " at " << where << ": fast " << p << ", general " << q
          << ", largest " << scale[k];
    };
    for (std::size_t i = 0; i < fast.nodes.size(); ++i) {
      const NodeResult& p = fast.nodes[i];
      const NodeResult& q = general.nodes[i];
      const std::string where = "node " + std::to_string(i);
      check(kReactionForce, p.reaction_force, q.reaction_force, where);
      check(kReactionMoment, p.reaction_moment, q.reaction_moment, where);
      check(kDeflection, p.deflection, q.deflection, where);
      check(kRotation, p.rotation_left, q.rotation_left, where + " (left)");
      check(kRotation, p.rotation_right, q.rotation_right, where + " (right)");
      ASSERT_EQ(p.moment_left.has_value(), q.moment_left.has_value()) << beam_name << ", " << where;
      ASSERT_EQ(p.moment_right.has_value(), q.moment_right.has_value()) << beam_name << ", " << where;
      if (p.moment_left) check(kMoment, *p.moment_left, *q.moment_left, where + " (left)");
      if (p.moment_right) check(kMoment, *p.moment_right, *q.moment_right, where + " (right)");
    }
    for (const At& a : stations) {
      const PointValues p = fast.at(a.span, a.x, a.after), q = general.at(a.span, a.x, a.after);
      const std::string where = "span " + std::to_string(a.span) + " x " + std::to_string(a.x) + (a.after ? " after" : " before");
      check(kShear, p.shear, q.shear, where);
      check(kMoment, p.moment, q.moment, where);
      check(kDeflection, p.deflection, q.deflection, where);
      check(kRotation, p.rotation, q.rotation, where);
    }
    if (HasFailure()) return;  // one beam's report is enough
  }
  EXPECT_GE(fast_shaped, 200);  // the brief: at least 200 beams of the fast path's shape
  EXPECT_GE(other_shaped, 30);
}

}  // namespace
}  // namespace trivet
