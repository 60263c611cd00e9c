// trivet: the command line. Parses arguments (CLI11), runs the commands,
// and maps outcomes to the exit codes of the contract:
//   0 every method agrees and every claim holds; 1 a disagreement, a failed
//   claim or an unconfirmed beam; 2 a file or the command line is invalid;
//   3 an internal failure.
#include <algorithm>
#include <atomic>
#include <condition_variable>
#include <csignal>
#include <cstdint>
#include <fstream>
#include <iterator>
#include <cstdio>
#include <cstdlib>
#include <iostream>
#include <mutex>
#include <sstream>
#include <thread>

#include <unistd.h>

#include <unistd.h>

#include <CLI/CLI.hpp>
#include <nlohmann/json.hpp>

#include "harness/cli/files.h"
#include "harness/cli/memory.h"
#include "harness/compare/against.h"
#include "harness/compare/compare.h"
#include "harness/input/reader.h"
#include "harness/precision/exact_reader.h"
#include "harness/precision/precision.h"
#include "harness/input/schema.h"
#include "references/selfcheck.h"
#include "reports/html_report.h"
#include "reports/plot.h"
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
  std::string json, junit, html, methods, shard;
  std::string command_line;
  double agreement = 1e-6;
  int stations_per_span = 0;
  unsigned jobs = 0;
  bool all_rows = false;
  // --against and how to read the other program's tables.
  std::vector<std::string> against, columns;
  std::string their_units, their_moment, their_deflection, their_shear, their_reaction, their_reaction_moment, against_case;
  std::string arithmetic = "double", reference;
};

// Warnings about digits double may lose, for every beam (a pure function of
// the beam), and, with --arithmetic or --reference, the results in extended
// or exact arithmetic: with --arithmetic the methods' values are replaced by
// the high-precision ones (correctly rounded to double) and the verdict,
// consensus and claims recomputed from them.
void apply_precision_text(compare::BeamResult& r, const std::string& text, const input::BeamFile& f,
                          const std::string& arithmetic, const std::string& reference, const compare::Options& opt);

