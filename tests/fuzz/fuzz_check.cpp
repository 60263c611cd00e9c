// libFuzzer target: one beam file's text through the reader, the whole
// check with every method, and the JSON, JUnit and console reports (into
// strings); and the same bytes as another program's CSV export (any
// separator and decimal mark) compared with a fixed beam (--against), as an
// .xlsx and as an .ods file (--against), and as a table of claims (CSV,
// .xlsx, .ods; --claims). Built with -DTRIVET_FUZZ=ON by clang (scripts/ci-fuzz.sh).
// The limits are small, so that the fuzzer explores the reading and the
// checking rather than solving huge beams.
#include <cstddef>
#include <cstdint>
#include <sstream>
#include <string>

#include "harness/compare/against.h"
#include "harness/compare/claims_table.h"
#include "harness/compare/compare.h"
#include "harness/input/reader.h"
#include "reports/reports.h"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  using namespace trivet;
  const std::string text(reinterpret_cast<const char*>(data), size);
  input::Limits limits;
  limits.max_file_bytes = 1u << 20;
  limits.max_spans = 64;
  limits.max_loads = 256;
  limits.max_stations_per_span = 50;
  limits.max_stations = 4000;
  limits.max_load_sets = 8;
  const input::BeamFile file = input::parse_beam_text(text, "fuzz.json", limits);
  for (const auto& e : file.errors) {
    // Every message names the location and a reason.
    if (e.reason.empty()) __builtin_trap();
  }
  compare::Options opt;
  std::vector<reports::Report> results;
  results.push_back(compare::check(file, opt));
  // Invalid exactly when the reader refuses the file, or when no method can
  // compute the accepted beam in double (and the error says so).
  const reports::Report& last = results.back();
  if (!file.ok() && last.status != compare::BeamStatus::Invalid) __builtin_trap();
  if (file.ok() && last.status == compare::BeamStatus::Invalid) {
    bool uncomputable = !last.errors.empty();
    for (const auto& e : last.errors)
      uncomputable = uncomputable && e.reason.find("no method could compute") != std::string::npos;
    if (!uncomputable) __builtin_trap();
  }
  std::ostringstream json, junit, console;
  reports::RunInfo run{"fuzz", {}, opt.agreement};
  reports::write_json(json, results, run);
  reports::write_junit(junit, results, 1e-6);
  reports::ConsoleOptions copt;
  reports::write_console(console, results.back(), copt);
  reports::write_console_summary(console, reports::summarize(results), copt);

  // The bytes as an --against table for a fixed two-span beam.
  static const input::BeamFile fixed = input::parse_beam_text(
      R"({"units": {"force": "kN", "length": "m"}, "spans": [{"length": 4, "EI": 1000}, {"length": 5, "EI": 1000}],
          "supports": ["pinned", "roller", "roller"], "loads": [{"type": "udl", "span": 1, "w": 3},
          {"type": "point", "span": 2, "P": 4, "at": 2}]})",
      "fixed.json");
  static const compare::BeamResult fixed_result = compare::check(fixed, opt);
  compare::against::Options ao;
  ao.limits.max_file_bytes = 1u << 20;
  const compare::against::Comparison cmp = compare::against::compare_text(fixed, fixed_result, text, "fuzz.csv", ao);
  for (const auto& e : cmp.errors)
    if (e.reason.empty()) __builtin_trap();

  // The bytes as a spreadsheet export, and as a table of claims.
  for (const auto format : {compare::sheet::Format::Xlsx, compare::sheet::Format::Ods}) {
    const compare::against::Comparison s = compare::against::compare_sheet_bytes(fixed, fixed_result, text, format, "fuzz", ao);
    for (const auto& e : s.errors)
      if (e.reason.empty()) __builtin_trap();
    const compare::claims_table::Read c = compare::claims_table::read_sheet_bytes(fixed, text, format, "fuzz");
    for (const auto& e : c.errors)
      if (e.reason.empty()) __builtin_trap();
    if (!c.ok() && !c.claims.empty()) __builtin_trap();
  }
  input::BeamFile with_claims = fixed;
  compare::claims_table::merge(with_claims, compare::claims_table::read_text(fixed, text, "fuzz.csv"));
  const compare::BeamResult claimed = compare::check(with_claims, opt);
  // A table with errors makes the beam invalid; one without adds its claims, each evaluated or with its reason.
  if (!with_claims.ok() && claimed.status != compare::BeamStatus::Invalid) __builtin_trap();
  for (const auto& c : claimed.claims)
    if (!c.evaluated && c.reason.empty()) __builtin_trap();
  return 0;
}
