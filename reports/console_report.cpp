#include <algorithm>
#include <cmath>
#include <cstdio>
#include <set>
#include <sstream>

#include "harness/compare/against.h"
#include "harness/precision/precision.h"
#include "reports/reports.h"

namespace trivet::reports {

using namespace trivet::compare;

std::string fixed(double v, int decimals) {
  if (!std::isfinite(v)) return "n/a";
  char buf[64];
  // Where fixed notation would be long (and past the digits a double has),
  // scientific notation: a table never shows a cut or invented digit.
  if (std::abs(v) >= 1e15) {
    std::snprintf(buf, sizeof buf, "%.6e", v);
    return buf;
  }
  std::snprintf(buf, sizeof buf, "%.*f", std::clamp(decimals, 0, 20), v);
  std::string s = buf;
  // No "-0.000".
  if (s[0] == '-' && s.find_first_not_of("-0.") == std::string::npos) s = s.substr(1);
  return s;
}

bool is_sagging(const LoadSet& set, double moment) {
  return moment > 1e-12 * set.scale[static_cast<int>(Kind::Moment)] && moment > 0;
}
bool is_hogging(const LoadSet& set, double moment) {
  return moment < -1e-12 * set.scale[static_cast<int>(Kind::Moment)] && moment < 0;
}

int decimals_for(double largest) {
  if (!(largest > 0) || !std::isfinite(largest)) return 3;
  const int mag = static_cast<int>(std::floor(std::log10(largest)));
  return std::clamp(3 - mag, 0, 9);
}

namespace {

const char* kReset = "\033[0m";
const char* kRed = "\033[1;31m";
const char* kGreen = "\033[32m";
const char* kYellow = "\033[33m";

std::string paint(const std::string& s, const char* c, bool on) { return on ? std::string(c) + s + kReset : s; }

std::string status_word(BeamStatus s, bool color) {
  const std::string w = beam_status_name(s);
  switch (s) {
    case BeamStatus::Agree: return paint(w, kGreen, color);
    case BeamStatus::Unconfirmed: return paint(w, kYellow, color);
    default: return paint(w, kRed, color);
  }
}

// A plain text table with right-aligned numeric columns.
struct Table {
  std::vector<std::string> head;
  std::vector<std::vector<std::string>> rows;
  void print(std::ostream& out, const std::string& indent) const {
    std::vector<std::size_t> w(head.size(), 0);
    for (std::size_t c = 0; c < head.size(); ++c) w[c] = head[c].size();
    // A row of one cell is a note (a claim's reason or finding, "... 11
    // nodes not shown ..."): it goes on its own line and widens no column.
    for (const auto& r : rows)
      if (r.size() > 1)
        for (std::size_t c = 0; c < r.size() && c < w.size(); ++c) w[c] = std::max(w[c], r[c].size());
    auto line = [&](const std::vector<std::string>& r) {
      out << indent;
      if (r.size() == 1 && head.size() > 1) { out << r[0] << "\n"; return; }
      for (std::size_t c = 0; c < r.size(); ++c) {
        const std::string& s = r[c];
        const std::size_t pad = w[c] > s.size() ? w[c] - s.size() : 0;
        if (c == 0) out << s << std::string(pad, ' ');
        else out << "  " << std::string(pad, ' ') << s;
      }
      out << "\n";
    };
    line(head);
    std::size_t total = 0;
    for (std::size_t c = 0; c < w.size(); ++c) total += w[c] + (c ? 2 : 0);
    out << indent << std::string(total, '-') << "\n";
    for (const auto& r : rows) {
      if (r.size() == 1) out << indent << r[0] << "\n";
      else line(r);
    }
  }
};

std::string sci(double v) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.1e", v);
  return buf;
}

}  // namespace

