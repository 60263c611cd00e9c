// trivet: the envelope of a combination with a pattern or a factor range,
// for one method (internal to harness/compare).
//
// The combination's loads are split into shares, each solved once by the
// method (superposition; README, "Load combinations and patterned
// envelopes"):
//   - a case that is not patterned: one share (its loads and the
//     settlements that name it), factor from F_k = {f} or {low, high};
//   - a patterned case: one share per span (its loads on that span),
//     factor from {0} u F_k; and one share of its node loads and the
//     settlements that name it, factor from F_k;
//   - the settlements that name no case: one share, factor exactly 1.
// "all": every share picks its factor independently. "adjacent-and-
// alternate": an arrangement (all spans, odd spans, even spans, or a pair
// of adjacent spans) switches the patterned span shares on (F_k) or off.
#pragma once

#include <array>
#include <cstddef>
#include <cstdint>
#include <limits>
#include <map>
#include <memory>
#include <utility>
#include <vector>

#include "harness/compare/compare.h"

namespace trivet::compare {

class EnvelopeModel {
 public:
  static constexpr std::size_t kAlways = std::numeric_limits<std::size_t>::max();
  struct Unit {
    std::size_t factor = kAlways;  // index into comb.factors; kAlways: factor 1, always on
    bool patterned = false;        // a patterned case's share of one span
    std::size_t span = 0;          // for a patterned share: its span
    std::vector<Load> loads;       // the share's loads, unfactored
    std::vector<std::pair<std::size_t, double>> settlements;  // (node, settlement), unfactored
    Solution solution;             // the method's; its `nodes` are dropped after the solve
    std::vector<double> reactions; // reaction force per node
  };
  // A factor for every unit (0: off): one arrangement with its factors.
  using Choice = std::vector<double>;
  enum What { kMoment, kShear, kDeflection };

  input::Combination comb;
  Beam base;  // the beam without loads or settlements
  std::size_t spans = 0;
  std::vector<Unit> units;
  std::vector<std::vector<std::size_t>> arrangements;  // adjacent-and-alternate only

  // The largest (want_max) or smallest combined value of units' values g
  // (one per unit), and the choice that gives it.
  double extreme(const std::vector<double>& g, bool want_max, Choice* choice) const;
  // For "all" arrangements: each unit's factor in the largest (max) and
  // the smallest (min) envelope where its value is positive, negative or
  // zero: the choice pick() makes, worked out once (prepare()).
  struct Options {
    double max_pos = 0, max_neg = 0, max_zero = 0, min_pos = 0, min_neg = 0, min_zero = 0;
  };
  std::vector<Options> options;  // empty until prepare(): extreme() then asks pick()
  // Works out `options` and `span_units` from `units` and `comb` (call after
  // the units are set).
  void prepare();
  // Per case (index into comb.factors), the unit of its patterned share on
  // each span (kAlways where it has none); empty for a case not patterned.
  std::vector<std::vector<std::size_t>> span_units;
  // For the second route (all arrangements): a choice made by extreme() for
  // values g, with each patterned share whose value is negligible (taken as
  // zero, so off) beyond the outermost spans that matter set as the share
  // two spans nearer took: the alternate pattern carried on to the ends. Its
  // value differs from the choice's by rounding only (each such share is
  // below 2^-52 of the sum); far from their points, many governing
  // arrangements become one, so fewer need a direct solve.
  void extend_pattern(const std::vector<double>& g, Choice& c) const;
  // What governs, shared between the points that have the same.
  struct Interned {
    std::map<std::pair<std::size_t, std::size_t>, std::vector<std::shared_ptr<const Governs>>> buckets;
    // The last few choices and what they govern: along a span most points
    // have the choices of the point before (six a station: the largest and
    // smallest moment, shear and deflection).
    struct Recent {
      Choice choice;
      std::uint64_t hash = 0;  // of `choice`, compared first
      std::shared_ptr<const Governs> by;
    };
    std::array<Recent, 8> recent;
    std::size_t next = 0;
    Choice hi, lo;  // room for combine()'s choices
  };
  std::shared_ptr<const Governs> intern(Governs g, Interned* pool) const;
  // Both bounds, with what governs them (shared through `pool` if given).
  Bound combine(const std::vector<double>& g, Interned* pool = nullptr) const;
  Bound at(std::size_t span, double local, bool after, What what) const;
  Bound reaction(std::size_t node) const;
  // The units' values of every quantity at a point.
  void values(std::size_t span, double local, bool after, std::vector<PointValues>& out) const;
  Governs governs(const Choice& c) const;
  // What governs choice `c`, shared through `pool`.
  std::shared_ptr<const Governs> governs(const Choice& c, Interned* pool) const;
  // The same, with the choice's hash worked out already.
  std::shared_ptr<const Governs> governs(const Choice& c, std::uint64_t hash, Interned* pool) const;
  // The beam of one unit (its loads and settlements, unfactored).
  Beam unit_beam(std::size_t u) const;
  // The beam of one arrangement with its factors: every unit's loads and
  // settlements times its factor, as an ordinary load set.
  Beam arrangement_beam(const Choice& c) const;

 private:
  double pick(std::size_t u, double g, bool want_max, bool allow_off, double* factor) const;
};

}  // namespace trivet::compare
