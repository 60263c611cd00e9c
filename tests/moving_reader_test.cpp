// The beam file's moving loads (a crane's wheels, a vehicle's axles), the
// input side: what the reader makes of "moving_loads", of a combination and
// a claim that name one, and every error of them with its pointer, its id
// and its reason. (The numbers are file data read back, not results of a
// check: no published source is needed; the units' factors are exact by
// definition, README "Sign conventions and units".)
#include <gtest/gtest.h>

#include <string>
#include <vector>

#include "harness/input/reader.h"

namespace trivet::input {
namespace {

// A two-span beam with a dead and a live case; the moving loads,
// combinations, claims and deflection limit are the test's.
std::string beam_file(const std::string& moving, const std::string& combinations = "", const std::string& claims = "",
                      const std::string& extra = "") {
  std::string t = R"({
  "units": {"force": "kN", "length": "m"},
  "spans": [{"length": 5.0, "EI": 52000}, {"length": 6.5, "EI": 52000}],
  "supports": ["pinned", "roller", "roller"],
  "loads": [{"type": "udl", "span": 1, "w": 8.0, "case": "dead"},
            {"type": "udl", "span": 2, "w": 3.0, "case": "live"}])";
  if (!moving.empty()) t += ",\n  \"moving_loads\": " + moving;
  if (!combinations.empty()) t += ",\n  \"combinations\": " + combinations;
  if (!claims.empty()) t += ",\n  \"claims\": {\"values\": " + claims + "}";
  if (!extra.empty()) t += ",\n  " + extra;
  return t + "\n}";
}

const std::string kTrolley =
    R"([{"name": "trolley", "points": [{"P": 100.0, "offset": 0.0}, {"P": 60.0, "offset": 3.5}]}])";

std::string all_errors(const BeamFile& f) {
  std::string s;
  for (const auto& e : f.errors) s += e.id + " at " + e.pointer + " (" + e.where + "): " + e.reason + "\n";
  return s;
}

TEST(MovingReader, ATrainReadsIntoItsPointsInFileOrder) {
  const BeamFile f = parse_beam_text(beam_file(kTrolley), "crane.json");
  ASSERT_TRUE(f.ok()) << all_errors(f);
  ASSERT_EQ(f.moving_loads.size(), 1u);
  const MovingLoad& m = f.moving_loads[0];
  EXPECT_EQ(m.name, "trolley");
  EXPECT_EQ(m.pointer, "/moving_loads/0");
  EXPECT_TRUE(m.both_directions);  // "both" is the default
  ASSERT_EQ(m.points.size(), 2u);
  EXPECT_DOUBLE_EQ(m.points[0].P, 100.0);
  EXPECT_DOUBLE_EQ(m.points[0].offset, 0.0);
  EXPECT_DOUBLE_EQ(m.points[1].P, 60.0);
  EXPECT_DOUBLE_EQ(m.points[1].offset, 3.5);
  // A moving load is a load set of its own, not a load case, and adds no
  // load to the beam.
  EXPECT_EQ(f.cases, (std::vector<std::string>{"dead", "live"}));
  EXPECT_EQ(f.beam.loads.size(), 2u);
}

// Quantities with their own unit are converted to the file's units, as a
// point load's P and position are: 100000 N = 100 kN, 3500 mm = 3.5 m,
// 2 ft = 0.6096 m (1 ft = 0.3048 m exactly), 10 kip = 44.482216152605 kN
// (1 lbf = 4.4482216152605 N exactly).
TEST(MovingReader, UnitsAreConvertedToTheFilesUnits) {
  // 2 ft after 3500 mm: the offsets are compared in the file's units
  // (2 ft is 0.6096 m; its double in m prints as 0.6095999999999999).
  const BeamFile f = parse_beam_text(beam_file(R"([
    {"name": "axles", "directions": "forward",
     "points": [{"P": "100000 N", "offset": "0 mm"}, {"P": "10 kip", "offset": "3500 mm"}, {"P": -5, "offset": "2 ft"}]}])"),
                                     "crane.json");
  ASSERT_EQ(f.errors.size(), 1u) << all_errors(f);
  EXPECT_EQ(f.errors[0].pointer, "/moving_loads/0/points/2/offset");
  EXPECT_EQ(f.errors[0].id, "input.bad_train");
  EXPECT_NE(f.errors[0].reason.find("(got 0.6095999999999999 after 3.5)"), std::string::npos) << f.errors[0].reason;

