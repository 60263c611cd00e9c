#include "harness/precision/exact_reader.h"

#include <cctype>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <limits>
#include <map>
#include <stdexcept>
#include <utility>

#include <nlohmann/json.hpp>

namespace trivet::precision {

namespace mp = boost::multiprecision;
using mp::cpp_int;
using nlohmann::json;

namespace {

cpp_int pow10(unsigned n) { return mp::pow(cpp_int(10), n); }

Exact make_exact(const cpp_int& p, const cpp_int& q) { return Exact(p, q); }

// Floor of log10 |r| for r != 0.
long floor_log10(const cpp_int& p, const cpp_int& q) {
  // p, q > 0. d = digits(p) - digits(q): r is in (10^(d-1), 10^(d+1)).
  const long d = static_cast<long>(p.str().size()) - static_cast<long>(q.str().size());
  const bool ge = d >= 0 ? p >= q * pow10(static_cast<unsigned>(d))
                         : p * pow10(static_cast<unsigned>(-d)) >= q;
  return ge ? d : d - 1;
}

// Rounds n/d (n >= 0, d > 0) to the nearest integer, ties to even.
cpp_int round_half_even(const cpp_int& n, const cpp_int& d) {
  cpp_int q, r;
  mp::divide_qr(n, d, q, r);
  const cpp_int twice = 2 * r;
  if (twice > d || (twice == d && mp::bit_test(q, 0))) ++q;
  return q;
}

}  // namespace

std::optional<Exact> parse_decimal(const std::string& text) {
  std::size_t i = 0;
  const std::size_t n = text.size();
  bool neg = false;
  if (i < n && (text[i] == '-' || text[i] == '+')) { neg = text[i] == '-'; ++i; }
  std::string digits;
  long scale = 0;  // value = digits * 10^(exp - scale)
  bool any = false;
  while (i < n && std::isdigit(static_cast<unsigned char>(text[i]))) { digits += text[i++]; any = true; }
  if (i < n && text[i] == '.') {
    ++i;
    while (i < n && std::isdigit(static_cast<unsigned char>(text[i]))) { digits += text[i++]; ++scale; any = true; }
  }
  if (!any) return std::nullopt;
  long exp = 0;
  if (i < n && (text[i] == 'e' || text[i] == 'E')) {
    ++i;
    bool eneg = false;
    if (i < n && (text[i] == '-' || text[i] == '+')) { eneg = text[i] == '-'; ++i; }
    bool edig = false;
    while (i < n && std::isdigit(static_cast<unsigned char>(text[i]))) {
      exp = exp * 10 + (text[i++] - '0');
      edig = true;
      if (exp > 100000) return std::nullopt;
    }
    if (!edig) return std::nullopt;
    if (eneg) exp = -exp;
  }
  if (i != n) return std::nullopt;
  const long e = exp - scale;
  if (e > 10000 || e < -10000 - static_cast<long>(digits.size())) return std::nullopt;
  // (cpp_int would read a leading 0 as octal)
  const std::size_t nz = digits.find_first_not_of('0');
  cpp_int m(nz == std::string::npos ? std::string("0") : digits.substr(nz));
  if (neg) m = -m;
  if (e >= 0) return make_exact(m * pow10(static_cast<unsigned>(e)), 1);
  return make_exact(m, pow10(static_cast<unsigned>(-e)));
}

namespace {

struct ExactUnit {
  Exact si;
  input::Dimension dim;
};

// The exact factors: num / den of the readers' one unit table
// (harness/input/units.h, with its sources).
const std::map<std::string, ExactUnit>& exact_units() {
  static const std::map<std::string, ExactUnit> t = [] {
    std::map<std::string, ExactUnit> m;
    for (const auto& u : input::unit_symbols())
      m[u.symbol] = {make_exact(cpp_int(u.num), cpp_int(u.den)), u.dim};
    return m;
  }();
  return t;
}

Exact ipow(const Exact& b, int e) {
  Exact r(1);
  for (int k = 0; k < (e < 0 ? -e : e); ++k) r *= b;
  return e < 0 ? Exact(1) / r : r;
}

}  // namespace

std::optional<Exact> exact_unit_factor(const std::string& symbol) {
  auto it = exact_units().find(symbol);
  if (it == exact_units().end()) return std::nullopt;
  return it->second.si;
}

ExactQuantity parse_exact_quantity(const std::string& text, input::Dimension want,
                                   const input::Units& units) {
  ExactQuantity r;
  std::size_t i = 0;
  while (i < text.size() && std::isspace(static_cast<unsigned char>(text[i]))) ++i;
  // The number, as strtod would take it (sign, digits, point, exponent).
  std::size_t j = i;
  if (j < text.size() && (text[j] == '+' || text[j] == '-')) ++j;
  while (j < text.size() && std::isdigit(static_cast<unsigned char>(text[j]))) ++j;
  if (j < text.size() && text[j] == '.') {
    ++j;
    while (j < text.size() && std::isdigit(static_cast<unsigned char>(text[j]))) ++j;
  }
  if (j < text.size() && (text[j] == 'e' || text[j] == 'E')) {
    std::size_t k = j + 1;
    if (k < text.size() && (text[k] == '+' || text[k] == '-')) ++k;
    if (k < text.size() && std::isdigit(static_cast<unsigned char>(text[k]))) {
      while (k < text.size() && std::isdigit(static_cast<unsigned char>(text[k]))) ++k;
      j = k;
    }
  }
  auto v = parse_decimal(text.substr(i, j - i));
  if (!v) {
    r.reason = "cannot read the number in \"" + text + "\"";
    return r;
  }
  // The unit expression, by the one grammar of units.h.
  const std::string u = text.substr(j);
  auto terms = input::parse_unit_expression(u, text, &r.reason);
  if (!terms) return r;
  Exact si = *v;
  input::Dimension dim{0, 0};
  const bool any_unit = !terms->empty();
  for (const auto& t : *terms) {
    auto it = exact_units().find(t.symbol);
    if (it == exact_units().end()) { r.reason = "unit '" + t.symbol + "' is not known exactly"; return r; }
    si *= ipow(it->second.si, t.power);
    dim.force += t.power * it->second.dim.force;
    dim.length += t.power * it->second.dim.length;
  }
  if (!any_unit) {
    r.ok = true;
    r.value = *v;
    return r;
  }
  if (dim != want) {
    r.reason = "the unit of \"" + text + "\" is " + input::dimension_name(dim) + ", not " +
               input::dimension_name(want);
    return r;
  }
  auto fu = exact_unit_factor(units.force);
  auto lu = exact_unit_factor(units.length);
  if (!fu || !lu) {
    r.reason = "the file's units '" + units.force + "' and '" + units.length + "' are not known exactly";
    return r;
  }
  r.value = si / (ipow(*fu, want.force) * ipow(*lu, want.length));
  r.converted = true;
  r.ok = true;
  return r;
}

double to_double(const Exact& r) {
  cpp_int p = mp::numerator(r);
  const cpp_int q = mp::denominator(r);
  if (p == 0) return 0.0;
  const bool neg = p < 0;
  if (neg) p = -p;
  // E = floor(log2 r).
  long E = static_cast<long>(mp::msb(p)) - static_cast<long>(mp::msb(q));
  {
    const bool ge = E >= 0 ? p >= (q << static_cast<unsigned>(E)) : (p << static_cast<unsigned>(-E)) >= q;
    if (!ge) --E;
  }
  if (E > 1023) return neg ? -std::numeric_limits<double>::infinity() : std::numeric_limits<double>::infinity();
  // The unit in the last place of the result: 2^(E-52), but not below 2^-1074.
  long ulp = E - 52;
  if (ulp < -1074) ulp = -1074;
  cpp_int m;
  if (ulp >= 0) m = round_half_even(p, q << static_cast<unsigned>(ulp));
  else m = round_half_even(p << static_cast<unsigned>(-ulp), q);
  const double mant = m.convert_to<double>();  // at most 2^53: exact
  const double v = std::ldexp(mant, static_cast<int>(ulp));
  return neg ? -v : v;
}

Extended to_extended(const Exact& r) {
  return Extended(mp::numerator(r)) / Extended(mp::denominator(r));
}

Exact exact_of(double d) {
  if (!std::isfinite(d)) throw std::invalid_argument("exact_of: not a finite number");
  if (!(d < 0.0) && !(d > 0.0)) return Exact(0);
  int e = 0;
  const double f = std::frexp(d, &e);  // d = f * 2^e, 0.5 <= |f| < 1
  const auto m = static_cast<std::int64_t>(std::ldexp(f, 53));  // exact
  e -= 53;
  cpp_int num(m);
  if (e >= 0) return Exact(num << static_cast<unsigned>(e));
  return make_exact(num, cpp_int(1) << static_cast<unsigned>(-e));
}

std::string fraction_text(const Exact& r) {
  const cpp_int& q = mp::denominator(r);
  if (q == 1) return mp::numerator(r).str();
  return mp::numerator(r).str() + "/" + q.str();
}

std::string decimal_text(const Exact& r, int digits) {
  if (digits < 1) digits = 1;
  cpp_int p = mp::numerator(r);
  const cpp_int q = mp::denominator(r);
  if (p == 0) return "0";
  const bool neg = p < 0;
  if (neg) p = -p;
  long e10 = floor_log10(p, q);
  const long s = digits - 1 - e10;  // m = round(r * 10^s)
  cpp_int m = s >= 0 ? round_half_even(p * pow10(static_cast<unsigned>(s)), q)
                     : round_half_even(p, q * pow10(static_cast<unsigned>(-s)));
  std::string t = m.str();
  if (t.size() > static_cast<std::size_t>(digits)) {  // rounded up to 10^digits
    t.pop_back();
    ++e10;
  }
  std::string out = neg ? "-" : "";
  out += t[0];
  if (t.size() > 1) out += "." + t.substr(1);
  out += "e" + std::to_string(e10);
  return out;
}

BasicBeam<Extended> to_extended(const BasicBeam<Exact>& b) {
  BasicBeam<Extended> r;
  r.title = b.title;
  r.labels = b.labels;
  r.stations_per_span = b.stations_per_span;
  for (const auto& s : b.spans) r.spans.push_back({to_extended(s.length), to_extended(s.EI)});
  for (const auto& s : b.supports)
    r.supports.push_back({s.type, to_extended(s.k), to_extended(s.kr), to_extended(s.settlement), s.hinge, s.settlement_case});
  for (const auto& l : b.loads) {
    BasicLoad<Extended> t;
    t.type = l.type; t.on_node = l.on_node; t.index = l.index;
    t.P = to_extended(l.P); t.C = to_extended(l.C);
    t.w1 = to_extended(l.w1); t.w2 = to_extended(l.w2);
    t.at = to_extended(l.at); t.from = to_extended(l.from); t.to = to_extended(l.to);
    t.load_case = l.load_case;
    r.loads.push_back(t);
  }
  return r;
}

// ---------------------------------------------------------------------------
// The JSON tree with every number kept as its text.

namespace {

struct Value {
  enum class Kind { Null, Bool, Number, String, Array, Object };
  Kind kind = Kind::Null;
  std::string text;  // a number's original text, or a string
  bool boolean = false;
  std::vector<std::pair<std::string, Value>> members;
  std::vector<Value> items;

