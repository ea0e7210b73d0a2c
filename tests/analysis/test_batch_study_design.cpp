// Study designs: what a design expands to (the varied keys in their order, the bone levels as the
// case's scenarios), the messages for bad designs, and the batch's message for a design larger
// than one sweep takes. Nothing here solves a model.
#include <gtest/gtest.h>

#include <string>
#include <vector>

#include "sharpey/analysis/case_spec.h"
#include "sharpey/analysis/multi_root_case.h"
#include "sharpey/analysis/study_design.h"
#include "sharpey/error.h"
#include "support/batch_process.h"

namespace sharpey::test {
namespace {

using analysis::parse_study_design;

TEST(StudyDesign, ExpandsToTheVariedKeysAndTheBoneLevelsAsScenarios) {
  const analysis::StudyDesign d = parse_study_design(R"({
    "label": "Invented design",
    "forces": [50, 100.5],
    "movements": ["translation", "controlled_tipping"],
    "materials": {"pdl.material.young_modulus_mpa": [0.47, 0.94]},
    "teeth": ["maxillary_canine", "mandibular_canine", "maxillary_first_premolar"],
    "bone_levels_mm": [0, 2.5],
    "also_vary": {"label": ["a", "true"]},
    "force_unit": "cN"
  })");
  EXPECT_EQ(d.label, "Invented design");
  // The design's own order (tooth, materials, others, movement, force), whatever the file's.
  ASSERT_EQ(d.variations.size(), 5u);
  EXPECT_EQ(d.variations[0].key, "tooth.type");
  EXPECT_EQ(d.variations[0].values,
            (std::vector<std::string>{"maxillary_canine", "mandibular_canine",
                                      "maxillary_first_premolar"}));
  EXPECT_EQ(d.variations[1].key, "pdl.material.young_modulus_mpa");
  EXPECT_EQ(d.variations[1].values, (std::vector<std::string>{"0.47", "0.94"}));
  EXPECT_EQ(d.variations[2].key, "label");
  // A text that reads as another JSON value keeps its quotes, so it stays text.
  EXPECT_EQ(d.variations[2].values, (std::vector<std::string>{"a", "\"true\""}));
  EXPECT_EQ(d.variations[3].key, "load.movement");
  EXPECT_EQ(d.variations[4].key, "load.magnitude");
  EXPECT_EQ(d.variations[4].values, (std::vector<std::string>{"50", "100.5"}));

  const std::string base = coarse_case_json(1);
  const analysis::CaseSpec spec =
      analysis::parse_case(analysis::apply_study_design(base, d), "design test");
  ASSERT_EQ(spec.scenarios.size(), 2u);
  EXPECT_EQ(spec.scenarios[0].name, "healthy");
  EXPECT_DOUBLE_EQ(spec.scenarios[1].loss.horizontal_mm, 2.5);
  EXPECT_EQ(spec.load.unit, analysis::ForceUnit::kCentinewton);
  // Every value goes through the case reader like a --vary value.
  const std::string varied = analysis::set_case_value(
      analysis::apply_study_design(base, d), d.variations[2].key, d.variations[2].values[1]);
  EXPECT_EQ(analysis::parse_case(varied).label, "true");
}

TEST(StudyDesign, MultiRootedDesignVariesTheFirstScenario) {
  const analysis::StudyDesign d = parse_study_design(R"({
    "label": "Invented design",
    "teeth": ["mandibular_first_molar", "maxillary_first_molar"],
    "bone_levels_mm": [0, 3],
    "furcation_degrees": [0, 1, 2, 3],
    "angular_defects_mm": [0, 2],
    "materials": {"pdl.poisson_ratio": [0.45, 0.49]},
    "also_vary": {"finite_elements": [false, true], "scenarios[0].furcation.entrances":
                  [["buccal"], ["buccal", "lingual"]]},
    "movements": ["uprighting", "translation"]
  })",
                                                     "design", /*multi_rooted=*/true);
  // The design's order: tooth, the scenario factors, materials, others, movement.
  std::vector<std::string> keys;
  for (const auto& v : d.variations) keys.push_back(v.key);
  EXPECT_EQ(keys,
            (std::vector<std::string>{
                "tooth.type", "scenarios[0].horizontal_loss_mm", "scenarios[0].furcation.degree",
                "scenarios[0].angular_defect.depth_mm", "pdl.poisson_ratio", "finite_elements",
                "scenarios[0].furcation.entrances", "load.movement"}));
  EXPECT_TRUE(d.bone_levels_mm.empty());  // varied keys, not a scenario list
  const std::string base = R"({"kind": "multi_root_estimate",
      "tooth": {"type": "mandibular_first_molar"},
      "scenarios": [{"name": "healthy"}, {"name": "3 mm", "horizontal_loss_mm": 3}],
      "load": {"movement": "uprighting", "magnitude": 10, "unit": "N mm"}})";
  const std::string applied = analysis::apply_study_design(base, d);
  // The first scenario alone, renamed; the unit dropped, so translation takes N.
  const std::string translation = analysis::set_case_value(
      analysis::set_case_value(applied, "load.movement", "translation"), "load.magnitude", "1");
  const analysis::MultiRootCase c = analysis::parse_multi_root_case(translation);
  ASSERT_EQ(c.scenarios.size(), 1u);
  EXPECT_EQ(c.scenarios[0].name, "varied by the design");
  EXPECT_EQ(c.unit, "N");
  EXPECT_EQ(analysis::parse_multi_root_case(applied).unit, "N mm");
}

