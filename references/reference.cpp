#include "references/reference.h"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <set>
#include <sstream>

#include <nlohmann/json.hpp>

#ifndef TRIVET_REFERENCES_DIR
#define TRIVET_REFERENCES_DIR "references/cases"
#endif

namespace trivet::references {

using nlohmann::json;

std::string format_citation(const Source& s) {
  std::string out;
  auto add = [&](const std::string& part) {
    if (part.empty()) return;
    if (!out.empty()) out += ", ";
    out += part;
  };
  add(s.author);
  add(s.title);
  add(s.edition);
  add(s.publisher);
  add(s.year);
  add(s.locator);
  if (!s.confirmed.empty()) out += " (" + s.confirmed + ")";
  return out;
}

namespace {

const std::vector<std::pair<Quantity, const char*>> kQuantityNames = {
    {Quantity::Moment, "moment"},
    {Quantity::Shear, "shear"},
    {Quantity::Reaction, "reaction"},
    {Quantity::ReactionMoment, "reaction_moment"},
    {Quantity::Deflection, "deflection"},
    {Quantity::Rotation, "rotation"},
    {Quantity::MaxMoment, "max_moment"},
    {Quantity::MinMoment, "min_moment"},
    {Quantity::MaxDeflection, "max_deflection"},
    {Quantity::MaxMomentAt, "max_moment_at"},
    {Quantity::MinMomentAt, "min_moment_at"},
    {Quantity::MaxDeflectionAt, "max_deflection_at"},
};

std::string ordinal(int n) {
  const int t = n % 100;
  const char* suffix = (t >= 11 && t <= 13) ? "th" : n % 10 == 1 ? "st" : n % 10 == 2 ? "nd" : n % 10 == 3 ? "rd" : "th";
  return std::to_string(n) + suffix;
}

std::string trim(const std::string& s) {
  std::size_t b = 0, e = s.size();
  while (b < e && std::isspace(static_cast<unsigned char>(s[b]))) ++b;
  while (e > b && std::isspace(static_cast<unsigned char>(s[e - 1]))) --e;
  return s.substr(b, e - b);
}

// ---------------------------------------------------------------------------
// The multiplier evaluator: a small recursive-descent parser.
struct Evaluator {
  const std::string& s;
  const std::map<std::string, double>& symbols;
  std::size_t i = 0;
  std::string error;

  void skip() { while (i < s.size() && std::isspace(static_cast<unsigned char>(s[i]))) ++i; }
  bool fail(const std::string& why) {
    if (error.empty()) error = why;
    return false;
  }
  bool eat(char c) {
    skip();
    if (i < s.size() && s[i] == c) { ++i; return true; }
    return false;
  }

