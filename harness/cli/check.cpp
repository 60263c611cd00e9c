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
#include <memory>
#include <mutex>
#include <new>
#include <sstream>
#include <thread>
#include <utility>
#include <vector>

#include <unistd.h>


#include "harness/cli/files.h"
#include "harness/cli/memory.h"
#include "harness/cli/reporting.h"
#include "harness/compare/against.h"
#include "harness/compare/claims_table.h"
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

compare::Options check_options(const CheckArgs& a) {
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
  return opt;
}

reports::Report check_beam(input::BeamFile f, const std::string& text, const CheckArgs& a, const compare::Options& opt) {
  // --claims: the table's claims join the file's; its errors make the beam invalid.
  if (!a.claims.empty() && f.ok()) compare::claims_table::merge(f, compare::claims_table::read_file(f, a.claims, a.claims_sheet));
  // --stations-per-span may ask for more stations than the file's limit allows.
  if (f.ok() && a.stations_per_span > 0)
    if (auto e = input::station_limit_error(f, a.stations_per_span)) f.errors.push_back(*e);
  reports::Report r(compare::check(f, opt));
  if (r.status != compare::BeamStatus::Invalid && f.ok()) {
    try { apply_precision_text(r, r.precision, text, f, a.arithmetic, a.reference, opt); }
    catch (const std::exception& e) { r.warnings.push_back(std::string("arithmetic run failed: ") + e.what()); }
  }
  return r;
}

