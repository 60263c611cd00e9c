// The envelopes of factored and patterned combinations, checked by brute
// force: every arrangement of the patterned spans and every choice of the
// factors, each built here from the parsed beam and solved by each method on
// its own (or, where the choices are too many, each share solved once and the
// shares added), never through the envelope code. The largest and smallest of
// those values are the envelope by definition.
//
// The load of a combination splits into shares:
//  - a case that is not patterned: one share (its loads and the settlements
//    that name it), factor from F = {f} or {low, high};
//  - a patterned case: one share per span (its loads on that span), factor
//    from {0} u F, and one share of its node loads and the settlements that
//    name it, factor from F;
//  - the settlements that name no case: one share, factor 1 always.
// "all": every share picks its factor on its own. "adjacent-and-alternate":
// the patterned span shares are on (factor from F) only on the spans of one
// arrangement (all spans, the odd spans, the even spans, or two adjacent
// spans) and off elsewhere.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <limits>
#include <optional>
#include <random>
#include <string>
#include <vector>

#include "harness/compare/compare.h"

namespace trivet::compare {
namespace {

// The methods are exact for the theory, so a method's envelope and the same
// method's brute force differ only by the rounding of superposing its own
// solutions, many orders below 1e-9 of the largest value; 1e-9 of the largest
// magnitude of each kind leaves room for that and for no modelling error.
constexpr double kRel = 1e-9;
// The whole-beam brute force solves every combination of choices; above this
// many solves per method and combination, each share is solved once and the
// shares are added (exact by superposition).
constexpr std::size_t kWholeLimit = 160;

// ---------------------------------------------------------------------------
// Random beam files.

struct Rng {
  std::mt19937 g;
  explicit Rng(unsigned seed) : g(seed) {}
  double u() { return std::uniform_real_distribution<double>(0.0, 1.0)(g); }
  double in(double a, double b) { return a + (b - a) * u(); }
  bool chance(double p) { return u() < p; }
  std::size_t pick(std::size_t n) { return std::uniform_int_distribution<std::size_t>(0, n - 1)(g); }
};

std::string num(double v) {
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.6g", v);
  return buf;
}

struct GenCombo {
  std::string name;
  std::vector<std::pair<std::string, std::vector<double>>> factors;  // {f} or {low, high}
  std::vector<std::string> pattern;
  bool adjacent = false;  // "adjacent-and-alternate"
  bool envelope() const {
    if (!pattern.empty()) return true;
    for (const auto& f : factors)
      if (f.second.size() > 1) return true;
    return false;
  }
  std::string json() const {
    std::string t = "{\"name\": \"" + name + "\", \"factors\": {";
    for (std::size_t i = 0; i < factors.size(); ++i) {
      t += (i ? ", \"" : "\"") + factors[i].first + "\": ";
      const auto& v = factors[i].second;
      t += v.size() == 1 ? num(v[0]) : "[" + num(v[0]) + ", " + num(v[1]) + "]";
    }
    t += "}";
    if (!pattern.empty()) {
      t += ", \"pattern\": [";
      for (std::size_t i = 0; i < pattern.size(); ++i) t += (i ? ", \"" : "\"") + pattern[i] + "\"";
      t += "]";
      if (adjacent) t += ", \"arrangements\": \"adjacent-and-alternate\"";
    }
    return t + "}";
  }
};

struct Gen {
  std::string text;
  std::size_t spans = 0;
  std::vector<std::string> cases;
  std::vector<bool> settled;             // per node
  std::vector<double> settle;            // per node
  std::vector<std::string> settle_case;  // per node, "" for none
  std::vector<GenCombo> combos;
  std::string features;  // for messages
};

std::vector<double> random_factor(Rng& r, double one, double low, double high, double p_range) {
  if (r.chance(p_range)) return {low, high};
  return {one};
}

// A beam of n spans with every load type, two or three cases (one or two of
// them patterned), factor ranges, settlements with and without a case,
// springs, sometimes a hinge at an interior roller or free node, sometimes
// fixed or free ends.
Gen random_beam(Rng& r, std::size_t n) {
  Gen g;
  g.spans = n;
  g.cases = {"dead", "live"};
  const bool wind = r.chance(0.5);
  if (wind) g.cases.push_back("wind");
  std::vector<std::string> pattern = {"live"};
  if (wind && r.chance(0.5)) pattern.push_back("wind");
  if (pattern.size() == 1 && r.chance(0.15)) pattern.push_back("dead");
  auto patterned = [&](const std::string& c) { return std::find(pattern.begin(), pattern.end(), c) != pattern.end(); };

  std::vector<double> L(n);
  std::string spans;
  for (std::size_t s = 0; s < n; ++s) {
    L[s] = r.in(2.0, 8.0);
    spans += std::string(s ? ", " : "") + "{\"length\": " + num(L[s]) + ", \"EI\": " + num(r.in(1e4, 1e5)) + "}";
    // The reader reads the printed digits; keep the lengths we place loads by equal to them.
    L[s] = std::stod(num(L[s]));
  }

  // Supports.
  std::vector<std::string> type(n + 1);
  for (std::size_t i = 0; i <= n; ++i) {
    const double p = r.u();
    if (i == 0 || i == n)
      type[i] = p < 0.2 ? "fixed" : p < 0.6 ? "pinned" : p < 0.82 ? "spring" : "free";
    else
      type[i] = p < 0.65 ? "roller" : p < 0.85 ? "spring" : "free";
  }
  std::vector<bool> hinge(n + 1, false);
  if (r.chance(0.35)) {
    std::vector<std::size_t> cand;
    for (std::size_t i = 1; i < n; ++i)
      if (type[i] == "roller" || type[i] == "free") cand.push_back(i);
    if (!cand.empty()) hinge[cand[r.pick(cand.size())]] = true;
  }
  g.settled.assign(n + 1, false);
  g.settle.assign(n + 1, 0.0);
  g.settle_case.assign(n + 1, "");
  bool any_spring = false, any_settle_case = false, any_settle_plain = false;
  std::string supports;
  for (std::size_t i = 0; i <= n; ++i) {
    std::string opts;
    if (type[i] == "spring") {
      any_spring = true;
      opts += ", \"k\": " + num(std::pow(10.0, r.in(2.0, 5.0)));
      if (r.chance(0.4)) opts += ", \"kr\": " + num(std::pow(10.0, r.in(3.0, 6.0)));
    }
    if (type[i] != "free" && r.chance(0.35)) {
      const double v = std::stod(num((r.chance(0.3) ? -1.0 : 1.0) * r.in(0.002, 0.01)));
      g.settled[i] = true;
      g.settle[i] = v;
      if (r.chance(0.5)) {
        g.settle_case[i] = g.cases[r.pick(g.cases.size())];
        opts += ", \"settlement\": {\"value\": " + num(v) + ", \"case\": \"" + g.settle_case[i] + "\"}";
        any_settle_case = true;
      } else {
        opts += ", \"settlement\": " + num(v);
        any_settle_plain = true;
      }
    }
    if (hinge[i]) opts += ", \"hinge\": true";
    supports += std::string(i ? ", " : "") + (opts.empty() ? "\"" + type[i] + "\"" : "{\"type\": \"" + type[i] + "\"" + opts + "}");
  }

  // Loads.
  std::string loads;
  auto add = [&](const std::string& l) { loads += (loads.empty() ? "" : ", ") + l; };
  for (const auto& c : g.cases) {
    const std::string cs = ", \"case\": \"" + c + "\"}";
    std::size_t count = 0;
    for (std::size_t s = 0; s < n; ++s) {
      const std::size_t k = r.chance(patterned(c) ? 0.85 : 0.7) ? (r.chance(0.3) ? 2 : 1) : 0;
      for (std::size_t j = 0; j < k; ++j, ++count) {
        const double sign = r.chance(0.12) ? -1.0 : 1.0;
        const std::string sp = "\"span\": " + std::to_string(s + 1);
        const double a = L[s] * r.in(0.0, 0.6), b = r.in(a + 0.1 * L[s], L[s]);
        switch (r.pick(5)) {
          case 0: add("{\"type\": \"point\", " + sp + ", \"P\": " + num(sign * r.in(5, 30)) + ", \"at\": " + num(L[s] * r.in(0.05, 0.95)) + cs); break;
          case 1: add("{\"type\": \"udl\", " + sp + ", \"w\": " + num(sign * r.in(2, 12)) + cs); break;
          case 2: add("{\"type\": \"udl\", " + sp + ", \"w\": " + num(sign * r.in(2, 12)) + ", \"from\": " + num(a) + ", \"to\": " + num(b) + cs); break;
          case 3: add("{\"type\": \"linear\", " + sp + ", \"w1\": " + num(sign * r.in(0, 12)) + ", \"w2\": " + num(sign * r.in(0, 12)) +
                      ", \"from\": " + num(a) + ", \"to\": " + num(b) + cs); break;
          default: add("{\"type\": \"couple\", " + sp + ", \"C\": " + num((r.chance(0.5) ? -1 : 1) * r.in(5, 25)) + ", \"at\": " + num(L[s] * r.in(0.05, 0.95)) + cs); break;
        }
      }
    }
    if (count == 0) add("{\"type\": \"udl\", \"span\": 1, \"w\": " + num(r.in(2, 12)) + cs);
    if (r.chance(0.35)) add("{\"type\": \"point\", \"node\": " + std::to_string(r.pick(n + 1) + 1) + ", \"P\": " + num((r.chance(0.2) ? -1 : 1) * r.in(5, 20)) + cs);
    if (r.chance(0.25)) {
      const std::size_t i = r.pick(n + 1);
      if (!hinge[i]) add("{\"type\": \"couple\", \"node\": " + std::to_string(i + 1) + ", \"C\": " + num((r.chance(0.5) ? -1 : 1) * r.in(5, 20)) + cs);
    }
  }

  // Combinations: the exact envelope, the codes' arrangements, a factor range
  // with no pattern (without "wind", so its settlements are absent there), and
  // a plain sum.
  for (int mode = 0; mode < 2; ++mode) {
    GenCombo c;
    c.name = mode ? "env-aa" : "env-all";
    c.adjacent = mode == 1;
    c.factors.push_back({"dead", random_factor(r, 1.2, 1.0, 1.35, 0.5)});
    c.factors.push_back({"live", random_factor(r, 1.6, 0.5, 1.5, 0.4)});
    if (wind) c.factors.push_back({"wind", random_factor(r, 0.9, 0.3, 1.4, 0.4)});
    c.pattern = pattern;
    g.combos.push_back(c);
  }
  GenCombo range;
  range.name = "env-range";
  range.factors = {{"dead", {1.0, 1.35}}, {"live", {1.5}}};
  g.combos.push_back(range);
  GenCombo plain;
  plain.name = "service";
  plain.factors = {{"dead", {1.0}}, {"live", {1.0}}};
  if (wind) plain.factors.push_back({"wind", {0.6}});
  g.combos.push_back(plain);

  std::string combos;
  for (std::size_t i = 0; i < g.combos.size(); ++i) combos += (i ? ", " : "") + g.combos[i].json();
  g.text = "{\"units\": {\"force\": \"kN\", \"length\": \"m\"}, \"stations_per_span\": 6, \"spans\": [" + spans + "], \"supports\": [" +
           supports + "], \"loads\": [" + loads + "], \"combinations\": [" + combos + "]}";
  g.features = std::to_string(n) + " spans, supports";
  for (std::size_t i = 0; i <= n; ++i) g.features += " " + type[i] + (hinge[i] ? "+hinge" : "");
  g.features += std::string(any_spring ? ", springs" : "") + (any_settle_plain ? ", settlement" : "") +
                (any_settle_case ? ", settlement with a case" : "") + ", pattern";
  for (const auto& p : pattern) g.features += " " + p;
  return g;
}

// ---------------------------------------------------------------------------
// Shares, arrangements and the brute force.

struct Share {
  std::string what;
  std::vector<Load> loads;     // as read, unscaled
  std::vector<double> settle;  // per node, unscaled
  std::vector<double> factors; // the factors it takes when on
  bool patterned = false;      // a patterned span share: may be off
  std::size_t span = 0;
};

// The beam as read with no loads and no settlements.
Beam bare(const Beam& parsed) {
  Beam b = parsed;
  b.loads.clear();
  for (auto& s : b.supports) {
    s.settlement = 0.0;
    s.settlement_case.clear();
  }
  return b;
}

void add_share(Beam& b, const Share& s, double f) {
  for (const auto& l : s.loads) {
    Load t = l;
    t.P *= f; t.C *= f; t.w1 *= f; t.w2 *= f;
    b.loads.push_back(t);
  }
  for (std::size_t i = 0; i < s.settle.size(); ++i) b.supports[i].settlement += f * s.settle[i];
}

std::vector<Share> make_shares(const Beam& parsed, const Gen& g, const GenCombo& c) {
  std::vector<Share> out;
  const std::size_t nodes = parsed.supports.size();
  auto settlements_of = [&](const std::string& cs, Share& sh) {
    sh.settle.assign(nodes, 0.0);
    bool any = false;
    for (std::size_t i = 0; i < nodes; ++i)
      if (g.settled[i] && g.settle_case[i] == cs) { sh.settle[i] = g.settle[i]; any = true; }
    return any;
  };
  for (const auto& [k, F] : c.factors) {
    if (std::find(c.pattern.begin(), c.pattern.end(), k) != c.pattern.end()) {
      for (std::size_t s = 0; s < parsed.spans.size(); ++s) {
        Share sh;
        sh.what = k + " on span " + std::to_string(s + 1);
        sh.factors = F;
        sh.patterned = true;
        sh.span = s;
        sh.settle.assign(nodes, 0.0);
        for (const auto& l : parsed.loads)
          if (l.load_case == k && !l.on_node && l.index == s) sh.loads.push_back(l);
        if (!sh.loads.empty()) out.push_back(sh);
      }
      Share sh;
      sh.what = k + " at the nodes";
      sh.factors = F;
      const bool settles = settlements_of(k, sh);
      for (const auto& l : parsed.loads)
        if (l.load_case == k && l.on_node) sh.loads.push_back(l);
      if (settles || !sh.loads.empty()) out.push_back(sh);
    } else {
      Share sh;
      sh.what = k;
      sh.factors = F;
      const bool settles = settlements_of(k, sh);
      for (const auto& l : parsed.loads)
        if (l.load_case == k) sh.loads.push_back(l);
      if (settles || !sh.loads.empty()) out.push_back(sh);
    }
  }
  Share sh;
  sh.what = "settlements without a case";
  sh.factors = {1.0};
  if (settlements_of("", sh)) out.push_back(sh);
  return out;
}

// One arrangement: which spans' patterned shares are on; nullopt in "all"
// mode (each is on or off by itself).
using Arrangement = std::optional<std::vector<bool>>;

std::vector<Arrangement> arrangements(const GenCombo& c, std::size_t n) {
  if (c.pattern.empty() || !c.adjacent) return {std::nullopt};
  std::vector<Arrangement> out;
  out.push_back(std::vector<bool>(n, true));
  std::vector<bool> odd(n), even(n);
  for (std::size_t s = 0; s < n; ++s) { odd[s] = s % 2 == 0; even[s] = s % 2 == 1; }
  out.push_back(odd);
  out.push_back(even);
  for (std::size_t s = 0; s + 1 < n; ++s) {
    std::vector<bool> pair(n, false);
    pair[s] = pair[s + 1] = true;
    out.push_back(pair);
  }
  return out;
}

// The choices of a share under an arrangement; nullopt is "off".
std::vector<std::optional<double>> options(const Share& s, const Arrangement& a) {
  bool on = true, off = false;
  if (s.patterned) {
    if (!a) off = true;
    else if (!(*a)[s.span]) { on = false; off = true; }
  }
  std::vector<std::optional<double>> o;
  if (off) o.push_back(std::nullopt);
  if (on)
    for (double f : s.factors) o.push_back(f);
  return o;
}

// Values of one solution: moment, shear, deflection at every station, then
// the reaction at every node.
std::vector<double> sample(const Solution& sol, const std::vector<Station>& st) {
  const std::size_t S = st.size(), N = sol.nodes.size();
  std::vector<double> v(3 * S + N);
  for (std::size_t i = 0; i < S; ++i) {
    const PointValues p = sol.at(st[i].span, st[i].local, st[i].after);
    v[i] = p.moment;
    v[S + i] = p.shear;
    v[2 * S + i] = p.deflection;
  }
  for (std::size_t j = 0; j < N; ++j) v[3 * S + j] = sol.nodes[j].reaction_force;
  return v;
}

struct Flat {
  std::vector<double> hi, lo;
};

struct BruteStats {
  std::size_t whole = 0, superposed = 0, solves = 0;
};

// The brute-force envelope of one method; false (with a failure recorded)
// when the method cannot solve one of the beams.
bool brute_envelope(const Beam& base, const std::vector<Share>& shares, const std::vector<Arrangement>& arrs,
                    const Method& m, const std::vector<Station>& st, Flat& out, BruteStats& stats, const std::string& ctx) {
  const std::size_t size = 3 * st.size() + base.supports.size();
  out.hi.assign(size, -std::numeric_limits<double>::infinity());
  out.lo.assign(size, std::numeric_limits<double>::infinity());
  std::vector<std::vector<std::vector<std::optional<double>>>> opts;
  std::size_t count = 0;
  for (const auto& a : arrs) {
    opts.emplace_back();
    std::size_t c = 1;
    for (const auto& s : shares) {
      opts.back().push_back(options(s, a));
      c = std::min<std::size_t>(c * opts.back().back().size(), kWholeLimit + 1);
    }
    count = std::min(count + c, kWholeLimit + 1);
  }
  auto solve = [&](const Beam& b, std::vector<double>& v) {
    ++stats.solves;
    const Solution sol = m.solve(b, st);
    if (sol.status != MethodStatus::Ok) {
      ADD_FAILURE() << ctx << ": " << m.name << " did not solve a brute-force beam: " << sol.reason;
      return false;
    }
    v = sample(sol, st);
    return true;
  };
  std::vector<double> v;
  if (count <= kWholeLimit) {
    ++stats.whole;
    for (const auto& o : opts) {
      std::vector<std::size_t> idx(shares.size(), 0);
      for (;;) {
        Beam b = base;
        for (std::size_t i = 0; i < shares.size(); ++i)
          if (o[i][idx[i]]) add_share(b, shares[i], *o[i][idx[i]]);
        if (!solve(b, v)) return false;
        for (std::size_t j = 0; j < size; ++j) {
          out.hi[j] = std::max(out.hi[j], v[j]);
          out.lo[j] = std::min(out.lo[j], v[j]);
        }
        std::size_t i = 0;
        while (i < shares.size() && ++idx[i] == o[i].size()) idx[i++] = 0;
        if (i == shares.size()) break;
      }
    }
    return true;
  }
  ++stats.superposed;
  std::vector<std::vector<double>> unit(shares.size());
  for (std::size_t i = 0; i < shares.size(); ++i) {
    Beam b = base;
    add_share(b, shares[i], 1.0);
    if (!solve(b, unit[i])) return false;
  }
  for (const auto& o : opts)
    for (std::size_t j = 0; j < size; ++j) {
      double hs = 0, ls = 0;
      for (std::size_t i = 0; i < shares.size(); ++i) {
        double h = -std::numeric_limits<double>::infinity(), l = std::numeric_limits<double>::infinity();
        for (const auto& f : o[i]) {
          const double x = f ? *f * unit[i][j] : 0.0;
          h = std::max(h, x);
          l = std::min(l, x);
        }
        hs += h;
        ls += l;
      }
      out.hi[j] = std::max(out.hi[j], hs);
      out.lo[j] = std::min(out.lo[j], ls);
    }
  return true;
}

const char* const kKindNames[4] = {"moment", "shear", "deflection", "reaction"};

// An envelope against the brute force, kind by kind: the largest difference
// must stay within kRel of the largest magnitude of that kind.
void expect_envelope(const Envelope& e, const Flat& bf, const std::vector<Station>& st, const std::string& ctx) {
  const std::size_t S = st.size(), N = bf.hi.size() - 3 * S;
  const std::vector<Bound>* env[4] = {&e.moment, &e.shear, &e.deflection, &e.reaction};
  for (int k = 0; k < 4; ++k) {
    const std::size_t off = k * S, len = k < 3 ? S : N;
    ASSERT_EQ(env[k]->size(), len) << ctx << " " << kKindNames[k];
    double scale = 0;
    for (std::size_t j = 0; j < len; ++j) scale = std::max({scale, std::fabs(bf.hi[off + j]), std::fabs(bf.lo[off + j])});
    double worst = -1;
    std::string where;
    for (std::size_t j = 0; j < len; ++j) {
      const Bound& b = (*env[k])[j];
      const double dh = std::fabs(b.max - bf.hi[off + j]), dl = std::fabs(b.min - bf.lo[off + j]);
      if (std::max(dh, dl) > worst) {
        worst = std::max(dh, dl);
        char buf[300];
        std::snprintf(buf, sizeof buf, "%s %zu (x = %.6g): envelope max %.12g min %.12g, brute force max %.12g min %.12g",
                      k < 3 ? "station" : "node", j, k < 3 ? st[j].x : 0.0, b.max, b.min, bf.hi[off + j], bf.lo[off + j]);
        where = buf;
      }
    }
    EXPECT_LE(worst, kRel * scale) << ctx << ", " << kKindNames[k] << " (scale " << scale << "): worst at " << where;
  }
}

// The median, entry by entry, of several methods' brute forces (the consensus).
Flat median(const std::vector<Flat>& v) {
  Flat m = v.front();
  for (std::size_t j = 0; j < m.hi.size(); ++j) {
    std::vector<double> h, l;
    for (const auto& f : v) { h.push_back(f.hi[j]); l.push_back(f.lo[j]); }
    std::sort(h.begin(), h.end());
    std::sort(l.begin(), l.end());
    const std::size_t c = h.size();
    m.hi[j] = c % 2 ? h[c / 2] : 0.5 * (h[c / 2 - 1] + h[c / 2]);
    m.lo[j] = c % 2 ? l[c / 2] : 0.5 * (l[c / 2 - 1] + l[c / 2]);
  }
  return m;
}

const LoadSet* set_named(const BeamResult& r, const std::string& name) {
  for (const auto& s : r.sets)
    if (s.name == name) return &s;
  return nullptr;
}

// Failures so far in the running test (to stop a flood, not to decide).
int failures() { return ::testing::UnitTest::GetInstance()->current_test_info()->result()->total_part_count(); }

// ---------------------------------------------------------------------------
// 1. Station and reaction envelopes of every method against brute force.

void envelopes_equal_brute_force(bool adjacent, unsigned seed, int trials) {
  Rng rng(seed);
  int accepted = 0, beams_checked = 0;
  BruteStats stats;
  for (int trial = 0; trial < trials; ++trial) {
    const std::size_t n = 2 + static_cast<std::size_t>(trial % 7);  // 2 to 8 spans
    const Gen g = random_beam(rng, n);
    const input::BeamFile f = input::parse_beam_text(g.text, "random.json");
    if (!f.ok()) {
      std::printf("trial %d skipped, the reader refuses it: %s\n", trial, f.errors.front().format("random.json").c_str());
      continue;
    }
    ++accepted;
    const BeamResult r = check(f, Options{});
    const Beam base = bare(f.beam);
    for (const auto& c : g.combos) {
      if (!c.envelope() || (adjacent != c.adjacent)) continue;
      const std::string ctx = "trial " + std::to_string(trial) + " (" + g.features + "), combination " + c.json();
      const LoadSet* set = set_named(r, c.name);
      ASSERT_NE(set, nullptr) << ctx;
      ASSERT_TRUE(set->envelope) << ctx;
      const std::vector<Share> shares = make_shares(f.beam, g, c);
      const std::vector<Arrangement> arrs = arrangements(c, n);
      std::vector<Flat> all;
      for (const auto& mr : set->methods) {
        if (mr.status != MethodStatus::Ok) continue;
        ASSERT_TRUE(mr.envelope.has_value()) << ctx << ", " << mr.name;
        const Method* m = find_method(mr.name);
        ASSERT_NE(m, nullptr) << mr.name;
        Flat bf;
        if (!brute_envelope(base, shares, arrs, *m, set->stations, bf, stats, ctx)) continue;
        expect_envelope(*mr.envelope, bf, set->stations, ctx + ", " + mr.name);
        all.push_back(bf);
      }
      if (all.empty()) continue;
      EXPECT_GE(all.size(), 2u) << ctx << ": fewer than two methods are ok" << [&] {
        std::string w;
        for (const auto& mr : set->methods) w += "; " + mr.name + ": " + method_status_name(mr.status) + " " + mr.reason;
        return w;
      }();
      expect_envelope(set->consensus_envelope, median(all), set->stations, ctx + ", consensus");
      ++beams_checked;
      if (failures() > 200) {
        ADD_FAILURE() << "stopping after trial " << trial << ": too many failures";
        return;
      }
    }
  }
  std::printf("%d of %d beams read; %d envelopes checked; %zu by whole solves, %zu by superposed shares; %zu solves\n",
              accepted, trials, beams_checked, stats.whole, stats.superposed, stats.solves);
  EXPECT_GE(accepted, trials * 8 / 10) << "the generator makes too many beams the reader refuses";
  EXPECT_GE(stats.whole, 8u) << "too few envelopes were checked by solving each arrangement whole";
  EXPECT_GE(stats.superposed, 2u);
}

TEST(EnvelopeBruteForce, AllArrangementsAndFactorRangesEqualBruteForce) {
  envelopes_equal_brute_force(false, 7301u, 300);
}

TEST(EnvelopeBruteForce, AdjacentAndAlternateEqualsBruteForce) {
  envelopes_equal_brute_force(true, 7302u, 300);
}

// ---------------------------------------------------------------------------
// 2. A settlement with no case acts once in every load set.

TEST(EnvelopeBruteForce, UncasedSettlementIsTheSettledNodesDeflectionInEveryEnvelope) {
  const double settlement = 0.01;
  const std::string text = R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 6, "EI": 40000}, {"length": 5, "EI": 60000}],
    "supports": ["pinned", {"type": "roller", "settlement": 0.01}, "roller"],
    "loads": [{"type": "udl", "span": 1, "w": 8, "case": "dead"}, {"type": "udl", "span": 2, "w": 8, "case": "dead"},
              {"type": "udl", "span": 1, "w": 12, "case": "live"}, {"type": "udl", "span": 2, "w": 12, "case": "live"}],
    "combinations": [
      {"name": "all", "factors": {"dead": 1.2, "live": 1.6}, "pattern": ["live"]},
      {"name": "codes", "factors": {"dead": 1.2, "live": 1.6}, "pattern": ["live"], "arrangements": "adjacent-and-alternate"},
      {"name": "ranges", "factors": {"dead": [1.0, 1.35], "live": [0.5, 1.5]}, "pattern": ["live"]},
      {"name": "ranges-codes", "factors": {"dead": [1.0, 1.35], "live": [0.5, 1.5]}, "pattern": ["live"], "arrangements": "adjacent-and-alternate"},
      {"name": "both-patterned", "factors": {"dead": 1.35, "live": 1.5}, "pattern": ["dead", "live"]},
      {"name": "range-only", "factors": {"dead": [1.0, 1.35], "live": 1.5}},
      {"name": "plain", "factors": {"dead": 1.35, "live": 1.5}}]})";
  const input::BeamFile f = input::parse_beam_text(text, "settled.json");
  ASSERT_TRUE(f.ok()) << f.errors.front().format("settled.json");
  const BeamResult r = check(f, Options{});
  // Exact: the node's deflection is prescribed; only rounding of the other
  // shares' (zero) deflection there may add to it.
  const double tol = 1e-12 * settlement;
  const double xb = 6.0;
  int envelopes = 0, plain = 0;
  for (const auto& set : r.sets) {
    if (set.envelope) {
      ++envelopes;
      std::vector<std::size_t> at_b;
      for (std::size_t i = 0; i < set.stations.size(); ++i)
        if (std::fabs(set.stations[i].x - xb) <= 1e-12 * xb) at_b.push_back(i);
      ASSERT_EQ(at_b.size(), 2u) << set.name << ": the node has a station on each side";
      std::vector<std::pair<std::string, const Envelope*>> envs = {{"consensus", &set.consensus_envelope}};
      int ok = 0;
      for (const auto& m : set.methods)
        if (m.status == MethodStatus::Ok) {
          ++ok;
          ASSERT_TRUE(m.envelope.has_value()) << set.name << " " << m.name;
          envs.push_back({m.name, &*m.envelope});
        }
      EXPECT_EQ(ok, 3) << set.name;
      for (const auto& [who, e] : envs)
        for (std::size_t i : at_b) {
          ASSERT_LT(i, e->deflection.size()) << set.name << " " << who;
          EXPECT_NEAR(e->deflection[i].max, settlement, tol) << set.name << " " << who << " station " << i;
          EXPECT_NEAR(e->deflection[i].min, settlement, tol) << set.name << " " << who << " station " << i;
        }
    } else {
      ++plain;
      ASSERT_EQ(set.consensus_nodes.size(), 3u) << set.name;
      EXPECT_NEAR(set.consensus_nodes[1].deflection, settlement, tol) << set.name;
      for (const auto& m : set.methods)
        if (m.status == MethodStatus::Ok) {
          EXPECT_NEAR(m.nodes.at(1).deflection, settlement, tol) << set.name << " " << m.name;
        }
    }
  }
  EXPECT_EQ(envelopes, 6);
  EXPECT_EQ(plain, 3);  // dead, live, plain
}

