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

// The element stiffness matrix itself (symmetric).
template <class R>
void element_matrix(const R& EI, const R& h, R k[4][4]) {
  const R c = EI / (h * h * h);
  const R a = R(12) * c, b = R(6) * h * c, d = R(4) * h * h * c, e = R(2) * h * h * c;
  const R m[4][4] = {{a, b, -a, b}, {b, d, -b, e}, {-a, -b, a, -b}, {b, e, -b, d}};
  for (int i = 0; i < 4; ++i)
    for (int j = 0; j < 4; ++j) k[i][j] = m[i][j];
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
  std::vector<R> EI;                  // per span (its length: its last node's p)
  std::vector<std::size_t> first;     // per span (+1): first element node of the span
  std::vector<ElementNode<R>> nodes;  // span by span, m_s + 1 nodes for m_s elements
  std::vector<Element<R>> elems;      // element j of span s: first[s] - s + j
};

template <class R>
BasicPointValues<R> evaluate(const State<R>& st, std::size_t s, const R& local, bool after) {
  BasicPointValues<R> out;
  if (s >= st.EI.size()) return out;
  const ElementNode<R>* p = st.nodes.data() + st.first[s];
  const std::size_t m = st.first[s + 1] - st.first[s] - 1;  // elements in the span
  R x = local;
  if (x < R(0)) x = R(0);
  if (p[m].p < x) x = p[m].p;  // the last element node is at the span's length
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
    auto where = [&] { return node_name(beam, i); };  // built only on failure
    switch (sp.type) {
      case SupportType::Fixed: case SupportType::Pinned: case SupportType::Roller:
      case SupportType::Free: case SupportType::Guided: case SupportType::Spring:
        break;
      default:
        return "unknown support type at " + where();
    }
    if (sp.type == SupportType::Spring) {
      if (sp.k < R(0) || !is_finite(sp.k)) return "spring with negative stiffness at " + where();
      if (sp.kr < R(0) || !is_finite(sp.kr)) return "rotational spring with negative stiffness at " + where();
    }
    if ((sp.type == SupportType::Free || sp.type == SupportType::Guided) && nonzero(sp.settlement))
      return std::string("settlement on a ") + support_type_name(sp.type) + " node at " + where();
    if (sp.hinge) {
      if (i == 0 || i == n) return "hinge at end " + where();
      if (restrains_rotation(sp.type)) return std::string("hinge on a ") + support_type_name(sp.type) + " support at " + where();
      if (sp.type == SupportType::Spring && R(0) < sp.kr) return "hinge on a rotational spring at " + where();
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
    auto where = [&] { return "span " + std::to_string(l.index + 1); };
    switch (l.type) {
      case LoadType::Point: case LoadType::Couple:
        if (l.at < R(0) || L < l.at || !is_finite(l.at)) return "load position outside " + where();
        break;
      case LoadType::Udl: case LoadType::Linear:
        if (l.from < R(0) || L < l.to || !(l.from < l.to)) return "load extent outside " + where();
        break;
      default:
        return "unknown load type on " + where();
    }
  }
  return {};
}

// Items of a list grouped by span. When the items come in span order (the
// usual case) nothing is copied: only the offsets into the list are kept.
// `span_of(item)` gives the span, or n for an item of no span.
template <class Item>
struct Buckets {
  const std::vector<Item>& items;
  bool in_order = true;
  std::vector<std::size_t> off;         // per span + 1 (empty when there are no items)
  std::vector<const Item*> regrouped;  // only when not in span order

  template <class SpanOf>
  Buckets(const std::vector<Item>& list, std::size_t n, SpanOf span_of) : items(list) {
    if (items.empty()) return;
    std::size_t last = 0;
    for (const Item& it : items) {
      const std::size_t s = span_of(it);
      if (s == n) continue;
      if (s < last) in_order = false;
      last = s;
    }
    off.assign(n + 1, 0);
    if (in_order) {
      std::size_t s = 0;
      for (std::size_t i = 0; i < items.size(); ++i) {
        const std::size_t sp = span_of(items[i]);
        if (sp == n) continue;
        while (s <= sp) off[s++] = i;
      }
      while (s <= n) off[s++] = items.size();
      return;
    }
    for (const Item& it : items)
      if (span_of(it) < n) ++off[span_of(it) + 1];
    for (std::size_t s = 0; s < n; ++s) off[s + 1] += off[s];
    regrouped.resize(off[n]);
    std::vector<std::size_t> fill(off.begin(), off.end() - 1);
    for (const Item& it : items)
      if (span_of(it) < n) regrouped[fill[span_of(it)]++] = &it;
  }