  const BeamFile g = parse_beam_text(beam_file(R"([
    {"name": "axles", "directions": "forward",
     "points": [{"P": "100000 N", "offset": "0 mm"}, {"P": "10 kip", "offset": "3500 mm"}, {"P": -5, "offset": "12 ft"}]}])"),
                                     "crane.json");
  ASSERT_TRUE(g.ok()) << all_errors(g);
  const MovingLoad& m = g.moving_loads.at(0);
  EXPECT_FALSE(m.both_directions);
  ASSERT_EQ(m.points.size(), 3u);
  EXPECT_NEAR(m.points[0].P, 100.0, 1e-12);
  EXPECT_NEAR(m.points[1].P, 44.482216152605, 1e-12);
  EXPECT_DOUBLE_EQ(m.points[2].P, -5.0);  // an upward point is allowed, one point is not zero
  EXPECT_NEAR(m.points[1].offset, 3.5, 1e-15);
  EXPECT_NEAR(m.points[2].offset, 12 * 0.3048, 1e-14);

  // A file in kip and ft keeps its plain numbers in kip and ft.
  const BeamFile h = parse_beam_text(R"({"units": {"force": "kip", "length": "ft"},
    "spans": [{"length": 20, "EI": 1e6}], "supports": ["pinned", "roller"],
    "moving_loads": [{"name": "truck", "points": [{"P": 8, "offset": 0}, {"P": 32, "offset": 14}, {"P": "142.34 kN", "offset": "336 in"}]}]})",
                                     "truck.json");
  ASSERT_TRUE(h.ok()) << all_errors(h);
  ASSERT_EQ(h.moving_loads.at(0).points.size(), 3u);
  EXPECT_DOUBLE_EQ(h.moving_loads[0].points[1].P, 32.0);
  EXPECT_DOUBLE_EQ(h.moving_loads[0].points[1].offset, 14.0);
  EXPECT_NEAR(h.moving_loads[0].points[2].P, 142.34 / 4.4482216152605, 1e-12);  // kN to kip
  EXPECT_NEAR(h.moving_loads[0].points[2].offset, 28.0, 1e-12);                 // 336 in = 28 ft
}

TEST(MovingReader, ACombinationNamingAMovingLoadHoldsItApartFromItsFactors) {
  const BeamFile f = parse_beam_text(
      beam_file(kTrolley, R"([
        {"name": "crane", "factors": {"dead": 1.2, "trolley": 1.6, "live": 0.5}},
        {"name": "crane alone", "factors": {"trolley": 1.5}},
        {"name": "service", "factors": {"dead": 1.0, "live": 1.0}}])"),
      "crane.json");
  ASSERT_TRUE(f.ok()) << all_errors(f);
  ASSERT_EQ(f.combinations.size(), 3u);
  const Combination& c = f.combinations[0];
  ASSERT_EQ(c.factors.size(), 2u);  // the moving load is not among the factors
  EXPECT_EQ(c.factors[0].first, "dead");
  EXPECT_DOUBLE_EQ(c.factors[0].second.high, 1.2);
  EXPECT_EQ(c.factors[1].first, "live");
  EXPECT_DOUBLE_EQ(c.factors[1].second.high, 0.5);
  ASSERT_TRUE(c.moving.has_value());
  EXPECT_EQ(c.moving->first, "trolley");
  EXPECT_DOUBLE_EQ(c.moving->second, 1.6);
  EXPECT_TRUE(c.is_envelope());
  // A combination made of the moving load alone.
  const Combination& a = f.combinations[1];
  EXPECT_TRUE(a.factors.empty());
  ASSERT_TRUE(a.moving.has_value());
  EXPECT_EQ(a.moving->first, "trolley");
  EXPECT_DOUBLE_EQ(a.moving->second, 1.5);
  EXPECT_TRUE(a.is_envelope());
  // A plain combination names none.
  EXPECT_FALSE(f.combinations[2].moving.has_value());
  EXPECT_FALSE(f.combinations[2].is_envelope());
}

