// A command's report formats (private to harness/cli): the reporters
// (reports/reporter.h) and the report files they write, opened before the
// run and put in place after it. The commands hand results to the
// reporters; nothing here writes report text.
#pragma once

#include <iostream>
#include <memory>
#include <string>
#include <utility>
#include <vector>

#include "harness/cli/files.h"

namespace trivet::cli {

template <class Reporter>
class Reporting {
 public:
  // The console's reporter comes first: it finishes first (the summary).
  explicit Reporting(std::unique_ptr<Reporter> console) { list_.push_back(std::move(console)); }

  // For a report file named on the command line (`path` not empty): opens
  // it and adds the reporter `make(file)` returns for it. A file that
  // cannot be opened gets no reporter; finish() gives its reason.
  // Formats finish in the order they are added.
  template <class Make>
  void add(const char* option, const std::string& path, Make make) {
    if (path.empty()) return;
    auto& t = *targets_.emplace_back(std::make_unique<Target>());
    t.option = option;
    t.error = t.file.open(path);
    if (!t.error.empty()) return;
    list_.push_back(make(t.file));
    t.reporter = list_.back().get();
  }

  // For a format that writes files of its own (named on the command line
  // by `option`; not empty): adds the reporter `make()` returns; its end()
  // gives its problems.
  template <class Make>
  void add_writer(const char* option, const std::string& path, Make make) {
    if (path.empty()) return;
    auto& t = *targets_.emplace_back(std::make_unique<Target>());
    t.option = option;
    t.own_files = true;
    list_.push_back(make());
    t.reporter = list_.back().get();
  }
  // Every reporter, the console's first.
  std::vector<std::unique_ptr<Reporter>>& list() { return list_; }

  // end() of every format in order; a report file is put in place only when
  // its format has written it whole. Problems, and warnings about reports
  // written, on standard error ("trivet: --json: ..."). False when a report
  // could not be written.
  template <class Totals>
  bool finish(const Totals& totals) {
    bool ok = true;
    list_.front()->end(totals);
    for (auto& t : targets_) {
      std::string err = t->error;
      if (err.empty()) err = t->reporter->end(totals);
      if (err.empty() && !t->own_files) err = t->file.commit();
      if (!err.empty()) {
        std::cerr << "trivet: " << t->option << ": " << err << "\n";
        ok = false;
      } else if (const std::string note = t->reporter->warning(); !note.empty()) {
        std::cerr << "trivet: " << t->option << ": " << note << "\n";
      }
    }
    return ok;
  }

 private:
  struct Target {
    const char* option = "";
    ReportFile file;
    std::string error;  // why it could not be opened
    Reporter* reporter = nullptr;
    bool own_files = false;  // add_writer(): no report file of ours
  };
  std::vector<std::unique_ptr<Reporter>> list_;
  std::vector<std::unique_ptr<Target>> targets_;
};

}  // namespace trivet::cli
