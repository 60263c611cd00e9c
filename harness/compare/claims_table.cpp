// trivet: claims from a table. See claims_table.h.
#include "harness/compare/claims_table.h"

#include <algorithm>
#include <cctype>
#include <charconv>
#include <cmath>
#include <optional>

namespace trivet::compare::claims_table {

namespace {

using input::Quantity;

std::string lower(std::string s) {
  for (char& c : s) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return s;
}

std::string trim(const std::string& s) {
  std::size_t a = 0, b = s.size();
  while (a < b && std::isspace(static_cast<unsigned char>(s[a]))) ++a;
  while (b > a && std::isspace(static_cast<unsigned char>(s[b - 1]))) --b;
  return s.substr(a, b - a);
}

// A plain number (no unit), as the whole text.
std::optional<double> plain_number(const std::string& text) {
  const std::string s = trim(text);
  if (s.empty()) return std::nullopt;
  const char* b = s.data();
  const char* e = s.data() + s.size();
  if (*b == '+') ++b;
  double v = 0;
  const auto [p, ec] = std::from_chars(b, e, v);
  if (ec != std::errc() || p != e || !std::isfinite(v)) return std::nullopt;
  for (const char* k = b; k != e; ++k)  // from_chars also reads "inf" and "nan"
    if (std::isalpha(static_cast<unsigned char>(*k)) && *k != 'e' && *k != 'E') return std::nullopt;
  return v;
}

constexpr Quantity kAll[] = {Quantity::Moment,    Quantity::Shear,         Quantity::Reaction,  Quantity::ReactionMoment,
                             Quantity::Deflection, Quantity::Rotation,     Quantity::MaxMoment, Quantity::MinMoment,
                             Quantity::MaxDeflection, Quantity::MomentMax, Quantity::MomentMin, Quantity::ShearMax,
                             Quantity::ShearMin,  Quantity::ReactionMax,   Quantity::ReactionMin};

const std::vector<std::string> kColumns = {"quantity", "where", "value", "case", "side", "tolerance"};

// Strips a unit in brackets at the end of a unit-row cell: "[mm]" -> "mm".
std::string unit_cell(const std::string& cell) {
  std::string u = trim(cell);
  if (u.size() >= 2 && ((u.front() == '[' && u.back() == ']') || (u.front() == '(' && u.back() == ')')))
    u = trim(u.substr(1, u.size() - 2));
  return u;
}

// The unit at the end of a header cell ("value [mm]" -> "mm"), or "".
std::string header_unit(const std::string& cell) {
  const std::string t = trim(cell);
  if (t.size() < 3) return "";
  const char close = t.back();
  const char open = close == ']' ? '[' : close == ')' ? '(' : 0;
  const auto at = open ? t.rfind(open) : std::string::npos;
  if (at == std::string::npos || at == 0) return "";
  const std::string u = trim(t.substr(at + 1, t.size() - at - 2));
  std::string why;
  return !u.empty() && input::parse_unit_expression(u, t, &why) ? u : "";
}

class Reader {
 public:
  Reader(const input::BeamFile& file, const against::CsvTable& table, const std::string& display)
      : file_(file), table_(table), display_(display) {
    if (!table.sheet.empty()) source_ = display + ", sheet " + table.sheet + ", row ";
    else source_ = display + ", line ";
  }

