// The beam file reader: every validation rule, one named test each, with
// the exact message a user sees.
#include <gtest/gtest.h>

#include "harness/input/reader.h"

namespace trivet::input {
namespace {

// A valid two-span beam; tests change one thing in it.
const char* kGood = R"({
  "title": "test",
  "units": {"force": "kN", "length": "m"},
  "spans": [{"length": 5.0, "EI": 52000}, {"length": 6.5, "EI": 52000}],
  "supports": ["pinned", "roller", "roller"],
  "loads": [{"type": "udl", "span": 1, "w": 8.0}]
})";

std::vector<std::string> messages(const std::string& text) {
  BeamFile f = parse_beam_text(text, "plant.json");
  std::vector<std::string> out;
  for (const auto& e : f.errors) out.push_back(e.format("plant.json"));
  return out;
}

std::string only(const std::string& text) {
  auto m = messages(text);
  EXPECT_EQ(m.size(), 1u) << ::testing::PrintToString(m);
  return m.empty() ? "" : m.front();
}

std::string with(const std::string& from, const std::string& to) {
  std::string s = kGood;
  auto p = s.find(from);
  EXPECT_NE(p, std::string::npos) << from;
  if (p != std::string::npos) s.replace(p, from.size(), to);
  return s;
}

TEST(Reader, GoodFileHasNoErrors) {
  BeamFile f = parse_beam_text(kGood, "plant.json");
  ASSERT_TRUE(f.ok()) << f.errors.front().format("plant.json");
  ASSERT_EQ(f.beam.spans.size(), 2u);
  EXPECT_DOUBLE_EQ(f.beam.spans[1].length, 6.5);
  EXPECT_EQ(f.beam.labels[2], "C");
  EXPECT_EQ(f.cases, std::vector<std::string>{"loads"});
}

TEST(Reader, SettlementNamingItsCase) {
  BeamFile f = parse_beam_text(with("\"roller\", \"roller\"]", "{\"type\": \"roller\", \"settlement\": {\"value\": \"12 mm\", \"case\": \"imposed\"}}, \"roller\"]"), "plant.json");
  ASSERT_TRUE(f.ok()) << f.errors.front().format("plant.json");
  EXPECT_NEAR(f.beam.supports[1].settlement, 0.012, 1e-15);
  EXPECT_EQ(f.beam.supports[1].settlement_case, "imposed");
  // The settlement makes its case, though no load names it.
  EXPECT_EQ(f.cases, (std::vector<std::string>{"loads", "imposed"}));
}

TEST(Reader, SettlementObjectNeedsItsValueAndAName) {
  EXPECT_EQ(only(with("\"roller\", \"roller\"]", "{\"type\": \"roller\", \"settlement\": {\"case\": \"imposed\"}}, \"roller\"]")),
            "plant.json: /supports/1/settlement/value (node 2): required field is missing");
  EXPECT_EQ(only(with("\"roller\", \"roller\"]", "{\"type\": \"roller\", \"settlement\": {\"value\": 0.01, \"case\": 3}}, \"roller\"]")),
            "plant.json: /supports/1/settlement/case (node 2): must be a non-empty name of a load case, without control characters (got 3)");
}

