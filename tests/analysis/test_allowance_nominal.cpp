// Nominal force allowances (analysis/force_allowance.h) on the incisor sample, coarse preset:
// linearity (the force at an allowance gives the threshold), and every allowance falls with bone
// loss. The sample case is invented (samples/maxillary_central_incisor_bone_loss.json).
#include <gtest/gtest.h>

#include <cmath>
#include <memory>

#include "sharpey/analysis/force_allowance.h"
#include "sharpey/analysis/verdict.h"
#include "sharpey/error.h"

namespace sharpey::analysis {
namespace {

class IncisorSampleAllowance : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    CaseSpec spec =
        load_case(SHARPEY_SOURCE_DIR "/samples/maxillary_central_incisor_bone_loss.json");
    spec.model.sizing.preset = mesh::MeshPreset::kCoarse;  // CI budget
    study_ = std::make_unique<Study>(spec);
    allowances_ = nominal_allowances(*study_);
  }
  static void TearDownTestSuite() {
    study_.reset();
    allowances_.clear();
  }
  static std::unique_ptr<Study> study_;
  static std::vector<ScenarioAllowances> allowances_;
};
std::unique_ptr<Study> IncisorSampleAllowance::study_;
std::vector<ScenarioAllowances> IncisorSampleAllowance::allowances_;

constexpr AllowanceMeasure kMeasures[] = {AllowanceMeasure::kPeak, AllowanceMeasure::kP95};
constexpr AllowanceThreshold kThresholds[] = {AllowanceThreshold::kCapillary,
                                              AllowanceThreshold::kLimit};

double threshold_kpa(const Thresholds& t, AllowanceThreshold which) {
  return which == AllowanceThreshold::kCapillary ? t.capillary.value_kpa : t.limit.value_kpa;
}

double measure_kpa(const ScenarioResult& r, AllowanceMeasure which) {
  return which == AllowanceMeasure::kPeak ? r.pressure_max_compression_kpa
                                          : r.pressure_p95_compression_kpa;
}

TEST_F(IncisorSampleAllowance, OneEntryPerScenarioAndMovement) {
  ASSERT_EQ(allowances_.size(), study_->spec().scenarios.size());
  for (const ScenarioAllowances& s : allowances_) {
    ASSERT_EQ(s.movements.size(), all_movement_presets().size());
    for (MovementPreset m : all_movement_presets()) EXPECT_EQ(s.of(m).movement, m);
  }
}

// The force at an allowance, applied with the movement's couple in the user's unit (grams), gives
// the threshold to 1e-9 relative (derived: the evaluation is linear in the force magnitude). An
// infinite allowance only where the movement compresses nothing by that measure.
TEST_F(IncisorSampleAllowance, ForceAtAllowanceGivesTheThreshold) {
  const CaseSpec& spec = study_->spec();
  int n_checked = 0;
  for (size_t k = 0; k < allowances_.size(); ++k) {
    const ScenarioSolution& solution = *study_->solutions()[k];
    for (const MovementAllowance& a : allowances_[k].movements) {
      for (AllowanceMeasure measure : kMeasures) {
        for (AllowanceThreshold which : kThresholds) {
          SCOPED_TRACE(allowances_[k].scenario + ", " + to_string(a.movement) + ", " +
                       to_string(measure) + " vs " + to_string(which));
          const double force_n = a.force_n(measure, which);
          const double per_n =
              measure == AllowanceMeasure::kPeak ? a.peak_kpa_per_n : a.p95_kpa_per_n;
          if (!std::isfinite(force_n)) {
            EXPECT_EQ(per_n, 0.0);
            continue;
          }
          ASSERT_GT(force_n, 0);
          LoadSpec load = allowance_load(spec.load, a.movement);
          load.unit = spec.load.unit;
          load.magnitude = convert_force(force_n, ForceUnit::kNewton, spec.load.unit);
          const ScenarioResult r = evaluate(solution, load, spec.thresholds, nullptr);
          const double t = threshold_kpa(spec.thresholds, which);
          EXPECT_NEAR(measure_kpa(r, measure), t, 1e-9 * t);
          ++n_checked;
        }
      }
    }
  }
  // Six of the seven movements compress the ligament in every scenario (all but extrusion).
  EXPECT_EQ(n_checked, static_cast<int>(allowances_.size()) * 6 * 4);
}

