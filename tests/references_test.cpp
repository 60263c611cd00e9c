// Tests of the reference-case library and its runner (`trivet selfcheck`).
#include <gtest/gtest.h>

#include <cmath>
#include <fstream>
#include <map>
#include <set>
#include <sstream>
#include <string>

#include <nlohmann/json.hpp>

#include "references/reference.h"
#include "references/selfcheck.h"
#include "harness/compare/compare.h"

namespace {

using namespace trivet::references;
using nlohmann::json;

// An independent cross-check of the span extremes the product finds (the
// turning points of each piece's interpolating polynomial, in
// harness/compare/extremes.cpp): a dense scan of each method's own `at`
// with bisection where the shear or the rotation changes sign. Positions
// local to the span.
struct MethodExtremes {
  double max_moment = 0, max_moment_at = 0;
  double min_moment = 0, min_moment_at = 0;
  double max_deflection = 0, max_deflection_at = 0;  // signed, largest magnitude
};
using trivet::PointValues;
using trivet::Solution;

// Bisection for a sign change of g on (a, b), g(a) and g(b) of opposite signs.
template <class G>
double bisect(G&& g, double a, double b, double ga) {
  for (int it = 0; it < 200 && b - a > 1e-15 * (std::abs(a) + std::abs(b) + 1e-300); ++it) {
    const double m = 0.5 * (a + b);
    if (!(m > a && m < b)) break;
    const double gm = g(m);
    if (!(std::abs(gm) > 0)) return m;
    if ((gm > 0) == (ga > 0)) { a = m; ga = gm; }
    else b = m;
  }
  return 0.5 * (a + b);
}

bool opposite(double a, double b) { return (a > 0 && b < 0) || (a < 0 && b > 0); }

MethodExtremes span_extremes(const Solution& solution, const trivet::compare::LoadSet& set, std::size_t span) {
  MethodExtremes e;
  const double L = set.beam.spans[span].length;
  // The grid: equal divisions plus every station of this span (which holds
  // the positions of the loads: their ends, point forces and couples).
  const int n = 240;
  std::vector<double> pts;
  for (int k = 0; k <= n; ++k) pts.push_back(k == n ? L : L * k / n);
  for (const auto& st : set.stations)
    if (st.span == span) pts.push_back(st.local);
  std::sort(pts.begin(), pts.end());
  std::vector<double> grid;
  for (double p : pts)
    if (grid.empty() || p - grid.back() > 1e-12 * L) grid.push_back(p);
    else if (std::abs(p - L) <= 1e-12 * L) grid.back() = L;
  bool first = true;
  auto consider = [&](double local, const PointValues& v) {
    if (first || v.moment > e.max_moment) { e.max_moment = v.moment; e.max_moment_at = local; }
    if (first || v.moment < e.min_moment) { e.min_moment = v.moment; e.min_moment_at = local; }
    if (first || std::abs(v.deflection) > std::abs(e.max_deflection)) {
      e.max_deflection = v.deflection;
      e.max_deflection_at = local;
    }
    first = false;
  };
  for (std::size_t k = 0; k < grid.size(); ++k) {
    consider(grid[k], solution.at(span, grid[k], false));
    consider(grid[k], solution.at(span, grid[k], true));
  }
  for (std::size_t k = 0; k + 1 < grid.size(); ++k) {
    const double a = grid[k], b = grid[k + 1];
    const PointValues pa = solution.at(span, a, true);   // just right of a
    const PointValues pb = solution.at(span, b, false);  // just left of b
    if (opposite(pa.shear, pb.shear)) {
      const double t = bisect([&](double s) { return solution.at(span, s, false).shear; }, a, b, pa.shear);
      consider(t, solution.at(span, t, false));
    }
    if (opposite(pa.rotation, pb.rotation)) {
      const double t = bisect([&](double s) { return solution.at(span, s, false).rotation; }, a, b, pa.rotation);
      consider(t, solution.at(span, t, false));
    }
  }
  return e;
}


std::string read_text(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

std::string errors_of(const ReferenceCase& c) {
  std::string s;
  for (const auto& e : c.errors) s += e.format(c.file) + "\n";
  return s;
}

std::string failures_of(const CaseResult& r) {
  std::string s;
  for (const auto& e : r.errors) s += e.format(r.file) + "\n";
  if (r.verdict != trivet::compare::Verdict::Agree)
    s += std::string("verdict ") + trivet::compare::verdict_name(r.verdict) + ": " + r.verdict_problem + "\n";
  for (const auto& [m, why] : r.methods_failed) s += m + " failed: " + why + "\n";
  for (const auto& v : r.values) {
    if (v.holds) continue;
    s += v.quantity + " at " + v.where + ": published " + v.published + " x " + v.multiplier + " = " +
         std::to_string(v.expected) + " +- " + std::to_string(v.tolerance) + ";";
    for (const auto& m : v.methods)
      s += " " + m.method + (m.evaluated ? " " + std::to_string(m.computed) : " (" + m.reason + ")") +
           (m.holds ? "" : " FAILS");
    s += "\n";
  }
  return s;
}

// ---------------------------------------------------------------------------
// The multiplier evaluator.

TEST(Multiplier, ProductsQuotientsPowers) {
  const std::map<std::string, double> sym = {{"w", 10}, {"L", 6}, {"EI", 20000}, {"P", 50}, {"a", 2}, {"b", 4},
                                             {"L1", 4}, {"L2", 6}};
  std::string why;
  EXPECT_NEAR(*evaluate_multiplier("w*L^2", sym, &why), 360.0, 1e-12);
  EXPECT_NEAR(*evaluate_multiplier("w*L^4/EI", sym, &why), 10.0 * 1296.0 / 20000.0, 1e-15);
  EXPECT_NEAR(*evaluate_multiplier("P*L^3/EI", sym, &why), 50.0 * 216.0 / 20000.0, 1e-15);
  EXPECT_NEAR(*evaluate_multiplier("P", sym, &why), 50.0, 0.0);
  EXPECT_NEAR(*evaluate_multiplier("P*a*b^2/L^2", sym, &why), 50.0 * 2 * 16 / 36.0, 1e-12);
  EXPECT_NEAR(*evaluate_multiplier("w*(L1^3 + L2^3)/(L1 + L2)", sym, &why), 10.0 * 280 / 10.0, 1e-12);
  EXPECT_NEAR(*evaluate_multiplier("P*L^3/(EI*sqrt(5))", sym, &why), 50.0 * 216 / (20000 * std::sqrt(5.0)), 1e-15);
  EXPECT_NEAR(*evaluate_multiplier("-L^2", sym, &why), -36.0, 1e-12);  // -(L^2), not (-L)^2
  EXPECT_NEAR(*evaluate_multiplier("2^3^2", sym, &why), 512.0, 1e-9);  // right associative
  EXPECT_NEAR(*evaluate_multiplier("w*L/2 - a", sym, &why), 28.0, 1e-12);
  EXPECT_NEAR(*evaluate_multiplier("1", sym, &why), 1.0, 0.0);
}

TEST(Multiplier, RefusesBadText) {
  const std::map<std::string, double> sym = {{"w", 10}, {"L", 6}};
  std::string why;
  EXPECT_FALSE(evaluate_multiplier("w*L^2*EI", sym, &why));
  EXPECT_NE(why.find("unknown symbol 'EI'"), std::string::npos) << why;
  EXPECT_FALSE(evaluate_multiplier("w*(L", sym, &why));
  EXPECT_FALSE(evaluate_multiplier("w**L", sym, &why));
  EXPECT_FALSE(evaluate_multiplier("w L", sym, &why));
  EXPECT_FALSE(evaluate_multiplier("", sym, &why));
  EXPECT_FALSE(evaluate_multiplier("w/(L-6)", sym, &why));
  EXPECT_FALSE(evaluate_multiplier("cos(L)", sym, &why));
}

// ---------------------------------------------------------------------------
// Tolerance from the printed digits.

TEST(Published, DecimalToleranceIsHalfAUnitInTheLastPlace) {
  std::string why;
  auto a = parse_published("-0.1071", false, false, &why);
  ASSERT_TRUE(a) << why;
  EXPECT_NEAR(a->value, -0.1071, 1e-15);
  EXPECT_NEAR(a->tolerance, 5e-5, 1e-18);
  EXPECT_EQ(a->decimals, 4);
  EXPECT_EQ(a->form, Form::Decimal);
  auto b = parse_published("0.125", false, false, &why);
  ASSERT_TRUE(b);
  EXPECT_NEAR(b->tolerance, 5e-4, 1e-18);
  auto c = parse_published("1.25", false, false, &why);
  ASSERT_TRUE(c);
  EXPECT_NEAR(c->tolerance, 5e-3, 1e-18);
  auto d = parse_published("0.070", false, false, &why);  // trailing zero is a printed digit
  ASSERT_TRUE(d);
  EXPECT_NEAR(d->tolerance, 5e-4, 1e-18);
  auto e = parse_published("12", false, false, &why);
  ASSERT_TRUE(e);
  EXPECT_NEAR(e->tolerance, 0.5, 1e-15);
}

TEST(Published, FractionIsExact) {
  std::string why;
  auto f = parse_published("-3/28", false, false, &why);
  ASSERT_TRUE(f) << why;
  EXPECT_EQ(f->form, Form::Exact);
  EXPECT_NEAR(f->value, -3.0 / 28.0, 1e-17);
  EXPECT_NEAR(f->tolerance, kExactRelative, 0.0);
  auto g = parse_published("6", true, false, &why);  // an integer coefficient of a formula
  ASSERT_TRUE(g);
  EXPECT_EQ(g->form, Form::Exact);
  EXPECT_NEAR(g->tolerance, kExactRelative, 0.0);
}

TEST(Published, RoundedDenominator) {
  std::string why;
  auto r = parse_published("1/185", false, true, &why);
  ASSERT_TRUE(r) << why;
  EXPECT_EQ(r->form, Form::RoundedDenominator);
  EXPECT_NEAR(r->tolerance, 1.0 / 184.5 - 1.0 / 185.0, 1e-15);
}

TEST(Published, RefusesBadText) {
  std::string why;
  for (const char* t : {"", "-", "0.1.2", "1e-3", "abc", "3/", "/4", "3/0", "0.", "1/2.5"})
    EXPECT_FALSE(parse_published(t, false, false, &why)) << t;
  EXPECT_FALSE(parse_published("0.0054", false, true, &why));
}

TEST(Published, ToleranceScalesWithTheMultiplier) {
  const std::string text = R"({
    "id": "t", "title": "t",
    "source": {"title": "s", "locator": "l", "confirmed": "derived"},
    "beam": {"units": {"force": "kN", "length": "m"}, "spans": [{"length": 6, "EI": 20000}],
             "supports": ["pinned", "roller"], "loads": [{"type": "udl", "span": 1, "w": 10}]},
    "symbols": {"w": 10, "L": 6},
    "expected": [
      {"quantity": "max_moment", "span": 1, "published": "0.1250", "multiplier": "w*L^2"},
      {"quantity": "reaction", "node": "A", "published": "1/2", "multiplier": "w*L"}
    ]})";
  const ReferenceCase c = parse_case_text(text, "inline");
  ASSERT_TRUE(c.ok()) << errors_of(c);
  ASSERT_EQ(c.expected.size(), 2u);
  EXPECT_NEAR(c.expected[0].multiplier_value, 360.0, 1e-12);
  EXPECT_NEAR(c.expected[0].value, 45.0, 1e-12);
  EXPECT_NEAR(c.expected[0].tolerance, 5e-5 * 360.0, 1e-12);
  EXPECT_NEAR(c.expected[1].tolerance, kExactRelative * 60.0, 1e-18);
  const CaseResult r = run_case(c);
  EXPECT_TRUE(r.holds) << failures_of(r);
}

