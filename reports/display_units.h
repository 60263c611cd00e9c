// trivet: the units a person reads, which need not be the beam file's.
//
// The JSON report keeps the file's units (the contract); the console
// tables, the HTML report, the checking record and the plots show each
// kind of value in a display unit: force (shear, reactions), moment
// (moments, reaction moments), length (positions x, lengths) and
// deflection. Rotation stays in rad.
//
// The defaults (README, "Display units"): a metric file (N, kN or MN with
// mm, cm or m) shows kN, kN*m, m and deflections in mm; an imperial file
// (lbf or kip with in or ft) shows kip, kip*ft, ft and deflections in in;
// a file that mixes the two systems shows its own units. `--show-units`
// chooses any of them, or `file` for the file's own units.
#pragma once

#include <optional>
#include <string>

#include "harness/compare/against.h"
#include "harness/compare/compare.h"
#include "harness/input/units.h"

namespace trivet::reports {

// What --show-units asked for: the file's own units, or a unit text per
// kind (empty: that kind's default). Each text has been checked by
// parse_show_units to be a known unit of the kind's dimension.
struct ShowUnits {
  bool file = false;
  std::string force, moment, length, deflection;
};

// What --show-units accepts, in words (for the help and the messages).
const char* show_units_syntax();

// Reads `file` or KIND=UNIT,... (KIND one of force, moment, length,
// deflection, each at most once; UNIT a unit expression of the kind's
// dimension, e.g. kN, kN*m, kip*ft, mm). Nothing, and the reason in
// *error, when it cannot be read.
std::optional<ShowUnits> parse_show_units(const std::string& text, std::string* error);

// One kind's display unit: its label and the factor that takes a value in
// the file's unit to it (display value = file value * factor).
struct DisplayUnit {
  std::string label;
  double factor = 1.0;
  double operator()(double file_value) const { return file_value * factor; }
};

struct DisplayUnits {
  DisplayUnit force, moment, length, deflection;
  DisplayUnit rotation{"rad", 1.0};
  // The unit of a compared kind: shear and reaction a force, moment,
  // deflection, rotation.
  const DisplayUnit& of(compare::Kind k) const;
  // The unit of a claim's quantity (moments, shears, reactions,
  // deflections, rotations).
  const DisplayUnit& of(input::Quantity q) const;
  // The unit of a column of another program's table (--against).
  const DisplayUnit& of(compare::against::Quantity q) const;
};

// A value converted to a display unit, written as the file's numbers are
// (input::format_number) once rounded to 12 significant digits, so that
// 40000 N reads "40" kN and not 40.000000000000007.
std::string shown_number(double v);

// The display units of a file in `units` as `show` asks (its empty kinds
// by the default rule above).
DisplayUnits display_units(const input::Units& units, const ShowUnits& show = {});

}  // namespace trivet::reports
