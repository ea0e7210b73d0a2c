// The Study / ScenarioSolution / evaluate interface on a coarse incisor: bad input, cancellation,
// progress, consistency with a direct solve, and the bookkeeping of the reported quantities.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <memory>

#include "sharpey/analysis/detail/rigid_motion.h"
#include "sharpey/analysis/study.h"
#include "sharpey/error.h"
#include "test_study_cases.h"

namespace sharpey::analysis {
namespace {

using testing::incisor_case;
using testing::lingual_g;

TEST(StudyInput, NoScenarioIsAnInputError) {
  CaseSpec spec = incisor_case(mesh::MeshPreset::kCoarse, {});
  try {
    Study study(spec);
    FAIL() << "no error";
  } catch (const InputError& e) {
    EXPECT_EQ(e.key(), "scenarios");
  }
  spec = incisor_case(mesh::MeshPreset::kCoarse, {0});
  EXPECT_THROW(ScenarioSolution(spec, 3, {}, nullptr), InputError);
}

TEST(StudyInput, CancelBeforeAndDuringTheWork) {
  const CaseSpec spec = incisor_case(mesh::MeshPreset::kCoarse, {0, 2});
  std::atomic<bool> cancel{true};
  EXPECT_THROW(Study(spec, {}, &cancel), Cancelled);
  cancel = false;
  // The user presses cancel while the first scenario is factorised.
  const auto progress = [&cancel](const std::string& stage, double) {
    if (stage.find("factorise") != std::string::npos) cancel = true;
  };
  EXPECT_THROW(Study(spec, progress, &cancel), Cancelled);
}

class StudyOnCoarseIncisor : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    // Scenarios deliberately not ordered by loss: the healthy reference is found, not assumed.
    study_ = std::make_unique<Study>(
        incisor_case(mesh::MeshPreset::kCoarse, {4, 0}),
        [](const std::string& stage, double fraction) { progress_.emplace_back(stage, fraction); });
  }
  static void TearDownTestSuite() { study_.reset(); }
  static std::unique_ptr<Study> study_;
  static std::vector<std::pair<std::string, double>> progress_;
};
std::unique_ptr<Study> StudyOnCoarseIncisor::study_;
std::vector<std::pair<std::string, double>> StudyOnCoarseIncisor::progress_;

TEST_F(StudyOnCoarseIncisor, ProgressAndHealthyReference) {
  ASSERT_FALSE(progress_.empty());
  double last = 0;
  for (const auto& [stage, fraction] : progress_) {
    EXPECT_GE(fraction, last) << stage;
    EXPECT_LE(fraction, 1.0);
    last = fraction;
  }
  EXPECT_EQ(progress_.back().second, 1.0);
  EXPECT_EQ(study_->healthy_index(), 1);
  const auto r = study_->evaluate(lingual_g(100, MovementPreset::kTranslation));
  ASSERT_EQ(r.size(), 2u);
  EXPECT_EQ(r[1].name, "healthy");
  EXPECT_NEAR(r[1].equivalent_force_peak_g, 100, 1e-9);
  EXPECT_NEAR(r[1].equivalent_force_area_rule_g, 100, 1e-9);
  EXPECT_LT(r[0].equivalent_force_peak_g, 100);
}

