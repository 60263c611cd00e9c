// Load cases, factored combinations and patterned live-load envelopes.
//
// Published coefficients for three equal spans under a patterned uniform
// load (maximum effects, coefficients of wL^2 and wL): span 1 +0.101 (spans
// 1 and 3 loaded), support B -0.117 (spans 1 and 2 loaded), span 2 +0.075
// (span 2 loaded), reaction A 0.450, reaction B 1.200 — from the
// continuous-beam coefficient tables of C. E. Reynolds, J. C. Steedman,
// A. J. Threlfall, "Reinforced Concrete Designer's Handbook", 11th ed.,
// Taylor & Francis, 2007 (table of three-span coefficients; table number and
// values from memory). Tolerances from the printed digits.
#include <gtest/gtest.h>

#include <random>

#include "harness/compare/compare.h"

namespace trivet::compare {
namespace {

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

// w = 10 kN/m live on three 6 m spans; a tiny dead load keeps the file honest
// about cases but is factored by 0 in the pattern-only combination.
const char* kThreeSpans = R"({"units": {"force": "kN", "length": "m"},
  "spans": [{"length": 6, "EI": 50000}, {"length": 6, "EI": 50000}, {"length": 6, "EI": 50000}],
  "supports": ["pinned", "roller", "roller", "roller"],
  "loads": [{"type": "udl", "span": 1, "w": 10, "case": "live"}, {"type": "udl", "span": 2, "w": 10, "case": "live"},
            {"type": "udl", "span": 3, "w": 10, "case": "live"}, {"type": "udl", "span": 1, "w": 4, "case": "dead"},
            {"type": "udl", "span": 2, "w": 4, "case": "dead"}, {"type": "udl", "span": 3, "w": 4, "case": "dead"}],
  "combinations": [
    {"name": "live-pattern", "factors": {"live": 1.0}, "pattern": ["live"]},
    {"name": "codes", "factors": {"live": 1.0}, "pattern": ["live"], "arrangements": "adjacent-and-alternate"},
    {"name": "service", "factors": {"dead": 1.0, "live": 1.0}},
    {"name": "strength-A", "factors": {"dead": 1.2, "live": 1.6}, "pattern": ["live"]},
    {"name": "strength-B", "factors": {"dead": [1.0, 1.35], "live": 1.5}, "pattern": ["live"], "arrangements": "adjacent-and-alternate"}],
  "claims": {"values": [{"quantity": "moment_min", "node": "B", "case": "strength-A", "value": -77.8}]}
})";

TEST(Envelope, ThreeEqualSpansMatchThePublishedPatternCoefficients) {
  BeamResult r = run(kThreeSpans);
  const LoadSet* s = set_named(r, "live-pattern");
  ASSERT_NE(s, nullptr);
  ASSERT_TRUE(s->envelope);
  EXPECT_EQ(s->verdict, Verdict::Agree) << s->problem;
  EXPECT_EQ(s->ok_count(), 3u);
  const double wL2 = 10 * 36, wL = 60;
  EXPECT_NEAR(s->extremes[0].max_moment / wL2, 0.101, 0.0005);
  EXPECT_NEAR(s->extremes[1].max_moment / wL2, 0.075, 0.0005);
  EXPECT_NEAR(s->extremes[0].min_moment / wL2, -0.117, 0.0005);
  EXPECT_NEAR(s->consensus_envelope.reaction[0].max / wL, 0.450, 0.0005);
  EXPECT_NEAR(s->consensus_envelope.reaction[1].max / wL, 1.200, 0.0005);
  // What governs: the end-span maximum with spans 1 and 3 loaded.
  EXPECT_EQ(s->extremes[0].max_moment_by, "spans 1, 3 loaded; live x1");
  EXPECT_EQ(s->extremes[1].max_moment_by, "span 2 loaded; live x1");
}

