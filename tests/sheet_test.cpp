// Tests of spreadsheets as another program's export (--against) and of
// tables of claims (--claims). The .xlsx and .ods files are built here with
// libzip from invented demo data; the expected values are the consensus of
// the methods (agreement between independent methods, no citation needed).
#include "harness/compare/against.h"
#include "harness/compare/claims_table.h"
#include "harness/compare/sheet.h"

#include <gtest/gtest.h>
#include <zip.h>

#include <unistd.h>

#include <algorithm>
#include <cstdio>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <sstream>

namespace trivet::compare {
namespace {

using input::format_number;

// ---------------------------------------------------------------------------
// Writing small spreadsheets (libzip), for the tests only.

struct Cell {
  bool number = false;
  double v = 0;
  std::string text;  // a text cell; empty and not a number: an empty cell
};
Cell N(double v) { return {true, v, ""}; }
Cell S(const std::string& s) { return {false, 0, s}; }
using Rows = std::vector<std::vector<Cell>>;

std::string zip_of(const std::vector<std::pair<std::string, std::string>>& parts) {
  static int serial = 0;
  const auto path = std::filesystem::temp_directory_path() /
                    ("trivet_sheet_test_" + std::to_string(getpid()) + "_" + std::to_string(serial++) + ".zip");
  int err = 0;
  zip_t* z = zip_open(path.string().c_str(), ZIP_CREATE | ZIP_TRUNCATE, &err);
  EXPECT_NE(z, nullptr);
  if (!z) return "";
  for (const auto& [name, data] : parts) {
    zip_source_t* s = zip_source_buffer(z, data.data(), data.size(), 0);
    EXPECT_GE(zip_file_add(z, name.c_str(), s, ZIP_FL_OVERWRITE), 0);
  }
  EXPECT_EQ(zip_close(z), 0);
  std::ifstream in(path, std::ios::binary);
  std::string bytes((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
  std::filesystem::remove(path);
  return bytes;
}

std::string col(std::size_t c) { return sheet::column_letters(c); }

std::string esc(const std::string& s) {
  std::string o;
  for (char c : s) {
    if (c == '<') o += "&lt;";
    else if (c == '&') o += "&amp;";
    else if (c == '"') o += "&quot;";
    else o += c;
  }
  return o;
}

// An .xlsx of named sheets: text cells as shared strings (or, with
// `inline_strings`, inline), numbers with all their digits.
std::string xlsx(const std::vector<std::pair<std::string, Rows>>& sheets, bool inline_strings = false) {
  std::vector<std::pair<std::string, std::string>> parts;
  std::vector<std::string> shared;
  std::string wb = R"(<?xml version="1.0" encoding="UTF-8"?><workbook xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main" xmlns:r="http://schemas.openxmlformats.org/officeDocument/2006/relationships"><sheets>)";
  std::string rels = R"(<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">)";
  for (std::size_t n = 0; n < sheets.size(); ++n) {
    const std::string id = "rId" + std::to_string(n + 1);
    wb += "<sheet name=\"" + esc(sheets[n].first) + "\" sheetId=\"" + std::to_string(n + 1) + "\" r:id=\"" + id + "\"/>";
    rels += "<Relationship Id=\"" + id + "\" Type=\"http://schemas.openxmlformats.org/officeDocument/2006/relationships/worksheet\" Target=\"worksheets/sheet" +
            std::to_string(n + 1) + ".xml\"/>";
    std::string ws = R"(<?xml version="1.0" encoding="UTF-8"?><worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData>)";
    const Rows& rows = sheets[n].second;
    for (std::size_t r = 0; r < rows.size(); ++r) {
      std::string cells;
      for (std::size_t c = 0; c < rows[r].size(); ++c) {
        const Cell& v = rows[r][c];
        const std::string ref = col(c + 1) + std::to_string(r + 1);
        char buf[64];
        if (v.number) {
          std::snprintf(buf, sizeof buf, "%.17g", v.v);
          cells += "<c r=\"" + ref + "\"><v>" + buf + "</v></c>";
        } else if (!v.text.empty()) {
          if (inline_strings) {
            cells += "<c r=\"" + ref + "\" t=\"inlineStr\"><is><t>" + esc(v.text) + "</t></is></c>";
          } else {
            cells += "<c r=\"" + ref + "\" t=\"s\"><v>" + std::to_string(shared.size()) + "</v></c>";
            shared.push_back(v.text);
          }
        }
      }
      if (!cells.empty()) ws += "<row r=\"" + std::to_string(r + 1) + "\">" + cells + "</row>";
    }
    ws += "</sheetData></worksheet>";
    parts.push_back({"xl/worksheets/sheet" + std::to_string(n + 1) + ".xml", ws});
  }
  wb += "</sheets></workbook>";
  rels += "</Relationships>";
  std::string sst = R"(<?xml version="1.0" encoding="UTF-8"?><sst xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main">)";
  for (const auto& s : shared) sst += "<si><t>" + esc(s) + "</t></si>";
  sst += "</sst>";
  parts.push_back({"xl/workbook.xml", wb});
  parts.push_back({"xl/_rels/workbook.xml.rels", rels});
  parts.push_back({"xl/sharedStrings.xml", sst});
  return zip_of(parts);
}

const char* kOdsHead =
    R"(<?xml version="1.0" encoding="UTF-8"?><office:document-content xmlns:office="urn:oasis:names:tc:opendocument:xmlns:office:1.0" xmlns:table="urn:oasis:names:tc:opendocument:xmlns:table:1.0" xmlns:text="urn:oasis:names:tc:opendocument:xmlns:text:1.0"><office:body><office:spreadsheet>)";
const char* kOdsTail = "</office:spreadsheet></office:body></office:document-content>";

// An .ods of named sheets, as a spreadsheet program writes one: numbers with
// a rounded display text, empty cells repeated, and the sheet's trailing
// empty cells and rows as huge repeats.
std::string ods(const std::vector<std::pair<std::string, Rows>>& sheets) {
  std::string c = kOdsHead;
  for (const auto& [name, rows] : sheets) {
    c += "<table:table table:name=\"" + esc(name) + "\">";
    for (const auto& row : rows) {
      c += "<table:table-row>";
      std::size_t empty = 0;
      for (const auto& v : row) {
        if (!v.number && v.text.empty()) { ++empty; continue; }
        if (empty) c += "<table:table-cell table:number-columns-repeated=\"" + std::to_string(empty) + "\"/>";
        empty = 0;
        char buf[64], shown[64];
        if (v.number) {
          std::snprintf(buf, sizeof buf, "%.17g", v.v);
          std::snprintf(shown, sizeof shown, "%.2f", v.v);
          c += std::string("<table:table-cell office:value-type=\"float\" office:value=\"") + buf + "\"><text:p>" + shown +
               "</text:p></table:table-cell>";
        } else {
          c += "<table:table-cell office:value-type=\"string\"><text:p>" + esc(v.text) + "</text:p></table:table-cell>";
        }
      }
      c += "<table:table-cell table:number-columns-repeated=\"16380\"/></table:table-row>";
    }
    c += "<table:table-row table:number-rows-repeated=\"1048000\"><table:table-cell table:number-columns-repeated=\"16384\"/></table:table-row>";
    c += "</table:table>";
  }
  c += kOdsTail;
  return zip_of({{"mimetype", "application/vnd.oasis.opendocument.spreadsheet"}, {"content.xml", c}});
}

// ---------------------------------------------------------------------------
// The beam: two spans (an invented demo), a udl on span 1 and a point force
// inside span 2.

const char* kBeam = R"({
  "title": "two spans",
  "units": {"force": "kN", "length": "m"},
  "spans": [{"length": 6.0, "EI": 40000}, {"length": 4.5, "EI": 40000}],
  "supports": ["pinned", "roller", "roller"],
  "loads": [{"type": "udl", "span": 1, "w": 9.0}, {"type": "point", "span": 2, "P": 16.0, "at": 2.0}],
  "stations_per_span": 6
})";