struct BadDesign {
  const char* name;
  const char* json;
  const char* key;
  const char* fragment;
};

class StudyDesignBad : public ::testing::TestWithParam<BadDesign> {};

TEST_P(StudyDesignBad, NamesTheKeyTheValueAndTheFix) {
  const BadDesign& b = GetParam();
  try {
    parse_study_design(b.json, "d.json");
    FAIL() << "accepted " << b.json;
  } catch (const InputError& e) {
    EXPECT_EQ(e.key(), b.key);
    EXPECT_NE(std::string(e.what()).find(b.fragment), std::string::npos) << e.what();
    EXPECT_NE(std::string(e.what()).find("d.json"), std::string::npos) << e.what();
  }
}

const BadDesign kBadDesigns[] = {
    {"not_an_object", "[1, 2]", "design", "not a JSON object"},
    {"unknown_key", R"({"teeths": ["maxillary_canine"]})", "design.teeths", "a design knows"},
    {"empty_list", R"({"forces": []})", "design.forces", "empty"},
    {"repeated_value", R"({"forces": [50, 100, 50]})", "design.forces", "lists 50 twice"},
    {"negative_force", R"({"forces": [-5]})", "design.forces", "force -5"},
    {"bad_movement", R"({"movements": ["bodily"]})", "design.movements", "\"bodily\" is unknown"},
    {"negative_bone_level", R"({"bone_levels_mm": [0, -1]})", "design.bone_levels_mm", "-1"},
    {"not_a_material", R"({"materials": {"load.magnitude": [1]}})",
     "design.materials.load.magnitude", "not a material key"},
    {"factor_under_also_vary", R"({"also_vary": {"tooth.type": ["maxillary_canine"]}})",
     "design.also_vary.tooth.type", "set by the design's own factors"},
    {"bad_unit", R"({"forces": [1], "force_unit": "kg"})", "design.force_unit", "kg"},
    {"newer_version", R"({"design_version": 2, "forces": [1]})", "design.design_version",
     "newer program"},
    {"varies_nothing", R"({"label": "x"})", "design.teeth", "varies nothing"},
};

// A multi-rooted design (the base case is multi-rooted): its own movements, units and materials.
class StudyDesignBadMultiRooted : public ::testing::TestWithParam<BadDesign> {};

TEST_P(StudyDesignBadMultiRooted, NamesTheKeyTheValueAndTheFix) {
  const BadDesign& b = GetParam();
  try {
    parse_study_design(b.json, "d.json", /*multi_rooted=*/true);
    FAIL() << "accepted " << b.json;
  } catch (const InputError& e) {
    EXPECT_EQ(e.key(), b.key);
    EXPECT_NE(std::string(e.what()).find(b.fragment), std::string::npos) << e.what();
  }
}

