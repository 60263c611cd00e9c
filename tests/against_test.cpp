// Tests of the comparison with another program's exported results.
#include "harness/compare/against.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <functional>
#include <sstream>

namespace trivet::compare::against {
namespace {

using input::format_number;

// Three spans, fixed at A, a point force inside span 2 (x = 8), udls on 1 and 3.
const char* kBeam = R"({
  "title": "three spans",
  "units": {"force": "kN", "length": "m"},
  "spans": [{"length": 5.0, "EI": 52000}, {"length": 6.5, "EI": 52000}, {"length": 4.0, "EI": 52000}],
  "supports": ["fixed", "roller", "roller", "pinned"],
  "loads": [{"type": "udl", "span": 1, "w": 8.0},
            {"type": "point", "span": 2, "P": 20.0, "at": 3.0},
            {"type": "udl", "span": 3, "w": 5.0}]
})";

constexpr double kTotal = 15.5;

class Against : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    file_ = new input::BeamFile(input::parse_beam_text(kBeam, "beam.json"));
    ASSERT_TRUE(file_->ok());
    result_ = new BeamResult(check(*file_, Options0()));
    ASSERT_EQ(result_->sets.size(), 1u);
    ASSERT_EQ(result_->sets[0].ok_count(), 3u);
  }
  static void TearDownTestSuite() {
    delete result_;
    delete file_;
  }
  static compare::Options Options0() { return {}; }

  static const LoadSet& set() { return result_->sets[0]; }

  struct StationRow {
    double x, shear, moment, deflection;
  };
  // The consensus at the shared station grid (left limit first at a jump).
  static std::vector<StationRow> truth() {
    std::vector<StationRow> v;
    for (const auto& s : set().consensus_stations) v.push_back({s.x, s.shear, s.moment, s.deflection});
    return v;
  }
  static std::string csv(const std::vector<StationRow>& rows, const std::string& eol = "\n",
                         const std::string& header = "x,shear,moment,deflection") {
    std::string s = header + eol;
    for (const auto& r : rows)
      s += format_number(r.x) + "," + format_number(r.shear) + "," + format_number(r.moment) + "," +
           format_number(r.deflection) + eol;
    return s;
  }
  static Comparison run(const std::string& text, const Options& o = {}) {
    return compare_text(*file_, *result_, text, "r.csv", o);
  }
  // The summary of a quantity; a failure (and an empty summary) if there is none.
  static const Summary* summary(const Comparison& c, Quantity q) {
    for (const auto& s : c.summary)
      if (s.quantity == q) return &s;
    ADD_FAILURE() << "no summary for " << quantity_name(q);
    static const Summary none;
    return &none;
  }
  static bool names(const Finding& f, Mistake m) {
    return std::find(f.mistakes.begin(), f.mistakes.end(), m) != f.mistakes.end();
  }
  static std::vector<std::string> messages(const Comparison& c) {
    std::vector<std::string> m;
    for (const auto& e : c.errors) m.push_back(e.format(c.file));
    return m;
  }
  static std::string only_error(const std::string& text, const Options& o = {}) {
    Comparison c = run(text, o);
    EXPECT_EQ(c.errors.size(), 1u) << ::testing::PrintToString(messages(c));
    return c.errors.empty() ? "" : c.errors.front().format(c.file);
  }

  static input::BeamFile* file_;
  static BeamResult* result_;
};

input::BeamFile* Against::file_ = nullptr;
BeamResult* Against::result_ = nullptr;

// ---------------------------------------------------------------------------
// CSV syntax.

TEST(Csv, QuotedFieldsCommasQuotesCrlfCommentsBlankLines) {
  const std::string text =
      "# exported\r\n"
      "\r\n"
      "name, \"a, b\" ,c\r\n"
      "  # a comment line\r\n"
      "\"say \"\"hi\"\"\",2,\"two\r\nlines\"\r\n"
      "   \r\n"
      "x , y,z";
  CsvRead r = parse_csv_text(text);
  ASSERT_TRUE(r.ok()) << r.errors.front().format("t.csv");
  EXPECT_EQ(r.table.header_line, 3u);
  EXPECT_EQ(r.table.header, (std::vector<std::string>{"name", "a, b", "c"}));
  ASSERT_EQ(r.table.rows.size(), 2u);
  EXPECT_EQ(r.table.rows[0].line, 5u);
  EXPECT_EQ(r.table.rows[0].fields, (std::vector<std::string>{"say \"hi\"", "2", "two\nlines"}));
  EXPECT_EQ(r.table.rows[1].line, 8u);
  EXPECT_EQ(r.table.rows[1].fields, (std::vector<std::string>{"x", "y", "z"}));
}

TEST(Csv, EmptyTrailingField) {
  CsvRead r = parse_csv_text("a,b\n1,\n");
  ASSERT_TRUE(r.ok());
  ASSERT_EQ(r.table.rows.size(), 1u);
  EXPECT_EQ(r.table.rows[0].fields, (std::vector<std::string>{"1", ""}));
}

std::string first_error(const std::string& text, const CsvLimits& l = {}) {
  CsvRead r = parse_csv_text(text, l);
  EXPECT_FALSE(r.ok());
  return r.errors.empty() ? "" : r.errors.front().format("t.csv");
}

TEST(Csv, Errors) {
  EXPECT_EQ(first_error("a,b\n1,\"open\n2,3\n"), "t.csv: line 2, column 2: a quoted field is not closed (it opens on this line)");
  EXPECT_EQ(first_error("a,b\n1,2\"3\n"),
            "t.csv: line 2, column 2: a quote inside an unquoted field (quote the whole field, and write a quote inside it twice)");
  EXPECT_EQ(first_error("a,b\n\"1\"x,2\n"),
            "t.csv: line 2, column 1: unexpected text after a closing quote (got 'x'; a quote inside a quoted field is written twice: \"\")");
  EXPECT_EQ(first_error("a,b,c\n1,2\n"), "t.csv: line 2: has 2 fields, the header has 3");
  EXPECT_EQ(first_error("a,,c\n1,2,3\n"), "t.csv: line 1, column 2: the header gives this column no name");
  EXPECT_EQ(first_error("# only a comment\n\n"), "t.csv: the file is empty (no header row)");
  EXPECT_EQ(first_error(std::string("a,b\n1,\0\n", 8)), "t.csv: line 2: the file holds a NUL byte: it is not a text (CSV) file");
  CsvLimits small;
  small.max_file_bytes = 10;
  EXPECT_EQ(first_error("x,moment\n1,2\n", small), "t.csv: the file is 13 bytes, over the limit of 10 bytes");
}

TEST(Csv, KeepsGoingAfterABadLineAndCapsTheList) {
  CsvLimits l;
  l.max_errors = 2;
  CsvRead r = parse_csv_text("a,b\n1\n2\n3\n4,5\n", l);
  ASSERT_EQ(r.errors.size(), 2u);
  EXPECT_EQ(r.errors[1].format("t.csv"), "t.csv: line 3: has 1 field, the header has 2 (and 1 more errors)");
}

TEST(Csv, FileTooLargeAndMissingFile) {
  const auto path = std::filesystem::temp_directory_path() / "trivet_against_big.csv";
  {
    std::ofstream f(path, std::ios::binary);
    f << "x,moment\n1,2\n";
  }
  CsvLimits l;
  l.max_file_bytes = 5;
  CsvRead r = read_csv_file(path.string(), l);
  ASSERT_EQ(r.errors.size(), 1u);
  EXPECT_EQ(r.errors[0].format("big.csv"), "big.csv: the file is 13 bytes, over the limit of 5 bytes");
  CsvRead ok = read_csv_file(path.string());
  EXPECT_TRUE(ok.ok());
  EXPECT_EQ(ok.table.rows.size(), 1u);
  std::filesystem::remove(path);
  CsvRead none = read_csv_file((std::filesystem::temp_directory_path() / "trivet_no_such_file.csv").string());
  ASSERT_EQ(none.errors.size(), 1u);
  EXPECT_EQ(none.errors[0].format("n.csv"), "n.csv: cannot open the file (No such file or directory)");
}

// ---------------------------------------------------------------------------
// Options.