// ---------------------------------------------------------------------------
// 3. Span extremes against dense sampling of every arrangement.

// A set's load as shares and arrangements, each share solved once by one method.
struct Model {
  std::vector<Share> shares;
  std::vector<Arrangement> arrs;
  std::vector<std::vector<std::vector<std::optional<double>>>> opts;  // [arrangement][share]
  std::vector<Solution> unit;                                          // [share]
};

struct PointEnv {
  double mhi, mlo, dhi, dlo;
};

PointEnv env_at(const Model& md, std::size_t span, double local, bool after) {
  std::vector<PointValues> p(md.unit.size());
  for (std::size_t i = 0; i < p.size(); ++i) p[i] = md.unit[i].at(span, local, after);
  const double inf = std::numeric_limits<double>::infinity();
  PointEnv e{-inf, inf, -inf, inf};
  for (const auto& o : md.opts) {
    double mh = 0, ml = 0, dh = 0, dl = 0;
    for (std::size_t i = 0; i < p.size(); ++i) {
      double a = inf, b = -inf, c = inf, d = -inf;  // min/max moment, min/max deflection
      for (const auto& f : o[i]) {
        const double m = f ? *f * p[i].moment : 0.0, v = f ? *f * p[i].deflection : 0.0;
        a = std::min(a, m); b = std::max(b, m);
        c = std::min(c, v); d = std::max(d, v);
      }
      mh += b; ml += a; dh += d; dl += c;
    }
    e.mhi = std::max(e.mhi, mh); e.mlo = std::min(e.mlo, ml);
    e.dhi = std::max(e.dhi, dh); e.dlo = std::min(e.dlo, dl);
  }
  return e;
}

