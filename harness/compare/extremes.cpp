#include "harness/compare/extremes.h"

#include <algorithm>
#include <cmath>

namespace trivet::compare {

namespace {

constexpr double kPi = 3.14159265358979323846;

double eval(const std::vector<double>& c, double t) {
  double v = 0;
  for (std::size_t k = c.size(); k-- > 0;) v = v * t + c[k];
  return v;
}

bool is_zero(double v) { return !(std::abs(v) > 0); }
bool opposite(double a, double b) { return (a > 0 && b < 0) || (a < 0 && b > 0); }

// The zero of p in [u, v], where p(u) and p(v) have opposite signs, by
// bisection: always converges, to the resolution of the doubles.
double bisect(const std::vector<double>& c, double u, double v, double pu) {
  for (int it = 0; it < 200; ++it) {
    const double m = 0.5 * (u + v);
    if (!(m > u && m < v)) break;
    const double pm = eval(c, m);
    if (is_zero(pm)) return m;
    if (opposite(pm, pu)) v = m;
    else { u = m; pu = pm; }
  }
  return 0.5 * (u + v);
}

}  // namespace

std::vector<double> polynomial_zeros(const std::vector<double>& coefficients, double lo, double hi) {
  std::vector<double> c = coefficients;
  while (!c.empty() && is_zero(c.back())) c.pop_back();
  std::vector<double> out;
  if (c.size() <= 1 || !(hi >= lo)) return out;  // a constant: no isolated zero
  if (c.size() == 2) {
    const double t = -c[0] / c[1];
    if (t >= lo && t <= hi) out.push_back(t);
    return out;
  }
  // Between consecutive zeros of p' the polynomial is monotone.
  std::vector<double> d(c.size() - 1);
  for (std::size_t k = 1; k < c.size(); ++k) d[k - 1] = static_cast<double>(k) * c[k];
  std::vector<double> cuts{lo};
  for (double t : polynomial_zeros(d, lo, hi))
    if (t > cuts.back() && t < hi) cuts.push_back(t);
  cuts.push_back(hi);
  auto add = [&](double t) {
    if (out.empty() || t > out.back()) out.push_back(t);
  };
  for (std::size_t i = 0; i + 1 < cuts.size(); ++i) {
    const double u = cuts[i], v = cuts[i + 1];
    const double pu = eval(c, u), pv = eval(c, v);
    if (is_zero(pu)) add(u);  // a zero at the end of a bracket counts
    if (opposite(pu, pv)) add(bisect(c, u, v, pu));
  }
  if (is_zero(eval(c, hi))) add(hi);
  return out;
}

std::array<double, kDegree - 1> sample_points(double a, double b) {
  std::array<double, kDegree - 1> x{};
  const double m = 0.5 * (a + b), h = 0.5 * (b - a);
  for (int j = 1; j < kDegree; ++j) x[static_cast<std::size_t>(j - 1)] = m - h * std::cos(kPi * j / kDegree);
  return x;
}

void turning_points(double a, double b, double fa, const std::array<double, kDegree - 1>& inner, double fb,
                    std::vector<double>& out) {
  if (!(b > a)) return;
  constexpr int n = kDegree + 1;
  // The interpolation in t = (x - m) / h on [-1, 1]: solve the Vandermonde
  // system by Gaussian elimination with partial pivoting (6 x 6, well
  // conditioned at the Chebyshev-Lobatto points).
  double A[n][n + 1];
  for (int j = 0; j < n; ++j) {
    const double t = -std::cos(kPi * j / kDegree);
    double p = 1;
    for (int k = 0; k < n; ++k) { A[j][k] = p; p *= t; }
    A[j][n] = j == 0 ? fa : j == kDegree ? fb : inner[static_cast<std::size_t>(j - 1)];
    if (!std::isfinite(A[j][n])) return;
  }
  for (int col = 0; col < n; ++col) {
    int piv = col;
    for (int r = col + 1; r < n; ++r)
      if (std::abs(A[r][col]) > std::abs(A[piv][col])) piv = r;
    if (piv != col)
      for (int k = 0; k <= n; ++k) std::swap(A[piv][k], A[col][k]);
    for (int r = col + 1; r < n; ++r) {
      const double f = A[r][col] / A[col][col];
      for (int k = col; k <= n; ++k) A[r][k] -= f * A[col][k];
    }
  }
  std::vector<double> c(n);
  for (int r = n - 1; r >= 0; --r) {
    double s = A[r][n];
    for (int k = r + 1; k < n; ++k) s -= A[r][k] * c[static_cast<std::size_t>(k)];
    c[static_cast<std::size_t>(r)] = s / A[r][r];
  }
  // Drop coefficients that are rounding noise of the values, so a quadratic
  // is not given spurious turning points by 1e-17 cubic terms (harmless, as
  // every candidate is evaluated, but wasted work).
  double scale = 0;
  for (double v : c) scale = std::max(scale, std::abs(v));
  for (double& v : c)
    if (std::abs(v) <= 1e-13 * scale) v = 0;
  std::vector<double> d(n - 1);
  for (int k = 1; k < n; ++k) d[static_cast<std::size_t>(k - 1)] = k * c[static_cast<std::size_t>(k)];
  const double m = 0.5 * (a + b), h = 0.5 * (b - a);
  for (double t : polynomial_zeros(d, -1.0, 1.0)) {
    const double x = m + h * t;
    if (x > a && x < b) out.push_back(x);
  }
}

}  // namespace trivet::compare
