// trivet: the direct stiffness method (Euler-Bernoulli beam elements).
//
// One element per span: element nodes only at the beam's own nodes
// (supports, free nodes, hinges). Each node carries a deflection and a
// rotation (two rotations at a hinge, one for each side). Every load inside
// a span enters as its work-equivalent (consistent) nodal loads: a
// distributed load by Gauss-Legendre quadrature against the Hermite cubics
// over its own [from, to] (exact: the integrand is a polynomial of degree
// 4), a point force or couple by the shape functions' values or slopes at
// its position. Supports are prescribed displacements (settlements); springs
// add to the diagonal. The banded system is solved by an LDL^T
// factorisation of our own, O(n) in the number of spans.
//
// Anywhere inside a span the answer is recovered exactly: deflection and
// rotation are the Hermite interpolation of the end values plus the span's
// clamped-clamped particular solution of its own loads (Green's function,
// any number of point loads, couples and partial loads); shear and bending
// moment follow from the span's end forces (k u minus the consistent loads)
// by statics, with the `after` limit at a point force or couple. A span
// with many loads (more than 6) keeps these sums by load position, built
// once in the solve (O(m log m) for m loads), so each value inside it costs
// O(log m) instead of a loop over its m loads (stiffness_recovery.h,
// SpanIndex); the solve itself is O(m) in the loads. Reactions
// are the node loads minus the end forces of the adjoining spans; global
// equilibrium is checked before the result is returned.
//
// Why nodes only at beam nodes. An earlier design placed an element node at
// every station and every load point "for exactness". The exact recovery
// above already makes the answer exact between nodes, so those extra nodes
// bought nothing, and they cost digits: the condition number of the
// assembled stiffness matrix grows roughly like (total length / shortest
// element)^4, so short elements between close stations or close loads lost
// 6-10 digits in double (and with loads 1e-6 of a span apart the factorisation
// met non-positive pivots). With one element per span the system is
// conditioned like the slope-deflection system of the same beam. The
// `stations` argument is therefore not used; it keeps the common signature.
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

namespace detail {
// The same solve without its special cases for the common pinned/roller
// shape (the unrolled assembly of a rotations-only element, the
// tridiagonal factorisation): the general path, for tests that compare the
// two (equal to 1e-13 of the largest value of each kind). Not for other
// use. No `stations` argument: `solve` does not use its stations either
// (the answer is exact anywhere in a span), so the seam takes the beam only.
template <class R>
BasicSolution<R> solve_general(const BasicBeam<R>& beam);
extern template BasicSolution<double> solve_general<double>(const BasicBeam<double>&);

// The same solve with the recovery inside spans chosen by the caller: a
// span with more than `index_above` loads is recovered from sums of its
// loads by position (O(log m) a call for m loads), the others by the loop
// over their loads (O(m) a call). 0: every loaded span by the sums;
// SIZE_MAX: every span by the loop. `solve` uses 6. For tests that
// compare the two (equal to rounding); not for other use.
template <class R>
BasicSolution<R> solve_with_index_above(const BasicBeam<R>& beam, std::size_t index_above);
extern template BasicSolution<double> solve_with_index_above<double>(const BasicBeam<double>&, std::size_t);
extern template BasicSolution<Extended> solve_with_index_above<Extended>(const BasicBeam<Extended>&,
                                                                         std::size_t);
}  // namespace detail

}  // namespace trivet::stiffness