// An envelope reads every share at every station; its work is counted and
// refused beyond the limit before anything is allocated for it.
TEST(Reader, EnvelopeBeyondItsLimitIsRefusedWhereItIsNamed) {
  auto text = [](int spans, int per_span) {
    std::string t = "{\"units\": {\"force\": \"kN\", \"length\": \"m\"}, \"stations_per_span\": " +
                    std::to_string(per_span) + ", \"spans\": [";
    std::string sup = "[\"pinned\"", loads;
    for (int i = 0; i < spans; ++i) {
      t += std::string(i ? "," : "") + "{\"length\": 4, \"EI\": 50000}";
      sup += ", \"roller\"";
      loads += std::string(i ? "," : "") + "{\"type\": \"udl\", \"span\": " + std::to_string(i + 1) +
               ", \"w\": 5, \"case\": \"live\"}";
    }
    return t + "], \"supports\": " + sup + "], \"loads\": [" + loads +
           "], \"combinations\": [{\"name\": \"pattern\", \"factors\": {\"live\": 1.5}, \"pattern\": [\"live\"]}]}";
  };
  // 1,000 spans at 4 stations per span: 1,002 shares x 6,000 stations, within.
  EXPECT_TRUE(parse_beam_text(text(1000, 4), "plant.json").ok());
  // 2,000 spans at 10: 2,002 shares x 26,000 stations, beyond.
  const BeamFile f = parse_beam_text(text(2000, 10), "plant.json");
  ASSERT_EQ(f.errors.size(), 1u);
  EXPECT_EQ(f.errors.front().pointer, "/combinations/0");
  EXPECT_NE(f.errors.front().reason.find("more than the limit of 20000000"), std::string::npos) << f.errors.front().reason;
  // The same beam at 1 station per span is within (2,002 x 8,000), and
  // --stations-per-span 10 on it is refused by the same count.
  const BeamFile g = parse_beam_text(text(2000, 1), "plant.json");
  ASSERT_TRUE(g.ok()) << g.errors.front().format("plant.json");
  const auto e = station_limit_error(g, 10);
  ASSERT_TRUE(e.has_value());
  EXPECT_EQ(e->pointer, "/combinations/0");
}

// A distributed load shorter than 1e-12 of its span is refused with what to
// write instead (a linear load from 2 to 2.0000000000000004 m on a 5 m span
// gave a three-moment reaction of -8 kN by cancellation; from 0 to 5e-324
// broke two methods).
TEST(Reader, DistributedLoadShorterThanRoundingIsRefused) {
  EXPECT_EQ(only(with("{\"type\": \"udl\", \"span\": 1, \"w\": 8.0}",
                      "{\"type\": \"linear\", \"span\": 1, \"w1\": 1, \"w2\": 2, \"from\": 2, \"to\": 2.0000000000000004}")),
            "plant.json: /loads/0/to (load 1): the load is 4.440892098500626e-16 m long, below 1e-12 of its span (5): "
            "give it as a point load of its resultant, or give it a length");
  EXPECT_EQ(messages(with("{\"type\": \"udl\", \"span\": 1, \"w\": 8.0}",
                          "{\"type\": \"udl\", \"span\": 1, \"w\": 1, \"from\": 0, \"to\": 5e-324}")).size(), 1u);
  // A short but real load (1e-9 of the span) is kept.
  EXPECT_TRUE(parse_beam_text(with("{\"type\": \"udl\", \"span\": 1, \"w\": 8.0}",
                                   "{\"type\": \"udl\", \"span\": 1, \"w\": 1, \"from\": 2, \"to\": 2.000000005}"), "plant.json").ok());
}

// Names that would paint over a terminal are refused where they are given.
TEST(Reader, NamesWithControlCharactersAreRefused) {
  EXPECT_EQ(only(with("\"w\": 8.0}", "\"w\": 8.0, \"case\": \"dead\\u001b[2J\"}")),
            "plant.json: /loads/0/case (load 1): a case name must not contain control characters (got \"dead\\u001B[2J\")");
  const BeamFile f = parse_beam_text(with("\"roller\", \"roller\"]", "\"roller\", \"roller\"], \"labels\": [\"A\", \"B\\r\", \"C\"]"), "plant.json");
  ASSERT_EQ(f.errors.size(), 1u);
  EXPECT_EQ(f.errors[0].pointer, "/labels/1");
  // A title may hold them; the console shows them escaped.
  EXPECT_EQ(printable_text("line\u001b[31m\nnext"), "line\\u001B[31m\\nnext");
}

TEST(Reader, NegativeLength) {
  EXPECT_EQ(only(with("\"length\": 6.5", "\"length\": -6.5")),
            "plant.json: /spans/1/length (span 2): must be greater than 0 (got -6.5)");
}

TEST(Reader, ZeroStiffness) {
  EXPECT_EQ(only(with("\"length\": 6.5, \"EI\": 52000", "\"length\": 6.5, \"EI\": 0")),
            "plant.json: /spans/1/EI (span 2): must be greater than 0 (got 0)");
}

