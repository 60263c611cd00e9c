// Report writers: the JSON report has the contract's shape and its numbers
// read back to the same doubles; the console report shows units and the
// caution.
#include <gtest/gtest.h>

#include <sstream>

#include <nlohmann/json.hpp>

#include "reports/reports.h"

namespace trivet::reports {
namespace {

reports::Report sample() {
  input::BeamFile f = input::parse_beam_text(R"({"title": "two spans", "units": {"force": "kN", "length": "m"},
    "spans": [{"length": 5, "EI": 30000}, {"length": 7, "EI": 30000}], "supports": ["fixed", "roller", "free"],
    "loads": [{"type": "udl", "span": 1, "w": 9.3}, {"type": "point", "span": 2, "P": 4.1, "at": 2.2}],
    "claims": {"values": [{"quantity": "reaction", "node": "A", "value": 1}]}})", "s.json");
  EXPECT_TRUE(f.ok());
  return compare::check(f, {});
}

TEST(JsonReport, HasTheContractShape) {
  std::vector<reports::Report> beams = {sample()};
  beams.push_back(compare::check(input::parse_beam_text("{}", "bad.json"), {}));
  std::ostringstream out;
  write_json(out, beams, {"9.9.9", {}, 1e-6});
  auto j = nlohmann::json::parse(out.str());
  EXPECT_EQ(j["tool"]["name"], "trivet");
  EXPECT_EQ(j["tool"]["version"], "9.9.9");
  EXPECT_EQ(j["summary"]["beams"], 2);
  EXPECT_EQ(j["summary"]["invalid"], 1);
  EXPECT_EQ(j["summary"]["claims_failed"], 1);
  EXPECT_TRUE(j["caution"].get<std::string>().find("qualified engineer") != std::string::npos);
  const auto& b = j["beams"][0];
  EXPECT_EQ(b["file"], "s.json");
  EXPECT_EQ(b["units"]["force"], "kN");
  EXPECT_EQ(b["status"], "disagree");  // the claim of 1 kN fails
  const auto& set = b["results"]["loads"];
  EXPECT_EQ(set["verdict"], "agree");
  for (const char* k : {"moment", "shear", "reaction", "deflection"}) EXPECT_TRUE(set["max_difference"][k].is_number()) << k;
  for (const char* m : {"three-moment", "slope-deflection", "stiffness"}) {
    const auto& mj = set["methods"][m];
    EXPECT_EQ(mj["status"], "ok") << m;
    ASSERT_EQ(mj["nodes"].size(), 3u);
    EXPECT_TRUE(mj["nodes"][0]["moment_left"].is_null());
    EXPECT_TRUE(mj["nodes"][2]["moment_right"].is_null());
    for (const char* k : {"label", "x", "moment_right", "reaction_force", "reaction_moment", "deflection", "rotation"})
      EXPECT_TRUE(mj["nodes"][0].contains(k)) << k;
    EXPECT_GT(mj["stations"].size(), 20u);
    double last = -1;
    for (const auto& s : mj["stations"]) {
      EXPECT_GE(s["x"].get<double>(), last);
      last = s["x"].get<double>();
    }
  }
  const auto& c = b["claims"][0];
  EXPECT_EQ(c["quantity"], "reaction");
  EXPECT_EQ(c["node"], "A");
  EXPECT_EQ(c["holds"], false);
  EXPECT_EQ(j["beams"][1]["status"], "invalid");
  EXPECT_FALSE(j["beams"][1]["errors"].empty());
}

TEST(JsonReport, NumbersReadBackToTheSameDouble) {
  std::vector<reports::Report> beams = {sample()};
  std::ostringstream out;
  write_json(out, beams, {"0", {}, 1e-6});
  auto j = nlohmann::json::parse(out.str());
  const auto& stations = j["beams"][0]["results"]["loads"]["methods"]["stiffness"]["stations"];
  const auto& mine = beams[0].sets[0].methods[2].stations;
  ASSERT_EQ(stations.size(), mine.size());
  for (std::size_t i = 0; i < mine.size(); ++i) {
    // Exact equality is the point here: the text must round-trip bit for bit.
    EXPECT_EQ(stations[i]["moment"].get<double>(), mine[i].moment) << i;
    EXPECT_EQ(stations[i]["deflection"].get<double>(), mine[i].deflection) << i;
  }
}

TEST(ConsoleReport, ShowsUnitsTablesAndCaution) {
  std::vector<reports::Report> beams = {sample()};
  std::ostringstream out;
  write_console(out, beams[0], {});
  write_console_summary(out, summarize(beams), {});
  const std::string s = out.str();
  for (const char* want : {"two spans", "M left [kN*m]", "reaction [kN]", "deflection [mm]", "max sagging [kN*m]",
                           "NO", "summary: 1 beam", "caution:", "qualified engineer"})
    EXPECT_NE(s.find(want), std::string::npos) << want << "\n" << s;
  EXPECT_EQ(s.find("\033["), std::string::npos) << "no colour unless asked";
}

// The JUnit file has the usual shape (testsuites / testsuite / testcase) and
// its counts in attributes match the elements it holds.
TEST(JunitReport, CountsMatchTheElements) {
  std::vector<reports::Report> beams = {sample()};
  beams.push_back(compare::check(input::parse_beam_text("{}", "bad.json"), {}));
  std::ostringstream out;
  write_junit(out, beams, 1e-6);
  const std::string x = out.str();
  auto count = [&](const std::string& what) {
    std::size_t n = 0;
    for (std::size_t p = x.find(what); p != std::string::npos; p = x.find(what, p + 1)) ++n;
    return n;
  };
  auto attribute = [&](std::size_t from, const std::string& name) {
    const std::size_t p = x.find(name + "=\"", from);
    return std::stoul(x.substr(p + name.size() + 2));
  };
  EXPECT_EQ(x.rfind("<?xml", 0), 0u);
  ASSERT_EQ(count("<testsuites "), 1u);
  EXPECT_EQ(count("<testsuite "), 2u);
  const std::size_t root = x.find("<testsuites ");
  EXPECT_EQ(attribute(root, "tests"), count("<testcase "));
  EXPECT_EQ(attribute(root, "failures"), count("<failure "));
  EXPECT_EQ(attribute(root, "errors"), count("<error "));
  EXPECT_EQ(count("<failure "), 1u);  // the failing claim of the sample
  EXPECT_EQ(count("<error "), 1u);    // the invalid file
  EXPECT_NE(x.find("claimed 1 kN, computed"), std::string::npos);  // with its unit (the file's)
  EXPECT_EQ(count("</testsuite>"), 2u);
  EXPECT_EQ(count("</testsuites>"), 1u);
}

// A batch writes its reports as it goes: the head with room for the counts,
// the beams' parts, the tail, then the head again with the final counts. The
// head must keep its length whatever the counts, and the document must say
// the same as write_json / write_junit.
TEST(StreamedReports, HeadsKeepTheirLengthAndTheDocumentIsTheSame) {
  std::vector<reports::Report> beams = {sample()};
  beams.push_back(compare::check(input::parse_beam_text("{}", "bad.json"), {}));
  const RunInfo run{"test", {}, 1e-6};
  Summary big;
  big.beams = big.agree = big.claims_failed = 18446744073709551615ull;  // 20 digits, the most a count has
  EXPECT_EQ(json_head({}, run, true).size(), json_head(big, run, true).size());
  EXPECT_EQ(junit_head({}, true).size(), junit_head({18446744073709551615ull, 1, 22}, true).size());

  const Summary s = summarize(beams);
  std::string json = json_head(s, run, true);
  JunitCounts total;
  std::string xml;
  for (std::size_t i = 0; i < beams.size(); ++i) {
    std::string part;
    json_beam_fragment(beams[i], part);
    json += (i ? "," : "") + part;
    const JunitCounts c = junit_suite(beams[i], 1e-6, xml);
    total.tests += c.tests;
    total.failures += c.failures;
    total.errors += c.errors;
  }
  json += json_tail(true);
  xml = junit_head(total, true) + xml + junit_tail();

  std::ostringstream whole_json, whole_xml;
  write_json(whole_json, beams, run);
  write_junit(whole_xml, beams, 1e-6);
  EXPECT_EQ(nlohmann::json::parse(json), nlohmann::json::parse(whole_json.str()));
  // The JUnit document differs only by the spaces inside the root tag.
  std::string unpadded = xml;
  const std::size_t close = unpadded.find('>', unpadded.find("<testsuites "));
  const std::size_t spaces = unpadded.find_last_not_of(' ', close - 1) + 1;
  unpadded.erase(spaces, close - spaces);
  EXPECT_EQ(unpadded, whole_xml.str());
  EXPECT_EQ(json_head({}, run, false) + json_tail(false),
            [&] { std::ostringstream o; write_json(o, {}, run); return o.str(); }());
}

// A long beam: its methods run side by side and its long arrays are
// written in blocks by two threads. The results must be those of each
// method run alone, and the report must hold every station and node once,
// in order, with the values of the results (a general requirement of the
// report, no published source).
TEST(LongBeam, SideBySideMethodsAndBlockWrittenArraysKeepTheResults) {
  std::string text = R"({"units": {"force": "kN", "length": "m"}, "stations_per_span": 4, "spans": [)";
  const std::size_t n = 9000;
  for (std::size_t i = 0; i < n; ++i) text += std::string(i ? "," : "") + R"({"length": )" + std::to_string(3 + i % 5) + R"(, "EI": 40000})";
  text += R"(], "supports": ["pinned")";
  for (std::size_t i = 0; i < n; ++i) text += R"(, "roller")";
  text += R"(], "loads": [)";
  for (std::size_t i = 0; i < n; ++i)
    text += std::string(i ? "," : "") + R"({"type": "udl", "span": )" + std::to_string(i + 1) + R"(, "w": )" + std::to_string(1 + i % 7) + "}";
  text += "]}";
  const input::BeamFile f = input::parse_beam_text(text, "long.json");
  ASSERT_TRUE(f.ok());
  const reports::Report all = compare::check(f, {});
  ASSERT_EQ(all.sets.size(), 1u);
  const compare::LoadSet& set = all.sets.front();
  ASSERT_GE(set.stations.size(), 40000u);  // past both thresholds
  ASSERT_EQ(set.methods.size(), 3u);
  for (const auto& m : set.methods) {
    compare::Options one;
    one.methods = {m.name};
    const reports::Report alone = compare::check(f, one);
    const compare::MethodResult& a = alone.sets.front().methods.front();
    ASSERT_EQ(a.name, m.name);
    ASSERT_EQ(a.stations.size(), m.stations.size());
    ASSERT_EQ(a.nodes.size(), m.nodes.size());
    for (std::size_t i = 0; i < a.stations.size(); ++i) {
      ASSERT_EQ(a.stations[i].moment, m.stations[i].moment) << m.name << " station " << i;
      ASSERT_EQ(a.stations[i].deflection, m.stations[i].deflection) << m.name << " station " << i;
    }
    for (std::size_t i = 0; i < a.nodes.size(); ++i) ASSERT_EQ(a.nodes[i].reaction_force, m.nodes[i].reaction_force);
  }
  std::ostringstream o;
  write_json(o, {all}, RunInfo{"test", {}, 1e-6});
  const nlohmann::json j = nlohmann::json::parse(o.str());
  const auto& methods = j["beams"][0]["results"][set.name]["methods"];
  for (const auto& m : set.methods) {
    const auto& st = methods[m.name]["stations"];
    ASSERT_EQ(st.size(), m.stations.size()) << m.name;
    for (std::size_t i = 0; i < m.stations.size(); ++i) {
      ASSERT_EQ(st[i]["x"].get<double>(), m.stations[i].x) << m.name << " station " << i;
      ASSERT_EQ(st[i]["moment"].get<double>(), m.stations[i].moment) << m.name << " station " << i;
    }
    const auto& nodes = methods[m.name]["nodes"];
    ASSERT_EQ(nodes.size(), m.nodes.size());
    for (std::size_t i = 0; i < m.nodes.size(); ++i) ASSERT_EQ(nodes[i]["reaction_force"].get<double>(), m.nodes[i].reaction_force);
  }
  const auto& ext = j["beams"][0]["results"][set.name]["span_extremes"];
  ASSERT_EQ(ext.size(), n);
  for (std::size_t i = 0; i < n; ++i) ASSERT_EQ(ext[i]["span"].get<std::size_t>(), i + 1);
}

TEST(ConsoleReport, RoundsForAPerson) {
  EXPECT_EQ(fixed(-0.0001, 2), "0.00");
  EXPECT_EQ(fixed(31.6449, 2), "31.64");
  EXPECT_EQ(decimals_for(31.6), 2);
  EXPECT_EQ(decimals_for(0.0041), 6);
}

}  // namespace
// Numbers a person reads are right at any magnitude: 2e70 printed in fixed
// notation used to come out cut to 63 digits (about 1e62).
TEST(Numbers, FixedNotationNeverCutsOrInventsDigits) {
  EXPECT_EQ(fixed(2e70, 1), "2.000000e+70");
  EXPECT_EQ(fixed(-3.5e20, 2), "-3.500000e+20");
  EXPECT_EQ(fixed(123456.789, 2), "123456.79");
  EXPECT_EQ(fixed(-0.0001, 2), "0.00");
  EXPECT_EQ(fixed(1.0 / 0.0, 2), "n/a");
}

}  // namespace trivet::reports

