// Plots: the data handed to gnuplot is each method's own stations, per
// panel; the difference panel is each method minus the consensus over the
// largest value; claims sit on their axes; thinning keeps extremes and
// jumps; rendering gives an SVG or PNG, or a plain reason.
#include <gtest/gtest.h>


#include <algorithm>
#include <cctype>
#include <cmath>
#include <memory>
#include <string>

#include "harness/compare/against.h"
#include "harness/input/reader.h"
#include "reports/plot.h"

namespace trivet::reports {
namespace {

// Three spans, a point force, a UDL, a linear load and a couple; claims on
// each plotted axis, one of them false.
const char* kBeam = R"({"title": "three spans for the plot test", "units": {"force": "kN", "length": "m"},
  "spans": [{"length": 6, "EI": 40000}, {"length": 8, "EI": 40000}, {"length": 5, "EI": 30000}],
  "supports": ["pinned", "roller", "roller", "fixed"],
  "loads": [{"type": "udl", "span": 1, "w": 12},
            {"type": "point", "span": 2, "P": 40, "at": 3},
            {"type": "linear", "span": 3, "w1": 0, "w2": 9, "from": 0, "to": 5},
            {"type": "couple", "span": 2, "C": 15, "at": 6}],
  "claims": {"tolerance": "1%", "values": [
    {"quantity": "moment", "node": "B", "value": -60},
    {"quantity": "max_moment", "span": 2, "value": 55},
    {"quantity": "deflection", "x": 10, "value": 0.003},
    {"quantity": "reaction", "node": "A", "value": 30},
    {"quantity": "shear", "x": 2, "side": "left", "value": 1000}]}})";

reports::Report sample() {
  input::BeamFile f = input::parse_beam_text(kBeam, "three-spans.json");
  EXPECT_TRUE(f.ok()) << (f.errors.empty() ? "" : f.errors[0].format("three-spans.json"));
  return compare::check(f, {});
}

double station_value(const compare::StationValues& s, PanelKind k) {
  switch (k) {
    case PanelKind::Shear: return s.shear;
    case PanelKind::Moment: return s.moment;
    default: return s.deflection;
  }
}

TEST(PlotData, EachCurveIsTheMethodsStations) {
  const reports::Report b = sample();
  ASSERT_EQ(b.sets.size(), 1u);
  const compare::LoadSet& set = b.sets[0];
  ASSERT_EQ(set.ok_count(), 3u);
  const PlotData d = plot_data(b, 0);
  ASSERT_EQ(d.panels.size(), 5u);
  EXPECT_EQ(d.panels[0].kind, PanelKind::Sketch);
  for (PanelKind k : {PanelKind::Shear, PanelKind::Moment, PanelKind::Deflection}) {
    const Panel* p = d.panel(k);
    ASSERT_NE(p, nullptr) << panel_name(k);
    ASSERT_EQ(p->curves.size(), set.methods.size()) << panel_name(k);
    EXPECT_NE(p->ylabel.find('['), std::string::npos) << "units on the " << panel_name(k) << " axis";
    for (std::size_t mi = 0; mi < set.methods.size(); ++mi) {
      const compare::MethodResult& m = set.methods[mi];
      const Curve& c = p->curves[mi];
      EXPECT_EQ(c.method, m.name);
      EXPECT_EQ(c.style, mi);
      // Every station's value, in order; between stations of a span with few
      // of them, the method's own values there (PlotData.CurvesShow...).
      ASSERT_EQ(c.x.size(), c.y.size());
      ASSERT_GE(c.x.size(), m.stations.size()) << m.name << " " << panel_name(k);
      std::size_t j = 0;
      // Deflections are drawn in mm (display_units.h: the default for a
      // kN, m file), everything else in the file's units.
      const double f = k == PanelKind::Deflection ? display_units(b.units).deflection.factor : 1.0;
      for (std::size_t i = 0; i < m.stations.size(); ++i) {
        // The same doubles, copied: compared without tolerance on purpose.
        auto same = [](double u, double v) { return !(u < v) && !(v < u); };
        while (j < c.x.size() && !(same(c.x[j], m.stations[i].x) && same(c.y[j], station_value(m.stations[i], k) * f))) ++j;
        ASSERT_LT(j, c.x.size()) << m.name << " " << panel_name(k) << ": station " << i << " not on the curve";
        ++j;
      }
    }
  }
  // The sign conventions are on the axes.
  EXPECT_NE(d.panel(PanelKind::Moment)->ylabel.find("sagging +"), std::string::npos);
  EXPECT_TRUE(d.panel(PanelKind::Moment)->drawn_down);
  EXPECT_NE(d.panel(PanelKind::Deflection)->ylabel.find("down +"), std::string::npos);
  EXPECT_FALSE(d.panel(PanelKind::Shear)->drawn_down);
  EXPECT_EQ(d.x_label, "x [m]");
  EXPECT_DOUBLE_EQ(d.x_max, 19.0);
}

TEST(PlotData, DifferencePanelIsMethodMinusConsensusOverScale) {
  const reports::Report b = sample();
  const compare::LoadSet& set = b.sets[0];
  const PlotData d = plot_data(b, 0);
  const Panel* p = d.panel(PanelKind::Difference);
  ASSERT_NE(p, nullptr);
  ASSERT_EQ(p->curves.size(), 3u * set.methods.size());
  std::size_t seen_kinds[3] = {0, 0, 0};
  for (const Curve& c : p->curves) {
    ASSERT_TRUE(c.kind.has_value());
    const compare::MethodResult& m = set.methods[c.style];
    EXPECT_EQ(m.name, c.method);
    const compare::Kind k = *c.kind;
    const double scale = set.scale[static_cast<std::size_t>(k)];
    ASSERT_GT(scale, 0);
    ASSERT_EQ(c.y.size(), m.stations.size());
    auto val = [&](const compare::StationValues& s) {
      return k == compare::Kind::Shear ? s.shear : k == compare::Kind::Moment ? s.moment : s.deflection;
    };
    for (std::size_t i = 0; i < c.y.size(); ++i) {
      EXPECT_DOUBLE_EQ(c.x[i], m.stations[i].x);
      const double want = (val(m.stations[i]) - val(set.consensus_stations[i])) / scale;
      EXPECT_NEAR(c.y[i], want, 1e-15) << c.label << " " << i;
      EXPECT_LT(std::abs(c.y[i]), 1e-6) << "the methods agree on this beam";
    }
    seen_kinds[k == compare::Kind::Shear ? 0 : k == compare::Kind::Moment ? 1 : 2]++;
  }
  for (std::size_t n : seen_kinds) EXPECT_EQ(n, set.methods.size());
}

