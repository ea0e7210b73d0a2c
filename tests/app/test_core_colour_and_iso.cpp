// Colour maps, colour scales and threshold iso-lines (no display needed).
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>

#include "core/colour_map.h"
#include "core/iso_lines.h"
#include "sharpey/core/constants.h"

namespace sharpey::app {
namespace {

using sharpey::core::kPi;

TEST(ColourMap, DivergingLightnessFallsAwayFromZeroOnBothSides) {
  double previous_pos = relative_luminance(diverging_colour(0));
  double previous_neg = previous_pos;
  for (int i = 1; i <= 100; ++i) {
    const double t = i / 100.0;
    const double pos = relative_luminance(diverging_colour(t));
    const double neg = relative_luminance(diverging_colour(-t));
    EXPECT_LT(pos, previous_pos) << "t = " << t;
    EXPECT_LT(neg, previous_neg) << "t = " << -t;
    previous_pos = pos;
    previous_neg = neg;
  }
  // The two ends are told apart by hue: compression is red-dominant, tension blue-dominant.
  const Rgb compression = diverging_colour(1), tension = diverging_colour(-1);
  EXPECT_GT(compression[0], compression[2]);
  EXPECT_GT(tension[2], tension[0]);
}

TEST(ColourMap, SequentialLightnessRises) {
  double previous = -1;
  for (int i = 0; i <= 100; ++i) {
    const double l = relative_luminance(sequential_colour(i / 100.0));
    EXPECT_GT(l, previous) << "t = " << i / 100.0;
    previous = l;
  }
}

TEST(ColourScale, SignedQuantitiesAreCentredOnZero) {
  const ColourScale scale(Quantity::kPressure, {-3.0, 12.0});
  EXPECT_DOUBLE_EQ(scale.range().min, -3.0);  // the bar shows what occurs
  EXPECT_DOUBLE_EQ(scale.range().max, 12.0);
  EXPECT_DOUBLE_EQ(scale.colour_range().min, -12.0);
  EXPECT_DOUBLE_EQ(scale.colour_range().max, 12.0);
  EXPECT_EQ(scale.colour(0.0), diverging_colour(0.0));
  EXPECT_EQ(scale.colour(12.0), diverging_colour(1.0));
  EXPECT_EQ(scale.colour(-6.0), diverging_colour(-0.5));
  EXPECT_EQ(scale.colour(std::nan("")), no_data_colour());
}

TEST(ColourScale, UnsignedQuantitiesSpanTheirRange) {
  const ColourScale scale(Quantity::kDisplacement, {2.0, 10.0});
  EXPECT_EQ(scale.colour(2.0), sequential_colour(0.0));
  EXPECT_EQ(scale.colour(6.0), sequential_colour(0.5));
  EXPECT_EQ(scale.colour(10.0), sequential_colour(1.0));
  const auto table = scale.table(5);
  ASSERT_EQ(table.size(), 5u);
  EXPECT_EQ(table[2], sequential_colour(0.5));
  // A constant field still gets a usable scale.
  const ColourScale flat(Quantity::kVonMises, {3.0, 3.0});
  EXPECT_GT(flat.colour_range().max, flat.colour_range().min);
}

TEST(Ranges, TheRangeShownLeavesTheCrestEdgeBandOut) {
  const std::vector<double> values = {1.0, 46.6, -2.0, 28.4, -9.0, 3.0};
  const std::vector<char> band = {0, 1, 0, 0, 1};  // the last value has no flag: outside
  const ValueRange shown = finite_range(values, band, false);
  EXPECT_DOUBLE_EQ(shown.min, -2.0);
  EXPECT_DOUBLE_EQ(shown.max, 28.4);
  const ValueRange in_band = finite_range(values, band, true);
  EXPECT_DOUBLE_EQ(in_band.min, -9.0);
  EXPECT_DOUBLE_EQ(in_band.max, 46.6);
  const ValueRange none = finite_range(values, std::vector<char>(6, 1), false);
  EXPECT_DOUBLE_EQ(none.min, 0.0);
  EXPECT_DOUBLE_EQ(none.max, 0.0);
}

TEST(Ranges, IgnoreMissingValues) {
  const ValueRange r = finite_range({std::nan(""), 2.0, -1.5, INFINITY, 0.5});
  EXPECT_DOUBLE_EQ(r.min, -1.5);
  EXPECT_DOUBLE_EQ(r.max, 2.0);
  const ValueRange none = finite_range({std::nan("")});
  EXPECT_DOUBLE_EQ(none.min, 0.0);
  EXPECT_DOUBLE_EQ(none.max, 0.0);
  const ValueRange m = merge({-1, 2}, {0, 5});
  EXPECT_DOUBLE_EQ(m.min, -1);
  EXPECT_DOUBLE_EQ(m.max, 5);
}

// Total length of the iso-line of f = distance from the grid centre at level R: a circle.
double circle_length(int n, double radius) {
  std::vector<double> values(static_cast<size_t>(n * n));
  const double c = (n - 1) / 2.0;
  for (int r = 0; r < n; ++r)
    for (int k = 0; k < n; ++k) values[static_cast<size_t>(r * n + k)] = std::hypot(k - c, r - c);
  double length = 0;
  for (const auto& s : iso_segments(values, n, n, radius))
    length += std::hypot(s.x1 - s.x0, s.y1 - s.y0);
  return length;
}

TEST(IsoLines, CircleLengthConvergesAtSecondOrder) {
  // Inscribed-polygon error of a linearly interpolated circle falls as h^2 (derived).
  const double e_coarse = std::abs(circle_length(21, 6.0) / (2 * kPi * 6.0) - 1.0);
  const double e_fine = std::abs(circle_length(41, 12.0) / (2 * kPi * 12.0) - 1.0);
  EXPECT_LT(e_coarse, 0.01);
  EXPECT_LT(e_fine, e_coarse / 3.0);  // about 4x for h halved
}

TEST(IsoLines, LinearFieldGivesTheExactStraightLine) {
  // f = 2x + 1 on a 5 x 6 grid: level 6 lies at x = 2.5 on every row span.
  const int rows = 5, cols = 6;
  std::vector<double> v(static_cast<size_t>(rows * cols));
  for (int r = 0; r < rows; ++r)
    for (int c = 0; c < cols; ++c) v[static_cast<size_t>(r * cols + c)] = 2.0 * c + 1.0;
  const auto segments = iso_segments(v, rows, cols, 6.0);
  ASSERT_EQ(segments.size(), static_cast<size_t>(rows - 1));
  for (const auto& s : segments) {
    EXPECT_DOUBLE_EQ(s.x0, 2.5);
    EXPECT_DOUBLE_EQ(s.x1, 2.5);
    EXPECT_DOUBLE_EQ(std::abs(s.y1 - s.y0), 1.0);
  }
}

TEST(IsoLines, NoLineThroughMissingData) {
  std::vector<double> v = {0, 1, 2, 0, std::nan(""), 2, 0, 1, 2};
  // Only squares without the NaN centre would be used, and all four touch it.
  EXPECT_TRUE(iso_segments(v, 3, 3, 0.5).empty());
}

TEST(IsoLines, SaddleIsSplitByTheCentreValue) {
  // Corners high-low-high-low: two segments, never crossing.
  const std::vector<double> high_centre = {1, 0, 0, 1};  // rows: (1,0) / (0,1), mean 0.5
  const auto segments = iso_segments(high_centre, 2, 2, 0.4);
  ASSERT_EQ(segments.size(), 2u);
  // With the centre above the level, the low corners (1,0) and (0,1) are cut off.
  for (const auto& s : segments) {
    const double mx = 0.5 * (s.x0 + s.x1), my = 0.5 * (s.y0 + s.y1);
    const bool near_10 = mx > 0.5 && my < 0.5;
    const bool near_01 = mx < 0.5 && my > 0.5;
    EXPECT_TRUE(near_10 || near_01) << mx << ", " << my;
  }
}

}  // namespace
}  // namespace sharpey::app

