// trivet three-moment method: a solved beam, span by span, and the values
// inside a span (what Solution::at returns).
//
// Private to methods/three_moment. Conventions of methods/beam/beam.h.
#pragma once

#include <algorithm>
#include <array>
#include <cstdint>
#include <memory>
#include <string>
#include <vector>

#include "methods/three_moment/load_terms.h"
#include "methods/beam/memory_advice.h"
#include "methods/beam/status.h"

namespace trivet::three_moment::detail {

// Large fresh arrays: the kernel's huge pages (methods/beam/memory_advice.h).
using trivet::advise_huge;
using trivet::reserve_huge;

// An array written once by index straight after it is allocated. Unlike
// std::vector::resize, the elements are default-initialised, so an array of
// built-in numbers is not zeroed first and then written again.
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
  std::unique_ptr<T[]> p_;
  std::size_t n_ = 0;
};

// One span of the solved model (on the tridiagonal path, spans joined at
// unsupported nodes of equal EI are merged into one segment).
template <class R>
struct Segment {
  R L{1}, invEI{1};  // length, 1/EI
  R invL{1};         // 1/L
  R MA{0};           // node-side moment at the left end (before loads at 0)
  R V0{0};           // shear just right of the left end (before loads at 0)
  R theta0{0};       // rotation at the left end
  R v0{0};           // deflection at the left end
  std::size_t first = 0, last = 0;  // load range in State::loads
};

// The loads of a segment with many of them, for `at` in O(log N): the
// loads' effects (Sums, load_terms.h) written as polynomials in x, and their
// sums over the loads sorted by position. Each load contributes, for
// x past its position e (u = x - e), to quantity q (0: V, 1: M, 2: I1,
// 3: I2, each the integral of the one before):
//   point P:          -P u^q/q!
//   couple C:          C u^(q-1)/(q-1)!   (q >= 1)
//   ramp w + s (x-e): -(w u^(q+1)/(q+1)! + s u^(q+2)/(q+2)!), and the same
//                      with the signs turned at the ramp's end (w2, s),
// as in point_effects, couple_effects and ramp_effects. Expanding u^k
// = sum_j C(k, j) x^j (-e)^(k-j), the sum over the loads left of x is, for
// each q, a polynomial in x (degree at most 5) whose coefficients are sums
// over those loads: prefix sums over the sorted loads, so `at` needs one
// binary search and four polynomial values. Exact in rational arithmetic;
// in floating point the terms are of the size of the per-load terms (local
// positions, 0 <= e <= L), so the rounding is of the same order.
template <class R>
struct LoadIndex {
  std::vector<R> pos;                  // sorted event positions (a ramp has two)
  std::vector<std::array<R, 24>> pre;  // pre[k][6 q + j]: sum over events [0, k)
};

template <class R>
struct State {
  std::vector<Segment<R>> seg;
  FreshArray<SpanLoad<R>> loads;
  Consts<R> K;
  std::vector<LoadIndex<R>> index;  // per segment; empty: sum the loads directly
  // Filled only when spans were merged (else a span is its own segment):
  std::vector<std::size_t> span_seg;  // original span -> segment
  std::vector<R> span_off;            // original span -> offset in its segment
  std::vector<R> span_len;
  std::vector<bool> span_last;        // original span ends its segment
};

