#include "harness/compare/envelope.h"

#include <algorithm>
#include <array>
#include <cmath>
#include <exception>
#include <map>
#include <memory>

#include "harness/compare/detail.h"
#include "harness/compare/extremes.h"

namespace trivet::compare {

using namespace detail;

namespace {

bool nonzero(double v) { return std::abs(v) > 0; }
bool same(double a, double b) { return !(a < b) && !(b < a); }
bool same_choice(const EnvelopeModel::Choice& a, const EnvelopeModel::Choice& b) {
  return a.size() == b.size() && std::equal(a.begin(), a.end(), b.begin(), same);
}

}  // namespace

// ---------------------------------------------------------------------------
// The model: a method's solutions of the shares, combined.

double EnvelopeModel::pick(std::size_t u, double g, bool want_max, bool allow_off, double* factor) const {
  const Unit& un = units[u];
  double best_f = 0, best_v = 0;
  bool have = false;
  auto consider = [&](double f) {
    const double v = f * g;
    if (!have || (want_max ? v > best_v : v < best_v)) { best_f = f; best_v = v; have = true; }
  };
  if (un.factor == kAlways) {
    consider(1.0);
  } else {
    if (allow_off) consider(0.0);  // first, so that a share without effect here stays off
    const input::Factor& f = comb.factors[un.factor].second;
    consider(f.high);
    if (f.range) consider(f.low);
  }
  if (factor) *factor = best_f;
  return best_v;
}

double EnvelopeModel::extreme(const std::vector<double>& g, bool want_max, Choice* choice) const {
  if (choice) choice->assign(units.size(), 0.0);
  double f = 0;
  if (comb.arrangements == input::Arrangements::All || arrangements.empty()) {
    // Every share independently: the sum of each share's best.
    double sum = 0;
    for (std::size_t u = 0; u < units.size(); ++u) {
      sum += pick(u, g[u], want_max, units[u].patterned, &f);
      if (choice) (*choice)[u] = f;
    }
    return sum;
  }
  // Named arrangements: the shares that are not patterned pick their best;
  // each span's patterned shares are on or off together.
  double base = 0;
  std::vector<double> on(spans, 0.0);
  for (std::size_t u = 0; u < units.size(); ++u) {
    const double v = pick(u, g[u], want_max, false, &f);
    if (units[u].patterned) on[units[u].span] += v;
    else {
      base += v;
      if (choice) (*choice)[u] = f;
    }
  }
  std::size_t best_a = 0;
  double best = 0;
  for (std::size_t a = 0; a < arrangements.size(); ++a) {
    double v = base;
    for (std::size_t s : arrangements[a]) v += on[s];
    if (a == 0 || (want_max ? v > best : v < best)) { best = v; best_a = a; }
  }
  if (choice)
    for (std::size_t u = 0; u < units.size(); ++u)
      if (units[u].patterned && std::binary_search(arrangements[best_a].begin(), arrangements[best_a].end(), units[u].span)) {
        pick(u, g[u], want_max, false, &f);
        (*choice)[u] = f;
      }
  return best;
}

Governs EnvelopeModel::governs(const Choice& c) const {
  const std::size_t nf = comb.factors.size();
  Governs gv;
  gv.factors.assign(nf, 0.0);
  for (std::size_t k = 0; k < nf; ++k) gv.factors[k] = comb.factors[k].second.high;
  std::vector<char> fixed(nf, 0);
  for (std::size_t u = 0; u < units.size() && u < c.size(); ++u)
    if (units[u].factor != kAlways && !units[u].patterned) {
      gv.factors[units[u].factor] = c[u];
      fixed[units[u].factor] = 1;
    }
  for (std::size_t u = 0; u < units.size() && u < c.size(); ++u) {
    if (!units[u].patterned || !nonzero(c[u])) continue;
    const std::size_t k = units[u].factor;
    gv.spans.push_back(units[u].span);
    if (!fixed[k]) { gv.factors[k] = c[u]; fixed[k] = 2; }
    else if (fixed[k] == 2 && !same(gv.factors[k], c[u])) gv.spans_other_factor.push_back(units[u].span);
  }
  auto tidy = [](std::vector<std::size_t>& v) {
    std::sort(v.begin(), v.end());
    v.erase(std::unique(v.begin(), v.end()), v.end());
  };
  tidy(gv.spans);
  tidy(gv.spans_other_factor);
  return gv;
}

Bound EnvelopeModel::combine(const std::vector<double>& g) const {
  Bound b;
  Choice hi, lo;
  b.max = extreme(g, true, &hi);
  b.min = extreme(g, false, &lo);
  b.max_by = governs(hi);
  b.min_by = governs(lo);
  return b;
}

void EnvelopeModel::values(std::size_t span, double local, bool after, std::vector<PointValues>& out) const {
  out.resize(units.size());
  for (std::size_t u = 0; u < units.size(); ++u) out[u] = units[u].solution.at(span, local, after);
}

Bound EnvelopeModel::at(std::size_t span, double local, bool after, What what) const {
  std::vector<double> g(units.size());
  for (std::size_t u = 0; u < units.size(); ++u) {
    const PointValues p = units[u].solution.at(span, local, after);
    g[u] = what == kMoment ? p.moment : what == kShear ? p.shear : p.deflection;
  }
  return combine(g);
}

Bound EnvelopeModel::reaction(std::size_t node) const {
  std::vector<double> g(units.size());
  for (std::size_t u = 0; u < units.size(); ++u) g[u] = units[u].solution.nodes[node].reaction_force;
  return combine(g);
}

Beam EnvelopeModel::arrangement_beam(const Choice& c) const {
  Beam b = units.front().beam;
  b.loads.clear();
  for (auto& s : b.supports) { s.settlement = 0; s.settlement_case.clear(); }
  for (std::size_t u = 0; u < units.size() && u < c.size(); ++u) {
    const double f = c[u];
    if (!nonzero(f)) continue;
    for (const auto& l : units[u].beam.loads) {
      Load s = l;
      s.P *= f; s.C *= f; s.w1 *= f; s.w2 *= f;
      b.loads.push_back(s);
    }
    for (std::size_t i = 0; i < b.supports.size(); ++i) b.supports[i].settlement += f * units[u].beam.supports[i].settlement;
  }
  return b;
}

std::string describe(const Governs& g, const input::Combination& c) {
  std::string s;
  if (!c.pattern.empty()) {
    if (g.spans.empty()) s = "no span loaded";
    else {
      s = g.spans.size() == 1 ? "span " : "spans ";
      for (std::size_t i = 0; i < g.spans.size(); ++i) s += (i ? ", " : "") + std::to_string(g.spans[i] + 1);
      s += " loaded";
      if (!g.spans_other_factor.empty()) {
        s += g.spans_other_factor.size() == 1 ? " (span " : " (spans ";
        for (std::size_t i = 0; i < g.spans_other_factor.size(); ++i)
          s += (i ? ", " : "") + std::to_string(g.spans_other_factor[i] + 1);
        s += " with the other end of the factor range)";
      }
    }
    s += "; ";
  }
  for (std::size_t k = 0; k < c.factors.size() && k < g.factors.size(); ++k)
    s += (k ? ", " : "") + c.factors[k].first + " x" + fmt(g.factors[k]);
  return s;
}

double envelope_value(const EnvelopeModel& model, input::Quantity q, std::size_t span, double local, bool after) {
  using Q = input::Quantity;
  using M = EnvelopeModel;
  switch (q) {
    case Q::MomentMax: return model.at(span, local, after, M::kMoment).max;
    case Q::MomentMin: return model.at(span, local, after, M::kMoment).min;
    case Q::ShearMax: return model.at(span, local, after, M::kShear).max;
    case Q::ShearMin: return model.at(span, local, after, M::kShear).min;
    case Q::ReactionMax: return model.reaction(span).max;
    case Q::ReactionMin: return model.reaction(span).min;
    default: return 0.0;
  }
}

namespace {

std::vector<std::vector<std::size_t>> code_arrangements(std::size_t n) {
  // All spans; alternate spans, both sets; each pair of adjacent spans.
  std::vector<std::vector<std::size_t>> out;
  auto push = [&](std::vector<std::size_t> a) {
    if (a.empty()) return;
    if (std::find(out.begin(), out.end(), a) == out.end()) out.push_back(std::move(a));
  };
  std::vector<std::size_t> all, odd, even;
  for (std::size_t s = 0; s < n; ++s) {
    all.push_back(s);
    (s % 2 == 0 ? odd : even).push_back(s);
  }
  push(all);
  push(odd);
  push(even);
  for (std::size_t s = 0; s + 1 < n; ++s) push({s, s + 1});
  return out;
}

// The four extremes looked for in each span of an envelope.
struct Target {
  EnvelopeModel::What what;
  bool want_max;
};
constexpr std::array<Target, 4> kTargets = {{{EnvelopeModel::kMoment, true},
                                             {EnvelopeModel::kMoment, false},
                                             {EnvelopeModel::kDeflection, true},
                                             {EnvelopeModel::kDeflection, false}}};

double quantity(const PointValues& p, EnvelopeModel::What w) {
  return w == EnvelopeModel::kMoment ? p.moment : w == EnvelopeModel::kShear ? p.shear : p.deflection;
}
// The derivative along x of that quantity (V = dM/dx, rotation = dv/dx).
double slope(const PointValues& p, EnvelopeModel::What w) {
  return w == EnvelopeModel::kMoment ? p.shear : p.rotation;
}

struct Best {
  double value = 0, local = 0;
  std::string by;
};

// The units' values at the Chebyshev-Lobatto points of one piece [a, b].
struct Piece {
  double a = 0, b = 0;
  std::vector<PointValues> ga, gb;
  std::array<std::vector<PointValues>, kDegree - 1> inner;
};

// Refines the extreme of one target on one piece. The envelope is the
// largest (smallest) of the arrangements' polynomials, so its kinks are
// convex (concave) and its extreme inside the piece lies where one
// arrangement's polynomial turns: take the arrangements that govern at the
// ends, the turning points of their polynomials (exactly, extremes.h), the
// arrangement that governs there, and so on until no new one appears.
void refine(const EnvelopeModel& model, std::size_t span, const Piece& pc, const Target& t, Best& best) {
  using Choice = EnvelopeModel::Choice;
  std::vector<double> g(model.units.size());
  auto gather = [&](const std::vector<PointValues>& v) {
    for (std::size_t u = 0; u < v.size(); ++u) g[u] = quantity(v[u], t.what);
  };
  std::vector<Choice> tried, queue(2);
  gather(pc.ga);
  model.extreme(g, t.want_max, &queue[0]);
  gather(pc.gb);
  model.extreme(g, t.want_max, &queue[1]);
  std::vector<PointValues> pv;
  std::vector<double> cand;
  for (int round = 0; round < 8 && !queue.empty(); ++round) {
    Choice c = std::move(queue.back());
    queue.pop_back();
    if (std::any_of(tried.begin(), tried.end(), [&](const Choice& o) { return same_choice(o, c); })) continue;
    auto sum = [&](const std::vector<PointValues>& v) {
      double s = 0;
      for (std::size_t u = 0; u < v.size(); ++u) s += c[u] * quantity(v[u], t.what);
      return s;
    };
    std::array<double, kDegree - 1> inner{};
    for (std::size_t j = 0; j < inner.size(); ++j) inner[j] = sum(pc.inner[j]);
    cand.clear();
    turning_points(pc.a, pc.b, sum(pc.ga), inner, sum(pc.gb), cand);
    tried.push_back(std::move(c));
    for (double x : cand) {
      model.values(span, x, false, pv);
      gather(pv);
      Choice here;
      const double v = model.extreme(g, t.want_max, &here);
      if (t.want_max ? v > best.value : v < best.value) {
        best.value = v;
        best.local = x;
        best.by = describe(model.governs(here), model.comb);
      }
      if (std::none_of(tried.begin(), tried.end(), [&](const Choice& o) { return same_choice(o, here); }))
        queue.push_back(std::move(here));
    }
  }
}

}  // namespace

namespace detail {

void run_envelope_method(const Method& method, const Beam& full, const input::Combination& comb,
                         const std::vector<Station>& stations, MethodResult& r) {
  using M = EnvelopeModel;
  auto model = std::make_shared<EnvelopeModel>();
  model->comb = comb;
  model->spans = full.spans.size();
  if (comb.arrangements == input::Arrangements::AdjacentAndAlternate) model->arrangements = code_arrangements(full.spans.size());
  // The shares (envelope.h). `full` holds the loads of the combination's
  // cases and their settlements, unfactored (load_sets.h).
  Beam blank = full;
  blank.loads.clear();
  for (auto& s : blank.supports) { s.settlement = 0; s.settlement_case.clear(); }
  for (std::size_t k = 0; k < comb.factors.size(); ++k) {
    const std::string& cs = comb.factors[k].first;
    const bool patterned = std::find(comb.pattern.begin(), comb.pattern.end(), cs) != comb.pattern.end();
    Beam rest = blank;
    std::vector<Beam> per_span(patterned ? full.spans.size() : 0, blank);
    for (const auto& l : full.loads) {
      if (l.load_case != cs) continue;
      if (patterned && !l.on_node) per_span[l.index].loads.push_back(l);
      else rest.loads.push_back(l);
    }
    bool settles = false;
    for (std::size_t i = 0; i < full.supports.size(); ++i)
      if (full.supports[i].settlement_case == cs && nonzero(full.supports[i].settlement)) {
        rest.supports[i].settlement = full.supports[i].settlement;
        settles = true;
      }
    if (!rest.loads.empty() || settles || !patterned) model->units.push_back({k, false, 0, std::move(rest), {}});
    for (std::size_t sp = 0; sp < per_span.size(); ++sp)
      if (!per_span[sp].loads.empty()) model->units.push_back({k, true, sp, std::move(per_span[sp]), {}});
  }
  {
    // The settlements that name no case act once, with factor 1.
    Beam once = blank;
    bool settles = false;
    for (std::size_t i = 0; i < full.supports.size(); ++i)
      if (full.supports[i].settlement_case.empty() && nonzero(full.supports[i].settlement)) {
        once.supports[i].settlement = full.supports[i].settlement;
        settles = true;
      }
    if (settles) model->units.push_back({M::kAlways, false, 0, std::move(once), {}});
  }
  if (model->units.empty()) model->units.push_back({M::kAlways, false, 0, blank, {}});
  r.status = MethodStatus::Ok;
  for (auto& u : model->units) {
    u.solution = method.solve(u.beam, stations);
    if (u.solution.status != MethodStatus::Ok) {
      r.status = u.solution.status;
      r.reason = u.solution.reason;
      return;
    }
    if (u.solution.nodes.size() != full.node_count() || !u.solution.at) {
      r.status = MethodStatus::Failed;
      r.reason = "the method returned an incomplete result";
      return;
    }
    const Equilibrium e = equilibrium_of(u.beam, u.solution.nodes);
    r.equilibrium.force_residual = std::max(r.equilibrium.force_residual, e.force_residual);
    r.equilibrium.moment_residual = std::max(r.equilibrium.moment_residual, e.moment_residual);
  }

  // The envelope at the stations, and the one-sided slope of each target's
  // bound there (from the governing arrangement's shear or rotation).
  Envelope env;
  const std::size_t ns = stations.size(), nu = model->units.size();
  env.moment.reserve(ns);
  env.shear.reserve(ns);
  env.deflection.reserve(ns);
  std::array<std::vector<double>, kTargets.size()> slopes;
  for (auto& s : slopes) s.resize(ns);
  std::vector<PointValues> pv;
  std::vector<double> g(nu);
  M::Choice choice;
  for (std::size_t i = 0; i < ns; ++i) {
    const Station& st = stations[i];
    model->values(st.span, st.local, st.after, pv);
    for (M::What w : {M::kMoment, M::kShear, M::kDeflection}) {
      for (std::size_t u = 0; u < nu; ++u) g[u] = quantity(pv[u], w);
      Bound b;
      M::Choice lo;
      b.max = model->extreme(g, true, &choice);
      b.min = model->extreme(g, false, &lo);
      b.max_by = model->governs(choice);
      b.min_by = model->governs(lo);
      for (std::size_t t = 0; t < kTargets.size(); ++t) {
        if (kTargets[t].what != w) continue;
        const M::Choice& c = kTargets[t].want_max ? choice : lo;
        double sl = 0;
        for (std::size_t u = 0; u < nu; ++u) sl += c[u] * slope(pv[u], w);
        slopes[t][i] = sl;
      }
      (w == M::kMoment ? env.moment : w == M::kShear ? env.shear : env.deflection).push_back(std::move(b));
    }
  }
  for (std::size_t j = 0; j < full.node_count(); ++j) env.reaction.push_back(model->reaction(j));
  auto finite = [](const std::vector<Bound>& v) {
    for (const auto& b : v)
      if (!std::isfinite(b.max) || !std::isfinite(b.min)) return false;
    return true;
  };
  if (!finite(env.moment) || !finite(env.shear) || !finite(env.deflection) || !finite(env.reaction)) {
    r.status = MethodStatus::Failed;
    r.reason = "the method produced a non-finite number";
    return;
  }

  // This method's span extremes of its envelope: the best station, then
  // each piece next to it and each piece whose ends slope towards an
  // extreme inside it, refined exactly.
  r.extremes.assign(full.spans.size(), {});
  std::size_t i = 0;
  double x0 = 0;
  for (std::size_t s = 0; s < full.spans.size(); ++s) {
    const std::size_t begin = i;
    while (i < ns && stations[i].span == s) ++i;
    const std::size_t end = i;
    if (end == begin) { x0 += full.spans[s].length; continue; }
    std::array<Best, kTargets.size()> best;
    std::array<std::size_t, kTargets.size()> at_station{};
    for (std::size_t t = 0; t < kTargets.size(); ++t) {
      const auto& v = kTargets[t].what == M::kMoment ? env.moment : env.deflection;
      for (std::size_t k = begin; k < end; ++k) {
        const double x = kTargets[t].want_max ? v[k].max : v[k].min;
        if (k == begin || (kTargets[t].want_max ? x > best[t].value : x < best[t].value)) {
          best[t].value = x;
          best[t].local = stations[k].local;
          at_station[t] = k;
        }
      }
      const Bound& bd = v[at_station[t]];
      best[t].by = describe(kTargets[t].want_max ? bd.max_by : bd.min_by, comb);
    }
    Piece pc;
    for (std::size_t k = begin; k + 1 < end; ++k) {
      const double a = stations[k].local, b = stations[k + 1].local;
      if (!(b > a)) continue;
      std::array<bool, kTargets.size()> go{};
      bool any = false;
      for (std::size_t t = 0; t < kTargets.size(); ++t) {
        const double sign = kTargets[t].want_max ? 1.0 : -1.0;
        const bool next_to_best = same(stations[at_station[t]].local, a) || same(stations[at_station[t]].local, b);
        go[t] = next_to_best || (sign * slopes[t][k] > 0 && sign * slopes[t][k + 1] < 0);
        any = any || go[t];
      }
      if (!any) continue;
      pc.a = a;
      pc.b = b;
      model->values(s, a, stations[k].after, pc.ga);
      model->values(s, b, stations[k + 1].after, pc.gb);
      const auto xs = sample_points(a, b);
      for (std::size_t j = 0; j < xs.size(); ++j) model->values(s, xs[j], false, pc.inner[j]);
      for (std::size_t t = 0; t < kTargets.size(); ++t)
        if (go[t]) refine(*model, s, pc, kTargets[t], best[t]);
    }
    SpanExtremes& e = r.extremes[s];
    e.max_moment = best[0].value; e.max_moment_x = x0 + best[0].local; e.max_moment_by = best[0].by;
    e.min_moment = best[1].value; e.min_moment_x = x0 + best[1].local; e.min_moment_by = best[1].by;
    const Best& d = std::abs(best[2].value) >= std::abs(best[3].value) ? best[2] : best[3];
    e.max_deflection = d.value; e.max_deflection_x = x0 + d.local; e.max_deflection_by = d.by;
    x0 += full.spans[s].length;
  }
  r.envelope = std::move(env);
  r.envelope_model = model;
}

void compare_envelopes(LoadSet& set, double agreement) {
  std::vector<MethodResult*> ok;
  for (auto& m : set.methods)
    if (m.status == MethodStatus::Ok && m.envelope) ok.push_back(&m);
  for (double& d : set.scale) d = 0;
  for (double& d : set.max_difference) d = 0;
  auto idx = [](Kind k) { return static_cast<int>(k); };
  for (auto* m : ok) {
    auto grow = [&](Kind k, const std::vector<Bound>& v) {
      for (const auto& b : v) set.scale[idx(k)] = std::max({set.scale[idx(k)], std::abs(b.max), std::abs(b.min)});
    };
    grow(Kind::Moment, m->envelope->moment);
    grow(Kind::Shear, m->envelope->shear);
    grow(Kind::Deflection, m->envelope->deflection);
    grow(Kind::Reaction, m->envelope->reaction);
  }
  floor_scales(set.scale, set.beam);
  // Consensus: the median of the methods' bounds; what governs from the first.
  std::vector<double> tmp;
  auto med = [&](auto get) { tmp.clear(); for (auto* m : ok) tmp.push_back(get(*m)); return median(tmp); };
  if (!ok.empty()) {
    set.consensus_envelope = *ok.front()->envelope;
    auto fill = [&](std::vector<Bound> Envelope::*field) {
      auto& out = set.consensus_envelope.*field;
      for (std::size_t i = 0; i < out.size(); ++i) {
        out[i].max = med([&](const MethodResult& m) { return ((*m.envelope).*field)[i].max; });
        out[i].min = med([&](const MethodResult& m) { return ((*m.envelope).*field)[i].min; });
      }
    };
    fill(&Envelope::moment);
    fill(&Envelope::shear);
    fill(&Envelope::deflection);
    fill(&Envelope::reaction);
  }
  double best = -1;
  std::vector<std::pair<std::pair<std::size_t, std::size_t>, double>> pairs;
  for (std::size_t a = 0; a < ok.size(); ++a)
    for (std::size_t b = a + 1; b < ok.size(); ++b) {
      double pw = 0;
      auto cmp = [&](Kind k, const std::vector<Bound>& A, const std::vector<Bound>& B, bool nodes) {
        const double sc = set.scale[idx(k)];
        for (std::size_t i = 0; i < A.size() && i < B.size(); ++i)
          for (int side = 0; side < 2; ++side) {
            const double va = side ? A[i].min : A[i].max, vb = side ? B[i].min : B[i].max;
            const double r = sc > 0 ? std::abs(va - vb) / sc : std::abs(va - vb);
            set.max_difference[idx(k)] = std::max(set.max_difference[idx(k)], r);
            pw = std::max(pw, r);
            if (r > best) {
              best = r;
              Worst w;
              w.kind = k;
              w.where = nodes ? "node " + set.beam.labels[i] + (side ? " (reaction_min)" : " (reaction_max)")
                              : "x = " + fmt(set.stations[i].x) + (side ? " (min)" : " (max)");
              w.x = nodes ? set.beam.node_x(i) : set.stations[i].x;
              w.values = {{ok[a]->name, va}, {ok[b]->name, vb}};
              set.worst = w;
            }
          }
      };
      cmp(Kind::Moment, ok[a]->envelope->moment, ok[b]->envelope->moment, false);
      cmp(Kind::Shear, ok[a]->envelope->shear, ok[b]->envelope->shear, false);
      cmp(Kind::Deflection, ok[a]->envelope->deflection, ok[b]->envelope->deflection, false);
      cmp(Kind::Reaction, ok[a]->envelope->reaction, ok[b]->envelope->reaction, true);
      // Each method's own span extremes of its envelope.
      auto ext = [&](Kind k, double va, double vb, std::size_t s, const char* what, double x) {
        const double sc = set.scale[idx(k)];
        const double r = sc > 0 ? std::abs(va - vb) / sc : std::abs(va - vb);
        set.max_difference[idx(k)] = std::max(set.max_difference[idx(k)], r);
        pw = std::max(pw, r);
        if (r > best) {
          best = r;
          Worst w;
          w.kind = k;
          w.where = "span " + std::to_string(s + 1) + " (" + what + ")";
          w.x = x;
          w.values = {{ok[a]->name, va}, {ok[b]->name, vb}};
          set.worst = w;
        }
      };
      const auto& XA = ok[a]->extremes;
      const auto& XB = ok[b]->extremes;
      for (std::size_t s = 0; s < XA.size() && s < XB.size(); ++s) {
        ext(Kind::Moment, XA[s].max_moment, XB[s].max_moment, s, "largest moment_max", XA[s].max_moment_x);
        ext(Kind::Moment, XA[s].min_moment, XB[s].min_moment, s, "smallest moment_min", XA[s].min_moment_x);
        ext(Kind::Deflection, XA[s].max_deflection, XB[s].max_deflection, s, "largest deflection", XA[s].max_deflection_x);
      }
      pairs.push_back({{a, b}, pw});
    }
  double worst_all = 0;
  for (double d : set.max_difference) worst_all = std::max(worst_all, d);
  bool failed = false;
  for (const auto& m : set.methods)
    if (m.status == MethodStatus::Failed) {
      failed = true;
      set.odd_one_out = m.name;
      set.problem = m.name + " failed: " + m.reason;
    }
  std::string unbalanced;
  for (auto* m : ok)
    if (m->equilibrium.force_residual > agreement || m->equilibrium.moment_residual > agreement) unbalanced = m->name;
  if (!unbalanced.empty()) {
    set.verdict = Verdict::Disagree;
    set.odd_one_out = unbalanced;
    set.problem = unbalanced + " is out of equilibrium in one of its unit solutions";
  } else if (failed) {
    set.verdict = Verdict::Disagree;
  } else if (ok.size() < 2) {
    set.verdict = Verdict::Unconfirmed;
    set.problem = ok.empty() ? "no method could analyse this beam" : "only " + ok.front()->name + " could analyse this beam; nothing confirms it";
  } else if (worst_all <= agreement) {
    set.verdict = Verdict::Agree;
  } else {
    set.verdict = Verdict::Disagree;
    if (ok.size() == 3)
      for (const auto& p : pairs)
        if (p.second <= agreement)
          for (std::size_t k = 0; k < 3; ++k)
            if (k != p.first.first && k != p.first.second) set.odd_one_out = ok[k]->name;
    if (set.worst)
      set.problem = std::string("the envelopes differ in ") + kind_name(set.worst->kind) + " at " + set.worst->where + " by " +
                    fmt(best) + " of the largest " + kind_name(set.worst->kind) +
                    (set.odd_one_out.empty() ? "" : "; " + set.odd_one_out + " is the odd one out");
  }
}


void second_route(LoadSet& set, const std::vector<const Method*>& methods, double agreement) {
  using M = EnvelopeModel;
  set.second_route.clear();
  const MethodResult* lead = nullptr;
  for (const auto& m : set.methods)
    if (m.status == MethodStatus::Ok && m.envelope_model) { lead = &m; break; }
  if (!lead || set.extremes.size() != set.beam.spans.size()) return;
  const M& model = *lead->envelope_model;
  const Beam& beam = set.beam;

  // What the envelope reports as governing, and the arrangement (with its
  // factors) that governs it in the lead method's model.
  struct Item {
    RouteCheck check;
    Kind kind = Kind::Moment;
    bool node = false;
    std::size_t index = 0;  // span or node
    double local = 0;
    M::What what = M::kMoment;
    std::size_t arrangement = 0;
  };
  std::vector<Item> items;
  std::vector<M::Choice> choices;
  std::vector<PointValues> pv;
  std::vector<double> g(model.units.size());
  auto add = [&](Item it, bool want_max) {
    M::Choice c;
    model.extreme(g, want_max, &c);
    std::size_t k = 0;
    while (k < choices.size() && !same_choice(choices[k], c)) ++k;
    if (k == choices.size()) choices.push_back(c);
    it.arrangement = k;
    it.check.arrangement = describe(model.governs(c), model.comb);
    items.push_back(std::move(it));
  };
  double x0 = 0;
  for (std::size_t s = 0; s < beam.spans.size(); ++s) {
    const SpanExtremes& e = set.extremes[s];
    const double L = beam.spans[s].length;
    struct Spec { const char* q; double v, x; M::What w; bool want_max; Kind k; };
    const Spec specs[] = {{"max_moment", e.max_moment, e.max_moment_x, M::kMoment, true, Kind::Moment},
                          {"min_moment", e.min_moment, e.min_moment_x, M::kMoment, false, Kind::Moment},
                          {"max_deflection", e.max_deflection, e.max_deflection_x, M::kDeflection, e.max_deflection >= 0,
                           Kind::Deflection}};
    for (const Spec& sp : specs) {
      Item it;
      it.check.quantity = sp.q;
      it.check.where = "span " + std::to_string(s + 1);
      it.check.x = sp.x;
      it.check.envelope = sp.v;
      it.kind = sp.k;
      it.index = s;
      it.local = std::min(std::max(sp.x - x0, 0.0), L);
      it.what = sp.w;
      model.values(s, it.local, false, pv);
      for (std::size_t u = 0; u < pv.size(); ++u) g[u] = quantity(pv[u], sp.w);
      add(std::move(it), sp.want_max);
    }
    x0 += L;
  }
  for (std::size_t j = 0; j < beam.node_count(); ++j) {
    const SupportType t = beam.supports[j].type;
    if (!restrains_deflection(t) && t != SupportType::Spring) continue;
    for (int side = 0; side < 2; ++side) {
      Item it;
      it.check.quantity = side ? "reaction_min" : "reaction_max";
      it.check.where = "node " + beam.labels[j];
      it.check.x = beam.node_x(j);
      const Bound& b = set.consensus_envelope.reaction[j];
      it.check.envelope = side ? b.min : b.max;
      it.kind = Kind::Reaction;
      it.node = true;
      it.index = j;
      for (std::size_t u = 0; u < model.units.size(); ++u) g[u] = model.units[u].solution.nodes[j].reaction_force;
      add(std::move(it), side == 0);
    }
  }

  // Each arrangement solved directly by every method, as an ordinary load set.
  std::vector<std::vector<Solution>> solved(choices.size());
  for (std::size_t k = 0; k < choices.size(); ++k) {
    const Beam b = model.arrangement_beam(choices[k]);
    const std::vector<Station> st = build_stations(b, 1);
    for (const Method* m : methods) {
      Solution sol;
      try {
        sol = m->solve(b, st);
      } catch (const std::exception& e) {
        sol.status = MethodStatus::Failed;
        sol.reason = std::string("internal error: ") + e.what();
      }
      solved[k].push_back(std::move(sol));
    }
  }
  const RouteCheck* worst = nullptr;
  for (auto& it : items) {
    RouteCheck& rc = it.check;
    const double sc = set.scale[static_cast<int>(it.kind)];
    rc.holds = true;
    for (std::size_t mi = 0; mi < methods.size(); ++mi) {
      const Solution& sol = solved[it.arrangement][mi];
      if (sol.status != MethodStatus::Ok || !sol.at || sol.nodes.size() != beam.node_count()) {
        if (sol.status != MethodStatus::NotApplicable) rc.holds = false;
        continue;
      }
      double v;
      if (it.node) {
        v = sol.nodes[it.index].reaction_force;
      } else {
        // At a point force or couple the value reported may be either
        // limit: the nearer one is the value the arrangement has there.
        const double l = quantity(sol.at(it.index, it.local, false), it.what);
        const double r = quantity(sol.at(it.index, it.local, true), it.what);
        v = std::abs(l - rc.envelope) <= std::abs(r - rc.envelope) ? l : r;
      }
      rc.values.emplace_back(methods[mi]->name, v);
      const double d = sc > 0 ? std::abs(v - rc.envelope) / sc : std::abs(v - rc.envelope);
      rc.difference = std::max(rc.difference, d);
    }
    if (rc.values.empty() || !(rc.difference <= agreement)) rc.holds = false;
    if (!rc.holds && (!worst || rc.difference > worst->difference)) worst = &rc;
    set.second_route.push_back(rc);
  }
  if (worst) {
    set.verdict = Verdict::Disagree;
    std::string vals;
    for (const auto& [name, v] : worst->values) vals += (vals.empty() ? "" : ", ") + name + " " + fmt(v);
    set.problem = "second route: the envelope's " + worst->quantity + " of " + worst->where + " (" + fmt(worst->envelope) +
                  ") is not what its governing arrangement (" + worst->arrangement + ") gives when solved directly (" +
                  (vals.empty() ? std::string("no method solved it") : vals) + ")";
  }
}

}  // namespace detail
}  // namespace trivet::compare