TEST(Reader, MissingStiffness) {
  EXPECT_EQ(only(with("\"length\": 6.5, \"EI\": 52000", "\"length\": 6.5")),
            "plant.json: /spans/1/EI (span 2): required field is missing (give EI, or both E and I)");
}

TEST(Reader, EAndIWithUnits) {
  BeamFile f = parse_beam_text(with("\"length\": 6.5, \"EI\": 52000", "\"length\": 6.5, \"E\": \"200 GPa\", \"I\": \"2.1e8 mm^4\""), "p");
  ASSERT_TRUE(f.ok());
  // 200e9 N/m^2 * 2.1e8e-12 m^4 = 4.2e7 N*m^2 = 42000 kN*m^2.
  EXPECT_NEAR(f.beam.spans[1].EI, 42000.0, 1e-9);
}

TEST(Reader, BothEIAndE) {
  EXPECT_EQ(only(with("\"length\": 6.5, \"EI\": 52000", "\"length\": 6.5, \"EI\": 52000, \"E\": 200e6")),
            "plant.json: /spans/1 (span 2): give either EI or both E and I, not both");
}

TEST(Reader, MisspeltKeySuggestsTheRightOne) {
  EXPECT_EQ(only(with("\"length\": 6.5", "\"lenght\": 6.5")),
            "plant.json: /spans/1/lenght (span 2): unknown field 'lenght' (did you mean 'length'?)");
}

TEST(Reader, MisspeltTopLevelKey) {
  auto m = messages(with("\"loads\"", "\"lods\""));
  ASSERT_FALSE(m.empty());
  EXPECT_EQ(m.front(), "plant.json: /lods: unknown field 'lods' (did you mean 'loads'?)");
}

TEST(Reader, WrongType) {
  EXPECT_EQ(only(with("\"length\": 6.5", "\"length\": true")),
            "plant.json: /spans/1/length (span 2): must be a number (m), or a string with its unit (got true)");
}

TEST(Reader, SupportsCount) {
  EXPECT_EQ(only(with("[\"pinned\", \"roller\", \"roller\"]", "[\"pinned\", \"roller\"]")),
            "plant.json: /supports: must have one entry per node: 3 for 2 spans (got 2)");
}

TEST(Reader, UnknownSupportType) {
  EXPECT_EQ(only(with("\"roller\", \"roller\"]", "\"roller\", \"rollr\"]")),
            "plant.json: /supports/2 (node 3): unknown support type 'rollr' (did you mean 'roller'?)");
}

TEST(Reader, SpringNeedsStiffness) {
  EXPECT_EQ(only(with("\"roller\", \"roller\"]", "\"roller\", {\"type\": \"spring\"}]")),
            "plant.json: /supports/2/k (node 3): required field is missing");
}

TEST(Reader, StiffnessOnlyOnSprings) {
  EXPECT_EQ(only(with("\"roller\", \"roller\"]", "\"roller\", {\"type\": \"roller\", \"k\": 5}]")),
            "plant.json: /supports/2/k (node 3): only a spring support takes a stiffness 'k' (this support is roller)");
}

TEST(Reader, HingeAtAnEnd) {
  EXPECT_EQ(only(with("\"roller\", \"roller\"]", "\"roller\", {\"type\": \"roller\", \"hinge\": true}]")),
            "plant.json: /supports/2/hinge (node 3): a hinge releases the moment between two spans, so it can only be at an interior node");
}

TEST(Reader, SettlementOnAFreeNode) {
  EXPECT_EQ(only(with("[\"pinned\", \"roller\", \"roller\"]", "[\"fixed\", \"roller\", {\"type\": \"free\", \"settlement\": 0.01}]")),
            "plant.json: /supports/2/settlement (node 3): a settlement needs a support that holds the node up; a free node is free to deflect");
}

TEST(Reader, LoadOutsideItsSpan) {
  EXPECT_EQ(only(with("{\"type\": \"udl\", \"span\": 1, \"w\": 8.0}", "{\"type\": \"point\", \"span\": 1, \"P\": 8.0, \"at\": 6}")),
            "plant.json: /loads/0/at (load 1): must be within the span, 0 to 5 m (got 6)");
}