class Sheets : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    file_ = new input::BeamFile(input::parse_beam_text(kBeam, "beam.json"));
    ASSERT_TRUE(file_->ok());
    result_ = new BeamResult(check(*file_, Options{}));
    ASSERT_EQ(result_->sets.size(), 1u);
    ASSERT_EQ(result_->sets[0].ok_count(), 3u);
  }
  static void TearDownTestSuite() {
    delete result_;
    delete file_;
  }
  static const LoadSet& set() { return result_->sets[0]; }

  // Another program's station table: a title row, an empty row, the header,
  // then each station (moments times `moment_factor`).
  static Rows stations(double moment_factor = 1.0) {
    Rows rows = {{S("Demo export: two-span beam, load set loads")}, {}, {S("x [m]"), S("shear"), S("moment [kN*m]")}};
    for (const auto& s : set().consensus_stations) rows.push_back({N(s.x), N(s.shear), N(s.moment * moment_factor)});
    return rows;
  }
  static against::Comparison compare(const std::string& bytes, sheet::Format f, const std::string& display,
                                     const against::Options& o = {}) {
    return against::compare_sheet_bytes(*file_, *result_, bytes, f, display, o);
  }
  static std::string messages(const against::Comparison& c) {
    std::string m;
    for (const auto& e : c.errors) m += e.format(c.file) + "\n";
    return m;
  }
  static const against::Summary* summary(const against::Comparison& c, against::Quantity q) {
    for (const auto& s : c.summary)
      if (s.quantity == q) return &s;
    ADD_FAILURE() << "no summary for " << against::quantity_name(q);
    return nullptr;
  }
  static bool names(const against::Finding& f, against::Mistake m) {
    return std::find(f.mistakes.begin(), f.mistakes.end(), m) != f.mistakes.end();
  }

  static input::BeamFile* file_;
  static BeamResult* result_;
};

input::BeamFile* Sheets::file_ = nullptr;
BeamResult* Sheets::result_ = nullptr;

// ---------------------------------------------------------------------------
// --against from a sheet.