  bool expr(double& v) {
    if (!term(v)) return false;
    for (;;) {
      skip();
      if (i < s.size() && (s[i] == '+' || s[i] == '-')) {
        const char op = s[i++];
        double r = 0;
        if (!term(r)) return false;
        v = op == '+' ? v + r : v - r;
      } else {
        return true;
      }
    }
  }
  bool term(double& v) {
    if (!unary(v)) return false;
    for (;;) {
      skip();
      if (i < s.size() && (s[i] == '*' || s[i] == '/')) {
        const char op = s[i++];
        double r = 0;
        if (!unary(r)) return false;
        if (op == '/') {
          if (!(std::abs(r) > 0)) return fail("division by zero");
          v /= r;
        } else {
          v *= r;
        }
      } else {
        return true;
      }
    }
  }
  bool unary(double& v) {
    if (eat('-')) {
      if (!unary(v)) return false;
      v = -v;
      return true;
    }
    if (eat('+')) return unary(v);
    return power(v);
  }
  bool power(double& v) {
    if (!primary(v)) return false;
    if (eat('^')) {
      double e = 0;
      if (!unary(e)) return false;  // right associative: a^b^c = a^(b^c)
      v = std::pow(v, e);
    }
    return true;
  }
  bool primary(double& v) {
    skip();
    if (i >= s.size()) return fail("the expression ends too early");
    const char c = s[i];
    if (c == '(') {
      ++i;
      if (!expr(v)) return false;
      if (!eat(')')) return fail("a ')' is missing at position " + std::to_string(i + 1));
      return true;
    }
    if (std::isdigit(static_cast<unsigned char>(c)) || c == '.') {
      std::size_t j = i;
      bool dot = false, digit = false;
      while (j < s.size() && (std::isdigit(static_cast<unsigned char>(s[j])) || (s[j] == '.' && !dot))) {
        if (s[j] == '.') dot = true; else digit = true;
        ++j;
      }
      if (!digit) return fail("a number is malformed at position " + std::to_string(i + 1));
      v = std::stod(s.substr(i, j - i));
      i = j;
      return true;
    }
    if (std::isalpha(static_cast<unsigned char>(c)) || c == '_') {
      std::size_t j = i;
      while (j < s.size() && (std::isalnum(static_cast<unsigned char>(s[j])) || s[j] == '_')) ++j;
      const std::string name = s.substr(i, j - i);
      i = j;
      skip();
      if (i < s.size() && s[i] == '(') {
        if (name != "sqrt") return fail("unknown function '" + name + "' (only sqrt)");
        ++i;
        if (!expr(v)) return false;
        if (!eat(')')) return fail("a ')' is missing after sqrt(");
        if (v < 0) return fail("sqrt of a negative number");
        v = std::sqrt(v);
        return true;
      }
      auto f = symbols.find(name);
      if (f == symbols.end()) {
        std::string known;
        for (const auto& [k, val] : symbols) known += (known.empty() ? "" : ", ") + k;
        return fail("unknown symbol '" + name + "' (the case's symbols: " + (known.empty() ? "none" : known) + ")");
      }
      v = f->second;
      return true;
    }
    return fail(std::string("unexpected '") + c + "' at position " + std::to_string(i + 1));
  }
};

bool all_digits(const std::string& t) {
  return !t.empty() && std::all_of(t.begin(), t.end(), [](char c) { return std::isdigit(static_cast<unsigned char>(c)); });
}

}  // namespace

const char* quantity_name(Quantity q) {
  for (const auto& [k, n] : kQuantityNames)
    if (k == q) return n;
  return "?";
}

std::optional<Quantity> quantity_from_name(const std::string& name) {
  for (const auto& [k, n] : kQuantityNames)
    if (name == n) return k;
  return std::nullopt;
}

bool is_span_quantity(Quantity q) {
  return q == Quantity::MaxMoment || q == Quantity::MinMoment || q == Quantity::MaxDeflection ||
         q == Quantity::MaxMomentAt || q == Quantity::MinMomentAt || q == Quantity::MaxDeflectionAt;
}

const char* form_name(Form f) {
  switch (f) {
    case Form::Decimal: return "decimal";
    case Form::Exact: return "exact";
    case Form::RoundedDenominator: return "rounded denominator";
  }
  return "?";
}

std::optional<PublishedNumber> parse_published(const std::string& text, bool exact,
                                               bool rounded_denominator, std::string* reason) {
  auto bad = [&](const std::string& why) -> std::optional<PublishedNumber> {
    if (reason) *reason = why;
    return std::nullopt;
  };
  std::string t = trim(text);
  bool negative = false;
  std::string body = t;
  if (!body.empty() && (body[0] == '-' || body[0] == '+')) {
    negative = body[0] == '-';
    body = body.substr(1);
  }
  PublishedNumber out;
  const auto slash = body.find('/');
  if (slash != std::string::npos) {
    const std::string p = trim(body.substr(0, slash)), q = trim(body.substr(slash + 1));
    if (!all_digits(p) || !all_digits(q))
      return bad("must be a decimal such as \"-0.1071\" or a fraction of whole numbers such as \"-3/28\" (got \"" + text + "\")");
    const double num = std::stod(p), den = std::stod(q);
    if (!(den > 0)) return bad("the denominator must not be zero (got \"" + text + "\")");
    out.value = (negative ? -num : num) / den;
    if (rounded_denominator) {
      if (!(den > 0.5)) return bad("a rounded denominator must be at least 1 (got \"" + text + "\")");
      out.form = Form::RoundedDenominator;
      out.tolerance = num * (1.0 / (den - 0.5) - 1.0 / den);
      out.rule = "denominator " + q + " rounded to a whole number: " + p + "/" + q + " to " + p + "/" +
                 input::format_number(den - 0.5);
    } else {
      out.form = Form::Exact;
      out.tolerance = kExactRelative;
      out.rule = "exact fraction (1e-9 of the multiplier)";
    }
    return out;
  }
  if (rounded_denominator) return bad("\"rounding\": \"denominator\" needs a fraction such as \"1/185\" (got \"" + text + "\")");
  const auto dot = body.find('.');
  const std::string ip = body.substr(0, dot);
  const std::string fp = dot == std::string::npos ? std::string() : body.substr(dot + 1);
  if ((ip.empty() && fp.empty()) || (!ip.empty() && !all_digits(ip)) || (!fp.empty() && !all_digits(fp)) ||
      (dot != std::string::npos && fp.empty()) || (ip.empty() && dot == std::string::npos))
    return bad("must be a decimal such as \"-0.1071\" or a fraction such as \"-3/28\", as printed (got \"" + text + "\")");
  const double mag = std::stod((ip.empty() ? std::string("0") : ip) + (fp.empty() ? "" : "." + fp));
  out.value = negative ? -mag : mag;
  out.decimals = static_cast<int>(fp.size());
  if (exact) {
    out.form = Form::Exact;
    out.tolerance = kExactRelative;
    out.rule = "exact (1e-9 of the multiplier)";
  } else {
    out.form = Form::Decimal;
    out.tolerance = 0.5 * std::pow(10.0, -out.decimals);
    out.rule = out.decimals == 0 ? "half a unit in the units place"
                                 : "half a unit in the " + ordinal(out.decimals) + " decimal place";
  }
  return out;
}

std::optional<double> evaluate_multiplier(const std::string& text,
                                          const std::map<std::string, double>& symbols,
                                          std::string* reason) {
  Evaluator ev{text, symbols, 0, std::string()};
  double v = 0;
  bool ok = ev.expr(v);
  if (ok) {
    ev.skip();
    if (ev.i != text.size()) ok = ev.fail("unexpected '" + std::string(1, text[ev.i]) + "' at position " + std::to_string(ev.i + 1));
  }
  if (ok && !std::isfinite(v)) ok = ev.fail("the value is not finite");
  if (!ok) {
    if (reason) *reason = ev.error.empty() ? "cannot be evaluated" : ev.error;
    return std::nullopt;
  }
  return v;
}

std::string Expected::where(const input::BeamFile& beam) const {
  std::string w;
  if (span) w = "span " + std::to_string(*span + 1);
  else if (node) w = "node " + (*node < beam.beam.labels.size() ? beam.beam.labels[*node] : input::default_label(*node));
  else if (x) w = "x = " + input::format_number(*x) + (beam.units.length.empty() ? "" : " " + beam.units.length);
  if (side == input::Side::Left) w += " (left)";
  else if (side == input::Side::Right) w += " (right)";
  return w;
}

namespace {

std::string got(const json& j) {
  if (j.is_string()) return "got the string \"" + j.get<std::string>() + "\"";
  if (j.is_number()) return "got " + input::format_number(j.get<double>());
  if (j.is_boolean()) return std::string("got ") + (j.get<bool>() ? "true" : "false");
  if (j.is_object()) return "got an object";
  if (j.is_array()) return "got an array";
  return "got null";
}

struct CaseReader {
  ReferenceCase* out;
  void error(const std::string& ptr, const std::string& where, const std::string& reason) {
    out->errors.push_back({ptr, where, reason, "reference.invalid"});
  }
  void check_keys(const json& obj, const std::string& ptr, const std::string& where,
                  const std::vector<std::string>& allowed) {
    for (auto it = obj.begin(); it != obj.end(); ++it) {
      if (std::find(allowed.begin(), allowed.end(), it.key()) != allowed.end()) continue;
      std::string reason = "unknown field '" + it.key() + "'";
      if (auto m = input::did_you_mean(it.key(), allowed)) reason += " (did you mean '" + *m + "'?)";
      else {
        reason += " (known here: ";
        for (std::size_t i = 0; i < allowed.size(); ++i) reason += (i ? ", " : "") + allowed[i];
        reason += ")";
      }
      error(ptr + "/" + it.key(), where, reason);
    }
  }
  // A required (or optional) string field.
  std::optional<std::string> text(const json& obj, const char* key, const std::string& ptr,
                                  const std::string& where, bool required) {
    auto it = obj.find(key);
    if (it == obj.end()) {
      if (required) error(ptr + "/" + key, where, "required field is missing");
      return std::nullopt;
    }
    if (!it->is_string()) {
      error(ptr + "/" + key, where, "must be a string (" + got(*it) + ")");
      return std::nullopt;
    }
    return it->get<std::string>();
  }
};

const std::vector<std::string> kCaseKeys = {"id", "title", "source", "note", "beam", "symbols", "expected"};
const std::vector<std::string> kSourceKeys = {"title", "author", "publisher", "edition", "year",
                                              "locator", "confirmed", "note"};
const std::vector<std::string> kConfirmed = {"from memory", "from the text", "derived"};
const std::vector<std::string> kExpectedKeys = {"quantity", "node", "x", "span", "side", "case",
                                                "published", "multiplier", "exact", "rounding", "unsigned", "note"};

}  // namespace

ReferenceCase parse_case_text(const std::string& text, const std::string& display) {
  ReferenceCase c;
  c.file = display;
  CaseReader rd{&c};
  json root;
  try {
    root = json::parse(text);
  } catch (const std::exception& e) {
    std::string msg = e.what();
    const std::string marker = "parse error at ";
    auto p = msg.find(marker);
    if (p != std::string::npos) msg = msg.substr(p + marker.size());
    rd.error("", "", "not valid JSON: " + msg);
    return c;
  }
  if (!root.is_object()) {
    rd.error("", "", "a reference case must be a JSON object (" + got(root) + ")");
    return c;
  }
  rd.check_keys(root, "", "", kCaseKeys);
  if (auto id = rd.text(root, "id", "", "", true)) {
    c.id = *id;
    if (c.id.empty()) rd.error("/id", "", "must not be empty");
  }
  if (auto t = rd.text(root, "title", "", "", true)) c.title = *t;
  if (auto n = rd.text(root, "note", "", "", false)) c.note = *n;

  // source
  if (auto it = root.find("source"); it == root.end()) {
    rd.error("/source", "", "required field is missing (where the numbers come from)");
  } else if (!it->is_object()) {
    rd.error("/source", "", "must be an object with title, author, ... (" + got(*it) + ")");
  } else {
    const json& s = *it;
    rd.check_keys(s, "/source", "source", kSourceKeys);
    if (auto v = rd.text(s, "title", "/source", "source", true)) c.source.title = *v;
    if (auto v = rd.text(s, "author", "/source", "source", false)) c.source.author = *v;
    if (auto v = rd.text(s, "publisher", "/source", "source", false)) c.source.publisher = *v;
    if (auto v = rd.text(s, "edition", "/source", "source", false)) c.source.edition = *v;
    if (auto y = s.find("year"); y != s.end()) {
      if (y->is_number_integer() || y->is_number_unsigned()) c.source.year = std::to_string(y->get<long long>());
      else if (y->is_string()) c.source.year = y->get<std::string>();
      else rd.error("/source/year", "source", "must be a year (" + got(*y) + ")");
    }
    if (auto v = rd.text(s, "locator", "/source", "source", true)) c.source.locator = *v;
    if (auto v = rd.text(s, "note", "/source", "source", false)) c.source.note = *v;
    if (auto v = rd.text(s, "confirmed", "/source", "source", true)) {
      if (std::find(kConfirmed.begin(), kConfirmed.end(), *v) == kConfirmed.end())
        rd.error("/source/confirmed", "source",
                 "must be \"from memory\", \"from the text\" or \"derived\" (got \"" + *v + "\")");
      else c.source.confirmed = *v;
    }
  }

  // symbols
  if (auto it = root.find("symbols"); it != root.end()) {
    if (!it->is_object()) {
      rd.error("/symbols", "", "must be an object of numbers such as {\"w\": 10, \"L\": 6} (" + got(*it) + ")");
    } else {
      for (auto s = it->begin(); s != it->end(); ++s) {
        const std::string& k = s.key();
        const bool name_ok = !k.empty() && (std::isalpha(static_cast<unsigned char>(k[0])) || k[0] == '_') &&
                             std::all_of(k.begin(), k.end(), [](char ch) { return std::isalnum(static_cast<unsigned char>(ch)) || ch == '_'; });
        if (!name_ok || k == "sqrt") { rd.error("/symbols/" + k, "", "is not a usable symbol name (letters, digits, _; not sqrt)"); continue; }
        if (!s->is_number() || !std::isfinite(s->get<double>())) {
          rd.error("/symbols/" + k, "", "must be a finite number (" + got(*s) + ")");
          continue;
        }
        c.symbols[k] = s->get<double>();
      }
    }
  }

  // beam
  bool beam_ok = false;
  if (auto it = root.find("beam"); it == root.end()) {
    rd.error("/beam", "", "required field is missing (a beam in the beam-file format)");
  } else if (!it->is_object()) {
    rd.error("/beam", "", "must be a beam-file object (" + got(*it) + ")");
  } else {
    c.beam_text = it->dump(2);
    c.beam = input::parse_beam_text(c.beam_text, display);
    for (const auto& e : c.beam.errors) c.errors.push_back({"/beam" + e.pointer, e.where, e.reason, e.id});
    if (!c.beam.claims.empty())
      rd.error("/beam/claims", "", "a reference beam carries no claims: give the published values under \"expected\"");
    beam_ok = c.beam.ok();
  }

  // expected
  if (auto it = root.find("expected"); it == root.end()) {
    rd.error("/expected", "", "required field is missing (the published values)");
  } else if (!it->is_array() || it->empty()) {
    rd.error("/expected", "", "must be a non-empty list of published values (" + got(*it) + ")");
  } else {
    const Beam& beam = c.beam.beam;
    const std::size_t n_spans = beam.spans.size(), n_nodes = n_spans + 1;
    for (std::size_t i = 0; i < it->size(); ++i) {
      const json& e = (*it)[i];
      const std::string ptr = "/expected/" + std::to_string(i);
      const std::string where = "value " + std::to_string(i + 1);
      if (!e.is_object()) { rd.error(ptr, where, "must be an object with quantity, published and multiplier (" + got(e) + ")"); continue; }
      const std::size_t before = c.errors.size();
      rd.check_keys(e, ptr, where, kExpectedKeys);
      Expected ex;
      ex.pointer = ptr;
      auto qn = rd.text(e, "quantity", ptr, where, true);
      std::optional<Quantity> q;
      if (qn) {
        q = quantity_from_name(*qn);
        if (!q) {
          std::vector<std::string> names;
          for (const auto& [k, n] : kQuantityNames) names.push_back(n);
          std::string reason = "unknown quantity '" + *qn + "'";
          if (auto d = input::did_you_mean(*qn, names)) reason += " (did you mean '" + *d + "'?)";
          rd.error(ptr + "/quantity", where, reason);
        }
      }
      if (q) ex.quantity = *q;
      const bool has_node = e.contains("node"), has_x = e.contains("x"), has_span = e.contains("span");
      if (q && is_span_quantity(*q)) {
        if (!has_span || has_node || has_x) rd.error(ptr, where, *qn + " is taken over a span: give 'span' (1-based) only");
        else if (!e["span"].is_number_integer() && !e["span"].is_number_unsigned()) rd.error(ptr + "/span", where, "must be a span number (" + got(e["span"]) + ")");
        else {
          const long long k = e["span"].get<long long>();
          if (beam_ok && (k < 1 || static_cast<std::size_t>(k) > n_spans))
            rd.error(ptr + "/span", where, "there is no span " + std::to_string(k) + " (the beam has " + std::to_string(n_spans) + ")");
          else if (k >= 1) ex.span = static_cast<std::size_t>(k - 1);
        }
      } else if (q) {
        const bool node_only = *q == Quantity::Reaction || *q == Quantity::ReactionMoment;
        if (has_span) rd.error(ptr + "/span", where, "'span' is only for the span extremes; give 'node' or 'x'");
        else if (has_node == has_x) rd.error(ptr, where, node_only ? "give 'node'" : "give either 'node' or 'x'");
        else if (has_x && node_only) rd.error(ptr + "/x", where, *qn + " is taken at a node: give 'node'");
        else if (has_node) {
          const json& v = e["node"];
          if (v.is_string()) {
            auto f = std::find(beam.labels.begin(), beam.labels.end(), v.get<std::string>());
            if (f != beam.labels.end()) ex.node = static_cast<std::size_t>(f - beam.labels.begin());
            else if (beam_ok) rd.error(ptr + "/node", where, "there is no node '" + v.get<std::string>() + "'");
          } else if (v.is_number_integer() || v.is_number_unsigned()) {
            const long long k = v.get<long long>();
            if (beam_ok && (k < 1 || static_cast<std::size_t>(k) > n_nodes))
              rd.error(ptr + "/node", where, "there is no node " + std::to_string(k) + " (the beam has " + std::to_string(n_nodes) + ")");
            else if (k >= 1) ex.node = static_cast<std::size_t>(k - 1);
          } else {
            rd.error(ptr + "/node", where, "must be a node label or a 1-based number (" + got(v) + ")");
          }
        } else {
          const json& v = e["x"];
          if (!v.is_number()) rd.error(ptr + "/x", where, "must be a number, global x in the beam's length unit (" + got(v) + ")");
          else {
            double total = 0;
            for (const auto& s : beam.spans) total += s.length;
            const double xv = v.get<double>();
            if (beam_ok && (xv < 0 || xv > total)) rd.error(ptr + "/x", where, "must be on the beam, 0 to " + input::format_number(total));
            else ex.x = xv;
          }
        }
      }
      if (auto s = rd.text(e, "side", ptr, where, false)) {
        if (*s == "left") ex.side = input::Side::Left;
        else if (*s == "right") ex.side = input::Side::Right;
        else rd.error(ptr + "/side", where, "must be \"left\" or \"right\" (got \"" + *s + "\")");
      }
      if (auto cs = rd.text(e, "case", ptr, where, false)) {
        if (beam_ok && std::find(c.beam.cases.begin(), c.beam.cases.end(), *cs) == c.beam.cases.end())
          rd.error(ptr + "/case", where, "there is no load case '" + *cs + "' in the beam");
        else ex.load_case = *cs;
      }
      if (auto n = rd.text(e, "note", ptr, where, false)) ex.note = *n;
      bool exact = false, rounded_den = false;
      if (auto ex_it = e.find("exact"); ex_it != e.end()) {
        if (!ex_it->is_boolean()) rd.error(ptr + "/exact", where, "must be true or false (" + got(*ex_it) + ")");
        else exact = ex_it->get<bool>();
      }
      if (auto r = rd.text(e, "rounding", ptr, where, false)) {
        if (*r == "denominator") rounded_den = true;
        else rd.error(ptr + "/rounding", where, "must be \"denominator\" (got \"" + *r + "\")");
      }
      if (exact && rounded_den) rd.error(ptr + "/exact", where, "a value cannot be both exact and rounded");
      if (auto u = e.find("unsigned"); u != e.end()) {
        if (!u->is_boolean()) rd.error(ptr + "/unsigned", where, "must be true or false (" + got(*u) + ")");
        else ex.magnitude = u->get<bool>();
      }
      // published: TEXT exactly as printed
      if (auto p = e.find("published"); p == e.end()) {
        rd.error(ptr + "/published", where, "required field is missing (the value as printed, as a string)");
      } else if (!p->is_string()) {
        rd.error(ptr + "/published", where, "must be a string, exactly as printed, so that its digits are known (" + got(*p) + ")");
      } else {
        ex.published = p->get<std::string>();
        std::string reason;
        if (auto num = parse_published(ex.published, exact, rounded_den, &reason)) {
          ex.number = *num;
          if (ex.magnitude && num->value < 0)
            rd.error(ptr + "/published", where, "a value printed without a sign (\"unsigned\": true) cannot be negative");
        } else {
          rd.error(ptr + "/published", where, reason);
        }
      }
      ex.multiplier = "1";
      if (auto m = rd.text(e, "multiplier", ptr, where, false)) ex.multiplier = *m;
      {
        std::string reason;
        if (auto mv = evaluate_multiplier(ex.multiplier, c.symbols, &reason)) {
          ex.multiplier_value = *mv;
          if (!(std::abs(*mv) > 0)) rd.error(ptr + "/multiplier", where, "evaluates to zero");
        } else {
          rd.error(ptr + "/multiplier", where, "\"" + ex.multiplier + "\": " + reason);
        }
      }
      if (c.errors.size() != before) continue;
      ex.value = ex.number.value * ex.multiplier_value;
      ex.tolerance = ex.number.tolerance * std::abs(ex.multiplier_value);
      c.expected.push_back(ex);
    }
  }
  return c;
}

ReferenceCase read_case_file(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) {
    ReferenceCase c;
    c.file = path;
    c.errors.push_back({"", "", "cannot open the file for reading", "reference.file"});
    return c;
  }
  std::ostringstream ss;
  ss << in.rdbuf();
  return parse_case_text(ss.str(), path);
}

