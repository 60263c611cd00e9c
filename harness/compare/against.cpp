// trivet: comparing another program's exported results (CSV) with the
// consensus of the methods. See against.h.
#include "harness/compare/against.h"

#include <algorithm>
#include <array>
#include <charconv>
#include <cmath>
#include <cstdio>
#include <cerrno>
#include <cstring>
#include <fstream>
#include <functional>
#include <limits>
#include <sstream>

namespace trivet::compare::against {

// ---------------------------------------------------------------------------
// Names.

std::string Error::format(const std::string& file) const {
  std::string s = file;
  if (line > 0) {
    s += (in_sheet ? ": row " : ": line ") + std::to_string(line);
    if (column > 0) {
      s += ", column " + (in_sheet ? sheet::column_letters(column) : std::to_string(column));
      if (!column_name.empty()) s += " (" + input::printable_text(column_name, 60) + ")";
    }
  }
  return s + ": " + reason;
}

const char* table_kind_name(TableKind k) {
  return k == TableKind::Stations ? "stations" : "reactions";
}

const char* quantity_name(Quantity q) {
  switch (q) {
    case Quantity::Shear: return "shear";
    case Quantity::Moment: return "moment";
    case Quantity::Deflection: return "deflection";
    case Quantity::ReactionForce: return "reaction";
    case Quantity::ReactionMoment: return "reaction moment";
    case Quantity::MomentMax: return "moment_max";
    case Quantity::MomentMin: return "moment_min";
    case Quantity::ShearMax: return "shear_max";
    case Quantity::ShearMin: return "shear_min";
    case Quantity::DeflectionMax: return "deflection_max";
    case Quantity::DeflectionMin: return "deflection_min";
    case Quantity::ReactionMax: return "reaction_max";
    case Quantity::ReactionMin: return "reaction_min";
  }
  return "?";
}

const char* quantity_plural(Quantity q) {
  switch (q) {
    case Quantity::Shear: return "shears";
    case Quantity::Moment: return "moments";
    case Quantity::Deflection: return "deflections";
    case Quantity::ReactionForce: return "reactions";
    case Quantity::ReactionMoment: return "reaction moments";
    case Quantity::MomentMax: return "moment_max values";
    case Quantity::MomentMin: return "moment_min values";
    case Quantity::ShearMax: return "shear_max values";
    case Quantity::ShearMin: return "shear_min values";
    case Quantity::DeflectionMax: return "deflection_max values";
    case Quantity::DeflectionMin: return "deflection_min values";
    case Quantity::ReactionMax: return "reaction_max values";
    case Quantity::ReactionMin: return "reaction_min values";
  }
  return "?";
}

bool is_envelope(Quantity q) {
  return static_cast<std::size_t>(q) >= static_cast<std::size_t>(Quantity::MomentMax);
}

const char* side_name(Side s) {
  switch (s) {
    case Side::Continuous: return "";
    case Side::Left: return "left";
    case Side::Right: return "right";
  }
  return "";
}

const char* mistake_name(Mistake m) {
  switch (m) {
    case Mistake::OppositeSign: return "opposite-sign";
    case Mistake::UnitsFactor: return "units-factor";
    case Mistake::RightToLeft: return "right-to-left";
    case Mistake::LocalAsGlobal: return "local-x";
    case Mistake::SupportShift: return "support-shift";
  }
  return "?";
}

bool Comparison::holds() const { return ok() && failing() == 0; }

std::size_t Comparison::failing() const {
  std::size_t n = 0;
  for (const auto& r : rows)
    for (const auto& c : r.cells) n += !c.holds;
  return n;
}

namespace {

std::string lower(std::string s) {
  for (char& c : s) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return s;
}

bool blank(char c) { return c == ' ' || c == '\t'; }

std::string trim(const std::string& s) {
  std::size_t a = 0, b = s.size();
  while (a < b && blank(s[a])) ++a;
  while (b > a && blank(s[b - 1])) --b;
  return s.substr(a, b - a);
}

// A short number for messages: up to 6 significant digits.
std::string nice(double v) {
  char buf[64];
  std::snprintf(buf, sizeof buf, "%.6g", v);
  return buf;
}

// Adds an error unless the list is full (then only counts it).
struct ErrorList {
  std::vector<Error>* list;
  std::size_t max;
  std::size_t* dropped;
  void add(std::size_t line, std::size_t column, const std::string& name, const std::string& reason) {
    if (list->size() < max) list->push_back({line, column, name, reason});
    else if (dropped) ++*dropped;
  }
};

// A number cell (defined below, with the table's reading).
std::optional<double> number(const std::string& cell);

}  // namespace

// ---------------------------------------------------------------------------
// CSV.

CsvRead parse_csv_text(const std::string& text, const CsvLimits& limits) {
  CsvRead out;
  std::size_t dropped = 0;
  ErrorList errs{&out.errors, std::max<std::size_t>(limits.max_errors, 1), &dropped};
  const std::size_t n = text.size();
  std::size_t i = 0, line = 1;
  if (n > limits.max_file_bytes) {
    errs.add(0, 0, "", "the file is " + std::to_string(n) + " bytes, over the limit of " +
                           std::to_string(limits.max_file_bytes) + " bytes");
    return out;
  }
  if (n >= 3 && text.compare(0, 3, "\xEF\xBB\xBF") == 0) i = 3;  // UTF-8 byte order mark
  if (const auto z = text.find('\0'); z != std::string::npos) {
    errs.add(static_cast<std::size_t>(std::count(text.begin(), text.begin() + static_cast<std::ptrdiff_t>(z), '\n')) + 1, 0, "",
             "the file holds a NUL byte: it is not a text (CSV) file");
    return out;
  }
  // The separator: given, or the one the first line (outside quotes) uses most.
  char sep = limits.separator;
  if (!sep) {
    std::size_t k = i;
    while (k < n) {  // the first line that is neither blank nor a comment
      std::size_t b = k;
      while (b < n && (blank(text[b]) || text[b] == '\r')) ++b;
      if (b < n && (text[b] == '\n' || text[b] == '#')) {
        const std::size_t e = text.find('\n', b);
        k = e == std::string::npos ? n : e + 1;
        continue;
      }
      break;
    }
    std::size_t commas = 0, semicolons = 0, tabs = 0;
    bool quoted = false;
    for (; k < n && (quoted || text[k] != '\n'); ++k) {
      const char c = text[k];
      if (c == '"') quoted = !quoted;
      else if (!quoted) { commas += c == ','; semicolons += c == ';'; tabs += c == '\t'; }
    }
    sep = ',';
    if (semicolons > commas && semicolons >= tabs) sep = ';';
    else if (tabs > commas && tabs > semicolons) sep = '\t';
  }
  out.table.separator = sep;
  auto is_blank = [&](char c) { return c == ' ' || (c == '\t' && sep != '\t'); };
  bool have_header = false;
  auto end_of_line = [&](std::size_t k) {  // index of the '\n' ending this line, or n
    const std::size_t e = text.find('\n', k);
    return e == std::string::npos ? n : e;
  };
  auto skip_line = [&]() {
    const std::size_t e = end_of_line(i);
    i = e < n ? e + 1 : n;
    ++line;
  };
  while (i < n) {
    // Blank lines and comments, at the start of a record only.
    {
      std::size_t k = i;
      while (k < n && (is_blank(text[k]) || text[k] == '\r')) ++k;
      if (k >= n) break;
      if (text[k] == '\n' || text[k] == '#') { skip_line(); continue; }
    }
    CsvRow row;
    row.line = line;
    bool bad = false;
    std::size_t field = 1;
    while (true) {
      while (i < n && is_blank(text[i])) ++i;
      std::string value;
      if (i < n && text[i] == '"') {
        const std::size_t open_line = line;
        ++i;
        bool closed = false;
        while (i < n) {
          const char c = text[i];
          if (c == '"') {
            if (i + 1 < n && text[i + 1] == '"') { value += '"'; i += 2; continue; }
            ++i;
            closed = true;
            break;
          }
          if (c == '\n') ++line;
          if (c == '\r' && i + 1 < n && text[i + 1] == '\n') { ++i; continue; }  // CRLF inside quotes -> LF
          value += c;
          ++i;
        }
        if (!closed) {
          errs.add(open_line, field, "", "a quoted field is not closed (it opens on this line)");
          out.table.rows.clear();
          return out;
        }
        while (i < n && is_blank(text[i])) ++i;
        if (i < n && text[i] != sep && text[i] != '\n' && text[i] != '\r') {
          errs.add(line, field, "", std::string("unexpected text after a closing quote (got '") + text[i] +
                                        "'; a quote inside a quoted field is written twice: \"\")");
          bad = true;
        }
      } else {
        const std::size_t start = i;
        while (i < n && text[i] != sep && text[i] != '\n' && text[i] != '\r') ++i;
        value = text.substr(start, i - start);
        while (!value.empty() && is_blank(value.back())) value.pop_back();
        if (value.find('"') != std::string::npos && !bad) {
          errs.add(line, field, "", "a quote inside an unquoted field (quote the whole field, and write a quote inside it twice)");
          bad = true;
        }
      }
      if (bad) break;
      row.fields.push_back(std::move(value));
      if (row.fields.size() > limits.max_columns) {
        errs.add(line, field, "", "more than " + std::to_string(limits.max_columns) + " fields");
        bad = true;
        break;
      }
      if (i < n && text[i] == sep) { ++i; ++field; continue; }
      // End of the record.
      if (i < n && text[i] == '\r') ++i;
      if (i < n && text[i] == '\n') ++i;
      ++line;
      break;
    }
    if (bad) {
      // Recover at the next line.
      if (i < n) skip_line();
      continue;
    }
    if (!have_header) {
      out.table.header = std::move(row.fields);
      out.table.header_line = row.line;
      have_header = true;
      for (std::size_t c = 0; c < out.table.header.size(); ++c)
        if (out.table.header[c].empty())
          errs.add(row.line, c + 1, "", "the header gives this column no name");
      continue;
    }
    if (row.fields.size() != out.table.header.size()) {
      errs.add(row.line, 0, "", "has " + std::to_string(row.fields.size()) + (row.fields.size() == 1 ? " field" : " fields") +
                                    ", the header has " + std::to_string(out.table.header.size()));
      continue;
    }
    out.table.rows.push_back(std::move(row));
  }
  if (!have_header && out.errors.empty()) errs.add(0, 0, "", "the file is empty (no header row)");
  // The decimal mark: given, or a comma when the file is not separated by
  // commas and its numbers have commas and never a point.
  {
    auto comma_number = [](const std::string& f) {
      std::size_t k = 0, digits = 0;
      if (k < f.size() && (f[k] == '+' || f[k] == '-')) ++k;
      while (k < f.size() && std::isdigit(static_cast<unsigned char>(f[k]))) { ++k; ++digits; }
      if (digits == 0 || k >= f.size() || f[k] != ',') return false;
      ++k;
      std::size_t after = 0;
      while (k < f.size() && std::isdigit(static_cast<unsigned char>(f[k]))) { ++k; ++after; }
      if (after == 0) return false;
      if (k < f.size() && (f[k] == 'e' || f[k] == 'E')) {
        ++k;
        if (k < f.size() && (f[k] == '+' || f[k] == '-')) ++k;
        std::size_t ex = 0;
        while (k < f.size() && std::isdigit(static_cast<unsigned char>(f[k]))) { ++k; ++ex; }
        if (ex == 0) return false;
      }
      return k == f.size();
    };
    auto point_number = [](const std::string& f) { return f.find('.') != std::string::npos && number(f).has_value(); };
    char mark = limits.decimal;
    if (!mark) {
      std::size_t commas = 0, points = 0;
      for (const auto& r : out.table.rows)
        for (const auto& f : r.fields) { commas += comma_number(f); points += point_number(f); }
      mark = '.';
      if (sep != ',' && commas > 0) {
        if (points == 0) mark = ',';
        else
          errs.add(0, 0, "", "cannot tell the decimal mark: " + std::to_string(commas) + " numbers have a decimal comma and " +
                                 std::to_string(points) + " a decimal point (give --their-decimal comma or point)");
      }
    }
    out.table.decimal = mark;
    if (mark == ',')
      for (auto& r : out.table.rows)
        for (auto& f : r.fields)
          if (comma_number(f)) f[f.find(',')] = '.';
  }
  if (dropped) out.errors.back().reason += " (and " + std::to_string(dropped) + " more errors)";
  return out;
}

CsvRead read_csv_file(const std::string& path, const CsvLimits& limits) {
  CsvRead out;
  std::ifstream in(path, std::ios::binary);
  if (!in) {
    out.errors.push_back({0, 0, "", std::string("cannot open the file (") + std::strerror(errno) + ")"});
    return out;
  }
  in.seekg(0, std::ios::end);
  const std::streamoff size = in.tellg();
  if (size < 0) {
    out.errors.push_back({0, 0, "", "cannot read the file"});
    return out;
  }
  if (static_cast<unsigned long long>(size) > limits.max_file_bytes) {
    out.errors.push_back({0, 0, "", "the file is " + std::to_string(size) + " bytes, over the limit of " +
                                        std::to_string(limits.max_file_bytes) + " bytes"});
    return out;
  }
  in.seekg(0, std::ios::beg);
  std::string text(static_cast<std::size_t>(size), '\0');
  if (size > 0 && !in.read(&text[0], size)) {
    out.errors.push_back({0, 0, "", "cannot read the file"});
    return out;
  }
  return parse_csv_text(text, limits);
}

// ---------------------------------------------------------------------------
// Spreadsheets.

std::string header_name(const std::string& cell) {
  const std::string t = trim(cell);
  if (t.size() >= 3) {
    const char close = t.back();
    const char open = close == ']' ? '[' : close == ')' ? '(' : 0;
    const auto at = open ? t.rfind(open) : std::string::npos;
    if (at != std::string::npos && at > 0) {
      const std::string u = trim(t.substr(at + 1, t.size() - at - 2));
      std::string why;
      if (!u.empty() && input::parse_unit_expression(u, t, &why)) return lower(trim(t.substr(0, at)));
    }
  }
  return lower(t);
}

void place_in_sheet(std::vector<Error>& errors, const CsvTable& table) {
  for (auto& e : errors) {
    e.in_sheet = true;
    if (e.column > 0 && e.column <= table.sheet_columns.size()) e.column = table.sheet_columns[e.column - 1];
  }
}

CsvRead table_from_sheet(const sheet::Sheet& s, const HeaderTest& is_header, const std::string& header_needs,
                         const CsvLimits& limits) {
  CsvRead out;
  out.table.sheet = s.name.empty() ? std::string("(unnamed)") : s.name;
  auto cells_of = [](const sheet::Row& r, std::size_t first, std::size_t last) {
    std::vector<std::string> v(last - first + 1);
    for (const auto& [c, t] : r.cells)
      if (c >= first && c <= last) v[c - first] = trim(t);
    return v;
  };
  std::size_t h = s.rows.size();
  for (std::size_t k = 0; k < s.rows.size() && h == s.rows.size(); ++k) {
    const auto& cs = s.rows[k].cells;
    if (!cs.empty() && is_header(cells_of(s.rows[k], cs.front().first, cs.back().first))) h = k;
  }
  if (h == s.rows.size()) {
    std::string why = "no row of sheet \"" + input::printable_text(out.table.sheet, 60) + "\" looks like the table's header (" +
                      header_needs + ")";
    if (s.rows.empty()) why += ": the sheet is empty";
    out.errors.push_back({0, 0, "", why});
    return out;
  }
  const sheet::Row& head = s.rows[h];
  // The header's columns: from its first to its last named cell; an unnamed
  // column inside them is kept only when it holds something below.
  const std::size_t first = head.cells.front().first, last = head.cells.back().first;
  if (last - first + 1 > limits.max_columns) {
    out.errors.push_back({head.number, 0, "", "the header has more than " + std::to_string(limits.max_columns) + " columns", true});
    return out;
  }
  const std::vector<std::string> names = cells_of(head, first, last);
  std::vector<char> used(names.size(), 0);
  for (std::size_t k = h + 1; k < s.rows.size(); ++k)
    for (const auto& [c, t] : s.rows[k].cells)
      if (c >= first && c <= last && !trim(t).empty()) used[c - first] = 1;
  std::vector<std::size_t> keep;  // offsets into names
  for (std::size_t k = 0; k < names.size(); ++k) {
    if (!names[k].empty()) keep.push_back(k);
    else if (used[k])
      out.errors.push_back({head.number, first + k, "", "the header gives this column no name, and it holds values", true});
  }
  if (!out.ok()) return out;
  out.table.header_line = head.number;
  for (std::size_t k : keep) {
    out.table.header.push_back(names[k]);
    out.table.sheet_columns.push_back(first + k);
  }
  for (std::size_t k = h + 1; k < s.rows.size(); ++k) {
    const std::vector<std::string> all = cells_of(s.rows[k], first, last);
    CsvRow row;
    row.line = s.rows[k].number;
    bool any = false;
    for (std::size_t c : keep) {
      any = any || !all[c].empty();
      row.fields.push_back(all[c]);
    }
    if (any) out.table.rows.push_back(std::move(row));
  }
  return out;
}

CsvRead read_table_file(const std::string& path, const std::string& sheet_name, const HeaderTest& is_header,
                        const std::string& header_needs, const CsvLimits& limits) {
  const sheet::Format format = sheet::format_of_path(path);
  if (format == sheet::Format::None) return read_csv_file(path, limits);
  const sheet::Sheet s = sheet::read_sheet_file(path, format, sheet_name);
  if (!s.ok()) {
    CsvRead out;
    out.errors.push_back({0, 0, "", s.error});
    return out;
  }
  return table_from_sheet(s, is_header, header_needs, limits);
}

// ---------------------------------------------------------------------------
// Options.

const std::vector<std::string>& option_names() {
  static const std::vector<std::string> names = {
      "column", "units", "force-unit", "length-unit", "moment-sign", "deflection-sign",
      "shear-sign", "reaction-sign", "reaction-moment-sign", "tolerance", "case", "separator", "decimal", "sheet"};
  return names;
}

namespace {

const std::vector<std::string> kColumnKeys = {"x", "span", "x_local", "shear", "moment", "deflection", "support", "force", "reaction_moment"};

std::vector<std::string> split(const std::string& s, char sep) {
  std::vector<std::string> out;
  std::string cur;
  for (char c : s) {
    if (c == sep) { out.push_back(trim(cur)); cur.clear(); }
    else cur += c;
  }
  out.push_back(trim(cur));
  return out;
}

template <class E>
std::string choose(E& out, const std::string& value, const std::string& name,
                   const std::vector<std::pair<std::string, E>>& choices) {
  for (const auto& [word, e] : choices)
    if (lower(trim(value)) == word) { out = e; return ""; }
  std::string list;
  for (std::size_t k = 0; k < choices.size(); ++k) list += (k ? (k + 1 == choices.size() ? " or " : ", ") : "") + choices[k].first;
  return name + " must be " + list + " (got \"" + input::printable_text(value, 60) + "\")";
}

}  // namespace

std::string set_option(Options& o, const std::string& name, const std::string& value) {
  if (name == "column") {
    for (const auto& part : split(value, ',')) {
      const auto eq = part.find('=');
      if (eq == std::string::npos) return "a column mapping is ours=theirs, e.g. moment=Mz (got \"" + input::printable_text(part, 60) + "\")";
      const std::string ours = lower(trim(part.substr(0, eq)));
      const std::string theirs = trim(part.substr(eq + 1));
      if (std::find(kColumnKeys.begin(), kColumnKeys.end(), ours) == kColumnKeys.end()) {
        std::string reason = "no column of ours is called \"" + ours + "\"";
        if (auto m = input::did_you_mean(ours, kColumnKeys)) reason += " (did you mean \"" + *m + "\"?)";
        return reason + "; ours are x, span, x_local, shear, moment, deflection, support, force, reaction_moment";
      }
      if (theirs.empty()) return "the column mapping for " + ours + " names no column";
      o.columns[ours] = theirs;
    }
    return "";
  }
  if (name == "units") {
    for (const auto& part : split(value, ',')) {
      const auto eq = part.find('=');
      const std::string key = eq == std::string::npos ? "" : lower(trim(part.substr(0, eq)));
      const std::string unit = eq == std::string::npos ? "" : trim(part.substr(eq + 1));
      if (key == "force") { if (auto r = set_option(o, "force-unit", unit); !r.empty()) return r; }
      else if (key == "length") { if (auto r = set_option(o, "length-unit", unit); !r.empty()) return r; }
      else return "units are given as force=UNIT,length=UNIT, e.g. force=N,length=mm (got \"" + input::printable_text(part, 60) + "\")";
    }
    return "";
  }
  if (name == "force-unit") {
    if (!input::force_unit(value)) return "the force unit must be N, kN, MN, lbf or kip (got \"" + input::printable_text(value, 60) + "\")";
    o.force_unit = value;
    return "";
  }
  if (name == "length-unit") {
    if (!input::length_unit(value)) return "the length unit must be mm, cm, m, in or ft (got \"" + input::printable_text(value, 60) + "\")";
    o.length_unit = value;
    return "";
  }
  if (name == "moment-sign")
    return choose(o.moment_sign, value, "the moment sign",
                  {{"sagging-positive", MomentSign::SaggingPositive}, {"hogging-positive", MomentSign::HoggingPositive}});
  if (name == "deflection-sign")
    return choose(o.deflection_sign, value, "the deflection sign",
                  {{"down-positive", DeflectionSign::DownPositive}, {"up-positive", DeflectionSign::UpPositive}});
  if (name == "shear-sign")
    return choose(o.shear_sign, value, "the shear sign", {{"ours", ShearSign::Ours}, {"opposite", ShearSign::Opposite}});
  if (name == "reaction-sign")
    return choose(o.reaction_sign, value, "the reaction sign",
                  {{"up-positive", ReactionSign::UpPositive}, {"down-positive", ReactionSign::DownPositive}});
  if (name == "reaction-moment-sign")
    return choose(o.reaction_moment_sign, value, "the reaction moment sign",
                  {{"counter-clockwise-positive", ReactionMomentSign::CounterClockwisePositive},
                   {"clockwise-positive", ReactionMomentSign::ClockwisePositive}});
  if (name == "tolerance") {
    std::string reason;
    auto t = input::parse_tolerance_text(value, &reason);
    if (!t) return "the tolerance: " + reason;
    o.tolerance = *t;
    return "";
  }
  if (name == "separator")
    return choose(o.limits.separator, value, "the separator", {{"comma", ','}, {"semicolon", ';'}, {"tab", '\t'}});
  if (name == "decimal")
    return choose(o.limits.decimal, value, "the decimal mark", {{"point", '.'}, {"comma", ','}});
  if (name == "sheet") {
    if (value.empty()) return "the sheet name is empty";
    o.sheet = value;
    return "";
  }
  if (name == "case") {
    if (trim(value).empty()) return "the load case name is empty";
    o.load_case = trim(value);
    return "";
  }
  return "no option \"" + name + "\"";
}

// ---------------------------------------------------------------------------
// Units factors.

const std::vector<UnitsFactor>& units_factors() {
  static const std::vector<UnitsFactor> all = [] {
    struct Base { double v; const char* number; const char* gloss; };
    const std::vector<Base> base = {
        {1e3, "1000", "N and kN, or mm and m, or kN and MN"},
        {1e6, "10^6", "N*mm and kN*m"},
        {1e9, "10^9", "N*mm^2 and kN*m^2"},
        {12.0, "12", "in and ft"},
        {144.0, "144", "in^2 and ft^2"},
        {1728.0, "1728", "in^3 and ft^3"},
        {4.4482216152605, "4.448", "N and lbf"},
        {0.3048, "0.3048", "ft and m"},
        {0.0254, "0.0254", "in and m"},
        {25.4, "25.4", "mm and in"},
        {304.8, "304.8", "mm and ft"},
    };
    std::vector<UnitsFactor> bases;
    for (const auto& b : base) bases.push_back({b.v, b.v, std::string(b.number) + " (between " + b.gloss + ")"});
    for (std::size_t a = 0; a < base.size(); ++a)
      for (std::size_t b = a; b < base.size(); ++b)
        bases.push_back({base[a].v * base[b].v, base[a].v * base[b].v,
                         std::string(base[a].number) + " x " + base[b].number + " (between " + base[a].gloss +
                             "; and between " + base[b].gloss + ")"});
    std::vector<UnitsFactor> out;
    auto known = [&](double f) {
      if (std::abs(f - 1.0) <= 1e-9) return true;
      for (const auto& u : out)
        if (std::abs(u.factor - f) <= 1e-9 * std::max(std::abs(f), std::abs(u.factor))) return true;
      return false;
    };
    for (const auto& b : bases) {
      if (!known(b.base)) out.push_back({b.base, b.base, b.words});
      if (!known(1.0 / b.base)) out.push_back({1.0 / b.base, b.base, b.words});
    }
    return out;
  }();
  return all;
}

// ---------------------------------------------------------------------------
// The comparison.

namespace {

constexpr std::size_t kNone = std::numeric_limits<std::size_t>::max();

std::size_t qi(Quantity q) { return static_cast<std::size_t>(q); }

Kind kind_of(Quantity q) {
  switch (q) {
    case Quantity::Shear: return Kind::Shear;
    case Quantity::Moment: return Kind::Moment;
    case Quantity::Deflection: return Kind::Deflection;
    case Quantity::ReactionForce: return Kind::Reaction;
    case Quantity::ReactionMoment: return Kind::Moment;
    case Quantity::MomentMax: case Quantity::MomentMin: return Kind::Moment;
    case Quantity::ShearMax: case Quantity::ShearMin: return Kind::Shear;
    case Quantity::DeflectionMax: case Quantity::DeflectionMin: return Kind::Deflection;
    case Quantity::ReactionMax: case Quantity::ReactionMin: return Kind::Reaction;
  }
  return Kind::Moment;
}

// The ordinary quantity an envelope one bounds (itself for an ordinary one).
Quantity base_of(Quantity q) {
  switch (q) {
    case Quantity::MomentMax: case Quantity::MomentMin: return Quantity::Moment;
    case Quantity::ShearMax: case Quantity::ShearMin: return Quantity::Shear;
    case Quantity::DeflectionMax: case Quantity::DeflectionMin: return Quantity::Deflection;
    case Quantity::ReactionMax: case Quantity::ReactionMin: return Quantity::ReactionForce;
    default: return q;
  }
}

// Max <-> min of an envelope quantity (itself for an ordinary one).
Quantity partner(Quantity q) {
  switch (q) {
    case Quantity::MomentMax: return Quantity::MomentMin;
    case Quantity::MomentMin: return Quantity::MomentMax;
    case Quantity::ShearMax: return Quantity::ShearMin;
    case Quantity::ShearMin: return Quantity::ShearMax;
    case Quantity::DeflectionMax: return Quantity::DeflectionMin;
    case Quantity::DeflectionMin: return Quantity::DeflectionMax;
    case Quantity::ReactionMax: return Quantity::ReactionMin;
    case Quantity::ReactionMin: return Quantity::ReactionMax;
    default: return q;
  }
}

input::Dimension dimension_of(Quantity q) {
  switch (base_of(q)) {
    case Quantity::Shear: case Quantity::ReactionForce: return {1, 0};
    case Quantity::Moment: case Quantity::ReactionMoment: return {1, 1};
    case Quantity::Deflection: return {0, 1};
    default: break;
  }
  return {0, 0};
}

double median(std::vector<double>& v) {
  if (v.empty()) return 0.0;
  std::sort(v.begin(), v.end());
  const std::size_t n = v.size();
  return n % 2 ? v[n / 2] : 0.5 * (v[n / 2 - 1] + v[n / 2]);
}

// A number cell: decimal, optional sign and exponent, nothing else.
std::optional<double> number(const std::string& cell) {
  std::string s = trim(cell);
  if (s.empty()) return std::nullopt;
  for (char c : s)
    if (!(std::isdigit(static_cast<unsigned char>(c)) || c == '+' || c == '-' || c == '.' || c == 'e' || c == 'E'))
      return std::nullopt;
  const char* b = s.data();
  const char* e = s.data() + s.size();
  if (*b == '+') {
    ++b;
    if (b == e || *b == '-' || *b == '+') return std::nullopt;
  }
  double v = 0;
  auto [p, ec] = std::from_chars(b, e, v);
  if (ec != std::errc() || p != e || !std::isfinite(v)) return std::nullopt;
  return v;
}

// Our values at one position: the two limits where the value jumps.
struct Probe {
  bool exists = true;   // false: the position is not in the beam (a support beyond the ends)
  std::array<std::optional<double>, kQuantities> left, right;
  int forced = 0;       // -1: compare with the left limit; +1: the right one; 0: either
};

// A position in the beam: a node, or a point inside (or at the end of) a span.
struct Pos {
  bool node = false;
  std::size_t index = 0;  // node or span
  double local = 0;
  bool jump = false;      // inside a span where a point force or couple acts
};

struct Geometry {
  const Beam& beam;
  std::vector<double> node_x;                     // n + 1
  std::vector<std::vector<double>> jumps;         // per span: locals of point forces / couples, sorted
  double total = 0;
  double eps = 0;