#include "core/axis_ticks.h"

namespace sharpey::app {
namespace {

TEST(AxisTicks, RoundStepsInsideTheRange) {
  const auto t = nice_ticks(-3.2, 51.5, 6);
  ASSERT_FALSE(t.empty());
  const double step = nice_step(-3.2, 51.5, 6);
  EXPECT_DOUBLE_EQ(step, 10.0);
  EXPECT_DOUBLE_EQ(t.front(), 0.0);
  EXPECT_DOUBLE_EQ(t.back(), 50.0);
  for (double v : t) {
    EXPECT_GE(v, -3.2);
    EXPECT_LE(v, 51.5);
    EXPECT_NEAR(std::remainder(v, step), 0.0, 1e-12);
  }
  EXPECT_DOUBLE_EQ(nice_step(0, 0.37, 5), 0.1);
  EXPECT_EQ(tick_label(0.30000000000000004, 0.1), "0.3");
  EXPECT_EQ(tick_label(20, 5), "20");
  EXPECT_TRUE(nice_ticks(1, 1).empty());
  EXPECT_TRUE(nice_ticks(0, NAN).empty());
}

// Issue 12, point 8: a premolar's moment-to-force ratio varied by 0.001 mm between levels (noise)
// and filled the whole axis.
TEST(TrendAxisSpan, NoiseBesideTheValueDrawsFlat) {
  const AxisSpan s = trend_axis_span(10.120, 10.121);
  const double span = s.hi - s.lo;
  EXPECT_GE(span, kTrendMinRelativeSpan * 10.121);  // at least the minimum span
  EXPECT_LT(0.001 / span, 0.01);                    // the noise is under 1 % of the axis
  EXPECT_LT(s.lo, 10.120);
  EXPECT_GT(s.hi, 10.121);
  EXPECT_NEAR(0.5 * (s.lo + s.hi), 10.1205, 1e-12);  // centred on the data
}

TEST(TrendAxisSpan, RealChangesKeepTheirOwnSpanAndZero) {
  // 11 to 14.6 mm: wider than the minimum, so only the 8 % margins are added.
  AxisSpan s = trend_axis_span(11.0, 14.6);
  EXPECT_NEAR(s.lo, 11.0 - 0.08 * 3.6, 1e-12);
  EXPECT_NEAR(s.hi, 14.6 + 0.08 * 3.6, 1e-12);
  // 56 to 350 kPa: zero is close, so it is included.
  s = trend_axis_span(56, 350);
  EXPECT_LT(s.lo, 0);
  EXPECT_NEAR(s.lo, -0.08 * 350, 1e-9);
  // Negative data mirror positive data.
  const AxisSpan m = trend_axis_span(-350, -56);
  EXPECT_NEAR(m.hi, 0.08 * 350, 1e-9);
  // All zero: a unit span around zero.
  s = trend_axis_span(0, 0);
  EXPECT_LT(s.lo, -1);
  EXPECT_GT(s.hi, 1);
}

}  // namespace
}  // namespace sharpey::app

