// trivet: the shared vocabulary of the three methods.
//
// A beam, its loads and supports, and the result every method returns. No
// I/O and no solving code lives here: the methods share only these types
// (DESIGN.md, "Independence").
//
// Every numeric type is a template on the number type R so that the same
// solver code runs on double, on boost::multiprecision::cpp_bin_float_50
// and, where a method needs only + - * /, on cpp_rational.
//
// Sign conventions (one set, everywhere):
//   x runs left to right; a span's local position is measured from its left
//   end. Applied forces and distributed loads are positive DOWNWARD; applied
//   couples are positive CLOCKWISE. Internal bending moment M is positive
//   SAGGING; shear V = dM/dx. Reaction forces are positive UPWARD, reaction
//   couples positive COUNTER-CLOCKWISE. Deflection v is positive DOWNWARD,
//   rotation positive CLOCKWISE, so rotation = dv/dx and EI v'' = -M.
//   Across a point: V jumps by +(reaction force) - P, and M jumps by
//   +C (applied clockwise couple) - (reaction couple).
#pragma once

#include <algorithm>
#include <cstddef>
#include <functional>
#include <optional>
#include <string>
#include <vector>

namespace trivet {

enum class SupportType { Fixed, Pinned, Roller, Free, Spring, Guided };

// Returns the file's name of a support type ("fixed", "pinned", ...).
const char* support_type_name(SupportType type);

// True when the support prevents vertical deflection outright (fixed,
// pinned, roller). A spring restrains elastically and is not "rigid".
inline bool restrains_deflection(SupportType t) {
  return t == SupportType::Fixed || t == SupportType::Pinned || t == SupportType::Roller;
}
// True when the support prevents rotation outright (fixed, guided).
inline bool restrains_rotation(SupportType t) {
  return t == SupportType::Fixed || t == SupportType::Guided;
}

template <class R>
struct BasicSupport {
  SupportType type = SupportType::Pinned;
  R k{0};            // Spring only: vertical stiffness, F/L, > 0.
  R kr{0};           // Spring only: rotational stiffness, F*L/rad, >= 0 (0: none).
  // Prescribed downward deflection. On fixed/pinned/roller: the node's
  // deflection. On a spring: the downward movement of the spring's base, so
  // the spring force (reaction, upward) is k * (v_node - settlement).
  // Always 0 on free and guided nodes (the reader refuses it there).
  R settlement{0};
  // An internal moment release: the bending moment is zero on both sides of
  // the node and the two sides rotate independently. Only at interior nodes,
  // never on a fixed or guided support, a spring with kr > 0, or a node that
  // carries a couple (the reader refuses those).
  bool hinge = false;
  // The load case the settlement belongs to; empty: it acts once, with
  // factor 1, in every load set (harness/compare/load_sets.h). The methods
  // never read this: the harness puts into `settlement` the value of the
  // load set being analysed.
  std::string settlement_case;
};

template <class R>
struct BasicSpan {
  R length{1};  // L > 0
  R EI{1};      // flexural rigidity > 0, F*L^2
};

enum class LoadType {
  Point,   // force P (down +) at `at`
  Udl,     // uniform w (down +) from `from` to `to` (w1 == w2 == w)
  Linear,  // w1 at `from` varying linearly to w2 at `to` (down +)
  Couple,  // couple C (clockwise +) at `at`
};

const char* load_type_name(LoadType type);

// One load. On a span (`on_node` false): `index` is the 0-based span and
// positions are local to that span, 0 <= at <= L, 0 <= from < to <= L.
// The reader moves point forces that sit exactly at a span end onto the
// node, so a span's Point load has 0 < at < L; a Couple may sit at 0 or L.
// On a node (`on_node` true): `index` is the 0-based node; only Point
// and Couple occur there.
template <class R>
struct BasicLoad {
  LoadType type = LoadType::Point;
  bool on_node = false;
  std::size_t index = 0;
  R P{0};    // Point
  R C{0};    // Couple
  R w1{0};   // Udl (w1 == w2) and Linear: intensity at `from`, F/L
  R w2{0};   //                            intensity at `to`, F/L
  R at{0};   // Point, Couple on a span
  R from{0}; // Udl, Linear
  R to{0};   // Udl, Linear
  std::string load_case = "loads";
};

// A beam of n spans has n + 1 nodes; node i is the left end of span i and
// the right end of span i - 1 (0-based).
template <class R>
struct BasicBeam {
  std::string title;
  std::vector<BasicSpan<R>> spans;
  std::vector<BasicSupport<R>> supports;  // spans.size() + 1 entries
  std::vector<std::string> labels;        // spans.size() + 1 entries
  std::vector<BasicLoad<R>> loads;
  int stations_per_span = 10;