LimitsBrief limits_brief(const LoadSet& set, double factor) {
  LimitsBrief b;
  double largest = 0;
  for (const auto& d : set.deflection_checks) {
    b.over += !d.holds;
    largest = std::max(largest, std::max(std::abs(d.deflection), d.allowed));
  }
  b.decimals = decimals_for(largest * std::abs(factor)) + 1;
  return b;
}

std::string status_reasons(const Report& b) {
  if (b.status == BeamStatus::Agree || b.status == BeamStatus::Invalid) return "";
  std::vector<std::string> why;
  std::vector<std::string> disagree, unconfirmed;
  for (const auto& set : b.sets) {
    if (set.verdict == Verdict::Disagree) disagree.push_back(set.name);
    else if (set.verdict == Verdict::Unconfirmed) unconfirmed.push_back(set.name);
  }
  auto sets = [](const std::vector<std::string>& names) {
    if (names.size() == 1) return "load set " + names[0];
    return std::to_string(names.size()) + " load sets";
  };
  if (!disagree.empty()) why.push_back("methods disagree in " + sets(disagree));
  if (!unconfirmed.empty()) why.push_back("fewer than two methods in " + sets(unconfirmed));
  if (const std::size_t n = b.claims_failed()) why.push_back(std::to_string(n) + (n == 1 ? " claim fails" : " claims fail"));
  if (const std::size_t n = b.limits_failed())
    why.push_back(std::to_string(n) + (n == 1 ? " span over its deflection limit" : " spans over their deflection limit"));
  std::size_t other = 0;
  for (const auto& c : b.against)
    if (c && c->ok()) other += c->failing();
  if (other) why.push_back(std::to_string(other) + (other == 1 ? " value of another program fails" : " values of another program fail"));
  std::string text;
  for (std::size_t i = 0; i < why.size(); ++i) text += (i ? ", " : "") + why[i];
  return text;
}

