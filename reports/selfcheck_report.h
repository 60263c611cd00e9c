// Writers of the selfcheck's result (the cited reference cases), beside the
// check's writers in reports.h. They read results and never compute them.
#pragma once

#include <ostream>
#include <string>

#include "references/selfcheck.h"

namespace trivet::reports {

// The verification record as JSON: tool, summary, caution and every case
// with its published values and each method's computed value.
void write_selfcheck_json(std::ostream& out, const references::SelfcheckResult& r, const std::string& version);
// JUnit XML: a testsuite per case, a testcase for the case and per value.
void write_selfcheck_junit(std::ostream& out, const references::SelfcheckResult& r);

}  // namespace trivet::reports
