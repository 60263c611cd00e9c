// Display units (reports/display_units.h): what --show-units reads, the
// defaults for metric and imperial files, and the console tables, the HTML
// report, the checking record and the plots showing the converted values
// with their units. The JSON keeps the file's units (reports_test.cpp).
//
// The beams are one simply supported span under a uniform load, whose
// midspan values are closed forms known from memory (any strength of
// materials text, e.g. Gere & Timoshenko, Mechanics of Materials, the
// table of beam deflections): M = w L^2 / 8, deflection 5 w L^4 / (384 EI).
// With w = 12 kN/m, L = 5 m, EI = 25000 kN*m^2: M = 37.5 kN*m and the
// deflection 0.00390625 m = 3.90625 mm. The same beam in N and mm: w = 12
// N/mm, L = 5000 mm, EI = 2.5e13 N*mm^2. The imperial beam: w = 1 kip/ft,
// L = 20 ft, EI = 1e6 kip*ft^2: M = 50 kip*ft and the deflection
// 5 * 1 * 20^4 / (384 * 1e6) ft = 0.0020833 ft = 0.025 in.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <sstream>
#include <string>

#include "reports/display_units.h"
#include "reports/html_report.h"
#include "reports/plot.h"
#include "reports/reports.h"

namespace trivet::reports {
namespace {

Report beam(const std::string& units, double L, double EI, double w) {
  const std::string text = R"({"title": "one span", "units": )" + units + R"(, "spans": [{"length": )" +
                           input::format_number(L) + R"(, "EI": )" + input::format_number(EI) +
                           R"(}], "supports": ["pinned", "roller"], "loads": [{"type": "udl", "span": 1, "w": )" +
                           input::format_number(w) + "}]}";
  input::BeamFile f = input::parse_beam_text(text, "one.json");
  EXPECT_TRUE(f.ok()) << text;
  return compare::check(f, {});
}
Report metric_kn_m() { return beam(R"({"force": "kN", "length": "m"})", 5, 25000, 12); }
Report metric_n_mm() { return beam(R"({"force": "N", "length": "mm"})", 5000, 2.5e13, 12); }
Report imperial() { return beam(R"({"force": "kip", "length": "ft"})", 20, 1e6, 1); }

std::string console(const Report& r, const ShowUnits& show = {}) {
  std::ostringstream o;
  ConsoleOptions opt;
  opt.show = show;
  write_console(o, r, opt);
  return o.str();
}

bool has(const std::string& text, const std::string& part) { return text.find(part) != std::string::npos; }

// The number in a table row's column `col` (0-based, columns split on runs of spaces).
double column(const std::string& text, const std::string& header, const std::string& row_start, std::size_t col) {
  const std::size_t h = text.find(header);
  EXPECT_NE(h, std::string::npos) << header;
  if (h == std::string::npos) return NAN;
  const std::size_t r = text.find("\n  " + row_start + " ", h);
  EXPECT_NE(r, std::string::npos) << row_start;
  if (r == std::string::npos) return NAN;
  std::istringstream in(text.substr(r + 1, text.find('\n', r + 1) - r - 1));
  std::string cell;
  for (std::size_t c = 0; c <= col; ++c) in >> cell;
  return std::stod(cell);
}

TEST(ShowUnits, ReadsFileAndAnySubset) {
  std::string err;
  auto s = parse_show_units("file", &err);
  ASSERT_TRUE(s) << err;
  EXPECT_TRUE(s->file);
  s = parse_show_units("moment=kN*m,deflection=mm", &err);
  ASSERT_TRUE(s) << err;
  EXPECT_FALSE(s->file);
  EXPECT_EQ(s->moment, "kN*m");
  EXPECT_EQ(s->deflection, "mm");
  EXPECT_TRUE(s->force.empty());
  EXPECT_TRUE(s->length.empty());
  s = parse_show_units("force=kip,moment=kipft,length=ft,deflection=in", &err);
  ASSERT_TRUE(s) << err;
  EXPECT_EQ(s->moment, "kipft");
}

TEST(ShowUnits, BadTextsSayWhy) {
  struct Bad {
    const char* text;
    const char* why;
  } const bad[] = {
      {"", "empty"},
      {"torque=kN*m", "unknown kind 'torque'"},
      {"moment=kN*furlong", "moment=kN*furlong"},
      {"moment=kN", "kN is force, but moment is force*length"},
      {"deflection=kN", "but deflection is length"},
      {"force=kN,force=N", "force is given twice"},
      {"kN", "'kN' is not KIND=UNIT"},
      {"force=kN,", "'' is not KIND=UNIT"},
  };
  for (const auto& b : bad) {
    std::string err;
    EXPECT_FALSE(parse_show_units(b.text, &err)) << b.text;
    EXPECT_TRUE(has(err, b.why)) << b.text << ": " << err;
    EXPECT_TRUE(has(err, "force=kN,moment=kN*m,length=m,deflection=mm")) << err;  // what is accepted
  }
}

TEST(DisplayUnits, MetricAndImperialDefaults) {
  input::Units kn_m;  // kN, m
  DisplayUnits u = display_units(kn_m);
  EXPECT_EQ(u.force.label, "kN");
  EXPECT_EQ(u.moment.label, "kN*m");
  EXPECT_EQ(u.length.label, "m");
  EXPECT_EQ(u.deflection.label, "mm");
  EXPECT_DOUBLE_EQ(u.force.factor, 1.0);
  EXPECT_DOUBLE_EQ(u.moment.factor, 1.0);
  EXPECT_DOUBLE_EQ(u.length.factor, 1.0);
  EXPECT_NEAR(u.deflection.factor, 1000.0, 1e-9);
  EXPECT_EQ(u.rotation.label, "rad");

  const input::Units n_mm{"N", "mm", 1.0, 1e-3};
  u = display_units(n_mm);
  EXPECT_EQ(u.moment.label, "kN*m");
  EXPECT_NEAR(u.moment.factor, 1e-6, 1e-20);
  EXPECT_NEAR(u.force.factor, 1e-3, 1e-18);
  EXPECT_NEAR(u.length.factor, 1e-3, 1e-18);
  EXPECT_EQ(u.deflection.label, "mm");
  EXPECT_DOUBLE_EQ(u.deflection.factor, 1.0);

  const input::Units lbf_in{"lbf", "in", *input::force_unit("lbf"), *input::length_unit("in")};
  u = display_units(lbf_in);
  EXPECT_EQ(u.force.label, "kip");
  EXPECT_EQ(u.moment.label, "kip*ft");
  EXPECT_EQ(u.length.label, "ft");
  EXPECT_EQ(u.deflection.label, "in");
  EXPECT_NEAR(u.moment.factor, 1.0 / 12000.0, 1e-15);  // 12,000 lbf*in in a kip*ft
  EXPECT_DOUBLE_EQ(u.deflection.factor, 1.0);

  // A file mixing the systems shows its own units.
  const input::Units kn_ft{"kN", "ft", 1000.0, *input::length_unit("ft")};
  u = display_units(kn_ft);
  EXPECT_EQ(u.moment.label, "kN*ft");
  EXPECT_EQ(u.deflection.label, "ft");
  EXPECT_DOUBLE_EQ(u.deflection.factor, 1.0);

  // `file`, and a chosen unit over the default.
  ShowUnits file;
  file.file = true;
  u = display_units(n_mm, file);
  EXPECT_EQ(u.moment.label, "N*mm");
  EXPECT_DOUBLE_EQ(u.moment.factor, 1.0);
  ShowUnits some;
  some.moment = "N*mm";
  some.deflection = "cm";
  u = display_units(kn_m, some);
  EXPECT_EQ(u.moment.label, "N*mm");
  EXPECT_NEAR(u.moment.factor, 1e6, 1e-6);
  EXPECT_NEAR(u.deflection.factor, 100.0, 1e-12);
  EXPECT_EQ(u.force.label, "kN");  // the rest keep their default
}

TEST(DisplayUnits, ConsoleShowsDeflectionsOfAkNmFileInMm) {
  const Report r = metric_kn_m();
  ASSERT_EQ(r.status, compare::BeamStatus::Agree);
  const std::string out = console(r);
  EXPECT_FALSE(has(out, "deflection [m]")) << out;
  // The span table: the consensus value (file units, as in the JSON) x 1000.
  const double file_value = r.sets[0].extremes[0].max_deflection;
  EXPECT_NEAR(file_value, 0.00390625, 1e-12);  // 5 w L^4 / (384 EI)
  const double shown = column(out, "max deflection [mm]", "1", 4);
  EXPECT_NEAR(shown, file_value * 1000, 0.0005) << out;
  EXPECT_NEAR(shown, 3.906, 1e-9) << out;  // 4 significant digits of the converted value
  EXPECT_TRUE(has(out, "deflection [mm]"));
  EXPECT_TRUE(has(out, "units: force kN, moment kN*m, x m, deflection mm (file: kN, m)")) << out;
}

TEST(DisplayUnits, ConsoleShowsMomentsOfANmmFileInkNm) {
  const Report r = metric_n_mm();
  ASSERT_EQ(r.status, compare::BeamStatus::Agree);
  const std::string out = console(r);
  const double file_value = r.sets[0].extremes[0].max_moment;  // N*mm
  EXPECT_NEAR(file_value, 37.5e6, 1e-3);                        // w L^2 / 8
  const double shown = column(out, "max sagging [kN*m]", "1", 1);
  EXPECT_NEAR(shown, file_value / 1e6, 0.005) << out;
  EXPECT_NEAR(column(out, "max sagging [kN*m]", "1", 2), 2.5, 1e-9);  // at x [m]
  EXPECT_NEAR(column(out, "max deflection [mm]", "1", 4), 3.906, 1e-9);
  // Node table: reactions w L / 2 = 30 kN, x of node B 5 m.
  EXPECT_NEAR(column(out, "reaction [kN]", "B", 1), 5.0, 1e-9) << out;
  EXPECT_NEAR(column(out, "reaction [kN]", "B", 4), 30.0, 1e-9) << out;
  EXPECT_FALSE(has(out, "e+06")) << out;  // not -3.75e+07 N*mm
  EXPECT_FALSE(has(out, "N*mm")) << out;
}

TEST(DisplayUnits, ShowUnitsFileShowsTheFilesUnits) {
  ShowUnits file;
  file.file = true;
  const std::string out = console(metric_n_mm(), file);
  EXPECT_NEAR(column(out, "max sagging [N*mm]", "1", 1), 37.5e6, 1) << out;
  EXPECT_NEAR(column(out, "max sagging [N*mm]", "1", 2), 2500, 1e-9) << out;
  EXPECT_TRUE(has(out, "reaction [N]"));
}

TEST(DisplayUnits, ImperialFileShowsKipFtAndInches) {
  const Report r = imperial();
  ASSERT_EQ(r.status, compare::BeamStatus::Agree);
  const std::string out = console(r);
  EXPECT_NEAR(column(out, "max sagging [kip*ft]", "1", 1), 50.0, 1e-9) << out;  // w L^2 / 8
  const double file_value = r.sets[0].extremes[0].max_deflection;                 // ft
  EXPECT_NEAR(column(out, "max deflection [in]", "1", 4), file_value * 12, 5e-6) << out;
  EXPECT_NEAR(column(out, "max deflection [in]", "1", 4), 0.025, 1e-9) << out;  // 5 w L^4 / (384 EI)
}

TEST(DisplayUnits, HtmlAndRecordShowTheDisplayUnits) {
  const Report r = metric_n_mm();
  HtmlOptions opt;
  opt.plots = false;
  opt.date_utc = "2026-01-01T00:00:00Z";
  std::ostringstream html;
  write_html(html, std::vector<Report>{r}, opt);
  EXPECT_TRUE(has(html.str(), "max sagging [kN*m]"));
  EXPECT_TRUE(has(html.str(), "<td class=\"n\">37.50</td>")) << html.str();
  EXPECT_TRUE(has(html.str(), "deflection [mm]"));
  EXPECT_FALSE(has(html.str(), "[N*mm]"));
  std::ostringstream rec;
  write_record(rec, r, opt);
  EXPECT_TRUE(has(rec.str(), "largest sagging moment [kN*m]</td><td class=\"n\">37.50</td>")) << rec.str();
  EXPECT_TRUE(has(rec.str(), "largest deflection [mm]</td><td class=\"n\">3.906</td>")) << rec.str();
  EXPECT_TRUE(has(rec.str(), "reaction at node A [kN]</td><td class=\"n\">30.00</td>")) << rec.str();
  opt.show.file = true;
  std::ostringstream rec_file;
  write_record(rec_file, r, opt);
  EXPECT_TRUE(has(rec_file.str(), "largest sagging moment [N*mm]")) << rec_file.str();
}

TEST(DisplayUnits, PlotAxesAndValuesInDisplayUnits) {
  const Report r = metric_kn_m();
  const PlotData d = plot_data(r, 0);
  const Panel* defl = d.panel(PanelKind::Deflection);
  ASSERT_TRUE(defl);
  EXPECT_TRUE(has(defl->ylabel, "deflection [mm]")) << defl->ylabel;
  double largest = 0;
  for (const auto& c : defl->curves) largest = std::max(largest, *std::max_element(c.y.begin(), c.y.end()));
  EXPECT_NEAR(largest, 3.90625, 1e-6);  // mm, the midspan deflection
  ASSERT_FALSE(defl->labels.empty());
  EXPECT_EQ(defl->labels[0].text, "3.906");

  const Report n = metric_n_mm();
  const PlotData p = plot_data(n, 0);
  EXPECT_EQ(p.x_label, "x [m]");
  EXPECT_NEAR(p.x_max, 5.0, 1e-12);
  const Panel* m = p.panel(PanelKind::Moment);
  ASSERT_TRUE(m);
  EXPECT_TRUE(has(m->ylabel, "moment [kN*m]")) << m->ylabel;
  double mmax = 0;
  for (const auto& c : m->curves) {
    mmax = std::max(mmax, *std::max_element(c.y.begin(), c.y.end()));
    EXPECT_LE(c.x.back(), 5.0 + 1e-9);
  }
  EXPECT_NEAR(mmax, 37.5, 1e-6);
  ASSERT_FALSE(p.loads.empty());
  EXPECT_EQ(p.loads[0].text, "w = 12 kN/m");
  EXPECT_TRUE(has(p.nodes[0].reaction, "R = 30.00 kN")) << p.nodes[0].reaction;

  ShowUnits file;
  file.file = true;
  const PlotData f = plot_data(n, 0, file);
  EXPECT_EQ(f.x_label, "x [mm]");
  EXPECT_TRUE(has(f.panel(PanelKind::Moment)->ylabel, "moment [N*mm]"));
}

}  // namespace
}  // namespace trivet::reports