// Two independent computations: evaluate() (superposed unit cases, rigid-fit bookkeeping) against
// a direct solve of the resolved force system distributed over the bracket pad.
TEST_F(StudyOnCoarseIncisor, AgreesWithADirectSolve) {
  const ScenarioSolution& s = *study_->solutions()[1];
  LoadSpec load = lingual_g(80, MovementPreset::kControlledTipping);
  load.direction = Eigen::Vector3d(-1, 0.3, -0.2);
  const ScenarioResult r = evaluate(s, load, default_thresholds(), nullptr);
  const mesh::VolumeMesh& m = s.model().mesh;
  const Eigen::VectorXd f = fem::patch_load(m, mesh::kBracketPad, r.load.force_n, r.load.moment_nmm,
                                            s.model().geometry.bracket_center);
  // The Study released its factor; a fresh solver is the independent computation.
  EXPECT_FALSE(s.has_solver());
  EXPECT_THROW(s.solver(), Error);
  EXPECT_GT(s.solver_statistics().n_dofs, 0);
  const fem::LinearElasticSolver solver(m, s.materials(), fem::fix_faces(m, mesh::kFixedBone));
  const Eigen::VectorXd u = solver.solve(f);
  const fem::RegionField field = fem::recover_region(m, s.materials(), u, mesh::kPdl);
  ASSERT_EQ(field.nodes, s.pdl_nodes());
  ASSERT_EQ(r.pressure_kpa.size(), s.pdl_nodes().size());
  ASSERT_EQ(r.displacement_mm.cols(), m.n_nodes());
  const double u_scale = u.cwiseAbs().maxCoeff();
  for (int i = 0; i < m.n_nodes(); i += 13) {
    EXPECT_NEAR((r.displacement_mm.col(i) - u.segment<3>(3 * i)).norm(), 0, 1e-9 * u_scale);
  }
  double p_max = 0;
  for (Eigen::Index i = 0; i < field.stress_mpa.cols(); ++i) {
    const double p = fem::hydrostatic_pressure_kpa(field.stress_mpa.col(i));
    EXPECT_NEAR(r.pressure_kpa[static_cast<size_t>(i)], p, 1e-9 * r.pressure_max_compression_kpa);
    p_max = std::max(p_max, p);
  }
  EXPECT_NEAR(r.pressure_max_compression_kpa, p_max, 1e-9 * p_max);
  // The crown tip's displacement is the embedded root's rigid motion carried to the tip: the same
  // fit of the direct solve's field gives the same value (two computations: superposed unit-case
  // fits against one fit of the combined field; exact by linearity, round-off tolerance).
  const detail::RigidMotion direct_fit =
      detail::fit_rigid_motion(m.nodes, u, s.embedded_root_nodes());
  const Eigen::Vector3d tip_rigid_um =
      1000.0 * direct_fit.displacement_at(s.model().geometry.crown_tip);
  EXPECT_NEAR((r.crown_tip_displacement_um - tip_rigid_um).norm(), 0,
              1e-6 * r.crown_tip_displacement_um.norm());
  // Against the field at the nearest tooth node: the crown's own bending (not in the rigid motion)
  // and the node's distance from the tip make up the difference. Observed here: 6.5 % of the
  // tip's displacement; bound 15 % (observed, a regression guard: a wrong fit set, e.g. the crown
  // only, or a sign error gives tens of percent).
  int nearest = -1;
  double best = 1e300;
  for (int e = 0; e < m.n_elements(); ++e) {
    if (m.element_region[static_cast<size_t>(e)] != mesh::kTooth) continue;
    for (int k = 0; k < m.nodes_per_element; ++k) {
      const int i = m.element(e)[k];
      const double d = (m.nodes[static_cast<size_t>(i)] - s.model().geometry.crown_tip).norm();
      if (d < best) {
        best = d;
        nearest = i;
      }
    }
  }
  const Eigen::Vector3d tip_node_um = 1000.0 * u.segment<3>(3 * nearest);
  const double bending = (r.crown_tip_displacement_um - tip_node_um).norm();
  std::printf(
      "crown tip: rigid motion of the root %.4f um, nearest node (%.3f mm away) %.4f um, "
      "difference %.1f %%\n",
      r.crown_tip_displacement_um.norm(), best, tip_node_um.norm(),
      100 * bending / r.crown_tip_displacement_um.norm());
  EXPECT_LT(bending, 0.15 * r.crown_tip_displacement_um.norm() +
                         1000.0 * best * r.rotation_deg.norm() * M_PI / 180);
}

// The embedded root is nearly rigid: the fitted rigid motion explains its displacement.
TEST_F(StudyOnCoarseIncisor, ToothMovesRigidly) {
  for (const auto& s : study_->solutions()) {
    const ScenarioResult r = evaluate(*s, lingual_g(100, MovementPreset::kUncontrolledTipping),
                                      default_thresholds(), nullptr);
    EXPECT_LT(r.rigid_fit_rms_um, 0.05 * r.crown_tip_displacement_um.norm());
    EXPECT_LT(r.crown_tip_displacement_um.x(), 0);  // lingual force: crown moves lingually
    // Derived: a single force tips the root about a centre of rotation apical to the CRes (which
    // lies in the root's cervical half), so the crown tip, further from that centre, moves more
    // than the apex.
    EXPECT_GT(std::abs(r.crown_tip_displacement_um.x()), std::abs(r.apex_displacement_um.x()));
    EXPECT_GT(r.apex_displacement_um.x(), 0);  // tipping about a point below the CRes
    EXPECT_LT(r.rotation_deg.y(), 0);  // crown lingual, apex labial: negative rotation about y
  }
}

// Derived: the root-surface area integrated on the mesh matches the parametric attachment area
// (within 2 %, the mesher's own acceptance), and the threshold areas are consistent.
TEST_F(StudyOnCoarseIncisor, AreasAndThresholds) {
  for (const auto& s : study_->solutions()) {
    SCOPED_TRACE(s->scenario().name);
    const double analytic = s->model().geometry.attachment_area_mm2;
    EXPECT_NEAR(s->attachment_area_mm2(), analytic, 0.02 * analytic);
    Thresholds t = default_thresholds();
    const LoadSpec load = lingual_g(100, MovementPreset::kUncontrolledTipping);
    ScenarioResult r = evaluate(*s, load, t, nullptr);
    EXPECT_GT(r.area_above_capillary_mm2, 0);
    EXPECT_GE(r.area_above_capillary_mm2, r.area_above_limit_mm2);
    EXPECT_NEAR(r.area_above_capillary_percent,
                100 * r.area_above_capillary_mm2 / r.attachment_area_mm2, 1e-9);
    EXPECT_LE(r.area_above_capillary_mm2, r.attachment_area_mm2);
    // A threshold above every value leaves no area; a very negative one covers the whole surface.
    t.limit.value_kpa = r.pressure_max_compression_kpa * 1.5;
    t.capillary.value_kpa = -1e6;
    r = evaluate(*s, load, t, nullptr);
    EXPECT_EQ(r.area_above_limit_mm2, 0.0);
    EXPECT_NEAR(r.area_above_capillary_mm2, r.attachment_area_mm2, 1e-9 * r.attachment_area_mm2);
    // 5 % of the attachment area lies above the 95th percentile.
    t.limit.value_kpa = r.pressure_p95_compression_kpa;
    r = evaluate(*s, load, t, nullptr);
    EXPECT_NEAR(r.area_above_limit_percent, 5.0, 1e-3);
  }
}

