// trivet: claims from a table (`trivet check beam.json --claims claims.csv`),
// CSV or a sheet of an .xlsx or .ods file, added to the beam file's own.
//
// The table has a header row (in a sheet, the first row with a cell
// `quantity`; rows above it, such as titles, are skipped) and one claim a
// row. Columns, by name without regard to case:
//   quantity   a claim quantity of the beam file (moment, shear, reaction,
//              reaction_moment, deflection, rotation, max_moment, min_moment,
//              max_deflection, moment_max ... reaction_min); "max moment"
//              and "max-moment" read as max_moment
//   where      a node (its label "B", or "node B", "node 2"), a position
//              ("x = 2.5", "x=2.5 m", "x 8 ft"; global), or a span ("span 2")
//   value      the claimed value, a number (in the beam file's units) or a
//              number with its unit ("5.2 mm", "-31.6 kN*m")
//   case       optional: the load case or combination
//   side       optional: left or right, where a value jumps
//   tolerance  optional: "1%" or an absolute value (with or without a unit)
// A unit in a header ("value [mm]", "where (ft)") or in a row of units under
// the header is the unit of that column's plain numbers. Other columns
// (notes, who checked) are not read; one whose name is close to one of ours
// ("tolerence") is an error.
//
// Every error names the table, the row and the column; a table with errors
// adds no claims, and its errors make the beam invalid.
#pragma once

#include <string>
#include <vector>

#include "harness/compare/against.h"
#include "harness/compare/sheet.h"
#include "harness/input/reader.h"

namespace trivet::compare::claims_table {

struct Read {
  std::vector<input::Claim> claims;  // each with its `source`
  // Each with the id "claims.unreadable" (the file as a whole) or
  // "claims.bad_row" (a row or a header cell), no pointer, and a reason that
  // starts "--claims FILE: line 4, column 3 (value): ..." (a sheet: "row 4,
  // column C").
  std::vector<input::Error> errors;
  bool ok() const { return errors.empty(); }
};

// The claims of a table, for the beam of `file` (read without errors).
Read read_table(const input::BeamFile& file, const against::CsvTable& table, const std::string& display);
// From a file: a sheet (`sheet_name`, empty: the first) of an .xlsx or .ods
// file (by its name's ending), else CSV.
Read read_file(const input::BeamFile& file, const std::string& path, const std::string& sheet_name = "");
// From CSV text, and from the bytes of an .xlsx or .ods file.
Read read_text(const input::BeamFile& file, const std::string& text, const std::string& display);
Read read_sheet_bytes(const input::BeamFile& file, const std::string& bytes, sheet::Format format,
                      const std::string& display, const std::string& sheet_name = "");

// Whether a row of a sheet is the header of a table of claims (a cell "quantity").
bool is_claims_header(const std::vector<std::string>& cells);

// Adds the claims read to `file`'s, or, when the table has errors, its
// errors to `file`'s errors (the beam is then invalid, with them).
void merge(input::BeamFile& file, Read&& read);

}  // namespace trivet::compare::claims_table
