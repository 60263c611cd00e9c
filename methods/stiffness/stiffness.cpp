// trivet: the direct stiffness method. See stiffness.h.
//
// Element degrees of freedom, in the beam.h conventions: deflection v
// (down +) and rotation theta = dv/dx (clockwise +) at each end. With
// forces down + and couples clockwise + as the work-conjugate actions, the
// element stiffness is the usual EI/h^3 [12 6h -12 6h; 6h 4h^2 -6h 2h^2;
// -12 -6h 12 -6h; 6h 2h^2 -6h 4h^2], and EI v'''' = w (load down +).
//
// Element end forces F = k u - f (f: work-equivalent loads) are the actions
// of the nodes ON the element (down +, clockwise +), so by the jump rules of
// beam.h the shear and moment just inside the element's left end are
// V0 = -F1 and M0 = +F2.
#include "methods/stiffness/stiffness.h"

#include <algorithm>
#include <cmath>
#include <exception>
#include <limits>
#include <memory>
#include <string>
#include <utility>

namespace trivet::stiffness {
namespace {

// --- Gauss-Legendre rule computed in R ---------------------------------------

constexpr int kGaussPoints = 3;  // exact to degree 5; loads are linear, shapes cubic: degree 4.

template <class R>
struct GaussRule {
  R x[kGaussPoints];  // abscissae on [-1, 1]
  R w[kGaussPoints];  // weights
};

// P_n(x) and P_n'(x) by the three-term recurrence.
template <class R>
void legendre(int n, const R& x, R& p, R& dp) {
  R p0(1), p1 = x;
  for (int k = 2; k <= n; ++k) {
    R p2 = (R(2 * k - 1) * x * p1 - R(k - 1) * p0) / R(k);
    p0 = p1;
    p1 = p2;
  }
  p = p1;
  dp = R(n) * (x * p1 - p0) / (x * x - R(1));
}

// Roots of P_n bracketed on a grid (odd count, so no grid point is 0), then
// bisection and Newton, all in R.
template <class R>
GaussRule<R> make_gauss_rule() {
  GaussRule<R> rule;
  const int n = kGaussPoints;
  const int grid = 64 * n + 1;
  int found = 0;
  R a(-1), pa, da;
  legendre(n, a, pa, da);
  for (int i = 1; i <= grid && found < n; ++i) {
    R b = R(-1) + R(2 * i) / R(grid);
    R pb, db;
    legendre(n, b, pb, db);
    if ((pa < R(0)) != (pb < R(0))) {
      R lo = a, hi = b, plo = pa;
      for (int it = 0; it < 20; ++it) {
        R mid = (lo + hi) / R(2), pm, dm;
        legendre(n, mid, pm, dm);
        if ((pm < R(0)) == (plo < R(0))) {
          lo = mid;
          plo = pm;
        } else {
          hi = mid;
        }
      }
      R x = (lo + hi) / R(2);
      for (int it = 0; it < 12; ++it) {  // quadratic convergence: far past 50 digits
        R p, dp;
        legendre(n, x, p, dp);
        x -= p / dp;
      }
      R p, dp;
      legendre(n, x, p, dp);
      rule.x[found] = x;
      rule.w[found] = R(2) / ((R(1) - x * x) * dp * dp);
      ++found;
    }
    a = b;
    pa = pb;
  }
  return rule;
}

template <class R>
const GaussRule<R>& gauss_rule() {
  static const GaussRule<R> rule = make_gauss_rule<R>();
  return rule;
}

// --- Hermite cubics on an element of length h (s = xi / h) --------------------

template <class R>
void hermite(const R& s, const R& h, R N[4]) {
  const R s2 = s * s, s3 = s2 * s;
  N[0] = R(1) - R(3) * s2 + R(2) * s3;
  N[1] = h * (s - R(2) * s2 + s3);
  N[2] = R(3) * s2 - R(2) * s3;
  N[3] = h * (s3 - s2);
}

template <class R>
void hermite_slope(const R& s, const R& h, R D[4]) {
  const R s2 = s * s;
  D[0] = (R(6) * s2 - R(6) * s) / h;
  D[1] = R(1) - R(4) * s + R(3) * s2;
  D[2] = (R(6) * s - R(6) * s2) / h;
  D[3] = R(3) * s2 - R(2) * s;
}

// Element stiffness times end displacements.
template <class R>
void stiffness_times(const R& EI, const R& h, const R u[4], R out[4]) {
  const R c = EI / (h * h * h);
  const R h2 = h * h;
  out[0] = c * (R(12) * u[0] + R(6) * h * u[1] - R(12) * u[2] + R(6) * h * u[3]);
  out[1] = c * (R(6) * h * u[0] + R(4) * h2 * u[1] - R(6) * h * u[2] + R(2) * h2 * u[3]);
  out[2] = c * (-R(12) * u[0] - R(6) * h * u[1] + R(12) * u[2] - R(6) * h * u[3]);
  out[3] = c * (R(6) * h * u[0] + R(2) * h2 * u[1] - R(6) * h * u[2] + R(4) * h2 * u[3]);
}

// Work-equivalent loads of a linear load wa..wb over an element of length h.
template <class R>
void consistent_loads(const R& wa, const R& wb, const R& h, R f[4]) {
  const GaussRule<R>& g = gauss_rule<R>();
  for (int i = 0; i < 4; ++i) f[i] = R(0);
  for (int q = 0; q < kGaussPoints; ++q) {
    const R s = (R(1) + g.x[q]) / R(2);
    const R w = wa + (wb - wa) * s;
    R N[4];
    hermite(s, h, N);
    const R c = g.w[q] * h / R(2) * w;
    for (int i = 0; i < 4; ++i) f[i] += c * N[i];
  }
}

// --- Solved state --------------------------------------------------------------

template <class R>
struct ElementNode {
  R p;   // local position in its span
  R v;   // deflection
  R th;  // rotation (of this span's side, at a hinge)
};

template <class R>
struct Element {
  R wa{0}, wb{0};  // distributed load intensity at its two ends (down +)
  R V0{0}, M0{0};  // shear and moment just inside its left end
};

template <class R>
struct State {
  std::vector<R> length, EI;          // per span
  std::vector<std::size_t> first;     // per span (+1): first element node of the span
  std::vector<ElementNode<R>> nodes;  // span by span, m_s + 1 nodes for m_s elements
  std::vector<Element<R>> elems;      // element j of span s: first[s] - s + j
};

template <class R>
BasicPointValues<R> evaluate(const State<R>& st, std::size_t s, const R& local, bool after) {
  BasicPointValues<R> out;
  if (s >= st.length.size()) return out;
  const ElementNode<R>* p = st.nodes.data() + st.first[s];
  const std::size_t m = st.first[s + 1] - st.first[s] - 1;  // elements in the span
  R x = local;
  if (x < R(0)) x = R(0);
  if (st.length[s] < x) x = st.length[s];
  const ElementNode<R>* it =
      std::lower_bound(p, p + m + 1, x, [](const ElementNode<R>& n, const R& v) { return n.p < v; });
  const std::size_t idx = static_cast<std::size_t>(it - p);
  std::size_t j;
  if (idx == 0) {
    j = 0;
  } else if (idx > m) {
    j = m - 1;
  } else if (!(x < p[idx].p)) {  // exactly on element node idx
    j = (idx == m) ? m - 1 : (after ? idx : idx - 1);
  } else {
    j = idx - 1;
  }
  const ElementNode<R>& a = p[j];
  const ElementNode<R>& b = p[j + 1];
  const Element<R>& e = st.elems[st.first[s] - s + j];
  const R h = b.p - a.p;
  const R xi = x - a.p;
  const R sN = xi / h;
  const R EI = st.EI[s];
  const R dw = e.wb - e.wa;

  // Statics from the element's left end.
  out.shear = e.V0 - (e.wa * xi + dw * xi * xi / (R(2) * h));
  out.moment = e.M0 + e.V0 * xi - (e.wa * xi * xi / R(2) + dw * xi * xi * xi / (R(6) * h));

  // Hermite interpolation plus the clamped-clamped particular solution
  // vp = g - N3 g(h) - N4 g'(h), g the quartic/quintic with EI g'''' = w.
  R N[4], D[4];
  hermite(sN, h, N);
  hermite_slope(sN, h, D);
  auto g = [&](const R& t) {
    const R t2 = t * t;
    return (e.wa * t2 * t2 / R(24) + dw * t2 * t2 * t / (R(120) * h)) / EI;
  };
  auto gd = [&](const R& t) {
    const R t2 = t * t;
    return (e.wa * t2 * t / R(6) + dw * t2 * t2 / (R(24) * h)) / EI;
  };
  const R gh = g(h), gdh = gd(h);
  out.deflection = N[0] * a.v + N[1] * a.th + N[2] * b.v + N[3] * b.th + g(xi) - N[2] * gh - N[3] * gdh;
  out.rotation = D[0] * a.v + D[1] * a.th + D[2] * b.v + D[3] * b.th + gd(xi) - D[2] * gh - D[3] * gdh;
  return out;
}

// --- Banded symmetric LDL^T (no pivoting) --------------------------------------

constexpr std::size_t kBand = 4;  // half-bandwidth of the DOF numbering below
constexpr std::size_t kRow = kBand + 1;

template <class R>
struct Band {
  std::size_t n = 0;
  std::vector<R> a;  // a[i * kRow + (i - j)] = K(i, j), j <= i <= j + kBand
  explicit Band(std::size_t size) : n(size), a(size * kRow, R(0)) {}
  R& at(std::size_t i, std::size_t j) {  // any order, |i - j| <= kBand
    return i >= j ? a[i * kRow + (i - j)] : a[j * kRow + (j - i)];
  }
};

template <class R>
bool is_finite(const R& x) {
  using std::isfinite;
  return isfinite(x);
}

// Factors in place (L below the diagonal, D on it). Returns the first DOF
// with a pivot that is not clearly positive, or n when all are.
template <class R>
std::size_t factor(Band<R>& K) {
  const R tol = std::numeric_limits<R>::epsilon() * R(1024);
  std::vector<R> LD(kRow);  // L(i, k) * D(k) for the current row
  for (std::size_t i = 0; i < K.n; ++i) {
    const std::size_t lo = i >= kBand ? i - kBand : 0;
    const R diag0 = K.a[i * kRow];
    for (std::size_t j = lo; j < i; ++j) {
      R sum = K.a[i * kRow + (i - j)];
      for (std::size_t k = lo; k < j; ++k) sum -= LD[i - k] * K.a[j * kRow + (j - k)];
      LD[i - j] = sum;                              // L(i, j) D(j)
      K.a[i * kRow + (i - j)] = sum / K.a[j * kRow];  // L(i, j)
    }
    R d = diag0;
    for (std::size_t k = lo; k < i; ++k) d -= LD[i - k] * K.a[i * kRow + (i - k)];
    if (!is_finite(d) || !(diag0 * tol < d)) return i;
    K.a[i * kRow] = d;
  }
  return K.n;
}

template <class R>
void substitute(const Band<R>& K, std::vector<R>& b) {
  const std::size_t n = K.n;
  for (std::size_t i = 0; i < n; ++i) {
    const std::size_t lo = i >= kBand ? i - kBand : 0;
    for (std::size_t k = lo; k < i; ++k) b[i] -= K.a[i * kRow + (i - k)] * b[k];
  }
  for (std::size_t i = 0; i < n; ++i) b[i] /= K.a[i * kRow];
  for (std::size_t i = n; i-- > 0;) {
    const std::size_t hi = std::min(n - 1, i + kBand);
    for (std::size_t k = i + 1; k <= hi; ++k) b[i] -= K.a[k * kRow + (k - i)] * b[k];
  }
}

// --- Input checks ---------------------------------------------------------------

template <class R>
std::string node_name(const BasicBeam<R>& beam, std::size_t i) {
  if (i < beam.labels.size() && !beam.labels[i].empty()) return "node " + beam.labels[i];
  return "node " + std::to_string(i + 1);
}

template <class R>
bool nonzero(const R& x) {
  return x < R(0) || R(0) < x;
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

// Empty when the beam is within scope, else the feature that is not.
template <class R>
std::string check_scope(const BasicBeam<R>& beam) {
  const std::size_t n = beam.spans.size();
  if (n == 0) return "beam without spans";
  if (beam.supports.size() != n + 1) return "support count differs from span count + 1";
  for (std::size_t s = 0; s < n; ++s) {
    if (!(R(0) < beam.spans[s].length)) return "non-positive length of span " + std::to_string(s + 1);
    if (!(R(0) < beam.spans[s].EI)) return "non-positive EI of span " + std::to_string(s + 1);
  }
  for (std::size_t i = 0; i <= n; ++i) {
    const BasicSupport<R>& sp = beam.supports[i];
    const std::string where = node_name(beam, i);
    switch (sp.type) {
      case SupportType::Fixed: case SupportType::Pinned: case SupportType::Roller:
      case SupportType::Free: case SupportType::Guided: case SupportType::Spring:
        break;
      default:
        return "unknown support type at " + where;
    }
    if (sp.type == SupportType::Spring) {
      if (sp.k < R(0) || !is_finite(sp.k)) return "spring with negative stiffness at " + where;
      if (sp.kr < R(0) || !is_finite(sp.kr)) return "rotational spring with negative stiffness at " + where;
    }
    if ((sp.type == SupportType::Free || sp.type == SupportType::Guided) && nonzero(sp.settlement))
      return std::string("settlement on a ") + support_type_name(sp.type) + " node at " + where;
    if (sp.hinge) {
      if (i == 0 || i == n) return "hinge at end " + where;
      if (restrains_rotation(sp.type)) return std::string("hinge on a ") + support_type_name(sp.type) + " support at " + where;
      if (sp.type == SupportType::Spring && R(0) < sp.kr) return "hinge on a rotational spring at " + where;
    }
  }
  for (const BasicLoad<R>& l : beam.loads) {
    if (l.on_node) {
      if (l.index > n) return "load on a node beyond the beam";
      if (l.type != LoadType::Point && l.type != LoadType::Couple)
        return std::string(load_type_name(l.type)) + " load on " + node_name(beam, l.index);
      if (l.type == LoadType::Couple && beam.supports[l.index].hinge)
        return "couple at hinge " + node_name(beam, l.index);
      continue;
    }
    if (l.index >= n) return "load on a span beyond the beam";
    const R L = beam.spans[l.index].length;
    const std::string where = "span " + std::to_string(l.index + 1);
    switch (l.type) {
      case LoadType::Point: case LoadType::Couple:
        if (l.at < R(0) || L < l.at || !is_finite(l.at)) return "load position outside " + where;
        break;
      case LoadType::Udl: case LoadType::Linear:
        if (l.from < R(0) || L < l.to || !(l.from < l.to)) return "load extent outside " + where;
        break;
      default:
        return "unknown load type on " + where;
    }
  }
  return {};
}

// --- The solver -------------------------------------------------------------------

template <class R>
BasicSolution<R> solve_impl(const BasicBeam<R>& beam, const std::vector<BasicStation<R>>& stations) {
  if (std::string why = check_scope(beam); !why.empty()) return not_applicable<R>(why);
  const std::size_t n = beam.spans.size();
  auto st = std::make_shared<State<R>>();
  st->length.resize(n);
  st->EI.resize(n);
  for (std::size_t s = 0; s < n; ++s) {
    st->length[s] = beam.spans[s].length;
    st->EI[s] = beam.spans[s].EI;
  }

  // Bucket span loads and stations by span (compressed rows).
  std::vector<std::size_t> load_off(n + 1, 0), stat_off(n + 1, 0);
  for (const auto& l : beam.loads)
    if (!l.on_node) ++load_off[l.index + 1];
  for (const auto& t : stations)
    if (t.span < n) ++stat_off[t.span + 1];
  for (std::size_t s = 0; s < n; ++s) {
    load_off[s + 1] += load_off[s];
    stat_off[s + 1] += stat_off[s];
  }
  std::vector<const BasicLoad<R>*> loads_by_span(load_off[n]);
  std::vector<const R*> stations_by_span(stat_off[n]);
  {
    std::vector<std::size_t> fill(load_off.begin(), load_off.end() - 1);
    for (const auto& l : beam.loads)
      if (!l.on_node) loads_by_span[fill[l.index]++] = &l;
    std::vector<std::size_t> sfill(stat_off.begin(), stat_off.end() - 1);
    for (const auto& t : stations)
      if (t.span < n) stations_by_span[sfill[t.span]++] = &t.local;
  }

  // Element nodes of every span.
  st->first.resize(n + 1);
  st->nodes.reserve(2 * n + 1 + stations.size() + 2 * beam.loads.size());
  std::vector<R> pts;
  for (std::size_t s = 0; s < n; ++s) {
    const R L = st->length[s];
    pts.clear();
    pts.push_back(R(0));
    pts.push_back(L);
    auto inside = [&](const R& x) {
      if (R(0) < x && x < L) pts.push_back(x);
    };
    for (std::size_t k = load_off[s]; k < load_off[s + 1]; ++k) {
      const BasicLoad<R>& l = *loads_by_span[k];
      if (l.type == LoadType::Point || l.type == LoadType::Couple) {
        inside(l.at);
      } else {
        inside(l.from);
        inside(l.to);
      }
    }
    for (std::size_t k = stat_off[s]; k < stat_off[s + 1]; ++k) inside(*stations_by_span[k]);
    std::sort(pts.begin(), pts.end());
    st->first[s] = st->nodes.size();
    for (std::size_t k = 0; k < pts.size(); ++k)
      if (k == 0 || pts[k - 1] < pts[k]) st->nodes.push_back({pts[k], R(0), R(0)});
  }
  st->first[n] = st->nodes.size();
  st->elems.assign(st->nodes.size() - n, Element<R>{});

  // Degrees of freedom: at beam node i, v then theta (left side) then, at a
  // hinge, theta of the right side; then the interior nodes of span i.
  std::vector<std::size_t> bv(n + 1), bthL(n + 1), bthR(n + 1);
  std::vector<std::size_t> dv(st->nodes.size()), dth(st->nodes.size());
  std::size_t ndof = 0;
  for (std::size_t i = 0; i <= n; ++i) {
    bv[i] = ndof++;
    bthL[i] = ndof++;
    bthR[i] = beam.supports[i].hinge ? ndof++ : bthL[i];
    if (i == n) break;
    for (std::size_t k = st->first[i] + 1; k + 1 < st->first[i + 1]; ++k) {
      dv[k] = ndof++;
      dth[k] = ndof++;
    }
  }
  for (std::size_t s = 0; s < n; ++s) {
    dv[st->first[s]] = bv[s];
    dth[st->first[s]] = bthR[s];
    dv[st->first[s + 1] - 1] = bv[s + 1];
    dth[st->first[s + 1] - 1] = bthL[s + 1];
  }

  // Distributed loads onto the elements they cover; concentrated loads onto
  // the DOFs (fn: applied nodal actions, down + / clockwise +).
  std::vector<R> fn(ndof, R(0));
  for (const BasicLoad<R>& l : beam.loads) {
    if (!l.on_node) continue;
    if (l.type == LoadType::Point) fn[bv[l.index]] += l.P;
    else fn[bthL[l.index]] += l.C;  // not at a hinge (checked), so one rotation
  }
  for (std::size_t s = 0; s < n; ++s) {
    const ElementNode<R>* p = st->nodes.data() + st->first[s];
    const ElementNode<R>* pend = st->nodes.data() + st->first[s + 1];
    auto node_at = [&](const R& x) {
      const ElementNode<R>* it =
          std::lower_bound(p, pend, x, [](const ElementNode<R>& a, const R& v) { return a.p < v; });
      return static_cast<std::size_t>(it - st->nodes.data());
    };
    const R L = st->length[s];
    for (std::size_t k = load_off[s]; k < load_off[s + 1]; ++k) {
      const BasicLoad<R>& l = *loads_by_span[k];
      switch (l.type) {
        case LoadType::Point:
          fn[dv[node_at(l.at)]] += l.P;
          break;
        case LoadType::Couple:
          if (!(R(0) < l.at)) fn[bthR[s]] += l.C;
          else if (!(l.at < L)) fn[bthL[s + 1]] += l.C;
          else fn[dth[node_at(l.at)]] += l.C;
          break;
        default: {
          const R w1 = l.w1;
          const R w2 = l.type == LoadType::Udl ? l.w1 : l.w2;
          const R slope = (w2 - w1) / (l.to - l.from);
          const std::size_t a = node_at(l.from), b = node_at(l.to);
          for (std::size_t k2 = a; k2 < b; ++k2) {
            Element<R>& e = st->elems[k2 - s];
            e.wa += w1 + slope * (st->nodes[k2].p - l.from);
            e.wb += w1 + slope * (st->nodes[k2 + 1].p - l.from);
          }
        }
      }
    }
  }

  // Assembly.
  Band<R> K(ndof);
  std::vector<R> f = fn;
  for (std::size_t s = 0; s < n; ++s) {
    const R EI = st->EI[s];
    for (std::size_t k = st->first[s]; k + 1 < st->first[s + 1]; ++k) {
      const R h = st->nodes[k + 1].p - st->nodes[k].p;
      const std::size_t d[4] = {dv[k], dth[k], dv[k + 1], dth[k + 1]};
      for (int c = 0; c < 4; ++c) {
        R u[4] = {R(0), R(0), R(0), R(0)};
        u[c] = R(1);
        R col[4];
        stiffness_times(EI, h, u, col);
        for (int r = c; r < 4; ++r) K.at(d[r], d[c]) += col[r];
      }
      const Element<R>& e = st->elems[k - s];
      if (nonzero(e.wa) || nonzero(e.wb)) {
        R fe[4];
        consistent_loads(e.wa, e.wb, h, fe);
        for (int r = 0; r < 4; ++r) f[d[r]] += fe[r];
      }
    }
  }
  for (std::size_t i = 0; i <= n; ++i) {
    const BasicSupport<R>& sp = beam.supports[i];
    if (sp.type != SupportType::Spring) continue;
    K.at(bv[i], bv[i]) += sp.k;
    f[bv[i]] += sp.k * sp.settlement;
    K.at(bthL[i], bthL[i]) += sp.kr;  // no hinge here when kr > 0 (checked)
  }

  // Prescribed displacements: move their columns to the right-hand side and
  // leave an identity row, so the solve returns them exactly.
  std::vector<char> fixed(ndof, 0);
  std::vector<R> value(ndof, R(0));
  for (std::size_t i = 0; i <= n; ++i) {
    const SupportType t = beam.supports[i].type;
    if (restrains_deflection(t)) {
      fixed[bv[i]] = 1;
      value[bv[i]] = beam.supports[i].settlement;
    }
    if (restrains_rotation(t)) fixed[bthL[i]] = 1;
  }
  for (std::size_t j = 0; j < ndof; ++j) {
    if (!fixed[j]) continue;
    const std::size_t lo = j >= kBand ? j - kBand : 0;
    const std::size_t hi = std::min(ndof - 1, j + kBand);
    for (std::size_t i = lo; i <= hi; ++i) {
      if (i == j) continue;
      if (!fixed[i] && nonzero(value[j])) f[i] -= K.at(i, j) * value[j];
      K.at(i, j) = R(0);
    }
    K.at(j, j) = R(1);
    f[j] = value[j];
  }

  if (const std::size_t bad = factor(K); bad < ndof)
    return failed<R>("zero or negative pivot in the stiffness solve (degree of freedom " +
                     std::to_string(bad) + "): the beam is unstable or ill-conditioned");
  std::vector<R>& u = f;
  substitute(K, u);
  for (std::size_t i = 0; i < ndof; ++i)
    if (!is_finite(u[i])) return failed<R>("non-finite displacement in the stiffness solve");

  // Nodal values, element end forces, residual forces at the DOFs.
  for (std::size_t k = 0; k < st->nodes.size(); ++k) {
    st->nodes[k].v = u[dv[k]];
    st->nodes[k].th = u[dth[k]];
  }
  std::vector<R> resid(ndof, R(0));  // sum of element end forces at each DOF
  for (std::size_t s = 0; s < n; ++s) {
    const R EI = st->EI[s];
    for (std::size_t k = st->first[s]; k + 1 < st->first[s + 1]; ++k) {
      const R h = st->nodes[k + 1].p - st->nodes[k].p;
      const std::size_t d[4] = {dv[k], dth[k], dv[k + 1], dth[k + 1]};
      const R ue[4] = {u[d[0]], u[d[1]], u[d[2]], u[d[3]]};
      R F[4];
      stiffness_times(EI, h, ue, F);
      Element<R>& e = st->elems[k - s];
      if (nonzero(e.wa) || nonzero(e.wb)) {
        R fe[4];
        consistent_loads(e.wa, e.wb, h, fe);
        for (int r = 0; r < 4; ++r) F[r] -= fe[r];
      }
      e.V0 = -F[0];
      e.M0 = F[1];
      for (int r = 0; r < 4; ++r) resid[d[r]] += F[r];
    }
  }

  BasicSolution<R> sol;
  sol.status = MethodStatus::Ok;
  sol.nodes.resize(n + 1);
  R x(0);
  for (std::size_t i = 0; i <= n; ++i) {
    BasicNodeResult<R>& r = sol.nodes[i];
    const BasicSupport<R>& sp = beam.supports[i];
    r.x = x;
    if (i < n) x += st->length[i];
    r.deflection = u[bv[i]];
    r.rotation_left = u[bthL[i]];
    r.rotation_right = u[bthR[i]];
    if (i > 0) r.moment_left = evaluate(*st, i - 1, st->length[i - 1], false).moment;
    if (i < n) r.moment_right = evaluate(*st, i, R(0), false).moment;
    if (restrains_deflection(sp.type)) r.reaction_force = fn[bv[i]] - resid[bv[i]];
    if (restrains_rotation(sp.type)) r.reaction_moment = fn[bthL[i]] - resid[bthL[i]];
    if (sp.type == SupportType::Spring) {
      r.reaction_force = sp.k * (r.deflection - sp.settlement);
      r.reaction_moment = sp.kr * r.rotation_left;
    }
    if (!is_finite(r.reaction_force) || !is_finite(r.reaction_moment))
      return failed<R>("non-finite reaction at " + node_name(beam, i));
  }
  std::shared_ptr<const State<R>> frozen = std::move(st);
  sol.at = [frozen](std::size_t span, const R& local, bool after) {
    return evaluate(*frozen, span, local, after);
  };
  return sol;
}

}  // namespace

template <class R>
BasicSolution<R> solve(const BasicBeam<R>& beam, const std::vector<BasicStation<R>>& stations) {
  try {
    return solve_impl(beam, stations);
  } catch (const std::exception& ex) {
    return failed<R>(std::string("internal fault in the stiffness solve: ") + ex.what());
  }
}

template BasicSolution<double> solve<double>(const BasicBeam<double>&,
                                             const std::vector<BasicStation<double>>&);
template BasicSolution<Extended> solve<Extended>(const BasicBeam<Extended>&,
                                                 const std::vector<BasicStation<Extended>>&);

}  // namespace trivet::stiffness
