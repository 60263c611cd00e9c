// trivet: overlaid diagrams of one beam and one load set.
//
// plot_data() is pure: it gathers the exact points of every curve (one per
// method that solved the beam, per panel), the claims as markers and the
// values worth a label. render() hands those points to gnuplot and returns
// the picture. Tests check the data, not pixels.
//
// Panels, top to bottom, sharing the x axis:
//   sketch      the beam: spans, supports by type, hinges, loads, labels
//   shear       V [force], positive up
//   moment      M [force*length], sagging +, DRAWN DOWNWARD (on the
//               tension side), so the diagram hangs below the axis where
//               the bottom fibre is in tension
//   deflection  v [length], down +, DRAWN DOWNWARD (the deflected shape)
//   difference  each method minus the consensus (median of the methods),
//               divided by the largest value of that kind in the load set
//
// An envelope load set (a combination with a pattern or a factor range)
// has two curves per method and panel, its max and its min envelope, in
// the method's one style; the difference panel compares each with the
// consensus envelope's max and min.
#pragma once

#include <cstddef>
#include <optional>
#include <string>
#include <vector>

#include "harness/compare/compare.h"
#include "reports/display_units.h"
#include "reports/report.h"

namespace trivet::reports {

enum class PanelKind { Sketch, Shear, Moment, Deflection, Difference, Influence };
const char* panel_name(PanelKind k);  // "sketch", "shear", ..., "influence"

// Which bound of an envelope a curve is; None for an ordinary load set.
enum class Limit { None, Max, Min };

// One polyline handed to gnuplot.
struct Curve {
  std::string method;  // the method's name
  std::string label;   // legend text
  std::size_t style = 0;  // the method's index: line colour and dash pattern
  // Difference panel only: which quantity (Kind::Shear, Moment,
  // Deflection); it picks the point marker.
  std::optional<compare::Kind> kind;
  // Envelope load sets: the max or the min envelope (the legend names the
  // pair once, "stiffness max/min", on the max curve).
  Limit limit = Limit::None;
  std::vector<double> x, y;
};

// A claimed value drawn at (x, y = the claimed value).
struct ClaimMarker {
  std::size_t claim = 0;  // 0-based index into Report::claims
  double x = 0, y = 0;
  bool holds = false;
  bool evaluated = false;
  std::string text;  // "claim 1"
};

// A value from another program's results (Report::against) drawn at
// its position: y = Cell::theirs (our units and signs).
struct OtherMarker {
  std::size_t comparison = 0;  // index into Report::against
  std::size_t row = 0;         // index into Comparison::rows
  double x = 0, y = 0;
  bool holds = false;
  std::string text;            // "other program, line 7"
};

// A value written next to the diagram.
struct ValueLabel {
  double x = 0, y = 0;
  std::string text;
};

struct Panel {
  PanelKind kind = PanelKind::Shear;
  std::string ylabel;     // with units and the sign convention
  bool drawn_down = false;  // positive values are drawn below the axis
  std::vector<Curve> curves;
  std::vector<ClaimMarker> claims;
  std::vector<OtherMarker> others;
  std::vector<ValueLabel> labels;
};

// The sketch: what the beam is, in the set's own units.
struct SketchNode {
  double x = 0;
  std::string label;
  SupportType type = SupportType::Free;
  bool hinge = false;
  bool rotational_spring = false;  // spring with kr > 0
  double settlement = 0;            // in settlement_unit
  std::string settlement_unit;     // the display deflection unit
  std::string reaction;            // "R = 81.2 kN; M = 169.1 kN*m", "R 40.1 to 97.3 kN" or empty
  std::vector<std::string> claims; // reaction claims at this node: "claim 1: R = 70 (holds)"
  // Another program's reactions at this node: "other: R = 81 (holds)".
  std::vector<std::string> others;
};

struct SketchLoad {
  LoadType type = LoadType::Point;
  double x0 = 0, x1 = 0;  // global; x1 == x0 for point forces and couples
  double v0 = 0, v1 = 0;  // P or C in v0; w at x0, x1 for distributed
  std::string text;       // "P = 60 kN", "w = 24 kN/m", "C = 10 kN*m"
};

struct PlotData {
  // The agreement bound (--agreement): drawn in the difference panel.
  double agreement = 1e-6;
  std::string title;     // the beam's title or file
  std::string subtitle;  // "load set: loads; verdict: agree"
  // A combination: "1.2 x dead + 1.6 x live; live patterned span by span
  // (every arrangement)"; a moving load's own load set: "moving load
  // trolley: 40 kN at 0 m, ..."; an influence line: the unit load and how
  // far apart the methods' lines are; empty for a load case. Drawn as a
  // third title line.
  std::string combination;
  bool envelope = false;  // an envelope load set (max and min curves)
  std::string x_label;   // "x [m]"
  double x_min = 0, x_max = 1;
  std::vector<SketchNode> nodes;
  std::vector<SketchLoad> loads;
  // Sketch, Shear, Moment, Deflection, Difference, in that order; the
  // sketch panel has no curves.
  std::vector<Panel> panels;
  std::vector<std::string> notes;  // methods left out and why, claims not drawn
  // A line at the foot of the picture (the plot command sets it to
  // compare::caution_text(); the HTML report, which carries it once, not).
  std::string caution;
  // Where a vertical marker line is drawn in the data panels (the point of
  // an influence line), with its text; none when empty.
  std::optional<double> mark_x;
  std::string mark_text;
  const Panel* panel(PanelKind k) const;
};

// The data of one load set. An invalid beam or a set index out of range
// gives a PlotData with no panels and a note saying why.
// Every value and axis is in the display units `show` asks for
// (display_units.h; the defaults when empty): x in the length unit, each
// panel in its kind's unit, the sketch's texts likewise.
PlotData plot_data(const Report& beam, std::size_t set_index, const ShowUnits& show = {});

// An influence line asked for on the command line (`--influence
// QUANTITY@WHERE`): QUANTITY one of moment, shear, deflection, reaction;
// WHERE a node label (for moment and shear at an interior node the end of
// the span on its left, `B-`; `B+` the start of the span on its right) or
// `x=7.5`, a global x in the file's length unit (not for reaction).
struct InfluenceRequest {
  enum class Quantity { Moment, Shear, Deflection, Reaction };
  Quantity quantity = Quantity::Moment;
  // A node label as given, "B", "B-" or "B+" (influence_data takes a
  // trailing sign as the side unless the label itself ends so), or empty
  // for `x`.
  std::string node;
  std::optional<double> x;   // global x, file units
  int side = 0;              // set by influence_data: -1 left, +1 right, 0 the default (left where there is a span)
  std::string text;          // as given
};
// What --influence accepts, in words (for error messages and the help).
const char* influence_syntax();
// Reads QUANTITY@WHERE; nothing, and the reason in *error, when it is not
// that form (a node label is checked against the beam by influence_data).
std::optional<InfluenceRequest> parse_influence(const std::string& text, std::string* error);
// A short name for the request to put in a file name: "moment-B",
// "shear-B-right", "deflection-x7.5" (letters, digits, '.', '-', '_').
std::string influence_slug(const InfluenceRequest& q);

// The influence line of `q` for a beam file: each method (`methods`, in
// that order, style = index) builds its own influence lines
// (compare::MovingModel) on the file's beam without loads or settlements,
// at the stations of that beam (`stations_per_span`, with a station pair
// added at an `x` that is none) and the line is drawn from the method's
// cubic on every piece (24 points a piece and both limits at each piece
// end). Panels: Sketch, Influence; a method without lines (not applicable,
// failed) is left out with a note. A node label the beam does not have, an
// x off the beam or a reaction at a node without a vertical support gives
// no panels and the reason in *error.
// Positions and ordinates are in the display units `show` asks for (a
// moment per unit load in the moment unit per force unit, and so on).
PlotData influence_data(const input::BeamFile& file, const InfluenceRequest& q,
                        const std::vector<const compare::Method*>& methods, int stations_per_span,
                        std::string* error, const ShowUnits& show = {});

// The indices of a curve's points to keep so it has at most about
// `max_points`: always the first and last, every jump (two points at the
// same x with different values), the largest and smallest value, and in
// between the smallest and largest of each run, so no peak is lost. Jumps
// are never dropped, so a curve with many of them may keep more.
// max_points == 0 keeps everything.
std::vector<std::size_t> thin_indices(const std::vector<double>& x, const std::vector<double>& y,
                                      std::size_t max_points);
// Every curve thinned so (see thin_indices).
PlotData thinned(const PlotData& data, std::size_t max_points);

// Where the value labels of a panel go, in pixels (y down). Each label is
// a box of `w` x `h` wanted just above (`up`) or below its point (`ax`,
// `ay`); it is tried there, then further out, on the other side and beside
// the point, and takes the first spot that overlaps neither a box already
// placed (`taken`, e.g. the claims' texts) nor an earlier label and lies
// inside `area`. A label with no such spot is left out (its value is in the
// tables): labels never cover each other. Returns each label's centre, or
// nothing where it is left out.
struct LabelBox {
  double x0 = 0, y0 = 0, x1 = 0, y1 = 0;
  bool overlaps(const LabelBox& o) const { return x0 < o.x1 && o.x0 < x1 && y0 < o.y1 && o.y0 < y1; }
};
struct LabelWish {
  double ax = 0, ay = 0;  // the point labelled
  double w = 0, h = 0;    // the text's box
  bool up = true;         // first choice: above the point
};
std::vector<std::optional<std::pair<double, double>>> place_labels(const std::vector<LabelWish>& wishes,
                                                                   const LabelBox& area,
                                                                   std::vector<LabelBox> taken = {});
// The box of a text of `chars` characters in a font of `size` points, as
// gnuplot's svg and pngcairo terminals draw DejaVu Sans (a digit is 0.636
// of the size wide; a little more, to be safe).
double text_width(std::size_t chars, double size);

enum class ImageFormat { Svg, Png };
// ".svg" or ".png" (any case) at the end of a path.
std::optional<ImageFormat> format_for_path(const std::string& path);

struct RenderOptions {
  ImageFormat format = ImageFormat::Svg;
  int width = 960, height = 1100;  // pixels
  // Empty: $TRIVET_GNUPLOT, else "gnuplot" found on PATH.
  std::string gnuplot;
  // Keep the generated gnuplot script here (for a person to debug), or empty.
  std::string keep_script;
};

// Where gnuplot is: its path, or nothing if it cannot be found.
std::optional<std::string> find_gnuplot(const std::string& preferred = "");

// Runs gnuplot and returns the SVG text or the PNG bytes. On failure returns
// "" and puts a reason in *error (e.g. "gnuplot was not found on PATH;
// install gnuplot-nox"). Data with no panels is a failure too.
std::string render(const PlotData& data, const RenderOptions& options, std::string* error);
std::string render(const PlotData& data, ImageFormat format, int width, int height, std::string* error);

}  // namespace trivet::reports