  const Value* find(const std::string& key) const {
    for (const auto& [k, v] : members)
      if (k == key) return &v;
    return nullptr;
  }
};

class TreeBuilder : public nlohmann::json_sax<json> {
 public:
  Value root;
  std::string error;

  bool null() override { return put(Value{}); }
  bool boolean(bool b) override {
    Value v;
    v.kind = Value::Kind::Bool;
    v.boolean = b;
    return put(std::move(v));
  }
  bool number_integer(number_integer_t n) override { return number(std::to_string(n)); }
  bool number_unsigned(number_unsigned_t n) override { return number(std::to_string(n)); }
  // `s` is the number exactly as written in the file.
  bool number_float(number_float_t, const string_t& s) override { return number(s); }
  bool string(string_t& s) override {
    Value v;
    v.kind = Value::Kind::String;
    v.text = s;
    return put(std::move(v));
  }
  bool binary(binary_t&) override { return put(Value{}); }
  bool start_object(std::size_t) override { return open(Value::Kind::Object); }
  bool key(string_t& k) override {
    stack_.back().pending_key = k;
    return true;
  }
  bool end_object() override { return close(); }
  bool start_array(std::size_t) override { return open(Value::Kind::Array); }
  bool end_array() override { return close(); }
  bool parse_error(std::size_t, const std::string&, const nlohmann::detail::exception& e) override {
    error = e.what();
    return false;
  }