struct Dense {
  double max_m, min_m;
  double max_d, min_d;  // largest deflection_max, smallest deflection_min
  double max_m_x = 0, min_m_x = 0, max_d_x = 0, min_d_x = 0;  // where (global x)
};

constexpr int kDense = 2400;  // equal divisions per span for the dense sampling

Dense dense_span(const Model& md, const Beam& base, const std::vector<Station>& st, std::size_t s) {
  const double inf = std::numeric_limits<double>::infinity();
  Dense d{-inf, inf, -inf, inf};
  const double x0 = base.node_x(s);
  auto take = [&](double local, bool after) {
    const PointEnv e = env_at(md, s, local, after);
    if (e.mhi > d.max_m) { d.max_m = e.mhi; d.max_m_x = x0 + local; }
    if (e.mlo < d.min_m) { d.min_m = e.mlo; d.min_m_x = x0 + local; }
    if (e.dhi > d.max_d) { d.max_d = e.dhi; d.max_d_x = x0 + local; }
    if (e.dlo < d.min_d) { d.min_d = e.dlo; d.min_d_x = x0 + local; }
  };
  const double L = base.spans[s].length;
  for (int j = 0; j <= kDense; ++j) take(j == kDense ? L : L * j / kDense, false);
  for (const auto& p : st)
    if (p.span == s) take(p.local, p.after);  // load positions, both sides of every jump
  return d;
}

