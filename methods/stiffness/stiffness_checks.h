// trivet, direct stiffness method, private header: plumbing, not mechanics.
//
// The input checks (what is outside the method's scope, with the message
// naming the feature), and the small helpers of the solve: finiteness,
// non-zero, and the NotApplicable / Failed results.
#pragma once

#include <cmath>
#include <cstddef>
#include <string>
#include <utility>

#include "methods/beam/beam.h"
#include "methods/beam/status.h"

namespace trivet::stiffness::internal {

template <class R>
bool is_finite(const R& x) {
  using std::isfinite;
  return isfinite(x);
}

// --- Input checks ---------------------------------------------------------------

template <class R>
std::string node_name(const BasicBeam<R>& beam, std::size_t i) {
  if (i < beam.labels.size() && !beam.labels[i].empty()) return "node " + beam.labels[i];
  return "node " + std::to_string(i + 1);
}

template <class R>
bool nonzero(const R& x) {
  return x < R(0) || R(0) < x;
}



// Empty when the beam is within scope, else the feature that is not.
template <class R>
std::string check_scope(const BasicBeam<R>& beam) {
  const std::size_t n = beam.spans.size();
  if (n == 0) return "beam without spans";
  if (beam.supports.size() != n + 1) return "support count differs from span count + 1";
  for (std::size_t s = 0; s < n; ++s) {
    if (!(R(0) < beam.spans[s].length)) return "non-positive length of span " + std::to_string(s + 1);
    if (!(R(0) < beam.spans[s].EI)) return "non-positive EI of span " + std::to_string(s + 1);
  }
  for (std::size_t i = 0; i <= n; ++i) {
    const BasicSupport<R>& sp = beam.supports[i];
    auto where = [&] { return node_name(beam, i); };  // built only on failure
    switch (sp.type) {
      case SupportType::Fixed: case SupportType::Pinned: case SupportType::Roller:
      case SupportType::Free: case SupportType::Guided: case SupportType::Spring:
        break;
      default:
        return "unknown support type at " + where();
    }
    if (sp.type == SupportType::Spring) {
      if (sp.k < R(0) || !is_finite(sp.k)) return "spring with negative stiffness at " + where();
      if (sp.kr < R(0) || !is_finite(sp.kr)) return "rotational spring with negative stiffness at " + where();
    }
    if ((sp.type == SupportType::Free || sp.type == SupportType::Guided) && nonzero(sp.settlement))
      return std::string("settlement on a ") + support_type_name(sp.type) + " node at " + where();
    if (sp.hinge) {
      if (i == 0 || i == n) return "hinge at end " + where();
      if (restrains_rotation(sp.type)) return std::string("hinge on a ") + support_type_name(sp.type) + " support at " + where();
      if (sp.type == SupportType::Spring && R(0) < sp.kr) return "hinge on a rotational spring at " + where();
    }
  }
  for (const BasicLoad<R>& l : beam.loads) {
    if (l.on_node) {
      if (l.index > n) return "load on a node beyond the beam";
      if (l.type != LoadType::Point && l.type != LoadType::Couple)
        return std::string(load_type_name(l.type)) + " load on " + node_name(beam, l.index);
      if (l.type == LoadType::Couple && beam.supports[l.index].hinge)
        return "couple at hinge " + node_name(beam, l.index);
      continue;
    }
    if (l.index >= n) return "load on a span beyond the beam";
    const R L = beam.spans[l.index].length;
    auto where = [&] { return "span " + std::to_string(l.index + 1); };
    switch (l.type) {
      case LoadType::Point: case LoadType::Couple:
        if (l.at < R(0) || L < l.at || !is_finite(l.at)) return "load position outside " + where();
        break;
      case LoadType::Udl: case LoadType::Linear:
        if (l.from < R(0) || L < l.to || !(l.from < l.to)) return "load extent outside " + where();
        break;
      default:
        return "unknown load type on " + where();
    }
  }
  return {};
}

// True when support i passes check_scope's support checks (the same
// conditions, without building a message).
template <class R>
bool support_in_scope(const BasicSupport<R>& sp, std::size_t i, std::size_t n) {
  switch (sp.type) {
    case SupportType::Fixed: case SupportType::Pinned: case SupportType::Roller:
    case SupportType::Free: case SupportType::Guided: case SupportType::Spring:
      break;
    default:
      return false;
  }
  if (sp.type == SupportType::Spring) {
    if (sp.k < R(0) || !is_finite(sp.k)) return false;
    if (sp.kr < R(0) || !is_finite(sp.kr)) return false;
  }
  if ((sp.type == SupportType::Free || sp.type == SupportType::Guided) && nonzero(sp.settlement)) return false;
  if (sp.hinge) {
    if (i == 0 || i == n) return false;
    if (restrains_rotation(sp.type)) return false;
    if (sp.type == SupportType::Spring && R(0) < sp.kr) return false;
  }
  return true;
}

}  // namespace trivet::stiffness::internal
