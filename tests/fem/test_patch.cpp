// Patch tests (source: Irons & Razzaque 1972, citation from memory, the patch test for finite
// elements; common practice; check-values.md section 10 item 5). A field the element space contains
// must be reproduced to 1e-10 relative (round-off):
//  - linear displacement with its boundary values prescribed (4- and 10-node),
//  - constant stress with the matching tractions on all six sides and only rigid-body supports
//    (4- and 10-node),
//  - quadratic displacement with its boundary values and the consistent constant body force
//    (10-node only).
// One suite, two kinds of mesh of the box [0, 2] x [0, 1] x [0, 1.5] mm with two regions of the
// same material (x < 1 and x > 1):
//  - grid: a 4 x 4 x 4-cell structured grid, interior vertices jittered by up to 35-40 % of the
//    local spacing;
//  - tetgen: real TetGen output of the box split by the plane x = 1 (mesh::tetrahedralize, 4-node,
//    then mesh::make_second_order for 10-node, straight edges), plain or jittered by 30 %.
#include <gtest/gtest.h>

#include <array>
#include <iostream>
#include <string>

#include "sharpey/mesh/second_order.h"
#include "sharpey/mesh/tetrahedralize.h"
#include "support/patch_checks.h"

namespace sharpey::testing {
namespace {

constexpr double kTolerance = 1e-10;  // relative, the acceptance bound

enum class PatchMesh { kGrid, kTetgen };

struct PatchCase {
  PatchMesh mesh;
  int nodes_per_element;
  double jitter;
  unsigned seed;
};
std::string case_name(const ::testing::TestParamInfo<PatchCase>& param_info) {
  const PatchCase& c = param_info.param;
  return std::string(c.mesh == PatchMesh::kGrid ? "grid" : "tetgen") + "_k" +
         std::to_string(c.nodes_per_element) + "_jitter" +
         std::to_string(static_cast<int>(100 * c.jitter)) + "_seed" + std::to_string(c.seed);
}

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

mesh::VolumeMesh patch_mesh(const PatchCase& c) {
  if (c.mesh == PatchMesh::kGrid) {
    mesh::VolumeMesh m = grid_mesh(
        4, 4, 4, c.nodes_per_element,
        [](const Eigen::Vector3d& p) -> Eigen::Vector3d { return p.cwiseProduct(kPatchBox); },
        [](const Eigen::Vector3d& centre) { return centre.x() < 0.5 ? 1 : 2; });
    jitter_nodes(m, c.jitter, c.seed);
    return m;
  }
  mesh::TetgenOptions options;
  options.max_volume_mm3 = 0.01;
  options.second_order = false;
  mesh::VolumeMesh m = mesh::tetrahedralize(box_plc(), options);
  if (c.jitter > 0) jitter_nodes(m, c.jitter, c.seed);
  if (c.nodes_per_element == 10) m = mesh::make_second_order(m);
  return m;
}

const char* mesh_name(const PatchCase& c) { return c.mesh == PatchMesh::kGrid ? "grid" : "tetgen"; }

class Patch : public ::testing::TestWithParam<PatchCase> {};

TEST_P(Patch, MeshIsWhatTheTestAssumes) {
  const mesh::VolumeMesh m = patch_mesh(GetParam());
  std::cout << "[patch " << mesh_name(GetParam()) << "] " << m.n_elements() << " elements, "
            << m.n_nodes() << " nodes\n";
  EXPECT_GT(m.n_elements(), 300);
  EXPECT_EQ(m.nodes_per_element, GetParam().nodes_per_element);
  if (GetParam().mesh != PatchMesh::kTetgen) return;  // the grid's own checks: test_patch_grid_mesh
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

TEST_P(Patch, LinearDisplacementFromBoundaryValues) {
  const PatchErrors e = linear_dirichlet_patch(patch_mesh(GetParam()));
  std::cout << "[patch " << mesh_name(GetParam()) << " linear Dirichlet] nodal " << e.nodal
            << ", quadrature stress " << e.stress << "\n";
  RecordProperty("nodal_error", std::to_string(e.nodal));
  EXPECT_LT(e.nodal, kTolerance);
  EXPECT_LT(e.stress, kTolerance);
}

TEST_P(Patch, ConstantStressFromTractions) {
  const PatchErrors e = constant_stress_patch(patch_mesh(GetParam()));
  std::cout << "[patch " << mesh_name(GetParam()) << " constant stress] nodal " << e.nodal
            << ", recovered stress " << e.stress << "\n";
  RecordProperty("nodal_error", std::to_string(e.nodal));
  EXPECT_LT(e.nodal, kTolerance);
  EXPECT_LT(e.stress, kTolerance);
}

// Quadratic fields: 10-node elements only (linear elements cannot represent them).
class QuadraticPatch : public ::testing::TestWithParam<PatchCase> {};

TEST_P(QuadraticPatch, QuadraticDisplacementWithBodyForce) {
  const PatchErrors e = quadratic_body_force_patch(patch_mesh(GetParam()));
  std::cout << "[patch " << mesh_name(GetParam()) << " quadratic] nodal " << e.nodal
            << " (without the body force: " << e.stress << ")\n";
  RecordProperty("nodal_error", std::to_string(e.nodal));
  EXPECT_LT(e.nodal, kTolerance);
  EXPECT_GT(e.stress, 1e-4);
}

constexpr PatchMesh kGrid = PatchMesh::kGrid, kTetgen = PatchMesh::kTetgen;
INSTANTIATE_TEST_SUITE_P(
    Box, Patch,
    ::testing::Values(PatchCase{kGrid, 4, 0.0, 1u}, PatchCase{kGrid, 4, 0.35, 1u},
                      PatchCase{kGrid, 4, 0.4, 7u}, PatchCase{kGrid, 10, 0.0, 1u},
                      PatchCase{kGrid, 10, 0.35, 1u}, PatchCase{kGrid, 10, 0.4, 7u},
                      PatchCase{kTetgen, 4, 0.0, 3u}, PatchCase{kTetgen, 4, 0.3, 3u},
                      PatchCase{kTetgen, 10, 0.0, 3u}, PatchCase{kTetgen, 10, 0.3, 3u}),
    case_name);
INSTANTIATE_TEST_SUITE_P(Box, QuadraticPatch,
                         ::testing::Values(PatchCase{kGrid, 10, 0.0, 1u},
                                           PatchCase{kGrid, 10, 0.35, 1u},
                                           PatchCase{kGrid, 10, 0.4, 7u},
                                           PatchCase{kTetgen, 10, 0.0, 3u},
                                           PatchCase{kTetgen, 10, 0.3, 3u}),
                         case_name);

}  // namespace
}  // namespace sharpey::testing
