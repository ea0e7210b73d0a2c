// Bone loss on the mesh: the crest sits where it was asked to be, the attachment area falls and
// matches the analytic area of the remaining embedded root, and an angular defect has its depth
// on the named side only. Also: every tooth of the library meshes with and without loss.
#include <gtest/gtest.h>

#include <Eigen/Geometry>
#include <cmath>

#include "sharpey/core/constants.h"
#include "sharpey/mesh/mesh_statistics.h"
#include "sharpey/mesh/tooth_model.h"

namespace sharpey::mesh {
namespace {

using sharpey::core::kPi;

// Highest vertex of the root-surface (attachment) faces whose polar angle lies within `tol` of
// `angle`; over all angles when tol >= pi.
double attachment_top(const VolumeMesh& m, double angle, double tol) {
  double top = -1e300;
  for (int f = 0; f < m.n_faces(); ++f) {
    if (m.face_marker[f] != kRootSurface) continue;
    for (int k = 0; k < 3; ++k) {
      const Eigen::Vector3d& p = m.nodes[m.face(f)[k]];
      const double d = std::remainder(std::atan2(p.y(), p.x()) - angle, 2 * kPi);
      if (std::hypot(p.x(), p.y()) > 1e-9 && std::abs(d) <= tol) top = std::max(top, p.z());
    }
  }
  return top;
}

TEST(BoneLoss, HorizontalLossMovesTheCrestAndShrinksTheAttachment) {
  double previous = 1e300;
  for (double loss : {0.0, 2.0, 4.0, 6.0}) {
    SCOPED_TRACE("horizontal loss " + std::to_string(loss) + " mm");
    ModelSpec spec;
    spec.sizing.preset = MeshPreset::kCoarse;
    spec.loss.horizontal_mm = loss;
    const ToothModel model = build_tooth_model(spec);
    const MeshStatistics s = measure(model.mesh);
    const double crest = -(spec.bone.crest_below_cej_mm + loss);
    EXPECT_NEAR(model.geometry.crest_z_mm, crest, 1e-12);
    EXPECT_NEAR(attachment_top(model.mesh, 0, kPi), crest, 1e-9);
    const double area = s.area_per_marker_mm2.at(kRootSurface);
    EXPECT_NEAR(area, model.geometry.attachment_area_mm2,
                0.02 * model.geometry.attachment_area_mm2);
    EXPECT_LT(area, previous);
    previous = area;
    // The bone top (free bone faces) lies at the crest or within the PDL's slant below it.
    double bone_top = -1e300;
    for (int f = 0; f < model.mesh.n_faces(); ++f)
      if (model.mesh.face_marker[f] == kFreeBone)
        for (int k = 0; k < 3; ++k)
          bone_top = std::max(bone_top, model.mesh.nodes[model.mesh.face(f)[k]].z());
    EXPECT_NEAR(bone_top, crest, 1e-9);
    EXPECT_EQ(s.n_inverted_elements, 0);
  }
}

struct DefectCase {
  ToothSurface surface;
  double angle;  // polar angle of the surface's centre
};
class AngularDefect : public ::testing::TestWithParam<DefectCase> {};

TEST_P(AngularDefect, DepthIsOnTheNamedSide) {
  const DefectCase c = GetParam();
  ModelSpec spec;
  spec.sizing.preset = MeshPreset::kCoarse;
  spec.loss.horizontal_mm = 1;
  spec.loss.defect_depth_mm = 3;
  spec.loss.defect_width_deg = 90;
  spec.loss.defect_surface = c.surface;
  const ToothModel model = build_tooth_model(spec);
  const double crest = model.geometry.crest_z_mm;
  EXPECT_NEAR(attachment_top(model.mesh, c.angle, 1e-6), crest - 3, 1e-9);
  EXPECT_NEAR(attachment_top(model.mesh, c.angle + kPi, 1e-6), crest, 1e-9);
  EXPECT_NEAR(attachment_top(model.mesh, c.angle + kPi / 2, 1e-6), crest, 1e-9);
  // Lowest point of the bone top (upward free-bone faces): at the defect, next to the root.
  double lowest = 1e300;
  Eigen::Vector3d where = Eigen::Vector3d::Zero();
  for (int f = 0; f < model.mesh.n_faces(); ++f) {
    if (model.mesh.face_marker[f] != kFreeBone) continue;
    const int* v = model.mesh.face(f);
    const Eigen::Vector3d n = (model.mesh.nodes[v[1]] - model.mesh.nodes[v[0]])
                                  .cross(model.mesh.nodes[v[2]] - model.mesh.nodes[v[0]]);
    if (n.z() <= 0.5 * n.norm()) continue;
    for (int k = 0; k < 3; ++k) {
      const Eigen::Vector3d& p = model.mesh.nodes[model.mesh.face(f)[k]];
      if (p.z() < lowest) lowest = p.z(), where = p;
    }
  }
  EXPECT_NEAR(lowest, crest - 3, 0.1);
  EXPECT_LT(std::abs(std::remainder(std::atan2(where.y(), where.x()) - c.angle, 2 * kPi)), 0.2);
  const MeshStatistics s = measure(model.mesh);
  EXPECT_EQ(s.n_inverted_elements, 0);
  EXPECT_NEAR(s.area_per_marker_mm2.at(kRootSurface), model.geometry.attachment_area_mm2,
              0.02 * model.geometry.attachment_area_mm2);
  EXPECT_NEAR(
      s.volume_per_region_mm3.at(kCorticalBone) + s.volume_per_region_mm3.at(kCancellousBone),
      model.geometry.bone_volume_mm3, 0.01 * model.geometry.bone_volume_mm3);
}

INSTANTIATE_TEST_SUITE_P(Surfaces, AngularDefect,
                         ::testing::Values(DefectCase{ToothSurface::kMesial, kPi / 2},
                                           DefectCase{ToothSurface::kDistal, -kPi / 2},
                                           DefectCase{ToothSurface::kLabial, 0},
                                           DefectCase{ToothSurface::kLingual, kPi}),
                         [](const ::testing::TestParamInfo<DefectCase>& p) {
                           return to_string(p.param.surface);
                         });

class EveryTooth : public ::testing::TestWithParam<ToothType> {};

TEST_P(EveryTooth, MeshesHealthyAndWithLoss) {
  ModelSpec spec;
  spec.tooth.type = GetParam();
  spec.tooth.dimensions = handbook_dimensions(GetParam());
  spec.sizing.preset = MeshPreset::kCoarse;
  for (double loss : {0.0, 4.0}) {
    SCOPED_TRACE("loss " + std::to_string(loss));
    spec.loss.horizontal_mm = loss;
    const ToothModel model = build_tooth_model(spec);
    const MeshStatistics s = measure(model.mesh);
    EXPECT_EQ(s.n_inverted_elements, 0);
    EXPECT_GT(s.min_jacobian_ratio, 0.0);
    EXPECT_NEAR(s.volume_per_region_mm3.at(kPdl), model.geometry.pdl_volume_mm3,
                0.01 * model.geometry.pdl_volume_mm3);
    EXPECT_NEAR(s.volume_per_region_mm3.at(kTooth), model.geometry.tooth_volume_mm3,
                0.01 * model.geometry.tooth_volume_mm3);
  }
}

INSTANTIATE_TEST_SUITE_P(Library, EveryTooth, ::testing::ValuesIn(all_tooth_types()),
                         [](const ::testing::TestParamInfo<ToothType>& p) {
                           return to_string(p.param);
                         });

}  // namespace
}  // namespace sharpey::mesh