TEST(Reader, LoadOnANonexistentSpan) {
  EXPECT_EQ(only(with("\"span\": 1, \"w\": 8.0", "\"span\": 3, \"w\": 8.0")),
            "plant.json: /loads/0/span (load 1): there is no span 3: the beam has 2 spans, numbered from 1");
}

TEST(Reader, FromAfterTo) {
  EXPECT_EQ(only(with("\"w\": 8.0}", "\"w\": 8.0, \"from\": 4, \"to\": 2}")),
            "plant.json: /loads/0/from (load 1): 'from' (4) must be less than 'to' (2)");
}

TEST(Reader, UnknownLoadType) {
  EXPECT_EQ(only(with("\"type\": \"udl\"", "\"type\": \"uld\"")),
            "plant.json: /loads/0/type (load 1): unknown load type 'uld' (did you mean 'udl'?)");
}

TEST(Reader, UdlAtANode) {
  EXPECT_EQ(only(with("\"span\": 1, \"w\": 8.0", "\"node\": 1, \"w\": 8.0")),
            "plant.json: /loads/0/node (load 1): a udl load acts along a span: give 'span' instead of 'node'");
}

TEST(Reader, UnknownForceUnit) {
  EXPECT_EQ(only(with("\"force\": \"kN\"", "\"force\": \"kn\"")),
            "plant.json: /units/force: unknown force unit 'kn' (did you mean 'kN'?)");
}

TEST(Reader, UnitsMissing) {
  EXPECT_EQ(only(with("\"units\": {\"force\": \"kN\", \"length\": \"m\"},", "")),
            "plant.json: /units: required field is missing (for example {\"force\": \"kN\", \"length\": \"m\"})");
}

TEST(Reader, QuantityWithTheWrongDimension) {
  EXPECT_EQ(only(with("\"w\": 8.0", "\"w\": \"8 kN\"")),
            "plant.json: /loads/0/w (load 1): the unit of \"8 kN\" is force, but this field is force/length (for example kN/m)");
}

TEST(Reader, QuantityWithAUnitIsConverted) {
  BeamFile f = parse_beam_text(with("\"w\": 8.0", "\"w\": \"1.5 kip/ft\""), "p");
  ASSERT_TRUE(f.ok());
  // 1.5 kip/ft = 1500 * 4.4482216152605 N / 0.3048 m = 21.891 kN/m.
  EXPECT_NEAR(f.beam.loads[0].w1, 1.5 * 4.4482216152605 / 0.3048, 1e-12);
}

TEST(Reader, NaNSpelledAsAString) {
  EXPECT_EQ(only(with("\"w\": 8.0", "\"w\": \"NaN\"")),
            "plant.json: /loads/0/w (load 1): must be a finite number (got \"NaN\")");
}

TEST(Reader, NumberThatOverflows) {
  EXPECT_EQ(only(with("\"w\": 8.0", "\"w\": 1e999")),
            "plant.json: /loads/0/w (load 1): must be a finite number (the value is too large)");
}

TEST(Reader, SyntaxErrorHasLineAndColumn) {
  auto m = only("{\n  \"units\": {\"force\": \"kN\" \"length\": \"m\"}\n}");
  EXPECT_EQ(m.rfind("plant.json: /: not valid JSON: line 2, column ", 0), 0u) << m;
}

TEST(Reader, EmptyFile) {
  EXPECT_EQ(only("  \n"), "plant.json: /: the file is empty (a beam file is a JSON object)");
}

TEST(Reader, TopLevelArray) {
  EXPECT_EQ(only("[1, 2]"), "plant.json: /: a beam file must be a JSON object with spans, supports and loads (got an array)");
}

TEST(Reader, DuplicateKey) {
  EXPECT_EQ(only(with("\"length\": 6.5", "\"length\": 6.5, \"length\": 7")),
            "plant.json: /spans/1/length (span 2): this field is given twice (each field may appear once)");
}

