// Patch tests on real TetGen output (source: Irons & Razzaque 1972, citation from memory, the patch
// test; common practice; check-values.md section 10 item 5): the box [0, 2] x [0, 1] x [0, 1.5] mm
// split by the plane x = 1 into two regions (same material), tetrahedralised by
// mesh::tetrahedralize (4-node), then made quadratic by mesh::make_second_order (10-node, straight
// edges); optionally with interior vertices jittered. Linear and constant-stress fields to 1e-10
// relative for both elements, quadratic fields with the consistent body force for the 10-node
// element.
#include <gtest/gtest.h>

#include <array>
#include <iostream>
#include <string>

#include "sharpey/mesh/second_order.h"
#include "sharpey/mesh/tetrahedralize.h"
#include "support/patch_checks.h"

namespace sharpey::testing {
namespace {

constexpr double kTolerance = 1e-10;

// Box PLC: 12 corner points (x = 0, 1, 2), side triangles marked 1..6, the interface x = 1
// marked 7.
mesh::Plc box_plc() {
  mesh::Plc plc;
  const double X = kPatchBox.x(), Y = kPatchBox.y(), Z = kPatchBox.z();
  for (double x : {0.0, 0.5 * X, X}) {
    plc.points.emplace_back(x, 0, 0);
    plc.points.emplace_back(x, Y, 0);
    plc.points.emplace_back(x, Y, Z);
    plc.points.emplace_back(x, 0, Z);
  }
  auto quad = [&plc](int a, int b, int c, int d, int marker) {
    plc.triangles.push_back({a, b, c});
    plc.triangles.push_back({a, c, d});
    plc.triangle_marker.push_back(marker);
    plc.triangle_marker.push_back(marker);
  };
  quad(0, 1, 2, 3, kXiMin);
  quad(4, 5, 6, 7, 7);
  quad(8, 9, 10, 11, kXiMax);
  for (int s = 0; s < 2; ++s) {  // the two halves' y, z sides
    const int o = 4 * s;
    quad(o + 0, o + 4, o + 7, o + 3, kEtaMin);   // y = 0
    quad(o + 1, o + 5, o + 6, o + 2, kEtaMax);   // y = Y
    quad(o + 0, o + 4, o + 5, o + 1, kZetaMin);  // z = 0
    quad(o + 3, o + 7, o + 6, o + 2, kZetaMax);  // z = Z
  }
  plc.regions.push_back({Eigen::Vector3d(0.25 * X, 0.5 * Y, 0.5 * Z), 1, 0.0});
  plc.regions.push_back({Eigen::Vector3d(0.75 * X, 0.5 * Y, 0.5 * Z), 2, 0.0});
  return plc;
}

struct TetgenCase {
  int nodes_per_element;
  double jitter;
};

mesh::VolumeMesh tetgen_box(const TetgenCase& c) {
  mesh::TetgenOptions options;
  options.max_volume_mm3 = 0.01;
  options.second_order = false;
  mesh::VolumeMesh m = mesh::tetrahedralize(box_plc(), options);
  if (c.jitter > 0) jitter_nodes(m, c.jitter, 3u);
  if (c.nodes_per_element == 10) m = mesh::make_second_order(m);
  return m;
}

class PatchTetgen : public ::testing::TestWithParam<TetgenCase> {};

TEST_P(PatchTetgen, MeshIsWhatTheTestAssumes) {
  const mesh::VolumeMesh m = tetgen_box(GetParam());
  std::cout << "[patch tetgen] " << m.n_elements() << " elements, " << m.n_nodes() << " nodes\n";
  EXPECT_GT(m.n_elements(), 300);
  EXPECT_EQ(m.nodes_per_element, GetParam().nodes_per_element);
  std::array<int, 8> per_marker{};
  for (int marker : m.face_marker) ++per_marker[static_cast<size_t>(marker)];
  for (int side = kXiMin; side <= 7; ++side)
    EXPECT_GT(per_marker[static_cast<size_t>(side)], 0) << side;
  for (const Eigen::Vector3d& corner :
       {Eigen::Vector3d(0, 0, 0), Eigen::Vector3d(kPatchBox.x(), 0, 0),
        Eigen::Vector3d(0, kPatchBox.y(), 0)}) {
    EXPECT_EQ((m.nodes[static_cast<size_t>(nearest_node(m, corner))] - corner).norm(), 0.0);
  }
}

TEST_P(PatchTetgen, LinearDisplacementFromBoundaryValues) {
  const PatchErrors e = linear_dirichlet_patch(tetgen_box(GetParam()));
  std::cout << "[patch tetgen linear Dirichlet] nodal " << e.nodal << ", quadrature stress "
            << e.stress << "\n";
  RecordProperty("nodal_error", std::to_string(e.nodal));
  EXPECT_LT(e.nodal, kTolerance);
  EXPECT_LT(e.stress, kTolerance);
}

TEST_P(PatchTetgen, ConstantStressFromTractions) {
  const PatchErrors e = constant_stress_patch(tetgen_box(GetParam()));
  std::cout << "[patch tetgen constant stress] nodal " << e.nodal << ", recovered stress "
            << e.stress << "\n";
  RecordProperty("nodal_error", std::to_string(e.nodal));
  EXPECT_LT(e.nodal, kTolerance);
  EXPECT_LT(e.stress, kTolerance);
}

// Quadratic fields: 10-node elements only (linear elements cannot represent them).
class QuadraticPatchTetgen : public ::testing::TestWithParam<TetgenCase> {};

TEST_P(QuadraticPatchTetgen, QuadraticDisplacementWithBodyForce) {
  const PatchErrors e = quadratic_body_force_patch(tetgen_box(GetParam()));
  std::cout << "[patch tetgen quadratic] nodal " << e.nodal
            << " (without the body force: " << e.stress << ")\n";
  RecordProperty("nodal_error", std::to_string(e.nodal));
  EXPECT_LT(e.nodal, kTolerance);
  EXPECT_GT(e.stress, 1e-4);
}

std::string case_name(const ::testing::TestParamInfo<TetgenCase>& param_info) {
  return "k" + std::to_string(param_info.param.nodes_per_element) +
         (param_info.param.jitter > 0 ? "_jittered" : "");
}
INSTANTIATE_TEST_SUITE_P(Box, PatchTetgen,
                         ::testing::Values(TetgenCase{4, 0.0}, TetgenCase{4, 0.3},
                                           TetgenCase{10, 0.0}, TetgenCase{10, 0.3}),
                         case_name);
INSTANTIATE_TEST_SUITE_P(Box, QuadraticPatchTetgen,
                         ::testing::Values(TetgenCase{10, 0.0}, TetgenCase{10, 0.3}), case_name);

}  // namespace
}  // namespace sharpey::testing
