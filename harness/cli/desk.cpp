// `trivet desk`: the local web server for one beam (harness/desk), given
// the very check of `trivet check` (check_beam in check.cpp) and its
// report options, so the page shows what the command would report.
#include <iostream>
#include <sstream>
#include <string>

#include "harness/desk/server.h"
#include "reports/html_report.h"
#include "reports/reports.h"

#include "harness/cli/commands.h"

namespace trivet::cli {

namespace {

// The starter beam of `trivet example`, as that command prints it.
std::string starter_beam() {
  std::ostringstream text;
  std::streambuf* const old = std::cout.rdbuf(text.rdbuf());
  try {
    run_example();
  } catch (...) {
    std::cout.rdbuf(old);
    throw;
  }
  std::cout.rdbuf(old);
  return text.str();
}

}  // namespace

int run_desk(const DeskArgs& a) {
  desk::Options o;
  o.file = a.file;
  o.host = a.host;
  o.port = a.port;
  o.open = a.open;
  if (const std::string why = desk::startup_problem(o); !why.empty()) fail("trivet desk: ", why);

  // The check as `trivet check FILE` runs it with no options.
  const CheckArgs check_args;
  const compare::Options opt = check_options(check_args);
  const reports::ShowUnits show = show_units_option("check", check_args.show_units);

  desk::Backend b;
  b.check = [check_args, opt](const std::string& text, const std::string& name) {
    return check_beam(input::parse_beam_text(text, name), text, check_args, opt);
  };
  b.run = reports::RunInfo{TRIVET_VERSION, opt.methods, opt.agreement};
  // The HTML report's options as `trivet check --html` sets them.
  b.html.agreement = opt.agreement;
  b.html.tool_version = TRIVET_VERSION;
  b.html.command_line = a.command_line;
  b.html.show = show;
  b.console.show = show;
  b.console.color = false;
  b.starter = starter_beam();
  return desk::serve(o, b);
}

}  // namespace trivet::cli