void write_console(std::ostream& out, const Report& b, const ConsoleOptions& opt) {
  // The file name and the title as text for a terminal (a title may hold
  // control characters; they are shown escaped, never sent raw).
  out << input::printable_text(b.file, 400);
  if (!b.title.empty()) out << " - " << input::printable_text(b.title, 200);
  const std::string why = status_reasons(b);
  out << "  [" << status_word(b.status, opt.color) << (why.empty() ? "" : ": " + why) << "]\n";
  if (b.status == BeamStatus::Invalid) {
    for (const auto& e : b.errors) out << "  " << paint("error", kRed, opt.color) << ": " << e.format(b.file) << "\n";
    out << "\n";
    return;
  }
  // Every value in its display unit (display_units.h); the JSON keeps the file's.
  const DisplayUnits u = display_units(b.units, opt.show);
  const std::string F = u.force.label, L = u.length.label, FL = u.moment.label, D = u.deflection.label;
  for (const auto& w : b.warnings) out << "  " << paint("warning: " + w, kYellow, opt.color) << "\n";
  // Each span's largest deflection against its limit (README, "Deflection
  // limits"); on a long beam only the spans over it, and a count.
  auto limits = [&](const LoadSet& set) {
    if (set.deflection_checks.empty()) return;
    const auto [over, dd] = limits_brief(set, u.deflection.factor);
    const bool cut = !opt.all_rows && set.deflection_checks.size() > opt.max_rows;
    Table t;
    t.head = {"span", "limit", "max deflection [" + D + "]", "at x [" + L + "]", "allowed [" + D + "]", "span/deflection", "holds"};
    for (const auto& d : set.deflection_checks) {
      if (cut && d.holds) continue;
      t.rows.push_back({std::to_string(d.span + 1), d.limit, fixed(u.deflection(d.deflection), dd), fixed(u.length(d.x), 2),
                        fixed(u.deflection(d.allowed), dd),
                        std::isfinite(d.ratio) ? fixed(d.ratio, 0) : "-",
                        d.holds ? paint("yes", kGreen, opt.color) : paint("NO", kRed, opt.color)});
    }
    out << "  deflection limits: " << set.deflection_checks.size() - over << " of " << set.deflection_checks.size()
        << (set.deflection_checks.size() == 1 ? " span holds" : " spans hold")
        << (cut && over > 0 ? " (the spans over their limit:)" : cut ? "" : ":") << "\n";
    if (!t.rows.empty()) t.print(out, "  ");
  };
  for (const auto& set : b.sets) {
    out << "  load set: " << set.name << "   units: force " << F << ", moment " << FL << ", x " << L << ", deflection " << D
        << " (file: " << b.units.force << ", " << b.units.length << ")\n";
    out << "  methods:";
    for (std::size_t i = 0; i < set.methods.size(); ++i) {
      const auto& m = set.methods[i];
      out << (i ? "," : "") << " " << m.name << " ";
      if (m.status == MethodStatus::Ok) out << "ok";
      else out << paint(method_status_name(m.status), m.status == MethodStatus::Failed ? kRed : kYellow, opt.color)
               << " (" << m.reason << ")";
    }
    out << "\n";
    for (const auto& pn : b.precision) {
      if (pn->load_case != set.name) continue;
      out << "  arithmetic: " << precision::arithmetic_name(pn->arithmetic);
      for (const auto& m : pn->methods)
        if (m.used != m.requested) out << " (" << m.name << " in " << precision::arithmetic_name(m.used) << ")";
      out << "; correct digits of the double results:";
      for (const auto& m : pn->methods) {
        if (!m.rounding) continue;
        char buf[32];
        if (m.rounding->measured) std::snprintf(buf, sizeof buf, "%.1f", m.rounding->worst_digits);
        out << " " << m.name << " " << (m.rounding->measured ? std::string(buf) : "n/a");
      }
      out << " (estimated loss " << fixed(pn->conditioning.estimated_digits_lost, 1) << " digits)\n";
    }
    {
      std::ostringstream d;
      d << "  between methods: ";
      const std::string v = verdict_name(set.verdict);
      d << paint(v, set.verdict == Verdict::Agree ? kGreen : set.verdict == Verdict::Disagree ? kRed : kYellow, opt.color);
      if (set.ok_count() >= 2) {
        d << "   largest difference:";
        for (std::size_t k = 0; k < 4; ++k) d << " " << kind_name(static_cast<Kind>(k)) << " " << sci(set.max_difference[k]);
        d << " (of the largest value)";
      }
      out << d.str() << "\n";
      if (!set.problem.empty()) out << "  " << paint(set.problem, set.verdict == Verdict::Disagree ? kRed : kYellow, opt.color) << "\n";
    }
    if (set.envelope && set.ok_count() > 0) {
      const input::Combination& cb = *set.combination;
      if (set.moving && cb.factors.empty()) {
        out << "  moving load " << set.name << ":";
        for (const auto& pt : set.moving->points)
          out << " " << shown_number(u.force(pt.P)) << " " << F << " at " << shown_number(u.length(pt.offset)) << " " << L << ";";
        out << (set.moving->both_directions ? " running either way" : " running forward only");
      } else {
        out << "  combination " << set.name << ":";
      }
      for (const auto& [cs, f] : cb.factors)
        out << " " << cs << " x" << (f.range ? "[" + input::format_number(f.low) + ", " + input::format_number(f.high) + "]" : input::format_number(f.high));
      if (cb.moving && !cb.factors.empty())
        out << " + " << cb.moving->first << " x" << input::format_number(cb.moving->second) << " (moving)";
      if (!cb.pattern.empty()) {
        out << "; patterned:";
        for (const auto& p : cb.pattern) out << " " << p;
        out << " (" << (cb.arrangements == input::Arrangements::All ? "every arrangement" : "all, alternate and adjacent spans") << ")";
      }
      if (!cb.source.empty()) out << "; " << cb.source;
      out << "\n";
      {
        // The second route: each governing arrangement solved directly.
        std::size_t holds = 0;
        double worst = 0;
        for (const auto& rc : set.second_route) {
          holds += rc.holds;
          worst = std::max(worst, rc.difference);
        }
        std::set<std::string> arrangements;
        for (const auto& rc : set.second_route) arrangements.insert(rc.arrangement);
        out << "  second route: " << set.second_route.size() << " governing values re-solved directly ("
            << arrangements.size() << (set.moving ? " positions" : " arrangements") << ", every method): " << holds << " reproduced, largest difference "
            << sci(worst) << " (of the largest value)\n";
      }
      const Envelope& e = set.consensus_envelope;
      const int dm = decimals_for(u.moment(set.scale[static_cast<int>(Kind::Moment)]));
      const int dr = decimals_for(u.force(set.scale[static_cast<int>(Kind::Reaction)]));
      Table t;
      t.head = {"node", "reaction max [" + F + "]", "governed by", "reaction min [" + F + "]", "governed by"};
      const std::size_t n = e.reaction.size();
      const bool cut = !opt.all_rows && n > opt.max_rows;
      for (std::size_t i = 0; i < n; ++i) {
        if (cut && i == opt.max_rows / 2) {
          t.rows.push_back({"  ... " + std::to_string(n - opt.max_rows) + " nodes not shown ..."});
          i = n - opt.max_rows / 2;
        }
        t.rows.push_back({set.beam.labels[i], fixed(u.force(e.reaction[i].max), dr), describe(governs_of(e.reaction[i].max_by), cb),
                          fixed(u.force(e.reaction[i].min), dr), describe(governs_of(e.reaction[i].min_by), cb)});
      }
      t.print(out, "  ");
      Table x;
      x.head = {"span", "moment max [" + FL + "]", "at x [" + L + "]", "governed by", "moment min [" + FL + "]", "at x [" + L + "]", "governed by"};
      for (std::size_t i = 0; i < set.extremes.size(); ++i) {
        if (!opt.all_rows && set.extremes.size() > opt.max_rows && i == opt.max_rows / 2) {
          x.rows.push_back({"  ... " + std::to_string(set.extremes.size() - opt.max_rows) + " spans not shown ..."});
          i = set.extremes.size() - opt.max_rows / 2;
        }
        const SpanExtremes& se = set.extremes[i];
        x.rows.push_back({std::to_string(i + 1), fixed(u.moment(se.max_moment), dm), fixed(u.length(se.max_moment_x), 2),
                          se.max_moment_by, fixed(u.moment(se.min_moment), dm), fixed(u.length(se.min_moment_x), 2),
                          se.min_moment_by});
      }
      out << "\n";
      x.print(out, "  ");
      out << "\n";
      if (!set.deflection_checks.empty()) {
        limits(set);
        out << "\n";
      }
      continue;
    }
    if (set.consensus_nodes.empty()) { out << "\n"; continue; }
    double worst_f = 0, worst_m = 0;
    for (const auto& m : set.methods)
      if (m.status == MethodStatus::Ok) {
        worst_f = std::max(worst_f, m.equilibrium.force_residual);
        worst_m = std::max(worst_m, m.equilibrium.moment_residual);
      }
    out << "  equilibrium (worst method): vertical forces " << sci(worst_f) << ", moments about the left end " << sci(worst_m) << "\n";

    const int dm = decimals_for(u.moment(set.scale[static_cast<int>(Kind::Moment)]));
    const int dr = decimals_for(std::max(u.force(set.scale[static_cast<int>(Kind::Reaction)]), 1e-300));
    const int dd = decimals_for(u.deflection(set.scale[static_cast<int>(Kind::Deflection)]));
    const int dt = decimals_for(set.scale[static_cast<int>(Kind::Rotation)]);
    double xmax = 0;
    for (const auto& n : set.consensus_nodes) xmax = std::max(xmax, std::abs(u.length(n.x)));
    const int dx = std::max(2, decimals_for(xmax) - 1);
    Table t;
    t.head = {"node", "x [" + L + "]", "M left [" + FL + "]", "M right [" + FL + "]", "reaction [" + F + "]",
              "reaction moment [" + FL + "]", "deflection [" + D + "]", "rotation [rad]"};
    const std::size_t n = set.consensus_nodes.size();
    const bool cut = !opt.all_rows && n > opt.max_rows;
    for (std::size_t i = 0; i < n; ++i) {
      if (cut && i == opt.max_rows / 2) {
        t.rows.push_back({"  ... " + std::to_string(n - opt.max_rows) + " nodes not shown (--all-rows shows every node) ..."});
        i = n - opt.max_rows / 2;
      }
      const NodeResult& c = set.consensus_nodes[i];
      t.rows.push_back({set.beam.labels[i], fixed(u.length(c.x), dx), c.moment_left ? fixed(u.moment(*c.moment_left), dm) : "-",
                        c.moment_right ? fixed(u.moment(*c.moment_right), dm) : "-", fixed(u.force(c.reaction_force), dr),
                        fixed(u.moment(c.reaction_moment), dm), fixed(u.deflection(c.deflection), dd),
                        i == 0 ? fixed(c.rotation_right, dt)
                               : (std::abs(c.rotation_left - c.rotation_right) > 1e-9 * set.scale[4]
                                      ? fixed(c.rotation_left, dt) + " / " + fixed(c.rotation_right, dt)
                                      : fixed(c.rotation_left, dt))});
    }
    t.print(out, "  ");
    // Span extremes.
    Table e;
    e.head = {"span", "max sagging [" + FL + "]", "at x [" + L + "]", "max hogging [" + FL + "]", "at x [" + L + "]",
              "max deflection [" + D + "]", "at x [" + L + "]"};
    const std::size_t ns = set.extremes.size();
    const bool cut_s = !opt.all_rows && ns > opt.max_rows;
    for (std::size_t i = 0; i < ns; ++i) {
      if (cut_s && i == opt.max_rows / 2) {
        e.rows.push_back({"  ... " + std::to_string(ns - opt.max_rows) + " spans not shown ..."});
        i = ns - opt.max_rows / 2;
      }
      const SpanExtremes& x = set.extremes[i];
      // Sagging or hogging below the rounding of the beam's largest moment
      // is none ("-"), not "0.00" at some point.
      const bool sag = is_sagging(set, x.max_moment), hog = is_hogging(set, x.min_moment);
      e.rows.push_back({std::to_string(i + 1), sag ? fixed(u.moment(x.max_moment), dm) : "-",
                        sag ? fixed(u.length(x.max_moment_x), dx) : "", hog ? fixed(u.moment(x.min_moment), dm) : "-",
                        hog ? fixed(u.length(x.min_moment_x), dx) : "", fixed(u.deflection(x.max_deflection), dd),
                        fixed(u.length(x.max_deflection_x), dx)});
    }
    out << "\n";
    e.print(out, "  ");
    if (cut_s) {
      // The governing values over the whole beam.
      const SpanExtremes* smax = &set.extremes[0];
      const SpanExtremes* smin = &set.extremes[0];
      const SpanExtremes* sdef = &set.extremes[0];
      for (const auto& x : set.extremes) {
        if (x.max_moment > smax->max_moment) smax = &x;
        if (x.min_moment < smin->min_moment) smin = &x;
        if (std::abs(x.max_deflection) > std::abs(sdef->max_deflection)) sdef = &x;
      }
      out << "  whole beam: max sagging " << fixed(u.moment(smax->max_moment), dm) << " " << FL << " at x = "
          << fixed(u.length(smax->max_moment_x), dx) << " " << L << ", max hogging " << fixed(u.moment(smin->min_moment), dm)
          << " " << FL << " at x = " << fixed(u.length(smin->min_moment_x), dx) << " " << L << ", max deflection "
          << fixed(u.deflection(sdef->max_deflection), dd) << " " << D << " at x = " << fixed(u.length(sdef->max_deflection_x), dx)
          << " " << L << "\n";
    }
    out << "\n";
    if (!set.deflection_checks.empty()) {
      limits(set);
      out << "\n";
    }
  }
  if (!b.claims.empty()) {
    Table c;
    c.head = {"claim", "quantity", "where", "case", "claimed", "computed", "difference", "tolerance", "holds"};
    // Claims from a table (--claims) say where they were read.
    const bool sourced = std::any_of(b.claims.begin(), b.claims.end(), [](const ClaimResult& r) { return !r.claim.source.empty(); });
    if (sourced) c.head.push_back("from");
    for (std::size_t i = 0; i < b.claims.size(); ++i) {
      const ClaimResult& r = b.claims[i];
      const DisplayUnit& cu = u.of(r.claim.quantity);
      const int d = decimals_for(std::max(std::abs(cu(r.claim.value)), std::abs(cu(r.computed)))) + 1;
      // A claim at x: its place in the display length unit.
      std::string where = r.claim.x && !r.claim.node && !r.claim.span ? "x = " + shown_number(u.length(*r.claim.x)) + " " + L
                                                                      : r.label;
      if (r.claim.side != input::Side::Unspecified) where += r.claim.side == input::Side::Left ? " (left)" : " (right)";
      c.rows.push_back({std::to_string(i + 1), std::string(input::quantity_name(r.claim.quantity)) + " [" + cu.label + "]", where,
                        r.load_case, fixed(cu(r.claim.value), d), r.evaluated ? fixed(cu(r.computed), d) : "-",
                        r.evaluated ? fixed(cu(r.difference), d) : "-", fixed(cu(r.tolerance), d),
                        r.holds ? paint("yes", kGreen, opt.color) : paint("NO", kRed, opt.color)});
      if (sourced) c.rows.back().push_back(r.claim.source.empty() ? "beam file" : r.claim.source);
      if (!r.reason.empty()) c.rows.push_back({"    claim " + std::to_string(i + 1) + ": " + r.reason});
      if (!r.finding.empty()) c.rows.push_back({"    claim " + std::to_string(i + 1) + ": finding: " + r.finding});
    }
    c.print(out, "  ");
    out << "\n";
  }
  for (const auto& cmp : b.against) {
    namespace ag = compare::against;
    out << "  against " << cmp->file << " (" << ag::table_kind_name(cmp->kind) << ", load set " << cmp->load_case << ")";
    if (!cmp->ok()) {
      out << ": " << paint("cannot be compared", kRed, opt.color) << "\n";
      for (const auto& e : cmp->errors) out << "    " << e.format(cmp->file) << "\n";
      if (cmp->errors_not_listed) out << "    ... and " << cmp->errors_not_listed << " more errors\n";
      out << "\n";
      continue;
    }
    out << ": " << (cmp->holds() ? paint("every value holds", kGreen, opt.color) : paint("values fail", kRed, opt.color)) << "\n";
    // In the display units, to the digits of the tolerance; each
    // quantity's unit beside its name. (Where a row is: as their table
    // gives it, in their units.)
    auto digits = [](const DisplayUnit& du, double v, double tol) {
      return decimals_for(std::max(std::abs(du(v)), std::abs(du(tol)))) + 1;
    };
    Table t;
    t.head = {"quantity", "rows", "failing", "worst difference", "at", "tolerance"};
    for (const auto& q : cmp->summary) {
      const DisplayUnit& du = u.of(q.quantity);
      const int d = digits(du, q.worst_difference, q.tolerance);
      t.rows.push_back({std::string(ag::quantity_name(q.quantity)) + " [" + du.label + "]", std::to_string(q.compared),
                        std::to_string(q.failing), fixed(du(q.worst_difference), d), q.worst_where, fixed(du(q.tolerance), d)});
      if (q.finding) t.rows.push_back({"    " + paint("finding: " + q.finding->text, kYellow, opt.color)});
      else if (!q.note.empty()) t.rows.push_back({"    note: " + q.note});
      if (q.empty > 0)
        t.rows.push_back({"    " + std::to_string(q.empty) + (q.empty == 1 ? " cell" : " cells") + " of this column empty: not compared"});
    }
    t.print(out, "  ");
    for (const auto& n : cmp->notes) out << "    note: " << n << "\n";
    std::size_t shown = 0;
    for (const auto& r : cmp->rows)
      for (const auto& c : r.cells) {
        if (c.holds || shown >= 10) continue;
        ++shown;
        const DisplayUnit& du = u.of(c.quantity);
        const int d = digits(du, std::max(std::abs(c.theirs), std::abs(c.ours)), c.tolerance);
        const std::string unit = " " + du.label;
        out << "    line " << r.line << ", " << r.where << ": " << ag::quantity_name(c.quantity) << " theirs "
            << fixed(du(c.theirs), d) << unit << ", ours " << fixed(du(c.ours), d) << unit << ", difference "
            << fixed(du(c.difference), d) << unit << " (tolerance " << fixed(du(c.tolerance), d) << unit << ")"
            << (c.reason.empty() ? "" : ": " + c.reason) << "\n";
      }
    if (cmp->failing() > shown)
      out << "    ... " << cmp->failing() - shown << (cmp->failing() - shown == 1 ? " more failing value" : " more failing values")
          << " in the JSON report\n";
    out << "\n";
  }
}

