// trivet: the command line. Parses arguments (CLI11), runs the commands,
// and maps outcomes to the exit codes of the contract:
//   0 every method agrees and every claim holds; 1 a disagreement, a failed
//   claim or an unconfirmed beam; 2 a file or the command line is invalid;
//   3 an internal failure.
#include <algorithm>
#include <atomic>
#include <cstdint>
#include <fstream>
#include <cstdio>
#include <cstdlib>
#include <iostream>
#include <mutex>
#include <sstream>
#include <thread>

#include <unistd.h>

#include <CLI/CLI.hpp>
#include <nlohmann/json.hpp>

#include "harness/cli/files.h"
#include "harness/compare/compare.h"
#include "harness/input/reader.h"
#include "reports/reports.h"

#ifndef TRIVET_VERSION
#define TRIVET_VERSION "0.0.0"
#endif

namespace trivet::cli {
namespace {

constexpr int kExitAgree = 0, kExitDisagree = 1, kExitInvalid = 2, kExitInternal = 3;

const char* kExample = R"({
  "title": "Example: two-span floor beam with an overhang",
  "units": {"force": "kN", "length": "m"},
  "spans": [
    {"length": 6.0, "EI": 42000},
    {"length": 7.5, "E": "210 GPa", "I": "2.3e8 mm^4"},
    {"length": 1.8, "EI": 42000}
  ],
  "supports": ["pinned", "roller", "roller", "free"],
  "labels": ["A", "B", "C", "D"],
  "loads": [
    {"type": "udl", "span": 1, "w": 12.0},
    {"type": "udl", "span": 2, "w": 9.5},
    {"type": "point", "span": 2, "P": 30.0, "at": 3.0},
    {"type": "linear", "span": 3, "w1": 9.5, "w2": 4.0},
    {"type": "point", "node": 4, "P": 5.0}
  ],
  "stations_per_span": 10,
  "claims": {
    "tolerance": "1%",
    "values": [
      {"quantity": "reaction", "node": "A", "value": 22.9},
      {"quantity": "moment", "node": "B", "value": -78.4}
    ]
  }
}
)";

// The shard (0-based) a file belongs to: a hash of its path (FNV-1a), so
// that adding a file does not move the others between shards.
unsigned shard_of(const std::string& path, unsigned n) {
  std::uint64_t h = 1469598103934665603ull;
  for (unsigned char c : path) {
    h ^= c;
    h *= 1099511628211ull;
  }
  return static_cast<unsigned>(h % n);
}

bool use_color(int fd) {
  return isatty(fd) && std::getenv("NO_COLOR") == nullptr;
}

std::vector<std::string> split_list(const std::string& s) {
  std::vector<std::string> out;
  std::string cur;
  for (char c : s) {
    if (c == ',') { if (!cur.empty()) out.push_back(cur); cur.clear(); }
    else if (c != ' ') cur += c;
  }
  if (!cur.empty()) out.push_back(cur);
  return out;
}

struct CheckArgs {
  std::vector<std::string> paths;
  std::string json, junit, methods, shard;
  double agreement = 1e-6;
  int stations_per_span = 0;
  unsigned jobs = 0;
  bool all_rows = false;
};