  Read run() {
    // The header.
    const std::size_t hl = table_.header_line;
    for (std::size_t c = 0; c < table_.header.size(); ++c) {
      const std::string name = against::header_name(table_.header[c]);
      auto known = std::find(kColumns.begin(), kColumns.end(), name);
      if (known != kColumns.end()) {
        const std::size_t k = static_cast<std::size_t>(known - kColumns.begin());
        if (col_[k] != kNone) {
          error(hl, c, "the column appears twice (columns " + std::to_string(col_[k] + 1) + " and " + std::to_string(c + 1) + ")",
                "claims.unreadable");
          continue;
        }
        col_[k] = c;
        unit_[k] = header_unit(table_.header[c]);
      } else if (auto d = input::did_you_mean(name, kColumns)) {
        error(hl, c, "no column of a table of claims is called \"" + input::printable_text(name, 40) + "\" (did you mean \"" + *d + "\"?)");
      }
    }
    std::string missing;
    for (std::size_t k = 0; k < 3; ++k)
      if (col_[k] == kNone) missing += (missing.empty() ? "" : ", ") + kColumns[k];
    if (!missing.empty()) {
      std::string found;
      for (std::size_t c = 0; c < table_.header.size() && c < 12; ++c)
        found += (c ? ", " : "") + ("\"" + input::printable_text(table_.header[c], 40) + "\"");
      error(hl, kNone, "the header has no column " + missing + " (a table of claims has quantity, where and value, and may have case, side and tolerance; the columns are " + found + ")",
            "claims.unreadable");
    }
    if (!out_.errors.empty()) return std::move(out_);

    // A row of units under the header.
    std::size_t first = 0;
    if (!table_.rows.empty()) {
      const auto& r0 = table_.rows.front().fields;
      bool units_row = true, any = false;
      for (const auto& f : r0) {
        const std::string u = unit_cell(f);
        std::string why;
        if (u.empty()) continue;
        if (plain_number(u) || !input::parse_unit_expression(u, f, &why)) { units_row = false; break; }
        any = true;
      }
      if (units_row && any) {
        first = 1;
        for (std::size_t k = 0; k < kColumns.size(); ++k) {
          if (col_[k] == kNone || col_[k] >= r0.size()) continue;
          const std::string u = unit_cell(r0[col_[k]]);
          if (u.empty()) continue;
          if (!unit_[k].empty() && unit_[k] != u)
            error(table_.rows.front().line, col_[k], "the units row says \"" + input::printable_text(u, 40) + "\" but the header says \"" + unit_[k] + "\"");
          unit_[k] = u;
        }
      }
    }
    sets_ = file_.cases;
    for (const auto& cb : file_.combinations) sets_.push_back(cb.name);
    for (const auto& m : file_.moving_loads) sets_.push_back(m.name);  // each a load set of its own
    for (std::size_t i = first; i < table_.rows.size(); ++i) row(table_.rows[i]);
    if (!out_.errors.empty()) out_.claims.clear();
    return std::move(out_);
  }

 private:
  static constexpr std::size_t kNone = static_cast<std::size_t>(-1);
  enum { kQuantity, kWhere, kValue, kCase, kSide, kTolerance };

  void error(std::size_t line, std::size_t column, const std::string& reason, const char* id = "claims.bad_row") {
    if (out_.errors.size() >= 50) {
      if (!out_.errors.empty() && out_.errors.back().reason.find("(further errors not listed)") == std::string::npos)
        out_.errors.back().reason += " (further errors not listed)";
      return;
    }
    against::Error e{line, column == kNone ? 0 : column + 1,
                     column == kNone || column >= table_.header.size() ? std::string() : table_.header[column], reason};
    std::vector<against::Error> one{e};
    if (!table_.sheet.empty()) against::place_in_sheet(one, table_);
    out_.errors.push_back({"", "", "--claims " + one.front().format(display_), id});
  }

  std::string cell(const against::CsvRow& r, int k) const {
    const std::size_t c = col_[static_cast<std::size_t>(k)];
    return c == kNone || c >= r.fields.size() ? std::string() : trim(r.fields[c]);
  }

  // A number with or without its unit, of dimension `dim`, in the file's units.
  std::optional<double> quantity(const against::CsvRow& r, int k, const std::string& text, input::Dimension dim, const std::string& what) {
    const std::string& u = unit_[static_cast<std::size_t>(k)];
    const std::string full = plain_number(text) && !u.empty() ? text + " " + u : text;
    const input::QuantityText q = input::parse_quantity(full, dim, file_.units);
    if (!q.ok) {
      error(r.line, col_[static_cast<std::size_t>(k)], what + " does not read (got \"" + input::printable_text(text, 60) + "\"): " + q.reason);
      return std::nullopt;
    }
    return q.value;
  }

