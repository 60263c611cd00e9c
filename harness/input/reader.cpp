#include "harness/input/reader.h"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <limits>
#include <map>
#include <set>
#include <unordered_set>
#include <memory>
#include <sstream>

#include <cerrno>
#include <cstdint>
#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <nlohmann/json.hpp>

#include "methods/beam/stability.h"

namespace trivet::input {

using json = nlohmann::ordered_json;  // objects as a vector of members (one allocation each, not a tree node per key)

std::string Error::format(const std::string& file) const {
  std::string s = file + ": " + (pointer.empty() ? std::string("/") : pointer);
  if (!where.empty()) s += " (" + where + ")";
  return s + ": " + reason;
}

const char* quantity_name(Quantity q) {
  switch (q) {
    case Quantity::Moment: return "moment";
    case Quantity::Shear: return "shear";
    case Quantity::Reaction: return "reaction";
    case Quantity::ReactionMoment: return "reaction_moment";
    case Quantity::Deflection: return "deflection";
    case Quantity::Rotation: return "rotation";
    case Quantity::MaxMoment: return "max_moment";
    case Quantity::MinMoment: return "min_moment";
    case Quantity::MaxDeflection: return "max_deflection";
    case Quantity::MomentMax: return "moment_max";
    case Quantity::MomentMin: return "moment_min";
    case Quantity::ShearMax: return "shear_max";
    case Quantity::ShearMin: return "shear_min";
    case Quantity::ReactionMax: return "reaction_max";
    case Quantity::ReactionMin: return "reaction_min";
  }
  return "?";
}

bool is_envelope_quantity(Quantity q) {
  return q == Quantity::MomentMax || q == Quantity::MomentMin || q == Quantity::ShearMax ||
         q == Quantity::ShearMin || q == Quantity::ReactionMax || q == Quantity::ReactionMin;
}

bool Combination::is_envelope() const {
  if (!pattern.empty() || moving) return true;
  for (const auto& f : factors)
    if (f.second.range) return true;
  return false;
}

std::string DeflectionLimit::text() const {
  if (!(ratio > 0)) return "none";
  std::string t = "L/" + format_number(ratio);
  if (cantilever) t += ", cantilever L/" + format_number(*cantilever);
  return t;
}

const std::vector<std::string>& preset_names() {
  static const std::vector<std::string> names = {"asce7-strength", "en1990-6.10"};
  return names;
}

Dimension quantity_dimension(Quantity q) {
  switch (q) {
    case Quantity::Moment: case Quantity::ReactionMoment:
    case Quantity::MaxMoment: case Quantity::MinMoment: return {1, 1};
    case Quantity::Shear: case Quantity::Reaction: return {1, 0};
    case Quantity::Deflection: case Quantity::MaxDeflection: return {0, 1};
    case Quantity::Rotation: return {0, 0};
    case Quantity::MomentMax: case Quantity::MomentMin: return {1, 1};
    case Quantity::ShearMax: case Quantity::ShearMin: case Quantity::ReactionMax: case Quantity::ReactionMin: return {1, 0};
  }
  return {0, 0};
}

std::string quantity_unit(const Units& units, Quantity q) {
  return q == Quantity::Rotation ? "rad" : units.of(quantity_dimension(q));
}

std::string default_label(std::size_t i) {
  std::string s;
  std::size_t n = i + 1;
  while (n > 0) {
    --n;
    s.insert(s.begin(), static_cast<char>('A' + n % 26));
    n /= 26;
  }
  return s;
}

std::string format_number(double v) {
  if (!(v < 0.0) && !(v > 0.0)) return "0";  // also -0
  char buf[64];
  auto res = std::to_chars(buf, buf + sizeof buf, v);
  return std::string(buf, res.ptr);
}

namespace {

std::size_t edit_distance(const std::string& a, const std::string& b) {
  std::vector<std::size_t> prev(b.size() + 1), cur(b.size() + 1);
  for (std::size_t j = 0; j <= b.size(); ++j) prev[j] = j;
  for (std::size_t i = 1; i <= a.size(); ++i) {
    cur[0] = i;
    for (std::size_t j = 1; j <= b.size(); ++j) {
      const bool same = std::tolower(static_cast<unsigned char>(a[i - 1])) ==
                        std::tolower(static_cast<unsigned char>(b[j - 1]));
      cur[j] = std::min({prev[j] + 1, cur[j - 1] + 1, prev[j - 1] + (same ? 0 : 1)});
    }
    std::swap(prev, cur);
  }
  return prev[b.size()];
}

}  // namespace

std::optional<std::string> did_you_mean(const std::string& word,
                                        const std::vector<std::string>& options) {
  std::optional<std::string> best;
  std::size_t best_d = 0;
  for (const auto& o : options) {
    const std::size_t d = edit_distance(word, o);
    if (!best || d < best_d) { best = o; best_d = d; }
  }
  if (!best) return std::nullopt;
  const std::size_t limit = std::max<std::size_t>(1, std::min<std::size_t>(3, best->size() / 3 + 1));
  if (*best == word || best_d > limit || best_d >= word.size()) return std::nullopt;
  return best;
}

std::optional<Tolerance> parse_tolerance_text(const std::string& text, std::string* reason) {
  std::string t = text;
  while (!t.empty() && std::isspace(static_cast<unsigned char>(t.back()))) t.pop_back();
  std::size_t b = 0;
  while (b < t.size() && std::isspace(static_cast<unsigned char>(t[b]))) ++b;
  t = t.substr(b);
  Tolerance tol;
  bool pct = !t.empty() && t.back() == '%';
  if (pct) t.pop_back();
  double v = 0;
  auto res = std::from_chars(t.data(), t.data() + t.size(), v);
  if (t.empty() || res.ec != std::errc() || res.ptr != t.data() + t.size() || !std::isfinite(v)) {
    if (reason) *reason = "must be a percentage such as \"1%\" or an absolute value such as 0.05 (got \"" + text + "\")";
    return std::nullopt;
  }
  if (v < 0) {
    if (reason) *reason = "must not be negative (got \"" + text + "\")";
    return std::nullopt;
  }
  tol.relative = pct;
  tol.value = pct ? v / 100.0 : v;
  return tol;
}

namespace {

// True when `s` holds a control character (ESC, CR, LF, ...): a name that
// would paint over a terminal's lines.
bool has_control(const std::string& s) {
  for (unsigned char c : s)
    if (c < 0x20 || c == 0x7F) return true;
  return false;
}

// Text from the file made fit for a one-line message: bytes that are not
// UTF-8 are written \xNN, control characters \n, \t or \u00NN, and a very
// long text is cut (at a character boundary) with "...".
std::string printable(const std::string& s, std::size_t max_bytes = 400) {
  static const char* hex = "0123456789ABCDEF";
  std::string r;
  std::size_t i = 0;
  while (i < s.size()) {
    if (r.size() >= max_bytes) { r += "..."; break; }
    const unsigned char c = static_cast<unsigned char>(s[i]);
    if (c < 0x20 || c == 0x7F) {
      if (c == '\n') r += "\\n";
      else if (c == '\t') r += "\\t";
      else if (c == '\r') r += "\\r";
      else { r += "\\u00"; r += hex[c >> 4]; r += hex[c & 15]; }
      ++i;
      continue;
    }
    if (c < 0x80) { r += static_cast<char>(c); ++i; continue; }
    // The length of a well-formed UTF-8 sequence starting here, or 0.
    std::size_t n = 0;
    unsigned lo = 0x80, hi = 0xBF;
    if (c >= 0xC2 && c <= 0xDF) n = 2;
    else if (c >= 0xE0 && c <= 0xEF) { n = 3; if (c == 0xE0) lo = 0xA0; if (c == 0xED) hi = 0x9F; }
    else if (c >= 0xF0 && c <= 0xF4) { n = 4; if (c == 0xF0) lo = 0x90; if (c == 0xF4) hi = 0x8F; }
    bool ok = n > 0 && i + n <= s.size();
    for (std::size_t k = 1; ok && k < n; ++k) {
      const unsigned char d = static_cast<unsigned char>(s[i + k]);
      if (d < (k == 1 ? lo : 0x80u) || d > (k == 1 ? hi : 0xBFu)) ok = false;
    }
    if (ok) { r.append(s, i, n); i += n; }
    else { r += "\\x"; r += hex[c >> 4]; r += hex[c & 15]; ++i; }
  }
  return r;
}

const char* type_of(const json& j) {
  switch (j.type()) {
    case json::value_t::null: return "null";
    case json::value_t::object: return "an object";
    case json::value_t::array: return "an array";
    case json::value_t::string: return "a string";
    case json::value_t::boolean: return "true/false";
    case json::value_t::number_integer:
    case json::value_t::number_unsigned:
    case json::value_t::number_float: return "a number";
    default: return "something else";
  }
}

std::string got(const json& j) {
  if (j.is_string()) {
    return "got the string \"" + printable(j.get<std::string>(), 40) + "\"";
  }
  if (j.is_number()) return "got " + format_number(j.get<double>());
  if (j.is_boolean()) return std::string("got ") + (j.get<bool>() ? "true" : "false");
  return std::string("got ") + type_of(j);
}

// Escapes a key for a JSON Pointer (RFC 6901: ~ -> ~0, / -> ~1).
std::string escape_key(const std::string& k) {
  std::string r;
  for (char c : k) {
    if (c == '~') r += "~0";
    else if (c == '/') r += "~1";
    else r += c;
  }
  return r;
}

// A whole number of the file as a long long, saturated (a number beyond
// the range of long long reads as the largest one of its sign).
long long whole(const json& v) {
  if (v.is_number_unsigned()) {
    const auto u = v.get<unsigned long long>();
    return u > static_cast<unsigned long long>(std::numeric_limits<long long>::max())
               ? std::numeric_limits<long long>::max() : static_cast<long long>(u);
  }
  return v.get<long long>();
}
// Its text, exact.
std::string whole_text(const json& v) {
  return v.is_number_unsigned() ? std::to_string(v.get<unsigned long long>()) : std::to_string(v.get<long long>());
}

struct Reader {
  std::vector<Error>* errors;
  Units units;
  Limits limits;
  std::set<std::string> unknown_keys;  // pointers of the fields reported as unknown

  // `id`: the stable name of the kind of error (README, "Error ids"),
  // without its "input." prefix.
  void error(const char* id, const std::string& ptr, const std::string& where, const std::string& reason) {
    if (errors->size() < 1000) errors->push_back({printable(ptr), where, printable(reason, 2000), std::string("input.") + id});
    else if (errors->size() == 1000)
      errors->push_back({"", "", "more than 1000 errors; the rest are not listed", "input.limit"});
  }