  std::size_t node_count() const { return supports.size(); }
  // Global x of node i (sum of the span lengths to its left).
  R node_x(std::size_t i) const {
    R x{0};
    for (std::size_t s = 0; s < i && s < spans.size(); ++s) x += spans[s].length;
    return x;
  }
};

// ---------------------------------------------------------------------------
// Results. Every method fills the same structure.

enum class MethodStatus { Ok, NotApplicable, Failed };
const char* method_status_name(MethodStatus s);  // "ok", "not-applicable", "failed"

template <class R>
struct BasicNodeResult {
  R x{0};
  // Limits of the internal moment just left / right of the node, taken from
  // inside the adjoining span (so a couple acting exactly at the node, or at
  // the very end of the span, is on the far side of the limit). Empty
  // outside the beam: moment_left at node 0, moment_right at the last node.
  std::optional<R> moment_left, moment_right;
  R reaction_force{0};   // upward +; 0 where nothing restrains deflection;
                         // a spring's force k (v - settlement)
  R reaction_moment{0};  // counter-clockwise +; 0 where nothing restrains
                         // rotation; a rotational spring's kr * rotation
  R deflection{0};       // downward +
  // Rotation (clockwise +) of the beam just left / right of the node. They
  // differ only at a hinge. At the end nodes both hold the one value.
  R rotation_left{0}, rotation_right{0};
};

// Values at one point inside a span. At local 0 the limit from inside the
// span (after any load at 0); at local L the limit from inside the span
// (before any load at L); in between, where a point force or couple acts
// exactly at `local`, the limit from the LEFT (before it).
template <class R>
struct BasicPointValues {
  R shear{0};       // V = dM/dx
  R moment{0};      // sagging +
  R deflection{0};  // downward +
  R rotation{0};    // clockwise +
};

template <class R>
struct BasicSolution {
  MethodStatus status = MethodStatus::Failed;
  std::string reason;  // empty when ok; else names the beam feature or fault
  std::string reason_id;  // empty when ok; else a stable id (methods/beam/status.h)
  std::vector<BasicNodeResult<R>> nodes;  // one per node, when ok
  // Values in span `span` (0-based) at local position `local` in [0, L],
  // with `after` choosing, at an interior point where a point force or
  // couple acts, the limit from the right instead of the left. Valid when
  // status is Ok; pure and safe to call from several threads.
  std::function<BasicPointValues<R>(std::size_t span, const R& local, bool after)> at;
};

// Every method has this shape (methods/<name>/<name>.h):
//   template <class R>
//   BasicSolution<R> solve(const BasicBeam<R>& beam,
//                          const std::vector<BasicStation<R>>& stations);
// `beam` has passed the reader's validation (valid and stable). `stations`
// is the grid the harness will ask for (a method may place its own
// points there, e.g. element nodes); `at` must be right at any point.

// ---------------------------------------------------------------------------
// Stations: the shared grid at which every method reports its diagrams.

// One station. `span` is 0-based; `local` is the position in that span
// (0 <= local <= L); `after` is true for the right-hand limit at an interior
// point of the span where a point force or couple acts (the entry that
// follows the left-hand one at the same x). `x` is global.
template <class R>
struct BasicStation {
  R x{0};
  std::size_t span = 0;
  R local{0};
  bool after = false;
};

// The grid of a beam: in each span, `per_span` equal divisions, plus the
// positions where a span load acts, starts or ends; at every interior node
// two stations (the end of the span on its left, then the start of the span
// on its right); at every point force or couple inside a span two stations
// (before, then after). Increasing x, left limit first. Uses only + - * /,
// so it is exact in exact arithmetic.
template <class R>
std::vector<BasicStation<R>> build_stations(const BasicBeam<R>& beam, int per_span) {
  std::vector<BasicStation<R>> out;
  std::vector<std::pair<R, bool>> pts;  // (local, is a point force/couple)
  std::vector<std::vector<const BasicLoad<R>*>> by_span(beam.spans.size());
  for (const auto& l : beam.loads)
    if (!l.on_node && l.index < by_span.size()) by_span[l.index].push_back(&l);
  // At most: the divisions, two entries per point of a span load, two at an interior node.
  out.reserve(beam.spans.size() * (static_cast<std::size_t>(per_span < 1 ? 1 : per_span) + 2) + 2 * beam.loads.size());
  R x0{0};
  for (std::size_t s = 0; s < beam.spans.size(); ++s) {
    const R L = beam.spans[s].length;
    pts.clear();
    const int n = per_span < 1 ? 1 : per_span;
    for (int k = 0; k <= n; ++k) pts.emplace_back(k == n ? L : L * R(k) / R(n), false);
    for (const auto* l : by_span[s]) {
      if (l->type == LoadType::Point || l->type == LoadType::Couple) {
        if (l->at > R(0) && l->at < L) pts.emplace_back(l->at, true);
      } else {
        pts.emplace_back(l->from, false);
        pts.emplace_back(l->to, false);
      }
    }
    std::sort(pts.begin(), pts.end(), [](const auto& a, const auto& b) { return a.first < b.first; });
    // Merge equal positions; a position is a jump if any entry there is.
    for (std::size_t i = 0; i < pts.size();) {
      std::size_t j = i;
      bool jump = false;
      while (j < pts.size() && !(pts[i].first < pts[j].first)) { jump = jump || pts[j].second; ++j; }
      const R& a = pts[i].first;
      out.push_back({x0 + a, s, a, false});
      if (jump) out.push_back({x0 + a, s, a, true});
      i = j;
    }
    x0 += L;
  }
  return out;
}

using Support = BasicSupport<double>;
using Span = BasicSpan<double>;
using Load = BasicLoad<double>;
using Beam = BasicBeam<double>;
using NodeResult = BasicNodeResult<double>;
using PointValues = BasicPointValues<double>;
using Solution = BasicSolution<double>;
using Station = BasicStation<double>;

// Converts a beam to another number type (each number through
// static_cast<To>, so a double becomes its exact binary value).
template <class To, class From>
BasicBeam<To> beam_cast(const BasicBeam<From>& b) {
  BasicBeam<To> r;
  r.title = b.title;
  r.labels = b.labels;
  r.stations_per_span = b.stations_per_span;
  for (const auto& s : b.spans) r.spans.push_back({static_cast<To>(s.length), static_cast<To>(s.EI)});
  for (const auto& s : b.supports)
    r.supports.push_back({s.type, static_cast<To>(s.k), static_cast<To>(s.kr),
                          static_cast<To>(s.settlement), s.hinge, s.settlement_case});
  for (const auto& l : b.loads) {
    BasicLoad<To> t;
    t.type = l.type; t.on_node = l.on_node; t.index = l.index;
    t.P = static_cast<To>(l.P); t.C = static_cast<To>(l.C);
    t.w1 = static_cast<To>(l.w1); t.w2 = static_cast<To>(l.w2);
    t.at = static_cast<To>(l.at); t.from = static_cast<To>(l.from); t.to = static_cast<To>(l.to);
    t.load_case = l.load_case;
    r.loads.push_back(t);
  }
  return r;
}

}  // namespace trivet
