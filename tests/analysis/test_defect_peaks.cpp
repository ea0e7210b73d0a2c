// Peaks next to an angular defect: the band left out of the reported peaks is measured in 3D from
// the ligament's free surface (analysis::pdl_crest_edge_band), so along a defect's steep walls it
// is as wide as at the crest; the mesh adds columns in and next to the defect's span, so the peak
// just below the defect's floor is resolved; the reported peaks converge with the mesh.
//
// Invented verification case (not patient data): maxillary canine, 3 mm horizontal loss plus a
// 5 mm deep, 40 degree wide angular defect, 150 g distal translation.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <string>

#include "sharpey/analysis/study.h"
#include "test_study_cases.h"

namespace sharpey::analysis {
namespace {

struct Peaks {
  double compression_kpa = 0, tension_kpa = 0, p95_kpa = 0;
};

CaseSpec canine_with_defect(mesh::MeshPreset preset, mesh::ToothSurface surface) {
  CaseSpec spec;
  spec.label = "invented verification case: maxillary canine with an angular defect";
  spec.model.tooth.type = mesh::ToothType::kMaxillaryCanine;
  spec.model.tooth.dimensions = mesh::handbook_dimensions(spec.model.tooth.type);
  spec.model.sizing.preset = preset;
  Scenario s;
  s.name = "3 mm loss, 5 mm defect " + mesh::to_string(surface);
  s.loss.horizontal_mm = 3;
  s.loss.defect_depth_mm = 5;
  s.loss.defect_width_deg = 40;
  s.loss.defect_surface = surface;
  spec.scenarios.push_back(s);
  return spec;
}

Peaks peaks(mesh::MeshPreset preset, mesh::ToothSurface surface, const LoadSpec& load) {
  const CaseSpec spec = canine_with_defect(preset, surface);
  const ScenarioSolution solution(spec, 0, {}, nullptr);
  const ScenarioResult r = evaluate(solution, load, spec.thresholds, nullptr);
  std::printf(
      "%-8s defect %-7s: peak compression %.3f kPa, peak tension %.3f kPa, 95th pct %.3f "
      "kPa (edge band %.3f kPa)\n",
      mesh::to_string(preset).c_str(), mesh::to_string(surface).c_str(),
      r.pressure_max_compression_kpa, r.pressure_max_tension_kpa, r.pressure_p95_compression_kpa,
      r.pressure_max_compression_crest_edge_kpa);
  return {r.pressure_max_compression_kpa, r.pressure_max_tension_kpa,
          r.pressure_p95_compression_kpa};
}

double relative_difference(double a, double reference) {
  return std::abs(a - reference) / std::abs(reference);
}

// y is mesial in tooth coordinates: distal is -y.
LoadSpec translation_g(double grams, double y_sign) {
  return testing::force_g(grams, Eigen::Vector3d(0, y_sign, 0), MovementPreset::kTranslation);
}

// Derived (mesh convergence): the acceptance, both peaks (and the 95th percentile) within
// 5 % between the standard and fine presets, for a defect on each of the four surfaces under a
// 150 g distal translation (the project's standard-versus-fine acceptance, docs/verification.md).
// Measured 2026-12-03 on the graded standard preset (standard vs fine; compression / tension /
// 95th percentile): distal 1.53 % (13.827 vs 13.619 kPa) / 0.29 % / 0.05 %; mesial 0.23 % /
// 1.51 % (13.828 vs 13.622 kPa) / 0.05 %; labial 0.26 % / 0.26 % / 0.11 %; lingual 0.25 % /
// 0.25 % / 0.09 % (before the grading: distal 1.66 %, mesial tension 1.65 %). The extra columns
// are nearly as close on the standard preset as on the fine one (0.10 vs 0.09 mm at the cervix),
// so near the floor this compares meshes that differ mainly in the rest of the model; halving the
// fine preset's extra-column spacing moved its compression by 0.3 % (13.619 -> 13.577 kPa, a
// one-off run); the coarse preset (0.2 mm, one element across the PDL) gives 17.2 kPa there
// (docs/verification.md).
// History of the peak on the defect's side (the distal defect's compression, about 0.3 to 0.7 mm
// below the defect's floor): with the band measured straight down from the crest the peaks did not
// converge at all (tension 16.6 / 16.2 / 24.9 kPa on coarse / standard / fine); with the 3D band
// but uniform columns (32 around the canine's root on the standard preset, about three across the
// 40 degree defect) the compression was 16.30 vs 17.32 kPa, 5.9 %: the defect's floor is a narrow
// notch that those columns left unresolved. The mesh now adds columns in and next to the defect's
// span (mesh/src/model_surfaces.cpp, interval_parts). Slow: four fine-preset solves.
class DefectPeakConvergence : public ::testing::TestWithParam<mesh::ToothSurface> {};

TEST_P(DefectPeakConvergence, BothPeaksWithinFivePercentOfFine) {
  const mesh::ToothSurface surface = GetParam();
  const LoadSpec load = translation_g(150, -1.0);
  const Peaks standard = peaks(mesh::MeshPreset::kStandard, surface, load);
  const Peaks fine = peaks(mesh::MeshPreset::kFine, surface, load);
  const double d_compression = relative_difference(standard.compression_kpa, fine.compression_kpa);
  const double d_tension = relative_difference(standard.tension_kpa, fine.tension_kpa);
  const double d_p95 = relative_difference(standard.p95_kpa, fine.p95_kpa);
  std::printf(
      "defect %s, standard vs fine: compression %.2f %%, tension %.2f %%, 95th pct %.2f %%\n",
      mesh::to_string(surface).c_str(), 100 * d_compression, 100 * d_tension, 100 * d_p95);
  EXPECT_LT(d_compression, 0.05);
  EXPECT_LT(d_tension, 0.05);
  EXPECT_LT(d_p95, 0.05);
}

INSTANTIATE_TEST_SUITE_P(Surfaces, DefectPeakConvergence,
                         ::testing::Values(mesh::ToothSurface::kDistal, mesh::ToothSurface::kMesial,
                                           mesh::ToothSurface::kLabial,
                                           mesh::ToothSurface::kLingual),
                         [](const ::testing::TestParamInfo<mesh::ToothSurface>& p) {
                           return mesh::to_string(p.param);
                         });

// Derived (symmetry): the canine's root and bone block are symmetric about the labiolingual plane
// y = 0, so a mesial defect under a mesial force is the mirror image of a distal defect under a
// distal force and must give the same peaks; only the two meshes differ (the PDL and the tooth
// surface are mirror images, element for element; TetGen's tooth and bone interiors are not).
// Within 2 % on the coarse preset (the acceptance figure). Measured: SYMMETRY_FIGURES.
// Before: with the band measured straight down 10 % and 29 %; with the 3D band but uniform
// columns and PDL prisms split by point index (not mirror images), compression 16.89 vs
// 17.66 kPa, 4.4 %, tension 0.16 %.
TEST(DefectPeakSymmetry, MirroredDefectsAndLoadsGiveTheSamePeaks) {
  const Peaks mesial =
      peaks(mesh::MeshPreset::kCoarse, mesh::ToothSurface::kMesial, translation_g(150, +1.0));
  const Peaks distal =
      peaks(mesh::MeshPreset::kCoarse, mesh::ToothSurface::kDistal, translation_g(150, -1.0));
  const double d_compression = relative_difference(mesial.compression_kpa, distal.compression_kpa);
  const double d_tension = relative_difference(mesial.tension_kpa, distal.tension_kpa);
  const double d_p95 = relative_difference(mesial.p95_kpa, distal.p95_kpa);
  std::printf("mirrored defects, coarse: compression %.2f %%, tension %.2f %%, 95th pct %.2f %%\n",
              100 * d_compression, 100 * d_tension, 100 * d_p95);
  EXPECT_LT(d_compression, 0.02);
  EXPECT_LT(d_tension, 0.02);
  EXPECT_LT(d_p95, 0.02);
}

}  // namespace
}  // namespace sharpey::analysis
