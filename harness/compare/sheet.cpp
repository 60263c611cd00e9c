// trivet: one sheet of an .xlsx or .ods file as rows of text cells. See sheet.h.
#include "harness/compare/sheet.h"

#include <algorithm>
#include <cerrno>
#include <charconv>
#include <cmath>
#include <cstring>
#include <fstream>
#include <limits>
#include <map>
#include <memory>
#include <optional>

#include <pugixml.hpp>
#include <zip.h>

#include "harness/input/reader.h"

namespace trivet::compare::sheet {

Format format_of_path(const std::string& path) {
  auto ends = [&](const char* e) {
    const std::size_t n = std::strlen(e);
    if (path.size() < n) return false;
    for (std::size_t k = 0; k < n; ++k)
      if (std::tolower(static_cast<unsigned char>(path[path.size() - n + k])) != e[k]) return false;
    return true;
  };
  if (ends(".xlsx")) return Format::Xlsx;
  if (ends(".ods")) return Format::Ods;
  return Format::None;
}

std::string column_letters(std::size_t column) {
  std::string s;
  while (column > 0) {
    const std::size_t r = (column - 1) % 26;
    s.insert(s.begin(), static_cast<char>('A' + r));
    column = (column - 1) / 26;
  }
  return s;
}

namespace {

// Thrown inside this file only, caught by read_sheet_bytes: why the file
// cannot be read.
struct Bad {
  std::string reason;
};

std::string quoted(const std::string& s) { return "\"" + input::printable_text(s, 60) + "\""; }

// The zip container (libzip), read from memory.
class Zip {
 public:
  Zip(const std::string& bytes, const Limits& limits) : limits_(limits) {
    zip_error_t err;
    zip_error_init(&err);
    zip_source_t* src = zip_source_buffer_create(bytes.data(), bytes.size(), 0, &err);
    if (!src) {
      const std::string why = zip_error_strerror(&err);
      zip_error_fini(&err);
      throw Bad{"cannot read the zip container (" + why + ")"};
    }
    zip_ = zip_open_from_source(src, ZIP_RDONLY, &err);
    if (!zip_) {
      const int code = zip_error_code_zip(&err);
      const std::string why = zip_error_strerror(&err);
      zip_source_free(src);
      zip_error_fini(&err);
      if (code == ZIP_ER_NOZIP || code == ZIP_ER_INCONS)
        throw Bad{"not a spreadsheet: an .xlsx or .ods file is a zip archive, and this is not one (" + why + ")"};
      throw Bad{"cannot read the zip container (" + why + ")"};
    }
    zip_error_fini(&err);
  }
  ~Zip() {
    if (zip_) zip_discard(zip_);
  }
  Zip(const Zip&) = delete;
  Zip& operator=(const Zip&) = delete;

  // The uncompressed bytes of part `name`, or nothing when the zip has no such part.
  std::optional<std::string> part(const std::string& name) {
    const zip_int64_t index = zip_name_locate(zip_, name.c_str(), 0);
    if (index < 0) return std::nullopt;
    const auto idx = static_cast<zip_uint64_t>(index);
    zip_stat_t st;
    zip_stat_init(&st);
    if (zip_stat_index(zip_, idx, 0, &st) == 0 && (st.valid & ZIP_STAT_SIZE) && st.size > limits_.max_part_bytes)
      throw Bad{"its part " + name + " is " + std::to_string(st.size) + " bytes uncompressed, over the limit of " +
                std::to_string(limits_.max_part_bytes) + " bytes"};
    zip_file_t* f = zip_fopen_index(zip_, idx, 0);
    if (!f) throw Bad{"cannot open its part " + name + " (" + zip_strerror(zip_) + ")"};
    std::string out;
    char buf[1 << 16];
    while (true) {
      const zip_int64_t got = zip_fread(f, buf, sizeof buf);
      if (got < 0) {
        const std::string why = zip_file_strerror(f);
        zip_fclose(f);
        throw Bad{"cannot read its part " + name + " (" + why + ")"};
      }
      if (got == 0) break;
      // The size the zip declares may be false: the bytes read are counted.
      if (out.size() + static_cast<std::size_t>(got) > limits_.max_part_bytes) {
        zip_fclose(f);
        throw Bad{"its part " + name + " is over the limit of " + std::to_string(limits_.max_part_bytes) +
                  " bytes uncompressed"};
      }
      out.append(buf, static_cast<std::size_t>(got));
    }
    zip_fclose(f);
    return out;
  }

