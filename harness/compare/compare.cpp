#include "harness/compare/compare.h"

#include "methods/beam/status.h"

#include "harness/compare/detail.h"
#include "harness/compare/moving.h"
#include "harness/compare/extremes.h"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <exception>
#include <future>
#include <new>
#include <limits>
#include <system_error>

namespace trivet::compare {

const char* kind_name(Kind k) {
  switch (k) {
    case Kind::Moment: return "moment";
    case Kind::Shear: return "shear";
    case Kind::Reaction: return "reaction";
    case Kind::Deflection: return "deflection";
    case Kind::Rotation: return "rotation";
  }
  return "?";
}

const char* verdict_name(Verdict v) {
  switch (v) {
    case Verdict::Agree: return "agree";
    case Verdict::Disagree: return "disagree";
    case Verdict::Unconfirmed: return "unconfirmed";
  }
  return "?";
}

const char* beam_status_name(BeamStatus s) {
  switch (s) {
    case BeamStatus::Agree: return "agree";
    case BeamStatus::Disagree: return "disagree";
    case BeamStatus::Unconfirmed: return "unconfirmed";
    case BeamStatus::Invalid: return "invalid";
  }
  return "?";
}

const char* caution_text() {
  return "trivet is a checking aid. Its results follow linear elastic Euler-Bernoulli beam theory "
         "for the model as entered (spans, supports, stiffness and loads as given in the file); "
         "they do not replace the judgement of a qualified engineer, and design must follow the "
         "local codes and licensed practice.";
}

std::size_t LoadSet::ok_count() const {
  std::size_t n = 0;
  for (const auto& m : methods) n += m.status == MethodStatus::Ok;
  return n;
}

std::size_t BeamResult::claims_failed() const {
  std::size_t n = 0;
  for (const auto& c : claims) n += !c.holds;
  return n;
}

std::size_t BeamResult::limits_failed() const {
  std::size_t n = 0;
  for (const auto& s : sets)
    for (const auto& d : s.deflection_checks) n += !d.holds;
  return n;
}

std::pair<std::size_t, double> locate(const Beam& beam, double x) {
  double x0 = 0;
  for (std::size_t s = 0; s < beam.spans.size(); ++s) {
    const double L = beam.spans[s].length;
    if (x <= x0 + L || s + 1 == beam.spans.size()) return {s, std::min(std::max(x - x0, 0.0), L)};
    x0 += L;
  }
  return {0, 0.0};
}

std::optional<std::size_t> node_at(const Beam& beam, double x) {
  double x0 = 0, total = 0;
  for (const auto& s : beam.spans) total += s.length;
  const double eps = 1e-12 * std::max(total, 1e-300);
  for (std::size_t i = 0; i <= beam.spans.size(); ++i) {
    if (std::abs(x - x0) <= eps) return i;
    if (i < beam.spans.size()) x0 += beam.spans[i].length;
  }
  return std::nullopt;
}


namespace detail {

double median(std::vector<double>& v) {
  if (v.empty()) return 0.0;
  if (v.size() == 3)  // the usual case: three methods
    return std::max(std::min(v[0], v[1]), std::min(std::max(v[0], v[1]), v[2]));
  std::sort(v.begin(), v.end());
  const std::size_t n = v.size();
  return n % 2 ? v[n / 2] : 0.5 * (v[n / 2 - 1] + v[n / 2]);
}

bool finite_solution(const MethodResult& r) {
  for (const auto& n : r.nodes) {
    if (!std::isfinite(n.reaction_force) || !std::isfinite(n.reaction_moment) ||
        !std::isfinite(n.deflection) || !std::isfinite(n.rotation_left) ||
        !std::isfinite(n.rotation_right))
      return false;
    if (n.moment_left && !std::isfinite(*n.moment_left)) return false;
    if (n.moment_right && !std::isfinite(*n.moment_right)) return false;
  }
  for (const auto& s : r.stations)
    if (!std::isfinite(s.shear) || !std::isfinite(s.moment) || !std::isfinite(s.deflection) ||
        !std::isfinite(s.rotation))
      return false;
  return true;
}

// Vertical-force and moment balance of one solution (moments about x = 0,
// clockwise positive: a downward force P at x gives P x, an upward
// reaction R gives -R x, a counter-clockwise reaction couple -Rm).
Equilibrium equilibrium_of(const Beam& beam, const std::vector<NodeResult>& nodes) {
  std::vector<double> xs(beam.node_count(), 0.0);
  for (std::size_t i = 0; i + 1 < xs.size(); ++i) xs[i + 1] = xs[i] + beam.spans[i].length;
  double f = 0, fs = 0, m = 0, ms = 0;
  auto force = [&](double down, double x) { f += down; fs += std::abs(down); m += down * x; ms += std::abs(down * x); };
  auto couple = [&](double cw) { m += cw; ms += std::abs(cw); };
  for (const auto& l : beam.loads) {
    const double x0 = l.on_node ? xs[l.index] : xs[l.index];
    switch (l.type) {
      case LoadType::Point: force(l.P, l.on_node ? x0 : x0 + l.at); break;
      case LoadType::Couple: couple(l.C); break;
      case LoadType::Udl:
      case LoadType::Linear: {
        const double a = l.from, b = l.to, len = b - a;
        const double total = 0.5 * (l.w1 + l.w2) * len;
        // First moment of a trapezoid about the span's left end.
        const double first = len * (l.w1 * (2 * a + b) + l.w2 * (a + 2 * b)) / 6.0;
        f += total; fs += 0.5 * (std::abs(l.w1) + std::abs(l.w2)) * len;
        m += first + total * x0;
        ms += std::abs(first + total * x0);
        break;
      }
    }
  }
  for (std::size_t i = 0; i < nodes.size() && i < xs.size(); ++i) {
    force(-nodes[i].reaction_force, xs[i]);
    couple(-nodes[i].reaction_moment);
  }
  // The forces the node movements alone make (each span's end forces from
  // its end deflections and rotations, term by term; springs' k v): a beam
  // moved without bending (a settlement of a statically determinate beam)
  // has reactions of rounding size only, whose rounding is measured against
  // these, not against themselves.
  double moved = 0;
  for (std::size_t i = 0; i + 1 < nodes.size() && i < beam.spans.size(); ++i) {
    const double L = beam.spans[i].length, EI = beam.spans[i].EI;
    moved += 12 * EI / (L * L * L) * (std::abs(nodes[i].deflection) + std::abs(nodes[i + 1].deflection)) +
             6 * EI / (L * L) * (std::abs(nodes[i].rotation_right) + std::abs(nodes[i + 1].rotation_left));
  }
  for (std::size_t i = 0; i < nodes.size() && i < beam.supports.size(); ++i)
    if (beam.supports[i].type == SupportType::Spring)
      moved += beam.supports[i].k * (std::abs(nodes[i].deflection) + std::abs(beam.supports[i].settlement));
  if (std::isfinite(moved)) fs += moved;
  Equilibrium e;
  e.force_residual = fs > 0 ? std::abs(f) / fs : std::abs(f);
  // Moments are measured against the total load times the beam's length as
  // well, so that a beam whose loads all sit at x = 0 (moments of rounding
  // size only) is not called out of balance by its own noise.
  const double lever = xs.empty() ? 0.0 : xs.back();
  ms = std::max(ms, fs * lever);
  e.moment_residual = ms > 0 ? std::abs(m) / ms : std::abs(m);
  return e;
}

std::string fmt(double v) { return input::format_number(v); }
std::string fmt_place(double v) {
  char b[32];
  std::snprintf(b, sizeof b, "%.6g", v);
  return b;
}

// A kind whose values are all rounding noise (the moments of a beam whose
// only load sits on a support, say) must not be scaled by that noise, or
// agreement to the last bit reads as a difference of 100%. Each kind's scale
// is floored from the others: moments through the movement (rotations and
// deflections, through stiffness and span length), forces and moments through
// the beam's length, deflections and rotations through the moments, span
// length and stiffness.
void floor_scales(double* scale, const Beam& beam) {
  double total = 0, longest = 0, ei = 0;
  for (const auto& sp : beam.spans) {
    total += sp.length;
    longest = std::max(longest, sp.length);
    ei = std::max(ei, sp.EI);
  }
  if (!(total > 0) || !(ei > 0)) return;
  double& M = scale[static_cast<int>(Kind::Moment)];
  double& V = scale[static_cast<int>(Kind::Shear)];
  double& R = scale[static_cast<int>(Kind::Reaction)];
  double& D = scale[static_cast<int>(Kind::Deflection)];
  double& T = scale[static_cast<int>(Kind::Rotation)];
  // Every floor carries the margin: it only ever lifts a scale that is far
  // below what the other kinds imply, never a real one (a claim's 1% stays
  // 1% of the largest value of its own kind).
  const double k = 1e-3;
  // A beam moved without bending (a settlement of a statically determinate
  // beam, say) has only rounding noise for its forces and moments: floor the
  // moments from the movement, through EI/L (rotation) and EI/L^2
  // (deflection), before the forces are floored from the moments.
  M = std::max({M, k * ei * T / longest, k * ei * D / (longest * longest)});
  const double force = std::max({V, R, M / total});
  V = std::max(V, k * force);
  R = std::max(R, k * force);
  M = std::max(M, k * force * total);
  D = std::max({D, k * T * longest, k * M * longest * longest / ei});
  T = std::max({T, k * D / longest, k * M * longest / ei});
}

SpanExtremes method_span_extremes(const MethodResult& m, const LoadSet& set, std::size_t s, std::size_t begin,
                                  std::size_t end, double x0) {
  SpanExtremes e;
  bool first = true;
  auto consider = [&](double local, double moment, double defl) {
    const double x = x0 + local;
    if (first || moment > e.max_moment) { e.max_moment = moment; e.max_moment_x = x; }
    if (first || moment < e.min_moment) { e.min_moment = moment; e.min_moment_x = x; }
    if (first || std::abs(defl) > std::abs(e.max_deflection)) { e.max_deflection = defl; e.max_deflection_x = x; }
    first = false;
  };
  for (std::size_t k = begin; k < end; ++k) consider(set.stations[k].local, m.stations[k].moment, m.stations[k].deflection);
  // Between consecutive stations at different positions (the first at its
  // position is the left-hand limit, the last the right-hand one) the
  // moment and the deflection are polynomials: their turning points exactly.
  std::vector<double> cand;
  for (std::size_t k = begin; k + 1 < end; ++k) {
    const double a = set.stations[k].local, b = set.stations[k + 1].local;
    if (!(b > a)) continue;
    // The moment: the cubic through the end values and slopes (the shear);
    // the deflection: the quintic through them (the rotation) and two
    // samples inside. Exact for Euler-Bernoulli pieces (extremes.h).
    const StationValues& A = m.stations[k];
    const StationValues& B = m.stations[k + 1];
    const auto hx = hermite_points(a, b);
    std::array<double, 2> iv{};
    for (std::size_t j = 0; j < hx.size(); ++j) iv[j] = m.solution.at(s, hx[j], false).deflection;
    cand.clear();
    turning_points_of(hermite3(a, b, A.moment, A.shear, B.moment, B.shear), a, b, cand);
    turning_points_of(hermite5(a, b, A.deflection, A.rotation, iv, B.deflection, B.rotation), a, b, cand);
    for (double t : cand) {
      const PointValues p = m.solution.at(s, t, false);
      consider(t, p.moment, p.deflection);
    }
  }
  return e;
}

void method_extremes(MethodResult& m, const LoadSet& set) {
  m.extremes.assign(set.beam.spans.size(), {});
  std::size_t i = 0;
  double x0 = 0;
  for (std::size_t s = 0; s < set.beam.spans.size(); ++s) {
    const std::size_t begin = i;
    while (i < set.stations.size() && set.stations[i].span == s) ++i;
    if (i > begin) m.extremes[s] = method_span_extremes(m, set, s, begin, i, x0);
    x0 += set.beam.spans[s].length;
  }
}

void consensus_extremes(LoadSet& set) {
  std::vector<const MethodResult*> ok;
  for (const auto& m : set.methods)
    if (m.status == MethodStatus::Ok && m.extremes.size() == set.beam.spans.size()) ok.push_back(&m);
  set.extremes.assign(set.beam.spans.size(), {});
  if (ok.empty()) return;
  std::vector<double> v;
  for (std::size_t s = 0; s < set.extremes.size(); ++s) {
    SpanExtremes& c = set.extremes[s];
    // The median value, with the position and what governs from the method
    // that gave it.
    auto pick = [&](auto value) -> const SpanExtremes& {
      v.clear();
      for (auto* m : ok) v.push_back(value(m->extremes[s]));
      const double med = median(v);
      const SpanExtremes* best = &ok.front()->extremes[s];
      for (auto* m : ok)
        if (std::abs(value(m->extremes[s]) - med) < std::abs(value(*best) - med)) best = &m->extremes[s];
      return *best;
    };
    const SpanExtremes& a = pick([](const SpanExtremes& e) { return e.max_moment; });
    c.max_moment = a.max_moment; c.max_moment_x = a.max_moment_x; c.max_moment_by = a.max_moment_by;
    const SpanExtremes& b = pick([](const SpanExtremes& e) { return e.min_moment; });
    c.min_moment = b.min_moment; c.min_moment_x = b.min_moment_x; c.min_moment_by = b.min_moment_by;
    const SpanExtremes& d = pick([](const SpanExtremes& e) { return e.max_deflection; });
    c.max_deflection = d.max_deflection; c.max_deflection_x = d.max_deflection_x; c.max_deflection_by = d.max_deflection_by;
  }
}

}  // namespace detail

namespace {

using namespace detail;

void compare_methods(LoadSet& set, double agreement) {
  std::vector<MethodResult*> ok;
  for (auto& m : set.methods)
    if (m.status == MethodStatus::Ok) ok.push_back(&m);
  const std::size_t nn = set.beam.node_count();
  const std::size_t ns = set.stations.size();

  // Consensus: the median of the methods that ran.
  std::vector<double> v;
  set.consensus_nodes.assign(ok.empty() ? 0 : nn, NodeResult{});
  set.consensus_stations.assign(ok.empty() ? 0 : ns, StationValues{});
  if (!ok.empty()) {
    for (std::size_t j = 0; j < nn; ++j) {
      NodeResult& c = set.consensus_nodes[j];
      c = ok.front()->nodes[j];
      auto med = [&](auto get) { v.clear(); for (auto* m : ok) v.push_back(get(m->nodes[j])); return median(v); };
      c.reaction_force = med([](const NodeResult& n) { return n.reaction_force; });
      c.reaction_moment = med([](const NodeResult& n) { return n.reaction_moment; });
      c.deflection = med([](const NodeResult& n) { return n.deflection; });
      c.rotation_left = med([](const NodeResult& n) { return n.rotation_left; });
      c.rotation_right = med([](const NodeResult& n) { return n.rotation_right; });
      if (c.moment_left) c.moment_left = med([](const NodeResult& n) { return n.moment_left.value_or(0.0); });
      if (c.moment_right) c.moment_right = med([](const NodeResult& n) { return n.moment_right.value_or(0.0); });
    }
    for (std::size_t i = 0; i < ns; ++i) {
      StationValues& c = set.consensus_stations[i];
      c.x = set.stations[i].x;
      auto med = [&](auto get) { v.clear(); for (auto* m : ok) v.push_back(get(m->stations[i])); return median(v); };
      c.shear = med([](const StationValues& s) { return s.shear; });
      c.moment = med([](const StationValues& s) { return s.moment; });
      c.deflection = med([](const StationValues& s) { return s.deflection; });
      c.rotation = med([](const StationValues& s) { return s.rotation; });
    }
  }

  // Scales: the largest magnitude of each kind over all methods that ran.
  for (double& s : set.scale) s = 0;
  auto grow = [&](Kind k, double x) { set.scale[static_cast<int>(k)] = std::max(set.scale[static_cast<int>(k)], std::abs(x)); };
  for (auto* m : ok) {
    for (const auto& n : m->nodes) {
      if (n.moment_left) grow(Kind::Moment, *n.moment_left);
      if (n.moment_right) grow(Kind::Moment, *n.moment_right);
      grow(Kind::Reaction, n.reaction_force);
      grow(Kind::Moment, n.reaction_moment);
      grow(Kind::Deflection, n.deflection);
      grow(Kind::Rotation, n.rotation_left);
      grow(Kind::Rotation, n.rotation_right);
    }
    for (const auto& s : m->stations) {
      grow(Kind::Moment, s.moment);
      grow(Kind::Shear, s.shear);
      grow(Kind::Deflection, s.deflection);
      grow(Kind::Rotation, s.rotation);
    }
  }
  floor_scales(set.scale, set.beam);
  auto rel = [&](Kind k, double d) {
    const double s = set.scale[static_cast<int>(k)];
    return s > 0 ? d / s : d;
  };

  // Pairwise differences.
  for (double& d : set.max_difference) d = 0;
  struct PairDiff { std::size_t a, b; double worst; };
  std::vector<PairDiff> pairs;
  double best = -1;
  // Where the largest difference is: a node (with the quantity's suffix)
  // or a station. The text is made once, at the end, not at every value.
  struct Place { bool node = true; std::size_t index = 0; const char* suffix = ""; bool span = false; };
  Place worst_place;
  for (std::size_t a = 0; a < ok.size(); ++a)
    for (std::size_t b = a + 1; b < ok.size(); ++b) {
      const MethodResult& A = *ok[a];
      const MethodResult& B = *ok[b];
      double pair_worst = 0;
      auto note = [&](Kind k, double va, double vb, Place where, double x) {
        const double r = rel(k, std::abs(va - vb));
        double& md = set.max_difference[static_cast<int>(k)];
        md = std::max(md, r);
        pair_worst = std::max(pair_worst, r);
        if (r > best) {
          best = r;
          Worst w;
          w.kind = k;
          w.x = x;
          set.worst = w;
          set.worst->values = {{A.name, va}, {B.name, vb}};
          worst_place = where;
        }
      };
      for (std::size_t j = 0; j < nn; ++j) {
        const NodeResult& na = A.nodes[j];
        const NodeResult& nb = B.nodes[j];
        if (na.moment_left && nb.moment_left) note(Kind::Moment, *na.moment_left, *nb.moment_left, {true, j, " (moment left)"}, na.x);
        if (na.moment_right && nb.moment_right) note(Kind::Moment, *na.moment_right, *nb.moment_right, {true, j, " (moment right)"}, na.x);
        note(Kind::Reaction, na.reaction_force, nb.reaction_force, {true, j, " (reaction)"}, na.x);
        note(Kind::Moment, na.reaction_moment, nb.reaction_moment, {true, j, " (reaction moment)"}, na.x);
        note(Kind::Deflection, na.deflection, nb.deflection, {true, j, " (deflection)"}, na.x);
        note(Kind::Rotation, na.rotation_left, nb.rotation_left, {true, j, " (rotation)"}, na.x);
        note(Kind::Rotation, na.rotation_right, nb.rotation_right, {true, j, " (rotation right)"}, na.x);
      }
      for (std::size_t i = 0; i < ns; ++i) {
        const StationValues& sa = A.stations[i];
        const StationValues& sb = B.stations[i];
        const Place where{false, i, ""};
        note(Kind::Moment, sa.moment, sb.moment, where, sa.x);
        note(Kind::Shear, sa.shear, sb.shear, where, sa.x);
        note(Kind::Deflection, sa.deflection, sb.deflection, where, sa.x);
        note(Kind::Rotation, sa.rotation, sb.rotation, where, sa.x);
      }
      // Each method's own span extremes.
      for (std::size_t s = 0; s < A.extremes.size() && s < B.extremes.size(); ++s) {
        const SpanExtremes& ea = A.extremes[s];
        const SpanExtremes& eb = B.extremes[s];
        note(Kind::Moment, ea.max_moment, eb.max_moment, {false, s, " (largest moment)", true}, ea.max_moment_x);
        note(Kind::Moment, ea.min_moment, eb.min_moment, {false, s, " (smallest moment)", true}, ea.min_moment_x);
        note(Kind::Deflection, ea.max_deflection, eb.max_deflection, {false, s, " (largest deflection)", true}, ea.max_deflection_x);
      }
      pairs.push_back({a, b, pair_worst});
    }
  if (set.worst)
    set.worst->where = worst_place.span   ? "span " + std::to_string(worst_place.index + 1) + worst_place.suffix
                       : worst_place.node ? "node " + set.beam.labels[worst_place.index] + worst_place.suffix
                                          : "x = " + fmt_place(set.worst->x);

  bool any_failed = false;
  for (const auto& m : set.methods)
    if (m.status == MethodStatus::Failed) {
      any_failed = true;
      if (set.problem.empty()) set.problem = m.name + " failed: " + m.reason;
    }

  double worst_all = 0;
  for (double d : set.max_difference) worst_all = std::max(worst_all, d);
  // A method out of equilibrium is wrong whatever the others say.
  std::string unbalanced;
  for (auto* m : ok)
    if (m->equilibrium.force_residual > agreement || m->equilibrium.moment_residual > agreement) {
      unbalanced = m->name;
      set.problem = m->name + " is out of equilibrium (vertical force residual " + fmt(m->equilibrium.force_residual) +
                    ", moment residual " + fmt(m->equilibrium.moment_residual) + ")";
      break;
    }
  if (!unbalanced.empty()) {
    set.verdict = Verdict::Disagree;
    set.odd_one_out = unbalanced;
  } else if (any_failed) {
    set.verdict = Verdict::Disagree;
    for (const auto& m : set.methods)
      if (m.status == MethodStatus::Failed) { set.odd_one_out = m.name; break; }
  } else if (ok.size() < 2) {
    set.verdict = Verdict::Unconfirmed;
    set.problem = ok.empty() ? "no method could analyse this beam"
                             : "only " + ok.front()->name + " could analyse this beam; nothing confirms it";
  } else if (worst_all <= agreement) {
    set.verdict = Verdict::Agree;
  } else {
    set.verdict = Verdict::Disagree;
    if (ok.size() == 3) {
      // The odd one out: the method outside the one pair that agrees.
      for (const auto& p : pairs)
        if (p.worst <= agreement) {
          for (std::size_t k = 0; k < 3; ++k)
            if (k != p.a && k != p.b) set.odd_one_out = ok[k]->name;
        }
    }
    if (set.worst) {
      set.problem = std::string("the methods differ in ") + kind_name(set.worst->kind) + " at " +
                    set.worst->where + " by " + fmt(best) + " of the largest " +
                    kind_name(set.worst->kind) + " (agreement bound " + fmt(agreement) + ")";
      if (!set.odd_one_out.empty()) set.problem += "; " + set.odd_one_out + " is the odd one out";
    }
  }
}


Kind kind_of(input::Quantity q) {
  using Q = input::Quantity;
  switch (q) {
    case Q::Moment: case Q::ReactionMoment: case Q::MaxMoment: case Q::MinMoment: return Kind::Moment;
    case Q::Shear: return Kind::Shear;
    case Q::Reaction: return Kind::Reaction;
    case Q::Deflection: case Q::MaxDeflection: return Kind::Deflection;
    case Q::Rotation: return Kind::Rotation;
    case Q::MomentMax: case Q::MomentMin: return Kind::Moment;
    case Q::ShearMax: case Q::ShearMin: return Kind::Shear;
    case Q::ReactionMax: case Q::ReactionMin: return Kind::Reaction;
  }
  return Kind::Moment;
}

// The consensus value of a quantity that may jump at a point: the left and
// right limits, and the side the claim names.
struct TwoSided {
  std::optional<double> left, right;
};

// The usual mistake that explains a failed claim, as --against diagnoses a
// column: the claimed value read with the other sign, times 10^-6 to 10^6,
// on the other side of a jump, or at the node beside (labels shifted).
std::string claim_finding(const input::Claim& claim, const ClaimResult& r, const TwoSided& v, const LoadSet& set,
                          const input::BeamFile& file) {
  using Q = input::Quantity;
  const double c = claim.value;
  auto holds = [&](double value, double computed) { return std::abs(value - computed) <= r.tolerance * (1 + 1e-12); };
  const std::string unit = input::quantity_unit(file.units, claim.quantity);
  if (!(r.tolerance > 0)) return "";
  if (holds(-c, r.computed)) return "it holds with the opposite sign (another sign convention?)";
  struct Factor { double f; const char* words; };
  const Factor factors[] = {{1e3, "1000"}, {1e-3, "1/1000"}, {1e6, "10^6"}, {1e-6, "1/10^6"}};
  for (const auto& [f, words] : factors)
    for (double sg : {1.0, -1.0})
      if (holds(sg * c / f, r.computed)) {
        const bool length = claim.quantity == Q::Deflection || claim.quantity == Q::MaxDeflection;
        const std::string& lu = file.units.length;
        std::string why = "a unit " + std::string(words) + " times " + (f > 1 ? "smaller" : "larger") + " than the file's " + unit + "?";
        if (length && f > 1 && f < 1e4 && lu == "m") why = "typed in mm, as m?";
        if (length && f < 1 && f > 1e-4 && lu == "mm") why = "typed in m, as mm?";
        return std::string("it holds if divided by ") + words + (sg < 0 ? " and read with the opposite sign" : "") +
               (why.empty() ? "" : " (" + why + ")");
      }
  if (claim.side != input::Side::Unspecified) {
    const auto& other = claim.side == input::Side::Left ? v.right : v.left;
    if (other && holds(c, *other))
      return std::string("it holds on the other side of the point (\"side\": \"") +
             (claim.side == input::Side::Left ? "right" : "left") + "\")";
  }
  // The node beside: labels shifted by one.
  if (claim.node && !set.consensus_nodes.empty()) {
    const auto& cn = set.consensus_nodes;
    for (int d : {-1, 1}) {
      const long j = static_cast<long>(*claim.node) + d;
      if (j < 0 || j >= static_cast<long>(cn.size())) continue;
      const auto& nd = cn[static_cast<std::size_t>(j)];
      std::optional<double> there;
      switch (claim.quantity) {
        case Q::Reaction: there = nd.reaction_force; break;
        case Q::ReactionMoment: there = nd.reaction_moment; break;
        case Q::Deflection: there = nd.deflection; break;
        case Q::Moment: there = nd.moment_left ? nd.moment_left : nd.moment_right; break;
        default: break;
      }
      if (there && holds(c, *there) && std::abs(*there) > 0)
        return "it holds at node " + set.beam.labels[static_cast<std::size_t>(j)] + " (are the node labels shifted by one?)";
    }
  }
  return "";
}

ClaimResult evaluate_claim(const input::Claim& claim, const LoadSet& set, const input::BeamFile& file) {
  using Q = input::Quantity;
  ClaimResult r;
  r.claim = claim;
  r.load_case = set.name;
  const Beam& beam = set.beam;
  const std::string& lu = file.units.length;
  std::vector<const MethodResult*> ok;
  for (const auto& m : set.methods)
    if (m.status == MethodStatus::Ok) ok.push_back(&m);
  if (claim.span) r.label = "span " + std::to_string(*claim.span + 1);
  else if (claim.node) r.label = "node " + beam.labels[*claim.node];
  else if (claim.x) r.label = "x = " + fmt(*claim.x) + " " + lu;
  if (ok.empty()) {
    r.reason = "no method could analyse the beam";
    return r;
  }
  const Kind kind = kind_of(claim.quantity);
  const double scale = set.scale[static_cast<int>(kind)];
  const input::Tolerance tol = claim.tolerance.value_or(file.claim_tolerance);
  r.tolerance = tol.relative ? tol.value * scale : tol.value;

  std::vector<double> tmp;
  auto at_point = [&](std::size_t s, double local, bool after, auto get) {
    tmp.clear();
    for (auto* m : ok) tmp.push_back(get(m->solution.at(s, local, after)));
    return median(tmp);
  };
  TwoSided v;
  std::optional<std::size_t> node = claim.node;
  if (!node && claim.x) node = node_at(beam, *claim.x);
  if (input::is_envelope_quantity(claim.quantity)) {
    auto value = [&](std::size_t s, double local, bool after) {
      tmp.clear();
      for (auto* m : ok)
        if (const auto e = envelope_value(*m, claim.quantity, s, local, after)) tmp.push_back(*e);
      return median(tmp);
    };
    if (claim.quantity == Q::ReactionMax || claim.quantity == Q::ReactionMin) {
      v.left = value(*node, 0.0, false);
    } else if (node) {
      const std::size_t j = *node;
      if (j > 0) v.left = value(j - 1, beam.spans[j - 1].length, false);
      if (j < beam.spans.size()) v.right = value(j, 0.0, false);
    } else {
      auto [s, local] = locate(beam, *claim.x);
      v.left = value(s, local, false);
      v.right = value(s, local, true);
    }
  } else {
  const auto& cn = set.consensus_nodes;
  switch (claim.quantity) {
    case Q::Reaction: v.left = cn[*node].reaction_force; break;
    case Q::ReactionMoment: v.left = cn[*node].reaction_moment; break;
    case Q::MaxMoment: v.left = set.extremes[*claim.span].max_moment; break;
    case Q::MinMoment: v.left = set.extremes[*claim.span].min_moment; break;
    case Q::MaxDeflection: v.left = set.extremes[*claim.span].max_deflection; break;
    case Q::Moment:
    case Q::Shear:
    case Q::Deflection:
    case Q::Rotation: {
      auto get = [&](const PointValues& p) {
        switch (claim.quantity) {
          case Q::Moment: return p.moment;
          case Q::Shear: return p.shear;
          case Q::Deflection: return p.deflection;
          default: return p.rotation;
        }
      };
      if (node) {
        const std::size_t j = *node;
        if (claim.quantity == Q::Deflection) { v.left = cn[j].deflection; break; }
        if (claim.quantity == Q::Moment) { v.left = cn[j].moment_left; v.right = cn[j].moment_right; }
        else if (claim.quantity == Q::Rotation) {
          if (j > 0) v.left = cn[j].rotation_left;
          if (j < beam.spans.size()) v.right = cn[j].rotation_right;
        } else {
          if (j > 0) v.left = at_point(j - 1, beam.spans[j - 1].length, false, get);
          if (j < beam.spans.size()) v.right = at_point(j, 0.0, false, get);
        }
      } else {
        auto [s, local] = locate(beam, *claim.x);
        v.left = at_point(s, local, false, get);
        v.right = at_point(s, local, true, get);
      }
      break;
    }
    default: break;
  }
  }
  double computed;
  if (claim.side == input::Side::Left) {
    if (!v.left) { r.reason = "there is no beam to the left of this point"; return r; }
    computed = *v.left;
  } else if (claim.side == input::Side::Right) {
    if (!v.right) { r.reason = "there is no beam to the right of this point"; return r; }
    computed = *v.right;
  } else if (v.left && v.right && std::abs(*v.left - *v.right) > std::max(r.tolerance, 1e-9 * scale)) {
    r.reason = std::string("the ") + input::quantity_name(claim.quantity) + " jumps here (" + fmt(*v.left) +
               " just left, " + fmt(*v.right) + " just right): give \"side\": \"left\" or \"right\"";
    r.evaluated = false;
    return r;
  } else {
    computed = v.left ? *v.left : *v.right;
  }
  r.evaluated = true;
  r.computed = computed;
  r.difference = claim.value - computed;
  // A tolerance is a closed bound; allow for rounding of the tolerance itself.
  r.holds = std::abs(r.difference) <= r.tolerance * (1 + 1e-12) + 1e-15 * scale;
  if (!r.holds) r.finding = claim_finding(claim, r, v, set, file);
  return r;
}

}  // namespace

namespace {

// Claims against their load sets, then the beam's status.
// The deflection limit that applies to a load set, if any: a combination's
// own; else the file's, for the load sets it names, or (naming none) for
// every load case and every combination whose factors are all 1 (a service
// combination; factored ones are for strength).
std::optional<input::DeflectionLimit> limit_of(const LoadSet& set, const input::BeamFile& file) {
  if (set.combination && set.combination->limit_set) {
    if (set.combination->deflection_limit.ratio > 0) return set.combination->deflection_limit;
    return std::nullopt;
  }
  if (!(file.deflection_limit.ratio > 0)) return std::nullopt;
  const auto& named = file.deflection_limit_sets;
  if (!named.empty()) {
    if (std::find(named.begin(), named.end(), set.name) != named.end()) return file.deflection_limit;
    return std::nullopt;
  }
  if (set.combination)
    for (const auto& [cs, f] : set.combination->factors)
      if (f.range || std::abs(f.high - 1.0) > 0 || std::abs(f.low - 1.0) > 0) return std::nullopt;
  return file.deflection_limit;
}

// Each span's largest deflection (the methods' median, between stations
// too) against the limit: span / n; an overhang's on twice its length
// unless the limit names a cantilever ratio of its own.
void check_deflection_limits(LoadSet& set, const input::BeamFile& file) {
  set.deflection_checks.clear();
  const auto limit = limit_of(set, file);
  if (!limit || set.extremes.size() != set.beam.spans.size()) return;
  const std::size_t n = set.beam.spans.size();
  for (std::size_t s = 0; s < n; ++s) {
    DeflectionCheck d;
    d.span = s;
    d.length = set.beam.spans[s].length;
    d.cantilever = (s == 0 && set.beam.supports.front().type == SupportType::Free) ||
                   (s + 1 == n && set.beam.supports.back().type == SupportType::Free);
    d.deflection = set.extremes[s].max_deflection;
    d.x = set.extremes[s].max_deflection_x;
    const std::string ratio = fmt(limit->ratio);
    if (d.cantilever && limit->cantilever) {
      d.allowed = d.length / *limit->cantilever;
      d.limit = "L/" + fmt(*limit->cantilever) + " (cantilever)";
    } else if (d.cantilever) {
      d.allowed = 2 * d.length / limit->ratio;
      d.limit = "2L/" + ratio + " (cantilever)";
    } else {
      d.allowed = d.length / limit->ratio;
      d.limit = "L/" + ratio;
    }
    const double mag = std::abs(d.deflection);
    d.ratio = mag > 0 ? d.length / mag : std::numeric_limits<double>::infinity();
    d.holds = mag <= d.allowed;
    set.deflection_checks.push_back(std::move(d));
  }
}

void finish(BeamResult& out, const input::BeamFile& file) {
  for (auto& s : out.sets) check_deflection_limits(s, file);
  for (const auto& claim : file.claims) {
    const LoadSet* set = &out.sets.front();
    if (!claim.load_case.empty())
      for (const auto& s : out.sets)
        if (s.name == claim.load_case) set = &s;
    out.claims.push_back(evaluate_claim(claim, *set, file));
  }
  bool unconfirmed = false, disagree = false;
  for (const auto& s : out.sets) {
    disagree = disagree || s.verdict == Verdict::Disagree;
    unconfirmed = unconfirmed || s.verdict == Verdict::Unconfirmed;
  }
  disagree = disagree || out.claims_failed() > 0 || out.limits_failed() > 0;
  out.status = disagree ? BeamStatus::Disagree : unconfirmed ? BeamStatus::Unconfirmed : BeamStatus::Agree;
  // A load set that every applicable method failed to compute (a spring of
  // 5e-324, numbers that overflow) is not a disagreement between methods:
  // it is an input that double precision cannot carry. The beam is invalid,
  // with the methods' reasons.
  for (const auto& s : out.sets) {
    std::size_t failed = 0;
    std::string reasons;
    for (const auto& m : s.methods)
      if (m.status == MethodStatus::Failed) {
        ++failed;
        reasons += (reasons.empty() ? "" : "; ") + m.name + ": " + m.reason;
      }
    if (s.ok_count() == 0 && failed > 0) {
      out.errors.push_back({"", "", "load set " + s.name + ": no method could compute this beam in double precision (" +
                                        reasons + "); check the magnitudes of its numbers",
                             "check.no_method_computes"});
      out.status = BeamStatus::Invalid;
    }
  }
  if (out.status == BeamStatus::Invalid) {
    out.sets.clear();
    out.claims.clear();
    return;
  }
  // Settlements so large that the loads' effect is below their rounding:
  // the methods agree, but on the settlement alone.
  for (const auto& s : out.sets) {
    double applied = 0, length = 0;
    for (const auto& sp : s.beam.spans) length += sp.length;
    for (const auto& l : s.beam.loads)
      applied += std::abs(l.P) + std::abs(l.C) / std::max(length, 1e-300) +
                 0.5 * (std::abs(l.w1) + std::abs(l.w2)) * (l.to - l.from);
    const double forces = std::max(s.scale[static_cast<int>(Kind::Reaction)], s.scale[static_cast<int>(Kind::Shear)]);
    if (!(applied > 0) || !(forces > 1e12 * applied)) continue;
    std::string nodes;
    for (std::size_t i = 0; i < s.beam.supports.size(); ++i)
      if (std::abs(s.beam.supports[i].settlement) > 0) nodes += (nodes.empty() ? "" : ", ") + s.beam.labels[i];
    if (nodes.empty()) continue;
    const bool one = nodes.find(',') == std::string::npos;
    const std::string w = "load set " + s.name + ": the settlement" + (one ? " at node " : "s at nodes ") + nodes +
                          (one ? " makes forces " : " make forces ") + fmt(forces / applied) +
                          " times the applied loads: the loads' own effect is below the rounding of the result";
    if (std::find(out.warnings.begin(), out.warnings.end(), w) == out.warnings.end()) out.warnings.push_back(w);
  }
}

// Stations from which a load set's methods run side by side.
constexpr std::size_t kParallelStations = 20000;
constexpr std::size_t kParallelEnvelopeSpans = 100;

}  // namespace

BeamResult check(const input::BeamFile& file, const Options& options) {
  BeamResult out;
  out.file = file.path;
  out.title = file.beam.title;
  out.units = file.units;
  out.errors = file.errors;
  if (!file.ok()) {
    out.status = BeamStatus::Invalid;
    return out;
  }
  std::vector<const Method*> chosen;
  const std::vector<Method>& pool = options.method_set ? *options.method_set : methods();
  if (options.methods.empty()) {
    for (const auto& m : pool) chosen.push_back(&m);
  } else {
    for (const auto& name : options.methods)
      for (const auto& m : pool)
        if (m.name == name) chosen.push_back(&m);
  }
  const int per_span = options.stations_per_span.value_or(file.beam.stations_per_span);
  // The load sets: each case on its own, then each combination.
  struct Spec {
    std::string name;
    Beam beam;
    std::optional<input::Combination> combination;
    const input::MovingLoad* moving = nullptr;
    double moving_factor = 1;
  };
  std::vector<Spec> specs;
  auto train = [&](const std::string& name) -> const input::MovingLoad* {
    for (const auto& ml : file.moving_loads)
      if (ml.name == name) return &ml;
    return nullptr;
  };
  for (const auto& case_name : file.cases)
    specs.push_back({case_name, file.cases.size() == 1 ? file.beam : beam_for_case(file.beam, case_name), std::nullopt});
  for (const auto& comb : file.combinations) {
    // An ordinary combination: one load set of factored loads (and
    // settlements by the rule of load_sets.h). An envelope: the loads of its
    // cases as they are; each method splits them into shares. With a moving
    // load (never patterned nor a range, the reader says): the factored
    // loads, and the train on top.
    std::vector<std::pair<std::string, double>> factors;
    for (const auto& [cs, f] : comb.factors)
      factors.emplace_back(cs, comb.is_envelope() && !comb.moving ? 1.0 : f.high);
    Spec spec{comb.name, beam_for_factors(file.beam, factors), comb};
    if (comb.moving) {
      spec.moving = train(comb.moving->first);
      spec.moving_factor = comb.moving->second;
    }
    specs.push_back(std::move(spec));
  }
  // Each moving load on its own, factor 1, with the settlements that act in
  // every load set (load_sets.h).
  for (const auto& ml : file.moving_loads) {
    input::Combination own;
    own.name = ml.name;
    own.pointer = ml.pointer;
    own.moving = std::make_pair(ml.name, 1.0);
    specs.push_back({ml.name, beam_for_factors(file.beam, std::vector<std::pair<std::string, double>>{}), own, &ml, 1.0});
  }
  for (auto& spec : specs) {
    LoadSet set;
    set.name = spec.name;
    set.beam = std::move(spec.beam);
    set.combination = spec.combination;
    set.envelope = spec.combination && spec.combination->is_envelope();
    if (spec.moving) {
      set.moving = *spec.moving;
      set.moving_factor = spec.moving_factor;
    }
    set.beam.stations_per_span = per_span;
    set.stations = build_stations(set.beam, per_span);
    auto run_method = [&set](const Method* m) {
      MethodResult r;
      r.name = m->name;
      try {
        if (set.moving) {
          run_moving_method(*m, set, r);
        } else if (set.envelope) {
          run_envelope_method(*m, set.beam, *set.combination, set.stations, r, set.beam.spans.size() >= kParallelEnvelopeSpans);
        } else {
          r.solution = m->solve(set.beam, set.stations);
          r.status = r.solution.status;
          r.reason = r.solution.reason;
          r.reason_id = r.solution.reason_id;
          if (r.status == MethodStatus::Ok) {
            if (r.solution.nodes.size() != set.beam.node_count() || !r.solution.at) {
              r.status = MethodStatus::Failed;
              r.reason = "the method returned an incomplete result";
              r.reason_id = reason_id::kIncomplete;
            } else {
              r.nodes = std::move(r.solution.nodes);  // the solution keeps only `at`
              r.stations.reserve(set.stations.size());
              for (const auto& st : set.stations) {
                const PointValues p = r.solution.at(st.span, st.local, st.after);
                r.stations.push_back({st.x, p.shear, p.moment, p.deflection, p.rotation});
              }
              if (!finite_solution(r)) {
                r.status = MethodStatus::Failed;
                r.reason = "the method produced a non-finite number (the beam may be too badly conditioned for double precision)";
                r.reason_id = reason_id::kNonFinite;
              } else {
                r.equilibrium = equilibrium_of(set.beam, r.nodes);
                method_extremes(r, set);
              }
            }
          }
        }
      } catch (const std::bad_alloc&) {
        throw;  // out of memory is no method's failure: the run's (exit 3)
      } catch (const std::exception& e) {
        r.status = MethodStatus::Failed;
        r.reason = std::string("internal error: ") + e.what();
        r.reason_id = reason_id::kInternal;
      }
      if (r.status != MethodStatus::Ok) {
        r.nodes.clear();
        r.stations.clear();
        r.solution.at = nullptr;
        r.envelope.reset();
        r.envelope_model.reset();
        r.moving_model.reset();
      }
      return r;
    };
    // A long beam runs its methods side by side (each reads only the beam and
    // the stations); a short one, as in a library run where every core
    // already checks beams of its own, one after the other. The order of
    // the results is the order of the methods either way.
    std::vector<std::future<MethodResult>> later(chosen.size());
    // An envelope costs about its spans times a plain load set: from
    // kParallelEnvelopeSpans spans its methods run side by side too.
    if (set.stations.size() >= kParallelStations || (set.envelope && set.beam.spans.size() >= kParallelEnvelopeSpans))
      for (std::size_t k = 1; k < chosen.size(); ++k) {
        try {
          later[k] = std::async(std::launch::async, run_method, chosen[k]);
        } catch (const std::system_error&) {
          // no thread to be had: this method runs below, in turn
        }
      }
    for (std::size_t k = 0; k < chosen.size(); ++k)
      set.methods.push_back(later[k].valid() ? later[k].get() : run_method(chosen[k]));
    if (set.moving) {
      compare_envelopes(set, options.agreement);
      compare_influence_lines(set, options.agreement);
      consensus_extremes(set);
      moving_second_route(set, chosen, options.agreement);
    } else if (set.envelope) {
      compare_envelopes(set, options.agreement);
      consensus_extremes(set);
      second_route(set, chosen, options.agreement, set.beam.spans.size() >= kParallelEnvelopeSpans);
    } else {
      compare_methods(set, options.agreement);
      consensus_extremes(set);
    }
    out.sets.push_back(std::move(set));
  }
  finish(out, file);
  return out;
}

void refresh(BeamResult& result, const input::BeamFile& file, const Options& options) {
  if (result.status == BeamStatus::Invalid) return;
  for (auto& set : result.sets) {
    if (set.envelope) continue;
    for (auto& m : set.methods)
      if (m.status == MethodStatus::Ok) {
        m.equilibrium = equilibrium_of(set.beam, m.nodes);
        method_extremes(m, set);
      }
    set.worst.reset();
    set.odd_one_out.clear();
    set.problem.clear();
    compare_methods(set, options.agreement);
    consensus_extremes(set);
  }
  result.claims.clear();
  finish(result, file);
}

}  // namespace trivet::compare