TEST(Envelope, AnOrdinaryCombinationIsTheFactoredSum) {
  BeamResult r = run(kThreeSpans);
  const LoadSet* s = set_named(r, "service");
  ASSERT_NE(s, nullptr);
  EXPECT_FALSE(s->envelope);
  // Three equal spans, UDL (dead + live = 14 kN/m): M_B = -0.100 wL^2
  // (T. G. Hicks, "Civil Engineering Formulas", 2nd ed., Table 2.1; from memory).
  EXPECT_NEAR(*s->consensus_nodes[1].moment_left / (14 * 36), -0.100, 0.0005);
}

TEST(Envelope, ClaimOnTheInteriorSupportMomentUnderAPatternedCombination) {
  BeamResult r = run(kThreeSpans);
  ASSERT_EQ(r.claims.size(), 1u);
  // dead 1.2 x 4 = 4.8 on all spans: -0.100 x 4.8 x 36 = -17.28; live 1.6 x 10
  // = 16 on spans 1 and 2: -0.1167 x 16 x 36 = -67.2 (the coefficients above).
  EXPECT_TRUE(r.claims[0].evaluated) << r.claims[0].reason;
  EXPECT_NEAR(r.claims[0].computed, -17.28 - 7.0 / 60.0 * 16 * 36, 1e-9);
  EXPECT_FALSE(r.claims[0].holds);  // -77.8 is 7 kN*m off: the claim fails
}

TEST(Envelope, AdjacentAndAlternateNeverExceedsAll) {
  BeamResult r = run(kThreeSpans);
  const LoadSet* all = set_named(r, "live-pattern");
  const LoadSet* codes = set_named(r, "codes");
  ASSERT_TRUE(all && codes);
  const double tol = 1e-9 * all->scale[static_cast<int>(Kind::Moment)];
  for (std::size_t i = 0; i < all->stations.size(); ++i) {
    EXPECT_LE(codes->consensus_envelope.moment[i].max, all->consensus_envelope.moment[i].max + tol) << i;
    EXPECT_GE(codes->consensus_envelope.moment[i].min, all->consensus_envelope.moment[i].min - tol) << i;
  }
}