TEST_F(Sheets, XlsxStationTableBelowATitlePassesAndMomentsTimes1000AreDiagnosed) {
  const auto good = compare(xlsx({{"Results", stations()}}), sheet::Format::Xlsx, "r.xlsx");
  ASSERT_TRUE(good.ok()) << messages(good);
  EXPECT_EQ(good.kind, against::TableKind::Stations);
  EXPECT_TRUE(good.holds());
  ASSERT_EQ(good.rows.size(), set().consensus_stations.size());
  EXPECT_EQ(good.rows.front().line, 4u);  // the sheet's row, below the title, the empty row and the header
  ASSERT_FALSE(good.notes.empty());
  EXPECT_NE(good.notes.front().find("sheet \"Results\", its header on row 3"), std::string::npos) << good.notes.front();
  // Every number came back to the same double: nothing differs at all.
  for (const auto& r : good.rows)
    for (const auto& c : r.cells) EXPECT_LE(std::abs(c.difference), 1e-12 * set().scale[1]) << r.where;

  const auto bad = compare(xlsx({{"Results", stations(1000.0)}}), sheet::Format::Xlsx, "r.xlsx");
  ASSERT_TRUE(bad.ok()) << messages(bad);
  EXPECT_FALSE(bad.holds());
  const auto* m = summary(bad, against::Quantity::Moment);
  ASSERT_TRUE(m && m->finding);
  EXPECT_TRUE(names(*m->finding, against::Mistake::UnitsFactor));
  EXPECT_NEAR(m->finding->factor, 1000.0, 1e-9);
  const auto* v = summary(bad, against::Quantity::Shear);
  ASSERT_TRUE(v);
  EXPECT_EQ(v->failing, 0u);
}

TEST_F(Sheets, InlineStringsReadAsSharedOnes) {
  const auto c = compare(xlsx({{"Results", stations()}}, true), sheet::Format::Xlsx, "r.xlsx");
  ASSERT_TRUE(c.ok()) << messages(c);
  EXPECT_TRUE(c.holds());
}

TEST_F(Sheets, OdsStationTablePassesAndHoggingPositiveMomentsAreDiagnosed) {
  const auto good = compare(ods({{"Stations", stations()}}), sheet::Format::Ods, "r.ods");
  ASSERT_TRUE(good.ok()) << messages(good);
  EXPECT_TRUE(good.holds());
  EXPECT_EQ(good.rows.size(), set().consensus_stations.size());

  const auto bad = compare(ods({{"Stations", stations(-1.0)}}), sheet::Format::Ods, "r.ods");
  ASSERT_TRUE(bad.ok()) << messages(bad);
  EXPECT_FALSE(bad.holds());
  const auto* m = summary(bad, against::Quantity::Moment);
  ASSERT_TRUE(m && m->finding);
  EXPECT_TRUE(names(*m->finding, against::Mistake::OppositeSign));
  EXPECT_NE(m->finding->text.find("hogging-positive"), std::string::npos) << m->finding->text;
}

TEST_F(Sheets, ASheetByNameOrTheFirst) {
  const Rows notes = {{S("Notes")}, {S("the stations are on the next sheet")}};
  for (const auto& [bytes, format] : {std::make_pair(xlsx({{"Notes", notes}, {"Stations", stations()}}), sheet::Format::Xlsx),
                                      std::make_pair(ods({{"Notes", notes}, {"Stations", stations()}}), sheet::Format::Ods)}) {
    against::Options named;
    ASSERT_EQ(against::set_option(named, "sheet", "Stations"), "");
    const auto c = compare(bytes, format, "r", named);
    ASSERT_TRUE(c.ok()) << messages(c);
    EXPECT_TRUE(c.holds());
    // The first sheet, which has no table.
    const auto first = compare(bytes, format, "r");
    ASSERT_EQ(first.errors.size(), 1u);
    EXPECT_EQ(first.errors[0].format("r"),
              "r: no row of sheet \"Notes\" looks like the table's header (a cell x or span for stations, or support for "
              "reactions, or the names given with --column)");
    against::Options wrong;
    ASSERT_EQ(against::set_option(wrong, "sheet", "Results"), "");
    const auto none = compare(bytes, format, "r", wrong);
    ASSERT_EQ(none.errors.size(), 1u);
    EXPECT_EQ(none.errors[0].format("r"), "r: no sheet \"Results\" in the file (its sheets: \"Notes\", \"Stations\")");
  }
  against::Options empty;
  EXPECT_EQ(against::set_option(empty, "sheet", ""), "the sheet name is empty");
}

TEST_F(Sheets, AColumnMappedWithColumnFindsTheHeader) {
  Rows rows = stations();
  rows[2] = {S("Dist"), S("V"), S("Mz")};
  against::Options o;
  ASSERT_EQ(against::set_option(o, "column", "x=Dist,shear=V,moment=Mz"), "");
  const auto c = compare(xlsx({{"Results", rows}}), sheet::Format::Xlsx, "r.xlsx", o);
  ASSERT_TRUE(c.ok()) << messages(c);
  EXPECT_TRUE(c.holds());
}

