// The commands' shared parts (private to harness/cli): the parsed options,
// the exit codes of the contract, the usage error and small helpers.
//   0 every method agrees and every claim holds; 1 a disagreement, a failed
//   claim or an unconfirmed beam; 2 a file or the command line is invalid;
//   3 an internal failure.
#pragma once
#include <memory>
#include <sstream>
#include <stdexcept>
#include <string>
#include <vector>

#include "harness/compare/compare.h"
#include "harness/precision/precision.h"
#include "harness/input/reader.h"
#include "reports/display_units.h"
#include "reports/report.h"

#ifndef TRIVET_VERSION
#define TRIVET_VERSION "0.0.0"
#endif

namespace trivet::cli {

constexpr int kExitAgree = 0, kExitDisagree = 1, kExitInvalid = 2, kExitInternal = 3;

// A usage or input error found before any work: carries the exit code and
// the whole message; main prints it (one line on standard error) and exits.
struct UsageError : std::runtime_error {
  explicit UsageError(const std::string& message, int exit_code = kExitInvalid)
      : std::runtime_error(message), code(exit_code) {}
  int code;
};

// Throws a UsageError (exit 2) whose message is the parts written in order.
template <class... Parts>
[[noreturn]] void fail(const Parts&... parts) {
  std::ostringstream o;
  (o << ... << parts);
  throw UsageError(o.str());
}

struct CheckArgs {
  std::vector<std::string> paths;
  std::string json, junit, html, methods, shard;
  std::string command_line;
  double agreement = 1e-6;
  int stations_per_span = 0;
  unsigned jobs = 0;
  bool all_rows = false;
  // --against and how to read the other program's tables.
  std::vector<std::string> against, columns;
  std::string their_units, their_moment, their_deflection, their_shear, their_reaction, their_reaction_moment, against_case;
  std::string their_separator, their_decimal;
  std::vector<std::string> their_sheets;  // one for every --against file, or one for each
  // --claims: a table of claims added to the beam file's (one beam file only).
  std::string claims, claims_sheet;
  bool html_all = false;
  std::string record;   // --record DIR: a checking record per beam
  std::string arithmetic = "double", reference;
  std::string show_units;  // --show-units (check and plot)
};

// `trivet desk [FILE] [--port N] [--host ADDR] [--open]` (docs/desk-api.md).
struct DeskArgs {
  std::string file;
  std::string host = "127.0.0.1";
  int port = 8320;
  bool open = false;
  std::string command_line;
};

struct SelfcheckArgs {
  std::string json, junit, html, methods, dir, command_line;
  std::string arithmetic = "double", reference;
};

// The shard (0-based) a file belongs to: a hash of its path (FNV-1a).
unsigned shard_of(const std::string& path, unsigned n);
// Colour only on a terminal and never with NO_COLOR.
bool use_color(int fd);
std::vector<std::string> split_list(const std::string& s);
// The units values are shown in (--show-units of `command`, "check" or
// "plot"); empty text: the defaults. A text that cannot be read is a usage
// error (exit 2) naming the option and what it accepts.
reports::ShowUnits show_units_option(const std::string& command, const std::string& text);

// Warnings about digits double may lose, for every beam (a pure function of
// the beam), and, with --arithmetic or --reference, the results in extended
// or exact arithmetic: with --arithmetic the methods' values are replaced by
// the high-precision ones (correctly rounded to double) and the verdict,
// consensus and claims recomputed from them. The high-precision results go
// to `numbers`.
void apply_precision_text(compare::BeamResult& r, std::vector<std::shared_ptr<const precision::LoadSetNumbers>>& numbers,
                          const std::string& text, const input::BeamFile& f, const std::string& arithmetic,
                          const std::string& reference, const compare::Options& opt);

// The check's options from its command line (--methods, --agreement,
// --stations-per-span); an unknown method is a usage error.
compare::Options check_options(const CheckArgs& a);
// One beam, read into `f` from `text`, checked as `trivet check` checks
// each file: --claims merged, the station limit of --stations-per-span,
// the methods, then the precision warnings and --arithmetic/--reference.
// Throws only on an internal failure (the caller reports it).
reports::Report check_beam(input::BeamFile f, const std::string& text, const CheckArgs& a, const compare::Options& opt);

// The commands.
int run_check(const CheckArgs& a);
// The desk: a local web server for one beam (harness/desk).
int run_desk(const DeskArgs& a);
int run_selfcheck(const SelfcheckArgs& a);
// `influence`: the --influence texts (QUANTITY@WHERE); when any is given the
// plot command draws those influence lines instead of the diagrams.
int run_plot(const std::string& file, const std::string& out, const std::string& load_case, const std::string& methods,
             const std::vector<std::string>& influence = {}, const std::string& show_units = "");
int run_merge(const std::vector<std::string>& inputs, const std::string& out_path);
int run_example();
int run_schema();

}  // namespace trivet::cli
