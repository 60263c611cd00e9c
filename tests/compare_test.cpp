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

TEST(Compare, SpringBeamConfirmedByAllThree) {
  // A spring: until three-moment treated springs (the five-moment equation)
  // it was not-applicable here and the other two confirmed alone; now every
  // method is ok and all three agree. (No beam the reader accepts makes a
  // method not-applicable any more.)
  BeamResult r = run(R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 5, "EI": 20000}, {"length": 5, "EI": 20000}],
    "supports": ["pinned", {"type": "spring", "k": 3000}, "roller"],
    "loads": [{"type": "udl", "span": 1, "w": 10}]})");
  const LoadSet& s = r.sets[0];
  EXPECT_EQ(s.methods[0].status, MethodStatus::Ok) << s.methods[0].reason;
  EXPECT_EQ(s.ok_count(), 3u);
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

namespace trivet::compare {
namespace {

// Deflection limits (README, "Deflection limits").
// A simple span under a UDL deflects 5wL^4/(384EI) at midspan; a cantilever
// under a tip load PL^3/(3EI) at its tip. Source: Roark's Formulas for
// Stress and Strain, 7th ed., Table 8.1, cases 2e and 1a (from memory).
TEST(DeflectionLimits, SimpleSpanAgainstTheClosedForm) {
  // L = 6, w = 10, EI = 20000: 5 * 10 * 6^4 / (384 * 20000) = 0.0084375, L/711.1.
  auto file = [](const char* limit) {
    return std::string(R"({"units": {"force": "kN", "length": "m"}, "spans": [{"length": 6, "EI": 20000}],
      "supports": ["pinned", "roller"], "loads": [{"type": "udl", "span": 1, "w": 10}], "deflection_limit": ")") +
           limit + "\"}";
  };
  const BeamResult holds = run(file("L/700"));
  ASSERT_EQ(holds.sets.size(), 1u);
  ASSERT_EQ(holds.sets[0].deflection_checks.size(), 1u);
  const DeflectionCheck& d = holds.sets[0].deflection_checks[0];
  EXPECT_NEAR(d.deflection, 5.0 * 10 * 1296 / (384.0 * 20000), 1e-12);
  EXPECT_NEAR(d.x, 3.0, 1e-6);
  EXPECT_NEAR(d.allowed, 6.0 / 700, 1e-15);
  EXPECT_NEAR(d.ratio, 6.0 / 0.0084375, 1e-6);
  EXPECT_FALSE(d.cantilever);
  EXPECT_TRUE(d.holds);
  EXPECT_EQ(holds.status, BeamStatus::Agree);
  EXPECT_EQ(holds.limits_failed(), 0u);

  const BeamResult over = run(file("L/720"));  // allowed 0.008333 < 0.0084375
  ASSERT_EQ(over.sets[0].deflection_checks.size(), 1u);
  EXPECT_FALSE(over.sets[0].deflection_checks[0].holds);
  EXPECT_EQ(over.status, BeamStatus::Disagree);  // a failed check, as a failed claim
  EXPECT_EQ(over.limits_failed(), 1u);
}

TEST(DeflectionLimits, CantileverOnTwiceItsLengthOrItsOwnRatio) {
  // A 6 m span with a 2 m overhang, a tip load of 5 kN and nothing else:
  // the tip deflects P a^2 (a + L) / (3 EI) = 5 * 4 * 8 / 60000 = 0.00267
  // downward (the overhang's own Pa^3/3EI plus the support's rotation
  // P a L / (3 EI) times a; AISC Steel Construction Manual, "Beam Diagrams
  // and Formulas", beam overhanging one support, concentrated load at the
  // end of the overhang, from memory).
  auto file = [](const char* limit) {
    return std::string(R"({"units": {"force": "kN", "length": "m"},
      "spans": [{"length": 6, "EI": 20000}, {"length": 2, "EI": 20000}], "supports": ["pinned", "roller", "free"],
      "loads": [{"type": "point", "node": 3, "P": 5}], "deflection_limit": )") + limit + "}";
  };
  const double tip = 5.0 * 4 * 8 / 60000;
  const BeamResult a = run(file("\"L/360\""));
  ASSERT_EQ(a.sets[0].deflection_checks.size(), 2u);
  const DeflectionCheck& c = a.sets[0].deflection_checks[1];
  EXPECT_TRUE(c.cantilever);
  EXPECT_NEAR(std::abs(c.deflection), tip, 1e-12);
  EXPECT_NEAR(c.allowed, 2 * 2.0 / 360, 1e-15);  // on twice the overhang's length
  EXPECT_TRUE(c.holds);
  // Its own ratio: L/1600 of 2 m is 0.00125 < 0.00267: over.
  const BeamResult b = run(file(R"({"span": "L/360", "cantilever": "L/1600"})"));
  ASSERT_EQ(b.sets[0].deflection_checks.size(), 2u);
  EXPECT_NEAR(b.sets[0].deflection_checks[1].allowed, 2.0 / 1600, 1e-15);
  EXPECT_FALSE(b.sets[0].deflection_checks[1].holds);
  EXPECT_TRUE(b.sets[0].deflection_checks[0].holds);
}

TEST(DeflectionLimits, ServiceCombinationsAndNamedLoadSetsOnly) {
  const char* base = R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 6, "EI": 20000}, {"length": 6, "EI": 20000}], "supports": ["pinned", "roller", "roller"],
    "loads": [{"type": "udl", "span": 1, "w": 10, "case": "dead"}, {"type": "udl", "span": 2, "w": 10, "case": "dead"},
              {"type": "udl", "span": 1, "w": 8, "case": "live"}, {"type": "udl", "span": 2, "w": 8, "case": "live"}],
    "combinations": [{"name": "service", "factors": {"dead": 1, "live": 1}},
                     {"name": "strength", "factors": {"dead": 1.2, "live": 1.6}},
                     {"name": "live patterned", "factors": {"live": 1}, "pattern": ["live"]},
                     {"name": "strength checked", "factors": {"dead": 1.35}, "deflection_limit": "L/250"},
                     {"name": "service unchecked", "factors": {"dead": 1}, "deflection_limit": "none"}])";
  auto checked = [](const BeamResult& r) {
    std::vector<std::string> names;
    for (const auto& s : r.sets)
      if (!s.deflection_checks.empty()) names.push_back(s.name);
    return names;
  };
  const BeamResult every = run(std::string(base) + R"(, "deflection_limit": "L/360"})");
  EXPECT_EQ(checked(every), (std::vector<std::string>{"dead", "live", "service", "live patterned", "strength checked"}));
  const BeamResult named = run(std::string(base) + R"(, "deflection_limit": {"span": "L/360", "load_sets": ["live"]}})");
  EXPECT_EQ(checked(named), (std::vector<std::string>{"live", "strength checked"}));
  // The envelope's limit reads the envelope's largest deflection: the live
  // load on one span of two equal spans deflects more than on both.
  const LoadSet* env = nullptr;
  const LoadSet* live = nullptr;
  for (const auto& s : every.sets) {
    if (s.name == "live patterned") env = &s;
    if (s.name == "live") live = &s;
  }
  ASSERT_TRUE(env && live);
  ASSERT_EQ(env->deflection_checks.size(), 2u);
  EXPECT_GT(std::abs(env->deflection_checks[0].deflection), std::abs(live->deflection_checks[0].deflection) * 1.01);
  EXPECT_NEAR(env->deflection_checks[0].deflection, env->extremes[0].max_deflection, 1e-15);
}

