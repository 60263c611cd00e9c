// The turning-point finder (harness/compare/extremes.h), each method's span
// extremes between stations, and the one rule for settlements in single
// cases, plain combinations and envelopes.
#include "harness/compare/extremes.h"

#include <gtest/gtest.h>

#include <cmath>
#include <string>

#include "harness/compare/compare.h"

namespace trivet::compare {
namespace {

// Polynomials with known zeros: (t - 0.3)(t + 0.6)(t - 0.9) and friends.
TEST(PolynomialZeros, FindsEveryZeroOfACubicInOrder) {
  // (t - 0.3)(t + 0.6)(t - 0.9) = t^3 - 0.6 t^2 - 0.45 t + 0.162
  const auto z = polynomial_zeros({0.162, -0.45, -0.6, 1.0}, -1.0, 1.0);
  ASSERT_EQ(z.size(), 3u);
  EXPECT_NEAR(z[0], -0.6, 1e-14);
  EXPECT_NEAR(z[1], 0.3, 1e-14);
  EXPECT_NEAR(z[2], 0.9, 1e-14);
}

TEST(PolynomialZeros, AZeroAtTheEndOfTheIntervalCounts) {
  // t^2 - 1: zeros exactly at both ends.
  const auto z = polynomial_zeros({-1.0, 0.0, 1.0}, -1.0, 1.0);
  ASSERT_EQ(z.size(), 2u);
  EXPECT_NEAR(z[0], -1.0, 1e-15);
  EXPECT_NEAR(z[1], 1.0, 1e-15);
  // t (t - 0.5): the zero at the left end, and the one inside.
  const auto y = polynomial_zeros({0.0, -0.5, 1.0}, 0.0, 1.0);
  ASSERT_EQ(y.size(), 2u);
  EXPECT_NEAR(y[0], 0.0, 1e-15);
  EXPECT_NEAR(y[1], 0.5, 1e-15);
}

TEST(PolynomialZeros, ADoubleZeroAndNoZero) {
  // (t - 0.25)^2 touches zero without a sign change; t^2 + 1 has none.
  const auto z = polynomial_zeros({0.0625, -0.5, 1.0}, -1.0, 1.0);
  ASSERT_EQ(z.size(), 1u);
  EXPECT_NEAR(z[0], 0.25, 1e-7);  // a double zero is found to the square root of the rounding
  EXPECT_TRUE(polynomial_zeros({1.0, 0.0, 1.0}, -1.0, 1.0).empty());
  EXPECT_TRUE(polynomial_zeros({3.0}, -1.0, 1.0).empty());
}

TEST(TurningPoints, OfAQuinticThroughItsSamples) {
  // f(x) = (x - 1)^2 (x - 2.5)(x - 4)(x + 1) on [0, 3]: f' has zeros at 1 and
  // at the zeros of the rest; compare with a fine scan of the sign of f'.
  auto f = [](double x) { return (x - 1) * (x - 1) * (x - 2.5) * (x - 4) * (x + 1); };
  auto df = [&](double x) { return (f(x + 1e-6) - f(x - 1e-6)) / 2e-6; };
  const double a = 0, b = 3;
  const auto xs = sample_points(a, b);
  std::array<double, kDegree - 1> inner{};
  for (std::size_t j = 0; j < xs.size(); ++j) inner[j] = f(xs[j]);
  std::vector<double> tp;
  turning_points_of(interpolate(f(a), inner, f(b)), a, b, tp);
  int sign_changes = 0;
  for (int k = 0; k < 3000; ++k) {
    const double u = a + (b - a) * k / 3000.0, v = a + (b - a) * (k + 1) / 3000.0;
    if ((df(u) > 0) != (df(v) > 0)) {
      ++sign_changes;
      bool found = false;
      for (double t : tp) found = found || (t >= u - 1e-9 && t <= v + 1e-9);
      EXPECT_TRUE(found) << "a turning point between " << u << " and " << v << " was missed";
    }
  }
  EXPECT_EQ(static_cast<int>(tp.size()), sign_changes);
}

// The Hermite forms reproduce a cubic from its end values and slopes, and a
// quintic from those and two samples inside (a general law of polynomials).
TEST(TurningPoints, HermiteFormsReproduceTheirPolynomials) {
  auto f3 = [](double x) { return 2 - 3 * x + 0.5 * x * x - 0.25 * x * x * x; };
  auto d3 = [](double x) { return -3 + x - 0.75 * x * x; };
  auto f5 = [](double x) { return 1 + x - 2 * x * x + 0.3 * std::pow(x, 3) - 0.1 * std::pow(x, 4) + 0.02 * std::pow(x, 5); };
  auto d5 = [](double x) { return 1 - 4 * x + 0.9 * x * x - 0.4 * std::pow(x, 3) + 0.1 * std::pow(x, 4); };
  const double a = 1.5, b = 4.0, m = 0.5 * (a + b), h = 0.5 * (b - a);
  const Poly p3 = hermite3(a, b, f3(a), d3(a), f3(b), d3(b));
  const auto hx = hermite_points(a, b);
  const Poly p5 = hermite5(a, b, f5(a), d5(a), {f5(hx[0]), f5(hx[1])}, f5(b), d5(b));
  for (int k = 0; k <= 20; ++k) {
    const double x = a + (b - a) * k / 20.0, t = (x - m) / h;
    EXPECT_NEAR(evaluate(p3, t), f3(x), 1e-12) << x;
    EXPECT_NEAR(evaluate(p5, t), f5(x), 1e-12) << x;
  }
}

BeamResult run(const std::string& text, Options o = {}) {
  input::BeamFile f = input::parse_beam_text(text, "t.json");
  EXPECT_TRUE(f.ok()) << (f.errors.empty() ? "" : f.errors.front().format("t.json"));
  return check(f, o);
}

const LoadSet* set_named(const BeamResult& r, const std::string& name) {
  for (const auto& s : r.sets)
    if (s.name == name) return &s;
  return nullptr;
}

// Three equal spans, end spans loaded with w: M_B = M_C = -wL^2/20 (the
// three-moment equation, closed form), so R_A = 0.45 wL and the largest
// sagging moment of span 1 is R_A^2 / 2w = 0.10125 wL^2, at 0.45 L. Printed
// as 0.1013 wL^2 in AISC, "Steel Construction Manual", 15th ed., Table 3-23,
// case "Continuous beam - three equal spans - end spans loaded" (from
// memory). The maximum lies between stations for every stations_per_span
// below, and each method must find it exactly.
TEST(SpanExtremes, EndSpanOfThreeEqualSpansAtAnyStationCount) {
  const char* text = R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 7, "EI": 40000}, {"length": 7, "EI": 40000}, {"length": 7, "EI": 40000}],
    "supports": ["pinned", "roller", "roller", "roller"],
    "loads": [{"type": "udl", "span": 1, "w": 12}, {"type": "udl", "span": 3, "w": 12}]})";
  const double wL2 = 12 * 49.0;
  for (int per_span : {1, 2, 3, 4, 7, 10, 13}) {
    Options o;
    o.stations_per_span = per_span;
    BeamResult r = run(text, o);
    ASSERT_EQ(r.sets.size(), 1u);
    const LoadSet& s = r.sets[0];
    EXPECT_EQ(s.verdict, Verdict::Agree) << s.problem;
    ASSERT_EQ(s.ok_count(), 3u);
    for (const auto& m : s.methods) {
      ASSERT_EQ(m.extremes.size(), 3u) << m.name;
      EXPECT_NEAR(m.extremes[0].max_moment / wL2, 0.10125, 1e-12) << m.name << " at " << per_span << " stations per span";
      EXPECT_NEAR(m.extremes[0].max_moment_x, 0.45 * 7, 1e-6) << m.name;
      EXPECT_NEAR(m.extremes[0].min_moment / wL2, -0.05, 1e-12) << m.name;  // at B
      EXPECT_NEAR(m.extremes[2].max_moment / wL2, 0.10125, 1e-12) << m.name;
      EXPECT_NEAR(m.extremes[1].min_moment / wL2, -0.05, 1e-12) << m.name;  // M_B = -wL^2/20
    }
    EXPECT_NEAR(s.extremes[0].max_moment / wL2, 0.10125, 1e-12);
  }
}