// The duplicate-key pass keeps a long object's keys in a hash set; a key
// given twice far down such an object is still found.
TEST(Reader, DuplicateKeyInAnObjectWithManyKeys) {
  std::string factors;
  for (int i = 0; i < 40; ++i) factors += "\"case" + std::to_string(i) + "\": 1, ";
  factors += "\"case3\": 2";
  std::string text = R"({"units": {"force": "kN", "length": "m"}, "spans": [{"length": 5, "EI": 1000}],
    "supports": ["pinned", "roller"], "loads": [], "combinations": [{"name": "c", "factors": {)" + factors + "}}]}";
  const input::BeamFile f = input::parse_beam_text(text, "plant.json");
  bool found = false;
  for (const auto& e : f.errors)
    found = found || e.format("plant.json") ==
                         "plant.json: /combinations/0/factors/case3 (combination 1): this field is given twice "
                         "(each field may appear once)";
  EXPECT_TRUE(found);
}

TEST(Reader, AllSupportsFreeIsAMechanism) {
  EXPECT_EQ(only(with("[\"pinned\", \"roller\", \"roller\"]", "[\"free\", \"free\", \"free\"]")),
            "plant.json: /supports: the beam is unstable: the whole beam (nodes A to C) can move up and down and turn with nothing to stop it (add a support or remove a hinge)");
}

TEST(Reader, HingeBetweenTwoPinsIsAMechanism) {
  auto m = only(with("[\"pinned\", \"roller\", \"roller\"]", "[\"pinned\", {\"type\": \"free\", \"hinge\": true}, \"roller\"]"));
  EXPECT_EQ(m, "plant.json: /supports: the beam is unstable: the whole beam (nodes A to C) can fold at its hinges with nothing to stop it (add a support or remove a hinge)");
}

TEST(Reader, EveryErrorIsListed) {
  auto m = messages(with("\"length\": 5.0, \"EI\": 52000}, {\"length\": 6.5, \"EI\": 52000",
                         "\"length\": -5.0, \"EI\": 52000}, {\"length\": 6.5, \"EI\": -1"));
  ASSERT_EQ(m.size(), 2u);
  EXPECT_EQ(m[0], "plant.json: /spans/0/length (span 1): must be greater than 0 (got -5)");
  EXPECT_EQ(m[1], "plant.json: /spans/1/EI (span 2): must be greater than 0 (got -1)");
}

TEST(Reader, ClaimOnANonexistentNode) {
  EXPECT_EQ(only(with("\"loads\"", "\"claims\": {\"values\": [{\"quantity\": \"reaction\", \"node\": \"Q\", \"value\": 1}]}, \"loads\"")),
            "plant.json: /claims/values/0/node (claim 1): there is no node 'Q'");
}

TEST(Reader, ClaimToleranceForms) {
  BeamFile f = parse_beam_text(with("\"loads\"", "\"claims\": {\"tolerance\": \"2%\", \"values\": [{\"quantity\": \"reaction\", \"node\": \"A\", \"value\": 1, \"tolerance\": 0.05}]}, \"loads\""), "p");
  ASSERT_TRUE(f.ok()) << f.errors.front().format("p");
  EXPECT_TRUE(f.claim_tolerance.relative);
  EXPECT_NEAR(f.claim_tolerance.value, 0.02, 1e-15);
  ASSERT_TRUE(f.claims[0].tolerance);
  EXPECT_FALSE(f.claims[0].tolerance->relative);
  EXPECT_NEAR(f.claims[0].tolerance->value, 0.05, 1e-15);
}

TEST(Reader, PointLoadAtASpanEndMovesToTheNode) {
  BeamFile f = parse_beam_text(with("{\"type\": \"udl\", \"span\": 1, \"w\": 8.0}", "{\"type\": \"point\", \"span\": 1, \"P\": 8.0, \"at\": 5.0}"), "p");
  ASSERT_TRUE(f.ok());
  EXPECT_TRUE(f.beam.loads[0].on_node);
  EXPECT_EQ(f.beam.loads[0].index, 1u);
}

TEST(Reader, CoupleAtAHinge) {
  const char* text = R"({
    "units": {"force": "kN", "length": "m"},
    "spans": [{"length": 5.0, "EI": 52000}, {"length": 6.5, "EI": 52000}],
    "supports": ["fixed", {"type": "roller", "hinge": true}, "roller"],
    "loads": [{"type": "couple", "node": 2, "C": 3}]
  })";
  EXPECT_EQ(only(text), "plant.json: /loads/0 (load 1): a couple cannot act at the hinge at node B (the hinge carries no moment)");
}

