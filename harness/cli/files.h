// trivet: collecting beam files and writing report files safely.
#pragma once

#include <functional>
#include <ostream>
#include <string>
#include <vector>

namespace trivet::cli {

// A path named on the command line, expanded: a file is itself; a
// directory gives every *.json below it (recursively, sorted, symbolic
// links to directories not followed). Problems (a missing path, an
// unreadable directory) are returned as (path, reason) in `problems`.
std::vector<std::string> collect_beam_files(const std::vector<std::string>& paths,
                                            std::vector<std::pair<std::string, std::string>>* problems);

// Writes a report file whole or not at all: into a temporary file in the
// same directory, then renamed over `path`. "-" writes to standard output.
// Returns an empty string, or the reason it failed.
std::string write_report_file(const std::string& path, const std::function<void(std::ostream&)>& body);

}  // namespace trivet::cli