TEST(MovingReader, ClaimsAndTheDeflectionLimitMayNameAMovingLoad) {
  const BeamFile f = parse_beam_text(
      beam_file(kTrolley, R"([{"name": "crane", "factors": {"dead": 1.2, "trolley": 1.6}}])",
                R"([{"quantity": "moment_max", "x": 2.5, "case": "trolley", "value": 120},
                    {"quantity": "reaction_min", "node": "B", "case": "trolley", "value": -10},
                    {"quantity": "shear_max", "node": 2, "case": "crane", "value": 150}])",
                R"("deflection_limit": {"span": "L/600", "load_sets": ["trolley"]})"),
      "crane.json");
  ASSERT_TRUE(f.ok()) << all_errors(f);
  ASSERT_EQ(f.claims.size(), 3u);
  EXPECT_EQ(f.claims[0].load_case, "trolley");
  EXPECT_EQ(f.claims[0].quantity, Quantity::MomentMax);
  EXPECT_DOUBLE_EQ(*f.claims[0].x, 2.5);
  EXPECT_EQ(f.claims[1].quantity, Quantity::ReactionMin);
  EXPECT_EQ(*f.claims[1].node, 1u);
  EXPECT_EQ(f.claims[2].load_case, "crane");
  EXPECT_EQ(f.deflection_limit_sets, std::vector<std::string>{"trolley"});
  EXPECT_DOUBLE_EQ(f.deflection_limit.ratio, 600.0);
}

