// Checks of the structured test-mesh generator the patch, convergence and benchmark programs use:
// if it were wrong, every verification result built on it would be meaningless.
#include <gtest/gtest.h>

#include <Eigen/Dense>
#include <algorithm>
#include <array>
#include <cmath>
#include <map>

#include "sharpey/core/reference_tetrahedron.h"
#include "support/grid_mesh.h"

namespace sharpey::testing {
namespace {

// Volume of element e by the degree-5 rule (exact for straight elements, accurate for curved ones).
double element_volume(const mesh::VolumeMesh& m, int e) {
  const core::QuadratureRule q = core::tet_quadrature(5);
  double v = 0;
  for (size_t p = 0; p < q.points.size(); ++p) {
    const Eigen::MatrixXd G = core::tet_shape_gradient(m.nodes_per_element, q.points[p]);
    Eigen::Matrix3d J = Eigen::Matrix3d::Zero();
    for (int i = 0; i < m.nodes_per_element; ++i)
      J += m.nodes[static_cast<size_t>(m.element(e)[i])] * G.row(i);
    EXPECT_GT(J.determinant(), 0.0) << "element " << e;
    v += q.weights[p] * J.determinant();
  }
  return v;
}

double total_volume(const mesh::VolumeMesh& m) {
  double v = 0;
  for (int e = 0; e < m.n_elements(); ++e) v += element_volume(m, e);
  return v;
}

// Every element face is shared by two elements or is a marked boundary face (same nodes).
void expect_conforming(const mesh::VolumeMesh& m) {
  std::map<std::array<int, 3>, int> count;
  for (int e = 0; e < m.n_elements(); ++e) {
    for (const auto& f : core::kTetFaces) {
      std::array<int, 3> key = {m.element(e)[f[0]], m.element(e)[f[1]], m.element(e)[f[2]]};
      std::sort(key.begin(), key.end());
      ++count[key];
    }
  }
  int n_boundary = 0;
  for (const auto& [key, c] : count) {
    ASSERT_LE(c, 2);
    n_boundary += c == 1;
  }
  EXPECT_EQ(n_boundary, m.n_faces());
  for (int f = 0; f < m.n_faces(); ++f) {
    std::array<int, 3> key = {m.face(f)[0], m.face(f)[1], m.face(f)[2]};
    std::sort(key.begin(), key.end());
    ASSERT_EQ(count.count(key), 1u);
    EXPECT_EQ(count[key], 1);
  }
}

class GridMesh : public ::testing::TestWithParam<int> {};

TEST_P(GridMesh, CountsVolumeAndConformity) {
  const int k = GetParam();
  const mesh::VolumeMesh m = grid_mesh(3, 2, 4, k);
  EXPECT_EQ(m.n_elements(), 6 * 3 * 2 * 4);
  EXPECT_EQ(m.n_nodes(), k == 4 ? 4 * 3 * 5 : 7 * 5 * 9);
  EXPECT_EQ(m.n_faces(), 2 * 2 * (3 * 2 + 2 * 4 + 3 * 4));
  EXPECT_NEAR(total_volume(m), 1.0, 1e-13);  // derived: unit cube
  expect_conforming(m);
}

TEST_P(GridMesh, FacesPointOutwardAndLieOnTheirSide) {
  const int k = GetParam();
  const mesh::VolumeMesh m = grid_mesh(2, 3, 2, k);
  std::array<double, 7> area{};
  for (int f = 0; f < m.n_faces(); ++f) {
    const int marker = m.face_marker[static_cast<size_t>(f)];
    ASSERT_GE(marker, 1);
    ASSERT_LE(marker, 6);
    const int axis = (marker - 1) / 2;
    const double level = (marker - 1) % 2;
    for (int a = 0; a < m.nodes_per_face; ++a) {
      EXPECT_DOUBLE_EQ(m.nodes[static_cast<size_t>(m.face(f)[a])][axis], level);
    }
    const Eigen::Vector3d& x0 = m.nodes[static_cast<size_t>(m.face(f)[0])];
    const Eigen::Vector3d n = (m.nodes[static_cast<size_t>(m.face(f)[1])] - x0)
                                  .cross(m.nodes[static_cast<size_t>(m.face(f)[2])] - x0);
    EXPECT_GT(n[axis] * (level > 0 ? 1.0 : -1.0), 0.0) << "face " << f << " points inward";
    area[static_cast<size_t>(marker)] += 0.5 * n.norm();
    if (k == 10) {  // midside nodes at the edge midpoints, VTK order (0,1) (1,2) (0,2)
      const int pairs[3][2] = {{0, 1}, {1, 2}, {0, 2}};
      for (int s = 0; s < 3; ++s) {
        const Eigen::Vector3d mid = 0.5 * (m.nodes[static_cast<size_t>(m.face(f)[pairs[s][0]])] +
                                           m.nodes[static_cast<size_t>(m.face(f)[pairs[s][1]])]);
        EXPECT_LT((m.nodes[static_cast<size_t>(m.face(f)[3 + s])] - mid).norm(), 1e-15);
      }
    }
  }
  for (int s = 1; s <= 6; ++s)
    EXPECT_NEAR(area[static_cast<size_t>(s)], 1.0, 1e-14) << "side " << s;
}

TEST_P(GridMesh, OrientationReversingCurvedMapGivesPositiveElements) {
  const int k = GetParam();
  // A quarter annulus, 1 <= r <= 2, with theta running clockwise: the map reverses orientation.
  const auto annulus = [](const Eigen::Vector3d& p) {
    const double r = 1.0 + p.x(), t = 0.5 * M_PI * (1.0 - p.y());
    return Eigen::Vector3d(r * std::cos(t), r * std::sin(t), 0.5 * p.z());
  };
  const mesh::VolumeMesh m =
      grid_mesh(4, 6, 1, k, annulus, [](const Eigen::Vector3d& c) { return c.x() < 0.5 ? 7 : 8; });
  // derived: quarter annulus area 3 pi / 4 times height 0.5; the chordal 4-node mesh is smaller.
  const double exact = 0.375 * M_PI;
  const double error = std::abs(total_volume(m) - exact) / exact;
  EXPECT_LT(error, k == 10 ? 2e-4 : 2e-2);
  EXPECT_EQ(std::count(m.element_region.begin(), m.element_region.end(), 7), m.n_elements() / 2);
  expect_conforming(m);

  // Faces point outward: the volume of the vertex polyhedron from its boundary triangles,
  // (1/6) sum x0 . (x1 x x2) (derived: divergence theorem), equals the sum of the straight
  // elements' volumes; an inward face would subtract instead of add.
  const auto x = [&m](int node) { return m.nodes[static_cast<size_t>(node)]; };
  double from_faces = 0, from_elements = 0;
  for (int f = 0; f < m.n_faces(); ++f) {
    from_faces += x(m.face(f)[0]).dot(x(m.face(f)[1]).cross(x(m.face(f)[2]))) / 6.0;
  }
  for (int e = 0; e < m.n_elements(); ++e) {
    const int* en = m.element(e);
    from_elements +=
        (x(en[1]) - x(en[0])).cross(x(en[2]) - x(en[0])).dot(x(en[3]) - x(en[0])) / 6.0;
  }
  EXPECT_NEAR(from_faces, from_elements, 1e-13);
  EXPECT_GT(from_elements, 0.0);
}

TEST_P(GridMesh, JitterKeepsBoundaryAndValidity) {
  const int k = GetParam();
  const mesh::VolumeMesh straight = grid_mesh(4, 4, 4, k);
  mesh::VolumeMesh m = straight;
  jitter_nodes(m, 0.3, 17u);
  int moved = 0;
  for (int i = 0; i < m.n_nodes(); ++i) {
    const Eigen::Vector3d& x = straight.nodes[static_cast<size_t>(i)];
    const bool boundary = (x.array() == 0.0).any() || (x.array() == 1.0).any();
    const double d = (m.nodes[static_cast<size_t>(i)] - x).norm();
    if (boundary) {
      EXPECT_EQ(d, 0.0);
    }
    moved += d > 0.01;
  }
  EXPECT_GT(moved, 20);
  EXPECT_NEAR(total_volume(m), 1.0, 1e-13);  // positive elements filling the same cube
  if (k == 10) {
    for (int e = 0; e < m.n_elements(); ++e) {
      for (int s = 0; s < 6; ++s) {
        const int* en = m.element(e);
        const Eigen::Vector3d mid =
            0.5 * (m.nodes[static_cast<size_t>(en[core::kTetEdges[static_cast<size_t>(s)][0]])] +
                   m.nodes[static_cast<size_t>(en[core::kTetEdges[static_cast<size_t>(s)][1]])]);
        EXPECT_LT((m.nodes[static_cast<size_t>(en[4 + s])] - mid).norm(), 1e-15);
      }
    }
  }
}

INSTANTIATE_TEST_SUITE_P(NodesPerElement, GridMesh, ::testing::Values(4, 10));

}  // namespace
}  // namespace sharpey::testing
