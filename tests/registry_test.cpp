// The method registry: every method once, by name, in every arithmetic it
// lists, each solving a beam with a handbook answer.
#include "methods/registry/registry.h"

#include <gtest/gtest.h>

#include <set>
#include <string>

namespace trivet {
namespace {

// A propped cantilever (fixed at A, roller at B) of length L under a UDL w:
// the roller's reaction is 3wL/8 and the fixed-end moment -wL^2/8.
// Source: AISC Steel Construction Manual, "Beam Diagrams and Formulas",
// the beam fixed at one end and supported at the other under a uniformly
// distributed load (from memory).
template <class R>
BasicBeam<R> propped_cantilever(const R& L, const R& w) {
  BasicBeam<R> b;
  b.spans.push_back({L, R(1000)});
  BasicSupport<R> fixed, roller;
  fixed.type = SupportType::Fixed;
  roller.type = SupportType::Roller;
  b.supports = {fixed, roller};
  b.labels = {"A", "B"};
  BasicLoad<R> l;
  l.type = LoadType::Udl;
  l.index = 0;
  l.w1 = l.w2 = w;
  l.from = R(0);
  l.to = L;
  b.loads.push_back(l);
  return b;
}

TEST(Registry, EveryMethodOnceWithItsSolvers) {
  std::set<std::string> names, identifiers;
  for (const auto& m : registry::all()) {
    EXPECT_TRUE(names.insert(m.name).second) << m.name;
    EXPECT_TRUE(identifiers.insert(m.identifier).second) << m.identifier;
    EXPECT_NE(m.solve, nullptr) << m.name;
    EXPECT_NE(m.solve_extended, nullptr) << m.name;
    if (!m.solve_exact) {
      EXPECT_GT(std::string(m.why_not_exact).size(), 0u) << m.name;
    }
    EXPECT_EQ(registry::find(m.name), &m);
    EXPECT_NE(registry::names().find(m.name), std::string::npos);
  }
  EXPECT_EQ(names.size(), 3u);
  EXPECT_EQ(registry::find("no-such-method"), nullptr);
}

TEST(Registry, EachArithmeticSolvesAHandbookBeam) {
  for (const auto& m : registry::all()) {
    {
      const auto b = propped_cantilever<double>(6.0, 10.0);
      const auto s = m.solve(b, build_stations(b, 4));
      ASSERT_EQ(s.status, MethodStatus::Ok) << m.name << ": " << s.reason;
      EXPECT_NEAR(s.nodes[1].reaction_force, 3.0 * 10 * 6 / 8, 1e-9) << m.name;
      EXPECT_NEAR(*s.nodes[0].moment_right, -10.0 * 36 / 8, 1e-9) << m.name;
    }
    {
      const auto b = propped_cantilever<Extended>(Extended(6), Extended(10));
      const auto s = m.solve_extended(b, build_stations(b, 4));
      ASSERT_EQ(s.status, MethodStatus::Ok) << m.name << ": " << s.reason;
      EXPECT_LT(abs(s.nodes[1].reaction_force - Extended(45) / 2), Extended(1e-40)) << m.name;
    }
    if (m.solve_exact) {
      const auto b = propped_cantilever<Exact>(Exact(6), Exact(10));
      const auto s = m.solve_exact(b, build_stations(b, 4));
      ASSERT_EQ(s.status, MethodStatus::Ok) << m.name << ": " << s.reason;
      EXPECT_EQ(s.nodes[1].reaction_force, Exact(45) / 2) << m.name;
      EXPECT_EQ(*s.nodes[0].moment_right, Exact(-45)) << m.name;
    }
  }
}

}  // namespace
}  // namespace trivet