// Every error of a moving load, with its pointer, its id, the engineer's
// name of the thing and a reason.
TEST(MovingReader, EveryErrorHasItsPointerIdAndReason) {
  struct Case {
    std::string text;
    std::string pointer, id, where, reason;  // `reason`: a part of the reason
  };
  const std::string pts = R"("points": [{"P": 100, "offset": 0}])";
  const std::vector<Case> cases = {
      {beam_file(R"({"name": "trolley"})"), "/moving_loads", "input.wrong_type", "", "must be a list of moving loads"},
      {beam_file(R"([3])"), "/moving_loads/0", "input.wrong_type", "moving load 1", "must be an object with a name and points"},
      {beam_file("[{" + pts + "}]"), "/moving_loads/0/name", "input.missing_field", "moving load 1", "required field is missing"},
      {beam_file(R"([{"name": "", )" + pts + "}]"), "/moving_loads/0/name", "input.wrong_type", "moving load 1", "must be a non-empty name"},
      {beam_file(R"([{"name": 7, )" + pts + "}]"), "/moving_loads/0/name", "input.wrong_type", "moving load 1", "(got 7)"},
      {beam_file(R"([{"name": "a\u001bb", )" + pts + "}]"), "/moving_loads/0/name", "input.control_characters", "moving load 1",
       "must not contain control characters"},
      {beam_file(R"([{"name": "live", )" + pts + "}]"), "/moving_loads/0/name", "input.duplicate", "moving load 1",
       "the name 'live' is already a load case's"},
      {beam_file(R"([{"name": "crab", )" + pts + R"(}, {"name": "crab", )" + pts + "}]"), "/moving_loads/1/name", "input.duplicate",
       "moving load 2", "is used by another moving load (moving load 1)"},
      {beam_file(kTrolley, R"([{"name": "trolley", "factors": {"dead": 1.0}}])"), "/combinations/0/name", "input.duplicate",
       "combination 1", "the name 'trolley' is already a moving load's (moving load 1)"},
      {beam_file(R"([{"name": "crab", "pionts": [{"P": 100, "offset": 0}]}])"), "/moving_loads/0/pionts", "input.unknown_field",
       "moving load 1", "unknown field 'pionts' (did you mean 'points'?)"},
      {beam_file(R"([{"name": "crab", "speed": 3, )" + pts + "}]"), "/moving_loads/0/speed", "input.unknown_field", "moving load 1",
       "known here: name, points, directions"},
      {beam_file(R"([{"name": "crab", "points": [{"P": 100, "ofset": 0}]}])"), "/moving_loads/0/points/0/ofset",
       "input.unknown_field", "moving load 1", "did you mean 'offset'?"},
      {beam_file(R"([{"name": "crab", "directions": "backward", )" + pts + "}]"), "/moving_loads/0/directions", "input.unknown_name",
       "moving load 1", "unknown direction 'backward'"},
      {beam_file(R"([{"name": "crab", "directions": "forwrd", )" + pts + "}]"), "/moving_loads/0/directions", "input.unknown_name",
       "moving load 1", "did you mean 'forward'?"},
      {beam_file(R"([{"name": "crab", "directions": true, )" + pts + "}]"), "/moving_loads/0/directions", "input.wrong_type",
       "moving load 1", "must be \"both\" or \"forward\""},
      {beam_file(R"([{"name": "crab"}])"), "/moving_loads/0/points", "input.missing_field", "moving load 1", "required field is missing"},
      {beam_file(R"([{"name": "crab", "points": {"P": 100, "offset": 0}}])"), "/moving_loads/0/points", "input.wrong_type",
       "moving load 1", "must be a list of"},
      {beam_file(R"([{"name": "crab", "points": []}])"), "/moving_loads/0/points", "input.wrong_count", "moving load 1",
       "must have at least one point"},
      {beam_file(R"([{"name": "crab", "points": [100]}])"), "/moving_loads/0/points/0", "input.wrong_type", "moving load 1",
       "must be an object"},
      {beam_file(R"([{"name": "crab", "points": [{"offset": 0}]}])"), "/moving_loads/0/points/0/P", "input.missing_field",
       "moving load 1", "required field is missing"},
      {beam_file(R"([{"name": "crab", "points": [{"P": 100}]}])"), "/moving_loads/0/points/0/offset", "input.missing_field",
       "moving load 1", "required field is missing"},
      {beam_file(R"([{"name": "crab", "points": [{"P": "heavy", "offset": 0}]}])"), "/moving_loads/0/points/0/P", "input.bad_quantity",
       "moving load 1", ""},
      {beam_file(R"([{"name": "crab", "points": [{"P": "100 kN/m", "offset": 0}]}])"), "/moving_loads/0/points/0/P",
       "input.bad_quantity", "moving load 1", "force"},
      {beam_file(R"([{"name": "crab", "points": [{"P": true, "offset": 0}]}])"), "/moving_loads/0/points/0/P", "input.wrong_type",
       "moving load 1", "must be a number (kN)"},
      {beam_file(R"([{"name": "crab", "points": [{"P": 1e999, "offset": 0}]}])"), "/moving_loads/0/points/0/P", "input.not_finite",
       "moving load 1", "must be a finite number"},
      {beam_file(R"([{"name": "crab", "points": [{"P": 100, "offset": "3 kN"}]}])"), "/moving_loads/0/points/0/offset",
       "input.bad_quantity", "moving load 1", "length"},
      {beam_file(R"([{"name": "crab", "points": [{"P": 100, "offset": 0}, {"P": 100, "offset": -1}]}])"),
       "/moving_loads/0/points/1/offset", "input.out_of_range", "moving load 1", "must be 0 or more (got -1)"},
      {beam_file(R"([{"name": "crab", "points": [{"P": 100, "offset": 1.5}, {"P": 100, "offset": 3}]}])"),
       "/moving_loads/0/points/0/offset", "input.bad_train", "moving load 1", "the first point's offset must be 0"},
      {beam_file(R"([{"name": "crab", "points": [{"P": 100, "offset": 0}, {"P": 100, "offset": 3}, {"P": 50, "offset": 3}]}])"),
       "/moving_loads/0/points/2/offset", "input.bad_train", "moving load 1", "offsets must increase along the train"},
      {beam_file(R"([{"name": "crab", "points": [{"P": 100, "offset": 0}, {"P": 100, "offset": 3}, {"P": 50, "offset": 2}]}])"),
       "/moving_loads/0/points/2/offset", "input.bad_train", "moving load 1", "(got 2 after 3)"},
      {beam_file(R"([{"name": "crab", "points": [{"P": 0, "offset": 0}, {"P": -0.0, "offset": 3}]}])"), "/moving_loads/0/points",
       "input.bad_train", "moving load 1", "at least one load that is not 0"},
      // In combinations.
      {beam_file(kTrolley, R"([{"name": "crane", "factors": {"dead": 1.2, "trolley": [1.0, 1.6]}}])"),
       "/combinations/0/factors/trolley", "input.bad_factor_range", "combination 1", "a moving load takes one factor"},
      {beam_file(kTrolley, R"([{"name": "crane", "factors": {"trolley": "1.6"}}])"), "/combinations/0/factors/trolley",
       "input.wrong_type", "combination 1", "must be a number"},
      {beam_file(R"([{"name": "crab", )" + pts + R"(}, {"name": "trolley", )" + pts + "}]",
                 R"([{"name": "crane", "factors": {"crab": 1.5, "trolley": 1.5}}])"),
       "/combinations/0/factors/trolley", "input.conflicting_fields", "combination 1", "at most one moving load ('crab' is already in it)"},
      {beam_file(kTrolley, R"([{"name": "crane", "factors": {"dead": 1.2, "live": 1.6, "trolley": 1.6}, "pattern": ["live"]}])"),
       "/combinations/0/pattern", "input.unsupported_feature", "combination 1",
       "a moving load ('trolley') and a pattern is not supported (yet): split it into two combinations"},
      {beam_file(kTrolley, R"([{"name": "crane", "factors": {"dead": [1.0, 1.35], "trolley": 1.6}}])"),
       "/combinations/0/factors/dead", "input.unsupported_feature", "combination 1",
       "a factor range (on 'dead') is not supported (yet): split it into two combinations"},
      {beam_file(kTrolley, R"([{"name": "crane", "factors": {"dead": 1.2, "trolley": 1.6}, "pattern": ["trolley"]}])"),
       "/combinations/0/pattern/0", "input.conflicting_fields", "combination 1", "'trolley' is a moving load"},
      {beam_file(kTrolley, R"([{"name": "crane", "factors": {"dead": 1.2, "trolly": 1.6}}])"), "/combinations/0/factors/trolly",
       "input.no_such_item", "combination 1", "there is no load case or moving load 'trolly' (did you mean 'trolley'?)"},
      // In claims: a moving load and a combination naming one are envelopes.
      {beam_file(kTrolley, "", R"([{"quantity": "moment", "x": 2.5, "case": "trolley", "value": 120}])"),
       "/claims/values/0/quantity", "input.conflicting_fields", "claim 1", "'trolley' is an envelope"},
      {beam_file(kTrolley, R"([{"name": "crane", "factors": {"dead": 1.2, "trolley": 1.6}}])",
                 R"([{"quantity": "reaction", "node": "A", "case": "crane", "value": 120}])"),
       "/claims/values/0/quantity", "input.conflicting_fields", "claim 1", "'crane' is an envelope"},
      {beam_file(kTrolley, "", R"([{"quantity": "moment_max", "x": 2.5, "case": "dead", "value": 120}])"),
       "/claims/values/0/quantity", "input.conflicting_fields", "claim 1", "a moving load or a combination that names one"},
      {beam_file(kTrolley, "", R"([{"quantity": "moment_max", "x": 2.5, "value": 120}])"), "/claims/values/0/case",
       "input.missing_field", "claim 1", "the file has 3 load cases, combinations and moving loads"},
      {beam_file(kTrolley, "", R"([{"quantity": "moment", "node": "A", "case": "trolly", "value": 120}])"),
       "/claims/values/0/case", "input.no_such_item", "claim 1", "did you mean 'trolley'?"},
      {beam_file(kTrolley, "", "", R"("deflection_limit": {"span": "L/600", "load_sets": ["trolly"]})"),
       "/deflection_limit/load_sets/0", "input.no_such_item", "",
       "there is no load case, combination or moving load 'trolly' (did you mean 'trolley'?)"},
  };
  for (const auto& c : cases) {
    const BeamFile f = parse_beam_text(c.text, "crane.json");
    ASSERT_EQ(f.errors.size(), 1u) << c.text << "\n" << all_errors(f);
    const Error& e = f.errors[0];
    EXPECT_EQ(e.pointer, c.pointer) << c.text;
    EXPECT_EQ(e.id, c.id) << c.text << "\n" << e.reason;
    EXPECT_EQ(e.where, c.where) << c.text;
    EXPECT_FALSE(e.reason.empty()) << c.text;
    EXPECT_NE(e.reason.find(c.reason), std::string::npos) << c.text << "\nwant: " << c.reason << "\ngot:  " << e.reason;
  }
}

