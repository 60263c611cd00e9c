#include "reports/plot.h"

#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <cctype>
#include <cerrno>
#include <cmath>
#include <tuple>
#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <iterator>
#include <sstream>
#include <utility>

#include <gnuplot-iostream.h>

#include "harness/compare/against.h"
#include "harness/compare/moving.h"
#include "harness/input/units.h"
#include "reports/reports.h"

namespace trivet::reports {

namespace {
// A position found by a search (between stations): six significant digits,
// as the console shows places, not the twelve of a number from the file.
std::string place(double v) {
  char b[32];
  std::snprintf(b, sizeof b, "%.6g", v);
  return b;
}
}  // namespace


using namespace trivet::compare;

const char* panel_name(PanelKind k) {
  switch (k) {
    case PanelKind::Sketch: return "sketch";
    case PanelKind::Shear: return "shear";
    case PanelKind::Moment: return "moment";
    case PanelKind::Deflection: return "deflection";
    case PanelKind::Difference: return "difference";
    case PanelKind::Influence: return "influence";
  }
  return "?";
}

const Panel* PlotData::panel(PanelKind k) const {
  for (const auto& p : panels)
    if (p.kind == k) return &p;
  return nullptr;
}

namespace {

std::size_t ki(Kind k) { return static_cast<std::size_t>(k); }

double value_of(const StationValues& s, Kind k) {
  switch (k) {
    case Kind::Shear: return s.shear;
    case Kind::Deflection: return s.deflection;
    case Kind::Rotation: return s.rotation;
    default: return s.moment;
  }
}

// The usable stations of a method: ok and one per load set station.
bool usable(const MethodResult& m, const LoadSet& set) {
  return m.status == MethodStatus::Ok && m.stations.size() == set.stations.size() && !m.stations.empty();
}

// The usable envelope of a method: ok and one bound per load set station.
bool usable_envelope(const MethodResult& m, const LoadSet& set) {
  return m.status == MethodStatus::Ok && m.envelope && !set.stations.empty() &&
         m.envelope->moment.size() == set.stations.size() && m.envelope->shear.size() == set.stations.size() &&
         m.envelope->deflection.size() == set.stations.size();
}

const std::vector<Bound>& bounds_of(const Envelope& e, Kind k) {
  return k == Kind::Shear ? e.shear : k == Kind::Deflection ? e.deflection : e.moment;
}

Kind panel_quantity(PanelKind p) {
  return p == PanelKind::Shear ? Kind::Shear : p == PanelKind::Moment ? Kind::Moment : Kind::Deflection;
}

// The combination in words: "1.2 x dead + 1.6 x live; live patterned span
// by span (every arrangement)".
std::string combination_text(const input::Combination& c) {
  std::string s;
  for (std::size_t k = 0; k < c.factors.size(); ++k) {
    const input::Factor& f = c.factors[k].second;
    s += (k ? " + " : "") +
         (f.range ? "[" + input::format_number(f.low) + " or " + input::format_number(f.high) + "]"
                  : input::format_number(f.low)) +
         " x " + c.factors[k].first;
  }
  if (!c.pattern.empty()) {
    s += "; ";
    for (std::size_t k = 0; k < c.pattern.size(); ++k) s += (k ? ", " : "") + c.pattern[k];
    s += std::string(" patterned span by span (") +
         (c.arrangements == input::Arrangements::All ? "every arrangement" : "all, alternate and adjacent spans") + ")";
  }
  if (c.moving)
    s += (c.factors.empty() ? std::string() : " + ") + input::format_number(c.moving->second) + " x " + c.moving->first +
         " (moving)";
  if (!c.source.empty()) s += "; factors: " + c.source;
  return s;
}

// A moving load in words: "moving load trolley: 40 kN at 0, 60 kN at 3 m;
// both directions".
std::string moving_text(const input::MovingLoad& t, const DisplayUnits& u) {
  std::string s = "moving load " + t.name + ":";
  for (std::size_t k = 0; k < t.points.size(); ++k)
    s += (k ? ", " : " ") + shown_number(u.force(t.points[k].P)) + " " + u.force.label + " at " +
         shown_number(u.length(t.points[k].offset)) + " " + u.length.label;
  s += t.both_directions ? "; both directions" : "; forward only";
  return s;
}

// The global x of another program's row, from its `where` text ("x = 2.5
// m" or "span 2, x_local = 1 m", in the file's length unit), converted to
// the beam file's units. Comparison rows carry no numeric position, so it
// is read back from that text (format_number keeps every digit needed).

}  // namespace

PlotData plot_data(const Report& b, std::size_t set_index, const ShowUnits& show) {
  PlotData d;
  d.title = b.title.empty() ? b.file : b.title;
  if (b.status == BeamStatus::Invalid) {
    d.notes.push_back("the beam file is invalid: nothing to plot");
    return d;
  }
  if (set_index >= b.sets.size()) {
    d.notes.push_back("no load set " + std::to_string(set_index + 1) + " (the beam has " +
                      std::to_string(b.sets.size()) + ")");
    return d;
  }
  const LoadSet& set = b.sets[set_index];
  const Beam& beam = set.beam;
  // Every number in its display unit (display_units.h): x in the length
  // unit, each panel's values in its kind's unit.
  const DisplayUnits u = display_units(b.units, show);
  const std::string F = u.force.label, L = u.length.label, FL = u.moment.label, D = u.deflection.label;
  d.subtitle = b.file + "  |  load set: " + set.name + (set.envelope ? " (envelope)" : "") + "  |  methods " +
               verdict_name(set.verdict);
  d.envelope = set.envelope;
  // A moving load's own load set: its combination holds only the train.
  const bool own_moving = set.moving && set.combination && set.combination->factors.empty() &&
                          set.combination->moving && set.combination->moving->first == set.name;
  if (own_moving) d.combination = moving_text(*set.moving, u);
  else if (set.combination) d.combination = "combination " + set.name + " = " + combination_text(*set.combination);
  d.x_label = "x [" + L + "]";
  const std::size_t nn = beam.node_count();
  d.x_min = 0;
  d.x_max = nn ? u.length(beam.node_x(nn - 1)) : 1;
  if (!(d.x_max > d.x_min)) d.x_max = d.x_min + 1;

  const int dm = decimals_for(u.moment(set.scale[ki(Kind::Moment)]));
  const int dv = decimals_for(u.force(set.scale[ki(Kind::Shear)]));
  const int dr = decimals_for(std::max(u.force(set.scale[ki(Kind::Reaction)]), 1e-300));
  const int dd = decimals_for(u.deflection(set.scale[ki(Kind::Deflection)]));
  // A panel's display unit.
  auto unit_of = [&](Kind k) -> const DisplayUnit& { return u.of(k); };

  // Node x positions (display unit), summed once.
  std::vector<double> node_x(nn, 0.0);
  for (std::size_t i = 1; i < nn; ++i) node_x[i] = node_x[i - 1] + u.length(beam.spans[i - 1].length);

  // The sketch.
  for (std::size_t i = 0; i < nn; ++i) {
    SketchNode n;
    n.x = node_x[i];
    n.label = i < beam.labels.size() ? beam.labels[i] : input::default_label(i);
    const Support& s = beam.supports[i];
    n.type = s.type;
    n.hinge = s.hinge;
    n.rotational_spring = s.type == SupportType::Spring && s.kr > 0;
    n.settlement = u.deflection(s.settlement);
    n.settlement_unit = D;
    if (i < set.consensus_nodes.size()) {
      const NodeResult& c = set.consensus_nodes[i];
      std::string r;
      if (restrains_deflection(s.type) || s.type == SupportType::Spring) r = "R = " + fixed(u.force(c.reaction_force), dr) + " " + F;
      if (restrains_rotation(s.type) || n.rotational_spring)
        r += (r.empty() ? "" : "; ") + std::string("M = ") + fixed(u.moment(c.reaction_moment), dm) + " " + FL;
      n.reaction = r;
    }
    if (set.envelope && i < set.consensus_envelope.reaction.size() &&
        (restrains_deflection(s.type) || s.type == SupportType::Spring)) {
      const Bound& r = set.consensus_envelope.reaction[i];
      n.reaction = "R " + fixed(u.force(r.min), dr) + " to " + fixed(u.force(r.max), dr) + " " + F;
    }
    d.nodes.push_back(std::move(n));
  }
  for (const Load& l : beam.loads) {
    SketchLoad s;
    s.type = l.type;
    const double base = l.on_node ? (l.index < nn ? node_x[l.index] : 0.0) : (l.index < nn ? node_x[l.index] : 0.0);
    switch (l.type) {
      case LoadType::Point:
        s.x0 = s.x1 = l.on_node ? base : base + u.length(l.at);
        s.v0 = s.v1 = u.force(l.P);
        s.text = "P = " + shown_number(s.v0) + " " + F;
        break;
      case LoadType::Couple:
        s.x0 = s.x1 = l.on_node ? base : base + u.length(l.at);
        s.v0 = s.v1 = u.moment(l.C);
        s.text = "C = " + shown_number(s.v0) + " " + FL;
        break;
      case LoadType::Udl:
        s.x0 = base + u.length(l.from);
        s.x1 = base + u.length(l.to);
        s.v0 = u.force(l.w1) / u.length.factor;
        s.v1 = u.force(l.w2) / u.length.factor;
        s.text = "w = " + shown_number(s.v0) + " " + F + "/" + L;
        break;
      case LoadType::Linear:
        s.x0 = base + u.length(l.from);
        s.x1 = base + u.length(l.to);
        s.v0 = u.force(l.w1) / u.length.factor;
        s.v1 = u.force(l.w2) / u.length.factor;
        s.text = "w = " + shown_number(s.v0) + " to " + shown_number(s.v1) + " " + F + "/" + L;
        break;
    }
    if (set.combination) {
      const auto& pat = set.combination->pattern;
      const bool patterned = std::find(pat.begin(), pat.end(), l.load_case) != pat.end();
      s.text += " (" + l.load_case + (patterned ? ", patterned" : "") + ")";
    }
    d.loads.push_back(std::move(s));
  }

  // The diagram panels.
  Panel sketch;
  sketch.kind = PanelKind::Sketch;
  Panel shear, moment, defl, diff;
  shear.kind = PanelKind::Shear;
  shear.ylabel = "shear [" + F + "]\nup +";
  moment.kind = PanelKind::Moment;
  moment.ylabel = "moment [" + FL + "]\nsagging +, drawn down";
  moment.drawn_down = true;
  defl.kind = PanelKind::Deflection;
  defl.ylabel = "deflection [" + D + "]\ndown +, drawn down";
  defl.drawn_down = true;
  diff.kind = PanelKind::Difference;
  diff.ylabel = "(method - consensus)\n/ largest of its kind";

  if (set.envelope) {
    shear.ylabel = "shear envelope [" + F + "]\nup +";
    moment.ylabel = "moment envelope [" + FL + "]\nsagging +, drawn down";
    defl.ylabel = "deflection envelope [" + D + "]\ndown +, drawn down";
    diff.ylabel = "(method - consensus)\n/ largest of its kind\nmax and min";
  }
  std::size_t env_ok = 0;
  for (std::size_t mi = 0; set.envelope && mi < set.methods.size(); ++mi) {
    const MethodResult& m = set.methods[mi];
    if (!usable_envelope(m, set)) {
      d.notes.push_back(m.name + ": " + (m.status == MethodStatus::Ok ? std::string("no envelope at the stations")
                                                                       : std::string(method_status_name(m.status))) +
                        (m.reason.empty() ? "" : " (" + m.reason + ")") + ", not drawn");
      continue;
    }
    ++env_ok;
    for (Panel* p : {&shear, &moment, &defl}) {
      const std::vector<Bound>& bs = bounds_of(*m.envelope, panel_quantity(p->kind));
      const DisplayUnit& pu = unit_of(panel_quantity(p->kind));
      for (Limit lim : {Limit::Max, Limit::Min}) {
        Curve c;
        c.method = m.name;
        c.label = m.name + " max/min";
        c.style = mi;
        c.limit = lim;
        c.x.reserve(bs.size());
        c.y.reserve(bs.size());
        for (std::size_t i = 0; i < bs.size(); ++i) {
          c.x.push_back(u.length(set.stations[i].x));
          c.y.push_back(pu(lim == Limit::Max ? bs[i].max : bs[i].min));
        }
        p->curves.push_back(std::move(c));
      }
    }
  }
  const Envelope& ce = set.consensus_envelope;
  const bool consensus_ok = ce.moment.size() == set.stations.size() && ce.shear.size() == set.stations.size() &&
                            ce.deflection.size() == set.stations.size() && !set.stations.empty();
  if (set.envelope && env_ok >= 2 && consensus_ok) {
    for (std::size_t mi = 0; mi < set.methods.size(); ++mi) {
      const MethodResult& m = set.methods[mi];
      if (!usable_envelope(m, set)) continue;
      for (Kind k : {Kind::Shear, Kind::Moment, Kind::Deflection}) {
        const double scale = set.scale[ki(k)];
        const std::vector<Bound>& bs = bounds_of(*m.envelope, k);
        const std::vector<Bound>& cs = bounds_of(ce, k);
        for (Limit lim : {Limit::Max, Limit::Min}) {
          Curve c;
          c.method = m.name;
          c.label = m.name + " " + kind_name(k) + (lim == Limit::Max ? " max" : " min");
          c.style = mi;
          c.kind = k;
          c.limit = lim;
          for (std::size_t i = 0; i < bs.size(); ++i) {
            c.x.push_back(u.length(set.stations[i].x));
            const double delta = lim == Limit::Max ? bs[i].max - cs[i].max : bs[i].min - cs[i].min;
            c.y.push_back(scale > 0 ? delta / scale : 0.0);
          }
          diff.curves.push_back(std::move(c));
        }
      }
    }
  } else if (set.envelope) {
    d.notes.push_back("fewer than two methods gave an envelope: no difference panel");
  }
  for (std::size_t mi = 0; !set.envelope && mi < set.methods.size(); ++mi) {
    const MethodResult& m = set.methods[mi];
    if (!usable(m, set)) {
      if (m.status == MethodStatus::Ok)
        d.notes.push_back(m.name + ": no values at the stations (an envelope load set?), not drawn");
      else
        d.notes.push_back(m.name + ": " + method_status_name(m.status) + (m.reason.empty() ? "" : " (" + m.reason + ")") +
                          ", not drawn");
      continue;
    }
    for (Panel* p : {&shear, &moment, &defl}) {
      const Kind k = p->kind == PanelKind::Shear ? Kind::Shear : p->kind == PanelKind::Moment ? Kind::Moment : Kind::Deflection;
      const DisplayUnit& pu = unit_of(k);
      Curve c;
      c.method = c.label = m.name;
      c.style = mi;
      c.x.reserve(m.stations.size());
      c.y.reserve(m.stations.size());
      // With few stations in a span the diagram between them is drawn from
      // the method's own values there (about 12 pieces a span), so that a
      // curve never hides an extreme that is between stations.
      std::size_t span_begin = 0;
      for (std::size_t i = 0; i < m.stations.size(); ++i) {
        const Station& st = set.stations[i];
        if (i == 0 || set.stations[i - 1].span != st.span) span_begin = i;
        c.x.push_back(u.length(m.stations[i].x));
        c.y.push_back(pu(value_of(m.stations[i], k)));
        if (i + 1 >= m.stations.size() || set.stations[i + 1].span != st.span || !m.solution.at) continue;
        const double from = st.local, to = set.stations[i + 1].local;
        if (!(to > from)) continue;
        std::size_t span_end = i + 1;
        while (span_end + 1 < set.stations.size() && set.stations[span_end + 1].span == st.span) ++span_end;
        const std::size_t pieces = span_end - span_begin;
        const std::size_t extra = pieces >= 12 ? 0 : (12 + pieces - 1) / pieces - 1;
        for (std::size_t e = 1; e <= extra; ++e) {
          const double t = from + (to - from) * static_cast<double>(e) / static_cast<double>(extra + 1);
          const PointValues pv = m.solution.at(st.span, t, false);
          const double v = k == Kind::Shear ? pv.shear : k == Kind::Moment ? pv.moment : pv.deflection;
          if (!std::isfinite(v)) continue;
          c.x.push_back(u.length(m.stations[i].x + (t - from)));
          c.y.push_back(pu(v));
        }
      }
      p->curves.push_back(std::move(c));
    }
  }
  if (set.envelope) {
  } else if (set.ok_count() >= 2 && set.consensus_stations.size() == set.stations.size()) {
    for (std::size_t mi = 0; mi < set.methods.size(); ++mi) {
      const MethodResult& m = set.methods[mi];
      if (!usable(m, set)) continue;
      for (Kind k : {Kind::Shear, Kind::Moment, Kind::Deflection}) {
        const double scale = set.scale[ki(k)];
        Curve c;
        c.method = m.name;
        c.label = m.name + " " + kind_name(k);
        c.style = mi;
        c.kind = k;
        for (std::size_t i = 0; i < m.stations.size(); ++i) {
          c.x.push_back(u.length(m.stations[i].x));
          const double delta = value_of(m.stations[i], k) - value_of(set.consensus_stations[i], k);
          c.y.push_back(scale > 0 ? delta / scale : 0.0);
        }
        diff.curves.push_back(std::move(c));
      }
    }
  } else {
    d.notes.push_back("fewer than two methods solved the beam: no difference panel");
  }

  // Values worth a label: at the supports and at the span extremes, from
  // the consensus. Many spans: only the governing ones.
  const std::size_t ns = beam.spans.size();
  const bool every_span = ns <= 8;
  if (set.consensus_nodes.size() == nn && set.consensus_stations.size() == set.stations.size() && nn >= 2) {
    // Shear at both ends of each span.
    std::vector<std::pair<double, double>> ends;  // (x, V)
    for (std::size_t i = 0; i < set.stations.size(); ++i) {
      const bool first = i == 0 || set.stations[i - 1].span != set.stations[i].span;
      const bool last = i + 1 == set.stations.size() || set.stations[i + 1].span != set.stations[i].span;
      if (first || last) ends.emplace_back(u.length(set.consensus_stations[i].x), u.force(set.consensus_stations[i].shear));
    }
    if (!every_span && !ends.empty()) {
      auto mx = std::max_element(ends.begin(), ends.end(), [](auto& a, auto& c) { return a.second < c.second; });
      auto mn = std::min_element(ends.begin(), ends.end(), [](auto& a, auto& c) { return a.second < c.second; });
      ends = {*mx, *mn};
    }
    const double vs = u.force(set.scale[ki(Kind::Shear)]);
    for (const auto& e : ends) {
      if (!(std::abs(e.second) > 1e-9 * vs)) continue;
      const std::string t = fixed(e.second, dv);
      // A shear continuous across a hinge or a free joint: one label.
      const bool again = std::any_of(shear.labels.begin(), shear.labels.end(), [&](const ValueLabel& l) {
        return l.text == t && std::abs(l.x - e.first) < 1e-9 * (d.x_max - d.x_min);
      });
      if (!again) shear.labels.push_back({e.first, e.second, t});
    }

    // Moment at the nodes where it is not zero, and the span extremes.
    const double ms = u.moment(set.scale[ki(Kind::Moment)]);
    auto node_moment = [&](std::size_t i) {
      const NodeResult& c = set.consensus_nodes[i];
      return u.moment(c.moment_right ? *c.moment_right : c.moment_left ? *c.moment_left : 0.0);
    };
    std::vector<std::size_t> nodes_to_label;
    if (every_span) {
      for (std::size_t i = 0; i < nn; ++i) nodes_to_label.push_back(i);
    } else {
      std::size_t hi = 0, lo = 0;
      for (std::size_t i = 0; i < nn; ++i) {
        if (node_moment(i) > node_moment(hi)) hi = i;
        if (node_moment(i) < node_moment(lo)) lo = i;
      }
      nodes_to_label = {hi, lo};
    }
    for (std::size_t i : nodes_to_label) {
      const double mv = node_moment(i);
      if (std::abs(mv) > 1e-9 * ms) {
        moment.labels.push_back({node_x[i], mv, fixed(mv, dm)});
      }
    }
    // The same value at (nearly) the same place once: a span's extreme at a
    // node whose moment is labelled already, a shear continuous across a
    // hinge. Labels near each other are kept apart when drawn (place_labels).
    const double tol_x = 0.01 * (d.x_max - d.x_min);
    auto near_label = [&](double x, const std::string& text) {
      for (const auto& l : moment.labels)
        if (l.text == text && std::abs(l.x - x) < tol_x) return true;
      return false;
    };
    std::vector<std::size_t> spans_to_label;
    if (every_span) {
      for (std::size_t s = 0; s < set.extremes.size(); ++s) spans_to_label.push_back(s);
    } else if (!set.extremes.empty()) {
      std::size_t hi = 0, lo = 0, df = 0;
      for (std::size_t s = 0; s < set.extremes.size(); ++s) {
        if (set.extremes[s].max_moment > set.extremes[hi].max_moment) hi = s;
        if (set.extremes[s].min_moment < set.extremes[lo].min_moment) lo = s;
        if (std::abs(set.extremes[s].max_deflection) > std::abs(set.extremes[df].max_deflection)) df = s;
      }
      spans_to_label = {hi, lo, df};
    }
    const double ds = u.deflection(set.scale[ki(Kind::Deflection)]);
    for (std::size_t s : spans_to_label) {
      const SpanExtremes& e = set.extremes[s];
      const double mmax = u.moment(e.max_moment), mmin = u.moment(e.min_moment), dmax = u.deflection(e.max_deflection);
      const double xmax = u.length(e.max_moment_x), xmin = u.length(e.min_moment_x);
      if (mmax > 1e-9 * ms && !near_label(xmax, fixed(mmax, dm))) {
        moment.labels.push_back({xmax, mmax, fixed(mmax, dm)});
      }
      if (mmin < -1e-9 * ms && !near_label(xmin, fixed(mmin, dm))) {
        moment.labels.push_back({xmin, mmin, fixed(mmin, dm)});
      }
      if (std::abs(dmax) > 1e-9 * ds && every_span)
        defl.labels.push_back({u.length(e.max_deflection_x), dmax, fixed(dmax, dd)});
    }
    // Many spans: the deflection of the span that deflects most only.
    if (!every_span && !spans_to_label.empty()) {
      const SpanExtremes& e = set.extremes[spans_to_label.back()];
      const double dmax = u.deflection(e.max_deflection);
      if (std::abs(dmax) > 1e-9 * ds) defl.labels.push_back({u.length(e.max_deflection_x), dmax, fixed(dmax, dd)});
    }
  }

  // Envelope load sets: the span extremes of moment_max and moment_min
  // (from `extremes`), the shear envelope at the span ends and the largest
  // downward deflection envelope of each span.
  if (set.envelope && consensus_ok && !set.extremes.empty()) {
    const double ms = set.scale[ki(Kind::Moment)], vs = set.scale[ki(Kind::Shear)], ds = set.scale[ki(Kind::Deflection)];
    // (ms, vs, ds in the file's units: compared with file values below.)
    std::vector<std::size_t> spans_to_label;
    if (every_span) {
      for (std::size_t sp = 0; sp < set.extremes.size(); ++sp) spans_to_label.push_back(sp);
    } else {
      std::size_t hi = 0, lo = 0;
      for (std::size_t sp = 0; sp < set.extremes.size(); ++sp) {
        if (set.extremes[sp].max_moment > set.extremes[hi].max_moment) hi = sp;
        if (set.extremes[sp].min_moment < set.extremes[lo].min_moment) lo = sp;
      }
      spans_to_label = {hi, lo};
    }
    for (std::size_t sp : spans_to_label) {
      const SpanExtremes& e = set.extremes[sp];
      const std::string tag = "span " + std::to_string(sp + 1) + ": ";
      auto add = [&](double x_file, double v_file) {
        const double x = u.length(x_file), v = u.moment(v_file);
        const std::string t = fixed(v, dm);
        for (const auto& l : moment.labels)
          if (l.text == t && std::abs(l.x - x) < 0.03 * (d.x_max - d.x_min)) return;  // the same value at a node
        moment.labels.push_back({x, v, t});
      };
      if (e.max_moment > 1e-9 * ms) {
        add(e.max_moment_x, e.max_moment);
        d.notes.push_back(tag + "largest moment_max " + fixed(u.moment(e.max_moment), dm) + " " + FL + " at x = " +
                          place(u.length(e.max_moment_x)) + " " + L +
                          (e.max_moment_by.empty() ? "" : " (" + e.max_moment_by + ")"));
      }
      if (e.min_moment < -1e-9 * ms) {
        add(e.min_moment_x, e.min_moment);
        d.notes.push_back(tag + "smallest moment_min " + fixed(u.moment(e.min_moment), dm) + " " + FL + " at x = " +
                          place(u.length(e.min_moment_x)) + " " + L +
                          (e.min_moment_by.empty() ? "" : " (" + e.min_moment_by + ")"));
      }
    }
    for (std::size_t i = 0; i < set.stations.size(); ++i) {
      const std::size_t sp = set.stations[i].span;
      const bool first = i == 0 || set.stations[i - 1].span != sp;
      const bool last = i + 1 == set.stations.size() || set.stations[i + 1].span != sp;
      if (!every_span) break;
      if (first && ce.shear[i].max > 1e-9 * vs)
        shear.labels.push_back({u.length(set.stations[i].x), u.force(ce.shear[i].max), fixed(u.force(ce.shear[i].max), dv)});
      if (last && ce.shear[i].min < -1e-9 * vs)
        shear.labels.push_back({u.length(set.stations[i].x), u.force(ce.shear[i].min), fixed(u.force(ce.shear[i].min), dv)});
    }
    if (every_span) {
      std::vector<std::size_t> at(ns, set.stations.size());
      for (std::size_t i = 0; i < set.stations.size(); ++i) {
        const std::size_t sp = set.stations[i].span;
        if (sp < ns && (at[sp] == set.stations.size() || ce.deflection[i].max > ce.deflection[at[sp]].max)) at[sp] = i;
      }
      for (std::size_t sp = 0; sp < ns; ++sp)
        if (at[sp] < set.stations.size() && ce.deflection[at[sp]].max > 1e-9 * ds)
          defl.labels.push_back({u.length(set.stations[at[sp]].x), u.deflection(ce.deflection[at[sp]].max),
                                 fixed(u.deflection(ce.deflection[at[sp]].max), dd)});
    }
  }

  // Claims of this load set, on the axes of their quantity.
  for (std::size_t ci = 0; ci < b.claims.size(); ++ci) {
    const ClaimResult& c = b.claims[ci];
    if (!c.load_case.empty() && c.load_case != set.name) continue;
    if (c.load_case.empty() && b.sets.size() > 1) continue;
    const std::string tag = "claim " + std::to_string(ci + 1);
    using Q = input::Quantity;
    const Q q = c.claim.quantity;
    std::optional<double> x;
    if (c.claim.node && *c.claim.node < nn) x = node_x[*c.claim.node];
    else if (c.claim.x) x = u.length(*c.claim.x);
    else if (c.claim.span && *c.claim.span < set.extremes.size()) {
      const SpanExtremes& e = set.extremes[*c.claim.span];
      x = u.length(q == Q::MinMoment ? e.min_moment_x : q == Q::MaxDeflection ? e.max_deflection_x : e.max_moment_x);
    }
    const std::string verdict = !c.evaluated ? "not evaluated" : c.holds ? "holds" : "fails";
    if (q == Q::Reaction || q == Q::ReactionMoment || q == Q::ReactionMax || q == Q::ReactionMin) {
      if (c.claim.node && *c.claim.node < nn) {
        const char* what = q == Q::Reaction ? "R" : q == Q::ReactionMax ? "R max" : q == Q::ReactionMin ? "R min" : "M";
        const DisplayUnit& cu = u.of(q);
        d.nodes[*c.claim.node].claims.push_back(tag + ": " + what + " = " + shown_number(cu(c.claim.value)) + " " +
                                                cu.label + " (" + verdict + ")");
        continue;
      }
    }
    Panel* p = nullptr;
    switch (q) {
      case Q::Moment: case Q::MaxMoment: case Q::MinMoment: case Q::MomentMax: case Q::MomentMin: p = &moment; break;
      case Q::Shear: case Q::ShearMax: case Q::ShearMin: p = &shear; break;
      case Q::Deflection: case Q::MaxDeflection: p = &defl; break;
      default: break;
    }
    if (!p || !x) {
      d.notes.push_back(tag + " (" + input::quantity_name(q) + ", " + c.label + ") has no axis in the plot; see the claims table");
      continue;
    }
    p->claims.push_back({ci, *x, u.of(q)(c.claim.value), c.holds, c.evaluated, tag});
  }

  // Another program's results: station values on their axes, reactions at
  // the supports. A comparison names its load case; one without a name (or
  // a beam with one load set) belongs to every set.
  for (std::size_t ai = 0; ai < b.against.size(); ++ai) {
    if (!b.against[ai]) continue;
    const against::Comparison& cmp = *b.against[ai];
    if (!cmp.ok()) continue;
    if (!cmp.load_case.empty() && cmp.load_case != set.name && b.sets.size() > 1) continue;
    std::size_t unplaced = 0;
    for (std::size_t ri = 0; ri < cmp.rows.size(); ++ri) {
      const against::RowResult& row = cmp.rows[ri];
      const std::string line = "line " + std::to_string(row.line);
      if (cmp.kind == against::TableKind::Reactions) {
        const auto node = row.node;
        if (!node || *node >= nn) { ++unplaced; continue; }
        for (const auto& cell : row.cells) {
          const bool force = cell.quantity == against::Quantity::ReactionForce;
          const int dec = force ? dr : dm;
          d.nodes[*node].others.push_back("other program: " + std::string(force ? "R" : "M") + " = " +
                                          fixed(force ? u.force(cell.theirs) : u.moment(cell.theirs), dec) + " " +
                                          (force ? F : FL) + " (" + (cell.holds ? "holds" : "fails") + ")");
        }
        continue;
      }
      const std::optional<double> x = row.x;
      if (!x) { ++unplaced; continue; }
      for (const auto& cell : row.cells) {
        Panel* p = cell.quantity == against::Quantity::Shear    ? &shear
                   : cell.quantity == against::Quantity::Moment ? &moment
                   : cell.quantity == against::Quantity::Deflection ? &defl
                                                                    : nullptr;
        if (!p) continue;
        p->others.push_back({ai, ri, u.length(*x), unit_of(panel_quantity(p->kind))(cell.theirs), cell.holds,
                             "other program, " + line});
      }
    }
    if (unplaced > 0)
      d.notes.push_back(cmp.file + ": " + std::to_string(unplaced) + " row(s) with no position in the beam, not drawn");
  }

  d.panels.push_back(std::move(sketch));
  d.panels.push_back(std::move(shear));
  d.panels.push_back(std::move(moment));
  d.panels.push_back(std::move(defl));
  d.panels.push_back(std::move(diff));
  return d;
}

// ---------------------------------------------------------------------------
// Influence lines.

const char* influence_syntax() {
  return "QUANTITY@WHERE: QUANTITY one of moment, shear, deflection, reaction; WHERE a node label (B; B- the end of "
         "the span on its left, B+ the start of the span on its right; B alone takes the left) or x=7.5 (global x "
         "in the file's length unit; not for reaction)";
}

namespace {
std::string trimmed(const std::string& s) {
  std::size_t a = 0, b = s.size();
  while (a < b && std::isspace(static_cast<unsigned char>(s[a]))) ++a;
  while (b > a && std::isspace(static_cast<unsigned char>(s[b - 1]))) --b;
  return s.substr(a, b - a);
}
const char* quantity_word(InfluenceRequest::Quantity q) {
  switch (q) {
    case InfluenceRequest::Quantity::Moment: return "moment";
    case InfluenceRequest::Quantity::Shear: return "shear";
    case InfluenceRequest::Quantity::Deflection: return "deflection";
    case InfluenceRequest::Quantity::Reaction: return "reaction";
  }
  return "?";
}
}  // namespace

std::optional<InfluenceRequest> parse_influence(const std::string& text, std::string* error) {
  auto bad = [&](const std::string& why) -> std::optional<InfluenceRequest> {
    if (error) *error = "--influence '" + text + "': " + why + "; expected " + influence_syntax();
    return std::nullopt;
  };
  const std::size_t at = text.find('@');
  if (at == std::string::npos) return bad("no '@'");
  if (text.find('@', at + 1) != std::string::npos) return bad("more than one '@'");
  std::string what = trimmed(text.substr(0, at));
  const std::string where = trimmed(text.substr(at + 1));
  for (char& c : what) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  InfluenceRequest q;
  q.text = text;
  if (what == "moment") q.quantity = InfluenceRequest::Quantity::Moment;
  else if (what == "shear") q.quantity = InfluenceRequest::Quantity::Shear;
  else if (what == "deflection") q.quantity = InfluenceRequest::Quantity::Deflection;
  else if (what == "reaction") q.quantity = InfluenceRequest::Quantity::Reaction;
  else return bad("unknown quantity '" + what + "'");
  if (where.empty()) return bad("no place after '@'");
  if (where.size() >= 2 && (where[0] == 'x' || where[0] == 'X') && where.find('=') != std::string::npos &&
      trimmed(where.substr(1, where.find('=') - 1)).empty()) {
    const std::string num_text = trimmed(where.substr(where.find('=') + 1));
    if (num_text.empty()) return bad("no number after 'x='");
    char* end = nullptr;
    errno = 0;
    const double v = std::strtod(num_text.c_str(), &end);
    if (end == num_text.c_str() || *end != '\0' || errno == ERANGE || !std::isfinite(v))
      return bad("'" + num_text + "' is not a number");
    if (q.quantity == InfluenceRequest::Quantity::Reaction) return bad("a reaction is at a node: give its label, not x");
    q.x = v;
    return q;
  }
  q.node = where;
  return q;
}

std::string influence_slug(const InfluenceRequest& q) {
  std::string where = q.x ? "x" + input::format_number(*q.x) : q.node;
  // "B-" and "B+" (parse_influence keeps the sign; influence_data reads it).
  if (!q.x && where.size() >= 2 && (where.back() == '-' || where.back() == '+')) {
    const char sign = where.back();
    where.pop_back();
    where += sign == '-' ? "-left" : "-right";
  }
  std::string s = std::string(quantity_word(q.quantity)) + "-";
  for (char c : where)
    s += std::isalnum(static_cast<unsigned char>(c)) || c == '.' || c == '-' || c == '_' ? c : '_';
  return s;
}

PlotData influence_data(const input::BeamFile& file, const InfluenceRequest& req,
                        const std::vector<const compare::Method*>& methods, int stations_per_span, std::string* error,
                        const ShowUnits& show) {
  PlotData d;
  // Drawn in the display units: positions in their length unit, a moment
  // per unit load in moment per force, a deflection per unit load in
  // deflection per force; shears and reactions per unit load have none.
  const DisplayUnits u = display_units(file.units, show);
  InfluenceRequest q = req;
  auto bad = [&](const std::string& why) {
    if (error) *error = "--influence '" + q.text + "': " + why;
    d.panels.clear();
    d.notes.push_back(why);
    return d;
  };
  if (!file.ok()) return bad("the beam file is invalid");
  // The beam of the lines: the file's, without loads or settlements.
  Beam beam = file.beam;
  beam.loads.clear();
  for (auto& s : beam.supports) s.settlement = 0;
  const std::size_t nn = beam.node_count();
  if (nn < 2) return bad("the beam has no span");
  std::vector<double> node_x(nn, 0.0);
  for (std::size_t i = 1; i < nn; ++i) node_x[i] = node_x[i - 1] + beam.spans[i - 1].length;
  const double total = node_x[nn - 1];
  auto label_of = [&](std::size_t i) { return i < beam.labels.size() ? beam.labels[i] : input::default_label(i); };

  // Where: a node (with its side) or a point inside a span.
  std::optional<std::size_t> node;
  std::size_t span = 0;
  double local = 0;
  if (!q.x) {
    for (std::size_t i = 0; i < nn && !node; ++i)
      if (label_of(i) == q.node) node = i;
    if (!node && q.node.size() >= 2 && (q.node.back() == '-' || q.node.back() == '+')) {
      const std::string bare = q.node.substr(0, q.node.size() - 1);
      for (std::size_t i = 0; i < nn && !node; ++i)
        if (label_of(i) == bare) {
          node = i;
          q.side = q.node.back() == '-' ? -1 : 1;
          q.node = bare;
        }
    }
    if (!node) {
      std::string names;
      for (std::size_t i = 0; i < nn && i < 30; ++i) names += (i ? ", " : "") + label_of(i);
      if (nn > 30) names += ", ...";
      return bad("no node '" + q.node + "' (nodes " + names + ")");
    }
  } else {
    const double tol = 1e-12 * total;
    if (!(*q.x >= -tol && *q.x <= total + tol))
      return bad("x = " + input::format_number(*q.x) + " is off the beam (0 to " + input::format_number(total) + " " +
                 file.units.length + ")");
    node = compare::node_at(beam, *q.x);
    if (!node) std::tie(span, local) = compare::locate(beam, *q.x);
  }
  bool after = false;
  if (node) {
    if (q.side < 0 && *node == 0) return bad("node " + label_of(0) + " has no span on its left");
    if (q.side > 0 && *node + 1 == nn) return bad("node " + label_of(nn - 1) + " has no span on its right");
    const bool right = q.side > 0 || (q.side == 0 && *node == 0);
    span = right ? *node : *node - 1;
    local = right ? 0.0 : beam.spans[span].length;
    after = right;
    if (q.quantity == InfluenceRequest::Quantity::Reaction) {
      const SupportType t = beam.supports[*node].type;
      if (!restrains_deflection(t) && t != SupportType::Spring)
        return bad("node " + label_of(*node) + " has no vertical support, so no reaction");
    }
  }
  const double mark = node ? node_x[*node] : *q.x;

  // The stations: the beam file's, and a pair at a point that is none.
  const int per_span = stations_per_span > 0 ? stations_per_span : file.beam.stations_per_span;
  std::vector<Station> stations = build_stations(beam, per_span);
  if (!node) {
    const double L = beam.spans[span].length;
    bool found = false;
    for (auto& st : stations)
      if (st.span == span && std::abs(st.local - local) <= 1e-12 * L) { found = true; local = st.local; }
    if (!found) {
      auto it = std::find_if(stations.begin(), stations.end(),
                             [&](const Station& st) { return st.span > span || (st.span == span && st.local > local); });
      it = stations.insert(it, Station{*q.x, span, local, true});
      stations.insert(it, Station{*q.x, span, local, false});
    }
  }

  const std::string F = u.force.label, L = u.length.label;
  const std::string where = node ? (q.x ? "x = " + shown_number(u.length(*q.x)) + " " + L + " (node " + label_of(*node) + ")"
                                        : label_of(*node)) +
                                       (q.quantity == InfluenceRequest::Quantity::Moment ||
                                                q.quantity == InfluenceRequest::Quantity::Shear
                                            ? (*node == 0 || *node + 1 == nn ? std::string()
                                               : after ? std::string(", right side") : std::string(", left side"))
                                            : std::string())
                                 : "x = " + shown_number(u.length(*q.x)) + " " + L;
  d.title = std::string("Influence line: ") + quantity_word(q.quantity) + " at " + where;
  d.x_label = "position of the unit load x [" + L + "]";
  d.x_min = 0;
  d.x_max = total > 0 ? u.length(total) : 1;
  d.mark_x = u.length(mark);
  d.mark_text = where;

  // The sketch: supports, hinges and labels; no loads.
  for (std::size_t i = 0; i < nn; ++i) {
    SketchNode n;
    n.x = u.length(node_x[i]);
    n.label = label_of(i);
    const Support& s = beam.supports[i];
    n.type = s.type;
    n.hinge = s.hinge;
    n.rotational_spring = s.type == SupportType::Spring && s.kr > 0;
    d.nodes.push_back(std::move(n));
  }
  Panel sketch;
  sketch.kind = PanelKind::Sketch;
  Panel p;
  p.kind = PanelKind::Influence;
  double ordinate = 1;  // display value of an ordinate per file value
  switch (q.quantity) {
    case InfluenceRequest::Quantity::Moment:
      p.ylabel = "moment per unit load [" + u.moment.label + " per " + F + "]\nsagging +";
      ordinate = u.moment.factor / u.force.factor;
      break;
    case InfluenceRequest::Quantity::Shear:
      p.ylabel = "shear [per unit load]\nup +";
      break;
    case InfluenceRequest::Quantity::Deflection:
      p.ylabel = "deflection per unit load [" + u.deflection.label + " per " + F + "]\ndown +";
      ordinate = u.deflection.factor / u.force.factor;
      break;
    case InfluenceRequest::Quantity::Reaction:
      p.ylabel = "reaction [per unit load]\nup +";
      break;
  }

  input::MovingLoad unit;
  unit.name = "unit load";
  unit.points = {{1.0, 0.0}};
  constexpr int kPerPiece = 24;
  double largest = 0;
  for (std::size_t mi = 0; mi < methods.size(); ++mi) {
    const compare::Method& m = *methods[mi];
    compare::MethodResult r;
    r.name = m.name;
    std::shared_ptr<compare::MovingModel> model;
    try {
      model = compare::MovingModel::build(m, beam, stations, unit, 1.0, r);
    } catch (const std::exception& e) {
      r.status = MethodStatus::Failed;
      r.reason = e.what();
    }
    if (!model) {
      d.notes.push_back(m.name + ": " + method_status_name(r.status) + (r.reason.empty() ? "" : " (" + r.reason + ")") +
                        ", not drawn");
      continue;
    }
    const std::vector<double> line =
        q.quantity == InfluenceRequest::Quantity::Reaction
            ? model->reaction_influence(*node)
            : model->influence(span, local, after,
                               q.quantity == InfluenceRequest::Quantity::Moment  ? compare::MovingModel::kMoment
                               : q.quantity == InfluenceRequest::Quantity::Shear ? compare::MovingModel::kShear
                                                                                 : compare::MovingModel::kDeflection);
    Curve c;
    c.method = c.label = m.name;
    c.style = mi;
    bool finite = true;
    for (const auto& pc : model->pieces()) {
      if (!(pc.x1 > pc.x0)) continue;
      for (int k = 0; k <= kPerPiece; ++k) {
        const double x = k == kPerPiece ? pc.x1 : pc.x0 + (pc.x1 - pc.x0) * k / kPerPiece;
        const double v = ordinate * model->influence_value(line, x, k == 0);
        finite = finite && std::isfinite(v);
        c.x.push_back(u.length(x));
        c.y.push_back(v);
        largest = std::max(largest, std::abs(v));
      }
    }
    if (!finite) {
      d.notes.push_back(m.name + ": a value of its influence line is not finite, not drawn");
      continue;
    }
    p.curves.push_back(std::move(c));
  }
  // How far apart the methods' lines are (each point against the first
  // method's), relative to the largest ordinate.
  double diff = 0;
  for (std::size_t k = 1; k < p.curves.size(); ++k)
    if (p.curves[k].y.size() == p.curves[0].y.size())
      for (std::size_t i = 0; i < p.curves[k].y.size(); ++i)
        diff = std::max(diff, std::abs(p.curves[k].y[i] - p.curves[0].y[i]));
  char agree[96] = "";
  if (p.curves.size() >= 2)
    std::snprintf(agree, sizeof agree, "  |  methods differ by %.1e of the largest ordinate",
                  largest > 0 ? diff / largest : diff);
  d.subtitle = file.beam.title.empty() ? file.path : file.beam.title;
  d.combination = std::string("a unit downward load anywhere on the beam") + agree;
  if (p.curves.empty()) d.notes.push_back("no method gave an influence line");
  d.panels.push_back(std::move(sketch));
  d.panels.push_back(std::move(p));
  if (error) error->clear();
  return d;
}

// ---------------------------------------------------------------------------
// Thinning.

double text_width(std::size_t chars, double size) { return 0.66 * size * static_cast<double>(chars) + 2.0; }

std::vector<std::optional<std::pair<double, double>>> place_labels(const std::vector<LabelWish>& wishes,
                                                                   const LabelBox& area, std::vector<LabelBox> taken) {
  std::vector<std::optional<std::pair<double, double>>> out(wishes.size());
  for (std::size_t i = 0; i < wishes.size(); ++i) {
    const LabelWish& w = wishes[i];
    if (!(std::isfinite(w.ax) && std::isfinite(w.ay) && w.w > 0 && w.h > 0)) continue;
    const double near = 0.5 * w.h + 4, line = w.h + 2;
    const double s = w.up ? -1 : 1;  // y grows downward
    // Centres to try, best first: the side asked for, a line further out,
    // the other side, two lines out, and beside the point.
    const std::pair<double, double> tries[] = {
        {w.ax, w.ay + s * near},           {w.ax, w.ay + s * (near + line)}, {w.ax, w.ay - s * near},
        {w.ax, w.ay + s * (near + 2 * line)}, {w.ax, w.ay - s * (near + line)},
        {w.ax + 0.5 * w.w + 6, w.ay},      {w.ax - 0.5 * w.w - 6, w.ay}};
    for (auto [cx, cy] : tries) {
      // Kept inside the panel sideways (a label at the beam's end).
      cx = std::clamp(cx, area.x0 + 0.5 * w.w, std::max(area.x0 + 0.5 * w.w, area.x1 - 0.5 * w.w));
      const LabelBox b{cx - 0.5 * w.w, cy - 0.5 * w.h, cx + 0.5 * w.w, cy + 0.5 * w.h};
      if (b.y0 < area.y0 || b.y1 > area.y1) continue;
      if (std::any_of(taken.begin(), taken.end(), [&](const LabelBox& t) { return t.overlaps(b); })) continue;
      taken.push_back(b);
      out[i] = std::make_pair(cx, cy);
      break;
    }
  }
  return out;
}

std::vector<std::size_t> thin_indices(const std::vector<double>& x, const std::vector<double>& y,
                                      std::size_t max_points) {
  const std::size_t n = std::min(x.size(), y.size());
  std::vector<std::size_t> all(n);
  for (std::size_t i = 0; i < n; ++i) all[i] = i;
  if (max_points == 0 || n <= max_points || n <= 2) return all;
  double xr = 0, yr = 0;
  {
    auto [xa, xb] = std::minmax_element(x.begin(), x.begin() + static_cast<std::ptrdiff_t>(n));
    auto [ya, yb] = std::minmax_element(y.begin(), y.begin() + static_cast<std::ptrdiff_t>(n));
    xr = *xb - *xa;
    yr = *yb - *ya;
  }
  std::vector<char> keep(n, 0);
  keep[0] = keep[n - 1] = 1;
  std::size_t lo = 0, hi = 0;
  for (std::size_t i = 0; i < n; ++i) {
    if (y[i] < y[lo]) lo = i;
    if (y[i] > y[hi]) hi = i;
  }
  keep[lo] = keep[hi] = 1;
  for (std::size_t i = 0; i + 1 < n; ++i)
    if (std::abs(x[i + 1] - x[i]) <= 1e-12 * xr && std::abs(y[i + 1] - y[i]) > 1e-12 * yr) keep[i] = keep[i + 1] = 1;
  std::size_t mandatory = 0;
  for (char k : keep) mandatory += k ? 1 : 0;
  // The rest of the budget: the smallest and largest of each run of points.
  if (max_points > mandatory + 1) {
    const std::size_t runs = std::max<std::size_t>(1, (max_points - mandatory) / 2);
    for (std::size_t r = 0; r < runs; ++r) {
      const std::size_t a = r * n / runs, b = std::min(n, (r + 1) * n / runs);
      if (a >= b) continue;
      std::size_t rl = a, rh = a;
      for (std::size_t i = a; i < b; ++i) {
        if (y[i] < y[rl]) rl = i;
        if (y[i] > y[rh]) rh = i;
      }
      keep[rl] = keep[rh] = 1;
    }
  }
  std::vector<std::size_t> out;
  for (std::size_t i = 0; i < n; ++i)
    if (keep[i]) out.push_back(i);
  return out;
}

PlotData thinned(const PlotData& data, std::size_t max_points) {
  PlotData d = data;
  if (max_points == 0) return d;
  for (auto& p : d.panels)
    for (auto& c : p.curves) {
      const auto idx = thin_indices(c.x, c.y, max_points);
      if (idx.size() == c.x.size()) continue;
      std::vector<double> nx, ny;
      nx.reserve(idx.size());
      ny.reserve(idx.size());
      for (std::size_t i : idx) {
        nx.push_back(c.x[i]);
        ny.push_back(c.y[i]);
      }
      c.x = std::move(nx);
      c.y = std::move(ny);
    }
  return d;
}

std::optional<ImageFormat> format_for_path(const std::string& path) {
  auto ends = [&](const char* ext) {
    const std::size_t n = std::char_traits<char>::length(ext);
    if (path.size() < n) return false;
    for (std::size_t i = 0; i < n; ++i)
      if (std::tolower(static_cast<unsigned char>(path[path.size() - n + i])) != ext[i]) return false;
    return true;
  };
  if (ends(".svg")) return ImageFormat::Svg;
  if (ends(".png")) return ImageFormat::Png;
  return std::nullopt;
}

// ---------------------------------------------------------------------------
// Rendering.

namespace {

bool executable(const std::string& p) { return !p.empty() && ::access(p.c_str(), X_OK) == 0; }

std::string shell_quote(const std::string& s) {
  std::string r = "'";
  for (char c : s) {
    if (c == '\'') r += "'\\''";
    else r += c;
  }
  return r + "'";
}

// A gnuplot double-quoted string.
std::string gq(const std::string& s) {
  std::string r = "\"";
  for (char c : s) {
    if (c == '\\') r += "\\\\";
    else if (c == '"') r += "\\\"";
    else if (c == '\n') r += "\\n";
    else if (c == '\r' || c == '\t') r += ' ';
    else r += c;
  }
  return r + "\"";
}

std::string num(double v) {
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.10g", v);
  return buf;
}

// Method styles: colour, width, dash. Distinct in luminance and in dash
// pattern, so they part in greyscale too.
struct Style {
  const char* color;
  const char* width;
  const char* dash;
};
constexpr Style kStyles[] = {
    {"#111111", "2.4", "solid"},
    {"#2b63b0", "1.9", "(9,5)"},
    {"#d9822b", "1.9", "(2,4)"},
    {"#4f8a3c", "1.7", "(12,4,2,4)"},
    {"#8a3c7a", "1.7", "(4,3)"},
};
constexpr std::size_t kStyleCount = sizeof kStyles / sizeof kStyles[0];

int kind_point(Kind k) {
  switch (k) {
    case Kind::Shear: return 4;       // open square
    case Kind::Moment: return 6;      // open circle
    default: return 8;                // open triangle
  }
}

// The sketch: y is in pixels of the panel (beam at 0, up +), x in beam
// units; `upx` is beam units per pixel.
struct Sketch {
  std::ostream& o;
  double upx;
  int obj = 1;
  const char* ink = "#222222";