TEST_F(Sheets, ErrorsNameTheSheetsRowAndColumn) {
  Rows rows = stations();
  rows[5][2] = S("n/a");
  // The table starts in column B: the sheet's columns are named, not the table's.
  for (auto& r : rows) r.insert(r.begin(), Cell{});
  const auto c = compare(xlsx({{"Results", rows}}), sheet::Format::Xlsx, "r.xlsx");
  ASSERT_EQ(c.errors.size(), 1u) << messages(c);
  EXPECT_EQ(c.errors[0].format("r.xlsx"), "r.xlsx: row 6, column D (moment [kN*m]): not a number (got \"n/a\")");
}

TEST_F(Sheets, AUnitsRowUnderTheHeaderAndAnUnnamedColumn) {
  Rows rows = stations(1000.0);  // N*m, said in the units row
  rows[2] = {S("x"), S("shear"), S("moment")};
  rows.insert(rows.begin() + 3, {S("m"), S("kN"), S("N*m")});
  const auto c = compare(ods({{"S", rows}}), sheet::Format::Ods, "r.ods");
  ASSERT_TRUE(c.ok()) << messages(c);
  EXPECT_TRUE(c.holds());
  // A column without a name in the header that holds values is an error at its header cell.
  Rows gap = stations();
  for (std::size_t k = 2; k < gap.size(); ++k) gap[k].insert(gap[k].begin() + 1, k == 2 ? Cell{} : N(1.0));
  const auto g = compare(xlsx({{"S", gap}}), sheet::Format::Xlsx, "g.xlsx");
  ASSERT_EQ(g.errors.size(), 1u) << messages(g);
  EXPECT_EQ(g.errors[0].format("g.xlsx"), "g.xlsx: row 3, column B: the header gives this column no name, and it holds values");
}

// ---------------------------------------------------------------------------
// The sheet reader on its own.

TEST(SheetReader, StoredValuesNotDisplayTextAndCellsByTheirReferences) {
  // 0.1 + 0.2 as stored: its display text would be 0.3.
  const std::string sheet_xml =
      R"(<worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData>)"
      R"(<row r="2"><c r="A2" t="s"><v>0</v></c><c r="C2"><v>0.30000000000000004</v></c><c r="D2" t="b"><v>1</v></c></row>)"
      R"(<row r="5"><c r="B5" t="inlineStr"><is><t>in</t><r><t>line</t></r></is></c><c r="E5"><v>1.5E-3</v></c><c r="F5" t="str"><v>text</v></c></row>)"
      R"(</sheetData></worksheet>)";
  const std::string bytes = zip_of({{"xl/workbook.xml", R"(<workbook xmlns:r="r"><sheets><sheet name="One" sheetId="1" r:id="rId1"/></sheets></workbook>)"},
                                    {"xl/_rels/workbook.xml.rels", R"(<Relationships><Relationship Id="rId1" Target="/xl/worksheets/a.xml"/></Relationships>)"},
                                    {"xl/sharedStrings.xml", R"(<sst><si><r><t>sha</t></r><r><t>red</t></r><rPh><t>reading</t></rPh></si></sst>)"},
                                    {"xl/worksheets/a.xml", sheet_xml}});
  const sheet::Sheet s = sheet::read_sheet_bytes(bytes, sheet::Format::Xlsx, "");
  ASSERT_TRUE(s.ok()) << s.error;
  EXPECT_EQ(s.name, "One");
  ASSERT_EQ(s.rows.size(), 2u);
  EXPECT_EQ(s.rows[0].number, 2u);
  using C = std::vector<std::pair<std::size_t, std::string>>;
  EXPECT_EQ(s.rows[0].cells, (C{{1, "shared"}, {3, "0.30000000000000004"}, {4, "TRUE"}}));
  EXPECT_EQ(s.rows[1].number, 5u);
  EXPECT_EQ(s.rows[1].cells, (C{{2, "inline"}, {5, "0.0015"}, {6, "text"}}));
  // The text reads back to the stored double.
  const double back = std::stod(s.rows[0].cells[1].second), sum = 0.1 + 0.2;
  EXPECT_EQ(std::memcmp(&back, &sum, sizeof back), 0);

  const std::string content = std::string(kOdsHead) +
      R"(<table:table table:name="T"><table:table-row table:number-rows-repeated="2"><table:table-cell/></table:table-row>)"
      R"(<table:table-row><table:table-cell table:number-columns-repeated="2"/>)"
      R"(<table:table-cell office:value-type="float" office:value="0.30000000000000004"><text:p>0.3</text:p></table:table-cell>)"
      R"(<table:table-cell office:value-type="string" table:number-columns-repeated="2"><text:p>a<text:s text:c="2"/>b</text:p><text:p>c</text:p></table:table-cell>)"
      R"(<table:table-cell office:value-type="percentage" office:value="0.05"><text:p>5%</text:p></table:table-cell>)"
      R"(<table:table-cell table:number-columns-repeated="16000"/></table:table-row></table:table>)" + kOdsTail;
  const sheet::Sheet o = sheet::read_sheet_bytes(zip_of({{"content.xml", content}}), sheet::Format::Ods, "");
  ASSERT_TRUE(o.ok()) << o.error;
  ASSERT_EQ(o.rows.size(), 1u);
  EXPECT_EQ(o.rows[0].number, 3u);
  EXPECT_EQ(o.rows[0].cells, (C{{3, "0.30000000000000004"}, {4, "a  b\nc"}, {5, "a  b\nc"}, {6, "0.05"}}));
}

