// Scanned tooth surfaces: reading and checking (each defect refused with its name), placement by
// landmarks, and the radial resampling against the parametric surface it came from.
#include <gtest/gtest.h>
#include <unistd.h>

#include <Eigen/Geometry>
#include <cmath>
#include <cstdio>
#include <fstream>
#include <functional>

#include "sharpey/error.h"
#include "sharpey/mesh/tooth_model.h"
#include "sharpey/mesh/tooth_surface.h"

namespace sharpey::mesh {
namespace {

std::string temp_path(const std::string& name) {
  return "/tmp/sharpey_test_tooth_surface_" + std::to_string(getpid()) + "_" + name;
}

// Landmarks of the parametric tooth of `spec` in tooth coordinates: the axis ends and the CEJ
// section's four extreme points.
ToothLandmarks landmarks_of(const ModelSpec& spec) {
  const ModelGeometry g = model_geometry(spec);
  const RootSection cej = root_section(spec, 0.0);
  ToothLandmarks l;
  l.apex = g.apex;
  l.crown_tip = g.crown_tip;
  l.cej_labial = {cej.labiolingual_half_mm, 0, 0};
  l.cej_lingual = {-cej.labiolingual_half_mm, 0, 0};
  l.cej_mesial = {0, cej.mesiodistal_half_mm, 0};
  l.cej_distal = {0, -cej.mesiodistal_half_mm, 0};
  return l;
}

ModelSpec scanned_spec(const ModelSpec& base, std::shared_ptr<const RadialToothSurface> scan) {
  ModelSpec spec = base;
  spec.tooth.scan = std::move(scan);
  spec.tooth.dimensions = scanned_dimensions(*spec.tooth.scan);
  return spec;
}

class ScanRoundTrip : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    // A re-tessellation unlike the mesher's: 100 columns at a phase, 260 rings by arc length.
    surface_ = new SurfaceMesh(tooth_surface_triangles(ModelSpec(), 100, 260, 0.0123));
    write_stl(*surface_, temp_path("tooth.stl"), true);
  }
  static void TearDownTestSuite() {
    std::remove(temp_path("tooth.stl").c_str());
    delete surface_;
  }
  static SurfaceMesh* surface_;
};
SurfaceMesh* ScanRoundTrip::surface_ = nullptr;

TEST_F(ScanRoundTrip, RootAreaAndLengthsMatchTheParametricTooth) {
  const ModelSpec base;
  const auto scan =
      import_tooth_surface(temp_path("tooth.stl"), landmarks_of(base), "tooth.surface");
  const ModelSpec spec = scanned_spec(base, scan);
  const ModelGeometry a = model_geometry(base), b = model_geometry(spec);
  // derived: the import resamples the same surface; 1 % is the acceptance bound.
  EXPECT_NEAR(b.root_area_mm2 / a.root_area_mm2, 1.0, 0.01);
  EXPECT_NEAR(b.attachment_area_mm2 / a.attachment_area_mm2, 1.0, 0.01);
  EXPECT_NEAR(b.tooth_volume_mm3 / a.tooth_volume_mm3, 1.0, 0.01);
  EXPECT_NEAR(b.root_length_mm, a.root_length_mm, 0.02);  // derived: poles are mesh vertices
  EXPECT_NEAR(b.crown_tip.z(), a.crown_tip.z(), 0.02);
  EXPECT_NEAR(b.pdl_volume_mm3 / a.pdl_volume_mm3, 1.0, 0.01);
  EXPECT_EQ(scan->source_sha256.size(), 64u);
}