// Builds the index of the loads [l, end).
template <class R>
LoadIndex<R> build_index(const SpanLoad<R>* l, const SpanLoad<R>* end) {
  struct Ev {
    R e;
    std::array<R, 24> c;  // this event's coefficient of x^j in quantity q: [6 q + j]
  };
  std::vector<Ev> ev;
  // Adds f * u^k / k! to quantity q, u = x - e.
  auto add = [](Ev& v, int q, int k, const R& f) {
    if (q > 3 || k < 0) return;
    R fact{1};
    for (int i = 2; i <= k; ++i) fact *= R(i);
    R base = f / fact;  // f/k!, times C(k, j) (-e)^(k-j) for each j
    // powers of (-e)
    R pw[6] = {R(1), R(0), R(0), R(0), R(0), R(0)};
    for (int i = 1; i <= k; ++i) pw[i] = pw[i - 1] * R(-v.e);
    R binom{1};  // C(k, j), j from 0
    for (int j = 0; j <= k; ++j) {
      v.c[q * 6 + j] += base * binom * pw[k - j];
      binom = binom * R(k - j) / R(j + 1);
    }
  };
  auto fresh = [](const R& e) {
    Ev v{e, {}};
    v.c.fill(R(0));
    return v;
  };
  for (; l != end; ++l) {
    switch (l->kind) {
      case Kind::Point: {
        Ev v = fresh(l->a);
        for (int q = 0; q < 4; ++q) add(v, q, q, R(-l->p));
        ev.push_back(std::move(v));
        break;
      }
      case Kind::Couple: {
        Ev v = fresh(l->a);
        for (int q = 1; q < 4; ++q) add(v, q, q - 1, l->p);
        ev.push_back(std::move(v));
        break;
      }
      case Kind::Ramp: {
        Ev a = fresh(l->a), d = fresh(l->d);
        for (int q = 0; q < 4; ++q) {
          add(a, q, q + 1, R(-l->p));
          add(a, q, q + 2, R(-l->s));
          add(d, q, q + 1, l->w2);
          add(d, q, q + 2, l->s);
        }
        ev.push_back(std::move(a));
        ev.push_back(std::move(d));
        break;
      }
    }
  }
  std::stable_sort(ev.begin(), ev.end(), [](const Ev& x, const Ev& y) { return x.e < y.e; });
  LoadIndex<R> ix;
  ix.pos.reserve(ev.size());
  ix.pre.reserve(ev.size() + 1);
  std::array<R, 24> run;
  run.fill(R(0));
  ix.pre.push_back(run);
  for (const Ev& v : ev) {
    ix.pos.push_back(v.e);
    for (int i = 0; i < 24; ++i) run[i] += v.c[i];
    ix.pre.push_back(run);
  }
  return ix;
}

// The effects at x of the indexed loads: those before x, and the point
// forces and couples at x itself when `incl` (a ramp adds nothing at its
// own start or end, where u = 0).
template <class R>
Sums<R> indexed_sums(const LoadIndex<R>& ix, const R& x, bool incl) {
  std::size_t k = static_cast<std::size_t>(std::lower_bound(ix.pos.begin(), ix.pos.end(), x) - ix.pos.begin());
  if (incl) k = static_cast<std::size_t>(std::upper_bound(ix.pos.begin(), ix.pos.end(), x) - ix.pos.begin());
  const std::array<R, 24>& c = ix.pre[k];
  auto poly = [&](int q) {
    R v = c[q * 6 + 5];
    for (int j = 4; j >= 0; --j) v = v * x + c[q * 6 + j];
    return v;
  };
  Sums<R> s;
  s.V = poly(0);
  s.M = poly(1);
  s.I1 = poly(2);
  s.I2 = poly(3);
  return s;
}

// Segments with more loads than this get an index for `at`; with fewer,
// summing the loads directly is as fast and rounds as the other paths do.
constexpr std::size_t kIndexFrom = 32;