// ---------------------------------------------------------------------------
// Errors in a case file: file and JSON location, never a crash.

TEST(Loader, ReportsErrorsWithTheirLocation) {
  const std::string text = R"({
    "id": "bad", "title": "bad",
    "source": {"title": "s", "locator": "l", "confirmed": "perhaps"},
    "beam": {"units": {"force": "kN", "length": "m"}, "spans": [{"length": -6, "EI": 20000}],
             "supports": ["pinned", "roller"]},
    "symbols": {"w": 10},
    "expected": [
      {"quantity": "momnet", "node": "A", "published": "0.1", "multiplier": "w"},
      {"quantity": "moment", "node": "A", "published": 0.125, "multiplier": "w"},
      {"quantity": "moment", "node": "A", "published": "0.125", "multiplier": "w*L^2"}
    ]})";
  const ReferenceCase c = parse_case_text(text, "bad.json");
  EXPECT_FALSE(c.ok());
  std::set<std::string> pointers;
  for (const auto& e : c.errors) pointers.insert(e.pointer);
  EXPECT_TRUE(pointers.count("/source/confirmed")) << errors_of(c);
  EXPECT_TRUE(pointers.count("/beam/spans/0/length")) << errors_of(c);
  EXPECT_TRUE(pointers.count("/expected/0/quantity")) << errors_of(c);
  EXPECT_TRUE(pointers.count("/expected/1/published")) << errors_of(c);
  EXPECT_TRUE(pointers.count("/expected/2/multiplier")) << errors_of(c);
  EXPECT_NE(errors_of(c).find("bad.json: /beam/spans/0/length"), std::string::npos) << errors_of(c);
  // A bad case never holds.
  EXPECT_FALSE(run_case(c).holds);
}