// Every train error is listed, not only the first, and a combination or a
// claim naming a moving load that was refused adds no second error.
TEST(MovingReader, EveryTrainErrorIsListedAndNothingFollowsFromIt) {
  const BeamFile f = parse_beam_text(
      beam_file(R"([{"name": "crab", "points": [{"P": 0, "offset": 1}, {"P": 0, "offset": 0.5}]}])",
                R"([{"name": "crane", "factors": {"dead": 1.2, "crab": 1.6}}])",
                R"([{"quantity": "moment_max", "x": 2.5, "case": "crab", "value": 120}])"),
      "crane.json");
  ASSERT_EQ(f.errors.size(), 3u) << all_errors(f);
  EXPECT_EQ(f.errors[0].pointer, "/moving_loads/0/points/0/offset");
  EXPECT_EQ(f.errors[1].pointer, "/moving_loads/0/points/1/offset");
  EXPECT_EQ(f.errors[2].pointer, "/moving_loads/0/points");
  for (const auto& e : f.errors) EXPECT_EQ(e.id, "input.bad_train");
  EXPECT_TRUE(f.moving_loads.empty());
}

TEST(MovingReader, PointsPerTrainHaveALimit) {
  auto train = [](std::size_t n) {
    std::string t = R"([{"name": "long train", "points": [)";
    for (std::size_t i = 0; i < n; ++i) t += std::string(i ? ", " : "") + "{\"P\": 10, \"offset\": " + std::to_string(i) + "}";
    return t + "]}]";
  };
  const Limits lim;
  ASSERT_EQ(lim.max_moving_points, 1000u);
  const BeamFile ok = parse_beam_text(beam_file(train(1000)), "train.json");
  ASSERT_TRUE(ok.ok()) << all_errors(ok);
  EXPECT_EQ(ok.moving_loads.at(0).points.size(), 1000u);
  EXPECT_DOUBLE_EQ(ok.moving_loads[0].points[999].offset, 999.0);
  const BeamFile bad = parse_beam_text(beam_file(train(1001)), "train.json");
  ASSERT_EQ(bad.errors.size(), 1u) << all_errors(bad);
  EXPECT_EQ(bad.errors[0].pointer, "/moving_loads/0/points");
  EXPECT_EQ(bad.errors[0].where, "moving load 1");
  EXPECT_EQ(bad.errors[0].id, "input.limit");
  EXPECT_NE(bad.errors[0].reason.find("has 1001 points, more than the limit of 1000 per moving load"), std::string::npos)
      << bad.errors[0].reason;
}

