#include "harness/compare/moving.h"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <exception>
#include <limits>
#include <map>
#include <new>
#include <optional>
#include <tuple>
#include <utility>

#include "harness/compare/detail.h"
#include "harness/compare/extremes.h"
#include "methods/beam/status.h"

namespace trivet::compare {

using namespace detail;

namespace {

constexpr double kPi = 3.14159265358979323846;

// The Chebyshev points of a piece in t in [-1, 1], increasing, and the
// matrix that turns values there into the coefficients of the cubic through
// them (c[k] multiplies t^k).
struct Cheb {
  std::array<double, 4> t{};
  std::array<std::array<double, 4>, 4> inv{};
  Cheb() {
    for (int m = 0; m < 4; ++m) t[static_cast<std::size_t>(m)] = -std::cos((2 * m + 1) * kPi / 8);
    // Invert the Vandermonde matrix V[m][k] = t_m^k (Gauss-Jordan, partial pivoting).
    double a[4][8];
    for (int m = 0; m < 4; ++m)
      for (int k = 0; k < 8; ++k)
        a[m][k] = k < 4 ? std::pow(t[static_cast<std::size_t>(m)], k) : (k - 4 == m ? 1.0 : 0.0);
    for (int c = 0; c < 4; ++c) {
      int p = c;
      for (int r = c + 1; r < 4; ++r)
        if (std::abs(a[r][c]) > std::abs(a[p][c])) p = r;
      for (int k = 0; k < 8; ++k) std::swap(a[c][k], a[p][k]);
      const double d = a[c][c];
      for (int k = 0; k < 8; ++k) a[c][k] /= d;
      for (int r = 0; r < 4; ++r)
        if (r != c) {
          const double f = a[r][c];
          for (int k = 0; k < 8; ++k) a[r][k] -= f * a[c][k];
        }
    }
    // V c = y  =>  c = V^-1 y.
    for (int k = 0; k < 4; ++k)
      for (int m = 0; m < 4; ++m) inv[static_cast<std::size_t>(k)][static_cast<std::size_t>(m)] = a[k][4 + m];
  }
  std::array<double, 4> fit(const double* y) const {
    std::array<double, 4> c{};
    for (std::size_t k = 0; k < 4; ++k)
      c[k] = inv[k][0] * y[0] + inv[k][1] * y[1] + inv[k][2] * y[2] + inv[k][3] * y[3];
    return c;
  }
};
const Cheb& cheb() {
  static const Cheb c;
  return c;
}

bool same(double a, double b) { return !(a < b) && !(b < a); }

double cubic(const std::array<double, 4>& c, double t) { return ((c[3] * t + c[2]) * t + c[1]) * t + c[0]; }

double pick(const PointValues& p, MovingModel::What w) {
  return w == MovingModel::kMoment ? p.moment : w == MovingModel::kShear ? p.shear : p.deflection;
}

double beam_length(const Beam& b) { return b.node_x(b.node_count() - 1); }

}  // namespace

// One interval of the first point's position, (p0, p1), in which no point
// of the train crosses a piece end: the effect is one cubic there. At each
// of the interval's four Chebyshev points, the pieces under the train's
// points and where on them (t), with each point's force.
struct MovingModel::Run {
  double p0 = 0, p1 = 0;
  struct Term {
    std::uint32_t piece = 0;
    double t = 0;
    double P = 0;
  };
  std::array<std::vector<Term>, 4> terms;
};

MovingModel::Table MovingModel::table_for(const std::vector<Piece>& pieces) const {
  Table table;
  if (pieces.empty()) return table;
  const double length = pieces.back().x1;
  // The piece ends: ends[0] the beam's start, ends[j + 1] the end of piece j.
  std::vector<double> ends;
  ends.reserve(pieces.size() + 1);
  ends.push_back(pieces.front().x0);
  for (const auto& pc : pieces) ends.push_back(pc.x1);
  const auto upper = ends.begin() + 1;  // the end of each piece
  const auto& C = cheb();
  for (int dir = 0; dir < (train_.both_directions ? 2 : 1); ++dir) {
    const double d = dir == 0 ? 1.0 : -1.0;
    std::vector<double> cuts;
    cuts.reserve(ends.size() * train_.points.size());
    for (const auto& pt : train_.points)
      for (double e : ends) cuts.push_back(e - d * pt.offset);
    std::sort(cuts.begin(), cuts.end());
    cuts.erase(std::unique(cuts.begin(), cuts.end()), cuts.end());
    auto& runs = table.runs[dir];
    for (std::size_t i = 0; i + 1 < cuts.size(); ++i) {
      Run run;
      run.p0 = cuts[i];
      run.p1 = cuts[i + 1];
      if (!(run.p1 > run.p0)) continue;
      const double mid = 0.5 * (run.p0 + run.p1), half = 0.5 * (run.p1 - run.p0);
      bool any = false;
      for (const auto& pt : train_.points) {
        // On the beam or off it, and on which piece, the same for the whole
        // run (no point crosses a piece end inside it): decided once at the
        // middle, so rounding at the four points of a very short run cannot
        // put one point on two pieces.
        const double am = mid + d * pt.offset;
        if (!(am > 0 && am < length)) continue;
        std::size_t j = static_cast<std::size_t>(std::upper_bound(upper, ends.end(), am) - upper);
        if (j >= pieces.size()) j = pieces.size() - 1;
        const Piece& pc = pieces[j];
        const double pm = 0.5 * (pc.x0 + pc.x1), ph = 0.5 * (pc.x1 - pc.x0);
        for (std::size_t m = 0; m < 4; ++m) {
          const double a = mid + half * C.t[m] + d * pt.offset;
          run.terms[m].push_back({static_cast<std::uint32_t>(j), std::min(1.0, std::max(-1.0, (a - pm) / ph)), pt.P});
        }
        any = true;
      }
      if (any) runs.push_back(std::move(run));
    }
  }
  return table;
}

Bound MovingModel::train_bound(const std::vector<double>& line, const std::vector<Piece>& pieces, const Table& table) const {
  const auto& C = cheb();
  const double length = pieces.empty() ? 0.0 : pieces.back().x1;
  std::vector<std::array<double, 4>> coef(pieces.size());
  for (std::size_t j = 0; j < pieces.size(); ++j) coef[j] = C.fit(&line[4 * j]);
  // The train off the beam: no effect.
  double best_hi = 0, best_lo = 0;
  Governs off;
  off.train = Governs::Train::Off;
  Governs hi = off, lo = off;
  for (int dir = 0; dir < 2; ++dir) {
    for (const Run& run : table.runs[dir]) {
      double e[4];
      for (std::size_t m = 0; m < 4; ++m) {
        double v = 0;
        for (const auto& term : run.terms[m]) v += term.P * cubic(coef[term.piece], term.t);
        e[m] = v;
      }
      const std::array<double, 4> c = C.fit(e);
      auto consider = [&](double t) {
        const double v = cubic(c, t);
        if (v > best_hi || v < best_lo) {
          Governs g;
          g.train = Governs::Train::Placed;
          g.first = 0.5 * (run.p0 + run.p1) + 0.5 * (run.p1 - run.p0) * t;
          if (t <= -1) { g.first = run.p0; g.approach = 1; }
          if (t >= 1) { g.first = run.p1; g.approach = -1; }
          g.backward = dir == 1;
          // The side it comes from matters only where a point stands on an
          // end of the beam (on it or just off it); elsewhere the train
          // stands there as it is.
          if (g.approach != 0) {
            bool at_end = false;
            for (const auto& pt : train_.points) {
              const double a = g.first + (dir == 0 ? 1.0 : -1.0) * pt.offset;
              if (std::abs(a - pieces.front().x0) <= 1e-12 * length || std::abs(a - length) <= 1e-12 * length) at_end = true;
            }
            if (!at_end) g.approach = 0;
          }
          if (v > best_hi) { best_hi = v; hi = g; }
          if (v < best_lo) { best_lo = v; lo = g; }
        }
      };
      consider(-1);
      consider(1);
      Poly dp{};
      dp[0] = c[1];
      dp[1] = 2 * c[2];
      dp[2] = 3 * c[3];
      std::array<double, kDegree> z{};
      const int nz = poly_zeros(dp, -1, 1, z);
      for (int k = 0; k < nz; ++k) consider(z[static_cast<std::size_t>(k)]);
    }
  }
  Bound b;
  b.max = best_hi;
  b.min = best_lo;
  b.max_by = std::make_shared<const Governs>(std::move(hi));
  b.min_by = std::make_shared<const Governs>(std::move(lo));
  return b;
}

std::shared_ptr<MovingModel> MovingModel::build(const Method& method, const Beam& base, const std::vector<Station>& stations,
                                               const input::MovingLoad& train, double factor, MethodResult& r) {
  auto m = std::make_shared<MovingModel>();
  m->method_ = &method;
  m->base_ = base;
  m->bare_ = base;
  m->bare_.loads.clear();
  for (auto& s : m->bare_.supports) { s.settlement = 0; s.settlement_case.clear(); }
  m->stations_ = stations;
  m->train_ = train;
  m->factor_ = factor;
  const std::size_t nodes = base.node_count();
  auto fail = [&](const Solution& s) {
    r.status = s.status == MethodStatus::Ok ? MethodStatus::Failed : s.status;
    r.reason = s.status == MethodStatus::Ok ? "the method returned an incomplete result" : s.reason;
    r.reason_id = s.status == MethodStatus::Ok ? std::string(reason_id::kIncomplete) : s.reason_id;
  };
  auto sound = [&](const Solution& s) { return s.status == MethodStatus::Ok && s.at && s.nodes.size() == nodes; };
  auto balance = [&](const Beam& b, const Solution& s) {
    const Equilibrium e = equilibrium_of(b, s.nodes);
    r.equilibrium.force_residual = std::max(r.equilibrium.force_residual, e.force_residual);
    r.equilibrium.moment_residual = std::max(r.equilibrium.moment_residual, e.moment_residual);
  };
  m->fixed_ = method.solve(base, stations);
  if (!sound(m->fixed_)) { fail(m->fixed_); return nullptr; }
  balance(base, m->fixed_);
  for (const auto& nd : m->fixed_.nodes) m->fixed_reactions_.push_back(nd.reaction_force);
  std::vector<NodeResult>().swap(m->fixed_.nodes);

  // The pieces: between the distinct station positions of each span.
  double x0 = 0;
  for (std::size_t s = 0; s < base.spans.size(); ++s) {
    std::vector<double> at;
    for (const auto& st : stations)
      if (st.span == s) at.push_back(st.local);
    at.push_back(0);
    at.push_back(base.spans[s].length);
    std::sort(at.begin(), at.end());
    at.erase(std::unique(at.begin(), at.end()), at.end());
    for (std::size_t k = 0; k + 1 < at.size(); ++k) m->pieces_.push_back({s, at[k], at[k + 1], x0 + at[k], x0 + at[k + 1]});
    x0 = base.node_x(s + 1);
  }
  // The unit loads, four per piece, each solved by the method.
  const auto& C = cheb();
  m->sample_reactions_.assign(nodes, {});
  for (auto& v : m->sample_reactions_) v.reserve(4 * m->pieces_.size());
  m->samples_.reserve(4 * m->pieces_.size());
  Beam unit = m->bare_;
  unit.loads.resize(1);
  for (const Piece& pc : m->pieces_) {
    const double mid = 0.5 * (pc.lo + pc.hi), half = 0.5 * (pc.hi - pc.lo);
    for (std::size_t k = 0; k < 4; ++k) {
      Load& l = unit.loads[0];
      l = Load{};
      l.type = LoadType::Point;
      l.index = pc.span;
      l.at = mid + half * C.t[k];
      l.P = 1;
      l.load_case = train.name;
      Solution s = method.solve(unit, stations);
      if (!sound(s)) { fail(s); return nullptr; }
      balance(unit, s);
      for (std::size_t j = 0; j < nodes; ++j) m->sample_reactions_[j].push_back(s.nodes[j].reaction_force);
      std::vector<NodeResult>().swap(s.nodes);
      m->sample_x_.push_back(pc.x0 + (l.at - pc.lo));
      m->samples_.push_back(std::move(s));
    }
  }
  m->table_ = std::make_shared<const Table>(m->table_for(m->pieces_));
  r.status = MethodStatus::Ok;
  return m;
}

std::vector<double> MovingModel::influence(std::size_t span, double local, bool after, What what) const {
  std::vector<double> line(samples_.size());
  for (std::size_t i = 0; i < samples_.size(); ++i) line[i] = pick(samples_[i].at(span, local, after), what);
  return line;
}

std::vector<double> MovingModel::reaction_influence(std::size_t node) const {
  return node < sample_reactions_.size() ? sample_reactions_[node] : std::vector<double>(samples_.size(), 0.0);
}

double MovingModel::influence_value(const std::vector<double>& line, double x, bool right) const {
  if (pieces_.empty() || line.size() != 4 * pieces_.size()) return 0;
  if (x < pieces_.front().x0 || x > pieces_.back().x1) return 0;
  std::size_t j = 0;
  for (; j + 1 < pieces_.size(); ++j) {
    if (x < pieces_[j].x1) break;
    if (!(x > pieces_[j].x1) && !right) break;  // at the end of piece j: from its inside
  }
  const Piece& pc = pieces_[j];
  const double pm = 0.5 * (pc.x0 + pc.x1), ph = 0.5 * (pc.x1 - pc.x0);
  return cubic(cheb().fit(&line[4 * j]), std::min(1.0, std::max(-1.0, (x - pm) / ph)));
}

Bound MovingModel::with_fixed(Bound b, double fixed) const {
  if (factor_ < 0) {
    std::swap(b.max, b.min);
    std::swap(b.max_by, b.min_by);
  }
  b.max = fixed + factor_ * b.max;
  b.min = fixed + factor_ * b.min;
  return b;
}

Bound MovingModel::at(std::size_t span, double local, bool after, What what) const {
  bool on_grid = false;
  for (const Piece& pc : pieces_)
    if (pc.span == span && (same(local, pc.lo) || same(local, pc.hi))) on_grid = true;
  if (!on_grid) return off_grid(span, local, after, what);
  return with_fixed(train_bound(influence(span, local, after, what), pieces_, *table_),
                    pick(fixed_.at(span, local, after), what));
}

Bound MovingModel::reaction(std::size_t node) const {
  return with_fixed(train_bound(reaction_influence(node), pieces_, *table_),
                    node < fixed_reactions_.size() ? fixed_reactions_[node] : 0.0);
}

Bound MovingModel::off_grid(std::size_t span, double local, bool after, What what) const {
  // The piece that holds the point, split there: four new unit loads on
  // each side, solved by the method; the other pieces keep theirs.
  std::vector<Piece> pieces;
  std::vector<double> line;
  const auto& C = cheb();
  Beam unit = bare_;
  unit.loads.resize(1);
  for (std::size_t j = 0; j < pieces_.size(); ++j) {
    const Piece& pc = pieces_[j];
    if (pc.span == span && local > pc.lo && local < pc.hi) {
      const double xs = pc.x0 + (local - pc.lo);
      const Piece parts[2] = {{span, pc.lo, local, pc.x0, xs}, {span, local, pc.hi, xs, pc.x1}};
      for (const Piece& part : parts) {
        pieces.push_back(part);
        const double mid = 0.5 * (part.lo + part.hi), half = 0.5 * (part.hi - part.lo);
        for (std::size_t k = 0; k < 4; ++k) {
          Load& l = unit.loads[0];
          l = Load{};
          l.type = LoadType::Point;
          l.index = span;
          l.at = mid + half * C.t[k];
          l.P = 1;
          const Solution s = method_->solve(unit, stations_);
          line.push_back(s.status == MethodStatus::Ok && s.at ? pick(s.at(span, local, after), what)
                                                              : std::numeric_limits<double>::quiet_NaN());
        }
      }
    } else {
      pieces.push_back(pc);
      for (std::size_t k = 0; k < 4; ++k) line.push_back(pick(samples_[4 * j + k].at(span, local, after), what));
    }
  }
  return with_fixed(train_bound(line, pieces, table_for(pieces)), pick(fixed_.at(span, local, after), what));
}

Beam MovingModel::placed_beam(const Governs& g) const {
  Beam b = base_;
  if (g.train != Governs::Train::Placed) return b;
  const double length = beam_length(b);
  const double tol = 1e-12 * length;
  const double d = g.backward ? -1.0 : 1.0;
  for (const auto& pt : train_.points) {
    const double a = g.first + d * pt.offset;
    if (a < -tol || a > length + tol) continue;
    // A point at an end of the beam, where the value is a limit: on the
    // beam as it was just before (every point comes from the side of
    // g.approach, as the first does).
    if (g.approach < 0 && std::abs(a) <= tol) continue;
    if (g.approach > 0 && std::abs(a - length) <= tol) continue;
    Load l;
    l.type = LoadType::Point;
    l.P = factor_ * pt.P;
    l.load_case = train_.name;
    std::optional<std::size_t> node;
    for (std::size_t i = 0; i < b.node_count(); ++i)
      if (std::abs(a - b.node_x(i)) <= tol) node = i;
    if (node) {
      l.on_node = true;
      l.index = *node;
    } else {
      const auto [s, local] = locate(b, a);
      l.index = s;
      l.at = std::min(std::max(local, 0.0), b.spans[s].length);
      if (!(l.at > 0) || !(l.at < b.spans[s].length)) {
        l.on_node = true;
        l.index = l.at > 0 ? s + 1 : s;
      }
    }
    b.loads.push_back(l);
  }
  return b;
}

namespace detail {

void run_moving_method(const Method& method, const LoadSet& set, MethodResult& r) {
  using M = MovingModel;
  if (!set.moving) return;
  auto model = M::build(method, set.beam, set.stations, *set.moving, set.moving_factor, r);
  if (!model) return;
  Envelope env;
  env.moment.reserve(set.stations.size());
  for (const auto& st : set.stations) {
    env.moment.push_back(model->at(st.span, st.local, st.after, M::kMoment));
    env.shear.push_back(model->at(st.span, st.local, st.after, M::kShear));
    env.deflection.push_back(model->at(st.span, st.local, st.after, M::kDeflection));
  }
  for (std::size_t j = 0; j < set.beam.node_count(); ++j) env.reaction.push_back(model->reaction(j));
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
  // Each span's extremes: the largest over its stations.
  const std::size_t n = set.beam.spans.size();
  r.extremes.assign(n, {});
  std::vector<char> seen(n, 0);
  for (std::size_t i = 0; i < set.stations.size(); ++i) {
    const Station& st = set.stations[i];
    SpanExtremes& e = r.extremes[st.span];
    const Bound& bm = env.moment[i];
    const Bound& bd = env.deflection[i];
    const bool first = !seen[st.span];
    seen[st.span] = 1;
    if (first || bm.max > e.max_moment) {
      e.max_moment = bm.max;
      e.max_moment_x = st.x;
      e.max_moment_by = describe(governs_of(bm.max_by), *set.combination);
    }
    if (first || bm.min < e.min_moment) {
      e.min_moment = bm.min;
      e.min_moment_x = st.x;
      e.min_moment_by = describe(governs_of(bm.min_by), *set.combination);
    }
    const bool use_max = std::abs(bd.max) >= std::abs(bd.min);
    const double dv = use_max ? bd.max : bd.min;
    if (first || std::abs(dv) > std::abs(e.max_deflection)) {
      e.max_deflection = dv;
      e.max_deflection_x = st.x;
      e.max_deflection_by = describe(governs_of(use_max ? bd.max_by : bd.min_by), *set.combination);
    }
  }
  r.envelope = std::move(env);
  r.moving_model = std::move(model);
}

void compare_influence_lines(LoadSet& set, double agreement) {
  std::vector<const MethodResult*> ok;
  for (const auto& m : set.methods)
    if (m.status == MethodStatus::Ok && m.moving_model) ok.push_back(&m);
  if (ok.size() < 2) return;
  using M = MovingModel;
  // Each kind's lines, scaled by the largest ordinate of that kind.
  struct Kindwise {
    Kind kind;
    double scale = 0, diff = 0;
    std::string where;
  };
  Kindwise kw[4] = {{Kind::Moment, 0, 0, {}}, {Kind::Shear, 0, 0, {}}, {Kind::Deflection, 0, 0, {}}, {Kind::Reaction, 0, 0, {}}};
  const M::What whats[3] = {M::kMoment, M::kShear, M::kDeflection};
  std::vector<std::vector<double>> lines(ok.size());
  auto compare_lines = [&](Kindwise& k, const std::string& where) {
    for (const auto& l : lines)
      for (double v : l) k.scale = std::max(k.scale, std::abs(v));
    for (std::size_t a = 0; a < lines.size(); ++a)
      for (std::size_t b = a + 1; b < lines.size(); ++b)
        for (std::size_t i = 0; i < lines[a].size() && i < lines[b].size(); ++i) {
          const double d = std::abs(lines[a][i] - lines[b][i]);
          if (d > k.diff) {
            k.diff = d;
            k.where = where + " with the unit load at x = " + fmt(ok[a]->moving_model->sample_x()[i]);
          }
        }
  };
  // The scale first needs every line: two passes would read every line
  // twice; instead the differences are kept absolute and scaled at the end
  // by the largest ordinate seen.
  for (const auto& st : set.stations)
    for (int w = 0; w < 3; ++w) {
      for (std::size_t k = 0; k < ok.size(); ++k) lines[k] = ok[k]->moving_model->influence(st.span, st.local, st.after, whats[w]);
      compare_lines(kw[w], std::string(kind_name(kw[w].kind)) + " at x = " + fmt(st.x));
    }
  for (std::size_t j = 0; j < set.beam.node_count(); ++j) {
    for (std::size_t k = 0; k < ok.size(); ++k) lines[k] = ok[k]->moving_model->reaction_influence(j);
    compare_lines(kw[3], "reaction at node " + set.beam.labels[j]);
  }
  // A kind whose ordinates are all rounding (the deflections of a beam read
  // only at its supports) is scaled from the others, as everywhere.
  double sc[kKinds] = {0, 0, 0, 0, 0};
  for (const auto& k : kw) sc[static_cast<int>(k.kind)] = k.scale;
  floor_scales(sc, set.beam);
  for (auto& k : kw) k.scale = sc[static_cast<int>(k.kind)];
  const Kindwise* worst = nullptr;
  double worst_r = 0;
  for (auto& k : kw) {
    const double r = k.scale > 0 ? k.diff / k.scale : k.diff;
    double& md = set.max_difference[static_cast<int>(k.kind)];
    md = std::max(md, r);
    if (r > worst_r) { worst_r = r; worst = &k; }
  }
  if (worst && worst_r > agreement && set.verdict == Verdict::Agree) {
    set.verdict = Verdict::Disagree;
    set.problem = "the influence lines differ in " + worst->where + " by " + fmt(worst_r) + " of the largest ordinate";
  }
}

void moving_second_route(LoadSet& set, const std::vector<const Method*>& methods, double agreement) {
  using M = MovingModel;
  set.second_route.clear();
  const MethodResult* lead = nullptr;
  for (const auto& m : set.methods)
    if (m.status == MethodStatus::Ok && m.moving_model) { lead = &m; break; }
  if (!lead || set.extremes.size() != set.beam.spans.size()) return;
  const M& model = *lead->moving_model;
  const Beam& beam = set.beam;
  // What the envelope reports as governing (route_items); the extremes are
  // read at stations, so each is taken at the station of its span nearest
  // it, where the lead model says where the train stands.
  struct Item : RouteItem {
    bool after = false;
    M::What what = M::kMoment;
    std::shared_ptr<const Governs> by;
  };
  std::vector<Item> items;
  for (RouteItem& ri : route_items(set)) {
    Item it;
    static_cast<RouteItem&>(it) = std::move(ri);
    if (it.node) {
      const Bound b = model.reaction(it.index);
      it.by = it.want_max ? b.max_by : b.min_by;
    } else {
      const Station* best = nullptr;
      for (const auto& st : set.stations)
        if (st.span == it.index && (!best || std::abs(st.x - it.check.x) < std::abs(best->x - it.check.x))) best = &st;
      if (!best) continue;
      it.local = best->local;
      it.after = best->after;
      it.what = it.deflection ? M::kDeflection : M::kMoment;
      const Bound b = model.at(it.index, best->local, best->after, it.what);
      it.by = it.want_max ? b.max_by : b.min_by;
    }
    items.push_back(std::move(it));
  }
  // Each distinct position solved once by every method.
  std::map<std::tuple<int, double, bool>, std::vector<std::size_t>> positions;
  for (std::size_t i = 0; i < items.size(); ++i) {
    const Governs& g = governs_of(items[i].by);
    positions[{static_cast<int>(g.train), g.train == Governs::Train::Placed ? g.first : 0.0, g.backward}].push_back(i);
    items[i].check.arrangement = describe(g, *set.combination);
  }
  std::vector<std::vector<char>> failed(methods.size(), std::vector<char>(items.size(), 0));
  for (const auto& [key, uses] : positions) {
    const Beam pb = model.placed_beam(governs_of(items[uses.front()].by));
    const std::vector<Station> st = build_stations(pb, 1);
    for (std::size_t mi = 0; mi < methods.size(); ++mi) {
      const Solution sol = solve_guarded(*methods[mi], pb, st);
      const bool ok = sol.status == MethodStatus::Ok && sol.at && sol.nodes.size() == beam.node_count();
      for (std::size_t i : uses) {
        Item& it = items[i];
        if (!ok) {
          if (sol.status != MethodStatus::NotApplicable) failed[mi][i] = 1;
          continue;
        }
        double v = 0;
        if (it.node) {
          v = sol.nodes[it.index].reaction_force;
        } else {
          // Where a point of the train stands on the point itself, the value
          // may be either limit: the nearer one is the one the envelope took.
          const auto q = [&](bool after) {
            const PointValues p = sol.at(it.index, it.local, after);
            return it.what == M::kMoment ? p.moment : it.what == M::kShear ? p.shear : p.deflection;
          };
          const double l = q(false), r = q(true);
          v = std::abs(l - it.check.envelope) <= std::abs(r - it.check.envelope) ? l : r;
        }
        it.check.values.emplace_back(methods[mi]->name, v);
        const double sc = set.scale[static_cast<int>(it.kind)];
        const double d = sc > 0 ? std::abs(v - it.check.envelope) / sc : std::abs(v - it.check.envelope);
        it.check.difference = std::max(it.check.difference, d);
      }
    }
  }
  set.second_route.reserve(items.size());
  for (std::size_t i = 0; i < items.size(); ++i) {
    RouteCheck& rc = items[i].check;
    rc.holds = !rc.values.empty() && rc.difference <= agreement;
    for (std::size_t mi = 0; mi < methods.size(); ++mi)
      if (failed[mi][i]) rc.holds = false;
    set.second_route.push_back(std::move(rc));
  }
  settle_second_route(set, "position");
}

}  // namespace detail
}  // namespace trivet::compare