TEST(PlotData, ClaimsAreMarkersOnTheirAxes) {
  const reports::Report b = sample();
  ASSERT_EQ(b.claims.size(), 5u);
  const PlotData d = plot_data(b, 0);
  const Panel* mp = d.panel(PanelKind::Moment);
  const Panel* dp = d.panel(PanelKind::Deflection);
  const Panel* sp = d.panel(PanelKind::Shear);
  ASSERT_EQ(mp->claims.size(), 2u);
  EXPECT_EQ(mp->claims[0].claim, 0u);
  EXPECT_DOUBLE_EQ(mp->claims[0].x, 6.0);  // node B
  EXPECT_DOUBLE_EQ(mp->claims[0].y, -60.0);
  EXPECT_EQ(mp->claims[1].claim, 1u);
  EXPECT_DOUBLE_EQ(mp->claims[1].x, b.sets[0].extremes[1].max_moment_x);  // where the span's largest sagging is
  EXPECT_DOUBLE_EQ(mp->claims[1].y, 55.0);
  ASSERT_EQ(dp->claims.size(), 1u);
  EXPECT_DOUBLE_EQ(dp->claims[0].x, 10.0);
  EXPECT_DOUBLE_EQ(dp->claims[0].y, 3.0);  // 0.003 m, drawn in mm (display_units.h)
  ASSERT_EQ(sp->claims.size(), 1u);
  EXPECT_DOUBLE_EQ(sp->claims[0].y, 1000.0);
  EXPECT_FALSE(sp->claims[0].holds);  // 1000 kN is far off
  for (const Panel* p : {mp, dp, sp})
    for (const auto& c : p->claims) EXPECT_EQ(c.holds, b.claims[c.claim].holds) << c.text;
  // The reaction claim is written at its support in the sketch.
  ASSERT_EQ(d.nodes.size(), 4u);
  ASSERT_EQ(d.nodes[0].claims.size(), 1u);
  EXPECT_NE(d.nodes[0].claims[0].find("claim 4"), std::string::npos);
  EXPECT_NE(d.nodes[0].reaction.find("kN"), std::string::npos);
}

// Three bays, dead and live, one patterned combination; claims on the
// envelope (moment_max, moment_min at a node, shear_max, reaction_max).
const char* kEnvelopeBeam = R"({"title": "three bays, patterned live load", "units": {"force": "kN", "length": "m"},
  "spans": [{"length": 7.5, "EI": 64000}, {"length": 7.5, "EI": 64000}, {"length": 7.5, "EI": 64000}],
  "supports": ["pinned", "roller", "roller", "roller"],
  "loads": [{"type": "udl", "span": 1, "w": 14.0, "case": "dead"}, {"type": "udl", "span": 2, "w": 14.0, "case": "dead"},
            {"type": "udl", "span": 3, "w": 14.0, "case": "dead"}, {"type": "udl", "span": 1, "w": 9.0, "case": "live"},
            {"type": "udl", "span": 2, "w": 9.0, "case": "live"}, {"type": "udl", "span": 3, "w": 9.0, "case": "live"}],
  "combinations": [{"name": "strength-A", "factors": {"dead": 1.2, "live": 1.6}, "pattern": ["live"]}],
  "claims": {"values": [
    {"quantity": "moment_max", "x": 3.0, "value": 150, "case": "strength-A"},
    {"quantity": "moment_min", "node": "B", "value": -5, "case": "strength-A"},
    {"quantity": "shear_max", "x": 0.5, "value": 120, "case": "strength-A"},
    {"quantity": "reaction_max", "node": "B", "value": 250, "case": "strength-A"}]}})";

reports::Report envelope_sample(std::size_t* set_index) {
  input::BeamFile f = input::parse_beam_text(kEnvelopeBeam, "bays.json");
  EXPECT_TRUE(f.ok()) << (f.errors.empty() ? "" : f.errors[0].format("bays.json"));
  reports::Report b = compare::check(f, {});
  *set_index = b.sets.size();
  for (std::size_t i = 0; i < b.sets.size(); ++i)
    if (b.sets[i].name == "strength-A") *set_index = i;
  return b;
}

