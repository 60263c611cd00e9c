// The selfcheck's verification record: as JSON and as JUnit XML, and its
// formats as reporters (console, JSON, JUnit, HTML).
#include "reports/selfcheck_report.h"

#include <cstdio>
#include <sstream>
#include <thread>

#include <unistd.h>

#include <nlohmann/json.hpp>

#include "harness/input/reader.h"
#include "methods/registry/registry.h"
#include "reports/html_report.h"

namespace trivet::reports {

namespace {

// One case of the record as JSON.
nlohmann::ordered_json case_json(const references::CaseResult& c) {
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
  return jc;
}

// The record around the cases, with an empty "cases" array.
nlohmann::ordered_json record_json(const SelfcheckSummary& s, const std::string& version) {
  nlohmann::ordered_json j;
  j["tool"] = {{"name", "trivet"}, {"version", version}};
  j["summary"] = {{"cases", s.cases}, {"cases_failed", s.cases_failed}, {"values", s.values}, {"values_failed", s.values_failed}};
  j["caution"] = compare::caution_text();
  j["cases"] = nlohmann::ordered_json::array();
  return j;
}

}  // namespace

void SelfcheckSummary::add(const references::CaseResult& c) {
  ++cases;
  cases_failed += !c.holds;
  values += c.values.size();
  values_failed += c.values_failed();
}

void write_selfcheck_json(std::ostream& o, const references::SelfcheckResult& r, const std::string& version) {
  SelfcheckSummary s;
  for (const auto& c : r.cases) s.add(c);
  nlohmann::ordered_json j = record_json(s, version);
  for (const auto& c : r.cases) j["cases"].push_back(case_json(c));
  o << j.dump(1) << "\n";
}

namespace {

// A number for a person to read in the record: `digits` significant digits
// (the JSON record keeps every digit).
std::string sig(double v, int digits) {
  char buf[48];
  std::snprintf(buf, sizeof buf, "%.*g", digits, v);
  return buf;
}

// Each case's lines (published values and what every method computed) as
// they come, then the counts and the caution.
class SelfcheckConsole final : public SelfcheckReporter {
 public:
  SelfcheckConsole(std::ostream& out, const SelfcheckConsoleOptions& opt) : out_(out), opt_(opt) {}
  void begin(const RunInfo&) override {}
  Part render(const references::CaseResult& c) const override {
    if (!opt_.cases) return {};
    std::ostringstream o;
    o << c.id << "  [" << paint(c.holds ? "holds" : "FAILS", c.holds) << "]  " << c.title << "\n";
    o << "  source: " << c.citation << "\n";
    for (const auto& [id, line] : opt_.rounding)
      if (id == c.id && !line.empty())
        o << "  arithmetic: " << opt_.arithmetic << "; correct digits of the double results:" << line << "\n";
    for (const auto& e : c.errors) o << "  error: " << e.format(c.file) << "\n";
    for (const auto& [m, why] : c.methods_skipped) o << "  " << m << ": not applicable (" << why << ")\n";
    for (const auto& [m, why] : c.methods_failed) o << "  " << m << ": " << paint("failed", false) << " (" << why << ")\n";
    if (!c.verdict_problem.empty()) o << "  " << c.verdict_problem << "\n";
    for (const auto& v : c.values) {
      std::string printed = v.published;
      if (!v.multiplier.empty() && v.multiplier != "1")
        printed = printed == "1" ? v.multiplier : printed == "-1" ? "-" + v.multiplier : printed + " " + v.multiplier;
      if (v.magnitude) printed += " (printed without sign; the magnitude is compared)";
      o << "  " << (v.holds ? "  ok " : paint("FAIL ", false)) << v.quantity << " at " << v.where << ": published "
        << printed << " = " << sig(v.expected, 10) << " +- " << sig(v.tolerance, 2) << "; computed";
      for (const auto& m : v.methods) {
        if (!m.evaluated) continue;
        o << " " << m.method << " " << sig(m.computed, 10) << (m.holds ? "" : " (out)");
      }
      o << "\n";
    }
    return {o.str(), {}};
  }
  void beam(Part&& part) override { out_ << part.text; }
  std::string end(const SelfcheckSummary& s) override {
    out_ << "selfcheck: " << s.cases << " cited cases, " << s.values << " published values: "
         << s.cases - s.cases_failed << " cases hold, " << s.cases_failed << " fail (" << s.values_failed
         << " values out of tolerance)\n";
    out_ << "caution: " << compare::caution_text() << "\n";
    return "";
  }