// A propped cantilever under a UDL: the largest deflection is
// wL^4 / (185 EI) at 0.4215 L from the pinned end (AISC, "Steel
// Construction Manual", 15th ed., Table 3-23, case "Beam fixed at one end,
// supported at other - uniformly distributed load"; from memory). The
// closed form is (39 + 55 sqrt(33)) / 65536 wL^4/EI = 0.0054161 wL^4/EI at
// (15 - sqrt(33)) / 16 L from the pinned end (derived from the elastic
// curve). The search for the zero rotation starts at the fixed end, where
// the rotation is zero too.
TEST(SpanExtremes, ProppedCantileverDeflectionFromTheFixedEnd) {
  const char* text = R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 6, "EI": 30000}], "supports": ["fixed", "roller"],
    "loads": [{"type": "udl", "span": 1, "w": 10}]})";
  const double exact = (39 + 55 * std::sqrt(33.0)) / 65536.0 * 10 * std::pow(6.0, 4) / 30000;
  const double at = (15 - std::sqrt(33.0)) / 16 * 6;  // from the fixed end (0.4215 L from the roller)
  for (int per_span : {1, 2, 5, 10}) {
    Options o;
    o.stations_per_span = per_span;
    BeamResult r = run(text, o);
    for (const auto& m : r.sets[0].methods) {
      ASSERT_EQ(m.status, MethodStatus::Ok) << m.name;
      EXPECT_NEAR(m.extremes[0].max_deflection / exact, 1.0, 1e-12) << m.name << " at " << per_span;
      EXPECT_NEAR(m.extremes[0].max_deflection_x, at, 1e-6) << m.name;
      // The printed denominator 185 holds to +-0.5, so to 0.27%.
      EXPECT_NEAR(10 * std::pow(6.0, 4) / 30000 / m.extremes[0].max_deflection, 185.0, 0.5) << m.name;
    }
  }
}