TEST(DeflectionLimits, BadLimitsAreLocatedErrors) {
  const std::string base = R"({"units": {"force": "kN", "length": "m"}, "spans": [{"length": 6, "EI": 20000}],
    "supports": ["pinned", "roller"], "loads": [{"type": "udl", "span": 1, "w": 10}], "deflection_limit": )";
  struct Case { std::string limit, pointer, id; };
  for (const auto& c : std::vector<Case>{{"\"360\"", "/deflection_limit", "input.wrong_type"},
                                         {"\"L/0\"", "/deflection_limit", "input.out_of_range"},
                                         {"\"L/-5\"", "/deflection_limit", "input.out_of_range"},
                                         {"\"none\"", "/deflection_limit", "input.wrong_type"},
                                         {"{\"cantilever\": \"L/180\"}", "/deflection_limit/span", "input.missing_field"},
                                         {"{\"span\": \"L/360\", \"load_sets\": [\"wind\"]}", "/deflection_limit/load_sets/0", "input.no_such_item"}}) {
    const input::BeamFile f = input::parse_beam_text(base + c.limit + "}", "t.json");
    ASSERT_FALSE(f.errors.empty()) << c.limit;
    EXPECT_EQ(f.errors[0].pointer, c.pointer) << c.limit;
    EXPECT_EQ(f.errors[0].id, c.id) << c.limit << ": " << f.errors[0].reason;
  }
}

}  // namespace
}  // namespace trivet::compare

