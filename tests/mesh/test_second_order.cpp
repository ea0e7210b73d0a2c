// make_second_order / make_first_order: conformity, shared midside nodes, curved projection and the
// convergence of the curved volume of a ball (expected values derived: 4/3 pi r^3).
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <map>
#include <set>

#include "sharpey/core/constants.h"
#include "sharpey/core/reference_tetrahedron.h"
#include "sharpey/error.h"
#include "sharpey/mesh/mesh_statistics.h"
#include "sharpey/mesh/second_order.h"
#include "sharpey/mesh/tetrahedralize.h"
#include "support/plc_shapes.h"

namespace sharpey::mesh {
namespace {

using sharpey::core::kPi;

TetgenOptions linear_options() {
  TetgenOptions o;
  o.second_order = false;
  return o;
}

VolumeMesh two_region_cube() {
  Plc plc;
  test::add_box(plc, Eigen::Vector3d::Zero(), Eigen::Vector3d::Ones(), 1);
  test::add_box(plc, Eigen::Vector3d::Constant(0.3), Eigen::Vector3d::Constant(0.6), 0, 20);
  plc.regions.push_back({Eigen::Vector3d(0.1, 0.1, 0.1), 1, 0.004});
  plc.regions.push_back({Eigen::Vector3d(0.5, 0.5, 0.5), 2, 0.001});
  return tetrahedralize(plc, linear_options());
}

// Ball of radius r meshed with its surface triangles kept (TetGen -Y), surface marker 1.
VolumeMesh ball(double r, int levels) {
  Plc plc;
  test::add_surface(plc, test::icosphere(Eigen::Vector3d::Zero(), r, levels), 1);
  plc.regions.push_back({Eigen::Vector3d::Zero(), 1, 0});
  TetgenOptions o = linear_options();
  o.preserve_surface = true;
  return tetrahedralize(plc, o);
}

std::array<int, 3> sorted3(int a, int b, int c) {
  std::array<int, 3> t = {a, b, c};
  std::sort(t.begin(), t.end());
  return t;
}

// The six nodes of local face `lf` of a 10-node element, as a sorted set.
std::set<int> face_nodes6(const int* el, const std::array<int, 3>& lf) {
  std::set<int> s = {el[lf[0]], el[lf[1]], el[lf[2]]};
  for (int k = 0; k < 6; ++k) {
    const int a = core::kTetEdges[static_cast<size_t>(k)][0],
              b = core::kTetEdges[static_cast<size_t>(k)][1];
    const bool on_face = std::count(lf.begin(), lf.end(), a) && std::count(lf.begin(), lf.end(), b);
    if (on_face) s.insert(el[4 + k]);
  }
  return s;
}

TEST(SecondOrder, ConformingWithOneNodePerEdge) {
  const VolumeMesh lin = two_region_cube();
  const VolumeMesh q = make_second_order(lin);
  ASSERT_EQ(q.nodes_per_element, 10);
  ASSERT_EQ(q.nodes_per_face, 6);
  ASSERT_EQ(q.n_elements(), lin.n_elements());
  ASSERT_EQ(q.n_faces(), lin.n_faces());
  EXPECT_EQ(q.element_region, lin.element_region);
  EXPECT_EQ(q.face_marker, lin.face_marker);

  // Node count = vertices + distinct edges (counted independently here).
  std::set<std::pair<int, int>> edges;
  for (int e = 0; e < lin.n_elements(); ++e) {
    for (const auto& ed : core::kTetEdges) {
      const int a = lin.element(e)[ed[0]], b = lin.element(e)[ed[1]];
      edges.emplace(std::min(a, b), std::max(a, b));
    }
  }
  EXPECT_EQ(static_cast<size_t>(q.n_nodes()), static_cast<size_t>(lin.n_nodes()) + edges.size());

  // Every element face seen from both sides carries the same six nodes; boundary faces once.
  std::map<std::array<int, 3>, std::vector<std::set<int>>> seen;
  for (int e = 0; e < q.n_elements(); ++e) {
    const int* el = q.element(e);
    for (int v = 0; v < 4; ++v) EXPECT_EQ(el[v], lin.element(e)[v]);
    for (const auto& lf : core::kTetFaces)
      seen[sorted3(el[lf[0]], el[lf[1]], el[lf[2]])].push_back(face_nodes6(el, lf));
  }
  int n_interior = 0;
  for (const auto& [key, sides] : seen) {
    ASSERT_LE(sides.size(), 2u);
    if (sides.size() == 2) {
      ++n_interior;
      EXPECT_EQ(sides[0], sides[1]);
    }
  }
  EXPECT_GT(n_interior, 0);
  // Output faces match the element faces they lie on, midside order (0,1) (1,2) (0,2).
  for (int f = 0; f < q.n_faces(); ++f) {
    const int* fa = q.face(f);
    const auto it = seen.find(sorted3(fa[0], fa[1], fa[2]));
    ASSERT_NE(it, seen.end());
    EXPECT_EQ(std::set<int>(fa, fa + 6), it->second.front());
    const Eigen::Vector3d mid01 =
        0.5 * (q.nodes[static_cast<size_t>(fa[0])] + q.nodes[static_cast<size_t>(fa[1])]);
    const Eigen::Vector3d mid12 =
        0.5 * (q.nodes[static_cast<size_t>(fa[1])] + q.nodes[static_cast<size_t>(fa[2])]);
    const Eigen::Vector3d mid02 =
        0.5 * (q.nodes[static_cast<size_t>(fa[0])] + q.nodes[static_cast<size_t>(fa[2])]);
    EXPECT_EQ(q.nodes[static_cast<size_t>(fa[3])], mid01);
    EXPECT_EQ(q.nodes[static_cast<size_t>(fa[4])], mid12);
    EXPECT_EQ(q.nodes[static_cast<size_t>(fa[5])], mid02);
  }
}

TEST(SecondOrder, FirstOrderUndoesSecondOrder) {
  const VolumeMesh lin = two_region_cube();
  const VolumeMesh back = make_first_order(make_second_order(lin));
  EXPECT_EQ(back.nodes_per_element, 4);
  EXPECT_EQ(back.nodes_per_face, 3);
  EXPECT_EQ(back.nodes, lin.nodes);
  EXPECT_EQ(back.elements, lin.elements);
  EXPECT_EQ(back.faces, lin.faces);
  EXPECT_EQ(back.element_region, lin.element_region);
  EXPECT_EQ(back.face_marker, lin.face_marker);
}

TEST(SecondOrder, ProjectionPutsMidsideNodesOnTheSphere) {
  const double r = 2.5;
  const VolumeMesh lin = ball(r, 2);
  int n_calls = 0;
  const VolumeMesh q = make_second_order(
      lin,
      [&](const std::vector<int>& markers, const Eigen::Vector3d& a, const Eigen::Vector3d& b) {
        ++n_calls;
        EXPECT_EQ(markers, std::vector<int>{1});
        return Eigen::Vector3d(r * (a + b).normalized());
      });
  EXPECT_EQ(n_calls, 3 * lin.n_faces() / 2);  // derived: closed surface, each edge on two faces
  for (int f = 0; f < q.n_faces(); ++f) {
    for (int k = 0; k < 6; ++k)
      EXPECT_NEAR(q.nodes[static_cast<size_t>(q.face(f)[k])].norm(), r, 1e-13);
  }
  // Interior edges keep the midpoint.
  std::set<int> surface_nodes(q.faces.begin(), q.faces.end());
  for (int e = 0; e < q.n_elements(); ++e) {
    const int* el = q.element(e);
    for (int k = 0; k < 6; ++k) {
      if (surface_nodes.count(el[4 + k])) continue;
      const Eigen::Vector3d mid =
          0.5 * (q.nodes[static_cast<size_t>(el[core::kTetEdges[static_cast<size_t>(k)][0]])] +
                 q.nodes[static_cast<size_t>(el[core::kTetEdges[static_cast<size_t>(k)][1]])]);
      EXPECT_EQ(q.nodes[static_cast<size_t>(el[4 + k])], mid);
    }
  }
  EXPECT_GT(measure(q).min_jacobian_ratio, 0.0);
}

TEST(SecondOrder, MarkersOfAllFacesOnAnEdgeAreReported) {
  const VolumeMesh lin = two_region_cube();
  std::set<std::vector<int>> marker_sets;
  make_second_order(lin, [&](const std::vector<int>& markers, const Eigen::Vector3d& a,
                             const Eigen::Vector3d& b) {
    EXPECT_TRUE(std::is_sorted(markers.begin(), markers.end()));
    EXPECT_EQ(std::adjacent_find(markers.begin(), markers.end()), markers.end());
    marker_sets.insert(markers);
    return Eigen::Vector3d(0.5 * (a + b));
  });
  // Cube edges lie on two sides (markers 1..6), e.g. x = 0 (1) and y = 0 (3).
  EXPECT_TRUE(marker_sets.count({1, 3}));
  EXPECT_TRUE(marker_sets.count({20}));
  EXPECT_TRUE(marker_sets.count({6}));
}

// Curved (projected) quadratic elements: ball volume error falls much faster than with straight
// elements. Errors are printed and the convergence rates asserted.
TEST(SecondOrder, CurvedBallVolumeConvergesFasterThanLinear) {
  const double r = 1.0, exact = 4.0 / 3.0 * kPi * r * r * r;  // derived
  std::vector<double> h, err_lin, err_curved;
  for (int level = 1; level <= 3; ++level) {
    const VolumeMesh lin = ball(r, level);
    const VolumeMesh q = make_second_order(
        lin, [r](const std::vector<int>&, const Eigen::Vector3d& a, const Eigen::Vector3d& b) {
          return Eigen::Vector3d(r * (a + b).normalized());
        });
    const MeshStatistics sl = measure(lin), sq = measure(q);
    err_lin.push_back(std::abs(sl.total_volume_mm3 - exact) / exact);
    err_curved.push_back(std::abs(sq.total_volume_mm3 - exact) / exact);
    h.push_back(std::pow(0.5, level));
    EXPECT_GT(sq.min_jacobian_ratio, 0.0);
    std::printf("level %d: %d elements, relative volume error linear %.3e, curved %.3e\n", level,
                lin.n_elements(), err_lin.back(), err_curved.back());
  }
  for (size_t i = 1; i < h.size(); ++i) {
    const double rate_lin = std::log(err_lin[i - 1] / err_lin[i]) / std::log(2.0);
    const double rate_curved = std::log(err_curved[i - 1] / err_curved[i]) / std::log(2.0);
    std::printf("rates: linear %.2f, curved %.2f\n", rate_lin, rate_curved);
    EXPECT_NEAR(rate_lin, 2.0, 0.3);  // derived: chordal error O(h^2)
    EXPECT_GT(rate_curved, 3.5);      // derived: quadratic geometry, O(h^4) volume error
  }
  EXPECT_LT(err_curved.back(), err_lin.back() / 100.0);
}

TEST(SecondOrder, RejectsWrongInput) {
  const VolumeMesh q = make_second_order(two_region_cube());
  EXPECT_THROW(make_second_order(q), MeshError);
  VolumeMesh broken = two_region_cube();
  broken.elements[5] = broken.n_nodes();
  EXPECT_THROW(make_second_order(broken), MeshError);
  VolumeMesh odd = q;
  odd.nodes_per_element = 7;
  EXPECT_THROW(make_first_order(odd), MeshError);
}

}  // namespace
}  // namespace sharpey::mesh