  void row(const against::CsvRow& r) {
    const std::size_t before = out_.errors.size();
    const Beam& beam = file_.beam;
    input::Claim claim;
    claim.source = source_ + std::to_string(r.line);

    // quantity
    const std::string qtext = cell(r, kQuantity);
    std::string qn = lower(qtext);
    for (char& ch : qn)
      if (ch == ' ' || ch == '-') ch = '_';
    std::vector<std::string> names;
    for (Quantity q : kAll) names.push_back(input::quantity_name(q));
    // The place decides between the two spellings of a span's extreme and
    // an envelope's value at a point (input::claim_quantity).
    const std::string wl0 = lower(cell(r, kWhere));
    const bool over_span = wl0.compare(0, 4, "span") == 0;
    const auto known = input::claim_quantity(qn, over_span, !over_span && !wl0.empty());
    const bool found = known.has_value();
    if (known) {
      claim.quantity = *known;
      if (qn != input::quantity_name(*known)) claim.written = qn;
    }
    if (qtext.empty()) { error(r.line, col_[kQuantity], "no quantity (one of moment, shear, reaction, deflection, ...)"); return; }
    if (!found) {
      std::string reason = "unknown quantity \"" + input::printable_text(qtext, 40) + "\"";
      if (auto d = input::did_you_mean(qn, names)) reason += " (did you mean \"" + *d + "\"?)";
      else {
        reason += " (one of ";
        for (std::size_t k = 0; k < names.size(); ++k) reason += (k ? ", " : "") + names[k];
        reason += ")";
      }
      error(r.line, col_[kQuantity], reason);
      return;
    }
    const std::string qname = input::quantity_name(claim.quantity);
    const bool by_span = claim.quantity == Quantity::MaxMoment || claim.quantity == Quantity::MinMoment ||
                         claim.quantity == Quantity::MaxDeflection;
    const bool by_node_only = claim.quantity == Quantity::Reaction || claim.quantity == Quantity::ReactionMoment ||
                              claim.quantity == Quantity::ReactionMax || claim.quantity == Quantity::ReactionMin;

    // where
    const std::string wtext = cell(r, kWhere);
    const std::string wl = lower(wtext);
    const std::size_t wc = col_[kWhere];
    auto rest_after = [&](std::size_t n) { return trim(wtext.substr(n)); };
    auto whole = [](const std::string& t) -> std::optional<long long> {
      long long v = 0;
      const auto [p, ec] = std::from_chars(t.data(), t.data() + t.size(), v);
      if (t.empty() || ec != std::errc() || p != t.data() + t.size()) return std::nullopt;
      return v;
    };
    auto node_by_label = [&](const std::string& label) -> bool {
      auto f = std::find(beam.labels.begin(), beam.labels.end(), label);
      if (f == beam.labels.end()) return false;
      claim.node = static_cast<std::size_t>(f - beam.labels.begin());
      return true;
    };
    const std::string hint = " (give a node's label such as " + (beam.labels.empty() ? std::string("B") : beam.labels.back()) +
                             ", \"node 2\", a position \"x = 2.5\" or \"span 2\")";
    if (wtext.empty()) {
      error(r.line, wc, "no place" + hint);
    } else if (node_by_label(wtext)) {
      // a label
    } else if (wl.compare(0, 4, "span") == 0 && (wl.size() == 4 || !std::isalpha(static_cast<unsigned char>(wl[4])))) {
      const auto k = whole(rest_after(4));
      if (!k) error(r.line, wc, "a span is given by its number, e.g. \"span 2\" (got \"" + input::printable_text(wtext, 40) + "\")");
      else if (*k < 1 || static_cast<std::size_t>(*k) > beam.spans.size())
        error(r.line, wc, "there is no span " + std::to_string(*k) + ": the beam has " + std::to_string(beam.spans.size()) + " spans, numbered from 1");
      else claim.span = static_cast<std::size_t>(*k - 1);
    } else if (wl.compare(0, 4, "node") == 0 && (wl.size() == 4 || !std::isalpha(static_cast<unsigned char>(wl[4])))) {
      const std::string rest = rest_after(4);
      if (!node_by_label(rest)) {
        const auto k = whole(rest);
        if (k && *k >= 1 && static_cast<std::size_t>(*k) <= beam.node_count()) claim.node = static_cast<std::size_t>(*k - 1);
        else if (k) error(r.line, wc, "there is no node " + std::to_string(*k) + ": the beam has " + std::to_string(beam.node_count()) + " nodes, numbered from 1");
        else {
          std::string reason = "there is no node \"" + input::printable_text(rest, 40) + "\"";
          if (auto d = input::did_you_mean(rest, beam.labels)) reason += " (did you mean \"" + *d + "\"?)";
          error(r.line, wc, reason);
        }
      }
    } else if (wl[0] == 'x' && (wl.size() == 1 || !std::isalpha(static_cast<unsigned char>(wl[1])))) {
      std::string t = rest_after(1);
      if (!t.empty() && (t[0] == '=' || t[0] == ':')) t = trim(t.substr(1));
      if (auto x = quantity(r, kWhere, t, {0, 1}, "the position")) {
        double total = 0;
        for (const auto& s : beam.spans) total += s.length;
        if (*x < 0 || *x > total)
          error(r.line, wc, "x must be on the beam, 0 to " + input::format_number(total) + " " + file_.units.length + " (got " + input::format_number(*x) + ")");
        else claim.x = *x;
      }
    } else {
      std::string reason = "\"" + input::printable_text(wtext, 40) + "\" is not a node, a position or a span" + hint;
      if (plain_number(wtext)) reason = "\"" + wtext + "\" alone could be a node number or a position: write \"node " + wtext + "\" or \"x = " + wtext + "\"";
      else if (auto d = input::did_you_mean(wtext, beam.labels)) reason += " (did you mean node \"" + *d + "\"?)";
      error(r.line, wc, reason);
    }
    if (out_.errors.size() == before) {
      if (by_span && !claim.span) error(r.line, wc, qname + " is taken over a span: give \"span N\"");
      else if (!by_span && claim.span) error(r.line, wc, "a span is a place for max_moment, min_moment and max_deflection; give a node or x for " + qname);
      else if (by_node_only && !claim.node) error(r.line, wc, qname + " is taken at a node: give its label or \"node N\"");
    }

    // side
    const std::string side = lower(cell(r, kSide));
    if (side == "left") claim.side = input::Side::Left;
    else if (side == "right") claim.side = input::Side::Right;
    else if (!side.empty()) error(r.line, col_[kSide], "the side is left or right (got \"" + input::printable_text(side, 40) + "\")");

    // case
    claim.load_case = cell(r, kCase);
    if (claim.load_case.empty() && sets_.size() > 1) {
      std::string list;
      for (std::size_t k = 0; k < sets_.size(); ++k) list += (k ? ", " : "") + sets_[k];
      error(r.line, col_[kCase] == kNone ? col_[kQuantity] : col_[kCase],
            "the beam has " + std::to_string(sets_.size()) + " load cases and combinations (" + list + "): name the claim's case" +
                (col_[kCase] == kNone ? " in a column \"case\"" : ""));
    } else if (!claim.load_case.empty()) {
      if (std::find(sets_.begin(), sets_.end(), claim.load_case) == sets_.end()) {
        std::string reason = "there is no load case \"" + input::printable_text(claim.load_case, 40) + "\"";
        if (auto d = input::did_you_mean(claim.load_case, sets_)) reason += " (did you mean \"" + *d + "\"?)";
        else {
          reason += " (cases: ";
          for (std::size_t k = 0; k < sets_.size(); ++k) reason += (k ? ", " : "") + sets_[k];
          reason += ")";
        }
        error(r.line, col_[kCase], reason);
      }
    }
    const input::Combination* comb = nullptr;
    for (const auto& cb : file_.combinations)
      if (cb.name == claim.load_case) comb = &cb;
    // An envelope: a combination with a pattern, a factor range or a moving
    // load, or a moving load's own load set.
    const bool envelope = (comb && comb->is_envelope()) ||
                          std::any_of(file_.moving_loads.begin(), file_.moving_loads.end(),
                                      [&](const input::MovingLoad& m) { return m.name == claim.load_case; });
    if (input::is_envelope_quantity(claim.quantity) && !envelope)
      error(r.line, col_[kQuantity], (claim.written.empty() ? qname : claim.written + " (read as " + qname + ")") +
                                         " is an envelope value: name a combination with a pattern or a factor range, or a moving load, in the case column");
    else if (envelope && !input::is_envelope_quantity(claim.quantity) && !by_span)
      error(r.line, col_[kQuantity], "\"" + claim.load_case + "\" is an envelope: claim moment_max, moment_min, shear_max, shear_min, reaction_max or reaction_min at a point, or max_moment, min_moment or max_deflection over a span");

    // value
    const std::string vtext = cell(r, kValue);
    if (vtext.empty()) error(r.line, col_[kValue], "no value");
    else if (auto v = quantity(r, kValue, vtext, input::quantity_dimension(claim.quantity), "the value")) claim.value = *v;

    // tolerance
    const std::string ttext = cell(r, kTolerance);
    if (!ttext.empty()) {
      if (ttext.back() == '%') {
        std::string why;
        if (auto t = input::parse_tolerance_text(ttext, &why)) claim.tolerance = *t;
        else error(r.line, col_[kTolerance], "the tolerance " + why);
      } else if (auto t = quantity(r, kTolerance, ttext, input::quantity_dimension(claim.quantity), "the tolerance")) {
        if (*t < 0) error(r.line, col_[kTolerance], "the tolerance must not be negative (got \"" + input::printable_text(ttext, 40) + "\")");
        else claim.tolerance = input::Tolerance{false, *t};
      }
    }
    if (out_.errors.size() == before) out_.claims.push_back(std::move(claim));
  }