TEST_F(ScanRoundTrip, MovedAndRotatedWithItsLandmarksGivesTheSameTooth) {
  const ModelSpec base;
  const Eigen::Affine3d motion = Eigen::Translation3d(31.5, -12.25, 7.0) *
                                 Eigen::AngleAxisd(0.7, Eigen::Vector3d(1, 2, -0.5).normalized());
  SurfaceMesh moved = *surface_;
  for (auto& v : moved.vertices) v = motion * v;
  write_stl(moved, temp_path("moved.stl"), false);  // ASCII this time
  ToothLandmarks l = landmarks_of(base);
  for (Eigen::Vector3d* p :
       {&l.apex, &l.crown_tip, &l.cej_labial, &l.cej_lingual, &l.cej_mesial, &l.cej_distal})
    *p = motion * *p;
  ToothPlacement placement;
  const auto scan = import_tooth_surface(temp_path("moved.stl"), l, "tooth.surface", &placement);
  std::remove(temp_path("moved.stl").c_str());
  EXPECT_FALSE(placement.mirrored);
  const auto reference =
      import_tooth_surface(temp_path("tooth.stl"), landmarks_of(base), "tooth.surface");
  ASSERT_EQ(scan->radius_mm.size(), reference->radius_mm.size());
  double worst = 0;
  for (size_t k = 0; k < scan->radius_mm.size(); ++k)
    worst = std::max(worst, std::abs(scan->radius_mm[k] - reference->radius_mm[k]));
  // derived: the STL stores single-precision coordinates (about 1e-5 mm at 30 mm).
  EXPECT_LT(worst, 1e-3);
  const double a = model_geometry(scanned_spec(base, reference)).root_area_mm2;
  const double b = model_geometry(scanned_spec(base, scan)).root_area_mm2;
  EXPECT_NEAR(b / a, 1.0, 1e-4);
}

TEST_F(ScanRoundTrip, AToothOfTheOtherSideIsMirroredBack) {
  // The tooth mirrored (y -> -y, triangles reversed to stay outward), its mesial landmark now on
  // the -y side: the import mirrors it back and finds the same radius table.
  SurfaceMesh mirrored = *surface_;
  for (auto& v : mirrored.vertices) v.y() = -v.y();
  for (auto& t : mirrored.triangles) std::swap(t[1], t[2]);
  write_stl(mirrored, temp_path("mirrored.stl"), true);
  ToothLandmarks l = landmarks_of(ModelSpec());
  for (Eigen::Vector3d* p :
       {&l.apex, &l.crown_tip, &l.cej_labial, &l.cej_lingual, &l.cej_mesial, &l.cej_distal})
    p->y() = -p->y();
  ToothPlacement placement;
  const auto scan = import_tooth_surface(temp_path("mirrored.stl"), l, "tooth.surface", &placement);
  std::remove(temp_path("mirrored.stl").c_str());
  EXPECT_TRUE(placement.mirrored);
  const auto reference =
      import_tooth_surface(temp_path("tooth.stl"), landmarks_of(ModelSpec()), "tooth.surface");
  double worst = 0;
  for (size_t k = 0; k < scan->radius_mm.size(); ++k)
    worst = std::max(worst, std::abs(scan->radius_mm[k] - reference->radius_mm[k]));
  EXPECT_LT(worst, 1e-3);  // derived: mirroring twice is the identity (single-precision STL)
}

TEST_F(ScanRoundTrip, DimensionsOfAScannedToothCannotBeSet) {
  ModelSpec spec = scanned_spec(
      ModelSpec(),
      import_tooth_surface(temp_path("tooth.stl"), landmarks_of(ModelSpec()), "tooth.surface"));
  EXPECT_NO_THROW(validate(spec));
  spec.tooth.dimensions.root_length_mm += 1;  // e.g. an edit meant for a parametric tooth
  try {
    validate(spec);
    ADD_FAILURE() << "accepted";
  } catch (const InputError& e) {
    EXPECT_EQ(e.key(), "tooth.dimensions");
  }
}

TEST_F(ScanRoundTrip, AnAxisOutsideTheToothIsRefused) {
  // Landmarks shifted 2.5 mm mesially: the axis runs outside the narrow apical root.
  ToothLandmarks l = landmarks_of(ModelSpec());
  for (Eigen::Vector3d* p :
       {&l.apex, &l.crown_tip, &l.cej_labial, &l.cej_lingual, &l.cej_mesial, &l.cej_distal})
    *p += Eigen::Vector3d(0, 2.5, 0);
  try {
    import_tooth_surface(temp_path("tooth.stl"), l, "tooth.surface");
    ADD_FAILURE() << "accepted";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("long axis"), std::string::npos) << e.what();
  }
}

TEST_F(ScanRoundTrip, PrincipalAxisProposalFindsTheLongAxis) {
  const ToothPlacement p = principal_axis_proposal(*surface_);
  // derived: the parametric incisor's long axis is z; the proposal's z must be within 10 deg.
  EXPECT_GT(p.rotation.row(2).dot(Eigen::RowVector3d::UnitZ()), std::cos(10 * M_PI / 180));
}