TEST(AgainstOptions, SetOption) {
  Options o;
  EXPECT_EQ(set_option(o, "column", "moment=Mz, x=Dist"), "");
  EXPECT_EQ(o.columns.at("moment"), "Mz");
  EXPECT_EQ(o.columns.at("x"), "Dist");
  EXPECT_EQ(set_option(o, "units", "force=N,length=mm"), "");
  EXPECT_EQ(o.force_unit, "N");
  EXPECT_EQ(o.length_unit, "mm");
  EXPECT_EQ(set_option(o, "moment-sign", "hogging-positive"), "");
  EXPECT_EQ(o.moment_sign, MomentSign::HoggingPositive);
  EXPECT_EQ(set_option(o, "deflection-sign", "up-positive"), "");
  EXPECT_EQ(o.deflection_sign, DeflectionSign::UpPositive);
  EXPECT_EQ(set_option(o, "shear-sign", "opposite"), "");
  EXPECT_EQ(o.shear_sign, ShearSign::Opposite);
  EXPECT_EQ(set_option(o, "reaction-sign", "down-positive"), "");
  EXPECT_EQ(o.reaction_sign, ReactionSign::DownPositive);
  EXPECT_EQ(set_option(o, "tolerance", "0.5%"), "");
  ASSERT_TRUE(o.tolerance);
  EXPECT_TRUE(o.tolerance->relative);
  EXPECT_NEAR(o.tolerance->value, 0.005, 1e-15);
  EXPECT_EQ(set_option(o, "moment-sign", "upside"),
            "the moment sign must be sagging-positive or hogging-positive (got \"upside\")");
  EXPECT_EQ(set_option(o, "force-unit", "Nm"), "the force unit must be N, kN, MN, lbf or kip (got \"Nm\")");
  EXPECT_EQ(set_option(o, "column", "momnet=Mz"),
            "no column of ours is called \"momnet\" (did you mean \"moment\"?); ours are x, span, x_local, shear, "
            "moment, deflection, support, force, reaction_moment");
  EXPECT_EQ(set_option(o, "column", "Mz"), "a column mapping is ours=theirs, e.g. moment=Mz (got \"Mz\")");
  EXPECT_EQ(set_option(o, "units", "N"), "units are given as force=UNIT,length=UNIT, e.g. force=N,length=mm (got \"N\")");
  EXPECT_EQ(set_option(o, "colour", "red"), "no option \"colour\"");
}

TEST(AgainstOptions, UnitsFactorsHaveNoRepeatsAndIncludeTheListed) {
  const auto& f = units_factors();
  for (std::size_t a = 0; a < f.size(); ++a) {
    EXPECT_GT(std::abs(f[a].factor - 1.0), 1e-6);
    for (std::size_t b = a + 1; b < f.size(); ++b)
      EXPECT_GT(std::abs(f[a].factor - f[b].factor), 1e-9 * std::abs(f[a].factor)) << f[a].words << " / " << f[b].words;
  }
  for (double want : {1e3, 1e-3, 1e6, 1e9, 12.0, 144.0, 1728.0, 4.4482216152605, 0.3048, 0.0254, 25.4, 304.8,
                      1.0 / 304.8, 4.4482216152605 * 0.3048, 1e3 * 4.4482216152605}) {
    bool found = false;
    for (const auto& u : f) found = found || std::abs(u.factor - want) <= 1e-9 * want;
    EXPECT_TRUE(found) << want;
  }
}

// ---------------------------------------------------------------------------
// The correct file, and each usual mistake.

TEST_F(Against, CorrectFilePasses) {
  const auto rows = truth();
  Comparison c = run(csv(rows));
  ASSERT_TRUE(c.ok()) << ::testing::PrintToString(messages(c));
  EXPECT_EQ(c.kind, TableKind::Stations);
  EXPECT_TRUE(c.holds());
  EXPECT_EQ(c.failing(), 0u);
  ASSERT_EQ(c.summary.size(), 3u);
  for (const auto& s : c.summary) {
    EXPECT_EQ(s.compared, rows.size());
    EXPECT_EQ(s.failing, 0u);
    EXPECT_FALSE(s.finding);
    EXPECT_LE(std::abs(s.worst_difference), 1e-9 * std::max(1.0, s.tolerance));
  }
  ASSERT_EQ(c.rows.size(), rows.size());
  EXPECT_EQ(c.rows[0].where, "x = 0 m");
  EXPECT_EQ(c.rows[0].line, 2u);
}

TEST_F(Against, CorrectFileWithCrlfAndQuotedMappedHeaders) {
  Options o;
  ASSERT_EQ(set_option(o, "column", "moment=M (kN*m)"), "");
  o.columns["x"] = "Dist, m";
  std::string text = csv(truth(), "\r\n", "\"Dist, m\",shear,\"M (kN*m)\",deflection");
  Comparison c = run("# from another program\r\n" + text, o);
  ASSERT_TRUE(c.ok()) << ::testing::PrintToString(messages(c));
  EXPECT_TRUE(c.holds());
  EXPECT_EQ(c.rows[0].line, 3u);
}

TEST_F(Against, MomentsSignFlippedIsFoundAsHogging) {
  auto rows = truth();
  for (auto& r : rows) r.moment = -r.moment;
  Comparison c = run(csv(rows));
  ASSERT_TRUE(c.ok());
  EXPECT_FALSE(c.holds());
  const Summary* m = summary(c, Quantity::Moment);
  EXPECT_GT(m->failing, 0u);
  ASSERT_TRUE(m->finding);
  EXPECT_EQ(m->finding->mistakes, std::vector<Mistake>{Mistake::OppositeSign});
  EXPECT_EQ(m->finding->text, "the moments match to within 0.001% of the largest moment if read as hogging-positive");
  EXPECT_EQ(summary(c, Quantity::Shear)->failing, 0u);
  EXPECT_EQ(summary(c, Quantity::Deflection)->failing, 0u);
  // Declared as hogging-positive, the same file passes.
  Options o;
  o.moment_sign = MomentSign::HoggingPositive;
  EXPECT_TRUE(run(csv(rows), o).holds());
}

TEST_F(Against, DeflectionAndShearSignFlips) {
  auto rows = truth();
  for (auto& r : rows) { r.deflection = -r.deflection; r.shear = -r.shear; }
  Comparison c = run(csv(rows));
  ASSERT_TRUE(c.ok());
  const Summary* d = summary(c, Quantity::Deflection);
  ASSERT_TRUE(d->finding);
  EXPECT_EQ(d->finding->text, "the deflections match to within 0.001% of the largest deflection if read as up-positive");
  const Summary* v = summary(c, Quantity::Shear);
  ASSERT_TRUE(v->finding);
  EXPECT_EQ(v->finding->mistakes, std::vector<Mistake>{Mistake::OppositeSign});
  EXPECT_EQ(v->finding->text,
            "the shears match to within 0.001% of the largest shear if read with the opposite shear sign (V = -dM/dx)");
}

TEST_F(Against, MomentsTimes1000IsAUnitsFactor) {
  auto rows = truth();
  for (auto& r : rows) r.moment *= 1000;
  Comparison c = run(csv(rows));
  ASSERT_TRUE(c.ok());
  EXPECT_FALSE(c.holds());
  const Summary* m = summary(c, Quantity::Moment);
  ASSERT_TRUE(m->finding);
  EXPECT_EQ(m->finding->mistakes, std::vector<Mistake>{Mistake::UnitsFactor});
  EXPECT_NEAR(m->finding->factor, 1000.0, 1e-9);
  EXPECT_EQ(m->finding->text,
            "the moments match to within 0.001% of the largest moment if divided by 1000 (between N and kN, or mm "
            "and m, or kN and MN)");
}

TEST_F(Against, SignAndUnitsTogetherAreOneFinding) {
  auto rows = truth();
  for (auto& r : rows) r.moment *= -1000;
  Comparison c = run(csv(rows));
  const Summary* m = summary(c, Quantity::Moment);
  ASSERT_TRUE(m->finding);
  EXPECT_EQ(m->finding->mistakes, (std::vector<Mistake>{Mistake::OppositeSign, Mistake::UnitsFactor}));
  EXPECT_EQ(m->finding->text,
            "the moments match to within 0.001% of the largest moment if read as hogging-positive and divided by "
            "1000 (between N and kN, or mm and m, or kN and MN)");
}