 private:
  struct Frame {
    Value value;
    std::string pending_key;
  };
  std::vector<Frame> stack_;

  bool number(const std::string& text) {
    Value v;
    v.kind = Value::Kind::Number;
    v.text = text;
    return put(std::move(v));
  }
  bool open(Value::Kind kind) {
    if (stack_.size() > 10000) { error = "nested too deeply"; return false; }
    Frame f;
    f.value.kind = kind;
    stack_.push_back(std::move(f));
    return true;
  }
  bool close() {
    Value v = std::move(stack_.back().value);
    stack_.pop_back();
    return put(std::move(v));
  }
  bool put(Value v) {
    if (stack_.empty()) { root = std::move(v); return true; }
    Frame& f = stack_.back();
    if (f.value.kind == Value::Kind::Object) f.value.members.emplace_back(f.pending_key, std::move(v));
    else f.value.items.push_back(std::move(v));
    return true;
  }
};

// Distance in units in the last place between two finite doubles.
std::uint64_t ulps(double a, double b) {
  auto key = [](double d) {
    std::int64_t i;
    std::memcpy(&i, &d, sizeof i);
    // Map to a monotonic unsigned scale (negative numbers below positive).
    return i < 0 ? static_cast<std::uint64_t>(0x8000000000000000ULL) - static_cast<std::uint64_t>(i & 0x7fffffffffffffffLL)
                 : static_cast<std::uint64_t>(i) + 0x8000000000000000ULL;
  };
  const std::uint64_t x = key(a), y = key(b);
  return x > y ? x - y : y - x;
}

struct Fail : std::runtime_error {
  using std::runtime_error::runtime_error;
};

// A number read exactly, with whether the double reader converted it.
struct Num {
  Exact v{0};
  bool converted = false;
};

struct ExactWalker {
  const input::BeamFile& file;

