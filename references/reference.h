// trivet: the library of cited reference cases (for `trivet selfcheck`).
//
// One JSON file per case under references/cases. Each file names its
// source (book, edition, table or page, and whether the numbers were taken
// from the text or written from memory), a beam in the beam-file format,
// the symbols of the published formulas (w, L, P, EI, ...) and the
// published values, each as TEXT exactly as printed together with the
// multiplier it is printed against ("-0.1071" against "w*L^2").
//
// The tolerance of a published value comes from its printed digits:
//   decimal "-0.1071"            half a unit in the last printed place
//                                (0.00005) times |multiplier|;
//   fraction "-3/28" (or any     exact: 1e-9 times |multiplier|
//   text with "exact": true)     (kExactRelative);
//   "1/185" with                 the denominator is rounded to the integer
//   "rounding": "denominator"    printed: |p| (1/(q - 1/2) - 1/q) times
//                                |multiplier|.
//
// Nothing here prints; errors in a file are listed with the file and the
// JSON location, never thrown.
#pragma once

#include <cstddef>
#include <map>
#include <optional>
#include <string>
#include <vector>

#include "harness/input/reader.h"

namespace trivet::references {

// The relative bound used for exact published values (of the multiplier).
constexpr double kExactRelative = 1e-9;

// Where a case's numbers come from.
struct Source {
  std::string title;
  std::string author;
  std::string publisher;
  std::string edition;
  std::string year;
  std::string locator;    // table, page, case or example
  std::string confirmed;  // "from memory", "from the text" or "derived"
  std::string note;       // optional remark on the source
};

// "T. G. Hicks, Civil Engineering Formulas, 2nd ed., McGraw-Hill, 2010,
//  Table 2.1 (from memory)". Empty parts are left out.
std::string format_citation(const Source& source);

// What a published value is a value of. The first nine are the beam-file
// claim quantities; the last three are the positions (local x from the
// left end of the span) of the span extremes.
enum class Quantity {
  Moment, Shear, Reaction, ReactionMoment, Deflection, Rotation,
  MaxMoment, MinMoment, MaxDeflection,
  MaxMomentAt, MinMomentAt, MaxDeflectionAt,
};
const char* quantity_name(Quantity q);  // "moment", ..., "max_deflection_at"
std::optional<Quantity> quantity_from_name(const std::string& name);
// True for the quantities taken over a span (extremes and their positions).
bool is_span_quantity(Quantity q);

// How the printed text is read.
enum class Form {
  Decimal,             // "0.1071", "-0.125", "2": rounded to the printed digits
  Exact,               // "-3/28", or a decimal marked "exact": true
  RoundedDenominator,  // "1/185": an integer denominator rounded as printed
};
const char* form_name(Form f);  // "decimal", "exact", "rounded denominator"

// A published number read from its text.
struct PublishedNumber {
  double value = 0;          // the number the text stands for
  double tolerance = 0;      // absolute, for a multiplier of 1
  Form form = Form::Decimal;
  int decimals = 0;          // Decimal: digits after the point
  std::string rule;          // "half a unit in the 4th decimal place", ...
};

// Reads "-0.1071", "0.125", "3", "-3/28", "1/185". `exact` marks a
// decimal or integer text as exact; `rounded_denominator` reads "p/q" as p
// over a rounded integer q. Gives nothing and a reason for bad text.
std::optional<PublishedNumber> parse_published(const std::string& text, bool exact,
                                               bool rounded_denominator, std::string* reason);

// Evaluates a multiplier such as "w*L^2", "w*L^4/EI", "P*a*b^2/L^2",
// "w*(L1^3 + L2^3)/(L1 + L2)" or "sqrt(5)": numbers, symbols, + - * / ^,
// unary minus, parentheses and sqrt(). '^' binds tightest and is right
// associative; "-L^2" is -(L^2). Gives nothing and a reason for an unknown
// symbol, a syntax error or a non-finite result.
std::optional<double> evaluate_multiplier(const std::string& text,
                                          const std::map<std::string, double>& symbols,
                                          std::string* reason);

// One published value of a case.
struct Expected {
  std::string pointer;                // "/expected/3"
  Quantity quantity = Quantity::Moment;
  std::optional<std::size_t> node;    // 0-based
  std::optional<double> x;            // global
  std::optional<std::size_t> span;    // 0-based
  input::Side side = input::Side::Unspecified;
  std::string load_case;              // empty: the beam's first load set
  std::string published;              // the text exactly as printed
  std::string multiplier;             // "w*L^2"; "1" when none
  PublishedNumber number;             // the printed number read
  double multiplier_value = 1;        // the multiplier evaluated
  double value = 0;                   // number.value * multiplier_value
  double tolerance = 0;               // number.tolerance * |multiplier_value|
  std::string note;                   // optional remark
  // The book prints the value without a sign (a magnitude): the computed
  // value's magnitude is compared with it ("unsigned": true).
  bool magnitude = false;
  // "node B", "node B (left)", "x = 3", "span 1"
  std::string where(const input::BeamFile& beam) const;
};

struct ReferenceCase {
  std::string file;                   // path or display name
  std::string id;
  std::string title;
  Source source;
  std::string note;
  std::string beam_text;              // the "beam" object as JSON text
  input::BeamFile beam;               // the beam read by the beam-file reader
  std::map<std::string, double> symbols;
  std::vector<Expected> expected;
  // Problems in the file (beam errors carry the "/beam" prefix).
  std::vector<input::Error> errors;
  bool ok() const { return errors.empty(); }
};

// Reads one case from its text / its file. Never throws for a bad file.
ReferenceCase parse_case_text(const std::string& text, const std::string& display);
ReferenceCase read_case_file(const std::string& path);

// The registry. The default directory is the source tree's
// references/cases (TRIVET_REFERENCES_DIR at build time); set_directory
// overrides it for the process (an empty string restores the default).
std::string default_directory();
std::string directory();
void set_directory(const std::string& dir);

// Every *.json directly under `dir`, sorted by name; nothing (and a
// reason) when the directory cannot be read.
std::vector<std::string> list_case_files(const std::string& dir, std::string* reason = nullptr);

// Every case under `dir`, in file-name order. A directory that cannot be
// read, or that holds no case, gives one entry whose errors say so. Two
// files with the same id are both reported.
std::vector<ReferenceCase> load_cases(const std::string& dir);
inline std::vector<ReferenceCase> load_cases() { return load_cases(directory()); }

}  // namespace trivet::references