void write_console_summary(std::ostream& out, const Summary& s, const ConsoleOptions& opt) {
  out << "summary: " << s.beams << (s.beams == 1 ? " beam" : " beams") << ": "
      << paint(std::to_string(s.agree) + " agree", kGreen, opt.color && s.agree) << ", "
      << paint(std::to_string(s.disagree) + " disagree", kRed, opt.color && s.disagree) << ", "
      << paint(std::to_string(s.unconfirmed) + " unconfirmed", kYellow, opt.color && s.unconfirmed) << ", "
      << paint(std::to_string(s.invalid) + " invalid", kRed, opt.color && s.invalid) << "; "
      << s.claims_failed << (s.claims_failed == 1 ? " claim fails" : " claims fail");
  if (s.limits_failed > 0)
    out << "; " << paint(std::to_string(s.limits_failed) + (s.limits_failed == 1 ? " span over its deflection limit" : " spans over their deflection limit"),
                         kRed, opt.color);
  out << "\n";
  out << "caution: " << caution_text() << "\n";
}

namespace {

// The tables for a person as a reporter: each beam's tables as they come,
// the summary at the end. `errors_only` (the JSON report is on standard
// output, this on standard error): only the errors of invalid beams.
class ConsoleReporter final : public CheckReporter {
 public:
  ConsoleReporter(std::ostream& out, const ConsoleOptions& opt, bool errors_only)
      : out_(out), opt_(opt), errors_only_(errors_only) {}
  void begin(const RunInfo&) override {}
  Part render(const Report& beam) const override {
    std::ostringstream o;
    write(o, beam);
    return {o.str(), {}};
  }
  void beam(Part&& part) override { out_ << part.text; }
  void keep(const Report& beam) override { write(out_, beam); }
  std::string end(const Summary& s) override {
    write_console_summary(out_, s, opt_);
    return "";
  }

 private:
  void write(std::ostream& o, const Report& b) const {
    if (!errors_only_) write_console(o, b, opt_);
    else if (b.status == BeamStatus::Invalid)
      for (const auto& e : b.errors) o << "error: " << e.format(b.file) << "\n";
  }
  std::ostream& out_;
  ConsoleOptions opt_;
  bool errors_only_;
};

}  // namespace

std::unique_ptr<CheckReporter> console_reporter(std::ostream& out, const ConsoleOptions& opt, bool errors_only) {
  return std::make_unique<ConsoleReporter>(out, opt, errors_only);
}

}  // namespace trivet::reports