  Num quantity(const Value& v, input::Dimension dim, const std::string& where) const {
    if (v.kind == Value::Kind::Number) {
      auto e = parse_decimal(v.text);
      if (!e) throw Fail(where + ": cannot read the number \"" + v.text + "\" exactly");
      return {*e, false};
    }
    if (v.kind == Value::Kind::String) {
      auto q = parse_exact_quantity(v.text, dim, file.units);
      if (!q.ok) throw Fail(where + ": " + q.reason);
      return {q.value, q.converted};
    }
    throw Fail(where + ": not a number");
  }
  std::optional<Num> field(const Value& obj, const char* key, input::Dimension dim,
                           const std::string& where) const {
    const Value* v = obj.find(key);
    if (!v) return std::nullopt;
    return quantity(*v, dim, where + " " + key);
  }
  std::size_t index(const Value& v, const std::string& where) const {
    if (v.kind != Value::Kind::Number) throw Fail(where + ": not a whole number");
    auto e = parse_decimal(v.text);
    if (!e || mp::denominator(*e) != 1 || *e < 1) throw Fail(where + ": not a whole number from 1");
    return mp::numerator(*e).convert_to<std::size_t>() - 1;
  }

  // Every exact value must round to the double the reader produced: a plain
  // number to the very same double, a converted one (several roundings in
  // the double reader) to within 64 units in the last place.
  static void check(const std::string& where, const Num& n, double d) {
    const double r = to_double(n.v);
    const std::uint64_t limit = n.converted ? 64 : 0;
    if (!std::isfinite(r) || ulps(r, d) > limit)
      throw Fail(where + ": the exact value " + decimal_text(n.v, 20) + " does not round to the double " +
                 input::format_number(d) + " the reader gave");
  }