  void line(double x0, double y0, double x1, double y1, double lw = 1.2, const char* color = nullptr) {
    o << "set arrow from first " << num(x0) << ",first " << num(y0) << " to first " << num(x1) << ",first " << num(y1)
      << " nohead lw " << lw << " lc rgb \"" << (color ? color : ink) << "\" front\n";
  }
  void arrow(double x0, double y0, double x1, double y1, double lw = 1.3) {
    o << "set arrow from first " << num(x0) << ",first " << num(y0) << " to first " << num(x1) << ",first " << num(y1)
      << " head filled size first " << num(7 * upx) << ",22,60 lw " << lw << " lc rgb \"" << ink << "\" front\n";
  }
  void poly(const std::vector<std::pair<double, double>>& pts, const char* fill, double lw = 1.2) {
    o << "set object " << obj++ << " polygon from ";
    for (std::size_t i = 0; i <= pts.size(); ++i) {
      const auto& p = pts[i % pts.size()];
      o << (i ? " to " : "") << "first " << num(p.first) << ",first " << num(p.second);
    }
    o << " front fc rgb \"" << fill << "\" fs solid 1.0 border lc rgb \"" << ink << "\" lw " << lw << "\n";
  }
  void circle(double x, double y, double rpx, const char* fill) {
    o << "set object " << obj++ << " circle at first " << num(x) << ",first " << num(y) << " size first " << num(rpx * upx)
      << " front fc rgb \"" << fill << "\" fs solid 1.0 border lc rgb \"" << ink << "\" lw 1.2\n";
  }
  void arc(double x, double y, double rpx, double a0, double a1) {
    o << "set object " << obj++ << " circle at first " << num(x) << ",first " << num(y) << " size first " << num(rpx * upx)
      << " arc [" << a0 << ":" << a1 << "] front fs empty border lc rgb \"" << ink << "\" lw 1.4 nowedge\n";
  }
  void text(double x, double y, const std::string& s, const char* align = "center", int size = 8,
            const char* color = nullptr) {
    o << "set label " << gq(s) << " at first " << num(x) << ",first " << num(y) << " " << align << " front font \","
      << size << "\" textcolor rgb \"" << (color ? color : ink) << "\" noenhanced\n";
  }
  // Short diagonal strokes under a ground line from x0 to x1 (pixels
  // relative to x) at height y.
  void ground(double x, double px0, double px1, double y) {
    line(x + px0 * upx, y, x + px1 * upx, y, 1.2);
    for (double p = px0 + 2; p <= px1; p += 5) line(x + p * upx, y, x + (p - 5) * upx, y - 5, 0.8);
  }
};

struct Layout {
  int W = 960, H = 1100;
  double left = 100, right = 200, top = 50, bottom = 56, gap = 10;
  double sketch_h = 180;
  double panel_h = 200;
  double fx(double px) const { return px / W; }
  double fy(double px_from_top) const { return 1.0 - px_from_top / H; }
};

}  // namespace

std::optional<std::string> find_gnuplot(const std::string& preferred) {
  std::string want = preferred;
  if (want.empty()) {
    const char* env = std::getenv("TRIVET_GNUPLOT");
    if (env && *env) want = env;
  }
  if (want.empty()) want = "gnuplot";
  if (want.find('/') != std::string::npos) {
    if (executable(want)) return want;
    return std::nullopt;
  }
  const char* path = std::getenv("PATH");
  std::string p = path ? path : "/usr/local/bin:/usr/bin:/bin";
  std::size_t start = 0;
  while (start <= p.size()) {
    std::size_t end = p.find(':', start);
    if (end == std::string::npos) end = p.size();
    std::string dir = p.substr(start, end - start);
    if (dir.empty()) dir = ".";
    const std::string cand = dir + "/" + want;
    if (executable(cand)) return cand;
    start = end + 1;
  }
  return std::nullopt;
}

namespace {

// The script: settings, then the data of each panel through
// gnuplot-iostream, written to a file that gnuplot then runs.
void write_script(Gnuplot& gp, const PlotData& d, const RenderOptions& opt, const std::string& out_path) {
  Layout lay;
  lay.W = std::max(320, opt.width);
  lay.H = std::max(400, opt.height);
  lay.right = std::clamp(lay.W * 0.2, 150.0, 230.0);
  lay.left = 136;
  // Text in lines of at most `width` characters, broken between words.
  auto wrap = [](const std::string& text, std::size_t width) {
    std::vector<std::string> lines;
    std::istringstream words(text);
    std::string w, line;
    while (words >> w) {
      if (!line.empty() && line.size() + 1 + w.size() > width) {
        lines.push_back(line);
        line.clear();
      }
      line += (line.empty() ? "" : " ") + w;
    }
    if (!line.empty()) lines.push_back(line);
    return lines;
  };
  // The combination under the title, in lines that fit the picture (a
  // 9-point character is up to about 6.5 pixels wide in a PNG).
  const std::vector<std::string> combination_lines =
      wrap(d.combination, static_cast<std::size_t>(std::max(30.0, lay.W / 7.2)));
  lay.top += 14 * static_cast<double>(combination_lines.size()) + (combination_lines.empty() ? 0 : 2);
  // The caution at the foot, in lines of about a picture's width.
  const std::vector<std::string> caution_lines = wrap(d.caution, static_cast<std::size_t>(std::max(40, lay.W / 5)));
  if (!caution_lines.empty()) lay.bottom += 8 + 12 * static_cast<double>(caution_lines.size());
  if (d.envelope) lay.right = std::min(lay.right + 40, 0.3 * lay.W);  // "slope-deflection max/min"

  // The sketch's height in pixels: loads stacked above the beam, the
  // supports, labels and reaction values below.
  std::vector<std::size_t> layer(d.loads.size(), 0);
  std::size_t layers = 0;
  {
    std::vector<double> layer_end;
    std::vector<std::size_t> order;
    for (std::size_t i = 0; i < d.loads.size(); ++i)
      if (d.loads[i].type == LoadType::Udl || d.loads[i].type == LoadType::Linear) order.push_back(i);
    std::sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) { return d.loads[a].x0 < d.loads[b].x0; });
    const double eps = 1e-9 * (d.x_max - d.x_min);
    for (std::size_t i : order) {
      std::size_t k = 0;
      while (k < layer_end.size() && layer_end[k] > d.loads[i].x0 + eps) ++k;
      if (k == layer_end.size()) layer_end.push_back(d.loads[i].x1);
      else layer_end[k] = d.loads[i].x1;
      layer[i] = k;
    }
    layers = layer_end.size();
  }
  bool any_point = false;
  for (const auto& l : d.loads) any_point = any_point || (l.type != LoadType::Udl && l.type != LoadType::Linear);
  const double span = d.x_max - d.x_min;
  const double xlo = d.x_min - 0.035 * span, xhi = d.x_max + 0.035 * span;
  const double plot_w = lay.W - lay.left - lay.right;
  const double upx = (xhi - xlo) / plot_w;
  // The lines under each support (its reaction and settlement, then its
  // claims and the other program's values, 7-point text): a node's lines
  // go in consecutive rows from the first row where none of them would
  // overlap a line of a node to its left (supports close together).
  const bool many_nodes = d.nodes.size() > 40;
  const std::size_t label_every = many_nodes ? (d.nodes.size() + 39) / 40 : 1;
  struct NodeLine {
    std::size_t node = 0;
    std::string text, color;
    std::size_t row = 0;
  };
  std::vector<NodeLine> node_lines;
  std::size_t rows_used = 1;
  {
    std::vector<std::pair<LabelBox, std::size_t>> placed;  // (box in pixels along x, row)
    for (std::size_t i = 0; i < d.nodes.size(); ++i) {
      if (!(i % label_every == 0 || i + 1 == d.nodes.size())) continue;
      const SketchNode& n = d.nodes[i];
      std::vector<NodeLine> lines;
      std::string r = n.reaction;
      if (std::abs(n.settlement) > 0) {
        char sb[48];
        std::snprintf(sb, sizeof sb, "%.3g", n.settlement);
        r += std::string(r.empty() ? "" : "; ") + "settles " + sb + (n.settlement_unit.empty() ? "" : " " + n.settlement_unit);
      }
      // Without a reaction line the claims start one row down, as always.
      if (!many_nodes) lines.push_back({i, r, "#333333", 0});
      for (const auto& c : n.claims) lines.push_back({i, c, "#555555", 0});
      for (const auto& c : n.others)
        lines.push_back({i, c, c.find("(fails)") != std::string::npos ? "#c2410c" : "#6a3d9a", 0});
      const double xp = (n.x - xlo) / upx;
      auto box = [&](const std::string& t) {
        const double w = text_width(t.size(), 7);
        return LabelBox{xp - 0.5 * w - 3, 0, xp + 0.5 * w + 3, 1};
      };
      std::size_t first = 0;
      for (bool clash = true; clash && first < 8; ) {
        clash = false;
        for (std::size_t k = 0; k < lines.size() && !clash; ++k) {
          if (lines[k].text.empty()) continue;
          const LabelBox b = box(lines[k].text);
          for (const auto& [pb, row] : placed)
            if (row == first + k && pb.overlaps(b)) clash = true;
        }
        if (clash) ++first;
      }
      for (std::size_t k = 0; k < lines.size(); ++k) {
        lines[k].row = first + k;
        if (lines[k].text.empty()) continue;
        placed.push_back({box(lines[k].text), lines[k].row});
        rows_used = std::max(rows_used, lines[k].row + 1);
        node_lines.push_back(lines[k]);
      }
    }
  }
  const double layer_h = 30;
  const double loads_top = 8 + layers * layer_h + (any_point ? 34 : 0) + 6;
  const double below = 54 + 12 * static_cast<double>(rows_used);
  lay.sketch_h = std::max(0.16 * lay.H, loads_top + below + 8);
  const std::size_t data_panels = d.panels.size() > 0 ? d.panels.size() - 1 : 0;
  lay.panel_h = (lay.H - lay.top - lay.bottom - lay.sketch_h - lay.gap * static_cast<double>(data_panels)) /
                std::max<std::size_t>(1, data_panels);
  if (lay.panel_h < 60) lay.panel_h = 60;


