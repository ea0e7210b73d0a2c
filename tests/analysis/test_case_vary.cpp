// --vary options of sweeps: parsing "KEY=V1,V2", setting a value by its case-file path, and the
// malformed options rejected with key "--vary".
#include <gtest/gtest.h>

#include <string>

#include "sharpey/analysis/case_spec.h"
#include "sharpey/error.h"

namespace sharpey::analysis {
namespace {

const char* kCase = R"({
  "tooth": {"type": "maxillary_central_incisor"},
  "pdl": {"width_mm": 0.2},
  "scenarios": [{"name": "healthy", "horizontal_loss_mm": 0}, {"name": "loss", "horizontal_loss_mm": 2}],
  "load": {"magnitude": 100, "unit": "g", "direction": "lingual"},
  "mesh": {"preset": "coarse"}
})";

TEST(CaseVary, ParsesKeyAndValues) {
  const CaseVariation v = parse_variation("load.magnitude=50, 100 ,150");
  EXPECT_EQ(v.key, "load.magnitude");
  EXPECT_EQ(v.values, (std::vector<std::string>{"50", "100", "150"}));
  // Commas inside brackets or quotes do not split.
  const CaseVariation w = parse_variation("load.direction=[1,0,0],\"lingual\",[0,0.5,-1]");
  EXPECT_EQ(w.values, (std::vector<std::string>{"[1,0,0]", "\"lingual\"", "[0,0.5,-1]"}));
  EXPECT_EQ(parse_variation("scenarios[1].horizontal_loss_mm=3").key,
            "scenarios[1].horizontal_loss_mm");
}

TEST(CaseVary, SetsNumbersWordsVectorsAndMissingObjects) {
  CaseSpec spec = parse_case(set_case_value(kCase, "load.magnitude", "150"));
  EXPECT_EQ(spec.load.magnitude, 150);
  spec = parse_case(set_case_value(kCase, "load.direction", "mesial"));  // bare word -> string
  EXPECT_EQ(spec.load.direction, Eigen::Vector3d::UnitY());
  spec = parse_case(set_case_value(kCase, "load.direction", "[0, 3, 4]"));
  EXPECT_NEAR((spec.load.direction - Eigen::Vector3d(0, 0.6, 0.8)).norm(), 0, 1e-15);
  // pdl.material does not exist in the file: it is created.
  spec = parse_case(set_case_value(kCase, "pdl.material.young_modulus_mpa", "0.05"));
  EXPECT_EQ(spec.pdl_material.young_modulus_mpa, 0.05);
  EXPECT_EQ(spec.pdl_material.poisson_ratio, 0.45);  // the rest keeps its default
  spec = parse_case(set_case_value(kCase, "scenarios[1].horizontal_loss_mm", "4.5"));
  EXPECT_EQ(spec.scenarios[1].loss.horizontal_mm, 4.5);
  EXPECT_EQ(spec.scenarios[0].loss.horizontal_mm, 0);
  // A named direction replaced by angles: the string becomes an object.
  spec = parse_case(set_case_value(kCase, "load.direction.azimuth_deg", "90"));
  EXPECT_NEAR((spec.load.direction - Eigen::Vector3d::UnitY()).norm(), 0, 1e-15);
}

TEST(CaseVary, AVariedValueIsCheckedLikeTheFile) {
  const std::string text = set_case_value(kCase, "load.magnitude", "abc");
  try {
    parse_case(text, "sweep");
    FAIL() << "accepted a magnitude \"abc\"";
  } catch (const InputError& e) {
    EXPECT_EQ(e.key(), "load.magnitude");
  }
  // A misspelt key lands in the file as an unknown key and is reported with a suggestion.
  try {
    parse_case(set_case_value(kCase, "load.magnitde", "5"), "sweep");
    FAIL();
  } catch (const InputError& e) {
    EXPECT_EQ(e.key(), "load.magnitde");
    EXPECT_NE(std::string(e.what()).find("did you mean \"magnitude\""), std::string::npos);
  }
}

struct BadVary {
  const char* name;
  const char* option;
  const char* fragment;
};

std::ostream& operator<<(std::ostream& os, const BadVary& b) {
  return os << b.name << " [--vary " << b.option << "]";
}

class BadVaryTest : public ::testing::TestWithParam<BadVary> {};

TEST_P(BadVaryTest, RejectedNamingTheOption) {
  const BadVary& b = GetParam();
  SCOPED_TRACE(b.option);
  try {
    const CaseVariation v = parse_variation(b.option);
    for (const std::string& value : v.values) set_case_value(kCase, v.key, value);
    FAIL() << "accepted --vary " << b.option;
  } catch (const InputError& e) {
    EXPECT_EQ(e.key(), "--vary");
    const std::string message = e.what();
    EXPECT_NE(message.find(b.fragment), std::string::npos) << message;
    EXPECT_NE(message.find("--vary"), std::string::npos) << message;
  }
}

const BadVary kBadVaries[] = {
    {"no_equals", "load.magnitude", "no '='"},
    {"no_values", "load.magnitude=", "no values"},
    {"empty_value", "load.magnitude=50,,100", "empty value"},
    {"empty_key", "=50", "the key is empty"},
    {"bad_characters", "load magnitude=50", "not a dotted key path"},
    {"trailing_dot", "load.=50", "not a dotted key path"},
    {"bad_index", "scenarios[x].horizontal_loss_mm=1", "malformed array index"},
    {"index_out_of_range", "scenarios[5].horizontal_loss_mm=1", "no element [5]"},
    {"index_on_object", "load[0]=1", "no element [0]"},
};

INSTANTIATE_TEST_SUITE_P(CaseVary, BadVaryTest, ::testing::ValuesIn(kBadVaries),
                         [](const ::testing::TestParamInfo<BadVary>& p) {
                           return std::string(p.param.name);
                         });

}  // namespace
}  // namespace sharpey::analysis