// A value printed without a sign ("unsigned": true) is compared with the
// magnitude of the computed one; a negative text cannot be unsigned. The
// beam is a simple span under a central point load: M = PL/4 (Hicks, "Civil
// Engineering Formulas", ch. 2, from memory), here P = 10, L = 4, M = 10.
TEST(Loader, UnsignedValueIsAMagnitude) {
  const std::string head = R"({
    "id": "u", "title": "u",
    "source": {"title": "s", "locator": "l", "confirmed": "derived"},
    "beam": {"units": {"force": "kN", "length": "m"}, "spans": [{"length": 4, "EI": 20000}],
             "supports": ["pinned", "roller"], "loads": [{"type": "point", "span": 1, "P": 10, "at": 2}]},
    "symbols": {},
    "expected": [)";
  auto with = [&](const std::string& e) { return parse_case_text(head + e + "]}", "u.json"); };
  // The sagging moment under the load: positive, so unsigned or not it holds.
  const ReferenceCase plain = with(R"({"quantity": "moment", "x": 2, "side": "left", "published": "10.0", "unsigned": true})");
  ASSERT_TRUE(plain.ok()) << errors_of(plain);
  EXPECT_TRUE(run_case(plain).holds) << failures_of(run_case(plain));
  // Right of the load the shear is -P/2 = -5 (V = dM/dx): only its
  // magnitude matches "5.0", and only when the text is marked unsigned.
  const ReferenceCase neg = with(R"({"quantity": "shear", "x": 3, "published": "5.0", "unsigned": true})");
  ASSERT_TRUE(neg.ok()) << errors_of(neg);
  const CaseResult rn = run_case(neg);
  EXPECT_TRUE(rn.holds) << failures_of(rn);
  for (const auto& mv : rn.values.at(0).methods)
    if (mv.evaluated) { EXPECT_LT(mv.computed, 0) << mv.method; }
  const ReferenceCase signed_neg = with(R"({"quantity": "shear", "x": 3, "published": "5.0"})");
  ASSERT_TRUE(signed_neg.ok()) << errors_of(signed_neg);
  EXPECT_FALSE(run_case(signed_neg).holds);
  const ReferenceCase off = with(R"({"quantity": "shear", "x": 3, "published": "5.1", "unsigned": true})");
  ASSERT_TRUE(off.ok()) << errors_of(off);
  EXPECT_FALSE(run_case(off).holds);
  const ReferenceCase bad = with(R"({"quantity": "shear", "x": 3, "published": "-5.0", "unsigned": true},
                                    {"quantity": "shear", "x": 3, "published": "5.0", "unsigned": "yes"})");
  EXPECT_FALSE(bad.ok());
  std::set<std::string> pointers;
  for (const auto& e : bad.errors) pointers.insert(e.pointer);
  EXPECT_TRUE(pointers.count("/expected/0/published")) << errors_of(bad);
  EXPECT_TRUE(pointers.count("/expected/1/unsigned")) << errors_of(bad);
}

