// Acceptance 5: with tooth and bone far stiffer than the PDL, equilibrium fixes the PDL stress, so
// the peak PDL pressure hardly depends on the PDL modulus while the tooth's displacement scales
// as 1/E (check-values.md section 1, consequence of the published constants: PDL 0.05 to 0.7 MPa
// against dentine 18.6 GPa and bone 1.37 to 13.7 GPa; derived).
// The derivation says "nearly" without a number: the 10 % bound below is the project's acceptance
// criterion (docs/analyses.md section 8.3), neither published nor derived. Measured on 2026-12-02
// (coarse preset; spread = (largest - smallest) / largest): peak 1.6 % (tipping) and 6.4 %
// (translation), 95th percentile 0.1 % and 1.1 %, displacement x E 4.5 % and 3.9 %. Kept at 10 %
// rather than fitted closer: the peak depends on the band left out at the crest, which is being
// redefined.
#include <gtest/gtest.h>

#include <algorithm>

#include "sharpey/analysis/study.h"
#include "test_study_cases.h"

namespace sharpey::analysis {
namespace {

TEST(PdlModulus, PressureNearlyIndependentDisplacementAsInverse) {
  CaseSpec spec = testing::incisor_case(mesh::MeshPreset::kCoarse, {0});
  const std::vector<double> moduli = {0.05, 0.47, 0.7};  // MPa, the published range and default
  const std::vector<MovementPreset> presets = {MovementPreset::kUncontrolledTipping,
                                               MovementPreset::kTranslation};
  // [preset][modulus]
  std::vector<std::vector<double>> peak(2), p95(2), tip_times_e(2);
  for (double e : moduli) {
    spec.pdl_material.young_modulus_mpa = e;
    const ScenarioSolution s(spec, 0, {}, nullptr);
    for (size_t k = 0; k < presets.size(); ++k) {
      const ScenarioResult r =
          evaluate(s, testing::lingual_g(100, presets[k]), spec.thresholds, nullptr);
      peak[k].push_back(r.pressure_max_compression_kpa);
      p95[k].push_back(r.pressure_p95_compression_kpa);
      tip_times_e[k].push_back(r.crown_tip_displacement_um.norm() * e);
      std::cout << to_string(presets[k]) << " E_pdl " << e << " MPa: peak " << peak[k].back()
                << " kPa, p95 " << p95[k].back() << " kPa, crown tip "
                << r.crown_tip_displacement_um.norm() << " um\n";
    }
  }
  const auto spread = [](const std::vector<double>& v) {
    const auto [lo, hi] = std::minmax_element(v.begin(), v.end());
    return (*hi - *lo) / *hi;
  };
  for (size_t k = 0; k < presets.size(); ++k) {
    SCOPED_TRACE(to_string(presets[k]));
    EXPECT_LT(spread(peak[k]), 0.10);         // project acceptance: less than 10 % (see above)
    EXPECT_LT(spread(p95[k]), 0.10);          // project acceptance
    EXPECT_LT(spread(tip_times_e[k]), 0.10);  // project acceptance; displacement x E: u ~ 1/E
  }
}

}  // namespace
}  // namespace sharpey::analysis