  // "L/360": the n of span / n, or nothing with an error.
  std::optional<double> limit_ratio(const json& v, const std::string& ptr, const std::string& where) {
    const std::string t = v.is_string() ? v.get<std::string>() : "";
    const auto slash = t.find('/');
    if (!v.is_string() || slash == std::string::npos || t.substr(0, slash) != "L") {
      error("wrong_type", ptr, where, "must be a limit such as \"L/360\" (span over a number) (" + got(v) + ")");
      return std::nullopt;
    }
    const std::string n = t.substr(slash + 1);
    char* end = nullptr;
    const double d = n.empty() ? 0.0 : std::strtod(n.c_str(), &end);
    if (n.empty() || !end || *end != '\0' || !std::isfinite(d) || !(d > 0)) {
      error("out_of_range", ptr, where, "the number under L must be a positive number, as in \"L/360\" (got \"" + printable(t, 60) + "\")");
      return std::nullopt;
    }
    return d;
  }
  // A deflection limit: "L/360", or {"span": "L/360", "cantilever": "L/180"}
  // (plus, at the top of the file, "load_sets"); "none" where allowed.
  bool deflection_limit(const json& v, const std::string& ptr, const std::string& where, bool top, DeflectionLimit& out,
                        std::vector<std::string>* sets) {
    if (v.is_string()) {
      if (!top && v.get<std::string>() == "none") { out = {}; return true; }
      auto r = limit_ratio(v, ptr, where);
      if (r) out.ratio = *r;
      return r.has_value();
    }
    if (!v.is_object()) {
      error("wrong_type", ptr, where, std::string("must be a limit such as \"L/360\" or an object {\"span\": \"L/360\", \"cantilever\": \"L/180\"}") +
                                          (top ? "" : ", or \"none\"") + " (" + got(v) + ")");
      return false;
    }
    check_keys(v, ptr, where, top ? std::vector<std::string>{"span", "cantilever", "load_sets"} : std::vector<std::string>{"span", "cantilever"});
    bool ok = true;
    auto sp = v.find("span");
    if (sp == v.end()) { error("missing_field", ptr + "/span", where, "required field is missing (the limit of a span, e.g. \"L/360\")"); ok = false; }
    else if (auto r = limit_ratio(*sp, ptr + "/span", where)) out.ratio = *r;
    else ok = false;
    if (auto c = v.find("cantilever"); c != v.end()) {
      if (auto r = limit_ratio(*c, ptr + "/cantilever", where)) out.cantilever = *r;
      else ok = false;
    }
    if (top && sets)
      if (auto ls = v.find("load_sets"); ls != v.end()) {
        if (!ls->is_array() || ls->empty()) { error("wrong_type", ptr + "/load_sets", where, "must be a list of load case or combination names (" + got(*ls) + ")"); ok = false; }
        else
          for (std::size_t i = 0; i < ls->size(); ++i) {
            const json& n = (*ls)[i];
            if (!n.is_string()) { error("wrong_type", ptr + "/load_sets/" + std::to_string(i), where, "must be the name of a load case or combination (" + got(n) + ")"); ok = false; }
            else sets->push_back(n.get<std::string>());
          }
      }
    return ok;
  }

  // Reports keys of `obj` not in `allowed`.
  void check_keys(const json& obj, const std::string& ptr, const std::string& where,
                  const std::vector<std::string>& allowed) {
    for (auto it = obj.begin(); it != obj.end(); ++it) {
      if (std::find(allowed.begin(), allowed.end(), it.key()) != allowed.end()) continue;
      std::string reason = "unknown field '" + it.key() + "'";
      if (auto m = did_you_mean(it.key(), allowed)) reason += " (did you mean '" + *m + "'?)";
      else {
        reason += " (known here: ";
        for (std::size_t i = 0; i < allowed.size(); ++i) reason += (i ? ", " : "") + allowed[i];
        reason += ")";
      }
      error("unknown_field", ptr + "/" + escape_key(it.key()), where, reason);
      unknown_keys.insert(ptr + "/" + escape_key(it.key()));
    }
  }

  // A quantity: a plain number in the file's units or a string with a unit.
  std::optional<double> quantity(const json& v, const std::string& ptr, const std::string& where,
                                 Dimension dim) {
    if (v.is_number()) {
      const double d = v.get<double>();
      if (!std::isfinite(d)) {
        error("not_finite", ptr, where, "must be a finite number (the value is too large)");
        return std::nullopt;
      }
      return d;
    }
    if (v.is_string()) {
      auto q = parse_quantity(v.get<std::string>(), dim, units);
      if (!q.ok) {
        error("bad_quantity", ptr, where, q.reason);
        return std::nullopt;
      }
      return q.value;
    }
    error("wrong_type", ptr, where, "must be a number (" + units.of(dim) + "), or a string with its unit (" + got(v) + ")");
    return std::nullopt;
  }

  // True when a key of `obj` has been reported as unknown with `key`
  // suggested: the missing `key` is then not reported again. (Only a field
  // reported as unknown can be the misspelling: "w1" is not a misspelt "w2".)
  bool misspelt(const json& obj, const std::string& ptr, const std::string& key) const {
    for (auto k = obj.begin(); k != obj.end(); ++k)
      if (k.key() != key && unknown_keys.count(ptr + "/" + escape_key(k.key())) &&
          did_you_mean(k.key(), {key}) == std::optional<std::string>(key))
        return true;
    return false;
  }

  std::optional<double> field(const json& obj, const char* key, const std::string& ptr,
                              const std::string& where, Dimension dim, bool required) {
    auto it = obj.find(key);
    if (it == obj.end()) {
      // A misspelt key has already been reported with this one suggested.
      if (required && !misspelt(obj, ptr, key)) error("missing_field", ptr + "/" + key, where, "required field is missing");
      return std::nullopt;
    }
    return quantity(*it, ptr + "/" + key, where, dim);
  }

  std::optional<double> positive(const json& obj, const char* key, const std::string& ptr,
                                 const std::string& where, Dimension dim, bool required) {
    auto v = field(obj, key, ptr, where, dim, required);
    if (v && !(*v > 0.0)) {
      error("out_of_range", ptr + "/" + key, where, "must be greater than 0 (got " + format_number(*v) + ")");
      return std::nullopt;
    }
    return v;
  }
};

const std::vector<std::string> kTopKeys = {"title", "description", "units", "spans", "supports",
                                           "labels", "loads", "stations_per_span", "claims", "combinations",
                                           "deflection_limit", "moving_loads", "$schema"};
const std::vector<std::string> kSupportTypes = {"fixed", "pinned", "roller", "free", "spring", "guided"};
const std::vector<std::string> kLoadTypes = {"point", "udl", "linear", "couple"};
const std::vector<std::string> kQuantities = {"moment", "shear", "reaction", "reaction_moment",
                                              "deflection", "rotation", "max_moment",
                                              "min_moment", "max_deflection", "moment_max", "moment_min",
                                              "shear_max", "shear_min", "reaction_max", "reaction_min"};

}  // namespace
// (Outside the file's private namespace, after kQuantities: reader.h.)
std::optional<Quantity> claim_quantity(const std::string& name, bool over_span, bool at_point) {
  std::optional<Quantity> q;
  auto it = std::find(kQuantities.begin(), kQuantities.end(), name);
  if (it != kQuantities.end()) q = static_cast<Quantity>(it - kQuantities.begin());
  else if (name == "max_shear") q = Quantity::ShearMax;
  else if (name == "min_shear") q = Quantity::ShearMin;
  else if (name == "max_reaction") q = Quantity::ReactionMax;
  else if (name == "min_reaction") q = Quantity::ReactionMin;
  else if (name == "deflection_max") q = Quantity::MaxDeflection;
  if (!q) return q;
  // One quantity, named by where it is taken.
  if (over_span && !at_point) {
    if (*q == Quantity::MomentMax) q = Quantity::MaxMoment;
    else if (*q == Quantity::MomentMin) q = Quantity::MinMoment;
  } else if (at_point && !over_span) {
    if (*q == Quantity::MaxMoment) q = Quantity::MomentMax;
    else if (*q == Quantity::MinMoment) q = Quantity::MomentMin;
  }
  return q;
}
namespace {

// Tracks object keys during parsing so that a key given twice is an error
// (nlohmann/json would otherwise keep the last one silently).
// Thrown by the duplicate finder when the nesting is deeper than the limit
// (a beam file nests a few levels; a deeper one is refused before it costs
// memory or stack).
struct TooDeep {
  std::string pointer;
};

struct DuplicateFinder {
  // The SAX interface of nlohmann/json: it finds duplicate keys and
  // excessive depth as the text is read, beside the document builder
  // (CheckedDocument below). (A parser callback would do the same, but
  // nlohmann/json's callback parser rescans each array at every object
  // end, which makes a 100,000-span file quadratic.) It allocates nothing in the steady state:
  // the keys of every open object share one stack, and a container's JSON
  // Pointer is put together only when a message needs it.
  std::size_t max_depth = 64;
  struct Frame {
    bool object;
    std::size_t index = 0;       // arrays: the next element's index
    std::string key;             // this container's key in its parent object
    std::size_t keys_from = 0;   // objects: where its keys start in `keys`
    std::unique_ptr<std::unordered_set<std::string>> many;  // or its keys, when it has many
  };
  std::vector<Frame> stack;
  std::vector<std::string> keys;  // the keys of the open objects, innermost last
  std::string pending_key;
  std::vector<std::string> duplicates;  // pointers
  bool overflow = false;         // a number beyond double
  std::string overflow_pointer;
  std::string syntax;            // the parse error's message, if any

