// `trivet plot`: the diagrams of one beam.
#include <iostream>
#include <string>

#include "harness/cli/files.h"
#include "harness/compare/compare.h"
#include "harness/input/reader.h"
#include "reports/plot.h"
#include "harness/cli/commands.h"

namespace trivet::cli {

// `trivet plot FILE -o OUT.svg|.png`: the stacked diagrams of one load set.
int run_plot(const std::string& file, const std::string& out, const std::string& load_case, const std::string& methods) {
  const auto format = reports::format_for_path(out);
  if (!format) {
    fail("trivet plot: -o: the output must end in .svg or .png (got '", out, "')");
  }
  const input::BeamFile f = input::read_beam_file(file);
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
  const std::string bytes = reports::render(reports::plot_data(r, index), *format, 960, 1100, &error);
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