const BadDesign kBadMultiRootedDesigns[] = {
    {"single_rooted_movement", R"({"movements": ["controlled_tipping"]})", "design.movements",
     "use uprighting, intrusion or translation"},
    {"single_rooted_material", R"({"materials": {"pdl.material.young_modulus_mpa": [1]}})",
     "design.materials.pdl.material.young_modulus_mpa", "pdl.young_modulus_mpa or"},
    {"bad_unit", R"({"forces": [1], "force_unit": "kN"})", "design.force_unit", "\"N mm\""},
    {"negative_degree", R"({"furcation_degrees": [0, -1]})", "design.furcation_degrees",
     "furcation degree -1"},
    {"negative_defect", R"({"angular_defects_mm": [-2]})", "design.angular_defects_mm", "-2"},
    {"other_scenario", R"({"also_vary": {"scenarios[1].horizontal_loss_mm": [1]}})",
     "design.also_vary.scenarios[1].horizontal_loss_mm", "set by the design's own factors"},
    {"factor_twice",
     R"({"bone_levels_mm": [1], "also_vary": {"scenarios[0].horizontal_loss_mm": [2]}})",
     "design.also_vary.scenarios[0].horizontal_loss_mm", "varied twice"},
};

INSTANTIATE_TEST_SUITE_P(Design, StudyDesignBadMultiRooted,
                         ::testing::ValuesIn(kBadMultiRootedDesigns),
                         [](const ::testing::TestParamInfo<BadDesign>& p) {
                           return std::string(p.param.name);
                         });

TEST(StudyDesign, MultiRootedFactorsAreRefusedOnASingleRootedCase) {
  try {
    parse_study_design(R"({"furcation_degrees": [0, 1]})", "d.json");
    FAIL() << "accepted";
  } catch (const InputError& e) {
    EXPECT_EQ(e.key(), "design.furcation_degrees");
    EXPECT_NE(std::string(e.what()).find("this base case is single-rooted: remove it"),
              std::string::npos)
        << e.what();
  }
}

INSTANTIATE_TEST_SUITE_P(Design, StudyDesignBad, ::testing::ValuesIn(kBadDesigns),
                         [](const ::testing::TestParamInfo<BadDesign>& p) {
                           return std::string(p.param.name);
                         });

TEST(StudyDesign, TooLargeADesignIsRefusedWithItsSizeAndTheFix) {
  TempFolder folder("design-size");
  const std::string case_path = folder / "case.json", design = folder / "design.json";
  write_file(case_path, coarse_case_json(1));
  // 10 teeth x 9 bone levels x 7 movements x 40 forces = 2800 combinations of 9 scenarios: taken;
  // with a PDL modulus factor of 8 values 22400: more than 20000.
  std::string forces;
  for (int f = 10; f <= 400; f += 10) forces += (forces.empty() ? "" : ", ") + std::to_string(f);
  const std::string teeth =
      R"("maxillary_central_incisor", "maxillary_lateral_incisor", "maxillary_canine",
         "maxillary_first_premolar", "maxillary_second_premolar", "mandibular_central_incisor",
         "mandibular_lateral_incisor", "mandibular_canine", "mandibular_first_premolar",
         "mandibular_second_premolar")";
  write_file(design, R"({"teeth": [)" + teeth +
                         R"(], "bone_levels_mm": [0, 1, 2, 3, 4, 5, 6, 7, 8],
      "movements": ["uncontrolled_tipping", "controlled_tipping", "translation", "root_movement",
                    "intrusion", "extrusion", "rotation"],
      "forces": [)" + forces +
                         R"(],
      "materials": {"pdl.material.young_modulus_mpa": [0.1, 0.2, 0.3, 0.47, 0.6, 0.7, 0.8, 0.9]}})");
  const ProcessResult r =
      run_batch({"sweep", case_path, "--design", design, "--out", folder / "out"}, 120);
  EXPECT_EQ(r.exit_code, 2) << r.err;
  EXPECT_NE(r.err.find("the sweep has 22400 combinations (tooth.type 10 x "
                       "pdl.material.young_modulus_mpa 8 x load.movement 7 x load.magnitude 40)"),
            std::string::npos)
      << r.err;
  EXPECT_NE(r.err.find("more than the 20000 one sweep takes; split it"), std::string::npos)
      << r.err;
  EXPECT_FALSE(exists(folder / "out"));
}

}  // namespace
}  // namespace sharpey::test
