// The JSON Schema of the beam file: the text embedded in the program is the
// file harness/input/beam-file.schema.json byte for byte, it is JSON of
// draft 2020-12, and it names every field the reader knows. (Validation of
// the corpus against it is the python3-jsonschema test, schema_check.py.)
#include <gtest/gtest.h>

#include <algorithm>
#include <fstream>
#include <sstream>

#include <nlohmann/json.hpp>

#include "harness/input/reader.h"
#include "harness/input/schema.h"

#ifndef TRIVET_SCHEMA_FILE
#error "TRIVET_SCHEMA_FILE must name harness/input/beam-file.schema.json"
#endif

namespace trivet::input {
namespace {

using nlohmann::json;

std::string file_text() {
  std::ifstream in(TRIVET_SCHEMA_FILE, std::ios::binary);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

TEST(Schema, TheEmbeddedTextIsTheFile) {
  const std::string f = file_text();
  ASSERT_FALSE(f.empty());
  EXPECT_EQ(std::string(beam_file_schema()), f);
}

TEST(Schema, IsDraft202012) {
  const json s = json::parse(beam_file_schema());
  EXPECT_EQ(s.at("$schema"), "https://json-schema.org/draft/2020-12/schema");
  EXPECT_EQ(s.at("type"), "object");
  EXPECT_EQ(s.at("additionalProperties"), false);
}

TEST(Schema, NamesEveryTopLevelFieldAndTheLimits) {
  const json s = json::parse(beam_file_schema());
  for (const char* key : {"$schema", "title", "description", "units", "spans", "supports", "labels", "loads",
                          "stations_per_span", "combinations", "deflection_limit", "moving_loads", "claims"})
    EXPECT_TRUE(s.at("properties").contains(key)) << key;
  EXPECT_EQ(s.at("properties").size(), 13u);
  const Limits lim;
  EXPECT_EQ(s["properties"]["spans"]["maxItems"].get<std::size_t>(), lim.max_spans);
  EXPECT_EQ(s["properties"]["supports"]["maxItems"].get<std::size_t>(), lim.max_spans + 1);
  EXPECT_EQ(s["properties"]["loads"]["maxItems"].get<std::size_t>(), lim.max_loads);
  EXPECT_EQ(s["properties"]["stations_per_span"]["maximum"].get<int>(), lim.max_stations_per_span);
  EXPECT_EQ(s["$defs"]["movingLoad"]["properties"]["points"]["maxItems"].get<std::size_t>(), lim.max_moving_points);
}

TEST(Schema, AMovingLoadHasTheReadersFields) {
  const json s = json::parse(beam_file_schema());
  const json& m = s["$defs"]["movingLoad"];
  EXPECT_EQ(m["required"].get<std::vector<std::string>>(), (std::vector<std::string>{"name", "points"}));
  std::vector<std::string> keys;
  for (auto it = m["properties"].begin(); it != m["properties"].end(); ++it) keys.push_back(it.key());
  std::sort(keys.begin(), keys.end());
  EXPECT_EQ(keys, (std::vector<std::string>{"directions", "name", "points"}));
  EXPECT_EQ(m["properties"]["directions"]["enum"].get<std::vector<std::string>>(), (std::vector<std::string>{"both", "forward"}));
  EXPECT_EQ(s["$defs"]["movingPoint"]["required"].get<std::vector<std::string>>(), (std::vector<std::string>{"P", "offset"}));
}

TEST(Schema, PresetsAreTheReadersPresets) {
  const json s = json::parse(beam_file_schema());
  const json& preset = s["$defs"]["combination"]["oneOf"][1]["properties"]["preset"]["enum"];
  EXPECT_EQ(preset.get<std::vector<std::string>>(), preset_names());
}

TEST(Schema, QuantitiesAreTheReadersQuantities) {
  const json s = json::parse(beam_file_schema());
  std::vector<std::string> names;
  for (int q = 0; q <= static_cast<int>(Quantity::ReactionMin); ++q) names.push_back(quantity_name(static_cast<Quantity>(q)));
  // Then the other spellings the reader accepts (claim_quantity).
  const std::vector<std::string> aliases = {"deflection_max", "max_shear", "min_shear", "max_reaction", "min_reaction"};
  for (const auto& a : aliases) {
    EXPECT_TRUE(claim_quantity(a, a == "deflection_max", a != "deflection_max")) << a;
    names.push_back(a);
  }
  EXPECT_EQ(s["$defs"]["claim"]["properties"]["quantity"]["enum"].get<std::vector<std::string>>(), names);
  EXPECT_FALSE(claim_quantity("maximum_moment", true, false));
}

}  // namespace
}  // namespace trivet::input
