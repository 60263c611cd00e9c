// trivet: turning points of a diagram between two breakpoints, exactly.
//
// Between two consecutive stations of a span no point force or couple acts
// and the distributed load is linear (the stations hold every load's ends),
// so by Euler-Bernoulli theory the shear is a polynomial of degree <= 2,
// the moment <= 3, the rotation <= 4 and the deflection <= 5 in x. A
// polynomial of degree <= kDegree is fixed by its values at kDegree + 1
// points: we take them at the Chebyshev-Lobatto points of the piece, find
// the interpolating polynomial, and the zeros of its derivative by
// recursion on the derivatives (between two consecutive zeros of p' a
// polynomial p is monotone, so a sign change there holds exactly one zero,
// found by a bracketed search that always converges; a zero at an end of a
// bracket counts). Nothing is stepped or sampled, so no turning point is missed,
// whatever the number of stations.
//
// This code is shared by the answers of all three methods (each method's
// own values are fed through it). What catches a bug in it:
// tests/extremes_test.cpp (polynomials with known roots, the handbook
// 0.10125 wL^2 at any stations per span) and tests/envelope_bruteforce_test.cpp
// (dense sampling of every method), and the selfcheck's own dense scan
// (references/selfcheck.cpp) on every cited span extreme.
#pragma once

#include <array>
#include <cstddef>
#include <utility>
#include <vector>

namespace trivet::compare {

// The degree the interpolation takes: exact for the deflection (degree 5
// under a linear load), so exact for the moment as well.
constexpr int kDegree = 5;

// The interior sample points of [a, b] (the kDegree - 1 Chebyshev-Lobatto
// points other than a and b), in increasing order.
std::array<double, kDegree - 1> sample_points(double a, double b);

// A polynomial of degree <= kDegree on a piece [a, b], in t = (x - m) / h
// (m the middle, h the half length, so t in [-1, 1]); c[k] multiplies t^k.
using Poly = std::array<double, kDegree + 1>;
// The polynomial through fa (t = -1), the interior samples (in the order
// of sample_points) and fb (t = +1).
Poly interpolate(double fa, const std::array<double, kDegree - 1>& inner, double fb);
double evaluate(const Poly& p, double t);
// The largest value of sign * p(t) on [t0, t1] (sign +1 or -1), and where:
// at an end or at a zero of p' inside.
std::pair<double, double> largest(const Poly& p, double t0, double t1, double sign);

// With the slopes at the ends as well (dp/dx there: the shear for the
// moment, the rotation for the deflection), fewer samples fix the
// polynomial: the cubic through the end values and slopes (exact for the
// moment under a linear load), and the quintic through them and two
// interior samples at hermite_points (exact for the deflection).
Poly hermite3(double a, double b, double fa, double dfa, double fb, double dfb);
std::array<double, 2> hermite_points(double a, double b);
Poly hermite5(double a, double b, double fa, double dfa, const std::array<double, 2>& inner, double fb, double dfb);
// The points strictly inside (a, b) where the derivative of p (in t on
// [a, b], as above) vanishes. Appends to `out`.
void turning_points_of(const Poly& p, double a, double b, std::vector<double>& out);

// The zeros of p in [lo, hi], increasing, into out; returns their count
// (as polynomial_zeros, without allocating).
int poly_zeros(const Poly& p, double lo, double hi, std::array<double, kDegree>& out);

// The real zeros in [lo, hi] of the polynomial sum c[k] t^k (up to 12 terms),
// in increasing order. Exposed for the tests.
std::vector<double> polynomial_zeros(const std::vector<double>& c, double lo, double hi);

}  // namespace trivet::compare
