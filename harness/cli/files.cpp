#include "harness/cli/files.h"

#include <algorithm>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <iostream>
#include <system_error>

#include <unistd.h>

namespace trivet::cli {

namespace fs = std::filesystem;

std::vector<std::string> collect_beam_files(const std::vector<std::string>& paths,
                                            std::vector<std::pair<std::string, std::string>>* problems) {
  std::vector<std::string> out;
  for (const auto& p : paths) {
    std::error_code ec;
    const fs::file_status st = fs::status(p, ec);
    if (ec || !fs::exists(st)) {
      problems->push_back({p, "no such file or directory"});
      continue;
    }
    if (!fs::is_directory(st)) {
      out.push_back(p);
      continue;
    }
    std::vector<std::string> found;
    fs::recursive_directory_iterator it(p, fs::directory_options::skip_permission_denied, ec), end;
    if (ec) {
      problems->push_back({p, "cannot read the directory: " + ec.message()});
      continue;
    }
    while (it != end) {
      const fs::directory_entry& e = *it;
      std::error_code e2;
      if (e.is_regular_file(e2) && e.path().extension() == ".json") found.push_back(e.path().string());
      it.increment(ec);
      if (ec) {
        problems->push_back({p, "stopped reading the directory: " + ec.message()});
        break;
      }
    }
    std::sort(found.begin(), found.end());
    out.insert(out.end(), found.begin(), found.end());
  }
  return out;
}

std::string write_report_file(const std::string& path, const std::function<void(std::ostream&)>& body) {
  if (path == "-") {
    body(std::cout);
    std::cout.flush();
    return std::cout ? "" : "cannot write to standard output";
  }
  const fs::path target(path);
  const fs::path dir = target.has_parent_path() ? target.parent_path() : fs::path(".");
  std::string tmpl = (dir / ("." + target.filename().string() + ".XXXXXX")).string();
  std::vector<char> name(tmpl.begin(), tmpl.end());
  name.push_back('\0');
  const int fd = mkstemp(name.data());
  if (fd < 0) return "cannot create a file in " + dir.string();
  close(fd);
  const std::string tmp(name.data());
  {
    std::ofstream out(tmp, std::ios::binary | std::ios::trunc);
    if (!out) { std::remove(tmp.c_str()); return "cannot write " + tmp; }
    body(out);
    out.flush();
    if (!out) { out.close(); std::remove(tmp.c_str()); return "writing " + path + " failed (disk full?)"; }
  }
  std::error_code ec;
  fs::permissions(tmp, fs::perms::owner_read | fs::perms::owner_write | fs::perms::group_read | fs::perms::others_read,
                  fs::perm_options::replace, ec);
  fs::rename(tmp, target, ec);
  if (ec) { std::remove(tmp.c_str()); return "cannot rename the report into place: " + ec.message(); }
  return "";
}

}  // namespace trivet::cli
