// The full report (the contract's JSON), streamed with JsonWriter.
#include <algorithm>
#include <cmath>
#include <future>
#include <sstream>
#include <system_error>
#include <unordered_map>

#include "harness/compare/against.h"
#include "harness/precision/precision.h"
#include "reports/json_writer.h"
#include "reports/reports.h"

namespace trivet::reports {

using namespace trivet::compare;

void Summary::add(BeamStatus status, std::size_t failed_claims, std::size_t failed_limits) {
  ++beams;
  switch (status) {
    case BeamStatus::Agree: ++agree; break;
    case BeamStatus::Disagree: ++disagree; break;
    case BeamStatus::Unconfirmed: ++unconfirmed; break;
    case BeamStatus::Invalid: ++invalid; break;
  }
  claims_failed += failed_claims;
  limits_failed += failed_limits;
}

Summary summarize(const std::vector<Report>& beams) {
  Summary s;
  for (const auto& b : beams) s.add(b.status, b.claims_failed(), b.limits_failed());
  return s;
}

namespace {

// Writes elements 0..n-1 of the current array, element i by one(writer, i).
// A long array (a 100,000-span beam's stations) is formatted in blocks, two
// side by side, each by a writer of the same depth, and the blocks are
// written in order: the same bytes as one writer would make.
template <class One>
void elements(JsonWriter& w, std::size_t n, const One& one) {
  constexpr std::size_t kBlock = 8192;
  if (n < 4 * kBlock) {
    for (std::size_t i = 0; i < n; ++i) one(w, i);
    return;
  }
  std::string first, second;
  auto fill = [&](std::string& text, std::size_t from) {
    text.clear();
    JsonWriter sub(text, w.depth());
    for (std::size_t i = from, end = std::min(n, from + kBlock); i < end; ++i) one(sub, i);
  };
  for (std::size_t from = 0; from < n; from += 2 * kBlock) {
    std::future<void> other;
    if (from + kBlock < n) {
      try {
        other = std::async(std::launch::async, [&, from] { fill(second, from + kBlock); });
      } catch (const std::system_error&) {
        fill(second, from + kBlock);  // no thread to be had: in turn
      }
    }
    fill(first, from);
    w.raw_element(first);
    if (from + kBlock < n) {
      if (other.valid()) other.get();
      w.raw_element(second);
    }
  }
}

void optional_number(JsonWriter& w, std::string_view k, const std::optional<double>& v) {
  w.key(k);
  if (v) w.value(*v);
  else w.null();
}

void governs_object(JsonWriter& w, const Governs& g, const input::Combination& c) {
  w.begin_object(true);
  if (!c.pattern.empty()) {
    w.key("loaded_spans");
    w.begin_array(true);
    for (auto sp : g.spans) w.value(static_cast<std::size_t>(sp) + 1);
    w.end_array();
    if (!g.spans_other_factor.empty()) {
      w.key("spans_with_other_factor");
      w.begin_array(true);
      for (auto sp : g.spans_other_factor) w.value(static_cast<std::size_t>(sp) + 1);
      w.end_array();
    }
  }
  w.key("factors");
  w.begin_object(true);
  for (std::size_t i = 0; i < c.factors.size() && i < g.factors.size(); ++i) w.member(c.factors[i].first, g.factors[i]);
  w.end_object();
  if (g.train == Governs::Train::Off) {
    w.member("train_position", "off the beam");
  } else if (g.train == Governs::Train::Placed) {
    w.key("train_position");
    w.begin_object(true);
    w.member("first_point_x", g.first);
    w.member("direction", g.backward ? "backward" : "forward");
    if (g.approach != 0) w.member("limit", g.approach < 0 ? "arriving from the left" : "arriving from the right");
    w.end_object();
  }
  w.end_object();
}

// What governs, each once as text: most points of a long envelope share
// their governing arrangement (interned by the envelope), and a patterned
// arrangement lists up to every span.
class GovernsText {
 public:
  explicit GovernsText(const input::Combination& c) : c_(c) {}
  void write(JsonWriter& w, std::string_view k, const std::shared_ptr<const Governs>& g) {
    w.key(k);
    auto found = text_.find(g.get());
    if (found == text_.end()) {
      std::string t;
      {
        JsonWriter sub(t);
        governs_object(sub, governs_of(g), c_);
      }
      found = text_.emplace(g.get(), std::string(t)).first;  // a copy of its own size (the writer keeps room)
    }
    w.raw_value(found->second);
  }