namespace {
std::string& directory_override() {
  static std::string dir;
  return dir;
}
}  // namespace

std::string default_directory() { return TRIVET_REFERENCES_DIR; }
std::string directory() { return directory_override().empty() ? default_directory() : directory_override(); }
void set_directory(const std::string& dir) { directory_override() = dir; }

std::vector<std::string> list_case_files(const std::string& dir, std::string* reason) {
  namespace fs = std::filesystem;
  std::vector<std::string> out;
  std::error_code ec;
  if (!fs::is_directory(dir, ec)) {
    if (reason) *reason = "not a directory that can be read: " + dir;
    return out;
  }
  fs::directory_iterator it(dir, ec), end;
  if (ec) {
    if (reason) *reason = "cannot list the directory " + dir + ": " + ec.message();
    return out;
  }
  for (; it != end; it.increment(ec)) {
    if (ec) break;
    const fs::path& p = it->path();
    std::error_code ec2;
    if (p.extension() == ".json" && it->is_regular_file(ec2)) out.push_back(p.string());
  }
  if (ec && reason) *reason = "cannot list the directory " + dir + ": " + ec.message();
  std::sort(out.begin(), out.end());
  return out;
}

std::vector<ReferenceCase> load_cases(const std::string& dir) {
  std::vector<ReferenceCase> out;
  std::string reason;
  const auto files = list_case_files(dir, &reason);
  if (files.empty()) {
    ReferenceCase c;
    c.file = dir;
    c.errors.push_back({"", "", reason.empty() ? "no reference case (*.json) in " + dir : reason, "reference.file"});
    out.push_back(c);
    return out;
  }
  for (const auto& f : files) out.push_back(read_case_file(f));
  // Ids must be unique across the library.
  std::map<std::string, std::string> first;
  for (auto& c : out) {
    if (c.id.empty()) continue;
    auto [p, fresh] = first.emplace(c.id, c.file);
    if (!fresh) c.errors.push_back({"/id", "", "the id '" + c.id + "' is already used by " + p->second, "reference.duplicate"});
  }
  return out;
}

}  // namespace trivet::references