void apply_precision_text(compare::BeamResult& r, const std::string& text, const input::BeamFile& f,
                          const std::string& arithmetic, const std::string& reference, const compare::Options& opt) {
  struct Args { std::string arithmetic, reference; } a{arithmetic, reference};
  {
    const precision::Conditioning c = precision::estimate_conditioning(f.beam, std::nullopt, 6, 1);  // warnings only
    for (const auto& w : c.warnings) r.warnings.push_back(w);
  }
  const bool want = a.arithmetic != "double" || !a.reference.empty();
  if (!want) return;
  precision::Options po;
  po.methods = opt.methods;
  po.stations_per_span = opt.stations_per_span;
  const std::string& ar = a.arithmetic != "double" ? a.arithmetic : a.reference;
  po.arithmetic = ar == "exact" ? precision::Arithmetic::Exact : precision::Arithmetic::Extended;
  po.reference = true;
  const precision::FileNumbers fn = precision::run_file(text, f, po);
  if (!fn.ok) {
    r.warnings.push_back("the " + ar + " arithmetic run could not be made: " + fn.error);
    return;
  }
  for (const auto& set : fn.sets) {
    r.precision.push_back(std::make_shared<precision::LoadSetNumbers>(set));
    if (set.conditioning.measured_digits_lost && *set.conditioning.measured_digits_lost > po.warn_digits)
      for (const auto& w : set.conditioning.warnings)
        if (std::find(r.warnings.begin(), r.warnings.end(), w) == r.warnings.end()) r.warnings.push_back(w);
  }
  if (a.arithmetic == "double") return;
  // Replace the double values by the high-precision ones.
  for (auto& set : r.sets) {
    const precision::LoadSetNumbers* pn = nullptr;
    for (const auto& p : r.precision)
      if (p->load_case == set.name) pn = p.get();
    if (!pn || set.envelope) continue;
    for (auto& m : set.methods) {
      if (m.status != MethodStatus::Ok) continue;
      for (const auto& mn : pn->methods) {
        if (mn.name != m.name || mn.status != MethodStatus::Ok) continue;
        if (mn.nodes.size() != m.nodes.size() || mn.stations.size() != m.stations.size()) continue;
        for (std::size_t j = 0; j < m.nodes.size(); ++j) {
          NodeResult& n = m.nodes[j];
          const precision::NodeNumbers& x = mn.nodes[j];
          if (n.moment_left && x.moment_left) n.moment_left = x.moment_left->value;
          if (n.moment_right && x.moment_right) n.moment_right = x.moment_right->value;
          n.reaction_force = x.reaction_force.value;
          n.reaction_moment = x.reaction_moment.value;
          n.deflection = x.deflection.value;
          n.rotation_left = x.rotation_left.value;
          n.rotation_right = x.rotation_right.value;
        }
        for (std::size_t i = 0; i < m.stations.size(); ++i) {
          m.stations[i].shear = mn.stations[i].shear.value;
          m.stations[i].moment = mn.stations[i].moment.value;
          m.stations[i].deflection = mn.stations[i].deflection.value;
          m.stations[i].rotation = mn.stations[i].rotation.value;
        }
      }
    }
  }
  compare::refresh(r, f, opt);
}

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
  {
    // A report path must not name a file being read (it would be overwritten).
    std::vector<std::string> inputs = files;
    inputs.insert(inputs.end(), a.against.begin(), a.against.end());
    const char* const options[] = {"--json", "--junit", "--html"};
    const auto [which, why] = report_clashes_with_input(std::vector<std::string>{a.json, a.junit, a.html}, inputs);
    if (!why.empty()) {
      std::cerr << "trivet: " << options[which] << ": " << why << "\n";
      return kExitInvalid;
    }
  }
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

  // Each beam is read, checked and written out (console text, JSON and
  // JUnit parts) by a worker, so that report writing runs in parallel too
  // and a checked beam's results can be let go at once. The main thread
  // takes the parts in file order as they are ready and writes them to the
  // console and the report files while the workers go on, so the output
  // does not depend on --jobs. The report files' counts come first, so
  // their heads are written with room for the counts and written again at
  // the end. --html and --against need the whole results afterwards: then
  // they are kept (and with --against, written after the comparison).
  const bool json_to_stdout = a.json == "-";
  reports::ConsoleOptions copt;
  copt.color = !json_to_stdout && use_color(1);
  copt.all_rows = a.all_rows;
  // One beam (perhaps a very long one) is written straight from its results
  // instead, without a copy of its report text in memory.
  const bool single = files.size() == 1;
  const bool keep_results = !a.html.empty() || !a.against.empty() || single;
  const bool render_in_workers = a.against.empty() && !single;
  struct Rendered {
    std::string console;  // the beam's tables; with --json -, its errors (for stderr)
    std::string json;
    std::string junit;
    reports::JunitCounts junit_counts;
    compare::BeamStatus status = compare::BeamStatus::Invalid;
    std::size_t claims_failed = 0;
  };
  std::vector<compare::BeamResult> results(files.size());
  std::vector<Rendered> rendered(files.size());
  unsigned jobs = a.jobs ? a.jobs : std::max(1u, std::thread::hardware_concurrency());
  jobs = static_cast<unsigned>(std::min<std::size_t>(jobs, std::max<std::size_t>(files.size(), 1)));

  const reports::RunInfo run{TRIVET_VERSION, opt.methods, opt.agreement};
  ReportFile json_file, junit_file;
  std::string json_err, junit_err;
  bool json_stream = false, junit_stream = false;  // written as the run goes on
  if (render_in_workers) {
    if (!a.json.empty()) {
      json_err = json_file.open(a.json);
      json_stream = json_err.empty() && json_file.seekable();
      if (json_stream) json_file.out() << reports::json_head({}, run, true);
    }
    if (!a.junit.empty()) {
      junit_err = junit_file.open(a.junit);
      junit_stream = junit_err.empty() && junit_file.seekable();
      if (junit_stream) junit_file.out() << reports::junit_head({}, true);
    }
  }

  auto render = [&](const compare::BeamResult& r, Rendered& out) {
    out.status = r.status;
    out.claims_failed = r.claims_failed();
    {
      std::ostringstream con;
      if (!json_to_stdout) reports::write_console(con, r, copt);
      else if (r.status == compare::BeamStatus::Invalid)
        for (const auto& e : r.errors) con << "error: " << e.format(r.file) << "\n";
      out.console = con.str();
    }
    if (!a.json.empty()) reports::json_beam_fragment(r, out.json);
    if (!a.junit.empty()) out.junit_counts = reports::junit_suite(r, opt.agreement, out.junit);
  };
  std::atomic<std::size_t> next{0};
  std::atomic<bool> internal_error{false};
  // Progress on a terminal, kept by the writing thread: it clears the line
  // before a beam's text goes to the same terminal, then puts it back.
  const bool progress = render_in_workers && isatty(2) && files.size() > 5;
  const bool human_on_terminal = isatty(json_to_stdout ? 2 : 1);
  std::mutex ready_mutex;
  std::condition_variable ready_cv;
  std::vector<char> ready(files.size(), 0);
  // Checks beam i (and, for a library, renders it and marks it ready).
  auto check_one = [&](std::size_t i) {
    compare::BeamResult& r = results[i];
    try {
      std::string text;
      input::BeamFile f = input::read_beam_file(files[i], {}, &text);
      if (a.arithmetic == "double" && a.reference.empty()) std::string().swap(text);  // only exact reading needs it
      // --stations-per-span may ask for more stations than the file's limit allows.
      if (f.ok() && a.stations_per_span > 0)
        if (auto e = input::station_limit_error(f, a.stations_per_span)) f.errors.push_back(*e);
      r = compare::check(f, opt);
      if (r.status != compare::BeamStatus::Invalid && f.ok()) {
        try { apply_precision_text(r, text, f, a.arithmetic, a.reference, opt); }
        catch (const std::exception& e) { r.warnings.push_back(std::string("arithmetic run failed: ") + e.what()); }
      }
    } catch (const std::exception& e) {
      internal_error = true;
      r = compare::BeamResult{};
      r.file = files[i];
      r.errors.push_back({"", "", std::string("internal error while checking: ") + e.what()});
    }
    if (render_in_workers) {
      try { render(r, rendered[i]); }
      catch (const std::exception& e) {
        internal_error = true;
        rendered[i].console = "trivet: internal error while writing the report of " + files[i] + ": " + e.what() + "\n";
      }
      if (!keep_results) r = compare::BeamResult{};
      {
        std::lock_guard<std::mutex> lock(ready_mutex);
        ready[i] = 1;
      }
      ready_cv.notify_one();
    }
  };
  auto work = [&] {
    for (std::size_t i; (i = next++) < files.size();) check_one(i);
  };

  std::ostream& human = json_to_stdout ? std::cerr : std::cout;
  reports::Summary s;
  reports::JunitCounts junit_total;
  bool any_json = false;
  // Writes one beam's parts and lets them go (those for standard output
  // wait for the end, where the counts are known).
  auto emit = [&](Rendered& r) {
    human << r.console;
    std::string().swap(r.console);
    s.add(r.status, r.claims_failed);
    junit_total.tests += r.junit_counts.tests;
    junit_total.failures += r.junit_counts.failures;
    junit_total.errors += r.junit_counts.errors;
    if (json_stream) {
      if (any_json) json_file.out() << ',';
      json_file.out() << r.json;
    }
    if (json_stream || !json_err.empty()) std::string().swap(r.json);
    any_json = true;
    if (junit_stream) junit_file.out() << r.junit;
    if (junit_stream || !junit_err.empty()) std::string().swap(r.junit);
  };
  if (render_in_workers) {
    // The main thread is one of the `jobs` checkers: between beams of its
    // own it writes, in file order, every beam that is ready, and at the
    // end it waits for the rest. (A separate writing thread would make one
    // thread more than cores, and a wake-up per beam.)
    std::vector<std::thread> pool;
    for (unsigned t = 1; t < jobs; ++t) pool.emplace_back(work);
    std::size_t written = 0;
    auto write_ready = [&](bool wait) {
      while (written < files.size()) {
        {
          std::unique_lock<std::mutex> lock(ready_mutex);
          if (wait) ready_cv.wait(lock, [&] { return ready[written] != 0; });
          else if (!ready[written]) return;
        }
        if (progress && human_on_terminal) std::cerr << "\r" << std::string(40, ' ') << "\r" << std::flush;
        emit(rendered[written]);
        ++written;
        if (progress) {
          if (human_on_terminal) human.flush();
          std::cerr << "\rchecked " << written << " of " << files.size() << " beams" << std::flush;
        }
      }
    };
    for (std::size_t i; (i = next++) < files.size();) {
      check_one(i);
      write_ready(false);
    }
    write_ready(true);
    for (auto& t : pool) t.join();
  } else {
    std::vector<std::thread> pool;
    for (unsigned t = 1; t < jobs; ++t) pool.emplace_back(work);
    work();
    for (auto& t : pool) t.join();
  }
  if (progress) std::cerr << "\r" << std::string(40, ' ') << "\r";

  bool against_invalid = false;
  if (!a.against.empty()) {
    namespace ag = compare::against;
    ag::Options ao;
    std::vector<std::pair<std::string, std::string>> settings;
    for (const auto& c : a.columns) settings.push_back({"column", c});
    if (!a.their_units.empty()) settings.push_back({"units", a.their_units});
    if (!a.their_moment.empty()) settings.push_back({"moment-sign", a.their_moment});
    if (!a.their_deflection.empty()) settings.push_back({"deflection-sign", a.their_deflection});
    if (!a.their_shear.empty()) settings.push_back({"shear-sign", a.their_shear});
    if (!a.their_reaction.empty()) settings.push_back({"reaction-sign", a.their_reaction});
    if (!a.their_reaction_moment.empty()) settings.push_back({"reaction-moment-sign", a.their_reaction_moment});
    if (!a.against_case.empty()) settings.push_back({"case", a.against_case});
    for (const auto& [name, value] : settings) {
      const std::string err = ag::set_option(ao, name, value);
      if (!err.empty()) {
        std::cerr << "trivet: --" << (name == "column" ? "column" : name) << ": " << err << "\n";
        return kExitInvalid;
      }
    }
    if (files.size() != 1 || !problems.empty()) {
      std::cerr << "trivet: --against compares one beam file with another program's results; give exactly one beam file\n";
      return kExitInvalid;
    }
    if (results[0].status != compare::BeamStatus::Invalid) {
      const input::BeamFile f = input::read_beam_file(files[0]);
      for (const auto& path : a.against) {
        auto cmp = std::make_shared<ag::Comparison>(ag::compare_file(f, results[0], path, ao));
        if (!cmp->ok()) against_invalid = true;
        else if (!cmp->holds()) results[0].status = compare::BeamStatus::Disagree;
        results[0].against.push_back(cmp);
      }
    }
  }

  for (const auto& [path, why] : problems) {
    compare::BeamResult r;
    r.file = path;
    r.errors.push_back({"", "", why});
    if (render_in_workers) {
      rendered.emplace_back();
      render(r, rendered.back());
      emit(rendered.back());
    }
    if (keep_results) results.push_back(std::move(r));
  }

  // One beam, or --against: the console tables and reports straight from
  // the results.
  if (!render_in_workers) {
    for (const auto& r : results) {
      if (!json_to_stdout) reports::write_console(std::cout, r, copt);
      else if (r.status == compare::BeamStatus::Invalid)
        for (const auto& e : r.errors) std::cerr << "error: " << e.format(r.file) << "\n";
    }
    s = reports::summarize(results);
  }
  reports::write_console_summary(human, s, copt);

  int code = kExitAgree;
  if (!a.json.empty()) {
    std::string err;
    if (!render_in_workers) {
      err = write_report_file(a.json, [&](std::ostream& o) { reports::write_json(o, results, run); });
    } else if (!json_err.empty()) {
      err = json_err;
    } else if (json_stream) {
      std::ostream& o = json_file.out();
      o << reports::json_tail(any_json);
      o.seekp(0);
      o << reports::json_head(s, run, true);  // the same length, now with the counts
      err = json_file.commit();
    } else {  // standard output: the parts were kept
      std::vector<std::string_view> parts;
      parts.reserve(rendered.size());
      for (const auto& r : rendered) parts.push_back(r.json);
      reports::write_json_fragments(json_file.out(), s, parts, run);
      err = json_file.commit();
    }
    if (!err.empty()) {
      std::cerr << "trivet: --json: " << err << "\n";
      code = kExitInvalid;
    }
  }
  if (!a.html.empty()) {
    reports::HtmlOptions ho;
    ho.tool_version = TRIVET_VERSION;
    ho.command_line = a.command_line;
    reports::HtmlStats st;
    const std::string err = write_report_file(a.html, [&](std::ostream& o) { st = reports::write_html(o, results, ho); });
    if (!err.empty()) {
      std::cerr << "trivet: --html: " << err << "\n";
      code = kExitInvalid;
    } else if (!st.plot_error.empty()) {
      std::cerr << "trivet: --html: the report was written without some plots: " << st.plot_error << "\n";
    }
  }
  if (!a.junit.empty()) {
    std::string err;
    if (!render_in_workers) {
      err = write_report_file(a.junit, [&](std::ostream& o) { reports::write_junit(o, results, opt.agreement); });
    } else if (!junit_err.empty()) {
      err = junit_err;
    } else if (junit_stream) {
      std::ostream& o = junit_file.out();
      o << reports::junit_tail();
      o.seekp(0);
      o << reports::junit_head(junit_total, true);
      err = junit_file.commit();
    } else {
      std::vector<reports::JunitCounts> counts;
      std::vector<std::string_view> suites;
      for (const auto& r : rendered) {
        counts.push_back(r.junit_counts);
        suites.push_back(r.junit);
      }
      reports::write_junit_suites(junit_file.out(), counts, suites);
      err = junit_file.commit();
    }
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
  if (s.invalid > 0 || against_invalid) verdict = kExitInvalid;
  if (internal_error) verdict = kExitInternal;
  return std::max(code, verdict);
}

