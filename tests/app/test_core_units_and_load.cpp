// Unit conversion and the force-system panel model (no display needed).
#include <gtest/gtest.h>

#include <cmath>
#include <tuple>

#include "core/load_controls.h"
#include "core/units.h"
#include "sharpey/analysis/case_spec.h"

namespace sharpey::app {
namespace {

using analysis::ForceUnit;
const ForceUnit kUnits[] = {ForceUnit::kGram, ForceUnit::kCentinewton, ForceUnit::kNewton};

TEST(Units, GramForceIsStandardGravityTimesOneGram) {
  // source: standard gravity g_n = 9.80665 m/s^2 (3rd CGPM, 1901), so 1 gf = 0.00980665 N.
  EXPECT_DOUBLE_EQ(analysis::to_newton(100.0, ForceUnit::kGram), 0.980665);
  EXPECT_DOUBLE_EQ(analysis::to_newton(250.0, ForceUnit::kCentinewton), 2.5);
  EXPECT_DOUBLE_EQ(analysis::to_newton(1.25, ForceUnit::kNewton), 1.25);
}

class UnitPair : public ::testing::TestWithParam<std::tuple<ForceUnit, ForceUnit>> {};

TEST_P(UnitPair, ConversionRoundTripsAndKeepsTheForce) {
  const auto [from, to] = GetParam();
  for (double v : {0.0, 0.37, 1.0, 42.0, 480.0}) {
    SCOPED_TRACE(v);
    const double converted = analysis::convert_force(v, from, to);
    EXPECT_NEAR(analysis::to_newton(converted, to), analysis::to_newton(v, from), 1e-12 * (1 + v));
    EXPECT_NEAR(analysis::convert_force(converted, to, from), v, 1e-12 * (1 + v));
  }
}
INSTANTIATE_TEST_SUITE_P(AllPairs, UnitPair,
                         ::testing::Combine(::testing::ValuesIn(kUnits),
                                            ::testing::ValuesIn(kUnits)));

TEST(Units, LabelsAreTheCaseFileUnits) {
  for (ForceUnit u : kUnits) {
    EXPECT_EQ(force_unit_label(u).toStdString(), analysis::to_string(u));
    // The moment unit is the force unit times mm (derived), as the library names it.
    EXPECT_EQ(analysis::moment_unit(u), analysis::to_string(u) + ".mm");
  }
}

TEST(Units, NumbersCarryTheirUnit) {
  EXPECT_EQ(with_unit(4.7, "kPa", 1), QString::fromUtf8("4.7\u2009kPa"));
  EXPECT_EQ(with_unit(-0.01, "kPa", 1), QString::fromUtf8("0.0\u2009kPa"));  // no "-0.0"
  EXPECT_EQ(with_unit(std::nan(""), "kPa", 1), QStringLiteral("n/a"));
  EXPECT_EQ(moment_unit_label(ForceUnit::kGram), QString::fromUtf8("g\u00b7mm"));
}

TEST(Directions, NamedDirectionsFollowTheToothCoordinateSystem) {
  // Tooth coordinates: x labial, y mesial, z toward the crown (common practice in this project).
  EXPECT_EQ(direction_vector(DirectionChoice::kLabial), Eigen::Vector3d(1, 0, 0));
  EXPECT_EQ(direction_vector(DirectionChoice::kLingual), Eigen::Vector3d(-1, 0, 0));
  EXPECT_EQ(direction_vector(DirectionChoice::kMesial), Eigen::Vector3d(0, 1, 0));
  EXPECT_EQ(direction_vector(DirectionChoice::kDistal), Eigen::Vector3d(0, -1, 0));
  EXPECT_EQ(direction_vector(DirectionChoice::kExtrusive), Eigen::Vector3d(0, 0, 1));
  EXPECT_EQ(direction_vector(DirectionChoice::kIntrusive), Eigen::Vector3d(0, 0, -1));
  for (DirectionChoice c : all_direction_choices()) {
    if (c == DirectionChoice::kAngles) continue;
    ASSERT_TRUE(named_choice_for(2.5 * direction_vector(c)).has_value());
    EXPECT_EQ(*named_choice_for(2.5 * direction_vector(c)), c);
  }
  EXPECT_FALSE(named_choice_for(Eigen::Vector3d(1, 1, 0)).has_value());
  EXPECT_FALSE(named_choice_for(Eigen::Vector3d::Zero()).has_value());
}

class AngleGrid : public ::testing::TestWithParam<std::tuple<double, double>> {};

TEST_P(AngleGrid, AnglesAndVectorRoundTrip) {
  const auto [azimuth, elevation] = GetParam();
  const Eigen::Vector3d d = direction_from_angles(azimuth, elevation);
  EXPECT_NEAR(d.norm(), 1.0, 1e-14);
  double az = 0, el = 0;
  angles_from_direction(d, &az, &el);
  EXPECT_NEAR(el, elevation, 1e-9);
  if (std::abs(elevation) < 90) {
    double diff = std::remainder(az - azimuth, 360.0);
    EXPECT_NEAR(diff, 0.0, 1e-9);
  }
  EXPECT_LT((direction_from_angles(az, el) - d).norm(), 1e-12);
}
INSTANTIATE_TEST_SUITE_P(Grid, AngleGrid,
                         ::testing::Combine(::testing::Values(-135.0, -90.0, 0.0, 30.0, 90.0,
                                                              180.0),
                                            ::testing::Values(-90.0, -45.0, 0.0, 20.0, 90.0)));

TEST(LoadControls, AnglesThatMatchANamedDirectionSelectIt) {
  LoadControls c;
  c.set_angles(90, 0);
  EXPECT_EQ(c.direction, DirectionChoice::kMesial);
  c.set_angles(45, 10);
  EXPECT_EQ(c.direction, DirectionChoice::kAngles);
  EXPECT_LT((c.direction_vector() - direction_from_angles(45, 10)).norm(), 1e-14);
  c.set_direction(DirectionChoice::kIntrusive);
  EXPECT_NEAR(c.elevation_deg, -90.0, 1e-12);
}

TEST(LoadControls, ChangingTheUnitKeepsTheLoad) {
  LoadControls c;
  c.magnitude = 120;
  c.couple = analysis::CoupleKind::kMoment;
  c.moment = Eigen::Vector3d(0, -900, 15);
  const analysis::LoadSpec before = to_load_spec(c);
  for (ForceUnit u : {ForceUnit::kNewton, ForceUnit::kCentinewton, ForceUnit::kGram}) {
    c.set_unit(u);
    const analysis::LoadSpec after = to_load_spec(c);
    EXPECT_NEAR(analysis::to_newton(after.magnitude, after.unit),
                analysis::to_newton(before.magnitude, before.unit), 1e-12);
    EXPECT_LT((after.moment_nmm - before.moment_nmm).norm(), 1e-12);
  }
  EXPECT_NEAR(c.magnitude, 120, 1e-9);
}

struct LoadCase {
  const char* name;
  LoadControls controls;
};

class LoadRoundTrip : public ::testing::TestWithParam<LoadCase> {};

TEST_P(LoadRoundTrip, PanelToLoadSpecAndBack) {
  const LoadControls& c = GetParam().controls;
  const analysis::LoadSpec load = to_load_spec(c);
  EXPECT_NEAR(load.direction.norm(), 1.0, 1e-12);
  EXPECT_NEAR(analysis::to_newton(load.magnitude, load.unit), c.force_n(), 1e-15);
  EXPECT_EQ(load.bracket_height_mm < 0, c.at_pad_centre);
  const LoadControls back = from_load_spec(load);
  EXPECT_EQ(back.direction, c.direction);
  EXPECT_LT((back.direction_vector() - c.direction_vector()).norm(), 1e-12);
  EXPECT_DOUBLE_EQ(back.magnitude, c.magnitude);
  EXPECT_EQ(back.unit, c.unit);
  EXPECT_EQ(back.at_pad_centre, c.at_pad_centre);
  if (!c.at_pad_centre) {
    EXPECT_DOUBLE_EQ(back.bracket_height_mm, c.bracket_height_mm);
  }
  EXPECT_EQ(back.couple, c.couple);
  EXPECT_LT((back.moment - c.moment).norm(), 1e-9);
  EXPECT_DOUBLE_EQ(back.moment_to_force_mm, c.moment_to_force_mm);
  EXPECT_EQ(back.preset, c.preset);
}

LoadControls make(double magnitude, ForceUnit unit, DirectionChoice d, double az, double el,
                  bool pad, double height, analysis::CoupleKind couple, Eigen::Vector3d moment,
                  double ratio, analysis::MovementPreset preset) {
  LoadControls c;
  c.magnitude = magnitude;
  c.unit = unit;
  if (d == DirectionChoice::kAngles)
    c.set_angles(az, el);
  else
    c.set_direction(d);
  c.at_pad_centre = pad;
  c.bracket_height_mm = height;
  c.couple = couple;
  c.moment = moment;
  c.moment_to_force_mm = ratio;
  c.preset = preset;
  return c;
}

using analysis::CoupleKind;
using analysis::MovementPreset;
INSTANTIATE_TEST_SUITE_P(
    Cases, LoadRoundTrip,
    ::testing::Values(
        LoadCase{"default", LoadControls{}},
        LoadCase{"angles_cN_height",
                 make(80, ForceUnit::kCentinewton, DirectionChoice::kAngles, 30, -20, false, 5.5,
                      CoupleKind::kNone, {0, 0, 0}, 0, MovementPreset::kNone)},
        LoadCase{"moment_N",
                 make(0.8, ForceUnit::kNewton, DirectionChoice::kMesial, 0, 0, true, 0,
                      CoupleKind::kMoment, {1.5, -2.0, 0.25}, 0, MovementPreset::kNone)},
        LoadCase{"ratio", make(150, ForceUnit::kGram, DirectionChoice::kLabial, 0, 0, true, 0,
                               CoupleKind::kRatio, {0, 0, 0}, 9.5, MovementPreset::kNone)},
        LoadCase{"preset", make(50, ForceUnit::kGram, DirectionChoice::kIntrusive, 0, 0, true, 0,
                                CoupleKind::kNone, {0, 0, 0}, 0, MovementPreset::kIntrusion)}),
    [](const ::testing::TestParamInfo<LoadCase>& p) { return std::string(p.param.name); });

TEST(LoadControls, SliderCoversTheRangeMonotonically) {
  for (ForceUnit u : kUnits) {
    SCOPED_TRACE(analysis::to_string(u));
    EXPECT_EQ(magnitude_from_slider(0, u), 0.0);
    EXPECT_DOUBLE_EQ(magnitude_from_slider(kSliderSteps, u), slider_max(u));
    double previous = -1;
    for (int p = 0; p <= kSliderSteps; p += 7) {
      const double m = magnitude_from_slider(p, u);
      EXPECT_GT(m, previous);
      previous = m;
      EXPECT_EQ(slider_from_magnitude(m, u), p);
    }
    EXPECT_EQ(slider_from_magnitude(10 * slider_max(u), u), kSliderSteps);  // clamped
    EXPECT_EQ(slider_from_magnitude(-3, u), 0);
  }
}

TEST(LoadControls, DescriptionNamesMagnitudeUnitAndDirection) {
  LoadControls c;
  const QString text = describe(c);
  EXPECT_TRUE(text.contains(QString::fromUtf8("100\u2009g"))) << text.toStdString();
  EXPECT_TRUE(text.contains("lingual")) << text.toStdString();
  c.preset = analysis::MovementPreset::kTranslation;
  EXPECT_TRUE(describe(c).contains("translation")) << describe(c).toStdString();
}

}  // namespace
}  // namespace sharpey::app
