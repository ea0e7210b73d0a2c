// Acceptance 6, second half: the pressure level of the model beside a published premolar study.
// source: Moga et al. 2023, Int J Environ Res Public Health 20:1889 (check-values.md section 8,
// pub): for a lower second premolar, an intact periodontium keeps 0.6 to 1.2 N below the 16 kPa
// physiological limit; after about 4 mm of bone loss 0.2 to 0.4 N is the safe range for tipping,
// translation and rotation.
// Here: the mandibular second premolar of the handbook, healthy and with 4 mm horizontal loss,
// each movement at 1 N; the force that brings the peak compression to 16 kPa is 16 kPa divided by
// the peak per newton (the model is linear). Two kinds of assertion:
//  - lower with loss for every movement: published (the same source's trend);
//  - each force within a factor of 3 of the published range: widened. Their model differs from
//    this one (geometry, materials, loading, where the peak is read), and the published ranges
//    are given for the three movements together, while this model separates them. Measured on
//    2026-12-02 (coarse preset, this test): healthy tipping 0.24 N, 2.5 times under the range's
//    lower end, and translation with loss 0.79 N, 2.0 times over its upper end (standard preset:
//    0.28 and 0.85 N, 2.1 times each); so the published range itself fails, and the factor 3 is
//    only an order-of-magnitude check. It catches a pressure off by a units or scaling error, not
//    a modelling difference.
// The standard-preset figures are recorded in docs/analyses.md section 8.4.
#include <gtest/gtest.h>

#include <cstdio>
#include <memory>

#include "sharpey/analysis/study.h"
#include "test_study_cases.h"

namespace sharpey::analysis {
namespace {

CaseSpec premolar_case() {
  CaseSpec spec = testing::incisor_case(mesh::MeshPreset::kCoarse, {0, 4});
  spec.label = "invented verification case: mandibular second premolar";
  spec.model.tooth.type = mesh::ToothType::kMandibularSecondPremolar;
  spec.model.tooth.dimensions = mesh::handbook_dimensions(spec.model.tooth.type);
  return spec;
}

TEST(PremolarPressureLevel, ForceAtTheLimitFallsWithLossAndIsNearThePublishedRange) {
  const Study study(premolar_case());
  const double limit_kpa = default_thresholds().limit.value_kpa;
  ASSERT_EQ(limit_kpa, 16.0);
  for (const auto preset : {MovementPreset::kUncontrolledTipping, MovementPreset::kTranslation,
                            MovementPreset::kRotation}) {
    SCOPED_TRACE(to_string(preset));
    LoadSpec load = testing::lingual_g(100, preset);
    load.magnitude = 1;
    load.unit = ForceUnit::kNewton;
    const std::vector<ScenarioResult> r = study.evaluate(load);
    ASSERT_EQ(r.size(), 2u);
    const double healthy_n = limit_kpa / r[0].pressure_max_compression_kpa;
    const double loss_n = limit_kpa / r[1].pressure_max_compression_kpa;
    std::printf(
        "%s: peak %.2f / %.2f kPa per N (healthy / 4 mm loss); force at 16 kPa %.2f / "
        "%.2f N (published 0.6 to 1.2 / 0.2 to 0.4 N)\n",
        to_string(preset).c_str(), r[0].pressure_max_compression_kpa,
        r[1].pressure_max_compression_kpa, healthy_n, loss_n);
    EXPECT_GT(healthy_n, 0.6 / 3);  // widened: published 0.6 N, factor 3 (see above)
    EXPECT_LT(healthy_n, 1.2 * 3);  // widened: published 1.2 N, factor 3
    EXPECT_GT(loss_n, 0.2 / 3);     // widened: published 0.2 N, factor 3
    EXPECT_LT(loss_n, 0.4 * 3);     // widened: published 0.4 N, factor 3
    EXPECT_LT(loss_n, healthy_n);   // published trend (Moga et al. 2023)
  }
}

}  // namespace
}  // namespace sharpey::analysis
