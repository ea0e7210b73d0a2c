// Hover read-out lookups (no display needed): the value under the mouse on a picked surface
// triangle and on the root map, the position as depth below the CEJ and side of the root, and the
// text the status bar shows.
#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <random>

#include "core/hover_readout.h"
#include "sharpey/core/constants.h"

namespace sharpey::app {
namespace {

constexpr double kNan = std::numeric_limits<double>::quiet_NaN();

TEST(HoverSide, AnglesFollowTheToothFrame) {
  // x labial, y mesial (tooth coordinate system): angle 0 labial, 90 mesial.
  EXPECT_NEAR(angle_around_axis_deg({1, 0, -3}), 0, 1e-12);
  EXPECT_NEAR(angle_around_axis_deg({0, 2, -3}), 90, 1e-12);
  EXPECT_NEAR(angle_around_axis_deg({-1, 0, -3}), 180, 1e-12);
  EXPECT_NEAR(angle_around_axis_deg({0, -1, -3}), -90, 1e-12);
  struct Case {
    double angle;
    const char* side;
  };
  for (const Case& c :
       {Case{0, "labial"}, Case{22, "labial"}, Case{23, "mesiolabial"}, Case{45, "mesiolabial"},
        Case{90, "mesial"}, Case{135, "mesiolingual"}, Case{180, "lingual"}, Case{-180, "lingual"},
        Case{-135, "distolingual"}, Case{-90, "distal"}, Case{270, "distal"},
        Case{-45, "distolabial"}, Case{359, "labial"}, Case{-720, "labial"}}) {
    SCOPED_TRACE(c.angle);
    EXPECT_EQ(side_name(c.angle), QString::fromLatin1(c.side));
  }
}

TEST(HoverSurface, LinearFieldIsReproducedExactlyOnEveryTriangle) {
  // A small tilted strip of triangles carrying f(p) = 3 + 2x - y + 0.5z: linear interpolation on
  // a flat triangle reproduces it exactly at any point inside (derived).
  std::vector<Eigen::Vector3d> points;
  for (int i = 0; i <= 4; ++i)
    for (int j = 0; j <= 1; ++j)
      points.emplace_back(1.0 + 0.1 * j, 0.5 * i, -2.0 - 0.7 * i + 0.2 * j);
  std::vector<std::array<int, 3>> triangles;
  for (int i = 0; i < 4; ++i) {
    triangles.push_back({2 * i, 2 * i + 1, 2 * i + 3});
    triangles.push_back({2 * i, 2 * i + 3, 2 * i + 2});
  }
  auto f = [](const Eigen::Vector3d& p) { return 3 + 2 * p.x() - p.y() + 0.5 * p.z(); };
  std::vector<double> values;
  for (const auto& p : points) values.push_back(f(p));
  std::mt19937 rng(7);
  std::uniform_real_distribution<double> u(0, 1);
  for (int t = 0; t < static_cast<int>(triangles.size()); ++t) {
    for (int k = 0; k < 20; ++k) {
      double a = u(rng), b = u(rng);
      if (a + b > 1) {
        a = 1 - a;
        b = 1 - b;
      }
      const auto& tri = triangles[static_cast<size_t>(t)];
      const Eigen::Vector3d p = (1 - a - b) * points[static_cast<size_t>(tri[0])] +
                                a * points[static_cast<size_t>(tri[1])] +
                                b * points[static_cast<size_t>(tri[2])];
      EXPECT_NEAR(value_on_triangle(points, triangles, values, t, p), f(p), 1e-12);
      const HoverReadout r = surface_readout(points, triangles, values, Quantity::kPressure, t, p);
      ASSERT_TRUE(r.has_position && r.has_value);
      EXPECT_NEAR(r.value, f(p), 1e-12);
      EXPECT_NEAR(r.depth_mm, -p.z(), 1e-12);
      EXPECT_NEAR(r.angle_deg, std::atan2(p.y(), p.x()) * 180 / sharpey::core::kPi, 1e-9);
    }
  }
}

TEST(HoverSurface, PicksOffTheTriangleAreClampedAndBadInputGivesNoValue) {
  const std::vector<Eigen::Vector3d> points = {{0, 0, -1}, {1, 0, -1}, {0, 1, -1}};
  const std::vector<std::array<int, 3>> triangles = {{0, 1, 2}};
  const std::vector<double> values = {0, 10, 20};
  // Slightly off the plane: projected (same value as the point in the plane).
  EXPECT_NEAR(value_on_triangle(points, triangles, values, 0, {0.25, 0.25, -0.999}), 7.5, 1e-9);
  // Outside the triangle beyond corner 1: clipped to the corner's value.
  EXPECT_NEAR(value_on_triangle(points, triangles, values, 0, {1.2, -0.1, -1}), 10, 1e-9);
  // Values stay within the corner values wherever the pick lands.
  for (double x = -1; x <= 2; x += 0.25)
    for (double y = -1; y <= 2; y += 0.25) {
      const double v = value_on_triangle(points, triangles, values, 0, {x, y, -1});
      EXPECT_GE(v, 0);
      EXPECT_LE(v, 20);
    }
  EXPECT_TRUE(std::isnan(value_on_triangle(points, triangles, values, 1, {0, 0, -1})));
  EXPECT_TRUE(std::isnan(value_on_triangle(points, triangles, values, -1, {0, 0, -1})));
  EXPECT_TRUE(std::isnan(value_on_triangle(points, triangles, {0, kNan, 20}, 0, {0.2, 0.2, -1})));
  const std::vector<Eigen::Vector3d> flat = {{0, 0, 0}, {1, 0, 0}, {2, 0, 0}};
  EXPECT_TRUE(std::isnan(value_on_triangle(flat, triangles, values, 0, {1, 0, 0})));
  const HoverReadout miss =
      surface_readout(points, triangles, values, Quantity::kPressure, -1, {0, 0, -1});
  EXPECT_FALSE(miss.has_position);
  EXPECT_TRUE(describe(miss).isEmpty());
}

// A root map whose cell (row i, column j) holds 100 i + j; row 0 without ligament (above the
// crest).
analysis::RootMap numbered_map() {
  analysis::RootMap m;
  m.n_angle = 36;
  m.n_depth = 10;
  m.depth_min_mm = 0;
  m.depth_max_mm = 20;
  for (int i = 0; i < m.n_depth; ++i)
    for (int j = 0; j < m.n_angle; ++j) m.pressure_kpa.push_back(i == 0 ? kNan : 100.0 * i + j);
  return m;
}

TEST(HoverRootMap, CellCentresGiveTheirOwnValueAndAnglesWrap) {
  const analysis::RootMap m = numbered_map();
  // Cell (row 3, column 5) is centred at angle 5.5 * 10 = 55 deg and depth 3.5 * 2 = 7 mm.
  HoverReadout r = root_map_readout(m, 55, 7);
  ASSERT_TRUE(r.has_position && r.has_value);
  EXPECT_NEAR(r.value, 305, 1e-9);
  EXPECT_NEAR(r.depth_mm, 7, 1e-12);
  EXPECT_NEAR(r.angle_deg, 55, 1e-12);
  // Half-way between the centres of columns 5 and 6: bilinear, as the map is drawn.
  EXPECT_NEAR(root_map_readout(m, 60, 7).value, 305.5, 1e-9);
  // Angles wrap: -85 deg is 275 deg, column 27 (centre 275); reported as -85 (distal side).
  r = root_map_readout(m, -85, 7);
  EXPECT_NEAR(r.value, 327, 1e-9);
  EXPECT_NEAR(r.angle_deg, -85, 1e-12);
  EXPECT_EQ(side_name(r.angle_deg), QStringLiteral("distal"));
  EXPECT_NEAR(root_map_readout(m, 275 + 720, 7).value, 327, 1e-9);
  // Across 0 deg: between column 35 (centre 355) and column 0 (centre 5).
  EXPECT_NEAR(root_map_readout(m, 0, 7).value, 0.5 * (335 + 300), 1e-9);
}

TEST(HoverRootMap, NoLigamentAndOutsideTheMap) {
  const analysis::RootMap m = numbered_map();
  const HoverReadout crest = root_map_readout(m, 55, 1);  // row 0: no ligament
  EXPECT_TRUE(crest.has_position);
  EXPECT_FALSE(crest.has_value);
  EXPECT_TRUE(describe(crest).startsWith(QStringLiteral("no ligament")));
  EXPECT_FALSE(root_map_readout(m, 55, -0.5).has_position);
  EXPECT_FALSE(root_map_readout(m, 55, 20.5).has_position);
  EXPECT_FALSE(root_map_readout(analysis::RootMap{}, 55, 7).has_position);
}

TEST(HoverText, NamesQuantityValueUnitDepthAndSide) {
  HoverReadout r;
  r.has_position = r.has_value = true;
  r.quantity = Quantity::kPressure;
  r.value = 12.34;
  r.depth_mm = 5.2;
  r.angle_deg = 52;
  const QString text = describe(r);
  EXPECT_TRUE(text.contains(QStringLiteral("hydrostatic pressure"))) << text.toStdString();
  EXPECT_TRUE(text.contains(QStringLiteral("kPa"))) << text.toStdString();
  EXPECT_TRUE(text.contains(QStringLiteral("5.2"))) << text.toStdString();
  EXPECT_TRUE(text.contains(QStringLiteral("below the CEJ"))) << text.toStdString();
  EXPECT_TRUE(text.contains(QStringLiteral("mesiolabial"))) << text.toStdString();
  r.quantity = Quantity::kDisplacement;
  EXPECT_TRUE(describe(r).contains(unit_label(Quantity::kDisplacement)));
}

}  // namespace
}  // namespace sharpey::app