namespace trivet::compare {
namespace {

// A failed claim says which usual mistake would make it hold, and still
// fails. Values from the closed forms: a simple span under a UDL deflects
// 5wL^4/(384EI) (Roark's Formulas for Stress and Strain, 7th ed., Table 8.1
// case 2e, from memory); two equal spans under a UDL have M_B = -wL^2/8,
// R_A = 3wL/8 and R_B = 10wL/8 (AISC Steel Construction Manual, "Beam
// Diagrams and Formulas", continuous beam of two equal spans, from memory).
TEST(ClaimFindings, TheUsualMistakesAreNamedAndTheClaimStillFails) {
  const BeamResult simple = run(simple_beam(R"(, "claims": {"values": [
      {"quantity": "max_deflection", "span": 1, "value": 8.4375},
      {"quantity": "max_deflection", "span": 1, "value": 0.0084375}]})"));
  ASSERT_EQ(simple.claims.size(), 2u);
  EXPECT_FALSE(simple.claims[0].holds);
  EXPECT_NE(simple.claims[0].finding.find("divided by 1000 (typed in mm, as m?)"), std::string::npos)
      << simple.claims[0].finding;
  EXPECT_TRUE(simple.claims[1].holds);
  EXPECT_TRUE(simple.claims[1].finding.empty());

  const BeamResult two = run(R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 6, "EI": 20000}, {"length": 6, "EI": 20000}], "supports": ["pinned", "roller", "roller"],
    "loads": [{"type": "udl", "span": 1, "w": 10}, {"type": "udl", "span": 2, "w": 10}],
    "claims": {"values": [{"quantity": "moment", "node": "B", "value": 45},
                          {"quantity": "reaction", "node": "B", "value": 22.5},
                          {"quantity": "moment", "node": "B", "value": -45000000},
                          {"quantity": "reaction", "node": "A", "value": 99}]}})");
  ASSERT_EQ(two.claims.size(), 4u);
  for (const auto& c : two.claims) EXPECT_FALSE(c.holds);
  EXPECT_NE(two.claims[0].finding.find("opposite sign"), std::string::npos) << two.claims[0].finding;
  EXPECT_NE(two.claims[1].finding.find("holds at node A"), std::string::npos) << two.claims[1].finding;
  EXPECT_NE(two.claims[2].finding.find("divided by 10^6"), std::string::npos) << two.claims[2].finding;
  EXPECT_TRUE(two.claims[3].finding.empty()) << two.claims[3].finding;  // no usual mistake explains 99
}

}  // namespace
}  // namespace trivet::compare

namespace trivet::compare {
namespace {

// One name per claim quantity, the other spelling accepted for it: over a
// span, max_moment and moment_max are the span's largest moment; at a point
// of an envelope, moment_max and max_moment are the envelope's value there.
// Three equal spans L, a live UDL w patterned span by span, nothing else:
//  - the largest sagging moment of span 1 comes with spans 1 and 3 loaded,
//    R_A = 0.45 wL and M = R_A^2 / 2w = 0.10125 wL^2 (three-moment equation,
//    derived in tests/extremes_test.cpp; AISC Steel Construction Manual,
//    Table 3-23, three equal spans, prints 0.1013 wL^2, from memory);
//  - the largest hogging moment at B comes with spans 1 and 2 loaded:
//    4 M_B + M_C = -wL^2/2 and M_B + 4 M_C = -wL^2/4 give M_B = -7 wL^2/60
//    (derived here; the same table prints 0.1167 wL^2, from memory).
std::string patterned(const std::string& claims) {
  return R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 5, "EI": 30000}, {"length": 5, "EI": 30000}, {"length": 5, "EI": 30000}],
    "supports": ["pinned", "roller", "roller", "roller"],
    "loads": [{"type": "udl", "span": 1, "w": 8, "case": "live"}, {"type": "udl", "span": 2, "w": 8, "case": "live"},
              {"type": "udl", "span": 3, "w": 8, "case": "live"}],
    "combinations": [{"name": "pattern", "factors": {"live": 1.0}, "pattern": ["live"]}],
    "claims": {"tolerance": 0.001, "values": [)" + claims + "]}}";
}