 private:
  zip_t* zip_ = nullptr;
  const Limits& limits_;
};

// The name of an element or attribute without its namespace prefix.
const char* local(const char* name) {
  const char* c = std::strrchr(name, ':');
  return c ? c + 1 : name;
}
bool is(const pugi::xml_node& n, const char* name) { return n.type() == pugi::node_element && std::strcmp(local(n.name()), name) == 0; }
pugi::xml_node child(const pugi::xml_node& n, const char* name) {
  for (auto c : n.children())
    if (is(c, name)) return c;
  return {};
}
// An attribute by its local name (and, when given, its prefix).
pugi::xml_attribute attr(const pugi::xml_node& n, const char* name, const char* prefix = nullptr) {
  for (auto a : n.attributes()) {
    if (std::strcmp(local(a.name()), name) != 0) continue;
    if (prefix) {
      const char* colon = std::strrchr(a.name(), ':');
      if (!colon || std::string(a.name(), colon) != prefix) continue;
    }
    return a;
  }
  return {};
}

void parse(pugi::xml_document& doc, const std::string& text, const std::string& part) {
  const pugi::xml_parse_result r = doc.load_buffer(text.data(), text.size(), pugi::parse_default, pugi::encoding_utf8);
  if (!r) throw Bad{"its part " + part + " is not well-formed XML (" + r.description() + ", at byte " + std::to_string(r.offset) + ")"};
}

// A stored number as the shortest text that reads back to the same double.
std::optional<std::string> number_text(const char* stored) {
  std::string s = stored;
  while (!s.empty() && std::isspace(static_cast<unsigned char>(s.back()))) s.pop_back();
  std::size_t b = 0;
  while (b < s.size() && std::isspace(static_cast<unsigned char>(s[b]))) ++b;
  if (b < s.size() && s[b] == '+') ++b;
  if (b >= s.size()) return std::nullopt;
  for (std::size_t k = b; k < s.size(); ++k) {
    const char c = s[k];
    if (!(std::isdigit(static_cast<unsigned char>(c)) || c == '-' || c == '+' || c == '.' || c == 'e' || c == 'E')) return std::nullopt;
  }
  double v = 0;
  const auto [p, ec] = std::from_chars(s.data() + b, s.data() + s.size(), v);
  if (ec != std::errc() || p != s.data() + s.size() || !std::isfinite(v)) return std::nullopt;
  return input::format_number(v);
}

// Collects the cells, with the limits on rows, columns and cells.
struct Builder {
  const Limits& limits;
  Sheet& sheet;
  std::size_t cells = 0;
  void add(std::size_t row, std::size_t column, std::string text) {
    if (text.empty()) return;
    if (row > limits.max_rows)
      throw Bad{"the sheet has a cell beyond row " + std::to_string(limits.max_rows) + " (row " + std::to_string(row) + ")"};
    if (column > limits.max_columns)
      throw Bad{"the sheet has a cell beyond column " + column_letters(limits.max_columns) + " (row " + std::to_string(row) + ")"};
    if (++cells > limits.max_cells)
      throw Bad{"the sheet has more than " + std::to_string(limits.max_cells) + " cells that hold something"};
    if (sheet.rows.empty() || sheet.rows.back().number != row) {
      if (!sheet.rows.empty() && sheet.rows.back().number > row)
        throw Bad{"the sheet's rows are out of order (row " + std::to_string(row) + " after row " +
                  std::to_string(sheet.rows.back().number) + ")"};
      sheet.rows.push_back({row, {}});
    }
    auto& cs = sheet.rows.back().cells;
    if (!cs.empty() && cs.back().first >= column)
      throw Bad{"the sheet's cells are out of order in row " + std::to_string(row) + " (column " + column_letters(column) +
                " after column " + column_letters(cs.back().first) + ")"};
    cs.push_back({column, std::move(text)});
  }
};

// ---------------------------------------------------------------------------
// .xlsx (Office Open XML)

// The text of a shared string or an inline string: its <t> elements, runs
// included, phonetic readings (<rPh>) left out.
void xlsx_text(const pugi::xml_node& n, std::string& out) {
  for (auto c : n.children()) {
    if (c.type() != pugi::node_element) continue;
    if (is(c, "rPh")) continue;
    if (is(c, "t")) out += c.text().get();
    else xlsx_text(c, out);
  }
}

// "B3" -> column 2, row 3; false when it is not a cell reference.
bool cell_ref(const char* r, std::size_t& column, std::size_t& row) {
  std::size_t k = 0, c = 0, w = 0;
  while (r[k] >= 'A' && r[k] <= 'Z') {
    c = c * 26 + static_cast<std::size_t>(r[k] - 'A' + 1);
    if (++k > 3) return false;
  }
  if (k == 0) return false;
  const std::size_t digits = k;
  while (r[k] >= '0' && r[k] <= '9') {
    w = w * 10 + static_cast<std::size_t>(r[k] - '0');
    if (++k - digits > 7) return false;
  }
  if (k == digits || r[k] != '\0' || w == 0) return false;
  column = c;
  row = w;
  return true;
}

void read_xlsx(Zip& zip, const std::string& wanted, const Limits& limits, Sheet& out) {
  const auto workbook = zip.part("xl/workbook.xml");
  if (!workbook) throw Bad{"not an .xlsx workbook: the zip has no xl/workbook.xml"};
  pugi::xml_document wb;
  parse(wb, *workbook, "xl/workbook.xml");
  std::vector<std::pair<std::string, std::string>> sheets;  // name, relationship id
  for (auto s : child(child(wb, "workbook"), "sheets").children())
    if (is(s, "sheet")) sheets.push_back({s.attribute("name").value(), attr(s, "id").value()});
  for (const auto& s : sheets) out.names.push_back(s.first);
  if (sheets.empty()) throw Bad{"the workbook lists no sheets (xl/workbook.xml)"};
  const std::pair<std::string, std::string>* chosen = &sheets.front();
  if (!wanted.empty()) {
    chosen = nullptr;
    for (const auto& s : sheets)
      if (s.first == wanted) chosen = &s;
  }
  if (!chosen) return;  // the caller names the sheets found
  out.name = chosen->first;

  // The part of the sheet, from the workbook's relationships.
  const auto rels_text = zip.part("xl/_rels/workbook.xml.rels");
  if (!rels_text) throw Bad{"not an .xlsx workbook: the zip has no xl/_rels/workbook.xml.rels"};
  pugi::xml_document rels;
  parse(rels, *rels_text, "xl/_rels/workbook.xml.rels");
  std::string target;
  for (auto r : child(rels, "Relationships").children())
    if (is(r, "Relationship") && chosen->second == r.attribute("Id").value()) target = r.attribute("Target").value();
  if (target.empty())
    throw Bad{"the workbook names no part for sheet " + quoted(chosen->first) + " (xl/_rels/workbook.xml.rels)"};
  std::string path = target[0] == '/' ? target.substr(1) : "xl/" + target;
  while (path.compare(0, 2, "./") == 0) path.erase(0, 2);

  // Shared strings (a workbook without text cells may have none).
  std::vector<std::string> shared;
  if (const auto sst_text = zip.part("xl/sharedStrings.xml")) {
    pugi::xml_document sst;
    parse(sst, *sst_text, "xl/sharedStrings.xml");
    for (auto si : child(sst, "sst").children())
      if (is(si, "si")) {
        shared.emplace_back();
        xlsx_text(si, shared.back());
      }
  }

  const auto sheet_text = zip.part(path);
  if (!sheet_text) throw Bad{"the zip has no " + path + ", the part of sheet " + quoted(chosen->first)};
  pugi::xml_document doc;
  parse(doc, *sheet_text, path);
  Builder b{limits, out};
  std::size_t row = 0;
  for (auto r : child(child(doc, "worksheet"), "sheetData").children()) {
    if (!is(r, "row")) continue;
    if (auto ra = r.attribute("r")) {
      const unsigned long long v = ra.as_ullong(0);
      if (v == 0 || v > limits.max_rows) throw Bad{path + ": a row number " + quoted(ra.value()) + " that is not one of 1 to " + std::to_string(limits.max_rows)};
      row = static_cast<std::size_t>(v);
    } else {
      ++row;
    }
    std::size_t column = 0;
    for (auto c : r.children()) {
      if (!is(c, "c")) continue;
      std::size_t cr = 0, rr = 0;
      if (auto ref = c.attribute("r")) {
        if (!cell_ref(ref.value(), cr, rr)) throw Bad{path + ": a cell reference " + quoted(ref.value()) + " that does not read (as B3)"};
        if (rr != row) throw Bad{path + ": cell " + quoted(ref.value()) + " stands in row " + std::to_string(row)};
        column = cr;
      } else {
        ++column;
      }
      const std::string type = c.attribute("t").value();
      const std::string where = "cell " + column_letters(column) + std::to_string(row);
      std::string text;
      if (type == "inlineStr") {
        xlsx_text(child(c, "is"), text);
      } else {
        const pugi::xml_node v = child(c, "v");
        if (!v) continue;  // no value: an empty (perhaps formatted) cell
        const char* value = v.text().get();
        if (type.empty() || type == "n") {
          auto n = number_text(value);
          if (!n) throw Bad{path + ": " + where + " is a number cell holding " + quoted(value) + ", which is not a number"};
          text = *n;
        } else if (type == "s") {
          const unsigned long long k = v.text().as_ullong(std::numeric_limits<unsigned long long>::max());
          if (k >= shared.size())
            throw Bad{path + ": " + where + " names shared string " + quoted(value) + ", and there are " + std::to_string(shared.size())};
          text = shared[static_cast<std::size_t>(k)];
        } else if (type == "b") {
          text = std::strcmp(value, "1") == 0 ? "TRUE" : "FALSE";
        } else {  // "str" (a formula's text), "e" (an error such as #DIV/0!), "d" (a date as text)
          text = value;
        }
      }
      b.add(row, column, std::move(text));
    }
  }
}

// ---------------------------------------------------------------------------
// .ods (OpenDocument)

// The text of a paragraph: its text, spans and links, with <text:s> as
// spaces, <text:tab> and <text:line-break>; notes and annotations left out.
void ods_text(const pugi::xml_node& n, std::string& out) {
  for (auto c : n.children()) {
    if (c.type() == pugi::node_pcdata || c.type() == pugi::node_cdata) {
      out += c.value();
    } else if (c.type() == pugi::node_element) {
      if (is(c, "s")) out.append(std::min<std::size_t>(attr(c, "c").as_uint(1), 1000), ' ');
      else if (is(c, "tab")) out += '\t';
      else if (is(c, "line-break")) out += '\n';
      else if (is(c, "note") || is(c, "annotation")) continue;
      else ods_text(c, out);
    }
  }
}

std::size_t repeats(const pugi::xml_node& n, const char* name) {
  const unsigned long long v = attr(n, name).as_ullong(1);
  return v == 0 ? 1 : static_cast<std::size_t>(std::min<unsigned long long>(v, 1ull << 40));
}

std::string ods_cell(const pugi::xml_node& c, const std::string& where) {
  const std::string type = attr(c, "value-type", "office").value();
  if (type == "float" || type == "percentage" || type == "currency") {
    const char* value = attr(c, "value", "office").value();
    auto n = number_text(value);
    if (!n) throw Bad{"content.xml: " + where + " is a number cell holding " + quoted(value) + ", which is not a number"};
    return *n;
  }
  if (type == "boolean") return std::strcmp(attr(c, "boolean-value", "office").value(), "true") == 0 ? "TRUE" : "FALSE";
  if (type == "date") return attr(c, "date-value", "office").value();
  if (type == "time") return attr(c, "time-value", "office").value();
  std::string text;
  bool first = true;
  for (auto p : c.children())
    if (is(p, "p") || is(p, "h")) {
      if (!first) text += '\n';
      first = false;
      ods_text(p, text);
    }
  return text;
}

// The rows of a table, through row groups and header rows.
void ods_rows(const pugi::xml_node& parent, std::size_t& row, const Limits& limits, Builder& b) {
  for (auto r : parent.children()) {
    if (is(r, "table-row-group") || is(r, "table-header-rows") || is(r, "table-rows")) {
      ods_rows(r, row, limits, b);
      continue;
    }
    if (!is(r, "table-row")) continue;
    const std::size_t times = repeats(r, "number-rows-repeated");
    // The row's cells once: (column, text).
    std::vector<std::pair<std::size_t, std::string>> cells;
    std::size_t column = 0;
    for (auto c : r.children()) {
      if (!is(c, "table-cell") && !is(c, "covered-table-cell")) continue;
      const std::size_t n = repeats(c, "number-columns-repeated");
      std::string text = ods_cell(c, "row " + std::to_string(row + 1) + ", column " + column_letters(std::min(column + 1, limits.max_columns + 1)));
      if (!text.empty()) {
        if (column + n > limits.max_columns)
          throw Bad{"the sheet has a cell beyond column " + column_letters(limits.max_columns) + " (row " + std::to_string(row + 1) + ")"};
        for (std::size_t k = 0; k < n; ++k) {
          if (cells.size() >= limits.max_cells)
            throw Bad{"the sheet has more than " + std::to_string(limits.max_cells) + " cells that hold something"};
          cells.push_back({column + k + 1, text});
        }
      }
      column = std::min(column + n, std::size_t{1} << 40);  // trailing empty repeats can be huge: only counted
    }
    if (cells.empty()) {
      row = std::min(row + times, std::size_t{1} << 40);
      continue;
    }
    for (std::size_t k = 0; k < times; ++k) {
      ++row;
      for (const auto& [col, text] : cells) b.add(row, col, text);  // throws past the limits of rows and cells
    }
  }
}

void read_ods(Zip& zip, const std::string& wanted, const Limits& limits, Sheet& out) {
  const auto content = zip.part("content.xml");
  if (!content) throw Bad{"not an .ods spreadsheet: the zip has no content.xml"};
  pugi::xml_document doc;
  parse(doc, *content, "content.xml");
  const pugi::xml_node spreadsheet = child(child(child(doc, "document-content"), "body"), "spreadsheet");
  if (!spreadsheet) throw Bad{"not an .ods spreadsheet: content.xml holds no spreadsheet (a text document?)"};
  std::vector<pugi::xml_node> tables;
  for (auto t : spreadsheet.children())
    if (is(t, "table")) {
      tables.push_back(t);
      out.names.push_back(attr(t, "name", "table").value());
    }
  if (tables.empty()) throw Bad{"the spreadsheet has no sheets (content.xml)"};
  std::size_t chosen = 0;
  if (!wanted.empty()) {
    chosen = tables.size();
    for (std::size_t k = 0; k < tables.size(); ++k)
      if (out.names[k] == wanted) chosen = k;
    if (chosen == tables.size()) return;  // the caller names the sheets found
  }
  out.name = out.names[chosen];
  Builder b{limits, out};
  std::size_t row = 0;
  ods_rows(tables[chosen], row, limits, b);
}

}  // namespace

Sheet read_sheet_bytes(const std::string& bytes, Format format, const std::string& name, const Limits& limits) {
  Sheet out;
  try {
    if (bytes.size() > limits.max_file_bytes)
      throw Bad{"the file is " + std::to_string(bytes.size()) + " bytes, over the limit of " + std::to_string(limits.max_file_bytes) + " bytes"};
    if (format == Format::None) throw Bad{"not a spreadsheet (.xlsx or .ods)"};
    if (bytes.empty()) throw Bad{"the file is empty (an .xlsx or .ods file is a zip archive)"};
    Zip zip(bytes, limits);
    if (format == Format::Xlsx) read_xlsx(zip, name, limits, out);
    else read_ods(zip, name, limits, out);
    if (out.name.empty() && !name.empty()) {
      std::string list;
      for (std::size_t k = 0; k < out.names.size(); ++k) list += (k ? ", " : "") + quoted(out.names[k]);
      throw Bad{"no sheet " + quoted(name) + " in the file (its sheets: " + list + ")"};
    }
  } catch (const Bad& b) {
    out.rows.clear();
    out.error = b.reason;
  } catch (const std::bad_alloc&) {
    out.rows.clear();
    out.error = "out of memory while reading the spreadsheet";
  }
  return out;
}

Sheet read_sheet_file(const std::string& path, Format format, const std::string& name, const Limits& limits) {
  Sheet out;
  std::ifstream in(path, std::ios::binary);
  if (!in) {
    out.error = std::string("cannot open the file (") + std::strerror(errno) + ")";
    return out;
  }
  in.seekg(0, std::ios::end);
  const std::streamoff size = in.tellg();
  if (size < 0) {
    out.error = "cannot read the file";
    return out;
  }
  if (static_cast<unsigned long long>(size) > limits.max_file_bytes) {
    out.error = "the file is " + std::to_string(size) + " bytes, over the limit of " + std::to_string(limits.max_file_bytes) + " bytes";
    return out;
  }
  in.seekg(0, std::ios::beg);
  std::string bytes(static_cast<std::size_t>(size), '\0');
  if (size > 0 && !in.read(&bytes[0], size)) {
    out.error = "cannot read the file";
    return out;
  }
  return read_sheet_bytes(bytes, format, name, limits);
}

}  // namespace trivet::compare::sheet
