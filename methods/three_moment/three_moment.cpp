// trivet: the three-moment equation (Clapeyron) method.
//
// Conventions are those of methods/beam/beam.h: loads down +, couples
// clockwise +, M sagging +, V = dM/dx, v down +, rotation clockwise + with
// rotation = dv/dx and EI v'' = -M.
//
// ---------------------------------------------------------------------------
// Derivation (our own, kept here so it can be checked line by line).
//
// One span of length L, rigidity EI, end deflections vA, vB, "node-side" end
// moments MA, MB (the moments between the span and its end nodes; a couple
// applied inside the span at local 0 or L belongs to the span's loads). The
// moment is M(x) = MA (1 - x/L) + MB x/L + M0(x), where M0 is the moment of
// the same span simply supported under its own loads (the "free" diagram).
// Integrating EI v'' = -M twice with v(0) = vA, v(L) = vB (Green's function
// of the simply supported span) gives the end rotations
//
//   EI L theta(0) =  FR + MA L^2/3 + MB L^2/6 + EI L psi,
//   EI L theta(L) = -FL - MA L^2/6 - MB L^2/3 + EI L psi,
//
// with psi = (vB - vA)/L the chord rotation (clockwise + when the right end
// settles more), FL = A0 * xbar the first moment of the free diagram about
// the LEFT end and FR = A0 * (L - xbar) its first moment about the RIGHT end.
//
// Three-moment equation at an interior support i between span 1 (left,
// ends i-1, i) and span 2 (right, ends i, i+1): theta_1(L1) = theta_2(0).
// Multiplying by 6 and writing f = L/EI:
//
//   f1 M_{i-1} + 2 (f1 + f2) M_i + f2 M_{i+1}
//      = -6 FL1 / (EI1 L1) - 6 FR2 / (EI2 L2) + 6 (psi1 - psi2).
//
// FL1 is A1 a1 (centroid distance a1 from the outer left end of the pair),
// FR2 is A2 b2 (distance b2 from the outer right end). Settlement enters as
// 6 (psi1 - psi2): a support that settles more than its neighbours makes
// psi1 > 0 and psi2 < 0, and its moment moves toward sagging.
//
// Fixed end: an imaginary span of infinite I (f = 0, psi = 0) beside it, so
//   left end fixed  (theta(0) = 0):  2 f MA + f MB = -6 FR/(EI L) - 6 psi,
//   right end fixed (theta(L) = 0):  f MA + 2 f MB = -6 FL/(EI L) + 6 psi.
// A fixed interior support does both, one per side: the moments either side
// are separate unknowns (the reaction couple takes the difference).
//
// Area-moment load terms, derived by superposing point loads. A unit load at
// a on the simply supported span gives the triangle M0 with peak a(L-a)/L at
// a: area a(L-a)/2, centroid (L+a)/3 from the left, so
//   FL = P a b (L + a)/6,   FR = P a b (L + b)/6,   b = L - a.
// A distributed load q(t) over [c, d] is the integral of these point terms:
//   FL = int q(t) gL(t) dt,  gL(t) = t (L^2 - t^2)/6,  FR uses gR(t) = gL(L-t).
// With t = c + tau, q = w1 + s tau (s = (w2 - w1)/(d - c)), delta = d - c and
// m_k = int_0^delta q tau^k dtau = w1 delta^{k+1}/(k+1) + s delta^{k+2}/(k+2):
//   6 FL = (L^2 c - c^3) m0 + (L^2 - 3c^2) m1 - 3 c m2 - m3,
//   6 FR = (L^2 e - e^3) m0 - (L^2 - 3e^2) m1 - 3 e m2 + m3,  e = L - c.
// A clockwise couple C at a: reactions -C/L, +C/L, so M0 = -C x/L (x < a)
// and C (1 - x/L) (x > a); integrating,
//   FL = C (L^2 - 3 a^2)/6,   FR = C (2 L^2 - 6 a L + 3 a^2)/6.
//
// After the support moments are known, each span is evaluated from its left
// end: M(x) = MA + V0 x + Mc(x), V(x) = V0 + Vc(x), where Mc and Vc are the
// moment and shear at x of the loads to the left of x (as on a cantilever
// built in at x), V0 = (MB - MA - Mc(L))/L. Rotation and deflection are the
// exact integrals: EI theta = EI theta0 - int_0^x M,
// EI v = EI vA + EI theta0 x - int_0^x (x - t) M(t) dt, each load term in
// closed form (polynomials of degree up to 5). theta0 follows from v(L) = vB.
// An overhang (free end) is statically determinate: its moment and shear
// come from statics; its rotation and deflection are integrated outward
// from the supported node's rotation and settlement.
// ---------------------------------------------------------------------------

// GCC 12 reports a false -Wmaybe-uninitialized inside boost::rational's
// negate() (boost/rational.hpp, a local `zero` it does initialise). Silence
// it for the boost headers only, before anything else includes them.
#if defined(__GNUC__) && !defined(__clang__)
#pragma GCC diagnostic push
#pragma GCC diagnostic ignored "-Wmaybe-uninitialized"
#endif
#include <boost/multiprecision/cpp_bin_float.hpp>
#include <boost/multiprecision/cpp_int.hpp>
#if defined(__GNUC__) && !defined(__clang__)
#pragma GCC diagnostic pop
#endif

#include "methods/three_moment/three_moment.h"

#include <cmath>
#include <cstdint>
#include <type_traits>
#include <memory>
#include <string>
#include <utility>

#if defined(__linux__)
#include <sys/mman.h>
#endif

namespace trivet::three_moment {
namespace {

// The per-span helpers of solve() are lambdas called from a few places;
// GCC otherwise keeps them out of line, and the calls (arguments through
// memory) cost more than their bodies on a long beam.
#if defined(__GNUC__)
#define TM_INLINE __attribute__((always_inline))
#else
#define TM_INLINE
#endif

template <class R>
TM_INLINE inline bool same(const R& a, const R& b) {
  return !(a < b) && !(b < a);
}
template <class R>
TM_INLINE inline bool is_zero(const R& a) {
  return same(a, R(0));
}
// False for NaN and infinities (x - x is NaN there; NaN compares false).
// Built-in floats ask std::isfinite (the same answer, without the
// subtraction and two compares).
template <class R>
TM_INLINE inline bool finite(const R& a) {
  if constexpr (std::is_floating_point_v<R>) {
    return std::isfinite(a);
  } else {
    const R d = a - a;
    return d <= R(0) && d >= R(0);
  }
}

enum class Kind { Point, Couple, Ramp };

// One load on a (possibly merged) span, local positions. No default
// member values: the array of them is allocated uninitialised (for
// built-in numbers) and every element is written whole before it is read;
// a lone one is made with `{}` (zeros).
template <class R>
struct SpanLoad {
  Kind kind;
  R a;   // Point/Couple: position; Ramp: start c
  R d;   // Ramp: end
  R p;   // Point: P; Couple: C; Ramp: w1 (intensity at c)
  R w2;  // Ramp: intensity at d
  R s;   // Ramp: slope (w2 - w1)/(d - c)
};

// An array written once by index straight after it is allocated. Unlike
// std::vector::resize, the elements are default-initialised, so the
// memory of an array of built-in numbers is not zeroed first and then
// written again (on a long beam the arrays do not stay in cache, and the
// zeroing doubles their memory traffic). Large arrays are advised onto
// transparent huge pages, as reserve_fresh does.
template <class T>
class FreshArray {
 public:
  void allocate(std::size_t count) {
    p_.reset(new T[count]);
    n_ = count;
    advise_huge(p_.get(), count * sizeof(T));
  }
  void shrink(std::size_t count) { n_ = count < n_ ? count : n_; }  // keeps the memory
  void release() { p_.reset(); n_ = 0; }
  T& operator[](std::size_t i) { return p_[i]; }
  const T& operator[](std::size_t i) const { return p_[i]; }
  T* data() { return p_.get(); }
  const T* data() const { return p_.get(); }
  std::size_t size() const { return n_; }

