// trivet: comparing another program's exported results with the consensus
// of the methods (`trivet check beam.json --against results.csv`).
//
// The exported file is CSV (RFC 4180), or a sheet of an .xlsx or .ods file
// read into the same rows of text cells (sheet.h, table_from_sheet). Its
// kind is told from its header:
//   stations:  `x` (global position) or `span` (1-based) with `x_local`,
//              and any of `shear`, `moment`, `deflection`;
//   reactions: `support` (a node label such as "B", or a 1-based node
//              number), and any of `force`, `moment`.
// For a load set that is an envelope (a combination with a pattern or a
// factor range, named by the `case` option) the value columns are instead
//   stations:  any of `moment_max`, `moment_min`, `shear_max`, `shear_min`,
//              `deflection_max`, `deflection_min`;
//   reactions: any of `reaction_max`, `reaction_min`;
// compared with the consensus envelope (median of the methods' envelopes).
// Ordinary columns on an envelope load set, and envelope columns on an
// ordinary one, are errors. A declared sign convention that reverses a sign
// also swaps max and min: under hogging-positive their moment_max is our
// -moment_min, so that cell is reported as moment_min in our signs. The
// deflection envelope is known only at trivet's stations.
// Column names are matched without regard to case; Options::columns renames
// them. An empty cell is "not given" and is not compared; a column that is
// absent is not compared. Values are converted from the file's declared
// units and sign conventions to the beam file's units and trivet's signs
// (methods/beam/beam.h), then compared with the consensus (median of the
// methods that ran) at the file's own positions.
//
// When a quantity fails, the usual mistakes are tried (see Mistake and
// units_factors()); one that makes every row of that quantity hold within
// the tolerance is reported as a Finding. A finding never turns a failure
// into a pass.
//
// Results are plain data; nothing here prints.
#pragma once

#include <cstddef>
#include <functional>
#include <map>
#include <optional>
#include <string>
#include <vector>

#include "harness/compare/compare.h"
#include "harness/compare/sheet.h"
#include "harness/input/reader.h"