TEST(PlotData, EnvelopeCurvesAreEachMethodsMaxAndMin) {
  std::size_t si = 0;
  const reports::Report b = envelope_sample(&si);
  ASSERT_LT(si, b.sets.size());
  const compare::LoadSet& set = b.sets[si];
  ASSERT_TRUE(set.envelope);
  ASSERT_GE(set.ok_count(), 2u);
  const PlotData d = plot_data(b, si);
  ASSERT_EQ(d.panels.size(), 5u);
  EXPECT_TRUE(d.envelope);
  EXPECT_NE(d.combination.find("1.2 x dead + 1.6 x live"), std::string::npos) << d.combination;
  EXPECT_NE(d.combination.find("live patterned"), std::string::npos) << d.combination;
  std::size_t methods_with_envelope = 0;
  for (const auto& m : set.methods) methods_with_envelope += m.envelope ? 1 : 0;
  ASSERT_GE(methods_with_envelope, 2u);
  for (PanelKind k : {PanelKind::Shear, PanelKind::Moment, PanelKind::Deflection}) {
    const Panel* p = d.panel(k);
    ASSERT_NE(p, nullptr);
    ASSERT_EQ(p->curves.size(), 2 * methods_with_envelope) << panel_name(k);
    bool max_differs_from_min = false;
    for (const Curve& c : p->curves) {
      ASSERT_LT(c.style, set.methods.size());
      const compare::MethodResult& m = set.methods[c.style];
      EXPECT_EQ(c.method, m.name);
      EXPECT_EQ(c.label, m.name + " max/min");
      ASSERT_NE(c.limit, Limit::None);
      ASSERT_TRUE(m.envelope.has_value());
      const auto& bs = k == PanelKind::Shear ? m.envelope->shear
                       : k == PanelKind::Moment ? m.envelope->moment : m.envelope->deflection;
      ASSERT_EQ(c.x.size(), set.stations.size());
      ASSERT_EQ(c.y.size(), bs.size());
      // Deflections in mm (display_units.h), the rest in the file's kN, m.
      const double f = k == PanelKind::Deflection ? display_units(b.units).deflection.factor : 1.0;
      for (std::size_t i = 0; i < bs.size(); ++i) {
        EXPECT_DOUBLE_EQ(c.x[i], set.stations[i].x);
        EXPECT_DOUBLE_EQ(c.y[i], (c.limit == Limit::Max ? bs[i].max : bs[i].min) * f) << m.name << " " << panel_name(k) << " " << i;
        if (std::abs(bs[i].max - bs[i].min) > 1e-9 * set.scale[0]) max_differs_from_min = true;
      }
    }
    EXPECT_TRUE(max_differs_from_min) << "a patterned live load gives a band, " << panel_name(k);
  }
  // Difference: each method's max and min minus the consensus envelope, over the scale.
  const Panel* p = d.panel(PanelKind::Difference);
  ASSERT_EQ(p->curves.size(), 6 * methods_with_envelope);
  for (const Curve& c : p->curves) {
    ASSERT_TRUE(c.kind.has_value());
    const compare::MethodResult& m = set.methods[c.style];
    const compare::Kind k = *c.kind;
    const auto& mine = k == compare::Kind::Shear ? m.envelope->shear
                       : k == compare::Kind::Moment ? m.envelope->moment : m.envelope->deflection;
    const auto& cons = k == compare::Kind::Shear ? set.consensus_envelope.shear
                       : k == compare::Kind::Moment ? set.consensus_envelope.moment : set.consensus_envelope.deflection;
    const double scale = set.scale[static_cast<std::size_t>(k)];
    ASSERT_GT(scale, 0);
    ASSERT_EQ(c.y.size(), mine.size());
    for (std::size_t i = 0; i < c.y.size(); ++i) {
      const double want = c.limit == Limit::Max ? (mine[i].max - cons[i].max) / scale : (mine[i].min - cons[i].min) / scale;
      EXPECT_NEAR(c.y[i], want, 1e-15) << c.label << " " << i;
      EXPECT_LT(std::abs(c.y[i]), 1e-6);
    }
  }
  // Span extremes labelled from `extremes`; envelope claims as markers; the
  // reaction claim and envelope at the support.
  const Panel* mp = d.panel(PanelKind::Moment);
  for (const auto& e : set.extremes) {
    bool found = false;
    for (const auto& l : mp->labels) found = found || (std::abs(l.x - e.max_moment_x) < 1e-12 && std::abs(l.y - e.max_moment) < 1e-12);
    EXPECT_TRUE(found) << "label at the largest moment_max " << e.max_moment;
  }
  ASSERT_EQ(mp->claims.size(), 2u);
  EXPECT_DOUBLE_EQ(mp->claims[0].x, 3.0);
  EXPECT_DOUBLE_EQ(mp->claims[1].x, 7.5);
  EXPECT_DOUBLE_EQ(mp->claims[1].y, -5.0);
  ASSERT_EQ(d.panel(PanelKind::Shear)->claims.size(), 1u);
  ASSERT_EQ(d.nodes[1].claims.size(), 1u);
  EXPECT_NE(d.nodes[1].claims[0].find("R max = 250"), std::string::npos) << d.nodes[1].claims[0];
  EXPECT_NE(d.nodes[1].reaction.find(" to "), std::string::npos) << d.nodes[1].reaction;
}

TEST(PlotData, OtherProgramsValuesAreMarkersAtTheirPositions) {
  reports::Report b = sample();
  input::BeamFile f = input::parse_beam_text(kBeam, "three-spans.json");
  const compare::LoadSet& set = b.sets[0];
  // Global x in mm (so the position and the value are converted), one
  // moment deliberately wrong; then span/x_local; then reactions.
  auto node_moment = [&](std::size_t i) { return *set.consensus_nodes[i].moment_right; };
  std::string csv = "x,moment,shear\n0,0,\n6000," + std::to_string(node_moment(1) * 1e6) + ",\n12500,999999999999,\n";
  compare::against::Options o;
  o.length_unit = "mm";
  o.force_unit = "N";
  auto a1 = std::make_shared<compare::against::Comparison>(compare::against::compare_text(f, b, csv, "their.csv", o));
  ASSERT_TRUE(a1->ok()) << (a1->errors.empty() ? "" : a1->errors[0].format("their.csv"));
  auto a2 = std::make_shared<compare::against::Comparison>(
      compare::against::compare_text(f, b, "span,x_local,deflection\n2,4,0.001\n", "local.csv", {}));
  ASSERT_TRUE(a2->ok());
  auto a3 = std::make_shared<compare::against::Comparison>(
      compare::against::compare_text(f, b, "support,force\nB,12345\n", "reactions.csv", {}));
  ASSERT_TRUE(a3->ok());
  b.against = {a1, a2, a3};
  const PlotData d = plot_data(b, 0);
  const Panel* mp = d.panel(PanelKind::Moment);
  ASSERT_EQ(mp->others.size(), 3u);
  const double xs[] = {0.0, 6.0, 12.5};
  std::size_t fails = 0;
  for (std::size_t i = 0; i < 3; ++i) {
    const OtherMarker& m = mp->others[i];
    EXPECT_EQ(m.comparison, 0u);
    const compare::against::Cell& cell = a1->rows[m.row].cells[0];
    EXPECT_DOUBLE_EQ(m.y, cell.theirs);
    EXPECT_EQ(m.holds, cell.holds);
    EXPECT_NEAR(m.x, xs[i], 1e-12);
    fails += m.holds ? 0 : 1;
  }
  EXPECT_NEAR(mp->others[1].y, node_moment(1), 1e-6 * std::abs(node_moment(1)));
  EXPECT_EQ(fails, 1u);
  EXPECT_TRUE(d.panel(PanelKind::Shear)->others.empty()) << "empty cells are not compared";
  const Panel* dp = d.panel(PanelKind::Deflection);
  ASSERT_EQ(dp->others.size(), 1u);
  EXPECT_NEAR(dp->others[0].x, 10.0, 1e-12);  // span 2 starts at 6
  EXPECT_DOUBLE_EQ(dp->others[0].y, a2->rows[0].cells[0].theirs * 1000);  // drawn in mm (display_units.h)
  ASSERT_EQ(d.nodes[1].others.size(), 1u);
  EXPECT_NE(d.nodes[1].others[0].find("R = 12345"), std::string::npos) << d.nodes[1].others[0];
  EXPECT_NE(d.nodes[1].others[0].find("fails"), std::string::npos);
  if (find_gnuplot()) {
    std::string err;
    const std::string svg = render(d, ImageFormat::Svg, 800, 900, &err);
    ASSERT_FALSE(svg.empty()) << err;
    EXPECT_NE(svg.find("other program (fails)"), std::string::npos);
    EXPECT_NE(svg.find("other program (holds)"), std::string::npos);
  }
}