TEST(Loader, NotJsonAndMissingDirectory) {
  const ReferenceCase c = parse_case_text("{ not json", "x.json");
  ASSERT_FALSE(c.ok());
  EXPECT_NE(c.errors.front().reason.find("not valid JSON"), std::string::npos);
  const auto cases = load_cases("/nonexistent/trivet/reference/dir");
  ASSERT_EQ(cases.size(), 1u);
  EXPECT_FALSE(cases.front().ok());
  const SelfcheckResult r = run_selfcheck("/nonexistent/trivet/reference/dir");
  EXPECT_FALSE(r.holds());
}

TEST(Registry, DirectoryCanBeOverridden) {
  EXPECT_EQ(directory(), default_directory());
  set_directory("/tmp/somewhere-else");
  EXPECT_EQ(directory(), "/tmp/somewhere-else");
  set_directory("");
  EXPECT_EQ(directory(), default_directory());
}

TEST(Citation, OneLine) {
  Source s;
  s.author = "T. G. Hicks";
  s.title = "Civil Engineering Formulas";
  s.edition = "2nd ed.";
  s.publisher = "McGraw-Hill";
  s.year = "2010";
  s.locator = "Table 2.1";
  s.confirmed = "from memory";
  EXPECT_EQ(format_citation(s), "T. G. Hicks, Civil Engineering Formulas, 2nd ed., McGraw-Hill, 2010, Table 2.1 (from memory)");
}