// Brute force over every arrangement of the patterned spans, each solved as
// an ordinary beam, against the envelope found without enumerating them.
TEST(Envelope, AllEqualsBruteForceOnRandomBeams) {
  std::mt19937 rng(20261201u);
  std::uniform_real_distribution<double> U(0.0, 1.0);
  for (int trial = 0; trial < 12; ++trial) {
    const std::size_t n = 2 + rng() % (trial == 11 ? 9 : 6);  // up to 10 spans
    std::string spans, supports = "[\"pinned\"", loads;
    for (std::size_t s = 0; s < n; ++s) {
      spans += std::string(s ? "," : "") + "{\"length\": " + std::to_string(3 + 6 * U(rng)) + ", \"EI\": " + std::to_string(2e4 + 8e4 * U(rng)) + "}";
      supports += U(rng) < 0.2 ? ", \"fixed\"" : ", \"roller\"";
      loads += std::string(s ? "," : "") + "{\"type\": \"udl\", \"span\": " + std::to_string(s + 1) + ", \"w\": " + std::to_string(2 + 8 * U(rng)) + ", \"case\": \"dead\"}";
      loads += ",{\"type\": \"point\", \"span\": " + std::to_string(s + 1) + ", \"P\": " + std::to_string(5 + 20 * U(rng)) + ", \"at\": 1.5, \"case\": \"live\"}";
      if (U(rng) < 0.5) loads += ",{\"type\": \"udl\", \"span\": " + std::to_string(s + 1) + ", \"w\": " + std::to_string(3 * U(rng)) + ", \"case\": \"live\"}";
    }
    supports += "]";
    const std::string text = "{\"units\": {\"force\": \"kN\", \"length\": \"m\"}, \"spans\": [" + spans + "], \"supports\": " + supports +
                             ", \"loads\": [" + loads + "], \"combinations\": [{\"name\": \"env\", \"factors\": {\"dead\": 1.2, \"live\": 1.6}, \"pattern\": [\"live\"]}]}";
    Options o;
    o.methods = {"stiffness"};
    BeamResult r = run(text, o);
    const LoadSet* env = set_named(r, "env");
    ASSERT_NE(env, nullptr);
    ASSERT_EQ(env->methods[0].status, MethodStatus::Ok) << env->methods[0].reason;
    input::BeamFile f = input::parse_beam_text(text, "t.json");
    const Method* stiff = find_method("stiffness");
    std::vector<double> hi(env->stations.size(), -1e300), lo(env->stations.size(), 1e300);
    std::vector<double> rhi(n + 1, -1e300), rlo(n + 1, 1e300);
    for (unsigned mask = 0; mask < (1u << n); ++mask) {
      Beam b = f.beam;
      b.loads.clear();
      for (const auto& l : f.beam.loads) {
        Load s = l;
        const double k = l.load_case == "dead" ? 1.2 : 1.6;
        if (l.load_case == "live" && !(mask >> l.index & 1u)) continue;
        s.P *= k; s.w1 *= k; s.w2 *= k;
        b.loads.push_back(s);
      }
      Solution sol = stiff->solve(b, env->stations);
      ASSERT_EQ(sol.status, MethodStatus::Ok);
      for (std::size_t i = 0; i < env->stations.size(); ++i) {
        const auto& st = env->stations[i];
        const double m = sol.at(st.span, st.local, st.after).moment;
        hi[i] = std::max(hi[i], m);
        lo[i] = std::min(lo[i], m);
      }
      for (std::size_t j = 0; j <= n; ++j) {
        rhi[j] = std::max(rhi[j], sol.nodes[j].reaction_force);
        rlo[j] = std::min(rlo[j], sol.nodes[j].reaction_force);
      }
    }
    const double tm = 1e-9 * env->scale[static_cast<int>(Kind::Moment)];
    const double tr = 1e-9 * env->scale[static_cast<int>(Kind::Reaction)];
    const Envelope& e = *env->methods[0].envelope;
    for (std::size_t i = 0; i < env->stations.size(); ++i) {
      EXPECT_NEAR(e.moment[i].max, hi[i], tm) << "trial " << trial << " station " << i;
      EXPECT_NEAR(e.moment[i].min, lo[i], tm) << "trial " << trial << " station " << i;
    }
    for (std::size_t j = 0; j <= n; ++j) {
      EXPECT_NEAR(e.reaction[j].max, rhi[j], tr) << "trial " << trial << " node " << j;
      EXPECT_NEAR(e.reaction[j].min, rlo[j], tr) << "trial " << trial << " node " << j;
    }
    // At every station, the arrangement reported as governing reproduces the
    // envelope value (maximum and minimum).
    for (std::size_t probe = 0; probe < env->stations.size(); ++probe) {
      for (int want_max = 0; want_max < 2; ++want_max) {
        const Governs& g = governs_of(want_max ? e.moment[probe].max_by : e.moment[probe].min_by);
        Beam b = f.beam;
        b.loads.clear();
        for (const auto& l : f.beam.loads) {
          const bool on = l.load_case == "dead" || std::find(g.spans.begin(), g.spans.end(), l.index) != g.spans.end();
          if (!on) continue;
          Load s = l;
          const double k = l.load_case == "dead" ? 1.2 : 1.6;
          s.P *= k; s.w1 *= k; s.w2 *= k;
          b.loads.push_back(s);
        }
        Solution sol = stiff->solve(b, env->stations);
        const auto& st = env->stations[probe];
        EXPECT_NEAR(sol.at(st.span, st.local, st.after).moment, want_max ? e.moment[probe].max : e.moment[probe].min, tm)
            << "trial " << trial << " station " << probe;
      }
    }
    if (HasFailure()) return;
  }
}

