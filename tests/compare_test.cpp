// The cross-check harness: agreement, the odd one out, unconfirmed beams,
// equilibrium residuals, and claims at the edge of their tolerance.
//
// Reference values: simply supported beam under UDL, M = wL^2/8 at midspan,
// reactions wL/2 (T. G. Hicks, "Civil Engineering Formulas", 2nd ed.,
// McGraw-Hill, 2010, ch. 2 beam formulas; from memory). Two equal spans under
// UDL: M_B = -wL^2/8 (same book, Table 2.1; from memory).
#include <gtest/gtest.h>

#include "harness/compare/compare.h"

namespace trivet::compare {
namespace {

// w = 10 kN/m, L = 6 m: wL^2/8 = 45 kN*m, wL/2 = 30 kN.
std::string simple_beam(const std::string& claims) {
  return R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 6, "EI": 20000}], "supports": ["pinned", "roller"],
    "loads": [{"type": "udl", "span": 1, "w": 10}])" + claims + "}";
}

BeamResult run(const std::string& text, Options o = {}) {
  input::BeamFile f = input::parse_beam_text(text, "t.json");
  EXPECT_TRUE(f.ok()) << (f.errors.empty() ? "" : f.errors.front().format("t.json"));
  return check(f, o);
}

TEST(Compare, AllMethodsAgreeOnASimpleBeam) {
  BeamResult r = run(simple_beam(""));
  ASSERT_EQ(r.sets.size(), 1u);
  const LoadSet& s = r.sets[0];
  EXPECT_EQ(s.verdict, Verdict::Agree) << s.problem;
  EXPECT_EQ(s.ok_count(), 3u);
  EXPECT_EQ(r.status, BeamStatus::Agree);
  for (double d : s.max_difference) EXPECT_LE(d, 1e-9);
  EXPECT_NEAR(s.extremes[0].max_moment, 45.0, 1e-9);
  EXPECT_NEAR(s.extremes[0].max_moment_x, 3.0, 1e-6);
  for (const auto& m : s.methods) {
    EXPECT_LE(m.equilibrium.force_residual, 1e-12) << m.name;
    EXPECT_LE(m.equilibrium.moment_residual, 1e-12) << m.name;
  }
}

TEST(Compare, ClaimJustInsideItsToleranceHolds) {
  // 1% of the largest moment (45) is 0.45: 45.44 holds, 45.46 does not.
  BeamResult r = run(simple_beam(R"(, "claims": {"values": [
      {"quantity": "moment", "x": 3, "value": 45.44},
      {"quantity": "moment", "x": 3, "value": 45.46},
      {"quantity": "reaction", "node": "A", "value": 30.0, "tolerance": 0.001},
      {"quantity": "max_moment", "span": 1, "value": 44.56}]})"));
  ASSERT_EQ(r.claims.size(), 4u);
  EXPECT_TRUE(r.claims[0].holds);
  EXPECT_NEAR(r.claims[0].tolerance, 0.45, 1e-12);
  EXPECT_NEAR(r.claims[0].computed, 45.0, 1e-9);
  EXPECT_FALSE(r.claims[1].holds);
  EXPECT_TRUE(r.claims[2].holds);
  EXPECT_NEAR(r.claims[2].tolerance, 0.001, 1e-15);
  EXPECT_TRUE(r.claims[3].holds);
  EXPECT_EQ(r.status, BeamStatus::Disagree);  // one claim fails
  EXPECT_EQ(r.claims_failed(), 1u);
}

TEST(Compare, ShearClaimAtASupportNeedsASide) {
  BeamResult r = run(R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 6, "EI": 20000}, {"length": 6, "EI": 20000}], "supports": ["pinned", "roller", "roller"],
    "loads": [{"type": "udl", "span": 1, "w": 10}, {"type": "udl", "span": 2, "w": 10}],
    "claims": {"values": [{"quantity": "shear", "node": "B", "value": -37.5},
                          {"quantity": "shear", "node": "B", "side": "left", "value": -37.5},
                          {"quantity": "moment", "node": "B", "value": -45}]}})");
  ASSERT_EQ(r.claims.size(), 3u);
  EXPECT_FALSE(r.claims[0].evaluated);
  EXPECT_NE(r.claims[0].reason.find("give \"side\""), std::string::npos) << r.claims[0].reason;
  // Two spans, UDL: V just left of B = -5wL/8 = -37.5 (from the reactions 3wL/8).
  EXPECT_TRUE(r.claims[1].holds) << r.claims[1].computed;
  EXPECT_TRUE(r.claims[2].holds) << r.claims[2].computed;
}

