// trivet: the solved model of the three-moment method (segments, their
// loads and end values) and its evaluation at any point of a span.
// Private: included by three_moment.cpp only. Conventions of beam.h.
#pragma once

#include <cstddef>
#include <memory>
#include <vector>

#include "methods/beam/beam.h"
#include "methods/three_moment/three_moment_detail.h"
#include "methods/three_moment/three_moment_loads.h"

namespace trivet::three_moment {
namespace {

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

}  // namespace
}  // namespace trivet::three_moment
