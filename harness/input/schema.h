// trivet: the JSON Schema (draft 2020-12) of the beam file, as printed by
// `trivet schema`. The text is harness/input/beam-file.schema.json, embedded
// at build time (a test checks the printed text against the file).
#pragma once

#include <string_view>

namespace trivet::input {

// The schema text, byte for byte the file harness/input/beam-file.schema.json.
std::string_view beam_file_schema();

}  // namespace trivet::input