  if (opt.format == ImageFormat::Svg)
    gp << "set terminal svg size " << lay.W << "," << lay.H << " font \"sans,10\" noenhanced background rgb \"white\"\n";
  else
    gp << "set terminal pngcairo size " << lay.W << "," << lay.H << " font \"sans,10\" noenhanced background rgb \"white\"\n";
  gp << "set encoding utf8\n";
  gp << "set output " << gq(out_path) << "\n";
  for (std::size_t i = 0; i < kStyleCount; ++i)
    gp << "set style line " << i + 1 << " lc rgb \"" << kStyles[i].color << "\" lw " << kStyles[i].width << " dt "
       << kStyles[i].dash << "\n";
  gp << "set style line 21 lc rgb \"#1d7a34\" lw 2 pt 6 ps 1.9\n";   // claim holds: open circle
  gp << "set style line 22 lc rgb \"#b3122e\" lw 2.4 pt 2 ps 2.1\n"; // claim fails: cross
  gp << "set style line 23 lc rgb \"#6a3d9a\" lw 1.6 pt 12 ps 1.5\n";  // other program, holds: open diamond
  gp << "set style line 24 lc rgb \"#c2410c\" lw 1.6 pt 13 ps 1.5\n";  // other program, fails: filled diamond
  gp << "set multiplot\n";
  gp << "set xrange [" << num(xlo) << ":" << num(xhi) << "]\n";
  gp << "set lmargin at screen " << num(lay.fx(lay.left)) << "\n";
  gp << "set rmargin at screen " << num(lay.fx(lay.W - lay.right)) << "\n";