struct SelfcheckArgs {
  std::string json, junit, html, methods, dir, command_line;
  std::string arithmetic = "double", reference;
};

// `trivet plot FILE -o OUT.svg|.png`: the stacked diagrams of one load set.
int run_plot(const std::string& file, const std::string& out, const std::string& load_case, const std::string& methods) {
  const auto format = reports::format_for_path(out);
  if (!format) {
    std::cerr << "trivet plot: -o: the output must end in .svg or .png (got '" << out << "')\n";
    return kExitInvalid;
  }
  const input::BeamFile f = input::read_beam_file(file);
  compare::Options opt;
  if (!methods.empty()) opt.methods = split_list(methods);
  const compare::BeamResult r = compare::check(f, opt);
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
      std::cerr << "trivet plot: --case: no load case or combination '" << load_case << "' in " << file << " (";
      for (std::size_t i = 0; i < r.sets.size(); ++i) std::cerr << (i ? ", " : "") << r.sets[i].name;
      std::cerr << ")\n";
      return kExitInvalid;
    }
  }
  std::string error;
  const std::string bytes = reports::render(reports::plot_data(r, index), *format, 960, 1100, &error);
  if (bytes.empty()) {
    std::cerr << "trivet plot: " << error << "\n";
    return kExitInvalid;
  }
  const std::string err = write_report_file(out, [&](std::ostream& o) { o.write(bytes.data(), static_cast<std::streamsize>(bytes.size())); });
  if (!err.empty()) {
    std::cerr << "trivet plot: " << err << "\n";
    return kExitInvalid;
  }
  std::cerr << "wrote " << out << " (" << r.sets[index].name << ", " << compare::verdict_name(r.sets[index].verdict) << ")\n";
  return r.status == compare::BeamStatus::Agree ? kExitAgree : kExitDisagree;
}


