// Display geometry: region boundaries, plane sections and iso-lines on a structured box mesh
// whose exact areas are known (derived from the box dimensions).
#include <gtest/gtest.h>

#include <Eigen/Geometry>
#include <cmath>
#include <map>
#include <tuple>

#include "core/display_mesh.h"
#include "sharpey/core/reference_tetrahedron.h"

namespace sharpey::app {
namespace {

// Box [0, nx] x [0, ny] x [0, nz] (unit cells), each cell split into six tetrahedra around its
// main diagonal (conforming), 4-node or 10-node. Cells with x < split_x get region 1, others 2.
mesh::VolumeMesh box_mesh(int nx, int ny, int nz, bool quadratic, int split_x = 1 << 20) {
  mesh::VolumeMesh m;
  auto id = [&](int i, int j, int k) { return i + (nx + 1) * (j + (ny + 1) * k); };
  for (int k = 0; k <= nz; ++k)
    for (int j = 0; j <= ny; ++j)
      for (int i = 0; i <= nx; ++i) m.nodes.emplace_back(i, j, k);
  std::map<std::pair<int, int>, int> mid;
  auto midside = [&](int a, int b) {
    const auto key = std::minmax(a, b);
    const auto it = mid.find(key);
    if (it != mid.end()) return it->second;
    m.nodes.push_back(0.5 * (m.nodes[static_cast<size_t>(a)] + m.nodes[static_cast<size_t>(b)]));
    const int n = static_cast<int>(m.nodes.size()) - 1;
    mid.emplace(key, n);
    return n;
  };
  static constexpr int kKuhn[6][4] = {{0, 1, 3, 7}, {0, 3, 2, 7}, {0, 2, 6, 7},
                                      {0, 6, 4, 7}, {0, 4, 5, 7}, {0, 5, 1, 7}};
  m.nodes_per_element = quadratic ? 10 : 4;
  m.nodes_per_face = quadratic ? 6 : 3;
  for (int k = 0; k < nz; ++k)
    for (int j = 0; j < ny; ++j)
      for (int i = 0; i < nx; ++i) {
        int corner[8];
        for (int c = 0; c < 8; ++c)
          corner[c] = id(i + (c & 1), j + ((c >> 1) & 1), k + ((c >> 2) & 1));
        for (const auto& t : kKuhn) {
          int v[4] = {corner[t[0]], corner[t[1]], corner[t[2]], corner[t[3]]};
          const Eigen::Vector3d& p0 = m.nodes[static_cast<size_t>(v[0])];
          const double volume = (m.nodes[static_cast<size_t>(v[1])] - p0)
                                    .cross(m.nodes[static_cast<size_t>(v[2])] - p0)
                                    .dot(m.nodes[static_cast<size_t>(v[3])] - p0);
          if (volume < 0) std::swap(v[1], v[2]);
          for (int a : v) m.elements.push_back(a);
          if (quadratic)
            for (const auto& e : core::kTetEdges) m.elements.push_back(midside(v[e[0]], v[e[1]]));
          m.element_region.push_back(i < split_x ? 1 : 2);
        }
      }
  return m;
}

std::vector<Eigen::Vector3d> surface_points(const mesh::VolumeMesh& m, const DisplaySurface& s) {
  std::vector<Eigen::Vector3d> p;
  for (int n : s.nodes) p.push_back(m.nodes[static_cast<size_t>(n)]);
  return p;
}

std::vector<Eigen::Vector3d> section_points(const mesh::VolumeMesh& m, const DisplaySection& s) {
  std::vector<Eigen::Vector3d> p;
  for (const EdgePoint& e : s.points)
    p.push_back(
        interpolate(e, m.nodes[static_cast<size_t>(e.a)], m.nodes[static_cast<size_t>(e.b)]));
  return p;
}

class BoxBoundary : public ::testing::TestWithParam<bool> {};

TEST_P(BoxBoundary, ClosedOutwardAndOfTheRightArea) {
  const bool quadratic = GetParam();
  const mesh::VolumeMesh m = box_mesh(3, 2, 2, quadratic);
  const DisplaySurface s = region_boundary(m, {1, 2});
  const auto p = surface_points(m, s);
  // Box 3 x 2 x 2: area 2 (6 + 6 + 4) = 32 mm^2, volume 12 mm^3 (derived).
  EXPECT_NEAR(total_area(p, s.triangles), 32.0, 1e-12);
  // Divergence theorem with outward normals: V = 1/3 sum over triangles of x . n A.
  double volume = 0;
  for (const auto& t : s.triangles) {
    const Eigen::Vector3d& a = p[static_cast<size_t>(t[0])];
    const Eigen::Vector3d twice_area_normal =
        (p[static_cast<size_t>(t[1])] - a).cross(p[static_cast<size_t>(t[2])] - a);
    volume += a.dot(twice_area_normal) / 6.0;
  }
  EXPECT_NEAR(volume, 12.0, 1e-12);
  // Closed: every edge is used by exactly two triangles.
  std::map<std::pair<int, int>, int> uses;
  for (const auto& t : s.triangles)
    for (int k = 0; k < 3; ++k)
      ++uses[std::minmax(t[static_cast<size_t>(k)], t[static_cast<size_t>((k + 1) % 3)])];
  for (const auto& [edge, count] : uses) EXPECT_EQ(count, 2);
}
INSTANTIATE_TEST_SUITE_P(LinearAndQuadratic, BoxBoundary, ::testing::Bool());

TEST(RegionBoundary, OneRegionOfTwoIncludesTheInterface) {
  const mesh::VolumeMesh m = box_mesh(3, 2, 2, true, 1);
  const DisplaySurface left = region_boundary(m, {1});  // [0,1] x [0,2] x [0,2]
  EXPECT_NEAR(total_area(surface_points(m, left), left.triangles), 2 * (2 + 2 + 4), 1e-12);
  const DisplaySurface right = region_boundary(m, {2});  // [1,3] x [0,2] x [0,2]
  EXPECT_NEAR(total_area(surface_points(m, right), right.triangles), 2 * (4 + 4 + 4), 1e-12);
}

class VisibleBoundary : public ::testing::TestWithParam<bool> {};

TEST_P(VisibleBoundary, LeavesOutTheFacesACoveringRegionHides) {
  const bool quadratic = GetParam();
  const mesh::VolumeMesh m = box_mesh(3, 2, 2, quadratic, 1);
  // Region 1 ([0,1] x [0,2] x [0,2]) covered by region 2 on x = 1: the 2 x 2 interface goes,
  // area 2 (2 + 2 + 4) - 4 = 12 mm^2 is left (derived).
  const DisplaySurface left = visible_boundary(m, {1}, {2});
  EXPECT_NEAR(total_area(surface_points(m, left), left.triangles), 12.0, 1e-12);
  for (const auto& p : surface_points(m, left)) EXPECT_LE(p.x(), 1.0);
  bool interface_face = false;
  const auto points = surface_points(m, left);
  for (const auto& t : left.triangles) {
    bool all_on_interface = true;
    for (int k : t)
      all_on_interface = all_on_interface && points[static_cast<size_t>(k)].x() == 1.0;
    interface_face = interface_face || all_on_interface;
  }
  EXPECT_FALSE(interface_face);
  // Nothing covering: the whole boundary, same triangles as region_boundary.
  EXPECT_EQ(visible_boundary(m, {1}, {}).triangles.size(),
            region_boundary(m, {1}).triangles.size());
}
INSTANTIATE_TEST_SUITE_P(LinearAndQuadratic, VisibleBoundary, ::testing::Bool());

class BoxSection : public ::testing::TestWithParam<bool> {};

TEST_P(BoxSection, PlaneSectionsHaveTheExactArea) {
  const mesh::VolumeMesh m = box_mesh(3, 2, 2, GetParam());
  // Cross-section x = 1.3: a 2 x 2 square.
  const DisplaySection across = plane_section(m, {1, 2}, {1.3, 0, 0}, {1, 0, 0});
  EXPECT_NEAR(total_area(section_points(m, across), across.triangles), 4.0, 1e-12);
  // Oblique plane z = 1 + 0.2 (x - 1.5) through the box: a parallelogram of area
  // 3 * 2 * sqrt(1 + 0.2^2) (derived; the plane stays inside 0 < z < 2).
  const Eigen::Vector3d normal(-0.2, 0, 1);
  const DisplaySection oblique = plane_section(m, {1, 2}, {1.5, 0, 1}, normal);
  EXPECT_NEAR(total_area(section_points(m, oblique), oblique.triangles), 6.0 * std::sqrt(1.04),
              1e-12);
  // Section points lie on the plane.
  for (const auto& q : section_points(m, oblique))
    EXPECT_NEAR(normal.normalized().dot(q - Eigen::Vector3d(1.5, 0, 1)), 0, 1e-12);
  // Only the chosen regions are cut.
  const mesh::VolumeMesh split = box_mesh(3, 2, 2, GetParam(), 1);
  const DisplaySection part = plane_section(split, {2}, {1.5, 1, 1}, {0, 0, 1});
  EXPECT_NEAR(total_area(section_points(split, part), part.triangles), 4.0, 1e-12);
}
INSTANTIATE_TEST_SUITE_P(LinearAndQuadratic, BoxSection, ::testing::Bool());

TEST(Section, LinearFieldIsInterpolatedExactly) {
  const mesh::VolumeMesh m = box_mesh(2, 2, 2, true);
  auto f = [](const Eigen::Vector3d& x) { return x.x() + 2 * x.y() + 3 * x.z(); };
  const DisplaySection s = plane_section(m, {1, 2}, {0.7, 0, 0}, {1, 0.3, 0.1});
  ASSERT_FALSE(s.points.empty());
  const auto p = section_points(m, s);
  for (size_t i = 0; i < p.size(); ++i) {
    const EdgePoint& e = s.points[i];
    const double v =
        interpolate(e, f(m.nodes[static_cast<size_t>(e.a)]), f(m.nodes[static_cast<size_t>(e.b)]));
    EXPECT_NEAR(v, f(p[i]), 1e-12);
  }
}

TEST(IsoLines, StraightIsoLineOfALinearFieldOnASection) {
  // On the section x = 0.7 of a 1 x 1 x 1 box, f = x + 2y + 3z = 3 is the segment from
  // (y, z) = (0, 2.3/3) to (1, 0.1): length sqrt(1 + (2/3)^2) (derived).
  const mesh::VolumeMesh m = box_mesh(1, 1, 1, true);
  const DisplaySection s = plane_section(m, {1, 2}, {0.7, 0, 0}, {1, 0, 0});
  const auto p = section_points(m, s);
  std::vector<double> values;
  for (const auto& q : p) values.push_back(q.x() + 2 * q.y() + 3 * q.z());
  double length = 0;
  for (const auto& [a, b] : triangle_iso_lines(p, s.triangles, values, 3.0)) {
    EXPECT_NEAR(a.x() + 2 * a.y() + 3 * a.z(), 3.0, 1e-12);
    length += (b - a).norm();
  }
  EXPECT_NEAR(length, std::sqrt(1.0 + 4.0 / 9.0), 1e-12);
}

TEST(IsoLines, NonFiniteValuesAreSkipped) {
  const std::vector<Eigen::Vector3d> p = {{0, 0, 0}, {1, 0, 0}, {0, 1, 0}};
  EXPECT_EQ(triangle_iso_lines(p, {{0, 1, 2}}, {0.0, 1.0, 1.0}, 0.5).size(), 1u);
  EXPECT_TRUE(triangle_iso_lines(p, {{0, 1, 2}}, {0.0, NAN, 1.0}, 0.5).empty());
}

}  // namespace
}  // namespace sharpey::app