  BasicBeam<Exact> walk(const Value& root) const {
    const input::Dimension kLength{0, 1}, kForce{1, 0}, kMoment{1, 1}, kLineLoad{1, -1}, kEI{1, 2},
        kE{1, -2}, kI{0, 4};
    const Beam& db = file.beam;
    if (root.kind != Value::Kind::Object) throw Fail("the file is not a JSON object");
    BasicBeam<Exact> b;
    b.title = db.title;
    b.labels = db.labels;
    b.stations_per_span = db.stations_per_span;

    const Value* spans = root.find("spans");
    if (!spans || spans->kind != Value::Kind::Array) throw Fail("no list of spans");
    if (spans->items.size() != db.spans.size())
      throw Fail("the exact reader found " + std::to_string(spans->items.size()) + " spans, the reader " +
                 std::to_string(db.spans.size()));
    for (std::size_t i = 0; i < spans->items.size(); ++i) {
      const Value& s = spans->items[i];
      const std::string where = "span " + std::to_string(i + 1);
      BasicSpan<Exact> sp;
      auto L = field(s, "length", kLength, where);
      if (!L) throw Fail(where + ": no length");
      check(where + " length", *L, db.spans[i].length);
      sp.length = L->v;
      Num ei;
      if (auto v = field(s, "EI", kEI, where)) {
        ei = *v;
      } else {
        auto e = field(s, "E", kE, where);
        auto in = field(s, "I", kI, where);
        if (!e || !in) throw Fail(where + ": neither EI nor E and I");
        ei = {e->v * in->v, true};  // E times I, exactly
      }
      check(where + " EI", ei, db.spans[i].EI);
      sp.EI = ei.v;
      b.spans.push_back(sp);
    }

    const Value* sups = root.find("supports");
    if (!sups || sups->kind != Value::Kind::Array || sups->items.size() != db.supports.size())
      throw Fail("the supports differ in number from the reader's");
    for (std::size_t i = 0; i < sups->items.size(); ++i) {
      const Value& s = sups->items[i];
      const std::string where = "node " + std::to_string(i + 1);
      BasicSupport<Exact> sup;
      sup.type = db.supports[i].type;
      sup.hinge = db.supports[i].hinge;
      sup.settlement_case = db.supports[i].settlement_case;
      if (s.kind == Value::Kind::Object) {
        if (auto k = field(s, "k", kLineLoad, where)) { check(where + " k", *k, db.supports[i].k); sup.k = k->v; }
        if (auto kr = field(s, "kr", kMoment, where)) { check(where + " kr", *kr, db.supports[i].kr); sup.kr = kr->v; }
        const Value* sv = s.find("settlement");
        const Value& so = sv && sv->kind == Value::Kind::Object ? *sv : s;  // {"value": v, "case": C}
        if (auto st = field(so, sv && sv->kind == Value::Kind::Object ? "value" : "settlement", kLength, where)) {
          check(where + " settlement", *st, db.supports[i].settlement);
          sup.settlement = st->v;
        }
      }
      b.supports.push_back(sup);
    }

    const Value* loads = root.find("loads");
    std::size_t count = 0;
    if (loads && loads->kind == Value::Kind::Array) {
      for (std::size_t i = 0; i < loads->items.size(); ++i) {
        const Value& l = loads->items[i];
        const std::string where = "load " + std::to_string(i + 1);
        if (count >= db.loads.size()) throw Fail(where + ": the reader has fewer loads");
        const Load& dl = db.loads[count++];
        BasicLoad<Exact> load;
        load.type = dl.type;
        if (const Value* c = l.find("case")) load.load_case = c->text;
        std::size_t idx = 0;
        bool on_node = false;
        if (const Value* sp = l.find("span")) idx = index(*sp, where + " span");
        else if (const Value* nd = l.find("node")) { idx = index(*nd, where + " node"); on_node = true; }
        else throw Fail(where + ": neither span nor node");
        if (!on_node && idx >= b.spans.size()) throw Fail(where + ": no such span");
        load.on_node = on_node;
        load.index = idx;
        const Exact L = on_node ? Exact(0) : b.spans[idx].length;
        auto pos = [&](const char* key, const Exact& dflt) {
          auto v = field(l, key, kLength, where);
          return v ? *v : Num{dflt, false};
        };
        Num P, C, w1, w2, at, from, to;
        switch (load.type) {
          case LoadType::Point:
          case LoadType::Couple: {
            auto f = field(l, load.type == LoadType::Point ? "P" : "C",
                           load.type == LoadType::Point ? kForce : kMoment, where);
            if (!f) throw Fail(where + ": no value");
            (load.type == LoadType::Point ? P : C) = *f;
            if (!on_node) at = pos("at", Exact(0));
            break;
          }
          case LoadType::Udl: {
            auto w = field(l, "w", kLineLoad, where);
            if (!w) throw Fail(where + ": no w");
            w1 = w2 = *w;
            from = pos("from", Exact(0));
            to = pos("to", L);
            break;
          }
          case LoadType::Linear: {
            auto a = field(l, "w1", kLineLoad, where);
            auto c = field(l, "w2", kLineLoad, where);
            if (!a || !c) throw Fail(where + ": no w1 or w2");
            w1 = *a;
            w2 = *c;
            from = pos("from", Exact(0));
            to = pos("to", L);
            break;
          }
        }
        // Positions within the span, exactly (the double reader checked
        // them in double: a position a few 1e-17 past the end passes there).
        if (!on_node) {
          const bool span_load = load.type == LoadType::Udl || load.type == LoadType::Linear;
          if (span_load ? (from.v < 0 || !(from.v < to.v) || to.v > L) : (at.v < 0 || at.v > L))
            throw Fail(where + ": a position is outside the span (or 'from' is not before 'to') when read "
                               "exactly, though not in double");
        }
        // A point force exactly at a span end acts on the node (as the
        // reader does, but decided on the exact values).
        if (load.type == LoadType::Point && !load.on_node) {
          if (!(at.v > 0)) { load.on_node = true; at = Num{}; }
          else if (!(at.v < L)) { load.on_node = true; load.index += 1; at = Num{}; }
        }
        load.P = P.v; load.C = C.v; load.w1 = w1.v; load.w2 = w2.v;
        load.at = at.v; load.from = from.v; load.to = to.v;
        if (load.on_node != dl.on_node || load.index != dl.index || load.load_case != dl.load_case)
          throw Fail(where + ": placed differently from the reader (a position that rounds to a span end in "
                             "double but is not exactly there?)");
        check(where + " P", P, dl.P);
        check(where + " C", C, dl.C);
        check(where + " w1", w1, dl.w1);
        check(where + " w2", w2, dl.w2);
        check(where + " at", at, dl.at);
        check(where + " from", from, dl.from);
        check(where + " to", to, dl.to);
        b.loads.push_back(load);
      }
    }
    if (count != db.loads.size())
      throw Fail("the reader has " + std::to_string(db.loads.size()) + " loads, the exact reader " +
                 std::to_string(count));
    return b;
  }
};

}  // namespace

ExactBeamFile read_exact_beam(const std::string& text, const input::BeamFile& file) {
  ExactBeamFile out;
  out.cases = file.cases;
  if (!file.ok()) {
    out.error = "the file was not accepted by the reader";
    return out;
  }
  TreeBuilder tb;
  bool parsed = false;
  try {
    parsed = json::sax_parse(text, &tb);
  } catch (const std::exception& e) {
    out.error = std::string("cannot parse the file again: ") + e.what();
    return out;
  }
  if (!parsed) {
    out.error = "cannot parse the file again: " + tb.error;
    return out;
  }
  try {
    out.beam = ExactWalker{file}.walk(tb.root);
  } catch (const std::exception& e) {
    out.error = std::string("exact reading does not match the reader: ") + e.what();
    return out;
  }
  out.ok = true;
  return out;
}

}  // namespace trivet::precision
