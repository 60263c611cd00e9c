// `trivet merge`: joins the JSON reports of shards.
#include <algorithm>
#include <fstream>
#include <iostream>
#include <stdexcept>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "harness/cli/files.h"
#include "harness/cli/commands.h"

namespace trivet::cli {

// Joins the JSON reports of several shards: beams in order of file name,
// the summary recounted. Exit code as for check.
int run_merge(const std::vector<std::string>& inputs, const std::string& out_path) {
  if (const std::string why = report_clashes_with_input(out_path, inputs); !why.empty()) {
    fail("trivet merge: --json: ", why);
  }
  nlohmann::ordered_json merged;
  std::vector<nlohmann::ordered_json> beams;
  for (const auto& path : inputs) {
    std::ifstream in(path);
    nlohmann::ordered_json j;
    try {
      if (!in) throw std::runtime_error("cannot open the file");
      j = nlohmann::ordered_json::parse(in);
      if (!j.is_object() || !j.contains("beams") || !j["beams"].is_array()) throw std::runtime_error("not a trivet report (no \"beams\" list)");
    } catch (const std::exception& e) {
      fail("trivet merge: ", path, ": ", e.what());
    }
    if (merged.empty()) merged = j;
    for (auto& b : j["beams"]) beams.push_back(b);
  }
  std::stable_sort(beams.begin(), beams.end(), [](const auto& x, const auto& y) {
    return x.value("file", std::string()) < y.value("file", std::string());
  });
  std::size_t agree = 0, disagree = 0, unconfirmed = 0, invalid = 0, claims_failed = 0;
  for (const auto& b : beams) {
    const std::string s = b.value("status", std::string());
    agree += s == "agree"; disagree += s == "disagree"; unconfirmed += s == "unconfirmed"; invalid += s == "invalid";
    if (b.contains("claims"))
      for (const auto& c : b["claims"]) claims_failed += !c.value("holds", false);
  }
  merged["summary"] = {{"beams", beams.size()}, {"agree", agree}, {"disagree", disagree},
                       {"unconfirmed", unconfirmed}, {"invalid", invalid}, {"claims_failed", claims_failed}};
  merged["beams"] = beams;
  const std::string err = write_report_file(out_path, [&](std::ostream& o) { o << merged.dump(1) << "\n"; });
  if (!err.empty()) {
    fail("trivet merge: ", err);
  }
  std::cerr << "merged " << inputs.size() << " reports: " << beams.size() << " beams: " << agree << " agree, "
            << disagree << " disagree, " << unconfirmed << " unconfirmed, " << invalid << " invalid; "
            << claims_failed << " claims fail\n";
  if (invalid) return kExitInvalid;
  if (disagree || unconfirmed) return kExitDisagree;
  return kExitAgree;
}

}  // namespace trivet::cli
