// A tooth from a surface scan, end to end: the parametric incisor's surface written to STL and
// imported gives the parametric results (round trip, standard preset, healthy and 3 mm loss); the
// same STL moved and rotated with its landmarks gives the same results (invariance, coarse); the
// case key, its path and the principal-axis proposal.
#include <gtest/gtest.h>

#include <Eigen/Geometry>
#include <cmath>
#include <cstdio>
#include <fstream>
#include <memory>

#include "sharpey/analysis/case_spec.h"
#include "sharpey/analysis/study.h"
#include "sharpey/error.h"
#include "sharpey/mesh/tooth_model.h"
#include "sharpey/mesh/tooth_surface.h"
#include "support/batch_process.h"

namespace sharpey::analysis {
namespace {

std::string vec(const Eigen::Vector3d& v) {
  std::ostringstream s;
  s.precision(17);
  s << "[" << v.x() << ", " << v.y() << ", " << v.z() << "]";
  return s.str();
}

// The parametric case: maxillary central incisor, 100 g lingual, healthy and 3 mm loss (or
// healthy only), on `preset`.
std::string case_json(const std::string& tooth_extra, const std::string& preset = "coarse",
                      bool with_loss = false) {
  return R"({
  "schema_version": 1,
  "label": "Invented test case: maxillary central incisor, 100 g lingual",
  "tooth": {"type": "maxillary_central_incisor")" +
         tooth_extra + R"(},
  "pdl": {"width_mm": 0.2},
  "scenarios": [{"name": "healthy", "horizontal_loss_mm": 0})" +
         std::string(with_loss ? R"(, {"name": "3 mm loss", "horizontal_loss_mm": 3})" : "") + R"(],
  "load": {"magnitude": 100, "unit": "g", "direction": "lingual"},
  "mesh": {"preset": ")" +
         preset + R"("}
})";
}

std::string surface_json(const std::string& file, const Eigen::Affine3d& motion) {
  const mesh::ModelSpec spec;
  const mesh::ModelGeometry g = mesh::model_geometry(spec);
  const mesh::RootSection cej = mesh::root_section(spec, 0.0);
  const double a = cej.labiolingual_half_mm, b = cej.mesiodistal_half_mm;
  return R"(, "surface": {"file": ")" + file + R"(", "landmarks": {"apex": )" +
         vec(motion * g.apex) + R"(, "crown_tip": )" + vec(motion * g.crown_tip) +
         R"(, "cej_labial": )" + vec(motion * Eigen::Vector3d(a, 0, 0)) + R"(, "cej_lingual": )" +
         vec(motion * Eigen::Vector3d(-a, 0, 0)) + R"(, "cej_mesial": )" +
         vec(motion * Eigen::Vector3d(0, b, 0)) + R"(, "cej_distal": )" +
         vec(motion * Eigen::Vector3d(0, -b, 0)) + "}}";
}

struct Figures {
  double peak_kpa, p95_kpa, cres_from_crest_mm, attachment_mm2;
};

std::vector<Figures> figures(const CaseSpec& spec) {
  const Study study(spec);
  LoadSpec load = spec.load;
  std::vector<Figures> out;
  for (const ScenarioResult& r : study.evaluate(load)) {
    out.push_back({r.pressure_max_compression_kpa, r.pressure_p95_compression_kpa,
                   r.cres_labiolingual.from_crest_mm, r.attachment_area_mm2});
  }
  return out;
}

class ScanImport : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    folder_ = std::make_unique<test::TempFolder>("scan_import");
    // Re-tessellated unlike the mesher: 120 columns at a phase, 300 rings by arc length.
    const mesh::SurfaceMesh s = mesh::tooth_surface_triangles(mesh::ModelSpec(), 120, 300, 0.0123);
    mesh::write_stl(s, folder_->path() + "/incisor.stl", true);
    motion_ = Eigen::Translation3d(31.5, -12.25, 7.0) *
              Eigen::AngleAxisd(0.7, Eigen::Vector3d(1, 2, -0.5).normalized());
    mesh::SurfaceMesh moved = s;
    for (auto& v : moved.vertices) v = motion_ * v;
    mesh::write_stl(moved, folder_->path() + "/moved.stl", true);
    // The issue's acceptance is on the standard preset: affordable here (a few seconds a study).
    parametric_ = figures(parse_case(case_json("", "standard", true)));
    imported_ = figures(parse_case(
        case_json(surface_json("incisor.stl", Eigen::Affine3d::Identity()), "standard", true),
        "case", folder_->path()));
  }
  static void TearDownTestSuite() { folder_.reset(); }
  static std::unique_ptr<test::TempFolder> folder_;
  static Eigen::Affine3d motion_;
  static std::vector<Figures> parametric_, imported_;
};
std::unique_ptr<test::TempFolder> ScanImport::folder_;
Eigen::Affine3d ScanImport::motion_;
std::vector<Figures> ScanImport::parametric_, ScanImport::imported_;