TEST(PlotData, SketchHasSupportsLoadsAndLabels) {
  const PlotData d = plot_data(sample(), 0);
  ASSERT_EQ(d.nodes.size(), 4u);
  EXPECT_EQ(d.nodes[0].type, SupportType::Pinned);
  EXPECT_EQ(d.nodes[1].type, SupportType::Roller);
  EXPECT_EQ(d.nodes[3].type, SupportType::Fixed);
  EXPECT_EQ(d.nodes[2].label, "C");
  EXPECT_DOUBLE_EQ(d.nodes[3].x, 19.0);
  ASSERT_EQ(d.loads.size(), 4u);
  EXPECT_EQ(d.loads[1].type, LoadType::Point);
  EXPECT_DOUBLE_EQ(d.loads[1].x0, 9.0);  // span 2 starts at 6
  EXPECT_EQ(d.loads[1].text, "P = 40 kN");
  EXPECT_DOUBLE_EQ(d.loads[2].x0, 14.0);
  EXPECT_DOUBLE_EQ(d.loads[2].x1, 19.0);
  EXPECT_EQ(d.loads[3].type, LoadType::Couple);
  EXPECT_NE(d.loads[3].text.find("kN*m"), std::string::npos);
  // Values at the supports and the span extremes.
  EXPECT_FALSE(d.panel(PanelKind::Moment)->labels.empty());
  EXPECT_FALSE(d.panel(PanelKind::Deflection)->labels.empty());
}

TEST(PlotData, InvalidBeamHasNothingToPlot) {
  const reports::Report bad = compare::check(input::parse_beam_text("{}", "bad.json"), {});
  const PlotData d = plot_data(bad, 0);
  EXPECT_TRUE(d.panels.empty());
  ASSERT_FALSE(d.notes.empty());
  std::string err;
  EXPECT_TRUE(render(d, ImageFormat::Svg, 400, 500, &err).empty());
  EXPECT_NE(err.find("nothing to plot"), std::string::npos) << err;
  EXPECT_TRUE(plot_data(sample(), 7).panels.empty());
}

TEST(Thinning, KeepsEndsExtremesAndJumps) {
  std::vector<double> x, y;
  const std::size_t n = 20000;
  for (std::size_t i = 0; i < n; ++i) {
    const double t = static_cast<double>(i) / (n - 1) * 10.0;
    x.push_back(t);
    y.push_back(std::sin(t));
    if (i == 7000) {  // a jump: the same x twice
      x.push_back(t);
      y.push_back(std::sin(t) + 3.0);
    }
  }
  y[12345] = -50.0;  // a narrow spike
  const auto idx = thin_indices(x, y, 400);
  EXPECT_LE(idx.size(), 402u);
  EXPECT_GT(idx.size(), 100u);
  auto has = [&](std::size_t i) { return std::find(idx.begin(), idx.end(), i) != idx.end(); };
  EXPECT_TRUE(has(0));
  EXPECT_TRUE(has(x.size() - 1));
  EXPECT_TRUE(has(7000));
  EXPECT_TRUE(has(7001));
  EXPECT_TRUE(has(12345));
  EXPECT_TRUE(std::is_sorted(idx.begin(), idx.end()));
  // Small curves are kept whole; 0 keeps everything.
  EXPECT_EQ(thin_indices(x, y, 0).size(), x.size());
  std::vector<double> sx = {0, 1, 2}, sy = {3, 4, 5};
  EXPECT_EQ(thin_indices(sx, sy, 400).size(), 3u);
  // thinned() applies it to every curve.
  const PlotData d = thinned(plot_data(sample(), 0), 5);
  for (const auto& p : d.panels)
    for (const auto& c : p.curves) {
      EXPECT_EQ(c.x.size(), c.y.size());
      EXPECT_LT(c.x.size(), plot_data(sample(), 0).panel(p.kind)->curves[0].x.size());
    }
}

TEST(Render, FormatFromPath) {
  EXPECT_EQ(format_for_path("a/b.svg"), ImageFormat::Svg);
  EXPECT_EQ(format_for_path("B.PNG"), ImageFormat::Png);
  EXPECT_FALSE(format_for_path("b.pdf").has_value());
  EXPECT_FALSE(format_for_path("png").has_value());
}

TEST(Render, MissingGnuplotIsAPlainError) {
  RenderOptions o;
  o.gnuplot = "/nonexistent/dir/gnuplot";
  std::string err;
  EXPECT_TRUE(render(plot_data(sample(), 0), o, &err).empty());
  EXPECT_NE(err.find("gnuplot was not found"), std::string::npos) << err;
}

TEST(Render, SvgText) {
  if (!find_gnuplot()) GTEST_SKIP() << "gnuplot is not installed (apt-get install gnuplot-nox): SVG rendering not tested";
  std::string err;
  const std::string svg = render(plot_data(sample(), 0), ImageFormat::Svg, 800, 900, &err);
  ASSERT_FALSE(svg.empty()) << err;
  EXPECT_TRUE(svg.rfind("<?xml", 0) == 0 || svg.rfind("<svg", 0) == 0) << svg.substr(0, 80);
  EXPECT_NE(svg.find("</svg>"), std::string::npos);
  // The legend names the methods; the axes carry units.
  for (const char* s : {"three-moment", "slope-deflection", "stiffness", "x [m]", "shear [kN]", "claim (fails)"})
    EXPECT_NE(svg.find(s), std::string::npos) << s;
  // The difference panel says the differences are within the agreement bound
  // (drawn dashed), instead of scaling rounding noise to fill the panel.
  EXPECT_NE(svg.find("all within 1e-06 (the agreement bound, dashed)"), std::string::npos);
  // The picture's title is the beam's, not the plotting program's name.
  EXPECT_EQ(svg.find("<title>Gnuplot</title>"), std::string::npos);
  const reports::PlotData pd = plot_data(sample(), 0);
  EXPECT_NE(svg.find("<title>" + pd.title), std::string::npos) << pd.title;
  // An envelope set: one legend entry per method for the pair, the combination written.
  std::size_t si = 0;
  const reports::Report eb = envelope_sample(&si);
  const std::string esvg = render(plot_data(eb, si), ImageFormat::Svg, 800, 900, &err);
  ASSERT_FALSE(esvg.empty()) << err;
  EXPECT_NE(esvg.find("stiffness max/min"), std::string::npos);
  EXPECT_NE(esvg.find("1.2 x dead + 1.6 x live"), std::string::npos);
}

TEST(Render, PngBytes) {
  if (!find_gnuplot()) GTEST_SKIP() << "gnuplot is not installed (apt-get install gnuplot-nox): PNG rendering not tested";
  std::string err;
  const std::string png = render(plot_data(sample(), 0), ImageFormat::Png, 800, 900, &err);
  ASSERT_GT(png.size(), 1000u) << err;
  EXPECT_EQ(png.substr(0, 8), std::string("\x89PNG\r\n\x1a\n", 8));
}

}  // namespace
}  // namespace trivet::reports