TEST(ClaimNames, EachQuantityOneNameTheOtherSpellingAccepted) {
  const double wL2 = 8.0 * 25.0;
  const std::string sag = std::to_string(0.10125 * wL2), hog = std::to_string(-7.0 * wL2 / 60.0);
  const BeamResult r = run(patterned(
      R"({"quantity": "max_moment", "span": 1, "value": )" + sag + R"(, "case": "pattern"},
         {"quantity": "moment_max", "span": 1, "value": )" + sag + R"(, "case": "pattern"},
         {"quantity": "moment_min", "node": "B", "value": )" + hog + R"(, "case": "pattern"},
         {"quantity": "min_moment", "node": "B", "value": )" + hog + R"(, "case": "pattern"},
         {"quantity": "min_moment", "span": 1, "value": )" + hog + R"(, "case": "pattern"},
         {"quantity": "max_reaction", "node": "A", "value": )" + std::to_string(0.45 * 8 * 5) + R"(, "case": "pattern"})"));
  ASSERT_EQ(r.claims.size(), 6u);
  const input::Quantity want[] = {input::Quantity::MaxMoment, input::Quantity::MaxMoment, input::Quantity::MomentMin,
                                  input::Quantity::MomentMin, input::Quantity::MinMoment, input::Quantity::ReactionMax};
  for (std::size_t i = 0; i < r.claims.size(); ++i) {
    EXPECT_EQ(r.claims[i].claim.quantity, want[i]) << "claim " << i + 1;
    EXPECT_TRUE(r.claims[i].evaluated) << "claim " << i + 1 << ": " << r.claims[i].reason;
    EXPECT_TRUE(r.claims[i].holds) << "claim " << i + 1 << ": computed " << r.claims[i].computed;
  }
  // The alias is remembered as written; the contract's name is not.
  EXPECT_EQ(r.claims[0].claim.written, "");
  EXPECT_EQ(r.claims[1].claim.written, "moment_max");
  EXPECT_EQ(r.claims[3].claim.written, "min_moment");
  // A wrong value still fails under either name.
  const BeamResult w = run(patterned(R"({"quantity": "moment_max", "span": 1, "value": 19.0, "case": "pattern"})"));
  ASSERT_EQ(w.claims.size(), 1u);
  EXPECT_FALSE(w.claims[0].holds);
  EXPECT_NEAR(w.claims[0].computed, 0.10125 * wL2, 1e-9 * wL2);
}

TEST(ClaimNames, AnEnvelopeNameOnALoadCaseSaysWhatToWrite) {
  input::BeamFile f = input::parse_beam_text(simple_beam(R"(, "claims": {"values": [
      {"quantity": "max_moment", "x": 3, "value": 45}, {"quantity": "max_shear", "x": 3, "value": 0}]})"), "t.json");
  ASSERT_EQ(f.errors.size(), 2u);
  EXPECT_NE(f.errors[0].reason.find("max_moment (read as moment_max) is an envelope value"), std::string::npos)
      << f.errors[0].reason;
  EXPECT_NE(f.errors[0].reason.find("claim moment at the point, or max_moment or min_moment over a span"), std::string::npos)
      << f.errors[0].reason;
  EXPECT_NE(f.errors[1].reason.find("max_shear (read as shear_max)"), std::string::npos) << f.errors[1].reason;
}

}  // namespace
}  // namespace trivet::compare