TEST_F(ScanImport, RoundTripGivesTheParametricResults) {
  ASSERT_EQ(parametric_.size(), 2u);
  ASSERT_EQ(imported_.size(), 2u);
  for (size_t i = 0; i < 2; ++i) {
    SCOPED_TRACE("scenario " + std::to_string(i));
    const Figures &a = parametric_[i], &b = imported_[i];
    std::printf(
        "scenario %zu parametric / imported: peak %.3f / %.3f kPa, p95 %.3f / %.3f kPa, "
        "CRes %.3f / %.3f mm below the crest, attachment %.2f / %.2f mm^2\n",
        i, a.peak_kpa, b.peak_kpa, a.p95_kpa, b.p95_kpa, a.cres_from_crest_mm, b.cres_from_crest_mm,
        a.attachment_mm2, b.attachment_mm2);
    // Bounds of the issue's acceptance (3 % for pressures and CRes, 1 % for area); derived: the
    // import resamples the same surface, so only resampling and remeshing differences remain.
    EXPECT_NEAR(b.attachment_mm2 / a.attachment_mm2, 1.0, 0.01);
    EXPECT_NEAR(b.peak_kpa / a.peak_kpa, 1.0, 0.03) << a.peak_kpa << " vs " << b.peak_kpa;
    EXPECT_NEAR(b.p95_kpa / a.p95_kpa, 1.0, 0.03) << a.p95_kpa << " vs " << b.p95_kpa;
    EXPECT_NEAR(b.cres_from_crest_mm / a.cres_from_crest_mm, 1.0, 0.03)
        << a.cres_from_crest_mm << " vs " << b.cres_from_crest_mm;
  }
}

TEST_F(ScanImport, MovedAndRotatedWithItsLandmarksGivesTheSameResults) {
  // Coarse preset, healthy only: the comparison is between two imports, not against the standard.
  const std::vector<Figures> still =
      figures(parse_case(case_json(surface_json("incisor.stl", Eigen::Affine3d::Identity())),
                         "case", folder_->path()));
  const std::vector<Figures> moved =
      figures(parse_case(case_json(surface_json("moved.stl", motion_)), "case", folder_->path()));
  ASSERT_EQ(moved.size(), 1u);
  ASSERT_EQ(still.size(), 1u);
  for (size_t i = 0; i < 1; ++i) {
    const Figures &a = still[i], &b = moved[i];
    std::printf(
        "still / moved: peak %.4f / %.4f kPa, p95 %.4f / %.4f kPa, CRes %.4f / %.4f mm, "
        "attachment %.3f / %.3f mm^2\n",
        a.peak_kpa, b.peak_kpa, a.p95_kpa, b.p95_kpa, a.cres_from_crest_mm, b.cres_from_crest_mm,
        a.attachment_mm2, b.attachment_mm2);
    // derived: a rigid motion changes nothing but single-precision rounding in the STL; 1 % is
    // the issue's acceptance bound.
    EXPECT_NEAR(b.attachment_mm2 / a.attachment_mm2, 1.0, 0.01);
    EXPECT_NEAR(b.peak_kpa / a.peak_kpa, 1.0, 0.01);
    EXPECT_NEAR(b.p95_kpa / a.p95_kpa, 1.0, 0.01);
    EXPECT_NEAR(b.cres_from_crest_mm / a.cres_from_crest_mm, 1.0, 0.01);
  }
}

TEST_F(ScanImport, CaseKeyRoundTripsAndWithoutLandmarksProposesAxes) {
  const std::string text = case_json(surface_json("incisor.stl", Eigen::Affine3d::Identity()));
  const CaseSpec spec = parse_case(text, "case", folder_->path());
  ASSERT_TRUE(spec.model.tooth.scan);
  EXPECT_EQ(spec.model.tooth.scan->source_sha256,
            mesh::file_sha256(folder_->path() + "/incisor.stl"));
  EXPECT_EQ(parse_case(case_to_json(spec), "case", folder_->path()), spec);
  // Without landmarks: refused with the proposal, unless accepted explicitly.
  const std::string bare = case_json(R"(, "surface": {"file": "incisor.stl"})");
  try {
    parse_case(bare, "case", folder_->path());
    ADD_FAILURE() << "accepted without landmarks";
  } catch (const InputError& e) {
    EXPECT_EQ(e.key(), "tooth.surface.landmarks");
    EXPECT_NE(std::string(e.what()).find("accept_principal_axes"), std::string::npos) << e.what();
  }
  const CaseSpec accepted = parse_case(
      case_json(R"(, "surface": {"file": "incisor.stl", "accept_principal_axes": true})"), "case",
      folder_->path());
  ASSERT_TRUE(accepted.model.tooth.scan);
  // derived: the proposal's axis is the tooth's long axis, so the lengths are close.
  EXPECT_NEAR(
      accepted.model.tooth.dimensions.root_length_mm +
          accepted.model.tooth.dimensions.crown_length_mm,
      spec.model.tooth.dimensions.root_length_mm + spec.model.tooth.dimensions.crown_length_mm,
      0.5);
  // A surface beside dimensions is refused.
  EXPECT_THROW(
      parse_case(
          case_json(
              R"(, "dimensions": {"root_length_mm": 13}, "surface": {"file": "incisor.stl"})"),
          "case", folder_->path()),
      InputError);
}

}  // namespace
}  // namespace sharpey::analysis
