// `trivet selfcheck`: the cited reference cases.
#include <algorithm>
#include <atomic>
#include <condition_variable>
#include <csignal>
#include <cstdint>
#include <fstream>
#include <iterator>
#include <cstdio>
#include <cstdlib>
#include <iostream>
#include <memory>
#include <mutex>
#include <sstream>
#include <string>
#include <thread>
#include <utility>
#include <vector>

#include <unistd.h>


#include "harness/cli/files.h"
#include "harness/cli/memory.h"
#include "harness/cli/reporting.h"
#include "harness/compare/against.h"
#include "harness/compare/compare.h"
#include "harness/input/reader.h"
#include "harness/precision/exact_reader.h"
#include "harness/precision/precision.h"
#include "harness/input/schema.h"
#include "references/selfcheck.h"
#include "reports/html_report.h"
#include "reports/plot.h"
#include "reports/reports.h"
#include "reports/selfcheck_report.h"

#include "harness/cli/commands.h"
#include "methods/registry/registry.h"

namespace trivet::cli {

// `trivet selfcheck`: every cited case on every method, a table, and exit 0
// only when every published value holds on every applicable method.
int run_selfcheck(const SelfcheckArgs& a) {
  compare::Options opt;
  if (!a.methods.empty()) {
    opt.methods = split_list(a.methods);
    for (const auto& m : opt.methods)
      if (!compare::find_method(m)) {
        fail("trivet: --methods: unknown method '", m, "' (one of ", registry::names(), ")");
      }
  }
  // In extended or exact arithmetic, each case's methods' values at the nodes
  // and stations are replaced by the high-precision ones before the published
  // values are compared (values between stations are still from double).
  references::AfterCheck after = nullptr;
  std::vector<std::pair<std::string, std::string>> rounding;  // case id, text
  std::mutex rounding_mutex;
  if (a.arithmetic != "double" || !a.reference.empty()) {
    after = [&](compare::BeamResult& br, const references::ReferenceCase& ref) {
      std::vector<std::shared_ptr<const precision::LoadSetNumbers>> numbers;
      apply_precision_text(br, numbers, ref.beam_text, ref.beam, a.arithmetic, a.reference, opt);
      std::string line;
      for (const auto& pn : numbers)
        for (const auto& m : pn->methods)
          if (m.rounding && m.rounding->measured) {
            char buf[64];
            std::snprintf(buf, sizeof buf, " %s %.1f", m.name.c_str(), m.rounding->worst_digits);
            line += buf;
          }
      std::lock_guard<std::mutex> lock(rounding_mutex);
      rounding.push_back({ref.id, line});
    };
  }
  const references::SelfcheckResult r =
      references::run_selfcheck(a.dir.empty() ? references::directory() : a.dir, opt, after);
  if (const std::string why = report_targets_problem({{"--json", a.json}, {"--junit", a.junit}, {"--html", a.html}});
      !why.empty())
    fail("trivet: ", why);
  // The formats, in the order they finish (and name their problems): the
  // tables (only the counts, on standard error, when the JSON record is on
  // standard output), JSON, HTML, JUnit.
  const bool to_stdout = a.json == "-";
  reports::SelfcheckConsoleOptions copt;
  copt.color = !to_stdout && use_color(1);
  copt.cases = !to_stdout;
  copt.arithmetic = a.arithmetic != "double" ? a.arithmetic : "double, reference " + a.reference;
  copt.rounding = std::move(rounding);
  Reporting<reports::SelfcheckReporter> reporting(reports::selfcheck_console_reporter(to_stdout ? std::cerr : std::cout, copt));
  reporting.add("--json", a.json, [](ReportFile& f) { return reports::selfcheck_json_reporter(f.out()); });
  reporting.add("--html", a.html, [&](ReportFile& f) {
    reports::HtmlOptions ho;
    ho.title = "trivet verification record (selfcheck)";
    ho.tool_version = TRIVET_VERSION;
    ho.command_line = a.command_line;
    ho.plots = false;
    return reports::selfcheck_html_reporter(f.out(), ho);
  });
  reporting.add("--junit", a.junit, [](ReportFile& f) { return reports::selfcheck_junit_reporter(f.out()); });

  const reports::RunInfo run{TRIVET_VERSION, opt.methods, opt.agreement};
  for (auto& rep : reporting.list()) rep->begin(run);
  reports::SelfcheckSummary s;
  for (const auto& c : r.cases) {
    for (auto& rep : reporting.list()) rep->keep(c);
    s.add(c);
  }
  int code = r.holds() ? kExitAgree : kExitDisagree;
  if (!reporting.finish(s)) code = kExitInvalid;
  return code;
}


}  // namespace trivet::cli