  template <class SpanOf, class Fn>
  void each(std::size_t s, SpanOf span_of, Fn fn) const {
    if (off.empty()) return;
    if (in_order) {
      for (std::size_t i = off[s]; i < off[s + 1]; ++i)
        if (span_of(items[i]) == s) fn(items[i]);
    } else {
      for (std::size_t k = off[s]; k < off[s + 1]; ++k) fn(*regrouped[k]);
    }
  }
};

// --- The solver -------------------------------------------------------------------

template <class R>
BasicSolution<R> solve_impl(const BasicBeam<R>& beam, const std::vector<BasicStation<R>>& stations) {
  if (std::string why = check_scope(beam); !why.empty()) return not_applicable<R>(why);
  const std::size_t n = beam.spans.size();
  auto st = std::make_shared<State<R>>();
  st->EI.resize(n);
  for (std::size_t s = 0; s < n; ++s) st->EI[s] = beam.spans[s].EI;

  // Span loads and stations grouped by span.
  auto load_span = [n](const BasicLoad<R>& l) { return l.on_node ? n : l.index; };
  auto station_span = [n](const BasicStation<R>& t) { return t.span < n ? t.span : n; };
  const Buckets<BasicLoad<R>> loads_of(beam.loads, n, load_span);
  const Buckets<BasicStation<R>> stations_of(stations, n, station_span);

  // Element nodes of every span.
  st->first.resize(n + 1);
  st->nodes.reserve(2 * n + 1 + stations.size() + 2 * beam.loads.size());
  std::vector<R> pts;
  for (std::size_t s = 0; s < n; ++s) {
    const R L = beam.spans[s].length;
    pts.clear();
    pts.push_back(R(0));
    pts.push_back(L);
    auto inside = [&](const R& x) {
      if (R(0) < x && x < L) pts.push_back(x);
    };
    loads_of.each(s, load_span, [&](const BasicLoad<R>& l) {
      if (l.type == LoadType::Point || l.type == LoadType::Couple) {
        inside(l.at);
      } else {
        inside(l.from);
        inside(l.to);
      }
    });
    stations_of.each(s, station_span, [&](const BasicStation<R>& t) { inside(t.local); });
    std::sort(pts.begin(), pts.end());
    st->first[s] = st->nodes.size();
    for (std::size_t k = 0; k < pts.size(); ++k)
      if (k == 0 || pts[k - 1] < pts[k]) st->nodes.push_back({pts[k], R(0), R(0)});
  }
  st->first[n] = st->nodes.size();
  st->elems.assign(st->nodes.size() - n, Element<R>{});

  // Degrees of freedom: only the free ones are numbered. At beam node i:
  // v, theta (left side), and at a hinge theta of the right side, each
  // unless restrained; then v, theta of every interior node of span i. A
  // restrained DOF has no number; its prescribed value goes to the
  // right-hand side during assembly.
  constexpr std::size_t kNone = static_cast<std::size_t>(-1);
  std::vector<std::size_t> base(n + 1);  // first DOF number at beam node i
  std::size_t ndof = 0;
  for (std::size_t i = 0; i <= n; ++i) {
    const BasicSupport<R>& sp = beam.supports[i];
    base[i] = ndof;
    ndof += (restrains_deflection(sp.type) ? 0 : 1) + (restrains_rotation(sp.type) ? 0 : 1) + (sp.hinge ? 1 : 0);
    if (i < n) ndof += 2 * (st->first[i + 1] - st->first[i] - 2);
  }
  struct Dofs { std::size_t v, thL, thR, interior; };
  auto beam_dofs = [&](std::size_t i) {
    const BasicSupport<R>& sp = beam.supports[i];
    std::size_t c = base[i];
    Dofs d;
    d.v = restrains_deflection(sp.type) ? kNone : c++;
    d.thL = restrains_rotation(sp.type) ? kNone : c++;
    d.thR = sp.hinge ? c++ : d.thL;
    d.interior = c;
    return d;
  };
  // DOFs (kNone if restrained) and prescribed values of node j of span s.
  auto node_dofs = [&](std::size_t s, std::size_t j, std::size_t& dv, std::size_t& dth, R& gv) {
    const std::size_t m = st->first[s + 1] - st->first[s] - 1;
    gv = R(0);
    if (j == 0 || j == m) {
      const std::size_t i = j == 0 ? s : s + 1;
      const Dofs d = beam_dofs(i);
      dv = d.v;
      dth = j == 0 ? d.thR : d.thL;
      if (dv == kNone) gv = beam.supports[i].settlement;
    } else {
      dv = beam_dofs(s).interior + 2 * (j - 1);
      dth = dv + 1;
    }
  };

  // Distributed loads onto the elements they cover; concentrated loads onto
  // the right-hand side. The node results start with the applied actions at
  // the beam nodes (down +, clockwise +); element end forces are subtracted
  // below, which leaves the reactions (beam.h signs) where restrained.
  BasicSolution<R> sol;
  sol.nodes.resize(n + 1);
  std::vector<R> f(ndof, R(0));
  auto add_force = [&](std::size_t dof, std::size_t node, const R& P) {
    if (dof != kNone) f[dof] += P;
    if (node != kNone) sol.nodes[node].reaction_force += P;
  };
  auto add_couple = [&](std::size_t dof, std::size_t node, const R& C) {
    if (dof != kNone) f[dof] += C;
    if (node != kNone) sol.nodes[node].reaction_moment += C;
  };
  for (const BasicLoad<R>& l : beam.loads) {
    if (!l.on_node) continue;
    const Dofs d = beam_dofs(l.index);
    if (l.type == LoadType::Point) add_force(d.v, l.index, l.P);
    else add_couple(d.thL, l.index, l.C);  // not at a hinge (checked), so one rotation
  }
  for (std::size_t s = 0; s < n; ++s) {
    const ElementNode<R>* p = st->nodes.data() + st->first[s];
    const ElementNode<R>* pend = st->nodes.data() + st->first[s + 1];
    const std::size_t m = static_cast<std::size_t>(pend - p) - 1;
    auto node_at = [&](const R& x) {  // local index of the element node at x
      return static_cast<std::size_t>(
          std::lower_bound(p, pend, x, [](const ElementNode<R>& a, const R& v) { return a.p < v; }) - p);
    };
    auto beam_node = [&](std::size_t j) { return j == 0 ? s : (j == m ? s + 1 : kNone); };
    loads_of.each(s, load_span, [&](const BasicLoad<R>& l) {
      if (l.type == LoadType::Point || l.type == LoadType::Couple) {
        const std::size_t j = node_at(l.at);
        std::size_t dv, dth;
        R gv;
        node_dofs(s, j, dv, dth, gv);
        if (l.type == LoadType::Point) add_force(dv, beam_node(j), l.P);
        else add_couple(dth, beam_node(j), l.C);
        return;
      }
      const R w1 = l.w1;
      const R w2 = l.type == LoadType::Udl ? l.w1 : l.w2;
      const R slope = (w2 - w1) / (l.to - l.from);
      const std::size_t a = node_at(l.from), b = node_at(l.to);
      for (std::size_t j = a; j < b; ++j) {
        Element<R>& e = st->elems[st->first[s] - s + j];
        e.wa += w1 + slope * (p[j].p - l.from);
        e.wb += w1 + slope * (p[j + 1].p - l.from);
      }
    });
  }

  // Assembly; prescribed displacements move to the right-hand side.
  Band<R> K(ndof);
  for (std::size_t s = 0; s < n; ++s) {
    const R EI = st->EI[s];
    const std::size_t m = st->first[s + 1] - st->first[s] - 1;
    for (std::size_t j = 0; j < m; ++j) {
      const std::size_t k = st->first[s] + j;
      const R h = st->nodes[k + 1].p - st->nodes[k].p;
      std::size_t d[4];
      R g[4] = {R(0), R(0), R(0), R(0)};
      node_dofs(s, j, d[0], d[1], g[0]);
      node_dofs(s, j + 1, d[2], d[3], g[2]);
      R ke[4][4];
      element_matrix(EI, h, ke);
      for (int c = 0; c < 4; ++c) {
        const bool known = d[c] == kNone;
        if (known && !nonzero(g[c])) continue;
        for (int r = 0; r < 4; ++r) {
          if (d[r] == kNone) continue;
          if (known) f[d[r]] -= ke[r][c] * g[c];
          else if (d[c] <= d[r]) K.at(d[r], d[c]) += ke[r][c];
        }
      }
      const Element<R>& e = st->elems[k - s];
      if (nonzero(e.wa) || nonzero(e.wb)) {
        R fe[4];
        consistent_loads(e.wa, e.wb, h, fe);
        for (int r = 0; r < 4; ++r)
          if (d[r] != kNone) f[d[r]] += fe[r];
      }
    }
  }
  for (std::size_t i = 0; i <= n; ++i) {
    const BasicSupport<R>& sp = beam.supports[i];
    if (sp.type != SupportType::Spring) continue;
    const Dofs d = beam_dofs(i);  // a spring restrains nothing outright
    K.at(d.v, d.v) += sp.k;
    f[d.v] += sp.k * sp.settlement;
    K.at(d.thL, d.thL) += sp.kr;  // no hinge here when kr > 0 (checked)
  }

  if (const std::size_t bad = factor(K); bad < ndof)
    return failed<R>("zero or negative pivot in the stiffness solve (degree of freedom " +
                     std::to_string(bad) + "): the beam is unstable or ill-conditioned");
  std::vector<R>& u = f;
  substitute(K, u);
  for (std::size_t i = 0; i < ndof; ++i)
    if (!is_finite(u[i])) return failed<R>("non-finite displacement in the stiffness solve");

  // Nodal values, element end forces F = k u - f; at the beam nodes the
  // reactions are the applied actions minus the sum of F (= f - K u).
  for (std::size_t s = 0; s < n; ++s) {
    const R EI = st->EI[s];
    const std::size_t m = st->first[s + 1] - st->first[s] - 1;
    for (std::size_t j = 0; j <= m; ++j) {
      std::size_t dv, dth;
      R gv;
      node_dofs(s, j, dv, dth, gv);
      ElementNode<R>& nd = st->nodes[st->first[s] + j];
      nd.v = dv == kNone ? gv : u[dv];
      nd.th = dth == kNone ? R(0) : u[dth];
    }
    for (std::size_t j = 0; j < m; ++j) {
      const std::size_t k = st->first[s] + j;
      const ElementNode<R>& a = st->nodes[k];
      const ElementNode<R>& b = st->nodes[k + 1];
      const R h = b.p - a.p;
      const R ue[4] = {a.v, a.th, b.v, b.th};
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
      if (j == 0) {
        sol.nodes[s].reaction_force -= F[0];
        sol.nodes[s].reaction_moment -= F[1];
      }
      if (j + 1 == m) {
        sol.nodes[s + 1].reaction_force -= F[2];
        sol.nodes[s + 1].reaction_moment -= F[3];
      }
    }
  }

  sol.status = MethodStatus::Ok;
  R x(0);
  for (std::size_t i = 0; i <= n; ++i) {
    BasicNodeResult<R>& r = sol.nodes[i];
    const BasicSupport<R>& sp = beam.supports[i];
    r.x = x;
    if (i < n) x += beam.spans[i].length;
    const ElementNode<R>& left = st->nodes[i == 0 ? 0 : st->first[i] - 1];
    const ElementNode<R>& right = st->nodes[i == n ? st->first[n] - 1 : st->first[i]];
    r.deflection = i < n ? right.v : left.v;
    r.rotation_left = i > 0 ? left.th : right.th;
    r.rotation_right = i < n ? right.th : left.th;
    if (i > 0) r.moment_left = evaluate(*st, i - 1, beam.spans[i - 1].length, false).moment;
    if (i < n) r.moment_right = evaluate(*st, i, R(0), false).moment;
    if (!restrains_deflection(sp.type)) r.reaction_force = R(0);
    if (!restrains_rotation(sp.type)) r.reaction_moment = R(0);
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
