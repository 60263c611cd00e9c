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

}  // namespace trivet::three_moment
