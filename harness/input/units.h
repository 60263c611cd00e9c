// trivet: units of a beam file and quantities written with their own unit.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

namespace trivet::input {

// The dimension of a quantity as powers of force and length, e.g. a
// distributed load is force^1 length^-1, a flexural rigidity force^1 length^2.
struct Dimension {
  int force = 0;
  int length = 0;
  bool operator==(const Dimension& o) const { return force == o.force && length == o.length; }
  bool operator!=(const Dimension& o) const { return !(*this == o); }
};

// Plain words for a dimension: "force/length", "force*length^2", ...
std::string dimension_name(Dimension d);

// A file's units: `force` one of N, kN, MN, lbf, kip; `length` one of mm,
// cm, m, in, ft. The factors take one file unit to newtons and metres.
struct Units {
  std::string force = "kN";
  std::string length = "m";
  double newtons = 1000.0;
  double metres = 1.0;

  // The unit text of a dimension in these units, e.g. "kN*m" or "kN/m".
  std::string of(Dimension d) const;
};

// Newtons per unit of a force name, or nothing if not one of ours.
std::optional<double> force_unit(const std::string& name);
// Metres per unit of a length name, or nothing if not one of ours.
std::optional<double> length_unit(const std::string& name);

// The result of reading "200 GPa" or "1.5 kip/ft".
struct QuantityText {
  bool ok = false;
  double value = 0.0;       // converted to the file's units
  std::string reason;       // why not, when !ok
};

// One factor of a unit expression: a known symbol to a power ("mm", 4).
struct UnitTerm {
  std::string symbol;
  int power = 1;
};

// The unit symbols the readers know: the one table of both readers. Each
// with its dimension, its factor to N and m in double (`si`) and exactly
// (`num` / `den`; the exact reader, harness/precision/exact_reader.cpp,
// reads it from here; a test holds `si` to the nearest double of num/den).
struct UnitSymbol {
  const char* symbol;
  Dimension dim;
  double si;
  std::int64_t num, den;
};
const std::vector<UnitSymbol>& unit_symbols();
// "N, kN, MN, lbf, kip, mm, ..." for messages.
std::string known_units_text();

// The one grammar of a unit expression (the text after a quantity's
// number), for the double and the exact reader alike. Factors are known
// symbols; between them '*', '·', '⋅', '.', '-' or spaces; at most one '/';
// a power as ^n, ^-n, a superscript (², ³, ⁴) or digits right after the
// symbol (mm4, N/mm2). A run of letters that is no symbol is read as known
// symbols written together where it splits into them one way (kNm = kN*m,
// kipft = kip*ft). `text` is the whole quantity, for messages. Nothing and
// `reason` set when it cannot be read.
std::optional<std::vector<UnitTerm>> parse_unit_expression(const std::string& unit, const std::string& text,
                                                           std::string* reason);

// Reads a number followed by a unit expression (parse_unit_expression) and
// converts it to `units`, checking it has dimension `want`. A number
// without a unit is taken to be in the file's units.
QuantityText parse_quantity(const std::string& text, Dimension want, const Units& units);

}  // namespace trivet::input