std::string error_of(const std::string& bytes, sheet::Format f, const std::string& name = "", const sheet::Limits& l = {}) {
  const sheet::Sheet s = sheet::read_sheet_bytes(bytes, f, name, l);
  EXPECT_FALSE(s.ok());
  EXPECT_TRUE(s.rows.empty());
  return s.error;
}

TEST(SheetReader, BadFilesGiveTheReason) {
  using sheet::Format;
  EXPECT_EQ(error_of("x,moment\n1,2\n", Format::Xlsx).rfind("not a spreadsheet: an .xlsx or .ods file is a zip archive, and this is not one (", 0), 0u);
  EXPECT_EQ(error_of("", Format::Ods), "the file is empty (an .xlsx or .ods file is a zip archive)");
  const std::string no_parts = zip_of({{"readme.txt", "hello"}});
  EXPECT_EQ(error_of(no_parts, Format::Xlsx), "not an .xlsx workbook: the zip has no xl/workbook.xml");
  EXPECT_EQ(error_of(no_parts, Format::Ods), "not an .ods spreadsheet: the zip has no content.xml");
  EXPECT_EQ(error_of(zip_of({{"content.xml", "<office:document-content><table:table"}}), Format::Ods),
            "its part content.xml is not well-formed XML (Error parsing start element tag, at byte 36)");
  EXPECT_EQ(error_of(zip_of({{"xl/workbook.xml", "<workbook><sheets><sheet name=\"A\" r:id=\"rId1\"/></sheets></workbook>"}}), Format::Xlsx),
            "not an .xlsx workbook: the zip has no xl/_rels/workbook.xml.rels");
  EXPECT_EQ(error_of(zip_of({{"xl/workbook.xml", "<workbook><sheets><sheet name=\"A\" r:id=\"rId1\"/></sheets></workbook>"},
                             {"xl/_rels/workbook.xml.rels", "<Relationships><Relationship Id=\"rId1\" Target=\"worksheets/s.xml\"/></Relationships>"}}),
                     Format::Xlsx),
            "the zip has no xl/worksheets/s.xml, the part of sheet \"A\"");
  EXPECT_EQ(error_of(zip_of({{"xl/workbook.xml", "<workbook><sheets><sheet name=\"A\" r:id=\"rId1\"/></sheets></workbook>"},
                             {"xl/_rels/workbook.xml.rels", "<Relationships><Relationship Id=\"rId1\" Target=\"worksheets/s.xml\"/></Relationships>"},
                             {"xl/worksheets/s.xml", "<worksheet><sheetData><row r=\"1\"><c r=\"A1\" t=\"s\"><v>3</v></c></row></sheetData></worksheet>"}}),
                     Format::Xlsx),
            "xl/worksheets/s.xml: cell A1 names shared string \"3\", and there are 0");
  EXPECT_EQ(error_of(xlsx({{"A", {{N(1)}}}, {"B", {{N(2)}}}}), Format::Xlsx, "C"), "no sheet \"C\" in the file (its sheets: \"A\", \"B\")");
  // A huge file, and a zip bomb: 8 MiB of zeros in a small zip, read up to the limit only.
  sheet::Limits small;
  small.max_file_bytes = 100;
  EXPECT_EQ(error_of(no_parts + std::string(200, ' '), Format::Xlsx, "", small).rfind("the file is ", 0), 0u);
  const std::string bomb = zip_of({{"content.xml", std::string(8u << 20, '\0')}});
  ASSERT_LT(bomb.size(), 100000u);
  sheet::Limits part;
  part.max_part_bytes = 1u << 20;
  EXPECT_EQ(error_of(bomb, Format::Ods, "", part), "its part content.xml is 8388608 bytes uncompressed, over the limit of 1048576 bytes");
  // A row that holds something repeated a million times stops at the cell limit.
  const std::string many = std::string(kOdsHead) +
      R"(<table:table table:name="T"><table:table-row table:number-rows-repeated="1000000"><table:table-cell office:value-type="float" office:value="1" table:number-columns-repeated="100"/></table:table-row></table:table>)" +
      kOdsTail;
  sheet::Limits cells;
  cells.max_cells = 10000;
  EXPECT_EQ(error_of(zip_of({{"content.xml", many}}), Format::Ods, "", cells), "the sheet has more than 10000 cells that hold something");
  const std::string far = std::string(kOdsHead) +
      R"(<table:table table:name="T"><table:table-row table:number-rows-repeated="1048576"><table:table-cell/></table:table-row>)"
      R"(<table:table-row><table:table-cell office:value-type="string"><text:p>below the last row</text:p></table:table-cell></table:table-row></table:table>)" +
      kOdsTail;
  EXPECT_EQ(error_of(zip_of({{"content.xml", far}}), Format::Ods), "the sheet has a cell beyond row 1048576 (row 1048577)");
  EXPECT_EQ(error_of(zip_of({{"content.xml", std::string(kOdsHead) + kOdsTail}}), Format::Ods), "the spreadsheet has no sheets (content.xml)");
  EXPECT_EQ(error_of(zip_of({{"content.xml", std::string(kOdsHead) +
                                                 R"(<table:table table:name="T"><table:table-row><table:table-cell office:value-type="float" office:value="1,5"/></table:table-row></table:table>)" +
                                                 kOdsTail}}),
                     Format::Ods),
            "content.xml: row 1, column A is a number cell holding \"1,5\", which is not a number");
}

