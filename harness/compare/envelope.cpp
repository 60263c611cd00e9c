#include "harness/compare/envelope.h"

#include <algorithm>
#include <array>
#include <cstdint>
#include <cstring>
#include <atomic>
#include <cmath>
#include <exception>
#include <future>
#include <map>
#include <memory>
#include <new>
#include <string>
#include <system_error>
#include <thread>

#include "harness/compare/detail.h"
#include "harness/compare/extremes.h"
#include "harness/compare/moving.h"
#include "methods/beam/status.h"

namespace trivet::compare {

using namespace detail;

namespace {

bool nonzero(double v) { return std::abs(v) > 0; }
bool same(double a, double b) { return !(a < b) && !(b < a); }

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

void EnvelopeModel::prepare() {
  span_units.assign(comb.factors.size(), {});
  for (std::size_t u = 0; u < units.size(); ++u) {
    const Unit& un = units[u];
    if (!un.patterned || un.factor >= span_units.size()) continue;
    auto& su = span_units[un.factor];
    if (su.empty()) su.assign(spans, kAlways);
    if (un.span < su.size()) su[un.span] = u;
  }
  options.assign(units.size(), Options{});
  const bool all = comb.arrangements == input::Arrangements::All || arrangements.empty();
  if (!all) return;
  for (std::size_t u = 0; u < units.size(); ++u) {
    Options& o = options[u];
    const bool off = units[u].patterned;
    // pick() with a value of each sign (its choice depends on nothing else).
    pick(u, 1.0, true, off, &o.max_pos);
    pick(u, -1.0, true, off, &o.max_neg);
    pick(u, 0.0, true, off, &o.max_zero);
    pick(u, 1.0, false, off, &o.min_pos);
    pick(u, -1.0, false, off, &o.min_neg);
    pick(u, 0.0, false, off, &o.min_zero);
  }
}

double EnvelopeModel::extreme(const std::vector<double>& g, bool want_max, Choice* choice) const {
  double f = 0;
  if (comb.arrangements == input::Arrangements::All || arrangements.empty()) {
    // Every share independently: the sum of each share's best.
    if (choice) choice->resize(units.size());
    // A share whose value here is below one unit in the last place of the
    // sum of every share's magnitude cannot change the sum beyond its
    // rounding: it is taken as zero (a patterned share stays off), so that
    // what governs names the spans that matter, not a far span whose
    // influence is rounding.
    double magnitude = 0;
    for (std::size_t u = 0; u < units.size(); ++u) magnitude += std::abs(g[u]);
    const double negligible = magnitude * 0x1p-52;
    double sum = 0;
    if (options.size() == units.size()) {
      // The factor pick() would choose, by the sign of the value (a
      // positive value wants the largest factor, a negative one the
      // smallest, for the largest sum; zero the first option).
      for (std::size_t u = 0; u < units.size(); ++u) {
        const Options& o = options[u];
        const double v = g[u];
        const bool pos = v > negligible, neg = v < -negligible;
        const double fu = want_max ? (pos ? o.max_pos : neg ? o.max_neg : o.max_zero)
                                   : (pos ? o.min_pos : neg ? o.min_neg : o.min_zero);
        sum += fu * v;
        if (choice) (*choice)[u] = fu;
      }
      return sum;
    }
    for (std::size_t u = 0; u < units.size(); ++u) {
      const double v = std::abs(g[u]) > negligible ? g[u] : 0.0;
      pick(u, v, want_max, units[u].patterned, &f);
      sum += f * g[u];
      if (choice) (*choice)[u] = f;
    }
    return sum;
  }
  // Named arrangements: the shares that are not patterned pick their best;
  // each span's patterned shares are on or off together.
  if (choice) choice->assign(units.size(), 0.0);
  double fixed_part = 0;
  std::vector<double> on(spans, 0.0);
  for (std::size_t u = 0; u < units.size(); ++u) {
    const double v = pick(u, g[u], want_max, false, &f);
    if (units[u].patterned) on[units[u].span] += v;
    else {
      fixed_part += v;
      if (choice) (*choice)[u] = f;
    }
  }
  std::size_t best_a = 0;
  double best = 0;
  for (std::size_t a = 0; a < arrangements.size(); ++a) {
    double v = fixed_part;
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

void EnvelopeModel::extend_pattern(const std::vector<double>& g, Choice& c) const {
  if (c.size() != units.size() || g.size() != units.size()) return;
  double magnitude = 0;
  for (double v : g) magnitude += std::abs(v);
  const double negligible = magnitude * 0x1p-52;
  for (const auto& su : span_units) {
    if (su.empty()) continue;
    auto matters = [&](std::size_t s) { return su[s] != kAlways && std::abs(g[su[s]]) > negligible; };
    std::size_t first = su.size(), last = 0;
    for (std::size_t s = 0; s < su.size(); ++s)
      if (matters(s)) { first = std::min(first, s); last = s; }
    if (first == su.size()) continue;
    for (std::size_t s = last + 1; s < su.size(); ++s)
      if (su[s] != kAlways && s >= 2 && su[s - 2] != kAlways) c[su[s]] = c[su[s - 2]];
    for (std::size_t s = first; s-- > 0;)
      if (su[s] != kAlways && s + 2 < su.size() && su[s + 2] != kAlways) c[su[s]] = c[su[s + 2]];
  }
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
    gv.spans.push_back(static_cast<std::uint32_t>(units[u].span));
    if (!fixed[k]) { gv.factors[k] = c[u]; fixed[k] = 2; }
    else if (fixed[k] == 2 && !same(gv.factors[k], c[u])) gv.spans_other_factor.push_back(static_cast<std::uint32_t>(units[u].span));
  }
  auto tidy = [](std::vector<std::uint32_t>& v) {
    if (!std::is_sorted(v.begin(), v.end())) std::sort(v.begin(), v.end());
    v.erase(std::unique(v.begin(), v.end()), v.end());
  };
  tidy(gv.spans);
  tidy(gv.spans_other_factor);
  return gv;
}

const Governs& governs_of(const std::shared_ptr<const Governs>& g) {
  static const Governs none;
  return g ? *g : none;
}

namespace {
bool same_governs(const Governs& a, const Governs& b) {
  return a.spans == b.spans && a.spans_other_factor == b.spans_other_factor && a.factors.size() == b.factors.size() &&
         std::equal(a.factors.begin(), a.factors.end(), b.factors.begin(), same);
}
}  // namespace

std::shared_ptr<const Governs> EnvelopeModel::intern(Governs g, Interned* pool) const {
  if (!pool) return std::make_shared<const Governs>(std::move(g));
  // The pool is keyed by the loaded spans' count and first span; the few
  // arrangements under one key are compared whole.
  const std::pair<std::size_t, std::size_t> key{g.spans.size(), g.spans.empty() ? 0 : g.spans.front()};
  auto& bucket = pool->buckets[key];
  for (const auto& p : bucket)
    if (same_governs(*p, g)) return p;
  g.spans.shrink_to_fit();  // kept for the whole run: no spare capacity
  g.spans_other_factor.shrink_to_fit();
  bucket.push_back(std::make_shared<const Governs>(std::move(g)));
  return bucket.back();
}

namespace {
// A hash of a choice's factors (FNV-1a over their bits; 0 and -0 alike).
constexpr std::uint64_t kHashStart = 14695981039346656037ull;
inline std::uint64_t hash_step(std::uint64_t h, double f) {
  std::uint64_t bits = 0;
  const double v = f + 0.0;
  std::memcpy(&bits, &v, sizeof bits);
  return (h ^ bits) * 1099511628211ull;
}
std::uint64_t hash_of(const EnvelopeModel::Choice& c) {
  std::uint64_t h = kHashStart;
  for (double f : c) h = hash_step(h, f);
  return h;
}
}  // namespace

std::shared_ptr<const Governs> EnvelopeModel::governs(const Choice& c, Interned* pool) const {
  if (!pool) return intern(governs(c), nullptr);
  return governs(c, hash_of(c), pool);
}

std::shared_ptr<const Governs> EnvelopeModel::governs(const Choice& c, std::uint64_t h, Interned* pool) const {
  for (const auto& r : pool->recent)
    if (r.by && r.hash == h && r.choice.size() == c.size() && std::equal(c.begin(), c.end(), r.choice.begin(), same))
      return r.by;
  auto by = intern(governs(c), pool);
  pool->recent[pool->next] = {c, h, by};
  pool->next = (pool->next + 1) % pool->recent.size();
  return by;
}

Bound EnvelopeModel::combine(const std::vector<double>& g, Interned* pool) const {
  Bound b;
  Choice own_hi, own_lo;
  Choice& hi = pool ? pool->hi : own_hi;
  Choice& lo = pool ? pool->lo : own_lo;
  const bool all = comb.arrangements == input::Arrangements::All || arrangements.empty();
  if (all && pool && options.size() == units.size()) {
    // extreme() for both bounds in one pass (the same sums, term by term in
    // the same order), with the choices' hashes (hash_of) on the way.
    double magnitude = 0;
    for (std::size_t u = 0; u < units.size(); ++u) magnitude += std::abs(g[u]);
    const double negligible = magnitude * 0x1p-52;
    hi.resize(units.size());
    lo.resize(units.size());
    double sum_hi = 0, sum_lo = 0;
    std::uint64_t h_hi = kHashStart, h_lo = kHashStart;
    for (std::size_t u = 0; u < units.size(); ++u) {
      const Options& o = options[u];
      const double v = g[u];
      const bool pos = v > negligible, neg = v < -negligible;
      const double f_hi = pos ? o.max_pos : neg ? o.max_neg : o.max_zero;
      const double f_lo = pos ? o.min_pos : neg ? o.min_neg : o.min_zero;
      sum_hi += f_hi * v;
      sum_lo += f_lo * v;
      hi[u] = f_hi;
      lo[u] = f_lo;
      h_hi = hash_step(h_hi, f_hi);
      h_lo = hash_step(h_lo, f_lo);
    }
    b.max = sum_hi;
    b.min = sum_lo;
    b.max_by = governs(hi, h_hi, pool);
    b.min_by = governs(lo, h_lo, pool);
    return b;
  }
  b.max = extreme(g, true, &hi);
  b.min = extreme(g, false, &lo);
  b.max_by = governs(hi, pool);
  b.min_by = governs(lo, pool);
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
  for (std::size_t u = 0; u < units.size(); ++u) g[u] = units[u].reactions[node];
  return combine(g);
}

Beam EnvelopeModel::arrangement_beam(const Choice& c) const {
  Beam b = base;
  std::size_t count = 0;
  for (std::size_t u = 0; u < units.size() && u < c.size(); ++u)
    if (nonzero(c[u])) count += units[u].loads.size();
  b.loads.reserve(count);
  for (std::size_t u = 0; u < units.size() && u < c.size(); ++u) {
    const double f = c[u];
    if (!nonzero(f)) continue;
    for (const auto& l : units[u].loads) {
      Load s = l;
      s.P *= f; s.C *= f; s.w1 *= f; s.w2 *= f;
      b.loads.push_back(s);
    }
    for (const auto& [i, d] : units[u].settlements) b.supports[i].settlement += f * d;
  }
  return b;
}

Beam EnvelopeModel::unit_beam(std::size_t u) const {
  Beam b = base;
  b.loads = units[u].loads;
  for (const auto& [i, d] : units[u].settlements) b.supports[i].settlement = d;
  return b;
}

namespace {
// 0-based spans, increasing, as 1-based text: a run of three or more
// consecutive spans as "4-9", a run of five or more every other span as
// "2, 4, ..., 40", the rest listed.
std::string span_list(const std::vector<std::uint32_t>& v) {
  std::string s;
  auto num = [&](std::size_t i) { return std::to_string(static_cast<std::size_t>(v[i]) + 1); };
  for (std::size_t i = 0; i < v.size();) {
    std::size_t one = i, two = i;
    while (one + 1 < v.size() && v[one + 1] == v[one] + 1) ++one;
    while (two + 1 < v.size() && v[two + 1] == v[two] + 2) ++two;
    if (!s.empty()) s += ", ";
    if (one - i + 1 >= 3) {
      s += num(i) + "-" + num(one);
      i = one + 1;
    } else if (two - i + 1 >= 5) {
      s += num(i) + ", " + num(i + 1) + ", ..., " + num(two);
      i = two + 1;
    } else {
      s += num(i);
      ++i;
    }
  }
  return s;
}
}  // namespace

std::string describe(const Governs& g, const input::Combination& c) {
  std::string s;
  if (!c.pattern.empty()) {
    if (g.spans.empty()) s = "no span loaded";
    else {
      s = g.spans.size() == 1 ? "span " : "spans ";
      s += span_list(g.spans);
      s += " loaded";
      if (!g.spans_other_factor.empty()) {
        s += g.spans_other_factor.size() == 1 ? " (span " : " (spans ";
        s += span_list(g.spans_other_factor);
        s += " with the other end of the factor range)";
      }
    }
    s += "; ";
  }
  for (std::size_t k = 0; k < c.factors.size() && k < g.factors.size(); ++k)
    s += (k ? ", " : "") + c.factors[k].first + " x" + fmt(g.factors[k]);
  if (c.moving && g.train != Governs::Train::None) {
    if (!s.empty() && s.back() != ' ') s += "; ";
    const auto& [name, f] = *c.moving;
    s += name;
    if (f < 1 || f > 1) s += " x" + fmt(f);
    s += g.train == Governs::Train::Off ? std::string(" off the beam")
                                        : " with its first point at x = " + fmt_place(g.first) +
                                              (g.backward ? ", running backward" : ", running forward") +
                                              (g.approach < 0 ? " (the limit as it arrives there from the left)"
                                               : g.approach > 0 ? " (the limit as it arrives there from the right)" : "");
  }
  return s;
}

std::optional<double> envelope_value(const MethodResult& m, input::Quantity q, std::size_t span, double local, bool after) {
  if (m.envelope_model) return envelope_value(*m.envelope_model, q, span, local, after);
  if (!m.moving_model) return std::nullopt;
  using Q = input::Quantity;
  using V = MovingModel;
  const V& model = *m.moving_model;
  switch (q) {
    case Q::MomentMax: return model.at(span, local, after, V::kMoment).max;
    case Q::MomentMin: return model.at(span, local, after, V::kMoment).min;
    case Q::ShearMax: return model.at(span, local, after, V::kShear).max;
    case Q::ShearMin: return model.at(span, local, after, V::kShear).min;
    case Q::ReactionMax: return model.reaction(span).max;
    case Q::ReactionMin: return model.reaction(span).min;
    default: return 0.0;
  }
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

double quantity(const PointValues& p, EnvelopeModel::What w) {
  return w == EnvelopeModel::kMoment ? p.moment : w == EnvelopeModel::kShear ? p.shear : p.deflection;
}
struct Best {
  double value = 0, local = 0;
  // What governs: interned at a station, or the choice found between
  // stations (described once, at the end).
  std::shared_ptr<const Governs> at_station;
  EnvelopeModel::Choice between;
  std::string describe(const EnvelopeModel& model) const {
    return compare::describe(between.empty() ? governs_of(at_station) : model.governs(between), model.comb);
  }
};

// One piece [a, b] of a span between consecutive stations, and each unit's
// moment and deflection on it as polynomials (extremes.h): exact, as no
// point force or couple acts inside and the distributed loads are linear.
struct Zeros {
  std::array<double, kDegree> t{};  // a polynomial of degree kDegree has at most kDegree zeros
  int count = -1;                   // -1: not found yet
};
struct Piece {
  double a = 0, b = 0;
  std::vector<Poly> poly[2];   // [0] moment, [1] deflection; one per unit
  std::vector<std::pair<double, double>> range[2];  // rigorous bounds of each unit's value on the piece
  std::vector<double> size[2]; // a bound on each unit's |value| on the piece
  std::vector<Zeros> zeros[2]; // each unit's zeros in (-1, 1), found when first asked
  double negligible[2] = {0, 0};  // below this a unit's kinks are rounding (see walk)
};

// The factor a unit takes where its value is positive (pos) and where it
// is negative (neg), to make sign * (factor * value) largest; `on` false
// for a unit that is off (AA arrangement without its span).
struct Factors {
  double pos = 0, neg = 0;
};

Factors factors_of(const EnvelopeModel& model, std::size_t u, double sign, bool allow_off) {
  const auto& un = model.units[u];
  std::vector<double> opts;
  if (un.factor == EnvelopeModel::kAlways) opts = {1.0};
  else {
    const input::Factor& f = model.comb.factors[un.factor].second;
    if (allow_off) opts.push_back(0.0);
    opts.push_back(f.high);
    if (f.range) opts.push_back(f.low);
  }
  Factors r{opts.front(), opts.front()};
  for (double f : opts) {
    if (sign * f > sign * r.pos) r.pos = f;  // largest sign*f where the value is positive
    if (sign * f < sign * r.neg) r.neg = f;  // smallest where it is negative
  }
  return r;
}

// A rigorous bound on a polynomial on [-1, 1]: c0 -+ the sum of |c_k|.
std::pair<double, double> range_of(const Poly& p) {
  double spread = 0;
  for (std::size_t k = 1; k < p.size(); ++k) spread += std::abs(p[k]);
  return {p[0] - spread, p[0] + spread};
}

// The largest of sign * E on the piece, where E is the sum over `units` of
// each unit's value times its factor (pos where the value is positive, neg
// where it is negative; factors[u]). Exact: between consecutive zeros of
// the units whose factor changes with the sign (the kinks of E), E is one
// polynomial, whose largest value is at an end or a zero of its derivative.
// Sub-pieces that cannot beat `floor` (the best value so far, times sign)
// are skipped. Returns (largest sign * E, t).
std::pair<double, double> walk(Piece& pc, int q, const std::vector<std::size_t>& units,
                               const std::vector<Factors>& factors, double sign, double floor) {
  // The cuts: (t, unit, the middle of the unit's stretch after t, before
  // its next zero). A unit's sign is read in the middle of its own stretch
  // between its zeros, never near a zero of another unit, where a tiny
  // sub-piece would leave only rounding to read.
  struct Cut {
    double t;
    std::size_t u;
    double mid_after;
  };
  std::vector<Cut> cuts;
  std::vector<double> first_mid(pc.poly[q].size(), 0.0);
  for (std::size_t u : units) {
    if (same(factors[u].pos, factors[u].neg)) continue;  // no kink
    // A unit whose whole value on the piece is below rounding of the sum
    // (far spans: influence decays span by span) changes the sum by less
    // than its rounding wherever it switches: its kinks are not cut.
    if (pc.size[q][u] <= pc.negligible[q]) continue;
    const Poly& p = pc.poly[q][u];
    const auto rg = range_of(p);
    if (rg.first > 0 || rg.second < 0) continue;  // no zero on the piece
    Zeros& z = pc.zeros[q][u];
    if (z.count < 0) {
      z.count = 0;
      std::array<double, kDegree> found{};
      const int nf = poly_zeros(p, -1.0, 1.0, found);
      for (int j = 0; j < nf; ++j)
        if (found[static_cast<std::size_t>(j)] > -1.0 && found[static_cast<std::size_t>(j)] < 1.0)
          z.t[static_cast<std::size_t>(z.count++)] = found[static_cast<std::size_t>(j)];
    }
    const std::size_t nz = static_cast<std::size_t>(z.count);
    if (nz > 0) first_mid[u] = 0.5 * (-1.0 + z.t[0]);
    for (std::size_t k = 0; k < nz; ++k)
      cuts.push_back({z.t[k], u, 0.5 * (z.t[k] + (k + 1 < nz ? z.t[k + 1] : 1.0))});
  }
  std::sort(cuts.begin(), cuts.end(), [](const Cut& x, const Cut& y) { return x.t < y.t; });
  std::vector<double> ts{-1.0};
  for (const auto& c : cuts)
    if (c.t > ts.back()) ts.push_back(c.t);
  ts.push_back(1.0);
  std::vector<double> taken(pc.poly[q].size(), 0.0);
  Poly sum{};
  auto take = [&](std::size_t u, double t) {
    const double y = evaluate(pc.poly[q][u], t);
    const double f = y < 0 ? factors[u].neg : factors[u].pos;
    const double df = f - taken[u];
    if (nonzero(df))
      for (std::size_t k = 0; k < sum.size(); ++k) sum[k] += df * pc.poly[q][u][k];
    taken[u] = f;
  };
  for (std::size_t u : units) take(u, first_mid[u]);
  std::pair<double, double> best{0.0, -1.0};
  bool first = true;
  std::size_t c = 0;
  for (std::size_t i = 0; i + 1 < ts.size(); ++i) {
    // Past each cut at ts[i]: its unit takes the factor of its next stretch.
    while (c < cuts.size() && !(cuts[c].t > ts[i])) {
      take(cuts[c].u, cuts[c].mid_after);
      ++c;
    }
    // A rigorous bound first: sign * sum at the middle plus the largest
    // slope on [-1, 1] times the half width. A sub-piece that cannot beat
    // the best so far is not searched.
    const double mid = 0.5 * (ts[i] + ts[i + 1]), half = 0.5 * (ts[i + 1] - ts[i]);
    double slope = 0;
    for (std::size_t k = 1; k < sum.size(); ++k) slope += static_cast<double>(k) * std::abs(sum[k]);
    if (!first && !(sign * evaluate(sum, mid) + slope * half > std::max(best.first, floor))) continue;
    const auto m = largest(sum, ts[i], ts[i + 1], sign);
    if (first || m.first > best.first) { best = m; first = false; }
  }
  return best;
}

// One method's envelope at the stations, and its span extremes, exactly:
// per span the largest moment_max, the smallest moment_min and the largest
// magnitude of the deflection envelope, anywhere (README, "How the check
// works"). On each piece between stations every unit's moment and
// deflection is a polynomial: for a unit with no load on the span, its
// moment is linear and its deflection the cubic through its end values and
// slopes (the rotation is dv/dx); a unit with loads there is sampled at the
// piece's Chebyshev-Lobatto points. The envelope is, for "all", the sum of
// each unit's best share, and for "adjacent-and-alternate" the best over
// the arrangements of such sums; `walk` finds the largest of such a sum
// exactly. A piece (or an arrangement) whose rigorous upper bound cannot
// beat the best value so far is skipped. The value found is evaluated again
// from the units at its point, with what governs it.
// Spans [span_begin, span_end) only: `env` gets the envelope at their
// stations, in order, and out[s] their extremes (`out` has a place for
// every span), so that two parts of a long beam can run side by side.
void envelope_and_extremes(const EnvelopeModel& model, const Beam& full, const std::vector<Station>& stations,
                           Envelope& env, std::vector<SpanExtremes>& out, std::size_t span_begin, std::size_t span_end) {
  using M = EnvelopeModel;
  const std::size_t ns = stations.size(), nu = model.units.size();
  const bool all = model.comb.arrangements == input::Arrangements::All || model.arrangements.empty();
  // The units of each "walk": every unit for "all"; per arrangement, the
  // units that are not patterned and the patterned ones on its spans.
  std::vector<std::vector<std::size_t>> walks;
  std::vector<std::vector<std::size_t>> by_span(model.spans);
  std::vector<std::size_t> fixed_units;
  for (std::size_t u = 0; u < nu; ++u)
    (model.units[u].patterned ? by_span[model.units[u].span] : fixed_units).push_back(u);
  if (all) {
    walks.emplace_back();
    for (std::size_t u = 0; u < nu; ++u) walks.back().push_back(u);
  } else {
    for (const auto& arr : model.arrangements) {
      walks.push_back(fixed_units);
      for (std::size_t sp : arr) walks.back().insert(walks.back().end(), by_span[sp].begin(), by_span[sp].end());
    }
  }
  // The units with a load on each span (the others are polynomials of the
  // end values there).
  std::vector<std::vector<std::size_t>> loading(full.spans.size());
  for (std::size_t u = 0; u < nu; ++u) {
    std::vector<char> on(full.spans.size(), 0);
    for (const auto& l : model.units[u].loads)
      if (!l.on_node && l.index < on.size()) on[l.index] = 1;
    for (std::size_t sp = 0; sp < on.size(); ++sp)
      if (on[sp]) loading[sp].push_back(u);
  }
  // Each unit's factors where its value is positive / negative, for the
  // largest (sign +1) and the smallest (sign -1) envelope.
  std::vector<Factors> fac[2];
  for (int k = 0; k < 2; ++k)
    for (std::size_t u = 0; u < nu; ++u)
      fac[k].push_back(factors_of(model, u, k == 0 ? 1.0 : -1.0, all && model.units[u].patterned));
  double max_factor = 1.0;
  for (const auto& [cs, f] : model.comb.factors) max_factor = std::max({max_factor, std::abs(f.low), std::abs(f.high)});

  env.moment.reserve(ns);
  env.shear.reserve(ns);
  env.deflection.reserve(ns);
  M::Interned pool;
  std::vector<std::vector<PointValues>> at_station;  // the units' values at the span's stations
  std::array<std::vector<PointValues>, kDegree - 1> inner_values;
  std::vector<PointValues> pv;
  std::vector<double> g(nu);
  M::Choice choice;
  Piece pc;
  std::size_t i = 0;
  double x0 = 0;
  while (i < ns && stations[i].span < span_begin) ++i;
  for (std::size_t s = 0; s < span_begin; ++s) x0 += full.spans[s].length;
  const std::size_t i0 = i;  // env's first station
  for (std::size_t s = span_begin; s < span_end; ++s) {
    const std::size_t begin = i;
    while (i < ns && stations[i].span == s) ++i;
    const std::size_t end = i;
    at_station.resize(std::max(at_station.size(), end - begin));
    for (std::size_t k = begin; k < end; ++k) {
      auto& v = at_station[k - begin];
      model.values(s, stations[k].local, stations[k].after, v);
      for (M::What w : {M::kMoment, M::kShear, M::kDeflection}) {
        for (std::size_t u = 0; u < nu; ++u) g[u] = quantity(v[u], w);
        (w == M::kMoment ? env.moment : w == M::kShear ? env.shear : env.deflection).push_back(model.combine(g, &pool));
      }
    }
    if (end == begin) { x0 += full.spans[s].length; continue; }
    // Targets: 0 moment max, 1 moment min, 2 deflection max, 3 deflection min.
    std::array<Best, 4> best;
    for (int t = 0; t < 4; ++t) {
      const auto& v = t < 2 ? env.moment : env.deflection;
      const bool want_max = t % 2 == 0;
      std::size_t at = begin;
      for (std::size_t k = begin; k < end; ++k) {
        const double x = want_max ? v[k - i0].max : v[k - i0].min;
        const double b = want_max ? v[at - i0].max : v[at - i0].min;
        if (want_max ? x > b : x < b) at = k;
      }
      const Bound& here = v[at - i0];
      Best& bt = best[static_cast<std::size_t>(t)];
      bt.value = want_max ? here.max : here.min;
      bt.local = stations[at].local;
      bt.at_station = want_max ? here.max_by : here.min_by;
      bt.between.clear();
    }
    for (std::size_t k = begin; k + 1 < end; ++k) {
      const double a = stations[k].local, b = stations[k + 1].local;
      if (!(b > a)) continue;
      pc.a = a;
      pc.b = b;
      const std::vector<PointValues>& va = at_station[k - begin];
      const std::vector<PointValues>& vb = at_station[k + 1 - begin];
      const double h = 0.5 * (b - a);
      for (int q = 0; q < 2; ++q) {
        pc.poly[q].resize(nu);
        pc.zeros[q].assign(nu, Zeros{});
        pc.size[q].resize(nu);
        pc.range[q].resize(nu);
      }
      // Units without a load on the span: M linear, v the Hermite cubic.
      for (std::size_t u = 0; u < nu; ++u) {
        const PointValues& A = va[u];
        const PointValues& B = vb[u];
        pc.poly[0][u] = Poly{0.5 * (A.moment + B.moment), 0.5 * (B.moment - A.moment), 0, 0, 0, 0};
        // v(t) on [-1, 1] with v(-1) = A, v(1) = B, dv/dt = h * rotation.
        const double p0 = A.deflection, p1 = B.deflection, m0 = h * A.rotation, m1 = h * B.rotation;
        pc.poly[1][u] = Poly{0.5 * (p0 + p1) - 0.25 * (m1 - m0), 0.75 * (p1 - p0) - 0.25 * (m0 + m1), 0.25 * (m1 - m0),
                             0.25 * (m0 + m1) - 0.25 * (p1 - p0), 0, 0};
      }
      // Units with a load on the span: sampled inside the piece.
      if (!loading[s].empty()) {
        const auto xs = sample_points(a, b);
        for (std::size_t j = 0; j < xs.size(); ++j) {
          inner_values[j].resize(nu);
          for (std::size_t u : loading[s]) inner_values[j][u] = model.units[u].solution.at(s, xs[j], false);
        }
        for (std::size_t u : loading[s])
          for (int q = 0; q < 2; ++q) {
            const M::What w = q == 0 ? M::kMoment : M::kDeflection;
            std::array<double, kDegree - 1> inner{};
            for (std::size_t j = 0; j < inner.size(); ++j) inner[j] = quantity(inner_values[j][u], w);
            pc.poly[q][u] = interpolate(quantity(va[u], w), inner, quantity(vb[u], w));
          }
      }
      // With every arrangement ("all": one walk of every unit in order),
      // the upper bound of each target (below) in the same pass.
      std::array<double, 4> all_bound{};
      for (int q = 0; q < 2; ++q) {
        double total = 0;
        for (std::size_t u = 0; u < nu; ++u) {
          const auto rg = pc.range[q][u] = range_of(pc.poly[q][u]);
          pc.size[q][u] = std::max(std::abs(rg.first), std::abs(rg.second));
          total += pc.size[q][u] * max_factor;
          if (all)
            for (int k2 = 0; k2 < 2; ++k2) {
              const double sign = k2 == 0 ? 1.0 : -1.0;
              const Factors& f = fac[k2][u];
              all_bound[static_cast<std::size_t>(2 * q + k2)] +=
                  std::max({sign * f.pos * rg.second, sign * f.neg * rg.first, sign * f.pos * rg.first, sign * f.neg * rg.second});
            }
        }
        pc.negligible[q] = 1e-15 * total / std::max<double>(1.0, static_cast<double>(nu));
      }
      for (int t = 0; t < 4; ++t) {
        const int q = t / 2;
        const int k2 = t % 2;
        const double sign = k2 == 0 ? 1.0 : -1.0;
        Best& bt = best[static_cast<std::size_t>(t)];
        // The upper bound of each unit's sign * (factor * value) on the piece.
        std::pair<double, double> found{0.0, 0.0};
        bool any = false;
        for (const auto& units : walks) {
          double bound = 0;
          if (all) {
            bound = all_bound[static_cast<std::size_t>(t)];
          } else {
            for (std::size_t u : units) {
              const auto& rg = pc.range[q][u];
              const Factors& f = fac[k2][u];
              bound += std::max({sign * f.pos * rg.second, sign * f.neg * rg.first, sign * f.pos * rg.first,
                                 sign * f.neg * rg.second});
            }
          }
          if (!(bound > sign * bt.value)) continue;
          const auto m = walk(pc, q, units, fac[k2], sign, sign * bt.value);
          if (!any || m.first > found.first) { found = m; any = true; }
        }
        if (!any || !(found.first > sign * bt.value)) continue;
        // The envelope itself at that point, from the units, and what governs it.
        const double x = 0.5 * (a + b) + 0.5 * (b - a) * found.second;
        model.values(s, x, false, pv);
        for (std::size_t u = 0; u < nu; ++u) g[u] = quantity(pv[u], q == 0 ? M::kMoment : M::kDeflection);
        const double v = model.extreme(g, sign > 0, &choice);
        if (sign * v > sign * bt.value) {
          bt.value = v;
          bt.local = x;
          bt.between.swap(choice);
        }
      }
    }
    SpanExtremes& e = out[s];
    e.max_moment = best[0].value; e.max_moment_x = x0 + best[0].local; e.max_moment_by = best[0].describe(model);
    e.min_moment = best[1].value; e.min_moment_x = x0 + best[1].local; e.min_moment_by = best[1].describe(model);
    const Best& d = std::abs(best[2].value) >= std::abs(best[3].value) ? best[2] : best[3];
    e.max_deflection = d.value; e.max_deflection_x = x0 + d.local; e.max_deflection_by = d.describe(model);
    x0 += full.spans[s].length;
  }
}

}  // namespace

namespace detail {

void run_envelope_method(const Method& method, const Beam& full, const input::Combination& comb,
                         const std::vector<Station>& stations, MethodResult& r, bool side_by_side) {
  using M = EnvelopeModel;
  auto model = std::make_shared<EnvelopeModel>();
  model->comb = comb;
  model->spans = full.spans.size();
  if (comb.arrangements == input::Arrangements::AdjacentAndAlternate) model->arrangements = code_arrangements(full.spans.size());
  // The shares (envelope.h). `full` holds the loads of the combination's
  // cases and their settlements, unfactored (load_sets.h).
  model->base = full;
  model->base.loads.clear();
  for (auto& s : model->base.supports) { s.settlement = 0; s.settlement_case.clear(); }
  for (std::size_t k = 0; k < comb.factors.size(); ++k) {
    const std::string& cs = comb.factors[k].first;
    const bool patterned = std::find(comb.pattern.begin(), comb.pattern.end(), cs) != comb.pattern.end();
    M::Unit rest;
    rest.factor = k;
    std::vector<std::vector<Load>> per_span(patterned ? full.spans.size() : 0);
    for (const auto& l : full.loads) {
      if (l.load_case != cs) continue;
      if (patterned && !l.on_node) per_span[l.index].push_back(l);
      else rest.loads.push_back(l);
    }
    for (std::size_t i = 0; i < full.supports.size(); ++i)
      if (full.supports[i].settlement_case == cs && nonzero(full.supports[i].settlement))
        rest.settlements.emplace_back(i, full.supports[i].settlement);
    if (!rest.loads.empty() || !rest.settlements.empty() || !patterned) model->units.push_back(std::move(rest));
    for (std::size_t sp = 0; sp < per_span.size(); ++sp)
      if (!per_span[sp].empty()) {
        M::Unit u;
        u.factor = k;
        u.patterned = true;
        u.span = sp;
        u.loads = std::move(per_span[sp]);
        model->units.push_back(std::move(u));
      }
  }
  {
    // The settlements that name no case act once, with factor 1.
    M::Unit once;
    for (std::size_t i = 0; i < full.supports.size(); ++i)
      if (full.supports[i].settlement_case.empty() && nonzero(full.supports[i].settlement))
        once.settlements.emplace_back(i, full.supports[i].settlement);
    if (!once.settlements.empty() || model->units.empty()) model->units.push_back(std::move(once));
  }
  model->prepare();
  r.status = MethodStatus::Ok;
  for (std::size_t k = 0; k < model->units.size(); ++k) {
    M::Unit& u = model->units[k];
    const Beam ub = model->unit_beam(k);
    u.solution = method.solve(ub, stations);
    if (u.solution.status != MethodStatus::Ok) {
      r.status = u.solution.status;
      r.reason = u.solution.reason;
      r.reason_id = u.solution.reason_id;
      return;
    }
    if (u.solution.nodes.size() != full.node_count() || !u.solution.at) {
      r.status = MethodStatus::Failed;
      r.reason = "the method returned an incomplete result";
      r.reason_id = reason_id::kIncomplete;
      return;
    }
    const Equilibrium e = equilibrium_of(ub, u.solution.nodes);
    r.equilibrium.force_residual = std::max(r.equilibrium.force_residual, e.force_residual);
    r.equilibrium.moment_residual = std::max(r.equilibrium.moment_residual, e.moment_residual);
    u.reactions.reserve(u.solution.nodes.size());
    for (const auto& nd : u.solution.nodes) u.reactions.push_back(nd.reaction_force);
    std::vector<NodeResult>().swap(u.solution.nodes);  // only the reactions are kept
  }

  // The envelope at the stations and each span's extremes, span by span;
  // on a long beam its two halves side by side.
  Envelope env;
  const std::size_t n = full.spans.size();
  r.extremes.assign(n, {});
  // (`second` before `later`: if this thread's half throws, the future's
  // destructor waits for the other half, which writes into `second`, so
  // `second` must outlive it.)
  Envelope second;
  std::future<void> later;
  const std::size_t mid = side_by_side && n >= 2 ? n / 2 : n;
  if (mid < n) {
    try {
      later = std::async(std::launch::async, [&] { envelope_and_extremes(*model, full, stations, second, r.extremes, mid, n); });
    } catch (const std::system_error&) {
      // no thread to be had: the second half runs below, in turn
    }
  }
  envelope_and_extremes(*model, full, stations, env, r.extremes, 0, mid);
  if (mid < n) {
    if (later.valid()) later.get();
    else envelope_and_extremes(*model, full, stations, second, r.extremes, mid, n);
    env.moment.insert(env.moment.end(), second.moment.begin(), second.moment.end());
    env.shear.insert(env.shear.end(), second.shear.begin(), second.shear.end());
    env.deflection.insert(env.deflection.end(), second.deflection.begin(), second.deflection.end());
  }
  {
    std::vector<double> g(model->units.size());
    M::Interned pool;
    for (std::size_t j = 0; j < full.node_count(); ++j) {
      for (std::size_t u = 0; u < g.size(); ++u) g[u] = model->units[u].reactions[j];
      env.reaction.push_back(model->combine(g, &pool));
    }
  }
  auto finite = [](const std::vector<Bound>& v) {
    for (const auto& b : v)
      if (!std::isfinite(b.max) || !std::isfinite(b.min)) return false;
    return true;
  };
  if (!finite(env.moment) || !finite(env.shear) || !finite(env.deflection) || !finite(env.reaction)) {
    r.status = MethodStatus::Failed;
    r.reason = "the method produced a non-finite number";
    r.reason_id = reason_id::kNonFinite;
    return;
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
      // One difference between the two methods; `where` makes the text of
      // the place only when it is the worst so far.
      auto note = [&](Kind k, double va, double vb, double x, auto where) {
        const double sc = set.scale[idx(k)];
        const double r = sc > 0 ? std::abs(va - vb) / sc : std::abs(va - vb);
        set.max_difference[idx(k)] = std::max(set.max_difference[idx(k)], r);
        pw = std::max(pw, r);
        if (r > best) {
          best = r;
          Worst w;
          w.kind = k;
          w.where = where();
          w.x = x;
          w.values = {{ok[a]->name, va}, {ok[b]->name, vb}};
          set.worst = w;
        }
      };
      auto cmp = [&](Kind k, const std::vector<Bound>& A, const std::vector<Bound>& B, bool nodes) {
        for (std::size_t i = 0; i < A.size() && i < B.size(); ++i)
          for (int side = 0; side < 2; ++side)
            note(k, side ? A[i].min : A[i].max, side ? B[i].min : B[i].max,
                 nodes ? set.beam.node_x(i) : set.stations[i].x, [&] {
                   return nodes ? "node " + set.beam.labels[i] + (side ? " (reaction_min)" : " (reaction_max)")
                                : "x = " + fmt_place(set.stations[i].x) + (side ? " (min)" : " (max)");
                 });
      };
      cmp(Kind::Moment, ok[a]->envelope->moment, ok[b]->envelope->moment, false);
      cmp(Kind::Shear, ok[a]->envelope->shear, ok[b]->envelope->shear, false);
      cmp(Kind::Deflection, ok[a]->envelope->deflection, ok[b]->envelope->deflection, false);
      cmp(Kind::Reaction, ok[a]->envelope->reaction, ok[b]->envelope->reaction, true);
      // Each method's own span extremes of its envelope.
      auto ext = [&](Kind k, double va, double vb, std::size_t s, const char* what, double x) {
        note(k, va, vb, x, [&] { return "span " + std::to_string(s + 1) + " (" + what + ")"; });
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


void second_route(LoadSet& set, const std::vector<const Method*>& methods, double agreement, bool side_by_side) {
  using M = EnvelopeModel;
  set.second_route.clear();
  const MethodResult* lead = nullptr;
  for (const auto& m : set.methods)
    if (m.status == MethodStatus::Ok && m.envelope_model) { lead = &m; break; }
  if (!lead || set.extremes.size() != set.beam.spans.size()) return;
  const M& model = *lead->envelope_model;
  const Beam& beam = set.beam;

  // What the envelope reports as governing (route_items), and the
  // arrangement (with its factors) that governs it in the lead method's model.
  struct Item : RouteItem {
    M::What what = M::kMoment;
    std::size_t arrangement = 0;
  };
  std::vector<Item> items;
  std::vector<char> wants_max;  // per item: the largest value governs (else the smallest)
  for (RouteItem& ri : route_items(set)) {
    Item it;
    static_cast<RouteItem&>(it) = std::move(ri);
    it.what = it.deflection ? M::kDeflection : M::kMoment;
    wants_max.push_back(it.want_max);
    items.push_back(std::move(it));
  }

  // Each item's arrangement in the lead model, worked out a block of items
  // at a time (on a long beam, the two halves of a block side by side),
  // then each arrangement kept once (the same factor for every unit is
  // solved once): the map holds it, `choices` points at it in order of
  // discovery.
  std::vector<const M::Choice*> choices;
  std::map<M::Choice, std::size_t> index;  // lexicographic order of the factors
  std::vector<std::string> described;      // per arrangement, in order of discovery
  constexpr std::size_t kBlock = 256;
  std::vector<M::Choice> block(kBlock);
  const bool all = model.comb.arrangements == input::Arrangements::All || model.arrangements.empty();
  for (std::size_t from = 0; from < items.size(); from += kBlock) {
    const std::size_t n = std::min(kBlock, items.size() - from);
    auto choose = [&](std::size_t a, std::size_t b) {
      std::vector<PointValues> pv;
      std::vector<double> g(model.units.size());
      for (std::size_t k = a; k < b; ++k) {
        const Item& it = items[from + k];
        if (it.node) {
          for (std::size_t u = 0; u < model.units.size(); ++u) g[u] = model.units[u].reactions[it.index];
        } else {
          model.values(it.index, it.local, false, pv);
          for (std::size_t u = 0; u < pv.size(); ++u) g[u] = quantity(pv[u], it.what);
        }
        model.extreme(g, wants_max[from + k] != 0, &block[k]);
        if (all) model.extend_pattern(g, block[k]);
      }
    };
    std::future<void> other;
    if (side_by_side && n > 1) {
      try {
        other = std::async(std::launch::async, choose, n / 2, n);
      } catch (const std::system_error&) {
        // no thread to be had: in turn, below
      }
    }
    choose(0, other.valid() ? n / 2 : n);
    if (other.valid()) other.get();
    for (std::size_t k = 0; k < n; ++k) {
      Item& it = items[from + k];
      const auto found = index.emplace(std::move(block[k]), choices.size());
      if (found.second) {
        choices.push_back(&found.first->first);
        described.push_back(describe(model.governs(found.first->first), model.comb));
      }
      it.arrangement = found.first->second;
      it.check.arrangement = described[it.arrangement];
    }
  }

  // Each arrangement solved directly by every method, as an ordinary load
  // set, and read at the points it governs (one solution at a time). On a
  // long beam the arrangements are shared out between threads: each builds
  // an arrangement's beam once and every method solves it. The values are
  // merged in the order of the methods.
  std::vector<std::vector<std::size_t>> uses(choices.size());
  for (std::size_t i = 0; i < items.size(); ++i) uses[items[i].arrangement].push_back(i);
  struct Read {
    std::vector<double> value;  // per item
    std::vector<char> got;      // per item: the method gave a value (finite or not)
    std::vector<char> failed;   // per item: the method failed (not merely not applicable)
  };
  std::vector<Read> reads(methods.size());
  for (auto& rd : reads) {
    rd.value.assign(items.size(), 0.0);
    rd.got.assign(items.size(), 0);
    rd.failed.assign(items.size(), 0);
  }
  // The load set's stations hold every position where a load of the
  // arrangement acts (its loads are some of the load set's). Each item
  // belongs to one arrangement: threads write to different items.
  const std::vector<Station>& st = set.stations;
  auto solve_one = [&](std::size_t k) {
    const Beam ab = model.arrangement_beam(*choices[k]);
    for (std::size_t mi = 0; mi < methods.size(); ++mi) {
      Read& rd = reads[mi];
      const Solution sol = solve_guarded(*methods[mi], ab, st);
      const bool ok = sol.status == MethodStatus::Ok && sol.at && sol.nodes.size() == beam.node_count();
      for (std::size_t i : uses[k]) {
        if (!ok) {
          if (sol.status != MethodStatus::NotApplicable) rd.failed[i] = 1;
          continue;
        }
        const Item& it = items[i];
        rd.got[i] = 1;
        if (it.node) {
          rd.value[i] = sol.nodes[it.index].reaction_force;
        } else {
          // At a point force or couple the value reported may be either
          // limit: the nearer one is the value the arrangement has there.
          const double l = quantity(sol.at(it.index, it.local, false), it.what);
          const double r = quantity(sol.at(it.index, it.local, true), it.what);
          rd.value[i] = std::abs(l - it.check.envelope) <= std::abs(r - it.check.envelope) ? l : r;
        }
      }
    }
  };
  std::atomic<std::size_t> next{0};
  auto work = [&] {
    for (std::size_t k; (k = next++) < choices.size();) solve_one(k);
  };
  std::vector<std::future<void>> helpers;
  if (side_by_side) {
    const unsigned threads = std::max(1u, std::thread::hardware_concurrency());
    for (unsigned t = 1; t < threads; ++t) {
      try {
        helpers.push_back(std::async(std::launch::async, work));
      } catch (const std::system_error&) {
        break;  // no thread to be had: fewer helpers
      }
    }
  }
  work();
  for (auto& h : helpers) h.get();
  for (auto& it : items) it.check.holds = true;
  for (std::size_t k = 0; k < methods.size(); ++k) {
    const Read& rd = reads[k];
    for (std::size_t i = 0; i < items.size(); ++i) {
      RouteCheck& rc = items[i].check;
      if (rd.failed[i]) rc.holds = false;
      if (!rd.got[i]) continue;
      const double v = rd.value[i];
      rc.values.emplace_back(methods[k]->name, v);
      const double sc = set.scale[static_cast<int>(items[i].kind)];
      const double d = sc > 0 ? std::abs(v - rc.envelope) / sc : std::abs(v - rc.envelope);
      rc.difference = std::max(rc.difference, d);
    }
  }
  set.second_route.reserve(items.size());
  for (auto& it : items) {
    RouteCheck& rc = it.check;
    if (rc.values.empty() || !(rc.difference <= agreement)) rc.holds = false;
    set.second_route.push_back(std::move(rc));
  }
  settle_second_route(set, "arrangement");
}

Solution solve_guarded(const Method& method, const Beam& beam, const std::vector<Station>& stations) {
  Solution sol;
  try {
    sol = method.solve(beam, stations);
  } catch (const std::bad_alloc&) {
    throw;
  } catch (const std::exception& e) {
    sol.status = MethodStatus::Failed;
    sol.reason = std::string("internal error: ") + e.what();
    sol.reason_id = reason_id::kInternal;
  }
  return sol;
}

std::vector<RouteItem> route_items(const LoadSet& set) {
  std::vector<RouteItem> items;
  const Beam& beam = set.beam;
  double x0 = 0;
  for (std::size_t s = 0; s < beam.spans.size() && s < set.extremes.size(); ++s) {
    const SpanExtremes& e = set.extremes[s];
    const double L = beam.spans[s].length;
    struct Spec { const char* q; double v, x; bool deflection, want_max; Kind k; };
    const Spec specs[] = {{"max_moment", e.max_moment, e.max_moment_x, false, true, Kind::Moment},
                          {"min_moment", e.min_moment, e.min_moment_x, false, false, Kind::Moment},
                          {"max_deflection", e.max_deflection, e.max_deflection_x, true, e.max_deflection >= 0,
                           Kind::Deflection}};
    for (const Spec& sp : specs) {
      RouteItem it;
      it.check.quantity = sp.q;
      it.check.where = "span " + std::to_string(s + 1);
      it.check.x = sp.x;
      it.check.envelope = sp.v;
      it.kind = sp.k;
      it.index = s;
      it.local = std::min(std::max(sp.x - x0, 0.0), L);
      it.deflection = sp.deflection;
      it.want_max = sp.want_max;
      items.push_back(std::move(it));
    }
    x0 += L;
  }
  for (std::size_t j = 0; j < beam.node_count() && j < set.consensus_envelope.reaction.size(); ++j) {
    const SupportType t = beam.supports[j].type;
    if (!restrains_deflection(t) && t != SupportType::Spring) continue;
    for (int side = 0; side < 2; ++side) {
      RouteItem it;
      it.check.quantity = side ? "reaction_min" : "reaction_max";
      it.check.where = "node " + beam.labels[j];
      it.check.x = beam.node_x(j);
      const Bound& b = set.consensus_envelope.reaction[j];
      it.check.envelope = side ? b.min : b.max;
      it.kind = Kind::Reaction;
      it.node = true;
      it.index = j;
      it.want_max = side == 0;
      items.push_back(std::move(it));
    }
  }
  return items;
}

void settle_second_route(LoadSet& set, const char* what) {
  const RouteCheck* worst = nullptr;
  for (const auto& rc : set.second_route)
    if (!rc.holds && (!worst || rc.difference > worst->difference)) worst = &rc;
  if (worst) {
    set.verdict = Verdict::Disagree;
    std::string vals;
    for (const auto& [name, v] : worst->values) vals += (vals.empty() ? "" : ", ") + name + " " + fmt(v);
    set.problem = "second route: the envelope's " + worst->quantity + " of " + worst->where + " (" + fmt(worst->envelope) +
                  ") is not what its governing " + what + " (" + worst->arrangement + ") gives when solved directly (" +
                  (vals.empty() ? std::string("no method solved it") : vals) + ")";
  }
}

}  // namespace detail
}  // namespace trivet::compare