// ---------------------------------------------------------------------------
// The library itself.

TEST(Library, EveryCaseLoads) {
  const auto files = list_case_files(default_directory());
  ASSERT_GE(files.size(), 32u) << default_directory();
  const auto cases = load_cases(default_directory());
  ASSERT_EQ(cases.size(), files.size());
  std::set<std::string> ids;
  for (const auto& c : cases) {
    EXPECT_TRUE(c.ok()) << errors_of(c);
    EXPECT_FALSE(c.expected.empty()) << c.file;
    EXPECT_FALSE(c.source.title.empty()) << c.file;
    EXPECT_FALSE(c.source.locator.empty()) << c.file;
    EXPECT_FALSE(c.source.confirmed.empty()) << c.file;
    EXPECT_TRUE(ids.insert(c.id).second) << "duplicate id " << c.id;
    // The file is named after its id.
    EXPECT_NE(c.file.find(c.id + ".json"), std::string::npos) << c.file << " has id " << c.id;
  }
}

TEST(Library, ToleranceOfAPrintedTableValue) {
  // Hicks, 4 equal spans: M_B printed "-0.1071" against w L^2 (w = 10, L = 6).
  const ReferenceCase c = read_case_file(default_directory() + "/hicks-continuous-4-spans-udl.json");
  ASSERT_TRUE(c.ok()) << errors_of(c);
  const Expected& mb = c.expected.at(0);
  EXPECT_EQ(mb.published, "-0.1071");
  EXPECT_EQ(mb.multiplier, "w*L^2");
  EXPECT_NEAR(mb.multiplier_value, 360.0, 1e-12);
  EXPECT_NEAR(mb.value, -0.1071 * 360.0, 1e-12);
  EXPECT_NEAR(mb.tolerance, 5e-5 * 360.0, 1e-12);
  EXPECT_EQ(mb.number.rule, "half a unit in the 4th decimal place");
}

TEST(Library, EveryCaseHoldsOnEveryMethod) {
  const SelfcheckResult r = run_selfcheck(default_directory());
  ASSERT_GE(r.cases.size(), 32u);
  for (const auto& c : r.cases) {
    EXPECT_TRUE(c.holds) << c.id << " (" << c.citation << "):\n" << failures_of(c);
    // At least two methods ran on every case and none failed; a method
    // that declares the beam outside its scope (three-moment: springs,
    // hinges) is skipped. Each value was computed from each method that ran.
    EXPECT_GE(c.methods_ok.size(), 2u) << c.id;
    EXPECT_TRUE(c.methods_failed.empty()) << c.id;
    EXPECT_EQ(c.methods_ok.size() + c.methods_skipped.size(), trivet::compare::methods().size()) << c.id;
    for (const auto& v : c.values) {
      ASSERT_EQ(v.methods.size(), trivet::compare::methods().size()) << c.id;
      for (const auto& m : v.methods) {
        if (m.status == trivet::MethodStatus::Ok) {
          EXPECT_TRUE(m.evaluated) << c.id << " " << v.where << " " << m.method;
        }
      }
    }
  }
  std::size_t all_three = 0;
  for (const auto& c : r.cases) all_three += c.methods_ok.size() == trivet::compare::methods().size();
  EXPECT_GE(all_three, 32u);
  EXPECT_TRUE(r.holds());
  EXPECT_EQ(r.values_failed(), 0u);
  EXPECT_GT(r.values_checked(), 150u);
}

