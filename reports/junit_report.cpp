// JUnit XML for CI systems: testsuites / testsuite (one per beam file) /
// testcase (one per load set and check), counts in attributes, failure
// elements carrying the numbers.
#include <algorithm>
#include <cmath>
#include <cstdio>
#include <sstream>

#include "harness/compare/against.h"
#include "reports/display_units.h"
#include "reports/json_writer.h"
#include "reports/reports.h"

namespace trivet::reports {

using namespace trivet::compare;

namespace {

std::string xml(const std::string& raw) {
  // Bytes that are not UTF-8 (a file name, say) become U+FFFD, so the XML
  // stays well formed.
  std::string s;
  s.reserve(raw.size());
  for (std::size_t i = 0; i < raw.size();) {
    const std::size_t n = utf8_sequence_length(raw, i);
    if (n == 0) { s += "\xEF\xBF\xBD"; ++i; }
    else { s.append(raw, i, n); i += n; }
  }
  std::string r;
  r.reserve(s.size());
  for (unsigned char c : s) {
    switch (c) {
      case '&': r += "&amp;"; break;
      case '<': r += "&lt;"; break;
      case '>': r += "&gt;"; break;
      case '"': r += "&quot;"; break;
      case '\'': r += "&apos;"; break;
      default:
        // XML 1.0 allows no control characters but tab, LF and CR.
        if (c < 0x20 && c != '\t' && c != '\n' && c != '\r') r += '?';
        else r += static_cast<char>(c);
    }
  }
  return r;
}

// Six significant digits, as a person reads a failure message (the JSON
// keeps every digit).
std::string num(double v) {
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.6g", v);
  return buf;
}

struct Case {
  std::string name;
  std::string failure;  // empty: passed
  bool error = false;   // an invalid input rather than a failed check
};

std::vector<Case> cases_of(const Report& b, double equilibrium_bound) {
  std::vector<Case> out;
  if (b.status == BeamStatus::Invalid) {
    std::string msg;
    for (const auto& e : b.errors) msg += e.format(b.file) + "\n";
    out.push_back({"beam file is valid", msg, true});
    return out;
  }
  for (const auto& set : b.sets) {
    const std::string p = set.name + ": ";
    Case agree{p + "methods agree", "", false};
    if (set.verdict != Verdict::Agree) {
      std::ostringstream m;
      m << verdict_name(set.verdict) << ": " << set.problem;
      if (set.worst) {
        m << "\nvalues at " << set.worst->where << ":";
        for (const auto& [name, v] : set.worst->values) m << " " << name << " = " << num(v);
      }
      agree.failure = m.str();
    }
    out.push_back(agree);
    for (const auto& m : set.methods) {
      if (m.status != MethodStatus::Ok) continue;
      Case eq{p + "equilibrium (" + m.name + ")", "", false};
      if (m.equilibrium.force_residual > equilibrium_bound || m.equilibrium.moment_residual > equilibrium_bound)
        eq.failure = "vertical force residual " + num(m.equilibrium.force_residual) + ", moment residual " +
                     num(m.equilibrium.moment_residual) + " (bound " + num(equilibrium_bound) + ")";
      out.push_back(eq);
    }
    if (!set.deflection_checks.empty()) {
      Case lim{p + "deflection limits", "", false};
      std::size_t over = 0;
      std::string lines;
      for (const auto& d : set.deflection_checks) {
        if (d.holds) continue;
        ++over;
        if (over <= 20)
          lines += "\nspan " + std::to_string(d.span + 1) + ": deflection " + num(d.deflection) + " " + b.units.length +
                   " at x = " + num(d.x) + ", allowed " + num(d.allowed) + " (" + d.limit + "), span/deflection " +
                   num(std::round(d.ratio));
      }
      if (over > 0)
        lim.failure = std::to_string(over) + " of " + std::to_string(set.deflection_checks.size()) +
                      " spans over their deflection limit" + lines + (over > 20 ? "\n..." : "");
      out.push_back(lim);
    }
  }
  ShowUnits own;
  own.file = true;
  const DisplayUnits file_units = display_units(b.units, own);
  for (std::size_t i = 0; i < b.claims.size(); ++i) {
    const ClaimResult& c = b.claims[i];
    Case k{"claim " + std::to_string(i + 1) + ": " + input::quantity_name(c.claim.quantity) + " at " + c.label +
               " (" + c.load_case + ")" + (c.claim.source.empty() ? "" : " from " + c.claim.source),
           "", false};
    if (!c.holds) {
      // In the file's units, as the JSON report.
      const std::string unit = " " + file_units.of(c.claim.quantity).label;
      k.failure = c.evaluated ? "claimed " + num(c.claim.value) + unit + ", computed " + num(c.computed) + unit +
                                    ", difference " + num(c.difference) + unit + ", tolerance " + num(c.tolerance) + unit
                              : "claimed " + num(c.claim.value) + unit + ": " + c.reason;
      if (!c.finding.empty()) k.failure += "\nfinding: " + c.finding;
    }
    out.push_back(k);
  }
  for (const auto& c : b.against) {
    namespace ag = compare::against;
    if (!c->ok()) {
      std::string msg;
      for (const auto& e : c->errors) msg += e.format(c->file) + "\n";
      out.push_back({"against " + c->file + ": file is readable", msg, true});
      continue;
    }
    for (const auto& q : c->summary) {
      Case k{"against " + c->file + ": " + ag::quantity_plural(q.quantity) + " (" + c->load_case + ")", "", false};
      if (q.failing > 0) {
        const std::string unit = " " + file_units.of(q.quantity).label;
        k.failure = std::to_string(q.failing) + " of " + std::to_string(q.compared) + " values fail; worst difference " +
                    num(q.worst_difference) + unit + " at " + q.worst_where + " (tolerance " + num(q.tolerance) + unit + ")";
        if (q.finding) k.failure += "\nfinding: " + q.finding->text;
        else if (!q.note.empty()) k.failure += "\n" + q.note;
      }
      out.push_back(k);
    }
  }
  return out;
}

}  // namespace

std::string junit_classname(const std::string& path) {
  std::string c = path;
  const std::string ext = ".json";
  if (c.size() > ext.size() && c.compare(c.size() - ext.size(), ext.size(), ext) == 0) c.resize(c.size() - ext.size());
  for (char& ch : c)
    if (ch == '.') ch = '_';
  return c;
}

namespace {
std::string seconds_text(double s) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.3f", std::max(0.0, s));
  return buf;
}
}  // namespace

