// trivet: the beam file read again from the decimal text of its numbers,
// into exact rationals (and 50-digit Extended numbers rounded from them).
//
// The double reader (harness/input/reader.h) rounds every number to binary
// as it reads it, so 0.1 becomes 0.1000000000000000055511151231257827...
// Here the same file is walked again with nlohmann/json's SAX interface,
// which hands over the original text of every floating-point number, and
// each number, unit factor and product is kept exact: "0.1" is 1/10 and
// "1.5 kip/ft" is 1.5 * 4448.2216152605 / 0.3048 N/m exactly.
//
// The file must already have been accepted by the double reader: this
// reader trusts its validation and only re-reads the numbers. It applies the
// same canonicalisation (a point force exactly at a span end moves onto the
// node; 'from' defaults to 0 and 'to' to the span length) and then checks
// every exact value against the double beam (each plain number must round
// to the very same double; a converted quantity or E*I to within a few
// units in the last place, since the double reader rounds at every step;
// the same counts, types and placement). Any difference is an error, never
// silently accepted.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "harness/input/reader.h"
#include "harness/input/units.h"
#include "harness/compare/load_sets.h"
#include "methods/beam/beam.h"
#include "methods/beam/numbers.h"

namespace trivet::precision {

struct ExactBeamFile {
  bool ok = false;
  std::string error;                 // why not, when !ok
  BasicBeam<Exact> beam;             // every load of every case
  std::vector<std::string> cases;    // as in the double BeamFile
};

// Reads `text` (the file's whole text) again, exactly. `file` is what
// input::parse_beam_text made of the same text; it must be ok().
ExactBeamFile read_exact_beam(const std::string& text, const input::BeamFile& file);

// The beam of one load case: compare::beam_for_case (loads and settlements
// by the one rule of harness/compare/load_sets.h).
template <class R>
BasicBeam<R> exact_beam_for_case(const BasicBeam<R>& beam, const std::string& load_case) {
  return compare::beam_for_case(beam, load_case);
}

// ---------------------------------------------------------------------------
// Exact numbers.

// A decimal number as JSON or strtod writes it ("-1.5e-3", ".5", "12.")
// into an exact rational; nothing when the text is not one (or its exponent
// is beyond +-10000).
std::optional<Exact> parse_decimal(const std::string& text);

// The exact SI value (N, m, Pa, ...) of one unit symbol of units.h, or
// nothing when the symbol is not one of ours.
std::optional<Exact> exact_unit_factor(const std::string& symbol);

// parse_quantity (units.h), exactly: "1.5 kip/ft" to the file's units.
struct ExactQuantity {
  bool ok = false;
  Exact value{0};
  bool converted = false;  // a unit was given (so the double reader rounded more than once)
  std::string reason;
};
ExactQuantity parse_exact_quantity(const std::string& text, input::Dimension want,
                                   const input::Units& units);

// The double nearest to r (ties to even), including subnormals; +-inf
// beyond the range of double.
double to_double(const Exact& r);
// The Extended nearest to r (to within one unit in its last place).
Extended to_extended(const Exact& r);
// The exact value of a finite double.
Exact exact_of(double d);

// "p/q" in lowest terms ("p" when q is 1).
std::string fraction_text(const Exact& r);
// r with `digits` significant decimal digits, correctly rounded (ties to
// even), in scientific notation: "-1.071428571428571428571428571428571428571e-1".
std::string decimal_text(const Exact& r, int digits);

BasicBeam<Extended> to_extended(const BasicBeam<Exact>& beam);

}  // namespace trivet::precision
