// Acceptance 2, 3, 4 and 6: the healthy maxillary central incisor and 2, 4 and 6 mm of horizontal
// bone loss (coarse mesh preset, to keep CI fast; docs/analyses.md records the standard preset).
#include <gtest/gtest.h>

#include <cmath>
#include <memory>

#include "sharpey/analysis/study.h"
#include "test_study_cases.h"

namespace sharpey::analysis {
namespace {

using testing::incisor_case;
using testing::lingual_g;

class IncisorBoneLoss : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    study_ = std::make_unique<Study>(incisor_case(mesh::MeshPreset::kCoarse, {0, 2, 4, 6}));
  }
  static void TearDownTestSuite() { study_.reset(); }
  static std::unique_ptr<Study> study_;
};
std::unique_ptr<Study> IncisorBoneLoss::study_;

// Healthy CRes 33 to 42 % of the embedded root apical to the crest, both force directions.
// Bound: published range, not widened. The range is common practice (the figure orthodontic texts
// quote for a single-rooted tooth; no single source read here); its upper end matches source:
// Poppe, Bourauel, Jaeger 2002, J Orofac Orthop 63:358 (about 42 % of the alveolar height;
// check-values.md section 7). Measured 39.0 % (labiolingual) and 38.3 % (mesiodistal) on 2026-12-02
// with the rigid motion fitted to the embedded root (38.1 / 37.7 % with the former whole-tooth
// fit).
TEST_F(IncisorBoneLoss, HealthyCentreOfResistance) {
  const ScenarioSolution& h = *study_->solutions()[0];
  for (const CentreOfResistance* c : {&h.cres_labiolingual(), &h.cres_mesiodistal()}) {
    std::cout << "healthy CRes " << c->from_crest_mm << " mm below the crest, "
              << 100 * c->fraction_embedded << " % of the embedded root\n";
    EXPECT_GE(c->fraction_embedded, 0.33);  // published (see above)
    EXPECT_LE(c->fraction_embedded, 0.42);  // published (see above)
  }
}

// source: Geramy 2000, Am J Orthod Dentofacial Orthop 117:399 (published; its abstract read in a
// secondary copy): "Bone loss causes center of resistance movement toward the apex, but its
// relative distance to the alveolar crest decreases at the same time." Checked as stated: with
// every step of loss the CRes lies further below the CEJ and at a smaller fraction of the
// remaining embedded root, for both force directions. No bound on how far the fraction falls:
// none is published (an earlier 5-point bound was recalled from memory and is withdrawn). How far
// it falls is set by the root's outline; that the finite-element drift stays within 1.5 points of
// the thin-layer estimate over the same outline (derived) is asserted in
// test_study_cres_outline.cpp (IncisorTaperProfile: default materials, 6 mm loss).
TEST_F(IncisorBoneLoss, CentreOfResistanceMovesApically) {
  const auto& s = study_->solutions();
  for (size_t k = 1; k < s.size(); ++k) {
    SCOPED_TRACE(s[k]->scenario().name);
    for (int dir = 0; dir < 2; ++dir) {
      const auto& prev = dir == 0 ? s[k - 1]->cres_labiolingual() : s[k - 1]->cres_mesiodistal();
      const auto& cur = dir == 0 ? s[k]->cres_labiolingual() : s[k]->cres_mesiodistal();
      const auto& healthy = dir == 0 ? s[0]->cres_labiolingual() : s[0]->cres_mesiodistal();
      std::cout << s[k]->scenario().name << (dir == 0 ? " x" : " y") << ": CRes " << cur.from_cej_mm
                << " mm below the CEJ, " << 100 * cur.fraction_embedded
                << " % of the remaining embedded root ("
                << 100 * (cur.fraction_embedded - healthy.fraction_embedded)
                << " points from healthy)\n";
      EXPECT_GT(cur.from_cej_mm, prev.from_cej_mm);              // source: Geramy 2000
      EXPECT_LT(cur.fraction_embedded, prev.fraction_embedded);  // source: Geramy 2000
    }
  }
}

// Same force, more loss. Each trend with its source:
//  - the peak and 95th-percentile compressive pressure rise: source: Geramy 2002, Eur J Orthod
//    24:21 (check-values.md section 8: PDL stress rises several-fold with 8 mm of loss for
//    tipping);
//  - the moment-to-force ratio for translation rises: derived from the CRes moving apically
//    (source: Geramy 2000, Am J Orthod Dentofacial Orthop 117:399; check-values.md section 7);
//  - the equivalent force and the attachment area fall: common practice (reduce the force with the
//    lost attachment, check-values.md section 8); the equivalent force is derived from the peaks.
// Checked for a tipping force and for translation.
TEST_F(IncisorBoneLoss, MoreLossMorePressure) {
  for (const auto preset : {MovementPreset::kUncontrolledTipping, MovementPreset::kTranslation}) {
    SCOPED_TRACE(to_string(preset));
    const std::vector<ScenarioResult> r = study_->evaluate(lingual_g(100, preset));
    ASSERT_EQ(r.size(), 4u);
    for (size_t k = 0; k < r.size(); ++k) {
      std::cout << to_string(preset) << " " << r[k].name << ": peak "
                << r[k].pressure_max_compression_kpa << " kPa, p95 "
                << r[k].pressure_p95_compression_kpa << " kPa, M/F translation "
                << r[k].mf_translation_mm << " mm, F_eq peak " << r[k].equivalent_force_peak_g
                << " g, p95 " << r[k].equivalent_force_p95_g << " g, area rule "
                << r[k].equivalent_force_area_rule_g << " g\n";
    }
    EXPECT_NEAR(r[0].equivalent_force_peak_g, 100, 1e-9);
    for (size_t k = 1; k < r.size(); ++k) {
      SCOPED_TRACE(r[k].name);
      EXPECT_GT(r[k].pressure_max_compression_kpa, r[k - 1].pressure_max_compression_kpa);
      EXPECT_GT(r[k].pressure_p95_compression_kpa, r[k - 1].pressure_p95_compression_kpa);
      EXPECT_GT(r[k].mf_translation_mm, r[k - 1].mf_translation_mm);
      EXPECT_LT(r[k].equivalent_force_peak_g, r[k - 1].equivalent_force_peak_g);
      EXPECT_LT(r[k].equivalent_force_p95_g, r[k - 1].equivalent_force_p95_g);
      EXPECT_LT(r[k].equivalent_force_area_rule_g, r[k - 1].equivalent_force_area_rule_g);
      EXPECT_LT(r[k].attachment_area_mm2, r[k - 1].attachment_area_mm2);
    }
  }
}

