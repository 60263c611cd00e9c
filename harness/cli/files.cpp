#include "harness/cli/files.h"

#include <algorithm>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <iostream>
#include <system_error>
#include <unordered_map>

#include <cerrno>
#include <cstdlib>

#include <dirent.h>
#include <fcntl.h>
#include <poll.h>
#include <signal.h>
#include <sys/stat.h>
#include <unistd.h>

#ifdef __linux__
#include <linux/fs.h>  // RENAME_EXCHANGE
#include <sys/syscall.h>
#endif

namespace trivet::cli {

namespace fs = std::filesystem;

namespace {

// What a directory entry named *.json is, when it is not a readable file.
std::string not_a_beam_file(const fs::path& p) {
  std::error_code ec;
  const fs::file_status st = fs::status(p, ec);
  if (ec || !fs::exists(st)) {
    std::error_code ec2;
    if (fs::is_symlink(fs::symlink_status(p, ec2)))
      return "a symbolic link to nothing (or a loop of links); nothing to read";
    return "cannot read the file: " + (ec ? ec.message() : std::string("it has gone"));
  }
  if (fs::is_regular_file(st) || fs::is_directory(st)) return "";
  return std::string("is not a regular file (") +
         (fs::is_fifo(st) ? "a named pipe" : fs::is_socket(st) ? "a socket" : "a device") + "); skipped";
}

// A name that fs::path would give the extension ".json" ("x.json", not ".json").
bool json_name(const char* name, std::size_t n) {
  return n > 5 && std::char_traits<char>::compare(name + n - 5, ".json", 5) == 0;
}

// Every *.json below `dir` into `found`; directories that cannot be read,
// and *.json entries that are not files, into `problems`. Symbolic links to
// directories are not followed (so a loop of links cannot trap the walk).
// readdir's entry types: no stat for a regular file or a directory.
void walk(const std::string& dir, std::vector<std::string>* found,
          std::vector<std::pair<std::string, std::string>>* problems) {
  DIR* d = ::opendir(dir.c_str());
  if (d == nullptr) {
    problems->push_back({dir, "cannot read the directory: " + std::error_code(errno, std::generic_category()).message()});
    return;
  }
  const std::string prefix = !dir.empty() && dir.back() == '/' ? dir : dir + "/";
  std::vector<std::string> subdirs;
  for (;;) {
    errno = 0;
    const dirent* e = ::readdir(d);
    if (e == nullptr) {
      if (errno != 0)
        problems->push_back({dir, "stopped reading the directory: " + std::error_code(errno, std::generic_category()).message()});
      break;
    }
    const std::size_t n = std::char_traits<char>::length(e->d_name);
    if ((n == 1 && e->d_name[0] == '.') || (n == 2 && e->d_name[0] == '.' && e->d_name[1] == '.')) continue;
    unsigned char type = e->d_type;
    if (type == DT_UNKNOWN) {  // a file system that does not fill in the type
      struct stat st{};
      const std::string p = prefix + e->d_name;
      type = ::lstat(p.c_str(), &st) != 0 ? DT_UNKNOWN : S_ISDIR(st.st_mode) ? DT_DIR : S_ISREG(st.st_mode) ? DT_REG
                                          : S_ISLNK(st.st_mode) ? DT_LNK : DT_FIFO;  // DT_FIFO: "not a file" (told apart below)
    }
    if (type == DT_DIR) {
      subdirs.push_back(prefix + e->d_name);
      continue;
    }
    if (!json_name(e->d_name, n)) continue;
    std::string p = prefix + e->d_name;
    if (type == DT_REG) {
      found->push_back(std::move(p));
      continue;
    }
    if (type == DT_LNK) {  // a link to a file is read; a link to a directory is not followed
      struct stat st{};
      if (::stat(p.c_str(), &st) == 0) {
        if (S_ISREG(st.st_mode)) found->push_back(std::move(p));
        if (S_ISREG(st.st_mode) || S_ISDIR(st.st_mode)) continue;
      }
    }
    const std::string why = not_a_beam_file(p);
    if (!why.empty()) problems->push_back({p, why});
  }
  ::closedir(d);
  for (const auto& sub : subdirs) walk(sub, found, problems);
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

std::pair<std::size_t, std::string> report_clashes_with_input(const std::vector<std::string>& reports,
                                                              const std::vector<std::string>& inputs) {
  const std::pair<std::size_t, std::string> none{reports.size(), ""};
  // A report that does not exist yet cannot be a file being read; one that
  // does is the same file as an input when both name the same inode (which
  // also sees through links: the exact test, one stat). Only candidates are
  // stat'ed (a stat per input cost a library of 10,000 files most of its
  // start-up). An entry of an input directory's listing is one when it has
  // the report's name in the report's directory (the two directories told
  // apart by stat, which sees through links and spellings), when it is a
  // link or of unknown type, or when its inode number is the report's (a
  // hard link). The listing's inode numbers are used for hard links only:
  // some file systems (overlayfs) list other numbers than stat gives. A hard
  // link they hide is harmless: the report takes the place of its own path
  // only, and the other name keeps the input.
  struct Existing {
    std::size_t report;
    struct stat st;      // of the report
    struct stat dir_st;  // of its directory (st_ino 0: unknown)
    std::string name;    // its last path component
  };
  const auto split = [](const std::string& path) {
    const std::size_t slash = path.rfind('/');
    return std::pair<std::string, std::string>{
        slash == std::string::npos ? "." : slash == 0 ? "/" : path.substr(0, slash),
        slash == std::string::npos ? path : path.substr(slash + 1)};
  };
  std::vector<Existing> existing;
  for (std::size_t k = 0; k < reports.size(); ++k) {
    Existing e{k, {}, {}, {}};
    if (reports[k].empty() || reports[k] == "-" || ::stat(reports[k].c_str(), &e.st) != 0) continue;
    const auto [dir, name] = split(reports[k]);
    if (::stat(dir.c_str(), &e.dir_st) != 0) e.dir_st.st_ino = 0;
    e.name = name;
    existing.push_back(std::move(e));
  }
  if (existing.empty()) return none;
  // The first report that the input is, or none.
  const auto clash = [&](const std::string& in) -> std::pair<std::size_t, std::string> {
    struct stat i{};
    if (::stat(in.c_str(), &i) == 0)
      for (const auto& r : existing)
        if (i.st_dev == r.st.st_dev && i.st_ino == r.st.st_ino)
          return {r.report, "'" + reports[r.report] + "' is the beam file '" + in + "'; the report would overwrite it (choose another path)"};
    return none;
  };
  // The inputs by directory, in order of first appearance.
  std::unordered_map<std::string, std::unordered_map<std::string, std::size_t>> by_dir;  // dir -> name -> input
  std::vector<std::string> dirs;
  for (std::size_t k = 0; k < inputs.size(); ++k) {
    auto [dir, name] = split(inputs[k]);
    auto [it, fresh] = by_dir.try_emplace(dir);
    if (fresh) dirs.push_back(dir);
    it->second.emplace(name, k);
  }
  std::vector<std::size_t> candidates;
  for (const std::string& dir : dirs) {
    const auto& names = by_dir[dir];
    candidates.clear();
    std::size_t listed = 0;
    if (DIR* d = ::opendir(dir.c_str())) {
      // The reports that live in this directory: their names are candidates.
      std::vector<const std::string*> here;
      struct stat dst{};
      if (::fstat(dirfd(d), &dst) == 0)
        for (const auto& r : existing)
          if (r.dir_st.st_ino != 0 && r.dir_st.st_dev == dst.st_dev && r.dir_st.st_ino == dst.st_ino) here.push_back(&r.name);
      while (const dirent* e = ::readdir(d)) {
        const auto it = names.find(e->d_name);
        if (it == names.end()) continue;
        ++listed;
        bool maybe = e->d_type != DT_REG;
        for (const auto& r : existing) maybe = maybe || e->d_ino == r.st.st_ino;
        for (const std::string* n : here) maybe = maybe || *n == e->d_name;
        if (maybe) candidates.push_back(it->second);
      }
      ::closedir(d);
    }
    if (listed < names.size()) {  // not listable, or named files not in the listing ("a/../b.json", gone): a stat each
      candidates.clear();
      for (const auto& name_input : names) candidates.push_back(name_input.second);
    }
    std::sort(candidates.begin(), candidates.end());
    for (const std::size_t k : candidates)
      if (auto c = clash(inputs[k]); !c.second.empty()) return c;
  }
  return none;
}

std::string report_clashes_with_input(const std::string& report, const std::vector<std::string>& inputs) {
  return report_clashes_with_input(std::vector<std::string>{report}, inputs).second;
}

std::string report_targets_problem(const std::vector<std::pair<std::string, std::string>>& targets) {
  std::vector<std::pair<dev_t, ino_t>> seen_files;
  std::vector<std::string> seen_paths;
  for (const auto& [option, path] : targets) {
    if (path.empty() || path == "-") continue;
    // The same path twice: the second report would replace the first.
    if (std::find(seen_paths.begin(), seen_paths.end(), path) != seen_paths.end())
      return option + ": " + path + " is named for two reports; give each report its own file";
    seen_paths.push_back(path);
    struct stat st{};
    if (::lstat(path.c_str(), &st) != 0) continue;  // a new file
    const char* what = S_ISREG(st.st_mode)  ? nullptr
                       : S_ISLNK(st.st_mode) ? "a symbolic link"
                       : S_ISDIR(st.st_mode) ? "a directory"
                       : S_ISCHR(st.st_mode) ? "a character device"
                       : S_ISBLK(st.st_mode) ? "a block device"
                       : S_ISFIFO(st.st_mode) ? "a named pipe"
                       : S_ISSOCK(st.st_mode) ? "a socket"
                                              : "not a regular file";
    if (what)
      return option + ": " + path + " exists and is " + what +
             ", not a report: trivet replaces only regular files (give another path, or '-' for standard output)";
    if ((st.st_mode & 0222) == 0)
      return option + ": " + path + " is read-only: trivet does not replace it (make it writable, or give another path)";
    for (const auto& f : seen_files)
      if (f.first == st.st_dev && f.second == st.st_ino)
        return option + ": " + path + " is the same file as another report; give each report its own file";
    seen_files.emplace_back(st.st_dev, st.st_ino);
  }
  return "";
}

// True when standard output is a pipe whose reader has gone (EPIPE).
bool stdout_reader_gone() {
  if (errno == EPIPE) return true;
  struct pollfd p{1, POLLOUT, 0};
  return poll(&p, 1, 0) == 1 && (p.revents & POLLERR) != 0;
}

namespace {

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

// Puts the finished file `tmp` at `target` in one step for any reader:
// `target` holds the old report or the new one, never a part. An old
// regular file is swapped out (renameat2 RENAME_EXCHANGE) and then removed
// under the temporary name: a plain rename over it makes ext4 start the
// disk writes of the whole new file, and free the old one, inside the
// rename. Where the swap is not supported: a plain rename.
std::string replace_file(const std::string& tmp, const std::string& target) {
#ifdef __linux__
  struct stat old{};
  if (::lstat(target.c_str(), &old) == 0 && S_ISREG(old.st_mode) &&
      ::syscall(SYS_renameat2, AT_FDCWD, tmp.c_str(), AT_FDCWD, target.c_str(), RENAME_EXCHANGE) == 0) {
    if (::unlink(tmp.c_str()) == 0) return "";
    // What was swapped out is not the old report (it changed under us):
    // swap it back, and the plain rename below decides.
    ::syscall(SYS_renameat2, AT_FDCWD, tmp.c_str(), AT_FDCWD, target.c_str(), RENAME_EXCHANGE);
  }
#endif
  std::error_code ec;
  fs::rename(tmp, target, ec);
  if (ec) return "cannot rename the report into place: " + ec.message();
  return "";
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
  // The file mkstemp made is opened again without truncating it ("r+"):
  // ext4 takes a truncated file for one being replaced and writes all of it
  // to the disk when it is closed, in the closing thread.
  close(fd);
  if (!buf_.open(tmp_, std::ios::in | std::ios::out | std::ios::binary)) {
    std::remove(tmp_.c_str());
    tmp_.clear();
    return "cannot write " + std::string(name.data());
  }
  file_.clear();
  return "";
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
  const bool written = static_cast<bool>(file_) && buf_.close() != nullptr;
  if (!written) {
    buf_.close();
    std::remove(tmp.c_str());
    return "writing " + path_ + " failed (disk full?)";
  }
  std::error_code ec;
  fs::permissions(tmp, fs::perms::owner_read | fs::perms::owner_write | fs::perms::group_read | fs::perms::others_read,
                  fs::perm_options::replace, ec);
  if (std::string err = replace_file(tmp, path_); !err.empty()) {
    std::remove(tmp.c_str());
    return err;
  }
  return "";
}

ReportFile::~ReportFile() {
  if (!tmp_.empty()) {
    buf_.close();
    std::remove(tmp_.c_str());
  }
}

std::string write_report_file(const std::string& path, const std::function<void(std::ostream&)>& body) {
  ReportFile f;
  if (std::string err = f.open(path); !err.empty()) return err;
  body(f.out());
  return f.commit();
}

}  // namespace trivet::cli