// Values at x in segment g. At 0 the limit from inside (after loads at 0);
// at L from inside (before loads at L); in between as asked. With the
// left-end moment MA, shear V0, rotation theta0 and deflection v0:
//   V = V0 + Vc,  M = MA + V0 x + Mc,
//   EI theta = EI theta0 - int_0^x M = EI theta0 - (MA x + V0 x^2/2 + I1c),
//   EI v = EI v0 + EI theta0 x - (MA x^2/2 + V0 x^3/6 + I2c),
// from EI v'' = -M (v down +, rotation clockwise +).
template <class R>
BasicPointValues<R> eval(const State<R>& st, std::size_t g, const R& x, bool after) {
  const Segment<R>& sg = st.seg[g];
  const Consts<R>& k = st.K;
  const bool incl = is_zero(x) ? true : (same(x, sg.L) ? false : after);
  const Sums<R> s = g < st.index.size() && !st.index[g].pos.empty()
                       ? indexed_sums(st.index[g], x, incl)
                       : sums(st.loads.data() + sg.first, st.loads.data() + sg.last, x, incl, k);
  BasicPointValues<R> p;
  p.shear = sg.V0 + s.V;
  p.moment = sg.MA + sg.V0 * x + s.M;
  const R x2 = x * x;
  const R I1 = sg.MA * x + sg.V0 * x2 * k.half + s.I1;
  const R I2 = sg.MA * x2 * k.half + sg.V0 * x2 * x * k.sixth + s.I2;
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


// Hands the solved state to the Solution's `at`.
// `many_loads` false: the caller knows no segment has kIndexFrom loads or
// more (the fast path counts them as it reads them), so none is looked at.
template <class R>
void set_at(BasicSolution<R>& out, std::shared_ptr<State<R>> st, bool many_loads = true) {
  for (std::size_t g = 0; many_loads && g < st->seg.size(); ++g) {
    const Segment<R>& sg = st->seg[g];
    if (sg.last - sg.first < kIndexFrom) continue;
    if (st->index.empty()) st->index.resize(st->seg.size());
    st->index[g] = build_index(st->loads.data() + sg.first, st->loads.data() + sg.last);
  }
  std::shared_ptr<const State<R>> cst = std::move(st);
  out.at = [cst](std::size_t span, const R& local, bool after) { return eval_span(*cst, span, local, after); };
}

// The checks both solve paths make of the beam as given (the reader has
// ruled these out; a fault here is upstream). False, with `why` set, when
// a span has a length or EI that is not positive and finite.
template <class R>
bool spans_sound(const BasicBeam<R>& beam, BasicSolution<R>* why) {
  for (std::size_t s = 0; s < beam.spans.size(); ++s)
    if (!(beam.spans[s].length > R(0)) || !(beam.spans[s].EI > R(0)) || !finite(beam.spans[s].length) ||
        !finite(beam.spans[s].EI)) {
      *why = failed<R>(reason_id::kInput, "span " + std::to_string(s + 1) + " has a non-positive length or EI");
      return false;
    }
  return true;
}
// False, with `why` set, when load `l` is not on the beam, not within its
// span, or a node load other than a point force or a couple.
template <class R>
bool load_sound(const BasicBeam<R>& beam, const BasicLoad<R>& l, BasicSolution<R>* why) {
  const std::size_t n = beam.spans.size();
  if (l.on_node) {
    if (l.index > n) *why = failed<R>(reason_id::kInput, "node load on a node that does not exist");
    else if (l.type != LoadType::Point && l.type != LoadType::Couple)
      *why = not_applicable<R>(reason_id::kFeature, std::string(load_type_name(l.type)) + " load on node " + beam.labels[l.index]);
    else return true;
    return false;
  }
  if (l.index >= n) {
    *why = failed<R>(reason_id::kInput, "span load on a span that does not exist");
    return false;
  }
  const R& L = beam.spans[l.index].length;
  if (l.type == LoadType::Point || l.type == LoadType::Couple) {
    if (l.at < R(0) || L < l.at) {
      *why = failed<R>(reason_id::kInput, "load position outside span " + std::to_string(l.index + 1));
      return false;
    }
  } else if (l.from < R(0) || !(l.from < l.to) || L < l.to) {
    *why = failed<R>(reason_id::kInput, "load extent outside span " + std::to_string(l.index + 1));
    return false;
  }
  return true;
}

}  // namespace trivet::three_moment::detail