// Derived (linearity): doubling the force doubles every pressure; the equivalent force brings the
// peak back to the healthy value (acceptance: within 1 %).
TEST_F(IncisorBoneLoss, LinearScalingAndEquivalentForce) {
  const auto& s = study_->solutions();
  const Thresholds t = default_thresholds();
  const LoadSpec load = lingual_g(100, MovementPreset::kTranslation);
  LoadSpec doubled = load;
  doubled.magnitude = 200;
  const ScenarioResult healthy = evaluate(*s[0], load, t, s[0].get());
  for (size_t k = 1; k < s.size(); ++k) {
    SCOPED_TRACE(s[k]->scenario().name);
    const ScenarioResult one = evaluate(*s[k], load, t, s[0].get());
    const ScenarioResult two = evaluate(*s[k], doubled, t, s[0].get());
    EXPECT_NEAR(two.pressure_max_compression_kpa, 2 * one.pressure_max_compression_kpa,
                1e-9 * one.pressure_max_compression_kpa);
    EXPECT_NEAR(two.pressure_p95_compression_kpa, 2 * one.pressure_p95_compression_kpa,
                1e-6 * one.pressure_p95_compression_kpa);
    EXPECT_NEAR(two.pressure_max_tension_kpa, 2 * one.pressure_max_tension_kpa,
                1e-9 * one.pressure_max_tension_kpa);
    for (size_t i = 0; i < one.pressure_kpa.size(); i += 97) {
      EXPECT_NEAR(two.pressure_kpa[i], 2 * one.pressure_kpa[i],
                  1e-9 * one.pressure_max_compression_kpa);
    }
    EXPECT_NEAR(two.mf_translation_mm, one.mf_translation_mm, 1e-9);
    EXPECT_NEAR(two.load.moment_to_force_mm, one.load.moment_to_force_mm, 1e-9);

    LoadSpec equivalent = load;
    equivalent.magnitude = one.equivalent_force_peak_g;
    const ScenarioResult eq = evaluate(*s[k], equivalent, t, s[0].get());
    EXPECT_NEAR(eq.pressure_max_compression_kpa, healthy.pressure_max_compression_kpa,
                0.01 * healthy.pressure_max_compression_kpa);
    equivalent.magnitude = one.equivalent_force_p95_g;
    EXPECT_NEAR(evaluate(*s[k], equivalent, t, s[0].get()).pressure_p95_compression_kpa,
                healthy.pressure_p95_compression_kpa, 0.01 * healthy.pressure_p95_compression_kpa);
  }
}

// Acceptance 6: a 100 g translation of the healthy incisor gives a peak compression in the kPa
// range. Bound: widened, an order-of-magnitude check. source: Moga et al. 2023, Int J Environ Res
// Public Health 20:1889 (check-values.md section 8, pub): an intact lower second premolar keeps
// 0.6 to 1.2 N below 16 kPa, i.e. (taking the range's ends as the force at 16 kPa) 13 to 27 kPa per
// newton at the peak. That is another tooth, movement mix and model, and this incisor's 100 g
// translation gives 8.9 kPa (measured 2026-12-02), under that range; so the bound is 1 to 100
// kPa, about a decade under the published level and four times over it (widened: different tooth
// and model; it tells kPa from Pa or MPa, i.e. a units or scaling error, and nothing finer). The
// premolar of the study itself is compared in test_clinical_premolar.cpp.
TEST_F(IncisorBoneLoss, TranslationPressureIsInTheKilopascalRange) {
  const std::vector<ScenarioResult> r =
      study_->evaluate(lingual_g(100, MovementPreset::kTranslation));
  std::cout << "100 g translation, healthy: peak compression " << r[0].pressure_max_compression_kpa
            << " kPa, p95 " << r[0].pressure_p95_compression_kpa << " kPa, peak tension "
            << r[0].pressure_max_tension_kpa << " kPa\n";
  EXPECT_GT(r[0].pressure_max_compression_kpa, 1.0);    // widened (see above)
  EXPECT_LT(r[0].pressure_max_compression_kpa, 100.0);  // widened (see above)
  // Translation loads the ligament nearly evenly: for a rigid cylinder in a thin layer the
  // pressure goes as cos(angle) round the root, so the 95th percentile is 0.99 of the peak
  // (derived). Widened to 0.5 for the tapered root and the crest; measured 8.3 / 8.9 kPa = 0.93 on
  // 2026-12-02. Catches a peak that runs away from the bulk of the ligament.
  EXPECT_GT(r[0].pressure_p95_compression_kpa, 0.5 * r[0].pressure_max_compression_kpa);
  EXPECT_LE(r[0].pressure_p95_compression_kpa, r[0].pressure_max_compression_kpa);
}

}  // namespace
}  // namespace sharpey::analysis
