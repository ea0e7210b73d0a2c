// Finite elements on a multi-rooted tooth (build_multi_root_mesh, coarse sizes): equilibrium, the
// CRes of the healthy molars with a stiff tooth and bone against the thin-layer estimate over the
// same tooth (derived: the thin layer is the idealisation the finite-element model tends to when
// tooth and bone are far stiffer than the ligament; on single roots the two agree within 1.5
// points of the embedded length, test_cres_teeth.cpp), and two parallel cylinders. The shift with
// loss: test_multi_root_fe_loss.cpp.
#include <gtest/gtest.h>

#include <iostream>

#include "sharpey/analysis/multi_root_fe.h"

namespace sharpey::analysis {
namespace {

class HealthyMolarFe : public ::testing::TestWithParam<mesh::MultiRootType> {};

TEST_P(HealthyMolarFe, CresAgreesWithTheThinLayerNearTheFurcation) {
  const mesh::MultiRootTooth tooth = mesh::multi_root_handbook(GetParam());
  const mesh::MultiRootBone bone;
  const mesh::MultiRootMesh m = mesh::build_multi_root_mesh(tooth, bone);
  const fem::Material stiff{1e5, 0.3}, pdl{0.47, 0.45};
  const MultiRootFeCres fe = multi_root_fe_cres(m, stiff, pdl, stiff, tooth.trunk_length_mm);
  const MultiRootThinLayer thin(tooth, bone, pdl);
  const MultiRootCres tx = thin.cres(Eigen::Vector3d::UnitX());
  const MultiRootCres ty = thin.cres(Eigen::Vector3d::UnitY());
  std::cout << mesh::to_string(GetParam()) << ", " << fe.n_dofs << " dofs: finite-element CRes "
            << fe.buccolingual.below_cej_mm << " (x), " << fe.mesiodistal.below_cej_mm
            << " (y) mm below the CEJ (" << fe.buccolingual.below_furcation_mm << ", "
            << fe.mesiodistal.below_furcation_mm << " below the furcation plane); thin layer "
            << tx.below_cej_mm << ", " << ty.below_cej_mm << "; equilibrium error "
            << fe.max_equilibrium_error_n << " N\n";
  // derived: reactions balance the loads.
  EXPECT_LT(fe.max_equilibrium_error_n, 1e-6);
  // Bound 0.3 mm, widened from the largest difference observed over the four molars (see
  // docs/molars.md) for the faceted surfaces and the roof's corners (1.5 points of a 12.5 mm
  // embedded length, the single roots' bound, are 0.19 mm).
  EXPECT_NEAR(fe.buccolingual.below_cej_mm, tx.below_cej_mm, 0.3);
  EXPECT_NEAR(fe.mesiodistal.below_cej_mm, ty.below_cej_mm, 0.3);
  // common practice (check-values.md section 11): near the furcation, a little apical to it;
  // the bound of test_multi_root_thin_layer.cpp (apical, less than 5 mm).
  EXPECT_GT(fe.buccolingual.below_furcation_mm, 0.0);
  EXPECT_LT(fe.mesiodistal.below_furcation_mm, 5.0);
  if (GetParam() == mesh::MultiRootType::kMandibularFirstMolar) {
    // derived: symmetric about the plane x = 0 (both roots on it), so the line of a mesiodistal
    // force through the CRes lies in that plane. Bound 0.25 mm, widened from the observed
    // 0.145 mm: the triangulations and the bone block (lingual plate 2.0 mm, buccal 1.5 mm) are
    // not symmetric.
    EXPECT_NEAR(fe.mesiodistal.point_mm.x(), 0.0, 0.25);
  }
}

INSTANTIATE_TEST_SUITE_P(Teeth, HealthyMolarFe,
                         ::testing::Values(mesh::MultiRootType::kMandibularFirstMolar,
                                           mesh::MultiRootType::kMandibularSecondMolar,
                                           mesh::MultiRootType::kMaxillaryFirstMolar,
                                           mesh::MultiRootType::kMaxillarySecondMolar),
                         [](const ::testing::TestParamInfo<mesh::MultiRootType>& p) {
                           return mesh::to_string(p.param);
                         });

// Cylinders of radius 1.5 mm and length 10 mm at the given y on a trunk; the crest level through
// the furcation, 2 mm below its plane: only the cylinders are attached.
mesh::MultiRootTooth cylinders(const std::vector<double>& ys) {
  mesh::MultiRootTooth t;
  t.trunk_length_mm = 3;
  t.cervix_half_x_mm = t.cervix_half_y_mm = 5;
  t.furcation_half_x_mm = t.furcation_half_y_mm = 4.5;
  for (double y : ys) {
    mesh::RootSpec r;
    r.name = "cylinder";
    r.profile = mesh::RootProfile::kCylinder;
    r.half_x_mm = r.half_y_mm = 1.5;
    r.length_mm = 10;
    r.foot_y_mm = y;
    t.roots.push_back(r);
  }
  return t;
}

TEST(MultiRootFe, TwoParallelCylindersHaveTheirCresMidwayAtTheSingleCylindersDepth) {
  // derived: two identical parallel roots joined by a rigid trunk resist like two copies of one
  // root (the bone, 2e5 times stiffer than the ligament, barely couples them), so the CRes lies
  // midway between them at the single root's depth; the thin-layer closed form for the cylinder
  // (test_multi_root_thin_layer.cpp) puts it 9.06 mm below the CEJ.
  mesh::MultiRootBone bone;
  bone.loss.horizontal_mm = 3.5;  // crest 5 mm below the CEJ
  bone.septum_to_roof = false;
  const fem::Material stiff{1e5, 0.3}, pdl{0.47, 0.45};
  const MultiRootFeCres one = multi_root_fe_cres(
      mesh::build_multi_root_mesh(cylinders({0.0}), bone), stiff, pdl, stiff, 3.0);
  const MultiRootFeCres two = multi_root_fe_cres(
      mesh::build_multi_root_mesh(cylinders({2.2, -2.2}), bone), stiff, pdl, stiff, 3.0);
  std::cout << "one cylinder: CRes " << one.buccolingual.below_cej_mm << " (x), "
            << one.mesiodistal.below_cej_mm << " (y) mm below the CEJ; two cylinders "
            << two.buccolingual.below_cej_mm << " (x), " << two.mesiodistal.below_cej_mm
            << " (y), x-force line at y = " << two.buccolingual.point_mm.y() << " mm\n";
  EXPECT_LT(two.max_equilibrium_error_n, 1e-6);
  // Midway: bound 0.2 mm, widened from the observed 0.12 mm (3 % of the 4.4 mm between the
  // roots): the two roots' triangulations (quad diagonals, TetGen's bone) are not mirror images.
  EXPECT_NEAR(two.buccolingual.point_mm.y(), 0.0, 0.2);
  // Same depth: bound 0.1 mm (observed 0.02 mm; the two meshes differ).
  EXPECT_NEAR(two.buccolingual.below_cej_mm, one.buccolingual.below_cej_mm, 0.1);
  EXPECT_NEAR(two.mesiodistal.below_cej_mm, one.mesiodistal.below_cej_mm, 0.1);
  // Against the thin-layer closed form (derived), within 2 % of the 8 mm embedded length.
  EXPECT_NEAR(one.buccolingual.below_cej_mm, 9.06, 0.16);
}

}  // namespace
}  // namespace sharpey::analysis