// Every allowance that compression limits falls with bone loss, for every movement (published for
// tipping on an incisor: Geramy 2002, Eur J Orthod 24:21, check-values.md section 8; the practice
// rule of reducing force in proportion to the lost attachment, same section). Extrusion stretches
// the ligament: no compression outside the crest edge band in any scenario (derived: a pull along
// the axis puts the whole ligament in tension in a linear-elastic model), so its compression
// allowance is unbounded; its peak tension per newton rises with bone loss instead.
TEST_F(IncisorSampleAllowance, EveryAllowanceFallsWithBoneLoss) {
  for (size_t k = 1; k < allowances_.size(); ++k) {
    ASSERT_GT(allowances_[k].bone_loss_mm, allowances_[k - 1].bone_loss_mm);
    for (MovementPreset m : all_movement_presets()) {
      const MovementAllowance& now = allowances_[k].of(m);
      const MovementAllowance& before = allowances_[k - 1].of(m);
      SCOPED_TRACE(allowances_[k].scenario + " vs " + allowances_[k - 1].scenario + ", " +
                   to_string(m));
      if (m == MovementPreset::kExtrusion) {
        EXPECT_FALSE(now.limited_by_compression());
        EXPECT_FALSE(before.limited_by_compression());
        EXPECT_GT(now.peak_tension_kpa_per_n, before.peak_tension_kpa_per_n);
        continue;
      }
      for (AllowanceMeasure measure : kMeasures) {
        for (AllowanceThreshold which : kThresholds) {
          SCOPED_TRACE(to_string(measure) + " vs " + to_string(which));
          EXPECT_LT(now.force_n(measure, which), before.force_n(measure, which));
        }
      }
    }
  }
}

// The limit allowance is the capillary one times the threshold ratio (derived, linearity).
TEST_F(IncisorSampleAllowance, AllowancesScaleWithTheThreshold) {
  const Thresholds& t = study_->spec().thresholds;
  const double ratio = t.limit.value_kpa / t.capillary.value_kpa;
  for (const ScenarioAllowances& s : allowances_) {
    for (const MovementAllowance& a : s.movements) {
      if (!a.limited_by_compression()) continue;  // infinite (extrusion), see above
      SCOPED_TRACE(s.scenario + ", " + to_string(a.movement));
      EXPECT_NEAR(a.peak_limit_n, ratio * a.peak_capillary_n, 1e-12 * a.peak_limit_n);
      EXPECT_NEAR(a.p95_limit_n, ratio * a.p95_capillary_n, 1e-12 * a.p95_limit_n);
      // The 95th percentile never exceeds the peak, so its allowance is never the smaller one.
      EXPECT_GE(a.p95_limit_n, a.peak_limit_n);
    }
  }
}

TEST(AllowanceLoad, VerticalCaseForceFallsBackToLabiolingualForHorizontalMovements) {
  LoadSpec intrusive;
  intrusive.direction = named_direction("intrusive");
  EXPECT_EQ(allowance_load(intrusive, MovementPreset::kTranslation).direction,
            named_direction("lingual"));
  EXPECT_EQ(allowance_load(intrusive, MovementPreset::kIntrusion).direction,
            named_direction("intrusive"));
  LoadSpec mesial;
  mesial.direction = Eigen::Vector3d(0, 2, 0);
  const LoadSpec l = allowance_load(mesial, MovementPreset::kControlledTipping);
  EXPECT_EQ(l.direction, Eigen::Vector3d(0, 1, 0));
  EXPECT_EQ(l.magnitude, 1.0);
  EXPECT_EQ(l.unit, ForceUnit::kNewton);
  EXPECT_EQ(allowance_load(mesial, MovementPreset::kExtrusion).direction,
            named_direction("extrusive"));
  LoadSpec zero;
  zero.direction.setZero();
  EXPECT_THROW(allowance_load(zero, MovementPreset::kTranslation), InputError);
}

// common practice (check-values.md section 9).
TEST(CommonPracticeRange, RangesOfTheTrade) {
  EXPECT_EQ(common_practice_range(MovementPreset::kTranslation).low_g, 70);
  EXPECT_EQ(common_practice_range(MovementPreset::kTranslation).high_g, 120);
  EXPECT_EQ(common_practice_range(MovementPreset::kIntrusion).high_g, 20);
  EXPECT_EQ(common_practice_range(MovementPreset::kRootMovement).low_g, 50);
  EXPECT_EQ(common_practice_range(MovementPreset::kRotation).status, "common practice");
  EXPECT_THROW(common_practice_range(MovementPreset::kNone), Error);
}

}  // namespace
}  // namespace sharpey::analysis