int run_check(const CheckArgs& a) {
  compare::Options opt;
  opt.agreement = a.agreement;
  if (a.stations_per_span > 0) opt.stations_per_span = a.stations_per_span;
  if (!a.methods.empty()) {
    opt.methods = split_list(a.methods);
    for (const auto& m : opt.methods)
      if (!compare::find_method(m)) {
        std::cerr << "trivet: --methods: unknown method '" << m
                  << "' (one of three-moment, slope-deflection, stiffness)\n";
        return kExitInvalid;
      }
    if (opt.methods.empty()) {
      std::cerr << "trivet: --methods: give at least one method\n";
      return kExitInvalid;
    }
  }
  std::vector<std::pair<std::string, std::string>> problems;
  std::vector<std::string> files = collect_beam_files(a.paths, &problems);
  if (!a.shard.empty()) {
    unsigned k = 0, n = 0;
    char slash = 0;
    std::istringstream in(a.shard);
    if (!(in >> k >> slash >> n) || slash != '/' || n == 0 || k < 1 || k > n || !in.eof()) {
      std::cerr << "trivet: --shard: expected K/N with 1 <= K <= N, e.g. 2/8 (got '" << a.shard << "')\n";
      return kExitInvalid;
    }
    std::vector<std::string> mine;
    for (const auto& f : files)
      if (shard_of(f, n) == k - 1) mine.push_back(f);
    files.swap(mine);
  }

  std::vector<compare::BeamResult> results(files.size());
  std::atomic<std::size_t> next{0}, done{0};
  std::atomic<bool> internal_error{false};
  const bool progress = isatty(2) && files.size() > 5;
  unsigned jobs = a.jobs ? a.jobs : std::max(1u, std::thread::hardware_concurrency());
  jobs = static_cast<unsigned>(std::min<std::size_t>(jobs, std::max<std::size_t>(files.size(), 1)));
  std::mutex progress_mutex;
  auto work = [&] {
    for (;;) {
      const std::size_t i = next++;
      if (i >= files.size()) return;
      try {
        const input::BeamFile f = input::read_beam_file(files[i]);
        results[i] = compare::check(f, opt);
      } catch (const std::exception& e) {
        internal_error = true;
        results[i] = compare::BeamResult{};
        results[i].file = files[i];
        results[i].errors.push_back({"", "", std::string("internal error while checking: ") + e.what()});
      }
      const std::size_t d = ++done;
      if (progress) {
        std::lock_guard<std::mutex> lock(progress_mutex);
        std::cerr << "\rchecked " << d << " of " << files.size() << " beams" << std::flush;
      }
    }
  };
  std::vector<std::thread> pool;
  for (unsigned t = 1; t < jobs; ++t) pool.emplace_back(work);
  work();
  for (auto& t : pool) t.join();
  if (progress) std::cerr << "\r" << std::string(40, ' ') << "\r";

  for (const auto& [path, why] : problems) {
    compare::BeamResult r;
    r.file = path;
    r.errors.push_back({"", "", why});
    results.push_back(std::move(r));
  }

  const bool json_to_stdout = a.json == "-";
  reports::ConsoleOptions copt;
  copt.color = !json_to_stdout && use_color(1);
  copt.all_rows = a.all_rows;
  std::ostream& human = json_to_stdout ? std::cerr : std::cout;
  if (!json_to_stdout)
    for (const auto& r : results) reports::write_console(std::cout, r, copt);
  else
    for (const auto& r : results)
      if (r.status == compare::BeamStatus::Invalid)
        for (const auto& e : r.errors) std::cerr << "error: " << e.format(r.file) << "\n";
  const reports::Summary s = reports::summarize(results);
  reports::write_console_summary(human, s, copt);

  int code = kExitAgree;
  if (!a.json.empty()) {
    reports::RunInfo run{TRIVET_VERSION, opt.methods, opt.agreement};
    const std::string err = write_report_file(a.json, [&](std::ostream& o) { reports::write_json(o, results, run); });
    if (!err.empty()) {
      std::cerr << "trivet: --json: " << err << "\n";
      code = kExitInvalid;
    }
  }
  if (!a.junit.empty()) {
    const std::string err = write_report_file(a.junit, [&](std::ostream& o) { reports::write_junit(o, results, opt.agreement); });
    if (!err.empty()) {
      std::cerr << "trivet: --junit: " << err << "\n";
      code = kExitInvalid;
    }
  }
  if (files.empty() && problems.empty() && a.shard.empty()) {
    std::cerr << "trivet: no beam files found\n";
    return kExitInvalid;
  }
  const bool single_method = opt.methods.size() == 1;
  int verdict = kExitAgree;
  if (s.disagree > 0 || (s.unconfirmed > 0 && !single_method)) verdict = kExitDisagree;
  if (s.invalid > 0) verdict = kExitInvalid;
  if (internal_error) verdict = kExitInternal;
  return std::max(code, verdict);
}

