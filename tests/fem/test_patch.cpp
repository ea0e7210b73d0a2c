// Patch tests on distorted structured meshes (source: Irons & Razzaque 1972, citation from memory,
// the patch test for finite elements; common practice; check-values.md section 10 item 5). A field
// the element space contains must be reproduced to 1e-10 relative (round-off):
//  - linear displacement with its boundary values prescribed (4- and 10-node),
//  - constant stress with the matching tractions on all six sides and only rigid-body supports
//    (4- and 10-node),
//  - quadratic displacement with its boundary values and the consistent constant body force
//    (10-node only).
// Meshes: a 4 x 4 x 4-cell grid of the box, interior vertices jittered by up to 35-40 % of the
// local spacing, two regions with the same material. The TetGen meshes are in
// test_patch_tetgen.cpp.
#include <gtest/gtest.h>

#include <iostream>
#include <string>

#include "support/patch_checks.h"

namespace sharpey::testing {
namespace {

constexpr double kTolerance = 1e-10;  // relative, the acceptance bound

struct PatchCase {
  int nodes_per_element;
  double jitter;
  unsigned seed;
};
std::string case_name(const ::testing::TestParamInfo<PatchCase>& param_info) {
  return "k" + std::to_string(param_info.param.nodes_per_element) + "_jitter" +
         std::to_string(static_cast<int>(100 * param_info.param.jitter)) + "_seed" +
         std::to_string(param_info.param.seed);
}

mesh::VolumeMesh distorted_box(const PatchCase& c) {
  mesh::VolumeMesh m = grid_mesh(
      4, 4, 4, c.nodes_per_element,
      [](const Eigen::Vector3d& p) -> Eigen::Vector3d { return p.cwiseProduct(kPatchBox); },
      [](const Eigen::Vector3d& centre) { return centre.x() < 0.5 ? 1 : 2; });
  jitter_nodes(m, c.jitter, c.seed);
  return m;
}

class Patch : public ::testing::TestWithParam<PatchCase> {};

TEST_P(Patch, LinearDisplacementFromBoundaryValues) {
  const PatchErrors e = linear_dirichlet_patch(distorted_box(GetParam()));
  std::cout << "[patch grid linear Dirichlet] nodal " << e.nodal << ", quadrature stress "
            << e.stress << "\n";
  RecordProperty("nodal_error", std::to_string(e.nodal));
  EXPECT_LT(e.nodal, kTolerance);
  EXPECT_LT(e.stress, kTolerance);
}

TEST_P(Patch, ConstantStressFromTractions) {
  const PatchErrors e = constant_stress_patch(distorted_box(GetParam()));
  std::cout << "[patch grid constant stress] nodal " << e.nodal << ", recovered stress " << e.stress
            << "\n";
  RecordProperty("nodal_error", std::to_string(e.nodal));
  EXPECT_LT(e.nodal, kTolerance);
  EXPECT_LT(e.stress, kTolerance);
}

// Quadratic fields: 10-node elements only (linear elements cannot represent them).
class QuadraticPatch : public ::testing::TestWithParam<PatchCase> {};

TEST_P(QuadraticPatch, QuadraticDisplacementWithBodyForce) {
  const PatchErrors e = quadratic_body_force_patch(distorted_box(GetParam()));
  std::cout << "[patch grid quadratic] nodal " << e.nodal
            << " (without the body force: " << e.stress << ")\n";
  RecordProperty("nodal_error", std::to_string(e.nodal));
  EXPECT_LT(e.nodal, kTolerance);
  EXPECT_GT(e.stress, 1e-4);
}

INSTANTIATE_TEST_SUITE_P(Distorted, Patch,
                         ::testing::Values(PatchCase{4, 0.0, 1u}, PatchCase{4, 0.35, 1u},
                                           PatchCase{4, 0.4, 7u}, PatchCase{10, 0.0, 1u},
                                           PatchCase{10, 0.35, 1u}, PatchCase{10, 0.4, 7u}),
                         case_name);
INSTANTIATE_TEST_SUITE_P(Distorted, QuadraticPatch,
                         ::testing::Values(PatchCase{10, 0.0, 1u}, PatchCase{10, 0.35, 1u},
                                           PatchCase{10, 0.4, 7u}),
                         case_name);

}  // namespace
}  // namespace sharpey::testing
