// trivet: the direct stiffness method (Euler-Bernoulli beam elements).
//
// Each span is cut into elements at its ends, at every point where a span
// load acts, starts or ends, and at every station given. Each element node
// carries a deflection and a rotation (two rotations at a hinge, one for
// each side). Distributed loads enter as work-equivalent nodal loads found
// by Gauss-Legendre quadrature against the Hermite cubics; supports are
// prescribed displacements (settlements), springs add to the diagonal. The
// banded system is solved by an LDL^T factorisation of our own, O(n) in the
// number of elements. Inside an element the answer is recovered exactly:
// deflection and rotation are the Hermite interpolation of the nodal values
// plus the element's clamped-clamped particular solution; shear and bending
// moment follow from the element end forces by statics.
//
// Independent of the other methods: it shares only methods/beam.
#pragma once

#include <vector>

#include "methods/beam/beam.h"
#include "methods/beam/numbers.h"

namespace trivet::stiffness {

// Solves every load in beam.loads. Returns NotApplicable (with the feature
// named in `reason`) for input outside the method's scope, Failed for an
// internal fault (zero or negative pivot, non-finite value).
template <class R>
BasicSolution<R> solve(const BasicBeam<R>& beam, const std::vector<BasicStation<R>>& stations);

extern template BasicSolution<double> solve<double>(const BasicBeam<double>&,
                                                    const std::vector<BasicStation<double>>&);
extern template BasicSolution<Extended> solve<Extended>(const BasicBeam<Extended>&,
                                                        const std::vector<BasicStation<Extended>>&);

}  // namespace trivet::stiffness