// Bad surfaces: each refused with an InputError naming the defect.
struct BadSurface {
  std::string name;
  std::string expected;  // words the message must contain
  std::function<void(const std::string& path, const SurfaceMesh& good)> write;
};
std::ostream& operator<<(std::ostream& os, const BadSurface& b) { return os << b.name; }

class BadSurfaces : public ::testing::TestWithParam<BadSurface> {};

TEST_P(BadSurfaces, AreRefusedNamingTheDefect) {
  const SurfaceMesh good = tooth_surface_triangles(ModelSpec(), 48, 60);
  const std::string ext = GetParam().name == "garbage_obj" ? "obj" : "stl";
  const std::string path = temp_path(GetParam().name + "." + ext);
  GetParam().write(path, good);
  try {
    read_tooth_surface(path);
    ADD_FAILURE() << "accepted";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find(GetParam().expected), std::string::npos) << e.what();
    EXPECT_EQ(e.key(), "tooth.surface");
  }
  std::remove(path.c_str());
}

SurfaceMesh scaled(SurfaceMesh m, double f) {
  for (auto& v : m.vertices) v *= f;
  return m;
}

INSTANTIATE_TEST_SUITE_P(
    Table, BadSurfaces,
    ::testing::Values(
        BadSurface{"open", "not closed",
                   [](const std::string& p, SurfaceMesh m) {
                     m.triangles.erase(m.triangles.begin() + 100);
                     write_stl(m, p, true);
                   }},
        BadSurface{
            "non_manifold", "not manifold",
            [](const std::string& p, SurfaceMesh m) {
              // A flap: a third triangle on an existing edge.
              const auto tri = m.triangles[100];
              m.vertices.push_back(m.vertices[tri[0]] + Eigen::Vector3d(0, 0, 3));
              m.triangles.push_back({tri[0], tri[1], static_cast<int>(m.vertices.size()) - 1});
              write_stl(m, p, true);
            }},
        BadSurface{"inverted", "inverted orientation",
                   [](const std::string& p, SurfaceMesh m) {
                     for (auto& f : m.triangles) std::swap(f[1], f[2]);
                     write_stl(m, p, true);
                   }},
        BadSurface{"inconsistent", "inconsistent orientation",
                   [](const std::string& p, SurfaceMesh m) {
                     std::swap(m.triangles[100][1], m.triangles[100][2]);
                     write_stl(m, p, true);
                   }},
        BadSurface{"self_intersecting", "self-intersections",
                   [](const std::string& p, SurfaceMesh m) {
                     // Two overlapping copies of the tooth: each closed, together crossing.
                     const int n = static_cast<int>(m.vertices.size());
                     const size_t n_t = m.triangles.size();
                     for (int v = 0; v < n; ++v)
                       m.vertices.push_back(m.vertices[v] + Eigen::Vector3d(1.0, 0.5, 0));
                     for (size_t f = 0; f < n_t; ++f)
                       m.triangles.push_back(
                           {m.triangles[f][0] + n, m.triangles[f][1] + n, m.triangles[f][2] + n});
                     write_stl(m, p, true);
                   }},
        BadSurface{"degenerate", "degenerate triangle",
                   [](const std::string& p, SurfaceMesh m) {
                     // Collapse one vertex onto its neighbour: zero-area triangles.
                     const auto tri = m.triangles[100];
                     m.vertices[tri[0]] = m.vertices[tri[1]];
                     write_stl(m, p, false);
                   }},
        BadSurface{"metres", "metres",
                   [](const std::string& p, const SurfaceMesh& m) {
                     write_stl(scaled(m, 1e-3), p, true);
                   }},
        BadSurface{
            "scale_1000x", "micrometres",
            [](const std::string& p, const SurfaceMesh& m) { write_stl(scaled(m, 1e3), p, true); }},
        BadSurface{
            "implausible", "implausible size",
            [](const std::string& p, const SurfaceMesh& m) { write_stl(scaled(m, 3), p, true); }},
        BadSurface{"too_few", "too few triangles",
                   [](const std::string& p, const SurfaceMesh&) {
                     write_stl(tooth_surface_triangles(ModelSpec(), 8, 8), p, true);
                   }},
        BadSurface{"empty", "empty",
                   [](const std::string& p, const SurfaceMesh&) { std::ofstream(p).flush(); }},
        BadSurface{"truncated_binary", "truncated binary STL",
                   [](const std::string& p, const SurfaceMesh& m) {
                     write_stl(m, p, true);
                     std::ifstream in(p, std::ios::binary);
                     std::string bytes((std::istreambuf_iterator<char>(in)),
                                       std::istreambuf_iterator<char>());
                     std::ofstream(p, std::ios::binary) << bytes.substr(0, bytes.size() / 2);
                   }},
        BadSurface{"garbage", "not a readable",
                   [](const std::string& p, const SurfaceMesh&) {
                     std::ofstream out(p, std::ios::binary);
                     for (int i = 0; i < 5000; ++i) out << static_cast<char>((i * 7919) % 251);
                   }},
        BadSurface{"garbage_obj", "not a readable",
                   [](const std::string& p, const SurfaceMesh&) {
                     std::ofstream(p) << "this is not a surface\nv 1 2\nf 1 2 9\n";
                   }}),
    [](const ::testing::TestParamInfo<BadSurface>& i) { return i.param.name; });

