// trivet: helpers shared inside harness/compare (not a public header).
#pragma once

#include <cstddef>
#include <string>
#include <vector>

#include "harness/compare/compare.h"

namespace trivet::compare::detail {

// The median (of three: the middle one); 0 for none. Reorders v.
double median(std::vector<double>& v);
// False when any node or station value of the result is NaN or infinite.
bool finite_solution(const MethodResult& r);
// Vertical-force and moment balance of one solution.
Equilibrium equilibrium_of(const Beam& beam, const std::vector<NodeResult>& nodes);
// Floors each kind's largest magnitude from the others (see compare.cpp).
void floor_scales(double* scale, const Beam& beam);
std::string fmt(double v);
// A position for a person to read: six significant digits (a station's x
// may carry the rounding of the sum of the divisions, 6.4799999999999995).
std::string fmt_place(double v);

// One method's extremes of span `s` (stations [begin, end) of the load
// set), from the method's own values at the stations and its own `at`
// between them (harness/compare/extremes.h). Positions global.
SpanExtremes method_span_extremes(const MethodResult& m, const LoadSet& set, std::size_t s, std::size_t begin,
                                  std::size_t end, double x0);

// A method's own extremes of every span (MethodResult::extremes).
void method_extremes(MethodResult& m, const LoadSet& set);
// The load set's extremes: per span the median of the methods' values,
// with the position (and what governs) of the method that gave it.
void consensus_extremes(LoadSet& set);

// Envelopes (envelope.cpp): one method over the shares of a combination,
// with its envelope at the stations and its own span extremes of the
// envelope; then the methods compared; then the second route.
// `side_by_side`: a long beam, whose envelope is worked out in two halves
// at once (the same values).
void run_envelope_method(const Method& method, const Beam& full, const input::Combination& comb,
                         const std::vector<Station>& stations, MethodResult& r, bool side_by_side = false);
void compare_envelopes(LoadSet& set, double agreement);
// `side_by_side`: the methods' direct solves run in threads of their own
// (a long beam); the results are the same either way.
void second_route(LoadSet& set, const std::vector<const Method*>& methods, double agreement, bool side_by_side);
// What the second route checks of an envelope load set: each span's largest
// and smallest moment and largest deflection (where the consensus extremes
// are), and each support's (or spring's) largest and smallest reaction.
struct RouteItem {
  RouteCheck check;         // quantity, where, x and the envelope's value
  Kind kind = Kind::Moment;
  bool node = false;        // a reaction (index: the node); else a span's (index: the span)
  std::size_t index = 0;
  double local = 0;         // in the span
  bool deflection = false;  // a span's deflection; else its moment
  bool want_max = true;     // the largest value governs (else the smallest)
};
std::vector<RouteItem> route_items(const LoadSet& set);
// A method's solve for the second route: an exception other than running
// out of memory is the method's failure (internal error), not the run's.
Solution solve_guarded(const Method& method, const Beam& beam, const std::vector<Station>& stations);
// After set.second_route is filled (each check's `holds` set): the load set
// disagrees with the worst check that fails, in words naming the governing
// `what` ("arrangement", "position").
void settle_second_route(LoadSet& set, const char* what);

}  // namespace trivet::compare::detail