TEST_F(Against, GarbageHasNoFinding) {
  auto rows = truth();
  for (std::size_t i = 0; i < rows.size(); ++i) rows[i].moment = (i % 2 ? 1.0 : -1.0) * 10.0 + 0.37 * static_cast<double>(i);
  Comparison c = run(csv(rows));
  const Summary* m = summary(c, Quantity::Moment);
  EXPECT_GT(m->failing, 0u);
  EXPECT_FALSE(m->finding);
  EXPECT_EQ(m->note, "no usual mistake (opposite sign, a units factor, the beam read right to left, local x taken "
                     "as global) makes every row hold");
}

TEST_F(Against, MomentsInKipFeetDeclaredAsKilonewtonMetres) {
  auto rows = truth();
  const double kip_ft = 4448.2216152605 * 0.3048 / 1000.0;  // kN*m per kip*ft
  for (auto& r : rows) r.moment /= kip_ft;
  Comparison c = run(csv(rows));
  const Summary* m = summary(c, Quantity::Moment);
  ASSERT_TRUE(m->finding);
  EXPECT_EQ(m->finding->mistakes, std::vector<Mistake>{Mistake::UnitsFactor});
  EXPECT_NEAR(m->finding->factor, 1.0 / kip_ft, 1e-9);
}

TEST_F(Against, RightToLeftIsFound) {
  auto rows = truth();
  std::vector<StationRow> mirrored;
  for (auto it = rows.rbegin(); it != rows.rend(); ++it)
    mirrored.push_back({kTotal - it->x, -it->shear, it->moment, it->deflection});
  Comparison c = run(csv(mirrored));
  ASSERT_TRUE(c.ok()) << ::testing::PrintToString(messages(c));
  EXPECT_FALSE(c.holds());
  for (Quantity q : {Quantity::Shear, Quantity::Moment, Quantity::Deflection}) {
    const Summary* s = summary(c, q);
    ASSERT_GT(s->failing, 0u) << quantity_name(q);
    ASSERT_TRUE(s->finding) << quantity_name(q);
    EXPECT_EQ(s->finding->mistakes, std::vector<Mistake>{Mistake::RightToLeft}) << quantity_name(q);
  }
  EXPECT_EQ(summary(c, Quantity::Moment)->finding->text,
            "the moments match to within 0.001% of the largest moment if the beam is taken as read right to left "
            "(x -> L - x, shear sign reversed)");
}

TEST_F(Against, LocalXTakenAsGlobalIsFound) {
  std::vector<StationRow> rows;
  const auto& st = set().stations;
  const auto& cs = set().consensus_stations;
  for (std::size_t i = 0; i < st.size(); ++i) rows.push_back({st[i].local, cs[i].shear, cs[i].moment, cs[i].deflection});
  Comparison c = run(csv(rows));
  ASSERT_TRUE(c.ok()) << ::testing::PrintToString(messages(c));
  EXPECT_FALSE(c.holds());
  const Summary* m = summary(c, Quantity::Moment);
  ASSERT_GT(m->failing, 0u);
  ASSERT_TRUE(m->finding);
  EXPECT_EQ(m->finding->mistakes, std::vector<Mistake>{Mistake::LocalAsGlobal});
  EXPECT_EQ(m->finding->text,
            "the moments match to within 0.001% of the largest moment if x is taken as the position within each "
            "span (x_local, a new span where x falls back)");
}

TEST_F(Against, SpanAndLocalColumnsPass) {
  const auto& st = set().stations;
  const auto& cs = set().consensus_stations;
  std::string text = "span,x_local,moment,shear\n";
  for (std::size_t i = 0; i < st.size(); ++i)
    text += std::to_string(st[i].span + 1) + "," + format_number(st[i].local) + "," + format_number(cs[i].moment) +
            "," + format_number(cs[i].shear) + "\n";
  Comparison c = run(text);
  ASSERT_TRUE(c.ok()) << ::testing::PrintToString(messages(c));
  EXPECT_TRUE(c.holds());
  EXPECT_EQ(c.rows[1].where, "span 1, x_local = 0.5 m");
}

TEST_F(Against, TheirUnitsNewtonsAndMillimetres) {
  std::string text = "x,shear,moment,deflection\n";
  for (const auto& r : truth())
    text += format_number(r.x * 1000) + "," + format_number(r.shear * 1000) + "," + format_number(r.moment * 1e6) + "," +
            format_number(r.deflection * 1000) + "\n";
  Options o;
  ASSERT_EQ(set_option(o, "units", "force=N,length=mm"), "");
  Comparison c = run(text, o);
  ASSERT_TRUE(c.ok()) << ::testing::PrintToString(messages(c));
  EXPECT_TRUE(c.holds());
  EXPECT_EQ(c.rows.back().where, "x = 15500 mm");
  // Values are reported in the beam file's units.
  const Cell& last = c.rows[5].cells[1];
  EXPECT_NEAR(last.theirs, truth()[5].moment, 1e-9 * std::abs(truth()[5].moment) + 1e-12);
  EXPECT_NEAR(last.raw, truth()[5].moment * 1e6, 1e-6 * std::abs(last.raw) + 1e-9);
  // Read as kN and m, x is outside the beam, and the message says why.
  Comparison m = run(text);
  ASSERT_FALSE(m.ok());
  EXPECT_EQ(m.errors[0].format("r.csv"),
            "r.csv: line 3, column 1 (x): x = 500 m is outside the beam (0 to 15.5 m); the positions would fit the "
            "beam in mm");
}

// ---------------------------------------------------------------------------
// Tolerance and the two sides of a jump.

TEST_F(Against, JustInsideAndJustOutsideTheTolerance) {
  const double tol = 0.01 * set().scale[static_cast<int>(Kind::Moment)];
  ASSERT_GT(tol, 0);
  const std::size_t k = 7;  // x = 3.5 in span 1
  auto rows = truth();
  ASSERT_LT(rows[k].x, 5.0);
  auto inside = rows;
  inside[k].moment += 0.99 * tol;
  Comparison a = run(csv(inside));
  ASSERT_TRUE(a.ok());
  EXPECT_TRUE(a.holds());
  EXPECT_NEAR(a.rows[k].cells[1].difference, 0.99 * tol, 1e-9 * tol);
  EXPECT_NEAR(a.rows[k].cells[1].tolerance, tol, 1e-12 * tol);
  auto outside = rows;
  outside[k].moment += 1.01 * tol;
  Comparison b = run(csv(outside));
  ASSERT_TRUE(b.ok());
  EXPECT_FALSE(b.holds());
  const Summary* m = summary(b, Quantity::Moment);
  EXPECT_EQ(m->failing, 1u);
  EXPECT_EQ(m->worst_line, k + 2);
  EXPECT_EQ(m->worst_where, "x = " + format_number(rows[k].x) + " m");
  EXPECT_NEAR(m->worst_difference, 1.01 * tol, 1e-9 * tol);
  EXPECT_FALSE(m->finding);  // one row off: no usual mistake explains it
  EXPECT_FALSE(m->note.empty());
  EXPECT_FALSE(b.rows[k].cells[1].holds);
  // An absolute tolerance.
  Options o;
  o.tolerance = input::Tolerance{false, 2.0 * tol};
  EXPECT_TRUE(run(csv(outside), o).holds());
}

