// Moving loads: each method's influence lines against closed forms and
// reciprocity, and each method's moving-load envelope against direct solves
// of the train at a fine grid of positions (built here, not by the envelope
// code).
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <random>
#include <string>
#include <vector>

#include "harness/compare/compare.h"
#include "harness/compare/moving.h"

namespace trivet::compare {
namespace {

input::BeamFile file_of(const Beam& beam, const std::vector<input::MovingLoad>& trains) {
  input::BeamFile f;
  f.path = "moving.json";
  f.beam = beam;
  for (const auto& l : beam.loads)
    if (std::find(f.cases.begin(), f.cases.end(), l.load_case) == f.cases.end()) f.cases.push_back(l.load_case);
  f.moving_loads = trains;
  return f;
}

Beam spans_beam(const std::vector<double>& lengths, double EI) {
  Beam b;
  for (double L : lengths) b.spans.push_back({L, EI});
  b.supports.assign(lengths.size() + 1, Support{});
  b.supports[0].type = SupportType::Pinned;
  for (std::size_t i = 1; i < b.supports.size(); ++i) b.supports[i].type = SupportType::Roller;
  for (std::size_t i = 0; i < b.supports.size(); ++i) b.labels.push_back(input::default_label(i));
  b.stations_per_span = 10;
  return b;
}

input::MovingLoad unit_train() {
  input::MovingLoad t;
  t.name = "unit";
  t.points = {{1.0, 0.0}};
  return t;
}

const LoadSet* set_named(const BeamResult& r, const std::string& name) {
  for (const auto& s : r.sets)
    if (s.name == name) return &s;
  return nullptr;
}

// The index of the station at the end of span s (local L, before any jump).
std::size_t station_at_end(const LoadSet& set, std::size_t s) {
  std::size_t k = 0;
  for (std::size_t i = 0; i < set.stations.size(); ++i)
    if (set.stations[i].span == s) k = i;
  return k;
}

// Two equal spans, a unit load at a = xi L in span 1. The three-moment
// equation (Clapeyron) with M_A = M_C = 0 gives 4 L M_B = -P a b (L + a) / L,
// so M_B = -L xi (1 - xi) (1 + xi) / 4 (derived here); statics of span 1
// gives R_A = (1 - xi) + M_B / L, and of span 2, R_C = M_B / L. At midspan
// these are M_B = -3PL/32, R_A = 13P/32, R_B = 11P/16, R_C = -3P/32: AISC
// Steel Construction Manual, Table 3-23, "continuous beam, two equal spans,
// concentrated load at center of one span" (from memory).
TEST(Moving, TwoSpanInfluenceLinesMatchTheClosedFormAndTheHandbook) {
  const double L = 8.0;
  const Beam beam = spans_beam({L, L}, 2.0e4);
  const BeamResult r = check(file_of(beam, {unit_train()}), Options{});
  const LoadSet* set = set_named(r, "unit");
  ASSERT_NE(set, nullptr);
  ASSERT_EQ(set->methods.size(), 3u);
  const std::size_t iB = station_at_end(*set, 0);
  for (const auto& m : set->methods) {
    SCOPED_TRACE(m.name);
    ASSERT_EQ(m.status, MethodStatus::Ok) << m.reason;
    ASSERT_TRUE(m.moving_model);
    const MovingModel& mm = *m.moving_model;
    const auto mB = mm.influence(0, L, false, MovingModel::kMoment);
    const auto rA = mm.reaction_influence(0);
    const auto rB = mm.reaction_influence(1);
    const auto rC = mm.reaction_influence(2);
    for (int k = 1; k < 40; ++k) {
      const double xi = k / 40.0;
      const double MB = -L * xi * (1 - xi) * (1 + xi) / 4;
      EXPECT_NEAR(mm.influence_value(mB, xi * L), MB, 1e-12 * L) << xi;
      // Span 2 by symmetry: the load at xi L from C.
      EXPECT_NEAR(mm.influence_value(mB, 2 * L - xi * L), MB, 1e-12 * L) << xi;
      EXPECT_NEAR(mm.influence_value(rA, xi * L), (1 - xi) + MB / L, 1e-12) << xi;
      EXPECT_NEAR(mm.influence_value(rC, xi * L), MB / L, 1e-12) << xi;
    }
    EXPECT_NEAR(mm.influence_value(mB, L / 2), -3 * L / 32, 1e-12 * L);
    EXPECT_NEAR(mm.influence_value(rA, L / 2), 13.0 / 32, 1e-12);
    EXPECT_NEAR(mm.influence_value(rB, L / 2), 11.0 / 16, 1e-12);
    EXPECT_NEAR(mm.influence_value(rC, L / 2), -3.0 / 32, 1e-12);
    // The envelope of one unit load: the least M_B is at dM_B/dxi = 0,
    // 1 - 3 xi^2 = 0, xi = 1/sqrt(3): M_B = -L / (6 sqrt 3) (derived here),
    // found exactly, not at a station.
    ASSERT_TRUE(m.envelope);
    EXPECT_NEAR(m.envelope->moment[iB].min, -L / (6 * std::sqrt(3.0)), 1e-12 * L);
    const Governs& g = governs_of(m.envelope->moment[iB].min_by);
    ASSERT_EQ(g.train, Governs::Train::Placed);
    const double a = std::min(g.first, 2 * L - g.first);  // either span, by symmetry
    EXPECT_NEAR(a, L / std::sqrt(3.0), 1e-7 * L);
    // The largest R_B is the load on B itself: 1.
    EXPECT_NEAR(m.envelope->reaction[1].max, 1.0, 1e-12);
  }
  EXPECT_EQ(set->verdict, Verdict::Agree) << set->problem;
  ASSERT_FALSE(set->second_route.empty());
  for (const auto& rc : set->second_route) EXPECT_TRUE(rc.holds) << rc.quantity << " " << rc.where;
}

// Three equal spans, a unit load at a = xi L in span 1: the three-moment
// equations 4 L M_B + L M_C = -P a b (L + a) / L and L M_B + 4 L M_C = 0 give
// M_B = -(4/15) L xi (1 - xi)(1 + xi) and M_C = -M_B / 4 (derived here); at
// midspan M_B = -PL/10. Statics of span 1 gives the end reaction
// R_A = (1 - xi) + M_B / L, and of span 3 (unloaded) R_D = M_C / L.
TEST(Moving, ThreeSpanSupportMomentLinesMatchTheClosedForm) {
  const double L = 5.0;
  const Beam beam = spans_beam({L, L, L}, 7.5e3);
  const BeamResult r = check(file_of(beam, {unit_train()}), Options{});
  const LoadSet* set = set_named(r, "unit");
  ASSERT_NE(set, nullptr);
  for (const auto& m : set->methods) {
    SCOPED_TRACE(m.name);
    ASSERT_EQ(m.status, MethodStatus::Ok) << m.reason;
    const MovingModel& mm = *m.moving_model;
    const auto mB = mm.influence(0, L, false, MovingModel::kMoment);
    const auto mC = mm.influence(1, L, false, MovingModel::kMoment);
    const auto rA = mm.reaction_influence(0);
    const auto rD = mm.reaction_influence(3);
    for (int k = 1; k < 30; ++k) {
      const double xi = k / 30.0;
      const double MB = -(4.0 / 15) * L * xi * (1 - xi) * (1 + xi);
      EXPECT_NEAR(mm.influence_value(mB, xi * L), MB, 1e-12 * L) << xi;
      EXPECT_NEAR(mm.influence_value(mC, xi * L), -MB / 4, 1e-12 * L) << xi;
      EXPECT_NEAR(mm.influence_value(rA, xi * L), (1 - xi) + MB / L, 1e-12) << xi;
      EXPECT_NEAR(mm.influence_value(rD, xi * L), -MB / 4 / L, 1e-12) << xi;
    }
    EXPECT_NEAR(mm.influence_value(mB, L / 2), -L / 10, 1e-12 * L);
  }
}

// Maxwell-Betti: the deflection at i under a unit load at j equals the
// deflection at j under a unit load at i, on a beam with a spring, a fixed
// end, an overhang and spans of different stiffness.
TEST(Moving, DeflectionLinesAreReciprocal) {
  Beam beam = spans_beam({4.0, 6.5, 5.0, 1.8}, 1.0e4);
  beam.spans[1].EI = 2.5e4;
  beam.supports[0].type = SupportType::Fixed;
  beam.supports[2].type = SupportType::Spring;
  beam.supports[2].k = 3.0e3;
  beam.supports[4].type = SupportType::Free;
  const BeamResult r = check(file_of(beam, {unit_train()}), Options{});
  const LoadSet* set = set_named(r, "unit");
  ASSERT_NE(set, nullptr);
  for (const auto& m : set->methods) {
    SCOPED_TRACE(m.name);
    ASSERT_EQ(m.status, MethodStatus::Ok) << m.reason;
    const MovingModel& mm = *m.moving_model;
    double scale = 0;
    std::vector<std::vector<double>> lines;
    for (const auto& st : set->stations) {
      lines.push_back(mm.influence(st.span, st.local, st.after, MovingModel::kDeflection));
      for (double v : lines.back()) scale = std::max(scale, std::abs(v));
    }
    ASSERT_GT(scale, 0);
    for (std::size_t i = 0; i < set->stations.size(); i += 3)
      for (std::size_t j = 0; j < set->stations.size(); j += 5) {
        const double xi = set->stations[i].x, xj = set->stations[j].x;
        EXPECT_NEAR(mm.influence_value(lines[i], xj), mm.influence_value(lines[j], xi), 1e-10 * scale) << xi << " " << xj;
      }
  }
}

// ---------------------------------------------------------------------------
// Brute force: the train at a fine grid of positions, each placed here and
// solved by each method directly.

struct Rng {
  std::mt19937 g;
  explicit Rng(unsigned seed) : g(seed) {}
  double u() { return std::uniform_real_distribution<double>(0.0, 1.0)(g); }
  double in(double a, double b) { return a + (b - a) * u(); }
  bool chance(double p) { return u() < p; }
};

Beam random_beam(Rng& rng) {
  const std::size_t n = 1 + static_cast<std::size_t>(rng.u() * 6) % 6;
  std::vector<double> lengths;
  for (std::size_t s = 0; s < n; ++s) lengths.push_back(std::round(rng.in(2, 9) * 4) / 4);
  Beam b = spans_beam(lengths, 1e4);
  for (auto& sp : b.spans) sp.EI = std::round(rng.in(0.5, 3)) * 1e4;
  for (std::size_t i = 0; i <= n; ++i) {
    const double u = rng.u();
    auto& s = b.supports[i];
    if (u < 0.2) s.type = SupportType::Fixed;
    else if (u < 0.35) { s.type = SupportType::Spring; s.k = std::round(rng.in(1, 20)) * 1e3; }
    else s.type = i == 0 ? SupportType::Pinned : SupportType::Roller;
  }
  // Sometimes an overhang at an end.
  if (n >= 2 && rng.chance(0.3) && b.supports[1].type != SupportType::Spring) {
    b.supports[0].type = SupportType::Free;
    b.supports[1].type = SupportType::Pinned;
  }
  // Keep it stable: at least two deflection restraints, or one fixed end.
  int rigid = 0;
  for (const auto& s : b.supports) rigid += restrains_deflection(s.type) ? (s.type == SupportType::Fixed ? 2 : 1) : 0;
  if (rigid < 2) { b.supports[0].type = SupportType::Fixed; }
  // A dead load on every span.
  for (std::size_t s = 0; s < n; ++s) {
    Load l;
    l.type = LoadType::Udl;
    l.index = s;
    l.w1 = l.w2 = std::round(rng.in(1, 8));
    l.from = 0;
    l.to = b.spans[s].length;
    l.load_case = "dead";
    b.loads.push_back(l);
  }
  b.stations_per_span = 1 + static_cast<int>(rng.u() * 4);
  return b;
}

// The beam with the train's first point at p (dir +1 forward, -1 backward),
// each force times f, on top of the beam's own loads (times `fixed`).
// `approach`: the value is the limit as the first point comes to p from
// below (-1) or above (+1): a point then counts as on the beam if it is on it
// a hair's breadth before.
Beam placed(const Beam& beam, const input::MovingLoad& t, double p, int dir, double f, double fixed, int approach = 0) {
  Beam b = beam;
  for (auto& l : b.loads) { l.P *= fixed; l.w1 *= fixed; l.w2 *= fixed; l.C *= fixed; }
  const double total = beam.node_x(beam.node_count() - 1);
  for (const auto& pt : t.points) {
    const double a = p + dir * pt.offset;
    if (a < 0 || a > total) continue;
    const double before = p + approach * 1e-9 * total + dir * pt.offset;
    if (approach != 0 && (before < 0 || before > total)) continue;
    Load l;
    l.type = LoadType::Point;
    l.P = f * pt.P;
    l.load_case = "train";
    double x0 = 0;
    bool done = false;
    for (std::size_t s = 0; s < beam.spans.size() && !done; ++s) {
      const double L = beam.spans[s].length;
      if (std::abs(a - x0) < 1e-12) { l.on_node = true; l.index = s; done = true; }
      else if (a < x0 + L) { l.index = s; l.at = a - x0; done = true; }
      x0 += L;
    }
    if (!done) { l.on_node = true; l.index = beam.spans.size(); }
    b.loads.push_back(l);
  }
  return b;
}

TEST(Moving, EveryMethodsEnvelopeBoundsEveryPositionAndIsAttained) {
  Rng rng(20261204);
  int beams = 0;
  for (int trial = 0; trial < 30; ++trial) {
    const Beam beam = random_beam(rng);
    input::MovingLoad t;
    t.name = "train";
    const int points = 1 + static_cast<int>(rng.u() * 3) % 3;
    double off = 0;
    for (int k = 0; k < points; ++k) {
      t.points.push_back({std::round(rng.in(10, 100)), off});
      off += std::round(rng.in(0.5, 4) * 4) / 4;
    }
    t.both_directions = rng.chance(0.7);
    input::BeamFile file = file_of(beam, {t});
    input::Combination c;
    c.name = "dead+train";
    c.factors = {{"dead", input::Factor{1.2, 1.2, false}}};
    c.moving = std::make_pair(std::string("train"), 1.5);
    file.combinations.push_back(c);
    const BeamResult r = check(file, Options{});
    SCOPED_TRACE("trial " + std::to_string(trial));
    for (const char* name : {"train", "dead+train"}) {
      const LoadSet* set = set_named(r, name);
      ASSERT_NE(set, nullptr);
      SCOPED_TRACE(name);
      const bool combo = std::string(name) != "train";
      const double f = combo ? 1.5 : 1.0;
      const Beam base = combo ? set->beam : beam_for_factors(beam, std::vector<std::pair<std::string, double>>{});
      // The load set's beam already carries the factored dead load (or none).
      const double total = beam.node_x(beam.node_count() - 1);
      const double lo = -off - 0.5, hi = total + 0.5;
      const int steps = 160;
      for (const auto& m : set->methods) {
        SCOPED_TRACE(m.name);
        ASSERT_EQ(m.status, MethodStatus::Ok) << m.reason;
        ASSERT_TRUE(m.envelope);
        const Envelope& e = *m.envelope;
        // Each kind's largest magnitude, floored where it is rounding
        // (a beam that barely deflects) as every comparison of the harness.
        const double sm = set->scale[static_cast<int>(Kind::Moment)], sv = set->scale[static_cast<int>(Kind::Shear)];
        const double sd = set->scale[static_cast<int>(Kind::Deflection)], sr = set->scale[static_cast<int>(Kind::Reaction)];
        const Method* method = find_method(m.name);
        ASSERT_NE(method, nullptr);
        auto within = [&](const Solution& s, double tm) {
          for (std::size_t i = 0; i < set->stations.size(); ++i) {
            const Station& st = set->stations[i];
            const PointValues p = s.at(st.span, st.local, st.after);
            EXPECT_LE(p.moment, e.moment[i].max + tm * sm) << "x = " << st.x;
            EXPECT_GE(p.moment, e.moment[i].min - tm * sm) << "x = " << st.x;
            EXPECT_LE(p.shear, e.shear[i].max + tm * sv) << "x = " << st.x;
            EXPECT_GE(p.shear, e.shear[i].min - tm * sv) << "x = " << st.x;
            EXPECT_LE(p.deflection, e.deflection[i].max + tm * sd) << "x = " << st.x;
            EXPECT_GE(p.deflection, e.deflection[i].min - tm * sd) << "x = " << st.x;
          }
          for (std::size_t j = 0; j < s.nodes.size(); ++j) {
            EXPECT_LE(s.nodes[j].reaction_force, e.reaction[j].max + tm * sr);
            EXPECT_GE(s.nodes[j].reaction_force, e.reaction[j].min - tm * sr);
          }
        };
        for (int dir : {1, -1}) {
          if (dir < 0 && !t.both_directions) continue;
          for (int k = 0; k <= steps; ++k) {
            const double p = lo + (hi - lo) * k / steps;
            const Beam pb = placed(base, t, p, dir, f, 1.0);
            const Solution s = method->solve(pb, build_stations(pb, 1));
            ASSERT_EQ(s.status, MethodStatus::Ok);
            within(s, 1e-9);
          }
        }
        // Attained: each station's bounds are what the train gives where
        // they say it stands (solved here, either limit at a jump).
        for (std::size_t i = 0; i < set->stations.size(); ++i) {
          const Station& st = set->stations[i];
          for (int side = 0; side < 2; ++side) {
            const Bound& b = e.moment[i];
            const Governs& g = governs_of(side ? b.min_by : b.max_by);
            Beam pb = base;
            if (g.train == Governs::Train::Placed) pb = placed(base, t, g.first, g.backward ? -1 : 1, f, 1.0, g.approach);
            const Solution s = method->solve(pb, build_stations(pb, 1));
            ASSERT_EQ(s.status, MethodStatus::Ok);
            const double want = side ? b.min : b.max;
            const double l = s.at(st.span, st.local, false).moment, rr = s.at(st.span, st.local, true).moment;
            EXPECT_NEAR(std::abs(l - want) < std::abs(rr - want) ? l : rr, want, 1e-9 * sm) << "x = " << st.x << " side " << side << " first " << g.first;
          }
        }
      }
      EXPECT_NE(set->verdict, Verdict::Disagree) << set->problem;
      for (const auto& rc : set->second_route) EXPECT_TRUE(rc.holds) << rc.quantity << " " << rc.where << " " << rc.arrangement;
    }
    ++beams;
  }
  EXPECT_EQ(beams, 30);
}

// Between stations: a point that is no station (a claim's x, a row of
// another program's table) gets the lines there from unit loads on either
// side of it, solved by the method on demand. Its envelope must bound the
// train at every position of a fine grid and be attained where it says; a
// claim there reads it.
TEST(Moving, BetweenStationsTheEnvelopeIsFoundOnDemand) {
  Beam beam = spans_beam({6.0, 7.5, 5.0}, 3.0e4);
  beam.stations_per_span = 2;
  input::MovingLoad t;
  t.name = "axles";
  t.points = {{80.0, 0.0}, {120.0, 1.8}, {40.0, 4.1}};
  input::BeamFile file = file_of(beam, {t});
  const double x = 2.3, xs = 6.0 + 4.4;  // span 1 at 2.3, span 2 at 4.4: no stations
  input::Claim c;
  c.quantity = input::Quantity::MomentMax;
  c.x = x;
  c.load_case = "axles";
  c.value = 0;  // replaced below by the computed value
  file.claims.push_back(c);
  const BeamResult first = check(file, Options{});
  const LoadSet* set = set_named(first, "axles");
  ASSERT_NE(set, nullptr);
  ASSERT_EQ(first.claims.size(), 1u);
  ASSERT_TRUE(first.claims[0].evaluated) << first.claims[0].reason;
  for (const auto& m : set->methods) {
    SCOPED_TRACE(m.name);
    ASSERT_EQ(m.status, MethodStatus::Ok) << m.reason;
    const MovingModel& mm = *m.moving_model;
    const Method* method = find_method(m.name);
    ASSERT_NE(method, nullptr);
    for (int which = 0; which < 2; ++which) {
      const double at = which == 0 ? x : xs;
      const auto [span, local] = locate(beam, at);
      const Bound bm = mm.at(span, local, false, MovingModel::kMoment);
      const Bound bv = mm.at(span, local, false, MovingModel::kShear);
      const double sm = set->scale[static_cast<int>(Kind::Moment)], sv = set->scale[static_cast<int>(Kind::Shear)];
      for (int dir : {1, -1})
        for (int k = 0; k <= 400; ++k) {
          const double p = -4.6 + (18.5 + 9.2) * k / 400.0;
          const Beam pb = placed(beam, t, p, dir, 1.0, 1.0);
          const Solution s = method->solve(pb, build_stations(pb, 1));
          ASSERT_EQ(s.status, MethodStatus::Ok);
          const PointValues v = s.at(span, local, false);
          EXPECT_LE(v.moment, bm.max + 1e-9 * sm) << at << " " << p;
          EXPECT_GE(v.moment, bm.min - 1e-9 * sm) << at << " " << p;
          EXPECT_LE(v.shear, bv.max + 1e-9 * sv) << at << " " << p;
          EXPECT_GE(v.shear, bv.min - 1e-9 * sv) << at << " " << p;
        }
      const Governs& g = governs_of(bm.max_by);
      ASSERT_EQ(g.train, Governs::Train::Placed);
      const Beam pb = placed(beam, t, g.first, g.backward ? -1 : 1, 1.0, 1.0, g.approach);
      const Solution s = method->solve(pb, build_stations(pb, 1));
      const double l = s.at(span, local, false).moment, r = s.at(span, local, true).moment;
      EXPECT_NEAR(std::abs(l - bm.max) < std::abs(r - bm.max) ? l : r, bm.max, 1e-9 * sm) << at;
      if (which == 0) {
        EXPECT_NEAR(first.claims[0].computed, bm.max, 1e-9 * sm);
      }
    }
  }
  // The claim holds at the computed value and fails 5% away.
  file.claims[0].value = first.claims[0].computed;
  EXPECT_TRUE(check(file, Options{}).claims[0].holds);
  file.claims[0].value = first.claims[0].computed * 1.05;
  EXPECT_FALSE(check(file, Options{}).claims[0].holds);
}

}  // namespace
}  // namespace trivet::compare
