// One test body, every method (STYLE item 3): the published cases that the
// foundation relies on, run on each of the three independent methods, and
// seeded random beams on which the methods must agree with each other.
//
// Sources of the closed forms (values from memory, as noted):
//  [H]  T. G. Hicks, "Civil Engineering Formulas", 2nd ed., McGraw-Hill,
//       2010: ch. 2 beam formulas, and Table 2.1 "Uniformly loaded
//       continuous beams over equal spans" (edition and values from memory).
//  [R]  W. C. Young, R. G. Budynas, "Roark's Formulas for Stress and
//       Strain", 7th ed., McGraw-Hill, 2002, Table 8.1 (from memory).
#include <gtest/gtest.h>

#include <cmath>
#include <functional>
#include <random>
#include <string>

#include "methods/beam/beam.h"
#include "methods/registry/registry.h"
#include "methods/beam/stability.h"
#include "methods/slope_deflection/slope_deflection.h"
#include "methods/stiffness/stiffness.h"
#include "methods/three_moment/three_moment.h"

namespace trivet {
namespace {

// Every method of the registry (methods/registry), by its letters-only name.
struct MethodParam {
  std::string name;
  registry::Solver<double> solve;
};

// How GoogleTest prints a parameter (its name, not its bytes).
void PrintTo(const MethodParam& p, std::ostream* os) { *os << p.name; }

std::vector<MethodParam> all_methods() {
  std::vector<MethodParam> out;
  for (const auto& m : registry::all()) out.push_back({m.identifier, m.solve});
  return out;
}

Beam beam_of(std::vector<double> lengths, std::vector<SupportType> types, double EI = 1.0) {
  Beam b;
  for (double L : lengths) b.spans.push_back({L, EI});
  for (std::size_t i = 0; i < types.size(); ++i) {
    Support s;
    s.type = types[i];
    b.supports.push_back(s);
    b.labels.push_back(std::string(1, static_cast<char>('A' + i)));
  }
  return b;
}

void udl_all(Beam& b, double w) {
  for (std::size_t s = 0; s < b.spans.size(); ++s) {
    Load l;
    l.type = LoadType::Udl;
    l.index = s;
    l.w1 = l.w2 = w;
    l.from = 0;
    l.to = b.spans[s].length;
    b.loads.push_back(l);
  }
}

class EveryMethod : public ::testing::TestWithParam<MethodParam> {
 protected:
  Solution run(const Beam& b) {
    Solution s = GetParam().solve(b, build_stations(b, 10));
    EXPECT_EQ(s.status, MethodStatus::Ok) << s.reason;
    return s;
  }
};

using T = SupportType;
constexpr double w = 10.0, L = 6.0, EI = 2.0e4, P = 25.0;

// [H] ch. 2, simple beam, uniform load: M_max = wL^2/8, deflection 5wL^4/384EI,
// reactions wL/2.
TEST_P(EveryMethod, SimplySupportedUdl) {
  Beam b = beam_of({L}, {T::Pinned, T::Roller}, EI);
  udl_all(b, w);
  Solution s = run(b);
  ASSERT_EQ(s.status, MethodStatus::Ok);
  auto mid = s.at(0, L / 2, false);
  EXPECT_NEAR(mid.moment, w * L * L / 8, 1e-9 * w * L * L);
  EXPECT_NEAR(mid.deflection, 5 * w * L * L * L * L / (384 * EI), 1e-9 * w * L * L * L * L / EI);
  EXPECT_NEAR(s.nodes[0].reaction_force, w * L / 2, 1e-9 * w * L);
  EXPECT_NEAR(s.nodes[1].reaction_force, w * L / 2, 1e-9 * w * L);
  // [H] end slope of a simple beam under UDL: wL^3/24EI (clockwise at the left).
  EXPECT_NEAR(s.nodes[0].rotation_right, w * L * L * L / (24 * EI), 1e-9 * w * L * L * L / EI);
}

// [H] ch. 2, simple beam, central point load: M = PL/4, deflection PL^3/48EI.
TEST_P(EveryMethod, SimplySupportedCentralPoint) {
  Beam b = beam_of({L}, {T::Pinned, T::Roller}, EI);
  Load l;
  l.type = LoadType::Point; l.index = 0; l.P = P; l.at = L / 2;
  b.loads.push_back(l);
  Solution s = run(b);
  ASSERT_EQ(s.status, MethodStatus::Ok);
  auto mid = s.at(0, L / 2, false);
  EXPECT_NEAR(mid.moment, P * L / 4, 1e-9 * P * L);
  EXPECT_NEAR(mid.deflection, P * L * L * L / (48 * EI), 1e-9 * P * L * L * L / EI);
  // Shear jumps by -P across the load.
  EXPECT_NEAR(s.at(0, L / 2, false).shear - s.at(0, L / 2, true).shear, P, 1e-9 * P);
}

// [H] ch. 2, beam fixed at both ends, uniform load: end moments -wL^2/12,
// midspan wL^2/24, deflection wL^4/384EI.
TEST_P(EveryMethod, FixedFixedUdl) {
  Beam b = beam_of({L}, {T::Fixed, T::Fixed}, EI);
  udl_all(b, w);
  Solution s = run(b);
  ASSERT_EQ(s.status, MethodStatus::Ok);
  const double ref = w * L * L;
  EXPECT_NEAR(*s.nodes[0].moment_right, -ref / 12, 1e-9 * ref);
  EXPECT_NEAR(*s.nodes[1].moment_left, -ref / 12, 1e-9 * ref);
  EXPECT_NEAR(s.nodes[0].reaction_moment, ref / 12, 1e-9 * ref);   // counter-clockwise at A
  EXPECT_NEAR(s.nodes[1].reaction_moment, -ref / 12, 1e-9 * ref);  // clockwise at B
  EXPECT_NEAR(s.at(0, L / 2, false).moment, ref / 24, 1e-9 * ref);
  EXPECT_NEAR(s.at(0, L / 2, false).deflection, w * std::pow(L, 4) / (384 * EI), 1e-9 * w * std::pow(L, 4) / EI);
}

// [H] ch. 2, fixed-fixed, point load at a: M_A = -Pab^2/L^2, M_B = -Pa^2b/L^2,
// R_A = Pb^2(3a+b)/L^3, R_B = Pa^2(a+3b)/L^3.
TEST_P(EveryMethod, FixedFixedPointAtA) {
  const double a = 2.0, bb = L - a;
  Beam b = beam_of({L}, {T::Fixed, T::Fixed}, EI);
  Load l;
  l.type = LoadType::Point; l.index = 0; l.P = P; l.at = a;
  b.loads.push_back(l);
  Solution s = run(b);
  ASSERT_EQ(s.status, MethodStatus::Ok);
  EXPECT_NEAR(*s.nodes[0].moment_right, -P * a * bb * bb / (L * L), 1e-9 * P * L);
  EXPECT_NEAR(*s.nodes[1].moment_left, -P * a * a * bb / (L * L), 1e-9 * P * L);
  EXPECT_NEAR(s.nodes[0].reaction_force, P * bb * bb * (3 * a + bb) / (L * L * L), 1e-9 * P);
  EXPECT_NEAR(s.nodes[1].reaction_force, P * a * a * (a + 3 * bb) / (L * L * L), 1e-9 * P);
}

// [H] ch. 2 / [R] Table 8.1, propped cantilever (fixed at A, prop at B), UDL:
// R_A = 5wL/8, R_B = 3wL/8, M_A = -wL^2/8, max sagging 9wL^2/128 at 3L/8 from B.
TEST_P(EveryMethod, ProppedCantileverUdl) {
  Beam b = beam_of({L}, {T::Fixed, T::Roller}, EI);
  udl_all(b, w);
  Solution s = run(b);
  ASSERT_EQ(s.status, MethodStatus::Ok);
  EXPECT_NEAR(s.nodes[0].reaction_force, 5 * w * L / 8, 1e-9 * w * L);
  EXPECT_NEAR(s.nodes[1].reaction_force, 3 * w * L / 8, 1e-9 * w * L);
  EXPECT_NEAR(*s.nodes[0].moment_right, -w * L * L / 8, 1e-9 * w * L * L);
  auto p = s.at(0, L - 3 * L / 8, false);
  EXPECT_NEAR(p.moment, 9 * w * L * L / 128, 1e-9 * w * L * L);
  EXPECT_NEAR(p.shear, 0.0, 1e-9 * w * L);
}

// [H] ch. 2, cantilever with end load: M = -PL at the root, tip deflection PL^3/3EI.
TEST_P(EveryMethod, CantileverTipLoad) {
  Beam b = beam_of({L}, {T::Fixed, T::Free}, EI);
  Load l;
  l.type = LoadType::Point; l.on_node = true; l.index = 1; l.P = P;
  b.loads.push_back(l);
  Solution s = run(b);
  ASSERT_EQ(s.status, MethodStatus::Ok);
  EXPECT_NEAR(*s.nodes[0].moment_right, -P * L, 1e-9 * P * L);
  EXPECT_NEAR(s.nodes[0].reaction_moment, P * L, 1e-9 * P * L);
  EXPECT_NEAR(s.nodes[1].deflection, P * L * L * L / (3 * EI), 1e-9 * P * L * L * L / EI);
  EXPECT_NEAR(s.nodes[1].rotation_left, P * L * L / (2 * EI), 1e-9 * P * L * L / EI);
}

// [H] ch. 2, cantilever with UDL: root moment -wL^2/2, tip deflection wL^4/8EI.
TEST_P(EveryMethod, CantileverUdl) {
  Beam b = beam_of({L}, {T::Fixed, T::Free}, EI);
  udl_all(b, w);
  Solution s = run(b);
  ASSERT_EQ(s.status, MethodStatus::Ok);
  EXPECT_NEAR(*s.nodes[0].moment_right, -w * L * L / 2, 1e-9 * w * L * L);
  EXPECT_NEAR(s.nodes[1].deflection, w * std::pow(L, 4) / (8 * EI), 1e-9 * w * std::pow(L, 4) / EI);
}

// [H] Table 2.1: two equal spans, UDL: M_B = -0.125 wL^2; reactions 0.375,
// 1.25, 0.375 wL. Tolerances from the printed digits (half a unit in the last
// printed place).
TEST_P(EveryMethod, TwoEqualSpansUdlTable) {
  Beam b = beam_of({L, L}, {T::Pinned, T::Roller, T::Roller}, EI);
  udl_all(b, w);
  Solution s = run(b);
  ASSERT_EQ(s.status, MethodStatus::Ok);
  EXPECT_NEAR(*s.nodes[1].moment_left / (w * L * L), -0.125, 0.0005);
  EXPECT_NEAR(s.nodes[0].reaction_force / (w * L), 0.375, 0.0005);
  EXPECT_NEAR(s.nodes[1].reaction_force / (w * L), 1.25, 0.005);
  EXPECT_NEAR(s.nodes[2].reaction_force / (w * L), 0.375, 0.0005);
}

// [H] Table 2.1: three equal spans, UDL: M_B = M_C = -0.100 wL^2; reactions
// 0.4, 1.1, 1.1, 0.4 wL.
TEST_P(EveryMethod, ThreeEqualSpansUdlTable) {
  Beam b = beam_of({L, L, L}, {T::Pinned, T::Roller, T::Roller, T::Roller}, EI);
  udl_all(b, w);
  Solution s = run(b);
  ASSERT_EQ(s.status, MethodStatus::Ok);
  EXPECT_NEAR(*s.nodes[1].moment_left / (w * L * L), -0.100, 0.0005);
  EXPECT_NEAR(*s.nodes[2].moment_left / (w * L * L), -0.100, 0.0005);
  EXPECT_NEAR(s.nodes[0].reaction_force / (w * L), 0.4, 0.05);
  EXPECT_NEAR(s.nodes[1].reaction_force / (w * L), 1.1, 0.05);
}

// [H] Table 2.1: four equal spans, UDL: M_B = -0.1071, M_C = -0.0714 wL^2;
// reactions 0.393, 1.143, 0.929 wL.
TEST_P(EveryMethod, FourEqualSpansUdlTable) {
  Beam b = beam_of({L, L, L, L}, {T::Pinned, T::Roller, T::Roller, T::Roller, T::Roller}, EI);
  udl_all(b, w);
  Solution s = run(b);
  ASSERT_EQ(s.status, MethodStatus::Ok);
  EXPECT_NEAR(*s.nodes[1].moment_left / (w * L * L), -0.1071, 0.00005);
  EXPECT_NEAR(*s.nodes[2].moment_left / (w * L * L), -0.0714, 0.00005);
  EXPECT_NEAR(s.nodes[0].reaction_force / (w * L), 0.393, 0.0005);
  EXPECT_NEAR(s.nodes[1].reaction_force / (w * L), 1.143, 0.0005);
  EXPECT_NEAR(s.nodes[2].reaction_force / (w * L), 0.929, 0.0005);
}

// Fixed-fixed span with one end settled by D: end moments 6EI D/L^2 (hogging at
// the end that did not move... signs by the jump rules), reactions 12EI D/L^3
// ([R] Table 8.1 case of a fixed-fixed beam with end displacement; from memory).
TEST_P(EveryMethod, FixedFixedSettlement) {
  const double D = 0.01;
  Beam b = beam_of({L}, {T::Fixed, T::Fixed}, EI);
  b.supports[1].settlement = D;
  Solution s = run(b);
  ASSERT_EQ(s.status, MethodStatus::Ok);
  const double M = 6 * EI * D / (L * L), R = 12 * EI * D / (L * L * L);
  // The right end drops: the beam hogs at A (tension on top... the span is
  // pulled down at B): M(0) = +6EID/L^2? The curve v = D(3x^2/L^2 - 2x^3/L^3)
  // gives EI v'' = EI D (6/L^2 - 12x/L^3), so M = -EI v'' = -6EID/L^2 at A and
  // +6EID/L^2 at B; R_A = V(0) = dM/dx = 12EID/L^3 (upward).
  EXPECT_NEAR(*s.nodes[0].moment_right, -M, 1e-9 * M);
  EXPECT_NEAR(*s.nodes[1].moment_left, M, 1e-9 * M);
  EXPECT_NEAR(s.nodes[0].reaction_force, R, 1e-9 * R);
  EXPECT_NEAR(s.nodes[1].reaction_force, -R, 1e-9 * R);
  EXPECT_NEAR(s.nodes[1].deflection, D, 1e-12);
}

// A beam of two equal spans L on three equal springs k under a UDL w on
// both spans (closed form derived here): by symmetry R_A = R_C = R1 and
// 2 R1 + R2 = 2wL; B's spring shortens by (R2 - R1)/k more than A's and
// C's, which is the midspan deflection of a simple span 2L under w less
// that of R2 at its middle: 5w(2L)^4/(384EI) - R2 (2L)^3/(48EI) (Roark's
// Formulas for Stress and Strain, 7th ed., Table 8.1 cases 2e and 1e, from
// memory). So R2 = (wL/k + 5wL^4/(24EI)) / (3/(2k) + L^3/(6EI)); its limits
// are 10wL/8 (rigid supports) and 2wL/3 (a rigid beam on soft springs).
TEST_P(EveryMethod, TwoSpansOnThreeSprings) {
  const double Ls = 5, ws = 10, EIs = 2e4;
  for (double k : {1e2, 1e3, 1e4, 1e7}) {
    Beam b = beam_of({Ls, Ls}, {T::Spring, T::Spring, T::Spring}, EIs);
    for (auto& s : b.supports) s.k = k;
    udl_all(b, ws);
    const Solution s = GetParam().solve(b, build_stations(b, 4));
    ASSERT_EQ(s.status, MethodStatus::Ok) << s.reason;
    const double R2 = (ws * Ls / k + 5 * ws * Ls * Ls * Ls * Ls / (24 * EIs)) / (3 / (2 * k) + Ls * Ls * Ls / (6 * EIs));
    const double R1 = (2 * ws * Ls - R2) / 2;
    EXPECT_NEAR(s.nodes[1].reaction_force, R2, 1e-9 * ws * Ls) << "k " << k;
    EXPECT_NEAR(s.nodes[0].reaction_force, R1, 1e-9 * ws * Ls) << "k " << k;
    EXPECT_NEAR(s.nodes[2].reaction_force, R1, 1e-9 * ws * Ls) << "k " << k;
    EXPECT_NEAR(s.nodes[1].deflection, R2 / k, 1e-9 * R2 / k) << "k " << k;
  }
}

INSTANTIATE_TEST_SUITE_P(Methods, EveryMethod, ::testing::ValuesIn(all_methods()),
                         [](const ::testing::TestParamInfo<MethodParam>& i) { return i.param.name; });

// ---------------------------------------------------------------------------
// Seeded random beams: every method against every other, at every node and
// at points between the stations. The methods share no solving code, so
// agreement to 1e-9 of the largest value of each kind confirms each of them.

struct RandomOptions {
  bool springs_and_guided;
  bool free_interior_nodes;
  bool hinges_on_springs = false;  // also a hinge at a spring without kr
};

Beam random_beam(std::mt19937& rng, const RandomOptions& o) {
  std::uniform_real_distribution<double> U(0.0, 1.0);
  for (;;) {
    Beam b;
    const std::size_t n = 1 + rng() % 6;
    const double EI0 = 1e3 + 1e5 * U(rng);
    for (std::size_t i = 0; i < n; ++i) b.spans.push_back({1.0 + 9.0 * U(rng), U(rng) < 0.3 ? EI0 * (0.3 + 2 * U(rng)) : EI0});
    for (std::size_t i = 0; i <= n; ++i) {
      Support s;
      const bool end = i == 0 || i == n;
      std::vector<T> pool = {T::Pinned, T::Roller, T::Fixed, T::Pinned};
      if (end) pool.push_back(T::Free);
      else if (o.free_interior_nodes) pool.push_back(T::Free);
      if (o.springs_and_guided) { pool.push_back(T::Spring); pool.push_back(T::Guided); }
      s.type = pool[rng() % pool.size()];
      if (s.type == T::Spring) {
        s.k = 1e2 + 1e4 * U(rng);
        if (U(rng) < 0.4) s.kr = 1e3 + 1e5 * U(rng);
      }
      if (restrains_deflection(s.type) && U(rng) < 0.25) s.settlement = 0.01 * (U(rng) - 0.5);
      if (s.type == T::Spring && U(rng) < 0.25) s.settlement = 0.005 * U(rng);
      if (!end && (s.type == T::Pinned || s.type == T::Roller || (o.free_interior_nodes && s.type == T::Free)) && U(rng) < 0.15)
        s.hinge = true;
      if (o.hinges_on_springs && !end && s.type == T::Spring && s.kr <= 0.0 && U(rng) < 0.3) s.hinge = true;
      b.supports.push_back(s);
      b.labels.push_back("N" + std::to_string(i + 1));
    }
    if (!o.free_interior_nodes)
      for (std::size_t i = 1; i < n; ++i)
        if (b.supports[i].type == T::Free) b.supports[i].type = T::Roller;
    // Three-moment merges free interior nodes only between equal EI.
    if (o.free_interior_nodes && !o.springs_and_guided)
      for (std::size_t i = 1; i < n; ++i)
        if (b.supports[i].type == T::Free) { b.spans[i].EI = b.spans[i - 1].EI; b.supports[i].hinge = false; }
    if (find_mechanism(b)) continue;
    const std::size_t nl = 1 + rng() % (2 * n + 1);
    for (std::size_t k = 0; k < nl; ++k) {
      Load l;
      l.index = rng() % n;
      const double Ls = b.spans[l.index].length;
      switch (rng() % 5) {
        case 0: l.type = LoadType::Point; l.P = 50 * (U(rng) - 0.3); l.at = Ls * (0.05 + 0.9 * U(rng)); break;
        case 1: l.type = LoadType::Udl; l.w1 = l.w2 = 20 * (U(rng) - 0.2); l.from = 0; l.to = Ls; break;
        case 2: {
          l.type = LoadType::Udl; l.w1 = l.w2 = 20 * U(rng);
          double a = Ls * U(rng), c = Ls * U(rng);
          if (a > c) std::swap(a, c);
          if (c - a < 0.05 * Ls) { a = 0; c = Ls; }
          l.from = a; l.to = c; break;
        }
        case 3: {
          l.type = LoadType::Linear; l.w1 = 20 * (U(rng) - 0.3); l.w2 = 20 * (U(rng) - 0.3);
          double a = Ls * U(rng), c = Ls * U(rng);
          if (a > c) std::swap(a, c);
          if (c - a < 0.05 * Ls) { a = 0; c = Ls; }
          l.from = a; l.to = c; break;
        }
        default: {
          l.type = LoadType::Couple; l.C = 30 * (U(rng) - 0.5); l.at = Ls * (0.05 + 0.9 * U(rng));
          if (U(rng) < 0.3) {
            // A couple at a node (not at a hinge).
            const std::size_t node = rng() % (n + 1);
            if (!b.supports[node].hinge) { l.on_node = true; l.index = node; l.at = 0; }
          }
        }
      }
      if (U(rng) < 0.15) {
        Load p;
        p.type = LoadType::Point; p.on_node = true; p.index = rng() % (n + 1); p.P = 40 * (U(rng) - 0.3);
        b.loads.push_back(p);
      }
      b.loads.push_back(l);
    }
    return b;
  }
}

double scale_of(const std::vector<double>& v) {
  double s = 0;
  for (double x : v) s = std::max(s, std::abs(x));
  return s;
}

void expect_agree(const Beam& b, const Solution& A, const Solution& B, const std::string& what, int seed) {
  ASSERT_EQ(A.nodes.size(), B.nodes.size());
  std::vector<double> M, V, R, D, Rot;
  std::vector<std::array<double, 4>> pa, pb;
  std::mt19937 rng(static_cast<unsigned>(seed) * 7919u + 1);
  std::uniform_real_distribution<double> U(0.0, 1.0);
  for (std::size_t s = 0; s < b.spans.size(); ++s)
    for (int k = 0; k < 7; ++k) {
      const double t = k == 0 ? 0.0 : k == 6 ? b.spans[s].length : b.spans[s].length * U(rng);
      auto a = A.at(s, t, false), c = B.at(s, t, false);
      pa.push_back({a.moment, a.shear, a.deflection, a.rotation});
      pb.push_back({c.moment, c.shear, c.deflection, c.rotation});
      M.push_back(a.moment); V.push_back(a.shear); D.push_back(a.deflection); Rot.push_back(a.rotation);
    }
  for (const auto& n : A.nodes) { R.push_back(n.reaction_force); M.push_back(n.reaction_moment); D.push_back(n.deflection); }
  // A kind that is zero everywhere (no shear under couples alone) is measured
  // against its partner kind: forces against moments per length, and so on.
  double total = 0;
  for (const auto& sp : b.spans) total += sp.length;
  const double fm = std::max(scale_of(M), 1e-300), ff = std::max({scale_of(V), scale_of(R), fm / total});
  const double sm = std::max(fm, ff * total), sv = ff, sr = ff;
  const double dd = std::max(scale_of(D), 1e-300), dt = std::max(scale_of(Rot), dd / total);
  const double sd = std::max(dd, dt * total), st = dt;
  const double tol = 1e-9;
  for (std::size_t i = 0; i < pa.size(); ++i) {
    EXPECT_NEAR(pa[i][0], pb[i][0], tol * sm) << what << " moment, point " << i << ", seed " << seed;
    EXPECT_NEAR(pa[i][1], pb[i][1], tol * sv) << what << " shear, point " << i << ", seed " << seed;
    EXPECT_NEAR(pa[i][2], pb[i][2], tol * sd) << what << " deflection, point " << i << ", seed " << seed;
    EXPECT_NEAR(pa[i][3], pb[i][3], tol * st) << what << " rotation, point " << i << ", seed " << seed;
  }
  for (std::size_t j = 0; j < A.nodes.size(); ++j) {
    const auto& x = A.nodes[j];
    const auto& y = B.nodes[j];
    EXPECT_NEAR(x.reaction_force, y.reaction_force, tol * sr) << what << " reaction at node " << j << ", seed " << seed;
    EXPECT_NEAR(x.reaction_moment, y.reaction_moment, tol * sm) << what << " reaction moment at node " << j << ", seed " << seed;
    EXPECT_NEAR(x.deflection, y.deflection, tol * sd) << what << " deflection at node " << j << ", seed " << seed;
    EXPECT_NEAR(x.rotation_left, y.rotation_left, tol * st) << what << " rotation left at node " << j << ", seed " << seed;
    EXPECT_NEAR(x.rotation_right, y.rotation_right, tol * st) << what << " rotation right at node " << j << ", seed " << seed;
    ASSERT_EQ(x.moment_left.has_value(), y.moment_left.has_value());
    ASSERT_EQ(x.moment_right.has_value(), y.moment_right.has_value());
    if (x.moment_left) {
      EXPECT_NEAR(*x.moment_left, *y.moment_left, tol * sm) << what << " moment left at node " << j << ", seed " << seed;
    }
    if (x.moment_right) {
      EXPECT_NEAR(*x.moment_right, *y.moment_right, tol * sm) << what << " moment right at node " << j << ", seed " << seed;
    }
  }
}

TEST(RandomBeams, ThreeMomentAgreesWithStiffness) {
  for (int seed = 1; seed <= 300; ++seed) {
    std::mt19937 rng(static_cast<unsigned>(seed));
    Beam b = random_beam(rng, {true, true, true});
    auto st = build_stations(b, 10);
    Solution a = three_moment::solve<double>(b, st);
    Solution c = stiffness::solve<double>(b, st);
    ASSERT_EQ(c.status, MethodStatus::Ok) << c.reason << " seed " << seed;
    // Every stable beam is within the three-moment method's scope.
    ASSERT_EQ(a.status, MethodStatus::Ok) << a.reason << " seed " << seed;
    expect_agree(b, a, c, "three-moment vs stiffness", seed);
    if (HasFailure()) return;
  }
}

TEST(RandomBeams, SlopeDeflectionAgreesWithStiffness) {
  for (int seed = 1; seed <= 300; ++seed) {
    std::mt19937 rng(static_cast<unsigned>(seed) + 100000u);
    Beam b = random_beam(rng, {true, true});
    auto st = build_stations(b, 10);
    Solution a = slope_deflection::solve<double>(b, st);
    Solution c = stiffness::solve<double>(b, st);
    ASSERT_EQ(a.status, MethodStatus::Ok) << a.reason << " seed " << seed;
    ASSERT_EQ(c.status, MethodStatus::Ok) << c.reason << " seed " << seed;
    expect_agree(b, a, c, "slope-deflection vs stiffness", seed);
    if (HasFailure()) return;
  }
}

TEST(RandomBeams, ThreeMomentAgreesWithSlopeDeflection) {
  for (int seed = 1; seed <= 300; ++seed) {
    std::mt19937 rng(static_cast<unsigned>(seed) + 200000u);
    Beam b = random_beam(rng, {false, false});
    auto st = build_stations(b, 10);
    Solution a = three_moment::solve<double>(b, st);
    Solution c = slope_deflection::solve<double>(b, st);
    ASSERT_EQ(a.status, MethodStatus::Ok) << a.reason << " seed " << seed;
    ASSERT_EQ(c.status, MethodStatus::Ok) << c.reason << " seed " << seed;
    expect_agree(b, a, c, "three-moment vs slope-deflection", seed);
    if (HasFailure()) return;
  }
}

// Many loads on every span (17 to 60, of every kind): the stiffness method
// then recovers values inside a span from sums of its loads by position
// instead of its loop over them (methods/stiffness/stiffness_recovery.h);
// the other two methods must still agree with it.
void add_many_loads(Beam& b, std::mt19937& rng) {
  std::uniform_real_distribution<double> U(0.0, 1.0);
  for (std::size_t s = 0; s < b.spans.size(); ++s) {
    const double Ls = b.spans[s].length;
    const int m = 17 + static_cast<int>(rng() % 44);
    for (int k = 0; k < m; ++k) {
      Load l;
      l.index = s;
      double a = Ls * U(rng), c = Ls * U(rng);
      if (a > c) std::swap(a, c);
      if (c - a < 0.01 * Ls) { a = 0; c = Ls; }
      switch (rng() % 4) {
        case 0: l.type = LoadType::Point; l.P = 5 * (U(rng) - 0.3); l.at = Ls * (0.02 + 0.96 * U(rng)); break;
        case 1: l.type = LoadType::Udl; l.w1 = l.w2 = 2 * (U(rng) - 0.2); l.from = a; l.to = c; break;
        case 2: l.type = LoadType::Linear; l.w1 = 2 * (U(rng) - 0.3); l.w2 = 2 * (U(rng) - 0.3); l.from = a; l.to = c; break;
        default: l.type = LoadType::Couple; l.C = 3 * (U(rng) - 0.5); l.at = Ls * (0.02 + 0.96 * U(rng));
      }
      b.loads.push_back(l);
    }
  }
}

TEST(RandomBeams, ManyLoadsPerSpanEveryMethodAgreesWithStiffness) {
  int compared_tm = 0;
  for (int seed = 1; seed <= 60; ++seed) {
    std::mt19937 rng(static_cast<unsigned>(seed) + 300000u);
    Beam b = random_beam(rng, {seed % 2 == 0, true});
    add_many_loads(b, rng);
    auto st = build_stations(b, 10);
    Solution c = stiffness::solve<double>(b, st);
    ASSERT_EQ(c.status, MethodStatus::Ok) << c.reason << " seed " << seed;
    Solution d = slope_deflection::solve<double>(b, st);
    ASSERT_EQ(d.status, MethodStatus::Ok) << d.reason << " seed " << seed;
    expect_agree(b, d, c, "many loads: slope-deflection vs stiffness", seed);
    Solution a = three_moment::solve<double>(b, st);
    ASSERT_EQ(a.status, MethodStatus::Ok) << a.reason << " seed " << seed;  // every beam (springs, guided, hinges)
    expect_agree(b, a, c, "many loads: three-moment vs stiffness", seed);
    ++compared_tm;
    if (HasFailure()) return;
  }
  EXPECT_EQ(compared_tm, 60);
}

// The three-moment method in double against an exact solution of the same
// beam: slope-deflection in exact rational arithmetic (cpp_rational),
// called through its public header. Every support type (springs with and
// without kr, guided), hinges (also at springs), unsupported nodes between
// spans of different EI, settlements, every load type. Agreement to 1e-9 of
// the largest value of each kind, at every node and at seven points a span.
// The exact solution is wrapped as a double Solution (each value rounded
// once) so that the comparison is expect_agree's.
Solution rounded(const BasicSolution<Exact>& e) {
  Solution s;
  s.status = e.status;
  s.reason = e.reason;
  auto d = [](const Exact& x) { return static_cast<double>(x); };
  for (const auto& n : e.nodes) {
    NodeResult r;
    r.x = d(n.x);
    if (n.moment_left) r.moment_left = d(*n.moment_left);
    if (n.moment_right) r.moment_right = d(*n.moment_right);
    r.reaction_force = d(n.reaction_force);
    r.reaction_moment = d(n.reaction_moment);
    r.deflection = d(n.deflection);
    r.rotation_left = d(n.rotation_left);
    r.rotation_right = d(n.rotation_right);
    s.nodes.push_back(r);
  }
  auto at = e.at;
  s.at = [at, d](std::size_t span, const double& local, bool after) {
    const BasicPointValues<Exact> p = at(span, Exact(local), after);
    return PointValues{d(p.shear), d(p.moment), d(p.deflection), d(p.rotation)};
  };
  return s;
}

// The random beams of the exact comparisons: every feature, a few spans
// (the rationals of random doubles grow with the number of spans).
Beam exact_test_beam(int seed) {
  std::mt19937 rng(static_cast<unsigned>(seed) + 300000u);
  for (;;) {
    Beam b = random_beam(rng, {true, true, true});
    if (b.spans.size() <= 4) return b;
  }
}

TEST(RandomBeams, ThreeMomentMatchesAnExactSolution) {
  int springs = 0, guided = 0, hinges = 0, free_steps = 0;
  for (int seed = 1; seed <= 150; ++seed) {
    const Beam b = exact_test_beam(seed);
    const BasicBeam<Exact> be = beam_cast<Exact>(b);
    const BasicSolution<Exact> ref = slope_deflection::solve<Exact>(be, build_stations(be, 2));
    ASSERT_EQ(ref.status, MethodStatus::Ok) << ref.reason << " seed " << seed;
    const Solution a = three_moment::solve<double>(b, build_stations(b, 10));
    ASSERT_EQ(a.status, MethodStatus::Ok) << a.reason << " seed " << seed;
    expect_agree(b, a, rounded(ref), "three-moment (double) vs exact slope-deflection", seed);
    if (HasFailure()) return;
    for (std::size_t i = 0; i < b.supports.size(); ++i) {
      springs += b.supports[i].type == T::Spring;
      guided += b.supports[i].type == T::Guided;
      hinges += b.supports[i].hinge;
      free_steps += i > 0 && i + 1 < b.supports.size() && b.supports[i].type == T::Free &&
                    (b.spans[i - 1].EI < b.spans[i].EI || b.spans[i].EI < b.spans[i - 1].EI);
    }
  }
  // The features were exercised (a collapse would mean a silent generator).
  EXPECT_GE(springs, 20);
  EXPECT_GE(guided, 20);
  EXPECT_GE(hinges, 10);
  EXPECT_GE(free_steps, 3);
}

// The same beams, three-moment in exact arithmetic: exactly the exact
// slope-deflection answer (two exact solutions of the same beam are the
// same rationals), at every node and at points inside every span.
TEST(RandomBeams, ThreeMomentExactEqualsExactSlopeDeflection) {
  for (int seed = 1; seed <= 60; ++seed) {
    const Beam b = exact_test_beam(seed);
    const BasicBeam<Exact> be = beam_cast<Exact>(b);
    const auto stations = build_stations(be, 2);
    const BasicSolution<Exact> ref = slope_deflection::solve<Exact>(be, stations);
    const BasicSolution<Exact> tm = three_moment::solve<Exact>(be, stations);
    ASSERT_EQ(ref.status, MethodStatus::Ok) << ref.reason << " seed " << seed;
    ASSERT_EQ(tm.status, MethodStatus::Ok) << tm.reason << " seed " << seed;
    ASSERT_EQ(tm.nodes.size(), ref.nodes.size());
    for (std::size_t i = 0; i < tm.nodes.size(); ++i) {
      const auto &p = tm.nodes[i], &q = ref.nodes[i];
      EXPECT_TRUE(p.moment_left == q.moment_left && p.moment_right == q.moment_right) << "seed " << seed << " node " << i;
      EXPECT_TRUE(p.reaction_force == q.reaction_force) << "seed " << seed << " node " << i;
      EXPECT_TRUE(p.reaction_moment == q.reaction_moment) << "seed " << seed << " node " << i;
      EXPECT_TRUE(p.deflection == q.deflection) << "seed " << seed << " node " << i;
      EXPECT_TRUE(p.rotation_left == q.rotation_left && p.rotation_right == q.rotation_right)
          << "seed " << seed << " node " << i;
    }
    for (const auto& sn : stations) {
      const auto p = tm.at(sn.span, sn.local, sn.after), q = ref.at(sn.span, sn.local, sn.after);
      EXPECT_TRUE(p.moment == q.moment && p.shear == q.shear && p.deflection == q.deflection && p.rotation == q.rotation)
          << "seed " << seed << " span " << sn.span << " at " << static_cast<double>(sn.local);
    }
    if (HasFailure()) return;
  }
}

}  // namespace
}  // namespace trivet

