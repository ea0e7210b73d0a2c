// Finite elements on a multi-rooted tooth (build_multi_root_mesh, coarse sizes): equilibrium, and
// the CRes of a healthy mandibular first molar with a stiff tooth and bone against the thin-layer
// estimate over the same tooth (derived: the thin layer is the idealisation the finite-element
// model tends to when tooth and bone are far stiffer than the ligament; on single roots the two
// agree within 1.5 points of the embedded length, test_cres_teeth.cpp).
#include <gtest/gtest.h>

#include <iostream>

#include "sharpey/analysis/multi_root_fe.h"

namespace sharpey::analysis {
namespace {

TEST(MultiRootFe, HealthyMolarCresAgreesWithTheThinLayer) {
  const mesh::MultiRootTooth tooth =
      mesh::multi_root_handbook(mesh::MultiRootType::kMandibularFirstMolar);
  const mesh::MultiRootBone bone;
  const mesh::MultiRootMesh m = mesh::build_multi_root_mesh(tooth, bone);
  const fem::Material stiff{1e5, 0.3}, pdl{0.47, 0.45};
  const MultiRootFeCres fe = multi_root_fe_cres(m, stiff, pdl, stiff, tooth.trunk_length_mm);
  const MultiRootThinLayer thin(tooth, bone, pdl);
  const MultiRootCres tx = thin.cres(Eigen::Vector3d::UnitX());
  const MultiRootCres ty = thin.cres(Eigen::Vector3d::UnitY());
  std::cout << "mandibular first molar, " << fe.n_dofs << " dofs: finite-element CRes "
            << fe.buccolingual.below_cej_mm << " (x), " << fe.mesiodistal.below_cej_mm
            << " (y) mm below the CEJ; thin layer " << tx.below_cej_mm << ", " << ty.below_cej_mm
            << "; equilibrium error " << fe.max_equilibrium_error_n << " N; rigid fit rms "
            << fe.max_rigid_fit_rms_um << " um\n";
  // derived: reactions balance the loads.
  EXPECT_LT(fe.max_equilibrium_error_n, 1e-6);
  // derived: the tooth is symmetric about the plane x = 0 (both roots on it), so the line of a
  // mesiodistal force through the CRes lies in that plane. Bound 0.25 mm, widened from the
  // observed 0.145 mm: the triangulations (quad diagonals, the roof, TetGen) and the bone block
  // (lingual plate 2.0 mm, buccal 1.5 mm) are not symmetric.
  std::cout << "  mesiodistal CRes line at x = " << fe.mesiodistal.point_mm.x() << " mm\n";
  EXPECT_NEAR(fe.mesiodistal.point_mm.x(), 0.0, 0.25);
  // Bound 0.3 mm, widened from the observed 0.11 mm for the faceted surfaces and the roof's
  // corners (1.5 points of a 12.5 mm embedded length, the single roots' bound, are 0.19 mm).
  EXPECT_NEAR(fe.buccolingual.below_cej_mm, tx.below_cej_mm, 0.3);
  EXPECT_NEAR(fe.mesiodistal.below_cej_mm, ty.below_cej_mm, 0.3);
}

}  // namespace
}  // namespace sharpey::analysis
