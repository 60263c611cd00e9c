#include "harness/input/units.h"

#include <cctype>
#include <cerrno>
#include <cmath>
#include <cstdlib>
#include <map>

namespace trivet::input {
namespace {

// SI value (N, m) and dimension of each unit symbol we accept, in the order
// people read them: forces, lengths, stresses, angle. Conversion factors:
// lbf = 4.4482216152605 N and in = 0.0254 m exactly by definition (NIST
// Special Publication 811, 2008 ed., appendix B.8); kip = 1000 lbf,
// ft = 12 in, psi = lbf/in^2, ksi = 1000 psi. Each row's exact factor is
// num / den; the double one is written as it always was (the readers' bits
// do not change), and a test holds it to num / den.
constexpr double kLbf = 4.4482216152605;
constexpr double kInch = 0.0254;
constexpr std::int64_t kLbfNum = 44482216152605, kLbfDen = 10000000000000;  // 4.4482216152605
constexpr std::int64_t kPsiDen = 6451600000;  // lbf / in^2 = kLbfNum / (0.0254^2 * 1e13) = kLbfNum / 6451600000

const std::vector<UnitSymbol>& rows() {
  static const std::vector<UnitSymbol> v = {
      {"N", {1, 0}, 1.0, 1, 1},
      {"kN", {1, 0}, 1e3, 1000, 1},
      {"MN", {1, 0}, 1e6, 1000000, 1},
      {"lbf", {1, 0}, kLbf, kLbfNum, kLbfDen},
      {"kip", {1, 0}, 1e3 * kLbf, kLbfNum, kLbfDen / 1000},
      {"kips", {1, 0}, 1e3 * kLbf, kLbfNum, kLbfDen / 1000},
      {"mm", {0, 1}, 1e-3, 1, 1000},
      {"cm", {0, 1}, 1e-2, 1, 100},
      {"m", {0, 1}, 1.0, 1, 1},
      {"in", {0, 1}, kInch, 254, 10000},
      {"ft", {0, 1}, 12 * kInch, 3048, 10000},
      {"Pa", {1, -2}, 1.0, 1, 1},
      {"kPa", {1, -2}, 1e3, 1000, 1},
      {"MPa", {1, -2}, 1e6, 1000000, 1},
      {"GPa", {1, -2}, 1e9, 1000000000, 1},
      {"psi", {1, -2}, kLbf / (kInch * kInch), kLbfNum, kPsiDen},
      {"ksi", {1, -2}, 1e3 * kLbf / (kInch * kInch), kLbfNum * 1000, kPsiDen},
      {"rad", {0, 0}, 1.0, 1, 1},
  };
  return v;
}

struct UnitDef {
  double si;
  Dimension dim;
};

const std::map<std::string, UnitDef>& unit_table() {
  static const std::map<std::string, UnitDef> t = [] {
    std::map<std::string, UnitDef> m;
    for (const auto& r : rows()) m[r.symbol] = {r.si, r.dim};
    return m;
  }();
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

const std::vector<UnitSymbol>& unit_symbols() { return rows(); }

std::string known_units_text() {
  std::string s;
  for (const auto& u : unit_symbols())
    if (std::string(u.symbol) != "kips") s += (s.empty() ? "" : ", ") + std::string(u.symbol);
  return s;
}

namespace {

bool is_symbol(const std::string& s) { return unit_table().count(s) > 0; }

// The splits of `run` into known symbols with the fewest pieces (more than
// one such split: ambiguous). Runs are a few letters, so all are tried.
void splits(const std::string& run, std::size_t from, std::vector<std::string>& cur,
            std::vector<std::vector<std::string>>& best) {
  if (!best.empty() && cur.size() > best.front().size()) return;
  if (from == run.size()) {
    if (!best.empty() && cur.size() < best.front().size()) best.clear();
    best.push_back(cur);
    return;
  }
  for (std::size_t len = run.size() - from; len >= 1; --len) {
    const std::string piece = run.substr(from, len);
    if (!is_symbol(piece)) continue;
    cur.push_back(piece);
    splits(run, from + len, cur, best);
    cur.pop_back();
  }
}

std::string normalise_unit_text(const std::string& u) {
  std::string norm;
  for (std::size_t i = 0; i < u.size();) {
    const unsigned char c = static_cast<unsigned char>(u[i]);
    auto next = [&](std::size_t o) { return i + o < u.size() ? static_cast<unsigned char>(u[i + o]) : 0u; };
    if (c == 0xC2 && next(1) == 0xB7) { norm += '*'; i += 2; continue; }                     // ·
    if (c == 0xC2 && next(1) == 0xB2) { norm += "^2"; i += 2; continue; }                    // ²
    if (c == 0xC2 && next(1) == 0xB3) { norm += "^3"; i += 2; continue; }                    // ³
    if (c == 0xE2 && next(1) == 0x81 && next(2) == 0xB4) { norm += "^4"; i += 3; continue; }  // ⁴
    if (c == 0xE2 && next(1) == 0x8B && next(2) == 0x85) { norm += '*'; i += 3; continue; }  // ⋅
    norm += static_cast<char>(c);
    ++i;
  }
  return norm;
}

}  // namespace

std::optional<std::vector<UnitTerm>> parse_unit_expression(const std::string& unit, const std::string& text,
                                                           std::string* reason) {
  const std::string norm = normalise_unit_text(unit);
  std::vector<UnitTerm> out;
  int sign = 1;
  std::size_t i = 0;
  auto fail = [&](const std::string& why) -> std::optional<std::vector<UnitTerm>> {
    *reason = why;
    return std::nullopt;
  };
  auto space = [&](std::size_t k) { return k < norm.size() && std::isspace(static_cast<unsigned char>(norm[k])); };
  while (space(i)) ++i;
  while (i < norm.size()) {
    const char c = norm[i];
    if (c == '*' || c == '.' || c == '-' || space(i)) {
      // A product sign: '.' and '-' only between two factors.
      if ((c == '.' || c == '-') && (out.empty() || i + 1 >= norm.size() || !std::isalpha(static_cast<unsigned char>(norm[i + 1]))))
        return fail("cannot read the unit in \"" + text + "\"");
      ++i;
      continue;
    }
    if (c == '/') {
      if (sign < 0) return fail("the unit in \"" + text + "\" has more than one '/'");
      sign = -1;
      ++i;
      continue;
    }
    std::size_t j = i;
    while (j < norm.size() && std::isalpha(static_cast<unsigned char>(norm[j]))) ++j;
    if (j == i) return fail("cannot read the unit in \"" + text + "\"");
    const std::string run = norm.substr(i, j - i);
    std::vector<std::string> pieces;
    if (is_symbol(run)) {
      pieces = {run};
    } else {
      std::vector<std::string> cur;
      std::vector<std::vector<std::string>> found;
      if (run.size() <= 24) splits(run, 0, cur, found);
      if (found.size() != 1)
        return fail("unknown unit '" + run + "' in \"" + text + "\" (known: " + known_units_text() + ")");
      pieces = found.front();
    }
    i = j;
    // A power: ^n, ^-n, or digits right after the symbol.
    int p = 1;
    const bool caret = i < norm.size() && norm[i] == '^';
    if (caret || (i < norm.size() && std::isdigit(static_cast<unsigned char>(norm[i])))) {
      if (caret) ++i;
      std::size_t k = i;
      if (caret && k < norm.size() && norm[k] == '-') ++k;
      const std::size_t digits_from = k;
      while (k < norm.size() && std::isdigit(static_cast<unsigned char>(norm[k]))) ++k;
      if (k == digits_from) return fail("cannot read the power in \"" + text + "\"");
      // At most a few digits: strtol on a long digit string would overflow.
      const std::string digits = norm.substr(i, k - i);
      p = k - digits_from > 3 ? 999 : static_cast<int>(std::strtol(digits.c_str(), nullptr, 10));
      i = k;
      if (p < -6 || p > 6) return fail("power out of range in \"" + text + "\"");
    }
    for (std::size_t k = 0; k < pieces.size(); ++k)
      out.push_back({pieces[k], sign * (k + 1 == pieces.size() ? p : 1)});
  }
  return out;
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
  // Unit expression (the one grammar, parse_unit_expression).
  const std::string u(end);
  auto terms = parse_unit_expression(u, text, &r.reason);
  if (!terms) return r;
  double si = v;
  Dimension dim{0, 0};
  const bool any_unit = !terms->empty();
  for (const auto& t : *terms) {
    const UnitDef& d = unit_table().at(t.symbol);
    si *= std::pow(d.si, t.power);
    dim.force += t.power * d.dim.force;
    dim.length += t.power * d.dim.length;
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
