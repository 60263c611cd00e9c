// trivet: a moving load (a train of point loads) on one method's beam: the
// method's influence lines, and the envelope of the train over every
// position, found exactly.
//
// Influence lines. The effect of a unit load standing at `a` on a quantity
// at a fixed point is a cubic in `a` between any two neighbouring kinks of
// the line: the nodes (supports, hinges) and the point itself (Müller-
// Breslau: the line is the deflected shape of the beam under a unit release
// at the point, and an unloaded prismatic stretch bends as a cubic). The
// pieces here end at every station of the load set, which holds every node
// and every station where the envelope is read. On each piece the method
// solves four unit loads, at the Chebyshev points of the piece: the cubic
// through their values is the influence line there, exactly (up to
// rounding). Each method's lines come from its own unit-load solutions.
//
// The train. With its first point at p, its point k stands at p + o_k
// (forward) or p - o_k (backward); a point off the beam does nothing. The
// effect sum_k P_k f(p +- o_k) is a cubic in p between the positions where
// a point crosses the end of a piece; its largest and smallest values are at
// the ends of those intervals (as limits from inside) or where its
// derivative vanishes: all are tried. The train off the beam (no effect) is
// one more position.
//
// This code is shared by the answers of all three methods. What catches a
// bug in it: the second route (every reported extreme's governing position
// solved directly by every method, as an ordinary load set) and
// tests/moving_test.cpp (direct solves at a fine grid of positions,
// closed-form influence lines, reciprocity).
#pragma once

#include <array>
#include <cstddef>
#include <memory>
#include <string>
#include <vector>

#include "harness/compare/compare.h"

namespace trivet::compare {

class MovingModel {
 public:
  enum What { kMoment, kShear, kDeflection };

  // The pieces of the influence lines: piece k lies in span `span[k]` from
  // local `lo[k]` to `hi[k]` (global `x0[k]` to `x1[k]`).
  struct Piece {
    std::size_t span = 0;
    double lo = 0, hi = 0;  // local to the span
    double x0 = 0, x1 = 0;  // global
  };

  // Builds one method's model: solves the fixed loads of `base` (the load
  // set's beam without the train: its other loads and its settlements) and a
  // unit load at four points of every piece between consecutive stations.
  // On failure returns null and fills r.status, r.reason, r.reason_id; the
  // equilibrium of every solution goes to r.equilibrium.
  static std::shared_ptr<MovingModel> build(const Method& method, const Beam& base, const std::vector<Station>& stations,
                                            const input::MovingLoad& train, double factor, MethodResult& r);

  const std::vector<Piece>& pieces() const { return pieces_; }
  // The positions of the unit loads (global x), four per piece.
  const std::vector<double>& sample_x() const { return sample_x_; }

  // The influence line of a quantity at a point of a span (`after`: the
  // right-hand limit at a jump), or of a node's reaction: its value at every
  // unit load (one per entry of sample_x()).
  std::vector<double> influence(std::size_t span, double local, bool after, What what) const;
  std::vector<double> reaction_influence(std::size_t node) const;
  // The line between the unit loads: its value with the load at global x
  // (0 off the beam; at a piece end the limit from inside the piece to the
  // left, or to the right with `right`).
  double influence_value(const std::vector<double>& line, double x, bool right = false) const;

  // The envelope: the fixed loads' value plus the factor times the train's
  // largest and smallest effect, with where the train stands for each.
  Bound at(std::size_t span, double local, bool after, What what) const;
  Bound reaction(std::size_t node) const;

  // The beam with the fixed loads and the train where `g` places it (times
  // its factor), as an ordinary load set; a point at a node is put on the
  // node, a point off the beam left off.
  Beam placed_beam(const Governs& g) const;

  const input::MovingLoad& train() const { return train_; }
  double factor() const { return factor_; }

 private:
  struct Run;  // an interval of the first point's position (moving.cpp)
  struct Table {
    std::vector<Run> runs[2];  // forward, backward
  };
  Bound train_bound(const std::vector<double>& line, const std::vector<Piece>& pieces, const Table& table) const;
  Table table_for(const std::vector<Piece>& pieces) const;
  // The fixed loads' value plus the factor times the train's bound (its
  // ends swapped for a negative factor).
  Bound with_fixed(Bound train, double fixed) const;
  // The line at a point that is no piece end: the pieces with the one that
  // holds it split there, and the values of the unit loads of the new pieces.
  Bound off_grid(std::size_t span, double local, bool after, What what) const;

  const Method* method_ = nullptr;
  Beam base_;   // the load set's beam without the train
  Beam bare_;   // without any load or settlement: the unit loads' beam
  std::vector<Station> stations_;
  input::MovingLoad train_;
  double factor_ = 1;
  Solution fixed_;                  // the fixed loads
  std::vector<double> fixed_reactions_;
  std::vector<Piece> pieces_;
  std::vector<double> sample_x_;
  std::vector<Solution> samples_;   // four per piece; `nodes` dropped
  std::vector<std::vector<double>> sample_reactions_;  // per node, one per sample
  std::shared_ptr<const Table> table_;
};

namespace detail {
// One method on a moving load's load set: its model, its envelope at the
// stations and nodes, and its span extremes (the largest over the
// stations of each span).
void run_moving_method(const Method& method, const LoadSet& set, MethodResult& r);
// The methods' influence lines compared (each method's value of every
// station's lines at every unit load), folded into the load set's
// agreement. Call after compare_envelopes.
void compare_influence_lines(LoadSet& set, double agreement);
// The second route for a moving load: each reported extreme's governing
// position solved directly by every method.
void moving_second_route(LoadSet& set, const std::vector<const Method*>& methods, double agreement);
}  // namespace detail

}  // namespace trivet::compare