TEST(Envelope, MethodsAgreeOnTheFactorRangeEnvelope) {
  BeamResult r = run(kThreeSpans);
  const LoadSet* s = set_named(r, "strength-B");
  ASSERT_NE(s, nullptr);
  EXPECT_EQ(s->verdict, Verdict::Agree) << s->problem;
  EXPECT_EQ(s->ok_count(), 3u);
  for (double d : s->max_difference) EXPECT_LE(d, 1e-9);
}

TEST(Envelope, PresetsExpandWithTheirSource) {
  input::BeamFile f = input::parse_beam_text(R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 5, "EI": 1e4}], "supports": ["pinned", "roller"],
    "loads": [{"type": "udl", "span": 1, "w": 3, "case": "D"}, {"type": "udl", "span": 1, "w": 2, "case": "L"}],
    "combinations": [{"name": "us", "preset": "asce7-strength", "cases": {"D": "D", "L": "L"}},
                     {"preset": "en1990-6.10", "cases": {"G": "D", "Q": "L"}}]})", "p.json");
  ASSERT_TRUE(f.ok()) << f.errors.front().format("p.json");
  ASSERT_EQ(f.combinations.size(), 3u);
  EXPECT_EQ(f.combinations[0].name, "us 1.4D");
  EXPECT_NEAR(f.combinations[0].factors[0].second.high, 1.4, 1e-15);
  EXPECT_EQ(f.combinations[1].name, "us 1.2D+1.6L");
  EXPECT_EQ(f.combinations[2].name, "en1990-6.10");
  EXPECT_TRUE(f.combinations[2].factors[0].second.range);
  EXPECT_NE(f.combinations[2].source.find("EN 1990"), std::string::npos);
}

TEST(Envelope, CombinationErrorsNameTheirLocation) {
  input::BeamFile f = input::parse_beam_text(R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 5, "EI": 1e4}], "supports": ["pinned", "roller"],
    "loads": [{"type": "udl", "span": 1, "w": 3, "case": "dead"}],
    "combinations": [{"name": "a", "factors": {"ded": 1.2}},
                     {"name": "b", "factors": {"dead": [1.5, 1.0]}},
                     {"name": "c", "factors": {"dead": 1.0}, "pattern": ["live"]}]})", "p.json");
  ASSERT_EQ(f.errors.size(), 3u);
  EXPECT_EQ(f.errors[0].format("p.json"), "p.json: /combinations/0/factors/ded (combination 1): there is no load case 'ded' (did you mean 'dead'?)");
  EXPECT_EQ(f.errors[1].format("p.json"), "p.json: /combinations/1/factors/dead (combination 2): a factor range is [low, high]: 1.5 is greater than 1");
  EXPECT_EQ(f.errors[2].format("p.json"), "p.json: /combinations/2/pattern/0 (combination 3): the patterned case 'live' has no factor in this combination");
}

}  // namespace
}  // namespace trivet::compare