TEST(Compare, OneMethodAloneIsUnconfirmed) {
  Options o;
  o.methods = {"stiffness"};
  BeamResult r = run(simple_beam(""), o);
  EXPECT_EQ(r.sets[0].verdict, Verdict::Unconfirmed);
  EXPECT_EQ(r.status, BeamStatus::Unconfirmed);
}

TEST(Compare, BrokenMethodIsNamedAsTheOddOneOut) {
  // A test double: the stiffness result with every moment 2% too large.
  static std::vector<Method> set;
  set = methods();
  set.push_back({"broken", [](const Beam& b, const std::vector<Station>& st) {
    Solution s = find_method("stiffness")->solve(b, st);
    auto inner = s.at;
    s.at = [inner](std::size_t span, const double& local, bool after) {
      PointValues p = inner(span, local, after);
      p.moment *= 1.02;
      return p;
    };
    return s;
  }});
  Options o;
  o.method_set = &set;
  o.methods = {"three-moment", "broken", "slope-deflection"};
  BeamResult r = run(simple_beam(""), o);
  const LoadSet& s = r.sets[0];
  EXPECT_EQ(s.verdict, Verdict::Disagree);
  EXPECT_EQ(s.odd_one_out, "broken");
  ASSERT_TRUE(s.worst);
  EXPECT_EQ(s.worst->kind, Kind::Moment);
  // Scaled by the largest moment of any method, the broken one included.
  EXPECT_NEAR(s.max_difference[static_cast<int>(Kind::Moment)], 0.02 / 1.02, 1e-9);
  EXPECT_EQ(r.status, BeamStatus::Disagree);
}

// A beam no method can compute in double (EI of 5e-324: every pivot is
// zero) is an input problem, named as such, never a disagreement.
TEST(Compare, EveryMethodFailingIsAnInputProblemNotADisagreement) {
  input::BeamFile f = input::parse_beam_text(R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 5, "EI": 5e-324}, {"length": 5, "EI": 5e-324}], "supports": ["pinned", "roller", "roller"],
    "loads": [{"type": "udl", "span": 1, "w": 10}]})", "t.json");
  ASSERT_TRUE(f.ok());
  BeamResult r = check(f, {});
  EXPECT_EQ(r.status, BeamStatus::Invalid);
  ASSERT_EQ(r.errors.size(), 1u);
  EXPECT_NE(r.errors[0].reason.find("no method could compute this beam in double precision"), std::string::npos)
      << r.errors[0].reason;
  EXPECT_TRUE(r.sets.empty());
}

// A settlement of 1e300 m swamps a 10 kN/m load: the methods agree on the
// settlement alone, and the beam carries a warning naming it.
TEST(Compare, SettlementThatSwampsTheLoadsIsNamed) {
  input::BeamFile f = input::parse_beam_text(R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 5, "EI": 50000}, {"length": 5, "EI": 50000}],
    "supports": ["pinned", {"type": "roller", "settlement": 1e300}, "roller"],
    "loads": [{"type": "udl", "span": 1, "w": 10}]})", "t.json");
  ASSERT_TRUE(f.ok());
  BeamResult r = check(f, {});
  ASSERT_EQ(r.warnings.size(), 1u);
  EXPECT_NE(r.warnings[0].find("the settlement at node B makes forces"), std::string::npos) << r.warnings[0];
  // An ordinary settlement gives no such warning.
  input::BeamFile g = input::parse_beam_text(R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 5, "EI": 50000}, {"length": 5, "EI": 50000}],
    "supports": ["pinned", {"type": "roller", "settlement": 0.01}, "roller"],
    "loads": [{"type": "udl", "span": 1, "w": 10}]})", "t.json");
  EXPECT_TRUE(check(g, {}).warnings.empty());
}

