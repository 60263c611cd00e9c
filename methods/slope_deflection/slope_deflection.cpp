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

#include <cmath>
#include <limits>
#include <memory>
#include <string>
#include <type_traits>
#include <utility>

namespace trivet::slope_deflection {
namespace {

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
template <class R>
bool is_finite(const R& x) {
  R d = x - x;
  return d <= R(0) && d >= R(0);
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

// Fixed-end moments (member-end convention, clockwise +) of one load.
//   Point P at a (b = L - a): M_ij = -P a b^2 / L^2, M_ji = +P a^2 b / L^2.
//   Couple C (clockwise) at a: the limit of a force pair, i.e. C times the
//     derivative in a of the point-load values per unit force:
//     M_ij = C b (2a - b) / L^2, M_ji = C a (2b - a) / L^2.
//   Distributed w(x) over [x1, x2]: the point-load values integrated,
//     M_ij = -(1/L^2) int w x (L-x)^2 dx, M_ji = (1/L^2) int w x^2 (L-x) dx,
//     with x = x1 + u, w = w1 + (w2 - w1) u / h, the polynomials expanded in
//     u and m_k = int_0^h w u^k du = h^(k+1) (w1 + (k+1) w2) / ((k+1)(k+2)).
template <class R>
detail::EndPair<R> fem_of(LoadType type, const R& L, const R& P, const R& C, const R& w1, const R& w2,
                          const R& at, const R& from, const R& to) {
  detail::EndPair<R> e;
  const R L2 = L * L;
  switch (type) {
    case LoadType::Point: {
      const R a = at;
      const R b = L - at;
      e.left = -P * a * b * b / L2;
      e.right = P * a * a * b / L2;
      break;
    }
    case LoadType::Couple: {
      const R a = at;
      const R b = L - at;
      e.left = C * b * (R(2) * a - b) / L2;
      e.right = C * a * (R(2) * b - a) / L2;
      break;
    }
    case LoadType::Udl:
    case LoadType::Linear: {
      const R x1 = from;
      const R h = to - from;
      const R b1 = L - x1;
      R m[4];
      R hk = h;
      for (int k = 0; k < 4; ++k) {
        m[k] = hk * (w1 + R(k + 1) * w2) / R((k + 1) * (k + 2));
        hk = hk * h;
      }
      const R left_int = x1 * b1 * b1 * m[0] + (b1 * b1 - R(2) * x1 * b1) * m[1] +
                         (x1 - R(2) * b1) * m[2] + m[3];
      const R right_int = x1 * x1 * b1 * m[0] + (R(2) * x1 * b1 - x1 * x1) * m[1] +
                          (b1 - R(2) * x1) * m[2] - m[3];
      e.left = -left_int / L2;
      e.right = right_int / L2;
      break;
    }
  }
  return e;
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

// A value that is either unknown `idx` (>= 0) or the known `value`.
template <class R>
struct Var {
  long idx = -1;
  R value{0};
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
    a.assign(n * w, R(0));
    rhs.assign(n, R(0));
  }
  R& at(std::size_t r, std::size_t c) { return a[r * w + (c - r)]; }
};

// Gaussian elimination without row exchanges on the symmetric band (the
// lower entry of row i, column k is the upper one of row k, column i):
// O(n hb^2). The matrix is positive definite for a stable beam, so every
// pivot must be positive; returns the first row whose pivot is not (or is
// mostly rounding), or -1.
template <class R>
long banded_solve(Banded<R>& m, std::vector<R>& x) {
  const std::size_t n = m.n, hb = m.hb;
  const R tol = pivot_tolerance<R>();
  x.resize(n);
  for (std::size_t k = 0; k < n; ++k) x[k] = m.at(k, k);  // original diagonal, for the tolerance
  for (std::size_t k = 0; k < n; ++k) {
    const R p = m.at(k, k);
    if (!(p > x[k] * tol) || !(p > R(0)) || !is_finite(p)) return static_cast<long>(k);
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
    for (std::size_t j = kk + 1; j < end; ++j) s -= m.at(kk, j) * x[j];
    x[kk] = s / m.at(kk, kk);
  }
  return -1;
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

  for (std::size_t s = 0; s < n; ++s) {
    if (!(beam.spans[s].length > R(0)) || !is_finite(beam.spans[s].length))
      return give_up<R>(MS::Failed, "invalid beam: length of span " + std::to_string(s + 1) + " is not positive");
    if (!(beam.spans[s].EI > R(0)) || !is_finite(beam.spans[s].EI))
      return give_up<R>(MS::Failed, "invalid beam: EI of span " + std::to_string(s + 1) + " is not positive");
  }

  // Node loads.
  std::vector<R> nodeP(N, R(0)), nodeC(N, R(0));
  // The solved state is filled as we go. Before the solve, three of its
  // slots hold other values of the span: MA the fixed-end moment FEM_ij,
  // DA the fixed-end moment FEM_ji, MB the simple-beam right reaction RB0.
  auto state = std::make_shared<SolvedState<R>>();
  state->spans.resize(n);
  auto& spans = state->spans;
  // Span loads: count (in `first`), then fill (counting sort, cursor in
  // `last`), summing the fixed-end moments.
  for (const auto& l : beam.loads) {
    if (l.on_node) {
      if (l.index >= N) return give_up<R>(MS::NotApplicable, "load on a node outside the beam");
      if (l.type == LoadType::Point) nodeP[l.index] += l.P;
      else if (l.type == LoadType::Couple) nodeC[l.index] += l.C;
      else return give_up<R>(MS::NotApplicable, std::string(load_type_name(l.type)) + " load on node " + name(l.index));
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
  std::vector<Term<R>> terms(total);
  {
    for (const auto& l : beam.loads) {
      if (l.on_node) continue;
      const std::size_t s = l.index;
      const R& L = beam.spans[s].length;
      auto where = [s]() { return " on span " + std::to_string(s + 1); };
      Term<R> t;
      switch (l.type) {
        case LoadType::Point:
          // The reader moves a point force at a span end onto the node.
          if (!(l.at > R(0)) || !(l.at < L))
            return give_up<R>(MS::NotApplicable, "point load not strictly inside its span" + where());
          t.kind = TermKind::Point; t.a = l.at; t.p = l.P;
          break;
        case LoadType::Couple:
          if (l.at < R(0) || l.at > L) return give_up<R>(MS::NotApplicable, "couple outside its span" + where());
          t.kind = TermKind::Couple; t.a = l.at; t.p = l.C;
          break;
        case LoadType::Udl:
        case LoadType::Linear:
          if (l.from < R(0) || l.to > L || l.to < l.from)
            return give_up<R>(MS::NotApplicable, "distributed load outside its span" + where());
          if (l.type == LoadType::Udl && !is_zero(R(l.w1 - l.w2)))
            return give_up<R>(MS::NotApplicable, "uniform load with unequal end intensities" + where());
          t.kind = TermKind::Spread; t.a = l.from; t.b = l.to; t.p = l.w1; t.q = l.w2;
          break;
      }
      const detail::EndPair<R> e = fem_of<R>(l.type, L, l.P, l.C, l.w1, l.w2, l.at, l.from, l.to);
      spans[s].MA += e.left;
      spans[s].DA += e.right;
      terms[spans[s].last++] = t;
    }
  }

  // Unknowns, node by node: [rotation left (= right unless hinge), deflection,
  // rotation right at a hinge], which keeps each span's unknowns within 4
  // consecutive positions.
  std::vector<std::int32_t> thL(N, -1), thR(N, -1), dv(N, -1);
  long next = 0;
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
      if (!is_zero(nodeC[i])) return give_up<R>(MS::NotApplicable, "couple at hinge node " + name(i));
    }
    const bool rotates = !restrains_rotation(t);
    const bool translates = !restrains_deflection(t);
    if (rotates) thL[i] = thR[i] = static_cast<std::int32_t>(next++);
    if (translates) dv[i] = static_cast<std::int32_t>(next++);
    if (rotates && sp.hinge) thR[i] = static_cast<std::int32_t>(next++);
    if (next > 2000000000L) return give_up<R>(MS::NotApplicable, "more than 2e9 unknowns");
  }
  const std::size_t nu = static_cast<std::size_t>(next);

  auto rot = [&](long idx) { Var<R> v; v.idx = idx; return v; };
  auto defl = [&](std::size_t i) {
    Var<R> v;
    v.idx = dv[i];
    if (dv[i] < 0) v.value = beam.supports[i].settlement;
    return v;
  };

  // Half-bandwidth.
  std::size_t hb = 0;
  for (std::size_t s = 0; s < n; ++s) {
    long lo = next, hi = -1;
    for (long idx : {long(thR[s]), long(dv[s]), long(thL[s + 1]), long(dv[s + 1])}) {
      if (idx < 0) continue;
      lo = std::min(lo, idx);
      hi = std::max(hi, idx);
    }
    if (hi > lo) hb = std::max(hb, static_cast<std::size_t>(hi - lo));
  }

  // Per-span simple-beam data.
  for (std::size_t s = 0; s < n; ++s) {
    SpanState<R>& ss = spans[s];
    ss.L = beam.spans[s].length;
    ss.EI = beam.spans[s].EI;
    SpanMath<R>::simple_beam(terms.data() + ss.first, ss.last - ss.first, ss.L, ss.RA0, ss.FL);
    LoadParts<R> end;
    for (std::size_t k = ss.first; k < ss.last; ++k) SpanMath<R>::add(terms[k], ss.L, true, end);
    ss.MB = -end.shear - ss.RA0;  // total load minus the left reaction
  }

  Banded<R> sys;
  sys.init(nu, hb);
  // row += c * var
  auto put = [&](long row, const R& c, const Var<R>& v) {
    if (row < 0) return;
    if (v.idx >= 0) {
      if (v.idx >= row) sys.at(static_cast<std::size_t>(row), static_cast<std::size_t>(v.idx)) += c;
    }
    else if (!is_zero(v.value)) sys.rhs[static_cast<std::size_t>(row)] -= c * v.value;
  };
  auto put_const = [&](long row, const R& c) {
    if (row >= 0) sys.rhs[static_cast<std::size_t>(row)] -= c;
  };

  for (std::size_t s = 0; s < n; ++s) {
    const R& L = beam.spans[s].length;
    const R k = R(2) * beam.spans[s].EI / L;  // 2EI/L
    const R kL = R(3) * k / L;                // 6EI/L^2
    const R kLL = R(2) * kL / L;              // 12EI/L^3
    const Var<R> ti = rot(thR[s]), tj = rot(thL[s + 1]);
    const Var<R> di = defl(s), dj = defl(s + 1);
    // M_ij = k(2 ti + tj) + kL (di - dj) + FEM_ij, on the row of ti.
    const long ri = ti.idx, rj = tj.idx;
    const R& femI = spans[s].MA;
    const R& femJ = spans[s].DA;
    put(ri, R(2) * k, ti); put(ri, k, tj); put(ri, kL, di); put(ri, -kL, dj); put_const(ri, femI);
    // M_ji = k(ti + 2 tj) + kL (di - dj) + FEM_ji, on the row of tj.
    put(rj, k, ti); put(rj, R(2) * k, tj); put(rj, kL, di); put(rj, -kL, dj); put_const(rj, femJ);
    // (M_ij + M_ji)/L = kL (ti + tj) + kLL (di - dj) + (FEM_ij + FEM_ji)/L.
    // Y_i = RA0 - (M_ij + M_ji)/L; row of di gets -Y_i.
    const R femL = (femI + femJ) / L;
    const long rdi = di.idx, rdj = dj.idx;
    const R& RA0 = state->spans[s].RA0;
    const R& RB0 = state->spans[s].MB;
    put(rdi, kL, ti); put(rdi, kL, tj); put(rdi, kLL, di); put(rdi, -kLL, dj); put_const(rdi, femL - RA0);
    // Y_j = RB0 + (M_ij + M_ji)/L; row of dj gets -Y_j.
    put(rdj, -kL, ti); put(rdj, -kL, tj); put(rdj, -kLL, di); put(rdj, kLL, dj); put_const(rdj, -femL - RB0);
  }
  for (std::size_t i = 0; i < N; ++i) {
    const BasicSupport<R>& sp = beam.supports[i];
    const bool spring = sp.type == SupportType::Spring;
    if (thL[i] >= 0 && !sp.hinge) {
      sys.rhs[static_cast<std::size_t>(thL[i])] += nodeC[i];
      if (spring) put(thL[i], sp.kr, rot(thL[i]));
    }
    if (dv[i] >= 0) {
      sys.rhs[static_cast<std::size_t>(dv[i])] += nodeP[i];
      if (spring) {
        put(dv[i], sp.k, defl(i));
        sys.rhs[static_cast<std::size_t>(dv[i])] += sp.k * sp.settlement;
      }
    }
  }

  std::vector<R> x;
  const long bad = banded_solve(sys, x);
  if (bad >= 0) {
    // Find the unknown's node and kind (only on failure: O(n) once).
    std::size_t node = 0;
    const char* what = "unknown";
    for (std::size_t i = 0; i < N; ++i) {
      if (thL[i] == bad) { node = i; what = beam.supports[i].hinge ? "rotation left of the hinge" : "rotation"; break; }
      if (dv[i] == bad) { node = i; what = "deflection"; break; }
      if (thR[i] == bad) { node = i; what = "rotation right of the hinge"; break; }
    }
    return give_up<R>(MS::Failed, std::string("zero or non-positive pivot at the ") + what + " of node " +
                                      name(node) + " (a mechanism, or too ill-conditioned)");
  }
  for (std::size_t r = 0; r < nu; ++r)
    if (!is_finite(x[r])) return give_up<R>(MS::Failed, "non-finite value in the solution");

  auto value = [&](const Var<R>& v) { return v.idx >= 0 ? x[static_cast<std::size_t>(v.idx)] : v.value; };

  // End moments (member-end convention) into the state as sagging moments:
  // MA = M_ij, MB = -M_ji. The end forces on the member follow from them:
  // Y_i = RA0 + (MB - MA)/L, Y_j = RB0 - (MB - MA)/L. The sums over the
  // member ends at each node are added to the node loads for the reactions:
  // nodeP becomes P + sum of Y, nodeC becomes C - sum of member-end moments.
  std::vector<R>& Yends = nodeP;
  std::vector<R>& Cnet = nodeC;
  for (std::size_t s = 0; s < n; ++s) {
    SpanState<R>& ss = state->spans[s];
    const R& L = ss.L;
    const R k = R(2) * ss.EI / L;
    const R ti = value(rot(thR[s])), tj = value(rot(thL[s + 1]));
    const R femI = ss.MA, femJ = ss.DA;
    ss.DA = value(defl(s));
    ss.DB = value(defl(s + 1));
    const R psi = (ss.DB - ss.DA) / L;
    ss.MA = k * (R(2) * ti + tj - R(3) * psi) + femI;
    const R Mji = k * (ti + R(2) * tj - R(3) * psi) + femJ;
    const R RB0 = ss.MB;
    ss.MB = -Mji;
    if (!is_finite(ss.MA) || !is_finite(ss.MB)) return give_up<R>(MS::Failed, "non-finite end moment");
    const R dV = (ss.MB - ss.MA) / L;
    Yends[s] += ss.RA0 + dV;
    Yends[s + 1] += RB0 - dV;
    Cnet[s] -= ss.MA;
    Cnet[s + 1] -= Mji;
  }
  state->terms = std::move(terms);

  BasicSolution<R> out;
  out.nodes.resize(N);
  R xpos{0};
  for (std::size_t i = 0; i < N; ++i) {
    const BasicSupport<R>& sp = beam.supports[i];
    BasicNodeResult<R>& nr = out.nodes[i];
    nr.x = xpos;
    if (i < n) xpos += beam.spans[i].length;
    nr.deflection = value(defl(i));
    const R rl = value(rot(thL[i]));
    const R rr = value(rot(thR[i]));
    nr.rotation_left = (i == 0) ? rr : rl;
    nr.rotation_right = (i == n) ? rl : rr;
    // Inside limits of the moment: the end moment, plus a span couple at
    // local 0 (it acts before the limit from inside the span at 0); a
    // couple at local L acts after the limit at L.
    if (i > 0) {
      const SpanState<R>& ss = state->spans[i - 1];
      R m = ss.MB;
      for (std::size_t k = ss.first; k < ss.last; ++k) {
        const Term<R>& t = state->terms[k];
        if (t.kind == TermKind::Couple && !(t.a < ss.L)) m -= t.p;
      }
      nr.moment_left = m;
    }
    if (i < n) {
      const SpanState<R>& ss = state->spans[i];
      R m = ss.MA;
      for (std::size_t k = ss.first; k < ss.last; ++k) {
        const Term<R>& t = state->terms[k];
        if (t.kind == TermKind::Couple && !(t.a > R(0))) m += t.p;
      }
      nr.moment_right = m;
    }
    if (restrains_deflection(sp.type)) nr.reaction_force = Yends[i];
    else if (sp.type == SupportType::Spring) nr.reaction_force = sp.k * (nr.deflection - sp.settlement);
    if (restrains_rotation(sp.type)) nr.reaction_moment = Cnet[i];
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
