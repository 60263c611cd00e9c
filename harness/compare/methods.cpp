// The method registry: the only place that names all three methods.
#include "harness/compare/compare.h"
#include "methods/slope_deflection/slope_deflection.h"
#include "methods/stiffness/stiffness.h"
#include "methods/three_moment/three_moment.h"

namespace trivet::compare {

const std::vector<Method>& methods() {
  static const std::vector<Method> all = {
      {"three-moment", &three_moment::solve<double>},
      {"slope-deflection", &slope_deflection::solve<double>},
      {"stiffness", &stiffness::solve<double>},
  };
  return all;
}

const Method* find_method(const std::string& name) {
  for (const auto& m : methods())
    if (m.name == name) return &m;
  return nullptr;
}

}  // namespace trivet::compare
