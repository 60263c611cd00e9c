// trivet: the slope-deflection method.
//
// Unknowns: the rotation of every node free to rotate (two at a hinge, one
// for each side) and the translation of every node free to translate (free
// nodes, springs, guided supports). Each span's end moments follow from
//   M_ij = (2EI/L)(2 theta_i + theta_j - 3 psi) + FEM_ij,  psi = (D_j - D_i)/L
// (clockwise-positive moments acting on the member ends), with fixed-end
// moments from closed forms per load type. Equations: moment equilibrium at
// each rotating node, vertical equilibrium at each translating node. The
// system is banded (unknowns ordered node by node) and is solved by a
// banded elimination of this module, O(n) in spans, using only + - * /.
//
// Results inside a span come from the statics of the span (end moments plus
// the span loads) and from the span's own elastic curve, in closed form.
#pragma once

#include <vector>

#include "methods/beam/beam.h"
#include "methods/beam/numbers.h"

namespace trivet::slope_deflection {

// Solves every load in beam.loads. Exact at any point (to rounding); the
// stations are not needed.
template <class R>
BasicSolution<R> solve(const BasicBeam<R>& beam, const std::vector<BasicStation<R>>& stations);

namespace detail {

// The general path alone: every beam the method covers, through the banded
// system of band.h. solve() takes a fused route for the common beam
// (fused.h) and this for the rest; the tests compare the two.
template <class R>
BasicSolution<R> solve_general(const BasicBeam<R>& beam, const std::vector<BasicStation<R>>& stations);

// A pair of values at the two ends of a span (left end i, right end j).
template <class R>
struct EndPair {
  R left{0};
  R right{0};
};

// Fixed-end moments of one span load on a span of length L fixed at both
// ends, in the member-end convention (clockwise +), from closed forms.
// Returns {0, 0} for a load type it does not know (none today).
template <class R>
EndPair<R> fixed_end_moments(const BasicLoad<R>& load, const R& length);

// End rotations (clockwise +) of the span as a simple beam (pinned at both
// ends) under one load, from the span's elastic-curve code (independent of
// fixed_end_moments: compatibility ties the two together).
template <class R>
EndPair<R> simple_span_end_rotations(const BasicLoad<R>& load, const R& length, const R& EI);

}  // namespace detail

extern template BasicSolution<double> solve<double>(const BasicBeam<double>&,
                                                    const std::vector<BasicStation<double>>&);
extern template BasicSolution<Extended> solve<Extended>(const BasicBeam<Extended>&,
                                                        const std::vector<BasicStation<Extended>>&);
extern template BasicSolution<Exact> solve<Exact>(const BasicBeam<Exact>&,
                                                  const std::vector<BasicStation<Exact>>&);

namespace detail {
extern template BasicSolution<double> solve_general<double>(const BasicBeam<double>&,
                                                            const std::vector<BasicStation<double>>&);
extern template BasicSolution<Extended> solve_general<Extended>(const BasicBeam<Extended>&,
                                                                const std::vector<BasicStation<Extended>>&);
extern template BasicSolution<Exact> solve_general<Exact>(const BasicBeam<Exact>&,
                                                          const std::vector<BasicStation<Exact>>&);
extern template EndPair<double> fixed_end_moments<double>(const BasicLoad<double>&, const double&);
extern template EndPair<Extended> fixed_end_moments<Extended>(const BasicLoad<Extended>&, const Extended&);
extern template EndPair<Exact> fixed_end_moments<Exact>(const BasicLoad<Exact>&, const Exact&);
extern template EndPair<double> simple_span_end_rotations<double>(const BasicLoad<double>&, const double&,
                                                                  const double&);
extern template EndPair<Extended> simple_span_end_rotations<Extended>(const BasicLoad<Extended>&,
                                                                      const Extended&, const Extended&);
extern template EndPair<Exact> simple_span_end_rotations<Exact>(const BasicLoad<Exact>&, const Exact&,
                                                                const Exact&);
}  // namespace detail

}  // namespace trivet::slope_deflection
