#include "harness/compare/compare.h"

#include <algorithm>
#include <cmath>
#include <exception>
#include <limits>

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

Beam beam_for_case(const Beam& beam, const std::string& load_case) {
  Beam b = beam;
  b.loads.clear();
  for (const auto& l : beam.loads)
    if (l.load_case == load_case) b.loads.push_back(l);
  return b;
}

namespace {

double median(std::vector<double>& v) {
  if (v.empty()) return 0.0;
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
  Equilibrium e;
  e.force_residual = fs > 0 ? std::abs(f) / fs : std::abs(f);
  e.moment_residual = ms > 0 ? std::abs(m) / ms : std::abs(m);
  return e;
}

std::string fmt(double v) { return input::format_number(v); }

// Finds x in [a, b] where g changes sign (g(a), g(b) of opposite signs),
// by the Illinois variant of regula falsi.
template <class G>
double find_root(G&& g, double a, double b, double ga, double gb) {
  int side = 0;
  for (int it = 0; it < 80; ++it) {
    const double c = (a * gb - b * ga) / (gb - ga);
    if (!(c > a && c < b)) return 0.5 * (a + b);
    const double gc = g(c);
    if ((gc > 0) == (gb > 0)) {
      b = c; gb = gc;
      if (side == -1) ga *= 0.5;
      side = -1;
    } else {
      a = c; ga = gc;
      if (side == +1) gb *= 0.5;
      side = +1;
    }
    if (std::abs(b - a) <= 1e-14 * (std::abs(a) + std::abs(b) + 1e-300) || !(std::abs(gc) > 0)) break;
  }
  return std::abs(ga) < std::abs(gb) ? a : b;
}

void compute_extremes(LoadSet& set) {
  const Beam& beam = set.beam;
  std::vector<const MethodResult*> ok;
  for (const auto& m : set.methods)
    if (m.status == MethodStatus::Ok) ok.push_back(&m);
  set.extremes.assign(beam.spans.size(), {});
  if (ok.empty()) return;
  const MethodResult& lead = *ok.front();
  std::vector<double> tmp;
  auto consensus = [&](std::size_t s, double local, bool after) {
    PointValues pv{};
    tmp.clear();
    for (auto* m : ok) tmp.push_back(m->solution.at(s, local, after).moment);
    pv.moment = median(tmp);
    tmp.clear();
    for (auto* m : ok) tmp.push_back(m->solution.at(s, local, after).deflection);
    pv.deflection = median(tmp);
    return pv;
  };
  std::size_t i = 0;
  double x0 = 0;
  for (std::size_t s = 0; s < beam.spans.size(); ++s) {
    SpanExtremes e;
    bool first = true;
    auto consider = [&](double local, double moment, double defl) {
      const double x = x0 + local;
      if (first || moment > e.max_moment) { e.max_moment = moment; e.max_moment_x = x; }
      if (first || moment < e.min_moment) { e.min_moment = moment; e.min_moment_x = x; }
      if (first || std::abs(defl) > std::abs(e.max_deflection)) { e.max_deflection = defl; e.max_deflection_x = x; }
      first = false;
    };
    std::size_t begin = i;
    while (i < set.stations.size() && set.stations[i].span == s) {
      consider(set.stations[i].local, set.consensus_stations[i].moment, set.consensus_stations[i].deflection);
      ++i;
    }
    // Between consecutive stations the diagrams are smooth: look for a
    // turning point of M (V = 0) and of the deflection (rotation = 0).
    for (std::size_t k = begin; k + 1 < i; ++k) {
      const Station& a = set.stations[k];
      const Station& b = set.stations[k + 1];
      if (!(b.local > a.local)) continue;
      const double la = a.local, lb = b.local, lm = 0.5 * (la + lb);
      auto shear = [&](double t) { return lead.solution.at(s, t, false).shear; };
      auto rot = [&](double t) { return lead.solution.at(s, t, false).rotation; };
      const PointValues pa = lead.solution.at(s, la, a.after || la <= 0.0);
      const PointValues pb = lead.solution.at(s, lb, false);
      const PointValues pm = lead.solution.at(s, lm, false);
      auto scan = [&](auto&& g, double ga, double gm, double gb) {
        std::vector<double> roots;
        if ((ga > 0 && gm < 0) || (ga < 0 && gm > 0)) roots.push_back(find_root(g, la, lm, ga, gm));
        if ((gm > 0 && gb < 0) || (gm < 0 && gb > 0)) roots.push_back(find_root(g, lm, lb, gm, gb));
        return roots;
      };
      for (double t : scan(shear, pa.shear, pm.shear, pb.shear)) {
        PointValues c = consensus(s, t, false);
        consider(t, c.moment, c.deflection);
      }
      for (double t : scan(rot, pa.rotation, pm.rotation, pb.rotation)) {
        PointValues c = consensus(s, t, false);
        consider(t, c.moment, c.deflection);
      }
    }
    set.extremes[s] = e;
    x0 += beam.spans[s].length;
  }
}

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
  auto rel = [&](Kind k, double d) {
    const double s = set.scale[static_cast<int>(k)];
    return s > 0 ? d / s : d;
  };

