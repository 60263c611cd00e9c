// trivet: the method registry, the one place that names all three methods.
//
// Each method is listed once, with its name as the command line and the
// reports spell it, and its solver in every arithmetic it has: double,
// extended (cpp_bin_float_50) and, where the method needs only + - * /,
// exact (cpp_rational). Everything that runs "every method" (the harness,
// precision runs, the command line's help, selfcheck, tests, benchmarks)
// iterates this list; nothing else spells the three names.
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "methods/beam/beam.h"
#include "methods/beam/numbers.h"

namespace trivet::registry {

template <class R>
using Solver = BasicSolution<R> (*)(const BasicBeam<R>&, const std::vector<BasicStation<R>>&);

struct MethodInfo {
  const char* name;        // "three-moment": command line, reports, JSON
  const char* identifier;  // "ThreeMoment": letters only, for test names
  const char* summary;     // one line: the unknowns and the system
  Solver<double> solve;
  Solver<Extended> solve_extended;
  Solver<Exact> solve_exact;    // nullptr where the method has no exact version
  const char* why_not_exact;    // the reason, where solve_exact is nullptr
};

// Every method, in report order.
const std::vector<MethodInfo>& all();
// The method of that name, or nullptr.
const MethodInfo* find(std::string_view name);
// The names joined by `separator` ("three-moment, slope-deflection, stiffness").
std::string names(std::string_view separator = ", ");

}  // namespace trivet::registry
