// Root-surface integration (areas over thresholds, area-weighted percentile) and the root map,
// on surfaces of revolution meshed with exact quadratic triangles.
#include <gtest/gtest.h>

#include <cmath>
#include <functional>
#include <random>

#include "sharpey/analysis/detail/root_map.h"
#include "sharpey/analysis/detail/root_surface.h"
#include "sharpey/core/constants.h"
#include "sharpey/error.h"

namespace sharpey::analysis::detail {
namespace {

using sharpey::core::kPi;
constexpr int kMarker = 1;

// Quadratic triangles on the surface of revolution radius rho(z) for z from z_top down to
// z_bottom, n_phi cells around (starting at angle phi0), n_z cells down. When `pole` is set the
// bottom ring collapses to one node on the axis (rho(z_bottom) must be 0). Every node lies on
// the exact surface.
mesh::VolumeMesh revolution_surface(const std::function<double(double)>& rho, double z_top,
                                    double z_bottom, int n_phi, int n_z, bool pole,
                                    double phi0 = 0.1) {
  mesh::VolumeMesh m;
  m.nodes_per_face = 6;
  const int n_k = 2 * n_phi, n_l = 2 * n_z + 1;
  std::vector<int> id(static_cast<size_t>(n_k * n_l));
  int pole_id = -1;
  for (int l = 0; l < n_l; ++l) {
    const double z = z_top + (z_bottom - z_top) * l / (n_l - 1);
    for (int k = 0; k < n_k; ++k) {
      const double phi = phi0 + 2 * kPi * k / n_k;
      if (pole && l == n_l - 1) {
        if (pole_id < 0) {
          pole_id = m.n_nodes();
          m.nodes.emplace_back(0, 0, z);
        }
        id[static_cast<size_t>(l * n_k + k)] = pole_id;
        continue;
      }
      id[static_cast<size_t>(l * n_k + k)] = m.n_nodes();
      m.nodes.emplace_back(rho(z) * std::cos(phi), rho(z) * std::sin(phi), z);
    }
  }
  const auto at = [&](int k, int l) { return id[static_cast<size_t>(l * n_k + (k % n_k))]; };
  const auto add = [&m](std::initializer_list<int> f) {
    m.faces.insert(m.faces.end(), f);
    m.face_marker.push_back(kMarker);
  };
  for (int j = 0; j < n_z; ++j) {
    for (int i = 0; i < n_phi; ++i) {
      const int k = 2 * i, l = 2 * j;
      if (pole && j == n_z - 1) {
        add({at(k, l), at(k + 2, l), at(k, l + 2), at(k + 1, l), at(k + 2, l + 1), at(k, l + 1)});
        continue;
      }
      add({at(k, l), at(k + 2, l), at(k + 2, l + 2), at(k + 1, l), at(k + 2, l + 1),
           at(k + 1, l + 1)});
      add({at(k, l), at(k + 2, l + 2), at(k, l + 2), at(k + 1, l + 1), at(k + 1, l + 2),
           at(k, l + 1)});
    }
  }
  return m;
}

std::vector<int> all_nodes(const mesh::VolumeMesh& m) {
  std::vector<int> v(static_cast<size_t>(m.n_nodes()));
  for (int i = 0; i < m.n_nodes(); ++i) v[static_cast<size_t>(i)] = i;
  return v;
}

Eigen::VectorXd nodal(const mesh::VolumeMesh& m,
                      const std::function<double(const Eigen::Vector3d&)>& f) {
  Eigen::VectorXd v(m.n_nodes());
  for (int i = 0; i < m.n_nodes(); ++i) v(i) = f(m.nodes[static_cast<size_t>(i)]);
  return v;
}

constexpr double kR = 3.0, kTop = -1.5, kBottom = -13.5, kL = kTop - kBottom;

mesh::VolumeMesh cylinder() {
  return revolution_surface([](double) { return kR; }, kTop, kBottom, 24, 12, false);
}

// Derived: exact fractions of a linear field on a triangle; and a Monte Carlo estimate (an
// independent computation) for random values and levels.
TEST(RootSurface, TriangleFractionAbove) {
  EXPECT_DOUBLE_EQ(triangle_fraction_above(0, 0, 1, 0.5), 0.25);
  EXPECT_DOUBLE_EQ(triangle_fraction_above(0, 1, 1, 0.5), 0.75);
  EXPECT_DOUBLE_EQ(triangle_fraction_above(1, 2, 3, 0.5), 1.0);
  EXPECT_DOUBLE_EQ(triangle_fraction_above(1, 2, 3, 3.0), 0.0);
  EXPECT_DOUBLE_EQ(triangle_fraction_above(2, 2, 2, 1.0), 1.0);
  std::mt19937 rng(7);
  std::uniform_real_distribution<double> u(0, 1);
  for (int trial = 0; trial < 5; ++trial) {
    const double a = u(rng), b = u(rng), c = u(rng), level = u(rng);
    int above = 0;
    const int n = 200000;
    for (int s = 0; s < n; ++s) {
      double x = u(rng), y = u(rng);
      if (x + y > 1) {
        x = 1 - x;
        y = 1 - y;
      }
      above += a * (1 - x - y) + b * x + c * y > level;
    }
    EXPECT_NEAR(triangle_fraction_above(a, b, c, level), static_cast<double>(above) / n, 5e-3)
        << a << " " << b << " " << c << " level " << level;
  }
}

// Derived: cylinder area 2 pi R L; for p = depth the area deeper than t is 2 pi R (depth_max - t).
TEST(RootSurface, CylinderAreaAndLinearField) {
  const mesh::VolumeMesh m = cylinder();
  const RootSurfaceSampler s(m, kMarker, all_nodes(m));
  EXPECT_EQ(s.n_faces(), 2 * 24 * 12);
  const double area = 2 * kPi * kR * kL;
  EXPECT_NEAR(s.area_mm2(), area, 2e-4 * area);
  const Eigen::VectorXd p = s.sample(nodal(m, [](const Eigen::Vector3d& x) { return -x.z(); }));
  for (double t : {2.0, 5.3, 10.0, 13.0}) {
    EXPECT_NEAR(s.area_above(p, t), 2 * kPi * kR * (-kBottom - t), 2e-4 * area) << t;
  }
  // Exceeded on 5 % of the area: depth_max - 0.05 L.
  EXPECT_NEAR(s.level_exceeded_on(p, 0.05), -kBottom - 0.05 * kL, 1e-3);
}

// Derived: for p = x = R cos(phi), the area with p > t is 2 R L acos(t / R), and the level exceeded
// on 5 % of the area is R cos(0.05 pi).
TEST(RootSurface, CylinderCosineField) {
  const mesh::VolumeMesh m = cylinder();
  const RootSurfaceSampler s(m, kMarker, all_nodes(m), 4);
  const Eigen::VectorXd p = s.sample(nodal(m, [](const Eigen::Vector3d& x) { return x.x(); }));
  const double area = 2 * kPi * kR * kL;
  for (double t : {-2.0, 0.0, 1.0, 2.5}) {
    EXPECT_NEAR(s.area_above(p, t), 2 * kR * kL * std::acos(t / kR), 2e-3 * area) << t;
  }
  EXPECT_NEAR(s.level_exceeded_on(p, 0.05), kR * std::cos(0.05 * kPi), 5e-3 * kR);
  // Finer sub-triangles converge on the exact area (the quadratic field is captured better).
  const RootSurfaceSampler fine(m, kMarker, all_nodes(m), 8);
  const double exact = 2 * kR * kL * std::acos(2.5 / kR);
  EXPECT_LT(
      std::abs(fine.area_above(
                   fine.sample(nodal(m, [](const Eigen::Vector3d& x) { return x.x(); })), 2.5) -
               exact),
      std::abs(s.area_above(p, 2.5) - exact) + 1e-9);
}

TEST(RootSurface, FieldMustCoverTheSurface) {
  const mesh::VolumeMesh m = cylinder();
  std::vector<int> nodes = all_nodes(m);
  nodes.pop_back();
  EXPECT_THROW(RootSurfaceSampler(m, kMarker, nodes), Error);
}

// Derived: a linear field in depth is reproduced exactly on every covered cell; cells above the
// surface (between the CEJ and the crest) are NaN; the whole band below is covered, seam included.
TEST(RootMap, CylinderDepthFieldAndCoverage) {
  const mesh::VolumeMesh m = cylinder();
  const RootMapSampler s(m, kMarker, all_nodes(m), 72, 60, 0.0, -kBottom);
  const RootMap map = s.sample(nodal(m, [](const Eigen::Vector3d& x) { return -x.z(); }));
  ASSERT_EQ(map.pressure_kpa.size(), 72u * 60u);
  const double dd = -kBottom / 60;
  int n_covered = 0;
  for (int i = 0; i < 60; ++i) {
    const double depth = (i + 0.5) * dd;
    for (int j = 0; j < 72; ++j) {
      const double v = map.pressure_kpa[static_cast<size_t>(i * 72 + j)];
      if (depth < -kTop) {
        EXPECT_TRUE(std::isnan(v)) << i << " " << j;
      } else {
        ASSERT_FALSE(std::isnan(v)) << i << " " << j;
        EXPECT_NEAR(v, depth, 1e-10);
        ++n_covered;
      }
    }
  }
  EXPECT_NEAR(s.covered_fraction(), n_covered / (72.0 * 60.0), 1e-15);
  EXPECT_GT(n_covered, 0);
}

// Derived: p = cos(angle) is mapped to the right columns (0 = +x labial, 90 = +y mesial), within
// the quadratic interpolation error of 15-degree faces.
TEST(RootMap, AngleConvention) {
  const mesh::VolumeMesh m = cylinder();
  const RootMapSampler s(m, kMarker, all_nodes(m), 72, 60, 0.0, -kBottom);
  const RootMap c = s.sample(nodal(m, [](const Eigen::Vector3d& x) { return x.x() / kR; }));
  const RootMap sn = s.sample(nodal(m, [](const Eigen::Vector3d& x) { return x.y() / kR; }));
  for (int j = 0; j < 72; ++j) {
    const double a = (j + 0.5) * 5.0 * kPi / 180;
    EXPECT_NEAR(c.pressure_kpa[static_cast<size_t>(40 * 72 + j)], std::cos(a), 2e-3) << j;
    EXPECT_NEAR(sn.pressure_kpa[static_cast<size_t>(40 * 72 + j)], std::sin(a), 2e-3) << j;
  }
}

// Derived: a cone closed by a pole on the axis covers the rows down to the apex.
TEST(RootMap, ConeWithApexPole) {
  const auto rho = [](double z) { return kR * (z - kBottom) / kL; };
  const mesh::VolumeMesh m = revolution_surface(rho, kTop, kBottom, 24, 12, true);
  const RootSurfaceSampler area(m, kMarker, all_nodes(m));
  const double slant = std::hypot(kR, kL);
  EXPECT_NEAR(area.area_mm2(), kPi * kR * slant, 1e-3 * kPi * kR * slant);
  const RootMapSampler s(m, kMarker, all_nodes(m), 72, 60, 0.0, -kBottom);
  const RootMap map = s.sample(nodal(m, [](const Eigen::Vector3d& x) { return -x.z(); }));
  for (int i = 0; i < 60; ++i) {
    const double depth = (i + 0.5) * (-kBottom / 60);
    for (int j = 0; j < 72; ++j) {
      const double v = map.pressure_kpa[static_cast<size_t>(i * 72 + j)];
      if (depth < -kTop) continue;
      ASSERT_FALSE(std::isnan(v)) << "row " << i << " column " << j;
      EXPECT_NEAR(v, depth, 1e-9);
    }
  }
}

}  // namespace
}  // namespace sharpey::analysis::detail
