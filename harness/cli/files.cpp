#include "harness/cli/files.h"

#include <algorithm>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <iostream>
#include <system_error>

#include <cerrno>
#include <cstdlib>

#include <fcntl.h>
#include <poll.h>
#include <signal.h>
#include <sys/stat.h>
#include <unistd.h>

namespace trivet::cli {

namespace fs = std::filesystem;

namespace {

// What a directory entry named *.json is, when it is not a readable file.
std::string not_a_beam_file(const fs::directory_entry& e) {
  std::error_code ec;
  const fs::file_status st = fs::status(e.path(), ec);
  if (ec || !fs::exists(st)) {
    std::error_code ec2;
    if (fs::is_symlink(fs::symlink_status(e.path(), ec2)))
      return "a symbolic link to nothing (or a loop of links); nothing to read";
    return "cannot read the file: " + (ec ? ec.message() : std::string("it has gone"));
  }
  if (fs::is_regular_file(st) || fs::is_directory(st)) return "";
  return std::string("is not a regular file (") +
         (fs::is_fifo(st) ? "a named pipe" : fs::is_socket(st) ? "a socket" : "a device") + "); skipped";
}

// Every *.json below `dir` into `found`; directories that cannot be read,
// and *.json entries that are not files, into `problems`. Symbolic links to
// directories are not followed (so a loop of links cannot trap the walk).
void walk(const fs::path& dir, std::vector<std::string>* found,
          std::vector<std::pair<std::string, std::string>>* problems) {
  std::error_code ec;
  fs::directory_iterator it(dir, ec), end;
  if (ec) {
    problems->push_back({dir.string(), "cannot read the directory: " + ec.message()});
    return;
  }
  std::vector<fs::path> subdirs;
  while (it != end) {
    const fs::directory_entry& e = *it;
    std::error_code e2;
    const bool link = e.is_symlink(e2);
    if (!link && e.is_directory(e2)) subdirs.push_back(e.path());
    else if (e.path().extension() == ".json") {
      if (e.is_regular_file(e2)) found->push_back(e.path().string());
      else if (!(link && e.is_directory(e2))) {
        const std::string why = not_a_beam_file(e);
        if (!why.empty()) problems->push_back({e.path().string(), why});
      }
    }
    it.increment(ec);
    if (ec) {
      problems->push_back({dir.string(), "stopped reading the directory: " + ec.message()});
      break;
    }
  }
  for (const auto& d : subdirs) walk(d, found, problems);
}

}  // namespace

std::vector<std::string> collect_beam_files(const std::vector<std::string>& paths,
                                            std::vector<std::pair<std::string, std::string>>* problems) {
  std::vector<std::string> out;
  for (const auto& p : paths) {
    std::error_code ec;
    const fs::file_status st = fs::status(p, ec);
    if (ec || !fs::exists(st)) {
      std::error_code ec2;
      problems->push_back({p, fs::is_symlink(fs::symlink_status(p, ec2)) ? "a symbolic link to nothing (or a loop of links)"
                                                                         : "no such file or directory"});
      continue;
    }
    if (!fs::is_directory(st)) {
      out.push_back(p);
      continue;
    }
    std::vector<std::string> found;
    walk(p, &found, problems);
    std::sort(found.begin(), found.end());
    out.insert(out.end(), found.begin(), found.end());
  }
  return out;
}

std::string report_clashes_with_input(const std::string& report, const std::vector<std::string>& inputs) {
  if (report.empty() || report == "-") return "";
  // A report that does not exist yet cannot be a file being read; one that
  // does is the same file as an input when both name the same inode (which
  // also sees through links). One stat per input, no path resolution: a
  // library of 10,000 files pays microseconds here.
  struct stat r{};
  if (::stat(report.c_str(), &r) != 0) return "";
  for (const auto& in : inputs) {
    struct stat i{};
    if (::stat(in.c_str(), &i) == 0 && i.st_dev == r.st_dev && i.st_ino == r.st_ino)
      return "'" + report + "' is the beam file '" + in + "'; the report would overwrite it (choose another path)";
  }
  return "";
}

namespace {

// True when standard output is a pipe whose reader has gone (EPIPE).
bool stdout_reader_gone() {
  if (errno == EPIPE) return true;
  struct pollfd p{1, POLLOUT, 0};
  return poll(&p, 1, 0) == 1 && (p.revents & POLLERR) != 0;
}

const char* kTempMark = ".trivet-tmp.";

// Removes the temporary files that an earlier, killed run left for `target`
// (".NAME.trivet-tmp.PID.XXXXXX" whose process PID no longer exists).
void remove_stale_temporaries(const fs::path& dir, const std::string& name) {
  const std::string prefix = "." + name + kTempMark;
  std::error_code ec;
  for (fs::directory_iterator it(dir, ec), end; !ec && it != end; it.increment(ec)) {
    const std::string f = it->path().filename().string();
    if (f.compare(0, prefix.size(), prefix) != 0) continue;
    const std::string rest = f.substr(prefix.size());
    const std::size_t dot = rest.find('.');
    if (dot == std::string::npos || dot == 0 || rest.find_first_not_of("0123456789") != dot) continue;
    const long pid = std::strtol(rest.substr(0, dot).c_str(), nullptr, 10);
    if (pid <= 0 || (kill(static_cast<pid_t>(pid), 0) != 0 && errno == ESRCH)) {
      std::error_code e2;
      fs::remove(it->path(), e2);
    }
  }
}

}  // namespace

std::string ReportFile::open(const std::string& path) {
  path_ = path;
  if (path == "-") {
    stdout_ = true;
    return "";
  }
  const fs::path target(path);
  const fs::path dir = target.has_parent_path() ? target.parent_path() : fs::path(".");
  remove_stale_temporaries(dir, target.filename().string());
  std::string tmpl = (dir / ("." + target.filename().string() + kTempMark + std::to_string(getpid()) + ".XXXXXX")).string();
  std::vector<char> name(tmpl.begin(), tmpl.end());
  name.push_back('\0');
  const int fd = mkstemp(name.data());
  if (fd < 0) return "cannot create a file in " + dir.string();
  tmp_ = name.data();
  if (!buf_.open(tmp_, std::ios::out | std::ios::binary | std::ios::trunc)) {
    close(fd);
    std::remove(tmp_.c_str());
    tmp_.clear();
    return "cannot write " + std::string(name.data());
  }
  buf_.fd = fd;  // kept open for the early writeback; closed in commit()
  file_.clear();
  return "";
}

std::streamsize ReportFile::Buffer::xsputn(const char* s, std::streamsize n) {
  const std::streamsize put = std::filebuf::xsputn(s, n);
  since_ += put;
  constexpr std::streamsize kStep = std::streamsize(8) << 20;
  if (since_ >= kStep && fd >= 0) {
    since_ = 0;
#ifdef __linux__
    // Start the disk writes of what is written so far; does not wait for them.
    if (sync() == 0) sync_file_range(fd, 0, 0, SYNC_FILE_RANGE_WRITE);
#endif
  }
  return put;
}

std::ostream& ReportFile::out() { return stdout_ ? std::cout : static_cast<std::ostream&>(file_); }

std::string ReportFile::commit() {
  if (stdout_) {
    std::cout.flush();
    // A reader that has gone (`trivet check ... --json - | head -1`) is not
    // a failure of ours: stop quietly (SIGPIPE is ignored in main).
    return std::cout || stdout_reader_gone() ? "" : "cannot write to standard output";
  }
  if (tmp_.empty()) return "the report was not opened";
  const std::string tmp = tmp_;
  tmp_.clear();  // from here on this object no longer owns the temporary file
  file_.flush();
  const int fd = buf_.fd;
  buf_.fd = -1;
  const bool written = static_cast<bool>(file_) && buf_.close() != nullptr;
  if (!written) {
    buf_.close();
    if (fd >= 0) close(fd);
    std::remove(tmp.c_str());
    return "writing " + path_ + " failed (disk full?)";
  }
  const fs::path target(path_);
  const fs::path dir = target.has_parent_path() ? target.parent_path() : fs::path(".");
  // On the disk before it takes the report's name (a power cut leaves the
  // old report or the new one, not an empty file).
  if (fd >= 0) {
    const bool synced = fsync(fd) == 0;
    close(fd);
    if (!synced) { std::remove(tmp.c_str()); return "writing " + path_ + " failed (the disk did not take it)"; }
  }
  std::error_code ec;
  fs::permissions(tmp, fs::perms::owner_read | fs::perms::owner_write | fs::perms::group_read | fs::perms::others_read,
                  fs::perm_options::replace, ec);
  fs::rename(tmp, target, ec);
  if (ec) { std::remove(tmp.c_str()); return "cannot rename the report into place: " + ec.message(); }
  if (const int dir_fd = ::open(dir.c_str(), O_RDONLY | O_DIRECTORY); dir_fd >= 0) {
    fsync(dir_fd);  // the new name on the disk too (best effort)
    close(dir_fd);
  }
  return "";
}

ReportFile::~ReportFile() {
  if (!tmp_.empty()) {
    buf_.close();
    std::remove(tmp_.c_str());
  }
  if (buf_.fd >= 0) close(buf_.fd);
}

std::string write_report_file(const std::string& path, const std::function<void(std::ostream&)>& body) {
  ReportFile f;
  if (std::string err = f.open(path); !err.empty()) return err;
  body(f.out());
  return f.commit();
}

}  // namespace trivet::cli