// Joins the JSON reports of several shards: beams in order of file name,
// the summary recounted. Exit code as for check.
int run_merge(const std::vector<std::string>& inputs, const std::string& out_path) {
  nlohmann::ordered_json merged;
  std::vector<nlohmann::ordered_json> beams;
  for (const auto& path : inputs) {
    std::ifstream in(path);
    nlohmann::ordered_json j;
    try {
      if (!in) throw std::runtime_error("cannot open the file");
      j = nlohmann::ordered_json::parse(in);
      if (!j.is_object() || !j.contains("beams") || !j["beams"].is_array()) throw std::runtime_error("not a trivet report (no \"beams\" list)");
    } catch (const std::exception& e) {
      std::cerr << "trivet merge: " << path << ": " << e.what() << "\n";
      return kExitInvalid;
    }
    if (merged.empty()) merged = j;
    for (auto& b : j["beams"]) beams.push_back(b);
  }
  std::stable_sort(beams.begin(), beams.end(), [](const auto& x, const auto& y) {
    return x.value("file", std::string()) < y.value("file", std::string());
  });
  std::size_t agree = 0, disagree = 0, unconfirmed = 0, invalid = 0, claims_failed = 0;
  for (const auto& b : beams) {
    const std::string s = b.value("status", std::string());
    agree += s == "agree"; disagree += s == "disagree"; unconfirmed += s == "unconfirmed"; invalid += s == "invalid";
    if (b.contains("claims"))
      for (const auto& c : b["claims"]) claims_failed += !c.value("holds", false);
  }
  merged["summary"] = {{"beams", beams.size()}, {"agree", agree}, {"disagree", disagree},
                       {"unconfirmed", unconfirmed}, {"invalid", invalid}, {"claims_failed", claims_failed}};
  merged["beams"] = beams;
  const std::string err = write_report_file(out_path, [&](std::ostream& o) { o << merged.dump(1) << "\n"; });
  if (!err.empty()) {
    std::cerr << "trivet merge: " << err << "\n";
    return kExitInvalid;
  }
  std::cerr << "merged " << inputs.size() << " reports: " << beams.size() << " beams: " << agree << " agree, "
            << disagree << " disagree, " << unconfirmed << " unconfirmed, " << invalid << " invalid; "
            << claims_failed << " claims fail\n";
  if (invalid) return kExitInvalid;
  if (disagree || unconfirmed) return kExitDisagree;
  return kExitAgree;
}

}  // namespace
}  // namespace trivet::cli

int main(int argc, char** argv) {
  using namespace trivet::cli;
  std::ios::sync_with_stdio(false);
  CLI::App app{"trivet: checks continuous-beam results by three independent classical methods\n"
               "(three-moment equation, slope-deflection, direct stiffness)."};
  app.set_version_flag("--version", std::string("trivet ") + TRIVET_VERSION);
  app.require_subcommand(1);

  CheckArgs ca;
  CLI::App* check = app.add_subcommand("check", "Check beam files (a directory means every *.json in it, recursively)");
  check->add_option("paths", ca.paths, "Beam files or directories")->required();
  check->add_option("--json", ca.json, "Write the full report as JSON to FILE ('-' for standard output)");
  check->add_option("--methods", ca.methods, "Comma list of three-moment, slope-deflection, stiffness (default all)");
  check->add_option("--agreement", ca.agreement, "Largest relative difference between methods still called agreement")
      ->default_val(1e-6)->check(CLI::PositiveNumber);
  check->add_option("--stations-per-span", ca.stations_per_span, "Equal divisions per span for the diagrams (overrides the file)")
      ->check(CLI::Range(1, 1000));
  check->add_option("--jobs", ca.jobs, "Beams checked in parallel (default: the number of cores)")->check(CLI::Range(1u, 1024u));
  check->add_flag("--all-rows", ca.all_rows, "Print every node and span, however long the beam");
  check->add_option("--junit", ca.junit, "Write a JUnit XML report to FILE (a test suite per beam file)");
  check->add_option("--shard", ca.shard, "Check only the K-th of N parts of the files (K/N, by a hash of the path)");

  std::vector<std::string> merge_inputs;
  std::string merge_json = "-", merge_junit;
  CLI::App* merge = app.add_subcommand("merge", "Merge the JSON reports of several shards into one report");
  merge->add_option("reports", merge_inputs, "JSON reports written by check --json")->required();
  merge->add_option("--json", merge_json, "Write the merged report to FILE ('-' for standard output, the default)");

  CLI::App* example = app.add_subcommand("example", "Print a starter beam file");

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
  try {
    if (*check) return run_check(ca);
    if (*merge) return run_merge(merge_inputs, merge_json);
    if (*example) {
      std::cout << kExample;
      return kExitAgree;
    }
  } catch (const std::exception& e) {
    std::cerr << "trivet: internal error: " << e.what() << "\n";
    return kExitInternal;
  }
  return kExitInvalid;
}