// Two equal spans L on three supports, UDL w on both, the middle support
// settles d: by the three-moment equation with settlement terms (closed
// form), M_B = -wL^2/8 + 3 EI d / L^2, R_B = 5wL/4 - 2 (3EId/L^2)/L ... i.e.
// R_B = 1.25 wL - 6 EI d / L^3.
constexpr double kW = 10, kL = 6, kEI = 50000, kD = 0.010;
double mb(double w, double d) { return -w * kL * kL / 8 + 3 * kEI * d / (kL * kL); }
double rb(double w, double d) { return 1.25 * w * kL - 6 * kEI * d / (kL * kL * kL); }

std::string two_spans(const std::string& settlement, const std::string& combinations) {
  return R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 6, "EI": 50000}, {"length": 6, "EI": 50000}],
    "supports": ["pinned", {"type": "roller", "settlement": )" + settlement + R"(}, "roller"],
    "loads": [{"type": "udl", "span": 1, "w": 4, "case": "dead"}, {"type": "udl", "span": 2, "w": 4, "case": "dead"},
              {"type": "udl", "span": 1, "w": 6, "case": "live"}, {"type": "udl", "span": 2, "w": 6, "case": "live"}],
    "combinations": [)" + combinations + "]}";
}

TEST(Settlements, ActOnceInEveryLoadSetWhenTheyNameNoCase) {
  BeamResult r = run(two_spans("0.010", R"({"name": "service", "factors": {"dead": 1.0, "live": 1.0}},
      {"name": "pattern", "factors": {"dead": 1.0, "live": 1.0}, "pattern": ["live"]},
      {"name": "range", "factors": {"dead": [1.0, 1.35], "live": 1.5}, "pattern": ["live"], "arrangements": "adjacent-and-alternate"})"));
  for (const auto& s : r.sets) {
    EXPECT_EQ(s.verdict, Verdict::Agree) << s.name << ": " << s.problem;
    if (s.envelope) {
      for (const auto& m : s.methods) {
        ASSERT_TRUE(m.envelope) << m.name;
        // The settled support's deflection is the settlement, whatever is loaded.
        const auto& st = s.stations;
        for (std::size_t i = 0; i < st.size(); ++i)
          if (std::abs(st[i].x - kL) < 1e-12) {
            EXPECT_NEAR(m.envelope->deflection[i].max, kD, 1e-12) << s.name << " " << m.name;
            EXPECT_NEAR(m.envelope->deflection[i].min, kD, 1e-12) << s.name << " " << m.name;
          }
      }
    } else {
      EXPECT_NEAR(s.consensus_nodes[1].deflection, kD, 1e-12) << s.name;
    }
  }
  // The plain combination (w = 10 on both spans) against the closed form.
  const LoadSet* service = set_named(r, "service");
  ASSERT_NE(service, nullptr);
  EXPECT_NEAR(*service->consensus_nodes[1].moment_left, mb(kW, kD), 1e-9 * std::abs(mb(kW, 0)));
  EXPECT_NEAR(service->consensus_nodes[1].reaction_force, rb(kW, kD), 1e-9 * rb(kW, 0));
  // The patterned envelope with both spans loaded (the worst hogging at B
  // and the largest reaction at B): the same numbers.
  const LoadSet* pattern = set_named(r, "pattern");
  ASSERT_NE(pattern, nullptr);
  EXPECT_NEAR(pattern->consensus_envelope.reaction[1].max, rb(kW, kD), 1e-9 * rb(kW, 0));
  EXPECT_NEAR(pattern->extremes[0].min_moment, mb(kW, kD), 1e-9 * std::abs(mb(kW, 0)));
  // Each single case carries the settlement once as well.
  const LoadSet* dead = set_named(r, "dead");
  ASSERT_NE(dead, nullptr);
  EXPECT_NEAR(*dead->consensus_nodes[1].moment_left, mb(4, kD), 1e-9 * std::abs(mb(4, 0)));
}

TEST(Settlements, ThatNameACaseAreFactoredWithIt) {
  BeamResult r = run(two_spans(R"({"value": 0.010, "case": "imposed"})",
                               R"({"name": "with", "factors": {"dead": 1.35, "imposed": 0.5}},
      {"name": "without", "factors": {"dead": 1.35, "live": 1.5}},
      {"name": "envelope", "factors": {"dead": 1.0, "live": 1.5, "imposed": [0.0, 1.2]}, "pattern": ["live"]})"));
  const LoadSet* imposed = set_named(r, "imposed");
  ASSERT_NE(imposed, nullptr);  // a case made by the settlement alone
  EXPECT_NEAR(imposed->consensus_nodes[1].deflection, kD, 1e-12);
  EXPECT_NEAR(*imposed->consensus_nodes[1].moment_left, mb(0, kD), 1e-9 * std::abs(mb(0, kD)));
  const LoadSet* dead = set_named(r, "dead");
  EXPECT_NEAR(dead->consensus_nodes[1].deflection, 0.0, 1e-15);
  const LoadSet* with = set_named(r, "with");
  EXPECT_NEAR(with->consensus_nodes[1].deflection, 0.5 * kD, 1e-12);
  EXPECT_NEAR(*with->consensus_nodes[1].moment_left, mb(1.35 * 4, 0.5 * kD), 1e-9 * std::abs(mb(5.4, 0)));
  const LoadSet* without = set_named(r, "without");
  EXPECT_NEAR(without->consensus_nodes[1].deflection, 0.0, 1e-15);
  // The envelope: the settlement factored 0 (less hogging is not taken) or
  // 1.2 (sagging at B grows) as each bound asks.
  const LoadSet* env = set_named(r, "envelope");
  ASSERT_NE(env, nullptr);
  EXPECT_EQ(env->verdict, Verdict::Agree) << env->problem;
  EXPECT_NEAR(env->extremes[0].min_moment, mb(4 + 1.5 * 6, 0.0), 1e-9 * std::abs(mb(13, 0)));
  EXPECT_NEAR(env->consensus_envelope.reaction[1].max, rb(4 + 1.5 * 6, 0.0), 1e-9 * rb(13, 0));
  EXPECT_NEAR(env->consensus_envelope.reaction[1].min, rb(4, 1.2 * kD) - 0.0, 1e-9 * rb(13, 0));
}

// The second route runs on every envelope and holds on a correct one.
TEST(SecondRoute, ReSolvesEveryGoverningArrangement) {
  BeamResult r = run(two_spans("0.010", R"({"name": "pattern", "factors": {"dead": 1.2, "live": 1.6}, "pattern": ["live"]})"));
  const LoadSet* s = set_named(r, "pattern");
  ASSERT_NE(s, nullptr);
  // Per span: max_moment, min_moment, max_deflection; per node: reaction_max, reaction_min.
  ASSERT_EQ(s->second_route.size(), 2u * 3u + 3u * 2u);
  for (const auto& rc : s->second_route) {
    EXPECT_TRUE(rc.holds) << rc.quantity << " " << rc.where << ": " << rc.difference;
    EXPECT_EQ(rc.values.size(), 3u);
    EXPECT_FALSE(rc.arrangement.empty());
  }
}

// The second route catches what the methods' agreement cannot: a fault that
// all three answers share. Three copies of one method, each reporting every
// deflection with a constant added (not linear: superposing n shares adds the
// constant n times, a direct solve once), agree with each other perfectly;
// only the direct solve of the governing arrangement shows the envelope is
// wrong. (The fault is in the deflections, so that every copy is still in
// equilibrium and nothing else calls it out.)
TEST(SecondRoute, CatchesAFaultEveryMethodShares) {
  static std::vector<Method> shared;
  shared.clear();
  for (const char* name : {"copy-a", "copy-b", "copy-c"})
    shared.push_back({name, [](const Beam& b, const std::vector<Station>& st) {
      Solution s = find_method("slope-deflection")->solve(b, st);
      auto inner = s.at;
      s.at = [inner](std::size_t span, const double& local, bool after) {
        PointValues p = inner(span, local, after);
        p.deflection += 0.001;  // m
        return p;
      };
      return s;
    }});
  Options o;
  o.method_set = &shared;
  BeamResult r = run(two_spans("0.0", R"({"name": "pattern", "factors": {"dead": 1.2, "live": 1.6}, "pattern": ["live"]})"), o);
  const LoadSet* s = set_named(r, "pattern");
  ASSERT_NE(s, nullptr);
  for (double d : s->max_difference) EXPECT_LT(d, 1e-12);  // the copies agree
  for (const auto& m : s->methods) {
    EXPECT_LT(m.equilibrium.force_residual, 1e-12) << m.name;  // and balance
    EXPECT_LT(m.equilibrium.moment_residual, 1e-12) << m.name;
  }
  EXPECT_EQ(s->verdict, Verdict::Disagree) << s->problem;
  EXPECT_NE(s->problem.find("second route"), std::string::npos) << s->problem;
  bool failed_deflection = false;
  for (const auto& rc : s->second_route)
    if (!rc.holds) failed_deflection = failed_deflection || rc.quantity == "max_deflection";
  EXPECT_TRUE(failed_deflection);
  EXPECT_EQ(r.status, BeamStatus::Disagree);
}

}  // namespace
}  // namespace trivet::compare