double signed_largest(double max_d, double min_d) { return std::fabs(max_d) >= std::fabs(min_d) ? max_d : min_d; }

struct SetModels {
  std::string name;
  bool envelope = false;
  std::vector<std::string> methods;
  std::vector<Model> models;               // per ok method
  std::vector<std::vector<Dense>> dense;   // per ok method, per span
  std::vector<Station> stations;           // the set's, at 10 per span (every load position)
  double moment_scale = 0, deflection_scale = 0;
};

// One extreme against the dense brute force and, at its reported x, the
// brute-force envelope there.
void expect_extremes(const SpanExtremes& x, const Dense& d, const Model* md, const Beam& base,
                     const std::vector<Station>& st, std::size_t s, double ms, double ds, const std::string& ctx_in,
                     const MethodResult* mr = nullptr) {
  // For the reader of a failure only (never asserted): the code's own
  // envelope at the x where the dense sampling found the extreme.
  std::string ctx = ctx_in;
  if (mr && mr->envelope_model) {
    const double x0 = base.node_x(s);
    char buf[200];
    std::snprintf(buf, sizeof buf, " [the code's own envelope_value there: moment_max %.10g at x = %.6g, moment_min %.10g at x = %.6g]",
                  envelope_value(*mr->envelope_model, input::Quantity::MomentMax, s, d.max_m_x - x0, false), d.max_m_x,
                  envelope_value(*mr->envelope_model, input::Quantity::MomentMin, s, d.min_m_x - x0, false), d.min_m_x);
    ctx += buf;
  }
  // The dense grid misses a smooth maximum by at most about (L / kDense)^2 of
  // the curvature: below 1e-6 of the largest moment for these loads.
  const double grid_m = 2e-6 * ms, round_m = kRel * ms, grid_d = 2e-6 * ds, round_d = kRel * ds;
  EXPECT_GE(x.max_moment, d.max_m - round_m) << ctx << " max_moment at x = " << x.max_moment_x << "; dense at x = " << d.max_m_x;
  EXPECT_LE(x.max_moment, d.max_m + grid_m) << ctx << " max_moment at x = " << x.max_moment_x << "; dense at x = " << d.max_m_x;
  EXPECT_LE(x.min_moment, d.min_m + round_m) << ctx << " min_moment at x = " << x.min_moment_x << "; dense at x = " << d.min_m_x;
  EXPECT_GE(x.min_moment, d.min_m - grid_m) << ctx << " min_moment at x = " << x.min_moment_x << "; dense at x = " << d.min_m_x;
  const double dense_d = signed_largest(d.max_d, d.min_d);
  EXPECT_GE(std::fabs(x.max_deflection), std::fabs(dense_d) - round_d) << ctx << " max_deflection " << x.max_deflection << " dense " << dense_d;
  EXPECT_LE(std::fabs(x.max_deflection), std::fabs(dense_d) + grid_d) << ctx << " max_deflection " << x.max_deflection << " dense " << dense_d;
  if (std::fabs(std::fabs(d.max_d) - std::fabs(d.min_d)) > 2 * grid_d) {
    EXPECT_EQ(x.max_deflection > 0, dense_d > 0) << ctx << " max_deflection " << x.max_deflection << " dense " << dense_d;
  }
  if (!md) return;
  // At the reported x the envelope takes the reported value.
  const double x0 = base.node_x(s), L = base.spans[s].length;
  auto at_x = [&](double gx, const std::string& what) {
    EXPECT_GE(gx, x0 - 1e-9 * L) << ctx << " " << what << "_x " << gx;
    EXPECT_LE(gx, x0 + L + 1e-9 * L) << ctx << " " << what << "_x " << gx;
    const double local = std::clamp(gx - x0, 0.0, L);
    std::vector<PointEnv> v = {env_at(*md, s, local, false)};
    if (local > 0 && local < L) v.push_back(env_at(*md, s, local, true));
    // x - x0 may miss a load's position by a rounding: there, both sides of the station.
    for (const auto& p : st)
      if (p.span == s && std::fabs(x0 + p.local - gx) <= 1e-12 * (x0 + L)) v.push_back(env_at(*md, s, p.local, p.after));
    return v;
  };
  double best = std::numeric_limits<double>::infinity();
  for (const auto& e : at_x(x.max_moment_x, "max_moment")) best = std::min(best, std::fabs(e.mhi - x.max_moment));
  EXPECT_LE(best, round_m) << ctx << " max_moment " << x.max_moment << " is not the envelope at x = " << x.max_moment_x
                           << " (dense maximum at x = " << d.max_m_x << "; span from " << x0 << " to " << x0 + L << ")";
  best = std::numeric_limits<double>::infinity();
  for (const auto& e : at_x(x.min_moment_x, "min_moment")) best = std::min(best, std::fabs(e.mlo - x.min_moment));
  EXPECT_LE(best, round_m) << ctx << " min_moment " << x.min_moment << " is not the envelope at x = " << x.min_moment_x
                           << " (dense minimum at x = " << d.min_m_x << "; span from " << x0 << " to " << x0 + L << ")";
  best = std::numeric_limits<double>::infinity();
  for (const auto& e : at_x(x.max_deflection_x, "max_deflection"))
    best = std::min({best, std::fabs(e.dhi - x.max_deflection), std::fabs(e.dlo - x.max_deflection)});
  EXPECT_LE(best, round_d) << ctx << " max_deflection " << x.max_deflection << " is not the envelope at x = " << x.max_deflection_x
                           << " (dense largest at x = " << (std::fabs(d.max_d) >= std::fabs(d.min_d) ? d.max_d_x : d.min_d_x)
                           << "; span from " << x0 << " to " << x0 + L << ")";
}

