// `trivet example` and `trivet schema`: starter file and the JSON Schema.
#include <iostream>

#include "harness/input/schema.h"

#include "harness/cli/commands.h"

namespace trivet::cli {

namespace {
const char* kExample = R"({
  "title": "Example: two-span floor beam with an overhang",
  "units": {"force": "kN", "length": "m"},
  "spans": [
    {"length": 6.0, "EI": 42000},
    {"length": 7.5, "E": "210 GPa", "I": "2.3e8 mm^4"},
    {"length": 1.8, "EI": 42000}
  ],
  "supports": ["pinned", "roller", "roller", "free"],
  "labels": ["A", "B", "C", "D"],
  "loads": [
    {"type": "udl", "span": 1, "w": 12.0},
    {"type": "udl", "span": 2, "w": 9.5},
    {"type": "point", "span": 2, "P": 30.0, "at": 3.0},
    {"type": "linear", "span": 3, "w1": 9.5, "w2": 4.0},
    {"type": "point", "node": 4, "P": 5.0}
  ],
  "stations_per_span": 10,
  "claims": {
    "tolerance": "1%",
    "values": [
      {"quantity": "reaction", "node": "A", "value": 22.9},
      {"quantity": "moment", "node": "B", "value": -78.4}
    ]
  }
}
)";
}  // namespace

int run_example() {
  std::cout << kExample;
  return kExitAgree;
}

int run_schema() {
  std::cout << input::beam_file_schema() << std::flush;
  return kExitAgree;
}

}  // namespace trivet::cli