TEST_F(Against, AJumpMatchesEitherSideAndSaysWhich) {
  // The point force at x = 8: the shear jumps by 20.
  const auto& st = set().stations;
  const auto& cs = set().consensus_stations;
  std::size_t left = st.size();
  for (std::size_t i = 0; i + 1 < st.size(); ++i)
    if (std::abs(st[i].x - 8.0) < 1e-12 && !st[i].after && st[i + 1].after) left = i;
  ASSERT_LT(left, st.size());
  const double vl = cs[left].shear, vr = cs[left + 1].shear;
  ASSERT_NEAR(vl - vr, 20.0, 1e-6);
  auto one = [&](double v) { return run("x,shear\n8," + format_number(v) + "\n"); };
  Comparison a = one(vr);
  ASSERT_TRUE(a.ok());
  EXPECT_TRUE(a.holds());
  EXPECT_EQ(a.rows[0].cells[0].side, Side::Right);
  EXPECT_FALSE(a.rows[0].cells[0].side_from_pair);
  Comparison b = one(vl);
  EXPECT_TRUE(b.holds());
  EXPECT_EQ(b.rows[0].cells[0].side, Side::Left);
  EXPECT_FALSE(one(0.5 * (vl + vr)).holds());
  // Given twice in a row, the first is the left limit and the second the right:
  // swapped, both fail.
  Comparison p = run("x,shear\n8," + format_number(vl) + "\n8," + format_number(vr) + "\n");
  EXPECT_TRUE(p.holds());
  EXPECT_EQ(p.rows[0].cells[0].side, Side::Left);
  EXPECT_TRUE(p.rows[0].cells[0].side_from_pair);
  EXPECT_EQ(p.rows[1].cells[0].side, Side::Right);
  Comparison s = run("x,shear\n8," + format_number(vr) + "\n8," + format_number(vl) + "\n");
  EXPECT_EQ(s.failing(), 2u);
  // At an interior support the shear jumps by the reaction.
  std::size_t end1 = st.size();
  for (std::size_t i = 0; i + 1 < st.size(); ++i)
    if (st[i].span == 0 && st[i + 1].span == 1) end1 = i;
  ASSERT_LT(end1, st.size());
  const double jump = cs[end1 + 1].shear - cs[end1].shear;
  EXPECT_NEAR(jump, set().consensus_nodes[1].reaction_force, 1e-6);
  Comparison n = run("x,shear\n5," + format_number(cs[end1 + 1].shear) + "\n");
  EXPECT_TRUE(n.holds());
  EXPECT_EQ(n.rows[0].cells[0].side, Side::Right);
  // A span end given by span and x_local has one side only.
  Comparison e = run("span,x_local,shear\n1,5," + format_number(cs[end1 + 1].shear) + "\n");
  EXPECT_FALSE(e.holds());
}

// ---------------------------------------------------------------------------
// Reactions.

TEST_F(Against, ReactionsPassAndShiftedLabelsAreFound) {
  const auto& nodes = set().consensus_nodes;
  ASSERT_EQ(nodes.size(), 4u);
  std::string good = "support,force,moment\n";
  const char* labels[] = {"A", "B", "C", "D"};
  for (std::size_t k = 0; k < 4; ++k)
    good += std::string(labels[k]) + "," + format_number(nodes[k].reaction_force) + "," +
            (k == 0 ? format_number(nodes[k].reaction_moment) : std::string()) + "\n";
  Comparison a = run(good);
  ASSERT_TRUE(a.ok()) << ::testing::PrintToString(messages(a));
  EXPECT_EQ(a.kind, TableKind::Reactions);
  EXPECT_TRUE(a.holds());
  ASSERT_EQ(a.summary.size(), 2u);
  EXPECT_EQ(summary(a, Quantity::ReactionForce)->compared, 4u);
  EXPECT_EQ(summary(a, Quantity::ReactionMoment)->compared, 1u);  // empty cells are not compared
  EXPECT_GT(std::abs(nodes[0].reaction_moment), 1.0);

  // Numbered from 0: every label one behind.
  std::string zero = "support,force\n";
  for (std::size_t k = 0; k < 4; ++k) zero += std::to_string(k) + "," + format_number(nodes[k].reaction_force) + "\n";
  Comparison b = run(zero);
  ASSERT_TRUE(b.ok()) << ::testing::PrintToString(messages(b));
  EXPECT_FALSE(b.holds());
  const Summary* r = summary(b, Quantity::ReactionForce);
  ASSERT_TRUE(r->finding);
  EXPECT_EQ(r->finding->mistakes, std::vector<Mistake>{Mistake::SupportShift});
  EXPECT_EQ(r->finding->shift, 1);
  EXPECT_EQ(r->finding->text,
            "the reactions match to within 0.001% of the largest reaction if each support is taken as the next node "
            "(labels one behind, as when nodes are counted from 0)");
  EXPECT_EQ(b.rows[0].cells[0].reason, "no node 0 in the beam");

  // Letters one ahead (B..D carry A..C): shift -1 on the rows given.
  std::string ahead = "support,force\n";
  for (std::size_t k = 0; k < 3; ++k) ahead += std::string(labels[k + 1]) + "," + format_number(nodes[k].reaction_force) + "\n";
  Comparison c = run(ahead);
  ASSERT_TRUE(c.ok());
  const Summary* rc = summary(c, Quantity::ReactionForce);
  ASSERT_TRUE(rc->finding);
  EXPECT_EQ(rc->finding->shift, -1);
  // All four, B..E: E, the letter after the beam's last, is a node beyond
  // the end (not an unreadable row), so the shift is found on every row.
  std::string all_ahead = "support,force\n";
  for (std::size_t k = 0; k < 4; ++k)
    all_ahead += std::string(1, static_cast<char>('B' + k)) + "," + format_number(nodes[k].reaction_force) + "\n";
  Comparison e = run(all_ahead);
  ASSERT_TRUE(e.ok()) << ::testing::PrintToString(messages(e));
  EXPECT_FALSE(e.holds());
  const Summary* re = summary(e, Quantity::ReactionForce);
  ASSERT_TRUE(re->finding);
  EXPECT_EQ(re->finding->shift, -1);
  EXPECT_EQ(re->compared, 4u);

  // Down-positive reactions.
  std::string down = "support,force\n";
  for (std::size_t k = 0; k < 4; ++k) down += std::string(labels[k]) + "," + format_number(-nodes[k].reaction_force) + "\n";
  Comparison d = run(down);
  const Summary* rd = summary(d, Quantity::ReactionForce);
  ASSERT_TRUE(rd->finding);
  EXPECT_EQ(rd->finding->text, "the reactions match to within 0.001% of the largest reaction if read as down-positive");
  Options o;
  o.reaction_sign = ReactionSign::DownPositive;
  EXPECT_TRUE(run(down, o).holds());
}

TEST_F(Against, OneSetOfOptionsServesStationsAndReactions) {
  Options o;
  ASSERT_EQ(set_option(o, "column", "moment=Mz,x=Dist"), "");
  const auto& nodes = set().consensus_nodes;
  // The reaction file has "moment", not "Mz": the station mapping is not used there.
  const std::string reactions = "support,force,moment\nA," + format_number(nodes[0].reaction_force) + "," +
                                format_number(nodes[0].reaction_moment) + "\n";
  Comparison r = run(reactions, o);
  ASSERT_TRUE(r.ok()) << ::testing::PrintToString(messages(r));
  EXPECT_TRUE(r.holds());
  EXPECT_EQ(summary(r, Quantity::ReactionMoment)->compared, 1u);
  // Its own mapping, and a wrong couple there fails.
  ASSERT_EQ(set_option(o, "column", "reaction_moment=Mr"), "");
  Comparison w = run("support,Mr\nA," + format_number(nodes[0].reaction_moment + 5.0) + "\n", o);
  ASSERT_TRUE(w.ok()) << ::testing::PrintToString(messages(w));
  EXPECT_EQ(w.failing(), 1u);
  // The station file uses Dist and Mz.
  std::string text = "Dist,Mz\n";
  for (const auto& row : truth()) text += format_number(row.x) + "," + format_number(row.moment) + "\n";
  EXPECT_TRUE(run(text, o).holds());
}

TEST_F(Against, NumbersAreStrict) {
  EXPECT_EQ(only_error("x,moment\n1,+-2\n"), "r.csv: line 2, column 2 (moment): not a number (got \"+-2\")");
  EXPECT_EQ(only_error("x,moment\n1,0x10\n"), "r.csv: line 2, column 2 (moment): not a number (got \"0x10\")");
  EXPECT_EQ(only_error("x,moment\n1,\"1,5\"\n"), "r.csv: line 2, column 2 (moment): not a number (got \"1,5\")");
  Comparison c = run("x,moment\n+1.5e0," + format_number(set().consensus_stations[3].moment) + "\n");
  ASSERT_TRUE(c.ok());
  EXPECT_TRUE(c.holds());
}