// PLY and OBJ written here by hand (the open formats' plain-text forms), read through CGAL.
TEST(SurfaceFormats, PlyAndObjReadLikeStl) {
  const SurfaceMesh m = tooth_surface_triangles(ModelSpec(), 40, 50);
  const std::string ply = temp_path("tooth.ply"), obj = temp_path("tooth.obj");
  {
    std::ofstream out(ply);
    out.precision(17);
    out << "ply\nformat ascii 1.0\ncomment invented test surface\nelement vertex "
        << m.vertices.size() << "\nproperty double x\nproperty double y\nproperty double z\n"
        << "element face " << m.triangles.size()
        << "\nproperty list uchar int vertex_indices\nend_header\n";
    for (const auto& v : m.vertices) out << v.x() << ' ' << v.y() << ' ' << v.z() << '\n';
    for (const auto& t : m.triangles) out << "3 " << t[0] << ' ' << t[1] << ' ' << t[2] << '\n';
  }
  {
    std::ofstream out(obj);
    out.precision(17);
    out << "# invented test surface\n";
    for (const auto& v : m.vertices) out << "v " << v.x() << ' ' << v.y() << ' ' << v.z() << '\n';
    for (const auto& t : m.triangles)
      out << "f " << t[0] + 1 << ' ' << t[1] + 1 << ' ' << t[2] + 1 << '\n';
  }
  for (const std::string& path : {ply, obj}) {
    SCOPED_TRACE(path);
    const SurfaceMesh r = read_tooth_surface(path);
    // derived: the same closed surface, so the same counts and the same vertex positions.
    EXPECT_EQ(r.vertices.size(), m.vertices.size());
    EXPECT_EQ(r.triangles.size(), m.triangles.size());
    EXPECT_NEAR((r.vertices[5] - m.vertices[5]).norm(), 0.0, 1e-9);
    std::remove(path.c_str());
  }
}

TEST(ToothLandmarks, InconsistentLandmarksAreRefused) {
  ToothLandmarks l = landmarks_of(ModelSpec());
  ToothLandmarks same_side = l;
  same_side.cej_distal = same_side.cej_mesial;
  EXPECT_THROW(placement_from_landmarks(same_side, "tooth.surface"), InputError);
  ToothLandmarks short_axis = l;
  short_axis.crown_tip = l.apex + Eigen::Vector3d(0, 0, 2);
  EXPECT_THROW(placement_from_landmarks(short_axis, "tooth.surface"), InputError);
  // Mesial and distal swapped: the tooth of the other side, mirrored.
  std::swap(l.cej_mesial, l.cej_distal);
  EXPECT_TRUE(placement_from_landmarks(l, "tooth.surface").mirrored);
}

TEST(FileSha256, KnownDigest) {
  const std::string p = temp_path("abc.txt");
  std::ofstream(p) << "abc";
  // published: FIPS 180-2 appendix B.1 test vector for "abc".
  EXPECT_EQ(file_sha256(p), "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  std::remove(p.c_str());
}

}  // namespace
}  // namespace sharpey::mesh