JunitCounts junit_suite(const Report& b, double equilibrium_bound, std::string& x) {
  JunitCounts out;
  out.seconds = b.seconds;
  const std::vector<Case> cases = cases_of(b, equilibrium_bound);
  for (const auto& c : cases) {
    ++out.tests;
    if (!c.failure.empty()) (c.error ? out.errors : out.failures)++;
  }
  const std::string file = xml(b.file);
  const std::string classname = xml(junit_classname(b.file));
  x += "  <testsuite name=\"" + file + "\" tests=\"" + std::to_string(out.tests) + "\" failures=\"" +
       std::to_string(out.failures) + "\" errors=\"" + std::to_string(out.errors) + "\" skipped=\"0\" time=\"" +
       seconds_text(b.seconds) + "\">\n";
  if (!b.warnings.empty()) {
    x += "    <system-out>";
    for (const auto& w : b.warnings) x += xml("warning: " + w) + "\n";
    x += "</system-out>\n";
  }
  for (const auto& c : cases) {
    x += "    <testcase classname=\"" + classname + "\" name=\"" + xml(c.name) + "\"";
    if (c.failure.empty()) {
      x += "/>\n";
      continue;
    }
    const std::string first = c.failure.substr(0, c.failure.find('\n'));
    const char* tag = c.error ? "error" : "failure";
    x += ">\n      <" + std::string(tag) + " message=\"" + xml(first) + "\">" + xml(c.failure) + "</" + tag +
         ">\n    </testcase>\n";
  }
  x += "  </testsuite>\n";
  return out;
}