namespace trivet::reports {
namespace {

// The rotated axis titles stay left of every tick label (a title over a
// tick label hid its minus sign: hogging read as sagging). Read from
// gnuplot's own SVG: a tick label is right-aligned at its x, its width from
// the usual widths of a sans font's glyphs (digits and 'e' 0.56 of the font
// size, '-' 0.34, '.' 0.28; common practice, no source); a rotated title's
// line reaches a little right of its x.
// The text items of gnuplot's SVG. Each reads
//   <g transform="translate(X,Y)[ rotate(270)]" ... font-size="S" ... text-anchor="A">
//   <text>T</text>
// (scanned by hand: std::regex trips GCC 12's maybe-uninitialized warning
// under the sanitizer build).
struct SvgText {
  double x = 0, y = 0, size = 0;
  std::string anchor, text;
  bool rotated = false;
};
std::vector<SvgText> svg_texts(const std::string& svg) {
  const auto attribute = [](const std::string& tag, const std::string& name) -> std::string {
    const std::string key = name + "=\"";
    const auto at = tag.find(key);
    if (at == std::string::npos) return {};
    const auto end = tag.find('"', at + key.size());
    return end == std::string::npos ? std::string() : tag.substr(at + key.size(), end - at - key.size());
  };
  std::vector<SvgText> out;
  for (std::size_t at = svg.find("<g transform=\"translate("); at != std::string::npos;
       at = svg.find("<g transform=\"translate(", at + 1)) {
    const auto close = svg.find('>', at);
    if (close == std::string::npos) break;
    const std::string tag = svg.substr(at, close - at + 1);
    const std::string size_text = attribute(tag, "font-size"), anchor = attribute(tag, "text-anchor");
    if (size_text.empty() || anchor.empty()) continue;
    auto open_text = close + 1;
    while (open_text < svg.size() && std::isspace(static_cast<unsigned char>(svg[open_text]))) ++open_text;
    if (svg.compare(open_text, 6, "<text>") != 0) continue;
    const auto end_text = svg.find("</text>", open_text);
    if (end_text == std::string::npos) break;
    const std::string text = svg.substr(open_text + 6, end_text - open_text - 6);
    if (text.find('<') != std::string::npos) continue;
    const std::string transform = attribute(tag, "transform");  // translate(X,Y)[ rotate(270)]
    SvgText t;
    t.x = std::stod(transform.substr(std::string("translate(").size()));
    t.y = std::stod(transform.substr(transform.find(',') + 1));
    t.size = std::stod(size_text);
    t.anchor = anchor;
    t.text = text;
    t.rotated = transform.find("rotate(") != std::string::npos;
    out.push_back(t);
  }
  return out;
}

bool is_number(const std::string& t) {
  if (t.empty()) return false;
  std::size_t i = t[0] == '-' ? 1 : 0;
  bool digits = false;
  for (; i < t.size() && (std::isdigit(static_cast<unsigned char>(t[i])) || t[i] == '.'); ++i) digits = true;
  if (i < t.size() && t[i] == 'e') {
    ++i;
    if (i < t.size() && (t[i] == '-' || t[i] == '+')) ++i;
    if (i == t.size()) return false;
    for (; i < t.size() && std::isdigit(static_cast<unsigned char>(t[i])); ++i) {}
  }
  return digits && i == t.size();
}

TEST(Render, AxisTitlesLeaveTheTickLabelsClear) {
  if (!find_gnuplot()) GTEST_SKIP() << "gnuplot is not installed (apt-get install gnuplot-nox)";
  std::string err;
  const std::string svg = render(plot_data(sample(), 0), ImageFormat::Svg, 800, 900, &err);
  ASSERT_FALSE(svg.empty()) << err;
  double leftmost_tick = 1e9, rightmost_title = -1e9;
  int ticks = 0, titles = 0;
  for (const SvgText& t : svg_texts(svg)) {
    if (t.rotated) {
      rightmost_title = std::max(rightmost_title, t.x + 0.3 * t.size);
      ++titles;
    } else if (t.anchor == "end" && is_number(t.text) && t.x < 200) {
      double w = 0;
      for (char c : t.text) w += c == '-' ? 0.34 : c == '.' ? 0.28 : 0.56;
      leftmost_tick = std::min(leftmost_tick, t.x - w * t.size);
      ++ticks;
    }
  }
  ASSERT_GT(titles, 3);
  ASSERT_GT(ticks, 10);
  EXPECT_LT(rightmost_title, leftmost_tick) << "an axis title reaches x = " << rightmost_title
                                            << ", a tick label starts at x = " << leftmost_tick;
}

// Labels wanted at one point, or crowded into a small panel, are placed
// apart or left out: never on top of each other, never outside the panel.
TEST(Labels, PlacedApartOrLeftOut) {
  const LabelBox area{0, 0, 200, 100};
  std::vector<LabelWish> wishes;
  for (int i = 0; i < 12; ++i) wishes.push_back({100, 50, text_width(6, 8), 10, i % 2 == 0});
  const auto spots = place_labels(wishes, area, {{90, 20, 110, 30}});  // a claim's text, say
  std::vector<LabelBox> placed;
  for (std::size_t i = 0; i < spots.size(); ++i) {
    if (!spots[i]) continue;
    const LabelBox b{spots[i]->first - 0.5 * wishes[i].w, spots[i]->second - 5, spots[i]->first + 0.5 * wishes[i].w,
                     spots[i]->second + 5};
    EXPECT_GE(b.x0, area.x0);
    EXPECT_LE(b.x1, area.x1);
    EXPECT_GE(b.y0, area.y0);
    EXPECT_LE(b.y1, area.y1);
    EXPECT_FALSE(b.overlaps({90, 20, 110, 30})) << "label " << i << " covers the claim's text";
    for (const auto& o : placed) EXPECT_FALSE(b.overlaps(o)) << "label " << i << " covers an earlier one";
    placed.push_back(b);
  }
  // The first two sit where they were asked: above and below the point.
  ASSERT_TRUE(spots[0] && spots[1]);
  EXPECT_LT(spots[0]->second, 50);
  EXPECT_GT(spots[1]->second, 50);
  EXPECT_GE(placed.size(), 4u);
  EXPECT_LT(placed.size(), wishes.size()) << "twelve labels cannot all fit around one point";
  // A label at the panel's end is moved inside it, not cut.
  const auto edge = place_labels({{199, 50, 40, 10, true}}, area);
  ASSERT_TRUE(edge[0]);
  EXPECT_DOUBLE_EQ(edge[0]->first, 180);
}

// A short span between long ones puts its supports' moments and shears
// side by side; a hinge where the shear runs on has the same shear at the
// end of one span and the start of the next. Every value label of the
// picture (gnuplot's own SVG) keeps clear of the others.
TEST(Render, ValueLabelsNeverCoverEachOther) {
  if (!find_gnuplot()) GTEST_SKIP() << "gnuplot is not installed (apt-get install gnuplot-nox)";
  // (Invented numbers, chosen so that the moments at B and C, 0.6 m
  // apart, are nearly equal: -229.4 and -226.2 kN*m.)
  const char* text = R"({"title": "crowded labels", "units": {"force": "kN", "length": "m"},
    "spans": [{"length": 10, "EI": 50000}, {"length": 0.6, "EI": 50000}, {"length": 7, "EI": 50000},
              {"length": 3, "EI": 50000}],
    "supports": ["pinned", "roller", "roller", {"type": "free", "hinge": true}, "fixed"],
    "loads": [{"type": "udl", "span": 1, "w": 20}, {"type": "udl", "span": 3, "w": 31.5},
              {"type": "udl", "span": 4, "w": 31.5}]})";
  input::BeamFile f = input::parse_beam_text(text, "crowded.json");
  ASSERT_TRUE(f.ok()) << (f.errors.empty() ? "" : f.errors[0].format("crowded.json"));
  const reports::Report b = compare::check(f, {});
  const PlotData d = plot_data(b, 0);
  std::size_t wanted = 0;
  for (const auto& p : d.panels) wanted += p.labels.size();
  std::string err;
  const std::string svg = render(d, ImageFormat::Svg, 960, 1100, &err);
  ASSERT_FALSE(svg.empty()) << err;
  std::vector<std::pair<LabelBox, std::string>> boxes;
  for (const SvgText& t : svg_texts(svg)) {
    // The value labels: numbers at 8 points, centred (tick labels are
    // anchored at an end).
    if (t.rotated || t.anchor != "middle" || !is_number(t.text) || std::abs(t.size - 8) > 0.01) continue;
    const double w = text_width(t.text.size(), t.size);
    boxes.push_back({{t.x - 0.5 * w, t.y - 0.8 * t.size, t.x + 0.5 * w, t.y + 0.2 * t.size}, t.text});
  }
  ASSERT_GE(boxes.size(), 8u) << "the labels were not found in the SVG";
  EXPECT_LE(boxes.size(), wanted);
  for (std::size_t i = 0; i < boxes.size(); ++i)
    for (std::size_t j = i + 1; j < boxes.size(); ++j)
      EXPECT_FALSE(boxes[i].first.overlaps(boxes[j].first))
          << "\"" << boxes[i].second << "\" and \"" << boxes[j].second << "\" overlap";
  // The reactions under the sketch's supports B and C, 0.6 m apart, too.
  std::vector<std::pair<LabelBox, std::string>> reactions;
  for (const SvgText& t : svg_texts(svg)) {
    if (t.rotated || t.anchor != "middle" || t.text.rfind("R = ", 0) != 0) continue;
    const double w = text_width(t.text.size(), t.size);
    reactions.push_back({{t.x - 0.5 * w, t.y - 0.8 * t.size, t.x + 0.5 * w, t.y + 0.2 * t.size}, t.text});
  }
  ASSERT_EQ(reactions.size(), 4u);  // A, B, C and the fixed end E
  for (std::size_t i = 0; i < reactions.size(); ++i)
    for (std::size_t j = i + 1; j < reactions.size(); ++j)
      EXPECT_FALSE(reactions[i].first.overlaps(reactions[j].first))
          << "\"" << reactions[i].second << "\" and \"" << reactions[j].second << "\" overlap";
  // A shear that runs on through the hinge is labelled once.
  std::size_t same = 0;
  for (const auto& l : d.panel(PanelKind::Shear)->labels)
    for (const auto& k : d.panel(PanelKind::Shear)->labels) same += &l != &k && l.text == k.text && std::abs(l.x - k.x) < 1e-9;
  EXPECT_EQ(same, 0u);
}

}  // namespace
}  // namespace trivet::reports

