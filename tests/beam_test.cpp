// Tests of the shared beam vocabulary: the station grid and the kinematic
// (mechanism) check. These are rules of statics, not published numbers:
// a beam is stable exactly when its supports and hinges leave no rigid-body
// motion (e.g. A. Ghali, A. M. Neville, T. G. Brown, "Structural Analysis:
// A Unified Classical and Matrix Approach", 6th ed., Spon, 2009, ch. 1,
// statical stability; from memory).
#include <gtest/gtest.h>

#include "methods/beam/beam.h"
#include "methods/beam/stability.h"

namespace trivet {
namespace {

Beam make(std::vector<SupportType> types, std::vector<bool> hinges = {}) {
  Beam b;
  for (std::size_t i = 0; i + 1 < types.size(); ++i) b.spans.push_back({4.0, 1000.0});
  for (std::size_t i = 0; i < types.size(); ++i) {
    Support s;
    s.type = types[i];
    if (s.type == SupportType::Spring) s.k = 100.0;
    s.hinge = i < hinges.size() && hinges[i];
    b.supports.push_back(s);
    b.labels.push_back(std::string(1, static_cast<char>('A' + i)));
  }
  return b;
}

using T = SupportType;

TEST(Stations, EqualDivisionsAndDoubledInteriorNodes) {
  Beam b = make({T::Pinned, T::Pinned, T::Pinned});
  auto st = build_stations(b, 4);
  // 5 per span, the interior node appears twice (end of span 1, start of 2).
  ASSERT_EQ(st.size(), 10u);
  EXPECT_DOUBLE_EQ(st[4].x, 4.0);
  EXPECT_EQ(st[4].span, 0u);
  EXPECT_DOUBLE_EQ(st[4].local, 4.0);
  EXPECT_DOUBLE_EQ(st[5].x, 4.0);
  EXPECT_EQ(st[5].span, 1u);
  EXPECT_DOUBLE_EQ(st[5].local, 0.0);
  for (std::size_t i = 1; i < st.size(); ++i) EXPECT_LE(st[i - 1].x, st[i].x);
}

TEST(Stations, PointLoadGivesBothSidesAndUdlEndsAreAdded) {
  Beam b = make({T::Pinned, T::Pinned});
  Load p; p.type = LoadType::Point; p.index = 0; p.P = 10; p.at = 1.3;
  Load w; w.type = LoadType::Udl; w.index = 0; w.w1 = w.w2 = 2; w.from = 0.7; w.to = 2.0;
  b.loads = {p, w};
  auto st = build_stations(b, 2);
  // 0, 0.7, 1.3-, 1.3+, 2.0, 4.0
  ASSERT_EQ(st.size(), 6u);
  EXPECT_DOUBLE_EQ(st[1].local, 0.7);
  EXPECT_DOUBLE_EQ(st[2].local, 1.3);
  EXPECT_FALSE(st[2].after);
  EXPECT_DOUBLE_EQ(st[3].local, 1.3);
  EXPECT_TRUE(st[3].after);
  EXPECT_DOUBLE_EQ(st[4].local, 2.0);
}

TEST(Mechanism, SimplySupportedAndContinuousAreStable) {
  EXPECT_FALSE(find_mechanism(make({T::Pinned, T::Roller})));
  EXPECT_FALSE(find_mechanism(make({T::Fixed, T::Free})));
  EXPECT_FALSE(find_mechanism(make({T::Pinned, T::Pinned, T::Pinned, T::Free})));
  EXPECT_FALSE(find_mechanism(make({T::Spring, T::Spring})));
  EXPECT_FALSE(find_mechanism(make({T::Fixed, T::Guided})));
}

TEST(Mechanism, AllFreeMoves) {
  auto m = find_mechanism(make({T::Free, T::Free, T::Free}));
  ASSERT_TRUE(m);
  EXPECT_EQ(m->first_span, 0u);
  EXPECT_EQ(m->last_span, 1u);
}

TEST(Mechanism, OneSupportTurns) {
  EXPECT_TRUE(find_mechanism(make({T::Pinned, T::Free})));
  EXPECT_TRUE(find_mechanism(make({T::Guided, T::Free})));
  EXPECT_TRUE(find_mechanism(make({T::Guided, T::Guided})));
}

TEST(Mechanism, HingeBetweenTwoPinnedEndsIsAMechanism) {
  // Three hinges in a line: pinned A, hinge at B (no support), pinned C.
  EXPECT_TRUE(find_mechanism(make({T::Pinned, T::Free, T::Pinned}, {false, true, false})));
  // A hinge over an interior support is fine.
  EXPECT_FALSE(find_mechanism(make({T::Pinned, T::Pinned, T::Pinned}, {false, true, false})));
  // A hinge in a fixed-ended beam (a propped Gerber beam) is fine.
  EXPECT_FALSE(find_mechanism(make({T::Fixed, T::Free, T::Pinned}, {false, true, false})));
  // Cantilever with a hinged drop-in span and nothing beyond.
  auto m = find_mechanism(make({T::Fixed, T::Free, T::Free}, {false, true, false}));
  ASSERT_TRUE(m);
  EXPECT_EQ(m->first_span, 1u);
}

// The test is scale-free: the same beam in mm and in km gives the same
// answer. Spans of 1e-13 (pinned, roller, roller) were called a mechanism
// while 1e-12 was not, from an absolute tolerance on positions.
TEST(Mechanism, ScaleFree) {
  for (double L : {1e-13, 1e-6, 1.0, 1e6, 1e13}) {
    Beam b = make({T::Pinned, T::Roller, T::Roller});
    for (auto& s : b.spans) s.length = L;
    EXPECT_FALSE(find_mechanism(b)) << "spans of " << L;
    Beam h = make({T::Pinned, T::Free, T::Pinned}, {false, true, false});
    for (auto& s : h.spans) s.length = L;
    EXPECT_TRUE(find_mechanism(h)) << "spans of " << L;
    Beam g = make({T::Fixed, T::Free, T::Pinned}, {false, true, false});
    for (auto& s : g.spans) s.length = L;
    EXPECT_FALSE(find_mechanism(g)) << "spans of " << L;
  }
}

}  // namespace
}  // namespace trivet
