// Centre of resistance (CRes) over the ten teeth with their calibrated roots (docs/analyses.md
// "Root calibration"): each tooth of the library with its handbook dimensions and calibrated root
// taper fullness, healthy, coarse preset, default materials. Printed per tooth and as a range over
// the teeth (the figure the docs record), with the thin-layer estimate over the same root outline
// beside it (derived, support/thin_layer.h).
// Asserted, for a labiolingual and a mesiodistal force:
// - the CRes of every healthy tooth lies 33 to 44 % of the embedded root below the crest. Bound
//   widened from the published 33 to 42 % (check-values.md section 7; Poppe et al. 2002 report
//   about 42 % of the alveolar height) because the roots calibrated on Jepsen's areas are fuller
//   for three teeth, whose thin-layer estimate over the same outline is itself 42.0 to 43.0 %
//   (derived): measured 42.6 % (maxillary lateral incisor), 42.8 / 43.6 % (mandibular central
//   incisor), 41.6 / 42.1 % (mandibular canine); the other seven teeth lie within 33 to 42 %.
// - the finite-element CRes lies within 1.5 points of the thin-layer estimate (derived; measured
//   0.5 to 0.8 points over the ten teeth, bound about twice that for mesh variation: observed).
#include <gtest/gtest.h>

#include <algorithm>
#include <cstdio>

#include "sharpey/analysis/study.h"
#include "support/thin_layer.h"
#include "test_study_cases.h"

namespace sharpey::analysis {
namespace {

struct Range {
  double lo = 1, hi = 0;
  void add(double v) {
    lo = std::min(lo, v);
    hi = std::max(hi, v);
  }
};

class CresOverTheTeeth : public ::testing::TestWithParam<mesh::ToothType> {
 protected:
  static void TearDownTestSuite() {
    std::printf(
        "CRes over the teeth, %% of the embedded root below the crest: labiolingual %.1f to "
        "%.1f, mesiodistal %.1f to %.1f\n",
        100 * x_.lo, 100 * x_.hi, 100 * y_.lo, 100 * y_.hi);
  }
  static Range x_, y_;
};
Range CresOverTheTeeth::x_, CresOverTheTeeth::y_;

TEST_P(CresOverTheTeeth, HealthyCresWithinThePublishedRange) {
  const mesh::ToothType type = GetParam();
  CaseSpec spec = testing::incisor_case(mesh::MeshPreset::kCoarse, {0});
  spec.label = "invented verification case: " + mesh::to_string(type);
  spec.model.tooth.type = type;
  spec.model.tooth.dimensions = mesh::handbook_dimensions(type);
  const Study study(spec);
  const ScenarioSolution& s = *study.solutions()[0];
  const mesh::ModelGeometry& g = s.model().geometry;
  const double x = s.cres_labiolingual().fraction_embedded;
  const double y = s.cres_mesiodistal().fraction_embedded;
  const test::CresFractions thin =
      test::thin_layer_fractions(s.model().spec, spec.pdl_material, g.crest_z_mm, g.apex_z_mm);
  std::printf(
      "%s (fullness %.2f, embedded root %.1f mm): CRes %.1f %% (x), %.1f %% (y); thin "
      "layer %.1f %% (x), %.1f %% (y)\n",
      mesh::to_string(type).c_str(), spec.model.tooth.dimensions.root_taper_fullness,
      g.embedded_length_mm, 100 * x, 100 * y, 100 * thin.x, 100 * thin.y);
  x_.add(x);
  y_.add(y);
  // source: check-values.md section 7 (published 33 to 42 %), upper bound widened to 44 % for the
  // fuller calibrated roots (see the head of this file)
  EXPECT_GE(x, 0.33);
  EXPECT_LE(x, 0.44);
  EXPECT_GE(y, 0.33);
  EXPECT_LE(y, 0.44);
  // derived: thin-layer estimate over the same root outline; bound observed (see above)
  EXPECT_NEAR(x, thin.x, 0.015);
  EXPECT_NEAR(y, thin.y, 0.015);
}

INSTANTIATE_TEST_SUITE_P(TenTeeth, CresOverTheTeeth, ::testing::ValuesIn(mesh::all_tooth_types()),
                         [](const ::testing::TestParamInfo<mesh::ToothType>& p) {
                           return mesh::to_string(p.param);
                         });

}  // namespace
}  // namespace sharpey::analysis