namespace trivet::reports {
namespace {

// A claim typed in mm for a file in m (8.4375 for a midspan deflection of
// 5wL^4/(384EI) = 0.0084375 m; Roark's Formulas for Stress and Strain, 7th
// ed., Table 8.1 case 2e, from memory) is drawn at the panel's edge with its
// value, and the axis keeps the scale of the results.
TEST(Render, AClaimFarOffScaleIsDrawnAtTheEdge) {
  if (!find_gnuplot()) GTEST_SKIP() << "gnuplot is not installed (apt-get install gnuplot-nox)";
  const input::BeamFile f = input::parse_beam_text(R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 6, "EI": 20000}], "supports": ["pinned", "roller"], "loads": [{"type": "udl", "span": 1, "w": 10}],
    "claims": {"values": [{"quantity": "deflection", "x": 3, "value": 8.4375}]}})", "off.json");
  ASSERT_TRUE(f.ok());
  const Report r(compare::check(f, {}));
  std::string err;
  const std::string svg = render(plot_data(r, 0), ImageFormat::Svg, 800, 900, &err);
  ASSERT_FALSE(svg.empty()) << err;
  // Deflections are drawn in mm (display_units.h): the claim's 8.4375 m is
  // 8437.5 mm, the results' largest 8.4375 mm.
  EXPECT_NE(svg.find("claim 1 = 8438 (off scale)"), std::string::npos);
  // No tick label of the deflection axis reaches the claim's 8438: the
  // largest is about the results' 8.4 (ticks of 2).
  EXPECT_EQ(svg.find("<text>8000</text>"), std::string::npos);
  EXPECT_EQ(svg.find("<text>8400</text>"), std::string::npos);
  EXPECT_NE(svg.find("<text>8</text>"), std::string::npos);
}

}  // namespace
}  // namespace trivet::reports

namespace trivet::reports {
namespace {

// With one station a span the diagrams are still drawn through the span:
// the moment curve of a simple span under a UDL reaches wL^2/8 = 45 at
// midspan (Roark's Formulas for Stress and Strain, 7th ed., Table 8.1
// case 2e, from memory), not the straight line between its zero ends.
TEST(PlotData, CurvesShowTheExtremesBetweenStations) {
  const input::BeamFile f = input::parse_beam_text(R"({"units": {"force": "kN", "length": "m"}, "stations_per_span": 1,
    "spans": [{"length": 6, "EI": 20000}], "supports": ["pinned", "roller"], "loads": [{"type": "udl", "span": 1, "w": 10}]})",
                                                   "one.json");
  ASSERT_TRUE(f.ok());
  const Report r(compare::check(f, {}));
  const PlotData d = plot_data(r, 0);
  bool found = false;
  for (const auto& p : d.panels) {
    if (p.kind != PanelKind::Moment) continue;
    ASSERT_FALSE(p.curves.empty());
    for (const auto& c : p.curves) {
      const double top = *std::max_element(c.y.begin(), c.y.end());
      EXPECT_GT(top, 0.99 * 45.0) << c.method;
      EXPECT_LE(top, 45.0 + 1e-9) << c.method;
      EXPECT_TRUE(std::is_sorted(c.x.begin(), c.x.end())) << c.method;
    }
    found = true;
  }
  EXPECT_TRUE(found);
}

}  // namespace
}  // namespace trivet::reports

