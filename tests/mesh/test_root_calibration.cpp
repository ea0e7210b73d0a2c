// CALIBRATION SIDE of the root calibration (docs/analyses.md "Root calibration"). The one shape
// parameter the handbook does not give, the root taper fullness, is solved per tooth so that the
// parametric root's surface area (CEJ to apex) equals the calibration set: Jepsen 1963, from memory
// (check-values.md section 4), the only set that covers all ten teeth. These checks are circular
// by design (the value was fitted to the figure it is compared with): they prove the procedure
// and the stored values, not the anatomy. The comparison with independent published measurements
// is the validation side, test_root_validation.cpp, which never feeds back into the values here.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <string>

#include "sharpey/error.h"
#include "sharpey/mesh/tooth_model.h"

namespace sharpey::mesh {
namespace {

// Calibration set, mm^2. source: Jepsen 1963, from memory (check-values.md section 4). Kept here
// apart from the library's copy (root_calibration_area_mm2) so that a typo in either shows.
struct CalibrationArea {
  ToothType type;
  double jepsen_mm2;
};
class RootCalibration : public ::testing::TestWithParam<CalibrationArea> {};

ModelSpec handbook_spec(ToothType type) {
  ModelSpec s;
  s.tooth.type = type;
  s.tooth.dimensions = handbook_dimensions(type);
  return s;
}

// The library's root reproduces the calibration area. The acceptance asks for 5 %; the stored
// fullness is the solved one rounded to two decimals, and dA/dm is below 25 mm^2 per unit on these
// teeth, so the rounding moves the area by at most 0.13 mm^2 (0.08 % of the smallest root): the
// bound is 0.1 % (measured at most 0.053 %, mandibular second premolar).
TEST_P(RootCalibration, LibraryRootHasTheCalibrationArea) {
  const CalibrationArea p = GetParam();
  const ModelGeometry g = model_geometry(handbook_spec(p.type));
  const double error = g.root_area_mm2 / p.jepsen_mm2 - 1;
  std::printf(
      "calibration %s: fullness %.2f, root area %.2f mm2, Jepsen %.0f mm2 (from memory), "
      "%+.3f %%\n",
      to_string(p.type).c_str(), handbook_dimensions(p.type).root_taper_fullness, g.root_area_mm2,
      p.jepsen_mm2, 100 * error);
  EXPECT_LT(std::abs(error), 1e-3);  // from memory (Jepsen 1963), the calibration target
  EXPECT_EQ(root_calibration_area_mm2(p.type), p.jepsen_mm2);
  // Derived: the attachment and the exposed root make up the whole root.
  EXPECT_NEAR(g.attachment_area_mm2 + g.exposed_root_area_mm2, g.root_area_mm2,
              1e-6 * g.root_area_mm2);
}

// The stored fullness is what the documented procedure gives: solving again from the table
// dimensions and the calibration area lands within the two-decimal rounding (0.005).
TEST_P(RootCalibration, StoredFullnessIsTheSolvedOne) {
  const CalibrationArea p = GetParam();
  const ModelSpec s = handbook_spec(p.type);
  const double solved = root_taper_fullness_for_area(s, p.jepsen_mm2);
  const double stored = s.tooth.dimensions.root_taper_fullness;
  std::printf("calibration %s: solved fullness %.4f, stored %.2f\n", to_string(p.type).c_str(),
              solved, stored);
  EXPECT_LE(std::abs(stored - solved), 0.005 + 1e-9);
  // The solver's answer reproduces its target (derived). It stops at 1e-9 of the area or at a
  // bracket 1e-6 wide in the fullness, which with dA/dm below 25 mm^2 per unit bounds the area
  // error by 2.5e-5 mm^2 (measured at most 2.1e-6 mm^2, maxillary lateral incisor).
  ModelSpec check = s;
  check.tooth.dimensions.root_taper_fullness = solved;
  EXPECT_NEAR(model_geometry(check).root_area_mm2, p.jepsen_mm2, 2.5e-5);
}

INSTANTIATE_TEST_SUITE_P(
    JepsenFromMemory, RootCalibration,
    ::testing::Values(CalibrationArea{ToothType::kMaxillaryCentralIncisor, 204},
                      CalibrationArea{ToothType::kMaxillaryLateralIncisor, 179},
                      CalibrationArea{ToothType::kMaxillaryCanine, 273},
                      CalibrationArea{ToothType::kMaxillaryFirstPremolar, 234},
                      CalibrationArea{ToothType::kMaxillarySecondPremolar, 220},
                      CalibrationArea{ToothType::kMandibularCentralIncisor, 154},
                      CalibrationArea{ToothType::kMandibularLateralIncisor, 168},
                      CalibrationArea{ToothType::kMandibularCanine, 268},
                      CalibrationArea{ToothType::kMandibularFirstPremolar, 180},
                      CalibrationArea{ToothType::kMandibularSecondPremolar, 207}),
    [](const ::testing::TestParamInfo<CalibrationArea>& p) { return to_string(p.param.type); });

// The maxillary premolars share Wheeler's dimensions (check-values.md section 3) but not their
// calibration areas (234 and 220 mm^2, Jepsen 1963, from memory): the first premolar's root is
// the fuller one, wider at every level below the cervix, and the two models differ.
TEST(RootCalibrationPremolars, MaxillaryFirstAndSecondPremolarsAreDistinct) {
  const ModelSpec first = handbook_spec(ToothType::kMaxillaryFirstPremolar);
  const ModelSpec second = handbook_spec(ToothType::kMaxillarySecondPremolar);
  EXPECT_GT(first.tooth.dimensions.root_taper_fullness,
            second.tooth.dimensions.root_taper_fullness);
  EXPECT_GT(model_geometry(first).root_area_mm2, model_geometry(second).root_area_mm2 + 10);
  for (const double z : {-3.0, -7.0, -11.0, -13.0}) {
    SCOPED_TRACE("z " + std::to_string(z));
    EXPECT_GT(root_section(first, z).labiolingual_half_mm,
              root_section(second, z).labiolingual_half_mm);
  }
}

// The solver's bracket relies on the area growing with the fullness (derived: every section
// widens).
TEST(RootCalibrationProcedure, AreaGrowsWithTheFullnessOverTheAllowedRange) {
  ModelSpec s = handbook_spec(ToothType::kMandibularCanine);
  double previous = 0;
  for (double m = kMinRootTaperFullness; m <= kMaxRootTaperFullness + 1e-9; m += 0.25) {
    SCOPED_TRACE("fullness " + std::to_string(m));
    s.tooth.dimensions.root_taper_fullness = m;
    const double area = model_geometry(s).root_area_mm2;
    EXPECT_GT(area, previous);
    previous = area;
  }
}

TEST(RootCalibrationProcedure, UnreachableAreaAndIdealisedRootsAreRefused) {
  const ModelSpec s = handbook_spec(ToothType::kMaxillaryLateralIncisor);
  for (const double area : {100.0, 250.0}) {
    try {
      root_taper_fullness_for_area(s, area);
      ADD_FAILURE() << "area " << area << " accepted";
    } catch (const InputError& e) {
      EXPECT_EQ(e.key(), "tooth.dimensions.root_taper_fullness");
      EXPECT_NE(std::string(e.what()).find("reaches"), std::string::npos) << e.what();
    }
  }
  ModelSpec ideal = s;
  ideal.tooth.ideal_root = IdealRoot::kCylinder;
  EXPECT_THROW(root_taper_fullness_for_area(ideal, 200), InputError);
}

}  // namespace
}  // namespace sharpey::mesh