  double y_px = lay.top;
  // Title.
  std::string title = d.title;
  const std::size_t fit = static_cast<std::size_t>(lay.W / 9.5);
  if (title.size() > fit) {
    std::size_t cut = fit - 3;
    while (cut > 0 && (static_cast<unsigned char>(title[cut]) & 0xC0) == 0x80) --cut;  // whole UTF-8 characters
    title = title.substr(0, cut) + "...";
  }
  gp << "set label 9001 " << gq(title) << " at screen 0.5, screen " << num(lay.fy(18))
     << " center font \",13\" noenhanced\n";
  std::string subtitle = d.subtitle;
  const std::size_t sub_fit = static_cast<std::size_t>(lay.W / 6.2);  // about a 9-point character's width
  if (subtitle.size() > sub_fit) {
    std::size_t cut = sub_fit - 3;
    while (cut > 0 && (static_cast<unsigned char>(subtitle[cut]) & 0xC0) == 0x80) --cut;
    subtitle = subtitle.substr(0, cut) + "...";
  }
  gp << "set label 9002 " << gq(subtitle) << " at screen 0.5, screen " << num(lay.fy(38))
     << " center font \",9\" textcolor rgb \"#444444\" noenhanced\n";
  for (std::size_t k = 0; k < combination_lines.size(); ++k)
    gp << "set label " << 9050 + k << " " << gq(combination_lines[k]) << " at screen 0.5, screen "
       << num(lay.fy(54 + 14 * static_cast<double>(k))) << " center font \",9\" textcolor rgb \"#222222\" noenhanced\n";