namespace trivet::reports {
namespace {

// Two equal spans of 8 m, pinned-roller-roller, with a load that the lines
// must ignore.
const char* kTwoSpans = R"({"title": "two equal spans", "units": {"force": "kN", "length": "m"},
  "spans": [{"length": 8, "EI": 20000}, {"length": 8, "EI": 20000}],
  "supports": ["pinned", "roller", "roller"], "stations_per_span": 4,
  "loads": [{"type": "udl", "span": 1, "w": 10}]})";

std::vector<const compare::Method*> all_methods() {
  std::vector<const compare::Method*> v;
  for (const auto& m : compare::methods()) v.push_back(&m);
  return v;
}

// The plotted value of a curve at x (a point it holds).
double curve_at(const Curve& c, double x) {
  for (std::size_t i = 0; i < c.x.size(); ++i)
    if (std::abs(c.x[i] - x) < 1e-12) return c.y[i];
  ADD_FAILURE() << c.method << ": no point at x = " << x;
  return 0;
}

// The moment at B of two equal spans L with a unit load at a = xi L in span
// 1: M_B = -L xi (1 - xi)(1 + xi) / 4 (three-moment equation with M_A = M_C
// = 0: 4 L M_B = -P a b (L + a) / L; derived here). At midspan -3L/32: AISC
// Steel Construction Manual, Table 3-23, two equal spans, concentrated load
// at the center of one span, support moment 3PL/32 (from memory).
TEST(Influence, MomentAtBIsEachMethodsLineAndTheClosedForm) {
  const input::BeamFile f = input::parse_beam_text(kTwoSpans, "two.json");
  ASSERT_TRUE(f.ok());
  std::string err;
  const auto q = parse_influence("moment@B", &err);
  ASSERT_TRUE(q) << err;
  const PlotData d = influence_data(f, *q, all_methods(), 0, &err);
  ASSERT_EQ(d.panels.size(), 2u) << err;
  EXPECT_EQ(d.title, "Influence line: moment at B, left side");
  EXPECT_NE(d.x_label.find("[m]"), std::string::npos);
  ASSERT_TRUE(d.mark_x);
  EXPECT_DOUBLE_EQ(*d.mark_x, 8.0);
  const Panel* p = d.panel(PanelKind::Influence);
  ASSERT_NE(p, nullptr);
  EXPECT_NE(p->ylabel.find("[kN*m per kN]"), std::string::npos) << p->ylabel;
  ASSERT_EQ(p->curves.size(), compare::methods().size());
  const double L = 8.0;
  for (std::size_t mi = 0; mi < p->curves.size(); ++mi) {
    const Curve& c = p->curves[mi];
    EXPECT_EQ(c.method, compare::methods()[mi].name);
    EXPECT_EQ(c.style, mi);
    // 4 stations a span: 8 pieces of 25 points.
    EXPECT_EQ(c.x.size(), 8u * 25u) << c.method;
    EXPECT_NEAR(curve_at(c, L / 2), -3 * L / 32, 1e-12 * L) << c.method;
    EXPECT_NEAR(curve_at(c, 3 * L / 2), -3 * L / 32, 1e-12 * L) << c.method;
    for (std::size_t i = 0; i < c.x.size(); ++i) {
      const double a = c.x[i] <= L ? c.x[i] : 2 * L - c.x[i];  // span 2 by symmetry
      const double xi = a / L;
      EXPECT_NEAR(c.y[i], -L * xi * (1 - xi) * (1 + xi) / 4, 1e-12 * L) << c.method << " x = " << c.x[i];
    }
  }
}

// The same beam in N and mm is drawn in the display units (m, kN*m per kN
// for the moment line, mm per kN for the deflection line): the moment at B
// under a unit load at midspan of span 1 is -3L/32 (as above) whatever the
// file's units; the deflection at midspan of span 1 under a unit load there
// is 23 L^3 / (1536 EI) for two equal spans (three-moment equation with
// M_B = -3PL/32, superposed on PL^3/(48EI) - M_B L^2/(16EI); derived here).
TEST(Influence, DrawnInTheDisplayUnits) {
  const input::BeamFile f = input::parse_beam_text(R"({"title": "two equal spans in N and mm",
    "units": {"force": "N", "length": "mm"},
    "spans": [{"length": 8000, "EI": 2e13}, {"length": 8000, "EI": 2e13}],
    "supports": ["pinned", "roller", "roller"], "stations_per_span": 4})", "two-mm.json");
  ASSERT_TRUE(f.ok());
  std::string err;
  const PlotData d = influence_data(f, *parse_influence("moment@B", &err), all_methods(), 0, &err);
  ASSERT_EQ(d.panels.size(), 2u) << err;
  EXPECT_NE(d.x_label.find("[m]"), std::string::npos) << d.x_label;
  EXPECT_DOUBLE_EQ(*d.mark_x, 8.0);
  EXPECT_DOUBLE_EQ(d.x_max, 16.0);
  const Panel* p = d.panel(PanelKind::Influence);
  EXPECT_NE(p->ylabel.find("[kN*m per kN]"), std::string::npos) << p->ylabel;
  for (const Curve& c : p->curves) EXPECT_NEAR(curve_at(c, 4.0), -3.0 * 8.0 / 32, 1e-12) << c.method;
  const PlotData v = influence_data(f, *parse_influence("deflection@x=4000", &err), all_methods(), 0, &err);
  ASSERT_EQ(v.panels.size(), 2u) << err;
  EXPECT_EQ(v.title, "Influence line: deflection at x = 4 m");
  const Panel* q = v.panel(PanelKind::Influence);
  EXPECT_NE(q->ylabel.find("[mm per kN]"), std::string::npos) << q->ylabel;
  // 23 (8000 mm)^3 / (1536 * 2e13 N*mm^2) in mm per N, times 1000 N per kN.
  const double expected = 23.0 * 8000.0 * 8000.0 * 8000.0 / (1536.0 * 2e13) * 1000.0;
  for (const Curve& c : q->curves) EXPECT_NEAR(curve_at(c, 4.0), expected, 1e-9 * expected) << c.method;
  // The file's own units when asked.
  ShowUnits own;
  own.file = true;
  const PlotData w = influence_data(f, *parse_influence("moment@B", &err), all_methods(), 0, &err, own);
  EXPECT_NE(w.panel(PanelKind::Influence)->ylabel.find("[N*mm per N]"), std::string::npos);
  for (const Curve& c : w.panel(PanelKind::Influence)->curves)
    EXPECT_NEAR(curve_at(c, 4000.0), -3.0 * 8000.0 / 32, 1e-9) << c.method;
}

