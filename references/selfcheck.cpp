#include "references/selfcheck.h"

#include <algorithm>
#include <cmath>

namespace trivet::references {

std::size_t CaseResult::values_failed() const {
  std::size_t n = 0;
  for (const auto& v : values) n += !v.holds;
  return n;
}

std::size_t SelfcheckResult::cases_failed() const {
  std::size_t n = 0;
  for (const auto& c : cases) n += !c.holds;
  return n;
}

std::size_t SelfcheckResult::values_checked() const {
  std::size_t n = 0;
  for (const auto& c : cases) n += c.values.size();
  return n;
}

std::size_t SelfcheckResult::values_failed() const {
  std::size_t n = 0;
  for (const auto& c : cases) n += c.values_failed();
  return n;
}

namespace {

// The shared helpers of the harness.
using compare::locate;
using compare::node_at;

// The value of `ex` on one method's result; nothing and a reason when the
// point is ambiguous (a jump without a side).
std::optional<double> value_on(const Expected& ex, const compare::MethodResult& m,
                               const compare::LoadSet& set, std::string* reason) {
  const Beam& beam = set.beam;
  const Solution& sol = m.solution;
  if (ex.span) {
    // The method's own span extremes (found by the harness from this
    // method's values, exactly between stations); positions local.
    if (*ex.span >= m.extremes.size()) { *reason = "the method gave no extremes for this span"; return std::nullopt; }
    const compare::SpanExtremes& e = m.extremes[*ex.span];
    const double x0 = beam.node_x(*ex.span);
    switch (ex.quantity) {
      case Quantity::MaxMoment: return e.max_moment;
      case Quantity::MinMoment: return e.min_moment;
      case Quantity::MaxDeflection: return e.max_deflection;
      case Quantity::MaxMomentAt: return e.max_moment_x - x0;
      case Quantity::MinMomentAt: return e.min_moment_x - x0;
      case Quantity::MaxDeflectionAt: return e.max_deflection_x - x0;
      default: break;
    }
    *reason = "not a span quantity";
    return std::nullopt;
  }
  std::optional<std::size_t> node = ex.node;
  if (!node && ex.x) node = node_at(beam, *ex.x);
  std::optional<double> left, right;
  auto pick = [](const PointValues& p, Quantity q) {
    switch (q) {
      case Quantity::Moment: return p.moment;
      case Quantity::Shear: return p.shear;
      case Quantity::Deflection: return p.deflection;
      default: return p.rotation;
    }
  };
  if (node) {
    const std::size_t j = *node;
    const NodeResult& nr = m.nodes[j];
    switch (ex.quantity) {
      case Quantity::Reaction: return nr.reaction_force;
      case Quantity::ReactionMoment: return nr.reaction_moment;
      case Quantity::Deflection: return nr.deflection;
      case Quantity::Moment: left = nr.moment_left; right = nr.moment_right; break;
      case Quantity::Rotation:
        if (j > 0) left = nr.rotation_left;
        if (j < beam.spans.size()) right = nr.rotation_right;
        break;
      case Quantity::Shear:
        if (j > 0) left = sol.at(j - 1, beam.spans[j - 1].length, false).shear;
        if (j < beam.spans.size()) right = sol.at(j, 0.0, false).shear;
        break;
      default: *reason = "not a point quantity"; return std::nullopt;
    }
  } else {
    auto [s, local] = locate(beam, *ex.x);
    left = pick(sol.at(s, local, false), ex.quantity);
    right = pick(sol.at(s, local, true), ex.quantity);
  }
  if (ex.side == input::Side::Left) {
    if (!left) { *reason = "there is no beam to the left of this point"; return std::nullopt; }
    return left;
  }
  if (ex.side == input::Side::Right) {
    if (!right) { *reason = "there is no beam to the right of this point"; return std::nullopt; }
    return right;
  }
  if (left && right && std::abs(*left - *right) > ex.tolerance) {
    *reason = std::string("the ") + quantity_name(ex.quantity) + " jumps here (" + input::format_number(*left) +
              " just left, " + input::format_number(*right) + " just right): the case must give \"side\"";
    return std::nullopt;
  }
  return left ? left : right;
}

}  // namespace

CaseResult run_case(const ReferenceCase& ref, const compare::Options& options, const AfterCheck& after) {
  CaseResult r;
  r.file = ref.file;
  r.id = ref.id;
  r.title = ref.title;
  r.source = ref.source;
  r.citation = format_citation(ref.source);
  r.errors = ref.errors;
  if (!ref.ok()) return r;

  compare::BeamResult br = compare::check(ref.beam, options);
  if (after) after(br, ref);
  if (br.status == compare::BeamStatus::Invalid || br.sets.empty()) {
    r.errors = br.errors;
    if (r.errors.empty()) r.errors.push_back({"/beam", "", "the beam could not be checked", "check.failed"});
    return r;
  }
  // The verdict: the worst over the load sets.
  r.verdict = compare::Verdict::Agree;
  for (const auto& s : br.sets) {
    if (s.verdict == compare::Verdict::Disagree ||
        (s.verdict == compare::Verdict::Unconfirmed && r.verdict == compare::Verdict::Agree)) {
      r.verdict = s.verdict;
      r.verdict_problem = s.problem;
    }
  }
  for (const auto& m : br.sets.front().methods) {
    if (m.status == MethodStatus::Ok) r.methods_ok.push_back(m.name);
    else if (m.status == MethodStatus::NotApplicable) r.methods_skipped.emplace_back(m.name, m.reason);
    else r.methods_failed.emplace_back(m.name, m.reason);
  }

  bool all_hold = true;
  for (const auto& ex : ref.expected) {
    ValueResult v;
    v.pointer = ex.pointer;
    v.quantity = quantity_name(ex.quantity);
    v.where = ex.where(ref.beam);
    v.published = ex.published;
    v.multiplier = ex.multiplier;
    v.published_number = ex.number.value;
    v.multiplier_value = ex.multiplier_value;
    v.expected = ex.value;
    v.tolerance = ex.tolerance;
    v.tolerance_rule = ex.number.rule;
    v.form = form_name(ex.number.form);
    v.magnitude = ex.magnitude;
    v.note = ex.note;
    const compare::LoadSet* set = &br.sets.front();
    for (const auto& s : br.sets)
      if (!ex.load_case.empty() && s.name == ex.load_case) set = &s;
    v.load_case = set->name;
    bool any = false, holds = true;
    for (const auto& m : set->methods) {
      MethodValue mv;
      mv.method = m.name;
      mv.status = m.status;
      if (m.status == MethodStatus::NotApplicable) {
        mv.holds = true;
        mv.reason = "not applicable: " + m.reason;
      } else if (m.status == MethodStatus::Failed) {
        mv.holds = false;
        mv.reason = "failed: " + m.reason;
        holds = false;
      } else {
        std::string reason;
        if (auto c = value_on(ex, m, *set, &reason)) {
          mv.evaluated = true;
          mv.computed = *c;
          mv.difference = (ex.magnitude ? std::abs(*c) : *c) - ex.value;
          // The tolerance is a closed bound; allow for the rounding of the
          // tolerance itself and of the multiplier.
          mv.holds = std::abs(mv.difference) <= ex.tolerance * (1 + 1e-12) + 1e-14 * std::abs(ex.multiplier_value);
          any = true;
        } else {
          mv.reason = reason;
          mv.holds = false;
        }
        holds = holds && mv.holds;
      }
      v.methods.push_back(mv);
    }
    v.holds = holds && any;
    all_hold = all_hold && v.holds;
    r.values.push_back(std::move(v));
  }
  r.holds = all_hold && !r.values.empty() && r.methods_failed.empty() && !r.methods_ok.empty() &&
            r.verdict == compare::Verdict::Agree;
  return r;
}

SelfcheckResult run_selfcheck(const std::string& dir, const compare::Options& options, const AfterCheck& after) {
  SelfcheckResult out;
  out.directory = dir;
  for (const auto& c : load_cases(dir)) out.cases.push_back(run_case(c, options, after));
  return out;
}

}  // namespace trivet::references
