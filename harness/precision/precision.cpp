#include "harness/precision/precision.h"

#include <algorithm>
#include <cfloat>
#include <cmath>
#include <cstdio>
#include <exception>
#include <limits>
#include <sstream>

#include "methods/beam/status.h"
#include "methods/registry/registry.h"

namespace trivet::precision {

const char* arithmetic_name(Arithmetic a) {
  switch (a) {
    case Arithmetic::Double: return "double";
    case Arithmetic::Extended: return "extended";
    case Arithmetic::Exact: return "exact";
  }
  return "?";
}

BasicSolution<Exact> solve_exact(const std::string& name, const BasicBeam<Exact>& beam,
                                 const std::vector<BasicStation<Exact>>& stations) {
  const registry::MethodInfo* m = registry::find(name);
  if (m && m->solve_exact) return m->solve_exact(beam, stations);
  BasicSolution<Exact> s;
  s.status = MethodStatus::NotApplicable;
  s.reason = "no exact version of the method '" + name + "'" + (m ? std::string(": ") + m->why_not_exact : "");
  s.reason_id = reason_id::kArithmetic;
  return s;
}

BasicSolution<Extended> solve_extended(const std::string& name, const BasicBeam<Extended>& beam,
                                       const std::vector<BasicStation<Extended>>& stations) {
  const registry::MethodInfo* m = registry::find(name);
  if (m && m->solve_extended) return m->solve_extended(beam, stations);
  BasicSolution<Extended> s;
  s.status = MethodStatus::NotApplicable;
  s.reason = "no extended version of the method '" + name + "'";
  s.reason_id = reason_id::kArithmetic;
  return s;
}

namespace {

// ---------------------------------------------------------------------------
// Numbers as text.

Number number_of(double v) {
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.16e", v);
  return {v, buf, ""};
}
Number number_of(const Extended& v) {
  return {static_cast<double>(v), v.str(49, std::ios_base::scientific), ""};
}
Number number_of(const Exact& v, int digits) {
  return {to_double(v), decimal_text(v, digits), fraction_text(v)};
}
template <class R>
Number num(const R& v, int digits) {
  if constexpr (std::is_same_v<R, Exact>) return number_of(v, digits);
  else { (void)digits; return number_of(v); }
}

Extended ext(const Exact& v) { return to_extended(v); }
Extended ext(const Extended& v) { return v; }
Extended ext(double v) { return Extended(v); }

template <class R>
BasicStation<R> station_cast(const BasicStation<Exact>& s) {
  if constexpr (std::is_same_v<R, Exact>) return s;
  else if constexpr (std::is_same_v<R, Extended>) return {to_extended(s.x), s.span, to_extended(s.local), s.after};
  else return {to_double(s.x), s.span, to_double(s.local), s.after};
}

// A method's solution reduced to its node results and station values, in
// Extended (exactly for double; to 1e-50 for Exact).
struct Values {
  std::vector<BasicNodeResult<Extended>> nodes;
  std::vector<BasicPointValues<Extended>> stations;
};

template <class R>
BasicNodeResult<Extended> node_ext(const BasicNodeResult<R>& n) {
  BasicNodeResult<Extended> e;
  e.x = ext(n.x);
  if (n.moment_left) e.moment_left = ext(*n.moment_left);
  if (n.moment_right) e.moment_right = ext(*n.moment_right);
  e.reaction_force = ext(n.reaction_force);
  e.reaction_moment = ext(n.reaction_moment);
  e.deflection = ext(n.deflection);
  e.rotation_left = ext(n.rotation_left);
  e.rotation_right = ext(n.rotation_right);
  return e;
}

// Fills `m` from a solution in R and returns its values in Extended.
template <class R>
Values fill(MethodNumbers& m, const BasicSolution<R>& sol, const std::vector<BasicStation<R>>& stations,
            std::size_t node_count, int digits) {
  Values v;
  m.status = sol.status;
  m.reason = sol.reason;
  m.reason_id = sol.reason_id;
  if (sol.status != MethodStatus::Ok) return v;
  if (sol.nodes.size() != node_count || !sol.at) {
    m.status = MethodStatus::Failed;
    m.reason = "the method returned an incomplete result";
    m.reason_id = reason_id::kIncomplete;
    return v;
  }
  for (const auto& n : sol.nodes) {
    NodeNumbers t;
    t.x = num(n.x, digits);
    if (n.moment_left) t.moment_left = num(*n.moment_left, digits);
    if (n.moment_right) t.moment_right = num(*n.moment_right, digits);
    t.reaction_force = num(n.reaction_force, digits);
    t.reaction_moment = num(n.reaction_moment, digits);
    t.deflection = num(n.deflection, digits);
    t.rotation_left = num(n.rotation_left, digits);
    t.rotation_right = num(n.rotation_right, digits);
    m.nodes.push_back(std::move(t));
    v.nodes.push_back(node_ext(n));
  }
  for (const auto& s : stations) {
    const BasicPointValues<R> p = sol.at(s.span, s.local, s.after);
    StationNumbers t;
    t.x = num(s.x, digits);
    t.span = s.span;
    t.local = num(s.local, digits);
    t.after = s.after;
    t.shear = num(p.shear, digits);
    t.moment = num(p.moment, digits);
    t.deflection = num(p.deflection, digits);
    t.rotation = num(p.rotation, digits);
    m.stations.push_back(std::move(t));
    v.stations.push_back({ext(p.shear), ext(p.moment), ext(p.deflection), ext(p.rotation)});
  }
  return v;
}

Values double_values(const Solution& sol, const std::vector<Station>& stations) {
  Values v;
  for (const auto& n : sol.nodes) v.nodes.push_back(node_ext(n));
  for (const auto& s : stations) {
    const PointValues p = sol.at(s.span, s.local, s.after);
    v.stations.push_back({ext(p.shear), ext(p.moment), ext(p.deflection), ext(p.rotation)});
  }
  return v;
}

bool finite(const Values& v) {
  auto f = [](const Extended& x) { return boost::multiprecision::isfinite(x); };
  for (const auto& n : v.nodes)
    if (!f(n.reaction_force) || !f(n.reaction_moment) || !f(n.deflection) || !f(n.rotation_left) ||
        !f(n.rotation_right) || (n.moment_left && !f(*n.moment_left)) || (n.moment_right && !f(*n.moment_right)))
      return false;
  for (const auto& s : v.stations)
    if (!f(s.shear) || !f(s.moment) || !f(s.deflection) || !f(s.rotation)) return false;
  return true;
}

using compare::Kind;

Rounding measure(const Values& ref, const Values& dbl, const Beam& beam,
                 const std::vector<Station>& stations) {
  Rounding r;
  r.measured = true;
  Extended scale[kKinds];
  for (auto& s : scale) s = 0;
  auto grow = [&](Kind k, const Extended& x) {
    Extended& s = scale[static_cast<int>(k)];
    const Extended a = abs(x);
    if (a > s) s = a;
  };
  for (const auto& n : ref.nodes) {
    if (n.moment_left) grow(Kind::Moment, *n.moment_left);
    if (n.moment_right) grow(Kind::Moment, *n.moment_right);
    grow(Kind::Reaction, n.reaction_force);
    grow(Kind::Moment, n.reaction_moment);
    grow(Kind::Deflection, n.deflection);
    grow(Kind::Rotation, n.rotation_left);
    grow(Kind::Rotation, n.rotation_right);
  }
  for (const auto& s : ref.stations) {
    grow(Kind::Moment, s.moment);
    grow(Kind::Shear, s.shear);
    grow(Kind::Deflection, s.deflection);
    grow(Kind::Rotation, s.rotation);
  }
  // A kind whose reference is (almost) zero throughout -- the moments of a
  // beam that only moves as a rigid body, say -- would otherwise be scaled by
  // its own rounding noise. Floors from the other kinds: shear and reactions
  // share one force scale; moments are at least a tenth of that force times
  // the shortest span; deflections and rotations share one displacement
  // scale the same way.
  if (!beam.spans.empty()) {
    double lmin = beam.spans.front().length, lmax = lmin;
    for (const auto& sp : beam.spans) { lmin = std::min(lmin, sp.length); lmax = std::max(lmax, sp.length); }
    auto& S = scale;
    const Extended F = std::max(S[static_cast<int>(Kind::Shear)], S[static_cast<int>(Kind::Reaction)]);
    S[static_cast<int>(Kind::Shear)] = F;
    S[static_cast<int>(Kind::Reaction)] = F;
    S[static_cast<int>(Kind::Moment)] = std::max(S[static_cast<int>(Kind::Moment)], Extended(F * lmin / 10));
    const Extended D = std::max(S[static_cast<int>(Kind::Deflection)], Extended(S[static_cast<int>(Kind::Rotation)] * lmin));
    S[static_cast<int>(Kind::Deflection)] = std::max(S[static_cast<int>(Kind::Deflection)], Extended(D / 10));
    S[static_cast<int>(Kind::Rotation)] = std::max(S[static_cast<int>(Kind::Rotation)], Extended(D / lmax / 10));
  }
  Extended worst = -1;
  auto note = [&](Kind k, const Extended& a, const Extended& b, const std::string& where) {
    const Extended& s = scale[static_cast<int>(k)];
    const Extended d = s > 0 ? Extended(abs(a - b) / s) : Extended(abs(a - b));
    const double dd = static_cast<double>(d);
    double& md = r.difference[static_cast<int>(k)];
    md = std::max(md, dd);
    if (d > worst) {
      worst = d;
      r.worst_kind = compare::kind_name(k);
      r.worst_where = where;
    }
  };
  for (std::size_t j = 0; j < ref.nodes.size() && j < dbl.nodes.size(); ++j) {
    const auto& a = ref.nodes[j];
    const auto& b = dbl.nodes[j];
    const std::string where = "node " + (j < beam.labels.size() ? beam.labels[j] : std::to_string(j + 1));
    if (a.moment_left && b.moment_left) note(Kind::Moment, *a.moment_left, *b.moment_left, where + " (moment left)");
    if (a.moment_right && b.moment_right) note(Kind::Moment, *a.moment_right, *b.moment_right, where + " (moment right)");
    note(Kind::Reaction, a.reaction_force, b.reaction_force, where + " (reaction)");
    note(Kind::Moment, a.reaction_moment, b.reaction_moment, where + " (reaction moment)");
    note(Kind::Deflection, a.deflection, b.deflection, where + " (deflection)");
    note(Kind::Rotation, a.rotation_left, b.rotation_left, where + " (rotation left)");
    note(Kind::Rotation, a.rotation_right, b.rotation_right, where + " (rotation right)");
  }
  for (std::size_t i = 0; i < ref.stations.size() && i < dbl.stations.size(); ++i) {
    const auto& a = ref.stations[i];
    const auto& b = dbl.stations[i];
    std::string where = "x = " + input::format_number(stations[i].x);
    if (stations[i].after) where += " (right)";
    note(Kind::Moment, a.moment, b.moment, where);
    note(Kind::Shear, a.shear, b.shear, where);
    note(Kind::Deflection, a.deflection, b.deflection, where);
    note(Kind::Rotation, a.rotation, b.rotation, where);
  }
  for (std::size_t k = 0; k < kKinds; ++k) {
    r.scale[k] = static_cast<double>(scale[k]);
    r.digits[k] = r.difference[k] > 0 ? std::min(kMaxDigits, -std::log10(r.difference[k])) : kMaxDigits;
    r.worst_difference = std::max(r.worst_difference, r.difference[k]);
  }
  r.worst_digits = r.worst_difference > 0 ? std::min(kMaxDigits, -std::log10(r.worst_difference)) : kMaxDigits;
  return r;
}

// ---------------------------------------------------------------------------
// Conditioning from the beam alone.

std::string ratio_text(double r) {
  if (!(r < std::numeric_limits<double>::max())) return "more than 1e308";
  if (r < 1000) {
    char b[32];
    std::snprintf(b, sizeof b, "%.3g", r);
    return b;
  }
  const double e = std::floor(std::log10(r));
  const double m = r / std::pow(10.0, e);
  char b[32];
  if (m < 1.05) std::snprintf(b, sizeof b, "1e%.0f", e);
  else std::snprintf(b, sizeof b, "%.2ge%.0f", m, e);
  return b;
}

std::string node_name(const Beam& beam, std::size_t i) {
  return "node " + (i < beam.labels.size() ? beam.labels[i] : std::to_string(i + 1));
}

}  // namespace

Conditioning estimate_conditioning(const Beam& beam, std::optional<double> measured, double warn_digits,
                                   std::size_t max_features) {
  Conditioning c;
  // The ratios first, the words only for the features kept (a long beam has
  // two ratios per pair of spans, and text for each cost more than the rest).
  enum class Kind { Translation, Rotation, Spring, RotationalSpring };
  struct Candidate {
    Kind kind;
    std::size_t index;  // the left span of the pair, or the spring's node
    bool greater;       // the right span (or the spring) is the stiffer
    double ratio;
  };
  std::vector<Candidate> f;
  const std::size_t n = beam.spans.size();
  const double keep_above = std::pow(10.0, 0.5);  // features costing more than half a digit
  auto add = [&](Kind kind, std::size_t index, double a, double b) {
    if (!(a > 0) || !(b > 0) || !std::isfinite(a) || !std::isfinite(b)) return;
    const bool greater = b > a;
    double ratio = greater ? b / a : a / b;
    // A ratio beyond double's range (a spring of 5e-324 beside a beam) is
    // the worst there is, not nothing: it is kept as the largest double.
    if (!std::isfinite(ratio)) ratio = std::numeric_limits<double>::max();
    if (!(ratio > keep_above)) return;
    f.push_back({kind, index, greater, ratio});
  };
  auto stiff = [&](std::size_t s) { const auto& sp = beam.spans[s]; return sp.EI / (sp.length * sp.length * sp.length); };
  auto rot = [&](std::size_t s) { const auto& sp = beam.spans[s]; return sp.EI / sp.length; };
  // Adjacent spans: translational (EI/L^3) and rotational (EI/L) stiffness.
  for (std::size_t s = 0; s + 1 < n; ++s) {
    add(Kind::Translation, s, stiff(s), stiff(s + 1));
    add(Kind::Rotation, s, rot(s), rot(s + 1));
  }
  // Springs against the beam beside them.
  for (std::size_t i = 0; i < beam.supports.size(); ++i) {
    const auto& sup = beam.supports[i];
    if (sup.type != SupportType::Spring) continue;
    double kb = 0, rb = 0;
    if (i > 0) { kb = std::max(kb, 12 * stiff(i - 1)); rb = std::max(rb, 4 * rot(i - 1)); }
    if (i < n) { kb = std::max(kb, 12 * stiff(i)); rb = std::max(rb, 4 * rot(i)); }
    if (kb > 0 && sup.k > 0) add(Kind::Spring, i, kb, sup.k);
    if (rb > 0 && sup.kr > 0) add(Kind::RotationalSpring, i, rb, sup.kr);
  }
  std::stable_sort(f.begin(), f.end(), [](const auto& a, const auto& b) { return a.ratio > b.ratio; });
  if (f.size() > max_features) f.resize(max_features);
  auto describe = [&](const Candidate& x) {
    const std::string r = ratio_text(x.ratio);
    const std::size_t i = x.index;
    switch (x.kind) {
      case Kind::Translation:
      case Kind::Rotation: {
        const std::string A = "span " + std::to_string(i + 1), B = "span " + std::to_string(i + 2);
        const std::string& stiffer = x.greater ? B : A;
        const std::string& other = x.greater ? A : B;
        return x.kind == Kind::Translation ? stiffer + " is " + r + " times stiffer than " + other + " (EI/L^3)"
                                           : stiffer + " is " + r + " times stiffer in rotation than " + other + " (EI/L)";
      }
      case Kind::Spring:
        return "the spring at " + node_name(beam, i) + " is " + r + (x.greater ? " times stiffer" : " times softer") +
               " than the beam beside it (k against 12EI/L^3)";
      case Kind::RotationalSpring:
        return "the rotational spring at " + node_name(beam, i) + " is " + r +
               (x.greater ? " times stiffer" : " times softer") + " than the beam beside it (kr against 4EI/L)";
    }
    return std::string();
  };
  for (const auto& x : f) {
    ConditionFeature cf;
    cf.description = describe(x);
    cf.ratio = x.ratio;
    cf.digits = std::log10(x.ratio);
    c.features.push_back(std::move(cf));
  }
  // Half a digit for the rounding every solution accumulates (the
  // elimination and the closed-form integrations), plus the worst feature;
  // at most all 16.
  c.estimated_digits_lost = std::min(16.0, kBaseDigitsLost + (c.features.empty() ? 0 : c.features.front().digits));
  c.measured_digits_lost = measured;
  if (c.estimated_digits_lost > warn_digits) {
    char b[160];
    std::snprintf(b, sizeof b, "double may lose about %.0f of its 16 digits on this beam: ", c.estimated_digits_lost);
    c.warnings.push_back(b + c.features.front().description);
  }
  if (measured && *measured > warn_digits) {
    char b[160];
    std::snprintf(b, sizeof b, "double lost %.1f of its 16 digits on this beam against the exact reference", *measured);
    std::string w = b;
    if (!c.features.empty()) w += " (" + c.features.front().description + ")";
    c.warnings.push_back(w);
  }
  return c;
}

double estimated_relative_error(const Conditioning& c) {
  return std::pow(10.0, c.estimated_digits_lost) * DBL_EPSILON;
}

LoadSetNumbers run_load_set(const ExactBeamFile& exact, const input::BeamFile& file,
                            const std::string& load_case, const Options& options) {
  LoadSetNumbers out;
  out.load_case = load_case;
  out.arithmetic = options.arithmetic;
  const bool one = file.cases.size() <= 1;
  Beam dbeam = one ? file.beam : compare::beam_for_case(file.beam, load_case);
  BasicBeam<Exact> xbeam = one ? exact.beam : exact_beam_for_case(exact.beam, load_case);
  const int per_span = options.stations_per_span.value_or(file.beam.stations_per_span);
  dbeam.stations_per_span = per_span;
  xbeam.stations_per_span = per_span;
  const BasicBeam<Extended> ebeam = to_extended(xbeam);

  // One grid for every arithmetic: the exact one, converted.
  const auto xst = build_stations(xbeam, per_span);
  std::vector<BasicStation<Extended>> est;
  std::vector<Station> dst;
  for (const auto& s : xst) {
    est.push_back(station_cast<Extended>(s));
    dst.push_back(station_cast<double>(s));
  }

  std::vector<std::string> names = options.methods;
  if (names.empty())
    for (const auto& m : compare::methods()) names.push_back(m.name);

  std::optional<double> lost;
  for (const auto& name : names) {
    MethodNumbers m;
    m.name = name;
    m.requested = options.arithmetic;
    m.used = options.arithmetic;
    const registry::MethodInfo* info = registry::find(name);
    if (options.arithmetic == Arithmetic::Exact && info && !info->solve_exact) {
      m.used = Arithmetic::Extended;
      m.note = "the " + name + " method ran in extended arithmetic (50 digits), not exactly: " + info->why_not_exact;
    }
    const compare::Method* dm = compare::find_method(name);
    Values ref;
    try {
      switch (m.used) {
        case Arithmetic::Exact: ref = fill(m, solve_exact(name, xbeam, xst), xst, xbeam.node_count(), options.exact_digits); break;
        case Arithmetic::Extended: ref = fill(m, solve_extended(name, ebeam, est), est, ebeam.node_count(), 50); break;
        case Arithmetic::Double:
          if (!dm) { m.status = MethodStatus::NotApplicable; m.reason = "no method '" + name + "'"; m.reason_id = reason_id::kFeature; break; }
          ref = fill(m, dm->solve(dbeam, dst), dst, dbeam.node_count(), 17);
          break;
      }
    } catch (const std::exception& e) {
      m.status = MethodStatus::Failed;
      m.reason = std::string("the method threw: ") + e.what();
      m.reason_id = reason_id::kInternal;
    }
    if (m.status == MethodStatus::Ok && !finite(ref)) {
      m.status = MethodStatus::Failed;
      m.reason = "the method returned a value that is not finite";
      m.reason_id = reason_id::kNonFinite;
    }
    if (options.reference && m.status == MethodStatus::Ok && m.used != Arithmetic::Double && dm) {
      Rounding r;
      try {
        const Solution ds = dm->solve(dbeam, dst);
        if (ds.status != MethodStatus::Ok || ds.nodes.size() != dbeam.node_count() || !ds.at) {
          r.reason = "the method in double: " + std::string(method_status_name(ds.status)) +
                     (ds.reason.empty() ? "" : ": " + ds.reason);
        } else {
          r = measure(ref, double_values(ds, dst), dbeam, dst);
        }
      } catch (const std::exception& e) {
        r.reason = std::string("the method in double threw: ") + e.what();
      }
      if (r.measured) {
        const double l = r.worst_difference > 0 ? std::max(0.0, std::log10(r.worst_difference / DBL_EPSILON)) : 0.0;
        lost = std::max(lost.value_or(0.0), l);
      }
      m.rounding = r;
    }
    out.methods.push_back(std::move(m));
  }
  out.conditioning = estimate_conditioning(dbeam, lost, options.warn_digits);
  return out;
}

FileNumbers run_file(const std::string& text, const input::BeamFile& file, const Options& options) {
  FileNumbers out;
  const ExactBeamFile exact = read_exact_beam(text, file);
  if (!exact.ok) {
    out.error = exact.error;
    return out;
  }
  for (const auto& c : file.cases) out.sets.push_back(run_load_set(exact, file, c, options));
  out.ok = true;
  return out;
}

}  // namespace trivet::precision
