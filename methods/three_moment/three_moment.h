// trivet: the three-moment equation (Clapeyron) method.
//
// The unknowns are the bending moments at the supports. Rotation continuity
// over each interior support gives the three-moment equation; a fixed end
// gives one more equation (an imaginary adjoining span of infinite
// stiffness). For the usual beam the system is tridiagonal and is solved in
// O(n). Springs (vertical: the five-moment equation; rotational), guided
// supports, hinges anywhere and unsupported nodes between spans of any EI
// add the node deflections as unknowns, closed by each node's vertical
// equilibrium or its spring; the system stays banded, O(n). Reactions, shear
// and moment then follow from the statics of each span, rotations and
// deflections from closed-form integration of M/EI along each span.
//
// Every beam the reader accepts is within scope. The method returns
// MethodStatus::NotApplicable (naming the feature) only for what the reader
// refuses anyway: a hinge where the rotation is restrained (fixed, guided,
// rotational spring) and a couple on a hinge.
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

namespace detail {

// For tests only: always takes the general path (tridiagonal when the beam
// fits it, banded otherwise), never the fast path, so a test can compare the
// fast path with the general one without relying on what the fast path
// declines.
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