namespace trivet::compare::against {

// ---------------------------------------------------------------------------
// Errors: every problem of a file, with its line and column.

struct Error {
  std::size_t line = 0;     // 1-based physical line; 0: the file as a whole
  std::size_t column = 0;   // 1-based field number; 0: the line as a whole
  std::string column_name;  // the header's name of that column, when known
  std::string reason;
  // From a spreadsheet: `line` is the sheet's row and `column` its column
  // (written as letters).
  bool in_sheet = false;
  // "results.csv: line 4, column 2 (moment): not a number (got \"1.2.3\")"
  // "results.xlsx: row 4, column C (moment): ..."
  // "results.csv: line 1: no column to compare: ..."; "results.csv: ..."
  std::string format(const std::string& file) const;
};

// ---------------------------------------------------------------------------
// CSV.

struct CsvLimits {
  std::size_t max_file_bytes = 64u << 20;  // 64 MiB
  std::size_t max_columns = 1000;
  std::size_t max_errors = 50;             // further errors are counted, not listed
  // The file's separator (',', ';' or '\t') and decimal mark ('.' or ','); 0:
  // found from the file (--their-separator, --their-decimal).
  char separator = 0;
  char decimal = 0;
};

struct CsvRow {
  std::size_t line = 0;  // line on which the record starts
  std::vector<std::string> fields;
};

struct CsvTable {
  char separator = ',';  // as found or given
  char decimal = '.';    // numbers with a decimal comma are stored with a point
  std::size_t header_line = 0;
  // Read from a spreadsheet: the sheet's name, and the sheet's column
  // (1-based) of each column of the table. Empty for CSV.
  std::string sheet;
  std::vector<std::size_t> sheet_columns;
  std::vector<std::string> header;
  std::vector<CsvRow> rows;
};

struct CsvRead {
  CsvTable table;
  std::vector<Error> errors;
  bool ok() const { return errors.empty(); }
};

// Reads CSV text: a header row, then one record per row. Fields separated
// by commas, semicolons or tabs (the one the header line uses most, unless
// given); a decimal comma is recognised in a file separated by semicolons
// or tabs (numbers such as 1,25 and no number with a point) and such numbers
// are stored with a point; a field may be quoted ("a, b" and "say ""x""" are one field,
// a quoted field may span lines); CRLF or LF line ends; lines whose first
// non-blank character is '#' and blank lines are skipped (outside quotes).
// Unquoted fields are trimmed of spaces and tabs. Every record must have as
// many fields as the header.
CsvRead parse_csv_text(const std::string& text, const CsvLimits& limits = {});
// The same from a file; a file over limits.max_file_bytes is refused.
CsvRead read_csv_file(const std::string& path, const CsvLimits& limits = {});

// ---------------------------------------------------------------------------
// Spreadsheets (.xlsx, .ods; sheet.h reads the sheet).

// Tells a header row: given the row's cells from its first to its last
// non-empty one, trimmed.
using HeaderTest = std::function<bool(const std::vector<std::string>& cells)>;

// A sheet's table as the CSV reader gives one: the header is the first row
// that `is_header` accepts (rows above it, such as titles, are skipped; when
// none does, an error that says what a header needs: `header_needs`, e.g.
// "a cell x, span or support"). The table spans the header's columns from
// its first to its last named one; cells outside them are not read, a
// column without a name inside them must be empty, and rows that are empty
// within them are skipped. Numbers come as the shortest text of their stored
// value, so they read back to the same double.
CsvRead table_from_sheet(const sheet::Sheet& s, const HeaderTest& is_header, const std::string& header_needs,
                         const CsvLimits& limits = {});
// A table from a file: a sheet (`sheet_name`, empty: the first) of an .xlsx
// or .ods file (by its name's ending), else CSV. Errors of a spreadsheet
// name its row and column.
CsvRead read_table_file(const std::string& path, const std::string& sheet_name, const HeaderTest& is_header,
                        const std::string& header_needs, const CsvLimits& limits = {});
// The bare name of a header cell: without a unit in brackets at its end
// ("Defl [mm]" -> "Defl"), lower case.
std::string header_name(const std::string& cell);
// Errors of a table read from a sheet: columns of the table to the sheet's.
void place_in_sheet(std::vector<Error>& errors, const CsvTable& table);

// ---------------------------------------------------------------------------
// Options: how the other program wrote its file.

enum class MomentSign { SaggingPositive, HoggingPositive };
enum class DeflectionSign { DownPositive, UpPositive };
enum class ShearSign { Ours, Opposite };  // Ours: V = dM/dx
enum class ReactionSign { UpPositive, DownPositive };
enum class ReactionMomentSign { CounterClockwisePositive, ClockwisePositive };

struct Options {
  // Our column name -> the file's ("moment" -> "Mz", "x" -> "Dist"). Keys:
  // x, span, x_local, shear, moment, deflection, support, force,
  // reaction_moment, and the envelope columns moment_max ... reaction_min. In a reaction table the couple's column is
  // "reaction_moment" when that is mapped, else "moment" (a "moment" mapping
  // that names a column the reaction file lacks is then not used), so one
  // set of options can serve a station file and a reaction file.
  std::map<std::string, std::string> columns;
  // The file's units (names of units.h); empty: the beam file's units.
  std::string force_unit;
  std::string length_unit;
  MomentSign moment_sign = MomentSign::SaggingPositive;
  DeflectionSign deflection_sign = DeflectionSign::DownPositive;
  ShearSign shear_sign = ShearSign::Ours;
  ReactionSign reaction_sign = ReactionSign::UpPositive;
  ReactionMomentSign reaction_moment_sign = ReactionMomentSign::CounterClockwisePositive;
  // Empty: the beam file's claims tolerance (default 1% of the largest
  // magnitude of the kind). An absolute tolerance is in the beam file's units.
  std::optional<input::Tolerance> tolerance;
  // The sheet of an .xlsx or .ods file (--their-sheet); empty: the first.
  std::string sheet;
  // The load case or combination compared; empty: the beam's only one (an error if several).
  std::string load_case;
  CsvLimits limits;
};

// Sets one option from command-line text. Names and values:
//   column           "moment=Mz" or "moment=Mz,x=Dist" (may be repeated)
//   units            "force=N,length=mm" (either part alone is fine)
//   force-unit       N, kN, MN, lbf, kip
//   length-unit      mm, cm, m, in, ft
//   moment-sign      sagging-positive | hogging-positive
//   deflection-sign  down-positive | up-positive
//   shear-sign       ours | opposite
//   reaction-sign    up-positive | down-positive
//   reaction-moment-sign  counter-clockwise-positive | clockwise-positive
//   tolerance        "1%" or an absolute value in the beam file's units
//   case             a load case or combination name
//   separator        comma | semicolon | tab
//   decimal          point | comma
//   sheet            the name of a sheet of an .xlsx or .ods file
// Returns an empty string when set, else the reason it is refused.
std::string set_option(Options& options, const std::string& name, const std::string& value);
// The names set_option knows, in that order.
const std::vector<std::string>& option_names();

// ---------------------------------------------------------------------------
// Results.

enum class TableKind { Stations, Reactions };
const char* table_kind_name(TableKind k);  // "stations", "reactions"

// The envelope quantities (MomentMax ... ReactionMin) are those of an
// envelope load set; a cell's quantity is in our signs (see above).
enum class Quantity {
  Shear, Moment, Deflection, ReactionForce, ReactionMoment,
  MomentMax, MomentMin, ShearMax, ShearMin, DeflectionMax, DeflectionMin, ReactionMax, ReactionMin,
};
constexpr std::size_t kQuantities = 13;
// "shear", "moment", "deflection", "reaction", "reaction moment", "moment_max", ..., "reaction_min"
const char* quantity_name(Quantity q);
// "shears", "moments", "deflections", "reactions", "reaction moments", "moment_max values", ...
const char* quantity_plural(Quantity q);
// True for MomentMax ... ReactionMin.
bool is_envelope(Quantity q);

// Which limit of a value that jumps at the row's position was compared.
enum class Side { Continuous, Left, Right };
const char* side_name(Side s);  // "", "left", "right"

struct Cell {
  Quantity quantity = Quantity::Moment;
  double raw = 0;         // as written in the file
  double theirs = 0;      // converted to the beam file's units and our signs
  double ours = 0;        // consensus of the methods (0 if the node is not in the beam)
  double difference = 0;  // theirs - ours
  double tolerance = 0;   // absolute, beam file's units
  bool holds = false;
  Side side = Side::Continuous;
  bool side_from_pair = false;  // the side came from a repeated position
  std::string reason;           // why it could not be compared ("no node 5 in the beam")
};

struct RowResult {
  std::size_t line = 0;
  std::string where;  // "x = 2.5 m", "span 2, x_local = 1 m", "support B"
  double x = 0;       // stations: the global x, beam file units
  std::optional<std::size_t> node;  // reactions: the 0-based node, when it is in the beam
  std::vector<Cell> cells;
};

enum class Mistake { OppositeSign, UnitsFactor, RightToLeft, LocalAsGlobal, SupportShift };
const char* mistake_name(Mistake m);  // "opposite-sign", "units-factor", "right-to-left", "local-x", "support-shift"

// A correction that makes every row of a quantity hold.
struct Finding {
  Quantity quantity = Quantity::Moment;
  std::vector<Mistake> mistakes;  // one, or a combination
  double factor = 1;              // UnitsFactor: their value is multiplied by this
  int shift = 0;                  // SupportShift: their node k is our node k + shift
  double residual = 0;            // worst |difference| after the correction, beam file units
  double residual_relative = 0;   // residual / the largest magnitude of the kind
  std::string text;  // "the moments match to 0.02% of the largest moment if read as hogging-positive"
};

struct Summary {
  Quantity quantity = Quantity::Moment;
  std::size_t compared = 0;
  std::size_t failing = 0;
  double worst_difference = 0;  // signed, largest magnitude
  double tolerance = 0;
  std::size_t worst_line = 0;
  std::string worst_where;
  std::optional<Finding> finding;  // only when failing > 0
  std::string note;  // when failing and no single finding: why (e.g. no correction holds)
  std::size_t empty = 0;  // cells of this quantity's column left empty: nothing to compare, said so
};

struct Comparison {
  std::string file;
  TableKind kind = TableKind::Stations;
  std::string load_case;
  input::Units their_units;  // as declared (or the beam file's)
  input::Units units;        // the beam file's: theirs/ours/difference are in these
  std::vector<RowResult> rows;
  std::vector<Summary> summary;  // one per quantity compared, in Quantity order
  std::vector<Error> errors;     // nothing was compared when not empty
  std::size_t errors_not_listed = 0;
  // Plain words about what was read but not compared (a column trivet does
  // not compare, such as a rotation).
  std::vector<std::string> notes;
  bool ok() const { return errors.empty(); }
  // True when the file was read and every compared value holds.
  bool holds() const;
  std::size_t failing() const;  // cells that do not hold
};

// Compares a table with the checked beam. `file` is the beam file that
// `result` came from (for its tolerance); `display` names the CSV in errors.
Comparison compare_table(const input::BeamFile& file, const BeamResult& result,
                         const CsvTable& table, const std::string& display,
                         const Options& options = {});
// Whether a row of a sheet is the header of an --against table: a cell
// names a position column (x, span) or a support column, as the options
// name them.
bool is_against_header(const std::vector<std::string>& cells, const Options& options = {});
// Reads `path` (CSV, or .xlsx or .ods by its name's ending) and compares
// it; `display` (default: path) names it.
Comparison compare_file(const input::BeamFile& file, const BeamResult& result,
                        const std::string& path, const Options& options = {},
                        const std::string& display = "");
// The same from CSV text.
Comparison compare_text(const input::BeamFile& file, const BeamResult& result,
                        const std::string& text, const std::string& display,
                        const Options& options = {});
// The same from the bytes of an .xlsx or .ods file.
Comparison compare_sheet_bytes(const input::BeamFile& file, const BeamResult& result, const std::string& bytes,
                               sheet::Format format, const std::string& display, const Options& options = {});

// The factors tried for a units mistake, each with plain words, e.g.
// {1000, "1000 (N for kN, or mm for m)"}: the products of at most two of
// 1000, 10^6, 10^9, 12, 144, 1728, 4.4482216152605 (lbf to N), 0.3048,
// 0.0254, 25.4, 304.8, and their inverses, without repeats and without 1.
struct UnitsFactor {
  double factor = 1;  // their value / ours: `base` or 1 / `base`
  double base = 1;    // a product of the listed factors
  std::string words;  // `base` in plain words: "1000 (between N and kN, or mm and m)"
};
const std::vector<UnitsFactor>& units_factors();

}  // namespace trivet::compare::against
