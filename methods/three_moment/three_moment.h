// trivet: the three-moment equation (Clapeyron) method.
//
// The unknowns are the bending moments at the supports. Rotation continuity
// over each interior support gives the three-moment equation; a fixed end
// gives one more equation (an imaginary adjoining span of infinite
// stiffness). The system is tridiagonal and is solved in O(n). Reactions,
// shear and moment then follow from the statics of each span, rotations and
// deflections from closed-form integration of M/EI along each span.
//
// Outside its scope (spring and guided supports, an unsupported interior node
// between spans of different EI, a hinge at an unsupported node) the method
// returns MethodStatus::NotApplicable with a reason naming the feature.
#pragma once

#include <vector>

#include "methods/beam/beam.h"
#include "methods/beam/numbers.h"

namespace trivet::three_moment {

template <class R>
BasicSolution<R> solve(const BasicBeam<R>& beam, const std::vector<BasicStation<R>>& stations);

extern template BasicSolution<double> solve<double>(const BasicBeam<double>&,
                                                    const std::vector<BasicStation<double>>&);
extern template BasicSolution<Extended> solve<Extended>(const BasicBeam<Extended>&,
                                                        const std::vector<BasicStation<Extended>>&);
extern template BasicSolution<Exact> solve<Exact>(const BasicBeam<Exact>&,
                                                  const std::vector<BasicStation<Exact>>&);

// The general path alone, the fast path for the usual beam (pinned and
// roller supports, no hinge, no node load, span loads in span order)
// switched off: a seam for tests, which compare it with solve(). The two
// agree to 1e-13 of the largest value of each kind.
namespace detail {
template <class R>
BasicSolution<R> solve_general(const BasicBeam<R>& beam, const std::vector<BasicStation<R>>& stations);

extern template BasicSolution<double> solve_general<double>(const BasicBeam<double>&,
                                                            const std::vector<BasicStation<double>>&);
extern template BasicSolution<Extended> solve_general<Extended>(const BasicBeam<Extended>&,
                                                                const std::vector<BasicStation<Extended>>&);
extern template BasicSolution<Exact> solve_general<Exact>(const BasicBeam<Exact>&,
                                                          const std::vector<BasicStation<Exact>>&);
}  // namespace detail

}  // namespace trivet::three_moment
