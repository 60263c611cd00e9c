// `trivet plot`: the diagrams of one beam.
#include <algorithm>
#include <cmath>
#include <iostream>
#include <string>
#include <vector>

#include "harness/cli/files.h"
#include "harness/compare/compare.h"
#include "harness/input/reader.h"
#include "reports/plot.h"
#include "harness/cli/commands.h"

namespace trivet::cli {

// `trivet plot FILE -o OUT.svg|.png`: the stacked diagrams of one load set.
namespace {

// OUT with "-SLUG" before its extension: "lines.svg" -> "lines-moment-B.svg".
std::string with_slug(const std::string& out, const std::string& slug) {
  const std::size_t dot = out.rfind('.');
  return out.substr(0, dot) + "-" + slug + out.substr(dot);
}

// `trivet plot FILE --influence Q@W ... -o OUT`: one picture per request,
// OUT itself for one, OUT-<quantity>-<where>.ext for several.
int run_influence(const input::BeamFile& f, const std::string& file, const std::string& out, reports::ImageFormat format,
                  const std::string& methods, const std::vector<std::string>& texts, const reports::ShowUnits& show) {
  std::vector<reports::InfluenceRequest> requests;
  for (const auto& t : texts) {
    std::string error;
    auto q = reports::parse_influence(t, &error);
    if (!q) fail("trivet plot: ", error);
    requests.push_back(*q);
  }
  if (!f.ok()) {
    for (const auto& e : f.errors) std::cerr << "error: " << e.format(file) << "\n";
    return kExitInvalid;
  }
  // The methods in the order check() takes them, so the styles match the diagrams.
  std::vector<const compare::Method*> chosen;
  if (methods.empty()) {
    for (const auto& m : compare::methods()) chosen.push_back(&m);
  } else {
    for (const auto& name : split_list(methods)) {
      const compare::Method* m = compare::find_method(name);
      if (!m) fail("trivet plot: --methods: no method '", name, "'");
      chosen.push_back(m);
    }
  }
  // Every request checked against the beam before any picture is drawn.
  std::vector<reports::PlotData> data;
  for (const auto& q : requests) {
    std::string error;
    reports::PlotData d = reports::influence_data(f, q, chosen, 0, &error, show);
    if (d.panels.empty()) fail("trivet plot: ", error.empty() ? std::string("--influence: nothing to plot") : error);
    d.caution = compare::caution_text();
    data.push_back(std::move(d));
  }
  // Exit 0 when every method drew every line and the lines agree (each
  // point against the first method's, relative to the largest ordinate).
  bool agree = true;
  for (const auto& d : data) {
    const reports::Panel* p = d.panel(reports::PanelKind::Influence);
    if (!p || p->curves.size() != chosen.size()) { agree = false; continue; }
    double largest = 0, diff = 0;
    for (const auto& c : p->curves)
      for (std::size_t i = 0; i < c.y.size(); ++i) {
        largest = std::max(largest, std::abs(c.y[i]));
        if (c.y.size() == p->curves[0].y.size()) diff = std::max(diff, std::abs(c.y[i] - p->curves[0].y[i]));
      }
    if (diff > compare::Options{}.agreement * largest) agree = false;  // the default agreement bound
  }
  for (std::size_t i = 0; i < data.size(); ++i) {
    for (const auto& n : data[i].notes) std::cerr << data[i].title << ": " << n << "\n";
    const std::string path = data.size() == 1 ? out : with_slug(out, reports::influence_slug(requests[i]));
    std::string error;
    const std::string bytes = reports::render(data[i], format, 960, 620, &error);
    if (bytes.empty()) fail("trivet plot: ", error);
    const std::string err =
        write_report_file(path, [&](std::ostream& o) { o.write(bytes.data(), static_cast<std::streamsize>(bytes.size())); });
    if (!err.empty()) fail("trivet plot: ", err);
    std::cerr << "wrote " << path << " (" << data[i].title << ")\n";
  }
  return agree ? kExitAgree : kExitDisagree;
}

}  // namespace

int run_plot(const std::string& file, const std::string& out, const std::string& load_case, const std::string& methods,
             const std::vector<std::string>& influence, const std::string& show_units) {
  const auto format = reports::format_for_path(out);
  if (!format) {
    fail("trivet plot: -o: the output must end in .svg or .png (got '", out, "')");
  }
  const reports::ShowUnits show = show_units_option("plot", show_units);
  const input::BeamFile f = input::read_beam_file(file);
  if (!influence.empty()) {
    if (!load_case.empty())
      std::cerr << "trivet plot: --case is not used with --influence (an influence line does not depend on the loads)\n";
    return run_influence(f, file, out, *format, methods, influence, show);
  }
  compare::Options opt;
  if (!methods.empty()) opt.methods = split_list(methods);
  const reports::Report r(compare::check(f, opt));
  if (r.status == compare::BeamStatus::Invalid) {
    for (const auto& e : r.errors) std::cerr << "error: " << e.format(file) << "\n";
    return kExitInvalid;
  }
  std::size_t index = 0;
  if (!load_case.empty()) {
    bool found = false;
    for (std::size_t i = 0; i < r.sets.size(); ++i)
      if (r.sets[i].name == load_case) { index = i; found = true; }
    if (!found) {
      std::string names;
      for (std::size_t i = 0; i < r.sets.size(); ++i) names += (i ? ", " : "") + r.sets[i].name;
      fail("trivet plot: --case: no load case or combination '", load_case, "' in ", file, " (", names, ")");
    }
  }
  std::string error;
  reports::PlotData data = reports::plot_data(r, index, show);
  data.caution = compare::caution_text();
  const std::string bytes = reports::render(data, *format, 960, 1100, &error);
  if (bytes.empty()) {
    fail("trivet plot: ", error);
  }
  const std::string err = write_report_file(out, [&](std::ostream& o) { o.write(bytes.data(), static_cast<std::streamsize>(bytes.size())); });
  if (!err.empty()) {
    fail("trivet plot: ", err);
  }
  std::cerr << "wrote " << out << " (" << r.sets[index].name << ", " << compare::verdict_name(r.sets[index].verdict) << ")\n";
  return r.status == compare::BeamStatus::Agree ? kExitAgree : kExitDisagree;
}



}  // namespace trivet::cli
