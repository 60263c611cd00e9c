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
#include <mutex>
#include <sstream>
#include <thread>

#include <unistd.h>


#include "harness/cli/files.h"
#include "harness/cli/memory.h"
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

namespace {
// A number for a person to read in the record: `digits` significant digits
// (the JSON record keeps every digit).
std::string sig(double v, int digits) {
  char buf[48];
  std::snprintf(buf, sizeof buf, "%.*g", digits, v);
  return buf;
}
}  // namespace


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
  const bool to_stdout = a.json == "-";
  std::ostream& human = to_stdout ? std::cerr : std::cout;
  const bool color = !to_stdout && use_color(1);
  auto paint = [&](const std::string& t, bool good) {
    return color ? std::string(good ? "\033[32m" : "\033[1;31m") + t + "\033[0m" : t;
  };
  if (!to_stdout) {
    for (const auto& c : r.cases) {
      std::cout << c.id << "  [" << paint(c.holds ? "holds" : "FAILS", c.holds) << "]  " << c.title << "\n";
      std::cout << "  source: " << c.citation << "\n";
      for (const auto& [id, line] : rounding)
        if (id == c.id && !line.empty())
          std::cout << "  arithmetic: " << (a.arithmetic != "double" ? a.arithmetic : "double, reference " + a.reference)
                    << "; correct digits of the double results:" << line << "\n";
      for (const auto& e : c.errors) std::cout << "  error: " << e.format(c.file) << "\n";
      for (const auto& [m, why] : c.methods_skipped) std::cout << "  " << m << ": not applicable (" << why << ")\n";
      for (const auto& [m, why] : c.methods_failed) std::cout << "  " << m << ": " << paint("failed", false) << " (" << why << ")\n";
      if (!c.verdict_problem.empty()) std::cout << "  " << c.verdict_problem << "\n";
      auto g = [](double x, int digits) {
        char buf[48];
        std::snprintf(buf, sizeof buf, "%.*g", digits, x);
        return std::string(buf);
      };
      for (const auto& v : c.values) {
        std::string printed = v.published;
        if (!v.multiplier.empty() && v.multiplier != "1")
          printed = printed == "1" ? v.multiplier : printed == "-1" ? "-" + v.multiplier : printed + " " + v.multiplier;
        if (v.magnitude) printed += " (printed without sign; the magnitude is compared)";
        std::cout << "  " << (v.holds ? "  ok " : paint("FAIL ", false)) << v.quantity << " at " << v.where << ": published "
                  << printed << " = " << g(v.expected, 10) << " +- " << g(v.tolerance, 2) << "; computed";
        for (const auto& m : v.methods) {
          if (!m.evaluated) continue;
          std::cout << " " << m.method << " " << g(m.computed, 10) << (m.holds ? "" : " (out)");
        }
        std::cout << "\n";
      }
    }
  }
  human << "selfcheck: " << r.cases.size() << " cited cases, " << r.values_checked() << " published values: "
        << r.cases.size() - r.cases_failed() << " cases hold, " << r.cases_failed() << " fail ("
        << r.values_failed() << " values out of tolerance)\n";
  human << "caution: " << compare::caution_text() << "\n";
  int code = r.holds() ? kExitAgree : kExitDisagree;
  if (!a.json.empty()) {
    const std::string err = write_report_file(a.json, [&](std::ostream& o) { reports::write_selfcheck_json(o, r, TRIVET_VERSION); });
    if (!err.empty()) { std::cerr << "trivet: --json: " << err << "\n"; code = kExitInvalid; }
  }
  if (!a.html.empty()) {
    reports::HtmlOptions ho;
    ho.title = "trivet verification record (selfcheck)";
    ho.tool_version = TRIVET_VERSION;
    ho.command_line = a.command_line;
    ho.plots = false;
    std::ostringstream h;
    char host[256] = "unknown";
    gethostname(host, sizeof host - 1);
    h << "<p>Tool trivet " << TRIVET_VERSION << ", built " << __DATE__ << " with " << __VERSION__ << "; machine "
      << reports::html_escape(host) << " (" << std::thread::hardware_concurrency() << " cores). "
      << r.cases.size() << " cited cases, " << r.values_checked() << " published values; "
      << r.cases.size() - r.cases_failed() << " cases hold, " << r.cases_failed() << " fail.</p>\n";
    h << "<table><tr><th>case</th><th>source</th><th>quantity</th><th>published</th><th>expected</th><th>tolerance</th>"
         "<th>" << registry::names("</th><th>") << "</th><th>holds</th></tr>\n";
    for (const auto& c : r.cases) {
      for (std::size_t i = 0; i < c.values.size(); ++i) {
        const auto& v = c.values[i];
        h << "<tr><td>" << (i == 0 ? reports::html_escape(c.id) : "") << "</td><td>" << (i == 0 ? reports::html_escape(c.citation) : "")
          << "</td><td>" << reports::html_escape(v.quantity + " at " + v.where) << "</td><td>" << reports::html_escape(v.published + " " + v.multiplier + (v.magnitude ? " (printed without sign; magnitude compared)" : ""))
          << "</td><td>" << sig(v.expected, 10) << "</td><td>" << sig(v.tolerance, 2) << "</td>";
        for (const auto& method : registry::all()) {
          const std::string m = method.name;
          std::string cell = "-";
          for (const auto& mv : v.methods)
            if (mv.method == m) cell = mv.evaluated ? sig(mv.computed, 10) : "n/a";
          h << "<td>" << reports::html_escape(cell) << "</td>";
        }
        h << "<td>" << (v.holds ? "yes" : "<strong>NO</strong>") << "</td></tr>\n";
      }
      if (c.values.empty() || !c.errors.empty())
        h << "<tr><td>" << reports::html_escape(c.id) << "</td><td colspan=\"9\">" << (c.holds ? "holds" : "<strong>FAILS</strong>") << "</td></tr>\n";
    }
    h << "</table>\n";
    ho.extra_sections.push_back({"selfcheck", "Verification record: cited reference cases", h.str()});
    const std::string err = write_report_file(a.html, [&](std::ostream& o) { reports::write_html(o, {}, ho); });
    if (!err.empty()) { std::cerr << "trivet: --html: " << err << "\n"; code = kExitInvalid; }
  }
  if (!a.junit.empty()) {
    const std::string err = write_report_file(a.junit, [&](std::ostream& o) { reports::write_selfcheck_junit(o, r); });
    if (!err.empty()) { std::cerr << "trivet: --junit: " << err << "\n"; code = kExitInvalid; }
  }
  return code;
}


}  // namespace trivet::cli