TEST(Reader, DefaultLabels) {
  EXPECT_EQ(default_label(0), "A");
  EXPECT_EQ(default_label(25), "Z");
  EXPECT_EQ(default_label(26), "AA");
  EXPECT_EQ(default_label(27), "AB");
}

TEST(Reader, TooManyStations) {
  EXPECT_EQ(only(with("\"loads\"", "\"stations_per_span\": 5000, \"loads\"")),
            "plant.json: /stations_per_span: must be from 1 to 1000 (got 5000)");
}

}  // namespace
}  // namespace trivet::input

namespace trivet::input {
namespace {

// Each kind of error has a stable id; scripts and these tests match the id
// and the JSON Pointer, never the wording.
TEST(ReaderErrorIds, EachKindOfErrorHasItsId) {
  struct Case {
    std::string from, to;  // the change to the good file
    std::string pointer, id;
  };
  const std::vector<Case> cases = {
      {"\"title\": \"test\",", "\"title\": \"test\", \"colour\": 1,", "/colour", "input.unknown_field"},
      {"{\"length\": 5.0, \"EI\": 52000}", "{\"EI\": 52000}", "/spans/0/length", "input.missing_field"},
      {"{\"length\": 5.0,", "{\"length\": -5.0,", "/spans/0/length", "input.out_of_range"},
      {"{\"length\": 5.0,", "{\"length\": \"five\",", "/spans/0/length", "input.bad_quantity"},
      {"{\"length\": 5.0,", "{\"length\": true,", "/spans/0/length", "input.wrong_type"},
      {"\"length\": \"m\"}", "\"length\": \"furlong\"}", "/units/length", "input.unknown_unit"},
      {"[\"pinned\", \"roller\", \"roller\"]", "[\"pinned\", \"roller\"]", "/supports", "input.wrong_count"},
      {"[\"pinned\", \"roller\", \"roller\"]", "[\"pinned\", \"roler\", \"roller\"]", "/supports/1", "input.unknown_name"},
      {"\"span\": 1,", "\"span\": 7,", "/loads/0/span", "input.no_such_item"},
      {"\"span\": 1,", "\"span\": 1, \"node\": 1,", "/loads/0", "input.conflicting_fields"},
      {"[\"pinned\", \"roller\", \"roller\"]", "[\"pinned\", \"free\", \"free\"]", "/supports", "input.mechanism"},
      {"\"title\": \"test\",", "\"title\": \"test\", \"title\": \"again\",", "/title", "input.duplicate"},
      {"\"w\": 8.0}", "\"w\": 8.0", "", "input.syntax"},
  };
  for (const auto& c : cases) {
    const BeamFile f = parse_beam_text(with(c.from, c.to), "plant.json");
    ASSERT_FALSE(f.errors.empty()) << c.to;
    bool found = false;
    for (const auto& e : f.errors)
      if (e.id == c.id && e.pointer.rfind(c.pointer, 0) == 0) found = true;
    std::string got;
    for (const auto& e : f.errors) got += e.id + " at " + e.pointer + "; ";
    EXPECT_TRUE(found) << c.to << ": want " << c.id << " at " << c.pointer << ", got " << got;
  }
}

TEST(ReaderErrorIds, EveryErrorOfTheCorpusHasAnId) {
  // No error leaves the reader without an id of its own ("input.other" is
  // the default of an Error made elsewhere).
  for (const char* bad : {"", "[]", "{\"spans\": 1}", "{\"units\": {}, \"spans\": [], \"supports\": [], \"loads\": []}"}) {
    const BeamFile f = parse_beam_text(bad, "plant.json");
    ASSERT_FALSE(f.errors.empty()) << bad;
    for (const auto& e : f.errors) {
      EXPECT_EQ(e.id.rfind("input.", 0), 0u) << bad << ": " << e.reason;
      EXPECT_NE(e.id, "input.other") << bad << ": " << e.reason;
    }
  }
}

}  // namespace
}  // namespace trivet::input
