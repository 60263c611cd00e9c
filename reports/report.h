// trivet: one beam as the reports show it.
//
// The check's result (harness/compare) with what the layers above the check
// attach to it: another program's results compared with ours (--against)
// and the runs in extended or exact arithmetic (--arithmetic, --reference).
// The compare layer names neither; the command line attaches them here.
#pragma once

#include <memory>
#include <utility>
#include <vector>

#include "harness/compare/against.h"
#include "harness/compare/compare.h"
#include "harness/precision/precision.h"

namespace trivet::reports {

struct Report : compare::BeamResult {
  Report() = default;
  // Implicit: a check's result is a report with nothing attached.
  Report(compare::BeamResult result) : compare::BeamResult(std::move(result)) {}  // NOLINT(google-explicit-constructor)
  // Another program's exported results compared with ours (--against).
  std::vector<std::shared_ptr<const compare::against::Comparison>> against;
  // Results in extended or exact arithmetic, one per load case (--arithmetic,
  // --reference).
  std::vector<std::shared_ptr<const precision::LoadSetNumbers>> precision;
  // Wall-clock seconds the beam took to read and check (JUnit's `time`).
  double seconds = 0;
};

}  // namespace trivet::reports
