#include <cmath>

#include <nlohmann/json.hpp>

#include "harness/compare/against.h"
#include "reports/reports.h"

namespace trivet::reports {

using nlohmann::ordered_json;
using namespace trivet::compare;

Summary summarize(const std::vector<BeamResult>& beams) {
  Summary s;
  for (const auto& b : beams) {
    ++s.beams;
    switch (b.status) {
      case BeamStatus::Agree: ++s.agree; break;
      case BeamStatus::Disagree: ++s.disagree; break;
      case BeamStatus::Unconfirmed: ++s.unconfirmed; break;
      case BeamStatus::Invalid: ++s.invalid; break;
    }
    s.claims_failed += b.claims_failed();
  }
  return s;
}

namespace {

// nlohmann/json writes NaN and infinity as null silently; say so instead.
ordered_json num(double v) {
  if (!std::isfinite(v)) return nullptr;
  return v;
}
ordered_json opt(const std::optional<double>& v) { return v ? num(*v) : ordered_json(nullptr); }

ordered_json governs_json(const Governs& g, const input::Combination& c) {
  ordered_json o;
  ordered_json spans = ordered_json::array();
  for (auto sp : g.spans) spans.push_back(sp + 1);
  if (!c.pattern.empty()) o["loaded_spans"] = std::move(spans);
  ordered_json f = ordered_json::object();
  for (std::size_t k = 0; k < c.factors.size() && k < g.factors.size(); ++k) f[c.factors[k].first] = g.factors[k];
  o["factors"] = std::move(f);
  return o;
}

ordered_json envelope_json(const Envelope& e, const LoadSet& set) {
  const input::Combination& c = *set.combination;
  ordered_json j;
  ordered_json st = ordered_json::array();
  for (std::size_t i = 0; i < e.moment.size(); ++i) {
    ordered_json o;
    o["x"] = num(set.stations[i].x);
    o["moment_max"] = num(e.moment[i].max);
    o["moment_min"] = num(e.moment[i].min);
    o["shear_max"] = num(e.shear[i].max);
    o["shear_min"] = num(e.shear[i].min);
    o["deflection_max"] = num(e.deflection[i].max);
    o["deflection_min"] = num(e.deflection[i].min);
    o["governs"] = {{"moment_max", governs_json(e.moment[i].max_by, c)}, {"moment_min", governs_json(e.moment[i].min_by, c)},
                    {"shear_max", governs_json(e.shear[i].max_by, c)}, {"shear_min", governs_json(e.shear[i].min_by, c)},
                    {"deflection_max", governs_json(e.deflection[i].max_by, c)}, {"deflection_min", governs_json(e.deflection[i].min_by, c)}};
    st.push_back(std::move(o));
  }
  j["stations"] = std::move(st);
  ordered_json nodes = ordered_json::array();
  for (std::size_t i = 0; i < e.reaction.size(); ++i) {
    ordered_json o;
    o["label"] = set.beam.labels[i];
    o["x"] = num(set.beam.node_x(i));
    o["reaction_max"] = num(e.reaction[i].max);
    o["reaction_min"] = num(e.reaction[i].min);
    o["governs"] = {{"reaction_max", governs_json(e.reaction[i].max_by, c)}, {"reaction_min", governs_json(e.reaction[i].min_by, c)}};
    nodes.push_back(std::move(o));
  }
  j["nodes"] = std::move(nodes);
  return j;
}

ordered_json method_json(const MethodResult& m, const LoadSet& set) {
  ordered_json j;
  j["status"] = method_status_name(m.status);
  j["reason"] = m.reason;
  if (set.envelope) {
    if (m.envelope) j["envelope"] = envelope_json(*m.envelope, set);
    if (m.status == MethodStatus::Ok)
      j["equilibrium"] = {{"force_residual", num(m.equilibrium.force_residual)},
                          {"moment_residual", num(m.equilibrium.moment_residual)}};
    return j;
  }
  ordered_json nodes = ordered_json::array();
  for (std::size_t i = 0; i < m.nodes.size(); ++i) {
    const NodeResult& n = m.nodes[i];
    ordered_json o;
    o["label"] = set.beam.labels[i];
    o["x"] = num(n.x);
    o["moment_left"] = opt(n.moment_left);
    o["moment_right"] = opt(n.moment_right);
    o["reaction_force"] = num(n.reaction_force);
    o["reaction_moment"] = num(n.reaction_moment);
    o["deflection"] = num(n.deflection);
    o["rotation"] = num(i == 0 ? n.rotation_right : n.rotation_left);
    o["rotation_right"] = num(n.rotation_right);
    nodes.push_back(std::move(o));
  }
  j["nodes"] = std::move(nodes);
  ordered_json st = ordered_json::array();
  for (const auto& s : m.stations) {
    ordered_json o;
    o["x"] = num(s.x);
    o["shear"] = num(s.shear);
    o["moment"] = num(s.moment);
    o["deflection"] = num(s.deflection);
    o["rotation"] = num(s.rotation);
    st.push_back(std::move(o));
  }
  j["stations"] = std::move(st);
  if (m.status == MethodStatus::Ok) {
    j["equilibrium"] = {{"force_residual", num(m.equilibrium.force_residual)},
                        {"moment_residual", num(m.equilibrium.moment_residual)}};
  }
  return j;
}

}  // namespace

void write_json(std::ostream& out, const std::vector<BeamResult>& beams, const RunInfo& run) {
  ordered_json root;
  root["tool"] = {{"name", "trivet"}, {"version", run.version}};
  const Summary s = summarize(beams);
  root["summary"] = {{"beams", s.beams},         {"agree", s.agree},
                     {"disagree", s.disagree},   {"unconfirmed", s.unconfirmed},
                     {"invalid", s.invalid},     {"claims_failed", s.claims_failed}};
  root["agreement"] = run.agreement;
  root["caution"] = caution_text();
  ordered_json list = ordered_json::array();
  for (const auto& b : beams) {
    ordered_json jb;
    jb["file"] = b.file;
    jb["title"] = b.title;
    jb["units"] = {{"force", b.units.force}, {"length", b.units.length}};
    jb["status"] = beam_status_name(b.status);
    ordered_json errors = ordered_json::array();
    for (const auto& e : b.errors)
      errors.push_back({{"pointer", e.pointer}, {"where", e.where}, {"reason", e.reason},
                        {"message", e.format(b.file)}});
    jb["errors"] = std::move(errors);
    ordered_json results = ordered_json::object();
    for (const auto& set : b.sets) {
      ordered_json r;
      r["verdict"] = verdict_name(set.verdict);
      if (set.combination) {
        ordered_json f = ordered_json::object();
        for (const auto& [cs, fac] : set.combination->factors)
          f[cs] = fac.range ? ordered_json::array({fac.low, fac.high}) : ordered_json(fac.high);
        r["combination"] = {{"factors", f}, {"pattern", set.combination->pattern},
                            {"arrangements", set.combination->arrangements == input::Arrangements::All ? "all" : "adjacent-and-alternate"},
                            {"envelope", set.envelope}};
        if (!set.combination->source.empty()) r["combination"]["source"] = set.combination->source;
      }
      ordered_json md;
      for (std::size_t k = 0; k < kKinds; ++k) md[kind_name(static_cast<Kind>(k))] = num(set.max_difference[k]);
      r["max_difference"] = std::move(md);
      ordered_json sc;
      for (std::size_t k = 0; k < kKinds; ++k) sc[kind_name(static_cast<Kind>(k))] = num(set.scale[k]);
      r["largest"] = std::move(sc);
      r["odd_one_out"] = set.odd_one_out.empty() ? ordered_json(nullptr) : ordered_json(set.odd_one_out);
      r["problem"] = set.problem;
      if (set.worst) {
        ordered_json w;
        w["kind"] = kind_name(set.worst->kind);
        w["where"] = set.worst->where;
        w["x"] = num(set.worst->x);
        ordered_json vals = ordered_json::object();
        for (const auto& [name, v] : set.worst->values) vals[name] = num(v);
        w["values"] = std::move(vals);
        r["largest_difference_at"] = std::move(w);
      }
      ordered_json ex = ordered_json::array();
      for (std::size_t i = 0; i < set.extremes.size(); ++i) {
        const auto& e = set.extremes[i];
        ex.push_back({{"span", i + 1},
                      {"max_moment", num(e.max_moment)}, {"max_moment_x", num(e.max_moment_x)},
                      {"min_moment", num(e.min_moment)}, {"min_moment_x", num(e.min_moment_x)},
                      {"max_deflection", num(e.max_deflection)}, {"max_deflection_x", num(e.max_deflection_x)}});
        if (set.envelope) {
          ex.back()["max_moment_governs"] = e.max_moment_by;
          ex.back()["min_moment_governs"] = e.min_moment_by;
        }
      }
      r["span_extremes"] = std::move(ex);
      ordered_json ms = ordered_json::object();
      for (const auto& m : set.methods) ms[m.name] = method_json(m, set);
      r["methods"] = std::move(ms);
      results[set.name] = std::move(r);
    }
    jb["results"] = std::move(results);
    ordered_json claims = ordered_json::array();
    for (const auto& c : b.claims) {
      ordered_json o;
      o["quantity"] = input::quantity_name(c.claim.quantity);
      if (c.claim.node) o["node"] = c.label.substr(5);
      if (c.claim.x) o["x"] = num(*c.claim.x);
      if (c.claim.span) o["span"] = *c.claim.span + 1;
      if (c.claim.side != input::Side::Unspecified) o["side"] = c.claim.side == input::Side::Left ? "left" : "right";
      o["case"] = c.load_case;
      o["claimed"] = num(c.claim.value);
      o["computed"] = c.evaluated ? num(c.computed) : ordered_json(nullptr);
      o["difference"] = c.evaluated ? num(c.difference) : ordered_json(nullptr);
      o["tolerance"] = num(c.tolerance);
      o["holds"] = c.holds;
      if (!c.reason.empty()) o["reason"] = c.reason;
      claims.push_back(std::move(o));
    }
    jb["claims"] = std::move(claims);
    if (!b.against.empty()) {
      namespace ag = compare::against;
      ordered_json list_ag = ordered_json::array();
      for (const auto& c : b.against) {
        ordered_json a;
        a["file"] = c->file;
        a["kind"] = ag::table_kind_name(c->kind);
        a["case"] = c->load_case;
        a["their_units"] = {{"force", c->their_units.force}, {"length", c->their_units.length}};
        a["holds"] = c->holds();
        ordered_json errs = ordered_json::array();
        for (const auto& e : c->errors) errs.push_back(e.format(c->file));
        a["errors"] = std::move(errs);
        ordered_json sum = ordered_json::array();
        for (const auto& q : c->summary) {
          ordered_json o;
          o["quantity"] = ag::quantity_name(q.quantity);
          o["compared"] = q.compared;
          o["failing"] = q.failing;
          o["worst_difference"] = num(q.worst_difference);
          o["worst_line"] = q.worst_line;
          o["worst_where"] = q.worst_where;
          o["tolerance"] = num(q.tolerance);
          if (q.finding) {
            ordered_json mist = ordered_json::array();
            for (auto m : q.finding->mistakes) mist.push_back(ag::mistake_name(m));
            o["finding"] = {{"mistakes", mist}, {"factor", num(q.finding->factor)}, {"shift", q.finding->shift},
                            {"residual", num(q.finding->residual)}, {"text", q.finding->text}};
          } else {
            o["finding"] = nullptr;
          }
          o["note"] = q.note;
          sum.push_back(std::move(o));
        }
        a["summary"] = std::move(sum);
        ordered_json rows = ordered_json::array();
        for (const auto& r : c->rows) {
          ordered_json row;
          row["line"] = r.line;
          row["where"] = r.where;
          ordered_json cells = ordered_json::array();
          for (const auto& cell : r.cells) {
            ordered_json o;
            o["quantity"] = ag::quantity_name(cell.quantity);
            o["raw"] = num(cell.raw);
            o["theirs"] = num(cell.theirs);
            o["ours"] = num(cell.ours);
            o["difference"] = num(cell.difference);
            o["tolerance"] = num(cell.tolerance);
            o["holds"] = cell.holds;
            if (cell.side != ag::Side::Continuous) o["side"] = ag::side_name(cell.side);
            if (!cell.reason.empty()) o["reason"] = cell.reason;
            cells.push_back(std::move(o));
          }
          row["values"] = std::move(cells);
          rows.push_back(std::move(row));
        }
        a["rows"] = std::move(rows);
        list_ag.push_back(std::move(a));
      }
      jb["against"] = std::move(list_ag);
    }
    list.push_back(std::move(jb));
  }
  root["beams"] = std::move(list);
  out << root.dump(1, ' ', false, nlohmann::json::error_handler_t::replace) << "\n";
}

}  // namespace trivet::reports
