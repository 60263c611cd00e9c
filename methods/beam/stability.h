// trivet: is a beam a structure or a mechanism?
#pragma once

#include <optional>
#include <string>

#include "methods/beam/beam.h"

namespace trivet {

// A mechanism found in a beam: the first and last span (0-based) of a part
// that can move as a rigid body without straining any span or spring.
struct Mechanism {
  std::size_t first_span = 0;
  std::size_t last_span = 0;
  std::string description;  // plain words, with node labels
};

// Kinematic check of the support and hinge arrangement (not of the
// numbers): the beam is cut at its hinges into rigid segments, each with
// two rigid-body freedoms (translation and rotation); supports and springs
// remove freedoms, and hinges tie neighbouring segments' deflection. A
// left-to-right sweep keeps the motions still possible, so it is O(n).
// Springs (k > 0, kr > 0) count as restraints: they resist motion.
std::optional<Mechanism> find_mechanism(const Beam& beam);

}  // namespace trivet
