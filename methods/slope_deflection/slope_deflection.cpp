// trivet: the slope-deflection method (see slope_deflection.h).
//
// Conventions inside this file (beam.h fixes the outside ones):
//   theta, psi   clockwise +, psi = (D_j - D_i)/L, D downward +.
//   M_ij, M_ji   moments acting ON the member ends, clockwise + (the classical
//                member-end convention). The sagging internal moment at the
//                very ends of the span is M(0) = M_ij and M(L) = -M_ji.
//   Y_i, Y_j     upward end forces acting on the member.
//
// Equations (signs chosen so the matrix is the symmetric, positive definite
// stiffness of a stable beam, so elimination needs no pivoting):
//   rotation row:    sum of M at the node's member ends + kr theta = C_node
//   hinge rows:      M at that member end = 0 (one row per side)
//   translation row: -(Y of the member ends at the node) + k D = P_node + k s
//
// Span statics and elastic curve (local x, 0..L):
//   M(x) = M_A (L-x)/L + M_B x/L + m0(x)
//   v(x) = D_i (L-x)/L + D_j x/L + M_A x(L-x)(2L-x)/(6EIL)
//          + M_B x(L-x)(L+x)/(6EIL) - (F(x) - x F(L)/L)/EI
// where m0 is the simple-beam moment of the span loads (m0 = RA0 x + load
// terms, RA0 chosen so m0 vanishes beyond L) and F is its double integral
// from 0 (F(0) = F'(0) = 0), so EI v'' = -M and v(0) = D_i, v(L) = D_j.
#include "methods/slope_deflection/slope_deflection.h"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <limits>
#include <memory>
#include <string>
#include <type_traits>
#include <utility>

#if defined(__linux__)
#include <sys/mman.h>
#endif
#if defined(__SSE2__)
#include <emmintrin.h>
#endif

namespace trivet::slope_deflection {
namespace {

// The per-load and per-entry helpers run once per load or matrix entry;
// inlined, their results stay in registers.
#if defined(__GNUC__)
#define TRIVET_SD_INLINE inline __attribute__((always_inline))
#else
#define TRIVET_SD_INLINE inline
#endif

// A span load reduced to what the span's diagrams need.
enum class TermKind : unsigned char { Point, Couple, Spread };

template <class R>
struct Term {
  TermKind kind = TermKind::Point;
  R a{0};  // Point, Couple: position. Spread: start.
  R b{0};  // Spread: end.
  R p{0};  // Point: force. Couple: couple. Spread: intensity at start.
  R q{0};  // Spread: intensity at end.
};

// The load part of a span's simple-beam diagrams at one point.
template <class R>
struct LoadParts {
  R shear{0};   // contribution to V
  R moment{0};  // contribution to m0
  R first{0};   // contribution to F' (integral of m0 from 0)
  R second{0};  // contribution to F  (double integral of m0 from 0)
};

template <class R>
struct SpanState {
  R L{1}, EI{1};
  R MA{0}, MB{0};  // sagging moments at the very ends (outside all span loads)
  R DA{0}, DB{0};  // end deflections, downward +
  R RA0{0};        // simple-beam left reaction of the span loads, upward +
  R FL{0};         // F(L)
  std::size_t first = 0, last = 0;  // the span's terms: [first, last)
};

template <class R>
struct SolvedState {
  std::vector<SpanState<R>> spans;
  std::vector<Term<R>> terms;
};

template <class R>
bool is_zero(const R& d) {
  return !(d < R(0)) && !(d > R(0));
}

// Finite: x - x is 0 for a finite number and NaN for inf or NaN.
// (The same test as std::isfinite for the built-in floating types, which
// take that shorter way.)
template <class R>
bool is_finite(const R& x) {
  if constexpr (std::is_floating_point_v<R>) {
    return std::isfinite(x);
  } else {
    R d = x - x;
    return d <= R(0) && d >= R(0);
  }
}

template <class R>
struct SpanMath {
  // I_n(x) = integral over the load of w(t) (x - t)^n dt, for t <= x,
  // n = 0..3, for a linear intensity p at `a` to q at `b`. Written so that
  // no term divides by a short load length or cancels a large one.
  static void spread(const Term<R>& t, const R& x, R I[4]) {
    for (int n = 0; n < 4; ++n) I[n] = R(0);
    if (!(x > t.a)) return;
    const R h = t.b - t.a;
    if (!(x > t.b)) {
      // Inside the load: d = x - a <= h, w(u) = p + (q - p) u / h.
      const R d = x - t.a;
      const R r = (t.q - t.p) * (d / h);
      R dn = d;  // d^(n+1)
      for (int n = 0; n < 4; ++n) {
        I[n] = t.p * dn / R(n + 1) + r * dn / R((n + 1) * (n + 2));
        dn = dn * d;
      }
      return;
    }
    // Past the load: E = x - b, s = b - t in [0, h], w(s) = q + (p - q) s / h,
    // (x - t)^n = (E + s)^n expanded; c_k = integral of w s^k ds.
    const R E = x - t.b;
    R c[4];
    R hk = h;  // h^(k+1)
    for (int k = 0; k < 4; ++k) {
      c[k] = hk * (t.q + R(k + 1) * t.p) / R((k + 1) * (k + 2));
      hk = hk * h;
    }
    const R E2 = E * E;
    const R E3 = E2 * E;
    I[0] = c[0];
    I[1] = E * c[0] + c[1];
    I[2] = E2 * c[0] + R(2) * E * c[1] + c[2];
    I[3] = E3 * c[0] + R(3) * E2 * c[1] + R(3) * E * c[2] + c[3];
  }

  // Adds one load's part at x. `after` chooses the right-hand limit where a
  // point force or couple acts exactly at x.
  static void add(const Term<R>& t, const R& x, bool after, LoadParts<R>& out) {
    switch (t.kind) {
      case TermKind::Point: {
        const R d = x - t.a;
        if (d > R(0) || (after && is_zero(d))) {
          out.shear -= t.p;
          out.moment -= t.p * d;
          out.first -= t.p * d * d / R(2);
          out.second -= t.p * d * d * d / R(6);
        }
        break;
      }
      case TermKind::Couple: {
        const R d = x - t.a;
        if (d > R(0) || (after && is_zero(d))) {
          out.moment += t.p;
          out.first += t.p * d;
          out.second += t.p * d * d / R(2);
        }
        break;
      }
      case TermKind::Spread: {
        R I[4];
        spread(t, x, I);
        out.shear -= I[0];
        out.moment -= I[1];
        out.first -= I[2] / R(2);
        out.second -= I[3] / R(6);
        break;
      }
    }
  }

  // Simple-beam data of a set of terms on a span: RA0 and F(L).
  static void simple_beam(const Term<R>* t, std::size_t count, const R& L, R& RA0, R& FL) {
    LoadParts<R> end;
    for (std::size_t i = 0; i < count; ++i) add(t[i], L, true, end);
    // m0(L+) = RA0 L + end.moment = 0 (every load on the span included).
    RA0 = -end.moment / L;
    FL = RA0 * L * L * L / R(6) + end.second;
  }