// Shear at an x inside span 1 that is no station (the point is added as
// one): with V = dM/dx, a unit load just left of the point gives V = R - 1
// there and just right of it V = R, R continuous in the load's position
// (statics), so the line jumps up by one as the load passes the point.
TEST(Influence, ShearAtAnXOffTheStationsJumpsByOneThere) {
  const input::BeamFile f = input::parse_beam_text(kTwoSpans, "two.json");
  std::string err;
  const auto q = parse_influence("shear@x=3.3", &err);
  ASSERT_TRUE(q) << err;
  const PlotData d = influence_data(f, *q, all_methods(), 0, &err);
  ASSERT_EQ(d.panels.size(), 2u) << err;
  const Panel* p = d.panel(PanelKind::Influence);
  ASSERT_EQ(p->curves.size(), compare::methods().size());
  for (const Curve& c : p->curves) {
    bool found = false;
    for (std::size_t i = 0; i + 1 < c.x.size(); ++i)
      if (std::abs(c.x[i] - 3.3) < 1e-12 && std::abs(c.x[i + 1] - 3.3) < 1e-12) {
        EXPECT_NEAR(c.y[i + 1] - c.y[i], 1.0, 1e-9) << c.method;
        found = true;
      }
    EXPECT_TRUE(found) << c.method << ": both limits at x = 3.3";
  }
}

TEST(Influence, BadTextNamesTheOptionAndWhatIsAccepted) {
  std::string err;
  for (const char* bad : {"moment", "torque@B", "moment@", "moment@x=abc", "reaction@x=2", "shear@B@C"}) {
    err.clear();
    EXPECT_FALSE(parse_influence(bad, &err)) << bad;
    EXPECT_NE(err.find("--influence"), std::string::npos) << err;
    EXPECT_NE(err.find("moment, shear, deflection, reaction"), std::string::npos) << err;
  }
  const input::BeamFile f = input::parse_beam_text(kTwoSpans, "two.json");
  for (const char* bad : {"moment@Q", "moment@x=99", "shear@A-", "moment@C+"}) {
    err.clear();
    const auto q = parse_influence(bad, &err);
    ASSERT_TRUE(q) << bad << ": " << err;
    const PlotData d = influence_data(f, *q, all_methods(), 0, &err);
    EXPECT_TRUE(d.panels.empty()) << bad;
    EXPECT_NE(err.find("--influence"), std::string::npos) << bad << ": " << err;
  }
  // A node without a vertical support has no reaction.
  const input::BeamFile g = input::parse_beam_text(R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 4, "EI": 1000}, {"length": 2, "EI": 1000}], "supports": ["fixed", "roller", "free"]})", "c.json");
  ASSERT_TRUE(g.ok());
  const auto q = parse_influence("reaction@C", &err);
  ASSERT_TRUE(q);
  EXPECT_TRUE(influence_data(g, *q, all_methods(), 0, &err).panels.empty());
  EXPECT_NE(err.find("no vertical support"), std::string::npos) << err;
}

TEST(Influence, SvgHasTheTitleEveryMethodAndTheCaution) {
  if (!find_gnuplot()) GTEST_SKIP() << "gnuplot is not installed (apt-get install gnuplot-nox)";
  const input::BeamFile f = input::parse_beam_text(kTwoSpans, "two.json");
  std::string err;
  PlotData d = influence_data(f, *parse_influence("reaction@B", &err), all_methods(), 0, &err);
  d.caution = compare::caution_text();
  const std::string svg = render(d, ImageFormat::Svg, 960, 620, &err);
  ASSERT_FALSE(svg.empty()) << err;
  EXPECT_NE(svg.find("Influence line: reaction at B"), std::string::npos);
  for (const auto& m : compare::methods()) EXPECT_NE(svg.find(m.name), std::string::npos) << m.name;
  EXPECT_NE(svg.find("reaction [per unit load]"), std::string::npos);
  EXPECT_NE(svg.find("Caution: trivet is a checking aid"), std::string::npos);
}

// A moving load's own load set plots as an envelope, its title naming the
// train; a combination that names one says so.
TEST(PlotData, MovingLoadSetIsAnEnvelopeNamedByItsTrain) {
  input::BeamFile f = input::parse_beam_text(kTwoSpans, "two.json");
  ASSERT_TRUE(f.ok());
  input::MovingLoad t;
  t.name = "trolley";
  t.points = {{40.0, 0.0}, {60.0, 3.0}};
  f.moving_loads.push_back(t);
  input::Combination c;
  c.name = "strength";
  c.factors.push_back({f.cases.at(0), input::Factor{}});
  c.factors.back().second.low = c.factors.back().second.high = 1.2;
  c.moving = std::make_pair(std::string("trolley"), 1.5);
  f.combinations.push_back(c);
  const reports::Report b = compare::check(f, {});
  for (const char* name : {"trolley", "strength"}) {
    std::size_t si = b.sets.size();
    for (std::size_t i = 0; i < b.sets.size(); ++i)
      if (b.sets[i].name == name) si = i;
    ASSERT_LT(si, b.sets.size()) << name;
    const PlotData d = plot_data(b, si);
    ASSERT_EQ(d.panels.size(), 5u) << name;
    EXPECT_TRUE(d.envelope) << name;
    ASSERT_EQ(d.panel(PanelKind::Moment)->curves.size(), 2 * compare::methods().size()) << name;
    const std::string want = std::string(name) == "trolley"
                                 ? "moving load trolley: 40 kN at 0 m, 60 kN at 3 m"
                                 : "1.2 x " + f.cases.at(0) + " + 1.5 x trolley (moving)";
    EXPECT_NE(d.combination.find(want), std::string::npos) << d.combination;
    if (!find_gnuplot()) continue;
    std::string err;
    const std::string svg = render(d, ImageFormat::Svg, 960, 1100, &err);
    ASSERT_FALSE(svg.empty()) << err;
    EXPECT_NE(svg.find(want), std::string::npos) << name;
    EXPECT_NE(svg.find("stiffness max/min"), std::string::npos) << name;
  }
}

}  // namespace
}  // namespace trivet::reports