void write_junit_suites(std::ostream& out, const std::vector<JunitCounts>& counts,
                        const std::vector<std::string_view>& suites) {
  std::size_t tests = 0, failures = 0, errors = 0;
  double seconds = 0;
  for (const auto& s : counts) {
    tests += s.tests;
    failures += s.failures;
    errors += s.errors;
    seconds += s.seconds;
  }
  out << junit_head({tests, failures, errors, seconds}, false);
  for (const auto& s : suites) out.write(s.data(), static_cast<std::streamsize>(s.size()));
  out << junit_tail();
}

std::string junit_head(const JunitCounts& total, bool padded) {
  std::string h = "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n<testsuites name=\"trivet\" tests=\"" +
                  std::to_string(total.tests) + "\" failures=\"" + std::to_string(total.failures) + "\" errors=\"" +
                  std::to_string(total.errors) + "\" time=\"" + seconds_text(total.seconds) + "\"";
  if (padded) {
    // Room for three counts of 20 digits and a time of 24, as spaces inside the tag.
    const std::size_t digits = std::to_string(total.tests).size() + std::to_string(total.failures).size() +
                               std::to_string(total.errors).size() + seconds_text(total.seconds).size();
    h.append(84 - digits, ' ');
  }
  return h + ">\n";
}

const char* junit_tail() { return "</testsuites>\n"; }

void write_junit(std::ostream& out, const std::vector<Report>& beams, double equilibrium_bound) {
  std::vector<JunitCounts> counts;
  std::vector<std::string> texts(beams.size());
  std::vector<std::string_view> suites;
  for (std::size_t i = 0; i < beams.size(); ++i) {
    counts.push_back(junit_suite(beams[i], equilibrium_bound, texts[i]));
    suites.push_back(texts[i]);
  }
  write_junit_suites(out, counts, suites);
}

namespace {

// JUnit XML as a reporter. Streamed: the root tag with room for the
// counts, each beam's suite as it comes, then the root tag again.
// Otherwise the suites are held and the document written at end().
class JunitReporter final : public CheckReporter {
 public:
  JunitReporter(const Output& output, double equilibrium_bound)
      : out_(*output.out), streamed_(output.streamed), bound_(equilibrium_bound) {}
  void begin(const RunInfo&) override {
    if (streamed_) out_ << junit_head({}, true);
  }
  Part render(const Report& beam) const override {
    Part p;
    p.tally = junit_suite(beam, bound_, p.text);
    return p;
  }
  void beam(Part&& part) override {
    total_.add(part.tally);
    if (streamed_) {
      out_ << part.text;
      return;
    }
    counts_.push_back(part.tally);
    held_.push_back(std::move(part.text));
  }
  std::string end(const Summary&) override {
    if (streamed_) {
      out_ << junit_tail();
      out_.seekp(0);
      out_ << junit_head(total_, true);  // the same length, now with the counts
    } else {
      write_junit_suites(out_, counts_, std::vector<std::string_view>(held_.begin(), held_.end()));
    }
    return "";  // a failed write shows in the stream, which the caller checks when it closes it
  }

 private:
  std::ostream& out_;
  bool streamed_;
  double bound_;
  JunitCounts total_;
  std::vector<JunitCounts> counts_;
  std::vector<std::string> held_;
};

}  // namespace

std::unique_ptr<CheckReporter> junit_reporter(const Output& output, double equilibrium_bound) {
  return std::make_unique<JunitReporter>(output, equilibrium_bound);
}

}  // namespace trivet::reports
