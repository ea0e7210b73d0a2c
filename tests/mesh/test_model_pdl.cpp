// The PDL layer: width measured on the mesh against the request (uniform and hourglass), elements
// across the width, and the fine preset's region volumes against the parametric definition.
#include <gtest/gtest.h>

#include <cmath>
#include <set>

#include "sharpey/mesh/mesh_statistics.h"
#include "sharpey/mesh/tooth_model.h"
#include "support/model_checks.h"

namespace sharpey::mesh {
namespace {

struct WidthCase {
  std::string name;
  PdlSpec pdl;
  double horizontal_loss_mm;
};
std::ostream& operator<<(std::ostream& os, const WidthCase& c) { return os << c.name; }

class PdlWidth : public ::testing::TestWithParam<WidthCase> {};

TEST_P(PdlWidth, MeasuredWidthEqualsTheRequest) {
  const WidthCase& c = GetParam();
  ModelSpec spec;
  spec.pdl = c.pdl;
  spec.loss.horizontal_mm = c.horizontal_loss_mm;
  spec.sizing.preset = MeshPreset::kStandard;
  const ToothModel model = build_tooth_model(spec);
  const std::vector<PdlWidthSample> samples = pdl_width_samples(model.mesh);
  ASSERT_GE(samples.size(), 100u);
  double worst = 0;
  for (const PdlWidthSample& s : samples) {
    const double requested = requested_pdl_width_mm(spec, s.root_point.z());
    const double error = std::abs(s.width_mm / requested - 1);
    worst = std::max(worst, error);
    EXPECT_LT(error, 0.05) << "at z = " << s.root_point.z() << ": measured " << s.width_mm
                           << " mm, requested " << requested << " mm";
  }
  RecordProperty("worst_relative_error", std::to_string(worst));
  RecordProperty("samples", static_cast<int>(samples.size()));
}

INSTANTIATE_TEST_SUITE_P(
    Profiles, PdlWidth,
    ::testing::Values(WidthCase{"uniform_0_20", {0.20, 0.20, 0.20}, 0},
                      // source: Coolidge 1937 (from memory, check-values.md section 2)
                      WidthCase{"hourglass_coolidge", {0.20, 0.14, 0.19}, 0},
                      WidthCase{"hourglass_with_4mm_loss", {0.20, 0.14, 0.19}, 4},
                      WidthCase{"uniform_0_35", {0.35, 0.35, 0.35}, 0}),
    [](const ::testing::TestParamInfo<WidthCase>& p) { return p.param.name; });

using FineIncisor = test::IncisorFixture<MeshPreset::kFine>;

TEST_F(FineIncisor, RegionVolumesWithinOnePercentOfTheParametricDefinition) {
  const ModelGeometry& g = model_->geometry;
  const auto& v = stats_->volume_per_region_mm3;
  const std::pair<int, double> expected[] = {{kTooth, g.tooth_volume_mm3},
                                             {kPdl, g.pdl_volume_mm3},
                                             {kCorticalBone, g.cortical_volume_mm3},
                                             {kCancellousBone, g.cancellous_volume_mm3}};
  for (const auto& [region, volume] : expected) {
    SCOPED_TRACE("region " + std::to_string(region));
    EXPECT_NEAR(v.at(region), volume, 0.01 * volume);
    RecordProperty("relative_error_region_" + std::to_string(region),
                   std::to_string(v.at(region) / volume - 1));
  }
  EXPECT_EQ(stats_->n_inverted_elements, 0);
  EXPECT_NEAR(stats_->area_per_marker_mm2.at(kRootSurface), g.attachment_area_mm2,
              0.005 * g.attachment_area_mm2);
}

TEST_F(FineIncisor, TwoElementsAcrossThePdl) {
  const VolumeMesh& m = model_->mesh;
  std::set<int> root_vertices, socket_vertices, pdl_vertices;
  int n_root_faces = 0;
  for (int f = 0; f < m.n_faces(); ++f) {
    if (m.face_marker[f] == kRootSurface) {
      ++n_root_faces;
      for (int k = 0; k < 3; ++k) root_vertices.insert(m.face(f)[k]);
    }
    if (m.face_marker[f] == kSocketSurface)
      for (int k = 0; k < 3; ++k) socket_vertices.insert(m.face(f)[k]);
  }
  for (int e = 0; e < m.n_elements(); ++e)
    if (m.element_region[e] == kPdl)
      for (int k = 0; k < 4; ++k) pdl_vertices.insert(m.element(e)[k]);
  // Three tetrahedra per root triangle and layer; one middle layer of vertices, as many as on the
  // root surface, touching neither surface; no element spans both surfaces.
  EXPECT_EQ(stats_->elements_per_region.at(kPdl), 2 * 3 * n_root_faces);
  EXPECT_EQ(pdl_vertices.size(),
            root_vertices.size() + socket_vertices.size() + root_vertices.size());
  EXPECT_EQ(root_vertices.size(), socket_vertices.size());
  for (int e = 0; e < m.n_elements(); ++e) {
    if (m.element_region[e] != kPdl) continue;
    bool on_root = false, on_socket = false;
    for (int k = 0; k < 4; ++k) {
      on_root = on_root || root_vertices.count(m.element(e)[k]);
      on_socket = on_socket || socket_vertices.count(m.element(e)[k]);
    }
    EXPECT_FALSE(on_root && on_socket);
  }
}

TEST(ModelPdl, LayersOnRequest) {
  ModelSpec spec;
  spec.sizing.preset = MeshPreset::kCoarse;
  spec.sizing.pdl_layers = 3;
  const ToothModel model = build_tooth_model(spec);
  int n_root_faces = 0;
  for (int marker : model.mesh.face_marker) n_root_faces += marker == kRootSurface;
  const MeshStatistics s = measure(model.mesh);
  EXPECT_EQ(s.elements_per_region.at(kPdl), 3 * 3 * n_root_faces);
  EXPECT_EQ(s.n_inverted_elements, 0);
  EXPECT_NEAR(s.volume_per_region_mm3.at(kPdl), model.geometry.pdl_volume_mm3,
              0.01 * model.geometry.pdl_volume_mm3);
}

}  // namespace
}  // namespace sharpey::mesh