TEST(Compare, NotApplicableMethodLeavesTwo) {
  // A spring: three-moment cannot treat it; the other two still confirm.
  BeamResult r = run(R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 5, "EI": 20000}, {"length": 5, "EI": 20000}],
    "supports": ["pinned", {"type": "spring", "k": 3000}, "roller"],
    "loads": [{"type": "udl", "span": 1, "w": 10}]})");
  const LoadSet& s = r.sets[0];
  EXPECT_EQ(s.methods[0].status, MethodStatus::NotApplicable);
  EXPECT_EQ(s.ok_count(), 2u);
  EXPECT_EQ(s.verdict, Verdict::Agree) << s.problem;
}

// A load that sits (all but) on a support leaves moments, deflections and
// rotations of rounding size only; the methods agree, and must not be told
// apart by their noise (found by probing extreme inputs).
TEST(Compare, NoiseOnlyKindsAreNotCalledDisagreement) {
  BeamResult r = run(R"({"units": {"force": "kN", "length": "m"}, "spans": [{"length": 5, "EI": 1}],
    "supports": ["pinned", "roller"], "loads": [{"type": "point", "span": 1, "P": 1, "at": 4.9e-324}]})");
  EXPECT_EQ(r.sets[0].verdict, Verdict::Agree) << r.sets[0].problem;
  // Statics: the whole load goes into the support it sits on.
  EXPECT_NEAR(r.sets[0].consensus_nodes[0].reaction_force, 1.0, 1e-12);
}

// A statically determinate beam whose support settles turns without
// bending: no reaction and no moment (statics, no published source), only a
// rigid rotation D/L. The methods' moments are rounding noise and must not
// be told apart by it.
TEST(Compare, SettlementOfADeterminateBeamMovesItWithoutBending) {
  BeamResult r = run(R"({"units": {"force": "kN", "length": "m"}, "spans": [{"length": 5, "EI": 20000}],
    "supports": ["pinned", {"type": "roller", "settlement": 0.01}], "loads": []})");
  ASSERT_EQ(r.sets[0].ok_count(), 3u);
  EXPECT_EQ(r.sets[0].verdict, Verdict::Agree) << r.sets[0].problem;
  for (const auto& n : r.sets[0].consensus_nodes) {
    EXPECT_NEAR(n.reaction_force, 0.0, 1e-12);
    EXPECT_NEAR(n.rotation_right, 0.01 / 5, 1e-15);
  }
  EXPECT_NEAR(r.sets[0].consensus_nodes[1].deflection, 0.01, 1e-15);
}

TEST(Compare, InvalidFileCarriesItsErrors) {
  input::BeamFile f = input::parse_beam_text("[]", "bad.json");
  BeamResult r = check(f, {});
  EXPECT_EQ(r.status, BeamStatus::Invalid);
  EXPECT_EQ(r.errors.size(), 1u);
  EXPECT_TRUE(r.sets.empty());
}

TEST(Compare, EachLoadCaseIsItsOwnLoadSet) {
  BeamResult r = run(R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 6, "EI": 20000}], "supports": ["pinned", "roller"],
    "loads": [{"type": "udl", "span": 1, "w": 10, "case": "dead"},
              {"type": "point", "span": 1, "P": 20, "at": 3, "case": "live"}],
    "claims": {"values": [{"quantity": "moment", "x": 3, "case": "live", "value": 30}]}})");
  ASSERT_EQ(r.sets.size(), 2u);
  EXPECT_EQ(r.sets[0].name, "dead");
  EXPECT_EQ(r.sets[1].name, "live");
  // Central point load PL/4 = 20 * 6 / 4 = 30 (Hicks, ch. 2; from memory).
  EXPECT_TRUE(r.claims[0].holds) << r.claims[0].computed;
}

}  // namespace
}  // namespace trivet::compare