 private:
  std::string paint(const std::string& t, bool good) const {
    return opt_.color ? std::string(good ? "\033[32m" : "\033[1;31m") + t + "\033[0m" : t;
  }
  std::ostream& out_;
  SelfcheckConsoleOptions opt_;
};

// The record as JSON: each case's object as write_selfcheck_json writes it
// (indented as an element of "cases"), put under the summary at end().
class SelfcheckJson final : public SelfcheckReporter {
 public:
  explicit SelfcheckJson(std::ostream& out) : out_(out) {}
  void begin(const RunInfo& run) override { version_ = run.version; }
  Part render(const references::CaseResult& c) const override {
    // dump(1) of the case alone, moved two levels in (root, "cases"): JSON
    // strings hold no raw line breaks, so every line break starts a line.
    const std::string alone = case_json(c).dump(1);
    Part p;
    p.text.reserve(alone.size() + alone.size() / 8);
    p.text += "  ";
    for (const char ch : alone) {
      p.text += ch;
      if (ch == '\n') p.text += "  ";
    }
    return p;
  }
  void beam(Part&& part) override { held_.push_back(std::move(part.text)); }
  std::string end(const SelfcheckSummary& s) override {
    std::string doc = record_json(s, version_).dump(1);  // ends in `"cases": []` and the root's "\n}"
    if (!held_.empty()) {
      const std::string empty_end = "[]\n}";
      doc.resize(doc.size() - empty_end.size());
      doc += "[\n";
      for (std::size_t i = 0; i < held_.size(); ++i) doc += (i ? ",\n" : "") + held_[i];
      doc += "\n ]\n}";
    }
    out_ << doc << "\n";
    return "";
  }

 private:
  std::ostream& out_;
  std::string version_;
  std::vector<std::string> held_;
};

// JUnit XML: a testsuite per case; the counts of the root tag at end().
class SelfcheckJunit final : public SelfcheckReporter {
 public:
  explicit SelfcheckJunit(std::ostream& out) : out_(out) {}
  void begin(const RunInfo&) override {}
  Part render(const references::CaseResult& c) const override {
    Part p;
    p.tally.tests = c.values.size() + 1;
    p.tally.failures = c.values_failed() + (c.holds ? 0 : 1);
    std::ostringstream o;
    o << "  <testsuite name=\"" << html_escape(c.id) << "\" tests=\"" << p.tally.tests << "\" failures=\""
      << p.tally.failures << "\" errors=\"0\">\n";
    o << "    <testcase classname=\"" << html_escape(c.id) << "\" name=\"case holds (" << html_escape(c.citation) << ")\"";
    if (c.holds) o << "/>\n";
    else o << "><failure message=\"" << html_escape(c.verdict_problem.empty() ? "a published value does not hold" : c.verdict_problem) << "\"/></testcase>\n";
    for (const auto& v : c.values) {
      o << "    <testcase classname=\"" << html_escape(c.id) << "\" name=\"" << html_escape(v.quantity + " at " + v.where) << "\"";
      if (v.holds) { o << "/>\n"; continue; }
      std::string msg = "published " + v.published + " " + v.multiplier + " = " + input::format_number(v.expected) +
                        " +- " + input::format_number(v.tolerance) + ";";
      for (const auto& m : v.methods) if (m.evaluated) msg += " " + m.method + " " + input::format_number(m.computed);
      o << "><failure message=\"" << html_escape(msg) << "\"/></testcase>\n";
    }
    o << "  </testsuite>\n";
    p.text = o.str();
    return p;
  }
  void beam(Part&& part) override {
    total_.add(part.tally);
    held_.push_back(std::move(part.text));
  }
  std::string end(const SelfcheckSummary&) override {
    out_ << "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n<testsuites name=\"trivet selfcheck\" tests=\"" << total_.tests
         << "\" failures=\"" << total_.failures << "\" errors=\"0\">\n";
    for (const auto& t : held_) out_ << t;
    out_ << "</testsuites>\n";
    return "";
  }

