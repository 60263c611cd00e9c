// trivet: the command line. Sets up the options (CLI11), runs the chosen
// command (each in its own file, see commands.h) and maps outcomes to the
// exit codes of the contract:
//   0 every method agrees and every claim holds; 1 a disagreement, a failed
//   claim or an unconfirmed beam; 2 a file or the command line is invalid;
//   3 an internal failure.
#include <cerrno>
#include <cstring>
#include <csignal>
#include <iostream>
#include <string>
#include <vector>

#include <CLI/CLI.hpp>

#include "harness/cli/commands.h"
#include "methods/registry/registry.h"
#include "harness/cli/files.h"
#include "harness/cli/memory.h"

int main(int argc, char** argv) {
  using namespace trivet::cli;
  std::ios::sync_with_stdio(false);
  // A reader of standard output that goes away (`trivet check lib | head -1`)
  // ends the writing quietly, not the program by a signal.
  std::signal(SIGPIPE, SIG_IGN);
  trivet::cli::prefer_huge_pages();
  CLI::App app{"trivet: checks continuous-beam results by three independent classical methods\n"
               "(three-moment equation, slope-deflection, direct stiffness)."};
  app.set_version_flag("--version", std::string("trivet ") + TRIVET_VERSION);
  app.require_subcommand(1);

  CheckArgs ca;
  CLI::App* check = app.add_subcommand("check", "Check beam files (a directory means every *.json in it, recursively)");
  check->add_option("paths", ca.paths, "Beam files or directories")->required();
  check->add_option("--json", ca.json, "Write the full report as JSON to FILE ('-' for standard output)");
  check->add_option("--methods", ca.methods, "Comma list of " + trivet::registry::names() + " (default all)");
  check->add_option("--agreement", ca.agreement, "Largest relative difference between methods still called agreement")
      ->default_val(1e-6)->check(CLI::PositiveNumber);
  check->add_option("--stations-per-span", ca.stations_per_span, "Equal divisions per span for the diagrams (overrides the file)")
      ->check(CLI::Range(1, 1000));
  check->add_option("--jobs", ca.jobs, "Beams checked in parallel (default: the number of cores)")->check(CLI::Range(1u, 1024u));
  check->add_flag("--all-rows", ca.all_rows, "Print every node and span, however long the beam");
  check->add_option("--junit", ca.junit, "Write a JUnit XML report to FILE (a test suite per beam file)");
  check->add_option("--html", ca.html, "Write a self-contained HTML report with the diagrams to FILE");
  check->add_option("--record", ca.record, "Write a printable checking record per beam (HTML) into the folder DIR");
  check->add_flag("--html-all", ca.html_all, "Every beam's detail in the HTML report (default, past 20 beams: the beams that need attention)");
  check->add_option("--arithmetic", ca.arithmetic, "double (default), extended (50 digits) or exact (rationals; stiffness in extended)")
      ->check(CLI::IsMember({"double", "extended", "exact"}));
  check->add_option("--reference", ca.reference, "Also run in extended or exact arithmetic and report each method's rounding error")
      ->check(CLI::IsMember({"extended", "exact"}));
  const std::string show_units_help = std::string("Units the tables, HTML, records and plots show values in: ") +
                                      trivet::reports::show_units_syntax() +
                                      " (default: kN, kN*m, m, mm for a metric file; kip, kip*ft, ft, in for an imperial one)";
  check->add_option("--show-units", ca.show_units, show_units_help);
  check->add_option("--shard", ca.shard, "Check only the K-th of N parts of the files (K/N, by a hash of the path)");

  check->add_option("--against", ca.against, "Another program's results (CSV, .xlsx or .ods) to compare; a second --against for a reactions table")
      ->expected(1)->take_all();
  check->add_option("--column", ca.columns, "Map a column name of the --against file, e.g. moment=Mz (repeatable)");
  check->add_option("--their-units", ca.their_units, "Units of the --against file, e.g. force=N,length=mm (default: the beam file's)");
  check->add_option("--their-moment", ca.their_moment, "sagging-positive (ours, default) or hogging-positive");
  check->add_option("--their-deflection", ca.their_deflection, "down-positive (ours, default) or up-positive");
  check->add_option("--their-shear", ca.their_shear, "ours (V = dM/dx, default) or opposite");
  check->add_option("--their-reaction", ca.their_reaction, "up-positive (ours, default) or down-positive");
  check->add_option("--their-reaction-moment", ca.their_reaction_moment, "counter-clockwise-positive (ours, default) or clockwise-positive");
  check->add_option("--their-separator", ca.their_separator, "comma, semicolon or tab (default: found from the --against file)");
  check->add_option("--their-decimal", ca.their_decimal, "point or comma (default: found from the --against file)");
  check->add_option("--their-sheet", ca.their_sheets,
                    "The sheet of an .xlsx or .ods --against file (default: the first); once for every file, or once for each")
      ->expected(1)->take_all();
  check->add_option("--against-case", ca.against_case, "The load case the --against results belong to");
  check->add_option("--claims", ca.claims, "A table of claims (CSV, .xlsx or .ods) added to the beam file's (one beam file only)");
  check->add_option("--claims-sheet", ca.claims_sheet, "The sheet of an .xlsx or .ods --claims file (default: the first)");

  SelfcheckArgs sa;
  CLI::App* selfcheck = app.add_subcommand("selfcheck", "Run the built-in cited handbook and textbook cases on every method");
  selfcheck->add_option("--json", sa.json, "Write the verification record as JSON to FILE ('-' for standard output)");
  selfcheck->add_option("--junit", sa.junit, "Write a JUnit XML report to FILE (a test suite per case)");
  selfcheck->add_option("--methods", sa.methods, "Comma list of " + trivet::registry::names() + " (default all)");
  selfcheck->add_option("--html", sa.html, "Write the verification record as a self-contained HTML file");
  selfcheck->add_option("--cases", sa.dir, "Directory of reference cases (default: the bundled library)");
  selfcheck->add_option("--arithmetic", sa.arithmetic, "double (default), extended or exact")
      ->check(CLI::IsMember({"double", "extended", "exact"}));
  selfcheck->add_option("--reference", sa.reference, "Also run in extended or exact arithmetic and report each method's rounding error")
      ->check(CLI::IsMember({"extended", "exact"}));

  std::string plot_file, plot_out, plot_case;
  CLI::App* plot = app.add_subcommand("plot", "Draw the diagrams of one beam, every method overlaid (SVG or PNG)");
  plot->add_option("file", plot_file, "The beam file")->required();
  plot->add_option("-o,--output", plot_out, "OUT.svg or OUT.png")->required();
  plot->add_option("--case", plot_case, "The load case or combination to draw (default: the first)");
  plot->add_option("--methods", ca.methods, "Comma list of " + trivet::registry::names() + " (default all)");
  std::vector<std::string> plot_influence;
  plot->add_option("--influence", plot_influence,
                   "Draw the influence line of QUANTITY@WHERE instead of the diagrams (repeatable): QUANTITY moment, "
                   "shear, deflection or reaction; WHERE a node label (B: the end of the span on its left; B- left, "
                   "B+ right side) or x=7.5 (global x in the file's length unit). Several: OUT-moment-B.svg, ...")
      ->expected(1)->take_all();
  plot->add_option("--show-units", ca.show_units, show_units_help);

  std::vector<std::string> merge_inputs;
  std::string merge_json = "-", merge_junit;
  CLI::App* merge = app.add_subcommand("merge", "Merge the JSON reports of several shards into one report");
  merge->add_option("reports", merge_inputs, "JSON reports written by check --json")->required();
  merge->add_option("--json", merge_json, "Write the merged report to FILE ('-' for standard output, the default)");

  DeskArgs da;
  CLI::App* desk = app.add_subcommand("desk", "Check one beam in the browser: a local web server (127.0.0.1) for the beam file FILE");
  desk->add_option("file", da.file, "The beam file to open and save to (a new one is made on the first save; "
                                    "without it the desk starts from the example and saves nothing)");
  desk->add_option("--port", da.port, "The port to listen on (default 8320; 0: any free port)")
      ->default_val(8320)->check(CLI::Range(0, 65535));
  desk->add_option("--host", da.host, "The address to listen on (default 127.0.0.1, this computer only)")
      ->default_val("127.0.0.1");
  desk->add_flag("--open", da.open, "Open the page in the browser (xdg-open)");

  CLI::App* example = app.add_subcommand("example", "Print a starter beam file");
  CLI::App* schema = app.add_subcommand("schema", "Print the JSON Schema (draft 2020-12) of the beam file");

  for (int i = 0; i < argc; ++i) ca.command_line += (i ? " " : "") + std::string(argv[i]);
  sa.command_line = ca.command_line;
  da.command_line = ca.command_line;
  try {
    app.parse(argc, argv);
  } catch (const CLI::CallForHelp& e) {
    return app.exit(e);
  } catch (const CLI::CallForVersion& e) {
    return app.exit(e);
  } catch (const CLI::ParseError& e) {
    app.exit(e);
    return kExitInvalid;
  }
  int code = kExitInvalid;
  try {
    if (*check) code = run_check(ca);
    else if (*merge) code = run_merge(merge_inputs, merge_json);
    else if (*schema) code = run_schema();
    else if (*selfcheck) code = run_selfcheck(sa);
    else if (*plot) code = run_plot(plot_file, plot_out, plot_case, ca.methods, plot_influence, ca.show_units);
    else if (*example) code = run_example();
    else if (*desk) code = run_desk(da);
  } catch (const UsageError& e) {
    std::cerr << e.what() << "\n";
    return e.code;
  } catch (const std::exception& e) {
    std::cerr << "trivet: internal error: " << e.what() << "\n";
    return kExitInternal;
  }
  // A failed write of standard output (a full disk, /dev/full) is a failure
  // of the run, never exit 0; a pipe whose reader has gone ends quietly.
  errno = 0;
  std::cout.flush();
  if (!std::cout.good() && !stdout_reader_gone()) {
    std::cerr << "trivet: could not write to standard output"
              << (errno ? std::string(" (") + std::strerror(errno) + ")" : std::string()) << "\n";
    return kExitInternal;
  }
  return code;
}
