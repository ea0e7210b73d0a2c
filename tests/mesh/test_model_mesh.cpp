// The meshed tooth model (coarse preset, maxillary central incisor): regions, markers, conformity
// of the PDL layer with tooth and bone, closure, orientation, positive Jacobians, and areas and
// volumes against the parametric definition (two independent computations: quadrature over the
// curved mesh versus numerical integration of the surfaces).
#include <gtest/gtest.h>

#include <cmath>
#include <set>

#include "sharpey/mesh/mesh_statistics.h"
#include "sharpey/mesh/tooth_model.h"
#include "support/model_checks.h"

namespace sharpey::mesh {
namespace {

using test::element_faces;
using test::FaceUse;
using test::sorted_triple;

using CoarseIncisor = test::IncisorFixture<MeshPreset::kCoarse>;

bool is_bone(int region) { return region == kCorticalBone || region == kCancellousBone; }

TEST_F(CoarseIncisor, HasAllRegionsAndMarkers) {
  const VolumeMesh& m = model_->mesh;
  EXPECT_EQ(m.nodes_per_element, 10);
  EXPECT_EQ(m.nodes_per_face, 6);
  for (int r : {kTooth, kPdl, kCorticalBone, kCancellousBone}) {
    SCOPED_TRACE("region " + std::to_string(r));
    EXPECT_GT(stats_->elements_per_region.at(r), 100);
  }
  std::set<int> markers(m.face_marker.begin(), m.face_marker.end());
  EXPECT_EQ(markers, (std::set<int>{kRootSurface, kSocketSurface, kCrownSurface, kBracketPad,
                                    kFixedBone, kExposedRoot, kFreeBone, kPdlCrest}));
}

TEST_F(CoarseIncisor, EveryElementHasPositiveJacobian) {
  EXPECT_EQ(stats_->n_inverted_elements, 0);
  EXPECT_GT(stats_->min_jacobian_ratio, 0.0);
}

TEST_F(CoarseIncisor, ElementsConformAndTheBoundaryIsMarked) {
  const VolumeMesh& m = model_->mesh;
  const auto faces = element_faces(m);
  std::map<test::Triple, int> marked;
  for (int f = 0; f < m.n_faces(); ++f)
    marked[sorted_triple(m.face(f)[0], m.face(f)[1], m.face(f)[2])] = f;
  int n_exterior = 0;
  for (const auto& [key, uses] : faces) {
    ASSERT_LE(uses.size(), 2u);
    if (uses.size() == 2) {
      // Shared faces carry the same six nodes on both sides.
      std::array<int, 6> a = test::face_nodes(m, uses[0].element, uses[0].local);
      std::array<int, 6> b = test::face_nodes(m, uses[1].element, uses[1].local);
      std::sort(a.begin(), a.end());
      std::sort(b.begin(), b.end());
      EXPECT_EQ(a, b);
    } else {
      ++n_exterior;
      EXPECT_TRUE(marked.count(key)) << "unmarked exterior face";
    }
  }
  // Interface faces and what lies on each side.
  for (int f = 0; f < m.n_faces(); ++f) {
    const auto& uses = faces.at(sorted_triple(m.face(f)[0], m.face(f)[1], m.face(f)[2]));
    std::multiset<int> regions;
    for (const FaceUse& u : uses) regions.insert(m.element_region[u.element]);
    const int marker = m.face_marker[f];
    SCOPED_TRACE("face marker " + std::to_string(marker));
    switch (marker) {
      case kRootSurface:
        ASSERT_EQ(uses.size(), 2u);
        EXPECT_EQ(regions, (std::multiset<int>{kTooth, kPdl}));
        break;
      case kSocketSurface:
        ASSERT_EQ(uses.size(), 2u);
        EXPECT_EQ(regions.count(kPdl), 1u);
        EXPECT_TRUE(is_bone(*regions.rbegin()));
        break;
      case kCrownSurface:
      case kBracketPad:
      case kExposedRoot:
        ASSERT_EQ(uses.size(), 1u);
        EXPECT_EQ(*regions.begin(), kTooth);
        break;
      case kPdlCrest:
        ASSERT_EQ(uses.size(), 1u);
        EXPECT_EQ(*regions.begin(), kPdl);
        break;
      case kFixedBone:
      case kFreeBone:
        ASSERT_EQ(uses.size(), 1u);
        EXPECT_TRUE(is_bone(*regions.begin()));
        break;
      default:
        ADD_FAILURE() << "unexpected marker";
    }
  }
  int n_exterior_marked = 0;
  for (int marker : m.face_marker)
    if (marker != kRootSurface && marker != kSocketSurface) ++n_exterior_marked;
  EXPECT_EQ(n_exterior, n_exterior_marked);
}

TEST_F(CoarseIncisor, FacesPointAwayFromTheToothAndOutOfTheirRegion) {
  const VolumeMesh& m = model_->mesh;
  const auto faces = element_faces(m);
  for (int f = 0; f < m.n_faces(); ++f) {
    const auto& uses = faces.at(sorted_triple(m.face(f)[0], m.face(f)[1], m.face(f)[2]));
    const int marker = m.face_marker[f];
    // The element the normal points out of: the tooth for root faces, the PDL for socket faces,
    // the only element otherwise.
    int from = uses[0].element;
    for (const FaceUse& u : uses) {
      const int r = m.element_region[u.element];
      if ((marker == kRootSurface && r == kTooth) || (marker == kSocketSurface && r == kPdl))
        from = u.element;
    }
    const Eigen::Vector3d out = test::face_centroid(m, f) - test::element_centroid(m, from);
    EXPECT_GT(test::face_normal(m, f).dot(out), 0.0) << "marker " << marker << " face " << f;
  }
}

TEST_F(CoarseIncisor, ElementVolumesAddUpToTheVolumeInsideTheBoundary) {
  // Two computations of the same volume: element quadrature versus the flux of x/3 through the
  // exterior faces (divergence theorem); a gap or overlap between elements would differ.
  const VolumeMesh& m = model_->mesh;
  double elements = 0;
  for (int e = 0; e < m.n_elements(); ++e) elements += test::element_volume(m, e);
  double flux = 0;
  for (const auto& [key, uses] : element_faces(m)) {
    if (uses.size() != 1) continue;
    const std::array<int, 6> n = test::face_nodes(m, uses[0].element, uses[0].local);
    flux += test::face_flux(m, n.data(), 6);
  }
  EXPECT_NEAR(elements, flux, 1e-9 * elements);
  EXPECT_NEAR(elements, stats_->total_volume_mm3, 1e-9 * elements);
  double sum = 0;
  for (const auto& [region, v] : stats_->volume_per_region_mm3) sum += v;
  EXPECT_NEAR(sum, stats_->total_volume_mm3, 1e-9 * sum);
}

TEST_F(CoarseIncisor, RegionVolumesMatchTheParametricDefinition) {
  // Acceptance asks 1 % on the fine preset (tests/mesh/test_model_pdl.cpp); coarse meets it too.
  const ModelGeometry& g = model_->geometry;
  const auto& v = stats_->volume_per_region_mm3;
  EXPECT_NEAR(v.at(kTooth), g.tooth_volume_mm3, 0.01 * g.tooth_volume_mm3);
  EXPECT_NEAR(v.at(kPdl), g.pdl_volume_mm3, 0.01 * g.pdl_volume_mm3);
  EXPECT_NEAR(v.at(kCorticalBone), g.cortical_volume_mm3, 0.01 * g.cortical_volume_mm3);
  EXPECT_NEAR(v.at(kCancellousBone), g.cancellous_volume_mm3, 0.01 * g.cancellous_volume_mm3);
  EXPECT_NEAR(g.cortical_volume_mm3 + g.cancellous_volume_mm3, g.bone_volume_mm3, 1e-9);
}

TEST_F(CoarseIncisor, SurfaceAreasMatchTheParametricDefinition) {
  const ModelGeometry& g = model_->geometry;
  const auto& a = stats_->area_per_marker_mm2;
  EXPECT_NEAR(a.at(kRootSurface), g.attachment_area_mm2, 0.02 * g.attachment_area_mm2);
  EXPECT_NEAR(a.at(kExposedRoot), g.exposed_root_area_mm2, 0.02 * g.exposed_root_area_mm2);
  // Bracket pad: width x length to within a column of faces, centred on the bracket centre.
  const BracketSpec& b = model_->spec.bracket;
  EXPECT_NEAR(a.at(kBracketPad), b.width_mm * b.length_mm, 0.25 * b.width_mm * b.length_mm);
  const VolumeMesh& m = model_->mesh;
  Eigen::Vector3d centre = Eigen::Vector3d::Zero(), normal = Eigen::Vector3d::Zero();
  double area = 0;
  for (int f = 0; f < m.n_faces(); ++f) {
    if (m.face_marker[f] != kBracketPad) continue;
    const Eigen::Vector3d n = test::face_normal(m, f);
    centre += 0.5 * n.norm() * test::face_centroid(m, f);
    area += 0.5 * n.norm();
    normal += n;
  }
  centre /= area;
  EXPECT_NEAR(centre.y(), g.bracket_center.y(), 1e-9);  // symmetric about y = 0
  EXPECT_NEAR(centre.z(), g.bracket_center.z(), 0.05);
  EXPECT_NEAR(centre.x(), g.bracket_center.x(), 0.15);  // the pad is curved, the centre on it
  EXPECT_GT(normal.normalized().dot(g.bracket_normal), 0.98);
}

TEST_F(CoarseIncisor, NoPdlAboveTheCrest) {
  const VolumeMesh& m = model_->mesh;
  const double crest = model_->geometry.crest_z_mm;
  double top = -1e300;
  for (int e = 0; e < m.n_elements(); ++e) {
    if (m.element_region[e] != kPdl) continue;
    for (int k = 0; k < m.nodes_per_element; ++k) top = std::max(top, m.nodes[m.element(e)[k]].z());
  }
  EXPECT_LE(top, crest + 1e-9);
  EXPECT_GT(top, crest - 1e-9);  // the attachment reaches the crest
}

TEST_F(CoarseIncisor, OneElementAcrossThePdl) {
  // Structured layer: three tetrahedra per root-surface triangle and layer; every PDL element
  // touches both the root and the socket surface.
  const VolumeMesh& m = model_->mesh;
  std::set<int> root_nodes, socket_nodes;
  int n_root_faces = 0;
  for (int f = 0; f < m.n_faces(); ++f) {
    if (m.face_marker[f] == kRootSurface) {
      ++n_root_faces;
      for (int k = 0; k < 3; ++k) root_nodes.insert(m.face(f)[k]);
    }
    if (m.face_marker[f] == kSocketSurface)
      for (int k = 0; k < 3; ++k) socket_nodes.insert(m.face(f)[k]);
  }
  EXPECT_EQ(stats_->elements_per_region.at(kPdl), 3 * n_root_faces);
  for (int e = 0; e < m.n_elements(); ++e) {
    if (m.element_region[e] != kPdl) continue;
    int on_root = 0, on_socket = 0;
    for (int k = 0; k < 4; ++k) {
      on_root += static_cast<int>(root_nodes.count(m.element(e)[k]));
      on_socket += static_cast<int>(socket_nodes.count(m.element(e)[k]));
    }
    EXPECT_EQ(on_root + on_socket, 4);
    EXPECT_GE(on_root, 1);
    EXPECT_GE(on_socket, 1);
  }
}

TEST(ModelMesh, IdealisedRootVolumesAndAreasWithinHalfAPercent) {
  // The parametric values equal the closed forms to 1e-5 (test_tooth_geometry.cpp); the curved
  // coarse mesh must reproduce them within 0.5 %.
  for (IdealRoot root : {IdealRoot::kCylinder, IdealRoot::kCone, IdealRoot::kParaboloid}) {
    SCOPED_TRACE("ideal root " + std::to_string(static_cast<int>(root)));
    ModelSpec spec;
    spec.tooth.ideal_root = root;
    spec.sizing.preset = MeshPreset::kCoarse;
    const ToothModel model = build_tooth_model(spec);
    const MeshStatistics s = measure(model.mesh);
    const ModelGeometry& g = model.geometry;
    EXPECT_EQ(s.n_inverted_elements, 0);
    EXPECT_NEAR(s.volume_per_region_mm3.at(kTooth), g.tooth_volume_mm3, 0.005 * g.tooth_volume_mm3);
    const double root_area =
        s.area_per_marker_mm2.at(kRootSurface) + s.area_per_marker_mm2.at(kExposedRoot);
    EXPECT_NEAR(root_area, g.root_area_mm2, 0.005 * g.root_area_mm2);
    EXPECT_NEAR(s.volume_per_region_mm3.at(kPdl), g.pdl_volume_mm3, 0.01 * g.pdl_volume_mm3);
  }
}

TEST(ModelMesh, LinearElementsOnRequestAndCurvedOnesAreCloser) {
  ModelSpec spec;
  spec.sizing.preset = MeshPreset::kCoarse;
  spec.sizing.second_order = false;
  const ToothModel linear = build_tooth_model(spec);
  EXPECT_EQ(linear.mesh.nodes_per_element, 4);
  EXPECT_EQ(linear.mesh.nodes_per_face, 3);
  const MeshStatistics s = measure(linear.mesh);
  EXPECT_EQ(s.n_inverted_elements, 0);
  // Straight elements inscribe the convex tooth: smaller volume, error O(h^2); the 10-node mesh
  // with midside nodes on the true surface is much closer (same vertices).
  spec.sizing.second_order = true;
  const MeshStatistics q = measure(build_tooth_model(spec).mesh);
  const double exact = linear.geometry.tooth_volume_mm3;
  const double linear_error = exact - s.volume_per_region_mm3.at(kTooth);
  const double curved_error = std::abs(exact - q.volume_per_region_mm3.at(kTooth));
  EXPECT_GT(linear_error, 0.0);
  EXPECT_LT(linear_error, 0.03 * exact);
  EXPECT_GT(linear_error, 5 * curved_error);
  EXPECT_EQ(s.n_elements, q.n_elements);
}

}  // namespace
}  // namespace sharpey::mesh
