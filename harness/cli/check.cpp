// `trivet check`: beam files checked in parallel, streamed to the reports.
#include <algorithm>
#include <atomic>
#include <chrono>
#include <condition_variable>
#include <csignal>
#include <cstdint>
#include <fstream>
#include <iterator>
#include <cstdio>
#include <cstdlib>
#include <iostream>
#include <mutex>
#include <new>
#include <sstream>
#include <thread>

#include <unistd.h>


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

#include "harness/cli/commands.h"
#include "methods/registry/registry.h"

namespace trivet::cli {

int run_check(const CheckArgs& a) {
  compare::Options opt;
  opt.agreement = a.agreement;
  if (a.stations_per_span > 0) opt.stations_per_span = a.stations_per_span;
  if (!a.methods.empty()) {
    opt.methods = split_list(a.methods);
    for (const auto& m : opt.methods)
      if (!compare::find_method(m)) {
        fail("trivet: --methods: unknown method '", m, "' (one of ", registry::names(), ")");
      }
    if (opt.methods.empty()) {
      fail("trivet: --methods: give at least one method");
    }
  }
  // The --against options, each checked by its own name before any beam is
  // checked; without --against they have nothing to apply to.
  namespace ag = compare::against;
  ag::Options ao;
  {
    std::vector<std::pair<std::string, std::pair<std::string, std::string>>> settings;  // flag, (option, value)
    for (const auto& c : a.columns) settings.push_back({"--column", {"column", c}});
    const std::pair<const char*, std::pair<const char*, const std::string*>> named[] = {
        {"--their-units", {"units", &a.their_units}},
        {"--their-moment", {"moment-sign", &a.their_moment}},
        {"--their-deflection", {"deflection-sign", &a.their_deflection}},
        {"--their-shear", {"shear-sign", &a.their_shear}},
        {"--their-reaction", {"reaction-sign", &a.their_reaction}},
        {"--their-reaction-moment", {"reaction-moment-sign", &a.their_reaction_moment}},
        {"--their-separator", {"separator", &a.their_separator}},
        {"--their-decimal", {"decimal", &a.their_decimal}},
        {"--against-case", {"case", &a.against_case}}};
    for (const auto& [flag, what] : named)
      if (!what.second->empty()) settings.push_back({flag, {what.first, *what.second}});
    for (const auto& [flag, setting] : settings) {
      if (a.against.empty()) fail("trivet: ", flag, ": applies to the file given with --against, and there is none");
      const std::string err = ag::set_option(ao, setting.first, setting.second);
      if (!err.empty()) fail("trivet: ", flag, ": ", err);
    }
  }
  if (const std::string why = report_targets_problem({{"--json", a.json}, {"--junit", a.junit}, {"--html", a.html}});
      !why.empty())
    fail("trivet: ", why);
  std::vector<std::pair<std::string, std::string>> problems;
  std::vector<std::string> files = collect_beam_files(a.paths, &problems);
  {
    // A report path must not name a file being read (it would be overwritten).
    std::vector<std::string> inputs = files;
    inputs.insert(inputs.end(), a.against.begin(), a.against.end());
    const char* const options[] = {"--json", "--junit", "--html"};
    const auto [which, why] = report_clashes_with_input(std::vector<std::string>{a.json, a.junit, a.html}, inputs);
    if (!why.empty()) {
      fail("trivet: ", options[which], ": ", why);
    }
  }
  if (!a.shard.empty()) {
    unsigned k = 0, n = 0;
    char slash = 0;
    std::istringstream in(a.shard);
    if (!(in >> k >> slash >> n) || slash != '/' || n == 0 || k < 1 || k > n || !in.eof()) {
      fail("trivet: --shard: expected K/N with 1 <= K <= N, e.g. 2/8 (got '", a.shard, "')");
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
    std::size_t limits_failed = 0;
  };
  std::vector<reports::Report> results(files.size());
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

  auto render = [&](const reports::Report& r, Rendered& out) {
    out.status = r.status;
    out.claims_failed = r.claims_failed();
    out.limits_failed = r.limits_failed();
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
    reports::Report& r = results[i];
    const auto started = std::chrono::steady_clock::now();
    try {
      std::string text;
      input::BeamFile f = input::read_beam_file(files[i], {}, &text);
      if (a.arithmetic == "double" && a.reference.empty()) std::string().swap(text);  // only exact reading needs it
      // --stations-per-span may ask for more stations than the file's limit allows.
      if (f.ok() && a.stations_per_span > 0)
        if (auto e = input::station_limit_error(f, a.stations_per_span)) f.errors.push_back(*e);
      r = reports::Report(compare::check(f, opt));
      if (r.status != compare::BeamStatus::Invalid && f.ok()) {
        try { apply_precision_text(r, r.precision, text, f, a.arithmetic, a.reference, opt); }
        catch (const std::exception& e) { r.warnings.push_back(std::string("arithmetic run failed: ") + e.what()); }
      }
    } catch (const std::bad_alloc&) {
      internal_error = true;
      r = reports::Report{};
      r.file = files[i];
      r.errors.push_back({"", "", "internal failure: out of memory while checking this beam (the other beams are kept)", "internal.out_of_memory"});
    } catch (const std::exception& e) {
      internal_error = true;
      r = reports::Report{};
      r.file = files[i];
      r.errors.push_back({"", "", std::string("internal error while checking: ") + e.what(), "internal.error"});
    }
    r.seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - started).count();
    if (render_in_workers) {
      try { render(r, rendered[i]); }
      catch (const std::exception& e) {
        internal_error = true;
        rendered[i].console = "trivet: internal error while writing the report of " + files[i] + ": " + e.what() + "\n";
      }
      if (!keep_results) r = reports::Report{};
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
    s.add(r.status, r.claims_failed, r.limits_failed);
    junit_total.tests += r.junit_counts.tests;
    junit_total.failures += r.junit_counts.failures;
    junit_total.errors += r.junit_counts.errors;
    junit_total.seconds += r.junit_counts.seconds;
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
    if (files.size() != 1 || !problems.empty()) {
      fail("trivet: --against compares one beam file with another program's results; give exactly one beam file");
    }
    if (results[0].status != compare::BeamStatus::Invalid) {
      const input::BeamFile f = input::read_beam_file(files[0]);
      for (const auto& path : a.against) {
        auto cmp = std::make_shared<ag::Comparison>(ag::compare_file(f, results[0], path, ao));
        if (!cmp->ok()) against_invalid = true;
        else if (!cmp->holds()) results[0].status = compare::BeamStatus::Disagree;
        results[0].against.push_back(cmp);
      }
      // A file of results that cannot be read is an invalid input (exit 2):
      // the beam's status and the summary say so, with the file's errors.
      if (against_invalid) {
        reports::Report& r = results[0];
        for (const auto& cmp : r.against)
          for (const auto& e : cmp->errors) r.errors.push_back({"", "", "--against " + e.format(cmp->file), "against.unreadable"});
        r.status = compare::BeamStatus::Invalid;
        r.sets.clear();
        r.claims.clear();
      }
    }
  }

  for (const auto& [path, why] : problems) {
    reports::Report r;
    r.file = path;
    r.errors.push_back({"", "", why, "input.file"});
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
    ho.agreement = opt.agreement;
    ho.all_details = a.html_all;
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
    fail("trivet: no beam files found");
  }
  const bool single_method = opt.methods.size() == 1;
  int verdict = kExitAgree;
  if (s.disagree > 0 || (s.unconfirmed > 0 && !single_method)) verdict = kExitDisagree;
  if (s.invalid > 0 || against_invalid) verdict = kExitInvalid;
  if (internal_error) verdict = kExitInternal;
  return std::max(code, verdict);
}

}  // namespace trivet::cli