Dense median_dense(const std::vector<std::vector<Dense>>& v, std::size_t s) {
  auto med = [&](double Dense::*f) {
    std::vector<double> a;
    for (const auto& m : v) a.push_back(m[s].*f);
    std::sort(a.begin(), a.end());
    return a.size() % 2 ? a[a.size() / 2] : 0.5 * (a[a.size() / 2 - 1] + a[a.size() / 2]);
  };
  return {med(&Dense::max_m), med(&Dense::min_m), med(&Dense::max_d), med(&Dense::min_d),
          v.front()[s].max_m_x, v.front()[s].min_m_x, v.front()[s].max_d_x, v.front()[s].min_d_x};
}

TEST(EnvelopeBruteForce, SpanExtremesMatchDenseSamplingOfEveryArrangement) {
  Rng rng(7303u);
  const int trials = 80;
  int accepted = 0, compared = 0;
  for (int trial = 0; trial < trials; ++trial) {
    const std::size_t n = 2 + static_cast<std::size_t>(trial % 3);  // 2 to 4 spans
    const Gen g = random_beam(rng, n);
    const input::BeamFile f = input::parse_beam_text(g.text, "random.json");
    if (!f.ok()) {
      std::printf("trial %d skipped, the reader refuses it: %s\n", trial, f.errors.front().format("random.json").c_str());
      continue;
    }
    ++accepted;
    const Beam base = bare(f.beam);
    Options o10;
    o10.stations_per_span = 10;
    const BeamResult r10 = check(f, o10);
    // Every load set: the combinations and each case alone.
    std::vector<GenCombo> sets = g.combos;
    for (const auto& c : g.cases) {
      GenCombo one;
      one.name = c;
      one.factors = {{c, {1.0}}};
      sets.push_back(one);
    }
    std::vector<SetModels> all;
    for (const auto& c : sets) {
      const std::string ctx = "trial " + std::to_string(trial) + " (" + g.features + "), load set " + c.name;
      const LoadSet* set = set_named(r10, c.name);
      ASSERT_NE(set, nullptr) << ctx;
      ASSERT_EQ(set->envelope, c.envelope()) << ctx;
      SetModels sm;
      sm.name = c.name;
      sm.envelope = c.envelope();
      std::vector<Share> shares = make_shares(f.beam, g, c);
      if (!sm.envelope) {
        // A plain load set: its whole beam, solved once.
        Share whole;
        whole.what = "all";
        whole.factors = {1.0};
        whole.settle.assign(base.supports.size(), 0.0);
        for (const auto& sh : shares) {
          Beam b = base;
          add_share(b, sh, sh.factors.front());
          whole.loads.insert(whole.loads.end(), b.loads.begin(), b.loads.end());
          for (std::size_t i = 0; i < b.supports.size(); ++i) whole.settle[i] += b.supports[i].settlement;
        }
        shares = {whole};
      }
      for (const auto& mr : set->methods) {
        if (mr.status != MethodStatus::Ok) continue;
        const Method* m = find_method(mr.name);
        ASSERT_NE(m, nullptr);
        Model md;
        md.shares = shares;
        md.arrs = arrangements(c, n);
        for (const auto& a : md.arrs) {
          md.opts.emplace_back();
          for (const auto& sh : md.shares) md.opts.back().push_back(options(sh, a));
        }
        for (const auto& sh : md.shares) {
          Beam b = base;
          add_share(b, sh, 1.0);
          md.unit.push_back(m->solve(b, set->stations));
          ASSERT_EQ(md.unit.back().status, MethodStatus::Ok) << ctx << " " << m->name << ": " << md.unit.back().reason;
        }
        std::vector<Dense> d;
        for (std::size_t s = 0; s < n; ++s) {
          d.push_back(dense_span(md, base, set->stations, s));
          sm.moment_scale = std::max({sm.moment_scale, std::fabs(d.back().max_m), std::fabs(d.back().min_m)});
          sm.deflection_scale = std::max({sm.deflection_scale, std::fabs(d.back().max_d), std::fabs(d.back().min_d)});
        }
        sm.methods.push_back(mr.name);
        sm.stations = set->stations;
        sm.models.push_back(std::move(md));
        sm.dense.push_back(std::move(d));
      }
      EXPECT_GE(sm.methods.size(), 2u) << ctx << ": fewer than two methods are ok" << [&] {
        std::string w;
        for (const auto& mr : set->methods) w += "; " + mr.name + ": " + method_status_name(mr.status) + " " + mr.reason;
        return w;
      }();
      if (!sm.methods.empty()) all.push_back(std::move(sm));
    }
    for (int per_span : {1, 2, 3, 10}) {
      Options o;
      o.stations_per_span = per_span;
      const BeamResult r = per_span == 10 ? r10 : check(f, o);
      for (const auto& sm : all) {
        const std::string ctx = "trial " + std::to_string(trial) + " (" + g.features + "), load set " + sm.name +
                                ", stations_per_span " + std::to_string(per_span);
        const LoadSet* set = set_named(r, sm.name);
        ASSERT_NE(set, nullptr) << ctx;
        ASSERT_EQ(set->extremes.size(), n) << ctx;
        for (std::size_t k = 0; k < sm.methods.size(); ++k) {
          const MethodResult* mr = nullptr;
          for (const auto& m : set->methods)
            if (m.name == sm.methods[k]) mr = &m;
          ASSERT_NE(mr, nullptr) << ctx << " " << sm.methods[k];
          ASSERT_EQ(mr->status, MethodStatus::Ok) << ctx << " " << sm.methods[k];
          ASSERT_EQ(mr->extremes.size(), n) << ctx << " " << sm.methods[k];
          for (std::size_t s = 0; s < n; ++s)
            expect_extremes(mr->extremes[s], sm.dense[k][s], &sm.models[k], base, sm.stations, s, sm.moment_scale, sm.deflection_scale,
                            ctx + ", " + sm.methods[k] + ", span " + std::to_string(s + 1), mr);
        }
        for (std::size_t s = 0; s < n; ++s)
          expect_extremes(set->extremes[s], median_dense(sm.dense, s), nullptr, base, sm.stations, s, sm.moment_scale, sm.deflection_scale,
                          ctx + ", consensus, span " + std::to_string(s + 1));
        ++compared;
        if (failures() > 200) {
          ADD_FAILURE() << "stopping after trial " << trial << ": too many failures";
          return;
        }
      }
    }
  }
  std::printf("%d of %d beams read; %d load sets compared\n", accepted, trials, compared);
  EXPECT_GE(accepted, trials * 8 / 10);
}

