// The HTML report as a reporter of the check (reporter.h): it keeps the
// beams it is given and writes the page from them at the end.
#include <memory>
#include <ostream>
#include <string>
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

}  // namespace

std::unique_ptr<CheckReporter> html_reporter(std::ostream& out, const HtmlOptions& options) {
  return std::make_unique<HtmlReporter>(out, options);
}

}  // namespace trivet::reports