// ---------------------------------------------------------------------------
// Errors, each with its line and column.

TEST_F(Against, Errors) {
  EXPECT_EQ(only_error("x,moment\n1,1.2.3\n"), "r.csv: line 2, column 2 (moment): not a number (got \"1.2.3\")");
  EXPECT_EQ(only_error("x,moment\n1,abc\n"), "r.csv: line 2, column 2 (moment): not a number (got \"abc\")");
  EXPECT_EQ(only_error("x,moment\n1,nan\n"), "r.csv: line 2, column 2 (moment): not a number (got \"nan\")");
  EXPECT_EQ(only_error("x,moment\n1,1\n18,2\n"),
            "r.csv: line 3, column 1 (x): x = 18 m is outside the beam (0 to 15.5 m)");
  EXPECT_EQ(only_error("x,moment\n-0.5,2\n"), "r.csv: line 2, column 1 (x): x = -0.5 m is outside the beam (0 to 15.5 m)");
  EXPECT_EQ(only_error("x,moment\n,2\n"), "r.csv: line 2, column 1 (x): the cell is empty");
  EXPECT_EQ(only_error("span,x_local,moment\n4,1,2\n"),
            "r.csv: line 2, column 1 (span): span 4 does not exist (the beam has 3 spans)");
  EXPECT_EQ(only_error("span,x_local,moment\n1.5,1,2\n"),
            "r.csv: line 2, column 1 (span): a span number is a whole number from 1 to 3 (got 1.5)");
  EXPECT_EQ(only_error("span,x_local,moment\n2,7,2\n"),
            "r.csv: line 2, column 2 (x_local): x_local = 7 m is outside span 2 (0 to 6.5 m)");
  EXPECT_EQ(only_error("span,moment\n2,2\n"),
            "r.csv: line 1, column 1 (span): a \"span\" column needs an \"x_local\" column beside it");
  EXPECT_EQ(only_error("x,rotation\n2,2\n"),
            "r.csv: line 1: no column to compare: a station file needs at least one of \"shear\", \"moment\" or "
            "\"deflection\"");
  EXPECT_EQ(only_error("pos,moment\n2,2\n"),
            "r.csv: line 1: cannot tell what the file holds: the header has no \"x\" or \"span\" column (stations) "
            "and no \"support\" column (reactions); the columns are \"pos\", \"moment\": name yours with --column, "
            "e.g. --column x=pos");
  EXPECT_EQ(only_error("support,force\nQ,2\n"),
            "r.csv: line 2, column 1 (support): no node \"Q\" in the beam (nodes A to D, or numbers 1 to 4)");
  EXPECT_EQ(only_error("support,force\n9,2\n"),
            "r.csv: line 2, column 1 (support): no node 9 in the beam (nodes 1 to 4, A to D)");
  EXPECT_EQ(only_error("x,moment,X\n1,2,3\n"), "r.csv: line 1, column 3 (X): the column name appears twice (columns 1 and 3)");
  EXPECT_EQ(only_error("x,moment\n"), "r.csv: line 1: the file has a header but no rows");
  EXPECT_EQ(only_error("\n# header next\nx,moment\n1,2,3\n"), "r.csv: line 4: has 3 fields, the header has 2");
  Options o;
  o.columns["moment"] = "Mz";
  EXPECT_EQ(only_error("x,M\n1,2\n", o), "r.csv: line 1: no column \"Mz\" (given for moment); the header has x, M");
  Options c;
  c.load_case = "wind";
  EXPECT_EQ(only_error("x,moment\n1,2\n", c), "r.csv: the beam has no load case \"wind\" (it has loads)");
}

TEST_F(Against, CompareFileReadsFromDisk) {
  const auto path = std::filesystem::temp_directory_path() / "trivet_against_ok.csv";
  {
    std::ofstream f(path, std::ios::binary);
    f << csv(truth(), "\r\n");
  }
  Comparison c = compare_file(*file_, *result_, path.string(), {}, "ok.csv");
  std::filesystem::remove(path);
  ASSERT_TRUE(c.ok()) << ::testing::PrintToString(messages(c));
  EXPECT_EQ(c.file, "ok.csv");
  EXPECT_TRUE(c.holds());
}

// ---------------------------------------------------------------------------
// Envelopes of a combination with a pattern: moment_max ... reaction_min.

// Three bays, dead and live on every span, a dead point force inside span 2
// (so shear jumps there), a service combination and a patterned one.
const char* kEnvelopeBeam = R"({
  "title": "office floor",
  "units": {"force": "kN", "length": "m"},
  "spans": [{"length": 7.5, "EI": 64000}, {"length": 7.5, "EI": 64000}, {"length": 7.5, "EI": 64000}],
  "supports": ["pinned", "roller", "roller", "roller"],
  "loads": [{"type": "udl", "span": 1, "w": 14.0, "case": "dead"},
            {"type": "udl", "span": 2, "w": 14.0, "case": "dead"},
            {"type": "udl", "span": 3, "w": 14.0, "case": "dead"},
            {"type": "point", "span": 2, "P": 30.0, "at": 2.5, "case": "dead"},
            {"type": "udl", "span": 1, "w": 9.0, "case": "live"},
            {"type": "udl", "span": 2, "w": 9.0, "case": "live"},
            {"type": "udl", "span": 3, "w": 9.0, "case": "live"}],
  "combinations": [
    {"name": "service", "factors": {"dead": 1.0, "live": 1.0}},
    {"name": "strength-A", "factors": {"dead": 1.2, "live": 1.6}, "pattern": ["live"]}
  ]
})";

class AgainstEnvelope : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    file_ = new input::BeamFile(input::parse_beam_text(kEnvelopeBeam, "beam.json"));
    ASSERT_TRUE(file_->ok());
    result_ = new BeamResult(check(*file_, compare::Options{}));
  }
  static void TearDownTestSuite() {
    delete result_;
    delete file_;
  }
  static const LoadSet& env() {
    for (const auto& s : result_->sets)
      if (s.name == "strength-A") return s;
    ADD_FAILURE() << "no load set strength-A";
    return result_->sets.front();
  }
  static Options on(const std::string& name) {
    Options o;
    o.load_case = name;
    return o;
  }
  static Comparison run(const std::string& text, const Options& o) {
    return compare_text(*file_, *result_, text, "r.csv", o);
  }
  static std::vector<std::string> messages(const Comparison& c) {
    std::vector<std::string> m;
    for (const auto& e : c.errors) m.push_back(e.format(c.file));
    return m;
  }
  static std::string only_error(const std::string& text, const Options& o) {
    Comparison c = run(text, o);
    EXPECT_EQ(c.errors.size(), 1u) << ::testing::PrintToString(messages(c));
    return c.errors.empty() ? "" : c.errors.front().format(c.file);
  }
  static const Summary* summary(const Comparison& c, Quantity q) {
    for (const auto& s : c.summary)
      if (s.quantity == q) return &s;
    ADD_FAILURE() << "no summary for " << quantity_name(q);
    static const Summary none;
    return &none;
  }
  // moment_max, moment_min (and shear_max, shear_min) at every station, from
  // the consensus envelope; `sign` -1 writes hogging-positive moments (max
  // and min swapped); `bump` is added to moment_max at row `bump_row`.
  static std::string stations_csv(bool with_shear, double sign = 1, std::size_t bump_row = 0, double bump = 0) {
    const LoadSet& s = env();
    std::string t = with_shear ? "x,moment_max,moment_min,shear_max,shear_min\n" : "x,moment_max,moment_min\n";
    for (std::size_t i = 0; i < s.stations.size(); ++i) {
      const Bound& m = s.consensus_envelope.moment[i];
      const double mmax = sign > 0 ? m.max : -m.min;
      const double mmin = sign > 0 ? m.min : -m.max;
      t += format_number(s.stations[i].x) + "," + format_number(mmax + (i + 2 == bump_row ? bump : 0.0)) + "," +
           format_number(mmin);
      if (with_shear)
        t += "," + format_number(s.consensus_envelope.shear[i].max) + "," + format_number(s.consensus_envelope.shear[i].min);
      t += "\n";
    }
    return t;
  }

  static input::BeamFile* file_;
  static BeamResult* result_;
};