  explicit Geometry(const Beam& b) : beam(b) {
    node_x.assign(b.spans.size() + 1, 0.0);
    for (std::size_t s = 0; s < b.spans.size(); ++s) node_x[s + 1] = node_x[s] + b.spans[s].length;
    total = node_x.back();
    eps = 1e-6 * total;
    jumps.resize(b.spans.size());
    for (const auto& l : b.loads)
      if (!l.on_node && l.index < jumps.size() && (l.type == LoadType::Point || l.type == LoadType::Couple))
        jumps[l.index].push_back(l.at);
    for (auto& j : jumps) std::sort(j.begin(), j.end());
  }
  std::size_t spans() const { return beam.spans.size(); }
  double length(std::size_t s) const { return beam.spans[s].length; }

  // Inside span s at `local` (clamped), snapped to a point load nearby.
  Pos inside(std::size_t s, double local) const {
    Pos p;
    p.index = s;
    p.local = std::min(std::max(local, 0.0), length(s));
    const auto& j = jumps[s];
    auto it = std::lower_bound(j.begin(), j.end(), p.local - eps);
    if (it != j.end() && std::abs(*it - p.local) <= eps && *it > 0.0 && *it < length(s)) {
      p.local = *it;
      p.jump = true;
    }
    return p;
  }
  // A global x (clamped to the beam): a node if within eps of one.
  Pos global(double x) const {
    x = std::min(std::max(x, 0.0), total);
    auto it = std::lower_bound(node_x.begin(), node_x.end(), x - eps);
    if (it != node_x.end() && std::abs(*it - x) <= eps) {
      Pos p;
      p.node = true;
      p.index = static_cast<std::size_t>(it - node_x.begin());
      return p;
    }
    auto up = std::upper_bound(node_x.begin(), node_x.end(), x);
    std::size_t s = static_cast<std::size_t>(up - node_x.begin());
    s = s == 0 ? 0 : std::min(s - 1, spans() - 1);
    return inside(s, x - node_x[s]);
  }
};

// The raw position of a station row, before any correction.
struct RawStation {
  bool global = true;
  double x = 0;          // global, beam file units
  std::size_t span = 0;  // 0-based, with local
  double local = 0;
};

struct Row {
  std::size_t line = 0;
  std::string where;
  RawStation pos;
  long node = 0;  // reactions: 0-based node as written (may be one beyond the ends)
  std::array<std::optional<double>, kQuantities> raw, theirs;
  int forced = 0;
};

class Consensus {
 public:
  explicit Consensus(const LoadSet& set) : set_(set) {
    for (const auto& m : set.methods)
      if (m.status == MethodStatus::Ok &&
          (set.envelope ? m.envelope_model || m.moving_model : static_cast<bool>(m.solution.at)))
        ok_.push_back(&m);
  }
  bool empty() const { return ok_.empty(); }
  // The median of the methods' envelope value of `q`.
  double envelope(input::Quantity q, std::size_t span, double local, bool after) const {
    std::vector<double> v;
    for (auto* m : ok_)
      if (const auto e = envelope_value(*m, q, span, local, after)) v.push_back(*e);
    return median(v);
  }
  // The consensus deflection envelope at a station at global x, if there is one.
  std::optional<Bound> deflection_at(double x, double eps) const {
    const auto& st = set_.stations;
    const auto& d = set_.consensus_envelope.deflection;
    for (std::size_t i = 0; i < st.size() && i < d.size(); ++i)
      if (std::abs(st[i].x - x) <= eps) return d[i];
    return std::nullopt;
  }
  std::array<double, 3> at(std::size_t span, double local, bool after) const {
    std::array<std::vector<double>, 3> v;
    for (auto* m : ok_) {
      const PointValues p = m->solution.at(span, local, after);
      v[0].push_back(p.shear);
      v[1].push_back(p.moment);
      v[2].push_back(p.deflection);
    }
    return {median(v[0]), median(v[1]), median(v[2])};
  }
  Probe probe(const Geometry& g, const Pos& p) const {
    Probe r;
    auto put = [](std::array<std::optional<double>, kQuantities>& to, const std::array<double, 3>& v) {
      to[qi(Quantity::Shear)] = v[0];
      to[qi(Quantity::Moment)] = v[1];
      to[qi(Quantity::Deflection)] = v[2];
    };
    if (set_.envelope) {
      using IQ = input::Quantity;
      auto put_env = [&](std::array<std::optional<double>, kQuantities>& to, std::size_t span, double local, bool after) {
        to[qi(Quantity::MomentMax)] = envelope(IQ::MomentMax, span, local, after);
        to[qi(Quantity::MomentMin)] = envelope(IQ::MomentMin, span, local, after);
        to[qi(Quantity::ShearMax)] = envelope(IQ::ShearMax, span, local, after);
        to[qi(Quantity::ShearMin)] = envelope(IQ::ShearMin, span, local, after);
      };
      if (p.node) {
        if (p.index > 0) put_env(r.left, p.index - 1, g.length(p.index - 1), false);
        if (p.index < g.spans()) put_env(r.right, p.index, 0.0, false);
      } else {
        put_env(r.left, p.index, p.local, false);
        if (p.jump) put_env(r.right, p.index, p.local, true);
      }
      // Deflection is continuous: one value, from the station there.
      const double x = p.node ? g.node_x[p.index] : g.node_x[p.index] + p.local;
      if (auto d = deflection_at(x, g.eps)) {
        auto& side = r.left[qi(Quantity::MomentMax)] ? r.left : r.right;
        side[qi(Quantity::DeflectionMax)] = d->max;
        side[qi(Quantity::DeflectionMin)] = d->min;
      }
      return r;
    }
    if (p.node) {
      if (p.index > 0) put(r.left, at(p.index - 1, g.length(p.index - 1), false));
      if (p.index < g.spans()) put(r.right, at(p.index, 0.0, false));
    } else {
      put(r.left, at(p.index, p.local, false));
      if (p.jump) put(r.right, at(p.index, p.local, true));
    }
    return r;
  }
  Probe reaction(long node) const {
    Probe r;
    if (set_.envelope) {
      if (node < 0 || static_cast<std::size_t>(node) >= set_.beam.node_count()) {
        r.exists = false;
        return r;
      }
      const std::size_t k = static_cast<std::size_t>(node);
      r.left[qi(Quantity::ReactionMax)] = envelope(input::Quantity::ReactionMax, k, 0.0, false);
      r.left[qi(Quantity::ReactionMin)] = envelope(input::Quantity::ReactionMin, k, 0.0, false);
      return r;
    }
    if (node < 0 || static_cast<std::size_t>(node) >= set_.consensus_nodes.size()) {
      r.exists = false;
      return r;
    }
    const NodeResult& n = set_.consensus_nodes[static_cast<std::size_t>(node)];
    r.left[qi(Quantity::ReactionForce)] = n.reaction_force;
    r.left[qi(Quantity::ReactionMoment)] = n.reaction_moment;
    return r;
  }