namespace trivet::compare {
namespace {

// On a long beam what governs names the spans that matter. Forty equal
// spans, a live UDL patterned on every span: the influence of a span's load
// on a point decays by a factor of about 0.27 a span (the carry-over of
// equal continuous spans, 2 - sqrt(3) = 0.268; a general property of the
// three-moment recurrence, derived from M_{i-1} + 4 M_i + M_{i+1} = 0, see
// any text on continuous beams, e.g. Timoshenko & Young, "Theory of
// Structures", 2nd ed., 1965, art. on continuous beams; from memory), so a
// span 30 spans away changes the end span's moment by about 0.27^30 =
// 1e-17 of it: below the rounding of the sum, it is left off. The spans
// near by still follow the alternate pattern (spans 1, 3 and 5 loaded,
// 2 and 4 not), and the value is the same as with every alternate span
// loaded to rounding (all three methods re-solve the arrangement in the
// second route, which must hold).
TEST(Envelope, FarSpansOfRoundingInfluenceAreLeftOffWhatGoverns) {
  std::string spans, supports = "\"pinned\"", loads;
  for (int i = 1; i <= 40; ++i) {
    spans += std::string(i > 1 ? "," : "") + R"({"length": 5, "EI": 40000})";
    supports += R"(, "roller")";
    loads += std::string(i > 1 ? "," : "") + R"({"type": "udl", "case": "live", "w": 10, "span": )" + std::to_string(i) + "}";
  }
  const BeamResult r = run(R"({"units": {"force": "kN", "length": "m"}, "spans": [)" + spans + R"(], "supports": [)" + supports +
                           R"(], "loads": [)" + loads + R"(], "combinations": [{"name": "live-pattern", "factors": {"live": 1.0}, "pattern": ["live"]}]})");
  const LoadSet* s = set_named(r, "live-pattern");
  ASSERT_NE(s, nullptr);
  EXPECT_EQ(s->verdict, Verdict::Agree) << s->problem;
  ASSERT_FALSE(s->second_route.empty());
  for (const auto& rc : s->second_route) EXPECT_TRUE(rc.holds) << rc.quantity << " " << rc.where;
  for (const auto& m : s->methods) {
    ASSERT_TRUE(m.envelope) << m.name;
    const Governs& g = governs_of(m.envelope->moment[s->stations.size() / 80].max_by);  // inside span 1
    ASSERT_FALSE(g.spans.empty());
    EXPECT_EQ(g.spans[0], 0u) << m.name;
    for (std::uint32_t sp : {1u, 3u}) EXPECT_EQ(std::count(g.spans.begin(), g.spans.end(), sp), 0) << m.name << " span " << sp + 1;
    for (std::uint32_t sp : {2u, 4u}) EXPECT_EQ(std::count(g.spans.begin(), g.spans.end(), sp), 1) << m.name << " span " << sp + 1;
    EXPECT_LT(g.spans.back(), 35u) << m.name << ": a span of rounding influence is named";
  }
  // The second route carries the alternate pattern on to the ends of the
  // beam where the influence is rounding (the value changes by rounding
  // only), so the largest sagging moment of every odd span is governed by
  // one arrangement, every odd span loaded, and solved once; on the screen
  // a run of every other span reads "1, 3, ..., 39".
  std::string odd;
  std::size_t odd_spans = 0;
  for (const auto& rc : s->second_route) {
    if (rc.quantity != "max_moment") continue;
    const int span = std::stoi(rc.where.substr(5));
    if (span % 2 == 0) continue;
    ++odd_spans;
    if (odd.empty()) odd = rc.arrangement;
    EXPECT_EQ(rc.arrangement, odd) << rc.where;
  }
  EXPECT_EQ(odd_spans, 20u);
  EXPECT_EQ(odd, "spans 1, 3, ..., 39 loaded; live x1");
}

// What governs in words: runs of spans are shortened, a run of three or more
// consecutive spans to "4-6", of five or more alternate spans to "1, 3, ..., 9".
TEST(Envelope, RunsOfSpansReadShort) {
  input::Combination c;
  c.name = "c";
  c.factors = {{"live", input::Factor{1.5, 1.5, false}}};
  c.pattern = {"live"};
  Governs g;
  g.factors = {1.5};
  g.spans = {0, 2, 4, 6, 8, 9, 10, 11, 13, 15, 17};
  EXPECT_EQ(describe(g, c), "spans 1, 3, ..., 9, 10-12, 14, 16, 18 loaded; live x1.5");
  g.spans = {0, 1, 3, 5};
  EXPECT_EQ(describe(g, c), "spans 1, 2, 4, 6 loaded; live x1.5");
  g.spans = {4};
  EXPECT_EQ(describe(g, c), "span 5 loaded; live x1.5");
}

}  // namespace
}  // namespace trivet::compare