TEST_F(Sheets, ABadFileMakesTheComparisonAnErrorNamingTheFile) {
  const auto c = compare("not a zip", sheet::Format::Xlsx, "their.xlsx");
  ASSERT_EQ(c.errors.size(), 1u);
  EXPECT_EQ(c.errors[0].format(c.file).rfind("their.xlsx: not a spreadsheet: an .xlsx or .ods file is a zip archive", 0), 0u)
      << c.errors[0].format(c.file);
  // From a file on disk: by its name's ending; a CSV with a sheet named is refused.
  const auto dir = std::filesystem::temp_directory_path();
  const auto path = dir / ("trivet_sheet_test_" + std::to_string(getpid()) + ".ods");
  {
    std::ofstream f(path, std::ios::binary);
    f << ods({{"S", stations()}});
  }
  const auto disk = against::compare_file(*file_, *result_, path.string());
  EXPECT_TRUE(disk.holds()) << messages(disk);
  std::filesystem::remove(path);
  against::Options o;
  ASSERT_EQ(against::set_option(o, "sheet", "S"), "");
  const auto csv = against::compare_file(*file_, *result_, (dir / "whatever.csv").string(), o, "w.csv");
  ASSERT_EQ(csv.errors.size(), 1u);
  EXPECT_EQ(csv.errors[0].format("w.csv"), "w.csv: a sheet is named (\"S\"), but this is not an .xlsx or .ods file");
}

// ---------------------------------------------------------------------------
// Tables of claims.

class ClaimsTable : public Sheets {
 protected:
  static double station(double x, double StationValues::*what, int nth = 0) {
    for (const auto& s : set().consensus_stations)
      if (std::abs(s.x - x) < 1e-9 && nth-- == 0) return s.*what;
    ADD_FAILURE() << "no station at " << x;
    return 0;
  }
  // Claims that hold: the consensus itself, in the words a person types.
  static Rows holding() {
    const auto& n = set().consensus_nodes;
    return {{S("Hand check, beam G-4")},
            {},
            {S("Quantity"), S("Where"), S("Value"), S("Side"), S("Tolerance"), S("checked by")},
            {S("reaction"), S("A"), N(n[0].reaction_force), {}, {}, S("JK")},
            {S("reaction"), S("node 2"), N(n[1].reaction_force)},
            {S("moment"), S("B"), N(*n[1].moment_left)},
            {S("moment"), S("x = 3 m"), N(station(3.0, &StationValues::moment))},
            {S("shear"), S("x=8"), N(station(8.0, &StationValues::shear)), S("left")},
            {S("deflection"), S("x 3000 mm"), N(station(3.0, &StationValues::deflection)), {}, S("0.5%")},
            {S("max moment"), S("span 1"), N(result_->sets[0].extremes[0].max_moment)}};
  }
  static std::string csv(const Rows& rows) {
    std::string t;
    std::size_t width = 0;
    for (const auto& r : rows) width = std::max(width, r.size());
    for (const auto& r : rows) {
      for (std::size_t c = 0; c < width; ++c)
        t += (c ? "," : "") + (c >= r.size() ? std::string() : r[c].number ? format_number(r[c].v) : r[c].text);
      t += "\n";
    }
    return t;
  }
  static BeamResult checked(const claims_table::Read& read) {
    input::BeamFile f = *file_;
    claims_table::merge(f, claims_table::Read(read));
    return check(f, Options{});
  }
  static std::string errors(const claims_table::Read& r) {
    std::string m;
    for (const auto& e : r.errors) m += e.reason + "\n";
    return m;
  }
};