namespace sharpey::app {
namespace {

// Issue 12, point 12: the views' background is the app's own (warm umber), not a slate blue-grey,
// and every label stays readable on it.
TEST(ViewColours, TheBackgroundIsWarmAndNotSlate) {
  const Rgb slate = {84 / 255.0, 90 / 255.0, 106 / 255.0};  // the look to stay away from (issue 12)
  for (const Rgb& c : {view_background_bottom(), view_background_top()}) {
    EXPECT_GT(c[0], c[2] + 0.02) << "red above blue: a warm hue";
    double distance = 0;
    for (int k = 0; k < 3; ++k) distance = std::max(distance, std::abs(c[k] - slate[k]));
    EXPECT_GT(distance, 0.08);
  }
}

TEST(ViewColours, LabelsAndColourMapsStandOutFromTheBackground) {
  for (const Rgb& background : {view_background_bottom(), view_background_top()}) {
    const Rgb box = blend(label_box_colour(), label_box_opacity(), background);
    for (const Rgb& text : {force_label_colour(), cres_label_colour(), crot_label_colour()}) {
      // source: WCAG 2.1 success criterion 1.4.3, 4.5:1 for normal text.
      EXPECT_GE(contrast_ratio(text, box), 4.5);
    }
    // source: WCAG 2.1 success criterion 1.4.11, 3:1 for graphical objects: the maps' light
    // middle and the tooth-coloured end against the background.
    EXPECT_GE(contrast_ratio(diverging_colour(0.0), background), 3.0);
    EXPECT_GE(contrast_ratio(sequential_colour(1.0), background), 3.0);
  }
  // derived: white on black is 21:1.
  EXPECT_NEAR(contrast_ratio({1, 1, 1}, {0, 0, 0}), 21.0, 1e-9);
}

}  // namespace
}  // namespace sharpey::app
