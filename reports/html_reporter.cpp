// The HTML report as a reporter of the check (reporter.h): it keeps the
// beams it is given and writes the page from them at the end.
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <memory>
#include <ostream>
#include <sstream>
#include <string>
#include <system_error>
#include <vector>

#include "reports/html_report.h"

namespace trivet::reports {

namespace {

class HtmlReporter final : public CheckReporter {
 public:
  HtmlReporter(std::ostream& out, const HtmlOptions& options) : out_(out), options_(options) {}
  void begin(const RunInfo&) override {}
  // The summary of every beam comes first: the page is written at end(),
  // from the beams the caller keeps until then.
  bool needs_all_results() const override { return true; }
  Part render(const Report&) const override { return {}; }  // not called: see needs_all_results()
  void beam(Part&&) override {}
  void keep(const Report& beam) override { beams_.push_back(&beam); }
  std::string end(const Summary&) override {
    stats_ = write_html(out_, beams_, options_);
    return "";  // a failed write shows in the stream, which the caller checks when it closes it
  }
  std::string warning() const override {
    return stats_.plot_error.empty() ? "" : "the report was written without some plots: " + stats_.plot_error;
  }

 private:
  std::ostream& out_;
  HtmlOptions options_;
  std::vector<const Report*> beams_;
  HtmlStats stats_;
};

// The checking records: each beam's page written to the folder as the beam
// is checked (render() runs in the workers; each beam has a file of its
// own), through a temporary file renamed into place, so a page is there
// whole or not at all. A part's text is the reason a page failed, if any.
class RecordReporter final : public CheckReporter {
 public:
  RecordReporter(std::string dir, const HtmlOptions& options) : dir_(std::move(dir)), options_(options) {
    std::error_code ec;
    std::filesystem::create_directories(dir_, ec);
    if (ec && !std::filesystem::is_directory(dir_)) problem_ = "cannot make the folder " + dir_ + ": " + ec.message();
  }
  void begin(const RunInfo&) override {}
  Part render(const Report& beam) const override {
    if (!problem_.empty()) return {};
    const std::filesystem::path target = std::filesystem::path(dir_) / record_file_name(beam.file);
    const std::filesystem::path tmp = target.string() + ".part";
    std::ostringstream page;
    write_record(page, beam, options_);
    {
      std::ofstream f(tmp, std::ios::binary | std::ios::trunc);
      f << page.str();
      f.flush();
      if (!f) {
        std::error_code ec;
        std::filesystem::remove(tmp, ec);
        return {"cannot write " + target.string(), {}};
      }
    }
    std::error_code ec;
    std::filesystem::rename(tmp, target, ec);
    if (ec) {
      std::filesystem::remove(tmp, ec);
      return {"cannot write " + target.string() + ": " + ec.message(), {}};
    }
    return {};
  }
  void beam(Part&& part) override {
    if (part.text.empty()) ++written_;
    else failed_.push_back(std::move(part.text));
  }
  std::string end(const Summary&) override {
    if (!problem_.empty()) return problem_;
    if (failed_.empty()) return "";
    std::string why = failed_.front();
    if (failed_.size() > 1) why += " (and " + std::to_string(failed_.size() - 1) + " more)";
    return why;
  }
  std::string warning() const override {
    return std::to_string(written_) + (written_ == 1 ? " checking record" : " checking records") + " written to " + dir_;
  }

 private:
  std::string dir_;
  HtmlOptions options_;
  std::string problem_;
  std::size_t written_ = 0;
  std::vector<std::string> failed_;
};

}  // namespace

std::unique_ptr<CheckReporter> record_reporter(const std::string& dir, const HtmlOptions& options) {
  return std::make_unique<RecordReporter>(dir, options);
}

std::unique_ptr<CheckReporter> html_reporter(std::ostream& out, const HtmlOptions& options) {
  return std::make_unique<HtmlReporter>(out, options);
}

}  // namespace trivet::reports