TEST_F(ClaimsTable, ClaimsThatHoldFromCsvXlsxAndOds) {
  Rows csv_rows = holding();
  csv_rows.erase(csv_rows.begin(), csv_rows.begin() + 2);  // CSV: the header first
  const std::vector<claims_table::Read> reads = {
      claims_table::read_text(*file_, csv(csv_rows), "claims.csv"),
      claims_table::read_sheet_bytes(*file_, xlsx({{"Claims", holding()}}), sheet::Format::Xlsx, "claims.xlsx"),
      claims_table::read_sheet_bytes(*file_, ods({{"Notes", {{S("see next sheet")}}}, {"Claims", holding()}}), sheet::Format::Ods,
                                     "claims.ods", "Claims")};
  for (const auto& read : reads) {
    ASSERT_TRUE(read.ok()) << errors(read);
    ASSERT_EQ(read.claims.size(), 7u);
    const BeamResult r = checked(read);
    ASSERT_EQ(r.status, BeamStatus::Agree);
    ASSERT_EQ(r.claims.size(), 7u);
    for (const auto& c : r.claims) {
      EXPECT_TRUE(c.evaluated) << c.claim.source << ": " << c.reason;
      EXPECT_TRUE(c.holds) << c.claim.source;
      EXPECT_FALSE(c.claim.source.empty());
    }
    EXPECT_EQ(r.claims[5].label, "x = 3 m");  // 3000 mm
    ASSERT_TRUE(read.claims[5].tolerance);
    EXPECT_NEAR(read.claims[5].tolerance->value, 0.005, 1e-15);
  }
  EXPECT_EQ(reads[0].claims[0].source, "claims.csv, line 2");
  EXPECT_EQ(reads[1].claims[0].source, "claims.xlsx, sheet Claims, row 4");
  EXPECT_EQ(reads[2].claims[6].source, "claims.ods, sheet Claims, row 10");
}

TEST_F(ClaimsTable, MergedWithTheFilesOwnClaims) {
  input::BeamFile f = input::parse_beam_text(
      std::string(kBeam).insert(std::string(kBeam).rfind('}'), R"(, "claims": {"values": [{"quantity": "reaction", "node": "C", "value": 1000}]})"),
      "own.json");
  ASSERT_TRUE(f.ok());
  claims_table::merge(f, claims_table::read_text(f, "quantity,where,value\nreaction,A," + format_number(set().consensus_nodes[0].reaction_force) + "\n", "t.csv"));
  const BeamResult r = check(f, Options{});
  ASSERT_EQ(r.claims.size(), 2u);
  EXPECT_TRUE(r.claims[0].claim.source.empty());
  EXPECT_FALSE(r.claims[0].holds);  // the file's own, wrong on purpose
  EXPECT_EQ(r.claims[1].claim.source, "t.csv, line 2");
  EXPECT_TRUE(r.claims[1].holds);
}

TEST_F(ClaimsTable, ADeflectionTypedInMillimetresFailsWithTheDiagnosis) {
  const double d = station(3.0, &StationValues::deflection);
  const auto read = claims_table::read_text(*file_, "quantity,where,value\ndeflection,x = 3," + format_number(d * 1000.0) + "\n", "c.csv");
  ASSERT_TRUE(read.ok()) << errors(read);
  const BeamResult r = checked(read);
  ASSERT_EQ(r.claims.size(), 1u);
  EXPECT_FALSE(r.claims[0].holds);
  EXPECT_EQ(r.status, BeamStatus::Disagree);
  EXPECT_NE(r.claims[0].finding.find("divided by 1000"), std::string::npos) << r.claims[0].finding;
  EXPECT_NE(r.claims[0].finding.find("mm"), std::string::npos) << r.claims[0].finding;
  // Said in the header, millimetres read as such and hold.
  const auto said = claims_table::read_text(*file_, "quantity,where,value [mm]\ndeflection,x = 3," + format_number(d * 1000.0) + "\n", "c.csv");
  ASSERT_TRUE(said.ok()) << errors(said);
  EXPECT_TRUE(checked(said).claims.at(0).holds);
  // And in a units row.
  const auto row = claims_table::read_text(*file_, "quantity,where,value\n,,mm\ndeflection,x = 3," + format_number(d * 1000.0) + "\n", "c.csv");
  ASSERT_TRUE(row.ok()) << errors(row);
  EXPECT_TRUE(checked(row).claims.at(0).holds);
}

