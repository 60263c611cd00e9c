// trivet: report writers. They read results and never compute them.
#pragma once

#include <memory>
#include <ostream>
#include <string>
#include <string_view>
#include <vector>

#include "harness/compare/compare.h"
#include "reports/display_units.h"
#include "reports/report.h"
#include "reports/reporter.h"

namespace trivet::reports {

struct Summary {
  std::size_t beams = 0, agree = 0, disagree = 0, unconfirmed = 0, invalid = 0, claims_failed = 0;
  std::size_t limits_failed = 0;  // spans over their deflection limit
  void add(compare::BeamStatus status, std::size_t failed_claims, std::size_t failed_limits = 0);
};
Summary summarize(const std::vector<Report>& beams);

// The full report (CONTRACT section 4) as JSON.
void write_json(std::ostream& out, const std::vector<Report>& beams, const RunInfo& run);
// The same report in two steps, so that a batch can write each beam's part
// as soon as the beam is checked (in parallel) and let the result go:
// json_beam_fragment() appends one element of "beams" to `text`, and
// write_json_fragments() puts the elements, in order, under the summary.
// Same bytes as write_json.
void json_beam_fragment(const Report& beam, std::string& text);
void write_json_fragments(std::ostream& out, const Summary& s, const std::vector<std::string_view>& fragments,
                          const RunInfo& run);
// And for a report written while the run goes on: the text before the
// first element (ending in `"beams": [`), the elements with a comma before
// every one but the first, then json_tail(). `padded` leaves room after
// the summary for counts of up to 20 digits (as spaces, so that the head
// can be written again with the final counts at the same length).
std::string json_head(const Summary& s, const RunInfo& run, bool padded);
const char* json_tail(bool any_beams);

// JUnit XML: a testsuite per beam file, a testcase per load set and check
// (method agreement, each method's equilibrium, each claim).
// `equilibrium_bound`: the largest relative residual that passes.
void write_junit(std::ostream& out, const std::vector<Report>& beams, double equilibrium_bound);
// The same in two steps (see json_beam_fragment): one beam's testsuite with
// its counts, then the document around the suites, in order.
using JunitCounts = Tally;  // tests, failures, errors, seconds
// A JUnit classname for a beam file: its path without ".json", other dots
// as "_" (CI viewers split classnames at dots).
std::string junit_classname(const std::string& path);
// Appends the beam's <testsuite> element to `xml`.
JunitCounts junit_suite(const Report& beam, double equilibrium_bound, std::string& xml);
void write_junit_suites(std::ostream& out, const std::vector<JunitCounts>& counts,
                        const std::vector<std::string_view>& suites);
// The document around the suites, for a report written as the run goes
// on; `padded` as for json_head.
std::string junit_head(const JunitCounts& total, bool padded);
const char* junit_tail();

struct ConsoleOptions {
  bool color = false;
  bool all_rows = false;     // every node and span, however many
  std::size_t max_rows = 40; // otherwise the first and last rows
  ShowUnits show;            // the units values are shown in (--show-units)
};

// One beam as tables for a person.
void write_console(std::ostream& out, const Report& beam, const ConsoleOptions& opt);
// Why a beam is not `agree`, in a few words beside its status: "methods
// disagree in load set live", "1 claim fails", "2 spans over their
// deflection limit", "values of another program fail"; empty for a beam
// that agrees (and for an invalid one: its errors say why).
std::string status_reasons(const Report& beam);
// The closing summary line(s).
void write_console_summary(std::ostream& out, const Summary& s, const ConsoleOptions& opt);

// The check's report formats, siblings of one interface (reporter.h); the
// HTML report's is in html_report.h. Each writes to `output`, which the
// caller opens and, after end(), closes.
using CheckReporter = Reporter<Report, Summary>;
// The tables for a person (or, `errors_only`, just the errors of invalid
// beams, when standard output carries the JSON report), then the summary.
std::unique_ptr<CheckReporter> console_reporter(std::ostream& out, const ConsoleOptions& opt, bool errors_only);
// The JSON report (CONTRACT section 4): the same bytes as write_json, or,
// streamed, with spaces after the summary where its counts were left room.
std::unique_ptr<CheckReporter> json_reporter(const Output& output);
// JUnit XML: the same bytes as write_junit, or, streamed, with spaces in
// the root tag where its counts were left room.
std::unique_ptr<CheckReporter> junit_reporter(const Output& output, double equilibrium_bound);

// Rounds a value for a person: `decimals` after the point, no "-0".
std::string fixed(double v, int decimals);
// Whether a span's largest moment is sagging (hogging): beyond the rounding
// of the load set's largest moment (1e-12 of it). Below that there is none,
// shown "-" (or "none"), never "0.00" at some point; every report asks this.
bool is_sagging(const compare::LoadSet& set, double moment);
bool is_hogging(const compare::LoadSet& set, double moment);
// Decimals that give about 4 significant digits to the largest magnitude.
int decimals_for(double largest);

// A load set's deflection checks in brief: how many spans are over their
// limit, and the decimals that show the largest deflection or allowance
// once multiplied by `factor` (the display unit's, display_units.h).
struct LimitsBrief {
  std::size_t over = 0;
  int decimals = 0;
};
LimitsBrief limits_brief(const compare::LoadSet& set, double factor = 1.0);

}  // namespace trivet::reports