// ---------------------------------------------------------------------------
// 4. A settlement that names a case takes that case's factor.

TEST(EnvelopeBruteForce, SettlementNamingACaseTakesThatCasesFactor) {
  const double settlement = 0.012;
  const std::string text = R"({"units": {"force": "kN", "length": "m"},
    "spans": [{"length": 5, "EI": 50000}, {"length": 7, "EI": 50000}, {"length": 4, "EI": 30000}],
    "supports": ["fixed", {"type": "roller", "settlement": {"value": 0.012, "case": "imposed"}}, "roller", "pinned"],
    "loads": [{"type": "udl", "span": 1, "w": 6, "case": "dead"}, {"type": "udl", "span": 2, "w": 6, "case": "dead"},
              {"type": "udl", "span": 3, "w": 6, "case": "dead"}, {"type": "point", "span": 2, "P": 20, "at": 3, "case": "imposed"},
              {"type": "udl", "span": 3, "w": 9, "case": "imposed"}],
    "combinations": [
      {"name": "half", "factors": {"dead": 1.35, "imposed": 0.5}},
      {"name": "dead-only", "factors": {"dead": 1.35}},
      {"name": "range", "factors": {"dead": 1.0, "imposed": [0.5, 1.5]}},
      {"name": "patterned", "factors": {"dead": 1.0, "imposed": 1.5}, "pattern": ["imposed"]},
      {"name": "patterned-range", "factors": {"dead": 1.0, "imposed": [0.5, 1.5]}, "pattern": ["imposed"], "arrangements": "adjacent-and-alternate"}]})";
  const input::BeamFile f = input::parse_beam_text(text, "cased.json");
  ASSERT_TRUE(f.ok()) << f.errors.front().format("cased.json");
  const BeamResult r = check(f, Options{});
  // Exact: the node's deflection is prescribed (see above).
  const double tol = 1e-12 * settlement;
  // Plain load sets: the settled node's deflection.
  const std::pair<const char*, double> plain[] = {{"half", 0.5 * settlement}, {"dead-only", 0.0}, {"imposed", settlement}, {"dead", 0.0}};
  for (const auto& [name, want] : plain) {
    const LoadSet* s = set_named(r, name);
    ASSERT_NE(s, nullptr) << name;
    ASSERT_FALSE(s->envelope) << name;
    ASSERT_EQ(s->consensus_nodes.size(), 4u) << name;
    EXPECT_NEAR(s->consensus_nodes[1].deflection, want, tol) << name;
    int ok = 0;
    for (const auto& m : s->methods)
      if (m.status == MethodStatus::Ok) {
        ++ok;
        EXPECT_NEAR(m.nodes.at(1).deflection, want, tol) << name << " " << m.name;
      }
    EXPECT_EQ(ok, 3) << name;
  }
  // Envelopes: the settlement goes with the case's (non-patterned or node)
  // share, so it takes each factor of the case and is never off.
  const std::tuple<const char*, double, double> env[] = {
      {"range", 1.5 * settlement, 0.5 * settlement},
      {"patterned", 1.5 * settlement, 1.5 * settlement},
      {"patterned-range", 1.5 * settlement, 0.5 * settlement}};
  for (const auto& [name, hi, lo] : env) {
    const LoadSet* s = set_named(r, name);
    ASSERT_NE(s, nullptr) << name;
    ASSERT_TRUE(s->envelope) << name;
    std::vector<std::size_t> at_b;
    for (std::size_t i = 0; i < s->stations.size(); ++i)
      if (std::fabs(s->stations[i].x - 5.0) <= 1e-12 * 5.0) at_b.push_back(i);
    ASSERT_EQ(at_b.size(), 2u) << name;
    std::vector<std::pair<std::string, const Envelope*>> envs = {{"consensus", &s->consensus_envelope}};
    for (const auto& m : s->methods)
      if (m.status == MethodStatus::Ok) {
        ASSERT_TRUE(m.envelope.has_value()) << name << " " << m.name;
        envs.push_back({m.name, &*m.envelope});
      }
    EXPECT_EQ(envs.size(), 4u) << name;
    for (const auto& [who, e] : envs)
      for (std::size_t i : at_b) {
        ASSERT_LT(i, e->deflection.size()) << name << " " << who;
        EXPECT_NEAR(e->deflection[i].max, hi, tol) << name << " " << who;
        EXPECT_NEAR(e->deflection[i].min, lo, tol) << name << " " << who;
      }
  }
}

}  // namespace
}  // namespace trivet::compare