 private:
  static void advise_huge(void* data, std::size_t bytes) {
#if defined(__linux__) && defined(MADV_HUGEPAGE)
    constexpr std::uintptr_t huge = std::uintptr_t(1) << 21;
    if (bytes < 4 * huge) return;
    const auto p = reinterpret_cast<std::uintptr_t>(data);
    const std::uintptr_t b = (p + huge - 1) & ~(huge - 1), e = (p + bytes) & ~(huge - 1);
    if (e > b) (void)madvise(reinterpret_cast<void*>(b), e - b, MADV_HUGEPAGE);
#else
    (void)data;
    (void)bytes;
#endif
  }
  std::unique_ptr<T[]> p_;
  std::size_t n_ = 0;
};

// One span of the solved model (interior unsupported nodes merged away).
template <class R>
struct Segment {
  R L{1}, invEI{1};  // length, 1/EI
  R invL{1};         // 1/L (set with the segment's load terms)
  R MA{0};         // node-side moment at the left end
  R V0{0};         // shear just right of the left end
  R theta0{0};     // rotation at the left end
  R v0{0};         // deflection at the left end
  std::size_t first = 0, last = 0;  // load range in State::loads
};

template <class R>
struct State {
  std::vector<Segment<R>> seg;
  FreshArray<SpanLoad<R>> loads;
  // Filled only when unsupported interior nodes were merged (else a span
  // is its own segment):
  std::vector<std::size_t> span_seg;  // original span -> segment
  std::vector<R> span_off;            // original span -> offset in its segment
  std::vector<R> span_len;
  std::vector<bool> span_last;        // original span ends its segment
};

// Effects at x of the loads left of x (a cantilever built in at x):
// shear V, moment M, and the integrals I1 = int_0^x M, I2 = int_0^x int M.
template <class R>
struct Sums {
  R V{0}, M{0}, I1{0}, I2{0};
};

// A load q(tau) = w + k tau starting at tau = 0, integrated to u > 0.
// sign: +1 to add the load, -1 to remove it (the continuation past `d`).
template <class R>
void add_ramp(Sums<R>& s, const R& u, const R& w, const R& k, bool remove) {
  const R u2 = u * u, u3 = u2 * u, u4 = u3 * u, u5 = u4 * u;
  const R dV = w * u + k * u2 / R(2);
  const R dM = w * u2 / R(2) + k * u3 / R(6);
  const R d1 = w * u3 / R(6) + k * u4 / R(24);
  const R d2 = w * u4 / R(24) + k * u5 / R(120);
  if (remove) {
    s.V += dV; s.M += dM; s.I1 += d1; s.I2 += d2;
  } else {
    s.V -= dV; s.M -= dM; s.I1 -= d1; s.I2 -= d2;
  }
}

// Loads at exactly x are included when `incl` is true.
template <class R>
Sums<R> sums(const State<R>& st, const Segment<R>& sg, const R& x, bool incl) {
  Sums<R> s;
  for (std::size_t j = sg.first; j < sg.last; ++j) {
    const SpanLoad<R>& l = st.loads[j];
    switch (l.kind) {
      case Kind::Point:
        if (l.a < x || (incl && same(l.a, x))) {
          const R t = x - l.a;
          s.V -= l.p;
          s.M -= l.p * t;
          s.I1 -= l.p * t * t / R(2);
          s.I2 -= l.p * t * t * t / R(6);
        }
        break;
      case Kind::Couple:
        if (l.a < x || (incl && same(l.a, x))) {
          const R t = x - l.a;
          s.M += l.p;
          s.I1 += l.p * t;
          s.I2 += l.p * t * t / R(2);
        }
        break;
      case Kind::Ramp:
        // The load from c to d is the ramp w1 + s tau from c to infinity
        // minus its continuation (w2 + s tau') from d to infinity.
        if (l.a < x) add_ramp(s, R(x - l.a), l.p, l.s, false);
        if (l.d < x) add_ramp(s, R(x - l.d), l.w2, l.s, true);
        break;
    }
  }
  return s;
}

// Reciprocals of the small integers of the load formulas, made once per
// solve so that the loops over the spans multiply instead of divide (exact
// in rational arithmetic; a rounding in floating point).
template <class R>
struct Consts {
  R two = R(2), three = R(3), six = R(6);
  R half = R(1) / R(2), third = R(1) / R(3), quarter = R(1) / R(4), fifth = R(1) / R(5);
  R sixth = R(1) / R(6), r24 = R(1) / R(24), r120 = R(1) / R(120);
};

// True for an exact zero (false for NaN): a uniform load's slope.
template <class R>
TM_INLINE inline bool flat(const R& s) {
  return s <= R(0) && s >= R(0);
}

// Six times the first moments of the segment's free (simply supported)
// moment diagram about its left end (6 FL) and right end (6 FR), summed
// over the loads [l, end): the formulas of the derivation above, times 6.
// Summed in locals (registers, for double), returned as {6 FL, 6 FR}.
// One load's terms of free_moments6, added to FL6 and FR6 (L2 = L * L).
template <class R>
TM_INLINE inline void add_free_moments6(R& FL6, R& FR6, const SpanLoad<R>* l, const R& L, const R& L2,
                                        const Consts<R>& k) {
  switch (l->kind) {
    case Kind::Point: {
      const R b = L - l->a;
      const R pab = l->p * l->a * b;
      FL6 += pab * (L + l->a);
      FR6 += pab * (L + b);
      break;
    }
    case Kind::Couple: {
      const R a2 = l->a * l->a;
      FL6 += l->p * (L2 - k.three * a2);
      FR6 += l->p * (k.two * L2 - k.six * l->a * L + k.three * a2);
      break;
    }
    case Kind::Ramp: {
      const R& c = l->a;
      const R e = L - c, dl = l->d - c;
      const R d2 = dl * dl, d3 = d2 * dl, d4 = d3 * dl;
      R m0 = l->p * dl, m1 = l->p * d2 * k.half, m2 = l->p * d3 * k.third, m3 = l->p * d4 * k.quarter;
      if (!flat(l->s)) {
        const R d5 = d4 * dl;
        m0 += l->s * d2 * k.half;
        m1 += l->s * d3 * k.third;
        m2 += l->s * d4 * k.quarter;
        m3 += l->s * d5 * k.fifth;
      }
      const R c2 = c * c, e2 = e * e;
      FL6 += (L2 * c - c2 * c) * m0 + (L2 - k.three * c2) * m1 - k.three * c * m2 - m3;
      FR6 += (L2 * e - e2 * e) * m0 - (L2 - k.three * e2) * m1 - k.three * e * m2 + m3;
      break;
    }
  }
}
template <class R>
TM_INLINE inline std::pair<R, R> free_moments6(const SpanLoad<R>* l, const SpanLoad<R>* end, const R& L, const Consts<R>& k) {
  const R L2 = L * L;
  R FL6{0}, FR6{0};
  for (; l != end; ++l) add_free_moments6(FL6, FR6, l, L, L2, k);
  return {std::move(FL6), std::move(FR6)};
}

// What the statics and the node values need of a segment's loads [l, end):
// the effects at x = L of the loads left of L (as `sums` with incl false:
// a force or couple exactly at L left out), and the point forces and
// couples exactly at L and exactly at 0.
template <class R>
struct EndSums {
  Sums<R> s;
  R PL{0}, CL{0}, P0{0}, C0{0};
};
// The sums are kept in locals (registers, for double) while the loads are
// read; a ramp's terms are those of add_ramp with the constants of `k`.
template <class R>
TM_INLINE inline EndSums<R> end_sums(const SpanLoad<R>* l, const SpanLoad<R>* end, const R& L, const Consts<R>& k) {
  R V{0}, M{0}, I1{0}, I2{0}, PL{0}, CL{0}, P0{0}, C0{0};
  // The load w + slope tau from tau = 0, integrated to u > 0; `remove` for
  // the continuation past its end, which is taken off again.
  auto ramp = [&](const R& u, const R& w, const R& slope, bool flat_load, bool remove) TM_INLINE {
    const R u2 = u * u, u3 = u2 * u, u4 = u3 * u;
    R dV = w * u, dM = w * u2 * k.half, d1 = w * u3 * k.sixth, d2 = w * u4 * k.r24;
    if (!flat_load) {
      const R u5 = u4 * u;
      dV += slope * u2 * k.half;
      dM += slope * u3 * k.sixth;
      d1 += slope * u4 * k.r24;
      d2 += slope * u5 * k.r120;
    }
    if (remove) {
      V += dV; M += dM; I1 += d1; I2 += d2;
    } else {
      V -= dV; M -= dM; I1 -= d1; I2 -= d2;
    }
  };
  for (; l != end; ++l) {
    switch (l->kind) {
      case Kind::Point:
        if (l->a < L) {
          const R t = L - l->a;
          const R pt2 = l->p * t * t;
          V -= l->p;
          M -= l->p * t;
          I1 -= pt2 * k.half;
          I2 -= pt2 * t * k.sixth;
        } else if (same(l->a, L)) {
          PL += l->p;
        }
        if (is_zero(l->a)) P0 += l->p;
        break;
      case Kind::Couple:
        if (l->a < L) {
          const R t = L - l->a;
          M += l->p;
          I1 += l->p * t;
          I2 += l->p * t * t * k.half;
        } else if (same(l->a, L)) {
          CL += l->p;
        }
        if (is_zero(l->a)) C0 += l->p;
        break;
      case Kind::Ramp: {
        const bool fl = flat(l->s);
        if (l->a < L) ramp(R(L - l->a), l->p, l->s, fl, false);
        if (l->d < L) ramp(R(L - l->d), l->w2, l->s, fl, true);
        break;
      }
    }
  }
  EndSums<R> r;
  r.s.V = std::move(V); r.s.M = std::move(M); r.s.I1 = std::move(I1); r.s.I2 = std::move(I2);
  r.PL = std::move(PL); r.CL = std::move(CL); r.P0 = std::move(P0); r.C0 = std::move(C0);
  return r;
}

// Reserves `count` elements of `v`. The big arrays here are written once,
// front to back, straight after they are allocated, so at a million spans
// most of their cost is the page faults of the fresh memory (about 7 ns a
// byte on 4 KiB pages on the benchmark machine). On Linux, ask for
// transparent huge pages on such an array before its first write: one fault
// per 2 MiB. Only a hint to the kernel: nothing depends on it.
template <class T>
void reserve_fresh(std::vector<T>& v, std::size_t count) {
  v.reserve(count);
#if defined(__linux__) && defined(MADV_HUGEPAGE)
  constexpr std::uintptr_t huge = std::uintptr_t(1) << 21;
  const std::size_t bytes = count * sizeof(T);
  if (bytes < 4 * huge) return;
  const auto p = reinterpret_cast<std::uintptr_t>(v.data());
  const std::uintptr_t b = (p + huge - 1) & ~(huge - 1), e = (p + bytes) & ~(huge - 1);
  if (e > b) (void)madvise(reinterpret_cast<void*>(b), e - b, MADV_HUGEPAGE);
#endif
}

template <class R>
BasicPointValues<R> eval(const State<R>& st, std::size_t g, const R& x, bool after) {
  const Segment<R>& sg = st.seg[g];
  // At 0 the limit from inside (after loads at 0); at L from inside
  // (before loads at L); in between as asked.
  const bool incl = is_zero(x) ? true : (same(x, sg.L) ? false : after);
  const Sums<R> s = sums(st, sg, x, incl);
  BasicPointValues<R> p;
  p.shear = sg.V0 + s.V;
  p.moment = sg.MA + sg.V0 * x + s.M;
  const R I1 = sg.MA * x + sg.V0 * x * x / R(2) + s.I1;
  const R I2 = sg.MA * x * x / R(2) + sg.V0 * x * x * x / R(6) + s.I2;
  p.rotation = sg.theta0 - I1 * sg.invEI;
  p.deflection = sg.v0 + sg.theta0 * x - I2 * sg.invEI;
  return p;
}

// Values in ORIGINAL span `span` at `local`.
template <class R>
BasicPointValues<R> eval_span(const State<R>& st, std::size_t span, const R& local, bool after) {
  if (st.span_seg.empty()) {  // nothing merged: spans are the segments
    if (span >= st.seg.size()) return BasicPointValues<R>{};
    return eval(st, span, local, after);
  }
  if (span >= st.span_seg.size()) return BasicPointValues<R>{};
  const R& off = st.span_off[span];
  // At a merged (unsupported) node the limit from inside this span.
  if (is_zero(local) && off > R(0)) after = true;
  if (same(local, st.span_len[span]) && !st.span_last[span]) after = false;
  return eval(st, st.span_seg[span], R(off + local), after);
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

// ---- The lean path: the usual beam (every support pinned or roller, no
// hinge, no node load, span loads listed span by span) in three passes
// instead of seven: (1) validation, segments, load copies, load terms and
// the Thomas forward sweep, each row eliminated as soon as its two spans
// are read; (2) back substitution; (3) span statics and node results. It
// makes the SAME operations in the SAME order as the general path of
// solve() for such a beam (the same bits: tests/three_moment_test.cpp
// compares them), reading its inputs once; anything it does not cover, a
// fault or a bad pivot makes it return false, and solve() runs the general
// path, which gives its usual answer and reason.
template <class R>
struct LeanRow {
  R cp, dp;  // Thomas: modified super-diagonal, right-hand side
};

template <class R>
bool solve_lean(const BasicBeam<R>& beam, BasicSolution<R>& out) {
  const std::size_t n = beam.spans.size();
  const auto* const sup = beam.supports.data();
  const auto* const spans = beam.spans.data();
  const BasicLoad<R>* const bl = beam.loads.data();
  const std::size_t nl = beam.loads.size();
  const Consts<R> K;
  auto plain = [&](std::size_t i) TM_INLINE {
    return (sup[i].type == SupportType::Pinned || sup[i].type == SupportType::Roller) && !sup[i].hinge;
  };
  // Both ends first, before anything is allocated: a fixed or free end
  // (the commonest refusal) then costs the general path no wasted pass.
  if (!plain(0) || !plain(n)) return false;
  auto st = std::make_shared<State<R>>();
  reserve_fresh(st->seg, n);
  st->loads.allocate(nl);
  SpanLoad<R>* const loads = st->loads.data();
  FreshArray<LeanRow<R>> rows;
  rows.allocate(n + 1);
  LeanRow<R>* const rw = rows.data();

  // ---- Pass 1.
  // Node 0: known(0) of the general path: emit(0, 1, 0, 0), pivot 1.
  rw[0].cp = R(0) / R(1);
  rw[0].dp = R(0) / R(1);
  std::size_t li = 0, nload = 0;
  R pgl6{0}, pf{0}, ppsi{0};  // terms of the segment left of node g
  // Anything out of scope returns at once, before it is divided by (a
  // zero division throws in rational arithmetic).
  for (std::size_t g = 0; g < n; ++g) {
    const R& len = spans[g].length;
    const R& EI = spans[g].EI;
    if (!(plain(g + 1) && len > R(0) && EI > R(0) && finite(len) && finite(EI))) return false;
    st->seg.emplace_back();
    Segment<R>& sg = st->seg.back();
    sg.L = R(0) + len;  // the general path sums the segment's spans from 0
    sg.invEI = R(1) / EI;
    sg.v0 = sup[g].settlement;
    sg.first = nload;
    // free_moments6 of the segment, each load's terms added as it is copied.
    const R L2 = sg.L * sg.L;
    R FL6{0}, FR6{0};
    for (; li < nl && bl[li].index == g; ++li) {
      const BasicLoad<R>& l = bl[li];
      SpanLoad<R>& sl = loads[nload++];
      const R off{0};
      switch (l.type) {
        case LoadType::Point:
          if (l.on_node || l.at < R(0) || len < l.at) return false;
          sl.kind = Kind::Point;
          sl.a = off + l.at;
          sl.p = l.P;
          sl.d = sl.w2 = sl.s = R(0);
          break;
        case LoadType::Couple:
          if (l.on_node || l.at < R(0) || len < l.at) return false;
          sl.kind = Kind::Couple;
          sl.a = off + l.at;
          sl.p = l.C;
          sl.d = sl.w2 = sl.s = R(0);
          break;
        case LoadType::Udl:
        case LoadType::Linear: {
          if (l.on_node || l.from < R(0) || !(l.from < l.to) || len < l.to) return false;
          const R& w2 = l.type == LoadType::Udl ? l.w1 : l.w2;
          sl.kind = Kind::Ramp;
          sl.a = off + l.from;
          sl.d = off + l.to;
          sl.p = l.w1;
          sl.w2 = w2;
          if (l.type == LoadType::Udl) sl.s = R(0);
          else sl.s = (w2 - l.w1) / (l.to - l.from);
          break;
        }
      }
      add_free_moments6(FL6, FR6, &sl, sg.L, L2, K);
    }
    sg.last = nload;
    // The next load, if any, must be on a later span.
    if (li < nl && !(bl[li].index > g && bl[li].index < n)) return false;
    // terms(g).
    sg.invL = R(1) / sg.L;
    const R& invL = sg.invL;
    const R q = sg.invEI * invL;
    const R gl6 = FL6 * q, gr6 = FR6 * q, f = sg.L * sg.invEI;
    const R psi = (sup[g + 1].settlement - sup[g].settlement) * invL;
    if (g > 0) {  // the three-moment equation at support g
      const R d = -pgl6 - gr6 + K.six * (ppsi - psi);
      const R a = pf, b = K.two * (pf + f);
      const R piv = b - a * rw[g - 1].cp;
      if (is_zero(piv) || !finite(piv)) return false;
      const R rhs = d - a * rw[g - 1].dp;
      rw[g].cp = f / piv;
      rw[g].dp = rhs / piv;
    }
    pgl6 = gl6;
    pf = f;
    ppsi = psi;
  }
  {  // Node n: known(0 - 0): emit(0, 1, 0, 0) after row n - 1.
    const R zero{0}, one{1};
    const R piv = one - zero * rw[n - 1].cp;
    if (is_zero(piv) || !finite(piv)) return false;
    const R rhs = R(zero - zero) - zero * rw[n - 1].dp;
    rw[n].cp = zero / piv;
    rw[n].dp = rhs / piv;
  }

  // ---- Pass 2: back substitution. The general path refuses a non-finite
  // support moment; here each one is tested in pass 3 with its node.
  for (std::size_t i = n; i-- > 0;) rw[i].dp = rw[i].dp - rw[i].cp * rw[i + 1].dp;

  // ---- Pass 3: span statics, rotations and deflections, node results.
  reserve_fresh(out.nodes, n + 1);
  bool bad = false;
  R x{0};
  BasicPointValues<R> lv;  // values just left of node g
  auto node = [&](std::size_t i, const R& settlement, const R& left_shear, const R& right_shear) TM_INLINE
      -> BasicNodeResult<R>& {
    out.nodes.emplace_back();
    BasicNodeResult<R>& nr = out.nodes.back();
    nr.x = x;
    nr.deflection = settlement;
    const R Vl = i > 0 ? left_shear : R(0);
    const R Vr = i < n ? right_shear : R(0);
    nr.reaction_force = Vr - Vl + R(0);
    return nr;
  };
  // The node's values and the support moment `Ms` at it are finite (the
  // general path tests both; reaction_moment stays 0 here). For built-in
  // floats one test of a sum of x - x, which is 0 for a finite x and NaN
  // otherwise (NaN then propagates through the sum).
  auto check = [&](const BasicNodeResult<R>& nr, const R& Ms) TM_INLINE {
    bool fin;
    if constexpr (std::is_floating_point_v<R>) {
      fin = std::isfinite(((nr.deflection - nr.deflection) + (nr.reaction_force - nr.reaction_force)) +
                          ((nr.rotation_left - nr.rotation_left) + (nr.rotation_right - nr.rotation_right)) +
                          (Ms - Ms));
    } else {
      fin = finite(nr.deflection) & finite(nr.reaction_force) & finite(nr.rotation_left) &
            finite(nr.rotation_right) & finite(Ms);
    }
    bad = bad | !fin;
  };
  R MA = rw[0].dp;
  for (std::size_t g = 0; g < n; ++g) {
    Segment<R>& sg = st->seg[g];
    const R& L = sg.L;
    const R MB = rw[g + 1].dp;
    const R& invL = sg.invL;
    const EndSums<R> es = end_sums(loads + sg.first, loads + sg.last, L, K);
    const R& vA = sg.v0;  // the settlement of node g, set in pass 1
    const R& vB = g + 1 < n ? st->seg[g + 1].v0 : sup[n].settlement;
    sg.MA = MA;
    sg.V0 = (MB - MA - (es.s.M + es.CL)) * invL;
    const R L2 = L * L;
    const R I1 = MA * L + sg.V0 * L2 * K.half + es.s.I1;
    const R I2 = MA * L2 * K.half + sg.V0 * L2 * L * K.sixth + es.s.I2;
    sg.theta0 = (vB - vA) * invL + I2 * sg.invEI * invL;
    // Node g: left values `lv` (from segment g - 1), right ones at 0 of g.
    BasicNodeResult<R>& nr = node(g, vA, lv.shear, R(sg.V0 - es.P0));
    if (g > 0) nr.moment_left = lv.moment;
    nr.moment_right = MA + es.C0;
    nr.rotation_left = g > 0 ? lv.rotation : sg.theta0;
    nr.rotation_right = sg.theta0;
    check(nr, MA);
    x += L;
    lv.shear = sg.V0 + es.s.V;
    lv.moment = sg.MA + sg.V0 * L + es.s.M;
    lv.rotation = sg.theta0 - I1 * sg.invEI;
    lv.deflection = sg.v0 + sg.theta0 * L - I2 * sg.invEI;
    MA = MB + R(0);
  }
  {
    BasicNodeResult<R>& nr = node(n, sup[n].settlement, lv.shear, lv.shear);
    nr.moment_left = lv.moment;
    nr.rotation_left = lv.rotation;
    nr.rotation_right = lv.rotation;
    check(nr, MA);
  }
  rows.release();
  if (bad) {
    out.nodes.clear();
    return false;
  }
  std::shared_ptr<const State<R>> cst = std::move(st);
  out.status = MethodStatus::Ok;
  out.at = [cst](std::size_t span, const R& local, bool after) { return eval_span(*cst, span, local, after); };
  return true;
}

}  // namespace

template <class R>
BasicSolution<R> solve(const BasicBeam<R>& beam, const std::vector<BasicStation<R>>& stations) {
  (void)stations;  // `at` is exact everywhere; the grid is not needed.
  const std::size_t n = beam.spans.size();
  if (n == 0) return failed<R>("beam has no spans");
  if (beam.supports.size() != n + 1 || beam.labels.size() != n + 1)
    return failed<R>("supports/labels do not match the number of spans");
  const auto& sup = beam.supports;
  auto label = [&](std::size_t i) { return "node " + beam.labels[i]; };
  {
    BasicSolution<R> lean;
    if (solve_lean(beam, lean)) return lean;
  }

  // ---- Scope and sanity.
  for (std::size_t s = 0; s < n; ++s)
    if (!(beam.spans[s].length > R(0)) || !(beam.spans[s].EI > R(0)) ||
        !finite(beam.spans[s].length) || !finite(beam.spans[s].EI))
      return failed<R>("span " + std::to_string(s + 1) + " has a non-positive length or EI");
  std::size_t free_interior = 0, fixed_interior = 0;
  for (std::size_t i = 0; i <= n; ++i) {
    const bool interior = i > 0 && i < n;
    switch (sup[i].type) {
      case SupportType::Spring: return not_applicable<R>("spring support at " + label(i));
      case SupportType::Guided: return not_applicable<R>("guided support at " + label(i));
      default: break;
    }
    if (sup[i].hinge) {
      if (!interior) return not_applicable<R>("hinge at end " + label(i));
      if (sup[i].type == SupportType::Free) return not_applicable<R>("hinge at unsupported " + label(i));
      if (sup[i].type == SupportType::Fixed) return not_applicable<R>("hinge at fixed support " + label(i));
    }
    if (sup[i].type == SupportType::Free && !is_zero(sup[i].settlement))
      return not_applicable<R>("settlement at unsupported " + label(i));
    if (interior && sup[i].type == SupportType::Free && !same(beam.spans[i - 1].EI, beam.spans[i].EI))
      return not_applicable<R>("unsupported " + label(i) + " between spans of different EI");
    if (interior && sup[i].type == SupportType::Free) ++free_interior;
    if (interior && sup[i].type == SupportType::Fixed) ++fixed_interior;
  }

  // ---- Segments: merge spans across unsupported interior nodes. Without
  // such nodes (the usual beam) a span is its own segment and `real` (the
  // original node at each segment end) is not stored.
  const bool merged = free_interior > 0;
  const std::size_t m = n - free_interior;  // segments
  std::vector<std::size_t> real;
  if (merged) {
    real.reserve(m + 1);
    real.push_back(0);
    for (std::size_t i = 1; i < n; ++i)
      if (sup[i].type != SupportType::Free) real.push_back(i);
    real.push_back(n);
  }
  auto real_of = [&](std::size_t g) TM_INLINE { return merged ? real[g] : g; };
  auto st = std::make_shared<State<R>>();
  reserve_fresh(st->seg, m);
  if (merged) {
    st->span_seg.resize(n);
    st->span_off.resize(n);
    st->span_len.resize(n);
    st->span_last.resize(n);
  }
  for (std::size_t g = 0; g < m; ++g) {
    R off{0};
    for (std::size_t s = real_of(g); s < real_of(g + 1); ++s) {
      if (merged) {
        st->span_seg[s] = g;
        st->span_off[s] = off;
        st->span_len[s] = beam.spans[s].length;
        st->span_last[s] = s + 1 == real[g + 1];
      }
      off += beam.spans[s].length;
    }
    Segment<R> sg;
    sg.L = std::move(off);
    sg.invEI = R(1) / beam.spans[real_of(g)].EI;
    st->seg.push_back(std::move(sg));
  }
  auto seg_of = [&](std::size_t span) TM_INLINE { return merged ? st->span_seg[span] : span; };
  auto off_of = [&](std::size_t span) TM_INLINE { return merged ? st->span_off[span] : R(0); };
  // Written in place: a copy of the finished struct costs more than filling it.
  auto set_span_load = [&](SpanLoad<R>& sl, const BasicLoad<R>& l) TM_INLINE {
    const R off = off_of(l.index);
    switch (l.type) {
      case LoadType::Point:
        sl.kind = Kind::Point; sl.a = off + l.at; sl.p = l.P; sl.d = sl.w2 = sl.s = R(0);  // all written
        break;
      case LoadType::Couple:
        sl.kind = Kind::Couple; sl.a = off + l.at; sl.p = l.C; sl.d = sl.w2 = sl.s = R(0);
        break;
      case LoadType::Udl:
      case LoadType::Linear: {
        const R& w2 = l.type == LoadType::Udl ? l.w1 : l.w2;
        sl.kind = Kind::Ramp;
        sl.a = off + l.from;
        sl.d = off + l.to;
        sl.p = l.w1;
        sl.w2 = w2;
        if (l.type == LoadType::Udl) sl.s = R(0);  // (w - w)/(to - from), without the division
        else sl.s = (w2 - l.w1) / (l.to - l.from);
        break;
      }
    }
  };

  // ---- Loads: validation; node loads summed (stored only if there are
  // any). Span loads listed span by span (the usual order) are stored as
  // they are read; in any other order, or with merged spans, they are
  // bucketed by segment afterwards.
  bool any_node_load = false;
  bool in_order = !merged;
  std::size_t last_span = 0;
  st->loads.allocate(beam.loads.size());  // written by index; cut to `nload` after
  std::size_t nload = 0;
  std::size_t next_span = 0;  // in order: spans before it have their `first`
  for (const auto& l : beam.loads) {
    if (l.on_node) {
      if (l.index > n) return failed<R>("node load on a node that does not exist");
      if (l.type != LoadType::Point && l.type != LoadType::Couple)
        return not_applicable<R>(std::string(load_type_name(l.type)) + " load on " + label(l.index));
      any_node_load = true;
      continue;
    }
    if (l.index >= n) return failed<R>("span load on a span that does not exist");
    const R& L = beam.spans[l.index].length;
    if (l.type == LoadType::Point || l.type == LoadType::Couple) {
      if (l.at < R(0) || L < l.at) return failed<R>("load position outside span " + std::to_string(l.index + 1));
    } else if (l.from < R(0) || !(l.from < l.to) || L < l.to) {
      return failed<R>("load extent outside span " + std::to_string(l.index + 1));
    }
    if (!in_order) continue;
    if (l.index < last_span) {
      in_order = false;
      continue;
    }
    last_span = l.index;
    for (; next_span <= l.index; ++next_span) st->seg[next_span].first = st->seg[next_span].last = nload;
    set_span_load(st->loads[nload++], l);
    st->seg[l.index].last = nload;
  }
  std::vector<R> nodeP, nodeC;
  if (any_node_load) {
    nodeP.assign(n + 1, R(0));
    nodeC.assign(n + 1, R(0));
    for (const auto& l : beam.loads) {
      if (!l.on_node) continue;
      if (l.type == LoadType::Point) nodeP[l.index] += l.P;
      else nodeC[l.index] += l.C;
    }
  }
  auto node_P = [&](std::size_t i) TM_INLINE { return nodeP.empty() ? R(0) : nodeP[i]; };
  auto node_C = [&](std::size_t i) TM_INLINE { return nodeC.empty() ? R(0) : nodeC[i]; };
  if (any_node_load)  // (a couple at a hinge is a node load)
    for (std::size_t i = 1; i < n; ++i)
      if (sup[i].hinge && !is_zero(node_C(i))) return not_applicable<R>("couple at hinge " + label(i));

  if (in_order) {  // the ranges are set; the spans after the last loaded one have none
    st->loads.shrink(nload);
    for (; next_span < m; ++next_span) st->seg[next_span].first = st->seg[next_span].last = nload;
  } else {  // bucket the loads by segment: count (in `last`), offsets, fill
    for (auto& sg : st->seg) sg.last = 0;
    for (const auto& l : beam.loads)
      if (!l.on_node) ++st->seg[seg_of(l.index)].last;
    if (merged)
      for (std::size_t i = 1; i < n; ++i)
        if (sup[i].type == SupportType::Free)
          st->seg[seg_of(i)].last += (is_zero(node_P(i)) ? 0 : 1) + (is_zero(node_C(i)) ? 0 : 1);
    std::size_t total = 0;
    for (auto& sg : st->seg) {
      const std::size_t count = sg.last;
      sg.first = sg.last = total;
      total += count;
    }
    st->loads.allocate(total);
    auto push = [&](std::size_t g, const SpanLoad<R>& sl) { st->loads[st->seg[g].last++] = sl; };
    for (const auto& l : beam.loads)
      if (!l.on_node) set_span_load(st->loads[st->seg[seg_of(l.index)].last++], l);
    // Loads on unsupported interior nodes become loads of the merged span.
    if (merged)
      for (std::size_t i = 1; i < n; ++i) {
        if (sup[i].type != SupportType::Free) continue;
        SpanLoad<R> sl{};
        sl.a = st->span_off[i];
        if (!is_zero(node_P(i))) { sl.kind = Kind::Point; sl.p = node_P(i); push(seg_of(i), sl); }
        if (!is_zero(node_C(i))) { sl.kind = Kind::Couple; sl.p = node_C(i); push(seg_of(i), sl); }
      }
  }
  const SpanLoad<R>* const loads = st->loads.data();
  const Consts<R> K;

  // ---- The tridiagonal system. Unknowns, in order along the beam: one
  // node-side moment per real node (MA of the segment to its right and MB
  // of the segment to its left are then tied by MA = MB + C), two at an
  // interior fixed node (MB left, MA right: the reaction couple takes the
  // difference). Each row is built and eliminated at once (Thomas forward
  // sweep), so no matrix is stored; each segment's load terms are made
  // once and serve the rows at both its ends.
  auto type_of = [&](std::size_t k) TM_INLINE { return sup[real_of(k)].type; };
  auto settle = [&](std::size_t k) TM_INLINE -> const R& { return sup[real_of(k)].settlement; };
  auto offA = [&](std::size_t g) TM_INLINE {  // MA_g = (unknown at node g) + offA(g)
    return g > 0 && type_of(g) != SupportType::Fixed ? node_C(real_of(g)) : R(0);
  };
  struct Terms {
    R gl6, gr6;  // 6 FL/(EI L), 6 FR/(EI L)
    R f;         // L/EI
    R psi;       // chord rotation (vB - vA)/L
  };
  auto terms = [&](std::size_t g) TM_INLINE {
    Segment<R>& sg = st->seg[g];
    sg.invL = R(1) / sg.L;
    const R& invL = sg.invL;
    const R& invEI = sg.invEI;
    const auto fm = free_moments6(loads + sg.first, loads + sg.last, sg.L, K);
    const R q = invEI * invL;
    return Terms{fm.first * q, fm.second * q, sg.L * invEI, (settle(g + 1) - settle(g)) * invL};
  };

  const bool left_free = type_of(0) == SupportType::Free;
  const bool right_free = type_of(m) == SupportType::Free;
  if (m == 1 && left_free && right_free) return failed<R>("mechanism: no support");
  R V0_left{0}, V0_right{0}, MB_left{0}, MA_right{0};
  if (left_free) {
    // Overhang to the left, by statics from the free end: MA = C0, V0 = -P0.
    if (sup[real_of(1)].hinge) return failed<R>("mechanism: hinge at " + label(real_of(1)) + " next to a free end");
    const Segment<R>& sg = st->seg[0];
    const Sums<R> s = sums(*st, sg, sg.L, true);
    V0_left = R(0) - node_P(real_of(0));
    MB_left = node_C(real_of(0)) + V0_left * sg.L + s.M;
  }
  if (right_free) {
    // Overhang to the right: MB = -Cm, V(L) = Pm.
    if (m > 1 && sup[real_of(m - 1)].hinge)
      return failed<R>("mechanism: hinge at " + label(real_of(m - 1)) + " next to a free end");
    const Segment<R>& sg = st->seg[m - 1];
    const Sums<R> s = sums(*st, sg, sg.L, true);
    V0_right = node_P(real_of(m)) - s.V;
    MA_right = R(0) - node_C(real_of(m)) - V0_right * sg.L - s.M;
  }

  const std::size_t nv = m + 1 + fixed_interior;
  struct Row {
    R cp, dp;  // Thomas: modified super-diagonal, right-hand side
  };
  FreshArray<Row> rows;
  rows.allocate(nv);     // written by index, row `nrow` next
  std::size_t nrow = 0;
  bool ok = true;
  // One row a x[i-1] + b x[i] + c x[i+1] = d. No pivoting: the rows are
  // strictly diagonally dominant (2(f1+f2) > f1+f2; fixed rows 2f > f;
  // known rows 1 > 0), so no pivot vanishes.
  auto emit = [&](const R& a, const R& b, const R& c, const R& d) TM_INLINE {
    if (nrow == nv) {  // more rows than unknowns: cannot happen, refused below
      ok = false;
      return;
    }
    const R piv = nrow == 0 ? b : R(b - a * rows[nrow - 1].cp);
    if (is_zero(piv) || !finite(piv)) {
      ok = false;
      rows[nrow].cp = rows[nrow].dp = R(0);  // read by the next row
      ++nrow;
      return;
    }
    const R rhs = nrow == 0 ? d : R(d - a * rows[nrow - 1].dp);
    Row& r = rows[nrow++];
    r.cp = c / piv;
    r.dp = rhs / piv;
  };
  auto known = [&](const R& value) TM_INLINE { emit(R(0), R(1), R(0), value); };
  // theta(0) = 0 of segment g (fixed at its left end), unknown MA then MB.
  auto fixed_left_row = [&](const Terms& t) TM_INLINE {
    emit(R(0), K.two * t.f, t.f, R(-t.gr6 - K.six * t.psi));
  };
  // theta(L) = 0 of segment g (fixed at its right end), unknown MA then MB.
  auto fixed_right_row = [&](std::size_t g, const Terms& t) TM_INLINE {
    emit(t.f, K.two * t.f, R(0), R(-t.gl6 + K.six * t.psi - t.f * offA(g)));
  };
  Terms prev{}, cur = terms(0);  // the segments left and right of node k
  // Node 0.
  if (type_of(0) != SupportType::Fixed) known(node_C(real_of(0)));  // beyond the end M = 0
  else if (m == 1 && right_free) known(MA_right);                      // cantilever
  else fixed_left_row(cur);
  for (std::size_t k = 1; k < m; ++k) {
    std::swap(prev, cur);
    cur = terms(k);
    const bool lt = left_free && k == 1, rt = right_free && k == m - 1;
    if (type_of(k) == SupportType::Fixed) {
      if (lt) known(MB_left);
      else fixed_right_row(k - 1, prev);
      if (rt) known(MA_right);
      else fixed_left_row(cur);
      continue;
    }
    if (lt && rt) return failed<R>("mechanism: overhangs either side of " + label(real_of(k)));
    if (lt) {
      known(MB_left);
    } else if (rt) {
      known(R(MA_right - node_C(real_of(k))));
    } else if (sup[real_of(k)].hinge) {
      known(R(0));
    } else {  // the three-moment equation at support k
      R d = -prev.gl6 - cur.gr6 + K.six * (prev.psi - cur.psi);
      if (any_node_load) d = d - prev.f * offA(k - 1) - K.two * cur.f * offA(k);
      emit(prev.f, K.two * (prev.f + cur.f), cur.f, d);
    }
  }
  // Node m.
  if (type_of(m) != SupportType::Fixed) known(R(R(0) - node_C(real_of(m))));
  else if (m == 1 && left_free) known(MB_left);
  else fixed_right_row(m - 1, cur);
  if (!ok || nrow != nv) return failed<R>("zero or non-finite pivot in the three-moment system");
  if (!finite(rows[nv - 1].dp)) return failed<R>("non-finite support moment");
  for (std::size_t i = nv - 1; i-- > 0;) {
    rows[i].dp = rows[i].dp - rows[i].cp * rows[i + 1].dp;
    if (!finite(rows[i].dp)) return failed<R>("non-finite support moment");
  }
  if (right_free && type_of(m - 1) != SupportType::Fixed && (m - 1 == 0 || (m - 1 == 1 && left_free)))
    return failed<R>("mechanism near " + label(real_of(m - 1)));
  if (left_free && type_of(1) != SupportType::Fixed && (m == 1 || (m == 2 && right_free)))
    return failed<R>("mechanism near " + label(real_of(1)));

  // ---- Span statics from the support moments, rotations and deflections,
  // and the node results, in one pass along the beam. A left overhang
  // takes its rotation from segment 1, so segment 0 is finished (and its
  // nodes written) after segment 1.
  struct Done {
    EndSums<R> es;
    R MB;      // node-side moment at the right end
    R I1, I2;  // int_0^L M and int_0^L int M
  };
  auto finish = [&](std::size_t g, const R& MA, const R& MB) TM_INLINE {
    Segment<R>& sg = st->seg[g];
    const R& L = sg.L;
    Done d{end_sums(loads + sg.first, loads + sg.last, L, K), MB, R(0), R(0)};
    const R& invL = sg.invL;
    sg.MA = MA;
    if (g == 0 && left_free) sg.V0 = V0_left;
    else if (g == m - 1 && right_free) sg.V0 = V0_right;
    else sg.V0 = (MB - MA - (d.es.s.M + d.es.CL)) * invL;  // statics with the loads at L
    const R L2 = L * L;
    d.I1 = MA * L + sg.V0 * L2 * K.half + d.es.s.I1;
    d.I2 = MA * L2 * K.half + sg.V0 * L2 * L * K.sixth + d.es.s.I2;
    if (!((g == 0 && left_free) || (g == m - 1 && right_free))) {
      sg.v0 = settle(g);
      sg.theta0 = (settle(g + 1) - settle(g)) * invL + d.I2 * sg.invEI * invL;  // from v(L) = settlement
    }
    return d;
  };

  BasicSolution<R> out;
  reserve_fresh(out.nodes, n + 1);
  bool bad = false;
  R x{0};                   // global x of the next node
  BasicPointValues<R> lv;   // values just left of the next node
  R Ml{0};                  // MB of the segment ending at the next node
  auto emit_node = [&](std::size_t i, const BasicPointValues<R>& left, const BasicPointValues<R>& right,
                       const R& Mr) TM_INLINE {
    out.nodes.emplace_back();
    BasicNodeResult<R>& nr = out.nodes.back();  // filled in place
    nr.x = x;
    if (i < n) x += beam.spans[i].length;
    if (i > 0) nr.moment_left = left.moment;
    if (i < n) nr.moment_right = right.moment;
    nr.rotation_left = i > 0 ? left.rotation : right.rotation;
    nr.rotation_right = i < n ? right.rotation : left.rotation;
    nr.deflection = i < n ? right.deflection : left.deflection;
    const SupportType t = sup[i].type;
    if (restrains_deflection(t)) {
      nr.deflection = sup[i].settlement;
      const R Vl = i > 0 ? left.shear : R(0);
      const R Vr = i < n ? right.shear : R(0);
      nr.reaction_force = Vr - Vl + node_P(i);  // V jumps by +R - P
    }
    if (t == SupportType::Fixed) {  // a fixed node ends segments: Ml, Mr are theirs
      nr.rotation_left = nr.rotation_right = R(0);
      nr.reaction_moment = (i > 0 ? Ml : R(0)) + node_C(i) - (i < n ? Mr : R(0));  // M jumps by +C - couple
    }
    // Without short-circuits: one test of the five, not five branches.
    const bool fin = finite(nr.deflection) & finite(nr.reaction_force) & finite(nr.reaction_moment) &
                     finite(nr.rotation_left) & finite(nr.rotation_right);
    bad = bad | !fin;
  };
  // The nodes from the left end of segment g up to (not including) its
  // right end; then `lv` and `Ml` for the node at its right end.
  auto emit_segment = [&](std::size_t g, const Done& d) TM_INLINE {
    const Segment<R>& sg = st->seg[g];
    const std::size_t i0 = real_of(g), i1 = real_of(g + 1);
    BasicPointValues<R> rv;  // inside segment g at 0: after the loads at 0
    rv.shear = sg.V0 - d.es.P0;
    rv.moment = sg.MA + d.es.C0;
    rv.rotation = sg.theta0;
    rv.deflection = sg.v0;
    emit_node(i0, lv, rv, sg.MA);
    for (std::size_t i = i0 + 1; i < i1; ++i)  // unsupported nodes inside a merged segment
      emit_node(i, eval_span(*st, i - 1, beam.spans[i - 1].length, false), eval_span(*st, i, R(0), true), R(0));
    // Inside segment g at L: before the loads at L.
    const R& L = sg.L;
    lv.shear = sg.V0 + d.es.s.V;
    lv.moment = sg.MA + sg.V0 * L + d.es.s.M;
    lv.rotation = sg.theta0 - d.I1 * sg.invEI;
    lv.deflection = sg.v0 + sg.theta0 * L - d.I2 * sg.invEI;
    Ml = d.MB;
  };

  {
    std::size_t v = 0;
    R MA = rows[v++].dp;  // MA of segment 0
    Done d0{};            // segment 0 when it is a left overhang
    for (std::size_t g = 0; g < m; ++g) {
      const std::size_t k = g + 1;  // the node at its right end
      R MB{0}, MA_next{0};
      if (k == m) {
        MB = rows[v].dp;
      } else if (type_of(k) == SupportType::Fixed) {
        MB = rows[v++].dp;
        MA_next = rows[v++].dp;
      } else {
        MB = rows[v++].dp;
        MA_next = MB + node_C(real_of(k));
      }
      Done d = finish(g, MA, MB);
      if (g == m - 1 && right_free) {  // integrate outward from the support's rotation
        Segment<R>& sg = st->seg[g];
        sg.theta0 = type_of(g) != SupportType::Fixed ? lv.rotation : R(0);
        sg.v0 = settle(g);
      }
      if (g == 0 && left_free && m > 1) {
        d0 = std::move(d);  // waits for segment 1
      } else {
        if (g == 0 && left_free) d0 = std::move(d);
        if ((g == 0 || g == 1) && left_free) {  // integrate back from the support's rotation
          Segment<R>& s0 = st->seg[0];
          const R th = type_of(1) != SupportType::Fixed ? st->seg[1].theta0 : R(0);
          s0.theta0 = th + d0.I1 * s0.invEI;
          s0.v0 = settle(1) - s0.theta0 * s0.L + d0.I2 * s0.invEI;
          emit_segment(0, d0);
        }
        if (!(g == 0 && left_free)) emit_segment(g, d);
      }
      MA = std::move(MA_next);
    }
    emit_node(n, lv, lv, R(0));
  }
  rows.release();
  if (bad) return failed<R>("non-finite result");
  std::shared_ptr<const State<R>> cst = std::move(st);
  out.status = MethodStatus::Ok;
  out.at = [cst](std::size_t span, const R& local, bool after) { return eval_span(*cst, span, local, after); };
  return out;
}

template BasicSolution<double> solve<double>(const BasicBeam<double>&, const std::vector<BasicStation<double>>&);
template BasicSolution<Extended> solve<Extended>(const BasicBeam<Extended>&,
                                                 const std::vector<BasicStation<Extended>>&);
template BasicSolution<Exact> solve<Exact>(const BasicBeam<Exact>&, const std::vector<BasicStation<Exact>>&);

}  // namespace trivet::three_moment