 private:
  const LoadSet& set_;
  std::vector<const MethodResult*> ok_;
};

struct Match {
  bool exists = false;
  double ours = 0;
  Side side = Side::Continuous;
  bool from_pair = false;
};

// Our value to compare `theirs` with at a probe.
Match match(const Probe& p, std::size_t q, double theirs, double scale) {
  Match m;
  if (!p.exists) return m;
  const auto& L = p.left[q];
  const auto& R = p.right[q];
  if (!L && !R) return m;
  m.exists = true;
  if (L && R && std::abs(*L - *R) > 1e-9 * scale + 1e-300) {
    if (p.forced != 0) {
      m.side = p.forced < 0 ? Side::Left : Side::Right;
      m.from_pair = true;
    } else {
      m.side = std::abs(theirs - *L) <= std::abs(theirs - *R) ? Side::Left : Side::Right;
    }
    m.ours = m.side == Side::Left ? *L : *R;
  } else {
    m.ours = L ? *L : *R;
  }
  return m;
}

bool within(double difference, double tolerance, double scale) {
  // A tolerance is a closed bound; allow for rounding of the tolerance itself.
  return std::abs(difference) <= tolerance * (1 + 1e-12) + 1e-15 * scale;
}

std::string percent(double relative) {
  const double pct = 100.0 * relative;
  if (pct < 0.001) return "within 0.001%";
  char buf[64];
  std::snprintf(buf, sizeof buf, "%.2g%%", pct);
  return buf;
}

// The column of a key in the header, by the user's mapping or our name.
struct Columns {
  std::vector<std::string> header;
  std::map<std::string, std::size_t> by_name;  // lower-case header name -> index
  const Options* options = nullptr;
  // kNone when absent. `mapped_missing` is set when the user named it and it is not there.
  std::size_t find(const std::string& key, bool* mapped_missing = nullptr, bool unmapped = false) const {
    auto m = unmapped ? options->columns.end() : options->columns.find(key);
    const std::string name = lower(m == options->columns.end() ? key : m->second);
    auto it = by_name.find(name);
    if (it == by_name.end()) {
      if (mapped_missing) *mapped_missing = m != options->columns.end();
      return kNone;
    }
    return it->second;
  }
  std::string name_of(const std::string& key) const {
    auto m = options->columns.find(key);
    return m == options->columns.end() ? key : m->second;
  }
};

struct Hypothesis {
  int geometry = 0;   // stations: 0 as read, 1 right to left, 2 local x; reactions: 0, 1 right to left, 3 shift +1, 4 shift -1
  int sign = 1;
  const UnitsFactor* factor = nullptr;
  std::size_t mistakes() const { return (geometry != 0) + (sign < 0) + (factor != nullptr); }
};

std::string sign_words(Quantity q, const Options& o) {
  if (is_envelope(q)) return sign_words(base_of(q), o) + " (max and min swapped)";
  switch (q) {
    case Quantity::Moment:
      return o.moment_sign == MomentSign::SaggingPositive ? "read as hogging-positive" : "read as sagging-positive";
    case Quantity::Deflection:
      return o.deflection_sign == DeflectionSign::DownPositive ? "read as up-positive" : "read as down-positive";
    case Quantity::Shear:
      return o.shear_sign == ShearSign::Ours ? "read with the opposite shear sign (V = -dM/dx)"
                                             : "read with our shear sign (V = dM/dx)";
    case Quantity::ReactionForce:
      return o.reaction_sign == ReactionSign::UpPositive ? "read as down-positive" : "read as up-positive";
    case Quantity::ReactionMoment:
      return o.reaction_moment_sign == ReactionMomentSign::CounterClockwisePositive ? "read as clockwise-positive"
                                                                                    : "read as counter-clockwise-positive";
    default: break;
  }
  return "";
}

std::string geometry_words(int g, bool stations) {
  switch (g) {
    case 1:
      if (!stations) return "the nodes are taken as numbered from the right end";
      return "the beam is taken as read right to left (x -> L - x, shear sign reversed)";
    case 2: return "x is taken as the position within each span (x_local, a new span where x falls back)";
    case 3: return "each support is taken as the next node (labels one behind, as when nodes are counted from 0)";
    case 4: return "each support is taken as the node before (labels one ahead)";
  }
  return "";
}

}  // namespace

Comparison compare_table(const input::BeamFile& file, const BeamResult& result, const CsvTable& table,
                         const std::string& display, const Options& options) {
  Comparison out;
  out.file = display;
  out.units = result.units;
  std::size_t dropped = 0;
  ErrorList errs{&out.errors, std::max<std::size_t>(options.limits.max_errors, 1), &dropped};
  auto finish = [&]() -> Comparison& {
    if (dropped && !out.errors.empty()) out.errors_not_listed = dropped;
    return out;
  };

  // The load set.
  if (result.status == BeamStatus::Invalid || result.sets.empty()) {
    errs.add(0, 0, "", "the beam file is not valid, so there is nothing to compare with");
    return finish();
  }
  const LoadSet* set = nullptr;
  if (!options.load_case.empty()) {
    for (const auto& s : result.sets)
      if (s.name == options.load_case) set = &s;
    if (!set) {
      std::string names;
      for (const auto& s : result.sets) names += (names.empty() ? "" : ", ") + s.name;
      errs.add(0, 0, "", "the beam has no load case \"" + options.load_case + "\" (it has " + names + ")");
      return finish();
    }
  } else if (result.sets.size() > 1) {
    std::string names;
    for (const auto& s : result.sets) names += (names.empty() ? "" : ", ") + s.name;
    errs.add(0, 0, "", "the beam has several load cases (" + names + "): name the one this file holds");
    return finish();
  } else {
    set = &result.sets.front();
  }
  out.load_case = set->name;
  const Consensus consensus(*set);
  if (consensus.empty()) {
    errs.add(0, 0, "", "no method could analyse the beam, so there is nothing to compare with");
    return finish();
  }
  const Beam& beam = set->beam;
  const Geometry geo(beam);

  // Units.
  out.their_units = result.units;
  if (!options.force_unit.empty()) {
    auto f = input::force_unit(options.force_unit);
    if (!f) { errs.add(0, 0, "", "unknown force unit \"" + options.force_unit + "\""); return finish(); }
    out.their_units.force = options.force_unit;
    out.their_units.newtons = *f;
  }
  if (!options.length_unit.empty()) {
    auto l = input::length_unit(options.length_unit);
    if (!l) { errs.add(0, 0, "", "unknown length unit \"" + options.length_unit + "\""); return finish(); }
    out.their_units.length = options.length_unit;
    out.their_units.metres = *l;
  }
  const double kf = out.their_units.newtons / result.units.newtons;
  const double kl = out.their_units.metres / result.units.metres;
  const std::string& lu = out.their_units.length;
  std::array<double, kQuantities> factor{}, sign{};
  factor[qi(Quantity::Shear)] = kf;
  factor[qi(Quantity::Moment)] = kf * kl;
  factor[qi(Quantity::Deflection)] = kl;
  factor[qi(Quantity::ReactionForce)] = kf;
  factor[qi(Quantity::ReactionMoment)] = kf * kl;
  sign[qi(Quantity::Shear)] = options.shear_sign == ShearSign::Ours ? 1 : -1;
  sign[qi(Quantity::Moment)] = options.moment_sign == MomentSign::SaggingPositive ? 1 : -1;
  sign[qi(Quantity::Deflection)] = options.deflection_sign == DeflectionSign::DownPositive ? 1 : -1;
  sign[qi(Quantity::ReactionForce)] = options.reaction_sign == ReactionSign::UpPositive ? 1 : -1;
  sign[qi(Quantity::ReactionMoment)] =
      options.reaction_moment_sign == ReactionMomentSign::CounterClockwisePositive ? 1 : -1;
  for (std::size_t q = qi(Quantity::MomentMax); q < kQuantities; ++q) {
    factor[q] = factor[qi(base_of(static_cast<Quantity>(q)))];
    sign[q] = sign[qi(base_of(static_cast<Quantity>(q)))];
  }
  // Where a column's values go: a reversed sign also swaps max and min.
  auto slot = [&](Quantity q) { return is_envelope(q) && sign[qi(q)] < 0 ? partner(q) : q; };

  // Tolerances.
  const input::Tolerance tol = options.tolerance.value_or(file.claim_tolerance);
  std::array<double, kQuantities> scale{}, tolerance{};
  for (std::size_t q = 0; q < kQuantities; ++q) {
    scale[q] = set->scale[static_cast<std::size_t>(kind_of(static_cast<Quantity>(q)))];
    tolerance[q] = tol.relative ? tol.value * scale[q] : tol.value;
  }

  // The header.
  Columns cols;
  cols.header = table.header;
  cols.options = &options;
  const std::size_t hl = table.header_line;
  // A unit in a header ("Defl [mm]", "M (kN*m)"): the name without it
  // also finds the column, and the column is read in that unit.
  std::vector<std::string> col_unit(table.header.size());
  auto split_unit = [](const std::string& h, std::string& name, std::string& unit) {
    const std::string t = trim(h);
    name = t;
    unit.clear();
    if (t.size() < 3) return;
    const char close = t.back();
    const char open = close == ']' ? '[' : close == ')' ? '(' : 0;
    if (!open) return;
    const auto at = t.rfind(open);
    if (at == std::string::npos || at == 0) return;
    std::string u = trim(t.substr(at + 1, t.size() - at - 2));
    std::string why;
    if (u.empty() || !input::parse_unit_expression(u, h, &why)) return;
    name = trim(t.substr(0, at));
    unit = u;
  };
  for (std::size_t c = 0; c < table.header.size(); ++c) {
    const std::string key = lower(trim(table.header[c]));
    auto [it, fresh] = cols.by_name.emplace(key, c);
    if (!fresh)
      errs.add(hl, c + 1, table.header[c],
               "the column name appears twice (columns " + std::to_string(it->second + 1) + " and " +
                   std::to_string(c + 1) + ")");
    std::string bare;
    split_unit(table.header[c], bare, col_unit[c]);
    if (!col_unit[c].empty()) cols.by_name.emplace(lower(bare), c);  // the full name wins a clash
  }
  if (!out.errors.empty()) return finish();
  // A row of units under the header: every cell a unit or empty, at least
  // one unit, no number.
  std::size_t first_row = 0;
  if (!table.rows.empty()) {
    const CsvRow& r0 = table.rows.front();
    bool units_row = true, any_unit = false;
    for (const auto& f : r0.fields) {
      const std::string t = trim(f);
      if (t.empty()) continue;
      std::string u = t, why;
      if (u.size() >= 2 && ((u.front() == '[' && u.back() == ']') || (u.front() == '(' && u.back() == ')')))
        u = trim(u.substr(1, u.size() - 2));
      if (number(t) || !input::parse_unit_expression(u, t, &why)) { units_row = false; break; }
      any_unit = true;
    }
    if (units_row && any_unit) {
      first_row = 1;
      for (std::size_t c = 0; c < r0.fields.size() && c < col_unit.size(); ++c) {
        std::string u = trim(r0.fields[c]);
        if (u.size() >= 2 && ((u.front() == '[' && u.back() == ']') || (u.front() == '(' && u.back() == ')')))
          u = trim(u.substr(1, u.size() - 2));
        if (u.empty()) continue;
        if (!col_unit[c].empty() && col_unit[c] != u)
          errs.add(r0.line, c + 1, table.header[c],
                   "the units row says \"" + input::printable_text(u, 40) + "\" but the header says \"" + col_unit[c] + "\"");
        col_unit[c] = u;
      }
      if (!out.errors.empty()) return finish();
    }
  }
  // The factor from a column's own unit to ours, for a quantity of
  // dimension `dim`; an error at the header cell when it is not one.
  auto column_factor = [&](std::size_t c, input::Dimension dim, double fallback) -> double {
    if (c == kNone || c >= col_unit.size() || col_unit[c].empty()) return fallback;
    const input::QuantityText q = input::parse_quantity("1 " + col_unit[c], dim, result.units);
    if (!q.ok) {
      errs.add(hl, c + 1, table.header[c], "the column's unit \"" + input::printable_text(col_unit[c], 40) + "\" is not a " +
                                               input::dimension_name(dim) + " unit (" + q.reason + ")");
      return fallback;
    }
    return q.value;
  };

  const std::size_t c_support = cols.find("support"), c_x = cols.find("x"), c_span = cols.find("span"),
                    c_local = cols.find("x_local");
  if (c_support != kNone && (c_x != kNone || c_span != kNone)) {
    errs.add(hl, c_support + 1, table.header[c_support],
             "the header has both a support column and a position column (" + cols.name_of(c_x != kNone ? "x" : "span") +
                 "); a file holds either stations or reactions");
    return finish();
  }
  if (c_support == kNone && c_x == kNone && c_span == kNone) {
    std::string reason = "cannot tell what the file holds: the header has no \"" + cols.name_of("x") + "\" or \"" +
                         cols.name_of("span") + "\" column (stations) and no \"" + cols.name_of("support") +
                         "\" column (reactions)";
    if (table.header.size() == 1 && (table.header[0].find(';') != std::string::npos || table.header[0].find('\t') != std::string::npos ||
                                     table.header[0].find(',') != std::string::npos)) {
      reason += "; the header is one field: give the file's separator with --their-separator comma, semicolon or tab";
    } else {
      std::string found;
      for (std::size_t k = 0; k < table.header.size() && k < 12; ++k)
        found += (k ? ", " : "") + ("\"" + input::printable_text(table.header[k], 40) + "\"");
      if (table.header.size() > 12) found += ", ...";
      reason += "; the columns are " + found + ": name yours with --column, e.g. --column x=" +
                (table.header.empty() ? std::string("Distance") : input::printable_text(table.header[0], 40));
    }
    errs.add(hl, 0, "", reason);
    return finish();
  }
  out.kind = c_support != kNone ? TableKind::Reactions : TableKind::Stations;
  const bool stations = out.kind == TableKind::Stations;

  // The value columns. In a reaction table the couple is "reaction_moment"
  // when that is mapped, else a mapped "moment" that is there, else "moment".
  // An envelope load set takes the envelope columns instead.
  using Wanted = std::vector<std::pair<Quantity, std::string>>;
  Wanted ordinary, envelope;
  if (stations) {
    ordinary = {{Quantity::Shear, "shear"}, {Quantity::Moment, "moment"}, {Quantity::Deflection, "deflection"}};
    envelope = {{Quantity::MomentMax, "moment_max"},       {Quantity::MomentMin, "moment_min"},
                {Quantity::ShearMax, "shear_max"},         {Quantity::ShearMin, "shear_min"},
                {Quantity::DeflectionMax, "deflection_max"}, {Quantity::DeflectionMin, "deflection_min"}};
  } else {
    ordinary = {{Quantity::ReactionForce, "force"},
                {Quantity::ReactionMoment, options.columns.count("reaction_moment") ? "reaction_moment" : "moment"}};
    envelope = {{Quantity::ReactionMax, "reaction_max"}, {Quantity::ReactionMin, "reaction_min"}};
  }
  const Wanted& wanted = set->envelope ? envelope : ordinary;
  for (const auto& [q, key] : set->envelope ? ordinary : envelope) {
    std::size_t c = cols.find(key);
    if (c == kNone && !stations && q == Quantity::ReactionMoment && key == "moment") c = cols.find(key, nullptr, true);
    if (c == kNone) continue;
    std::string names;
    for (std::size_t k = 0; k < wanted.size(); ++k) names += (k ? ", " : "") + cols.name_of(wanted[k].second);
    if (set->envelope)
      errs.add(hl, c + 1, table.header[c],
               "\"" + input::printable_text(table.header[c], 60) + "\" is an ordinary value, but load set \"" + set->name +
                   "\" is an envelope (a combination with a pattern or a factor range): give " + names + " instead");
    else
      errs.add(hl, c + 1, table.header[c],
               "\"" + table.header[c] + "\" is an envelope value, but load set \"" + set->name +
                   "\" is not an envelope: name a combination with a pattern or a factor range in the case option");
  }
  std::array<std::size_t, kQuantities> c_value;
  c_value.fill(kNone);
  bool any = false;
  for (const auto& [q, key] : wanted) {
    bool missing = false;
    c_value[qi(q)] = cols.find(key, &missing);
    if (!stations && q == Quantity::ReactionMoment && key == "moment" && missing) {
      // A "moment" mapping for the station file: the reaction file keeps "moment".
      c_value[qi(q)] = cols.find(key, nullptr, true);
      missing = false;
    }
    if (missing) {
      std::string have;
      for (const auto& h : table.header) have += (have.empty() ? "" : ", ") + h;
      errs.add(hl, 0, "", "no column \"" + options.columns.at(key) + "\" (given for " + key + "); the header has " + have);
    }
    any = any || c_value[qi(q)] != kNone;
  }
  if (!out.errors.empty()) return finish();
  if (!any) {
    std::string names;
    for (std::size_t k = 0; k < wanted.size(); ++k)
      names += (k ? (k + 1 == wanted.size() ? " or " : ", ") : "") + ("\"" + cols.name_of(wanted[k].second) + "\"");
    errs.add(hl, 0, "", std::string("no column to compare: a ") + (stations ? "station" : "reaction") +
                            " file needs at least one of " + names);
    return finish();
  }
  bool global = true;
  if (stations && c_x == kNone) {
    global = false;
    if (c_local == kNone) {
      errs.add(hl, c_span + 1, table.header[c_span],
               "a \"" + cols.name_of("span") + "\" column needs an \"" + cols.name_of("x_local") + "\" column beside it");
      return finish();
    }
  }

  // Columns read but not compared are named, never skipped without a word.
  {
    std::vector<char> used(table.header.size(), 0);
    for (std::size_t c : {c_support, c_x, c_span, c_local})
      if (c != kNone && c < used.size()) used[c] = 1;
    for (std::size_t c : c_value)
      if (c != kNone && c < used.size()) used[c] = 1;
    for (std::size_t c = 0; c < table.header.size(); ++c)
      if (!used[c])
        out.notes.push_back("column " + std::to_string(c + 1) + " (\"" + input::printable_text(table.header[c], 40) +
                            "\") is not compared: trivet compares " +
                            (stations ? (set->envelope ? "the envelope's moment, shear and deflection columns"
                                                       : "shear, moment and deflection")
                                      : (set->envelope ? "reaction_max and reaction_min" : "force and moment")) +
                            " (name a column with --column if it is one of these)");
  }
  // Columns with a unit of their own (header or units row).
  const double kx = column_factor(c_x, {0, 1}, kl), kxl = column_factor(c_local, {0, 1}, kl);
  const std::string lux = c_x != kNone && !col_unit[c_x].empty() ? col_unit[c_x] : lu;
  const std::string luxl = c_local != kNone && !col_unit[c_local].empty() ? col_unit[c_local] : lu;
  for (std::size_t q = 0; q < kQuantities; ++q)
    if (c_value[q] != kNone) factor[q] = column_factor(c_value[q], dimension_of(static_cast<Quantity>(q)), factor[q]);
  if (!out.errors.empty()) return finish();

  // The rows.
  const std::size_t n = geo.spans();
  std::vector<Row> rows;
  rows.reserve(table.rows.size());
  std::array<std::size_t, kQuantities> empty_cells{};  // per quantity, cells left empty
  bool beyond = false;
  double max_x = 0;
  bool negative = false;
  std::size_t first_outside = kNone;
  for (std::size_t ri = first_row; ri < table.rows.size(); ++ri) {
    const CsvRow& tr = table.rows[ri];
    Row r;
    r.line = tr.line;
    bool row_ok = true;
    auto cell_error = [&](std::size_t c, const std::string& reason) {
      errs.add(tr.line, c + 1, table.header[c], reason);
      row_ok = false;
    };
    auto read_number = [&](std::size_t c, bool required) -> std::optional<double> {
      const std::string& s = tr.fields[c];
      if (trim(s).empty()) {
        if (required) cell_error(c, "the cell is empty");
        return std::nullopt;
      }
      auto v = number(s);
      if (!v) cell_error(c, "not a number (got \"" + input::printable_text(s, 60) + "\")");
      return v;
    };
    if (stations) {
      if (global) {
        if (auto x = read_number(c_x, true)) {
          const double xs = *x * kx;
          max_x = std::max(max_x, *x);
          negative = negative || xs < -geo.eps;
          if (xs < -geo.eps || xs > geo.total + geo.eps) {
            if (first_outside == kNone) first_outside = out.errors.size();
            cell_error(c_x, "x = " + input::format_number(*x) + " " + lux + " is outside the beam (0 to " +
                                nice(geo.total / kx) + " " + lux + ")");
          }
          r.pos.global = true;
          r.pos.x = std::min(std::max(xs, 0.0), geo.total);
          r.where = "x = " + input::format_number(*x) + " " + lux;
        }
      } else {
        auto sp = read_number(c_span, true);
        auto lo = read_number(c_local, true);
        if (sp) {
          const double s = *sp;
          if (std::abs(s - std::round(s)) > 0 || s < 1)
            cell_error(c_span, "a span number is a whole number from 1 to " + std::to_string(n) + " (got " +
                                   tr.fields[c_span] + ")");
          else if (s > static_cast<double>(n))
            cell_error(c_span, "span " + input::format_number(s) + " does not exist (the beam has " + std::to_string(n) +
                                   (n == 1 ? " span)" : " spans)"));
          else if (lo) {
            const std::size_t si = static_cast<std::size_t>(s) - 1;
            const double L = geo.length(si);
            const double xl = *lo * kxl;
            if (xl < -geo.eps || xl > L + geo.eps)
              cell_error(c_local, "x_local = " + input::format_number(*lo) + " " + luxl + " is outside span " +
                                      std::to_string(si + 1) + " (0 to " + nice(L / kxl) + " " + luxl + ")");
            r.pos.global = false;
            r.pos.span = si;
            r.pos.local = std::min(std::max(xl, 0.0), L);
            r.where = "span " + std::to_string(si + 1) + ", x_local = " + input::format_number(*lo) + " " + luxl;
          }
        }
      }
    } else {
      const std::string text = trim(tr.fields[c_support]);
      r.where = "support " + text;
      long node = -2;
      bool found = false;
      for (std::size_t k = 0; k < beam.labels.size() && !found; ++k)
        if (beam.labels[k] == text) { node = static_cast<long>(k); found = true; }
      for (std::size_t k = 0; k < beam.labels.size() && !found; ++k)
        if (lower(beam.labels[k]) == lower(text)) { node = static_cast<long>(k); found = true; }
      // The next name of the beam's own lettering past its last node (E after
      // A to D): a node beyond the end, as a number past the last would be,
      // so that labels shifted by one are found (the diagnosis below).
      if (!found && beam.labels.size() == beam.node_count()) {
        bool default_lettering = true;
        for (std::size_t k = 0; k < beam.labels.size() && default_lettering; ++k)
          default_lettering = beam.labels[k] == input::default_label(k);
        if (default_lettering && lower(text) == lower(input::default_label(beam.node_count()))) {
          node = static_cast<long>(beam.node_count());
          found = true;
        }
      }
      if (!found) {
        auto v = number(text);
        if (text.empty()) {
          cell_error(c_support, "the cell is empty");
        } else if (v && std::abs(*v - std::round(*v)) <= 0 && std::abs(*v) < 1e9) {
          node = static_cast<long>(std::lround(*v)) - 1;
          found = true;
        } else {
          cell_error(c_support, "no node \"" + input::printable_text(text, 60) + "\" in the beam (nodes " + beam.labels.front() + " to " +
                                    beam.labels.back() + ", or numbers 1 to " + std::to_string(beam.node_count()) + ")");
        }
      }
      r.node = node;
      if (found && (node < 0 || node >= static_cast<long>(beam.node_count()))) beyond = true;
    }
    for (const auto& [q, key] : wanted) {
      const std::size_t c = c_value[qi(q)];
      if (c == kNone) continue;
      if (trim(tr.fields[c]).empty()) ++empty_cells[qi(q)];
      if (auto v = read_number(c, false)) {
        const std::size_t k = qi(slot(q));
        r.raw[k] = *v;
        r.theirs[k] = *v * factor[qi(q)] * sign[qi(q)];
      }
    }
    if (row_ok) rows.push_back(std::move(r));
  }
  // Positions past the end that would fit in another length unit.
  if (first_outside != kNone && first_outside < out.errors.size() && !negative) {
    for (const char* unit : {"mm", "cm", "m", "in", "ft"}) {
      if (unit == lu) continue;
      const double f = *input::length_unit(unit) / result.units.metres;
      if (max_x * f <= geo.total + geo.eps && max_x * f >= 0.5 * geo.total) {
        out.errors[first_outside].reason += "; the positions would fit the beam in " + std::string(unit);
        break;
      }
    }
  }
  // Support numbers beyond the ends: kept (and failing) only when one shift
  // by one node brings every row into the beam, which the diagnosis tests.
  if (!stations && beyond) {
    const long nn = static_cast<long>(beam.node_count());
    bool fits_plus = true, fits_minus = true;
    for (const auto& r : rows) {
      fits_plus = fits_plus && r.node + 1 >= 0 && r.node + 1 < nn;
      fits_minus = fits_minus && r.node - 1 >= 0 && r.node - 1 < nn;
    }
    if (!fits_plus && !fits_minus)
      for (const auto& r : rows)
        if (r.node < 0 || r.node >= nn)
          errs.add(r.line, c_support + 1, table.header[c_support],
                   "no node " + std::to_string(r.node + 1) + " in the beam (nodes 1 to " + std::to_string(nn) + ", " +
                       beam.labels.front() + " to " + beam.labels.back() + ")");
  }
  if (!out.errors.empty()) return finish();
  if (rows.empty()) {
    errs.add(hl, 0, "", "the file has a header but no rows");
    return finish();
  }

  // A position given twice in a row: the first is the left limit, the second the right.
  if (stations) {
    auto same = [&](const RawStation& a, const RawStation& b) {
      if (a.global != b.global) return false;
      if (a.global) return std::abs(a.x - b.x) <= geo.eps;
      return a.span == b.span && std::abs(a.local - b.local) <= geo.eps;
    };
    for (std::size_t i = 0; i + 1 < rows.size(); ++i)
      if (rows[i].forced == 0 && same(rows[i].pos, rows[i + 1].pos)) {
        rows[i].forced = -1;
        rows[i + 1].forced = +1;
      }
  }

  // Our values at the rows, under each reading of their positions.
  // Geometries: 0 as read; 1 right to left; 2 local x as global (global
  // tables); 3, 4 support labels shifted by +1 / -1 (reactions).
  std::map<int, std::optional<std::vector<Probe>>> probes;
  auto probes_for = [&](int g) -> const std::optional<std::vector<Probe>>& {
    auto it = probes.find(g);
    if (it != probes.end()) return it->second;
    std::optional<std::vector<Probe>> ps;
    std::vector<Probe> v;
    v.reserve(rows.size());
    bool applicable = true;
    if (stations) {
      std::size_t seg = 0;
      for (std::size_t i = 0; i < rows.size() && applicable; ++i) {
        const RawStation& p = rows[i].pos;
        Pos pos;
        if (g == 0) {
          pos = p.global ? geo.global(p.x) : geo.inside(p.span, p.local);
        } else if (g == 1) {
          pos = p.global ? geo.global(geo.total - p.x) : geo.inside(n - 1 - p.span, geo.length(p.span) - p.local);
        } else if (g == 2) {
          if (!p.global) { applicable = false; break; }
          if (i > 0 && p.x < rows[i - 1].pos.x - geo.eps) ++seg;
          if (seg >= n || p.x > geo.length(seg) + geo.eps) { applicable = false; break; }
          pos = geo.inside(seg, p.x);
        } else {
          applicable = false;
          break;
        }
        Probe pr = consensus.probe(geo, pos);
        pr.forced = rows[i].forced;
        if (g == 1) {
          pr.forced = -pr.forced;
          for (auto* side : {&pr.left, &pr.right}) {
            auto& sd = *side;
            if (sd[qi(Quantity::Shear)]) sd[qi(Quantity::Shear)] = -*sd[qi(Quantity::Shear)];
            // Read from the other end, the largest shear is minus the smallest.
            const auto mx = sd[qi(Quantity::ShearMax)], mn = sd[qi(Quantity::ShearMin)];
            sd[qi(Quantity::ShearMax)].reset();
            sd[qi(Quantity::ShearMin)].reset();
            if (mn) sd[qi(Quantity::ShearMax)] = -*mn;
            if (mx) sd[qi(Quantity::ShearMin)] = -*mx;
          }
        }
        v.push_back(pr);
      }
    } else {
      const long nn = static_cast<long>(beam.node_count());
      for (const auto& r : rows) {
        long k = r.node;
        if (g == 1) k = nn - 1 - k;
        else if (g == 3) k = k + 1;
        else if (g == 4) k = k - 1;
        else if (g != 0) { applicable = false; break; }
        v.push_back(consensus.reaction(k));
      }
    }
    if (applicable) ps = std::move(v);
    return probes.emplace(g, std::move(ps)).first->second;
  };

  // Compare as read.
  const auto& base = *probes_for(0);
  std::array<Summary, kQuantities> sums;
  std::array<bool, kQuantities> present{};
  for (std::size_t i = 0; i < rows.size(); ++i) {
    RowResult rr;
    rr.line = rows[i].line;
    rr.where = rows[i].where;
    rr.x = rows[i].pos.global ? rows[i].pos.x : beam.node_x(rows[i].pos.span) + rows[i].pos.local;
    if (out.kind == TableKind::Reactions && rows[i].node >= 0 && rows[i].node < static_cast<long>(beam.node_count()))
      rr.node = static_cast<std::size_t>(rows[i].node);
    for (const auto& [q, key] : wanted) {
      const std::size_t k = qi(q);
      if (!rows[i].theirs[k]) continue;
      present[k] = true;
      Cell c;
      c.quantity = q;
      c.raw = *rows[i].raw[k];
      c.theirs = *rows[i].theirs[k];
      c.tolerance = tolerance[k];
      const Match m = match(base[i], k, c.theirs, scale[k]);
      Summary& s = sums[k];
      s.quantity = q;
      s.tolerance = tolerance[k];
      ++s.compared;
      if (!m.exists) {
        c.reason = stations ? "the deflection envelope is known only at trivet's stations, and there is none here "
                              "(stations_per_span in the beam file places more)"
                            : "no node " + std::to_string(rows[i].node + 1) + " in the beam";
        c.difference = c.theirs;
      } else {
        c.ours = m.ours;
        c.side = m.side;
        c.side_from_pair = m.from_pair;
        c.difference = c.theirs - c.ours;
        c.holds = within(c.difference, c.tolerance, scale[k]);
      }
      if (!c.holds) ++s.failing;
      if (s.worst_line == 0 || std::abs(c.difference) > std::abs(s.worst_difference)) {
        s.worst_difference = c.difference;
        s.worst_line = rr.line;
        s.worst_where = rr.where;
      }
      rr.cells.push_back(c);
    }
    out.rows.push_back(std::move(rr));
  }

  // Diagnosis.
  std::vector<int> geometries = stations ? std::vector<int>{0, 1, 2} : std::vector<int>{0, 1, 3, 4};
  std::vector<const UnitsFactor*> factors = {nullptr};
  for (const auto& u : units_factors()) factors.push_back(&u);
  for (std::size_t k = 0; k < kQuantities; ++k) {
    if (!present[k] && empty_cells[k] > 0) {
      // A column with no value at all: said, not silently dropped.
      sums[k].quantity = static_cast<Quantity>(k);
      present[k] = true;
    }
    if (!present[k]) continue;
    Summary& s = sums[k];
    s.empty = empty_cells[k];
    const Quantity q = static_cast<Quantity>(k);
    if (s.failing > 0) {
      std::optional<Hypothesis> best;
      double best_residual = 0;
      for (int g : geometries) {
        const auto& ps = probes_for(g);
        if (!ps) continue;
        for (int sg : {1, -1})
          for (const UnitsFactor* f : factors) {
            Hypothesis h{g, sg, f};
            if (h.mistakes() == 0) continue;
            if (best && h.mistakes() > best->mistakes()) continue;
            const double m = sg / (f ? f->factor : 1.0);
            double worst = 0;
            bool all = true, meaningful = false;
            for (std::size_t i = 0; i < rows.size() && all; ++i) {
              if (!rows[i].theirs[k]) continue;
              const double t = *rows[i].theirs[k] * m;
              // A reversed sign also swaps max and min.
              const Match mt = match((*ps)[i], sg < 0 ? qi(partner(q)) : k, t, scale[k]);
              if (!mt.exists) { all = false; break; }
              const double d = t - mt.ours;
              if (!within(d, tolerance[k], scale[k])) { all = false; break; }
              worst = std::max(worst, std::abs(d));
              meaningful = meaningful || std::abs(mt.ours) > 2 * tolerance[k];
            }
            if (!all) continue;
            if (!meaningful) continue;
            if (!best || h.mistakes() < best->mistakes() || worst < best_residual) {
              best = h;
              best_residual = worst;
            }
          }
      }
      if (best) {
        Finding f;
        f.quantity = q;
        std::vector<std::string> words;
        if (best->geometry != 0) {
          f.mistakes.push_back(best->geometry == 1 ? Mistake::RightToLeft
                               : best->geometry == 2 ? Mistake::LocalAsGlobal
                                                     : Mistake::SupportShift);
          if (best->geometry >= 3) f.shift = best->geometry == 3 ? 1 : -1;
          words.push_back(geometry_words(best->geometry, stations));
        }
        if (best->sign < 0) {
          f.mistakes.push_back(Mistake::OppositeSign);
          words.push_back(sign_words(q, options));
        }
        if (best->factor) {
          f.mistakes.push_back(Mistake::UnitsFactor);
          f.factor = best->factor->factor;
          const bool divide = best->factor->factor > 1.0;
          words.push_back(std::string(divide ? "divided by " : "multiplied by ") + best->factor->words);
        }
        f.residual = best_residual;
        f.residual_relative = scale[k] > 0 ? best_residual / scale[k] : best_residual;
        std::string joined;
        for (std::size_t w = 0; w < words.size(); ++w) joined += (w ? " and " : "") + words[w];
        const std::string kind = kind_name(kind_of(q));
        f.text = std::string("the ") + quantity_plural(q) + " match to " +
                 (scale[k] > 0 ? percent(f.residual_relative) + " of the largest " + kind
                               : "within " + nice(best_residual) + " " + result.units.of(dimension_of(q))) +
                 " if " + joined;
        s.finding = std::move(f);
      } else {
        s.note = stations ? "no usual mistake (opposite sign, a units factor, the beam read right to left, local x "
                            "taken as global) makes every row hold"
                          : "no usual mistake (opposite sign, a units factor, support labels shifted by one, nodes "
                            "counted from the right) makes every row hold";
      }
    }
    out.summary.push_back(std::move(s));
  }
  return finish();
}

bool is_against_header(const std::vector<std::string>& cells, const Options& options) {
  for (const char* key : {"x", "span", "support"}) {
    const auto m = options.columns.find(key);
    const std::string want = lower(trim(m == options.columns.end() ? std::string(key) : m->second));
    for (const auto& c : cells)
      if (lower(trim(c)) == want || header_name(c) == want) return true;
  }
  return false;
}

namespace {
std::string against_header_needs() {
  return "a cell x or span for stations, or support for reactions, or the names given with --column";
}
}  // namespace

namespace {

// A table that could not be read: nothing compared, the errors said.
Comparison unreadable(const std::string& name, const BeamResult& result, std::vector<Error> errors) {
  Comparison out;
  out.file = name;
  out.units = result.units;
  out.errors = std::move(errors);
  return out;
}

// Compares a table read from a CSV file or a sheet; errors of a sheet name
// its rows and columns.
Comparison compare_read(const input::BeamFile& file, const BeamResult& result, CsvRead&& read, const std::string& name,
                        const Options& options) {
  if (!read.ok()) return unreadable(name, result, std::move(read.errors));
  Comparison out = compare_table(file, result, read.table, name, options);
  if (!read.table.sheet.empty()) {
    place_in_sheet(out.errors, read.table);
    out.notes.insert(out.notes.begin(), "read from sheet \"" + input::printable_text(read.table.sheet, 60) +
                                            "\", its header on row " + std::to_string(read.table.header_line) +
                                            " (line numbers are the sheet's rows)");
  }
  return out;
}

}  // namespace

Comparison compare_text(const input::BeamFile& file, const BeamResult& result, const std::string& text,
                        const std::string& display, const Options& options) {
  return compare_read(file, result, parse_csv_text(text, options.limits), display, options);
}

Comparison compare_file(const input::BeamFile& file, const BeamResult& result, const std::string& path,
                        const Options& options, const std::string& display) {
  const std::string name = display.empty() ? path : display;
  const HeaderTest test = [&](const std::vector<std::string>& cells) { return is_against_header(cells, options); };
  if (!options.sheet.empty() && sheet::format_of_path(path) == sheet::Format::None)
    return unreadable(name, result, {{0, 0, "", "a sheet is named (\"" + input::printable_text(options.sheet, 60) +
                                                     "\"), but this is not an .xlsx or .ods file"}});
  return compare_read(file, result, read_table_file(path, options.sheet, test, against_header_needs(), options.limits),
                      name, options);
}

Comparison compare_sheet_bytes(const input::BeamFile& file, const BeamResult& result, const std::string& bytes,
                               sheet::Format format, const std::string& display, const Options& options) {
  sheet::Limits sl;
  sl.max_file_bytes = options.limits.max_file_bytes;
  const sheet::Sheet s = sheet::read_sheet_bytes(bytes, format, options.sheet, sl);
  CsvRead read;
  if (!s.ok()) read.errors.push_back({0, 0, "", s.error});
  else
    read = table_from_sheet(
        s, [&](const std::vector<std::string>& cells) { return is_against_header(cells, options); },
        against_header_needs(), options.limits);
  return compare_read(file, result, std::move(read), display, options);
}

}  // namespace trivet::compare::against