  // The pointer of frame `upto` (exclusive: the container holding it).
  std::string pointer_of(std::size_t upto) const {
    std::string p;
    for (std::size_t i = 1; i < upto; ++i) {
      p += '/';
      p += stack[i - 1].object ? escape_key(stack[i].key) : std::to_string(stack[i - 1].index);
    }
    return p;
  }
  // The pointer of the value being read now.
  std::string child_pointer() const {
    if (stack.empty()) return "";
    const Frame& f = stack.back();
    return pointer_of(stack.size()) + "/" + (f.object ? escape_key(pending_key) : std::to_string(f.index));
  }
  void value_done() {
    if (!stack.empty() && !stack.back().object) ++stack.back().index;
  }
  void open(bool object) {
    if (stack.size() >= max_depth) throw TooDeep{child_pointer()};
    Frame f{object, 0, {}, keys.size(), nullptr};
    if (!stack.empty() && stack.back().object) f.key = pending_key;
    stack.push_back(std::move(f));
  }
  void close() {
    if (!stack.empty()) {
      if (stack.back().object && !stack.back().many) keys.resize(stack.back().keys_from);
      stack.pop_back();
    }
    value_done();
  }
  bool null() { value_done(); return true; }
  bool boolean(bool) { value_done(); return true; }
  bool number_integer(json::number_integer_t) { value_done(); return true; }
  bool number_unsigned(json::number_unsigned_t) { value_done(); return true; }
  bool number_float(json::number_float_t, const json::string_t&) { value_done(); return true; }
  bool string(json::string_t&) { value_done(); return true; }
  bool binary(json::binary_t&) { value_done(); return true; }
  bool start_object(std::size_t) { open(true); return true; }
  bool end_object() { close(); return true; }
  bool start_array(std::size_t) { open(false); return true; }
  bool end_array() { close(); return true; }
  bool key(json::string_t& k) {
    pending_key = k;
    if (stack.empty()) return true;
    Frame& f = stack.back();
    bool seen;
    if (f.many) {
      seen = !f.many->insert(k).second;
    } else {
      // Objects in a beam file have a handful of keys: a linear search is
      // cheapest. Past 32 keys (a long list of load-case factors, or a
      // hostile file) the object's keys move to a hash set, so the pass
      // stays linear.
      const auto first = keys.begin() + static_cast<std::ptrdiff_t>(f.keys_from);
      seen = std::find(first, keys.end(), k) != keys.end();
      if (!seen) keys.push_back(k);
      if (keys.size() - f.keys_from > 32) {
        f.many = std::make_unique<std::unordered_set<std::string>>(keys.begin() + static_cast<std::ptrdiff_t>(f.keys_from),
                                                                   keys.end());
        keys.resize(f.keys_from);
      }
    }
    if (seen && duplicates.size() < 100) duplicates.push_back(pointer_of(stack.size()) + "/" + escape_key(k));
    return true;
  }
  bool parse_error(std::size_t, const std::string&, const nlohmann::detail::exception& ex) {
    if (ex.id == 406) {  // out_of_range.406: number overflow
      overflow = true;
      overflow_pointer = child_pointer();
    } else {
      syntax = ex.what();
    }
    return false;
  }
};

// One pass over the text: the duplicate finder's checks and the document
// built by nlohmann/json's own SAX document builder, event by event.
struct CheckedDocument {
  DuplicateFinder& dups;
  nlohmann::detail::json_sax_dom_parser<json> dom;
  CheckedDocument(json& root, DuplicateFinder& d) : dups(d), dom(root, false) {}
  bool null() { dups.null(); return dom.null(); }
  bool boolean(bool v) { dups.boolean(v); return dom.boolean(v); }
  bool number_integer(json::number_integer_t v) { dups.number_integer(v); return dom.number_integer(v); }
  bool number_unsigned(json::number_unsigned_t v) { dups.number_unsigned(v); return dom.number_unsigned(v); }
  bool number_float(json::number_float_t v, const json::string_t& t) { dups.number_float(v, t); return dom.number_float(v, t); }
  bool string(json::string_t& v) { dups.string(v); return dom.string(v); }
  bool binary(json::binary_t& v) { dups.binary(v); return dom.binary(v); }
  bool start_object(std::size_t n) { dups.start_object(n); return dom.start_object(n); }
  bool end_object() { dups.end_object(); return dom.end_object(); }
  bool start_array(std::size_t n) { dups.start_array(n); return dom.start_array(n); }
  bool end_array() { dups.end_array(); return dom.end_array(); }
  bool key(json::string_t& k) { dups.key(k); return dom.key(k); }
  bool parse_error(std::size_t at, const std::string& token, const nlohmann::detail::exception& ex) {
    return dups.parse_error(at, token, ex);
  }
};

std::string where_of(const std::string& ptr) {
  // "/spans/1/..." -> "span 2", "/supports/0" -> "node 1", ...
  static const std::vector<std::pair<std::string, std::string>> prefixes = {
      {"/spans/", "span "}, {"/supports/", "node "}, {"/labels/", "node "},
      {"/loads/", "load "}, {"/claims/values/", "claim "}, {"/combinations/", "combination "},
      {"/moving_loads/", "moving load "}};
  for (const auto& [p, w] : prefixes) {
    if (ptr.compare(0, p.size(), p) == 0) {
      std::size_t i = p.size();
      std::size_t n = 0;
      bool digits = false;
      while (i < ptr.size() && std::isdigit(static_cast<unsigned char>(ptr[i]))) {
        n = n * 10 + static_cast<std::size_t>(ptr[i] - '0');
        ++i;
        digits = true;
      }
      if (digits) return w + std::to_string(n + 1);
    }
  }
  return "";
}

}  // namespace

namespace {
void envelope_limit_errors(const BeamFile& file, int per_span, const Limits& limits, std::vector<Error>& out);
}  // namespace

BeamFile parse_beam_text(const std::string& text, const std::string& display, const Limits& limits) {
  BeamFile out;
  out.path = display;
  Reader rd{&out.errors, Units{}, limits, {}};

  if (text.size() > limits.max_file_bytes) {
    rd.error("limit", "", "", "the file is larger than the limit of " + std::to_string(limits.max_file_bytes >> 20) + " MiB");
    return out;
  }
  if (std::all_of(text.begin(), text.end(), [](char c) { return std::isspace(static_cast<unsigned char>(c)); })) {
    rd.error("syntax", "", "", "the file is empty (a beam file is a JSON object)");
    return out;
  }

  json root;
  DuplicateFinder dups;
  dups.max_depth = limits.max_depth;
  try {
    CheckedDocument doc(root, dups);
    if (!json::sax_parse(text, &doc, json::input_format_t::json, true, false)) {
      if (dups.overflow) {
        rd.error("not_finite", dups.overflow_pointer, where_of(dups.overflow_pointer), "must be a finite number (the value is too large)");
        return out;
      }
      std::string msg = dups.syntax;
      const std::string marker = "parse error at ";
      auto p = msg.find(marker);
      if (p != std::string::npos) msg = msg.substr(p + marker.size());
      rd.error("syntax", "", "", "not valid JSON: " + msg);
      return out;
    }
  } catch (const TooDeep& deep) {
    rd.error("syntax", deep.pointer, where_of(deep.pointer), "nested more than " + std::to_string(limits.max_depth) +
                                                       " levels deep (a beam file needs only a few)");
    return out;
  } catch (const json::parse_error& e) {
    std::string msg = e.what();
    const std::string marker = "parse error at ";
    auto p = msg.find(marker);
    if (p != std::string::npos) msg = msg.substr(p + marker.size());
    rd.error("syntax", "", "", "not valid JSON: " + msg);
    return out;
  } catch (const json::out_of_range& e) {
    // nlohmann/json refuses numbers beyond double (e.g. 1e999); the
    // duplicate finder knows where the parser had got to.
    const std::string ptr = dups.child_pointer();
    rd.error("not_finite", ptr, where_of(ptr), "must be a finite number (the value is too large)");
    return out;
  } catch (const std::exception& e) {
    rd.error("syntax", "", "", std::string("not valid JSON: ") + e.what());
    return out;
  }
  for (const auto& d : dups.duplicates)
    rd.error("duplicate", d, where_of(d), "this field is given twice (each field may appear once)");
  if (!root.is_object()) {
    rd.error("syntax", "", "", std::string("a beam file must be a JSON object with spans, supports and loads (got ") +
                         type_of(root) + ")");
    return out;
  }
  rd.check_keys(root, "", "", kTopKeys);

  Beam& beam = out.beam;
  // title
  if (auto it = root.find("title"); it != root.end()) {
    if (it->is_string()) beam.title = it->get<std::string>();
    else rd.error("wrong_type", "/title", "", "must be a string (" + got(*it) + ")");
  }
  for (const char* key : {"description", "$schema"})
    if (auto it = root.find(key); it != root.end() && !it->is_string())
      rd.error("wrong_type", std::string("/") + key, "", "must be a string (" + got(*it) + ")");
  // units
  bool units_ok = false;
  if (auto it = root.find("units"); it == root.end()) {
    rd.error("missing_field", "/units", "", "required field is missing (for example {\"force\": \"kN\", \"length\": \"m\"})");
  } else if (!it->is_object()) {
    rd.error("wrong_type", "/units", "", "must be an object such as {\"force\": \"kN\", \"length\": \"m\"} (" + got(*it) + ")");
  } else {
    rd.check_keys(*it, "/units", "", {"force", "length"});
    units_ok = true;
    auto unit_field = [&](const char* key, const std::vector<std::string>& names, bool force) {
      auto f = it->find(key);
      const std::string ptr = std::string("/units/") + key;
      std::string list;
      for (std::size_t i = 0; i < names.size(); ++i) list += (i ? ", " : "") + names[i];
      if (f == it->end()) { rd.error("missing_field", ptr, "", "required field is missing (one of " + list + ")"); units_ok = false; return; }
      if (!f->is_string()) { rd.error("wrong_type", ptr, "", "must be one of " + list + " (" + got(*f) + ")"); units_ok = false; return; }
      const std::string name = f->get<std::string>();
      auto factor = force ? force_unit(name) : length_unit(name);
      if (!factor) {
        std::string reason = "unknown " + std::string(force ? "force" : "length") + " unit '" + name + "'";
        if (auto m = did_you_mean(name, names)) reason += " (did you mean '" + *m + "'?)";
        else reason += " (one of " + list + ")";
        rd.error("unknown_unit", ptr, "", reason);
        units_ok = false;
        return;
      }
      if (force) { rd.units.force = name; rd.units.newtons = *factor; }
      else { rd.units.length = name; rd.units.metres = *factor; }
    };
    unit_field("force", {"N", "kN", "MN", "lbf", "kip"}, true);
    unit_field("length", {"mm", "cm", "m", "in", "ft"}, false);
  }
  out.units = rd.units;
  // Quantities given with their own unit cannot be converted without the
  // file's units; plain numbers can still be checked.
  (void)units_ok;

  const Dimension kLength{0, 1}, kForce{1, 0}, kMoment{1, 1}, kLineLoad{1, -1}, kEI{1, 2},
      kE{1, -2}, kI{0, 4};

  // spans
  bool spans_ok = false;
  if (auto it = root.find("spans"); it == root.end()) {
    rd.error("missing_field", "/spans", "", "required field is missing (a list of spans, left to right)");
  } else if (!it->is_array()) {
    rd.error("wrong_type", "/spans", "", "must be a list of spans (" + got(*it) + ")");
  } else if (it->empty()) {
    rd.error("wrong_count", "/spans", "", "must have at least one span");
  } else if (it->size() > limits.max_spans) {
    rd.error("limit", "/spans", "", "has " + std::to_string(it->size()) + " spans, more than the limit of " +
                               std::to_string(limits.max_spans));
  } else {
    spans_ok = true;
    beam.spans.reserve(it->size());
    for (std::size_t i = 0; i < it->size(); ++i) {
      const json& s = (*it)[i];
      const std::string ptr = "/spans/" + std::to_string(i);
      const std::string where = "span " + std::to_string(i + 1);
      Span span;
      if (!s.is_object()) {
        rd.error("wrong_type", ptr, where, "must be an object with length and EI (" + got(s) + ")");
        spans_ok = false;
        beam.spans.push_back(span);
        continue;
      }
      rd.check_keys(s, ptr, where, {"length", "EI", "E", "I"});
      auto L = rd.positive(s, "length", ptr, where, kLength, true);
      const bool has_ei = s.contains("EI"), has_e = s.contains("E"), has_i = s.contains("I");
      // (plain doubles here: GCC 12 warns falsely about optional<double>)
      double ei = 0.0;
      bool ei_ok = false;
      if (has_ei && (has_e || has_i)) {
        rd.error("conflicting_fields", ptr, where, "give either EI or both E and I, not both");
      } else if (has_ei) {
        if (auto v = rd.positive(s, "EI", ptr, where, kEI, true)) { ei = *v; ei_ok = true; }
      } else if (has_e || has_i) {
        auto e = rd.positive(s, "E", ptr, where, kE, true);
        auto in = rd.positive(s, "I", ptr, where, kI, true);
        if (e && in) {
          ei = *e * *in;
          ei_ok = std::isfinite(ei) && ei > 0;
          if (!ei_ok) rd.error("out_of_range", ptr, where, "E times I is out of range (" + format_number(ei) + ")");
        }
      } else {
        rd.error("missing_field", ptr + "/EI", where, "required field is missing (give EI, or both E and I)");
      }
      if (L && ei_ok) {
        span.length = *L;
        span.EI = ei;
      } else {
        spans_ok = false;
      }
      beam.spans.push_back(span);
    }
  }
  const std::size_t n_spans = beam.spans.size();
  const std::size_t n_nodes = n_spans + 1;

  // supports
  bool supports_ok = false;
  if (auto it = root.find("supports"); it == root.end()) {
    rd.error("missing_field", "/supports", "", "required field is missing (one entry per node, left to right)");
  } else if (!it->is_array()) {
    rd.error("wrong_type", "/supports", "", "must be a list with one entry per node (" + got(*it) + ")");
  } else if (n_spans > 0 && it->size() != n_nodes) {
    rd.error("wrong_count", "/supports", "", "must have one entry per node: " + std::to_string(n_nodes) + " for " +
                                  std::to_string(n_spans) + (n_spans == 1 ? " span" : " spans") +
                                  " (got " + std::to_string(it->size()) + ")");
  } else {
    supports_ok = n_spans > 0;
    for (std::size_t i = 0; i < it->size(); ++i) {
      const json& s = (*it)[i];
      const std::string ptr = "/supports/" + std::to_string(i);
      const std::string where = "node " + std::to_string(i + 1);
      Support sup;
      const json* type = nullptr;
      std::string tptr = ptr;
      if (s.is_string()) {
        type = &s;
      } else if (s.is_object()) {
        rd.check_keys(s, ptr, where, {"type", "k", "kr", "settlement", "hinge"});
        auto t = s.find("type");
        if (t == s.end()) { rd.error("missing_field", ptr + "/type", where, "required field is missing (one of fixed, pinned, roller, free, spring, guided)"); supports_ok = false; }
        else { type = &*t; tptr = ptr + "/type"; }
      } else {
        rd.error("wrong_type", ptr, where, "must be a support type such as \"pinned\", or an object with \"type\" (" + got(s) + ")");
        supports_ok = false;
      }
      bool type_ok = false;
      if (type) {
        if (!type->is_string()) {
          rd.error("wrong_type", tptr, where, "must be one of fixed, pinned, roller, free, spring, guided (" + got(*type) + ")");
        } else {
          const std::string t = type->get<std::string>();
          static const std::map<std::string, SupportType> m = {
              {"fixed", SupportType::Fixed}, {"pinned", SupportType::Pinned},
              {"roller", SupportType::Roller}, {"free", SupportType::Free},
              {"spring", SupportType::Spring}, {"guided", SupportType::Guided}};
          auto f = m.find(t);
          if (f == m.end()) {
            std::string reason = "unknown support type '" + t + "'";
            if (auto d = did_you_mean(t, kSupportTypes)) reason += " (did you mean '" + *d + "'?)";
            else reason += " (one of fixed, pinned, roller, free, spring, guided)";
            rd.error("unknown_name", tptr, where, reason);
          } else {
            sup.type = f->second;
            type_ok = true;
          }
        }
      }
      if (!type_ok) supports_ok = false;
      if (s.is_object() && type_ok) {
        const bool spring = sup.type == SupportType::Spring;
        if (spring) {
          auto k = rd.positive(s, "k", ptr, where, kLineLoad, true);
          if (k) sup.k = *k; else supports_ok = false;
          if (s.contains("kr")) {
            auto kr = rd.field(s, "kr", ptr, where, kMoment, false);
            if (kr && *kr < 0) { rd.error("out_of_range", ptr + "/kr", where, "must not be negative (got " + format_number(*kr) + ")"); supports_ok = false; }
            else if (kr) sup.kr = *kr; else supports_ok = false;
          }
        } else {
          if (s.contains("k")) { rd.error("conflicting_fields", ptr + "/k", where, "only a spring support takes a stiffness 'k' (this support is " + std::string(support_type_name(sup.type)) + ")"); supports_ok = false; }
          if (s.contains("kr")) { rd.error("conflicting_fields", ptr + "/kr", where, "only a spring support takes a rotational stiffness 'kr' (this support is " + std::string(support_type_name(sup.type)) + ")"); supports_ok = false; }
        }
        if (s.contains("settlement")) {
          // A number (acts once in every load set) or {"value": v, "case": C}
          // (belongs to load case C and is factored with it).
          double st = 0;
          bool st_ok = false;
          const json& sv = *s.find("settlement");
          if (sv.is_object()) {
            const std::string sptr = ptr + "/settlement";
            rd.check_keys(sv, sptr, where, {"value", "case"});
            if (auto v = rd.field(sv, "value", sptr, where, kLength, true)) { st = *v; st_ok = true; }
            if (auto c = sv.find("case"); c != sv.end()) {
              if (!c->is_string() || c->get<std::string>().empty() || has_control(c->get<std::string>())) {
                rd.error("control_characters", sptr + "/case", where, "must be a non-empty name of a load case, without control characters (" + got(*c) + ")");
                st_ok = false;
              } else {
                sup.settlement_case = c->get<std::string>();
              }
            }
          } else if (auto v = rd.field(s, "settlement", ptr, where, kLength, false)) {
            st = *v;
            st_ok = true;
          }
          if (st_ok && (sup.type == SupportType::Free || sup.type == SupportType::Guided)) {
            rd.error("unsupported_feature", ptr + "/settlement", where, std::string("a settlement needs a support that holds the node up; a ") +
                                                     support_type_name(sup.type) + " node is free to deflect");
            supports_ok = false;
          } else if (st_ok) sup.settlement = st;
          else supports_ok = false;
        }
        if (auto h = s.find("hinge"); h != s.end()) {
          if (!h->is_boolean()) { rd.error("wrong_type", ptr + "/hinge", where, "must be true or false (" + got(*h) + ")"); supports_ok = false; }
          else sup.hinge = h->get<bool>();
        }
        if (sup.hinge) {
          std::string why;
          if (i == 0 || i + 1 == it->size()) why = "a hinge releases the moment between two spans, so it can only be at an interior node";
          else if (sup.type == SupportType::Fixed) why = "a hinge on a fixed support leaves the fixity nothing to hold; use \"pinned\" with the hinge";
          else if (sup.type == SupportType::Guided) why = "a hinge on a guided support leaves the rotation restraint nothing to hold";
          else if (sup.type == SupportType::Spring && sup.kr > 0) why = "a hinge on a spring with a rotational stiffness 'kr' is ambiguous (which side does kr hold?)";
          if (!why.empty()) { rd.error("unsupported_feature", ptr + "/hinge", where, why); supports_ok = false; }
        }
      }
      if (type_ok && s.is_string() && sup.type == SupportType::Spring) {
        rd.error("missing_field", ptr, where, "a spring support needs its stiffness: {\"type\": \"spring\", \"k\": ...}");
        supports_ok = false;
      }
      beam.supports.push_back(sup);
    }
  }

  // labels
  beam.labels.clear();
  for (std::size_t i = 0; i < n_nodes && n_spans > 0; ++i) beam.labels.push_back(default_label(i));
  if (auto it = root.find("labels"); it != root.end()) {
    if (!it->is_array()) {
      rd.error("wrong_type", "/labels", "", "must be a list of node names (" + got(*it) + ")");
    } else if (n_spans > 0 && it->size() != n_nodes) {
      rd.error("wrong_count", "/labels", "", "must name every node: " + std::to_string(n_nodes) + " names for " +
                                  std::to_string(n_spans) + (n_spans == 1 ? " span" : " spans") + " (got " +
                                  std::to_string(it->size()) + ")");
    } else if (n_spans > 0) {
      std::map<std::string, std::size_t> seen;
      for (std::size_t i = 0; i < it->size(); ++i) {
        const json& l = (*it)[i];
        const std::string ptr = "/labels/" + std::to_string(i);
        const std::string where = "node " + std::to_string(i + 1);
        if (!l.is_string() || l.get<std::string>().empty()) {
          rd.error("wrong_type", ptr, where, "must be a non-empty string (" + got(l) + ")");
          continue;
        }
        const std::string name = l.get<std::string>();
        if (has_control(name)) {
          rd.error("control_characters", ptr, where, "a node name must not contain control characters (got \"" + printable(name, 60) + "\")");
          continue;
        }
        auto [p, fresh] = seen.emplace(name, i);
        if (!fresh) rd.error("duplicate", ptr, where, "the name '" + name + "' is already used by node " + std::to_string(p->second + 1));
        beam.labels[i] = name;
      }
    }
  }
  auto node_label = [&](std::size_t i) { return i < beam.labels.size() ? beam.labels[i] : default_label(i); };

  // stations_per_span
  if (auto it = root.find("stations_per_span"); it != root.end()) {
    if (!it->is_number_integer() && !it->is_number_unsigned()) {
      rd.error("wrong_type", "/stations_per_span", "", "must be a whole number from 1 to " + std::to_string(limits.max_stations_per_span) + " (" + got(*it) + ")");
    } else {
      const auto v = whole(*it);
      if (v < 1 || v > limits.max_stations_per_span)
        rd.error("out_of_range", "/stations_per_span", "", "must be from 1 to " + std::to_string(limits.max_stations_per_span) + " (got " + whole_text(*it) + ")");
      else beam.stations_per_span = static_cast<int>(v);
    }
  }
  if (spans_ok && n_spans * static_cast<std::size_t>(beam.stations_per_span + 1) > limits.max_stations)
    rd.error("limit", "/stations_per_span", "", "asks for " + std::to_string(n_spans * static_cast<std::size_t>(beam.stations_per_span + 1)) +
                                           " stations, more than the limit of " + std::to_string(limits.max_stations));

  // loads
  if (auto it = root.find("loads"); it != root.end()) {
    if (!it->is_array()) {
      rd.error("wrong_type", "/loads", "", "must be a list of loads (" + got(*it) + ")");
    } else if (it->size() > limits.max_loads) {
      rd.error("limit", "/loads", "", "has " + std::to_string(it->size()) + " loads, more than the limit of " + std::to_string(limits.max_loads));
    } else {
      beam.loads.reserve(it->size());
      for (std::size_t i = 0; i < it->size(); ++i) {
        const json& l = (*it)[i];
        const std::string ptr = "/loads/" + std::to_string(i);
        const std::string where = "load " + std::to_string(i + 1);
        if (!l.is_object()) { rd.error("wrong_type", ptr, where, "must be an object with a type (" + got(l) + ")"); continue; }
        Load load;
        auto t = l.find("type");
        if (t == l.end()) { rd.error("missing_field", ptr + "/type", where, "required field is missing (one of point, udl, linear, couple)"); continue; }
        if (!t->is_string()) { rd.error("wrong_type", ptr + "/type", where, "must be one of point, udl, linear, couple (" + got(*t) + ")"); continue; }
        const std::string type = t->get<std::string>();
        if (type == "point") load.type = LoadType::Point;
        else if (type == "udl") load.type = LoadType::Udl;
        else if (type == "linear") load.type = LoadType::Linear;
        else if (type == "couple") load.type = LoadType::Couple;
        else {
          std::string reason = "unknown load type '" + type + "'";
          if (auto d = did_you_mean(type, kLoadTypes)) reason += " (did you mean '" + *d + "'?)";
          else reason += " (one of point, udl, linear, couple)";
          rd.error("unknown_name", ptr + "/type", where, reason);
          continue;
        }
        std::vector<std::string> keys = {"type", "span", "node", "case"};
        switch (load.type) {
          case LoadType::Point: keys.insert(keys.end(), {"P", "at"}); break;
          case LoadType::Udl: keys.insert(keys.end(), {"w", "from", "to"}); break;
          case LoadType::Linear: keys.insert(keys.end(), {"w1", "w2", "from", "to"}); break;
          case LoadType::Couple: keys.insert(keys.end(), {"C", "at"}); break;
        }
        const std::size_t before = out.errors.size();
        rd.check_keys(l, ptr, where, keys);
        if (auto c = l.find("case"); c != l.end()) {
          if (!c->is_string() || c->get<std::string>().empty()) rd.error("wrong_type", ptr + "/case", where, "must be a non-empty name (" + got(*c) + ")");
          else if (has_control(c->get<std::string>()))
            rd.error("control_characters", ptr + "/case", where, "a case name must not contain control characters (got \"" + printable(c->get<std::string>(), 60) + "\")");
          else load.load_case = c->get<std::string>();
        }
        const bool has_span = l.contains("span"), has_node = l.contains("node");
        bool placed = false;
        auto index_of = [&](const char* key, std::size_t count, const char* what) -> std::optional<std::size_t> {
          const json& v = l[key];
          const std::string p = ptr + "/" + key;
          if (!v.is_number_integer() && !v.is_number_unsigned()) {
            rd.error("wrong_type", p, where, std::string("must be a ") + what + " number, 1 to " + std::to_string(count) + " (" + got(v) + ")");
            return std::nullopt;
          }
          const long long k = whole(v);
          if (k < 1 || static_cast<unsigned long long>(k) > count) {
            rd.error("no_such_item", p, where, std::string("there is no ") + what + " " + whole_text(v) + ": the beam has " +
                                   std::to_string(count) + " " + what + (count == 1 ? "" : "s") +
                                   ", numbered from 1");
            return std::nullopt;
          }
          return static_cast<std::size_t>(k - 1);
        };
        if (has_span && has_node) {
          rd.error("conflicting_fields", ptr, where, "give either 'span' or 'node', not both");
        } else if (!has_span && !has_node) {
          rd.error("missing_field", ptr + "/span", where, "required field is missing (the span number, or 'node' for a load at a node)");
        } else if (has_node) {
          if (load.type == LoadType::Udl || load.type == LoadType::Linear) {
            rd.error("conflicting_fields", ptr + "/node", where, std::string("a ") + type + " load acts along a span: give 'span' instead of 'node'");
          } else if (n_spans > 0) {
            load.on_node = true;  // (no position is asked for, even when the node number is wrong)
            if (auto k = index_of("node", n_nodes, "node")) { load.index = *k; placed = true; }
            if (l.contains("at")) { rd.error("conflicting_fields", ptr + "/at", where, "a load at a node has no position 'at'"); placed = false; }
          }
        } else if (n_spans > 0) {
          if (auto k = index_of("span", n_spans, "span")) { load.index = *k; placed = true; }
        }
        const double L = placed && !load.on_node ? beam.spans[load.index].length : 0.0;
        const bool L_known = placed && !load.on_node && spans_ok;
        auto position = [&](const char* key, double dflt, bool required) -> std::optional<double> {
          auto v = rd.field(l, key, ptr, where, kLength, required);
          if (!v) return l.contains(key) || required ? std::nullopt : std::optional<double>(dflt);
          if (L_known && (*v < 0 || *v > L)) {
            rd.error("out_of_range", ptr + "/" + key, where, "must be within the span, 0 to " + format_number(L) + " " + rd.units.length +
                                                 " (got " + format_number(*v) + ")");
            return std::nullopt;
          }
          return v;
        };
        switch (load.type) {
          case LoadType::Point: {
            auto P = rd.field(l, "P", ptr, where, kForce, true);
            if (P) load.P = *P;
            if (!load.on_node) { if (auto a = position("at", 0, true)) load.at = *a; }
            break;
          }
          case LoadType::Couple: {
            auto C = rd.field(l, "C", ptr, where, kMoment, true);
            if (C) load.C = *C;
            if (!load.on_node) { if (auto a = position("at", 0, true)) load.at = *a; }
            break;
          }
          case LoadType::Udl: {
            auto w = rd.field(l, "w", ptr, where, kLineLoad, true);
            if (w) load.w1 = load.w2 = *w;
            auto f = position("from", 0.0, false);
            auto to = position("to", L, false);
            if (f) load.from = *f;
            if (to) load.to = *to;
            break;
          }
          case LoadType::Linear: {
            auto w1 = rd.field(l, "w1", ptr, where, kLineLoad, true);
            auto w2 = rd.field(l, "w2", ptr, where, kLineLoad, true);
            if (w1) load.w1 = *w1;
            if (w2) load.w2 = *w2;
            auto f = position("from", 0.0, false);
            auto to = position("to", L, false);
            if (f) load.from = *f;
            if (to) load.to = *to;
            break;
          }
        }
        if (out.errors.size() != before || !placed) continue;
        if ((load.type == LoadType::Udl || load.type == LoadType::Linear) && !(load.from < load.to)) {
          rd.error("out_of_range", ptr + "/from", where, "'from' (" + format_number(load.from) + ") must be less than 'to' (" +
                                             format_number(load.to) + ")");
          continue;
        }
        // A distributed load shorter than 1e-12 of its span is a point load
        // written as a distributed one: its length is rounding of the span's
        // positions, and no method can integrate it without cancellation.
        // Refused, with what to write instead.
        if ((load.type == LoadType::Udl || load.type == LoadType::Linear) && spans_ok &&
            !(load.to - load.from > 1e-12 * L)) {
          rd.error("too_short", ptr + "/to", where, "the load is " + format_number(load.to - load.from) + " " + out.units.length +
                                           " long, below 1e-12 of its span (" + format_number(L) +
                                           "): give it as a point load of its resultant, or give it a length");
          continue;
        }
        // A point force exactly at a span end acts on the node.
        if (load.type == LoadType::Point && !load.on_node && spans_ok) {
          if (!(load.at > 0.0)) { load.on_node = true; load.index = load.index; load.at = 0; }
          else if (!(load.at < L)) { load.on_node = true; load.index = load.index + 1; load.at = 0; }
        }
        if (load.type == LoadType::Couple && n_nodes > 0) {
          std::size_t node = n_nodes;
          if (load.on_node) node = load.index;
          else if (spans_ok && !(load.at > 0.0)) node = load.index;
          else if (spans_ok && !(load.at < L)) node = load.index + 1;
          if (node < n_nodes) {
            if (supports_ok && beam.supports[node].hinge) {
              rd.error("unsupported_feature", ptr, where, "a couple cannot act at the hinge at node " + node_label(node) + " (the hinge carries no moment)");
              continue;
            }
          }
        }
        if (std::find(out.cases.begin(), out.cases.end(), load.load_case) == out.cases.end())
          out.cases.push_back(load.load_case);
        beam.loads.push_back(load);
      }
    }
  }
  // A settlement that names its case makes that case, even with no loads.
  for (const auto& sup : beam.supports)
    if (!sup.settlement_case.empty() &&
        std::find(out.cases.begin(), out.cases.end(), sup.settlement_case) == out.cases.end())
      out.cases.push_back(sup.settlement_case);
  if (out.cases.empty()) out.cases.push_back("loads");

  // moving loads: each a train of point loads at fixed distances from its
  // first point, a load set of its own.
  // Every moving load's name as read, with its index, also of one refused
  // for another reason: a combination or claim naming it then adds no
  // second error.
  std::vector<std::pair<std::string, std::size_t>> moving_names;
  if (auto it = root.find("moving_loads"); it != root.end()) {
    if (!it->is_array()) {
      rd.error("wrong_type", "/moving_loads", "", "must be a list of moving loads (" + got(*it) + ")");
    } else {
      for (std::size_t i = 0; i < it->size(); ++i) {
        const json& m = (*it)[i];
        const std::string ptr = "/moving_loads/" + std::to_string(i);
        const std::string where = "moving load " + std::to_string(i + 1);
        if (!m.is_object()) {
          rd.error("wrong_type", ptr, where, "must be an object with a name and points (" + got(m) + ")");
          continue;
        }
        const std::size_t before = out.errors.size();
        rd.check_keys(m, ptr, where, {"name", "points", "directions"});
        MovingLoad ml;
        ml.pointer = ptr;
        if (auto n = m.find("name"); n == m.end()) {
          if (!rd.misspelt(m, ptr, "name"))
            rd.error("missing_field", ptr + "/name", where, "required field is missing (a name of its own, e.g. \"crane\")");
        } else if (!n->is_string() || n->get<std::string>().empty()) {
          rd.error("wrong_type", ptr + "/name", where, "must be a non-empty name (" + got(*n) + ")");
        } else if (has_control(n->get<std::string>())) {
          rd.error("control_characters", ptr + "/name", where, "a name must not contain control characters (got \"" + printable(n->get<std::string>(), 60) + "\")");
        } else {
          ml.name = n->get<std::string>();
          if (std::find(out.cases.begin(), out.cases.end(), ml.name) != out.cases.end()) {
            rd.error("duplicate", ptr + "/name", where, "the name '" + ml.name + "' is already a load case's; a moving load needs a name of its own");
          } else {
            for (const auto& [other, k] : moving_names)
              if (other == ml.name) {
                rd.error("duplicate", ptr + "/name", where, "the name '" + ml.name + "' is used by another moving load (moving load " +
                                                         std::to_string(k + 1) + ")");
                break;
              }
          }
          moving_names.emplace_back(ml.name, i);
        }
        if (auto d = m.find("directions"); d != m.end()) {
          static const std::vector<std::string> kDirections = {"both", "forward"};
          if (!d->is_string()) {
            rd.error("wrong_type", ptr + "/directions", where, "must be \"both\" or \"forward\" (" + got(*d) + ")");
          } else if (d->get<std::string>() == "both") {
            ml.both_directions = true;
          } else if (d->get<std::string>() == "forward") {
            ml.both_directions = false;
          } else {
            std::string reason = "unknown direction '" + printable(d->get<std::string>(), 60) + "'";
            if (auto dm = did_you_mean(d->get<std::string>(), kDirections)) reason += " (did you mean '" + *dm + "'?)";
            else reason += " (\"both\", the default: the train as listed and reversed; \"forward\": only as listed, each point at its offset to the right of the first)";
            rd.error("unknown_name", ptr + "/directions", where, reason);
          }
        }
        auto pts = m.find("points");
        if (pts == m.end()) {
          if (!rd.misspelt(m, ptr, "points"))
            rd.error("missing_field", ptr + "/points", where,
                   "required field is missing (a list of {\"P\": force, \"offset\": distance from the first point})");
        } else if (!pts->is_array()) {
          rd.error("wrong_type", ptr + "/points", where, "must be a list of {\"P\": force, \"offset\": distance from the first point} (" + got(*pts) + ")");
        } else if (pts->empty()) {
          rd.error("wrong_count", ptr + "/points", where, "must have at least one point");
        } else if (pts->size() > limits.max_moving_points) {
          rd.error("limit", ptr + "/points", where, "has " + std::to_string(pts->size()) + " points, more than the limit of " +
                                                  std::to_string(limits.max_moving_points) + " per moving load");
        } else {
          bool points_ok = true;
          for (std::size_t k = 0; k < pts->size(); ++k) {
            const json& p = (*pts)[k];
            const std::string pp = ptr + "/points/" + std::to_string(k);
            if (!p.is_object()) {
              rd.error("wrong_type", pp, where, "must be an object {\"P\": force, \"offset\": distance from the first point} (" + got(p) + ")");
              points_ok = false;
              continue;
            }
            const std::size_t point_before = out.errors.size();
            rd.check_keys(p, pp, where, {"P", "offset"});
            MovingPoint mp;
            if (auto P = rd.field(p, "P", pp, where, kForce, true)) mp.P = *P;
            if (auto o = rd.field(p, "offset", pp, where, kLength, true)) {
              if (*o < 0) rd.error("out_of_range", pp + "/offset", where, "must be 0 or more (got " + format_number(*o) + ")");
              else mp.offset = *o;
            }
            if (out.errors.size() != point_before) points_ok = false;
            ml.points.push_back(mp);
          }
          // The train as a whole, once every point reads.
          if (points_ok) {
            if (ml.points.front().offset > 0)
              rd.error("bad_train", ptr + "/points/0/offset", where,
                       "the first point's offset must be 0: offsets are measured from the train's first point (got " +
                           format_number(ml.points.front().offset) + ")");
            for (std::size_t k = 1; k < ml.points.size(); ++k)
              if (!(ml.points[k].offset > ml.points[k - 1].offset))
                rd.error("bad_train", ptr + "/points/" + std::to_string(k) + "/offset", where,
                         "offsets must increase along the train, each point farther from the first than the one before (got " +
                             format_number(ml.points[k].offset) + " after " + format_number(ml.points[k - 1].offset) + ")");
            bool any = false;
            for (const auto& mp : ml.points) any = any || mp.P > 0 || mp.P < 0;
            if (!any) rd.error("bad_train", ptr + "/points", where, "every point's P is 0: a moving load needs at least one load that is not 0");
          }
        }
        if (out.errors.size() == before) out.moving_loads.push_back(std::move(ml));
      }
    }
  }
  auto is_moving = [&](const std::string& name) {
    for (const auto& mn : moving_names)
      if (mn.first == name) return true;
    return false;
  };
  std::vector<std::string> moving_list;  // the names, for messages
  for (const auto& mn : moving_names)
    if (std::find(moving_list.begin(), moving_list.end(), mn.first) == moving_list.end()) moving_list.push_back(mn.first);

  // combinations
  if (auto it = root.find("combinations"); it != root.end()) {
    if (!it->is_array()) {
      rd.error("wrong_type", "/combinations", "", "must be a list of combinations (" + got(*it) + ")");
    } else {
      std::set<std::string> names;
      auto add = [&](Combination c, const std::string& ptr, const std::string& where) {
        if (std::find(out.cases.begin(), out.cases.end(), c.name) != out.cases.end()) {
          rd.error("duplicate", ptr + "/name", where, "the name '" + c.name + "' is already a load case's; a combination needs a name of its own");
          return;
        }
        for (const auto& [mn, k] : moving_names)
          if (mn == c.name) {
            rd.error("duplicate", ptr + "/name", where, "the name '" + c.name + "' is already a moving load's (moving load " +
                                                     std::to_string(k + 1) + "); a combination needs a name of its own");
            return;
          }
        if (!names.insert(c.name).second) {
          rd.error("duplicate", ptr + "/name", where, "the name '" + c.name + "' is used by another combination");
          return;
        }
        out.combinations.push_back(std::move(c));
      };
      for (std::size_t i = 0; i < it->size(); ++i) {
        const json& c = (*it)[i];
        const std::string ptr = "/combinations/" + std::to_string(i);
        const std::string where = "combination " + std::to_string(i + 1);
        if (!c.is_object()) { rd.error("wrong_type", ptr, where, "must be an object with a name and factors (" + got(c) + ")"); continue; }
        const std::size_t before = out.errors.size();
        std::string name;
        if (auto n = c.find("name"); n == c.end()) {
          if (!c.contains("preset")) rd.error("missing_field", ptr + "/name", where, "required field is missing");
        }
        else if (!n->is_string() || n->get<std::string>().empty()) rd.error("wrong_type", ptr + "/name", where, "must be a non-empty name (" + got(*n) + ")");
        else if (has_control(n->get<std::string>()))
          rd.error("control_characters", ptr + "/name", where, "a name must not contain control characters (got \"" + printable(n->get<std::string>(), 60) + "\")");
        else name = n->get<std::string>();
        // `moving`: a moving load may be named here too (a combination's
        // factors, not a preset's cases).
        auto known_case = [&](const std::string& cs, const std::string& p, bool moving = false) {
          if (std::find(out.cases.begin(), out.cases.end(), cs) != out.cases.end()) return true;
          moving = moving && !moving_list.empty();
          std::vector<std::string> known = out.cases;
          if (moving) known.insert(known.end(), moving_list.begin(), moving_list.end());
          std::string reason = std::string("there is no load case ") + (moving ? "or moving load " : "") + "'" + cs + "'";
          if (auto d = did_you_mean(cs, known)) reason += " (did you mean '" + *d + "'?)";
          else {
            reason += " (cases: ";
            for (std::size_t k = 0; k < out.cases.size(); ++k) reason += (k ? ", " : "") + out.cases[k];
            if (moving) {
              reason += "; moving loads: ";
              for (std::size_t k = 0; k < moving_list.size(); ++k) reason += (k ? ", " : "") + moving_list[k];
            }
            reason += ")";
          }
          rd.error("no_such_item", p, where, reason);
          return false;
        };
        if (c.contains("preset")) {
          // Factor sets of design standards, with the user's case names.
          rd.check_keys(c, ptr, where, {"name", "preset", "cases", "arrangements"});
          const json& pr = c["preset"];
          const std::string preset = pr.is_string() ? pr.get<std::string>() : "";
          const auto& pn = preset_names();
          if (std::find(pn.begin(), pn.end(), preset) == pn.end()) {
            std::string reason = "unknown preset '" + (pr.is_string() ? preset : std::string(type_of(pr))) + "'";
            if (auto d = did_you_mean(preset, pn)) reason += " (did you mean '" + *d + "'?)";
            else reason += " (one of asce7-strength, en1990-6.10)";
            rd.error("unknown_name", ptr + "/preset", where, reason);
            continue;
          }
          const bool asce = preset == "asce7-strength";
          const std::vector<std::string> roles = asce ? std::vector<std::string>{"D", "L"} : std::vector<std::string>{"G", "Q"};
          std::map<std::string, std::string> map;
          auto cs = c.find("cases");
          if (cs == c.end() || !cs->is_object()) {
            rd.error("missing_field", ptr + "/cases", where, std::string("required: which of your load cases is ") +
                                                (asce ? "D (dead) and L (live), e.g. {\"D\": \"dead\", \"L\": \"live\"}"
                                                      : "G (permanent) and Q (variable), e.g. {\"G\": \"dead\", \"Q\": \"live\"}"));
            continue;
          }
          rd.check_keys(*cs, ptr + "/cases", where, roles);
          for (const auto& r : roles) {
            auto f = cs->find(r);
            if (f == cs->end()) { rd.error("missing_field", ptr + "/cases/" + r, where, "required field is missing (the name of your load case)"); continue; }
            if (!f->is_string()) { rd.error("wrong_type", ptr + "/cases/" + r, where, "must be the name of a load case (" + got(*f) + ")"); continue; }
            if (known_case(f->get<std::string>(), ptr + "/cases/" + r)) map[r] = f->get<std::string>();
          }
          Arrangements arr = Arrangements::All;
          if (auto a = c.find("arrangements"); a != c.end()) {
            if (a->is_string() && a->get<std::string>() == "all") arr = Arrangements::All;
            else if (a->is_string() && a->get<std::string>() == "adjacent-and-alternate") arr = Arrangements::AdjacentAndAlternate;
            else rd.error("wrong_type", ptr + "/arrangements", where, "must be \"all\" or \"adjacent-and-alternate\" (" + got(*a) + ")");
          }
          if (out.errors.size() != before) continue;
          const std::string base = name.empty() ? preset : name;
          if (asce) {
            // ASCE/SEI 7-16, "Minimum Design Loads and Associated Criteria for Buildings and Other
            // Structures", section 2.3.1, combinations 1 and 2 with dead and live load only
            // (from memory): 1.4D; 1.2D + 1.6L.
            const std::string src = "ASCE/SEI 7-16, section 2.3.1, combinations 1 and 2 (from memory)";
            Combination c1{base + " 1.4D", ptr, {{map["D"], Factor{1.4, 1.4, false}}}, {}, arr, src, false, {}, std::nullopt};
            Combination c2{base + " 1.2D+1.6L", ptr, {{map["D"], Factor{1.2, 1.2, false}}, {map["L"], Factor{1.6, 1.6, false}}}, {map["L"]}, arr, src, false, {}, std::nullopt};
            add(c1, ptr, where);
            add(c2, ptr, where);
          } else {
            // EN 1990:2002 + A1:2005, expression (6.10) with Table A1.2(B): permanent actions
            // 1.35 unfavourable / 1.00 favourable, the leading variable action 1.5 where
            // unfavourable, 0 where favourable (from memory).
            const std::string src = "EN 1990:2002+A1:2005, expression (6.10), Table A1.2(B) (from memory)";
            Combination c1{base, ptr, {{map["G"], Factor{1.0, 1.35, true}}, {map["Q"], Factor{1.5, 1.5, false}}}, {map["Q"]}, arr, src, false, {}, std::nullopt};
            add(c1, ptr, where);
          }
          continue;
        }
        rd.check_keys(c, ptr, where, {"name", "factors", "pattern", "arrangements", "deflection_limit"});
        Combination comb;
        comb.name = name;
        comb.pointer = ptr;
        if (auto dl = c.find("deflection_limit"); dl != c.end())
          comb.limit_set = rd.deflection_limit(*dl, ptr + "/deflection_limit", where, false, comb.deflection_limit, nullptr);
        auto fs = c.find("factors");
        if (fs == c.end()) rd.error("missing_field", ptr + "/factors", where, "required field is missing (load case -> factor, e.g. {\"dead\": 1.2, \"live\": 1.6})");
        else if (!fs->is_object() || fs->empty()) rd.error("wrong_type", ptr + "/factors", where, "must be an object of load case -> factor (" + got(*fs) + ")");
        else {
          for (auto f = fs->begin(); f != fs->end(); ++f) {
            const std::string p = ptr + "/factors/" + escape_key(f.key());
            auto number = [&](const json& v, const std::string& pp) -> std::optional<double> {
              if (!v.is_number() || !std::isfinite(v.get<double>())) { rd.error("wrong_type", pp, where, "must be a number (" + got(v) + ")"); return std::nullopt; }
              return v.get<double>();
            };
            if (is_moving(f.key())) {
              // A moving load: one factor, at most one moving load.
              if (f->is_array()) {
                rd.error("bad_factor_range", p, where, "a moving load takes one factor, not a range: give one number");
                continue;
              }
              auto v = number(*f, p);
              if (!v) continue;
              if (comb.moving) {
                rd.error("conflicting_fields", p, where, "a combination takes at most one moving load ('" + comb.moving->first +
                                                       "' is already in it): put each moving load in a combination of its own");
                continue;
              }
              comb.moving = std::make_pair(f.key(), *v);
              continue;
            }
            if (!known_case(f.key(), p, true)) continue;
            Factor fac;
            if (f->is_array()) {
              if (f->size() != 2) { rd.error("bad_factor_range", p, where, "a factor range is [low, high] (got " + std::to_string(f->size()) + " numbers)"); continue; }
              auto lo = number((*f)[0], p + "/0"), hi = number((*f)[1], p + "/1");
              if (!lo || !hi) continue;
              if (*lo > *hi) { rd.error("bad_factor_range", p, where, "a factor range is [low, high]: " + format_number(*lo) + " is greater than " + format_number(*hi)); continue; }
              fac = Factor{*lo, *hi, true};
            } else {
              auto v = number(*f, p);
              if (!v) continue;
              fac = Factor{*v, *v, false};
            }
            comb.factors.push_back({f.key(), fac});
          }
        }
        if (auto pt = c.find("pattern"); pt != c.end()) {
          if (!pt->is_array()) rd.error("wrong_type", ptr + "/pattern", where, "must be a list of load cases placed span by span (" + got(*pt) + ")");
          else
            for (std::size_t k = 0; k < pt->size(); ++k) {
              const json& v = (*pt)[k];
              const std::string p = ptr + "/pattern/" + std::to_string(k);
              if (!v.is_string()) { rd.error("wrong_type", p, where, "must be the name of a load case (" + got(v) + ")"); continue; }
              const std::string cs = v.get<std::string>();
              if (is_moving(cs)) {
                rd.error("conflicting_fields", p, where, "'" + cs + "' is a moving load: it is placed by moving it along the beam, not span by span; remove it from the pattern");
                continue;
              }
              bool in = false;
              for (const auto& f : comb.factors) in = in || f.first == cs;
              if (!in) { rd.error("conflicting_fields", p, where, "the patterned case '" + cs + "' has no factor in this combination"); continue; }
              comb.pattern.push_back(cs);
            }
        }
        if (auto a = c.find("arrangements"); a != c.end()) {
          if (a->is_string() && a->get<std::string>() == "all") comb.arrangements = Arrangements::All;
          else if (a->is_string() && a->get<std::string>() == "adjacent-and-alternate") comb.arrangements = Arrangements::AdjacentAndAlternate;
          else rd.error("wrong_type", ptr + "/arrangements", where, "must be \"all\" or \"adjacent-and-alternate\" (" + got(*a) + ")");
          if (comb.pattern.empty()) rd.error("conflicting_fields", ptr + "/arrangements", where, "arrangements need a \"pattern\" (the cases placed span by span)");
        }
        // A moving load with a pattern or a factor range: not supported (yet).
        if (comb.moving) {
          const std::string what = "a combination with a moving load ('" + comb.moving->first + "') and ";
          const std::string instead = " is not supported (yet): split it into two combinations, one with the moving load and one with the ";
          if (!comb.pattern.empty())
            rd.error("unsupported_feature", ptr + "/pattern", where, what + "a pattern" + instead + "pattern");
          for (const auto& [cs, f] : comb.factors)
            if (f.range)
              rd.error("unsupported_feature", ptr + "/factors/" + escape_key(cs), where,
                       what + "a factor range (on '" + cs + "')" + instead + "factor range");
        }
        if (out.errors.size() == before) add(comb, ptr, where);
      }
    }
  }

  // The beam's deflection limit, and the load sets it is for.
  if (auto dl = root.find("deflection_limit"); dl != root.end()) {
    std::vector<std::string> sets;
    if (rd.deflection_limit(*dl, "/deflection_limit", "", true, out.deflection_limit, &sets)) {
      std::vector<std::string> known = out.cases;
      for (const auto& cb : out.combinations) known.push_back(cb.name);
      known.insert(known.end(), moving_list.begin(), moving_list.end());
      for (std::size_t i = 0; i < sets.size(); ++i)
        if (std::find(known.begin(), known.end(), sets[i]) == known.end()) {
          std::string reason = std::string(moving_list.empty() ? "there is no load case or combination '" : "there is no load case, combination or moving load '") +
                               printable(sets[i], 60) + "'";
          if (auto d = did_you_mean(sets[i], known)) reason += " (did you mean '" + *d + "'?)";
          rd.error("no_such_item", "/deflection_limit/load_sets/" + std::to_string(i), "", reason);
        }
      out.deflection_limit_sets = std::move(sets);
    }
  }

  // Load sets and stations in all (each load set has its own stations).
  {
    const std::size_t sets = out.cases.size() + out.combinations.size() + out.moving_loads.size();
    const std::size_t along = spans_ok ? n_spans * static_cast<std::size_t>(beam.stations_per_span + 1) : 0;
    const std::size_t per_set = along + beam.loads.size();
    // Where the count is reported: the last list that adds load sets.
    const char* set_list = !out.combinations.empty() ? "/combinations" : !out.moving_loads.empty() ? "/moving_loads" : "/loads";
    if (sets > limits.max_load_sets)
      rd.error("limit", set_list, "",
               "has " + std::to_string(out.cases.size()) + " load cases" +
                   (out.moving_loads.empty() ? std::string(" and ") : ", " + std::to_string(out.moving_loads.size()) + " moving loads and ") +
                   std::to_string(out.combinations.size()) +
                   " combinations, more than the limit of " + std::to_string(limits.max_load_sets) + " load sets");
    else if (spans_ok && along <= limits.max_stations && per_set * sets > limits.max_stations)
      rd.error("limit", sets > 1 ? set_list : "/loads", "",
               "asks for " + std::to_string(per_set * sets) + " stations in all (" + std::to_string(per_set) + " in each of " +
                   std::to_string(sets) + (sets == 1 ? " load set" : " load sets") + "), more than the limit of " +
                   std::to_string(limits.max_stations));
  }

  // claims
  if (auto it = root.find("claims"); it != root.end()) {
    if (!it->is_object()) {
      rd.error("wrong_type", "/claims", "", "must be an object with \"values\" (and optionally \"tolerance\") (" + got(*it) + ")");
    } else {
      rd.check_keys(*it, "/claims", "", {"tolerance", "values"});
      auto read_tol = [&](const json& v, const std::string& p, const std::string& w) -> std::optional<Tolerance> {
        if (v.is_number()) {
          const double d = v.get<double>();
          if (!std::isfinite(d) || d < 0) { rd.error("out_of_range", p, w, "must be a percentage such as \"1%\" or an absolute value >= 0 (got " + format_number(d) + ")"); return std::nullopt; }
          return Tolerance{false, d};
        }
        if (v.is_string()) {
          std::string reason;
          auto t = parse_tolerance_text(v.get<std::string>(), &reason);
          if (!t) rd.error("wrong_type", p, w, reason);
          return t;
        }
        rd.error("wrong_type", p, w, "must be a percentage such as \"1%\" or an absolute value such as 0.05 (" + got(v) + ")");
        return std::nullopt;
      };
      if (auto t = it->find("tolerance"); t != it->end()) {
        if (auto tol = read_tol(*t, "/claims/tolerance", "")) out.claim_tolerance = *tol;
      }
      auto values = it->find("values");
      if (values == it->end()) {
        rd.error("missing_field", "/claims/values", "", "required field is missing (a list of claimed values)");
      } else if (!values->is_array()) {
        rd.error("wrong_type", "/claims/values", "", "must be a list of claimed values (" + got(*values) + ")");
      } else {
        for (std::size_t i = 0; i < values->size(); ++i) {
          const json& c = (*values)[i];
          const std::string ptr = "/claims/values/" + std::to_string(i);
          const std::string where = "claim " + std::to_string(i + 1);
          if (!c.is_object()) { rd.error("wrong_type", ptr, where, "must be an object with quantity and value (" + got(c) + ")"); continue; }
          rd.check_keys(c, ptr, where, {"quantity", "node", "x", "span", "side", "case", "value", "tolerance", "note"});
          Claim claim;
          claim.pointer = ptr;
          const std::size_t before = out.errors.size();
          auto q = c.find("quantity");
          if (q == c.end()) { rd.error("missing_field", ptr + "/quantity", where, "required field is missing"); continue; }
          if (!q->is_string()) { rd.error("wrong_type", ptr + "/quantity", where, "must be a quantity name (" + got(*q) + ")"); continue; }
          const std::string qn = q->get<std::string>();
          const auto qi = claim_quantity(qn, c.contains("span"), c.contains("node") || c.contains("x"));
          if (!qi) {
            std::string reason = "unknown quantity '" + qn + "'";
            if (auto d = did_you_mean(qn, kQuantities)) reason += " (did you mean '" + *d + "'?)";
            else { reason += " (one of "; for (std::size_t k = 0; k < kQuantities.size(); ++k) reason += (k ? ", " : "") + kQuantities[k]; reason += ")"; }
            rd.error("unknown_name", ptr + "/quantity", where, reason);
            continue;
          }
          claim.quantity = *qi;
          if (qn != quantity_name(claim.quantity)) claim.written = qn;
          const bool has_node = c.contains("node"), has_x = c.contains("x"), has_span = c.contains("span");
          const bool by_span = claim.quantity == Quantity::MaxMoment || claim.quantity == Quantity::MinMoment ||
                               claim.quantity == Quantity::MaxDeflection;
          const bool by_node_only = claim.quantity == Quantity::Reaction || claim.quantity == Quantity::ReactionMoment ||
                                    claim.quantity == Quantity::ReactionMax || claim.quantity == Quantity::ReactionMin;
          if (by_span) {
            if (!has_span) rd.error("missing_field", ptr + "/span", where, std::string("required field is missing (") + qn + " is taken over a span)");
            if (has_node || has_x) rd.error("conflicting_fields", ptr, where, std::string(qn) + " is taken over a span: give 'span', not 'node' or 'x'");
            if (has_span) {
              const json& v = c["span"];
              if (!v.is_number_integer() && !v.is_number_unsigned()) rd.error("wrong_type", ptr + "/span", where, "must be a span number (" + got(v) + ")");
              else {
                const long long k = whole(v);
                if (k < 1 || static_cast<std::size_t>(k) > n_spans) rd.error("no_such_item", ptr + "/span", where, "there is no span " + whole_text(v) + ": the beam has " + std::to_string(n_spans) + " spans, numbered from 1");
                else claim.span = static_cast<std::size_t>(k - 1);
              }
            }
          } else {
            if (has_span) rd.error("conflicting_fields", ptr + "/span", where, std::string("'span' is for max_moment, min_moment and max_deflection; give 'node' or 'x' for ") + qn);
            if (has_node && has_x) rd.error("conflicting_fields", ptr, where, "give either 'node' or 'x', not both");
            else if (!has_node && !has_x) rd.error("missing_field", ptr + "/node", where, by_node_only ? "required field is missing (the node's label or number)" : "required field is missing (give 'node' or 'x')");
            else if (has_x && by_node_only) rd.error("conflicting_fields", ptr + "/x", where, std::string(qn) + " is taken at a node: give 'node'");
            else if (has_node) {
              const json& v = c["node"];
              if (v.is_string()) {
                auto f = std::find(beam.labels.begin(), beam.labels.end(), v.get<std::string>());
                if (f == beam.labels.end()) {
                  std::string reason = "there is no node '" + v.get<std::string>() + "'";
                  if (auto d = did_you_mean(v.get<std::string>(), beam.labels)) reason += " (did you mean '" + *d + "'?)";
                  rd.error("no_such_item", ptr + "/node", where, reason);
                } else claim.node = static_cast<std::size_t>(f - beam.labels.begin());
              } else if (v.is_number_integer() || v.is_number_unsigned()) {
                const long long k = whole(v);
                if (k < 1 || static_cast<std::size_t>(k) > n_nodes) rd.error("no_such_item", ptr + "/node", where, "there is no node " + whole_text(v) + ": the beam has " + std::to_string(n_nodes) + " nodes, numbered from 1");
                else claim.node = static_cast<std::size_t>(k - 1);
              } else rd.error("wrong_type", ptr + "/node", where, "must be a node label or number (" + got(v) + ")");
            } else {
              auto x = rd.field(c, "x", ptr, where, kLength, true);
              if (x) {
                double total = 0;
                for (const auto& s : beam.spans) total += s.length;
                if (spans_ok && (*x < 0 || *x > total)) rd.error("out_of_range", ptr + "/x", where, "must be on the beam, 0 to " + format_number(total) + " " + rd.units.length + " (got " + format_number(*x) + ")");
                else claim.x = *x;
              }
            }
          }
          if (auto nt = c.find("note"); nt != c.end() && !nt->is_string())
            rd.error("wrong_type", ptr + "/note", where, "must be a string (" + got(*nt) + ")");
          if (auto s = c.find("side"); s != c.end()) {
            if (s->is_string() && s->get<std::string>() == "left") claim.side = Side::Left;
            else if (s->is_string() && s->get<std::string>() == "right") claim.side = Side::Right;
            else rd.error("wrong_type", ptr + "/side", where, "must be \"left\" or \"right\" (" + got(*s) + ")");
          }
          if (auto cs = c.find("case"); cs != c.end()) {
            if (!cs->is_string() || cs->get<std::string>().empty()) rd.error("wrong_type", ptr + "/case", where, "must be the name of a load case (" + got(*cs) + ")");
            else claim.load_case = cs->get<std::string>();
          }
          auto v = rd.field(c, "value", ptr, where, quantity_dimension(claim.quantity), true);
          if (v) claim.value = *v;
          if (auto t = c.find("tolerance"); t != c.end()) claim.tolerance = read_tol(*t, ptr + "/tolerance", where);
          if (out.errors.size() == before) out.claims.push_back(claim);
        }
      }
    }
  }
  std::vector<std::string> sets = out.cases;
  for (const auto& cb : out.combinations) sets.push_back(cb.name);
  sets.insert(sets.end(), moving_list.begin(), moving_list.end());
  for (const auto& c : out.claims) {
    if (c.load_case.empty() && sets.size() > 1) {
      rd.error("missing_field", c.pointer + "/case", where_of(c.pointer),
               "required field is missing: the file has " + std::to_string(sets.size()) +
                   (moving_list.empty() ? " load cases and combinations" : " load cases, combinations and moving loads") +
                   ", so a claim must name its \"case\"");
      continue;
    }
    const Combination* comb = nullptr;
    for (const auto& cb : out.combinations)
      if (cb.name == c.load_case) comb = &cb;
    // A moving load is an envelope load set (over the train's positions).
    const bool envelope = (comb && comb->is_envelope()) || is_moving(c.load_case);
    if (is_envelope_quantity(c.quantity) && !envelope) {
      const std::string name = c.written.empty() ? std::string(quantity_name(c.quantity))
                                                 : c.written + " (read as " + quantity_name(c.quantity) + ")";
      rd.error("conflicting_fields", c.pointer + "/quantity", where_of(c.pointer),
               name + " is an envelope value: name a combination with a pattern or a factor range" +
                   (moving_list.empty() ? "" : ", a moving load or a combination that names one,") + " in \"case\"" +
                   (c.quantity == Quantity::MomentMax || c.quantity == Quantity::MomentMin
                        ? "; for a load case, claim moment at the point, or max_moment or min_moment over a span"
                        : ""));
      continue;
    }
    // An envelope takes its values at a point (moment_max ... reaction_min)
    // and its span extremes (the largest moment_max, the smallest
    // moment_min, the largest deflection of a span).
    const bool over_span = c.quantity == Quantity::MaxMoment || c.quantity == Quantity::MinMoment ||
                           c.quantity == Quantity::MaxDeflection;
    if (envelope && !is_envelope_quantity(c.quantity) && !over_span) {
      rd.error("conflicting_fields", c.pointer + "/quantity", where_of(c.pointer),
               "'" + c.load_case + "' is an envelope: claim moment_max, moment_min, shear_max, shear_min, reaction_max or "
               "reaction_min at a point, or max_moment, min_moment or max_deflection over a span");
      continue;
    }
    if (!c.load_case.empty() && std::find(sets.begin(), sets.end(), c.load_case) == sets.end()) {
      std::string reason = "there is no load case '" + c.load_case + "'";
      if (auto d = did_you_mean(c.load_case, sets)) reason += " (did you mean '" + *d + "'?)";
      else { reason += " (cases: "; for (std::size_t k = 0; k < sets.size(); ++k) reason += (k ? ", " : "") + sets[k]; reason += ")"; }
      rd.error("no_such_item", c.pointer + "/case", where_of(c.pointer), reason);
    }
  }

  // Stability, once the structure itself is readable.
  if (out.errors.empty() && spans_ok && supports_ok) {
    if (auto m = find_mechanism(beam)) {
      rd.error("mechanism", "/supports", "", "the beam is unstable: " + m->description +
                                    " (add a support or remove a hinge)");
    }
  }
  // The work of each envelope, counted before anything is allocated for it.
  if (out.errors.empty()) envelope_limit_errors(out, beam.stations_per_span, limits, out.errors);
  return out;
}

namespace {

// The envelopes of `file` that would read more share values (shares x
// stations) than the limit allows with `per_span` stations per span.
// a * b, or the largest size_t when it would pass it.
std::size_t times(std::size_t a, std::size_t b) {
  return a != 0 && b > std::numeric_limits<std::size_t>::max() / a ? std::numeric_limits<std::size_t>::max() : a * b;
}

void envelope_limit_errors(const BeamFile& file, int per_span, const Limits& limits, std::vector<Error>& out) {
  const std::size_t n = file.beam.spans.size();
  const std::size_t stations = n * (static_cast<std::size_t>(per_span) + 1) + 2 * file.beam.loads.size();
  // A moving load is read, per method, at 4 values for each piece of the
  // beam between stations (spans x stations per span of them) at every
  // station: 4 x pieces x stations.
  const std::size_t pieces = times(n, static_cast<std::size_t>(per_span));
  const std::size_t moving_values = times(times(4, pieces), stations);
  // `shares`: the combination's other shares (0 for the moving load alone).
  auto moving_reason = [&](const std::string& what, const std::string& name, std::size_t shares, std::size_t values) {
    return what + " reads the moving load '" + name + "' at 4 x " + std::to_string(pieces) + " pieces of the beam (" +
           std::to_string(n) + (n == 1 ? " span" : " spans") + " x " + std::to_string(per_span) +
           " stations per span) at about " + std::to_string(stations) + " stations each" +
           (shares ? " and " + std::to_string(shares) + (shares == 1 ? " share" : " shares") + " of its cases at each station" : std::string()) +
           " (" + std::to_string(values) + " values), more than the limit of " + std::to_string(limits.max_envelope_values) +
           ": use fewer stations per span, or check the beam in parts";
  };
  for (std::size_t m = 0; m < file.moving_loads.size(); ++m) {
    const MovingLoad& ml = file.moving_loads[m];
    if (moving_values > limits.max_envelope_values)
      out.push_back({ml.pointer.empty() ? "/moving_loads/" + std::to_string(m) : ml.pointer,
                     "moving load " + std::to_string(m + 1), moving_reason("this envelope", ml.name, 0, moving_values),
                     "input.limit"});
  }
  for (std::size_t c = 0; c < file.combinations.size(); ++c) {
    const Combination& comb = file.combinations[c];
    if (!comb.is_envelope()) continue;
    if (comb.moving) {
      // Its cases (one share each: no pattern or range goes with a moving
      // load) plus the moving load.
      const std::size_t shares = 1 + comb.factors.size();
      const std::size_t sum = times(shares, stations) + moving_values;
      const std::size_t values = sum < moving_values ? std::numeric_limits<std::size_t>::max() : sum;
      if (values > limits.max_envelope_values)
        out.push_back({comb.pointer.empty() ? "/combinations/" + std::to_string(c) : comb.pointer,
                       "combination " + std::to_string(c + 1), moving_reason("this combination", comb.moving->first, shares, values),
                       "input.limit"});
      continue;
    }
    std::size_t shares = 1;  // the settlements that name no case
    for (const auto& [cs, f] : comb.factors) {
      const bool patterned = std::find(comb.pattern.begin(), comb.pattern.end(), cs) != comb.pattern.end();
      if (!patterned) { ++shares; continue; }
      std::vector<char> loaded(n, 0);
      for (const auto& l : file.beam.loads)
        if (l.load_case == cs && !l.on_node && l.index < n) loaded[l.index] = 1;
      shares += 1 + static_cast<std::size_t>(std::count(loaded.begin(), loaded.end(), 1));
    }
    const std::size_t values = shares * stations;
    if (values > limits.max_envelope_values)
      out.push_back({comb.pointer.empty() ? "/combinations/" + std::to_string(c) : comb.pointer,
                     "combination " + std::to_string(c + 1),
                     "this envelope reads " + std::to_string(shares) + " shares at about " + std::to_string(stations) +
                         " stations each (" + std::to_string(values) + " values), more than the limit of " +
                         std::to_string(limits.max_envelope_values) +
                         ": use fewer stations per span, or check the beam in parts",
                     "input.limit"});
  }
}

}  // namespace

std::optional<Error> station_limit_error(const BeamFile& file, int per_span, const Limits& limits) {
  if (per_span < 1) return std::nullopt;
  const std::size_t sets = file.cases.size() + file.combinations.size() + file.moving_loads.size();
  const std::size_t along = file.beam.spans.size() * (static_cast<std::size_t>(per_span) + 1);
  const std::size_t per_set = along + file.beam.loads.size();
  if (along <= limits.max_stations && per_set * std::max<std::size_t>(sets, 1) <= limits.max_stations) {
    std::vector<Error> env;
    envelope_limit_errors(file, per_span, limits, env);
    if (env.empty()) return std::nullopt;
    return env.front();
  }
  return Error{"/stations_per_span", "",
               "with " + std::to_string(per_span) + " stations per span the beam asks for " +
                   std::to_string(per_set * std::max<std::size_t>(sets, 1)) + " stations in all, more than the limit of " +
                   std::to_string(limits.max_stations),
               "input.limit"};
}

BeamFile read_beam_file(const std::string& path, const Limits& limits, std::string* text_out) {
  auto failed = [&](const std::string& why) {
    BeamFile out;
    out.path = path;
    out.errors.push_back({"", "", why, "input.file"});
    return out;
  };
  // POSIX calls, not a stream: one open, one fstat, the reads, one close.
  // O_NONBLOCK: opening a named pipe does not wait for a writer (fstat then
  // tells what it is); it changes nothing for a regular file.
  const int fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC | O_NONBLOCK | O_NOCTTY);
  if (fd < 0) {
    std::error_code ec;
    const auto st = std::filesystem::status(path, ec);
    if (ec || !std::filesystem::exists(st)) {
      const auto link = std::filesystem::symlink_status(path, ec);
      return failed(!ec && std::filesystem::is_symlink(link) ? "a symbolic link to nothing (or a loop of links); nothing to read"
                                                             : "cannot open the file for reading (it does not exist)");
    }
    if (std::filesystem::is_directory(st)) return failed("is a directory, not a beam file");
    if (std::filesystem::is_socket(st)) return failed("is not a regular file (a socket); trivet reads beam files only");
    return failed("cannot open the file for reading");
  }
  struct stat st{};
  if (::fstat(fd, &st) != 0) {
    ::close(fd);
    return failed("cannot read the file");
  }
  if (!S_ISREG(st.st_mode)) {
    ::close(fd);
    if (S_ISDIR(st.st_mode)) return failed("is a directory, not a beam file");
    return failed(std::string("is not a regular file (") + (S_ISFIFO(st.st_mode) ? "a named pipe" :
                  S_ISSOCK(st.st_mode) ? "a socket" : "a device") + "); trivet reads beam files only");
  }
  if (st.st_size > 0 && static_cast<std::uint64_t>(st.st_size) > limits.max_file_bytes) {
    ::close(fd);
    return failed("the file is larger than the limit of " + std::to_string(limits.max_file_bytes >> 20) + " MiB");
  }
  std::string text;
  // One byte more than the size, so the read that meets the end fits.
  text.resize(st.st_size > 0 ? static_cast<std::size_t>(st.st_size) + 1 : 4096);
  std::size_t got = 0;
  bool read_error = false;
  for (;;) {
    if (got == text.size()) {
      // The file may have grown since fstat (or report no size): read on,
      // up to one byte past the limit so that the limit is still seen.
      if (text.size() > limits.max_file_bytes) break;
      text.resize(std::min<std::size_t>(std::max<std::size_t>(text.size() * 2, 4096), limits.max_file_bytes + 1));
    }
    const ssize_t n = ::read(fd, text.data() + got, text.size() - got);
    if (n < 0) {
      if (errno == EINTR) continue;
      read_error = true;
      break;
    }
    if (n == 0) break;
    got += static_cast<std::size_t>(n);
  }
  ::close(fd);
  if (read_error) return failed("cannot read the file");
  text.resize(got);
  BeamFile out = parse_beam_text(text, path, limits);
  if (text_out) *text_out = std::move(text);
  return out;
}

std::string printable_text(const std::string& s, std::size_t max_bytes) { return printable(s, max_bytes); }

}  // namespace trivet::input