 private:
  const input::Combination& c_;
  std::unordered_map<const Governs*, std::string> text_;
};

void envelope(JsonWriter& w, const Envelope& e, const LoadSet& set) {
  GovernsText gov(*set.combination);
  w.key("envelope");
  w.begin_object();
  w.key("stations");
  w.begin_array();
  for (std::size_t i = 0; i < e.moment.size(); ++i) {
    w.begin_object(true);
    w.member("x", set.stations[i].x);
    w.member("moment_max", e.moment[i].max);
    w.member("moment_min", e.moment[i].min);
    w.member("shear_max", e.shear[i].max);
    w.member("shear_min", e.shear[i].min);
    w.member("deflection_max", e.deflection[i].max);
    w.member("deflection_min", e.deflection[i].min);
    w.key("governs");
    w.begin_object(true);
    gov.write(w, "moment_max", e.moment[i].max_by);
    gov.write(w, "moment_min", e.moment[i].min_by);
    gov.write(w, "shear_max", e.shear[i].max_by);
    gov.write(w, "shear_min", e.shear[i].min_by);
    gov.write(w, "deflection_max", e.deflection[i].max_by);
    gov.write(w, "deflection_min", e.deflection[i].min_by);
    w.end_object();
    w.end_object();
  }
  w.end_array();
  w.key("nodes");
  w.begin_array();
  for (std::size_t i = 0; i < e.reaction.size(); ++i) {
    w.begin_object(true);
    w.member("label", set.beam.labels[i]);
    w.member("x", set.beam.node_x(i));
    w.member("reaction_max", e.reaction[i].max);
    w.member("reaction_min", e.reaction[i].min);
    w.key("governs");
    w.begin_object(true);
    gov.write(w, "reaction_max", e.reaction[i].max_by);
    gov.write(w, "reaction_min", e.reaction[i].min_by);
    w.end_object();
    w.end_object();
  }
  w.end_array();
  w.end_object();
}

// The extremes of each span (anywhere in it), with what governs them in an envelope.
void span_extremes(JsonWriter& w, const std::vector<SpanExtremes>& extremes, bool envelope) {
  w.key("span_extremes");
  w.begin_array();
  elements(w, extremes.size(), [&](JsonWriter& o, std::size_t i) {
    const auto& e = extremes[i];
    o.record_begin();
    o.record("span", i + 1);
    o.record("max_moment", e.max_moment);
    o.record("max_moment_x", e.max_moment_x);
    o.record("min_moment", e.min_moment);
    o.record("min_moment_x", e.min_moment_x);
    o.record("max_deflection", e.max_deflection);
    o.record("max_deflection_x", e.max_deflection_x);
    if (envelope) {
      o.record("max_moment_governs", std::string_view(e.max_moment_by));
      o.record("min_moment_governs", std::string_view(e.min_moment_by));
      o.record("max_deflection_governs", std::string_view(e.max_deflection_by));
    }
    o.record_end();
  });
  w.end_array();
}

// The second route of an envelope: each governing arrangement solved directly.
void second_route(JsonWriter& w, const LoadSet& set) {
  if (!set.envelope) return;
  w.key("second_route");
  w.begin_array();
  for (const auto& rc : set.second_route) {
    w.begin_object(true);
    w.member("quantity", rc.quantity);
    w.member("where", rc.where);
    w.member("x", rc.x);
    w.member("arrangement", rc.arrangement);
    w.member("envelope", rc.envelope);
    w.key("direct");
    w.begin_object(true);
    for (const auto& [name, v] : rc.values) w.member(name, v);
    w.end_object();
    w.member("difference", rc.difference);
    w.member("holds", rc.holds);
    w.end_object();
  }
  w.end_array();
}

void equilibrium(JsonWriter& w, const MethodResult& m) {
  if (m.status != MethodStatus::Ok) return;
  w.key("equilibrium");
  w.begin_object(true);
  w.member("force_residual", m.equilibrium.force_residual);
  w.member("moment_residual", m.equilibrium.moment_residual);
  w.end_object();
}

void method(JsonWriter& w, const MethodResult& m, const LoadSet& set) {
  w.key(m.name);
  w.begin_object();
  w.member("status", method_status_name(m.status));
  w.member("reason", m.reason);
  w.member("reason_id", m.reason_id);
  if (set.envelope) {
    if (m.envelope) envelope(w, *m.envelope, set);
    if (m.status == MethodStatus::Ok) span_extremes(w, m.extremes, true);
    equilibrium(w, m);
    w.end_object();
    return;
  }
  w.key("nodes");
  w.begin_array();
  elements(w, m.nodes.size(), [&](JsonWriter& o, std::size_t i) {
    const NodeResult& n = m.nodes[i];
    o.record_begin();
    o.record("label", std::string_view(set.beam.labels[i]));
    o.record("x", n.x);
    if (n.moment_left) o.record("moment_left", *n.moment_left);
    else o.record_null("moment_left");
    if (n.moment_right) o.record("moment_right", *n.moment_right);
    else o.record_null("moment_right");
    o.record("reaction_force", n.reaction_force);
    o.record("reaction_moment", n.reaction_moment);
    o.record("deflection", n.deflection);
    o.record("rotation", i == 0 ? n.rotation_right : n.rotation_left);
    o.record("rotation_right", n.rotation_right);
    o.record_end();
  });
  w.end_array();
  w.key("stations");
  w.begin_array();
  elements(w, m.stations.size(), [&](JsonWriter& o, std::size_t i) {
    const StationValues& s = m.stations[i];
    o.record_begin();
    o.record("x", s.x);
    o.record("shear", s.shear);
    o.record("moment", s.moment);
    o.record("deflection", s.deflection);
    o.record("rotation", s.rotation);
    o.record_end();
  });
  w.end_array();
  if (m.status == MethodStatus::Ok) span_extremes(w, m.extremes, false);
  equilibrium(w, m);
  w.end_object();
}

void number(JsonWriter& w, std::string_view k, const precision::Number& n) {
  w.key(k);
  w.begin_object(true);
  w.member("value", n.value);
  w.member("decimal", n.decimal);
  if (!n.fraction.empty()) w.member("fraction", n.fraction);
  w.end_object();
}

// Extended or exact results: every number also as a decimal with all its
// digits (and, in exact arithmetic, as a fraction), and each method's
// rounding error in double.
void arithmetic(JsonWriter& w, const precision::LoadSetNumbers& pn) {
  w.key("arithmetic");
  w.begin_object();
  w.member("requested", precision::arithmetic_name(pn.arithmetic));
  w.key("conditioning");
  w.begin_object(true);
  w.member("estimated_digits_lost", pn.conditioning.estimated_digits_lost);
  if (pn.conditioning.measured_digits_lost) w.member("measured_digits_lost", *pn.conditioning.measured_digits_lost);
  w.key("features");
  w.begin_array(true);
  for (const auto& f : pn.conditioning.features) w.value(f.description);
  w.end_array();
  w.key("warnings");
  w.begin_array(true);
  for (const auto& x : pn.conditioning.warnings) w.value(x);
  w.end_array();
  w.end_object();
  w.key("methods");
  w.begin_object();
  for (const auto& m : pn.methods) {
    w.key(m.name);
    w.begin_object();
    w.member("arithmetic", precision::arithmetic_name(m.used));
    w.member("note", m.note);
    w.member("status", method_status_name(m.status));
    w.member("reason", m.reason);
    w.member("reason_id", m.reason_id);
    if (m.rounding) {
      w.key("double_rounding");
      w.begin_object(true);
      w.member("measured", m.rounding->measured);
      if (!m.rounding->reason.empty()) w.member("reason", m.rounding->reason);
      w.key("relative_difference");
      w.begin_object(true);
      for (std::size_t k = 0; k < kKinds; ++k) w.member(kind_name(static_cast<Kind>(k)), m.rounding->difference[k]);
      w.end_object();
      w.key("correct_digits");
      w.begin_object(true);
      for (std::size_t k = 0; k < kKinds; ++k) w.member(kind_name(static_cast<Kind>(k)), m.rounding->digits[k]);
      w.end_object();
      w.member("worst_kind", m.rounding->worst_kind);
      w.member("worst_where", m.rounding->worst_where);
      w.end_object();
    }
    w.key("nodes");
    w.begin_array();
    for (const auto& n : m.nodes) {
      w.begin_object(true);
      number(w, "x", n.x);
      if (n.moment_left) number(w, "moment_left", *n.moment_left);
      if (n.moment_right) number(w, "moment_right", *n.moment_right);
      number(w, "reaction_force", n.reaction_force);
      number(w, "reaction_moment", n.reaction_moment);
      number(w, "deflection", n.deflection);
      number(w, "rotation_left", n.rotation_left);
      number(w, "rotation_right", n.rotation_right);
      w.end_object();
    }
    w.end_array();
    w.key("stations");
    w.begin_array();
    for (const auto& st : m.stations) {
      w.begin_object(true);
      number(w, "x", st.x);
      number(w, "shear", st.shear);
      number(w, "moment", st.moment);
      number(w, "deflection", st.deflection);
      number(w, "rotation", st.rotation);
      w.end_object();
    }
    w.end_array();
    w.end_object();
  }
  w.end_object();
  w.end_object();
}

void load_set(JsonWriter& w, const LoadSet& set, const Report& b) {
  w.key(set.name);
  w.begin_object();
  w.member("verdict", verdict_name(set.verdict));
  for (const auto& pn : b.precision)
    if (pn->load_case == set.name) arithmetic(w, *pn);
  if (set.moving) {
    w.key("moving_load");
    w.begin_object(true);
    w.member("name", set.moving->name);
    w.member("factor", set.moving_factor);
    w.key("points");
    w.begin_array(true);
    for (const auto& pt : set.moving->points) {
      w.begin_object(true);
      w.member("P", pt.P);
      w.member("offset", pt.offset);
      w.end_object();
    }
    w.end_array();
    w.member("directions", set.moving->both_directions ? "both" : "forward");
    w.end_object();
  }
  if (set.combination && !(set.moving && set.combination->factors.empty())) {
    const input::Combination& c = *set.combination;
    w.key("combination");
    w.begin_object();
    w.key("factors");
    w.begin_object(true);
    for (const auto& [cs, f] : c.factors) {
      w.key(cs);
      if (f.range) {
        w.begin_array(true);
        w.value(f.low);
        w.value(f.high);
        w.end_array();
      } else {
        w.value(f.high);
      }
    }
    w.end_object();
    w.key("pattern");
    w.begin_array(true);
    for (const auto& p : c.pattern) w.value(p);
    w.end_array();
    w.member("arrangements", c.arrangements == input::Arrangements::All ? "all" : "adjacent-and-alternate");
    w.member("envelope", set.envelope);
    if (!c.source.empty()) w.member("source", c.source);
    w.end_object();
  }
  w.key("max_difference");
  w.begin_object(true);
  for (std::size_t k = 0; k < kKinds; ++k) w.member(kind_name(static_cast<Kind>(k)), set.max_difference[k]);
  w.end_object();
  w.key("largest");
  w.begin_object(true);
  for (std::size_t k = 0; k < kKinds; ++k) w.member(kind_name(static_cast<Kind>(k)), set.scale[k]);
  w.end_object();
  w.key("odd_one_out");
  if (set.odd_one_out.empty()) w.null();
  else w.value(set.odd_one_out);
  w.member("problem", set.problem);
  if (set.worst) {
    w.key("largest_difference_at");
    w.begin_object(true);
    w.member("kind", kind_name(set.worst->kind));
    w.member("where", set.worst->where);
    w.member("x", set.worst->x);
    w.key("values");
    w.begin_object(true);
    for (const auto& [name, v] : set.worst->values) w.member(name, v);
    w.end_object();
    w.end_object();
  }
  span_extremes(w, set.extremes, set.envelope);
  second_route(w, set);
  w.key("deflection_limits");
  w.begin_array();
  for (const auto& d : set.deflection_checks) {
    w.begin_object(true);
    w.member("span", d.span + 1);
    w.member("cantilever", d.cantilever);
    w.member("limit", d.limit);
    w.member("length", d.length);
    w.member("deflection", d.deflection);
    w.member("x", d.x);
    w.member("allowed", d.allowed);
    w.key("span_over_deflection");
    if (std::isfinite(d.ratio)) w.value(d.ratio);
    else w.null();
    w.member("holds", d.holds);
    w.end_object();
  }
  w.end_array();
  w.key("methods");
  w.begin_object();
  for (const auto& m : set.methods) method(w, m, set);
  w.end_object();
  w.end_object();
}

void claims(JsonWriter& w, const Report& b) {
  w.key("claims");
  w.begin_array();
  for (const auto& c : b.claims) {
    w.begin_object(true);
    w.member("quantity", input::quantity_name(c.claim.quantity));
    if (c.claim.node) w.member("node", b.sets.empty() ? std::string() : b.sets.front().beam.labels[*c.claim.node]);
    if (c.claim.x) w.member("x", *c.claim.x);
    if (c.claim.span) w.member("span", *c.claim.span + 1);
    if (c.claim.side != input::Side::Unspecified) w.member("side", c.claim.side == input::Side::Left ? "left" : "right");
    w.member("case", c.load_case);
    w.member("claimed", c.claim.value);
    optional_number(w, "computed", c.evaluated ? std::optional<double>(c.computed) : std::nullopt);
    optional_number(w, "difference", c.evaluated ? std::optional<double>(c.difference) : std::nullopt);
    w.member("tolerance", c.tolerance);
    w.member("holds", c.holds);
    if (!c.reason.empty()) w.member("reason", c.reason);
    if (!c.finding.empty()) w.member("finding", c.finding);
    if (!c.claim.source.empty()) w.member("source", c.claim.source);
    w.end_object();
  }
  w.end_array();
}

void against_results(JsonWriter& w, const Report& b) {
  if (b.against.empty()) return;
  namespace ag = compare::against;
  w.key("against");
  w.begin_array();
  for (const auto& c : b.against) {
    w.begin_object();
    w.member("file", c->file);
    w.member("kind", ag::table_kind_name(c->kind));
    w.member("case", c->load_case);
    w.key("their_units");
    w.begin_object(true);
    w.member("force", c->their_units.force);
    w.member("length", c->their_units.length);
    w.end_object();
    w.member("holds", c->holds());
    w.key("errors");
    w.begin_array();
    for (const auto& e : c->errors) w.value(e.format(c->file));
    w.end_array();
    w.key("notes");
    w.begin_array();
    for (const auto& n : c->notes) w.value(n);
    w.end_array();
    w.key("summary");
    w.begin_array();
    for (const auto& q : c->summary) {
      w.begin_object(true);
      w.member("quantity", ag::quantity_name(q.quantity));
      w.member("compared", q.compared);
      w.member("failing", q.failing);
      w.member("worst_difference", q.worst_difference);
      w.member("worst_line", q.worst_line);
      w.member("worst_where", q.worst_where);
      w.member("empty_cells", q.empty);
      w.member("tolerance", q.tolerance);
      w.key("finding");
      if (q.finding) {
        w.begin_object(true);
        w.key("mistakes");
        w.begin_array(true);
        for (auto m : q.finding->mistakes) w.value(ag::mistake_name(m));
        w.end_array();
        w.member("factor", q.finding->factor);
        w.member("shift", q.finding->shift);
        w.member("residual", q.finding->residual);
        w.member("text", q.finding->text);
        w.end_object();
      } else {
        w.null();
      }
      w.member("note", q.note);
      w.end_object();
    }
    w.end_array();
    w.key("rows");
    w.begin_array();
    for (const auto& r : c->rows) {
      w.begin_object(true);
      w.member("line", r.line);
      w.member("where", r.where);
      w.key("values");
      w.begin_array(true);
      for (const auto& cell : r.cells) {
        w.begin_object(true);
        w.member("quantity", ag::quantity_name(cell.quantity));
        w.member("raw", cell.raw);
        w.member("theirs", cell.theirs);
        w.member("ours", cell.ours);
        w.member("difference", cell.difference);
        w.member("tolerance", cell.tolerance);
        w.member("holds", cell.holds);
        if (cell.side != ag::Side::Continuous) w.member("side", ag::side_name(cell.side));
        if (!cell.reason.empty()) w.member("reason", cell.reason);
        w.end_object();
      }
      w.end_array();
      w.end_object();
    }
    w.end_array();
    w.end_object();
  }
  w.end_array();
}

}  // namespace

namespace {

// One element of "beams".
void beam_object(JsonWriter& w, const Report& b) {
  {
    w.begin_object();
    w.member("file", b.file);
    w.member("title", b.title);
    w.key("units");
    w.begin_object(true);
    w.member("force", b.units.force);
    w.member("length", b.units.length);
    w.end_object();
    w.member("status", beam_status_name(b.status));
    w.key("warnings");
    w.begin_array();
    for (const auto& x : b.warnings) w.value(x);
    w.end_array();
    w.key("errors");
    w.begin_array();
    for (const auto& e : b.errors) {
      w.begin_object(true);
      w.member("id", e.id);
      w.member("pointer", e.pointer);
      w.member("where", e.where);
      w.member("reason", e.reason);
      w.member("message", e.format(b.file));
      w.end_object();
    }
    w.end_array();
    w.key("results");
    w.begin_object();
    for (const auto& set : b.sets) load_set(w, set, b);
    w.end_object();
    claims(w, b);
    against_results(w, b);
    w.end_object();
  }
}

// The report around the beams; `beams(w)` writes the elements of "beams".
template <class Beams>
void report(std::ostream& out, const Summary& s, const RunInfo& run, const Beams& beams) {
  JsonWriter w(out);
  w.begin_object();
  w.key("tool");
  w.begin_object(true);
  w.member("name", "trivet");
  w.member("version", run.version);
  w.end_object();
  w.key("summary");
  w.begin_object(true);
  w.member("beams", s.beams);
  w.member("agree", s.agree);
  w.member("disagree", s.disagree);
  w.member("unconfirmed", s.unconfirmed);
  w.member("invalid", s.invalid);
  w.member("claims_failed", s.claims_failed);
  w.member("limits_failed", s.limits_failed);
  w.end_object();
  w.member("agreement", run.agreement);
  w.member("caution", caution_text());
  w.key("beams");
  w.begin_array();
  beams(w);
  w.end_array();
  w.end_object();
  w.flush();
}

}  // namespace

void json_beam_fragment(const Report& b, std::string& text) {
  JsonWriter w(text, 2);  // inside the root object and its "beams" array
  beam_object(w, b);
}

void write_json_fragments(std::ostream& out, const Summary& s, const std::vector<std::string_view>& fragments,
                          const RunInfo& run) {
  report(out, s, run, [&](JsonWriter& w) {
    for (const auto& f : fragments) w.raw_element(f);
  });
}

std::string json_head(const Summary& s, const RunInfo& run, bool padded) {
  std::ostringstream o;
  report(o, s, run, [](JsonWriter&) {});
  std::string h = o.str();
  const std::string empty_end = "]\n}\n";  // what an empty "beams" array and the root leave
  h.resize(h.size() - empty_end.size());
  if (padded) {
    // Room for seven counts of 20 digits: spaces after the summary's comma,
    // before the line break.
    const std::size_t at = h.find('}', h.find("\"summary\": ")) + 2;  // past "},"
    const std::size_t digits = std::to_string(s.beams).size() + std::to_string(s.agree).size() +
                               std::to_string(s.disagree).size() + std::to_string(s.unconfirmed).size() +
                               std::to_string(s.invalid).size() + std::to_string(s.claims_failed).size() +
                               std::to_string(s.limits_failed).size();
    h.insert(at, 140 - digits, ' ');
  }
  return h;
}

const char* json_tail(bool any_beams) { return any_beams ? "\n ]\n}\n" : "]\n}\n"; }

void write_json(std::ostream& out, const std::vector<Report>& beams, const RunInfo& run) {
  report(out, summarize(beams), run, [&](JsonWriter& w) {
    for (const auto& b : beams) beam_object(w, b);
  });
}

namespace {

// The JSON report as a reporter. Streamed: the head with room for the
// counts, each beam's element as it comes, then the head again. Otherwise
// the elements are held (or, for kept beams, the beams themselves) and the
// whole report written at end().
class JsonReporter final : public CheckReporter {
 public:
  explicit JsonReporter(const Output& output) : out_(*output.out), streamed_(output.streamed) {}
  void begin(const RunInfo& run) override {
    run_ = run;
    if (streamed_) out_ << json_head({}, run_, true);
  }
  Part render(const Report& beam) const override {
    Part p;
    json_beam_fragment(beam, p.text);
    return p;
  }
  void beam(Part&& part) override {
    if (streamed_) {
      if (any_) out_ << ',';
      out_ << part.text;
    } else {
      held_.push_back(std::move(part.text));
    }
    any_ = true;
  }
  void keep(const Report& beam) override {
    if (streamed_) return CheckReporter::keep(beam);
    kept_.push_back(&beam);  // written straight from the beam at end(), without a copy of its text
    any_ = true;
  }
  std::string end(const Summary& s) override {
    if (streamed_) {
      out_ << json_tail(any_);
      out_.seekp(0);
      out_ << json_head(s, run_, true);  // the same length, now with the counts
    } else if (!kept_.empty()) {
      report(out_, s, run_, [&](JsonWriter& w) {
        for (const Report* b : kept_) beam_object(w, *b);
      });
    } else {
      std::vector<std::string_view> parts(held_.begin(), held_.end());
      write_json_fragments(out_, s, parts, run_);
    }
    return "";  // a failed write shows in the stream, which the caller checks when it closes it
  }

 private:
  std::ostream& out_;
  bool streamed_;
  RunInfo run_;
  bool any_ = false;
  std::vector<std::string> held_;
  std::vector<const Report*> kept_;
};

}  // namespace

std::unique_ptr<CheckReporter> json_reporter(const Output& output) { return std::make_unique<JsonReporter>(output); }

}  // namespace trivet::reports
