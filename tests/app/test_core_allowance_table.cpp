// The allowance view's model (core/allowance_table.h) without a display or a solve: allowances
// built by hand, converted to the user's unit, the band beside them only when it belongs to the
// same levels, the apply action's force rounded down, and the force controls it sets.
#include <gtest/gtest.h>

#include <cmath>
#include <limits>

#include "core/allowance_table.h"
#include "core/units.h"

namespace sharpey::app {
namespace {

using analysis::AllowanceMeasure;
using analysis::AllowanceThreshold;
using analysis::ForceUnit;
using analysis::MovementPreset;

constexpr double kGramForceN = 9.80665e-3;  // standard gravity times 1 g (derived: CGPM 1901)

analysis::MovementAllowance allowance(MovementPreset m, double peak_limit_n) {
  analysis::MovementAllowance a;
  a.movement = m;
  if (std::isinf(peak_limit_n)) {
    a.peak_kpa_per_n = 0;  // no compression: every allowance unbounded
    a.peak_capillary_n = a.peak_limit_n = a.p95_capillary_n = a.p95_limit_n = peak_limit_n;
    return a;
  }
  a.peak_kpa_per_n = 16.0 / peak_limit_n;
  a.peak_limit_n = peak_limit_n;
  a.peak_capillary_n = peak_limit_n * 4.7 / 16.0;
  a.p95_limit_n = 2 * peak_limit_n;
  a.p95_capillary_n = 2 * peak_limit_n * 4.7 / 16.0;
  return a;
}

std::vector<analysis::ScenarioAllowances> two_levels() {
  std::vector<analysis::ScenarioAllowances> levels(2);
  levels[0].scenario = "healthy";
  levels[1].scenario = "4 mm loss";
  levels[1].bone_loss_mm = 4;
  for (size_t k = 0; k < 2; ++k) {
    const double scale = k == 0 ? 1.0 : 0.5;
    levels[k].movements = {
        allowance(MovementPreset::kUncontrolledTipping, 0.3 * scale),
        allowance(MovementPreset::kTranslation, 1.8 * scale),
        allowance(MovementPreset::kExtrusion, std::numeric_limits<double>::infinity())};
  }
  return levels;
}

analysis::AllowanceBand band_for(const std::vector<analysis::ScenarioAllowances>& nominal) {
  analysis::AllowanceBand band;
  for (const auto& s : nominal) {
    analysis::ScenarioBand sb;
    sb.scenario = s.scenario;
    for (const auto& a : s.movements) {
      analysis::MovementBand mb;
      mb.movement = a.movement;
      mb.peak_limit = {0.6 * a.peak_limit_n, 0.8 * a.peak_limit_n, 0.95 * a.peak_limit_n};
      mb.peak_capillary = mb.peak_limit;
      mb.p95_limit = mb.p95_capillary = mb.peak_limit;
      sb.movements.push_back(mb);
    }
    band.scenarios.push_back(sb);
  }
  return band;
}

TEST(AllowanceTable, NominalInTheUsersUnitWithThePracticeRange) {
  const auto nominal = two_levels();
  const auto levels = allowance_levels(nominal, nullptr, {}, ForceUnit::kGram);
  ASSERT_EQ(levels.size(), 2u);
  const AllowanceRow* tip = levels[1].row(MovementPreset::kUncontrolledTipping);
  ASSERT_NE(tip, nullptr);
  EXPECT_NEAR(tip->nominal, 0.15 / kGramForceN, 1e-9);  // derived: N to gram-force
  EXPECT_FALSE(tip->has_band());
  // check-values.md section 9 (common practice): tipping 35 to 60 g, translation 70 to 120 g.
  EXPECT_DOUBLE_EQ(tip->practice_low, 35);
  EXPECT_DOUBLE_EQ(tip->practice_high, 60);
  const AllowanceRow* trans = levels[0].row(MovementPreset::kTranslation);
  EXPECT_DOUBLE_EQ(trans->practice_low, 70);
  EXPECT_DOUBLE_EQ(trans->practice_high, 120);
  // In cN: the same force, 1 cN = 0.01 N (derived).
  const auto in_cn = allowance_levels(nominal, nullptr, {}, ForceUnit::kCentinewton);
  EXPECT_NEAR(in_cn[0].row(MovementPreset::kTranslation)->nominal, 180.0, 1e-9);
  EXPECT_NEAR(in_cn[0].row(MovementPreset::kTranslation)->practice_low, 70 * kGramForceN * 100,
              1e-9);
  // The other criteria pick the other allowances of the library's struct.
  const auto p95 =
      allowance_levels(nominal, nullptr, {AllowanceMeasure::kP95, AllowanceThreshold::kCapillary},
                       ForceUnit::kNewton);
  EXPECT_DOUBLE_EQ(p95[0].row(MovementPreset::kTranslation)->nominal, 2 * 1.8 * 4.7 / 16.0);
}

TEST(AllowanceTable, UnboundedMovementIsSaidInWords) {
  const auto levels = allowance_levels(two_levels(), nullptr, {}, ForceUnit::kGram);
  const AllowanceRow* ext = levels[0].row(MovementPreset::kExtrusion);
  ASSERT_NE(ext, nullptr);
  EXPECT_FALSE(ext->limited);
  EXPECT_EQ(allowance_text(ext->nominal, ForceUnit::kGram), QStringLiteral("unbounded"));
  EXPECT_FALSE(allowance_to_apply(*ext, ForceUnit::kGram).has_value());
  const AllowanceTable t = allowance_table(levels[0], ForceUnit::kGram);
  ASSERT_EQ(t.cells.size(), 3u);
  EXPECT_EQ(t.cells[2][1], QStringLiteral("unbounded"));
  EXPECT_EQ(t.cells[0][2], QStringLiteral("no band"));
  EXPECT_EQ(t.cells[0][5], QStringLiteral("35 to 60") + QChar(0x2009) + QStringLiteral("g"));
}

TEST(AllowanceTable, BandShownOnlyForTheSameLevels) {
  const auto nominal = two_levels();
  const analysis::AllowanceBand band = band_for(nominal);
  const auto with_band = allowance_levels(nominal, &band, {}, ForceUnit::kNewton);
  const AllowanceRow* tip = with_band[0].row(MovementPreset::kUncontrolledTipping);
  ASSERT_TRUE(tip->has_band());
  EXPECT_DOUBLE_EQ(tip->band_p10, 0.6 * 0.3);
  EXPECT_DOUBLE_EQ(tip->band_p90, 0.95 * 0.3);
  // A band of other levels (another study) is not put beside these allowances.
  auto other = nominal;
  other[1].scenario = "6 mm loss";
  const auto mismatched = allowance_levels(other, &band, {}, ForceUnit::kNewton);
  EXPECT_FALSE(mismatched[0].rows[0].has_band());
  other.pop_back();
  EXPECT_FALSE(allowance_levels(other, &band, {}, ForceUnit::kNewton)[0].rows[0].has_band());
}

TEST(AllowanceTable, AppliedForceIsTheConservativeAllowanceRoundedDown) {
  const auto nominal = two_levels();
  const analysis::AllowanceBand band = band_for(nominal);
  for (ForceUnit unit : {ForceUnit::kGram, ForceUnit::kCentinewton, ForceUnit::kNewton}) {
    SCOPED_TRACE(force_unit_label(unit).toStdString());
    const auto levels = allowance_levels(nominal, &band, {}, unit);
    const AllowanceRow& row = *levels[0].row(MovementPreset::kTranslation);
    const auto applied = allowance_to_apply(row, unit);
    ASSERT_TRUE(applied.has_value());
    EXPECT_TRUE(applied->is_conservative);
    const double step = std::pow(10.0, -force_decimals(unit));
    EXPECT_LE(applied->force, row.band_p10);  // never above the conservative allowance
    EXPECT_GT(applied->force, row.band_p10 - step);
    // Without the band the nominal allowance is applied, and said to be nominal.
    const auto plain = allowance_levels(nominal, nullptr, {}, unit);
    const auto nominal_applied =
        allowance_to_apply(*plain[0].row(MovementPreset::kTranslation), unit);
    ASSERT_TRUE(nominal_applied.has_value());
    EXPECT_FALSE(nominal_applied->is_conservative);
    EXPECT_LE(nominal_applied->force, plain[0].row(MovementPreset::kTranslation)->nominal);
  }
}

TEST(AllowanceTable, ControlsTakeTheMovementItsDirectionAndTheForce) {
  LoadControls present;
  present.unit = ForceUnit::kCentinewton;
  present.magnitude = 98;
  present.set_direction(DirectionChoice::kIntrusive);  // a vertical case force
  present.at_pad_centre = false;
  present.bracket_height_mm = 6;
  // Tipping needs a horizontal force: the labiolingual default (analysis::allowance_load).
  const LoadControls tip =
      controls_for_allowance(present, MovementPreset::kControlledTipping, 41.5);
  EXPECT_EQ(tip.preset, MovementPreset::kControlledTipping);
  EXPECT_EQ(tip.direction, DirectionChoice::kLingual);
  EXPECT_EQ(tip.unit, ForceUnit::kCentinewton);
  EXPECT_DOUBLE_EQ(tip.magnitude, 41.5);
  EXPECT_FALSE(tip.at_pad_centre);
  EXPECT_DOUBLE_EQ(tip.bracket_height_mm, 6);
  EXPECT_EQ(tip.couple, analysis::CoupleKind::kNone);
  // Extrusion pulls along the long axis.
  present.set_direction(DirectionChoice::kMesial);
  EXPECT_EQ(controls_for_allowance(present, MovementPreset::kExtrusion, 10).direction,
            DirectionChoice::kExtrusive);
  // A horizontal case direction is kept for translation.
  EXPECT_EQ(controls_for_allowance(present, MovementPreset::kTranslation, 10).direction,
            DirectionChoice::kMesial);
}

}  // namespace
}  // namespace sharpey::app
