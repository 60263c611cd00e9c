// trivet: collecting beam files and writing report files safely.
#pragma once

#include <fstream>
#include <functional>
#include <ostream>
#include <string>
#include <utility>
#include <vector>

namespace trivet::cli {

// A path named on the command line, expanded: a file is itself; a
// directory gives every *.json below it (recursively, sorted, symbolic
// links to directories not followed). Problems (a missing path, an
// unreadable directory, a *.json entry that is a dangling link, a link loop
// or a named pipe) are returned as (path, reason) in `problems`; the walk
// goes on past them.
std::vector<std::string> collect_beam_files(const std::vector<std::string>& paths,
                                            std::vector<std::pair<std::string, std::string>>* problems);

// Why `report` (a --json or --junit path) must not be written: it names
// one of the input beam files (then the reason), or "" when it may.
std::string report_clashes_with_input(const std::string& report, const std::vector<std::string>& inputs);
// The same for several reports at once (one reading of the inputs'
// directories): the first report that names an input and the reason, or
// (reports.size(), "") when none does. Empty and "-" reports are skipped.
std::pair<std::size_t, std::string> report_clashes_with_input(const std::vector<std::string>& reports,
                                                              const std::vector<std::string>& inputs);

// Writes a report file whole or not at all: into a temporary file in the
// same directory (".NAME.trivet-tmp.PID.XXXXXX"), then put in place of
// `path` in one step. A reader, or a run killed mid-write, sees the old
// report (or none) or the new one, never a part; a killed run leaves its
// hidden temporary file, which the next write of the same report removes
// once process PID is gone. The file is not synced to the disk (the kernel
// writes it out within seconds): a power cut just after a run can leave an
// empty or cut-short report, which no JSON or XML reader takes for whole. "-" writes to standard output; a reader
// that has gone away (a broken pipe) is not an error.
// Returns an empty string, or the reason it failed.
std::string write_report_file(const std::string& path, const std::function<void(std::ostream&)>& body);

// The same in steps, for a report written while the run goes on: open(),
// write to out() (and, unless seekable() is false, seek back to fill in
// what was left blank), then commit(). Destroyed without commit(), it
// removes its temporary file and the old report stays.
class ReportFile {
 public:
  ReportFile() = default;
  ReportFile(const ReportFile&) = delete;
  ReportFile& operator=(const ReportFile&) = delete;
  ~ReportFile();
  std::string open(const std::string& path);  // "" or the reason it cannot be written
  std::ostream& out();
  bool seekable() const { return !stdout_; }
  std::string commit();  // "" or the reason it failed

 private:
  std::string path_, tmp_;
  std::filebuf buf_;
  std::ostream file_{&buf_};
  bool stdout_ = false;
};

// True when standard output is a pipe whose reader has gone (EPIPE): a
// closed pipe ends a run quietly, any other failed write is an error.
bool stdout_reader_gone();

// The first problem with the report paths (option -> path; "" and "-" are
// skipped): an existing target that is not a regular file (a device, a
// named pipe, a symbolic link, a directory), a read-only one, or one path
// (or one file) named for two reports. "" when there is none.
std::string report_targets_problem(const std::vector<std::pair<std::string, std::string>>& targets);

}  // namespace trivet::cli
