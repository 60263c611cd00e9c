// trivet: one sheet of a spreadsheet file (.xlsx or .ods) as rows of text
// cells, for the readers of tables (--against, --claims), which then read
// them as they read a CSV file.
//
// The container is read with libzip and the XML with pugixml. A number cell
// gives its stored value (not its display text), written as the shortest
// text that reads back to the same double (input::format_number); a text
// cell its text; a true/false cell TRUE or FALSE. Rows and columns are
// placed by the file's own references (an .xlsx cell's "B3", an .ods cell's
// repeats), so empty cells and skipped columns stay where they are.
//
// Nothing here throws for a bad file: `error` says what is wrong with it.
#pragma once

#include <cstddef>
#include <string>
#include <utility>
#include <vector>

namespace trivet::compare::sheet {

struct Limits {
  std::size_t max_file_bytes = 256u << 20;   // the file itself (as the beam file)
  std::size_t max_part_bytes = 256u << 20;   // one part of the zip, uncompressed (a zip bomb stops here)
  std::size_t max_cells = 5'000'000;         // cells that hold something, in the sheet read
  std::size_t max_rows = 1u << 20;           // rows of a sheet (1048576, as the spreadsheet programs)
  std::size_t max_columns = 1u << 14;        // columns of a sheet (16384, XFD)
};

enum class Format { None, Xlsx, Ods };

// By the file name's ending (.xlsx, .ods, any case); None for anything else.
Format format_of_path(const std::string& path);

struct Row {
  std::size_t number = 0;  // 1-based row of the sheet
  // The cells that hold something: (1-based column, text), in column order.
  std::vector<std::pair<std::size_t, std::string>> cells;
};

struct Sheet {
  std::string name;                // the sheet read
  std::vector<std::string> names;  // every sheet of the file, in order
  std::vector<Row> rows;           // rows that hold something, in order
  std::string error;               // why the file cannot be read; empty when read
  bool ok() const { return error.empty(); }
};

// Reads sheet `name` (empty: the first) from the bytes of an .xlsx or .ods file.
Sheet read_sheet_bytes(const std::string& bytes, Format format, const std::string& name, const Limits& limits = {});
// The same from a file.
Sheet read_sheet_file(const std::string& path, Format format, const std::string& name, const Limits& limits = {});

// A column's letters: 1 -> "A", 26 -> "Z", 27 -> "AA".
std::string column_letters(std::size_t column);

}  // namespace trivet::compare::sheet
