#include "reports/html_report.h"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <ctime>
#include <map>
#include <sstream>

#include "harness/compare/against.h"
#include "reports/reports.h"
#include "reports/sha256.h"

namespace trivet::reports {

using namespace trivet::compare;

std::string html_escape(const std::string& s) {
  std::string r;
  r.reserve(s.size());
  for (char c : s) {
    switch (c) {
      case '&': r += "&amp;"; break;
      case '<': r += "&lt;"; break;
      case '>': r += "&gt;"; break;
      case '"': r += "&quot;"; break;
      case '\'': r += "&#39;"; break;
      default: r += c;
    }
  }
  return r;
}

std::string utc_now_iso8601() {
  const std::time_t t = std::time(nullptr);
  std::tm tm{};
  gmtime_r(&t, &tm);
  char buf[32];
  std::strftime(buf, sizeof buf, "%Y-%m-%dT%H:%M:%SZ", &tm);
  return buf;
}

std::string beam_anchor(std::size_t i) { return "beam-" + std::to_string(i + 1); }

namespace {

void replace_all(std::string& s, const std::string& from, const std::string& to) {
  if (from.empty()) return;
  std::string out;
  out.reserve(s.size() + s.size() / 16);
  std::size_t pos = 0;
  for (;;) {
    const std::size_t at = s.find(from, pos);
    if (at == std::string::npos) break;
    out.append(s, pos, at - pos);
    out += to;
    pos = at + from.size();
  }
  out.append(s, pos, std::string::npos);
  s = std::move(out);
}

// Removes every attribute `name="..."` (either quote) from the text.
void drop_attribute(std::string& s, const std::string& name) {
  for (const char q : {'"', '\''}) {
    const std::string key = " " + name + "=" + q;
    for (std::size_t at = s.find(key); at != std::string::npos; at = s.find(key, at)) {
      const std::size_t end = s.find(q, at + key.size());
      if (end == std::string::npos) break;
      s.erase(at, end + 1 - at);
    }
  }
}

}  // namespace

std::string svg_for_html(const std::string& svg, const std::string& prefix) {
  const std::size_t start = svg.find("<svg");
  if (start == std::string::npos) return std::string();
  std::string s = svg.substr(start);
  drop_attribute(s, "xmlns");
  drop_attribute(s, "xmlns:xlink");
  replace_all(s, "xlink:href=", "href=");
  for (const char* q : {"\"", "'"}) {
    replace_all(s, std::string("id=") + q, std::string("id=") + q + prefix);
    replace_all(s, std::string("href=") + q + "#", std::string("href=") + q + "#" + prefix);
  }
  replace_all(s, "url(#", "url(#" + prefix);
  replace_all(s, "<title>Gnuplot</title>", "<title>diagrams</title>");
  // Smaller: no indentation, no empty lines (text content sits on its own
  // lines, so nothing a person reads changes).
  std::string t;
  t.reserve(s.size());
  std::size_t i = 0;
  while (i < s.size()) {
    std::size_t e = s.find('\n', i);
    if (e == std::string::npos) e = s.size();
    std::size_t b = i;
    while (b < e && (s[b] == ' ' || s[b] == '\t')) ++b;
    if (b < e) {
      t.append(s, b, e - b);
      t += '\n';
    }
    i = e + 1;
  }
  s = std::move(t);
  replace_all(s, "<svg ", "<svg class=\"plot\" role=\"img\" ");
  return s;
}

namespace {

const char* kCss = R"(
body{font-family:sans-serif;margin:1.2em auto;max-width:72em;padding:0 1em;color:#1a1a1a;line-height:1.35}
h1{font-size:1.5em;margin:.2em 0}h2{font-size:1.2em;margin:1.6em 0 .3em;border-top:2px solid #444;padding-top:.5em}
.why{font-size:.8em;font-weight:normal;color:#7a1d1d}
h3{font-size:1.02em;margin:1em 0 .3em}
table{border-collapse:collapse;margin:.3em 0 .8em;font-size:.88em}
th,td{border:1px solid #bbb;padding:.15em .45em;text-align:left;vertical-align:top}
th{background:#eee}td.n{text-align:right;font-variant-numeric:tabular-nums;white-space:nowrap}
.st{font-weight:bold;padding:0 .35em;border:1px solid;border-radius:.2em;white-space:nowrap}
.agree{color:#175e2b;border-color:#175e2b}.disagree,.invalid,.fails{color:#a3142c;border-color:#a3142c}
.unconfirmed{color:#7a5600;border-color:#7a5600}
.counts{font-size:1.05em;margin:.4em 0}.counts b{font-size:1.15em}
.caution{border:2px solid #7a5600;background:#fff8e6;padding:.5em .8em;margin:.8em 0}
.note{border-left:4px solid #a3142c;background:#fdf0f2;padding:.3em .7em;margin:.5em 0}
.warning{border-left:4px solid #7a5600;background:#fff8e6;padding:.3em .7em;margin:.5em 0}
.warn{color:#7a5600;border-color:#7a5600}
.muted{color:#555;font-size:.9em}code,.mono{font-family:monospace;font-size:.92em;word-break:break-all}
details{margin:.4em 0}summary{cursor:pointer;font-weight:bold}
svg.plot{max-width:100%;height:auto;border:1px solid #ddd;background:#fff}
@media print{details{display:block}body{max-width:none}}
)";

std::string st_badge(const std::string& word) {
  return "<span class=\"st " + html_escape(word) + "\">" + html_escape(word) + "</span>";
}

int rank(BeamStatus s) {
  switch (s) {
    case BeamStatus::Invalid: return 0;
    case BeamStatus::Disagree: return 1;
    case BeamStatus::Unconfirmed: return 2;
    case BeamStatus::Agree: return 3;
  }
  return 4;
}

// The display units of a beam in words (display_units.h).
std::string shown_units_text(const Report& b, const HtmlOptions& opt) {
  const DisplayUnits u = display_units(b.units, opt.show);
  return html_escape("force " + u.force.label + ", moment " + u.moment.label + ", x " + u.length.label + ", deflection " +
                     u.deflection.label + ", rotation rad");
}

std::string sci(double v) {
  if (!std::isfinite(v)) return "n/a";
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.1e", v);
  return buf;
}

double largest_difference(const Report& b) {
  double m = 0;
  for (const auto& s : b.sets)
    if (s.ok_count() >= 2)
      for (std::size_t k = 0; k < 4; ++k) m = std::max(m, s.max_difference[k]);
  return m;
}

std::string methods_cell(const Report& b) {
  if (b.sets.empty()) return "-";
  // Over all load sets: how many methods were ok in the worst set.
  std::size_t ok = b.sets[0].methods.size(), total = b.sets[0].methods.size();
  std::vector<std::string> out;
  for (const auto& s : b.sets) {
    ok = std::min(ok, s.ok_count());
    for (const auto& m : s.methods)
      if (m.status != MethodStatus::Ok &&
          std::find(out.begin(), out.end(), m.name + " " + method_status_name(m.status)) == out.end())
        out.push_back(m.name + " " + method_status_name(m.status));
  }
  std::string r = std::to_string(ok) + "/" + std::to_string(total) + " ok";
  for (const auto& o : out) r += "; " + o;
  return r;
}

Kind claim_kind(input::Quantity q) {
  using Q = input::Quantity;
  switch (q) {
    case Q::Shear: return Kind::Shear;
    case Q::Reaction: return Kind::Reaction;
    case Q::Deflection: case Q::MaxDeflection: return Kind::Deflection;
    case Q::Rotation: return Kind::Rotation;
    default: return Kind::Moment;
  }
}

// A beam that needs an engineer's attention: not agreeing, a failed claim,
// a span over its deflection limit.
bool needs_attention(const Report& b) {
  return b.status != BeamStatus::Agree || b.claims_failed() > 0 || b.limits_failed() > 0;
}

// The beams as the writer reads them: in file order, owned by the caller.
class BeamList {
 public:
  explicit BeamList(const std::vector<const Report*>& beams) : p_(beams) {}
  std::size_t size() const { return p_.size(); }
  bool empty() const { return p_.empty(); }
  const Report& operator[](std::size_t i) const { return *p_[i]; }

 private:
  const std::vector<const Report*>& p_;
};

struct Writer {
  std::ostream& o;
  const HtmlOptions& opt;
  HtmlStats stats;
  bool no_gnuplot = false;
  std::map<std::string, std::string> hashes;  // path -> sha256 or reason

  const std::string& hash_of(const std::string& path) {
    auto it = hashes.find(path);
    if (it != hashes.end()) return it->second;
    auto h = sha256_file(path);
    return hashes[path] = h ? *h : std::string("(file not readable)");
  }

  void summary(const BeamList& beams, const std::vector<std::size_t>& order) {
    Summary s;
    for (std::size_t i = 0; i < beams.size(); ++i) s.add(beams[i].status, beams[i].claims_failed(), beams[i].limits_failed());
    o << "<section id=\"summary\"><h2>Summary</h2>\n<p class=\"counts\"><b>" << s.beams << "</b> "
      << (s.beams == 1 ? "beam" : "beams") << ": <b>" << s.agree << "</b> agree, <b>" << s.disagree
      << "</b> disagree, <b>" << s.unconfirmed << "</b> unconfirmed, <b>" << s.invalid << "</b> invalid; <b>"
      << s.claims_failed << "</b> " << (s.claims_failed == 1 ? "claim fails" : "claims fail") << ".</p>\n";
    {
      std::size_t warned = 0;
      for (std::size_t i = 0; i < beams.size(); ++i) warned += beams[i].warnings.empty() ? 0 : 1;
      if (warned > 0)
        o << "<p class=\"warning\" id=\"summary-warnings\"><b>" << warned << "</b> "
          << (warned == 1 ? "beam has" : "beams have") << " warnings (marked below; see each beam's section).</p>\n";
    }
    if (beams.empty()) {
      o << "<p>No beams.</p></section>\n";
      return;
    }
    const bool fold = beams.size() > opt.fold_agreeing_after;
    auto head = [&] {
      o << "<table class=\"summary\"><tr><th>#</th><th>file</th><th>title</th><th>status</th><th>methods</th>"
           "<th>largest difference</th><th>claims failed</th></tr>\n";
    };
    const bool brief = fold && !opt.all_details;  // agreeing beams have no section of their own
    auto row = [&](std::size_t i) {
      const Report& b = beams[i];
      o << "<tr><td class=\"n\">" << i + 1 << "</td><td class=\"mono\">"
        << (brief && !needs_attention(b) ? html_escape(b.file)
                                         : "<a href=\"#" + beam_anchor(i) + "\">" + html_escape(b.file) + "</a>")
        << "</td><td>" << html_escape(b.title) << "</td><td>"
        << st_badge(beam_status_name(b.status))
        << (b.warnings.empty() ? std::string()
                               : " <span class=\"st warn\" title=\"see the beam's section\">" +
                                     std::to_string(b.warnings.size()) +
                                     (b.warnings.size() == 1 ? " warning" : " warnings") + "</span>")
        << "</td><td>" << html_escape(methods_cell(b)) << "</td><td class=\"n\">"
        << (b.status == BeamStatus::Invalid ? "-" : sci(largest_difference(b))) << "</td><td class=\"n\">"
        << b.claims_failed() << " of " << b.claims.size() << "</td></tr>\n";
    };
    std::size_t problems = 0;
    for (std::size_t i : order)
      if (needs_attention(beams[i])) ++problems;
    if (!fold) {
      head();
      for (std::size_t i : order) row(i);
      o << "</table>\n";
    } else {
      if (problems > 0) {
        o << "<h3>Beams with a problem (" << problems << ")</h3>\n";
        head();
        for (std::size_t i : order)
          if (needs_attention(beams[i])) row(i);
        o << "</table>\n";
      } else {
        o << "<p>No beam has a problem.</p>\n";
      }
      o << "<details><summary>Beams whose methods agree and whose checks hold (" << beams.size() - problems
        << ")" << (brief ? ": listed here only (every beam's detail: --html-all)" : "") << "</summary>\n";
      head();
      for (std::size_t i : order)
        if (!needs_attention(beams[i])) row(i);
      o << "</table></details>\n";
    }
    o << "<p class=\"muted\">Largest difference: the largest difference between two methods in moment, shear, "
         "reaction or deflection, as a fraction of the largest value of that kind in the beam.</p>\n";
    o << "</section>\n";
  }

  void plot(const Report& b, std::size_t bi, std::size_t si, bool plotted, bool open) {
    if (!opt.plots) return;
    o << "<details class=\"plots\"" << (open ? " open" : "") << "><summary>Diagrams";
    if (b.sets.size() > 1) o << " (load set " << html_escape(b.sets[si].name) << ")";
    o << "</summary>\n";
    if (!plotted) {
      ++stats.plots_skipped;
      o << "<p class=\"note\">Not plotted here (plots are limited to " << opt.max_plotted_beams
        << " beams in one report, problems first); run <code>trivet plot " << html_escape(b.file)
        << " -o plot.svg</code>.</p>\n";
    } else if (no_gnuplot) {
      ++stats.plots_skipped;
      o << "<p class=\"note\">No diagrams: " << html_escape(stats.plot_error) << "</p>\n";
    } else {
      RenderOptions ro = opt.render;
      ro.format = ImageFormat::Svg;
      ro.width = opt.plot_width;
      ro.height = opt.plot_height;
      PlotData data = thinned(plot_data(b, si, opt.show), opt.max_points);
      data.agreement = opt.agreement;
      std::string err;
      const std::string svg = render(data, ro, &err);
      if (svg.empty()) {
        ++stats.plots_skipped;
        if (stats.plot_error.empty()) stats.plot_error = err;
        o << "<p class=\"note\">No diagrams: " << html_escape(err) << "</p>\n";
      } else {
        ++stats.plots;
        o << svg_for_html(svg, "b" + std::to_string(bi + 1) + "s" + std::to_string(si + 1) + "-") << "\n";
        o << "<p class=\"muted\">Each method's curve is drawn in its own dash pattern: where they agree they "
             "lie on one line. Moment: sagging positive, drawn below the axis (tension side). Deflection: "
             "downward positive, drawn downward. Bottom panel: each method minus the consensus, divided by "
             "the largest value of that kind. Every station is kept up to "
          << opt.max_points << " points per curve; beyond that extremes and jumps are kept.</p>\n";
        for (const auto& n : data.notes) o << "<p class=\"muted\">" << html_escape(n) << "</p>\n";
      }
    }
    o << "</details>\n";
  }

  // An envelope load set: the combination, each node's reaction envelope
  // and each span's extremes of moment_max and moment_min, with what
  // governs them (consensus of the methods).
  void envelope_tables(const Report& b, const LoadSet& set) {
    const DisplayUnits u = display_units(b.units, opt.show);
    const std::string F = html_escape(u.force.label), L = html_escape(u.length.label), FL = html_escape(u.moment.label);
    const std::string D = html_escape(u.deflection.label);
    const int dm = decimals_for(u.moment(set.scale[static_cast<std::size_t>(Kind::Moment)]));
    const int dr = decimals_for(std::max(u.force(set.scale[static_cast<std::size_t>(Kind::Reaction)]), 1e-300));
    const Beam& beam = set.beam;
    const std::size_t nn = beam.node_count();
    std::vector<double> node_x(nn, 0.0);
    for (std::size_t i = 1; i < nn; ++i) node_x[i] = node_x[i - 1] + u.length(beam.spans[i - 1].length);
    const int dx = std::max(2, decimals_for(nn ? node_x[nn - 1] : 1.0) - 1);
    auto governs = [&](const Governs& g) {
      return set.combination ? html_escape(describe(g, *set.combination)) : std::string();
    };
    if (set.combination) {
      const input::Combination& c = *set.combination;
      if (set.moving && c.factors.empty()) {
        o << "<p class=\"envelope-combination\">Envelope of moving load <b>" << html_escape(set.name) << "</b> over every position";
        o << (set.moving->both_directions ? ", running either way" : ", running forward only") << ": ";
        for (std::size_t k = 0; k < set.moving->points.size(); ++k)
          o << (k ? "; " : "") << shown_number(u.force(set.moving->points[k].P)) << " " << F << " at "
            << shown_number(u.length(set.moving->points[k].offset)) << " " << L;
      } else {
        o << "<p class=\"envelope-combination\">Envelope of combination <b>" << html_escape(set.name) << "</b>: ";
      }
      for (std::size_t k = 0; k < c.factors.size(); ++k) {
        const input::Factor& f = c.factors[k].second;
        o << (k ? " + " : "")
          << html_escape(f.range ? input::format_number(f.low) + " or " + input::format_number(f.high)
                                 : input::format_number(f.low))
          << " &times; " << html_escape(c.factors[k].first);
      }
      if (c.moving && !c.factors.empty())
        o << " + " << html_escape(input::format_number(c.moving->second)) << " &times; " << html_escape(c.moving->first)
          << " (moving, at its worst position)";
      if (!c.pattern.empty()) {
        o << "; patterned span by span: ";
        for (std::size_t k = 0; k < c.pattern.size(); ++k) o << (k ? ", " : "") << html_escape(c.pattern[k]);
        o << (c.arrangements == input::Arrangements::All ? " (every arrangement)" : " (all, alternate and adjacent spans)");
      }
      if (!c.source.empty()) o << "; factors: " << html_escape(c.source);
      o << ".</p>\n";
    }
    const auto& re = set.consensus_envelope.reaction;
    if (!re.empty()) {
      o << "<table class=\"envelope-reactions\"><tr><th>node</th><th>x [" << L << "]</th><th>reaction max [" << F
        << "]</th><th>governed by</th><th>reaction min [" << F << "]</th><th>governed by</th></tr>\n";
      for (std::size_t i = 0; i < re.size() && i < nn; ++i) {
        const Support& sup = beam.supports[i];
        if (!(restrains_deflection(sup.type) || sup.type == SupportType::Spring)) continue;
        o << "<tr><td>" << html_escape(i < beam.labels.size() ? beam.labels[i] : input::default_label(i))
          << "</td><td class=\"n\">" << fixed(node_x[i], dx) << "</td><td class=\"n\">" << fixed(u.force(re[i].max), dr)
          << "</td><td>" << governs(governs_of(re[i].max_by)) << "</td><td class=\"n\">" << fixed(u.force(re[i].min), dr) << "</td><td>"
          << governs(governs_of(re[i].min_by)) << "</td></tr>\n";
      }
      o << "</table>\n";
    }
    if (!set.extremes.empty()) {
      o << "<table class=\"envelope-extremes\"><tr><th>span</th><th>largest moment_max [" << FL << "]</th><th>at x ["
        << L << "]</th><th>governed by</th><th>smallest moment_min [" << FL << "]</th><th>at x [" << L
        << "]</th><th>governed by</th></tr>\n";
      for (std::size_t i = 0; i < set.extremes.size(); ++i) {
        const SpanExtremes& e = set.extremes[i];
        o << "<tr><td>" << i + 1 << "</td><td class=\"n\">" << fixed(u.moment(e.max_moment), dm) << "</td><td class=\"n\">"
          << fixed(u.length(e.max_moment_x), dx) << "</td><td>" << html_escape(e.max_moment_by) << "</td><td class=\"n\">"
          << fixed(u.moment(e.min_moment), dm) << "</td><td class=\"n\">" << fixed(u.length(e.min_moment_x), dx) << "</td><td>"
          << html_escape(e.min_moment_by) << "</td></tr>\n";
      }
      o << "</table>\n";
      const int dd = decimals_for(u.deflection(set.scale[static_cast<std::size_t>(Kind::Deflection)]));
      o << "<table class=\"envelope-deflections\"><tr><th>span</th><th>largest deflection [" << D << "]</th><th>at x ["
        << L << "]</th><th>governed by</th></tr>\n";
      for (std::size_t i = 0; i < set.extremes.size(); ++i) {
        const SpanExtremes& e = set.extremes[i];
        o << "<tr><td>" << i + 1 << "</td><td class=\"n\">" << fixed(u.deflection(e.max_deflection), dd) << "</td><td class=\"n\">"
          << fixed(u.length(e.max_deflection_x), dx) << "</td><td>" << html_escape(e.max_deflection_by) << "</td></tr>\n";
      }
      o << "</table>\n";
    }
    second_route_table(b, set, dx);
  }

  // The second route: each value the envelope reports as governing, and its
  // arrangement solved directly by every method.
  void second_route_table(const Report& b, const LoadSet& set, int dx) {
    const DisplayUnits u = display_units(b.units, opt.show);
    const std::string L = html_escape(u.length.label);
    // Each value in its kind's display unit, to the digits the kind's largest value needs.
    auto shown = [&](const RouteCheck& rc, double v) {
      const bool defl = rc.quantity == "max_deflection", react = rc.quantity.rfind("reaction", 0) == 0;
      const Kind k = defl ? Kind::Deflection : react ? Kind::Reaction : Kind::Moment;
      const DisplayUnit& ku = u.of(k);
      const int d = decimals_for(std::max(ku(set.scale[static_cast<std::size_t>(k)]), 1e-300)) + 2;
      return fixed(ku(v), d) + " " + html_escape(ku.label);
    };
    if (set.second_route.empty()) return;
    std::size_t holds = 0;
    for (const auto& rc : set.second_route) holds += rc.holds;
    o << "<details class=\"second-route\"" << (holds == set.second_route.size() ? "" : " open")
      << "><summary>Second route: " << set.second_route.size()
      << " governing values re-solved directly by every method, " << holds << " reproduced</summary>\n";
    o << (set.moving ? "<p>Each value the envelope reports as governing, and the position of the train that governs it, "
                       : "<p>Each value the envelope reports as governing, and the arrangement that governs it, with its factors, ")
      << "solved directly as an ordinary load set by every method; the difference is relative to the largest value of "
         "its kind.</p>\n";
    o << "<table class=\"second-route\"><tr><th>value</th><th>where</th><th>x [" << L
      << "]</th><th>arrangement</th><th>envelope</th>";
    for (const auto& m : set.methods) o << "<th>" << html_escape(m.name) << "</th>";
    o << "<th>difference</th><th>holds</th></tr>\n";
    for (const auto& rc : set.second_route) {
      o << "<tr><td>" << html_escape(rc.quantity) << "</td><td>" << html_escape(rc.where) << "</td><td class=\"n\">"
        << fixed(u.length(rc.x), dx) << "</td><td>" << html_escape(rc.arrangement) << "</td><td class=\"n\">"
        << shown(rc, rc.envelope) << "</td>";
      for (const auto& m : set.methods) {
        const auto it = std::find_if(rc.values.begin(), rc.values.end(), [&](const auto& p) { return p.first == m.name; });
        o << "<td class=\"n\">" << (it == rc.values.end() ? std::string("-") : shown(rc, it->second)) << "</td>";
      }
      char buf[32];
      std::snprintf(buf, sizeof buf, "%.1e", rc.difference);
      o << "<td class=\"n\">" << buf << "</td><td>" << (rc.holds ? "yes" : "<b>NO</b>") << "</td></tr>\n";
    }
    o << "</table></details>\n";
  }

  // Another program's results (--against): per comparison, per quantity.
  void against_summary(const Report& b) {
    if (b.against.empty()) return;
    o << "<h3>Another program's results</h3>\n";
    for (const auto& ptr : b.against) {
      if (!ptr) continue;
      const against::Comparison& c = *ptr;
      o << "<p><code>" << html_escape(c.file) << "</code>: " << against::table_kind_name(c.kind) << " table"
        << (c.load_case.empty() ? "" : ", load case " + html_escape(c.load_case)) << " "
        << (c.ok() ? (c.holds() ? st_badge("holds") : st_badge("fails")) : st_badge("invalid")) << "</p>\n";
      if (!c.ok()) {
        o << "<ul>\n";
        for (const auto& e : c.errors) o << "<li class=\"fails\">" << html_escape(e.format(c.file)) << "</li>\n";
        if (c.errors_not_listed > 0) o << "<li>and " << c.errors_not_listed << " more</li>\n";
        o << "</ul>\n";
        continue;
      }
      o << "<table class=\"against\"><tr><th>quantity</th><th>rows</th><th>failing</th><th>worst difference</th>"
           "<th>where</th><th>tolerance</th><th>finding</th></tr>\n";
      const DisplayUnits u = display_units(b.units, opt.show);
      for (const auto& s : c.summary) {
        const DisplayUnit& du = u.of(s.quantity);
        const std::string unit = html_escape(du.label);
        const int d = decimals_for(std::max(std::abs(du(s.worst_difference)), std::abs(du(s.tolerance)))) + 1;
        o << "<tr><td>" << html_escape(against::quantity_name(s.quantity)) << "</td><td class=\"n\">" << s.compared
          << "</td><td class=\"n\">" << s.failing << "</td><td class=\"n\">" << fixed(du(s.worst_difference), d) << " "
          << unit << "</td><td>" << html_escape(s.worst_where)
          << (s.worst_line ? " (line " + std::to_string(s.worst_line) + ")" : std::string()) << "</td><td class=\"n\">"
          << fixed(du(s.tolerance), d) << " " << unit << "</td><td>"
          << html_escape(s.finding ? s.finding->text : s.note)
          << (s.empty ? html_escape((s.finding || !s.note.empty() ? "; " : "") + std::to_string(s.empty) +
                                    (s.empty == 1 ? " cell" : " cells") + " of this column empty: not compared")
                      : std::string())
          << "</td></tr>\n";
      }
      o << "</table>\n";
    }
  }

  void beam(const Report& b, std::size_t bi, bool plotted, bool open_plots) {
    o << "<section class=\"beam\" id=\"" << beam_anchor(bi) << "\">\n<h2>" << bi + 1 << ". <span class=\"mono\">"
      << html_escape(b.file) << "</span> " << st_badge(beam_status_name(b.status));
    if (const std::string why = status_reasons(b); !why.empty()) o << " <span class=\"why\">" << html_escape(why) << "</span>";
    o << "</h2>\n";
    if (!b.title.empty()) o << "<p><b>" << html_escape(b.title) << "</b></p>\n";
    o << "<p class=\"muted\">input <code>" << html_escape(b.file) << "</code>, SHA-256 <code>"
      << html_escape(hash_of(b.file)) << "</code>; file units " << html_escape(b.units.force) << ", "
      << html_escape(b.units.length) << "; shown in " << shown_units_text(b, opt) << ". <a href=\"#summary\">back to the summary</a></p>\n";
    if (!b.warnings.empty()) {
      o << "<div class=\"warning beam-warnings\"><b>" << (b.warnings.size() == 1 ? "Warning" : "Warnings")
        << ".</b><ul>\n";
      for (const auto& w : b.warnings) o << "<li>" << html_escape(w) << "</li>\n";
      o << "</ul></div>\n";
    }
    if (b.status == BeamStatus::Invalid) {
      o << "<ul>\n";
      for (const auto& e : b.errors) o << "<li class=\"fails\">" << html_escape(e.format(b.file)) << "</li>\n";
      o << "</ul>\n</section>\n";
      return;
    }
    const DisplayUnits u = display_units(b.units, opt.show);
    const std::string F = html_escape(u.force.label), L = html_escape(u.length.label), FL = html_escape(u.moment.label);
    const std::string D = html_escape(u.deflection.label);
    for (std::size_t si = 0; si < b.sets.size(); ++si) {
      const LoadSet& set = b.sets[si];
      o << "<h3>Load set " << html_escape(set.name) << ": methods " << st_badge(verdict_name(set.verdict)) << "</h3>\n";
      if (!set.problem.empty()) o << "<p class=\"note\">" << html_escape(set.problem) << "</p>\n";
      // Methods and comparisons.
      o << "<table><tr><th>method</th><th>status</th><th>equilibrium: vertical forces</th>"
           "<th>equilibrium: moments</th><th>note</th></tr>\n";
      for (const auto& m : set.methods) {
        const bool ok = m.status == MethodStatus::Ok;
        o << "<tr><td>" << html_escape(m.name) << "</td><td>" << html_escape(method_status_name(m.status))
          << "</td><td class=\"n\">" << (ok ? sci(m.equilibrium.force_residual) : "-") << "</td><td class=\"n\">"
          << (ok ? sci(m.equilibrium.moment_residual) : "-") << "</td><td>" << html_escape(m.reason)
          << (m.name == set.odd_one_out ? " <b>disagrees with the others</b>" : "") << "</td></tr>\n";
      }
      o << "</table>\n";
      if (set.ok_count() >= 2) {
        o << "<table><tr><th>largest difference between methods</th>";
        for (std::size_t k = 0; k < 4; ++k) o << "<th>" << kind_name(static_cast<Kind>(k)) << "</th>";
        o << "</tr><tr><td>fraction of the largest value</td>";
        for (std::size_t k = 0; k < 4; ++k) o << "<td class=\"n\">" << sci(set.max_difference[k]) << "</td>";
        o << "</tr></table>\n";
        if (set.worst) {
          const Worst& w = *set.worst;
          // A place given by x is written again in the display length unit.
          const std::string where = w.where.rfind("x = ", 0) == 0 ? "x = " + shown_number(u.length(w.x)) + " " + u.length.label
                                                                  : w.where;
          o << "<p>Worst agreement: " << kind_name(w.kind) << " at " << html_escape(where) << ":";
          const DisplayUnit& wu = u.of(w.kind);
          const int d = decimals_for(wu(set.scale[static_cast<std::size_t>(w.kind)])) + 2;
          for (std::size_t i = 0; i < w.values.size(); ++i)
            o << (i ? ", " : " ") << html_escape(w.values[i].first) << " " << fixed(wu(w.values[i].second), d);
          o << " " << html_escape(wu.label);
          o << ".</p>\n";
        }
      }
      if (!set.consensus_nodes.empty()) {
        const int dm = decimals_for(u.moment(set.scale[static_cast<std::size_t>(Kind::Moment)]));
        const int dr = decimals_for(std::max(u.force(set.scale[static_cast<std::size_t>(Kind::Reaction)]), 1e-300));
        const int dd = decimals_for(u.deflection(set.scale[static_cast<std::size_t>(Kind::Deflection)]));
        const int dt = decimals_for(set.scale[static_cast<std::size_t>(Kind::Rotation)]);
        double xmax = 0;
        for (const auto& n : set.consensus_nodes) xmax = std::max(xmax, std::abs(u.length(n.x)));
        const int dx = std::max(2, decimals_for(xmax) - 1);
        const std::size_t n = set.consensus_nodes.size();
        const bool fold_nodes = n > 30;
        if (fold_nodes) o << "<details><summary>Nodes (" << n << ")</summary>\n";
        else o << "<p class=\"muted\">Nodes: consensus of the methods (median).</p>\n";
        o << "<table><tr><th>node</th><th>x [" << L << "]</th><th>M left [" << FL << "]</th><th>M right [" << FL
          << "]</th><th>reaction [" << F << "]</th><th>reaction moment [" << FL << "]</th><th>deflection [" << D
          << "]</th><th>rotation [rad]</th></tr>\n";
        for (std::size_t i = 0; i < n; ++i) {
          const NodeResult& c = set.consensus_nodes[i];
          const std::string rot = std::abs(c.rotation_left - c.rotation_right) > 1e-9 * set.scale[4]
                                      ? fixed(c.rotation_left, dt) + " / " + fixed(c.rotation_right, dt)
                                      : fixed(i == 0 ? c.rotation_right : c.rotation_left, dt);
          o << "<tr><td>" << html_escape(i < set.beam.labels.size() ? set.beam.labels[i] : input::default_label(i))
            << "</td><td class=\"n\">" << fixed(u.length(c.x), dx) << "</td><td class=\"n\">"
            << (c.moment_left ? fixed(u.moment(*c.moment_left), dm) : "-") << "</td><td class=\"n\">"
            << (c.moment_right ? fixed(u.moment(*c.moment_right), dm) : "-") << "</td><td class=\"n\">"
            << fixed(u.force(c.reaction_force), dr) << "</td><td class=\"n\">" << fixed(u.moment(c.reaction_moment), dm)
            << "</td><td class=\"n\">" << fixed(u.deflection(c.deflection), dd) << "</td><td class=\"n\">" << rot << "</td></tr>\n";
        }
        o << "</table>\n";
        if (fold_nodes) o << "</details>\n";
        const std::size_t ns = set.extremes.size();
        if (ns > 30) o << "<details><summary>Span extremes (" << ns << ")</summary>\n";
        o << "<table><tr><th>span</th><th>max sagging [" << FL << "]</th><th>at x [" << L << "]</th><th>max hogging ["
          << FL << "]</th><th>at x [" << L << "]</th><th>max deflection [" << D << "]</th><th>at x [" << L
          << "]</th></tr>\n";
        for (std::size_t i = 0; i < ns; ++i) {
          const SpanExtremes& e = set.extremes[i];
          const bool sag = is_sagging(set, e.max_moment), hog = is_hogging(set, e.min_moment);
          o << "<tr><td>" << i + 1 << "</td><td class=\"n\">" << (sag ? fixed(u.moment(e.max_moment), dm) : "-")
            << "</td><td class=\"n\">" << (sag ? fixed(u.length(e.max_moment_x), dx) : "") << "</td><td class=\"n\">"
            << (hog ? fixed(u.moment(e.min_moment), dm) : "-") << "</td><td class=\"n\">"
            << (hog ? fixed(u.length(e.min_moment_x), dx) : "") << "</td><td class=\"n\">"
            << fixed(u.deflection(e.max_deflection), dd) << "</td><td class=\"n\">" << fixed(u.length(e.max_deflection_x), dx)
            << "</td></tr>\n";
        }
        o << "</table>\n";
        if (ns > 30) o << "</details>\n";
      }
      if (set.envelope) envelope_tables(b, set);
      plot(b, bi, si, plotted, open_plots);
    }
    against_summary(b);
    for (const auto& set : b.sets) {
      if (set.deflection_checks.empty()) continue;
      const auto [over, dd] = limits_brief(set, u.deflection.factor);
      o << "<h3>Deflection limits, " << html_escape(set.name) << " (" << over << " of " << set.deflection_checks.size()
        << " spans over)</h3>\n";
      o << "<table><tr><th>span</th><th>limit</th><th>max deflection [" << D << "]</th><th>at x [" << L
        << "]</th><th>allowed [" << D << "]</th><th>span/deflection</th><th>holds</th></tr>\n";
      for (const auto& d : set.deflection_checks)
        o << "<tr><td class=\"n\">" << d.span + 1 << "</td><td>" << html_escape(d.limit) << "</td><td class=\"n\">"
          << fixed(u.deflection(d.deflection), dd) << "</td><td class=\"n\">" << fixed(u.length(d.x), 2) << "</td><td class=\"n\">"
          << fixed(u.deflection(d.allowed), dd) << "</td><td class=\"n\">" << (std::isfinite(d.ratio) ? fixed(d.ratio, 0) : "-")
          << "</td><td>" << (d.holds ? st_badge("holds") : st_badge("fails")) << "</td></tr>\n";
      o << "</table>\n";
    }
    if (!b.claims.empty()) {
      o << "<h3>Claims (" << b.claims_failed() << " of " << b.claims.size() << " fail)</h3>\n";
      const bool sourced =
          std::any_of(b.claims.begin(), b.claims.end(), [](const ClaimResult& r) { return !r.claim.source.empty(); });
      o << "<table><tr><th>claim</th><th>quantity</th><th>where</th><th>load set</th><th>claimed</th><th>computed</th>"
           "<th>difference</th><th>tolerance</th><th>holds</th>"
        << (sourced ? "<th>from</th>" : "") << "</tr>\n";
      for (std::size_t i = 0; i < b.claims.size(); ++i) {
        const ClaimResult& r = b.claims[i];
        (void)claim_kind(r.claim.quantity);
        const DisplayUnit& cu = u.of(r.claim.quantity);
        const int d = decimals_for(std::max(std::abs(cu(r.claim.value)), std::abs(cu(r.computed)))) + 1;
        // A claim at x: its place in the display length unit.
        std::string where = r.claim.x && !r.claim.node && !r.claim.span ? "x = " + shown_number(u.length(*r.claim.x)) + " " + u.length.label
                                                                        : r.label;
        if (r.claim.side != input::Side::Unspecified) where += r.claim.side == input::Side::Left ? " (left)" : " (right)";
        const std::string& unit = cu.label;
        o << "<tr><td class=\"n\">" << i + 1 << "</td><td>" << html_escape(input::quantity_name(r.claim.quantity))
          << " [" << html_escape(unit) << "]</td><td>" << html_escape(where) << "</td><td>" << html_escape(r.load_case)
          << "</td><td class=\"n\">" << fixed(cu(r.claim.value), d) << "</td><td class=\"n\">"
          << (r.evaluated ? fixed(cu(r.computed), d) : "-") << "</td><td class=\"n\">"
          << (r.evaluated ? fixed(cu(r.difference), d) : "-") << "</td><td class=\"n\">" << fixed(cu(r.tolerance), d)
          << "</td><td>" << (r.holds ? st_badge("holds") : st_badge("fails")) << "</td>";
        if (sourced) o << "<td>" << html_escape(r.claim.source.empty() ? "beam file" : r.claim.source) << "</td>";
        o << "</tr>\n";
        const char* span = sourced ? "9" : "8";
        if (!r.reason.empty())
          o << "<tr><td></td><td colspan=\"" << span << "\">" << html_escape(r.reason) << "</td></tr>\n";
        if (!r.finding.empty())
          o << "<tr><td></td><td colspan=\"" << span << "\">finding: " << html_escape(r.finding) << "</td></tr>\n";
      }
      o << "</table>\n";
    }
    o << "</section>\n";
  }
};

const char* kRecordCss = R"(
.record-head td{min-width:16em}.record-head td.blank{height:1.9em;border-bottom:1px solid #444}
.governing td:first-child{white-space:nowrap}
@media print{@page{margin:14mm}h1,h2,h3,summary{break-after:avoid;page-break-after:avoid}
table,svg,.caution,.record-head{break-inside:avoid;page-break-inside:avoid}
a{color:inherit;text-decoration:none}}
a[href="#summary"]{display:none}
)";

// The governing values of one load set, in the load set's units: each a
// row of what, value, where.
void governing_rows(std::ostream& o, const LoadSet& set, const DisplayUnits& u) {
  const std::string F = html_escape(u.force.label), L = html_escape(u.length.label), FL = html_escape(u.moment.label);
  const std::string D = html_escape(u.deflection.label);
  const int dm = decimals_for(u.moment(set.scale[static_cast<std::size_t>(Kind::Moment)]));
  const int dv = decimals_for(u.force(set.scale[static_cast<std::size_t>(Kind::Shear)]));
  const int dr = decimals_for(std::max(u.force(set.scale[static_cast<std::size_t>(Kind::Reaction)]), 1e-300));
  const int dd = decimals_for(u.deflection(set.scale[static_cast<std::size_t>(Kind::Deflection)]));
  const int dx = 2;
  auto row = [&](const std::string& what, const std::string& value, const std::string& where) {
    o << "<tr><td>" << what << "</td><td class=\"n\">" << value << "</td><td>" << where << "</td></tr>\n";
  };
  // Span extremes: largest sagging and hogging, largest deflection.
  std::size_t smax = 0, smin = 0, sdef = 0;
  for (std::size_t i = 0; i < set.extremes.size(); ++i) {
    if (set.extremes[i].max_moment > set.extremes[smax].max_moment) smax = i;
    if (set.extremes[i].min_moment < set.extremes[smin].min_moment) smin = i;
    if (std::abs(set.extremes[i].max_deflection) > std::abs(set.extremes[sdef].max_deflection)) sdef = i;
  }
  if (!set.extremes.empty()) {
    const SpanExtremes& a = set.extremes[smax];
    const SpanExtremes& c = set.extremes[smin];
    const SpanExtremes& d = set.extremes[sdef];
    auto by = [](const std::string& t) { return t.empty() ? std::string() : "; " + html_escape(t); };
    row("largest sagging moment [" + FL + "]", is_sagging(set, a.max_moment) ? fixed(u.moment(a.max_moment), dm) : "none",
        is_sagging(set, a.max_moment) ? "span " + std::to_string(smax + 1) + ", x = " + fixed(u.length(a.max_moment_x), dx) + " " + L + by(a.max_moment_by) : "");
    row("largest hogging moment [" + FL + "]", is_hogging(set, c.min_moment) ? fixed(u.moment(c.min_moment), dm) : "none",
        is_hogging(set, c.min_moment) ? "span " + std::to_string(smin + 1) + ", x = " + fixed(u.length(c.min_moment_x), dx) + " " + L + by(c.min_moment_by) : "");
    std::string ratio;
    for (const auto& dc : set.deflection_checks)
      if (dc.span == sdef)
        ratio = "; span/deflection " + (std::isfinite(dc.ratio) ? fixed(dc.ratio, 0) : std::string("-")) + " against " +
                html_escape(dc.limit) + (dc.holds ? " (holds)" : " (fails)");
    row("largest deflection [" + D + "]", fixed(u.deflection(d.max_deflection), dd),
        "span " + std::to_string(sdef + 1) + ", x = " + fixed(u.length(d.max_deflection_x), dx) + " " + L + by(d.max_deflection_by) + ratio);
  }
  // Shear and reactions.
  if (set.envelope) {
    const Envelope& e = set.consensus_envelope;
    std::size_t k = 0;
    double best = -1;
    for (std::size_t i = 0; i < e.shear.size() && i < set.stations.size(); ++i)
      for (double v : {e.shear[i].max, e.shear[i].min})
        if (std::abs(v) > best) { best = std::abs(v); k = i; }
    if (best >= 0) {
      const double v = std::abs(e.shear[k].max) >= std::abs(e.shear[k].min) ? e.shear[k].max : e.shear[k].min;
      row("largest shear [" + F + "]", fixed(u.force(v), dv), "x = " + fixed(u.length(set.stations[k].x), dx) + " " + L);
    }
    for (std::size_t j = 0; j < e.reaction.size() && j < set.beam.supports.size(); ++j) {
      const SupportType t = set.beam.supports[j].type;
      if (!restrains_deflection(t) && t != SupportType::Spring) continue;
      row("reaction at node " + html_escape(set.beam.labels[j]) + ", largest / smallest [" + F + "]",
          fixed(u.force(e.reaction[j].max), dr) + " / " + fixed(u.force(e.reaction[j].min), dr),
          e.reaction[j].min < 0 ? "uplift: the support must hold the beam down" : "");
    }
  } else {
    std::size_t k = 0;
    double best = -1;
    for (std::size_t i = 0; i < set.consensus_stations.size(); ++i)
      if (std::abs(set.consensus_stations[i].shear) > best) { best = std::abs(set.consensus_stations[i].shear); k = i; }
    if (best >= 0)
      row("largest shear [" + F + "]", fixed(u.force(set.consensus_stations[k].shear), dv),
          "x = " + fixed(u.length(set.consensus_stations[k].x), dx) + " " + L);
    for (std::size_t j = 0; j < set.consensus_nodes.size() && j < set.beam.supports.size(); ++j) {
      const SupportType t = set.beam.supports[j].type;
      if (!restrains_deflection(t) && t != SupportType::Spring) continue;
      const double r = set.consensus_nodes[j].reaction_force;
      row("reaction at node " + html_escape(set.beam.labels[j]) + " [" + F + "]", fixed(u.force(r), dr),
          r < 0 ? "uplift: the support must hold the beam down" : "");
      if (restrains_rotation(t) || set.beam.supports[j].kr > 0)
        row("reaction moment at node " + html_escape(set.beam.labels[j]) + " [" + FL + "]",
            fixed(u.moment(set.consensus_nodes[j].reaction_moment), dm), "counter-clockwise positive");
    }
  }
}

}  // namespace

std::string record_file_name(const std::string& path) {
  std::string s = path;
  while (s.rfind("./", 0) == 0) s.erase(0, 2);
  while (!s.empty() && (s.front() == '/' || s.front() == '.')) s.erase(0, 1);
  if (s.size() > 5 && s.compare(s.size() - 5, 5, ".json") == 0) s.resize(s.size() - 5);
  for (char& c : s)
    if (c == '/' || c == '\\' || c == ':' || static_cast<unsigned char>(c) < 0x20) c = '-';
  if (s.empty()) s = "beam";
  return s + ".html";
}

void write_record(std::ostream& out, const Report& b, const HtmlOptions& opt) {
  Writer w{out, opt, {}, false, {}};
  const std::string date = opt.date_utc.empty() ? utc_now_iso8601() : opt.date_utc;
  const std::string version = opt.tool_version.empty() ? "(version not given)" : opt.tool_version;
  const std::string title = b.title.empty() ? b.file : b.title;
  out << "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n"
         "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n<title>Checking record: "
      << html_escape(title) << "</title>\n<style>" << kCss << kRecordCss << "</style>\n</head>\n<body>\n";
  out << "<header><h1>Checking record: " << html_escape(title) << "</h1>\n";
  out << "<table class=\"record-head\">\n"
      << "<tr><th>beam file</th><td class=\"mono\">" << html_escape(b.file) << "</td><th>project</th><td class=\"blank\"></td></tr>\n"
      << "<tr><th>SHA-256 of the file</th><td class=\"mono\">" << html_escape(w.hash_of(b.file))
      << "</td><th>checked by</th><td class=\"blank\"></td></tr>\n"
      << "<tr><th>checked with</th><td>trivet " << html_escape(version) << ", " << html_escape(date)
      << "</td><th>date</th><td class=\"blank\"></td></tr>\n"
      << "<tr><th>units</th><td>file: " << html_escape(b.units.force) << ", " << html_escape(b.units.length)
      << "; shown in " << shown_units_text(b, opt) << "</td><th>signature</th><td class=\"blank\"></td></tr>\n</table>\n</header>\n";
  out << "<div class=\"caution\"><b>Caution.</b> " << html_escape(caution_text()) << "</div>\n";
  // The result in one paragraph.
  out << "<h2>Result: " << st_badge(beam_status_name(b.status)) << "</h2>\n<p>";
  if (b.status == BeamStatus::Invalid) {
    out << "The file could not be checked: " << b.errors.size() << (b.errors.size() == 1 ? " error" : " errors") << " below.";
  } else {
    double worst = 0;
    for (const auto& set : b.sets)
      for (std::size_t k = 0; k < 4; ++k) worst = std::max(worst, set.max_difference[k]);
    out << b.sets.size() << (b.sets.size() == 1 ? " load set" : " load sets") << "; the methods ("
        << html_escape(methods_cell(b)) << ") differ by at most " << sci(worst)
        << " of the largest value of each kind; " << b.claims_failed() << " of " << b.claims.size()
        << " claims fail; " << b.limits_failed() << " spans over their deflection limit";
    std::size_t compared = 0, failing = 0;
    for (const auto& c : b.against)
      if (c)
        for (const auto& sm : c->summary) {
          compared += sm.compared;
          failing += sm.failing;
        }
    if (compared) out << "; " << failing << " of " << compared << " values compared with the other results fail";
    out << ".";
  }
  out << "</p>\n";
  if (b.status != BeamStatus::Invalid) {
    out << "<h2>Governing values</h2>\n";
    for (const auto& set : b.sets) {
      out << "<h3>Load set " << html_escape(set.name) << (set.envelope ? " (envelope)" : "") << ": methods "
          << st_badge(verdict_name(set.verdict)) << "</h3>\n";
      out << "<table class=\"governing\"><tr><th>value</th><th>consensus</th><th>where, and what governs</th></tr>\n";
      governing_rows(out, set, display_units(b.units, opt.show));
      out << "</table>\n";
    }
  }
  out << "<h2>Detail</h2>\n";
  w.beam(b, 0, true, true);
  out << "<footer><p class=\"caution\"><b>Caution.</b> " << html_escape(caution_text()) << "</p></footer>\n";
  out << "</body>\n</html>\n";
}

HtmlStats write_html(std::ostream& out, const std::vector<Report>& all, const HtmlOptions& opt) {
  std::vector<const Report*> beams;
  beams.reserve(all.size());
  for (const auto& b : all) beams.push_back(&b);
  return write_html(out, beams, opt);
}

HtmlStats write_html(std::ostream& out, const std::vector<const Report*>& pointers, const HtmlOptions& opt) {
  const BeamList beams(pointers);
  Writer w{out, opt, {}, false, {}};
  const std::string date = opt.date_utc.empty() ? utc_now_iso8601() : opt.date_utc;
  // Problems first, then file order.
  std::vector<std::size_t> order(beams.size());
  for (std::size_t i = 0; i < order.size(); ++i) order[i] = i;
  std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
    const int ra = rank(beams[a].status) - (needs_attention(beams[a]) ? 1 : 0) * (beams[a].status == BeamStatus::Agree);
    const int rb = rank(beams[b].status) - (needs_attention(beams[b]) ? 1 : 0) * (beams[b].status == BeamStatus::Agree);
    return ra < rb;
  });
  // Which beams get plots: problems first, up to the limit.
  std::vector<char> plotted(beams.size(), 0);
  {
    std::size_t n = 0;
    for (std::size_t i : order)
      if (beams[i].status != BeamStatus::Invalid && n < opt.max_plotted_beams) {
        plotted[i] = 1;
        ++n;
      }
  }
  const bool large = beams.size() > opt.fold_agreeing_after;

  out << "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n"
         "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n<title>"
      << html_escape(opt.title) << "</title>\n<style>" << kCss << "</style>\n</head>\n<body>\n";
  out << "<header><h1>" << html_escape(opt.title) << "</h1>\n<p class=\"muted\">trivet "
      << html_escape(opt.tool_version.empty() ? "(version not given)" : opt.tool_version) << ", " << html_escape(date)
      << (opt.command_line.empty() ? "" : ", <code>" + html_escape(opt.command_line) + "</code>") << "</p></header>\n";
  out << "<div class=\"caution\" id=\"caution\"><b>Caution.</b> " << html_escape(caution_text()) << "</div>\n";
  if (opt.plots && !find_gnuplot(opt.render.gnuplot)) {
    w.no_gnuplot = true;
    w.stats.plot_error = "gnuplot was not found, so this report has no diagrams; install it (e.g. apt-get install "
                         "gnuplot-nox) and run again";
    out << "<p class=\"note\" id=\"no-plots\">" << html_escape(w.stats.plot_error) << ".</p>\n";
  }
  w.summary(beams, order);
  for (const auto& s : opt.extra_sections) {
    out << "<section class=\"extra\" id=\"" << html_escape(s.id) << "\">\n<h2>" << html_escape(s.heading) << "</h2>\n"
        << s.html << "\n</section>\n";
  }
  for (std::size_t i = 0; i < beams.size(); ++i) {
    const bool problem = needs_attention(beams[i]);
    if (large && !opt.all_details && !problem) continue;  // listed in the summary only
    w.beam(beams[i], i, plotted[i] != 0, !large || problem);
  }
  // Provenance.
  out << "<section id=\"provenance\"><h2>Provenance</h2>\n<table>"
      << "<tr><th>tool</th><td>trivet " << html_escape(opt.tool_version.empty() ? "(version not given)" : opt.tool_version)
      << "</td></tr>\n<tr><th>date (UTC)</th><td>" << html_escape(date) << "</td></tr>\n<tr><th>command line</th><td><code>"
      << html_escape(opt.command_line.empty() ? "(not given)" : opt.command_line) << "</code></td></tr>\n</table>\n";
  if (!beams.empty()) {
    const bool fold = beams.size() > opt.fold_agreeing_after;
    if (fold) out << "<details><summary>Input files and their SHA-256 (" << beams.size() << ")</summary>\n";
    out << "<table><tr><th>#</th><th>input file</th><th>SHA-256</th></tr>\n";
    for (std::size_t i = 0; i < beams.size(); ++i)
      out << "<tr><td class=\"n\">" << i + 1 << "</td><td class=\"mono\">" << html_escape(beams[i].file)
          << "</td><td class=\"mono\">" << html_escape(w.hash_of(beams[i].file)) << "</td></tr>\n";
    out << "</table>\n";
    if (fold) out << "</details>\n";
  }
  out << "</section>\n";
  out << "<footer><p class=\"caution\"><b>Caution.</b> " << html_escape(caution_text()) << "</p></footer>\n";
  out << "</body>\n</html>\n";
  return w.stats;
}

}  // namespace trivet::reports
