#include "harness/compare/extremes.h"

#include <algorithm>
#include <cmath>
#include <stdexcept>

namespace trivet::compare {

namespace {

constexpr double kPi = 3.14159265358979323846;

bool is_zero(double v) { return !(std::abs(v) > 0); }
bool opposite(double a, double b) { return (a > 0 && b < 0) || (a < 0 && b > 0); }

}  // namespace

namespace {

// The working form, without allocation: up to kMaxTerms coefficients.
constexpr int kMaxTerms = 12;

double eval_n(const double* c, int n, double t) {
  double v = 0;
  for (int k = n; k-- > 0;) v = v * t + c[k];
  return v;
}

double bracketed_zero_n(const double* c, int n, double u, double v, double pu, double pv) {
  int side = 0;
  for (int it = 0; it < 200; ++it) {
    double w = (u * pv - v * pu) / (pv - pu);
    if (!(w > u && w < v)) w = 0.5 * (u + v);
    if (!(w > u && w < v)) break;  // no double left between u and v
    const double pw = eval_n(c, n, w);
    if (is_zero(pw)) return w;
    if (opposite(pw, pu)) {
      v = w; pv = pw;
      if (side == -1) pu *= 0.5;
      side = -1;
    } else {
      u = w; pu = pw;
      if (side == +1) pv *= 0.5;
      side = +1;
    }
    if (v - u <= 1e-15) break;
  }
  return std::abs(pu) <= std::abs(pv) ? u : v;
}

// The zeros of sum c[k] t^k (n terms) in [lo, hi], increasing, into out
// (room for n - 1); returns their count.
int zeros_n(const double* coefficients, int n, double lo, double hi, double* out) {
  while (n > 0 && is_zero(coefficients[n - 1])) --n;
  const double* c = coefficients;
  int count = 0;
  if (n <= 1 || !(hi >= lo)) return 0;  // a constant: no isolated zero
  if (n == 2) {
    const double t = -c[0] / c[1];
    if (t >= lo && t <= hi) out[count++] = t;
    return count;
  }
  if (n == 3) {
    // A quadratic in closed form (the stable pair of formulas). A double
    // zero (no sign change) counts only where the discriminant is exactly 0.
    const double disc = c[1] * c[1] - 4 * c[2] * c[0];
    if (disc < 0) return 0;
    const double q = -0.5 * (c[1] + std::copysign(std::sqrt(disc), c[1]));
    double t1 = q / c[2], t2 = is_zero(q) ? t1 : c[0] / q;
    if (t2 < t1) std::swap(t1, t2);
    if (t1 >= lo && t1 <= hi) out[count++] = t1;
    if (t2 >= lo && t2 <= hi && (count == 0 || t2 > out[count - 1])) out[count++] = t2;
    return count;
  }
  // Between consecutive zeros of p' the polynomial is monotone.
  double d[kMaxTerms];
  for (int k = 1; k < n; ++k) d[k - 1] = static_cast<double>(k) * c[k];
  double dz[kMaxTerms];
  const int nd = zeros_n(d, n - 1, lo, hi, dz);
  double cuts[kMaxTerms + 1];
  int nc = 0;
  cuts[nc++] = lo;
  for (int i = 0; i < nd; ++i)
    if (dz[i] > cuts[nc - 1] && dz[i] < hi) cuts[nc++] = dz[i];
  cuts[nc++] = hi;
  auto add = [&](double t) {
    if (count == 0 || t > out[count - 1]) out[count++] = t;
  };
  for (int i = 0; i + 1 < nc; ++i) {
    const double u = cuts[i], v = cuts[i + 1];
    const double pu = eval_n(c, n, u), pv = eval_n(c, n, v);
    if (is_zero(pu)) add(u);  // a zero at the end of a bracket counts
    if (opposite(pu, pv)) add(bracketed_zero_n(c, n, u, v, pu, pv));
  }
  if (is_zero(eval_n(c, n, hi))) add(hi);
  return count;
}

}  // namespace

std::vector<double> polynomial_zeros(const std::vector<double>& coefficients, double lo, double hi) {
  std::vector<double> out;
  if (coefficients.empty()) return out;
  if (coefficients.size() > static_cast<std::size_t>(kMaxTerms)) {
    // Beyond the working size: only trailing zeros may be there.
    for (std::size_t k = kMaxTerms; k < coefficients.size(); ++k)
      if (!is_zero(coefficients[k])) throw std::invalid_argument("polynomial_zeros: more than 12 terms");
  }
  const int n = static_cast<int>(std::min<std::size_t>(coefficients.size(), kMaxTerms));
  double z[kMaxTerms];
  const int count = zeros_n(coefficients.data(), n, lo, hi, z);
  out.assign(z, z + count);
  return out;
}

int poly_zeros(const Poly& p, double lo, double hi, std::array<double, kDegree>& out) {
  return zeros_n(p.data(), static_cast<int>(p.size()), lo, hi, out.data());
}

std::array<double, kDegree - 1> sample_points(double a, double b) {
  std::array<double, kDegree - 1> x{};
  const double m = 0.5 * (a + b), h = 0.5 * (b - a);
  for (int j = 1; j < kDegree; ++j) x[static_cast<std::size_t>(j - 1)] = m - h * std::cos(kPi * j / kDegree);
  return x;
}

namespace {

// The inverse of the Vandermonde matrix at the Chebyshev-Lobatto points
// t_j = -cos(pi j / kDegree), j = 0..kDegree: coefficients = inv * values.
// Gaussian elimination with partial pivoting, once (6 x 6, well conditioned).
struct InverseVandermonde {
  double m[kDegree + 1][kDegree + 1];
  InverseVandermonde() {
    constexpr int n = kDegree + 1;
    double A[n][2 * n];
    for (int j = 0; j < n; ++j) {
      const double t = -std::cos(kPi * j / kDegree);
      double p = 1;
      for (int k = 0; k < n; ++k) { A[j][k] = p; p *= t; }
      for (int k = 0; k < n; ++k) A[j][n + k] = j == k ? 1.0 : 0.0;
    }
    for (int col = 0; col < n; ++col) {
      int piv = col;
      for (int r = col + 1; r < n; ++r)
        if (std::abs(A[r][col]) > std::abs(A[piv][col])) piv = r;
      if (piv != col)
        for (int k = 0; k < 2 * n; ++k) std::swap(A[piv][k], A[col][k]);
      const double d = A[col][col];
      for (int k = 0; k < 2 * n; ++k) A[col][k] /= d;
      for (int r = 0; r < n; ++r) {
        if (r == col) continue;
        const double f = A[r][col];
        for (int k = 0; k < 2 * n; ++k) A[r][k] -= f * A[col][k];
      }
    }
    for (int r = 0; r < n; ++r)
      for (int k = 0; k < n; ++k) m[r][k] = A[r][n + k];
  }
};

const InverseVandermonde& inverse_vandermonde() {
  static const InverseVandermonde v;
  return v;
}

}  // namespace

Poly interpolate(double fa, const std::array<double, kDegree - 1>& inner, double fb) {
  const auto& V = inverse_vandermonde();
  std::array<double, kDegree + 1> y{};
  y[0] = fa;
  for (std::size_t j = 0; j < inner.size(); ++j) y[j + 1] = inner[j];
  y[kDegree] = fb;
  Poly c{};
  for (int r = 0; r <= kDegree; ++r) {
    double s = 0;
    for (int k = 0; k <= kDegree; ++k) s += V.m[r][k] * y[static_cast<std::size_t>(k)];
    c[static_cast<std::size_t>(r)] = s;
  }
  return c;
}

double evaluate(const Poly& p, double t) {
  double v = 0;
  for (std::size_t k = p.size(); k-- > 0;) v = v * t + p[k];
  return v;
}

std::pair<double, double> largest(const Poly& p, double t0, double t1, double sign) {
  double best = sign * evaluate(p, t0), at = t0;
  const double e1 = sign * evaluate(p, t1);
  if (e1 > best) { best = e1; at = t1; }
  double d[kDegree], z[kDegree];
  for (std::size_t k = 1; k < p.size(); ++k) d[k - 1] = static_cast<double>(k) * p[k];
  const int nz = zeros_n(d, kDegree, t0, t1, z);
  for (int i = 0; i < nz; ++i) {
    const double e = sign * evaluate(p, z[i]);
    if (e > best) { best = e; at = z[i]; }
  }
  return {best, at};
}

void turning_points_of(const Poly& p, double a, double b, std::vector<double>& out) {
  if (!(b > a)) return;
  for (double v : p)
    if (!std::isfinite(v)) return;
  Poly c = p;
  // Drop coefficients that are rounding noise of the values, so a quadratic
  // is not given spurious turning points by 1e-17 cubic terms (harmless, as
  // every candidate is evaluated, but wasted work).
  double scale = 0;
  for (double v : c) scale = std::max(scale, std::abs(v));
  for (double& v : c)
    if (std::abs(v) <= 1e-13 * scale) v = 0;
  double d[kDegree], z[kDegree];
  for (std::size_t k = 1; k < c.size(); ++k) d[k - 1] = static_cast<double>(k) * c[k];
  const double m = 0.5 * (a + b), h = 0.5 * (b - a);
  const int nz = zeros_n(d, kDegree, -1.0, 1.0, z);
  for (int i = 0; i < nz; ++i) {
    const double x = m + h * z[i];
    if (x > a && x < b) out.push_back(x);
  }
}

Poly hermite3(double a, double b, double fa, double dfa, double fb, double dfb) {
  // p(t) on [-1, 1] with p(-1) = fa, p(1) = fb, p'(-1) = h dfa, p'(1) = h dfb.
  const double h = 0.5 * (b - a), m0 = h * dfa, m1 = h * dfb;
  return Poly{0.5 * (fa + fb) - 0.25 * (m1 - m0), 0.75 * (fb - fa) - 0.25 * (m0 + m1), 0.25 * (m1 - m0),
              0.25 * (m0 + m1) - 0.25 * (fb - fa), 0, 0};
}

std::array<double, 2> hermite_points(double a, double b) {
  const double m = 0.5 * (a + b), h = 0.5 * (b - a);
  return {m - 0.5 * h, m + 0.5 * h};
}

namespace {

// The inverse of the confluent Vandermonde matrix of the conditions
// p(-1), p'(-1), p(-1/2), p(1/2), p(1), p'(1) on t^0..t^5, once.
struct InverseHermite {
  double m[6][6];
  InverseHermite() {
    double A[6][12] = {};
    auto value = [&](int row, double t) {
      double p = 1;
      for (int k = 0; k < 6; ++k) { A[row][k] = p; p *= t; }
    };
    auto slope = [&](int row, double t) {
      A[row][0] = 0;
      double p = 1;
      for (int k = 1; k < 6; ++k) { A[row][k] = k * p; p *= t; }
    };
    value(0, -1.0);
    slope(1, -1.0);
    value(2, -0.5);
    value(3, 0.5);
    value(4, 1.0);
    slope(5, 1.0);
    for (int r = 0; r < 6; ++r) A[r][6 + r] = 1.0;
    for (int col = 0; col < 6; ++col) {
      int piv = col;
      for (int r = col + 1; r < 6; ++r)
        if (std::abs(A[r][col]) > std::abs(A[piv][col])) piv = r;
      if (piv != col)
        for (int k = 0; k < 12; ++k) std::swap(A[piv][k], A[col][k]);
      const double dv = A[col][col];
      for (int k = 0; k < 12; ++k) A[col][k] /= dv;
      for (int r = 0; r < 6; ++r) {
        if (r == col) continue;
        const double f = A[r][col];
        for (int k = 0; k < 12; ++k) A[r][k] -= f * A[col][k];
      }
    }
    for (int r = 0; r < 6; ++r)
      for (int k = 0; k < 6; ++k) m[r][k] = A[r][6 + k];
  }
};

}  // namespace

Poly hermite5(double a, double b, double fa, double dfa, const std::array<double, 2>& inner, double fb, double dfb) {
  static const InverseHermite inv;
  const double h = 0.5 * (b - a);
  const double y[6] = {fa, h * dfa, inner[0], inner[1], fb, h * dfb};
  Poly c{};
  for (int r = 0; r < 6; ++r) {
    double s = 0;
    for (int k = 0; k < 6; ++k) s += inv.m[r][k] * y[k];
    c[static_cast<std::size_t>(r)] = s;
  }
  return c;
}

}  // namespace trivet::compare
