// Acceptance 1: centre of resistance of idealised roots in a thin uniform PDL with a stiff tooth
// and bone, against thin-layer (Winkler) theory.
//
// Thin-layer theory (derived, check-values.md section 7): a rigid root in a thin layer whose
// stiffness per unit depth is proportional to the local radius has its CRes at the radius-weighted
// mean depth: L/2 for a cylinder, L/3 for a cone, 2L/5 for a paraboloid, from the crest over the
// embedded length L. The mesher's roots differ slightly from those ideal shapes (the cylinder is
// closed by a half-ellipsoid, the cone's tip is rounded, the paraboloid's apex too: see
// mesh/tooth_model.h), so the test also derives the thin-layer CRes for the exact shape built:
// springs on the true root surface (from mesh::root_section) with normal stiffness
// (lambda + 2 mu) / w and shear stiffness mu / w per unit area (a thin layer of width w), and
// checks the finite-element CRes against both.
#include <gtest/gtest.h>

#include <algorithm>
#include <cstdio>
#include <string>

#include "sharpey/analysis/study.h"
#include "support/thin_layer.h"
#include "test_study_cases.h"

namespace sharpey::analysis {
namespace {

struct IdealCase {
  mesh::IdealRoot root;
  const char* name;
  double ideal_fraction;  // thin-layer theory for the ideal shape, from the crest over L
};

std::ostream& operator<<(std::ostream& os, const IdealCase& c) { return os << c.name; }

CaseSpec ideal_case(mesh::IdealRoot root) {
  CaseSpec spec;
  spec.label = "invented verification case: idealised root in a thin uniform PDL";
  spec.model.tooth.ideal_root = root;
  spec.model.tooth.ideal_radius_mm = 3.0;
  spec.model.tooth.ideal_length_mm = 12.0;
  spec.model.sizing.preset = mesh::MeshPreset::kCoarse;
  // Tooth and bone far stiffer than the PDL (2e5 times): the thin-layer idealisation.
  spec.tooth_material = {1e5, 0.3};
  spec.cortical_material = {1e5, 0.3};
  spec.cancellous_material = {1e5, 0.3};
  Scenario s;
  s.name = "healthy";
  spec.scenarios.push_back(s);
  return spec;
}

class IdealRootCres : public ::testing::TestWithParam<IdealCase> {};

TEST_P(IdealRootCres, MatchesThinLayerTheory) {
  const IdealCase c = GetParam();
  const CaseSpec spec = ideal_case(c.root);
  const ScenarioSolution s(spec, 0, {}, nullptr);
  const mesh::ModelGeometry& g = s.model().geometry;
  const double L = g.embedded_length_mm;
  ASSERT_GT(L, 0);
  const double fe = s.cres_labiolingual().fraction_embedded;
  const double fe_y = s.cres_mesiodistal().fraction_embedded;
  // Derived: the thin-layer CRes of the shape actually built (support/thin_layer.h).
  const double exact_shape =
      test::thin_layer_fractions(s.model().spec, spec.pdl_material, g.crest_z_mm, g.apex_z_mm).x;
  RecordProperty("cres_fraction_fe", std::to_string(fe));
  RecordProperty("cres_fraction_thin_layer_exact_shape", std::to_string(exact_shape));
  std::cout << c.name << ": FE CRes " << fe << " (x) " << fe_y << " (y) of L = " << L
            << " mm; thin layer, exact shape " << exact_shape << "; ideal " << c.ideal_fraction
            << "\n";
  // Acceptance: within 5 % of the embedded length of the ideal-shape value (derived).
  EXPECT_NEAR(fe, c.ideal_fraction, 0.05);
  EXPECT_NEAR(fe_y, c.ideal_fraction, 0.05);
  // Closer agreement with the thin-layer value of the shape actually built (derived).
  EXPECT_NEAR(fe, exact_shape, 0.02);
  // Axisymmetric root: both directions agree (the bone block is not axisymmetric, hence 2 %).
  EXPECT_NEAR(fe, fe_y, 0.02);
}

INSTANTIATE_TEST_SUITE_P(
    Roots, IdealRootCres,
    ::testing::Values(IdealCase{mesh::IdealRoot::kCylinder, "cylinder", 1.0 / 2.0},
                      IdealCase{mesh::IdealRoot::kCone, "cone", 1.0 / 3.0},
                      IdealCase{mesh::IdealRoot::kParaboloid, "paraboloid", 2.0 / 5.0}),
    [](const ::testing::TestParamInfo<IdealCase>& p) { return std::string(p.param.name); });

// An idealised cylinder root (radius 2.5 mm, 15 mm below the CEJ) with the default materials
// (dentine tooth, cortical and cancellous bone): the tooth now bends a little, so the centre of
// resistance comes from the rigid motion fitted to the embedded root only
// (ScenarioSolution::embedded_root_nodes()). Fitted over the whole tooth, crown bending moved it
// to 0.453 L against 0.484 L with a very stiff tooth (thin-layer theory: 0.487 for the built
// shape).
CaseSpec cylinder_with_default_materials(double loss_mm) {
  CaseSpec spec;
  spec.label = "invented verification case: cylinder root, default materials";
  spec.model.tooth.ideal_root = mesh::IdealRoot::kCylinder;
  spec.model.tooth.ideal_radius_mm = 2.5;
  spec.model.tooth.ideal_length_mm = 15.0;
  spec.model.sizing.preset = mesh::MeshPreset::kCoarse;
  Scenario s;
  s.name = std::to_string(static_cast<int>(loss_mm)) + " mm loss";
  s.loss.horizontal_mm = loss_mm;
  spec.scenarios.push_back(s);
  return spec;
}

class CylinderCresWithDentine : public ::testing::TestWithParam<double> {};

// Derived: within 0.02 L of the thin-layer CRes of the shape built (support/thin_layer.h), at
// each bone level (the acceptance figure; the stiff-tooth test above meets the same 0.02).
TEST_P(CylinderCresWithDentine, WithinTwoPercentOfThinLayerAtEachBoneLevel) {
  const CaseSpec spec = cylinder_with_default_materials(GetParam());
  const ScenarioSolution s(spec, 0, {}, nullptr);
  const mesh::ModelGeometry& g = s.model().geometry;
  const double thin_layer =
      test::thin_layer_fractions(s.model().spec, spec.pdl_material, g.crest_z_mm, g.apex_z_mm).x;
  const double fe = s.cres_labiolingual().fraction_embedded;
  std::printf("cylinder, %.0f mm loss: FE CRes %.4f L (x), %.4f L (y); thin layer %.4f L\n",
              GetParam(), fe, s.cres_mesiodistal().fraction_embedded, thin_layer);
  EXPECT_NEAR(fe, thin_layer, 0.02);
  EXPECT_NEAR(s.cres_mesiodistal().fraction_embedded, thin_layer, 0.02);
}

INSTANTIATE_TEST_SUITE_P(Losses, CylinderCresWithDentine, ::testing::Values(0.0, 3.0, 6.0),
                         [](const ::testing::TestParamInfo<double>& p) {
                           return std::to_string(static_cast<int>(p.param)) + "mm";
                         });

// Derived (rigid root; check-values.md section 9, Naegerl et al. 1991): for a single horizontal
// force, the distance from the CRes to the line of force (a) times the distance from the CRes to
// the centre of rotation (b) is the same for every height of the force. Within 3 % over
// application heights 2 to 8 mm above the CEJ (the acceptance figure); fitted over the
// whole tooth it drifted 11 %.
TEST(CylinderCresWithDentine, CentreOfRotationProductConstantOverApplicationHeights) {
  const CaseSpec spec = cylinder_with_default_materials(0.0);
  const ScenarioSolution s(spec, 0, {}, nullptr);
  const double z_cres = s.cres_labiolingual().point.z();
  const double L = s.model().geometry.embedded_length_mm;
  double lo = 1e300, hi = -1e300;
  for (double height : {2.0, 4.0, 6.0, 8.0}) {
    LoadSpec load = testing::lingual_g(100, MovementPreset::kNone);
    load.bracket_height_mm = height;
    const ScenarioResult r = evaluate(s, load, spec.thresholds, nullptr);
    ASSERT_TRUE(r.centre_of_rotation_defined) << "height " << height;
    const double a = r.load.application_point.z() - z_cres;
    const double b = z_cres - r.centre_of_rotation.z();
    std::printf(
        "force %.0f mm above the CEJ: a %.3f mm, b %.3f mm, a b %.4f mm^2 (L^2/12 = %.4f, "
        "thin layer, cylinder)\n",
        height, a, b, a * b, L * L / 12.0);
    lo = std::min(lo, a * b);
    hi = std::max(hi, a * b);
  }
  EXPECT_LT(hi / lo - 1.0, 0.03);
}

}  // namespace
}  // namespace sharpey::analysis