input::BeamFile* AgainstEnvelope::file_ = nullptr;
BeamResult* AgainstEnvelope::result_ = nullptr;

TEST_F(AgainstEnvelope, TheLoadSetIsAnEnvelope) {
  const LoadSet& s = env();
  ASSERT_TRUE(s.envelope);
  ASSERT_EQ(s.ok_count(), 3u);
  ASSERT_EQ(s.consensus_envelope.moment.size(), s.stations.size());
  ASSERT_GT(s.scale[static_cast<std::size_t>(Kind::Moment)], 0.0);
  // Patterned live load: the envelope is wider than the one arrangement.
  double widest = 0;
  for (const auto& b : s.consensus_envelope.moment) widest = std::max(widest, b.max - b.min);
  EXPECT_GT(widest, 1.0);
}

TEST_F(AgainstEnvelope, StationEnvelopeHolds) {
  Comparison c = run(stations_csv(true), on("strength-A"));
  ASSERT_TRUE(c.ok()) << ::testing::PrintToString(messages(c));
  EXPECT_EQ(c.kind, TableKind::Stations);
  EXPECT_EQ(c.load_case, "strength-A");
  EXPECT_TRUE(c.holds()) << c.failing() << " failing";
  const std::size_t n = env().stations.size();
  for (Quantity q : {Quantity::MomentMax, Quantity::MomentMin, Quantity::ShearMax, Quantity::ShearMin}) {
    EXPECT_EQ(summary(c, q)->compared, n) << quantity_name(q);
    EXPECT_EQ(summary(c, q)->failing, 0u) << quantity_name(q);
  }
  // The tolerance is the claims' (1%) of the envelope's largest moment.
  EXPECT_NEAR(summary(c, Quantity::MomentMax)->tolerance, 0.01 * env().scale[static_cast<std::size_t>(Kind::Moment)],
              1e-9);
  // The point force makes shear jump at x = 10: both limits are compared, left first.
  std::size_t jumps = 0;
  for (const auto& r : c.rows)
    for (const auto& cell : r.cells)
      if (cell.quantity == Quantity::ShearMax && cell.side_from_pair) ++jumps;
  EXPECT_GE(jumps, 2u);
}

TEST_F(AgainstEnvelope, OneValueBeyondTheToleranceFailsAtItsRow) {
  const double tol = 0.01 * env().scale[static_cast<std::size_t>(Kind::Moment)];
  const std::size_t line = 6;  // the fifth station
  Comparison c = run(stations_csv(false, 1, line, 3 * tol), on("strength-A"));
  ASSERT_TRUE(c.ok()) << ::testing::PrintToString(messages(c));
  EXPECT_FALSE(c.holds());
  EXPECT_EQ(c.failing(), 1u);
  for (const auto& r : c.rows)
    for (const auto& cell : r.cells) {
      if (cell.holds) continue;
      EXPECT_EQ(r.line, line);
      EXPECT_EQ(cell.quantity, Quantity::MomentMax);
      EXPECT_NEAR(cell.difference, 3 * tol, 1e-6 * tol);
    }
  EXPECT_EQ(summary(c, Quantity::MomentMax)->failing, 1u);
  EXPECT_EQ(summary(c, Quantity::MomentMax)->worst_line, line);
  EXPECT_EQ(summary(c, Quantity::MomentMin)->failing, 0u);
  // Just inside the tolerance holds.
  EXPECT_TRUE(run(stations_csv(false, 1, line, 0.9 * tol), on("strength-A")).holds());
}

TEST_F(AgainstEnvelope, ValuesBetweenStationsComeFromTheMethods) {
  // Midway between stations the consensus envelope has no entry: the value
  // comes from the methods' envelopes, and lies near its neighbours'.
  const LoadSet& s = env();
  const double x = 0.5 * (s.stations[1].x + s.stations[2].x);
  const auto& a = s.consensus_envelope.moment[1];
  const auto& b = s.consensus_envelope.moment[2];
  // Their mean is a fair estimate; the envelope curve is not a straight line,
  // so the mean is not exact, but a value far away must fail.
  const double mid = 0.5 * (a.max + b.max);
  const double tol = 0.01 * s.scale[static_cast<std::size_t>(Kind::Moment)];
  Comparison far = run("x,moment_max\n" + format_number(x) + "," + format_number(mid + 10 * tol) + "\n", on("strength-A"));
  ASSERT_TRUE(far.ok()) << ::testing::PrintToString(messages(far));
  EXPECT_EQ(far.failing(), 1u);
  ASSERT_EQ(far.rows.size(), 1u);
  const double ours = far.rows[0].cells[0].ours;
  EXPECT_GT(ours, std::min(a.max, b.max) - 2 * tol);
  EXPECT_LT(ours, std::max(a.max, b.max) + 2 * tol);
  EXPECT_TRUE(run("x,moment_max\n" + format_number(x) + "," + format_number(ours) + "\n", on("strength-A")).holds());
}

TEST_F(AgainstEnvelope, ReactionEnvelopeHolds) {
  const LoadSet& s = env();
  std::string t = "support,reaction_max,reaction_min\n";
  for (std::size_t j = 0; j < s.beam.labels.size(); ++j)
    t += s.beam.labels[j] + "," + format_number(s.consensus_envelope.reaction[j].max) + "," +
         format_number(s.consensus_envelope.reaction[j].min) + "\n";
  Comparison c = run(t, on("strength-A"));
  ASSERT_TRUE(c.ok()) << ::testing::PrintToString(messages(c));
  EXPECT_EQ(c.kind, TableKind::Reactions);
  EXPECT_TRUE(c.holds());
  EXPECT_EQ(summary(c, Quantity::ReactionMax)->compared, 4u);
  EXPECT_EQ(summary(c, Quantity::ReactionMin)->compared, 4u);
  // Max and min differ at the inner supports (pattern loading), so swapping them fails.
  std::string swapped = "support,reaction_max,reaction_min\n";
  for (std::size_t j = 0; j < s.beam.labels.size(); ++j)
    swapped += s.beam.labels[j] + "," + format_number(s.consensus_envelope.reaction[j].min) + "," +
               format_number(s.consensus_envelope.reaction[j].max) + "\n";
  EXPECT_FALSE(run(swapped, on("strength-A")).holds());
  // Down-positive reactions: their max is our -min.
  std::string down = "support,reaction_max,reaction_min\n";
  for (std::size_t j = 0; j < s.beam.labels.size(); ++j)
    down += s.beam.labels[j] + "," + format_number(-s.consensus_envelope.reaction[j].min) + "," +
            format_number(-s.consensus_envelope.reaction[j].max) + "\n";
  Options o = on("strength-A");
  o.reaction_sign = ReactionSign::DownPositive;
  EXPECT_TRUE(run(down, o).holds());
}

TEST_F(AgainstEnvelope, HoggingPositiveSwapsMaxAndMin) {
  const std::string hog = stations_csv(false, -1);
  // Declared: it holds, and their moment_max column is compared as our moment_min.
  Options o = on("strength-A");
  ASSERT_EQ(set_option(o, "moment-sign", "hogging-positive"), "");
  Comparison c = run(hog, o);
  ASSERT_TRUE(c.ok()) << ::testing::PrintToString(messages(c));
  EXPECT_TRUE(c.holds()) << c.failing() << " failing";
  ASSERT_FALSE(c.rows.empty());
  ASSERT_EQ(c.rows[0].cells.size(), 2u);
  const std::string hog_first = hog.substr(hog.find('\n') + 1);
  const double their_max = std::stod(hog_first.substr(hog_first.find(',') + 1));
  bool seen = false;
  for (const auto& cell : c.rows[0].cells) {
    if (cell.quantity != Quantity::MomentMin) continue;
    seen = true;
    EXPECT_NEAR(cell.raw, their_max, 1e-9 * (1 + std::abs(their_max)));
  }
  EXPECT_TRUE(seen);
  // A sign flip alone (without the swap) would not do: our max is not -their max.
  std::string flipped_only = "x,moment_max,moment_min\n";
  const LoadSet& s = env();
  for (std::size_t i = 0; i < s.stations.size(); ++i)
    flipped_only += format_number(s.stations[i].x) + "," + format_number(-s.consensus_envelope.moment[i].max) + "," +
                    format_number(-s.consensus_envelope.moment[i].min) + "\n";
  EXPECT_FALSE(run(flipped_only, o).holds());
  // Not declared: it fails, and the finding names the convention.
  Comparison u = run(hog, on("strength-A"));
  ASSERT_TRUE(u.ok());
  EXPECT_FALSE(u.holds());
  const Summary* sm = summary(u, Quantity::MomentMax);
  ASSERT_TRUE(sm->finding);
  EXPECT_EQ(sm->finding->mistakes, std::vector<Mistake>{Mistake::OppositeSign});
  EXPECT_NE(sm->finding->text.find("read as hogging-positive (max and min swapped)"), std::string::npos)
      << sm->finding->text;
}

