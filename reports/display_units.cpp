#include "reports/display_units.h"

#include <cmath>
#include <cstdio>
#include <cstdlib>

#include "harness/input/reader.h"

namespace trivet::reports {

namespace {

const char* const kKinds[] = {"force", "moment", "length", "deflection"};
const input::Dimension kDims[] = {{1, 0}, {1, 1}, {0, 1}, {0, 1}};
const char* const kExamples[] = {"kN or kip", "kN*m or kip*ft", "m or ft", "mm or in"};

bool is_metric(const input::Units& u) {
  return (u.force == "N" || u.force == "kN" || u.force == "MN") && (u.length == "mm" || u.length == "cm" || u.length == "m");
}
bool is_imperial(const input::Units& u) {
  return (u.force == "lbf" || u.force == "kip" || u.force == "kips") && (u.length == "in" || u.length == "ft");
}

// A unit text read by the one unit grammar (harness/input/units.h): its
// label (the symbols as given, '*' between, '/' before the denominator),
// its dimension and its factor to N and m. Nothing, and *reason, when it
// is not a unit.
struct ReadUnit {
  std::string label;
  input::Dimension dim;
  double si = 1.0;
};
std::optional<ReadUnit> read_unit(const std::string& text, std::string* reason) {
  const auto terms = input::parse_unit_expression(text, text, reason);
  if (!terms || terms->empty()) {
    if (reason && reason->empty()) *reason = "no unit";
    return std::nullopt;
  }
  ReadUnit r;
  std::string num, den;
  for (const input::UnitTerm& t : *terms) {
    const input::UnitSymbol* s = nullptr;
    for (const auto& u : input::unit_symbols())
      if (t.symbol == u.symbol) s = &u;
    if (!s) {
      if (reason) *reason = "unknown unit '" + t.symbol + "'";
      return std::nullopt;
    }
    r.dim.force += s->dim.force * t.power;
    r.dim.length += s->dim.length * t.power;
    r.si *= std::pow(s->si, t.power);
    const int p = std::abs(t.power);
    std::string& side = t.power < 0 ? den : num;
    side += (side.empty() ? "" : "*") + t.symbol + (p == 1 ? std::string() : "^" + std::to_string(p));
  }
  r.label = (num.empty() ? std::string("1") : num) + (den.empty() ? std::string() : "/" + den);
  return r;
}

// Factor to N and m of one file unit of dimension `d`.
double file_si(const input::Units& u, input::Dimension d) {
  return std::pow(u.newtons, d.force) * std::pow(u.metres, d.length);
}

DisplayUnit unit_for(const input::Units& file, input::Dimension d, const std::string& text) {
  std::string why;
  const auto r = read_unit(text, &why);
  // parse_show_units has checked the text; a text that is no unit of the
  // dimension (a caller that did not check) shows the file's unit.
  if (!r || r->dim != d) return {file.of(d), 1.0};
  return {r->label, file_si(file, d) / r->si};
}

}  // namespace

const char* show_units_syntax() {
  return "'file' (the beam file's own units) or KIND=UNIT,... with KIND one of force, moment, length, deflection "
         "(any of them; the rest keep their default) and UNIT of that kind, e.g. "
         "force=kN,moment=kN*m,length=m,deflection=mm or force=kip,moment=kip*ft,length=ft,deflection=in";
}

std::optional<ShowUnits> parse_show_units(const std::string& text, std::string* error) {
  auto bad = [&](const std::string& why) -> std::optional<ShowUnits> {
    if (error) *error = why + "; expected " + show_units_syntax();
    return std::nullopt;
  };
  ShowUnits s;
  if (text == "file") {
    s.file = true;
    return s;
  }
  if (text.empty()) return bad("empty");
  std::string* slots[] = {&s.force, &s.moment, &s.length, &s.deflection};
  std::size_t start = 0;
  while (start <= text.size()) {
    const std::size_t comma = text.find(',', start);
    const std::string item = text.substr(start, comma == std::string::npos ? std::string::npos : comma - start);
    start = comma == std::string::npos ? text.size() + 1 : comma + 1;
    const std::size_t eq = item.find('=');
    if (eq == std::string::npos) return bad("'" + item + "' is not KIND=UNIT");
    const std::string kind = item.substr(0, eq), unit = item.substr(eq + 1);
    std::size_t k = 0;
    while (k < 4 && kind != kKinds[k]) ++k;
    if (k == 4) return bad("unknown kind '" + kind + "' (one of force, moment, length, deflection)");
    if (!slots[k]->empty()) return bad(kind + " is given twice");
    std::string why;
    const auto r = read_unit(unit, &why);
    if (!r) return bad(kind + "=" + unit + ": " + why + " (known units: " + input::known_units_text() + ")");
    if (r->dim != kDims[k])
      return bad(kind + "=" + unit + ": " + unit + " is " + input::dimension_name(r->dim) + ", but " + kind + " is " +
                 input::dimension_name(kDims[k]) + " (for example " + kExamples[k] + ")");
    *slots[k] = unit;
  }
  return s;
}

std::string shown_number(double v) {
  if (!std::isfinite(v)) return input::format_number(v);
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.12g", v);
  return input::format_number(std::strtod(buf, nullptr));
}

const DisplayUnit& DisplayUnits::of(compare::Kind k) const {
  switch (k) {
    case compare::Kind::Moment: return moment;
    case compare::Kind::Shear: case compare::Kind::Reaction: return force;
    case compare::Kind::Deflection: return deflection;
    case compare::Kind::Rotation: return rotation;
  }
  return rotation;
}

const DisplayUnit& DisplayUnits::of(input::Quantity q) const {
  if (q == input::Quantity::Rotation) return rotation;
  const input::Dimension d = input::quantity_dimension(q);
  if (d == input::Dimension{1, 1}) return moment;
  if (d == input::Dimension{1, 0}) return force;
  if (d == input::Dimension{0, 1}) return deflection;
  return rotation;
}

const DisplayUnit& DisplayUnits::of(compare::against::Quantity q) const {
  using AQ = compare::against::Quantity;
  switch (q) {
    case AQ::Shear: case AQ::ShearMax: case AQ::ShearMin:
    case AQ::ReactionForce: case AQ::ReactionMax: case AQ::ReactionMin: return force;
    case AQ::Deflection: case AQ::DeflectionMax: case AQ::DeflectionMin: return deflection;
    case AQ::Moment: case AQ::MomentMax: case AQ::MomentMin: case AQ::ReactionMoment: return moment;
  }
  return moment;
}

DisplayUnits display_units(const input::Units& units, const ShowUnits& show) {
  std::string def[4];
  if (!show.file) {
    if (is_metric(units)) {
      def[0] = "kN"; def[1] = "kN*m"; def[2] = "m"; def[3] = "mm";
    } else if (is_imperial(units)) {
      def[0] = "kip"; def[1] = "kip*ft"; def[2] = "ft"; def[3] = "in";
    }
  }
  const std::string* asked[] = {&show.force, &show.moment, &show.length, &show.deflection};
  DisplayUnit* out[4];
  DisplayUnits u;
  out[0] = &u.force; out[1] = &u.moment; out[2] = &u.length; out[3] = &u.deflection;
  for (std::size_t k = 0; k < 4; ++k) {
    const std::string& t = !asked[k]->empty() ? *asked[k] : def[k];
    *out[k] = t.empty() ? DisplayUnit{units.of(kDims[k]), 1.0} : unit_for(units, kDims[k], t);
    // The file's own unit: exactly 1, never a factor rounded near it.
    if (out[k]->label == units.of(kDims[k])) out[k]->factor = 1.0;
  }
  return u;
}

}  // namespace trivet::reports