namespace trivet {
namespace {

// Each method's fast path against its general path, through the seams the
// methods declare for tests (detail::solve_general), on random common beams
// (pinned, roller and fixed supports, settlements, every span load type,
// loads in span order: what the fast paths take). The two are different
// code for the same mechanics, so they agree to 1e-13 of the largest value
// of each quantity, not bitwise.
struct FastAndGeneral {
  std::string name;
  registry::Solver<double> fast;
  std::function<Solution(const Beam&, const std::vector<Station>&)> general;
};
void PrintTo(const FastAndGeneral& p, std::ostream* os) { *os << p.name; }

class FastEqualsGeneral : public ::testing::TestWithParam<FastAndGeneral> {};

TEST_P(FastEqualsGeneral, OnRandomCommonBeams) {
  std::mt19937 rng(20261204);
  int compared = 0;
  for (int trial = 0; trial < 250; ++trial) {
    Beam b = random_beam(rng, {false, false});
    // Common beams only: no hinge, no free end, no load at a node.
    for (auto& s : b.supports) {
      s.hinge = false;
      if (s.type == T::Free) s.type = T::Roller;
    }
    b.loads.erase(std::remove_if(b.loads.begin(), b.loads.end(), [](const Load& l) { return l.on_node; }), b.loads.end());
    std::stable_sort(b.loads.begin(), b.loads.end(), [](const Load& x, const Load& y) { return x.index < y.index; });
    if (b.loads.empty() || find_mechanism(b)) continue;
    const std::vector<Station> st = build_stations(b, 4);
    const Solution f = GetParam().fast(b, st), g = GetParam().general(b, st);
    ASSERT_EQ(f.status, MethodStatus::Ok) << f.reason << " trial " << trial;
    ASSERT_EQ(g.status, MethodStatus::Ok) << g.reason << " trial " << trial;
    ASSERT_EQ(f.nodes.size(), g.nodes.size());
    // The largest magnitude of each kind, from the general path.
    double sm = 0, sv = 0, sd = 0, sr = 0, sf = 0;
    for (const auto& n : g.nodes) {
      sm = std::max({sm, std::abs(n.moment_left.value_or(0)), std::abs(n.moment_right.value_or(0)), std::abs(n.reaction_moment)});
      sf = std::max(sf, std::abs(n.reaction_force));
      sd = std::max(sd, std::abs(n.deflection));
      sr = std::max({sr, std::abs(n.rotation_left), std::abs(n.rotation_right)});
    }
    std::vector<PointValues> gv;
    for (const auto& s : st) {
      gv.push_back(g.at(s.span, s.local, s.after));
      sm = std::max(sm, std::abs(gv.back().moment));
      sv = std::max(sv, std::abs(gv.back().shear));
      sd = std::max(sd, std::abs(gv.back().deflection));
      sr = std::max(sr, std::abs(gv.back().rotation));
    }
    sv = std::max(sv, sf);
    auto near = [&](double a, double c, double scale, const std::string& what) {
      EXPECT_LE(std::abs(a - c), 1e-13 * scale + 1e-300) << what << " trial " << trial << ": fast " << a << ", general " << c;
    };
    for (std::size_t i = 0; i < f.nodes.size(); ++i) {
      const auto &p = f.nodes[i], &q = g.nodes[i];
      const std::string where = "node " + std::to_string(i);
      ASSERT_EQ(p.moment_left.has_value(), q.moment_left.has_value()) << where;
      ASSERT_EQ(p.moment_right.has_value(), q.moment_right.has_value()) << where;
      if (p.moment_left) near(*p.moment_left, *q.moment_left, sm, where + " moment left");
      if (p.moment_right) near(*p.moment_right, *q.moment_right, sm, where + " moment right");
      near(p.reaction_force, q.reaction_force, sv, where + " reaction");
      near(p.reaction_moment, q.reaction_moment, sm, where + " reaction moment");
      near(p.deflection, q.deflection, sd, where + " deflection");
      near(p.rotation_left, q.rotation_left, sr, where + " rotation left");
      near(p.rotation_right, q.rotation_right, sr, where + " rotation right");
    }
    for (std::size_t k = 0; k < st.size(); ++k) {
      const PointValues p = f.at(st[k].span, st[k].local, st[k].after);
      const std::string where = "station " + std::to_string(k);
      near(p.shear, gv[k].shear, sv, where + " shear");
      near(p.moment, gv[k].moment, sm, where + " moment");
      near(p.deflection, gv[k].deflection, sd, where + " deflection");
      near(p.rotation, gv[k].rotation, sr, where + " rotation");
    }
    ++compared;
    if (HasFailure()) return;
  }
  EXPECT_GE(compared, 150);
}

INSTANTIATE_TEST_SUITE_P(
    Methods, FastEqualsGeneral,
    ::testing::Values(
        FastAndGeneral{"ThreeMoment", &three_moment::solve<double>,
                       [](const Beam& b, const std::vector<Station>& s) { return three_moment::detail::solve_general<double>(b, s); }},
        FastAndGeneral{"SlopeDeflection", &slope_deflection::solve<double>,
                       [](const Beam& b, const std::vector<Station>& s) { return slope_deflection::detail::solve_general<double>(b, s); }},
        // The stiffness method's seam takes the beam only: it uses no stations.
        FastAndGeneral{"Stiffness", &stiffness::solve<double>,
                       [](const Beam& b, const std::vector<Station>&) { return stiffness::detail::solve_general<double>(b); }}),
    [](const ::testing::TestParamInfo<FastAndGeneral>& i) { return i.param.name; });

}  // namespace
}  // namespace trivet