TEST_F(AgainstEnvelope, DeflectionEnvelopeAtStations) {
  const LoadSet& s = env();
  std::string t = "x,deflection_max,deflection_min\n";
  for (std::size_t i = 0; i < s.stations.size(); ++i)
    t += format_number(s.stations[i].x) + "," + format_number(s.consensus_envelope.deflection[i].max) + "," +
         format_number(s.consensus_envelope.deflection[i].min) + "\n";
  Comparison c = run(t, on("strength-A"));
  ASSERT_TRUE(c.ok()) << ::testing::PrintToString(messages(c));
  EXPECT_TRUE(c.holds());
  EXPECT_EQ(summary(c, Quantity::DeflectionMax)->compared, s.stations.size());
  // Between stations it cannot be compared, and says why.
  const double x = 0.5 * (s.stations[1].x + s.stations[2].x);
  Comparison b = run("x,deflection_max\n" + format_number(x) + ",0.001\n", on("strength-A"));
  ASSERT_TRUE(b.ok()) << ::testing::PrintToString(messages(b));
  ASSERT_EQ(b.rows.size(), 1u);
  ASSERT_EQ(b.rows[0].cells.size(), 1u);
  EXPECT_FALSE(b.rows[0].cells[0].holds);
  EXPECT_EQ(b.rows[0].cells[0].reason,
            "the deflection envelope is known only at trivet's stations, and there is none here (stations_per_span "
            "in the beam file places more)");
}

TEST_F(AgainstEnvelope, OrdinaryAndEnvelopeColumnsDoNotMix) {
  EXPECT_EQ(only_error("x,moment\n1,2\n", on("strength-A")),
            "r.csv: line 1, column 2 (moment): \"moment\" is an ordinary value, but load set \"strength-A\" is an "
            "envelope (a combination with a pattern or a factor range): give moment_max, moment_min, shear_max, "
            "shear_min, deflection_max, deflection_min instead");
  EXPECT_EQ(only_error("support,force\nA,2\n", on("strength-A")),
            "r.csv: line 1, column 2 (force): \"force\" is an ordinary value, but load set \"strength-A\" is an "
            "envelope (a combination with a pattern or a factor range): give reaction_max, reaction_min instead");
  EXPECT_EQ(only_error("x,moment_max\n1,2\n", on("service")),
            "r.csv: line 1, column 2 (moment_max): \"moment_max\" is an envelope value, but load set \"service\" is "
            "not an envelope: name a combination with a pattern or a factor range in the case option");
  EXPECT_EQ(only_error("support,reaction_min\nB,2\n", on("dead")),
            "r.csv: line 1, column 2 (reaction_min): \"reaction_min\" is an envelope value, but load set \"dead\" is "
            "not an envelope: name a combination with a pattern or a factor range in the case option");
  EXPECT_EQ(only_error("x,rotation\n1,2\n", on("strength-A")),
            "r.csv: line 1: no column to compare: a station file needs at least one of \"moment_max\", "
            "\"moment_min\", \"shear_max\", \"shear_min\", \"deflection_max\" or \"deflection_min\"");
  // The ordinary columns still serve an ordinary combination.
  const LoadSet* service = nullptr;
  for (const auto& s : result_->sets)
    if (s.name == "service") service = &s;
  ASSERT_TRUE(service);
  std::string t = "x,moment\n";
  for (const auto& st : service->consensus_stations) t += format_number(st.x) + "," + format_number(st.moment) + "\n";
  EXPECT_TRUE(run(t, on("service")).holds());
}

TEST(AgainstInvalid, InvalidBeamIsAnError) {
  input::BeamFile bad = input::parse_beam_text("{\"spans\": []}", "bad.json");
  ASSERT_FALSE(bad.ok());
  BeamResult r = check(bad, compare::Options{});
  Comparison c = compare_text(bad, r, "x,moment\n1,2\n", "r.csv");
  ASSERT_EQ(c.errors.size(), 1u);
  EXPECT_EQ(c.errors[0].format("r.csv"), "r.csv: the beam file is not valid, so there is nothing to compare with");
}

// A huge field is echoed cut to a readable length, never whole.
TEST(AgainstInvalid, AHugeFieldIsEchoedCut) {
  input::BeamFile f = input::parse_beam_text(R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 5, "EI": 50000}], "supports": ["pinned", "roller"], "loads": [{"type": "udl", "span": 1, "w": 10}]})",
                                             "b.json");
  ASSERT_TRUE(f.ok());
  BeamResult r = check(f, compare::Options{});
  const std::string field(1000000, '7');
  Comparison c = compare_text(f, r, "x,moment\n1," + field + "z\n", "r.csv");
  ASSERT_FALSE(c.errors.empty());
  const std::string m = c.errors[0].format("r.csv");
  EXPECT_LT(m.size(), 300u) << m.substr(0, 300);
  EXPECT_NE(m.find("not a number"), std::string::npos) << m.substr(0, 300);
}

// An empty cell is not compared, and the summary says how many there were
// (they were skipped without a word).
TEST(AgainstInvalid, EmptyCellsAreCountedNotSkippedSilently) {
  input::BeamFile f = input::parse_beam_text(R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 5, "EI": 50000}], "supports": ["pinned", "roller"], "loads": [{"type": "udl", "span": 1, "w": 10}]})",
                                             "b.json");
  ASSERT_TRUE(f.ok());
  BeamResult r = check(f, compare::Options{});
  // M = w x (L - x)/2: 0 at x = 0, 30 at x = 2 (a closed form of statics).
  Comparison c = compare_text(f, r, "x,moment\n0,0\n1,\n2,30\n3,\n", "r.csv");
  ASSERT_TRUE(c.ok()) << c.errors.front().format("r.csv");
  ASSERT_EQ(c.summary.size(), 1u);
  EXPECT_EQ(c.summary[0].compared, 2u);
  EXPECT_EQ(c.summary[0].empty, 2u);
  EXPECT_TRUE(c.holds());
}

