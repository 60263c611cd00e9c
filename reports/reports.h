// trivet: report writers. They read results and never compute them.
#pragma once

#include <ostream>
#include <string>
#include <vector>

#include "harness/compare/compare.h"

namespace trivet::reports {

struct Summary {
  std::size_t beams = 0, agree = 0, disagree = 0, unconfirmed = 0, invalid = 0, claims_failed = 0;
};
Summary summarize(const std::vector<compare::BeamResult>& beams);

struct RunInfo {
  std::string version;
  std::vector<std::string> methods;  // asked for
  double agreement = 1e-6;
};

// The full report (CONTRACT section 4) as JSON.
void write_json(std::ostream& out, const std::vector<compare::BeamResult>& beams, const RunInfo& run);

// JUnit XML: a testsuite per beam file, a testcase per load set and check
// (method agreement, each method's equilibrium, each claim).
// `equilibrium_bound`: the largest relative residual that passes.
void write_junit(std::ostream& out, const std::vector<compare::BeamResult>& beams, double equilibrium_bound);

struct ConsoleOptions {
  bool color = false;
  bool all_rows = false;     // every node and span, however many
  std::size_t max_rows = 40; // otherwise the first and last rows
};

// One beam as tables for a person.
void write_console(std::ostream& out, const compare::BeamResult& beam, const ConsoleOptions& opt);
// The closing summary line(s).
void write_console_summary(std::ostream& out, const Summary& s, const ConsoleOptions& opt);

// Rounds a value for a person: `decimals` after the point, no "-0".
std::string fixed(double v, int decimals);
// Decimals that give about 4 significant digits to the largest magnitude.
int decimals_for(double largest);

}  // namespace trivet::reports