// Moves a published text one unit of its last printed digit (a fraction:
// one unit of its numerator) in the direction away from `computed`.
std::string nudge(const std::string& text, double coefficient_computed) {
  std::string t = text;
  const bool negative = !t.empty() && t[0] == '-';
  std::string body = negative ? t.substr(1) : t;
  const auto slash = body.find('/');
  if (slash != std::string::npos) {
    long long p = std::stoll(body.substr(0, slash));
    const long long q = std::stoll(body.substr(slash + 1));
    const double v = (negative ? -1.0 : 1.0) * static_cast<double>(p) / static_cast<double>(q);
    // Away from the computed value in magnitude terms.
    const bool up = (v >= coefficient_computed) == !negative;
    p = up ? p + 1 : (p > 0 ? p - 1 : p + 1);
    return (negative ? "-" : "") + std::to_string(p) + "/" + body.substr(slash + 1);
  }
  const auto dot = body.find('.');
  const int decimals = dot == std::string::npos ? 0 : static_cast<int>(body.size() - dot - 1);
  const double unit = std::pow(10.0, -decimals);
  const double v = std::stod(t);
  const double shifted = v >= coefficient_computed ? v + unit : v - unit;
  char buf[64];
  std::snprintf(buf, sizeof buf, "%.*f", decimals, shifted);
  return buf;
}

TEST(Library, OneDigitOffMakesTheCaseFail) {
  const auto files = list_case_files(default_directory());
  ASSERT_FALSE(files.empty());
  std::size_t mutated = 0;
  for (const auto& f : files) {
    const std::string text = read_text(f);
    const json root = json::parse(text);
    const ReferenceCase original = parse_case_text(text, f);
    ASSERT_TRUE(original.ok()) << errors_of(original);
    const CaseResult base = run_case(original);
    ASSERT_TRUE(base.holds) << failures_of(base);
    for (std::size_t i = 0; i < root["expected"].size(); ++i) {
      // The coefficient the methods give (the first method), so the nudge
      // goes away from it.
      const auto& vr = base.values[i];
      double coefficient = 0;
      for (const auto& mv : vr.methods)
        if (mv.evaluated) { coefficient = mv.computed / vr.multiplier_value; break; }
      json copy = root;
      const std::string old = copy["expected"][i]["published"].get<std::string>();
      const std::string changed = nudge(old, coefficient);
      ASSERT_NE(old, changed);
      copy["expected"][i]["published"] = changed;
      const ReferenceCase m = parse_case_text(copy.dump(), f + " (changed)");
      ASSERT_TRUE(m.ok()) << errors_of(m);
      const CaseResult r = run_case(m);
      EXPECT_FALSE(r.holds) << f << " value " << i << ": " << old << " -> " << changed << " still holds";
      ASSERT_EQ(r.values.size(), base.values.size());
      EXPECT_FALSE(r.values[i].holds) << f << " value " << i << ": " << old << " -> " << changed;
      for (const auto& mv : r.values[i].methods) {
        if (mv.status == trivet::MethodStatus::Ok) {
          EXPECT_FALSE(mv.holds) << f << " value " << i << " " << mv.method;
        }
      }
      for (std::size_t k = 0; k < r.values.size(); ++k) {
        if (k != i) {
          EXPECT_TRUE(r.values[k].holds) << f << " value " << k;
        }
      }
      ++mutated;
    }
  }
  EXPECT_GT(mutated, 150u);
}

