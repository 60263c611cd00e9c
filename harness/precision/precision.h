// trivet: extended and exact arithmetic. A reference answer for a beam, and
// a measure of what rounding in double costs.
//
// The methods run on one load set of a beam read exactly from its decimal
// text (exact_reader.h), in Extended (50 significant digits, all three
// methods) or Exact (rationals: three-moment and slope-deflection; the
// stiffness method then runs in Extended, because its Gauss-Legendre points
// are irrational). The same methods also run in double on the double beam,
// and the largest difference of each from its own high-precision answer,
// per kind of quantity and scaled by the largest magnitude of that kind
// (as the cross-check does), says how many digits double got right.
//
// Plain data and functions; nothing here prints.
#pragma once

#include <cstdint>

#include <cstddef>
#include <optional>
#include <string>
#include <vector>

#include "harness/compare/compare.h"
#include "harness/input/reader.h"
#include "harness/precision/exact_reader.h"
#include "methods/beam/beam.h"

namespace trivet::precision {

enum class Arithmetic { Double, Extended, Exact };
const char* arithmetic_name(Arithmetic a);  // "double", "extended", "exact"

// One number of a result: its double value, its decimal text with all the
// digits the arithmetic carries (Double: 17 significant digits; Extended: 50;
// Exact: `exact_digits`, correctly rounded) and, in Exact, the fraction p/q.
struct Number {
  double value = 0;
  std::string decimal;
  std::string fraction;  // Exact only
};

struct NodeNumbers {
  Number x;
  std::optional<Number> moment_left, moment_right;
  Number reaction_force, reaction_moment, deflection, rotation_left, rotation_right;
};

struct StationNumbers {
  Number x;
  std::size_t span = 0;
  Number local;
  bool after = false;
  Number shear, moment, deflection, rotation;
};

constexpr std::size_t kKinds = compare::kKinds;  // moment, shear, reaction, deflection, rotation

// A method's double result against its own high-precision result.
struct Rounding {
  bool measured = false;            // false: the double run failed (see reason)
  std::string reason;
  // Largest magnitude per kind in the reference, as the cross-check scales,
  // but floored from the other kinds (see precision.cpp) so that a kind
  // that is exactly zero is not scaled by its own rounding noise.
  double scale[kKinds] = {0, 0, 0, 0, 0};
  double difference[kKinds] = {0, 0, 0, 0, 0};  // largest |double - reference| / scale
  double digits[kKinds] = {0, 0, 0, 0, 0};      // -log10(difference), at most kMaxDigits
  double worst_difference = 0;                  // over the kinds
  double worst_digits = 0;
  std::string worst_kind;                       // kind_name of the worst
  std::string worst_where;                      // "node B (moment left)", "x = 2.5"
};
constexpr double kMaxDigits = 17;

struct MethodNumbers {
  std::string name;               // "three-moment", ...
  Arithmetic requested = Arithmetic::Exact;
  Arithmetic used = Arithmetic::Exact;
  std::string note;               // e.g. why stiffness ran in Extended
  MethodStatus status = MethodStatus::Failed;
  std::string reason;
  std::string reason_id;  // empty when ok; else a stable id (methods/beam/status.h)
  std::vector<NodeNumbers> nodes;
  std::vector<StationNumbers> stations;
  std::optional<Rounding> rounding;  // with Options::reference
};

// A feature of a beam that costs digits in double, with the estimated loss.
struct ConditionFeature {
  std::string description;  // "span 3 is 1e10 times stiffer than span 2 (EI/L^3)"
  double ratio = 1;
  double digits = 0;        // estimated digits lost to it
};

// Measured on seeded random beams (3 methods, 1 to 5 spans, every support
// and load type, adjacent EI ratios up to 1e11): the digits double loses are
// at most about estimated_digits_lost + 1.4 (a factor 25 on the error
// bound), and the beams whose loads and supports excite the feature lose
// within about 3 digits of the estimate; others lose less. The estimate is a
// bound, not a prediction.
constexpr double kBaseDigitsLost = 0.5;

struct Conditioning {
  // kBaseDigitsLost + log10 of the worst ratio (at most 16) among: adjacent spans' EI/L^3
  // and EI/L, a spring's k against 12EI/L^3 and kr against 4EI/L of the
  // spans beside it (either way: stiffer or softer).
  double estimated_digits_lost = 0;       // from the beam alone
  std::vector<ConditionFeature> features; // largest first, only those costing > 0.5 digit
  std::optional<double> measured_digits_lost;  // from the reference, when given
  std::vector<std::string> warnings;
};

// Digits double loses on this beam, from the beam alone (and from a measured
// loss, when given), with a warning when more than `warn_digits` are lost
// naming the feature that causes it. `max_features`: keep at most that
// many features (the largest; the warnings name only the first). A pure
// function.
Conditioning estimate_conditioning(const Beam& beam, std::optional<double> measured_digits_lost = std::nullopt,
                                   double warn_digits = 6, std::size_t max_features = SIZE_MAX);
// The estimate as a relative error bound: 10^digits * DBL_EPSILON.
double estimated_relative_error(const Conditioning& c);

struct Options {
  Arithmetic arithmetic = Arithmetic::Exact;
  std::vector<std::string> methods;   // empty: all three
  bool reference = true;              // also run double and measure its rounding
  std::optional<int> stations_per_span;
  int exact_digits = 40;              // significant digits of Exact decimals
  double warn_digits = 6;
};

struct LoadSetNumbers {
  std::string load_case;
  Arithmetic arithmetic = Arithmetic::Exact;
  std::vector<MethodNumbers> methods;
  Conditioning conditioning;
};

// One load set: `exact` read by read_exact_beam from the same text as
// `file`. Never throws for a method's failure (see MethodNumbers::status).
LoadSetNumbers run_load_set(const ExactBeamFile& exact, const input::BeamFile& file,
                            const std::string& load_case, const Options& options);

struct FileNumbers {
  bool ok = false;
  std::string error;
  std::vector<LoadSetNumbers> sets;  // one per load case
};
// Every load case of a file (the file's text and what the reader made of it).
FileNumbers run_file(const std::string& text, const input::BeamFile& file, const Options& options);

// ---------------------------------------------------------------------------
// The raw solutions, for callers (and tests) that want the numbers
// themselves: one method on one load set in one number type. `name` is a
// method name; stations are the load set's exact grid converted to R.
// Exact is available where the registry (methods/registry) lists an exact solver.
BasicSolution<Exact> solve_exact(const std::string& name, const BasicBeam<Exact>& beam,
                                 const std::vector<BasicStation<Exact>>& stations);
BasicSolution<Extended> solve_extended(const std::string& name, const BasicBeam<Extended>& beam,
                                       const std::vector<BasicStation<Extended>>& stations);

}  // namespace trivet::precision
