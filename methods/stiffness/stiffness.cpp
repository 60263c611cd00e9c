// trivet: the direct stiffness method. See stiffness.h.
//
// Element degrees of freedom, in the beam.h conventions: deflection v
// (down +) and rotation theta = dv/dx (clockwise +) at each end. With
// forces down + and couples clockwise + as the work-conjugate actions, the
// element stiffness is the usual EI/h^3 [12 6h -12 6h; 6h 4h^2 -6h 2h^2;
// -12 -6h 12 -6h; 6h 2h^2 -6h 4h^2], and EI v'''' = w (load down +).
//
// One element per span. Its end forces F = k u - f (f: the work-equivalent
// loads of all the span's loads) are the actions of the nodes ON the element
// (down +, clockwise +), so by the jump rules of beam.h the shear and moment
// just inside the span's left end, before any load at local 0, are
// V0 = -F1 and M0 = +F2; statics of the span carries them to any x. With
// Hermite cubics (the exact homogeneous solutions of EI v'''' = 0) these end
// forces are exact, not approximations: -f are the exact fixed-end forces.
#include "methods/stiffness/stiffness.h"

#include <algorithm>
#include <cmath>
#include <exception>
#include <limits>
#include <memory>
#include <string>
#include <utility>

namespace trivet::stiffness {
namespace {

// --- Gauss-Legendre rule computed in R ---------------------------------------

constexpr int kGaussPoints = 3;  // exact to degree 5; loads are linear, shapes cubic: degree 4.

template <class R>
struct GaussRule {
  R x[kGaussPoints];  // abscissae on [-1, 1]
  R w[kGaussPoints];  // weights
};

// P_n(x) and P_n'(x) by the three-term recurrence.
template <class R>
void legendre(int n, const R& x, R& p, R& dp) {
  R p0(1), p1 = x;
  for (int k = 2; k <= n; ++k) {
    R p2 = (R(2 * k - 1) * x * p1 - R(k - 1) * p0) / R(k);
    p0 = p1;
    p1 = p2;
  }
  p = p1;
  dp = R(n) * (x * p1 - p0) / (x * x - R(1));
}

// Roots of P_n bracketed on a grid (odd count, so no grid point is 0), then
// bisection and Newton, all in R.
template <class R>
GaussRule<R> make_gauss_rule() {
  GaussRule<R> rule;
  const int n = kGaussPoints;
  const int grid = 64 * n + 1;
  int found = 0;
  R a(-1), pa, da;
  legendre(n, a, pa, da);
  for (int i = 1; i <= grid && found < n; ++i) {
    R b = R(-1) + R(2 * i) / R(grid);
    R pb, db;
    legendre(n, b, pb, db);
    if ((pa < R(0)) != (pb < R(0))) {
      R lo = a, hi = b, plo = pa;
      for (int it = 0; it < 20; ++it) {
        R mid = (lo + hi) / R(2), pm, dm;
        legendre(n, mid, pm, dm);
        if ((pm < R(0)) == (plo < R(0))) {
          lo = mid;
          plo = pm;
        } else {
          hi = mid;
        }
      }
      R x = (lo + hi) / R(2);
      for (int it = 0; it < 12; ++it) {  // quadratic convergence: far past 50 digits
        R p, dp;
        legendre(n, x, p, dp);
        x -= p / dp;
      }
      R p, dp;
      legendre(n, x, p, dp);
      rule.x[found] = x;
      rule.w[found] = R(2) / ((R(1) - x * x) * dp * dp);
      ++found;
    }
    a = b;
    pa = pb;
  }
  return rule;
}

template <class R>
const GaussRule<R>& gauss_rule() {
  static const GaussRule<R> rule = make_gauss_rule<R>();
  return rule;
}

// --- Hermite cubics on an element of length h (s = xi / h) --------------------

template <class R>
void hermite(const R& s, const R& h, R N[4]) {
  const R s2 = s * s, s3 = s2 * s;
  N[0] = R(1) - R(3) * s2 + R(2) * s3;
  N[1] = h * (s - R(2) * s2 + s3);
  N[2] = R(3) * s2 - R(2) * s3;
  N[3] = h * (s3 - s2);
}

template <class R>
void hermite_slope(const R& s, const R& h, R D[4]) {
  const R s2 = s * s;
  D[0] = (R(6) * s2 - R(6) * s) / h;
  D[1] = R(1) - R(4) * s + R(3) * s2;
  D[2] = (R(6) * s - R(6) * s2) / h;
  D[3] = R(3) * s2 - R(2) * s;
}

// Element stiffness times end displacements.
template <class R>
inline __attribute__((always_inline)) void stiffness_times(const R& EI, const R& h, const R u[4], R out[4]) {
  const R c = EI / (h * h * h);
  const R h2 = h * h;
  out[0] = c * (R(12) * u[0] + R(6) * h * u[1] - R(12) * u[2] + R(6) * h * u[3]);
  out[1] = c * (R(6) * h * u[0] + R(4) * h2 * u[1] - R(6) * h * u[2] + R(2) * h2 * u[3]);
  out[2] = c * (-R(12) * u[0] - R(6) * h * u[1] + R(12) * u[2] - R(6) * h * u[3]);
  out[3] = c * (R(6) * h * u[0] + R(2) * h2 * u[1] - R(6) * h * u[2] + R(4) * h2 * u[3]);
}

// The element stiffness matrix itself (symmetric).
template <class R>
inline __attribute__((always_inline)) void element_matrix(const R& EI, const R& h, R k[4][4]) {
  const R c = EI / (h * h * h);
  const R a = R(12) * c, b = R(6) * h * c, d = R(4) * h * h * c, e = R(2) * h * h * c;
  const R m[4][4] = {{a, b, -a, b}, {b, d, -b, e}, {-a, -b, a, -b}, {b, e, -b, d}};
  for (int i = 0; i < 4; ++i)
    for (int j = 0; j < 4; ++j) k[i][j] = m[i][j];
}

// --- Solved state ---------------------------------------------------------------

// One load inside a span, local coordinates. Point: `value` = P at `a`.
// Couple: `value` = C at `a`. Distributed (Udl and Linear alike): wa at
// `a` varying linearly to wb at `b`.
template <class R>
struct SpanLoad {
  // No default member initialisers: the solver's arrays of these are made
  // without a fill pass (every field is written before it is read).
  LoadType type;
  R value, a, b, wa, wb;
  bool distributed() const { return type == LoadType::Udl || type == LoadType::Linear; }
};

template <class R>
struct SpanState {
  R L, EI;                // no initialisers, as SpanLoad
  R v0, th0, v1, th1;      // end displacements (this span's side at a hinge)
  R V0, M0;                // shear and moment from the left end force (before loads at 0)
};

// An array of `size` elements written by index, allocated once for its
// largest size and not filled first (for double the elements are left
// uninitialised by new T[]: nothing reads them before they are written).
template <class T>
struct FreshArray {
  std::unique_ptr<T[]> p;
  std::size_t count = 0;
  void allocate(std::size_t capacity) {
    p.reset(new T[capacity]);
    count = 0;
  }
  std::size_t size() const { return count; }
  T& operator[](std::size_t i) { return p[i]; }
  const T& operator[](std::size_t i) const { return p[i]; }
  T& push() { return p[count++]; }
};

template <class R>
struct State {
  FreshArray<SpanState<R>> spans;
  // Per span + 1: the span's loads are loads[first[s] .. first[s+1]).
  // Written by index in the assembly pass, so not filled before.
  std::unique_ptr<std::size_t[]> first;
  FreshArray<SpanLoad<R>> loads;
};

// Work-equivalent (consistent) loads of one span load on the element of
// length L (invL = 1 / L, made once per span): f_i = integral of w N_i over
// the load's own [a, b] by the Gauss rule (degree 1 x 3 = 4 <= 5: exact),
// in closed form for a uniform load over the whole span (wL/2, wL^2/12,
// wL/2, -wL^2/12: the same integral, other rounding), P N_i(a) for a force,
// C N_i'(a) for a couple. Added to f.
template <class R>
inline __attribute__((always_inline)) void add_consistent(const SpanLoad<R>& l, const R& L, const R& invL, R f[4]) {
  // Summed in locals: through the pointer f every store would make the
  // compiler read the load's fields again.
  R acc[4] = {f[0], f[1], f[2], f[3]};
  R N[4];
  const R a = l.a;
  if (l.type == LoadType::Point || l.type == LoadType::Couple) {
    const R value = l.value;
    if (l.type == LoadType::Point) hermite(a * invL, L, N);
    else hermite_slope(a * invL, L, N);
    for (int i = 0; i < 4; ++i) acc[i] += value * N[i];
  } else if (!(R(0) < a) && !(l.b < L) && !(l.wa < l.wb) && !(l.wb < l.wa)) {  // a == 0, b == L, uniform
    const R half_W = l.wa * L / R(2), fm = l.wa * L * L / R(12);
    acc[0] += half_W;
    acc[1] += fm;
    acc[2] += half_W;
    acc[3] -= fm;
  } else {
    const GaussRule<R>& g = gauss_rule<R>();
    const R b = l.b, wa = l.wa, wb = l.wb;
    const R half = (b - a) / R(2), mid = (a + b) / R(2);
    const R wmid = (wa + wb) / R(2), wslope = (wb - wa) / R(2);
    for (int q = 0; q < kGaussPoints; ++q) {
      const R xi = g.x[q];
      const R t = mid + half * xi;
      const R w = wmid + wslope * xi;
      hermite(t * invL, L, N);
      const R c = g.w[q] * half * w;
      for (int i = 0; i < 4; ++i) acc[i] += c * N[i];
    }
  }
  for (int i = 0; i < 4; ++i) f[i] = acc[i];
}

// The clamped-clamped Green's function of a span of length L (EI = 1):
// G(x, t) is the deflection (down +) at x due to a unit downward force at
// t, zero with zero slope at both ends. For x <= t ([Roark] Table 8.1
// case 1d, from memory; b = L - t):
//   G = b^2 x^2 (3 t L - (2 t + L) x) / (6 L^3),
// and G(x, t) = G(L - x, L - t) for x >= t (mirror image). Returned with
// dG/dx, dG/dt and d2G/dxdt: a clockwise couple C at t deflects the beam by
// C dG/dt (a downward force just right of t and an upward one just left).
template <class R>
struct Green {
  R g, gx, gt, gxt;
};

template <class R>
Green<R> green_left(const R& x, const R& t, const R& L) {  // x <= t
  const R b = L - t, L3 = L * L * L, two_t_L = R(2) * t + L, tL = t * L;
  Green<R> r;
  r.g = b * b * x * x * (R(3) * tL - two_t_L * x) / (R(6) * L3);
  r.gx = b * b * x * (R(2) * tL - two_t_L * x) / (R(2) * L3);
  r.gt = b * x * x * (L * L - R(3) * tL + R(2) * t * x) / (R(2) * L3);
  r.gxt = b * x * (L * L - R(3) * tL + R(3) * t * x) / L3;
  return r;
}

template <class R>
Green<R> green(const R& x, const R& t, const R& L) {
  if (!(t < x)) return green_left(x, t, L);
  Green<R> m = green_left(L - x, L - t, L);
  m.gx = -m.gx;
  m.gt = -m.gt;
  return m;
}

// Adds EI v and EI v' at x of the clamped-clamped span under a linear load
// wa..wb over [p, q] (a sub-interval of the load [a, b] lying on one side
// of x), by the Gauss rule: G is cubic in t on each side of x, the load
// linear, so degree 4 is integrated exactly.
template <class R>
void add_distributed_particular(const SpanLoad<R>& l, const R& p, const R& q, const R& x, const R& L, R& v,
                                R& th) {
  if (!(p < q)) return;
  const GaussRule<R>& g = gauss_rule<R>();
  const R half = (q - p) / R(2), mid = (p + q) / R(2);
  const R slope = (l.wb - l.wa) / (l.b - l.a);
  for (int k = 0; k < kGaussPoints; ++k) {
    const R t = mid + half * g.x[k];
    const R w = l.wa + slope * (t - l.a);
    const Green<R> G = green(x, t, L);
    const R c = g.w[k] * half * w;
    v += c * G.g;
    th += c * G.gx;
  }
}

// True when a point force or couple at `a` is on the near (left) side of
// the limit asked for at x: before x, or at x when the limit is the one
// after it (always at local 0, never at L; beam.h).
template <class R>
bool included(const R& a, const R& x, const R& L, bool after) {
  if (a < x) return true;
  if (x < a) return false;
  return !(R(0) < x) || (after && x < L);
}

// Shear and moment at x (already clamped to [0, L]) of span s by statics
// from its left end: the end force, then every load to the left. Shared by
// `evaluate` and the node moments, so both give the same bits.
template <class R>
void span_statics(const State<R>& st, std::size_t s, const R& x, bool after, R& V_out, R& M_out) {
  const SpanState<R>& sp = st.spans[s];
  const R& L = sp.L;
  R V = sp.V0;  // in locals: stores through V_out and M_out would reload the loads
  R M = sp.M0 + sp.V0 * x;
  for (std::size_t k = st.first[s]; k < st.first[s + 1]; ++k) {
    const SpanLoad<R>& l = st.loads[k];
    if (l.distributed()) {
      if (l.a < x) {
        const R e = x < l.b ? x : l.b;
        const R c = e - l.a;
        const R we = l.wa + (l.wb - l.wa) * (c / (l.b - l.a));
        const R W = (l.wa + we) / R(2) * c;
        V -= W;
        M -= (x - e) * W + c * c * (R(2) * l.wa + we) / R(6);
      }
    } else if (included(l.a, x, L, after)) {
      if (l.type == LoadType::Point) {
        V -= l.value;
        M -= l.value * (x - l.a);
      } else {
        M += l.value;
      }
    }
  }
  V_out = V;
  M_out = M;
}

template <class R>
BasicPointValues<R> evaluate(const State<R>& st, std::size_t s, const R& local, bool after) {
  BasicPointValues<R> out;
  if (s >= st.spans.size()) return out;
  const SpanState<R>& sp = st.spans[s];
  const R& L = sp.L;
  R x = local;
  if (x < R(0)) x = R(0);
  if (L < x) x = L;

  span_statics(st, s, x, after, out.shear, out.moment);
  // Clamped-clamped particular solution (times EI) of the span's loads.
  R vp(0), thp(0);
  for (std::size_t k = st.first[s]; k < st.first[s + 1]; ++k) {
    const SpanLoad<R>& l = st.loads[k];
    if (l.distributed()) {
      add_distributed_particular(l, l.a, x < l.b ? x : l.b, x, L, vp, thp);
      add_distributed_particular(l, l.a < x ? x : l.a, l.b, x, L, vp, thp);
      continue;
    }
    const Green<R> G = green(x, l.a, L);
    if (l.type == LoadType::Point) {
      vp += l.value * G.g;
      thp += l.value * G.gx;
    } else {
      vp += l.value * G.gt;
      thp += l.value * G.gxt;
    }
  }

  // Hermite interpolation of the end values plus the particular solution.
  R N[4], D[4];
  const R sN = x / L;
  hermite(sN, L, N);
  hermite_slope(sN, L, D);
  out.deflection = N[0] * sp.v0 + N[1] * sp.th0 + N[2] * sp.v1 + N[3] * sp.th1 + vp / sp.EI;
  out.rotation = D[0] * sp.v0 + D[1] * sp.th0 + D[2] * sp.v1 + D[3] * sp.th1 + thp / sp.EI;
  return out;
}

// The limits of the moment just inside span s at its left end (after any
// load at local 0) and at its right end (before any load at L), as
// `evaluate` gives them: span_statics at x = 0 and at x = L in one pass
// over the span's loads, the same operations for each (so the same bits).
// At x = 0 only the point loads and couples at local 0 count (none of a
// distributed load lies left of 0); at x = L every load except a point
// load or couple at L.
template <class R>
inline __attribute__((always_inline)) void end_moments(const State<R>& st, std::size_t s, R& M_left, R& M_right) {
  const SpanState<R>& sp = st.spans[s];
  const R L = sp.L;
  R ML = sp.M0 + sp.V0 * R(0);
  R MR = sp.M0 + sp.V0 * L;
  for (std::size_t k = st.first[s]; k < st.first[s + 1]; ++k) {
    const SpanLoad<R>& l = st.loads[k];
    if (l.distributed()) {
      if (l.a < L) {
        const R e = L < l.b ? L : l.b;
        const R c = e - l.a;
        const R we = l.wa + (l.wb - l.wa) * (c / (l.b - l.a));
        const R W = (l.wa + we) / R(2) * c;
        MR -= (L - e) * W + c * c * (R(2) * l.wa + we) / R(6);
      }
      continue;
    }
    const bool point = l.type == LoadType::Point;
    if (!(R(0) < l.a)) {  // included(l.a, 0, L, false)
      if (point) ML -= l.value * (R(0) - l.a);
      else ML += l.value;
    }
    if (l.a < L) {  // included(l.a, L, L, false)
      if (point) MR -= l.value * (L - l.a);
      else MR += l.value;
    }
  }
  M_left = ML;
  M_right = MR;
}

// --- Banded symmetric LDL^T (no pivoting) --------------------------------------

constexpr std::size_t kMaxBand = 4;  // largest half-bandwidth of the DOF numbering below

// Row i holds K(i, i - c) at a[i * (w + 1) + c], c = 0 .. w, for the
// system's own half-bandwidth w <= kMaxBand (1 when only rotations are
// free, 3 with free deflections, 4 at a hinge).
template <class R>
struct Band {
  std::size_t n = 0, w = 0;
  std::vector<R> a;
  Band(std::size_t size, std::size_t width) : n(size), w(width), a(size * (width + 1), R(0)) {}
  __attribute__((always_inline)) R& at(std::size_t i, std::size_t j) {  // any order, |i - j| <= w
    return i >= j ? a[i * (w + 1) + (i - j)] : a[j * (w + 1) + (j - i)];
  }
};

template <class R>
bool is_finite(const R& x) {
  using std::isfinite;
  return isfinite(x);
}

// Factors K in place (L below the diagonal, D on it) and solves K u = b,
// u overwriting b, for half-bandwidth W fixed at compile time. The forward
// substitution of row i follows its factorisation in the same pass. Returns
// the first DOF with a pivot that is not clearly positive (b is then
// unfinished), or n when all are. Within the band the operations are those
// of any wider band: the terms it leaves out are exact zeros.
template <std::size_t W, bool kFast, class R>
std::size_t factor_solve_w(Band<R>& K, std::vector<R>& b) {
  constexpr std::size_t kRow = W + 1;
  const R tol = std::numeric_limits<R>::epsilon() * R(1024);
  const std::size_t n = K.n;
  R* const a = K.a.data();
  R* const x = b.data();
  if constexpr (W == 1 && kFast) {
    // Tridiagonal (only rotations free): the loops below with the previous
    // pivot and forward value carried in registers, not reloaded from
    // the row just stored (a store-forwarding round trip on the chain from
    // pivot to pivot). The same operations, so the same bits.
    R dprev(1), yprev(0);
    for (std::size_t i = 0; i < n; ++i) {
      R* const row = a + i * kRow;
      const R diag0 = row[0];
      R d = diag0, xi = x[i];
      if (i > 0) {
        const R k = row[1];   // L(i, i - 1) D(i - 1)
        const R l = k / dprev;  // L(i, i - 1)
        row[1] = l;
        d -= k * l;
        xi -= l * yprev;
      }
      if (!is_finite(d) || !(diag0 * tol < d)) return i;
      row[0] = d;
      x[i] = xi;
      dprev = d;
      yprev = xi;
    }
    R unext(0);
    for (std::size_t i = n; i-- > 0;) {
      R xi = x[i] / a[i * kRow];
      if (i + 1 < n) xi -= a[(i + 1) * kRow + 1] * unext;
      x[i] = xi;
      unext = xi;
    }
    return n;
  }
  R LD[kRow];  // L(i, k) * D(k) for the current row, by i - k
  for (std::size_t i = 0; i < n; ++i) {
    const std::size_t lo = i >= W ? i - W : 0;
    R* const row = a + i * kRow;
    const R diag0 = row[0];
    for (std::size_t j = lo; j < i; ++j) {
      const R* const rj = a + j * kRow;
      R sum = row[i - j];
      for (std::size_t k = lo; k < j; ++k) sum -= LD[i - k] * rj[j - k];
      LD[i - j] = sum;          // L(i, j) D(j)
      row[i - j] = sum / rj[0];  // L(i, j)
    }
    R d = diag0;
    for (std::size_t k = lo; k < i; ++k) d -= LD[i - k] * row[i - k];
    if (!is_finite(d) || !(diag0 * tol < d)) return i;
    row[0] = d;
    R xi = x[i];  // forward: L y = b
    for (std::size_t k = lo; k < i; ++k) xi -= row[i - k] * x[k];
    x[i] = xi;
  }
  for (std::size_t i = n; i-- > 0;) {  // back: L^T u = D^-1 y (the division by D in the same pass)
    const std::size_t hi = std::min(n - 1, i + W);
    R xi = x[i] / a[i * kRow];
    for (std::size_t k = i + 1; k <= hi; ++k) xi -= a[k * kRow + (k - i)] * x[k];
    x[i] = xi;
  }
  return n;
}

// kFast false: without the tridiagonal special case (detail::solve_general).
template <bool kFast, class R>
std::size_t factor_solve(Band<R>& K, std::vector<R>& b) {
  switch (K.w) {
    case 0: return factor_solve_w<0, kFast>(K, b);
    case 1: return factor_solve_w<1, kFast>(K, b);
    case 2: return factor_solve_w<2, kFast>(K, b);
    case 3: return factor_solve_w<3, kFast>(K, b);
    default: return factor_solve_w<kMaxBand, kFast>(K, b);
  }
}

// --- Input checks ---------------------------------------------------------------

template <class R>
std::string node_name(const BasicBeam<R>& beam, std::size_t i) {
  if (i < beam.labels.size() && !beam.labels[i].empty()) return "node " + beam.labels[i];
  return "node " + std::to_string(i + 1);
}

template <class R>
bool nonzero(const R& x) {
  return x < R(0) || R(0) < x;
}

template <class R>
BasicSolution<R> not_applicable(std::string why) {
  BasicSolution<R> s;
  s.status = MethodStatus::NotApplicable;
  s.reason = std::move(why);
  return s;
}

template <class R>
BasicSolution<R> failed(std::string why) {
  BasicSolution<R> s;
  s.status = MethodStatus::Failed;
  s.reason = std::move(why);
  return s;
}

// Empty when the beam is within scope, else the feature that is not.
template <class R>
std::string check_scope(const BasicBeam<R>& beam) {
  const std::size_t n = beam.spans.size();
  if (n == 0) return "beam without spans";
  if (beam.supports.size() != n + 1) return "support count differs from span count + 1";
  for (std::size_t s = 0; s < n; ++s) {
    if (!(R(0) < beam.spans[s].length)) return "non-positive length of span " + std::to_string(s + 1);
    if (!(R(0) < beam.spans[s].EI)) return "non-positive EI of span " + std::to_string(s + 1);
  }
  for (std::size_t i = 0; i <= n; ++i) {
    const BasicSupport<R>& sp = beam.supports[i];
    auto where = [&] { return node_name(beam, i); };  // built only on failure
    switch (sp.type) {
      case SupportType::Fixed: case SupportType::Pinned: case SupportType::Roller:
      case SupportType::Free: case SupportType::Guided: case SupportType::Spring:
        break;
      default:
        return "unknown support type at " + where();
    }
    if (sp.type == SupportType::Spring) {
      if (sp.k < R(0) || !is_finite(sp.k)) return "spring with negative stiffness at " + where();
      if (sp.kr < R(0) || !is_finite(sp.kr)) return "rotational spring with negative stiffness at " + where();
    }
    if ((sp.type == SupportType::Free || sp.type == SupportType::Guided) && nonzero(sp.settlement))
      return std::string("settlement on a ") + support_type_name(sp.type) + " node at " + where();
    if (sp.hinge) {
      if (i == 0 || i == n) return "hinge at end " + where();
      if (restrains_rotation(sp.type)) return std::string("hinge on a ") + support_type_name(sp.type) + " support at " + where();
      if (sp.type == SupportType::Spring && R(0) < sp.kr) return "hinge on a rotational spring at " + where();
    }
  }
  for (const BasicLoad<R>& l : beam.loads) {
    if (l.on_node) {
      if (l.index > n) return "load on a node beyond the beam";
      if (l.type != LoadType::Point && l.type != LoadType::Couple)
        return std::string(load_type_name(l.type)) + " load on " + node_name(beam, l.index);
      if (l.type == LoadType::Couple && beam.supports[l.index].hinge)
        return "couple at hinge " + node_name(beam, l.index);
      continue;
    }
    if (l.index >= n) return "load on a span beyond the beam";
    const R L = beam.spans[l.index].length;
    auto where = [&] { return "span " + std::to_string(l.index + 1); };
    switch (l.type) {
      case LoadType::Point: case LoadType::Couple:
        if (l.at < R(0) || L < l.at || !is_finite(l.at)) return "load position outside " + where();
        break;
      case LoadType::Udl: case LoadType::Linear:
        if (l.from < R(0) || L < l.to || !(l.from < l.to)) return "load extent outside " + where();
        break;
      default:
        return "unknown load type on " + where();
    }
  }
  return {};
}

// True when support i passes check_scope's support checks (the same
// conditions, without building a message).
template <class R>
bool support_in_scope(const BasicSupport<R>& sp, std::size_t i, std::size_t n) {
  switch (sp.type) {
    case SupportType::Fixed: case SupportType::Pinned: case SupportType::Roller:
    case SupportType::Free: case SupportType::Guided: case SupportType::Spring:
      break;
    default:
      return false;
  }
  if (sp.type == SupportType::Spring) {
    if (sp.k < R(0) || !is_finite(sp.k)) return false;
    if (sp.kr < R(0) || !is_finite(sp.kr)) return false;
  }
  if ((sp.type == SupportType::Free || sp.type == SupportType::Guided) && nonzero(sp.settlement)) return false;
  if (sp.hinge) {
    if (i == 0 || i == n) return false;
    if (restrains_rotation(sp.type)) return false;
    if (sp.type == SupportType::Spring && R(0) < sp.kr) return false;
  }
  return true;
}

// --- The solver -------------------------------------------------------------------
//
// Few passes over the beam, since for a long beam the passes over memory,
// not the arithmetic, set the time: one over the supports and spans
// (scope, DOF numbering, bandwidth), one over the spans with their loads
// (scope of each load, the span's loads in local coordinates, consistent
// loads, assembly, the load side of the equilibrium check), the band
// solve, and one over the spans and nodes (end forces, node results, the
// reaction side of the equilibrium check). Any input outside the scope is
// reported by check_scope, so the message is the one of the full check.
// Loads that do not come in span order are regrouped (stably) and the
// assembly pass is run again on them.

// kFast false: the special cases for rotations-only elements and
// tridiagonal systems turned off (detail::solve_general, for the tests).
template <class R, bool kFast = true>
BasicSolution<R> solve_impl(const BasicBeam<R>& beam) {
  using std::abs;
  using std::sqrt;
  const std::size_t n = beam.spans.size();
  if (n == 0 || beam.supports.size() != n + 1) return not_applicable<R>(check_scope(beam));

  // Degrees of freedom, only at the beam's nodes, and only the free ones
  // numbered: at node i v, theta (left side) and, at a hinge, theta of the
  // right side, each unless restrained. A restrained DOF has no number; its
  // prescribed value goes to the right-hand side during assembly.
  constexpr std::size_t kNone = static_cast<std::size_t>(-1);
  std::vector<std::size_t> base(n + 1);
  struct Dofs { std::size_t v, thL, thR; };
  auto node_dofs = [&](std::size_t i) __attribute__((always_inline)) {
    const BasicSupport<R>& sp = beam.supports[i];
    std::size_t c = base[i];
    Dofs d;
    d.v = restrains_deflection(sp.type) ? kNone : c++;
    d.thL = restrains_rotation(sp.type) ? kNone : c++;
    d.thR = sp.hinge ? c++ : d.thL;
    return d;
  };
  // The element of span s: DOFs and prescribed values of (v, theta) at its
  // left end (node s, right side) and right end (node s + 1, left side).
  // a and b: node_dofs(s) and node_dofs(s + 1).
  auto element_dofs = [&](std::size_t s, const Dofs& a, const Dofs& b, std::size_t d[4], R g[4]) __attribute__((always_inline)) {
    d[0] = a.v; d[1] = a.thR; d[2] = b.v; d[3] = b.thL;
    g[0] = a.v == kNone ? beam.supports[s].settlement : R(0);
    g[2] = b.v == kNone ? beam.supports[s + 1].settlement : R(0);
    g[1] = g[3] = R(0);  // a restrained rotation is held at zero
  };

  // Pass 1, supports and spans: scope, DOF numbers and the half-bandwidth
  // (the widest spread of one element's numbered DOFs; they increase along
  // d[0..3]).
  std::size_t ndof = 0, width = 0;
  bool in_scope = true;
  Dofs prev_dofs{};
  for (std::size_t i = 0; i <= n; ++i) {
    const BasicSupport<R>& sp = beam.supports[i];
    if (i < n) in_scope = in_scope && R(0) < beam.spans[i].length && R(0) < beam.spans[i].EI;
    in_scope = in_scope && support_in_scope(sp, i, n);
    base[i] = ndof;
    ndof += (restrains_deflection(sp.type) ? 0 : 1) + (restrains_rotation(sp.type) ? 0 : 1) + (sp.hinge ? 1 : 0);
    const Dofs b = node_dofs(i);
    if (i == 0) {
      prev_dofs = b;
      continue;
    }
    const Dofs a = prev_dofs;
    prev_dofs = b;
    const std::size_t lo = a.v != kNone ? a.v : a.thR != kNone ? a.thR : b.v != kNone ? b.v : b.thL;
    const std::size_t hi = b.thL != kNone ? b.thL : b.v != kNone ? b.v : a.thR != kNone ? a.thR : a.v;
    if (lo != kNone && hi - lo > width) width = hi - lo;
  }
  if (!in_scope) return not_applicable<R>(check_scope(beam));

  // Pass 2, spans with their loads. The actions applied at the nodes (down
  // +, clockwise +) are kept in a list, by node; in pass 3 each node result
  // starts with them and the element end forces are subtracted, which
  // leaves the reactions (beam.h signs) where restrained. Each span's consistent nodal loads f_e are
  // kept in its end displacement fields (v0, th0, v1, th1) until pass 3
  // reads them there before it writes the displacements. Prescribed
  // displacements move to the right-hand side. A spring at a node is added
  // once both its elements are in (node s after element s).
  auto st = std::make_shared<State<R>>();
  BasicSolution<R> sol;
  struct NodeAction {
    std::size_t node;
    bool couple;
    R value;
  };
  std::vector<NodeAction> actions;
  std::vector<R> f(ndof, R(0));
  Band<R> K(ndof, width);  // zero, as f: cleared again only for a second assembly pass
  bool assembled_once = false;
  st->first.reset(new std::size_t[n + 1]);
  st->spans.allocate(n);
  st->loads.allocate(beam.loads.size());
  // Equilibrium (a fault check, see below): the loads' resultant (down +)
  // and moment about x = 0 (clockwise +) and the sizes involved. The moment
  // of the forces applied at the nodes is added in pass 3, where the
  // node's x is known.
  // Summed in locals of each pass (through references the compiler kept
  // them in memory: the stores into f and K might alias them).
  struct Sums {
    R force{0}, moment{0}, scale{0}, mscale{0};
  };
  Sums sums;
  auto add_spring = [&](std::size_t i) {
    const BasicSupport<R>& sp = beam.supports[i];
    if (sp.type != SupportType::Spring) return;
    const Dofs d = node_dofs(i);  // a spring restrains nothing outright
    K.at(d.v, d.v) += sp.k;
    f[d.v] += sp.k * sp.settlement;
    K.at(d.thL, d.thL) += sp.kr;  // no hinge here when kr > 0 (checked)
  };
  // A load on a node; false when outside the scope.
  auto node_load = [&](const BasicLoad<R>& l, Sums& acc) __attribute__((always_inline)) {
    if (l.index > n) return false;
    if (l.type != LoadType::Point && l.type != LoadType::Couple) return false;
    if (l.type == LoadType::Couple && beam.supports[l.index].hinge) return false;
    const Dofs d = node_dofs(l.index);
    if (l.type == LoadType::Point) {
      if (d.v != kNone) f[d.v] += l.P;
      actions.push_back({l.index, false, l.P});
      acc.force += l.P;
      acc.scale += abs(l.P);
    } else {  // not at a hinge (checked), so one rotation
      if (d.thL != kNone) f[d.thL] += l.C;
      actions.push_back({l.index, true, l.C});
      acc.moment += l.C;
      acc.mscale += abs(l.C);
    }
    return true;
  };
  // The pass over loads load_at(0 .. m-1); false when a load is outside
  // the scope or out of span order (span loads of a span after those of a
  // later span).
  auto assemble = [&](auto&& load_at, std::size_t m) {
    st->spans.count = 0;
    st->loads.count = 0;  // m <= beam.loads.size(), the capacity
    actions.clear();
    if (assembled_once) {
      std::fill(f.begin(), f.end(), R(0));
      std::fill(K.a.begin(), K.a.end(), R(0));
    }
    assembled_once = true;
    Sums acc;
    std::size_t k = 0;
    R x0(0);
    Dofs right = node_dofs(0);
    for (std::size_t s = 0; s < n; ++s) {
      const Dofs left = right;
      right = node_dofs(s + 1);
      const R& L = beam.spans[s].length;
      st->first[s] = st->loads.size();
      const R invL = R(1) / L;
      R fe[4] = {R(0), R(0), R(0), R(0)};
      bool loaded = false;
      for (; k < m; ++k) {
        const BasicLoad<R>& l = load_at(k);
        if (l.on_node) {
          if (!node_load(l, acc)) return false;
          continue;
        }
        if (l.index != s) {
          if (l.index < s) return false;
          break;  // a later span's (or beyond the beam: left over at the end)
        }
        // Built in place (a copy from the stack was a 16-byte reload of
        // fresh 8-byte stores, a store-forwarding stall, for every load).
        SpanLoad<R>& t = st->loads.push();
        t.type = l.type;
        switch (l.type) {
          case LoadType::Point:
            if (l.at < R(0) || L < l.at || !is_finite(l.at)) return false;
            t.value = l.P; t.a = t.b = l.at; t.wa = t.wb = R(0);
            acc.force += l.P;
            acc.moment += l.P * (x0 + l.at);
            acc.scale += abs(l.P);
            break;
          case LoadType::Couple:
            if (l.at < R(0) || L < l.at || !is_finite(l.at)) return false;
            t.value = l.C; t.a = t.b = l.at; t.wa = t.wb = R(0);
            acc.moment += l.C;
            acc.mscale += abs(l.C);
            break;
          case LoadType::Udl: case LoadType::Linear: {
            if (l.from < R(0) || L < l.to || !(l.from < l.to)) return false;
            t.value = R(0);
            t.a = l.from;
            t.b = l.to;
            t.wa = l.w1;
            t.wb = l.type == LoadType::Udl ? l.w1 : l.w2;
            const R c = t.b - t.a;
            const R W = (t.wa + t.wb) / R(2) * c;
            acc.force += W;
            acc.moment += (x0 + t.a) * W + c * c * (t.wa + R(2) * t.wb) / R(6);
            acc.scale += (abs(t.wa) + abs(t.wb)) * c;
            break;
          }
          default:
            return false;
        }
        add_consistent(t, L, invL, fe);
        loaded = true;
      }
      SpanState<R>& sp = st->spans.push();  // in place, as the loads
      sp.L = L;
      sp.EI = beam.spans[s].EI;
      sp.v0 = fe[0]; sp.th0 = fe[1]; sp.v1 = fe[2]; sp.th1 = fe[3];
      sp.V0 = sp.M0 = R(0);  // pass 3's
      std::size_t d[4];
      R g[4];
      element_dofs(s, left, right, d, g);
      R ke[4][4];
      element_matrix(sp.EI, sp.L, ke);
      if (kFast && d[0] == kNone && d[2] == kNone && d[1] != kNone && d[3] != kNone) {
        // Only the rotations free (pinned, roller or hinge at both ends):
        // the loop below unrolled for this pattern, the same operations on
        // each entry in the same order.
        const std::size_t d1 = d[1], d3 = d[3];
        R f1 = f[d1], f3 = f[d3];
        if (nonzero(g[0])) {
          f1 -= ke[1][0] * g[0];
          f3 -= ke[3][0] * g[0];
        }
        K.at(d1, d1) += ke[1][1];
        K.at(d3, d1) += ke[3][1];
        if (nonzero(g[2])) {
          f1 -= ke[1][2] * g[2];
          f3 -= ke[3][2] * g[2];
        }
        K.at(d3, d3) += ke[3][3];
        if (loaded) {
          f1 += fe[1];
          f3 += fe[3];
        }
        f[d1] = f1;
        f[d3] = f3;
      } else {
        for (int c = 0; c < 4; ++c) {
          const bool known = d[c] == kNone;
          if (known && !nonzero(g[c])) continue;
          for (int r = 0; r < 4; ++r) {
            if (d[r] == kNone) continue;
            if (known) f[d[r]] -= ke[r][c] * g[c];
            else if (d[c] <= d[r]) K.at(d[r], d[c]) += ke[r][c];
          }
        }
        if (loaded)
          for (int r = 0; r < 4; ++r)
            if (d[r] != kNone) f[d[r]] += fe[r];
      }
      add_spring(s);
      x0 += L;
    }
    st->first[n] = st->loads.size();
    add_spring(n);
    for (; k < m; ++k) {  // what is left: node loads, or loads out of order or beyond the beam
      const BasicLoad<R>& l = load_at(k);
      if (!l.on_node || !node_load(l, acc)) return false;
    }
    sums = acc;
    return true;
  };
  const std::vector<BasicLoad<R>>& loads = beam.loads;
  if (!assemble([&](std::size_t k) -> const BasicLoad<R>& { return loads[k]; }, loads.size())) {
    if (std::string why = check_scope(beam); !why.empty()) return not_applicable<R>(why);
    // In scope, so the loads are out of span order: group them by span,
    // in their own order within a span, the node loads first.
    std::vector<std::size_t> off(n + 2, 0);
    auto key = [n](const BasicLoad<R>& l) { return l.on_node ? 0 : l.index + 1; };
    for (const BasicLoad<R>& l : loads) ++off[key(l) + 1];
    for (std::size_t s = 0; s <= n; ++s) off[s + 1] += off[s];
    std::vector<const BasicLoad<R>*> grouped(loads.size());
    for (const BasicLoad<R>& l : loads) grouped[off[key(l)]++] = &l;
    if (!assemble([&](std::size_t k) -> const BasicLoad<R>& { return *grouped[k]; }, grouped.size()))
      return failed<R>("internal fault: the loads could not be grouped by span");
  }
  if (width > kMaxBand) return failed<R>("internal fault: DOF numbering wider than the band solve");

  if (const std::size_t bad = factor_solve<kFast>(K, f); bad < ndof)
    return failed<R>("zero or negative pivot in the stiffness solve (degree of freedom " +
                     std::to_string(bad) + "): the beam is unstable or ill-conditioned");
  const std::vector<R>& u = f;
  for (std::size_t i = 0; i < ndof; ++i)
    if (!is_finite(u[i])) return failed<R>("non-finite displacement in the stiffness solve");

  // Pass 3: end displacements and end forces F = k u - f of every element;
  // at the nodes the reactions are the applied actions minus the sum of F
  // (the right end's of span i - 1, then the left end's of span i). Node i
  // is finished once the spans on both sides are recovered.
  // The node actions by node, in their own order at a node.
  if (!std::is_sorted(actions.begin(), actions.end(),
                      [](const NodeAction& p, const NodeAction& q) { return p.node < q.node; }))
    std::stable_sort(actions.begin(), actions.end(),
                     [](const NodeAction& p, const NodeAction& q) { return p.node < q.node; });
  sol.nodes.reserve(n + 1);
  R x(0), react_force(0), react_moment(0);
  R load_moment = sums.moment, scale = sums.scale, mscale = sums.mscale;
  R F2prev(0), F3prev(0);  // span i - 1's end forces at node i
  R Mprev(0);               // span i - 1's moment at its right end
  std::size_t next_action = 0;
  Dofs next = node_dofs(0);
  for (std::size_t i = 0; i <= n; ++i) {
    BasicNodeResult<R>& r = sol.nodes.emplace_back();
    for (; next_action < actions.size() && actions[next_action].node == i; ++next_action) {
      const NodeAction& a = actions[next_action];
      if (a.couple) r.reaction_moment += a.value;
      else r.reaction_force += a.value;
    }
    load_moment += r.reaction_force * x;  // the forces applied at the node
    if (i > 0) {
      r.reaction_force -= F2prev;
      r.reaction_moment -= F3prev;
    }
    if (i < n) {
      SpanState<R>& sp = st->spans[i];
      std::size_t d[4];
      R g[4];
      const Dofs prev = next;
      next = node_dofs(i + 1);
      element_dofs(i, prev, next, d, g);
      const R fe[4] = {sp.v0, sp.th0, sp.v1, sp.th1};
      R ue[4];
      for (int c = 0; c < 4; ++c) ue[c] = d[c] == kNone ? g[c] : u[d[c]];
      sp.v0 = ue[0]; sp.th0 = ue[1]; sp.v1 = ue[2]; sp.th1 = ue[3];
      R F[4];
      stiffness_times(sp.EI, sp.L, ue, F);
      // Unconditionally: a span without loads has fe = +0, and F - (+0)
      // is F, bit for bit (-0 included).
      for (int c = 0; c < 4; ++c) F[c] -= fe[c];
      sp.V0 = -F[0];
      sp.M0 = F[1];
      r.reaction_force -= F[0];
      r.reaction_moment -= F[1];
      F2prev = F[2];
      F3prev = F[3];
      R Mleft, Mright;
      end_moments(*st, i, Mleft, Mright);
      if (i > 0) r.moment_left = Mprev;
      r.moment_right = Mleft;
      Mprev = Mright;
    } else {
      r.moment_left = Mprev;
    }
    const BasicSupport<R>& sp = beam.supports[i];
    r.x = x;
    if (i < n) x += beam.spans[i].length;
    const SpanState<R>* left = i > 0 ? &st->spans[i - 1] : nullptr;
    const SpanState<R>* right = i < n ? &st->spans[i] : nullptr;
    r.deflection = right ? right->v0 : left->v1;
    r.rotation_left = left ? left->th1 : right->th0;
    r.rotation_right = right ? right->th0 : left->th1;
    // Where nothing restrains, the sum is the solve's residual: zero.
    if (!restrains_deflection(sp.type)) r.reaction_force = R(0);
    if (!restrains_rotation(sp.type)) r.reaction_moment = R(0);
    if (sp.type == SupportType::Spring) {
      r.reaction_force = sp.k * (r.deflection - sp.settlement);
      r.reaction_moment = sp.kr * r.rotation_left;
    }
    if (!is_finite(r.reaction_force) || !is_finite(r.reaction_moment))
      return failed<R>("non-finite reaction at " + node_name(beam, i));
    react_force += r.reaction_force;
    react_moment += r.reaction_force * r.x + r.reaction_moment;
    scale += abs(r.reaction_force);
    mscale += abs(r.reaction_moment);
  }

  // Global equilibrium of the result, a fault check: the reactions (spring
  // forces included) balance the loads, vertically and in moment about the
  // left end, to within sqrt(epsilon) of the sizes involved. With one
  // element per span the residual is a few ulps; this catches a fault, it
  // is not the accuracy claim.
  {
    const R force = sums.force - react_force, moment = load_moment - react_moment;
    const R length = sol.nodes[n].x;
    const R tol = sqrt(std::numeric_limits<R>::epsilon());
    // The end forces the displacements alone make (k u, term by term) are
    // counted too: a beam moved without bending (a settlement of a
    // statically determinate beam) has reactions of rounding size only,
    // and their rounding is measured against these, not against themselves.
    R moved(0);
    for (std::size_t i = 0; i < n; ++i) {
      const SpanState<R>& sp = st->spans[i];
      const R k3 = sp.EI / (sp.L * sp.L * sp.L), k2 = sp.EI / (sp.L * sp.L);
      moved += R(12) * k3 * (abs(sp.v0) + abs(sp.v1)) + R(6) * k2 * (abs(sp.th0) + abs(sp.th1));
    }
    for (std::size_t i = 0; i <= n; ++i) {
      const BasicSupport<R>& sp = beam.supports[i];
      if (sp.type == SupportType::Spring)
        moved += sp.k * (abs(sol.nodes[i].deflection) + abs(sp.settlement)) + sp.kr * abs(sol.nodes[i].rotation_left) / length;
    }
    const R fscale = scale + mscale / length + moved;  // couples count as forces over the beam's length
    if (tol * fscale < abs(force))
      return failed<R>("equilibrium residual in force exceeds sqrt(epsilon) of the loads");
    if (tol * fscale * length < abs(moment))
      return failed<R>("equilibrium residual in moment exceeds sqrt(epsilon) of the loads");
  }
  sol.status = MethodStatus::Ok;
  std::shared_ptr<const State<R>> frozen = std::move(st);
  sol.at = [frozen](std::size_t span, const R& local, bool after) {
    return evaluate(*frozen, span, local, after);
  };
  return sol;
}

}  // namespace

// `stations` is not needed: the answer is exact anywhere in a span without
// an element node there (see stiffness.h); kept for the common signature.
template <class R>
BasicSolution<R> solve(const BasicBeam<R>& beam, const std::vector<BasicStation<R>>& /*stations*/) {
  try {
    return solve_impl(beam);
  } catch (const std::exception& ex) {
    return failed<R>(std::string("internal fault in the stiffness solve: ") + ex.what());
  }
}

template BasicSolution<double> solve<double>(const BasicBeam<double>&,
                                             const std::vector<BasicStation<double>>&);

namespace detail {
template <class R>
BasicSolution<R> solve_general(const BasicBeam<R>& beam) {
  try {
    return solve_impl<R, false>(beam);
  } catch (const std::exception& ex) {
    return failed<R>(std::string("internal fault in the stiffness solve: ") + ex.what());
  }
}
template BasicSolution<double> solve_general<double>(const BasicBeam<double>&);
}  // namespace detail
template BasicSolution<Extended> solve<Extended>(const BasicBeam<Extended>&,
                                                 const std::vector<BasicStation<Extended>>&);

}  // namespace trivet::stiffness