  const input::BeamFile& file_;
  const against::CsvTable& table_;
  std::string display_, source_;
  std::vector<std::string> sets_;
  std::size_t col_[6] = {kNone, kNone, kNone, kNone, kNone, kNone};
  std::string unit_[6];
  Read out_;
};

Read unreadable(const std::vector<against::Error>& errors, const std::string& display) {
  Read out;
  for (const auto& e : errors) out.errors.push_back({"", "", "--claims " + e.format(display), "claims.unreadable"});
  return out;
}

const char* kHeaderNeeds = "a cell quantity, with where and value";

}  // namespace

bool is_claims_header(const std::vector<std::string>& cells) {
  for (const auto& c : cells)
    if (against::header_name(c) == "quantity") return true;
  return false;
}

Read read_table(const input::BeamFile& file, const against::CsvTable& table, const std::string& display) {
  if (!file.ok()) return {};
  return Reader(file, table, display).run();
}

Read read_file(const input::BeamFile& file, const std::string& path, const std::string& sheet_name) {
  if (!sheet_name.empty() && sheet::format_of_path(path) == sheet::Format::None)
    return unreadable({{0, 0, "", "a sheet is named (\"" + input::printable_text(sheet_name, 60) + "\"), but this is not an .xlsx or .ods file"}}, path);
  against::CsvLimits limits;
  limits.max_file_bytes = 256u << 20;
  const against::CsvRead read = against::read_table_file(path, sheet_name, is_claims_header, kHeaderNeeds, limits);
  if (!read.ok()) return unreadable(read.errors, path);
  return read_table(file, read.table, path);
}

Read read_text(const input::BeamFile& file, const std::string& text, const std::string& display) {
  const against::CsvRead read = against::parse_csv_text(text);
  if (!read.ok()) return unreadable(read.errors, display);
  return read_table(file, read.table, display);
}

Read read_sheet_bytes(const input::BeamFile& file, const std::string& bytes, sheet::Format format,
                      const std::string& display, const std::string& sheet_name) {
  const sheet::Sheet s = sheet::read_sheet_bytes(bytes, format, sheet_name);
  if (!s.ok()) return unreadable({{0, 0, "", s.error}}, display);
  const against::CsvRead read = against::table_from_sheet(s, is_claims_header, kHeaderNeeds);
  if (!read.ok()) return unreadable(read.errors, display);
  return read_table(file, read.table, display);
}

void merge(input::BeamFile& file, Read&& read) {
  if (!read.ok()) {
    for (auto& e : read.errors) file.errors.push_back(std::move(e));
    return;
  }
  for (auto& c : read.claims) file.claims.push_back(std::move(c));
}

}  // namespace trivet::compare::claims_table