TEST_F(ClaimsTable, BadRowsAreLocatedAndMakeTheBeamInvalid) {
  const std::string text =
      "quantity,where,value,case,tolerance\n"
      "moment,Q,1,,\n"
      "momnet,B,1,,\n"
      "reaction,x = 2,1,,\n"
      "max_moment,span 7,1,,\n"
      "deflection,3,1,,\n"
      "deflection,x=2,5 kN,,\n"
      "moment,x = 40,1,,\n"
      "moment,B,,,\n"
      "moment,B,1,wind,\n"
      "moment,B,1,,-2\n"
      "moment_max,B,1,,\n"
      "moment,B,1,,\n";
  const auto read = claims_table::read_text(*file_, text, "c.csv");
  const std::vector<std::string> want = {
      "--claims c.csv: line 2, column 2 (where): \"Q\" is not a node, a position or a span (give a node's label such as C, \"node 2\", a position \"x = 2.5\" or \"span 2\")",
      "--claims c.csv: line 3, column 1 (quantity): unknown quantity \"momnet\" (did you mean \"moment\"?)",
      "--claims c.csv: line 4, column 2 (where): reaction is taken at a node: give its label or \"node N\"",
      "--claims c.csv: line 5, column 2 (where): there is no span 7: the beam has 2 spans, numbered from 1",
      "--claims c.csv: line 6, column 2 (where): \"3\" alone could be a node number or a position: write \"node 3\" or \"x = 3\"",
      "--claims c.csv: line 7, column 3 (value): the value does not read (got \"5 kN\"): the unit of \"5 kN\" is force, but this field is length (for example m)",
      "--claims c.csv: line 8, column 2 (where): x must be on the beam, 0 to 10.5 m (got 40)",
      "--claims c.csv: line 9, column 3 (value): no value",
      "--claims c.csv: line 10, column 4 (case): there is no load case \"wind\" (cases: loads)",
      "--claims c.csv: line 11, column 5 (tolerance): the tolerance must not be negative (got \"-2\")",
      "--claims c.csv: line 12, column 1 (quantity): moment_max is an envelope value: name a combination with a pattern or a factor range, or a moving load, in the case column",
  };
  ASSERT_EQ(read.errors.size(), want.size()) << errors(read);
  for (std::size_t k = 0; k < want.size(); ++k) {
    EXPECT_EQ(read.errors[k].reason, want[k]);
    EXPECT_EQ(read.errors[k].id, "claims.bad_row");
  }
  EXPECT_TRUE(read.claims.empty());  // a table with errors adds none, not even its good row
  const BeamResult r = checked(read);
  EXPECT_EQ(r.status, BeamStatus::Invalid);
  EXPECT_EQ(r.errors.size(), want.size());

  // The header.
  const auto head = claims_table::read_text(*file_, "quantity,location,value,tolerence\nmoment,B,1,1%\n", "h.csv");
  ASSERT_EQ(head.errors.size(), 2u) << errors(head);
  EXPECT_EQ(head.errors[0].reason, "--claims h.csv: line 1, column 4 (tolerence): no column of a table of claims is called \"tolerence\" (did you mean \"tolerance\"?)");
  EXPECT_EQ(head.errors[1].reason,
            "--claims h.csv: line 1: the header has no column where (a table of claims has quantity, where and value, and may have "
            "case, side and tolerance; the columns are \"quantity\", \"location\", \"value\", \"tolerence\")");
  EXPECT_EQ(head.errors[1].id, "claims.unreadable");
  // A sheet: its rows and columns; a file that is no spreadsheet.
  const auto sheet = claims_table::read_sheet_bytes(*file_, xlsx({{"C", {{S("title")}, {S("quantity"), S("where"), S("value")}, {S("moment"), S("B"), S("lots")}}}}),
                                                    sheet::Format::Xlsx, "c.xlsx");
  ASSERT_EQ(sheet.errors.size(), 1u);
  EXPECT_EQ(sheet.errors[0].reason.rfind("--claims c.xlsx: row 3, column C (value): the value does not read (got \"lots\")", 0), 0u)
      << sheet.errors[0].reason;
  const auto junk = claims_table::read_sheet_bytes(*file_, "junk", sheet::Format::Ods, "c.ods");
  ASSERT_EQ(junk.errors.size(), 1u);
  EXPECT_EQ(junk.errors[0].id, "claims.unreadable");
  EXPECT_EQ(junk.errors[0].reason.rfind("--claims c.ods: not a spreadsheet", 0), 0u) << junk.errors[0].reason;
}

TEST(ClaimsTableCases, SeveralLoadCasesNeedTheCaseColumn) {
  const input::BeamFile f = input::parse_beam_text(R"({"units": {"force": "kN", "length": "m"},
      "spans": [{"length": 4, "EI": 1000}], "supports": ["pinned", "roller"],
      "loads": [{"type": "udl", "span": 1, "w": 2, "case": "dead"}, {"type": "udl", "span": 1, "w": 3, "case": "live"}]})",
                                                   "cases.json");
  ASSERT_TRUE(f.ok());
  const auto none = claims_table::read_text(f, "quantity,where,value\nreaction,A,4\n", "c.csv");
  ASSERT_EQ(none.errors.size(), 1u);
  EXPECT_EQ(none.errors[0].reason,
            "--claims c.csv: line 2, column 1 (quantity): the beam has 2 load cases and combinations (dead, live): name the claim's "
            "case in a column \"case\"");
  const auto given = claims_table::read_text(f, "quantity,where,value,case\nreaction,A,4,dead\nreaction,B,6,live\n", "c.csv");
  ASSERT_TRUE(given.ok());
  input::BeamFile g = f;
  claims_table::merge(g, claims_table::Read(given));
  const BeamResult r = check(g, Options{});
  ASSERT_EQ(r.claims.size(), 2u);
  // Statics of a simple span: each reaction is half the load, wL/2.
  EXPECT_TRUE(r.claims[0].holds);
  EXPECT_EQ(r.claims[0].load_case, "dead");
  EXPECT_TRUE(r.claims[1].holds);
  EXPECT_EQ(r.claims[1].load_case, "live");
}

}  // namespace
}  // namespace trivet::compare
