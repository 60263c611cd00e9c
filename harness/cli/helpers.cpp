// Small helpers shared by the commands, and the precision runs of a checked beam.
#include <algorithm>
#include <cstdint>
#include <cstdlib>
#include <memory>

#include <unistd.h>

#include "harness/precision/precision.h"

#include "harness/cli/commands.h"

namespace trivet::cli {

// The shard (0-based) a file belongs to: a hash of its path (FNV-1a), so
// that adding a file does not move the others between shards.
reports::ShowUnits show_units_option(const std::string& command, const std::string& text) {
  if (text.empty()) return {};
  std::string error;
  const auto s = reports::parse_show_units(text, &error);
  if (!s) fail("trivet ", command, ": --show-units: ", error);
  return *s;
}

unsigned shard_of(const std::string& path, unsigned n) {
  std::uint64_t h = 1469598103934665603ull;
  for (unsigned char c : path) {
    h ^= c;
    h *= 1099511628211ull;
  }
  return static_cast<unsigned>(h % n);
}

bool use_color(int fd) {
  return isatty(fd) && std::getenv("NO_COLOR") == nullptr;
}

std::vector<std::string> split_list(const std::string& s) {
  std::vector<std::string> out;
  std::string cur;
  for (char c : s) {
    if (c == ',') { if (!cur.empty()) out.push_back(cur); cur.clear(); }
    else if (c != ' ') cur += c;
  }
  if (!cur.empty()) out.push_back(cur);
  return out;
}

void apply_precision_text(compare::BeamResult& r, std::vector<std::shared_ptr<const precision::LoadSetNumbers>>& numbers,
                          const std::string& text, const input::BeamFile& f, const std::string& arithmetic,
                          const std::string& reference, const compare::Options& opt) {
  struct Args { std::string arithmetic, reference; } a{arithmetic, reference};
  {
    const precision::Conditioning c = precision::estimate_conditioning(f.beam, std::nullopt, 6, 1);  // warnings only
    for (const auto& w : c.warnings) r.warnings.push_back(w);
  }
  const bool want = a.arithmetic != "double" || !a.reference.empty();
  if (!want) return;
  precision::Options po;
  po.methods = opt.methods;
  po.stations_per_span = opt.stations_per_span;
  const std::string& ar = a.arithmetic != "double" ? a.arithmetic : a.reference;
  po.arithmetic = ar == "exact" ? precision::Arithmetic::Exact : precision::Arithmetic::Extended;
  po.reference = true;
  const precision::FileNumbers fn = precision::run_file(text, f, po);
  if (!fn.ok) {
    r.warnings.push_back("the " + ar + " arithmetic run could not be made: " + fn.error);
    return;
  }
  for (const auto& set : fn.sets) {
    numbers.push_back(std::make_shared<precision::LoadSetNumbers>(set));
    if (set.conditioning.measured_digits_lost && *set.conditioning.measured_digits_lost > po.warn_digits)
      for (const auto& w : set.conditioning.warnings)
        if (std::find(r.warnings.begin(), r.warnings.end(), w) == r.warnings.end()) r.warnings.push_back(w);
  }
  if (a.arithmetic == "double") return;
  // Replace the double values by the high-precision ones.
  for (auto& set : r.sets) {
    const precision::LoadSetNumbers* pn = nullptr;
    for (const auto& p : numbers)
      if (p->load_case == set.name) pn = p.get();
    if (!pn || set.envelope) continue;
    for (auto& m : set.methods) {
      if (m.status != MethodStatus::Ok) continue;
      for (const auto& mn : pn->methods) {
        if (mn.name != m.name || mn.status != MethodStatus::Ok) continue;
        if (mn.nodes.size() != m.nodes.size() || mn.stations.size() != m.stations.size()) continue;
        for (std::size_t j = 0; j < m.nodes.size(); ++j) {
          NodeResult& n = m.nodes[j];
          const precision::NodeNumbers& x = mn.nodes[j];
          if (n.moment_left && x.moment_left) n.moment_left = x.moment_left->value;
          if (n.moment_right && x.moment_right) n.moment_right = x.moment_right->value;
          n.reaction_force = x.reaction_force.value;
          n.reaction_moment = x.reaction_moment.value;
          n.deflection = x.deflection.value;
          n.rotation_left = x.rotation_left.value;
          n.rotation_right = x.rotation_right.value;
        }
        for (std::size_t i = 0; i < m.stations.size(); ++i) {
          m.stations[i].shear = mn.stations[i].shear.value;
          m.stations[i].moment = mn.stations[i].moment.value;
          m.stations[i].deflection = mn.stations[i].deflection.value;
          m.stations[i].rotation = mn.stations[i].rotation.value;
        }
      }
    }
  }
  compare::refresh(r, f, opt);
}

}  // namespace trivet::cli