// Moving loads are load sets: they count toward the limit of load sets.
TEST(MovingReader, MovingLoadsCountAsLoadSets) {
  Limits lim;
  lim.max_load_sets = 3;  // dead and live, and one moving load
  const std::string two = R"([{"name": "crab", "points": [{"P": 1, "offset": 0}]}, {"name": "trolley", "points": [{"P": 1, "offset": 0}]}])";
  EXPECT_TRUE(parse_beam_text(beam_file(kTrolley), "crane.json", lim).ok());
  const BeamFile f = parse_beam_text(beam_file(two), "crane.json", lim);
  ASSERT_EQ(f.errors.size(), 1u) << all_errors(f);
  EXPECT_EQ(f.errors[0].pointer, "/moving_loads");
  EXPECT_EQ(f.errors[0].id, "input.limit");
  EXPECT_NE(f.errors[0].reason.find("has 2 load cases, 2 moving loads and 0 combinations, more than the limit of 3 load sets"),
            std::string::npos)
      << f.errors[0].reason;
  // Stations in all: (2 x (10 + 1) + 2 loads) = 24 a load set, times 4 load sets.
  Limits st;
  st.max_stations = 90;
  const BeamFile g = parse_beam_text(beam_file(two), "crane.json", st);
  ASSERT_EQ(g.errors.size(), 1u) << all_errors(g);
  EXPECT_EQ(g.errors[0].id, "input.limit");
  EXPECT_NE(g.errors[0].reason.find("asks for 96 stations in all (24 in each of 4 load sets)"), std::string::npos)
      << g.errors[0].reason;
  EXPECT_TRUE(parse_beam_text(beam_file(kTrolley), "crane.json", st).ok());  // 72 stations
}