 private:
  std::ostream& out_;
  Tally total_;
  std::vector<std::string> held_;
};

// The HTML page: a table row per published value, the build and the
// machine above the table, in a section of the common page.
class SelfcheckHtml final : public SelfcheckReporter {
 public:
  SelfcheckHtml(std::ostream& out, const HtmlOptions& options) : out_(out), options_(options) {}
  void begin(const RunInfo&) override {}
  Part render(const references::CaseResult& c) const override {
    std::ostringstream h;
    for (std::size_t i = 0; i < c.values.size(); ++i) {
      const auto& v = c.values[i];
      h << "<tr><td>" << (i == 0 ? html_escape(c.id) : "") << "</td><td>" << (i == 0 ? html_escape(c.citation) : "")
        << "</td><td>" << html_escape(v.quantity + " at " + v.where) << "</td><td>" << html_escape(v.published + " " + v.multiplier + (v.magnitude ? " (printed without sign; magnitude compared)" : ""))
        << "</td><td>" << sig(v.expected, 10) << "</td><td>" << sig(v.tolerance, 2) << "</td>";
      for (const auto& method : registry::all()) {
        const std::string m = method.name;
        std::string cell = "-";
        for (const auto& mv : v.methods)
          if (mv.method == m) cell = mv.evaluated ? sig(mv.computed, 10) : "n/a";
        h << "<td>" << html_escape(cell) << "</td>";
      }
      h << "<td>" << (v.holds ? "yes" : "<strong>NO</strong>") << "</td></tr>\n";
    }
    if (c.values.empty() || !c.errors.empty())
      h << "<tr><td>" << html_escape(c.id) << "</td><td colspan=\"9\">" << (c.holds ? "holds" : "<strong>FAILS</strong>") << "</td></tr>\n";
    return {h.str(), {}};
  }
  void beam(Part&& part) override { rows_ += part.text; }
  std::string end(const SelfcheckSummary& s) override {
    std::ostringstream h;
    char host[256] = "unknown";
    gethostname(host, sizeof host - 1);
    h << "<p>Tool trivet " << options_.tool_version << ", built " << __DATE__ << " with " << __VERSION__ << "; machine "
      << html_escape(host) << " (" << std::thread::hardware_concurrency() << " cores). "
      << s.cases << " cited cases, " << s.values << " published values; "
      << s.cases - s.cases_failed << " cases hold, " << s.cases_failed << " fail.</p>\n";
    h << "<table><tr><th>case</th><th>source</th><th>quantity</th><th>published</th><th>expected</th><th>tolerance</th>"
         "<th>" << registry::names("</th><th>") << "</th><th>holds</th></tr>\n";
    h << rows_ << "</table>\n";
    HtmlOptions ho = options_;
    ho.extra_sections.push_back({"selfcheck", "Verification record: cited reference cases", h.str()});
    write_html(out_, std::vector<const Report*>{}, ho);
    return "";
  }

 private:
  std::ostream& out_;
  HtmlOptions options_;
  std::string rows_;
};

}  // namespace

void write_selfcheck_junit(std::ostream& o, const references::SelfcheckResult& r) {
  SelfcheckJunit junit(o);
  SelfcheckSummary s;
  junit.begin({});
  for (const auto& c : r.cases) {
    junit.beam(junit.render(c));
    s.add(c);
  }
  junit.end(s);
}

std::unique_ptr<SelfcheckReporter> selfcheck_console_reporter(std::ostream& out, const SelfcheckConsoleOptions& opt) {
  return std::make_unique<SelfcheckConsole>(out, opt);
}
std::unique_ptr<SelfcheckReporter> selfcheck_json_reporter(std::ostream& out) { return std::make_unique<SelfcheckJson>(out); }
std::unique_ptr<SelfcheckReporter> selfcheck_junit_reporter(std::ostream& out) { return std::make_unique<SelfcheckJunit>(out); }
std::unique_ptr<SelfcheckReporter> selfcheck_html_reporter(std::ostream& out, const HtmlOptions& options) {
  return std::make_unique<SelfcheckHtml>(out, options);
}

}  // namespace trivet::reports
