#include "harness/input/units.h"

#include <cctype>
#include <cerrno>
#include <cmath>
#include <cstdlib>
#include <map>

namespace trivet::input {
namespace {

// SI value (N, m) and dimension of each unit symbol we accept.
// Conversion factors: lbf = 4.4482216152605 N and in = 0.0254 m exactly by
// definition (NIST Special Publication 811, 2008 ed., appendix B.8);
// kip = 1000 lbf, ft = 12 in, psi = lbf/in^2, ksi = 1000 psi.
struct UnitDef {
  double si;
  Dimension dim;
};

constexpr double kLbf = 4.4482216152605;
constexpr double kInch = 0.0254;

const std::map<std::string, UnitDef>& unit_table() {
  static const std::map<std::string, UnitDef> t = {
      {"N", {1.0, {1, 0}}},        {"kN", {1e3, {1, 0}}},
      {"MN", {1e6, {1, 0}}},       {"lbf", {kLbf, {1, 0}}},
      {"kip", {1e3 * kLbf, {1, 0}}}, {"kips", {1e3 * kLbf, {1, 0}}},
      {"mm", {1e-3, {0, 1}}},      {"cm", {1e-2, {0, 1}}},
      {"m", {1.0, {0, 1}}},        {"in", {kInch, {0, 1}}},
      {"ft", {12 * kInch, {0, 1}}},
      {"Pa", {1.0, {1, -2}}},      {"kPa", {1e3, {1, -2}}},
      {"MPa", {1e6, {1, -2}}},     {"GPa", {1e9, {1, -2}}},
      {"psi", {kLbf / (kInch * kInch), {1, -2}}},
      {"ksi", {1e3 * kLbf / (kInch * kInch), {1, -2}}},
      {"rad", {1.0, {0, 0}}},
  };
  return t;
}

std::string power(const std::string& base, int p) {
  if (p == 1) return base;
  return base + "^" + std::to_string(p);
}

}  // namespace

std::string dimension_name(Dimension d) {
  Units names;
  names.force = "force";
  names.length = "length";
  if (d.force == 0 && d.length == 0) return "a plain number";
  return names.of(d);
}

std::string Units::of(Dimension d) const {
  std::string num, den;
  auto add = [](std::string& s, const std::string& part) {
    if (!s.empty()) s += "*";
    s += part;
  };
  if (d.force > 0) add(num, power(force, d.force));
  if (d.length > 0) add(num, power(length, d.length));
  if (d.force < 0) add(den, power(force, -d.force));
  if (d.length < 0) add(den, power(length, -d.length));
  if (num.empty()) num = "1";
  return den.empty() ? num : num + "/" + den;
}

std::optional<double> force_unit(const std::string& name) {
  auto& t = unit_table();
  auto it = t.find(name);
  if (it == t.end() || it->second.dim != Dimension{1, 0} || name == "kips") return std::nullopt;
  return it->second.si;
}

std::optional<double> length_unit(const std::string& name) {
  auto& t = unit_table();
  auto it = t.find(name);
  if (it == t.end() || it->second.dim != Dimension{0, 1}) return std::nullopt;
  return it->second.si;
}

QuantityText parse_quantity(const std::string& text, Dimension want, const Units& units) {
  QuantityText r;
  const char* s = text.c_str();
  while (std::isspace(static_cast<unsigned char>(*s))) ++s;
  char* end = nullptr;
  errno = 0;
  const double v = std::strtod(s, &end);
  if (end == s) {
    r.reason = "must be a number, or a number with a unit such as \"" + std::string("1.5 ") +
               units.of(want) + "\" (got \"" + text + "\")";
    return r;
  }
  std::string number(s, static_cast<const char*>(end));
  for (char c : number)
    if (std::isalpha(static_cast<unsigned char>(c)) && c != 'e' && c != 'E') {
      r.reason = "must be a finite number (got \"" + text + "\")";
      return r;
    }
  if (!std::isfinite(v) || errno == ERANGE) {
    if (std::isfinite(v) && std::abs(v) < 1.0) {
      // underflow to (near) zero is harmless only if the value is 0.
    } else {
      r.reason = "must be a finite number (got \"" + text + "\")";
      return r;
    }
  }
  // Unit expression.
  std::string u(end);
  // Normalise separators and superscripts.
  std::string norm;
  for (std::size_t i = 0; i < u.size();) {
    unsigned char c = static_cast<unsigned char>(u[i]);
    if (c == 0xC2 && i + 1 < u.size() && static_cast<unsigned char>(u[i + 1]) == 0xB7) {  // ·
      norm += '*'; i += 2; continue;
    }
    if (c == 0xC2 && i + 1 < u.size() && static_cast<unsigned char>(u[i + 1]) == 0xB2) {  // ²
      norm += "^2"; i += 2; continue;
    }
    if (c == 0xC2 && i + 1 < u.size() && static_cast<unsigned char>(u[i + 1]) == 0xB3) {  // ³
      norm += "^3"; i += 2; continue;
    }
    if (c == 0xE2 && i + 2 < u.size() && static_cast<unsigned char>(u[i + 1]) == 0x81 &&
        static_cast<unsigned char>(u[i + 2]) == 0xB4) {  // ⁴
      norm += "^4"; i += 3; continue;
    }
    if (c == 0xE2 && i + 2 < u.size() && static_cast<unsigned char>(u[i + 1]) == 0x8B &&
        static_cast<unsigned char>(u[i + 2]) == 0x85) {  // ⋅
      norm += '*'; i += 3; continue;
    }
    norm += static_cast<char>(c);
    ++i;
  }
  double si = v;
  Dimension dim{0, 0};
  bool any_unit = false;
  int sign = 1;
  std::size_t i = 0;
  auto skip_space = [&] { while (i < norm.size() && std::isspace(static_cast<unsigned char>(norm[i]))) ++i; };
  skip_space();
  while (i < norm.size()) {
    if (norm[i] == '*') { ++i; skip_space(); continue; }
    if (norm[i] == '/') {
      if (sign < 0) { r.reason = "the unit \"" + u.substr(0) + "\" has more than one '/'"; return r; }
      sign = -1; ++i; skip_space(); continue;
    }
    std::size_t j = i;
    while (j < norm.size() && std::isalpha(static_cast<unsigned char>(norm[j]))) ++j;
    if (j == i) {
      r.reason = "cannot read the unit in \"" + text + "\"";
      return r;
    }
    std::string sym = norm.substr(i, j - i);
    auto it = unit_table().find(sym);
    if (it == unit_table().end()) {
      r.reason = "unknown unit '" + sym + "' in \"" + text +
                 "\" (known: N, kN, MN, lbf, kip, mm, cm, m, in, ft, Pa, kPa, MPa, GPa, psi, ksi, rad)";
      return r;
    }
    i = j;
    int p = 1;
    if (i < norm.size() && norm[i] == '^') {
      ++i;
      std::size_t k = i;
      if (k < norm.size() && norm[k] == '-') ++k;
      while (k < norm.size() && std::isdigit(static_cast<unsigned char>(norm[k]))) ++k;
      if (k == i || (k == i + 1 && norm[i] == '-')) {
        r.reason = "cannot read the power in \"" + text + "\"";
        return r;
      }
      // At most a few digits: strtol on a long digit string would overflow.
      const std::string digits = norm.substr(i, k - i);
      p = digits.size() > 3 ? 999 : static_cast<int>(std::strtol(digits.c_str(), nullptr, 10));
      i = k;
      if (p < -6 || p > 6) { r.reason = "power out of range in \"" + text + "\""; return r; }
    }
    any_unit = true;
    const int e = sign * p;
    si *= std::pow(it->second.si, e);
    dim.force += e * it->second.dim.force;
    dim.length += e * it->second.dim.length;
    skip_space();
  }
  if (!any_unit) {
    r.ok = true;
    r.value = v;
    return r;
  }
  if (dim != want) {
    r.reason = "the unit of \"" + text + "\" is " + dimension_name(dim) + ", but this field is " +
               dimension_name(want) + " (for example " + units.of(want) + ")";
    return r;
  }
  const double to_file = std::pow(units.newtons, want.force) * std::pow(units.metres, want.length);
  r.value = si / to_file;
  if (!std::isfinite(r.value)) {
    r.reason = "\"" + text + "\" is out of range after conversion to " + units.of(want);
    return r;
  }
  r.ok = true;
  return r;
}

}  // namespace trivet::input