TEST(Library, ALeftRightJumpNeedsASide) {
  // A central point load: the shear jumps at midspan, so "shear at x = 3"
  // without a side cannot be evaluated and the case fails; with a side it holds.
  const std::string base = R"({
    "id": "t", "title": "t",
    "source": {"title": "s", "locator": "l", "confirmed": "derived"},
    "beam": {"units": {"force": "kN", "length": "m"}, "spans": [{"length": 6, "EI": 20000}],
             "supports": ["pinned", "roller"], "loads": [{"type": "point", "span": 1, "P": 50, "at": 3}]},
    "symbols": {"P": 50},
    "expected": [{"quantity": "shear", "x": 3, "published": "1/2", "multiplier": "P" SIDE}]})";
  auto with = [&](const std::string& side) {
    std::string t = base;
    t.replace(t.find("SIDE"), 4, side);
    return run_case(parse_case_text(t, "inline"));
  };
  EXPECT_FALSE(with("").holds);
  EXPECT_TRUE(with(", \"side\": \"left\"").holds);
  EXPECT_FALSE(with(", \"side\": \"right\"").holds);
}

TEST(Library, PerMethodExtremesMatchTheConsensus) {
  // The runner's own extreme search agrees with the harness's consensus
  // extremes on a case with a known maximum (propped cantilever, 9wL^2/128).
  const std::string text = R"({
    "id": "t", "title": "t",
    "source": {"title": "s", "locator": "l", "confirmed": "derived"},
    "beam": {"units": {"force": "kN", "length": "m"}, "spans": [{"length": 6, "EI": 20000}],
             "supports": ["pinned", "fixed"], "loads": [{"type": "udl", "span": 1, "w": 10}]},
    "symbols": {"w": 10, "L": 6},
    "expected": [{"quantity": "max_moment", "span": 1, "published": "9/128", "multiplier": "w*L^2"}]})";
  const ReferenceCase c = parse_case_text(text, "inline");
  ASSERT_TRUE(c.ok()) << errors_of(c);
  const auto br = trivet::compare::check(c.beam, {});
  ASSERT_EQ(br.sets.size(), 1u);
  for (const auto& m : br.sets[0].methods) {
    ASSERT_EQ(m.status, trivet::MethodStatus::Ok) << m.name;
    const MethodExtremes e = span_extremes(m.solution, br.sets[0], 0);
    EXPECT_NEAR(e.max_moment, br.sets[0].extremes[0].max_moment, 1e-9 * 360);
    EXPECT_NEAR(e.max_moment_at, 6.0 * 3.0 / 8.0, 1e-6);
    EXPECT_NEAR(e.min_moment, -360.0 / 8.0, 1e-9 * 360);
    EXPECT_NEAR(e.min_moment_at, 6.0, 1e-12);
  }
}

// Every span of every bundled case, on every method: the product's span
// extremes (each method's own) against the dense scan above. The scan's
// own error is that of bisection to 1e-15 and of missing nothing between
// 240 divisions of a span for these smooth diagrams.
TEST(Library, EveryMethodsSpanExtremesMatchADenseScanOnEveryCase) {
  const std::vector<ReferenceCase> cases = load_cases();
  ASSERT_GE(cases.size(), 40u);
  std::size_t compared = 0;
  for (const ReferenceCase& c : cases) {
    ASSERT_TRUE(c.ok()) << c.id;
    const auto br = trivet::compare::check(c.beam, {});
    for (const auto& set : br.sets)
      for (const auto& m : set.methods) {
        if (m.status != trivet::MethodStatus::Ok || set.envelope) continue;
        ASSERT_EQ(m.extremes.size(), set.beam.spans.size());
        const double ms = set.scale[static_cast<int>(trivet::compare::Kind::Moment)];
        const double ds = set.scale[static_cast<int>(trivet::compare::Kind::Deflection)];
        for (std::size_t s = 0; s < set.beam.spans.size(); ++s) {
          const MethodExtremes d = span_extremes(m.solution, set, s);
          const auto& e = m.extremes[s];
          const std::string where = c.id + " " + m.name + " span " + std::to_string(s + 1);
          EXPECT_NEAR(e.max_moment, d.max_moment, 1e-9 * ms) << where;
          EXPECT_NEAR(e.min_moment, d.min_moment, 1e-9 * ms) << where;
          EXPECT_NEAR(std::abs(e.max_deflection), std::abs(d.max_deflection), 1e-9 * ds) << where;
          ++compared;
        }
      }
  }
  EXPECT_GE(compared, 100u);
}

}  // namespace
