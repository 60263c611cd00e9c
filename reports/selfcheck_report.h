// Writers of the selfcheck's result (the cited reference cases), beside the
// check's writers in reports.h. They read results and never compute them.
#pragma once

#include <memory>
#include <ostream>
#include <string>
#include <utility>
#include <vector>

#include "references/selfcheck.h"
#include "reports/html_report.h"
#include "reports/reporter.h"

namespace trivet::reports {

// The verification record as JSON: tool, summary, caution and every case
// with its published values and each method's computed value.
void write_selfcheck_json(std::ostream& out, const references::SelfcheckResult& r, const std::string& version);
// JUnit XML: a testsuite per case, a testcase for the case and per value.
void write_selfcheck_junit(std::ostream& out, const references::SelfcheckResult& r);

// The selfcheck's counts, added case by case (the same as SelfcheckResult's).
struct SelfcheckSummary {
  std::size_t cases = 0, cases_failed = 0, values = 0, values_failed = 0;
  void add(const references::CaseResult& c);
};

// The selfcheck's formats, siblings of one interface (reporter.h) like the
// check's: an item is one cited case. The selfcheck is small and run before
// it is reported, so no format streams: each holds its parts and writes at
// end(), the same bytes as the whole-record writers above.
using SelfcheckReporter = Reporter<references::CaseResult, SelfcheckSummary>;

struct SelfcheckConsoleOptions {
  bool color = false;
  bool cases = true;  // each case's lines; false: the summary only (the JSON record is on standard output)
  // With --arithmetic or --reference: how the run was made ("extended",
  // "double, reference exact") and, per case id, the correct digits of the
  // double results as one line (" method digits" ...).
  std::string arithmetic;
  std::vector<std::pair<std::string, std::string>> rounding;
};
std::unique_ptr<SelfcheckReporter> selfcheck_console_reporter(std::ostream& out, const SelfcheckConsoleOptions& opt);
std::unique_ptr<SelfcheckReporter> selfcheck_json_reporter(std::ostream& out);
std::unique_ptr<SelfcheckReporter> selfcheck_junit_reporter(std::ostream& out);
// The HTML page with the verification record as its section: the build
// and the machine, then a table of every published value on every method.
std::unique_ptr<SelfcheckReporter> selfcheck_html_reporter(std::ostream& out, const HtmlOptions& options);

}  // namespace trivet::reports