namespace trivet::reports {
namespace {

TEST(Junit, ClassnamesHaveNoDotSuffixForViewersToSplit) {
  EXPECT_EQ(junit_classname("examples/core-wall-beam.json"), "examples/core-wall-beam");
  EXPECT_EQ(junit_classname("lib/v1.2/beam.b.json"), "lib/v1_2/beam_b");
  EXPECT_EQ(junit_classname("plain"), "plain");
}

}  // namespace
}  // namespace trivet::reports

namespace trivet::reports {
namespace {

// A JUnit failure message is read by a person in a CI viewer: numbers to six
// significant digits, not every digit of the double (the JSON keeps those).
TEST(Junit, FailureMessagesShowReadableNumbers) {
  // Three equal spans of 7 m, w = 9.3: values whose doubles have long tails.
  const input::BeamFile f = input::parse_beam_text(R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 7, "EI": 30000}, {"length": 7, "EI": 30000}, {"length": 7, "EI": 30000}],
    "supports": ["pinned", "roller", "roller", "roller"],
    "loads": [{"type": "udl", "span": 1, "w": 9.3}, {"type": "udl", "span": 2, "w": 9.3}, {"type": "udl", "span": 3, "w": 9.3}],
    "claims": {"values": [{"quantity": "reaction", "node": "B", "value": 1.0}]}})", "t.json");
  ASSERT_TRUE(f.ok());
  std::vector<Report> beams{Report(compare::check(f, {}))};
  std::ostringstream x;
  write_junit(x, beams, 1e-6);
  const std::string xml = x.str();
  const auto at = xml.find("computed ");
  ASSERT_NE(at, std::string::npos) << xml;
  const std::string computed = xml.substr(at + 9, xml.find(',', at) - at - 9);
  // R_B = 1.1 w L (three equal spans; AISC Steel Construction Manual, "Beam
  // Diagrams and Formulas", continuous beam of three equal spans, from memory).
  EXPECT_NEAR(std::stod(computed), 1.1 * 9.3 * 7, 1e-3);
  EXPECT_LE(computed.size(), 8u) << computed;
}

}  // namespace
}  // namespace trivet::reports

