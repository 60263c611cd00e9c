// trivet: a method's "no answer", with its stable id.
//
// Plumbing shared by the three methods (it is not mechanics: the
// independence rule in DEVELOPERS.md lets it be shared). The reason names
// the beam feature or the fault in words; the id is for scripts and tests,
// and never changes with the wording (README, "Errors and reasons").
#pragma once

#include <string>
#include <utility>

#include "methods/beam/beam.h"

namespace trivet {

namespace reason_id {
// not-applicable: a feature of the beam the method does not take (the
// reason names it and where it is).
inline constexpr const char* kFeature = "method.not_applicable.feature";
// not-applicable: the beam is larger than the method's system can index.
inline constexpr const char* kSize = "method.not_applicable.size";
// not-applicable: the arithmetic asked for (exact, extended) has no version
// of the method.
inline constexpr const char* kArithmetic = "method.not_applicable.arithmetic";
// failed: the beam reached the method in a state the reader rules out (a
// load outside its span, a span of no length): a fault upstream.
inline constexpr const char* kInput = "method.failed.input";
// failed: the system has no unique solution (a mechanism, a zero pivot).
inline constexpr const char* kSingular = "method.failed.singular";
// failed: a value came out infinite or not a number.
inline constexpr const char* kNonFinite = "method.failed.non_finite";
// failed: the method's own check of equilibrium of its answer failed.
inline constexpr const char* kEquilibrium = "method.failed.equilibrium";
// failed: the method returned fewer results than the beam has nodes.
inline constexpr const char* kIncomplete = "method.failed.incomplete";
// failed: the method threw (the reason holds what it said).
inline constexpr const char* kInternal = "method.failed.internal";
}  // namespace reason_id

template <class R>
BasicSolution<R> give_up(MethodStatus status, const char* id, std::string why) {
  BasicSolution<R> s;
  s.status = status;
  s.reason = std::move(why);
  s.reason_id = id;
  return s;
}

template <class R>
BasicSolution<R> not_applicable(const char* id, std::string why) {
  return give_up<R>(MethodStatus::NotApplicable, id, std::move(why));
}

template <class R>
BasicSolution<R> failed(const char* id, std::string why) {
  return give_up<R>(MethodStatus::Failed, id, std::move(why));
}

}  // namespace trivet
