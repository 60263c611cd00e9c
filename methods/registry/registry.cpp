#include "methods/registry/registry.h"

#include "methods/slope_deflection/slope_deflection.h"
#include "methods/stiffness/stiffness.h"
#include "methods/three_moment/three_moment.h"

namespace trivet::registry {

const std::vector<MethodInfo>& all() {
  static const std::vector<MethodInfo> list = {
      {"three-moment", "ThreeMoment",
       "Clapeyron's equation: the support moments from a banded system, then span statics",
       &three_moment::solve<double>, &three_moment::solve<Extended>, &three_moment::solve<Exact>, ""},
      {"slope-deflection", "SlopeDeflection",
       "slope-deflection equations: node rotations and translations from node equilibrium",
       &slope_deflection::solve<double>, &slope_deflection::solve<Extended>, &slope_deflection::solve<Exact>, ""},
      {"stiffness", "Stiffness",
       "direct stiffness: one Hermite beam element per span, consistent loads by Gauss-Legendre quadrature",
       &stiffness::solve<double>, &stiffness::solve<Extended>, nullptr,
       "its Gauss-Legendre quadrature points are irrational"},
  };
  return list;
}

const MethodInfo* find(std::string_view name) {
  for (const auto& m : all())
    if (name == m.name) return &m;
  return nullptr;
}

std::string names(std::string_view separator) {
  std::string out;
  for (const auto& m : all()) {
    if (!out.empty()) out += separator;
    out += m.name;
  }
  return out;
}

}  // namespace trivet::registry
