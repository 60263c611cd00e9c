// trivet: the beam of one load set, and the one rule for settlements.
//
// A load set is a load case on its own, or a combination of cases with a
// factor each. Its beam carries the loads of its cases, each multiplied by
// its case's factor, and its settlements by this rule (README,
// "Settlements"):
//   - a settlement that names no case acts exactly once, with factor 1, in
//     every load set (a single case, a plain combination, and every
//     arrangement of an envelope);
//   - a settlement that names its case belongs to that case: it is
//     multiplied by that case's factor where the case takes part, and is
//     absent from load sets without it.
// A spring's settlement (the movement of its base) follows the same rule.
//
// This code is shared by the answers of all three methods. What catches a
// bug in it: tests/envelope_bruteforce_test.cpp builds every arrangement's
// beam by its own code, and tests/envelope_test.cpp checks a settled support
// against the closed form.
#pragma once

#include <string>
#include <utility>
#include <vector>

#include "methods/beam/beam.h"

namespace trivet::compare {

// The beam of a load set whose cases take the given factors (case name ->
// factor; a case not listed is absent). Number type R as the beam's.
template <class R>
BasicBeam<R> beam_for_factors(const BasicBeam<R>& beam, const std::vector<std::pair<std::string, R>>& factors) {
  BasicBeam<R> b = beam;
  b.loads.clear();
  auto factor_of = [&](const std::string& cs) -> const R* {
    for (const auto& [name, f] : factors)
      if (name == cs) return &f;
    return nullptr;
  };
  for (const auto& l : beam.loads)
    if (const R* f = factor_of(l.load_case)) {
      BasicLoad<R> s = l;
      s.P *= *f; s.C *= *f; s.w1 *= *f; s.w2 *= *f;
      b.loads.push_back(s);
    }
  for (auto& sup : b.supports) {
    if (sup.settlement_case.empty()) continue;
    const R* f = factor_of(sup.settlement_case);
    sup.settlement = f ? R(sup.settlement * *f) : R(0);
  }
  return b;
}

// The beam of one load case on its own (factor 1; loads not scaled, so the
// numbers are bit for bit those of the file).
template <class R>
BasicBeam<R> beam_for_case(const BasicBeam<R>& beam, const std::string& load_case) {
  BasicBeam<R> b = beam;
  b.loads.clear();
  for (const auto& l : beam.loads)
    if (l.load_case == load_case) b.loads.push_back(l);
  for (auto& sup : b.supports)
    if (!sup.settlement_case.empty() && sup.settlement_case != load_case) sup.settlement = R(0);
  return b;
}

}  // namespace trivet::compare