namespace trivet {
namespace {

// A method that gives no answer says why with a stable id
// (methods/beam/status.h), the same in every method: a couple on an
// interior hinge (which the reader refuses, so it can only come from a
// caller that skips the reader) is a feature no method takes; a load past
// the end of its span is a fault upstream; and an answer always has no id.
class MethodReasons : public ::testing::TestWithParam<MethodParam> {};

TEST_P(MethodReasons, NoAnswerCarriesItsStableId) {
  Beam b = beam_of({3, 3}, {SupportType::Fixed, SupportType::Free, SupportType::Roller}, 1e4);
  b.supports[1].hinge = true;
  Load c;
  c.type = LoadType::Couple; c.on_node = true; c.index = 1; c.C = 5;
  b.loads = {c};
  const Solution hinge = GetParam().solve(b, build_stations(b, 2));
  EXPECT_EQ(hinge.status, MethodStatus::NotApplicable) << hinge.reason;
  EXPECT_EQ(hinge.reason_id, "method.not_applicable.feature") << hinge.reason;

  Beam ok = beam_of({3, 3}, {SupportType::Pinned, SupportType::Roller, SupportType::Roller}, 1e4);
  udl_all(ok, 2);
  const Solution fine = GetParam().solve(ok, build_stations(ok, 2));
  EXPECT_EQ(fine.status, MethodStatus::Ok) << fine.reason;
  EXPECT_EQ(fine.reason_id, "");

  Load far;
  far.type = LoadType::Point; far.index = 0; far.P = 1; far.at = 4;  // span 1 is 3 long
  ok.loads = {far};
  const Solution off = GetParam().solve(ok, build_stations(ok, 2));
  EXPECT_NE(off.status, MethodStatus::Ok);
  EXPECT_FALSE(off.reason_id.empty()) << off.reason;
  EXPECT_EQ(off.reason_id.rfind("method.", 0), 0u) << off.reason_id;
}

INSTANTIATE_TEST_SUITE_P(Methods, MethodReasons, ::testing::ValuesIn(all_methods()),
                         [](const ::testing::TestParamInfo<MethodParam>& i) { return i.param.name; });

}  // namespace
}  // namespace trivet