  static BasicPointValues<R> evaluate(const SolvedState<R>& st, std::size_t span, const R& x,
                                      bool after) {
    BasicPointValues<R> pv;
    if (span >= st.spans.size()) return pv;
    const SpanState<R>& s = st.spans[span];
    const R& L = s.L;
    if (!(x > R(0))) after = true;   // at the left end: inside the span
    if (!(x < L)) after = false;     // at the right end: inside the span
    LoadParts<R> lp;
    for (std::size_t i = s.first; i < s.last; ++i) add(st.terms[i], x, after, lp);
    const R Lx = L - x;
    pv.shear = (s.MB - s.MA) / L + s.RA0 + lp.shear;
    pv.moment = (s.MA * Lx + s.MB * x) / L + s.RA0 * x + lp.moment;
    const R F = s.RA0 * x * x * x / R(6) + lp.second;
    const R F1 = s.RA0 * x * x / R(2) + lp.first;
    const R sixEIL = R(6) * s.EI * L;
    pv.deflection = (s.DA * Lx + s.DB * x) / L +
                    (s.MA * x * Lx * (L + Lx) + s.MB * x * Lx * (L + x)) / sixEIL -
                    (F - x * s.FL / L) / s.EI;
    pv.rotation = (s.DB - s.DA) / L +
                  (s.MA * (R(2) * L * L - R(6) * L * x + R(3) * x * x) + s.MB * (L * L - R(3) * x * x)) /
                      sixEIL -
                  (F1 - s.FL / L) / s.EI;
    return pv;
  }
};

// Reciprocals of the small integers the closed forms divide by, made once
// per solve (a product by them replaces a division in the per-load code;
// exact in exact arithmetic, the last bit in floating point).
template <class R>
struct Consts {
  R half = R(1) / R(2);
  R sixth = R(1) / R(6);
  R twelfth = R(1) / R(12);
  R twentieth = R(1) / R(20);
};

// What one span load contributes to its span: the fixed-end moments and the
// simple-beam sums at the right end (x = L, every load of the span behind).
template <class R>
struct LoadEffect {
  detail::EndPair<R> fem;
  R shear{0};   // load part of V(L+): minus the total force
  R moment{0};  // load part of m0(L+)
  R second{0};  // load part of F(L)
};

// Fixed-end moments (member-end convention, clockwise +) of one load.
//   Point P at a (b = L - a): M_ij = -P a b^2 / L^2, M_ji = +P a^2 b / L^2.
//   Couple C (clockwise) at a: the limit of a force pair, i.e. C times the
//     derivative in a of the point-load values per unit force:
//     M_ij = C b (2a - b) / L^2, M_ji = C a (2b - a) / L^2.
//   Distributed w(x) over [x1, x2]: the point-load values integrated,
//     M_ij = -(1/L^2) int w x (L-x)^2 dx, M_ji = (1/L^2) int w x^2 (L-x) dx,
//     with x = x1 + u, w = w1 + (w2 - w1) u / h, the polynomials expanded in
//     u and m_k = int_0^h w u^k du = h^(k+1) (w1 + (k+1) w2) / ((k+1)(k+2)).
// The simple-beam sums at L are those of SpanMath::add at x = L, after:
//   Point: d = L - a; V -= P, m0 -= P d, F -= P d^3 / 6.
//   Couple: d = L - a; m0 += C, F += C d^2 / 2.
//   Distributed: the "past the load" form of SpanMath::spread with
//     E = L - x2 >= 0 (at E = 0 it equals the "inside" form at d = h).
// `invL2` is 1 / L^2.
template <class R>
TRIVET_SD_INLINE LoadEffect<R> effect_of(LoadType type, const R& L, const R& invL2, const R& P, const R& C, const R& w1,
                        const R& w2, const R& at, const R& from, const R& to, const Consts<R>& k) {
  LoadEffect<R> e;
  switch (type) {
    case LoadType::Point: {
      const R& a = at;
      const R b = L - at;
      const R Pab = P * a * b;
      e.fem.left = -Pab * b * invL2;
      e.fem.right = Pab * a * invL2;
      e.shear = -P;
      e.moment = -P * b;
      e.second = -P * b * b * b * k.sixth;
      break;
    }
    case LoadType::Couple: {
      const R& a = at;
      const R b = L - at;
      e.fem.left = C * b * (R(2) * a - b) * invL2;
      e.fem.right = C * a * (R(2) * b - a) * invL2;
      e.moment = C;
      e.second = C * b * b * k.half;
      break;
    }
    case LoadType::Udl:
    case LoadType::Linear: {
      const R& x1 = from;
      const R h = to - from;
      const R b1 = L - x1;
      const R h2 = h * h;
      const R h3 = h2 * h;
      const R h4 = h3 * h;
      // m_k (FEM, from the load's start) and c_k (simple beam, from its end).
      const R m0 = h * (w1 + w2) * k.half;
      const R m1 = h2 * (w1 + R(2) * w2) * k.sixth;
      const R m2 = h3 * (w1 + R(3) * w2) * k.twelfth;
      const R m3 = h4 * (w1 + R(4) * w2) * k.twentieth;
      const R left_int = x1 * b1 * b1 * m0 + (b1 * b1 - R(2) * x1 * b1) * m1 + (x1 - R(2) * b1) * m2 + m3;
      const R right_int = x1 * x1 * b1 * m0 + (R(2) * x1 * b1 - x1 * x1) * m1 + (b1 - R(2) * x1) * m2 - m3;
      e.fem.left = -left_int * invL2;
      e.fem.right = right_int * invL2;
      const R& c0 = m0;  // h (p + q) / 2 either way round
      // Uniform (w1 == w2, checked by the caller): c_k = m_k, the very same
      // operations.
      const bool uniform = type == LoadType::Udl;
      const R c1 = uniform ? m1 : h2 * (w2 + R(2) * w1) * k.sixth;
      const R c2 = uniform ? m2 : h3 * (w2 + R(3) * w1) * k.twelfth;
      const R c3 = uniform ? m3 : h4 * (w2 + R(4) * w1) * k.twentieth;
      const R E = L - to;
      e.shear = -c0;
      e.moment = -(E * c0 + c1);
      e.second = -(E * E * E * c0 + R(3) * E * E * c1 + R(3) * E * c2 + c3) * k.sixth;
      break;
    }
  }
  return e;
}

template <class R>
detail::EndPair<R> fem_of(LoadType type, const R& L, const R& P, const R& C, const R& w1, const R& w2,
                          const R& at, const R& from, const R& to) {
  const Consts<R> k;
  const R invL2 = R(1) / (L * L);
  return effect_of<R>(type, L, invL2, P, C, w1, w2, at, from, to, k).fem;
}

template <class R>
R pivot_tolerance() {
  if constexpr (std::is_same_v<R, Exact>) {
    return R(0);
  } else {
    // Below this fraction of the original diagonal the pivot is mostly
    // rounding: a (near) mechanism, never a trustworthy answer.
    return std::numeric_limits<R>::epsilon() * R(1024);
  }
}

std::string node_name(const std::vector<std::string>& labels, std::size_t i) {
  if (i < labels.size() && !labels[i].empty()) return labels[i];
  return "#" + std::to_string(i);
}

template <class R>
BasicSolution<R> give_up(MethodStatus status, std::string reason) {
  BasicSolution<R> s;
  s.status = status;
  s.reason = std::move(reason);
  return s;
}

// Large arrays: ask the kernel for transparent huge pages before the first
// touch. A beam of a million spans needs a few hundred megabytes, and with
// 4 KiB pages the first-touch page faults cost more than the whole solve.
// Only the 2 MiB-aligned inside of the block is advised; a hint, never
// required (ignored where unsupported or refused).
constexpr std::size_t kHugeFrom = std::size_t(4) << 20;

inline void advise_huge(const void* p, std::size_t bytes) {
#if defined(__linux__) && defined(MADV_HUGEPAGE)
  if (bytes < kHugeFrom) return;
  constexpr std::uintptr_t kHuge = std::uintptr_t(2) << 20;
  const std::uintptr_t b = reinterpret_cast<std::uintptr_t>(p);
  const std::uintptr_t lo = (b + kHuge - 1) & ~(kHuge - 1);
  const std::uintptr_t hi = (b + bytes) & ~(kHuge - 1);
  if (hi > lo) (void)madvise(reinterpret_cast<void*>(lo), hi - lo, MADV_HUGEPAGE);
#else
  (void)p;
  (void)bytes;
#endif
}

// Reserves room for `count` elements (no element touched yet) and advises it.
template <class T>
void reserve_huge(std::vector<T>& v, std::size_t count) {
  v.reserve(count);
  advise_huge(v.data(), count * sizeof(T));
}

// The unknowns of a node (-1: none, the value is known).
struct NodeUnknowns {
  std::int32_t thL = -1;  // rotation left of the node (the only one without a hinge)
  std::int32_t dv = -1;   // deflection
  std::int32_t thR = -1;  // rotation right of the node (= thL unless a hinge)
};

// The banded system, symmetric: rows 0..n-1, half-bandwidth hb, only the
// diagonal and the hb entries right of it stored (the assembly is symmetric
// by construction; entries left of the diagonal are not kept).
template <class R>
struct Banded {
  std::size_t n = 0, hb = 0, w = 1;
  std::vector<R> a;  // row r, column c >= r at r * w + (c - r)
  std::vector<R> rhs;
  void init(std::size_t rows, std::size_t half) {
    n = rows;
    hb = half;
    w = half + 1;
    reserve_huge(a, n * w);
    a.assign(n * w, R(0));
    reserve_huge(rhs, n);
    rhs.assign(n, R(0));
  }
  R& at(std::size_t r, std::size_t c) { return a[r * w + (c - r)]; }
  // row += c * (unknown col, or the known value): only the stored upper
  // part is kept; a known value moves to the right-hand side.
  TRIVET_SD_INLINE void put(long row, const R& c, long col, const R& known) {
    if (row < 0) return;
    if (col >= 0) {
      if (col >= row) at(static_cast<std::size_t>(row), static_cast<std::size_t>(col)) += c;
    } else if (!is_zero(known)) {
      rhs[static_cast<std::size_t>(row)] -= c * known;
    }
  }
  TRIVET_SD_INLINE void put_const(long row, const R& c) {
    if (row >= 0) rhs[static_cast<std::size_t>(row)] -= c;
  }
};

template <class R>
bool bad_pivot(const R& p, const R& original, const R& tol) {
  return !(p > original * tol) || !(p > R(0)) || !is_finite(p);
}

// Gaussian elimination without row exchanges on the symmetric band (the
// lower entry of row i, column k is the upper one of row k, column i):
// O(n hb^2). The matrix is positive definite for a stable beam, so every
// pivot must be positive; returns the first row whose pivot is not (or is
// mostly rounding), or -1. The solution is left in m.rhs.
template <class R>
long banded_solve(Banded<R>& m) {
  const std::size_t n = m.n, hb = m.hb;
  const R tol = pivot_tolerance<R>();
  if (n == 0) return -1;
  if (hb == 0) {
    for (std::size_t k = 0; k < n; ++k) {
      const R& p = m.a[k];
      if (bad_pivot(p, p, tol)) return static_cast<long>(k);
      m.rhs[k] /= p;
    }
    return -1;
  }
  if (hb == 1) {
    // Tridiagonal (the common case: every node restrained vertically, no
    // hinge). Row k: a[2k] diagonal, a[2k+1] the entry right of it. The
    // original diagonal of the next row is read before it is reduced. The
    // diagonal slot keeps 1/pivot for the back substitution.
    R* a = m.a.data();
    R* r = m.rhs.data();
    R original = a[0];
    for (std::size_t k = 0;; ++k) {
      const R p = a[2 * k];
      if (bad_pivot(p, original, tol)) return static_cast<long>(k);
      const R ip = R(1) / p;
      a[2 * k] = ip;
      if (k + 1 == n) break;
      const R& u = a[2 * k + 1];
      original = a[2 * k + 2];
      if (!is_zero(u)) {
        const R f = u * ip;
        a[2 * k + 2] -= f * u;
        r[k + 1] -= f * r[k];
      }
    }
    r[n - 1] *= a[2 * (n - 1)];
    for (std::size_t k = n - 1; k-- > 0;) r[k] = (r[k] - a[2 * k + 1] * r[k + 1]) * a[2 * k];
    return -1;
  }
  std::vector<R> diag(n);
  for (std::size_t k = 0; k < n; ++k) diag[k] = m.at(k, k);  // original diagonal, for the tolerance
  for (std::size_t k = 0; k < n; ++k) {
    const R p = m.at(k, k);
    if (bad_pivot(p, diag[k], tol)) return static_cast<long>(k);
    const std::size_t end = std::min(n, k + hb + 1);
    for (std::size_t i = k + 1; i < end; ++i) {
      const R& lik = m.at(k, i);
      if (is_zero(lik)) continue;
      const R f = lik / p;
      for (std::size_t j = i; j < end; ++j) m.at(i, j) -= f * m.at(k, j);
      m.rhs[i] -= f * m.rhs[k];
    }
  }
  for (std::size_t kk = n; kk-- > 0;) {
    R s = m.rhs[kk];
    const std::size_t end = std::min(n, kk + hb + 1);
    for (std::size_t j = kk + 1; j < end; ++j) s -= m.at(kk, j) * m.rhs[j];
    m.rhs[kk] = s / m.at(kk, kk);
  }
  return -1;
}

// Why a span load is out of the method's scope (None: it is not).
enum class LoadFault : unsigned char { None, PointNotInside, CoupleOutside, SpreadOutside, UnequalUdl };

std::string fault_text(LoadFault f, std::size_t span) {
  const char* what = "";
  switch (f) {
    case LoadFault::None: break;
    // The reader moves a point force at a span end onto the node.
    case LoadFault::PointNotInside: what = "point load not strictly inside its span"; break;
    case LoadFault::CoupleOutside: what = "couple outside its span"; break;
    case LoadFault::SpreadOutside: what = "distributed load outside its span"; break;
    case LoadFault::UnequalUdl: what = "uniform load with unequal end intensities"; break;
  }
  return what + (" on span " + std::to_string(span + 1));
}

// Checks one span load and reduces it to a term and its effect on the span.
template <class R>
TRIVET_SD_INLINE LoadFault take_load(const BasicLoad<R>& l, const R& L, const R& invL2, const Consts<R>& k,
                                     Term<R>& t, LoadEffect<R>& e) {
  switch (l.type) {
    case LoadType::Point:
      if (!(l.at > R(0)) || !(l.at < L)) return LoadFault::PointNotInside;
      t.kind = TermKind::Point; t.a = l.at; t.p = l.P;
      break;
    case LoadType::Couple:
      if (l.at < R(0) || l.at > L) return LoadFault::CoupleOutside;
      t.kind = TermKind::Couple; t.a = l.at; t.p = l.C;
      break;
    case LoadType::Udl:
    case LoadType::Linear:
      if (l.from < R(0) || l.to > L || l.to < l.from) return LoadFault::SpreadOutside;
      if (l.type == LoadType::Udl && !is_zero(R(l.w1 - l.w2))) return LoadFault::UnequalUdl;
      t.kind = TermKind::Spread; t.a = l.from; t.b = l.to; t.p = l.w1; t.q = l.w2;
      break;
  }
  e = effect_of<R>(l.type, L, invL2, l.P, l.C, l.w1, l.w2, l.at, l.from, l.to, k);
  return LoadFault::None;
}

// Before the solve the span slots hold other sums of the span's loads:
// MA the fixed-end moment FEM_ij, DA FEM_ji, RA0 the load part of m0(L+),
// MB the load part of V(L+), FL the load part of F(L).
template <class R>
struct SpanSums {
  R femI{0}, femJ{0}, moment{0}, shear{0}, second{0};
  TRIVET_SD_INLINE void add(const LoadEffect<R>& e) {
    femI += e.fem.left;
    femJ += e.fem.right;
    moment += e.moment;
    shear += e.shear;
    second += e.second;
  }
  void store(SpanState<R>& ss) const {
    ss.MA = femI;
    ss.DA = femJ;
    ss.RA0 = moment;
    ss.MB = shear;
    ss.FL = second;
  }
};

// ---------------------------------------------------------------------------
// The rotations-only path: every support pinned or roller and no hinge, no
// node load, the span loads in span order (the common beam). The unknowns
// are the node rotations, one per node, and the system is tridiagonal. The
// work is that of the general path below (the same operations in the same
// order, so the same numbers), fused into two passes: forward, each span's
// loads, its stiffness and at once the elimination of the row it completes;
// backward, the back substitution with each span's end moments and the node
// results. Whatever it does not cover (or any fault, or a bad pivot) it
// leaves to the general path, which then also gives the reason.

// True for a support of the rotations-only path.
template <class R>
bool rotation_only(const BasicSupport<R>& sp) {
  return (sp.type == SupportType::Pinned || sp.type == SupportType::Roller) && !sp.hinge;
}

// One row of the tridiagonal system as the forward elimination leaves it.
// Every field is written before it is read (no initializers: for double
// the array is not cleared first).
template <class R>
struct RotationRow {
  R ip;  // 1 / pivot
  R r;   // the reduced right-hand side
  R k;   // 2EI/L of the span right of the node: the entry right of the diagonal
  R x;   // global x of the node
};

// q0 = a0 / b0 and q1 = a1 / b1. For double in one packed division (each
// lane an IEEE division, so the same quotients): the divider is shared by
// the several divisions of a span and the pivot's.
template <class R>
TRIVET_SD_INLINE void divide2(const R& a0, const R& b0, const R& a1, const R& b1, R& q0, R& q1) {
  q0 = a0 / b0;
  q1 = a1 / b1;
}
#if defined(__SSE2__)
TRIVET_SD_INLINE void divide2(const double& a0, const double& b0, const double& a1, const double& b1, double& q0,
                              double& q1) {
  const __m128d q = _mm_div_pd(_mm_set_pd(a1, a0), _mm_set_pd(b1, b0));
  q0 = _mm_cvtsd_f64(q);
  q1 = _mm_cvtsd_f64(_mm_unpackhi_pd(q, q));
}
#endif

// Reduces the next row (diagonal D, right-hand side b, complete) by the row
// before it, checks the pivot and keeps the row (as banded_solve's
// tridiagonal path does); false for a bad pivot. Filled in place: a copy
// from the stack would read the fresh stores back in wider pieces, which
// store forwarding cannot serve.
template <class R>
TRIVET_SD_INLINE bool eliminate_row(RotationRow<R>* rows, std::size_t s, const R& D, R& b, const R& k, const R& x,
                                    const R& tol) {
  R p = D;
  if (s > 0) {
    const RotationRow<R>& pr = rows[s - 1];
    if (!is_zero(pr.k)) {
      const R f = pr.k * pr.ip;
      p -= f * pr.k;
      b -= f * pr.r;
    }
  }
  if (bad_pivot(p, D, tol)) return false;
  RotationRow<R>& row = rows[s];
  row.ip = R(1) / p;
  row.r = std::move(b);
  row.k = k;
  row.x = x;
  return true;
}

template <class R>
bool solve_rotations_only(const BasicBeam<R>& beam, const Consts<R>& K, BasicSolution<R>& out) {
  const std::size_t n = beam.spans.size();
  const std::size_t N = n + 1;
  if (N > std::size_t(2000000000)) return false;
  if (!rotation_only(beam.supports[0])) return false;
  const auto& loads = beam.loads;
  const std::size_t nl = loads.size();
  auto state = std::make_shared<SolvedState<R>>();
  auto& spans = state->spans;
  auto& terms = state->terms;
  reserve_huge(spans, n);
  reserve_huge(terms, nl);
  const std::unique_ptr<RotationRow<R>[]> row_store(new RotationRow<R>[N]);
  RotationRow<R>* const rows = row_store.get();
  advise_huge(rows, N * sizeof(RotationRow<R>));
  const R tol = pivot_tolerance<R>();
  bool end_couples = false;
  std::size_t lp = 0;    // the next load
  R Dcur{0}, bcur{0};    // diagonal and right-hand side of row s, as assembled so far
  R xpos{0};
  for (std::size_t s = 0; s < n; ++s) {
    const BasicSupport<R>& right = beam.supports[s + 1];
    if (!rotation_only(right)) return false;
    const BasicSpan<R>& bs = beam.spans[s];
    if (!(bs.length > R(0)) || !is_finite(bs.length) || !(bs.EI > R(0)) || !is_finite(bs.EI)) return false;
    SpanState<R>& ss = spans.emplace_back();  // in place, as the rows
    ss.L = bs.length;
    ss.EI = bs.EI;
    const R& L = ss.L;
    ss.first = terms.size();
    SpanSums<R> sums;
    // 1/L^2 for the loads, 1/L and 2EI/L for the span (as the general path).
    R invL2, invL;
    divide2(R(1), R(L * L), R(1), L, invL2, invL);
    const R k = R(2) * ss.EI / L;
    if (lp < nl && !loads[lp].on_node && loads[lp].index == s) {
      do {
        Term<R>& t = terms.emplace_back();
        LoadEffect<R> e;
        if (take_load(loads[lp], L, invL2, K, t, e) != LoadFault::None) return false;
        if (t.kind == TermKind::Couple && (!(t.a > R(0)) || !(t.a < L))) end_couples = true;
        sums.add(e);
      } while (++lp < nl && !loads[lp].on_node && loads[lp].index == s);
    }
    sums.store(ss);
    ss.last = terms.size();
    // As the general path: the simple-beam data, then the span's stiffness
    // into rows s and s + 1.
    ss.RA0 = -ss.RA0 * invL;
    ss.FL = ss.RA0 * L * L * L * K.sixth + ss.FL;
    ss.MB = -ss.MB - ss.RA0;
    const R twok = R(2) * k;
    const R& Di = beam.supports[s].settlement;
    const R& Dj = right.settlement;
    R bnext{0};
    if (!is_zero(Di) || !is_zero(Dj)) {
      const R kL = R(3) * k / L;
      if (!is_zero(Di)) { bcur -= kL * Di; bnext -= kL * Di; }
      if (!is_zero(Dj)) { bcur -= -kL * Dj; bnext -= -kL * Dj; }
    }
    bcur -= ss.MA;   // FEM_ij
    bnext -= ss.DA;  // FEM_ji
    Dcur += twok;
    if (!eliminate_row(rows, s, Dcur, bcur, k, xpos, tol)) return false;
    xpos += bs.length;
    Dcur = twok;  // 0 + 2k in the general path (2k is never -0)
    bcur = std::move(bnext);
  }
  if (lp != nl) return false;
  if (!eliminate_row(rows, n, Dcur, bcur, R(0), xpos, tol)) return false;

  // Backward: rotation of node i from that of node i + 1, then span i's end
  // moments, then node i + 1 complete (span i + 1 done the step before).
  reserve_huge(out.nodes, N);
  out.nodes.resize(N);
  R xr = rows[n].r * rows[n].ip;  // rotation of node i + 1
  R Yright{0};                    // span i + 1's part of node i + 1's reaction
  for (std::size_t i = n; i-- > 0;) {
    const RotationRow<R>& row = rows[i];
    const R xi = (row.r - row.k * xr) * row.ip;
    SpanState<R>& ss = spans[i];
    const R& L = ss.L;
    const R& k = row.k;  // 2EI/L, as the general path computes it again
    const R femI = ss.MA, femJ = ss.DA;
    ss.DA = beam.supports[i].settlement;
    ss.DB = beam.supports[i + 1].settlement;
    const R d = ss.DB - ss.DA;
    const R psi = is_zero(d) ? d : R(d / L);  // 0 / L is that same 0
    ss.MA = k * (R(2) * xi + xr - R(3) * psi) + femI;
    const R Mji = k * (xi + R(2) * xr - R(3) * psi) + femJ;
    const R RB0 = ss.MB;
    ss.MB = -Mji;
    if (!is_finite(ss.MA) || !is_finite(ss.MB)) return false;
    const R dV = (ss.MB - ss.MA) / L;
    BasicNodeResult<R>& nr = out.nodes[i + 1];
    R Y{0};
    Y += RB0 - dV;
    if (i + 1 < n) Y += Yright;
    nr.x = rows[i + 1].x;
    nr.deflection = ss.DB;
    nr.rotation_left = xr;
    nr.rotation_right = xr;
    {
      R m = ss.MB;
      if (end_couples) {
        for (std::size_t q = ss.first; q < ss.last; ++q) {
          const Term<R>& t = terms[q];
          if (t.kind == TermKind::Couple && !(t.a < ss.L)) m -= t.p;
        }
      }
      nr.moment_left = std::move(m);
    }
    if (i + 1 < n) {
      const SpanState<R>& sr = spans[i + 1];
      R m = sr.MA;
      if (end_couples) {
        for (std::size_t q = sr.first; q < sr.last; ++q) {
          const Term<R>& t = terms[q];
          if (t.kind == TermKind::Couple && !(t.a > R(0))) m += t.p;
        }
      }
      nr.moment_right = std::move(m);
    }
    nr.reaction_force = std::move(Y);
    Yright = ss.RA0 + dV;
    xr = xi;
  }
  {
    BasicNodeResult<R>& nr = out.nodes[0];
    const SpanState<R>& sr = spans[0];
    R Y{0};
    Y += Yright;
    nr.x = rows[0].x;
    nr.deflection = sr.DA;
    nr.rotation_left = xr;
    nr.rotation_right = xr;
    R m = sr.MA;
    if (end_couples) {
      for (std::size_t q = sr.first; q < sr.last; ++q) {
        const Term<R>& t = terms[q];
        if (t.kind == TermKind::Couple && !(t.a > R(0))) m += t.p;
      }
    }
    nr.moment_right = std::move(m);
    nr.reaction_force = std::move(Y);
  }

  std::shared_ptr<const SolvedState<R>> frozen = std::move(state);
  out.at = [frozen](std::size_t span, const R& local, bool after) {
    return SpanMath<R>::evaluate(*frozen, span, local, after);
  };
  out.status = MethodStatus::Ok;
  return true;
}

}  // namespace

template <class R>
BasicSolution<R> solve(const BasicBeam<R>& beam, const std::vector<BasicStation<R>>& stations) {
  (void)stations;  // exact at any point; no grid needed
  using MS = MethodStatus;
  const std::size_t n = beam.spans.size();
  if (n == 0) return give_up<R>(MS::Failed, "invalid beam: no span");
  const std::size_t N = n + 1;
  if (beam.supports.size() != N) return give_up<R>(MS::Failed, "invalid beam: support count is not spans + 1");
  const auto& labels = beam.labels;
  auto name = [&](std::size_t i) { return node_name(labels, i); };

  const Consts<R> K;
  {
    BasicSolution<R> fast;
    if (solve_rotations_only(beam, K, fast)) return fast;
  }
  // Node loads, only when there are any (empty: none).
  std::vector<R> nodeP, nodeC;
  // The solved state is filled as we go (see `SpanSums` for what its
  // slots hold before the solve).
  auto state = std::make_shared<SolvedState<R>>();
  auto& spans = state->spans;
  reserve_huge(spans, n);
  spans.resize(n);
  for (std::size_t s = 0; s < n; ++s) {
    const BasicSpan<R>& bs = beam.spans[s];
    if (!(bs.length > R(0)) || !is_finite(bs.length))
      return give_up<R>(MS::Failed, "invalid beam: length of span " + std::to_string(s + 1) + " is not positive");
    if (!(bs.EI > R(0)) || !is_finite(bs.EI))
      return give_up<R>(MS::Failed, "invalid beam: EI of span " + std::to_string(s + 1) + " is not positive");
    spans[s].L = bs.length;
    spans[s].EI = bs.EI;
  }
  // Whether some span couple sits exactly at a span end (it changes the
  // inside limits of the moment at that node).
  bool end_couples = false;
  std::vector<Term<R>>& terms = state->terms;
  auto node_load = [&](const BasicLoad<R>& l) {
    if (nodeP.empty()) {
      nodeP.assign(N, R(0));
      nodeC.assign(N, R(0));
    }
    if (l.type == LoadType::Point) nodeP[l.index] += l.P;
    else if (l.type == LoadType::Couple) nodeC[l.index] += l.C;
  };

  // Span loads. Fast path: the span loads come in span order and are all
  // acceptable; one pass builds the terms and sums their effects. Otherwise
  // (or on the first fault) the general path: count, then fill by a
  // counting sort, and report the first fault in the order of the loads.
  bool fast = true;
  {
    reserve_huge(terms, beam.loads.size());
    terms.resize(beam.loads.size());
    std::size_t pos = 0;  // terms filled
    std::size_t cur = 0;  // the span being filled
    spans[0].first = 0;
    R invL2 = R(1) / (spans[0].L * spans[0].L);
    SpanSums<R> sums;  // of span `cur`
    for (const auto& l : beam.loads) {
      if (l.on_node) {
        if (l.index >= N || (l.type != LoadType::Point && l.type != LoadType::Couple)) { fast = false; break; }
        node_load(l);
        continue;
      }
      const std::size_t s = l.index;
      if (s >= n || s < cur) { fast = false; break; }
      if (s != cur) {
        sums.store(spans[cur]);
        sums = SpanSums<R>();
        while (cur < s) {
          spans[cur].last = pos;
          ++cur;
          spans[cur].first = pos;
        }
        invL2 = R(1) / (spans[s].L * spans[s].L);
      }
      Term<R>& t = terms[pos++];
      LoadEffect<R> e;
      if (take_load(l, spans[s].L, invL2, K, t, e) != LoadFault::None) { fast = false; break; }
      if (t.kind == TermKind::Couple && (!(t.a > R(0)) || !(t.a < spans[s].L))) end_couples = true;
      sums.add(e);
    }
    if (fast) {
      sums.store(spans[cur]);
      spans[cur].last = pos;
      for (std::size_t s = cur + 1; s < n; ++s) spans[s].first = spans[s].last = pos;
      terms.resize(pos);  // shrinks in place
    }
  }
  if (!fast) {
    for (std::size_t s = 0; s < n; ++s) {
      SpanState<R>& ss = spans[s];
      ss.MA = ss.DA = ss.RA0 = ss.MB = ss.FL = R(0);
      ss.first = ss.last = 0;
    }
    nodeP.clear();
    nodeC.clear();
    for (const auto& l : beam.loads) {
      if (l.on_node) {
        if (l.index >= N) return give_up<R>(MS::NotApplicable, "load on a node outside the beam");
        if (l.type != LoadType::Point && l.type != LoadType::Couple)
          return give_up<R>(MS::NotApplicable, std::string(load_type_name(l.type)) + " load on node " + name(l.index));
        node_load(l);
      } else {
        if (l.index >= n) return give_up<R>(MS::NotApplicable, "load on a span outside the beam");
        ++spans[l.index].first;
      }
    }
    std::size_t total = 0;
    for (std::size_t s = 0; s < n; ++s) {
      const std::size_t c = spans[s].first;
      spans[s].first = spans[s].last = total;
      total += c;
    }
    terms.assign(total, Term<R>{});
    for (const auto& l : beam.loads) {
      if (l.on_node) continue;
      SpanState<R>& ss = spans[l.index];
      const R invL2 = R(1) / (ss.L * ss.L);
      Term<R> t;
      LoadEffect<R> e;
      const LoadFault f = take_load(l, ss.L, invL2, K, t, e);
      if (f != LoadFault::None) return give_up<R>(MS::NotApplicable, fault_text(f, l.index));
      if (t.kind == TermKind::Couple && (!(t.a > R(0)) || !(t.a < ss.L))) end_couples = true;
      SpanSums<R> one;
      one.add(e);
      ss.MA += one.femI;
      ss.DA += one.femJ;
      ss.RA0 += one.moment;
      ss.MB += one.shear;
      ss.FL += one.second;
      terms[ss.last++] = t;
    }
  }

  // Unknowns, node by node: [rotation left (= right unless hinge), deflection,
  // rotation right at a hinge], which keeps each span's unknowns within 4
  // consecutive positions.
  std::vector<NodeUnknowns> un;
  reserve_huge(un, N);
  un.resize(N);
  long next = 0;
  std::size_t hb = 0;
  for (std::size_t i = 0; i < N; ++i) {
    const BasicSupport<R>& sp = beam.supports[i];
    const SupportType t = sp.type;
    const bool end = (i == 0 || i == n);
    if (t == SupportType::Spring) {
      if (sp.k < R(0) || sp.kr < R(0)) return give_up<R>(MS::NotApplicable, "negative spring stiffness at node " + name(i));
    }
    if ((t == SupportType::Free || t == SupportType::Guided) && !is_zero(sp.settlement))
      return give_up<R>(MS::NotApplicable, "settlement on a " + std::string(support_type_name(t)) + " node " + name(i));
    if (sp.hinge) {
      if (end) return give_up<R>(MS::NotApplicable, "hinge at end node " + name(i));
      if (restrains_rotation(t))
        return give_up<R>(MS::NotApplicable, "hinge on a " + std::string(support_type_name(t)) + " support at node " + name(i));
      if (t == SupportType::Spring && sp.kr > R(0))
        return give_up<R>(MS::NotApplicable, "hinge on a rotational spring at node " + name(i));
      if (!nodeC.empty() && !is_zero(nodeC[i])) return give_up<R>(MS::NotApplicable, "couple at hinge node " + name(i));
    }
    const bool rotates = !restrains_rotation(t);
    const bool translates = !restrains_deflection(t);
    NodeUnknowns& u = un[i];
    if (rotates) u.thL = u.thR = static_cast<std::int32_t>(next++);
    if (translates) u.dv = static_cast<std::int32_t>(next++);
    if (rotates && sp.hinge) u.thR = static_cast<std::int32_t>(next++);
    if (next > 2000000000L) return give_up<R>(MS::NotApplicable, "more than 2e9 unknowns");
    if (i > 0) {
      // Half-bandwidth: the spread of span i-1's unknowns.
      // Order within a node: thL, dv, thR; so the first of span i-1's
      // unknowns is node i-1's dv or thR, the last node i's dv or thL.
      const NodeUnknowns& v = un[i - 1];
      std::int32_t lo = v.thR;
      if (v.dv >= 0 && (lo < 0 || v.dv < lo)) lo = v.dv;
      std::int32_t hi = u.dv >= 0 ? u.dv : u.thL;
      if (hi < 0) hi = std::max(v.thR, v.dv);
      if (lo < 0) lo = u.thL >= 0 ? u.thL : u.dv;
      if (lo >= 0 && hi > lo) hb = std::max(hb, static_cast<std::size_t>(hi - lo));
    }
  }
  const std::size_t nu = static_cast<std::size_t>(next);

  Banded<R> sys;
  sys.init(nu, hb);
  const R zero(0);
  // The known deflection of node i (its settlement) where it is no unknown.
  auto known_defl = [&](std::size_t i) -> const R& { return un[i].dv < 0 ? beam.supports[i].settlement : zero; };
  auto node_rows = [&](std::size_t i) {
    const BasicSupport<R>& sp = beam.supports[i];
    const bool spring = sp.type == SupportType::Spring;
    const NodeUnknowns& u = un[i];
    if (u.thL >= 0 && !sp.hinge) {
      if (!nodeC.empty()) sys.rhs[static_cast<std::size_t>(u.thL)] += nodeC[i];
      if (spring) sys.put(u.thL, sp.kr, u.thL, zero);
    }
    if (u.dv >= 0) {
      if (!nodeP.empty()) sys.rhs[static_cast<std::size_t>(u.dv)] += nodeP[i];
      if (spring) {
        sys.put(u.dv, sp.k, u.dv, zero);
        sys.rhs[static_cast<std::size_t>(u.dv)] += sp.k * sp.settlement;
      }
    }
  };

  // Per span: the simple-beam data, then its stiffness into the system;
  // after span s the rows of node s are complete.
  for (std::size_t s = 0; s < n; ++s) {
    SpanState<R>& ss = spans[s];
    const R& L = ss.L;
    const R invL = R(1) / L;
    // m0(L+) = RA0 L + (load part) = 0 (every load on the span included).
    ss.RA0 = -ss.RA0 * invL;
    ss.FL = ss.RA0 * L * L * L * K.sixth + ss.FL;
    ss.MB = -ss.MB - ss.RA0;  // RB0: total load minus the left reaction
    const R k = R(2) * ss.EI / L;  // 2EI/L
    const R kL = R(3) * k / L;     // 6EI/L^2
    const R kLL = R(2) * kL / L;   // 12EI/L^3
    const long ti = un[s].thR, tj = un[s + 1].thL;
    const long di = un[s].dv, dj = un[s + 1].dv;
    const R& Di = known_defl(s);
    const R& Dj = known_defl(s + 1);
    const R& femI = ss.MA;
    const R& femJ = ss.DA;
    const R twok = R(2) * k;
    if (di < 0 && dj < 0 && ti >= 0 && tj == ti + 1) {
      // Both ends rotate, neither translates (the common case): the same
      // entries as below, written directly.
      const std::size_t r = static_cast<std::size_t>(ti);
      R* a = &sys.a[r * sys.w];
      a[0] += twok;
      a[1] += k;
      a[sys.w] += twok;
      R& bi = sys.rhs[r];
      R& bj = sys.rhs[r + 1];
      if (!is_zero(Di)) { bi -= kL * Di; bj -= kL * Di; }
      if (!is_zero(Dj)) { bi -= -kL * Dj; bj -= -kL * Dj; }
      bi -= femI;
      bj -= femJ;
      node_rows(s);
      continue;
    }
    // M_ij = k(2 ti + tj) + kL (di - dj) + FEM_ij, on the row of ti.
    if (ti >= 0) {
      sys.put(ti, twok, ti, zero); sys.put(ti, k, tj, zero); sys.put(ti, kL, di, Di); sys.put(ti, -kL, dj, Dj);
      sys.put_const(ti, femI);
    }
    // M_ji = k(ti + 2 tj) + kL (di - dj) + FEM_ji, on the row of tj.
    if (tj >= 0) {
      sys.put(tj, k, ti, zero); sys.put(tj, twok, tj, zero); sys.put(tj, kL, di, Di); sys.put(tj, -kL, dj, Dj);
      sys.put_const(tj, femJ);
    }
    // (M_ij + M_ji)/L = kL (ti + tj) + kLL (di - dj) + (FEM_ij + FEM_ji)/L.
    // Y_i = RA0 - (M_ij + M_ji)/L; row of di gets -Y_i.
    if (di >= 0 || dj >= 0) {
      const R femL = (femI + femJ) / L;
      if (di >= 0) {
        sys.put(di, kL, ti, zero); sys.put(di, kL, tj, zero); sys.put(di, kLL, di, Di); sys.put(di, -kLL, dj, Dj);
        sys.put_const(di, femL - ss.RA0);
      }
      // Y_j = RB0 + (M_ij + M_ji)/L; row of dj gets -Y_j.
      if (dj >= 0) {
        sys.put(dj, -kL, ti, zero); sys.put(dj, -kL, tj, zero); sys.put(dj, -kLL, di, Di); sys.put(dj, kLL, dj, Dj);
        sys.put_const(dj, -femL - ss.MB);
      }
    }
    node_rows(s);
  }
  node_rows(n);

  const long bad = banded_solve(sys);
  if (bad >= 0) {
    // Find the unknown's node and kind (only on failure: O(n) once).
    std::size_t node = 0;
    const char* what = "unknown";
    for (std::size_t i = 0; i < N; ++i) {
      if (un[i].thL == bad) { node = i; what = beam.supports[i].hinge ? "rotation left of the hinge" : "rotation"; break; }
      if (un[i].dv == bad) { node = i; what = "deflection"; break; }
      if (un[i].thR == bad) { node = i; what = "rotation right of the hinge"; break; }
    }
    return give_up<R>(MS::Failed, std::string("zero or non-positive pivot at the ") + what + " of node " +
                                      name(node) + " (a mechanism, or too ill-conditioned)");
  }
  const std::vector<R>& x = sys.rhs;
  // Every unknown enters some span's end moments (a rotation directly, a
  // deflection through psi) and a non-finite one makes them non-finite, so
  // the solution is scanned only when an end moment is not finite.
  auto non_finite = [&]() {
    for (std::size_t r = 0; r < nu; ++r)
      if (!is_finite(x[r])) return give_up<R>(MS::Failed, "non-finite value in the solution");
    return give_up<R>(MS::Failed, "non-finite end moment");
  };

  auto value = [&](long idx, const R& known) -> const R& { return idx >= 0 ? x[static_cast<std::size_t>(idx)] : known; };

  // End moments (member-end convention) into the state as sagging moments:
  // MA = M_ij, MB = -M_ji. The end forces on the member follow from them:
  // Y_i = RA0 + (MB - MA)/L, Y_j = RB0 - (MB - MA)/L. The sums over the
  // member ends at each node, with the node loads, give the reactions:
  // P + sum of Y, and C - sum of member-end moments. Node by node, span i-1
  // having been done the step before.
  BasicSolution<R> out;
  reserve_huge(out.nodes, N);
  out.nodes.resize(N);
  R xpos{0};
  R Yprev{0}, Mjiprev{0};  // of span i-1: Y_j and M_ji
  for (std::size_t i = 0; i < N; ++i) {
    const BasicSupport<R>& sp = beam.supports[i];
    R Y = nodeP.empty() ? R(0) : nodeP[i];
    R Cn = nodeC.empty() ? R(0) : nodeC[i];
    if (i > 0) {
      Y += Yprev;
      Cn -= Mjiprev;
    }
    if (i < n) {
      SpanState<R>& ss = spans[i];
      const R& L = ss.L;
      const R k = R(2) * ss.EI / L;
      const R& ti = value(un[i].thR, zero);
      const R& tj = value(un[i + 1].thL, zero);
      const R femI = ss.MA, femJ = ss.DA;
      ss.DA = value(un[i].dv, beam.supports[i].settlement);
      ss.DB = value(un[i + 1].dv, beam.supports[i + 1].settlement);
      const R psi = (ss.DB - ss.DA) / L;
      ss.MA = k * (R(2) * ti + tj - R(3) * psi) + femI;
      const R Mji = k * (ti + R(2) * tj - R(3) * psi) + femJ;
      const R RB0 = ss.MB;
      ss.MB = -Mji;
      if (!is_finite(ss.MA) || !is_finite(ss.MB)) return non_finite();
      const R dV = (ss.MB - ss.MA) / L;
      Y += ss.RA0 + dV;
      Cn -= ss.MA;
      Yprev = RB0 - dV;
      Mjiprev = Mji;
    }
    BasicNodeResult<R>& nr = out.nodes[i];
    nr.x = xpos;
    if (i < n) xpos += beam.spans[i].length;
    nr.deflection = value(un[i].dv, sp.settlement);
    const R& rl = value(un[i].thL, zero);
    const R& rr = value(un[i].thR, zero);
    nr.rotation_left = (i == 0) ? rr : rl;
    nr.rotation_right = (i == n) ? rl : rr;
    // Inside limits of the moment: the end moment, plus a span couple at
    // local 0 (it acts before the limit from inside the span at 0); a
    // couple at local L acts after the limit at L.
    if (i > 0) {
      const SpanState<R>& ss = spans[i - 1];
      R m = ss.MB;
      if (end_couples) {
        for (std::size_t k = ss.first; k < ss.last; ++k) {
          const Term<R>& t = terms[k];
          if (t.kind == TermKind::Couple && !(t.a < ss.L)) m -= t.p;
        }
      }
      nr.moment_left = std::move(m);
    }
    if (i < n) {
      const SpanState<R>& ss = spans[i];
      R m = ss.MA;
      if (end_couples) {
        for (std::size_t k = ss.first; k < ss.last; ++k) {
          const Term<R>& t = terms[k];
          if (t.kind == TermKind::Couple && !(t.a > R(0))) m += t.p;
        }
      }
      nr.moment_right = std::move(m);
    }
    if (restrains_deflection(sp.type)) nr.reaction_force = Y;
    else if (sp.type == SupportType::Spring) nr.reaction_force = sp.k * (nr.deflection - sp.settlement);
    if (restrains_rotation(sp.type)) nr.reaction_moment = Cn;
    else if (sp.type == SupportType::Spring) nr.reaction_moment = sp.kr * rr;
  }

  std::shared_ptr<const SolvedState<R>> frozen = std::move(state);
  out.at = [frozen](std::size_t span, const R& local, bool after) {
    return SpanMath<R>::evaluate(*frozen, span, local, after);
  };
  out.status = MS::Ok;
  return out;
}

namespace detail {

template <class R>
EndPair<R> fixed_end_moments(const BasicLoad<R>& l, const R& length) {
  return fem_of<R>(l.type, length, l.P, l.C, l.w1, l.w2, l.at, l.from, l.to);
}

template <class R>
EndPair<R> simple_span_end_rotations(const BasicLoad<R>& l, const R& L, const R& EI) {
  SolvedState<R> st;
  Term<R> t;
  switch (l.type) {
    case LoadType::Point: t.kind = TermKind::Point; t.a = l.at; t.p = l.P; break;
    case LoadType::Couple: t.kind = TermKind::Couple; t.a = l.at; t.p = l.C; break;
    case LoadType::Udl:
    case LoadType::Linear: t.kind = TermKind::Spread; t.a = l.from; t.b = l.to; t.p = l.w1; t.q = l.w2; break;
  }
  st.terms.push_back(t);
  SpanState<R> s;
  s.L = L;
  s.EI = EI;
  s.first = 0;
  s.last = 1;
  SpanMath<R>::simple_beam(st.terms.data(), 1, L, s.RA0, s.FL);
  st.spans.push_back(s);
  EndPair<R> e;
  e.left = SpanMath<R>::evaluate(st, 0, R(0), true).rotation;
  e.right = SpanMath<R>::evaluate(st, 0, L, false).rotation;
  return e;
}

}  // namespace detail

template BasicSolution<double> solve<double>(const BasicBeam<double>&, const std::vector<BasicStation<double>>&);
template BasicSolution<Extended> solve<Extended>(const BasicBeam<Extended>&,
                                                 const std::vector<BasicStation<Extended>>&);
template BasicSolution<Exact> solve<Exact>(const BasicBeam<Exact>&, const std::vector<BasicStation<Exact>>&);

namespace detail {
template EndPair<double> fixed_end_moments<double>(const BasicLoad<double>&, const double&);
template EndPair<Extended> fixed_end_moments<Extended>(const BasicLoad<Extended>&, const Extended&);
template EndPair<Exact> fixed_end_moments<Exact>(const BasicLoad<Exact>&, const Exact&);
template EndPair<double> simple_span_end_rotations<double>(const BasicLoad<double>&, const double&, const double&);
template EndPair<Extended> simple_span_end_rotations<Extended>(const BasicLoad<Extended>&, const Extended&,
                                                               const Extended&);
template EndPair<Exact> simple_span_end_rotations<Exact>(const BasicLoad<Exact>&, const Exact&, const Exact&);
}  // namespace detail

}  // namespace trivet::slope_deflection
