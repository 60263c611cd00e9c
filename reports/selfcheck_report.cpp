// The selfcheck's verification record as JSON and as JUnit XML.
#include "reports/selfcheck_report.h"

#include <nlohmann/json.hpp>

#include "harness/input/reader.h"
#include "reports/html_report.h"

namespace trivet::reports {

void write_selfcheck_json(std::ostream& o, const references::SelfcheckResult& r, const std::string& version) {
  nlohmann::ordered_json j;
  j["tool"] = {{"name", "trivet"}, {"version", version}};
  j["summary"] = {{"cases", r.cases.size()}, {"cases_failed", r.cases_failed()},
                  {"values", r.values_checked()}, {"values_failed", r.values_failed()}};
  j["caution"] = compare::caution_text();
  nlohmann::ordered_json cases = nlohmann::ordered_json::array();
  for (const auto& c : r.cases) {
    nlohmann::ordered_json jc;
    jc["id"] = c.id; jc["file"] = c.file; jc["title"] = c.title; jc["source"] = c.citation;
    jc["holds"] = c.holds; jc["verdict"] = compare::verdict_name(c.verdict); jc["problem"] = c.verdict_problem;
    nlohmann::ordered_json errs = nlohmann::ordered_json::array();
    for (const auto& e : c.errors) errs.push_back(e.format(c.file));
    jc["errors"] = errs;
    nlohmann::ordered_json skipped = nlohmann::ordered_json::object();
    for (const auto& [m, why] : c.methods_skipped) skipped[m] = why;
    jc["not_applicable"] = skipped;
    nlohmann::ordered_json vals = nlohmann::ordered_json::array();
    for (const auto& v : c.values) {
      nlohmann::ordered_json jv;
      jv["quantity"] = v.quantity; jv["where"] = v.where; jv["case"] = v.load_case;
      jv["published"] = v.published; jv["multiplier"] = v.multiplier; jv["expected"] = v.expected;
      jv["tolerance"] = v.tolerance; jv["tolerance_rule"] = v.tolerance_rule; jv["unsigned"] = v.magnitude; jv["holds"] = v.holds;
      nlohmann::ordered_json ms = nlohmann::ordered_json::object();
      for (const auto& m : v.methods)
        ms[m.method] = {{"status", method_status_name(m.status)}, {"computed", m.evaluated ? nlohmann::ordered_json(m.computed) : nlohmann::ordered_json(nullptr)},
                        {"holds", m.holds}, {"reason", m.reason}};
      jv["methods"] = ms;
      vals.push_back(jv);
    }
    jc["values"] = vals;
    cases.push_back(jc);
  }
  j["cases"] = cases;
  o << j.dump(1) << "\n";
}

void write_selfcheck_junit(std::ostream& o, const references::SelfcheckResult& r) {
  std::size_t tests = 0, failures = 0;
  for (const auto& c : r.cases) { tests += c.values.size() + 1; failures += c.values_failed() + (c.holds ? 0 : 1); }
  o << "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n<testsuites name=\"trivet selfcheck\" tests=\"" << tests
    << "\" failures=\"" << failures << "\" errors=\"0\">\n";
  for (const auto& c : r.cases) {
    o << "  <testsuite name=\"" << reports::html_escape(c.id) << "\" tests=\"" << c.values.size() + 1 << "\" failures=\""
      << c.values_failed() + (c.holds ? 0 : 1) << "\" errors=\"0\">\n";
    o << "    <testcase classname=\"" << reports::html_escape(c.id) << "\" name=\"case holds (" << reports::html_escape(c.citation) << ")\"";
    if (c.holds) o << "/>\n";
    else o << "><failure message=\"" << reports::html_escape(c.verdict_problem.empty() ? "a published value does not hold" : c.verdict_problem) << "\"/></testcase>\n";
    for (const auto& v : c.values) {
      o << "    <testcase classname=\"" << reports::html_escape(c.id) << "\" name=\"" << reports::html_escape(v.quantity + " at " + v.where) << "\"";
      if (v.holds) { o << "/>\n"; continue; }
      std::string msg = "published " + v.published + " " + v.multiplier + " = " + input::format_number(v.expected) +
                        " +- " + input::format_number(v.tolerance) + ";";
      for (const auto& m : v.methods) if (m.evaluated) msg += " " + m.method + " " + input::format_number(m.computed);
      o << "><failure message=\"" << reports::html_escape(msg) << "\"/></testcase>\n";
    }
    o << "  </testsuite>\n";
  }
  o << "</testsuites>\n";
}

}  // namespace trivet::reports
