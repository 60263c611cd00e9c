// trivet: the beam file reader. JSON text -> validated Beam, with every
// error of the file listed with its JSON location and a plain reason.
#pragma once

#include <cstddef>
#include <optional>
#include <string>
#include <vector>

#include "harness/input/units.h"
#include "methods/beam/beam.h"

namespace trivet::input {

// Upper bounds on what one file may ask for (refused with a message, never
// an out-of-memory). Any real beam is far inside them.
struct Limits {
  std::size_t max_file_bytes = 256u << 20;      // 256 MiB
  std::size_t max_spans = 1'000'000;
  std::size_t max_loads = 4'000'000;
  int max_stations_per_span = 1000;
  std::size_t max_stations = 20'000'000;       // (spans x (stations_per_span + 1) + loads) x load sets
  std::size_t max_load_sets = 1000;            // load cases + combinations (each is analysed on its own)
  // An envelope solves each of its shares (one per span of each patterned
  // case, README "Load combinations") and reads every share at every
  // station: shares x stations, per envelope. Its time and memory grow with it.
  std::size_t max_envelope_values = 20'000'000;
  std::size_t max_depth = 64;                  // nesting of JSON arrays and objects
  // The points of one moving load (a crane's wheels, a vehicle's axles:
  // a handful; a long train of axles a few hundred).
  std::size_t max_moving_points = 1000;
};

// One error in a file. `pointer` is a JSON Pointer (RFC 6901, 0-based);
// `where` the engineer's 1-based name of the thing ("span 2", "node 3",
// "load 1", "claim 4"), possibly empty.
struct Error {
  std::string pointer;
  std::string where;
  std::string reason;
  // The stable name of the kind of error, for scripts and tests: the reason's
  // wording may change, the id does not (README, "Error ids"). "input.*" for
  // the beam file, "against.*" for --against, "check.*" and "internal.*" for
  // failures of the check itself.
  std::string id = "input.other";
  // "file: /spans/1/length (span 2): must be greater than 0 (got -6.5)"
  std::string format(const std::string& file) const;
};

enum class Quantity {
  Moment, Shear, Reaction, ReactionMoment, Deflection, Rotation,
  MaxMoment, MinMoment, MaxDeflection,
  // Envelope quantities of a combination with a pattern or a factor range.
  MomentMax, MomentMin, ShearMax, ShearMin, ReactionMax, ReactionMin,
};
// True for the envelope quantities (moment_max ... reaction_min).
bool is_envelope_quantity(Quantity q);
// A claim's quantity from its name. Each quantity has one name (the
// contract's, which the reports use) and the other spelling a person may
// write is accepted for it: max_moment / moment_max (and min_) name the
// largest moment over a span when the claim gives `span` (max_moment) and
// the envelope's largest at a point when it gives `node` or `x`
// (moment_max); deflection_max over a span is max_deflection; max_shear,
// min_shear, max_reaction and min_reaction are shear_max ... reaction_min.
// Nothing when the name is none of these.
std::optional<Quantity> claim_quantity(const std::string& name, bool over_span, bool at_point);
const char* quantity_name(Quantity q);
Dimension quantity_dimension(Quantity q);
// The unit a quantity is shown in: the file's units of its dimension, and
// "rad" for a rotation.
std::string quantity_unit(const Units& units, Quantity q);

enum class Side { Unspecified, Left, Right };

// A tolerance: a fraction of the largest magnitude of that kind of quantity
// in the beam ("1%" -> relative, 0.01), or an absolute value in file units.
struct Tolerance {
  bool relative = true;
  double value = 0.01;
};

// A value a person or another program asserts (CONTRACT "claims").
struct Claim {
  Quantity quantity = Quantity::Moment;
  std::string pointer;                 // "/claims/values/3"
  std::optional<std::size_t> node;     // 0-based
  std::optional<double> x;             // global
  std::optional<std::size_t> span;     // 0-based
  Side side = Side::Unspecified;
  std::string load_case;               // empty: the file's only load set
  double value = 0.0;
  std::optional<Tolerance> tolerance;  // the claim's own
  std::string written;                 // the quantity's name as written, when another spelling
  // Where a claim from a table of claims (--claims) was read: "claims.csv,
  // line 4"; empty for the beam file's own claims.
  std::string source;
};

// A load factor: one value, or a range [low, high] of which either may govern.
struct Factor {
  double low = 1.0;
  double high = 1.0;
  bool range = false;
};

enum class Arrangements {
  All,                   // the exact envelope over every on/off arrangement of the spans
  AdjacentAndAlternate,  // all spans; alternate spans (both sets); each pair of adjacent spans
};

// A factored combination of load cases (the file's "combinations").
// A deflection limit as codes write it: span / ratio ("L/360"). For a
// cantilever (an overhang at an end of the beam) codes measure on twice its
// length unless a cantilever ratio of its own is given (README, "Deflection
// limits").
struct DeflectionLimit {
  double ratio = 0;                     // n of "L/n"; 0: no limit
  std::optional<double> cantilever;     // n of "L/n" on the overhang's own length
  std::string text() const;             // "L/360" or "L/360, cantilever L/180"
};

// A train of concentrated loads that moves along the beam (the file's
// "moving_loads"): a crane's wheels, a vehicle's axles. Each point stands at
// a fixed distance `offset` from the train's first point; the first point's
// position is what places the train. Running "backward" the offsets point to
// the left of the first point. Each moving load is a load set of its own.
struct MovingPoint {
  double P = 0;       // force, positive downward (file units)
  double offset = 0;  // distance from the first point, >= 0 (file units)
};
struct MovingLoad {
  std::string name;
  std::string pointer;              // "/moving_loads/0"
  std::vector<MovingPoint> points;  // in file order; at least one
  bool both_directions = true;      // "both" (default) or "forward"
};

struct Combination {
  std::string name;
  std::string pointer;                                  // "/combinations/1"
  std::vector<std::pair<std::string, Factor>> factors;  // case -> factor, in file order
  std::vector<std::string> pattern;                     // cases placed span by span
  Arrangements arrangements = Arrangements::All;
  std::string source;  // for a preset: where its factors come from
  // Its own deflection limit (ratio 0 with `limit_set`: "none", no check).
  bool limit_set = false;
  DeflectionLimit deflection_limit;
  // A moving load this combination names, with its factor (one number):
  // the envelope of the combination's cases (as `factors` and `pattern`
  // give) plus the factor times the moving load at its worst position.
  // Empty: none. At most one per combination.
  std::optional<std::pair<std::string, double>> moving;
  bool is_envelope() const;  // a pattern, a factor range or a moving load
};

struct BeamFile {
  std::string path;
  Units units;
  Beam beam;                        // valid only when errors is empty
  std::vector<std::string> cases;   // load cases in order of first use
  std::vector<Combination> combinations;
  std::vector<MovingLoad> moving_loads;  // each a load set of its own, after the cases
  // The beam's deflection limit, for the load sets named in
  // `deflection_limit_sets` (empty: every load set); a combination's own
  // limit takes its place.
  DeflectionLimit deflection_limit;
  std::vector<std::string> deflection_limit_sets;
  Tolerance claim_tolerance;        // claims.tolerance, default 1%
  std::vector<Claim> claims;
  std::vector<Error> errors;
  bool ok() const { return errors.empty(); }
};

// Reads and validates one beam file. Never throws for a bad file: problems
// are in `errors`. `display` is the name used in messages (default: path).
// The names of the factor presets ("asce7-strength", "en1990-6.10").
const std::vector<std::string>& preset_names();

// `text`, when given, receives the file's bytes (as parsed).
BeamFile read_beam_file(const std::string& path, const Limits& limits = {}, std::string* text = nullptr);
BeamFile parse_beam_text(const std::string& text, const std::string& display,
                         const Limits& limits = {});

// For a file read without errors, analysed with `per_span` stations per span
// (e.g. --stations-per-span instead of the file's value): the error when its
// stations in all would pass limits.max_stations, or nothing.
std::optional<Error> station_limit_error(const BeamFile& file, int per_span, const Limits& limits = {});

// Reads "1%" or 0.05 (file units) into a Tolerance, or gives a reason.
std::optional<Tolerance> parse_tolerance_text(const std::string& text, std::string* reason);

// The default node names: A, B, ..., Z, AA, AB, ...
std::string default_label(std::size_t i);

// The closest of `options` to `word`, if it is plausibly a misspelling.
std::optional<std::string> did_you_mean(const std::string& word,
                                        const std::vector<std::string>& options);

// A number as the shortest text that reads back to the same double.
std::string format_number(double v);

// Text from a file made fit for one line on a terminal: control characters
// written as \n, \t, \r or \u00NN, bytes that are not UTF-8 as \xNN, and
// cut with "..." past `max_bytes`.
std::string printable_text(const std::string& s, std::size_t max_bytes = 400);

}  // namespace trivet::input
