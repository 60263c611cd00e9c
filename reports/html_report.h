// trivet: one self-contained HTML file for a person: a summary of every
// beam first, then per beam its verdict, tables, claims and plots, then the
// provenance and the caution. No scripts, no network references; CSS and
// SVG inline. Stays usable for a library of 1,000 beams: counts and
// problems first, agreeing beams folded away, small plots folded in
// <details>, and plots for at most `max_plotted_beams` beams.
#pragma once

#include <cstddef>
#include <memory>
#include <ostream>
#include <string>
#include <vector>

#include "harness/compare/compare.h"
#include "reports/plot.h"
#include "reports/report.h"
#include "reports/reports.h"

namespace trivet::reports {

// A section the caller adds (e.g. the verification record of selfcheck).
// `html` is inserted as it is: the caller escapes its own text (see
// html_escape) and must not put scripts or network references in it.
struct HtmlSection {
  std::string id;       // anchor, e.g. "selfcheck"; letters, digits, '-'
  std::string heading;  // plain text
  std::string html;
};

struct HtmlOptions {
  std::string title = "trivet report";
  std::string tool_version;   // e.g. "0.1.0"
  std::string command_line;   // as typed
  std::string date_utc;       // ISO 8601; empty: now
  bool plots = true;
  std::size_t max_plotted_beams = 100;  // the rest get a note (problems are plotted first)
  std::size_t max_points = 300;         // per curve in the inline SVG
  int plot_width = 860, plot_height = 980;
  RenderOptions render;                 // gnuplot path, etc. (format and size are set here)
  // Sections of the caller, after the summary and before the beams.
  std::vector<HtmlSection> extra_sections;
  // More beams than this: the agreeing ones are listed folded.
  std::size_t fold_agreeing_after = 20;
  double agreement = 1e-6;  // --agreement, drawn in the plots' difference panels
  // With more than fold_agreeing_after beams, only the beams that need
  // attention (not agreeing, a failed claim or deflection limit) get their
  // detail section; every beam is listed in the summary. True: every beam's
  // detail (--html-all).
  bool all_details = false;
  // The units values are shown in (--show-units; display_units.h).
  ShowUnits show;
};

struct HtmlStats {
  std::size_t plots = 0;        // plots rendered
  std::size_t plots_skipped = 0;
  std::string plot_error;       // the first reason a plot could not be made, or empty
};

HtmlStats write_html(std::ostream& out, const std::vector<Report>& beams, const HtmlOptions& options);
// The same for beams held elsewhere (in file order; none may be null).
HtmlStats write_html(std::ostream& out, const std::vector<const Report*>& beams, const HtmlOptions& options);

// The HTML report as a sibling of the other formats (reports.h): it needs
// every beam before it writes (the summary comes first), so it keeps the
// beams it is given (needs_all_results()) and writes the page at end().
// warning() then names plots that could not be made.
std::unique_ptr<CheckReporter> html_reporter(std::ostream& out, const HtmlOptions& options);

// A checking record: one printable page for one beam, for a firm's files.
// The beam and its result first (verdict, the methods' agreement, claims
// and limits failed), the governing values of every load set (largest
// sagging and hogging moment, shear, reactions, deflection and span over
// deflection), then the whole detail of the HTML report for that beam
// (tables, claims, comparisons, diagrams), the input's SHA-256, the tool's
// version and date, blank fields for the project, the checker, the date and
// a signature, and the caution. A print style sheet keeps each heading with
// what follows it and a table or diagram on one page.
void write_record(std::ostream& out, const Report& beam, const HtmlOptions& options);
// The name of a beam's record in the records' folder: its path with the
// folder separators as '-' and ".json" as ".html" ("examples/a.json" ->
// "examples-a.html").
std::string record_file_name(const std::string& path);
// The records as a sibling of the other formats: each beam's page written
// to `dir` (created if needed) as soon as the beam is checked, in full or
// not at all. end() names the pages that could not be written.
std::unique_ptr<CheckReporter> record_reporter(const std::string& dir, const HtmlOptions& options);

// &, <, >, " and ' as entities.
std::string html_escape(const std::string& s);
// The current time in UTC as ISO 8601, "2024-05-01T12:34:56Z".
std::string utc_now_iso8601();
// The id of beam i's section ("beam-1", ...), 0-based i.
std::string beam_anchor(std::size_t i);
// An SVG from gnuplot made fit to sit inside HTML: no XML prolog or
// doctype, no namespace URIs, ids prefixed with `prefix` so that several
// plots on one page do not clash.
std::string svg_for_html(const std::string& svg, const std::string& prefix);

}  // namespace trivet::reports
