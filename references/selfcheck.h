// trivet: runs the reference cases through the methods (`trivet selfcheck`).
//
// Every case is checked with compare::check; then every published value
// is computed from EACH method that ran (not only from the consensus) and
// compared with the published value within the tolerance of its printed
// digits. A case holds when it was read without error, at least one method
// ran, no method failed, the methods agree, and every published value holds
// on every method that ran. A method that declares the beam not applicable
// is listed and skipped. Results are plain data: nothing here prints.
#pragma once

#include <cstddef>
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "harness/compare/compare.h"
#include "references/reference.h"

namespace trivet::references {

// One published value on one method.
struct MethodValue {
  std::string method;          // "three-moment", "slope-deflection", "stiffness"
  MethodStatus status = MethodStatus::Failed;
  bool evaluated = false;      // false: `reason` says why not (or not applicable)
  double computed = 0;
  double difference = 0;       // computed - published value
  bool holds = false;          // |difference| <= tolerance (true when skipped as not applicable)
  std::string reason;
};

// One published value of a case, on every method.
struct ValueResult {
  std::string pointer;         // "/expected/2" in the case file
  std::string quantity;        // "moment", "max_deflection_at", ...
  std::string where;           // "node B", "x = 3 m", "span 1", "node B (left)"
  std::string load_case;
  std::string published;       // as printed, "-0.1071"
  std::string multiplier;      // "w*L^2"
  double published_number = 0; // -0.1071
  double multiplier_value = 1; // w*L^2 evaluated
  double expected = 0;         // published_number * multiplier_value
  double tolerance = 0;        // absolute
  std::string tolerance_rule;  // "half a unit in the 4th decimal place"
  std::string form;            // "decimal", "exact", "rounded denominator"
  bool magnitude = false;      // printed without a sign: |computed| is compared
  std::string note;
  std::vector<MethodValue> methods;  // in the order the methods ran
  bool holds = false;          // on every method that ran, and at least one ran
};

struct CaseResult {
  std::string file;
  std::string id;
  std::string title;
  Source source;
  std::string citation;        // format_citation(source)
  std::vector<input::Error> errors;  // the file could not be used when not empty
  std::vector<std::string> methods_ok;             // methods that ran
  std::vector<std::pair<std::string, std::string>> methods_skipped;  // not applicable: name, reason
  std::vector<std::pair<std::string, std::string>> methods_failed;   // failed: name, reason
  compare::Verdict verdict = compare::Verdict::Unconfirmed;  // of the methods (worst load set)
  std::string verdict_problem; // plain words when not agree
  std::vector<ValueResult> values;
  bool holds = false;
  std::size_t values_failed() const;
};

struct SelfcheckResult {
  std::string directory;
  std::vector<CaseResult> cases;
  std::size_t cases_failed() const;
  std::size_t values_checked() const;
  std::size_t values_failed() const;
  bool holds() const { return !cases.empty() && cases_failed() == 0; }  // exit 0 only then
};

// Called on each case's check result before the published values are read
// from it (e.g. to replace the methods' values by ones computed in another
// arithmetic).
using AfterCheck = std::function<void(compare::BeamResult&, const ReferenceCase&)>;

// Runs one case (already read). Default options: all three methods.
CaseResult run_case(const ReferenceCase& reference, const compare::Options& options = {},
                    const AfterCheck& after = nullptr);
// Reads and runs every case under `dir` (default: directory()).
SelfcheckResult run_selfcheck(const std::string& dir, const compare::Options& options = {},
                              const AfterCheck& after = nullptr);
inline SelfcheckResult run_selfcheck() { return run_selfcheck(directory()); }

}  // namespace trivet::references
