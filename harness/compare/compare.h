// trivet: the cross-check. Runs the methods on each load set of a beam,
// measures their agreement and equilibrium, and tests the claims against
// their consensus. Results are plain data; reports/ writes them.
#pragma once

#include <cstddef>
#include <cstdint>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "harness/compare/load_sets.h"
#include "harness/input/reader.h"
#include "methods/beam/beam.h"

namespace trivet::compare {

// The kinds of quantity compared, each scaled by its own largest magnitude.
enum class Kind { Moment, Shear, Reaction, Deflection, Rotation };
constexpr std::size_t kKinds = 5;
const char* kind_name(Kind k);  // "moment", "shear", "reaction", "deflection", "rotation"

// A method in double arithmetic, chosen by name (methods/registry lists them).
struct Method {
  std::string name;
  Solution (*solve)(const Beam&, const std::vector<Station>&);
};
// All methods in report order.
const std::vector<Method>& methods();
const Method* find_method(const std::string& name);

struct StationValues {
  double x = 0;
  double shear = 0, moment = 0, deflection = 0, rotation = 0;
};

// Equilibrium of one method's solution: the vertical forces (reactions and
// spring forces against the applied loads) and the moments about the left
// end, each as a residual relative to the sum of the magnitudes involved.
struct Equilibrium {
  double force_residual = 0;
  double moment_residual = 0;
};

// Which arrangement of a combination governs an envelope value: the spans
// (0-based) whose patterned loads are on, and the factor taken for each of
// the combination's cases (in the combination's order).
struct Governs {
  // 0-based span indices, increasing (32 bits: a long patterned envelope
  // holds many of these).
  std::vector<std::uint32_t> spans;
  std::vector<double> factors;
  // Loaded spans whose share of a patterned case with a factor range took
  // the other end of the range than `factors` names for that case.
  std::vector<std::uint32_t> spans_other_factor;
  // A moving load (its own load set, or a combination that names one):
  // `Placed` with its first point at global x `first`, the train running
  // backward (its other points to the left of the first) or forward; `Off`:
  // the train off the beam governs.
  enum class Train : std::uint8_t { None, Placed, Off };
  Train train = Train::None;
  double first = 0;
  bool backward = false;
  // Where a value is the limit as the train comes to `first` from below (-1)
  // or from above (+1), not its value there (0): a point at an end of the
  // beam is then on it or off it as it was just before.
  std::int8_t approach = 0;
};

// The largest and smallest value of a quantity over a combination's
// arrangements and factor choices, with what governs each.
struct Bound {
  double max = 0, min = 0;
  // Shared: many points of an envelope have the same governing arrangement.
  std::shared_ptr<const Governs> max_by, min_by;
};
// What governs a bound (an empty Governs where nothing was recorded).
const Governs& governs_of(const std::shared_ptr<const Governs>& g);

// Envelope of one method for a combination with a pattern or a factor
// range: per station (moment, shear, deflection) and per node (reaction).
struct Envelope {
  std::vector<Bound> moment, shear, deflection;  // one per load set station
  std::vector<Bound> reaction;                   // one per node
};

// The extreme values of one span, anywhere in it (between stations too).
// Each method finds its own (MethodResult::extremes); the load set's are
// their median. For an envelope: the largest moment_max, the smallest
// moment_min and the largest magnitude of deflection_max / deflection_min,
// with what governs them.
struct SpanExtremes {
  double max_moment = 0, max_moment_x = 0;
  double min_moment = 0, min_moment_x = 0;
  double max_deflection = 0, max_deflection_x = 0;  // signed, largest magnitude
  std::string max_moment_by, min_moment_by, max_deflection_by;  // envelopes only
};

class EnvelopeModel;  // a method's unit solutions, for envelope values anywhere
class MovingModel;    // a method's influence lines and a moving load on them (moving.h)

struct MethodResult {
  std::string name;
  MethodStatus status = MethodStatus::Failed;
  std::string reason;
  std::string reason_id;  // empty when ok; else a stable id (methods/beam/status.h)
  std::vector<NodeResult> nodes;
  std::vector<StationValues> stations;  // one per load set station
  Equilibrium equilibrium;
  Solution solution;  // for evaluation between stations
  // For an envelope load set (then nodes/stations are empty): the envelope
  // and the unit solutions it came from.
  std::optional<Envelope> envelope;
  std::shared_ptr<const EnvelopeModel> envelope_model;
  // For a moving load's load set: the method's influence lines and the train.
  std::shared_ptr<const MovingModel> moving_model;
  // This method's own span extremes (of its envelope, for an envelope).
  std::vector<SpanExtremes> extremes;
};

// The second route for an envelope: a value the envelope reports as
// governing (a span's largest or smallest moment, a node's largest or
// smallest reaction, a span's largest deflection), and the governing
// arrangement with its factors solved directly, as an ordinary load set,
// by every method.
struct RouteCheck {
  std::string quantity;     // "max_moment", "min_moment", "max_deflection", "reaction_max", "reaction_min"
  std::string where;        // "span 2", "node B"
  double x = 0;             // global
  std::string arrangement;  // plain words (describe())
  double envelope = 0;      // the envelope's value (consensus)
  std::vector<std::pair<std::string, double>> values;  // method -> value of the direct solve
  double difference = 0;    // largest |value - envelope|, relative to the largest of that kind
  bool holds = false;       // difference within the agreement bound, every method ok
};

// The value of `q` (moment_max ... reaction_min) of one method's envelope
// at a point of a span (`after`: the right-hand limit at a jump) or, for
// reactions, at a node (`span` is then the node).
double envelope_value(const EnvelopeModel& model, input::Quantity q, std::size_t span, double local, bool after);
// The same for one method's result of an envelope load set (a patterned
// combination or a moving load); nothing when the method has no envelope.
std::optional<double> envelope_value(const MethodResult& m, input::Quantity q, std::size_t span, double local, bool after);


enum class Verdict { Agree, Disagree, Unconfirmed };
const char* verdict_name(Verdict v);  // "agree", "disagree", "unconfirmed"

// Where two methods differ most.
struct Worst {
  Kind kind = Kind::Moment;
  std::string where;   // "node B" or "x = 3.25"
  double x = 0;
  std::vector<std::pair<std::string, double>> values;  // method, value
};

// One span's largest deflection against the load set's deflection limit
// (README, "Deflection limits").
struct DeflectionCheck {
  std::size_t span = 0;      // 0-based
  bool cantilever = false;   // an overhang: a span at an end of the beam whose outer end is free
  double length = 0;         // the span's length
  double deflection = 0;     // the largest magnitude in the span, signed (the methods' median)
  double x = 0;              // where (global)
  double allowed = 0;        // the limit as a deflection, > 0
  double ratio = 0;          // length / |deflection|; infinity where it does not deflect
  std::string limit;         // how the limit reads: "L/360", "2L/360 (cantilever)", "L/180 (cantilever)"
  bool holds = true;
};

struct LoadSet {
  std::string name;
  // The combination this load set comes from, if any; `envelope` when it
  // has a pattern or a factor range (the methods then carry envelopes).
  std::optional<input::Combination> combination;
  bool envelope = false;
  // A moving load's load set (the moving load's own, with `combination`
  // holding only it, or a combination that names one): the train and its
  // factor. Such a load set is an envelope.
  std::optional<input::MovingLoad> moving;
  double moving_factor = 1;
  Envelope consensus_envelope;
  Beam beam;  // the beam with this set's loads only
  std::vector<Station> stations;
  std::vector<MethodResult> methods;
  Verdict verdict = Verdict::Unconfirmed;
  double scale[kKinds] = {0, 0, 0, 0, 0};           // largest magnitude per kind
  double max_difference[kKinds] = {0, 0, 0, 0, 0};  // relative to scale
  std::optional<Worst> worst;                       // where agreement is worst
  std::string odd_one_out;                          // method that disagrees with the others
  std::string problem;                              // plain words when not agree
  std::vector<SpanExtremes> extremes;               // per span: median of the methods'
  std::vector<RouteCheck> second_route;             // envelopes only
  std::vector<DeflectionCheck> deflection_checks;   // per span, where a limit applies
  std::vector<NodeResult> consensus_nodes;          // median of ok methods
  std::vector<StationValues> consensus_stations;
  std::size_t ok_count() const;
};

struct ClaimResult {
  input::Claim claim;
  std::string label;        // "node B", "x = 2.4 m", "span 2"
  std::string load_case;
  bool evaluated = false;   // false: `reason` says why it could not be
  double computed = 0;
  double difference = 0;
  double tolerance = 0;
  bool holds = false;
  std::string reason;
  // For a claim that fails: the usual mistake that would make it hold (the
  // other sign, a factor of 10^3 or 10^6, the other side of a jump, the node
  // beside), in plain words; empty when none does. Never a pass.
  std::string finding;
};

enum class BeamStatus { Agree, Disagree, Unconfirmed, Invalid };
const char* beam_status_name(BeamStatus s);

struct BeamResult {
  std::string file;
  std::string title;
  input::Units units;
  BeamStatus status = BeamStatus::Invalid;
  std::vector<input::Error> errors;
  std::vector<LoadSet> sets;
  std::vector<ClaimResult> claims;
  // Warnings about the beam (e.g. digits double loses). What the layers
  // above attach (--against, other arithmetic) is in reports::Report.
  std::vector<std::string> warnings;
  std::size_t claims_failed() const;
  std::size_t limits_failed() const;  // spans over their deflection limit, all load sets
};

struct Options {
  std::vector<std::string> methods;  // empty: all
  // The methods to choose from (default: methods()); tests put a
  // deliberately broken method here.
  const std::vector<Method>* method_set = nullptr;
  double agreement = 1e-6;
  std::optional<int> stations_per_span;
};

// Plain words for what governs an envelope value: "spans 1, 3 loaded;
// dead x1.35, live x1.6".
std::string describe(const Governs& g, const input::Combination& c);

// Checks one file that has been read (invalid files give an Invalid result
// carrying their errors).
BeamResult check(const input::BeamFile& file, const Options& options);

// After the methods' node and station values of `result` were replaced (by
// values computed in another arithmetic), recomputes the agreement, the
// consensus, the span extremes, the claims and the status.
void refresh(BeamResult& result, const input::BeamFile& file, const Options& options);

// Global x -> (span, local position); x beyond the ends is clamped.
std::pair<std::size_t, double> locate(const Beam& beam, double x);
// The node at global x (within 1e-12 of the beam's length), if any.
std::optional<std::size_t> node_at(const Beam& beam, double x);

// The loads of one load case: beam_for_case in load_sets.h.

// The caution every report carries.
const char* caution_text();

}  // namespace trivet::compare