  for (std::size_t k = 0; k < caution_lines.size(); ++k)
    gp << "set label " << 9010 + k << " " << gq((k ? "" : "Caution: ") + caution_lines[k]) << " at screen 0.5, screen "
       << num(lay.fy(lay.H - 12.0 * static_cast<double>(caution_lines.size() - k) + 3)) << " center font \",7\" textcolor rgb \"#7a5600\" noenhanced\n";

  for (std::size_t pi = 0; pi < d.panels.size(); ++pi) {
    const Panel& p = d.panels[pi];
    const double h = p.kind == PanelKind::Sketch ? lay.sketch_h : lay.panel_h;
    gp << "set tmargin at screen " << num(lay.fy(y_px)) << "\n";
    gp << "set bmargin at screen " << num(lay.fy(y_px + h)) << "\n";
    const bool last = pi + 1 == d.panels.size();
    if (p.kind == PanelKind::Sketch) {
      gp << "unset border\nunset xtics\nunset ytics\nunset key\nunset grid\n";
      gp << "set yrange [" << num(-below) << ":" << num(h - below) << "]\n";
      std::ostringstream o;
      Sketch s{o, upx};
      // Spans.
      s.line(d.x_min, 0, d.x_max, 0, 4.0);
      for (std::size_t i = 0; i < d.nodes.size(); ++i) {
        const SketchNode& n = d.nodes[i];
        const double x = n.x;
        auto X = [&](double px) { return x + px * upx; };
        switch (n.type) {
          case SupportType::Pinned:
            s.poly({{x, -2}, {X(-9), -18}, {X(9), -18}}, "white");
            s.ground(x, -13, 13, -18);
            break;
          case SupportType::Roller:
            s.poly({{x, -2}, {X(-8), -14}, {X(8), -14}}, "white");
            s.circle(X(-4.5), -17, 2.6, "white");
            s.circle(X(4.5), -17, 2.6, "white");
            s.ground(x, -13, 13, -20);
            break;
          case SupportType::Fixed: {
            const int side = i == 0 ? -1 : (i + 1 == d.nodes.size() ? 1 : 0);
            if (side != 0) {
              s.line(x, -22, x, 22, 2.4);
              for (double yy = -20; yy <= 22; yy += 6) s.line(x, yy, X(side * 7), yy - 7, 0.8);
            } else {
              s.poly({{X(-7), -2}, {X(7), -2}, {X(7), -16}, {X(-7), -16}}, "#cccccc");
              s.ground(x, -13, 13, -16);
            }
            break;
          }
          case SupportType::Spring: {
            std::vector<std::pair<double, double>> z = {{x, -2}, {x, -6}};
            for (int k = 0; k < 6; ++k) z.emplace_back(X(k % 2 ? -6 : 6), -8 - 3 * k);
            z.emplace_back(x, -26);
            z.emplace_back(x, -29);
            for (std::size_t k = 0; k + 1 < z.size(); ++k) s.line(z[k].first, z[k].second, z[k + 1].first, z[k + 1].second, 1.2);
            s.ground(x, -11, 11, -29);
            if (n.rotational_spring) {
              s.arc(x, 0, 9, 200, 340);
              s.text(X(12), -10, "kr", "left", 7);
            }
            break;
          }
          case SupportType::Guided:
            s.line(X(-10), -25, X(-10), 4, 1.2);
            s.line(X(10), -25, X(10), 4, 1.2);
            s.poly({{X(-7), -3}, {X(7), -3}, {X(7), -17}, {X(-7), -17}}, "#dddddd");
            s.ground(x, -13, 13, -25);
            break;
          case SupportType::Free:
            break;
        }
        if (n.hinge) s.circle(x, 0, 4, "white");
        if (i % label_every == 0 || i + 1 == d.nodes.size()) s.text(x, -42, n.label, "center", 9);
      }
      for (const auto& l : node_lines)
        s.text(d.nodes[l.node].x, -55 - 12 * static_cast<double>(l.row), l.text, "center", 7, l.color.c_str());
      // Loads.
      double wmax = 0;
      for (const auto& l : d.loads)
        if (l.type == LoadType::Udl || l.type == LoadType::Linear) wmax = std::max({wmax, std::abs(l.v0), std::abs(l.v1)});
      const bool label_loads = d.loads.size() <= 30;
      for (std::size_t li = 0; li < d.loads.size(); ++li) {
        const SketchLoad& l = d.loads[li];
        if (l.type == LoadType::Udl || l.type == LoadType::Linear) {
          const double base = 6 + layer[li] * layer_h;
          auto hgt = [&](double w) { return wmax > 0 ? 3 + 15 * std::abs(w) / wmax : 3; };
          const double h0 = hgt(l.v0), h1 = hgt(l.v1);
          s.poly({{l.x0, base}, {l.x1, base}, {l.x1, base + h1}, {l.x0, base + h0}}, "#e6e6e6", 1.0);
          const double len_px = (l.x1 - l.x0) / upx;
          const int arrows = std::max(2, static_cast<int>(len_px / 22) + 1);
          for (int k = 0; k < arrows; ++k) {
            const double t = static_cast<double>(k) / (arrows - 1);
            const double xx = l.x0 + t * (l.x1 - l.x0);
            const double hh = h0 + t * (h1 - h0);
            const double w = l.v0 + t * (l.v1 - l.v0);
            if (hh > 5) {
              if (w >= 0) s.arrow(xx, base + hh, xx, base, 0.9);
              else s.arrow(xx, base, xx, base + hh, 0.9);
            }
          }
          if (label_loads) s.text(0.5 * (l.x0 + l.x1), base + std::max(h0, h1) + 6, l.text, "center", 7);
        } else if (l.type == LoadType::Point) {
          const double tail = loads_top - 10;
          // Labels of forces at the same place, one above the other.
          std::size_t same = 0;
          for (std::size_t k = 0; k < li; ++k)
            if (d.loads[k].type == LoadType::Point && std::abs(d.loads[k].x0 - l.x0) < 40 * upx) ++same;
          if (l.v0 >= 0) s.arrow(l.x0, tail, l.x0, 3, 1.6);
          else s.arrow(l.x0, 3, l.x0, tail, 1.6);
          if (label_loads) s.text(l.x0 + 3 * upx, tail + 2 - 10 * static_cast<double>(same), l.text, "left", 7);
        } else {  // couple: an arc round the point, the head showing its sense
          const double r = 12;
          s.arc(l.x0, 0, r, 30, 330);
          // Clockwise +: the head at the top end of the arc points right.
          const double ax = l.x0 + r * std::cos(30 * M_PI / 180) * upx;
          const double ay = r * std::sin(30 * M_PI / 180);
          const double bx = l.x0 + r * std::cos(-30 * M_PI / 180) * upx;
          const double by = -ay;
          if (l.v0 >= 0) s.arrow(l.x0 + r * std::cos(60 * M_PI / 180) * upx, r * std::sin(60 * M_PI / 180), ax, ay, 1.2);
          else s.arrow(l.x0 + r * std::cos(-60 * M_PI / 180) * upx, -r * std::sin(60 * M_PI / 180), bx, by, 1.2);
          if (label_loads) s.text(l.x0 + 3 * upx, r + 8, l.text + (l.v0 >= 0 ? " (clockwise)" : ""), "left", 7);
        }
      }
      gp << o.str();
      gp << "plot 1/0 notitle\n";
      gp << "unset arrow\nunset object\nunset label\n";
      gp << "set border 3 lc rgb \"#555555\"\nset xtics nomirror out\nset ytics nomirror out\n";
      gp << "set grid xtics ytics lc rgb \"#e2e2e2\" lw 0.6 dt 1\n";
      gp << "set xzeroaxis lt 1 lc rgb \"#888888\" lw 1\n";
    } else {
      // Range, with room for labels; drawn-down panels reversed.
      double lo = 0, hi = 0;
      for (const auto& c : p.curves)
        for (double v : c.y)
          if (std::isfinite(v)) { lo = std::min(lo, v); hi = std::max(hi, v); }
      // A claim far outside the results (5.72 claimed for a deflection of
      // 0.00572) does not rescale the axis and flatten the real curves: it
      // is drawn at the edge, with an arrow and its value.
      const double curve_lo = lo, curve_hi = hi;
      const double curve_span = std::max(curve_hi - curve_lo, 1e-300);
      auto on_scale = [&](double y) { return y >= curve_lo - 0.5 * curve_span && y <= curve_hi + 0.5 * curve_span; };
      for (const auto& c : p.claims)
        if (on_scale(c.y)) { lo = std::min(lo, c.y); hi = std::max(hi, c.y); }
      for (const auto& c : p.others)
        if (std::isfinite(c.y)) { lo = std::min(lo, c.y); hi = std::max(hi, c.y); }
      // The labelled extremes (found between stations too) stay inside their
      // panel: a label beyond the range would be drawn over the next one.
      for (const auto& l : p.labels)
        if (std::isfinite(l.y)) { lo = std::min(lo, l.y); hi = std::max(hi, l.y); }
      if (p.kind == PanelKind::Difference) {
        // Scaled to the agreement bound at least, so that rounding noise far
        // below it does not fill the panel; the bound drawn, and said when
        // every difference is within it.
        const double a = d.agreement > 0 ? d.agreement : 1e-6;
        const double worst = std::max(std::abs(lo), std::abs(hi));
        const double m = std::max({worst, a, 1e-16});
        lo = -1.25 * m;
        hi = 1.25 * m;
        gp << "set format y \"%.0e\"\n";
        for (double b : {a, -a})
          gp << "set arrow from graph 0, first " << num(b) << " to graph 1, first " << num(b)
             << " nohead back lc rgb \"#b03030\" lw 1 dt (6,4)\n";
        char text[96];
        if (worst <= a) std::snprintf(text, sizeof text, "all within %.0e (the agreement bound, dashed)", a);
        else std::snprintf(text, sizeof text, "largest %.1e: beyond the agreement bound %.0e (dashed)", worst, a);
        gp << "set label 9101 " << gq(text) << " at graph 0.01, graph 0.93 left front font \",8\" textcolor rgb \"#222222\" noenhanced\n";
      } else {
        double r = hi - lo;
        if (!(r > 0)) r = 1;
        lo -= 0.16 * r;
        hi += 0.16 * r;
        gp << "set format y \"%g\"\n";
      }
      if (p.drawn_down) gp << "set yrange [" << num(hi) << ":" << num(lo) << "]\n";
      else gp << "set yrange [" << num(lo) << ":" << num(hi) << "]\n";
      // Left of the tick labels, never over them (a covered minus sign would
      // turn hogging into sagging for the reader).
      gp << "set ylabel " << gq(p.ylabel) << " offset -2.5,0 font \",9\"\n";
      if (last) gp << "set format x \"%g\"\nset xlabel " << gq(d.x_label) << "\n";
      else gp << "set format x \"\"\nunset xlabel\n";
      gp << "set key at screen " << num(lay.fx(lay.W - lay.right + 14)) << ", screen " << num(lay.fy(y_px))
         << " left top Left reverse samplen 3.2 spacing 1.05 font \",8\" noenhanced\n";
      // Node lines, to read the diagrams against the sketch.
      if (d.nodes.size() <= 60)
        for (const auto& n : d.nodes)
          gp << "set arrow from first " << num(n.x) << ", graph 0 to first " << num(n.x)
             << ", graph 1 nohead back lc rgb \"#c8c8c8\" lw 0.8 dt (3,3)\n";
      // The point of an influence line.
      if (d.mark_x) {
        gp << "set arrow from first " << num(*d.mark_x) << ", graph 0 to first " << num(*d.mark_x)
           << ", graph 1 nohead back lc rgb \"#b03030\" lw 1.2 dt (6,3)\n";
        gp << "set label " << gq(d.mark_text) << " at first " << num(*d.mark_x)
           << ", graph 0.96 left offset 0.6,0 front font \",8\" textcolor rgb \"#b03030\" noenhanced\n";
      }
      // Pixels of this panel (y down), for the labels' boxes.
      auto px_x = [&](double x) { return lay.left + (x - xlo) / (xhi - xlo) * plot_w; };
      auto px_y = [&](double y) {
        const double t = (y - lo) / (hi - lo);
        return p.drawn_down ? y_px + t * h : y_px + h - t * h;
      };
      std::vector<LabelBox> taken;
      if (d.mark_x) taken.push_back({px_x(*d.mark_x), y_px, px_x(*d.mark_x) + 10 + text_width(d.mark_text.size(), 8), y_px + 0.1 * h});
      if (p.kind == PanelKind::Difference) taken.push_back({lay.left, y_px, lay.left + 0.01 * plot_w + text_width(60, 8), y_px + 0.1 * h});
      // Where each claim is drawn: at its value, or at the edge it is beyond.
      std::vector<double> claim_y;
      for (const auto& c : p.claims) {
        double y = c.y;
        std::string text = c.text;
        if (!(y >= lo && y <= hi)) {
          const bool above = y > hi;
          const double edge = above ? hi : lo, back = 0.1 * (hi - lo) * (above ? -1 : 1);
          char value[48];
          std::snprintf(value, sizeof value, "%.4g", c.y);
          text += std::string(" = ") + value + " (off scale)";
          gp << "set arrow from first " << num(c.x) << ", first " << num(edge + back) << " to first " << num(c.x)
             << ", first " << num(edge) << " head size screen 0.008,25 front lw 1.2 lc rgb \""
             << (c.holds ? "#1d7a34" : "#b3122e") << "\"\n";
          y = edge + back;
        }
        claim_y.push_back(y);
        gp << "set label " << gq(text) << " at first " << num(c.x) << ",first " << num(y)
           << " left offset 1.2,0.2 front font \",7\" textcolor rgb \"" << (c.holds ? "#1d7a34" : "#b3122e")
           << "\" noenhanced\n";
        // (offset 1.2 characters of the 10-point font: about 7 px)
        taken.push_back({px_x(c.x) + 6, px_y(y) - 8, px_x(c.x) + 8 + text_width(text.size(), 7), px_y(y) + 2});
      }
      // The values, where they do not cover each other or a claim's text.
      {
        std::vector<LabelWish> wishes;
        for (std::size_t li = 0; li < p.labels.size(); ++li) {
          const ValueLabel& l = p.labels[li];
          LabelWish w{px_x(l.x), px_y(l.y), text_width(l.text.size(), 8), 10, p.drawn_down ? l.y < 0 : l.y >= 0};
          // The same text within its own width of an earlier one: said once.
          for (std::size_t k = 0; k < li; ++k)
            if (p.labels[k].text == l.text && std::abs(wishes[k].ax - w.ax) < w.w && std::abs(wishes[k].ay - w.ay) < w.h)
              w.w = 0;  // left out
          wishes.push_back(w);
        }
        const auto spots = place_labels(wishes, {lay.left, y_px, lay.W - lay.right, y_px + h}, taken);
        for (std::size_t li = 0; li < p.labels.size(); ++li) {
          if (!spots[li]) continue;
          gp << "set label " << gq(p.labels[li].text) << " at screen " << num(lay.fx(spots[li]->first)) << ", screen "
             << num(lay.fy(spots[li]->second)) << " center front font \",8\" textcolor rgb \"#222222\" noenhanced\n";
        }
      }
      std::vector<std::vector<std::pair<double, double>>> series;
      std::vector<std::string> specs;
      for (const auto& c : p.curves) {
        std::vector<std::pair<double, double>> pts;
        pts.reserve(c.x.size());
        for (std::size_t i = 0; i < c.x.size() && i < c.y.size(); ++i) pts.emplace_back(c.x[i], c.y[i]);
        if (pts.empty()) continue;
        std::string spec = "'-' with ";
        const std::size_t ls = c.style % kStyleCount + 1;
        if (c.kind) {
          const std::size_t every = std::max<std::size_t>(1, pts.size() / 10);
          spec += "linespoints ls " + std::to_string(ls) + " pt " + std::to_string(kind_point(*c.kind)) +
                  " ps 0.8 pi " + std::to_string(every);
        } else {
          spec += "lines ls " + std::to_string(ls);
        }
        // The difference panel's legend: one entry per method and one per
        // quantity, added below, not one per curve.
        spec += c.kind || c.limit == Limit::Min ? std::string(" notitle") : " title " + gq(c.label);
        specs.push_back(spec);
        series.push_back(std::move(pts));
      }
      for (int holds = 1; holds >= 0; --holds) {
        std::vector<std::pair<double, double>> pts;
        for (std::size_t ci = 0; ci < p.claims.size(); ++ci)
          if (p.claims[ci].holds == (holds == 1)) pts.emplace_back(p.claims[ci].x, claim_y[ci]);
        if (pts.empty()) continue;
        specs.push_back(std::string("'-' with points ls ") + (holds ? "21" : "22") + " title " +
                        gq(holds ? "claim (holds)" : "claim (fails)"));
        series.push_back(std::move(pts));
      }
      for (int holds = 1; holds >= 0; --holds) {
        std::vector<std::pair<double, double>> pts;
        for (const auto& c : p.others)
          if (c.holds == (holds == 1) && std::isfinite(c.y)) pts.emplace_back(c.x, c.y);
        if (pts.empty()) continue;
        specs.push_back(std::string("'-' with points ls ") + (holds ? "23" : "24") + " title " +
                        gq(holds ? "other program (holds)" : "other program (fails)"));
        series.push_back(std::move(pts));
      }
      std::vector<std::string> dummies;  // legend entries with no data
      if (p.kind == PanelKind::Difference && !series.empty()) {
        std::vector<std::size_t> seen;
        for (const auto& c : p.curves)
          if (std::find(seen.begin(), seen.end(), c.style) == seen.end()) {
            seen.push_back(c.style);
            dummies.push_back("1/0 with lines ls " + std::to_string(c.style % kStyleCount + 1) + " title " +
                              gq(c.limit == Limit::None ? c.method : c.method + " max/min"));
          }
        for (Kind k : {Kind::Shear, Kind::Moment, Kind::Deflection})
          dummies.push_back("1/0 with points pt " + std::to_string(kind_point(k)) +
                            " ps 0.9 lc rgb \"#444444\" title " + gq(kind_name(k)));
      }
      if (series.empty()) {
        gp << "set label 9100 \"nothing to draw\" at graph 0.5, graph 0.5 center\n";
        gp << "plot 1/0 notitle\n";
      } else {
        gp << "plot ";
        for (std::size_t i = 0; i < specs.size(); ++i) gp << (i ? ", \\\n  " : "") << specs[i];
        for (const auto& dm : dummies) gp << ", \\\n  " << dm;
        gp << "\n";
        for (const auto& s : series) gp.send1d(s);
      }
      gp << "unset arrow\nunset label\n";
    }
    y_px += h + lay.gap;
  }
  gp << "unset multiplot\nset output\n";
  gp.flush();
}