// Root map: NaN above the crest, covered below it, values within the range of the root-surface
// pressures.
TEST_F(StudyOnCoarseIncisor, RootMapLayout) {
  for (const auto& s : study_->solutions()) {
    SCOPED_TRACE(s->scenario().name);
    const ScenarioResult r = evaluate(*s, lingual_g(100, MovementPreset::kUncontrolledTipping),
                                      default_thresholds(), nullptr);
    const RootMap& map = r.root_map;
    ASSERT_EQ(map.n_angle, 72);
    ASSERT_EQ(map.n_depth, 60);
    ASSERT_EQ(map.pressure_kpa.size(), 72u * 60u);
    EXPECT_EQ(map.depth_min_mm, 0.0);
    EXPECT_NEAR(map.depth_max_mm, -s->model().geometry.apex_z_mm, 1e-12);
    const double crest_depth = -s->model().geometry.crest_z_mm;
    const double dd = (map.depth_max_mm - map.depth_min_mm) / map.n_depth;
    int covered = 0, below = 0;
    for (int i = 0; i < map.n_depth; ++i) {
      const double depth = (i + 0.5) * dd;
      for (int j = 0; j < map.n_angle; ++j) {
        const double v = map.pressure_kpa[static_cast<size_t>(i * map.n_angle + j)];
        if (depth < crest_depth - 1e-9) {
          EXPECT_TRUE(std::isnan(v)) << "row " << i << " above the crest";
        } else if (depth > crest_depth + dd && depth < map.depth_max_mm - dd) {
          ++below;
          if (!std::isnan(v)) {
            ++covered;
            EXPECT_LE(v, 1.05 * r.pressure_max_compression_kpa);
            EXPECT_GE(v, -1.05 * r.pressure_max_tension_kpa);
          }
        }
      }
    }
    EXPECT_EQ(covered, below);
    // Lingual force, tipping: the labial side (angle 0) near the crest is in tension and the
    // lingual side (180) in compression.
    const int row = static_cast<int>((crest_depth + 1.0) / dd);
    EXPECT_LT(map.pressure_kpa[static_cast<size_t>(row * 72 + 0)], 0);
    EXPECT_GT(map.pressure_kpa[static_cast<size_t>(row * 72 + 36)], 0);
  }
}

// Centre of rotation: below the CRes for a single force, none for translation and rotation.
TEST_F(StudyOnCoarseIncisor, CentreOfRotation) {
  const ScenarioSolution& s = *study_->solutions()[1];
  const Thresholds t = default_thresholds();
  const ScenarioResult tip =
      evaluate(s, lingual_g(100, MovementPreset::kUncontrolledTipping), t, nullptr);
  ASSERT_TRUE(tip.centre_of_rotation_defined);
  EXPECT_LT(tip.centre_of_rotation.z(), s.cres_labiolingual().point.z());
  EXPECT_GT(tip.centre_of_rotation.z(), s.model().geometry.apex_z_mm);
  const ScenarioResult ct =
      evaluate(s, lingual_g(100, MovementPreset::kControlledTipping), t, nullptr);
  ASSERT_TRUE(ct.centre_of_rotation_defined);
  // Up to the small turn the asymmetric mesh adds out of the force's plane.
  EXPECT_NEAR(ct.centre_of_rotation.z(), s.model().geometry.apex_z_mm, 1e-3);
  const ScenarioResult tr = evaluate(s, lingual_g(100, MovementPreset::kTranslation), t, nullptr);
  EXPECT_FALSE(tr.centre_of_rotation_defined);
  EXPECT_TRUE(std::isnan(tr.centre_of_rotation.z()));
  EXPECT_LT(tr.rotation_deg.norm(), 1e-9);
  const ScenarioResult rot = evaluate(s, lingual_g(100, MovementPreset::kRotation), t, nullptr);
  EXPECT_EQ(rot.load.force_n, Eigen::Vector3d::Zero());
  EXPECT_GT(std::abs(rot.rotation_deg.z()), 10 * rot.rotation_deg.head<2>().norm());
}

}  // namespace
}  // namespace sharpey::analysis