int run_check(const CheckArgs& a) {
  const compare::Options opt = check_options(a);
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
    for (const auto& sh : a.their_sheets) settings.push_back({"--their-sheet", {"sheet", sh}});
    for (const auto& [flag, setting] : settings) {
      if (a.against.empty()) fail("trivet: ", flag, ": applies to the file given with --against, and there is none");
      ag::Options check_only;
      const std::string err = ag::set_option(setting.first == "sheet" ? check_only : ao, setting.first, setting.second);
      if (!err.empty()) fail("trivet: ", flag, ": ", err);
    }
    if (a.their_sheets.size() > 1 && a.their_sheets.size() != a.against.size())
      fail("trivet: --their-sheet: give one for every --against file, or one for each (", a.their_sheets.size(), " for ",
           a.against.size(), " files)");
  }
  if (!a.claims_sheet.empty() && a.claims.empty())
    fail("trivet: --claims-sheet: applies to the file given with --claims, and there is none");
  const reports::ShowUnits show = show_units_option("check", a.show_units);
  if (const std::string why = report_targets_problem({{"--json", a.json}, {"--junit", a.junit}, {"--html", a.html}});
      !why.empty())
    fail("trivet: ", why);
  std::vector<std::pair<std::string, std::string>> problems;
  std::vector<std::string> files = collect_beam_files(a.paths, &problems);
  {
    // A report path must not name a file being read (it would be overwritten).
    std::vector<std::string> inputs = files;
    inputs.insert(inputs.end(), a.against.begin(), a.against.end());
    if (!a.claims.empty()) inputs.push_back(a.claims);
    const char* const options[] = {"--json", "--junit", "--html"};
    const auto [which, why] = report_clashes_with_input(std::vector<std::string>{a.json, a.junit, a.html}, inputs);
    if (!why.empty()) {
      fail("trivet: ", options[which], ": ", why);
    }
  }
  if (!a.claims.empty() && (files.size() != 1 || !problems.empty()))
    fail("trivet: --claims adds a table of claims to one beam file; give exactly one beam file (", files.size() + problems.size(),
         " given)");
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

  // Each beam is read and checked by a worker, which also renders its part
  // of every report format (reports/reporter.h), so that report writing
  // runs in parallel too and a checked beam's results can be let go at
  // once. The main thread hands the parts to the formats in file order as
  // they are ready, while the workers go on, so the output does not depend
  // on --jobs. One beam (perhaps a very long one) and --against are
  // reported from the whole results afterwards (with --against, after the
  // comparison; the JSON report then straight from the results, without a
  // copy of its text in memory), as are formats that need every beam (HTML).
  const bool json_to_stdout = a.json == "-";
  reports::ConsoleOptions copt;
  copt.color = !json_to_stdout && use_color(1);
  copt.all_rows = a.all_rows;
  copt.show = show;
  const bool single = files.size() == 1;
  const bool streamed = a.against.empty() && !single;  // parts rendered by the workers

  // The formats, in the order they finish (and name their problems): the
  // tables (on standard error when the JSON report is on standard output),
  // JSON, HTML, JUnit. A report file that cannot be opened gets no reporter;
  // its reason is given at the end.
  std::ostream& human = json_to_stdout ? std::cerr : std::cout;
  Reporting<reports::CheckReporter> reporting(reports::console_reporter(human, copt, json_to_stdout));
  reporting.add("--json", a.json, [&](ReportFile& f) { return reports::json_reporter({&f.out(), streamed && f.seekable()}); });
  reporting.add("--html", a.html, [&](ReportFile& f) {
    reports::HtmlOptions ho;
    ho.agreement = opt.agreement;
    ho.all_details = a.html_all;
    ho.tool_version = TRIVET_VERSION;
    ho.command_line = a.command_line;
    ho.show = show;
    return reports::html_reporter(f.out(), ho);
  });
  reporting.add_writer("--record", a.record, [&] {
    reports::HtmlOptions ho;
    ho.agreement = opt.agreement;
    ho.tool_version = TRIVET_VERSION;
    ho.command_line = a.command_line;
    ho.show = show;
    return reports::record_reporter(a.record, ho);
  });
  reporting.add("--junit", a.junit, [&](ReportFile& f) {
    return reports::junit_reporter({&f.out(), streamed && f.seekable()}, opt.agreement);
  });
  auto& reporters = reporting.list();
  bool any_needs_all = false;
  for (const auto& rep : reporters) any_needs_all = any_needs_all || rep->needs_all_results();
  const bool keep_results = !streamed || any_needs_all;

  struct Rendered {
    std::vector<reports::Part> parts;  // one per reporter (empty for one that needs all results)
    std::string problem;               // an internal error while rendering (then no parts)
    compare::BeamStatus status = compare::BeamStatus::Invalid;
    std::size_t claims_failed = 0;
    std::size_t limits_failed = 0;
  };
  // Room for every beam and every unreadable path: the kept beams do not
  // move, so the formats that keep them may hold on to them.
  std::vector<reports::Report> results(files.size());
  results.reserve(files.size() + problems.size());
  std::vector<Rendered> rendered(streamed ? files.size() : 0);
  unsigned jobs = a.jobs ? a.jobs : std::max(1u, std::thread::hardware_concurrency());
  jobs = static_cast<unsigned>(std::min<std::size_t>(jobs, std::max<std::size_t>(files.size(), 1)));

  const reports::RunInfo run{TRIVET_VERSION, opt.methods, opt.agreement};
  for (auto& rep : reporters) rep->begin(run);

  auto render = [&](const reports::Report& r, Rendered& out) {
    out.status = r.status;
    out.claims_failed = r.claims_failed();
    out.limits_failed = r.limits_failed();
    out.parts.resize(reporters.size());
    for (std::size_t k = 0; k < reporters.size(); ++k)
      if (!reporters[k]->needs_all_results()) out.parts[k] = reporters[k]->render(r);
  };
  std::atomic<std::size_t> next{0};
  std::atomic<bool> internal_error{false};
  // Progress on a terminal, kept by the writing thread: it clears the line
  // before a beam's text goes to the same terminal, then puts it back.
  const bool progress = streamed && isatty(2) && files.size() > 5;
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
      r = check_beam(std::move(f), text, a, opt);
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
    if (streamed) {
      try { render(r, rendered[i]); }
      catch (const std::exception& e) {
        // The beam's report could not be written (a large one, out of
        // memory): the beam stays in every report, as an internal failure
        // that says so; only if even that cannot be written is it a line
        // on the console.
        internal_error = true;
        const bool memory = dynamic_cast<const std::bad_alloc*>(&e) != nullptr;
        try {
          rendered[i].parts.clear();
          r = reports::Report{};
          r.file = files[i];
          r.errors.push_back({"", "",
                              memory ? "internal failure: out of memory while writing the report of this beam (the other beams are kept)"
                                     : std::string("internal error while writing the report of this beam: ") + e.what(),
                              memory ? "internal.out_of_memory" : "internal.error"});
          render(r, rendered[i]);
        } catch (const std::exception& again) {
          rendered[i].parts.clear();
          rendered[i].problem = "trivet: internal error while writing the report of " + files[i] + ": " + again.what() + "\n";
        }
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

  reports::Summary s;
  // Hands beam i to every format, in file order: its rendered parts (then
  // lets them go), or, to a format that needs all results, the beam.
  auto emit = [&](std::size_t i) {
    Rendered& r = rendered[i];
    if (!r.problem.empty()) human << r.problem;
    for (std::size_t k = 0; k < reporters.size(); ++k) {
      if (reporters[k]->needs_all_results()) reporters[k]->keep(results[i]);
      else if (r.problem.empty()) reporters[k]->beam(std::move(r.parts[k]));
    }
    std::vector<reports::Part>().swap(r.parts);
    s.add(r.status, r.claims_failed, r.limits_failed);
  };
  if (streamed) {
    // The main thread is one of the `jobs` checkers: between beams of its
    // own it hands over, in file order, every beam that is ready, and at
    // the end it waits for the rest. (A separate writing thread would make
    // one thread more than cores, and a wake-up per beam.)
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
        emit(written);
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
      for (std::size_t k = 0; k < a.against.size(); ++k) {
        const std::string& path = a.against[k];
        ag::Options o = ao;
        if (!a.their_sheets.empty()) o.sheet = a.their_sheets[a.their_sheets.size() == 1 ? 0 : k];
        auto cmp = std::make_shared<ag::Comparison>(ag::compare_file(f, results[0], path, o));
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

  // Paths that could not be read, after the beams.
  for (const auto& [path, why] : problems) {
    reports::Report r;
    r.file = path;
    r.errors.push_back({"", "", why, "input.file"});
    results.push_back(std::move(r));  // within the room reserved above
    if (streamed) {
      rendered.emplace_back();
      render(results.back(), rendered.back());
      emit(results.size() - 1);
      if (!keep_results) results.back() = reports::Report{};
    }
  }

  // One beam, or --against: every format from the whole results.
  if (!streamed) {
    for (const auto& r : results) {
      for (auto& rep : reporters) rep->keep(r);
      s.add(r.status, r.claims_failed(), r.limits_failed());
    }
  }

  // The formats finish in order; a report file is put in place only when
  // its format has written it whole.
  const int code = reporting.finish(s) ? kExitAgree : kExitInvalid;
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
