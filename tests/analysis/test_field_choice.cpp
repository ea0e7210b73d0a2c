// Evaluating part of a result (field_choice.h) on a coarse incisor: what is computed equals the
// full evaluation bit for bit, what is left out is empty or NaN, never a stale number.
#include <gtest/gtest.h>

#include <cmath>
#include <cstring>

#include "sharpey/analysis/field_choice.h"
#include "test_study_cases.h"

namespace sharpey::analysis {
namespace {

bool same_bits(const std::vector<double>& a, const std::vector<double>& b) {
  return a.size() == b.size() && std::memcmp(a.data(), b.data(), a.size() * sizeof(double)) == 0;
}

TEST(FieldChoice, PartsEqualTheFullEvaluationAndTheRestIsLeftOut) {
  const CaseSpec spec = testing::incisor_case(mesh::MeshPreset::kCoarse, {0.0});
  const ScenarioSolution solution(spec, 0, ProgressCallback{}, nullptr);
  const LoadSpec load = testing::lingual_g(120, MovementPreset::kNone);
  const ScenarioResult full = evaluate(solution, load, spec.thresholds, &solution);
  const ScenarioResult pressure_only =
      evaluate(solution, load, spec.thresholds, &solution, FieldChoice{false, false, false, false});
  EXPECT_TRUE(same_bits(full.pressure_kpa, pressure_only.pressure_kpa));
  EXPECT_TRUE(same_bits(full.root_map.pressure_kpa, pressure_only.root_map.pressure_kpa));
  EXPECT_EQ(full.pressure_max_compression_kpa, pressure_only.pressure_max_compression_kpa);
  EXPECT_EQ(full.pressure_p95_compression_kpa, pressure_only.pressure_p95_compression_kpa);
  EXPECT_EQ(full.area_above_limit_mm2, pressure_only.area_above_limit_mm2);
  EXPECT_EQ(full.equivalent_force_peak_g, pressure_only.equivalent_force_peak_g);
  EXPECT_TRUE(full.centre_of_rotation == pressure_only.centre_of_rotation);
  EXPECT_TRUE(full.crown_tip_displacement_um == pressure_only.crown_tip_displacement_um);
  // Left out.
  EXPECT_TRUE(pressure_only.max_principal_strain_field.empty());
  EXPECT_TRUE(pressure_only.equivalent_strain_field.empty());
  EXPECT_TRUE(pressure_only.von_mises_kpa.empty());
  EXPECT_EQ(pressure_only.displacement_mm.cols(), 0);
  EXPECT_TRUE(std::isnan(pressure_only.max_principal_strain));
  EXPECT_TRUE(std::isnan(pressure_only.max_von_mises_kpa));
  EXPECT_TRUE(std::isnan(pressure_only.rigid_fit_rms_um));
  EXPECT_TRUE(std::isnan(pressure_only.volume_beyond_linear_range_percent));
  EXPECT_FALSE(pressure_only.beyond_linear_range);
  // Each field alone equals its full counterpart.
  const ScenarioResult strains =
      evaluate(solution, load, spec.thresholds, &solution, FieldChoice{true, false, false});
  EXPECT_TRUE(same_bits(full.max_principal_strain_field, strains.max_principal_strain_field));
  EXPECT_TRUE(same_bits(full.equivalent_strain_field, strains.equivalent_strain_field));
  EXPECT_EQ(full.max_abs_principal_strain, strains.max_abs_principal_strain);
  EXPECT_EQ(full.volume_beyond_linear_range_percent, strains.volume_beyond_linear_range_percent);
  const ScenarioResult vm =
      evaluate(solution, load, spec.thresholds, &solution, FieldChoice{false, true, false});
  EXPECT_TRUE(same_bits(full.von_mises_kpa, vm.von_mises_kpa));
  EXPECT_EQ(full.max_von_mises_kpa, vm.max_von_mises_kpa);
  const ScenarioResult moved =
      evaluate(solution, load, spec.thresholds, &solution, FieldChoice{false, false, true});
  EXPECT_TRUE(full.displacement_mm == moved.displacement_mm);
  EXPECT_EQ(full.rigid_fit_rms_um, moved.rigid_fit_rms_um);
}

// The strain maxima without the strain fields (FieldChoice::strain_maxima, what the app evaluates
// during a slider drag) equal the full evaluation's bit for bit (derived: the same closed-form
// principal values at every node that can hold a maximum), below and beyond the linear range,
// for forces in three directions and a couple.
TEST(FieldChoice, StrainMaximaWithoutTheFieldsEqualTheFullEvaluation) {
  const CaseSpec spec = testing::incisor_case(mesh::MeshPreset::kCoarse, {0.0});
  const ScenarioSolution solution(spec, 0, ProgressCallback{}, nullptr);
  bool seen_beyond = false, seen_within = false;
  for (const double grams : {30.0, 120.0, 600.0, 2000.0}) {
    for (const MovementPreset preset :
         {MovementPreset::kNone, MovementPreset::kTranslation, MovementPreset::kIntrusion}) {
      LoadSpec load = testing::lingual_g(grams, preset);
      if (preset == MovementPreset::kIntrusion) {
        load.preset = MovementPreset::kNone;
        load.direction = Eigen::Vector3d(0.3, 0.5, -0.8).normalized();
      }
      SCOPED_TRACE(std::to_string(grams) + " g, preset " + to_string(preset));
      const ScenarioResult full = evaluate(solution, load, spec.thresholds, nullptr);
      const ScenarioResult maxima = evaluate(solution, load, spec.thresholds, nullptr,
                                             FieldChoice{false, false, false, true});
      EXPECT_TRUE(maxima.max_principal_strain_field.empty());
      EXPECT_EQ(full.max_principal_strain, maxima.max_principal_strain);
      EXPECT_EQ(full.max_equivalent_strain, maxima.max_equivalent_strain);
      EXPECT_EQ(full.max_abs_principal_strain, maxima.max_abs_principal_strain);
      EXPECT_EQ(full.beyond_linear_range, maxima.beyond_linear_range);
      EXPECT_EQ(full.volume_beyond_linear_range_percent, maxima.volume_beyond_linear_range_percent);
      (full.beyond_linear_range ? seen_beyond : seen_within) = true;
    }
  }
  EXPECT_TRUE(seen_beyond);  // both sides of the limit were checked
  EXPECT_TRUE(seen_within);
}

}  // namespace
}  // namespace sharpey::analysis
