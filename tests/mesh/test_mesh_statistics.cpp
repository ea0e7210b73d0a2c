// measure() and pdl_width_samples(): exact volumes and areas of boxes, curved ball, element quality
// of known tetrahedra, Jacobian of curved and inverted elements, PDL width between concentric
// spheres, and the tree search against brute force. Expected values are derived.
#include <gtest/gtest.h>

#include <Eigen/Geometry>
#include <algorithm>
#include <cmath>
#include <random>

#include "sharpey/core/constants.h"
#include "sharpey/error.h"
#include "sharpey/mesh/mesh_statistics.h"
#include "sharpey/mesh/second_order.h"
#include "sharpey/mesh/tetrahedralize.h"
#include "support/plc_shapes.h"

namespace sharpey::mesh {
namespace {

using sharpey::core::kPi;

VolumeMesh box_mesh(bool quadratic) {
  Plc plc;
  test::add_box(plc, Eigen::Vector3d::Zero(), Eigen::Vector3d(2, 1, 3), 11);
  plc.regions.push_back({Eigen::Vector3d(1, 0.5, 1.5), 4, 0.02});
  TetgenOptions o;
  o.second_order = quadratic;
  return tetrahedralize(plc, o);
}

class BoxStatistics : public testing::TestWithParam<bool> {};

TEST_P(BoxStatistics, ExactVolumeAndAreasAndStraightJacobian) {
  const VolumeMesh m = box_mesh(GetParam());
  const MeshStatistics s = measure(m);
  EXPECT_EQ(s.n_nodes, m.n_nodes());
  EXPECT_EQ(s.n_elements, m.n_elements());
  EXPECT_EQ(s.n_faces, m.n_faces());
  ASSERT_EQ(s.elements_per_region.size(), 1u);
  EXPECT_EQ(s.elements_per_region.at(4), m.n_elements());
  EXPECT_NEAR(s.volume_per_region_mm3.at(4), 6.0, 1e-12);  // derived: 2 x 1 x 3
  EXPECT_NEAR(s.total_volume_mm3, 6.0, 1e-12);
  const double areas[6] = {3, 3, 6, 6, 2, 2};  // derived: x sides 1x3, y sides 2x3, z sides 2x1
  for (int side = 0; side < 6; ++side)
    EXPECT_NEAR(s.area_per_marker_mm2.at(11 + side), areas[side], 1e-12);
  EXPECT_NEAR(s.min_jacobian_ratio, 1.0, 1e-12);  // straight elements: constant det J
  EXPECT_EQ(s.n_inverted_elements, 0);
  EXPECT_GT(s.min_dihedral_deg, 0.0);
  EXPECT_LT(s.max_dihedral_deg, 180.0);
  EXPECT_LE(s.max_radius_edge_ratio, 1.6 * (1 + 1e-6));  // TetGen's -q bound in TetgenOptions
  EXPECT_EQ(s.pdl_width_samples, 0);
}

INSTANTIATE_TEST_SUITE_P(Order, BoxStatistics, testing::Values(false, true),
                         [](const testing::TestParamInfo<bool>& i) {
                           return i.param ? std::string("quadratic") : std::string("linear");
                         });

VolumeMesh single_tet(const Eigen::Vector3d& a, const Eigen::Vector3d& b, const Eigen::Vector3d& c,
                      const Eigen::Vector3d& d) {
  VolumeMesh m;
  m.nodes = {a, b, c, d};
  m.nodes_per_element = 4;
  m.elements = {0, 1, 2, 3};
  m.element_region = {1};
  m.nodes_per_face = 3;
  return m;
}

TEST(MeshStatistics, RegularTetrahedronQuality) {
  const double s3 = std::sqrt(3.0);
  const VolumeMesh m =
      single_tet({0, 0, 0}, {1, 0, 0}, {0.5, s3 / 2, 0}, {0.5, s3 / 6, std::sqrt(2.0 / 3.0)});
  const MeshStatistics s = measure(m);
  const double dihedral = std::acos(1.0 / 3.0) * 180.0 / kPi;  // derived: 70.53 deg
  EXPECT_NEAR(s.min_dihedral_deg, dihedral, 1e-9);
  EXPECT_NEAR(s.max_dihedral_deg, dihedral, 1e-9);
  EXPECT_NEAR(s.max_radius_edge_ratio, std::sqrt(6.0) / 4.0, 1e-12);  // derived: R = a sqrt(6)/4
  EXPECT_NEAR(s.total_volume_mm3, 1.0 / (6.0 * std::sqrt(2.0)),
              1e-14);  // derived: a^3 / (6 sqrt 2)
}

TEST(MeshStatistics, RightCornerTetrahedronQuality) {
  const MeshStatistics s = measure(single_tet({0, 0, 0}, {1, 0, 0}, {0, 1, 0}, {0, 0, 1}));
  EXPECT_NEAR(s.min_dihedral_deg, std::acos(1.0 / std::sqrt(3.0)) * 180.0 / kPi,
              1e-9);  // derived: 54.74
  EXPECT_NEAR(s.max_dihedral_deg, 90.0, 1e-9);
  // derived: circumcentre (1/2, 1/2, 1/2), R = sqrt(3)/2, shortest edge 1
  EXPECT_NEAR(s.max_radius_edge_ratio, std::sqrt(3.0) / 2.0, 1e-12);
}

TEST(MeshStatistics, InvertedLinearElementIsReported) {
  const MeshStatistics s = measure(single_tet({0, 0, 0}, {0, 1, 0}, {1, 0, 0}, {0, 0, 1}));
  EXPECT_NEAR(s.total_volume_mm3, -1.0 / 6.0, 1e-15);
  EXPECT_NEAR(s.min_jacobian_ratio, -1.0, 1e-15);
  EXPECT_EQ(s.n_inverted_elements, 1);
  EXPECT_EQ(s.inverted_elements, std::vector<int>{0});
  EXPECT_EQ(s.worst_jacobian_element, 0);
}

// Reference tetrahedron as a 10-node element with the midside node of edge (0,1) moved by d along
// -z. derived: x = X - d N4(X) e_z, det J = 1 + 4 d L1, volume = (1 + d)/6 (divergence theorem:
// the integral of N4 = 4 L0 L1 over the face z = 0 is 1/6).
VolumeMesh bent_tet(double d) {
  VolumeMesh m = make_second_order(single_tet({0, 0, 0}, {1, 0, 0}, {0, 1, 0}, {0, 0, 1}));
  m.nodes[static_cast<size_t>(m.elements[4])] += Eigen::Vector3d(0, 0, -d);
  return m;
}

TEST(MeshStatistics, CurvedElementJacobianAndVolume) {
  const MeshStatistics s = measure(bent_tet(0.5));
  EXPECT_NEAR(s.total_volume_mm3, 1.5 / 6.0, 1e-14);
  EXPECT_NEAR(s.min_jacobian_ratio, 1.0 / 3.0, 1e-14);  // min 1 at L1 = 0, max 3 at node 1
  EXPECT_EQ(s.n_inverted_elements, 0);
}

TEST(MeshStatistics, DeliberatelyInvertedQuadraticElementIsReported) {
  const MeshStatistics s = measure(bent_tet(-0.4));
  EXPECT_NEAR(s.min_jacobian_ratio, -0.6, 1e-14);  // det J = 1 - 1.6 at node 1
  EXPECT_EQ(s.inverted_elements, std::vector<int>{0});
  EXPECT_NEAR(s.total_volume_mm3, 0.6 / 6.0, 1e-14);
}

// Two concentric spheres: inner ball region 1 (root side, marker 1), shell region 2 (PDL) up to the
// outer sphere (socket, marker 2). Midside nodes projected onto the spheres.
VolumeMesh sphere_pair(double r_in, double r_out, int levels, bool quadratic) {
  Plc plc;
  test::add_surface(plc, test::icosphere(Eigen::Vector3d::Zero(), r_in, levels), kRootSurface);
  test::add_surface(plc, test::icosphere(Eigen::Vector3d::Zero(), r_out, levels), kSocketSurface);
  plc.regions.push_back({Eigen::Vector3d::Zero(), kTooth, 0});
  plc.regions.push_back({Eigen::Vector3d(0.5 * (r_in + r_out), 0, 0), kPdl, 0});
  TetgenOptions o;
  o.second_order = false;
  o.preserve_surface = true;
  const VolumeMesh lin = tetrahedralize(plc, o);
  if (!quadratic) return lin;
  return make_second_order(lin, [=](const std::vector<int>& markers, const Eigen::Vector3d& a,
                                    const Eigen::Vector3d& b) {
    const double r = markers.front() == kRootSurface ? r_in : r_out;
    return Eigen::Vector3d(r * (a + b).normalized());
  });
}

TEST(PdlWidth, ConcentricSpheresGiveTheGap) {
  const double r_in = 3.0, r_out = 3.2;
  const VolumeMesh m = sphere_pair(r_in, r_out, 3, true);
  const MeshStatistics s = measure(m);
  std::printf("PDL width: %d samples, mean %.6f, min %.6f, max %.6f mm (exact 0.2)\n",
              s.pdl_width_samples, s.pdl_width_mean_mm, s.pdl_width_min_mm, s.pdl_width_max_mm);
  EXPECT_GT(s.pdl_width_samples, 1000);
  EXPECT_NEAR(s.pdl_width_mean_mm, 0.2, 0.002);  // derived: r_out - r_in, within 1 %
  EXPECT_NEAR(s.pdl_width_min_mm, 0.2, 0.002);
  EXPECT_NEAR(s.pdl_width_max_mm, 0.2, 0.002);
  EXPECT_NEAR(s.area_per_marker_mm2.at(kRootSurface), 4 * kPi * r_in * r_in,
              1e-3 * 4 * kPi * r_in * r_in);
  EXPECT_NEAR(s.volume_per_region_mm3.at(kPdl),
              4.0 / 3.0 * kPi * (std::pow(r_out, 3) - std::pow(r_in, 3)),
              1e-3 * s.volume_per_region_mm3.at(kPdl));
  EXPECT_GT(s.min_jacobian_ratio, 0.0);
  // The curved ball and sphere: derived 4/3 pi r^3 and 4 pi r^2.
  const double ball = 4.0 / 3.0 * kPi * std::pow(r_in, 3), socket_area = 4 * kPi * r_out * r_out;
  const double ball_error = std::abs(s.volume_per_region_mm3.at(kTooth) - ball) / ball;
  const double area_error =
      std::abs(s.area_per_marker_mm2.at(kSocketSurface) - socket_area) / socket_area;
  std::printf("curved ball volume relative error %.2e, sphere area relative error %.2e\n",
              ball_error, area_error);
  EXPECT_LT(ball_error, 1e-4);
  EXPECT_LT(area_error, 1e-4);

  const auto samples = pdl_width_samples(m);
  ASSERT_EQ(static_cast<int>(samples.size()), s.pdl_width_samples);
  for (const auto& w : samples) {
    EXPECT_NEAR(w.root_point.norm(), r_in, 1e-12);
    EXPECT_NEAR(w.socket_point.norm(), r_out, 2e-3);
    EXPECT_NEAR(w.width_mm, (w.socket_point - w.root_point).norm(), 1e-14);
    EXPECT_EQ(w.root_point, m.nodes[static_cast<size_t>(w.node)]);
    // The nearest point lies radially outward.
    EXPECT_GT(w.root_point.normalized().dot(w.socket_point.normalized()), 1.0 - 1e-4);
  }
}

TEST(PdlWidth, LinearFacesUnderestimateByAtMostTheSagitta) {
  const double r_in = 3.0, r_out = 3.2;
  const VolumeMesh m = sphere_pair(r_in, r_out, 3, false);
  double longest = 0;
  for (int f = 0; f < m.n_faces(); ++f) {
    for (int k = 0; k < 3; ++k) {
      longest = std::max(longest, (m.nodes[static_cast<size_t>(m.face(f)[k])] -
                                   m.nodes[static_cast<size_t>(m.face(f)[(k + 1) % 3])])
                                      .norm());
    }
  }
  // derived: a flat triangle inscribed in the sphere lies at most R - sqrt(R^2 - rc^2) inside it,
  // rc <= longest edge / sqrt(3) the triangle's circumradius.
  const double rc = longest / std::sqrt(3.0);
  const double sagitta = r_out - std::sqrt(r_out * r_out - rc * rc);
  for (const auto& w : pdl_width_samples(m)) {
    EXPECT_LE(w.width_mm, 0.2 + 1e-12);
    EXPECT_GE(w.width_mm, 0.2 - sagitta - 1e-12);
  }
}

// Brute-force nearest distance from p to a triangle, by a different route: the plane projection
// when it falls inside, otherwise the nearest of the three edge segments.
double brute_distance(const Eigen::Vector3d& p, const Eigen::Vector3d& a, const Eigen::Vector3d& b,
                      const Eigen::Vector3d& c) {
  const Eigen::Vector3d n = (b - a).cross(c - a).normalized();
  const Eigen::Vector3d q = p - n.dot(p - a) * n;
  const double area = (b - a).cross(c - a).dot(n);
  const double l0 = (b - q).cross(c - q).dot(n) / area, l1 = (c - q).cross(a - q).dot(n) / area;
  if (l0 >= 0 && l1 >= 0 && l0 + l1 <= 1) return (p - q).norm();
  auto segment = [&p](const Eigen::Vector3d& u, const Eigen::Vector3d& v) {
    const double t = std::clamp((p - u).dot(v - u) / (v - u).squaredNorm(), 0.0, 1.0);
    return (p - (u + t * (v - u))).norm();
  };
  return std::min({segment(a, b), segment(b, c), segment(c, a)});
}

TEST(PdlWidth, TreeSearchAgreesWithBruteForce) {
  std::mt19937 rng(7);
  std::uniform_real_distribution<double> u(-1.0, 1.0);
  VolumeMesh m;
  m.nodes_per_element = 4;
  m.nodes_per_face = 3;
  // Socket: 600 small random triangles in a box of side 2; root: 300 random triangles.
  auto add_triangle = [&](int marker, double size) {
    const Eigen::Vector3d c(u(rng), u(rng), u(rng));
    const int base = m.n_nodes();
    for (int k = 0; k < 3; ++k)
      m.nodes.push_back(c + size * Eigen::Vector3d(u(rng), u(rng), u(rng)));
    for (int k = 0; k < 3; ++k) m.faces.push_back(base + k);
    m.face_marker.push_back(marker);
  };
  for (int i = 0; i < 600; ++i) add_triangle(2, 0.15);
  for (int i = 0; i < 300; ++i) add_triangle(1, 0.3);
  const auto samples = pdl_width_samples(m, 1, 2);
  ASSERT_EQ(samples.size(), 900u);
  for (const auto& w : samples) {
    double best = 1e300;
    for (int f = 0; f < m.n_faces(); ++f) {
      if (m.face_marker[static_cast<size_t>(f)] != 2) continue;
      const int* t = m.face(f);
      best = std::min(best, brute_distance(w.root_point, m.nodes[static_cast<size_t>(t[0])],
                                           m.nodes[static_cast<size_t>(t[1])],
                                           m.nodes[static_cast<size_t>(t[2])]));
    }
    EXPECT_NEAR(w.width_mm, best, 1e-12) << "node " << w.node;
  }
}

TEST(MeshStatistics, MalformedMeshThrows) {
  VolumeMesh m = single_tet({0, 0, 0}, {1, 0, 0}, {0, 1, 0}, {0, 0, 1});
  m.elements[2] = 9;
  EXPECT_THROW(measure(m), MeshError);
  VolumeMesh n = single_tet({0, 0, 0}, {1, 0, 0}, {0, 1, 0}, {0, 0, 1});
  n.element_region.push_back(2);
  EXPECT_THROW(measure(n), MeshError);
  VolumeMesh k = single_tet({0, 0, 0}, {1, 0, 0}, {0, 1, 0}, {0, 0, 1});
  k.nodes_per_element = 8;
  EXPECT_THROW(measure(k), MeshError);
}

}  // namespace
}  // namespace sharpey::mesh