std::string read_all(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  return std::string(std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>());
}

}  // namespace

std::string render(const PlotData& data, ImageFormat format, int width, int height, std::string* error) {
  RenderOptions o;
  o.format = format;
  o.width = width;
  o.height = height;
  return render(data, o, error);
}

std::string render(const PlotData& data, const RenderOptions& options, std::string* error) {
  auto fail = [&](const std::string& why) {
    if (error) *error = why;
    return std::string();
  };
  if (data.panels.empty())
    return fail("nothing to plot" + (data.notes.empty() ? std::string() : ": " + data.notes.front()));
  const auto gnuplot = find_gnuplot(options.gnuplot);
  if (!gnuplot)
    return fail("gnuplot was not found (looked for " +
                (options.gnuplot.empty() ? std::string("TRIVET_GNUPLOT or gnuplot on PATH") : options.gnuplot) +
                "); install it, e.g. apt-get install gnuplot-nox");
  const char* tmp = std::getenv("TMPDIR");
  std::string dir_template = std::string(tmp && *tmp ? tmp : "/tmp") + "/trivet-plot-XXXXXX";
  std::vector<char> buf(dir_template.begin(), dir_template.end());
  buf.push_back('\0');
  if (!::mkdtemp(buf.data())) return fail("cannot make a temporary directory under " + dir_template);
  const std::string dir = buf.data();
  const std::string script = dir + "/plot.gp";
  const std::string out = dir + (options.format == ImageFormat::Svg ? "/plot.svg" : "/plot.png");
  const std::string err = dir + "/gnuplot.err";
  auto cleanup = [&] {
    std::remove(script.c_str());
    std::remove(out.c_str());
    std::remove(err.c_str());
    ::rmdir(dir.c_str());
  };
  try {
    Gnuplot gp(">" + script);
    write_script(gp, data, options, out);
  } catch (const std::exception& e) {
    cleanup();
    return fail(std::string("cannot write the gnuplot script: ") + e.what());
  }
  if (!options.keep_script.empty()) {
    std::ofstream keep(options.keep_script, std::ios::binary);
    keep << read_all(script);
  }
  const std::string cmd = shell_quote(*gnuplot) + " " + shell_quote(script) + " </dev/null >/dev/null 2>" + shell_quote(err);
  const int status = std::system(cmd.c_str());
  std::string image = read_all(out);
  std::string messages = read_all(err);
  cleanup();
  const bool exited_ok = status != -1 && WIFEXITED(status) && WEXITSTATUS(status) == 0;
  if (!exited_ok || image.empty()) {
    if (messages.size() > 2000) messages = messages.substr(0, 2000) + "...";
    return fail("gnuplot failed (" + *gnuplot + ")" + (messages.empty() ? std::string() : ": " + messages));
  }
  if (options.format == ImageFormat::Svg && image.find("</svg>") == std::string::npos)
    return fail("gnuplot wrote an incomplete SVG");
  if (options.format == ImageFormat::Svg) {
    // The picture's title is the beam's, not the plotting program's name.
    const std::string generic = "<title>Gnuplot</title>";
    if (const auto at = image.find(generic); at != std::string::npos) {
      std::string t;
      for (char c : data.title + (data.subtitle.empty() ? std::string() : " - " + data.subtitle)) {
        switch (c) {
          case '&': t += "&amp;"; break;
          case '<': t += "&lt;"; break;
          case '>': t += "&gt;"; break;
          case '"': t += "&quot;"; break;
          default: t += static_cast<unsigned char>(c) < 0x20 ? ' ' : c;
        }
      }
      image.replace(at, generic.size(), "<title>" + t + "</title>");
    }
  }
  return image;
}

}  // namespace trivet::reports