  // Pairwise differences.
  for (double& d : set.max_difference) d = 0;
  struct PairDiff { std::size_t a, b; double worst; };
  std::vector<PairDiff> pairs;
  double best = -1;
  for (std::size_t a = 0; a < ok.size(); ++a)
    for (std::size_t b = a + 1; b < ok.size(); ++b) {
      const MethodResult& A = *ok[a];
      const MethodResult& B = *ok[b];
      double pair_worst = 0;
      auto note = [&](Kind k, double va, double vb, const std::string& where, double x) {
        const double r = rel(k, std::abs(va - vb));
        double& md = set.max_difference[static_cast<int>(k)];
        md = std::max(md, r);
        pair_worst = std::max(pair_worst, r);
        if (r > best) {
          best = r;
          Worst w;
          w.kind = k;
          w.where = where;
          w.x = x;
          set.worst = w;
          set.worst->values = {{A.name, va}, {B.name, vb}};
        }
      };
      for (std::size_t j = 0; j < nn; ++j) {
        const NodeResult& na = A.nodes[j];
        const NodeResult& nb = B.nodes[j];
        const std::string where = "node " + set.beam.labels[j];
        if (na.moment_left && nb.moment_left) note(Kind::Moment, *na.moment_left, *nb.moment_left, where + " (moment left)", na.x);
        if (na.moment_right && nb.moment_right) note(Kind::Moment, *na.moment_right, *nb.moment_right, where + " (moment right)", na.x);
        note(Kind::Reaction, na.reaction_force, nb.reaction_force, where + " (reaction)", na.x);
        note(Kind::Moment, na.reaction_moment, nb.reaction_moment, where + " (reaction moment)", na.x);
        note(Kind::Deflection, na.deflection, nb.deflection, where + " (deflection)", na.x);
        note(Kind::Rotation, na.rotation_left, nb.rotation_left, where + " (rotation)", na.x);
        note(Kind::Rotation, na.rotation_right, nb.rotation_right, where + " (rotation right)", na.x);
      }
      for (std::size_t i = 0; i < ns; ++i) {
        const StationValues& sa = A.stations[i];
        const StationValues& sb = B.stations[i];
        const std::string where = "x = " + fmt(sa.x);
        note(Kind::Moment, sa.moment, sb.moment, where, sa.x);
        note(Kind::Shear, sa.shear, sb.shear, where, sa.x);
        note(Kind::Deflection, sa.deflection, sb.deflection, where, sa.x);
        note(Kind::Rotation, sa.rotation, sb.rotation, where, sa.x);
      }
      pairs.push_back({a, b, pair_worst});
    }

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

// Global x -> (span, local).
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

Kind kind_of(input::Quantity q) {
  using Q = input::Quantity;
  switch (q) {
    case Q::Moment: case Q::ReactionMoment: case Q::MaxMoment: case Q::MinMoment: return Kind::Moment;
    case Q::Shear: return Kind::Shear;
    case Q::Reaction: return Kind::Reaction;
    case Q::Deflection: case Q::MaxDeflection: return Kind::Deflection;
    case Q::Rotation: return Kind::Rotation;
  }
  return Kind::Moment;
}

// The consensus value of a quantity that may jump at a point: the left and
// right limits, and the side the claim names.
struct TwoSided {
  std::optional<double> left, right;
};

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
  return r;
}

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
  for (const auto& case_name : file.cases) {
    LoadSet set;
    set.name = case_name;
    set.beam = file.cases.size() == 1 ? file.beam : beam_for_case(file.beam, case_name);
    set.beam.stations_per_span = per_span;
    set.stations = build_stations(set.beam, per_span);
    for (const Method* m : chosen) {
      MethodResult r;
      r.name = m->name;
      try {
        r.solution = m->solve(set.beam, set.stations);
        r.status = r.solution.status;
        r.reason = r.solution.reason;
        if (r.status == MethodStatus::Ok) {
          if (r.solution.nodes.size() != set.beam.node_count() || !r.solution.at) {
            r.status = MethodStatus::Failed;
            r.reason = "the method returned an incomplete result";
          } else {
            r.nodes = r.solution.nodes;
            r.stations.reserve(set.stations.size());
            for (const auto& st : set.stations) {
              const PointValues p = r.solution.at(st.span, st.local, st.after);
              r.stations.push_back({st.x, p.shear, p.moment, p.deflection, p.rotation});
            }
            if (!finite_solution(r)) {
              r.status = MethodStatus::Failed;
              r.reason = "the method produced a non-finite number (the beam may be too badly conditioned for double precision)";
            } else {
              r.equilibrium = equilibrium_of(set.beam, r.nodes);
            }
          }
        }
      } catch (const std::exception& e) {
        r.status = MethodStatus::Failed;
        r.reason = std::string("internal error: ") + e.what();
      }
      if (r.status != MethodStatus::Ok) {
        r.nodes.clear();
        r.stations.clear();
        r.solution.at = nullptr;
      }
      set.methods.push_back(std::move(r));
    }
    compare_methods(set, options.agreement);
    compute_extremes(set);
    out.sets.push_back(std::move(set));
  }
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
  disagree = disagree || out.claims_failed() > 0;
  out.status = disagree ? BeamStatus::Disagree : unconfirmed ? BeamStatus::Unconfirmed : BeamStatus::Agree;
  return out;
}

}  // namespace trivet::compare