// `trivet selfcheck`: every cited case on every method, a table, and exit 0
// only when every published value holds on every applicable method.
int run_selfcheck(const SelfcheckArgs& a) {
  compare::Options opt;
  if (!a.methods.empty()) {
    opt.methods = split_list(a.methods);
    for (const auto& m : opt.methods)
      if (!compare::find_method(m)) {
        std::cerr << "trivet: --methods: unknown method '" << m << "' (one of three-moment, slope-deflection, stiffness)\n";
        return kExitInvalid;
      }
  }
  // In extended or exact arithmetic, each case's methods' values at the nodes
  // and stations are replaced by the high-precision ones before the published
  // values are compared (values between stations are still from double).
  references::AfterCheck after = nullptr;
  std::vector<std::pair<std::string, std::string>> rounding;  // case id, text
  std::mutex rounding_mutex;
  if (a.arithmetic != "double" || !a.reference.empty()) {
    after = [&](compare::BeamResult& br, const references::ReferenceCase& ref) {
      apply_precision_text(br, ref.beam_text, ref.beam, a.arithmetic, a.reference, opt);
      std::string line;
      for (const auto& pn : br.precision)
        for (const auto& m : pn->methods)
          if (m.rounding && m.rounding->measured) {
            char buf[64];
            std::snprintf(buf, sizeof buf, " %s %.1f", m.name.c_str(), m.rounding->worst_digits);
            line += buf;
          }
      std::lock_guard<std::mutex> lock(rounding_mutex);
      rounding.push_back({ref.id, line});
    };
  }
  const references::SelfcheckResult r =
      references::run_selfcheck(a.dir.empty() ? references::directory() : a.dir, opt, after);
  const bool to_stdout = a.json == "-";
  std::ostream& human = to_stdout ? std::cerr : std::cout;
  const bool color = !to_stdout && use_color(1);
  auto paint = [&](const std::string& t, bool good) {
    return color ? std::string(good ? "\033[32m" : "\033[1;31m") + t + "\033[0m" : t;
  };
  if (!to_stdout) {
    for (const auto& c : r.cases) {
      std::cout << c.id << "  [" << paint(c.holds ? "holds" : "FAILS", c.holds) << "]  " << c.title << "\n";
      std::cout << "  source: " << c.citation << "\n";
      for (const auto& [id, line] : rounding)
        if (id == c.id && !line.empty())
          std::cout << "  arithmetic: " << (a.arithmetic != "double" ? a.arithmetic : "double, reference " + a.reference)
                    << "; correct digits of the double results:" << line << "\n";
      for (const auto& e : c.errors) std::cout << "  error: " << e.format(c.file) << "\n";
      for (const auto& [m, why] : c.methods_skipped) std::cout << "  " << m << ": not applicable (" << why << ")\n";
      for (const auto& [m, why] : c.methods_failed) std::cout << "  " << m << ": " << paint("failed", false) << " (" << why << ")\n";
      if (!c.verdict_problem.empty()) std::cout << "  " << c.verdict_problem << "\n";
      auto g = [](double x, int digits) {
        char buf[48];
        std::snprintf(buf, sizeof buf, "%.*g", digits, x);
        return std::string(buf);
      };
      for (const auto& v : c.values) {
        std::string printed = v.published;
        if (!v.multiplier.empty() && v.multiplier != "1")
          printed = printed == "1" ? v.multiplier : printed == "-1" ? "-" + v.multiplier : printed + " " + v.multiplier;
        if (v.magnitude) printed += " (printed without sign; the magnitude is compared)";
        std::cout << "  " << (v.holds ? "  ok " : paint("FAIL ", false)) << v.quantity << " at " << v.where << ": published "
                  << printed << " = " << g(v.expected, 10) << " +- " << g(v.tolerance, 2) << "; computed";
        for (const auto& m : v.methods) {
          if (!m.evaluated) continue;
          std::cout << " " << m.method << " " << g(m.computed, 10) << (m.holds ? "" : " (out)");
        }
        std::cout << "\n";
      }
    }
  }
  human << "selfcheck: " << r.cases.size() << " cited cases, " << r.values_checked() << " published values: "
        << r.cases.size() - r.cases_failed() << " cases hold, " << r.cases_failed() << " fail ("
        << r.values_failed() << " values out of tolerance)\n";
  human << "caution: " << compare::caution_text() << "\n";
  int code = r.holds() ? kExitAgree : kExitDisagree;
  if (!a.json.empty()) {
    const std::string err = write_report_file(a.json, [&](std::ostream& o) {
      nlohmann::ordered_json j;
      j["tool"] = {{"name", "trivet"}, {"version", TRIVET_VERSION}};
      j["summary"] = {{"cases", r.cases.size()}, {"cases_failed", r.cases_failed()},
                      {"values", r.values_checked()}, {"values_failed", r.values_failed()}};
      j["caution"] = compare::caution_text();
      nlohmann::ordered_json cases = nlohmann::ordered_json::array();
      for (const auto& c : r.cases) {
        nlohmann::ordered_json jc;
        jc["id"] = c.id; jc["file"] = c.file; jc["title"] = c.title; jc["source"] = c.citation;
        jc["holds"] = c.holds; jc["verdict"] = compare::verdict_name(c.verdict); jc["problem"] = c.verdict_problem;
        nlohmann::ordered_json errs = nlohmann::ordered_json::array();
        for (const auto& e : c.errors) errs.push_back(e.format(c.file));
        jc["errors"] = errs;
        nlohmann::ordered_json skipped = nlohmann::ordered_json::object();
        for (const auto& [m, why] : c.methods_skipped) skipped[m] = why;
        jc["not_applicable"] = skipped;
        nlohmann::ordered_json vals = nlohmann::ordered_json::array();
        for (const auto& v : c.values) {
          nlohmann::ordered_json jv;
          jv["quantity"] = v.quantity; jv["where"] = v.where; jv["case"] = v.load_case;
          jv["published"] = v.published; jv["multiplier"] = v.multiplier; jv["expected"] = v.expected;
          jv["tolerance"] = v.tolerance; jv["tolerance_rule"] = v.tolerance_rule; jv["unsigned"] = v.magnitude; jv["holds"] = v.holds;
          nlohmann::ordered_json ms = nlohmann::ordered_json::object();
          for (const auto& m : v.methods)
            ms[m.method] = {{"status", method_status_name(m.status)}, {"computed", m.evaluated ? nlohmann::ordered_json(m.computed) : nlohmann::ordered_json(nullptr)},
                            {"holds", m.holds}, {"reason", m.reason}};
          jv["methods"] = ms;
          vals.push_back(jv);
        }
        jc["values"] = vals;
        cases.push_back(jc);
      }
      j["cases"] = cases;
      o << j.dump(1) << "\n";
    });
    if (!err.empty()) { std::cerr << "trivet: --json: " << err << "\n"; code = kExitInvalid; }
  }
  if (!a.html.empty()) {
    reports::HtmlOptions ho;
    ho.title = "trivet verification record (selfcheck)";
    ho.tool_version = TRIVET_VERSION;
    ho.command_line = a.command_line;
    ho.plots = false;
    std::ostringstream h;
    char host[256] = "unknown";
    gethostname(host, sizeof host - 1);
    h << "<p>Tool trivet " << TRIVET_VERSION << ", built " << __DATE__ << " with " << __VERSION__ << "; machine "
      << reports::html_escape(host) << " (" << std::thread::hardware_concurrency() << " cores). "
      << r.cases.size() << " cited cases, " << r.values_checked() << " published values; "
      << r.cases.size() - r.cases_failed() << " cases hold, " << r.cases_failed() << " fail.</p>\n";
    h << "<table><tr><th>case</th><th>source</th><th>quantity</th><th>published</th><th>expected</th><th>tolerance</th>"
         "<th>three-moment</th><th>slope-deflection</th><th>stiffness</th><th>holds</th></tr>\n";
    for (const auto& c : r.cases) {
      for (std::size_t i = 0; i < c.values.size(); ++i) {
        const auto& v = c.values[i];
        h << "<tr><td>" << (i == 0 ? reports::html_escape(c.id) : "") << "</td><td>" << (i == 0 ? reports::html_escape(c.citation) : "")
          << "</td><td>" << reports::html_escape(v.quantity + " at " + v.where) << "</td><td>" << reports::html_escape(v.published + " " + v.multiplier + (v.magnitude ? " (printed without sign; magnitude compared)" : ""))
          << "</td><td>" << input::format_number(v.expected) << "</td><td>" << input::format_number(v.tolerance) << "</td>";
        for (const char* m : {"three-moment", "slope-deflection", "stiffness"}) {
          std::string cell = "-";
          for (const auto& mv : v.methods)
            if (mv.method == m) cell = mv.evaluated ? input::format_number(mv.computed) : "n/a";
          h << "<td>" << reports::html_escape(cell) << "</td>";
        }
        h << "<td>" << (v.holds ? "yes" : "<strong>NO</strong>") << "</td></tr>\n";
      }
      if (c.values.empty() || !c.errors.empty())
        h << "<tr><td>" << reports::html_escape(c.id) << "</td><td colspan=\"9\">" << (c.holds ? "holds" : "<strong>FAILS</strong>") << "</td></tr>\n";
    }
    h << "</table>\n";
    ho.extra_sections.push_back({"selfcheck", "Verification record: cited reference cases", h.str()});
    const std::string err = write_report_file(a.html, [&](std::ostream& o) { reports::write_html(o, {}, ho); });
    if (!err.empty()) { std::cerr << "trivet: --html: " << err << "\n"; code = kExitInvalid; }
  }
  if (!a.junit.empty()) {
    const std::string err = write_report_file(a.junit, [&](std::ostream& o) {
      std::size_t tests = 0, failures = 0;
      for (const auto& c : r.cases) { tests += c.values.size() + 1; failures += c.values_failed() + (c.holds ? 0 : 1); }
      o << "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n<testsuites name=\"trivet selfcheck\" tests=\"" << tests
        << "\" failures=\"" << failures << "\" errors=\"0\">\n";
      for (const auto& c : r.cases) {
        o << "  <testsuite name=\"" << reports::html_escape(c.id) << "\" tests=\"" << c.values.size() + 1 << "\" failures=\""
          << c.values_failed() + (c.holds ? 0 : 1) << "\" errors=\"0\">\n";
        o << "    <testcase classname=\"" << reports::html_escape(c.id) << "\" name=\"case holds (" << reports::html_escape(c.citation) << ")\"";
        if (c.holds) o << "/>\n";
        else o << "><failure message=\"" << reports::html_escape(c.verdict_problem.empty() ? "a published value does not hold" : c.verdict_problem) << "\"/></testcase>\n";
        for (const auto& v : c.values) {
          o << "    <testcase classname=\"" << reports::html_escape(c.id) << "\" name=\"" << reports::html_escape(v.quantity + " at " + v.where) << "\"";
          if (v.holds) { o << "/>\n"; continue; }
          std::string msg = "published " + v.published + " " + v.multiplier + " = " + input::format_number(v.expected) +
                            " +- " + input::format_number(v.tolerance) + ";";
          for (const auto& m : v.methods) if (m.evaluated) msg += " " + m.method + " " + input::format_number(m.computed);
          o << "><failure message=\"" << reports::html_escape(msg) << "\"/></testcase>\n";
        }
        o << "  </testsuite>\n";
      }
      o << "</testsuites>\n";
    });
    if (!err.empty()) { std::cerr << "trivet: --junit: " << err << "\n"; code = kExitInvalid; }
  }
  return code;
}

