// The report formats as siblings of one interface (reports/reporter.h): a
// list of reporters driven through begin / render / beam / end (or keep)
// writes the same bytes as the whole-result writers (write_json,
// write_junit, write_selfcheck_json), in every way a command hands them the
// results. A format's bytes are the contract (CONTRACT section 4).
#include <gtest/gtest.h>

#include <memory>
#include <sstream>
#include <string>
#include <thread>
#include <vector>

#include <nlohmann/json.hpp>

#include "reports/reports.h"
#include "reports/selfcheck_report.h"

namespace trivet::reports {
namespace {

std::vector<Report> two_beams() {
  input::BeamFile f = input::parse_beam_text(R"({"title": "two spans", "units": {"force": "kN", "length": "m"},
    "spans": [{"length": 5, "EI": 30000}, {"length": 7, "EI": 30000}], "supports": ["fixed", "roller", "free"],
    "loads": [{"type": "udl", "span": 1, "w": 9.3}, {"type": "point", "span": 2, "P": 4.1, "at": 2.2}],
    "claims": {"values": [{"quantity": "reaction", "node": "A", "value": 1}]}})", "lib/s.json");
  EXPECT_TRUE(f.ok());
  std::vector<Report> beams;
  beams.emplace_back(compare::check(f, {}));
  beams.emplace_back(compare::check(input::parse_beam_text("{}", "lib/bad.json"), {}));
  beams[0].seconds = 0.25;  // JUnit's times: the head carries their sum
  beams[1].seconds = 1.5;
  return beams;
}

// How a command hands the results to its reporters.
enum class Handing { Parts, PartsStreamed, Kept };

// Runs a JSON and a JUnit reporter, as one list, over `beams`; returns
// their documents. Parts are rendered in parallel, one thread a beam, and
// handed over in order, as `trivet check` does.
std::pair<std::string, std::string> run_json_and_junit(const std::vector<Report>& beams, const RunInfo& run,
                                                       Handing how) {
  std::stringstream json, junit;  // seekable, like a report file
  const bool streamed = how == Handing::PartsStreamed;
  std::vector<std::unique_ptr<CheckReporter>> list;
  list.push_back(json_reporter({&json, streamed}));
  list.push_back(junit_reporter({&junit, streamed}, run.agreement));
  for (auto& r : list) r->begin(run);
  if (how == Handing::Kept) {
    for (const auto& b : beams)
      for (auto& r : list) r->keep(b);
  } else {
    std::vector<std::vector<Part>> parts(beams.size(), std::vector<Part>(list.size()));
    std::vector<std::thread> workers;
    for (std::size_t i = 0; i < beams.size(); ++i)
      workers.emplace_back([&, i] {
        for (std::size_t k = 0; k < list.size(); ++k) parts[i][k] = list[k]->render(beams[i]);
      });
    for (auto& w : workers) w.join();
    for (std::size_t i = 0; i < beams.size(); ++i)
      for (std::size_t k = 0; k < list.size(); ++k) list[k]->beam(std::move(parts[i][k]));
  }
  const Summary s = summarize(beams);
  for (auto& r : list) EXPECT_EQ(r->end(s), "");
  return {json.str(), junit.str()};
}

// The spaces a streamed head leaves for its counts, taken out: after the
// summary's "}," in JSON, before the root tag's ">" in JUnit.
std::string without_json_room(std::string t) {
  const std::size_t at = t.find('}', t.find("\"summary\": ")) + 2;
  const std::size_t end = t.find_first_not_of(' ', at);
  EXPECT_GT(end, at) << "no room was left after the summary";
  return t.erase(at, end - at);
}
std::string without_junit_room(std::string t) {
  const std::size_t close = t.find('>', t.find("<testsuites "));
  const std::size_t from = t.find_last_not_of(' ', close - 1) + 1;
  EXPECT_LT(from, close) << "no room was left in the root tag";
  return t.erase(from, close - from);
}

class CheckReporters : public ::testing::TestWithParam<Handing> {};

TEST_P(CheckReporters, WriteTheBytesOfTheWholeResultWriters) {
  const std::vector<Report> beams = two_beams();
  const RunInfo run{"9.9.9", {"stiffness", "three-moment"}, 1e-6};
  std::ostringstream whole_json, whole_junit;
  write_json(whole_json, beams, run);
  write_junit(whole_junit, beams, run.agreement);
  ASSERT_NE(whole_json.str().find("lib/bad.json"), std::string::npos);
  ASSERT_NE(whole_junit.str().find("time=\"1.750\""), std::string::npos);  // 0.25 + 1.5

  auto [json, junit] = run_json_and_junit(beams, run, GetParam());
  if (GetParam() == Handing::PartsStreamed) {
    // The head was written first with room for 20-digit counts, then again
    // in place with the counts: the same length, so the spaces stay.
    EXPECT_GT(json.size(), whole_json.str().size());
    json = without_json_room(json);
    junit = without_junit_room(junit);
  }
  EXPECT_EQ(json, whole_json.str());
  EXPECT_EQ(junit, whole_junit.str());
}

TEST_P(CheckReporters, NoBeamsIsTheEmptyReport) {
  const RunInfo run{"9.9.9", {}, 1e-6};
  std::ostringstream whole_json, whole_junit;
  write_json(whole_json, {}, run);
  write_junit(whole_junit, {}, run.agreement);
  auto [json, junit] = run_json_and_junit({}, run, GetParam());
  if (GetParam() == Handing::PartsStreamed) {
    json = without_json_room(json);
    junit = without_junit_room(junit);
  }
  EXPECT_EQ(json, whole_json.str());
  EXPECT_EQ(junit, whole_junit.str());
}

INSTANTIATE_TEST_SUITE_P(Handing, CheckReporters,
                         ::testing::Values(Handing::Parts, Handing::PartsStreamed, Handing::Kept),
                         [](const ::testing::TestParamInfo<Handing>& p) {
                           return p.param == Handing::Parts           ? std::string("Parts")
                                  : p.param == Handing::PartsStreamed ? std::string("PartsStreamed")
                                                                      : std::string("Kept");
                         });

// The order of the beams is the order they are handed over in, not the
// order they were rendered in.
TEST(CheckReporterOrder, PartsAreWrittenInTheOrderTheyAreHandedOver) {
  std::vector<Report> beams = two_beams();
  const RunInfo run{"9.9.9", {}, 1e-6};
  std::stringstream json;
  auto rep = json_reporter({&json, false});
  rep->begin(run);
  Part second = rep->render(beams[1]);
  Part first = rep->render(beams[0]);
  rep->beam(std::move(first));
  rep->beam(std::move(second));
  rep->end(summarize(beams));
  std::ostringstream whole;
  write_json(whole, beams, run);
  EXPECT_EQ(json.str(), whole.str());
}

// The console's sibling: its tables, then the summary, the same text as
// write_console and write_console_summary; with the JSON report on standard
// output, only the errors of the invalid beam.
TEST(ConsoleReporter, TablesThenTheSummary) {
  const std::vector<Report> beams = two_beams();
  ConsoleOptions opt;
  std::ostringstream expected;
  for (const auto& b : beams) write_console(expected, b, opt);
  write_console_summary(expected, summarize(beams), opt);
  std::ostringstream out, errors;
  auto tables = console_reporter(out, opt, false);
  auto errors_only = console_reporter(errors, opt, true);
  for (auto* r : {tables.get(), errors_only.get()}) {
    r->begin({});
    r->beam(r->render(beams[0]));
    r->keep(beams[1]);
    r->end(summarize(beams));
  }
  EXPECT_EQ(out.str(), expected.str());
  EXPECT_EQ(errors.str().rfind("error: lib/bad.json", 0), 0u) << errors.str();
  EXPECT_EQ(errors.str().find("two spans"), std::string::npos);
}

references::SelfcheckResult two_cases() {
  references::SelfcheckResult r;
  references::CaseResult a;
  a.file = "cases/a.json";
  a.id = "a";
  a.title = "propped cantilever \"quoted\"";
  a.citation = "a book, p. 1";
  a.verdict = compare::Verdict::Agree;
  a.holds = true;
  a.methods_skipped = {{"three-moment", "a reason"}};
  for (int k = 0; k < 2; ++k) {
    references::ValueResult v;
    v.quantity = "moment";
    v.where = k ? "node B" : "x = 3 m";
    v.published = "-0.125";
    v.multiplier = "w*L^2";
    v.expected = -0.125 * (k + 1);
    v.tolerance = 5e-4;
    v.holds = true;
    references::MethodValue m;
    m.method = "stiffness";
    m.status = MethodStatus::Ok;
    m.evaluated = true;
    m.computed = v.expected + 1e-9;
    m.holds = true;
    v.methods = {m};
    a.values.push_back(v);
  }
  references::CaseResult b;
  b.file = "cases/b.json";
  b.id = "b";
  b.errors.push_back({"/spans", "", "must not be empty", "input.other"});
  b.verdict_problem = "the file could not be used";
  r.cases = {a, b};
  return r;
}

// The selfcheck's JSON reporter moves each case's own dump two levels in;
// the whole record is one dump. Byte for byte the same.
TEST(SelfcheckReporters, JsonIsTheWholeRecordsBytes) {
  for (const auto& r : {two_cases(), references::SelfcheckResult{}}) {
    std::ostringstream whole, out;
    write_selfcheck_json(whole, r, "9.9.9");
    auto rep = selfcheck_json_reporter(out);
    rep->begin({"9.9.9", {}, 1e-6});
    SelfcheckSummary s;
    for (const auto& c : r.cases) {
      rep->beam(rep->render(c));
      s.add(c);
    }
    EXPECT_EQ(rep->end(s), "");
    EXPECT_EQ(out.str(), whole.str());
    EXPECT_EQ(nlohmann::json::parse(out.str())["cases"].size(), r.cases.size());
  }
}

TEST(SelfcheckReporters, JunitCountsEveryCaseAndValue) {
  const references::SelfcheckResult r = two_cases();
  std::ostringstream out;
  auto rep = selfcheck_junit_reporter(out);
  rep->begin({});
  SelfcheckSummary s;
  for (const auto& c : r.cases) {
    rep->keep(c);
    s.add(c);
  }
  rep->end(s);
  // Case a: itself and 2 values, all holding; case b: itself, failing.
  EXPECT_NE(out.str().find("<testsuites name=\"trivet selfcheck\" tests=\"4\" failures=\"1\" errors=\"0\">"),
            std::string::npos)
      << out.str();
  EXPECT_NE(out.str().find("<failure message=\"the file could not be used\"/>"), std::string::npos);
}

}  // namespace
}  // namespace trivet::reports
