// The harness's view of the method registry (methods/registry): the double
// solver of every method, by name.
#include "harness/compare/compare.h"
#include "methods/registry/registry.h"

namespace trivet::compare {

const std::vector<Method>& methods() {
  static const std::vector<Method> list = [] {
    std::vector<Method> out;
    for (const auto& m : registry::all()) out.push_back({m.name, m.solve});
    return out;
  }();
  return list;
}

const Method* find_method(const std::string& name) {
  for (const auto& m : methods())
    if (m.name == name) return &m;
  return nullptr;
}

}  // namespace trivet::compare