namespace trivet::reports {
namespace {

// One verdict per beam: the status carries why it is not agree, and the
// methods' own agreement is said as theirs, so "agree" under a heading of
// "disagree" cannot be read as the beam's verdict.
TEST(ConsoleReport, TheBeamsStatusSaysWhyAndTheMethodsLineIsTheirs) {
  const Report b = sample();  // the methods agree; the claim of 1 kN fails
  EXPECT_EQ(status_reasons(b), "1 claim fails");
  std::ostringstream out;
  write_console(out, b, {});
  const std::string text = out.str();
  EXPECT_NE(text.find("[disagree: 1 claim fails]"), std::string::npos) << text;
  EXPECT_NE(text.find("between methods: agree"), std::string::npos) << text;
  EXPECT_EQ(text.find("agreement: agree"), std::string::npos) << text;
  // An agreeing beam says nothing more.
  input::BeamFile f = input::parse_beam_text(R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 5, "EI": 30000}], "supports": ["pinned", "roller"],
    "loads": [{"type": "udl", "span": 1, "w": 9.3}]})", "ok.json");
  const Report ok = compare::check(f, {});
  EXPECT_EQ(status_reasons(ok), "");
  std::ostringstream o2;
  write_console(o2, ok, {});
  EXPECT_NE(o2.str().find("[agree]"), std::string::npos);
}

}  // namespace
}  // namespace trivet::reports
