#include "methods/beam/stability.h"

#include <cmath>

namespace trivet {
namespace {

// The rigid motions of one segment still possible, v(x) = a + b (x - x0),
// as a subspace of (a, b) of dimension 0, 1 or 2; for dimension 1, `u`
// spans it.
struct Motions {
  int dim = 2;
  double ua = 0, ub = 0;

  // Imposes c_a * a + c_b * b = 0.
  void restrict(double ca, double cb) {
    if (dim == 2) {
      // The null space of (ca, cb): (-cb, ca).
      ua = -cb; ub = ca;
      dim = 1;
    } else if (dim == 1) {
      const double dot = ca * ua + cb * ub;
      const double scale = std::hypot(ca, cb) * std::hypot(ua, ub);
      if (std::abs(dot) > 1e-12 * scale) dim = 0;
    }
  }
};

}  // namespace

std::optional<Mechanism> find_mechanism(const Beam& beam) {
  const std::size_t n = beam.spans.size();
  if (n == 0 || beam.supports.size() != n + 1) return std::nullopt;
  // Positions as fractions of the beam's length: the test is then the same
  // for the same beam in mm and in km (scale-free), and its tolerances are
  // relative to the beam.
  std::vector<double> xs(n + 1, 0.0);
  for (std::size_t i = 0; i < n; ++i) xs[i + 1] = xs[i] + beam.spans[i].length;
  const double total = xs[n];
  if (total > 0 && std::isfinite(total))
    for (double& x : xs) x /= total;
  auto label = [&](std::size_t i) {
    return i < beam.labels.size() ? beam.labels[i] : std::to_string(i + 1);
  };

  // Segment state. `carried` is the freedom passed through the hinge on the
  // left: when the part left of the hinge is rigid (dim 0 there), the new
  // segment starts with its left deflection fixed at zero.
  Motions m;
  std::size_t free_from = 0;   // first span of the part that can still move
  double x0 = 0.0;             // left end of the current segment
  bool folds = false;          // the moving part crosses a hinge
  auto restrain_node = [&](std::size_t i, bool at_hinge) {
    const Support& s = beam.supports[i];
    const double dx = xs[i] - x0;
    const bool deflection = restrains_deflection(s.type) || s.type == SupportType::Spring;
    bool rotation = !at_hinge && (restrains_rotation(s.type) ||
                                  (s.type == SupportType::Spring && s.kr > 0.0));
    if (deflection) m.restrict(1.0, dx);
    if (rotation) m.restrict(0.0, 1.0);
  };

  restrain_node(0, false);
  for (std::size_t i = 1; i <= n; ++i) {
    const bool hinge = i < n && beam.supports[i].hinge;
    restrain_node(i, hinge);
    if (!hinge) continue;
    // Cut at the hinge: the motions of the left part that leave the hinge
    // still can never be stopped by anything to the right.
    const double dx = xs[i] - x0;
    int carried = 0;
    if (m.dim == 2) {
      // Deflection at the hinge a + b dx = 0 leaves one motion (rotation
      // about the hinge) that the right side cannot stop.
      return Mechanism{free_from, i - 1,
                       "spans " + std::to_string(free_from + 1) + " to " + std::to_string(i) +
                           " (nodes " + label(free_from) + " to " + label(i) +
                           ") can turn about the hinge at " + label(i) + " with nothing to stop them"};
    } else if (m.dim == 1) {
      const double hinge_v = m.ua + m.ub * dx;
      if (std::abs(hinge_v) <= 1e-12 * std::hypot(m.ua, m.ub) * (1.0 + std::abs(dx))) {
        return Mechanism{free_from, i - 1,
                         "spans " + std::to_string(free_from + 1) + " to " + std::to_string(i) +
                             " (nodes " + label(free_from) + " to " + label(i) +
                             ") can move while the hinge at " + label(i) + " stays put"};
      }
      carried = 1;
      folds = true;
    } else {
      free_from = i;
      folds = false;
    }
    // New segment: v = h + b (x - x_i); h free only if carried.
    x0 = xs[i];
    m = Motions{};
    if (carried == 0) m.restrict(1.0, 0.0);
  }
  if (m.dim > 0) {
    const std::size_t first = free_from;
    std::string what = folds ? "can fold at its hinges"
                       : m.dim == 2 ? "can move up and down and turn"
                                    : (std::abs(m.ub) <= 1e-300 ? "can move up and down"
                                                                : "can turn about a point");
    std::string where = first == 0 && n == 1 ? "the beam"
                        : "spans " + std::to_string(first + 1) + " to " + std::to_string(n) +
                              " (nodes " + label(first) + " to " + label(n) + ")";
    if (first == 0) where = n == 1 ? "the beam" : "the whole beam (nodes " + label(0) + " to " + label(n) + ")";
    return Mechanism{first, n - 1, where + " " + what + " with nothing to stop it"};
  }
  return std::nullopt;
}

}  // namespace trivet