// The envelope of a moving load reads 4 values for each piece of the beam
// (spans x stations per span) at every station. The two-span file at 10
// stations per span: 20 pieces, 2 x 11 + 2 x 2 loads = 26 stations, so
// 4 x 20 x 26 = 2080 values; the combination "crane" adds its dead case and
// the settlements' share, 2 x 26 = 52: 2132.
TEST(MovingReader, TheEnvelopeOfAMovingLoadHasItsLimit) {
  const std::string text = beam_file(kTrolley, R"([{"name": "crane", "factors": {"dead": 1.2, "trolley": 1.6}}])");
  Limits lim;
  lim.max_envelope_values = 2132;
  EXPECT_TRUE(parse_beam_text(text, "crane.json", lim).ok());
  lim.max_envelope_values = 2131;
  {
    const BeamFile f = parse_beam_text(text, "crane.json", lim);
    ASSERT_EQ(f.errors.size(), 1u) << all_errors(f);
    EXPECT_EQ(f.errors[0].pointer, "/combinations/0");
    EXPECT_EQ(f.errors[0].where, "combination 1");
    EXPECT_EQ(f.errors[0].id, "input.limit");
    EXPECT_NE(f.errors[0].reason.find("(2132 values), more than the limit of 2131"), std::string::npos) << f.errors[0].reason;
  }
  lim.max_envelope_values = 2079;
  {
    const BeamFile f = parse_beam_text(text, "crane.json", lim);
    ASSERT_EQ(f.errors.size(), 2u) << all_errors(f);
    EXPECT_EQ(f.errors[0].pointer, "/moving_loads/0");
    EXPECT_EQ(f.errors[0].where, "moving load 1");
    EXPECT_EQ(f.errors[0].id, "input.limit");
    EXPECT_NE(f.errors[0].reason.find("reads the moving load 'trolley' at 4 x 20 pieces of the beam (2 spans x 10 stations per span) "
                                      "at about 26 stations each (2080 values), more than the limit of 2079"),
              std::string::npos)
        << f.errors[0].reason;
    EXPECT_NE(f.errors[0].reason.find("use fewer stations per span"), std::string::npos);
    EXPECT_EQ(f.errors[1].pointer, "/combinations/0");
  }
  // With the default limit: 200 spans (no load) at 10 stations per span are
  // within (4 x 2000 x 2200 = 17,600,000); --stations-per-span 12 is refused
  // at the moving load (4 x 2400 x 2600 = 24,960,000).
  std::string spans, sup = "[\"pinned\"";
  for (int i = 0; i < 200; ++i) {
    spans += std::string(i ? "," : "") + "{\"length\": 4, \"EI\": 50000}";
    sup += ", \"roller\"";
  }
  const BeamFile g = parse_beam_text("{\"units\": {\"force\": \"kN\", \"length\": \"m\"}, \"spans\": [" + spans +
                                         "], \"supports\": " + sup + "], \"moving_loads\": " + kTrolley + "}",
                                     "long.json");
  ASSERT_TRUE(g.ok()) << all_errors(g);
  EXPECT_FALSE(station_limit_error(g, 10).has_value());
  const auto e = station_limit_error(g, 12);
  ASSERT_TRUE(e.has_value());
  EXPECT_EQ(e->pointer, "/moving_loads/0");
  EXPECT_EQ(e->id, "input.limit");
  EXPECT_NE(e->reason.find("24960000 values"), std::string::npos) << e->reason;
}

}  // namespace
}  // namespace trivet::input
