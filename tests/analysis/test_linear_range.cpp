// The linear-range flag: a scenario whose ligament strain passes the strain at which published
// bilinear PDL fits change slope (about 7.5 %, from memory: Poppe, Bourauel, Jaeger 2002, J Orofac
// Orthop 63:358; check-values.md sections 1 and 12) is flagged "beyond the linear range" with the
// share of the ligament volume beyond it.
#include <gtest/gtest.h>

#include <cstdio>
#include <string>

#include "sharpey/analysis/detail/pdl_regions.h"
#include "sharpey/analysis/study.h"

namespace sharpey::analysis {
namespace {

// The incisor sample (invented case: 100 g lingual, healthy and 6 mm loss; the 2 and 4 mm levels
// are left out to keep the test short) on the coarse preset.
CaseSpec incisor_sample_coarse() {
  CaseSpec spec = load_case(std::string(SHARPEY_SOURCE_DIR) +
                            "/samples/maxillary_central_incisor_bone_loss.json");
  spec.model.sizing.preset = mesh::MeshPreset::kCoarse;
  std::vector<Scenario> kept;
  for (const Scenario& s : spec.scenarios) {
    if (s.loss.horizontal_mm == 0 || s.loss.horizontal_mm == 6) kept.push_back(s);
  }
  spec.scenarios = kept;
  return spec;
}

class LinearRange : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    spec_ = new CaseSpec(incisor_sample_coarse());
    ASSERT_EQ(spec_->scenarios.size(), 2u);
    healthy_ = new ScenarioSolution(*spec_, 0, {}, nullptr);
    reduced_ = new ScenarioSolution(*spec_, 1, {}, nullptr);
  }
  static void TearDownTestSuite() {
    delete reduced_;
    delete healthy_;
    delete spec_;
  }
  static CaseSpec* spec_;
  static ScenarioSolution *healthy_, *reduced_;
};
CaseSpec* LinearRange::spec_ = nullptr;
ScenarioSolution* LinearRange::healthy_ = nullptr;
ScenarioSolution* LinearRange::reduced_ = nullptr;

// The acceptance of the flag: set at 6 mm loss, not at 0 mm, under the sample's 100 g lingual
// force, with the volume share printed (and the text every output shows).
TEST_F(LinearRange, FlaggedAtSixMillimetresLossNotWhenHealthy) {
  const ScenarioResult h = evaluate(*healthy_, spec_->load, spec_->thresholds, nullptr);
  const ScenarioResult r = evaluate(*reduced_, spec_->load, spec_->thresholds, healthy_);
  for (const ScenarioResult* x : {&h, &r}) {
    std::printf("%s: max |principal strain| %.2f %%, PDL volume beyond %.1f %% -> %s\n",
                x->name.c_str(), 100 * x->max_abs_principal_strain,
                x->volume_beyond_linear_range_percent,
                x->beyond_linear_range ? "flagged" : "within");
  }
  EXPECT_FALSE(h.beyond_linear_range);
  EXPECT_TRUE(beyond_linear_range_text(h).empty());
  EXPECT_TRUE(r.beyond_linear_range);
  EXPECT_GT(r.volume_beyond_linear_range_percent, 0.0);
  EXPECT_LT(r.volume_beyond_linear_range_percent, 100.0);
  const std::string text = beyond_linear_range_text(r);
  EXPECT_NE(text.find("Beyond the linear range"), std::string::npos) << text;
  EXPECT_NE(text.find("indicative only"), std::string::npos) << text;
}

// Derived (linearity): strains scale with the force, so the flag switches exactly where the
// largest strain magnitude reaches the limit, and the volume share only grows with the force.
TEST_F(LinearRange, SwitchesWhereTheStrainReachesTheLimit) {
  const ScenarioResult at_100 = evaluate(*reduced_, spec_->load, spec_->thresholds, nullptr);
  const double grams_at_limit = 100.0 * kLinearRangeStrainLimit / at_100.max_abs_principal_strain;
  LoadSpec below = spec_->load, above = spec_->load;
  below.magnitude = 0.99 * grams_at_limit;
  above.magnitude = 1.01 * grams_at_limit;
  const ScenarioResult r_below = evaluate(*reduced_, below, spec_->thresholds, nullptr);
  const ScenarioResult r_above = evaluate(*reduced_, above, spec_->thresholds, nullptr);
  std::printf("6 mm loss: the strain reaches the limit at %.1f g\n", grams_at_limit);
  EXPECT_FALSE(r_below.beyond_linear_range);
  EXPECT_TRUE(r_above.beyond_linear_range);
  EXPECT_LE(r_below.volume_beyond_linear_range_percent, r_above.volume_beyond_linear_range_percent);
  EXPECT_LE(r_above.volume_beyond_linear_range_percent, at_100.volume_beyond_linear_range_percent);
}

// Derived: the volume share counts element volumes; the PDL elements' volumes add up to the PDL
// volume of the parametric model (within 2 %, the mesher's own acceptance for volumes).
TEST_F(LinearRange, ElementVolumesAddUpToThePdlVolume) {
  const detail::PdlElementTable& table = healthy_->pdl_elements();
  const double parametric = healthy_->model().geometry.pdl_volume_mm3;
  std::printf("PDL volume: elements %.3f mm^3, parametric %.3f mm^3\n", table.total_volume_mm3,
              parametric);
  EXPECT_NEAR(table.total_volume_mm3, parametric, 0.02 * parametric);
}

}  // namespace
}  // namespace sharpey::analysis