// Joins the JSON reports of several shards: beams in order of file name,
// the summary recounted. Exit code as for check.
int run_merge(const std::vector<std::string>& inputs, const std::string& out_path) {
  if (const std::string why = report_clashes_with_input(out_path, inputs); !why.empty()) {
    std::cerr << "trivet merge: --json: " << why << "\n";
    return kExitInvalid;
  }
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
  check->add_option("--methods", ca.methods, "Comma list of three-moment, slope-deflection, stiffness (default all)");
  check->add_option("--agreement", ca.agreement, "Largest relative difference between methods still called agreement")
      ->default_val(1e-6)->check(CLI::PositiveNumber);
  check->add_option("--stations-per-span", ca.stations_per_span, "Equal divisions per span for the diagrams (overrides the file)")
      ->check(CLI::Range(1, 1000));
  check->add_option("--jobs", ca.jobs, "Beams checked in parallel (default: the number of cores)")->check(CLI::Range(1u, 1024u));
  check->add_flag("--all-rows", ca.all_rows, "Print every node and span, however long the beam");
  check->add_option("--junit", ca.junit, "Write a JUnit XML report to FILE (a test suite per beam file)");
  check->add_option("--html", ca.html, "Write a self-contained HTML report with the diagrams to FILE");
  check->add_option("--arithmetic", ca.arithmetic, "double (default), extended (50 digits) or exact (rationals; stiffness in extended)")
      ->check(CLI::IsMember({"double", "extended", "exact"}));
  check->add_option("--reference", ca.reference, "Also run in extended or exact arithmetic and report each method's rounding error")
      ->check(CLI::IsMember({"extended", "exact"}));
  check->add_option("--shard", ca.shard, "Check only the K-th of N parts of the files (K/N, by a hash of the path)");

  check->add_option("--against", ca.against, "Another program's results (CSV) to compare; a second --against for a reactions table")
      ->expected(1)->take_all();
  check->add_option("--column", ca.columns, "Map a column name of the --against file, e.g. moment=Mz (repeatable)");
  check->add_option("--their-units", ca.their_units, "Units of the --against file, e.g. force=N,length=mm (default: the beam file's)");
  check->add_option("--their-moment", ca.their_moment, "sagging-positive (ours, default) or hogging-positive");
  check->add_option("--their-deflection", ca.their_deflection, "down-positive (ours, default) or up-positive");
  check->add_option("--their-shear", ca.their_shear, "ours (V = dM/dx, default) or opposite");
  check->add_option("--their-reaction", ca.their_reaction, "up-positive (ours, default) or down-positive");
  check->add_option("--their-reaction-moment", ca.their_reaction_moment, "counter-clockwise-positive (ours, default) or clockwise-positive");
  check->add_option("--against-case", ca.against_case, "The load case the --against results belong to");

  SelfcheckArgs sa;
  CLI::App* selfcheck = app.add_subcommand("selfcheck", "Run the built-in cited handbook and textbook cases on every method");
  selfcheck->add_option("--json", sa.json, "Write the verification record as JSON to FILE ('-' for standard output)");
  selfcheck->add_option("--junit", sa.junit, "Write a JUnit XML report to FILE (a test suite per case)");
  selfcheck->add_option("--methods", sa.methods, "Comma list of methods (default all)");
  selfcheck->add_option("--html", sa.html, "Write the verification record as a self-contained HTML file");
  selfcheck->add_option("--cases", sa.dir, "Directory of reference cases (default: the bundled library)");
  selfcheck->add_option("--arithmetic", sa.arithmetic, "double (default), extended or exact")
      ->check(CLI::IsMember({"double", "extended", "exact"}));
  selfcheck->add_option("--reference", sa.reference, "Also run in extended or exact arithmetic and report each method's rounding")
      ->check(CLI::IsMember({"extended", "exact"}));

  std::string plot_file, plot_out, plot_case;
  CLI::App* plot = app.add_subcommand("plot", "Draw the diagrams of one beam, every method overlaid (SVG or PNG)");
  plot->add_option("file", plot_file, "The beam file")->required();
  plot->add_option("-o,--output", plot_out, "OUT.svg or OUT.png")->required();
  plot->add_option("--case", plot_case, "The load case or combination to draw (default: the first)");
  plot->add_option("--methods", ca.methods, "Comma list of methods (default all)");

  std::vector<std::string> merge_inputs;
  std::string merge_json = "-", merge_junit;
  CLI::App* merge = app.add_subcommand("merge", "Merge the JSON reports of several shards into one report");
  merge->add_option("reports", merge_inputs, "JSON reports written by check --json")->required();
  merge->add_option("--json", merge_json, "Write the merged report to FILE ('-' for standard output, the default)");

  CLI::App* example = app.add_subcommand("example", "Print a starter beam file");
  CLI::App* schema = app.add_subcommand("schema", "Print the JSON Schema (draft 2020-12) of the beam file");

  for (int i = 0; i < argc; ++i) ca.command_line += (i ? " " : "") + std::string(argv[i]);
  sa.command_line = ca.command_line;
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
    if (*schema) {
      std::cout << trivet::input::beam_file_schema() << std::flush;
      return kExitAgree;
    }
    if (*selfcheck) return run_selfcheck(sa);
    if (*plot) return run_plot(plot_file, plot_out, plot_case, ca.methods);
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
