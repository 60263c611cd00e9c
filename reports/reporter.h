// trivet: one interface for every report format, so that a command hands
// each result to a list of reporters and writes nothing itself (after
// google/benchmark's reporters: siblings of one interface).
//
// A run calls, on one thread unless said otherwise:
//   begin(run)                     before the first item;
//   for each item, in file order, either
//     beam(render(item))           render() in any worker thread, in
//                                  parallel; beam() in order, on one
//                                  thread; the item may be let go as soon
//                                  as its part is rendered; or
//     keep(item)                   when the caller holds every item until
//                                  end() returns (always for a format
//                                  whose needs_all_results() is true;
//                                  for every format when the run keeps its
//                                  results anyway: one beam, --against);
//   end(totals)                    after the last item.
// A run hands all its items to one reporter the same way.
// The check's formats are Reporter<Report, Summary> (reports.h,
// html_report.h); the selfcheck's are Reporter<CaseResult,
// SelfcheckSummary> (selfcheck_report.h).
#pragma once

#include <cstddef>
#include <ostream>
#include <string>
#include <vector>

namespace trivet::reports {

// The run, as the reports name it.
struct RunInfo {
  std::string version;
  std::vector<std::string> methods;  // asked for (empty: all)
  double agreement = 1e-6;
};

// What a format counts over its items for its head (JUnit: tests,
// failures, errors and seconds). Formats that need none leave it zero.
struct Tally {
  std::size_t tests = 0, failures = 0, errors = 0;
  double seconds = 0;
  void add(const Tally& t) {
    tests += t.tests;
    failures += t.failures;
    errors += t.errors;
    seconds += t.seconds;
  }
};

// One item's text in one format, with what the format counts of it.
struct Part {
  std::string text;
  Tally tally;
};

// Where a format writes. `streamed`: the output is a regular file, written
// as the run goes on: a format whose head holds counts writes it first with
// room for them and goes back to fill them in at end(). Otherwise
// (standard output, or a run whose items are all kept) it holds its parts
// and writes the whole report at end().
struct Output {
  std::ostream* out = nullptr;
  bool streamed = false;
};

template <class Item, class Totals>
class Reporter {
 public:
  virtual ~Reporter() = default;

  // Writes (or prepares) what comes before the items.
  virtual void begin(const RunInfo& run) = 0;

  // True when the format cannot write an item before it has seen all of
  // them (HTML: a summary of every beam comes first). Then the caller keeps
  // every item alive until end() returns and hands each one to keep();
  // render() and beam() are not called.
  virtual bool needs_all_results() const { return false; }

  // The format's text for one item. Const and free of shared state: workers
  // call it in parallel.
  virtual Part render(const Item& item) const = 0;
  // One rendered part, in file order: written now, or kept for end().
  virtual void beam(Part&& part) = 0;
  // One item, in file order, which the caller keeps alive until end()
  // returns: the format may write straight from it at end() instead of
  // holding its text. By default: its part, rendered now.
  virtual void keep(const Item& item) { beam(render(item)); }

  // Writes what comes after the items (and, for a streamed output, the head
  // again with the counts). Returns "" or the reason the report could not be
  // written.
  virtual std::string end(const Totals& totals) = 0;
  // After end(): something a person should know about a report that was
  // written (HTML: plots left out and why), or "".
  virtual std::string warning() const { return ""; }
};

}  // namespace trivet::reports