// Another program's envelope table of a moving load: the same columns as a
// patterned combination's. The consensus at every station holds; one value
// 5% off the largest moment fails at its row; a reaction table holds.
TEST(AgainstMoving, AMovingLoadsEnvelopeTableIsCompared) {
  const char* beam = R"({
    "units": {"force": "kN", "length": "m"},
    "spans": [{"length": 8, "EI": 90000}, {"length": 8, "EI": 90000}],
    "supports": ["pinned", "roller", "roller"],
    "loads": [{"type": "udl", "span": 1, "w": 5, "case": "dead"}, {"type": "udl", "span": 2, "w": 5, "case": "dead"}],
    "moving_loads": [{"name": "axles", "points": [{"P": 50, "offset": 0}, {"P": 50, "offset": 2.5}]}],
    "stations_per_span": 4
  })";
  const input::BeamFile file = input::parse_beam_text(beam, "beam.json");
  ASSERT_TRUE(file.ok()) << (file.errors.empty() ? "" : file.errors.front().format("beam.json"));
  const BeamResult result = check(file, compare::Options{});
  const LoadSet* set = nullptr;
  for (const auto& s : result.sets)
    if (s.name == "axles") set = &s;
  ASSERT_NE(set, nullptr);
  ASSERT_TRUE(set->envelope);
  ASSERT_EQ(set->ok_count(), 3u);
  Options o;
  o.load_case = "axles";
  const double scale = set->scale[static_cast<std::size_t>(Kind::Moment)];
  auto table = [&](std::size_t bump_row, double bump) {
    std::string t = "x,moment_max,moment_min\n";
    for (std::size_t i = 0; i < set->stations.size(); ++i)
      t += format_number(set->stations[i].x) + "," +
           format_number(set->consensus_envelope.moment[i].max + (i == bump_row ? bump : 0.0)) + "," +
           format_number(set->consensus_envelope.moment[i].min) + "\n";
    return t;
  };
  const Comparison good = compare_text(file, result, table(0, 0), "theirs.csv", o);
  ASSERT_TRUE(good.ok());
  EXPECT_EQ(good.load_case, "axles");
  EXPECT_TRUE(good.holds()) << good.failing() << " failing";
  EXPECT_EQ(good.failing(), 0u);
  const Comparison bad = compare_text(file, result, table(3, 0.05 * scale), "theirs.csv", o);
  ASSERT_TRUE(bad.ok());
  EXPECT_FALSE(bad.holds());
  EXPECT_EQ(bad.failing(), 1u);
  std::string r = "support,reaction_max,reaction_min\n";
  for (std::size_t j = 0; j < set->beam.labels.size(); ++j)
    r += set->beam.labels[j] + "," + format_number(set->consensus_envelope.reaction[j].max) + "," +
         format_number(set->consensus_envelope.reaction[j].min) + "\n";
  const Comparison reactions = compare_text(file, result, r, "reactions.csv", o);
  ASSERT_TRUE(reactions.ok());
  EXPECT_TRUE(reactions.holds());
}

}  // namespace
}  // namespace trivet::compare::against

namespace trivet::compare::against {
namespace {

// Local CSV habits (invented demo tables built from the beam's own
// consensus, as the other tests here).
std::string local_csv(const std::vector<std::array<double, 4>>& rows, char sep, bool decimal_comma) {
  auto num = [&](double v) {
    std::string t = format_number(v);
    if (decimal_comma) std::replace(t.begin(), t.end(), '.', ',');
    return t;
  };
  std::string s = std::string("x") + sep + "shear" + sep + "moment" + sep + "deflection\n";
  for (const auto& r : rows) s += num(r[0]) + sep + num(r[1]) + sep + num(r[2]) + sep + num(r[3]) + "\n";
  return s;
}

TEST_F(Against, SemicolonsTabsAndDecimalCommasAreRead) {
  std::vector<std::array<double, 4>> rows;
  for (const auto& r : truth()) rows.push_back({r.x, r.shear, r.moment, r.deflection});
  for (char sep : {';', '\t'})
    for (bool comma : {false, true}) {
      const std::string text = local_csv(rows, sep, comma);
      const CsvRead parsed = parse_csv_text(text);
      ASSERT_TRUE(parsed.ok()) << ::testing::PrintToString(parsed.errors.size());
      EXPECT_EQ(parsed.table.separator, sep);
      EXPECT_EQ(parsed.table.decimal, comma ? ',' : '.');
      Comparison c = run(text);
      ASSERT_TRUE(c.ok()) << ::testing::PrintToString(messages(c));
      EXPECT_TRUE(c.holds()) << "separator " << static_cast<int>(sep) << " decimal comma " << comma;
    }
  // A wrong export in the same habit is flagged with its diagnosis.
  auto wrong = rows;
  for (auto& r : wrong) r[2] = -r[2];
  Comparison c = run(local_csv(wrong, ';', true));
  ASSERT_TRUE(c.ok());
  EXPECT_FALSE(c.holds());
  const Summary* m = summary(c, Quantity::Moment);
  ASSERT_TRUE(m->finding);
  EXPECT_TRUE(names(*m->finding, Mistake::OppositeSign));
}

TEST_F(Against, SeparatorAndDecimalMarkCanBeGivenOrAreRefusedWhenUnclear) {
  // Both marks in one file: no guess.
  const CsvRead mixed = parse_csv_text("x;moment\n1,5;2.5\n3;4\n");
  ASSERT_EQ(mixed.errors.size(), 1u);
  EXPECT_NE(mixed.errors[0].reason.find("cannot tell the decimal mark"), std::string::npos) << mixed.errors[0].reason;
  // Given, it is read so.
  CsvLimits l;
  l.decimal = ',';
  const CsvRead given = parse_csv_text("x;moment\n1,5;2.5\n", l);
  ASSERT_TRUE(given.ok());
  EXPECT_EQ(given.table.rows[0].fields[0], "1.5");
  l = {};
  l.separator = '\t';
  const CsvRead tabbed = parse_csv_text("x,a\tmoment\n1\t2\n", l);
  ASSERT_TRUE(tabbed.ok());
  EXPECT_EQ(tabbed.table.header[0], "x,a");
  Options o;
  EXPECT_EQ(set_option(o, "separator", "semicolon"), "");
  EXPECT_EQ(o.limits.separator, ';');
  EXPECT_EQ(set_option(o, "decimal", "comma"), "");
  EXPECT_EQ(o.limits.decimal, ',');
  EXPECT_NE(set_option(o, "separator", "pipe"), "");
}

}  // namespace
}  // namespace trivet::compare::against

namespace trivet::compare::against {
namespace {

TEST_F(Against, UnitsInTheHeaderOrInARowBelowIt) {
  // Deflections in mm and moments in N*m in a file otherwise in kN and m.
  auto rows = truth();
  std::string bracketed = "x [m],shear,moment (N*m),Defl [mm]\n";
  std::string units_row = "x,shear,moment,deflection\nm,kN,N*m,mm\n";
  for (const auto& r : rows) {
    const std::string line = format_number(r.x) + "," + format_number(r.shear) + "," + format_number(r.moment * 1000) + "," +
                             format_number(r.deflection * 1000) + "\n";
    bracketed += line;
    units_row += line;
  }
  Options o;
  ASSERT_EQ(set_option(o, "column", "deflection=Defl"), "");
  for (const auto& [text, opts] : {std::pair<std::string, Options>{bracketed, o}, {units_row, Options{}}}) {
    Comparison c = run(text, opts);
    ASSERT_TRUE(c.ok()) << ::testing::PrintToString(messages(c));
    EXPECT_TRUE(c.holds());
    for (const auto& sm : c.summary) EXPECT_FALSE(sm.finding) << quantity_name(sm.quantity);
    ASSERT_EQ(c.rows.size(), rows.size());  // the units row is not a row of values
  }
  // Without the units, the same numbers are found to be a factor of 1000 off.
  std::string plain = "x,shear,moment,deflection\n";
  for (const auto& r : rows)
    plain += format_number(r.x) + "," + format_number(r.shear) + "," + format_number(r.moment) + "," +
             format_number(r.deflection * 1000) + "\n";
  Comparison c = run(plain);
  ASSERT_TRUE(c.ok());
  EXPECT_FALSE(c.holds());
  const Summary* d = summary(c, Quantity::Deflection);
  ASSERT_TRUE(d->finding);
  EXPECT_TRUE(names(*d->finding, Mistake::UnitsFactor));
  // A unit of the wrong kind is refused at its header cell.
  const std::string wrong = only_error("x,moment [mm]\n0,0\n");
  EXPECT_NE(wrong.find("column 2"), std::string::npos) << wrong;
  EXPECT_NE(wrong.find("is not a force*length unit"), std::string::npos) << wrong;
}

}  // namespace
}  // namespace trivet::compare::against

namespace trivet::compare::against {
namespace {

TEST_F(Against, AColumnNotComparedIsNamed) {
  const auto rows = truth();
  std::string text = "x,moment,rotation\n";
  for (const auto& r : rows) text += format_number(r.x) + "," + format_number(r.moment) + ",0\n";
  Comparison c = run(text);
  ASSERT_TRUE(c.ok()) << ::testing::PrintToString(messages(c));
  EXPECT_TRUE(c.holds());
  ASSERT_EQ(c.notes.size(), 1u);
  EXPECT_NE(c.notes[0].find("column 3 (\"rotation\") is not compared"), std::string::npos) << c.notes[0];
}

}  // namespace
}  // namespace trivet::compare::against
