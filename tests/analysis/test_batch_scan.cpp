// sharpey-batch on scanned tooth surfaces: each bad surface refused with exit 2 and a message
// naming the defect (the issue's table); the invented sample scan runs and its outputs name the
// file and its checksum.
#include <gtest/gtest.h>

#include <functional>
#include <nlohmann/json.hpp>
#include <string>

#include "sharpey/analysis/case_spec.h"
#include "sharpey/mesh/tooth_model.h"
#include "sharpey/mesh/tooth_surface.h"
#include "support/batch_process.h"

namespace sharpey::test {
namespace {

using Json = nlohmann::ordered_json;

std::string vec(const Eigen::Vector3d& v) {
  std::ostringstream s;
  s.precision(12);
  s << "[" << v.x() << ", " << v.y() << ", " << v.z() << "]";
  return s.str();
}

// The coarse incisor case with tooth.surface naming `file` and the parametric landmarks.
std::string scan_case(const std::string& file) {
  const mesh::ModelSpec spec;
  const mesh::ModelGeometry g = mesh::model_geometry(spec);
  const mesh::RootSection cej = mesh::root_section(spec, 0.0);
  const double a = cej.labiolingual_half_mm, b = cej.mesiodistal_half_mm;
  Json j = Json::parse(coarse_case_json(1));
  j["tooth"]["surface"] =
      Json::parse(R"({"file": ")" + file + R"(", "landmarks": {"apex": )" + vec(g.apex) +
                  R"(, "crown_tip": )" + vec(g.crown_tip) + R"(, "cej_labial": )" + vec({a, 0, 0}) +
                  R"(, "cej_lingual": )" + vec({-a, 0, 0}) + R"(, "cej_mesial": )" +
                  vec({0, b, 0}) + R"(, "cej_distal": )" + vec({0, -b, 0}) + "}}");
  return j.dump(2);
}

mesh::SurfaceMesh scaled(mesh::SurfaceMesh m, double f) {
  for (auto& v : m.vertices) v *= f;
  return m;
}

struct BadSurface {
  std::string name;
  std::string fragment;  // the defect's name in the message
  std::function<void(const std::string& path, mesh::SurfaceMesh m)> write;
};
std::ostream& operator<<(std::ostream& os, const BadSurface& b) { return os << b.name; }

class BatchBadSurface : public ::testing::TestWithParam<BadSurface> {};

TEST_P(BatchBadSurface, ExitsTwoNamingTheDefect) {
  TempFolder folder("batch_scan");
  GetParam().write(folder / "tooth.stl", mesh::tooth_surface_triangles(mesh::ModelSpec(), 60, 80));
  write_file(folder / "case.json", scan_case("tooth.stl"));
  const ProcessResult r = run_batch({"run", folder / "case.json", "--out", folder / "out"});
  EXPECT_EQ(r.exit_code, 2) << r.err;  // exit code 2: bad input (docs/case-format.md)
  EXPECT_NE(r.err.find(GetParam().fragment), std::string::npos) << r.err;
  EXPECT_NE(r.err.find("tooth.surface"), std::string::npos) << r.err;
  EXPECT_FALSE(exists(folder / "out"));
}

INSTANTIATE_TEST_SUITE_P(
    Table, BatchBadSurface,
    ::testing::Values(
        BadSurface{"open", "not closed",
                   [](const std::string& p, mesh::SurfaceMesh m) {
                     m.triangles.pop_back();
                     mesh::write_stl(m, p, true);
                   }},
        BadSurface{
            "non_manifold", "not manifold",
            [](const std::string& p, mesh::SurfaceMesh m) {
              const auto tri = m.triangles[50];
              m.vertices.push_back(m.vertices[tri[0]] + Eigen::Vector3d(0, 0, 2));
              m.triangles.push_back({tri[0], tri[1], static_cast<int>(m.vertices.size()) - 1});
              mesh::write_stl(m, p, true);
            }},
        BadSurface{"inverted", "inverted orientation",
                   [](const std::string& p, mesh::SurfaceMesh m) {
                     for (auto& f : m.triangles) std::swap(f[1], f[2]);
                     mesh::write_stl(m, p, true);
                   }},
        BadSurface{"self_intersecting", "self-intersections",
                   [](const std::string& p, mesh::SurfaceMesh m) {
                     const int n = static_cast<int>(m.vertices.size());
                     const size_t n_t = m.triangles.size();
                     for (int v = 0; v < n; ++v)
                       m.vertices.push_back(m.vertices[v] + Eigen::Vector3d(1.0, 0.5, 0));
                     for (size_t f = 0; f < n_t; ++f)
                       m.triangles.push_back(
                           {m.triangles[f][0] + n, m.triangles[f][1] + n, m.triangles[f][2] + n});
                     mesh::write_stl(m, p, true);
                   }},
        BadSurface{"scale_1000x", "micrometres",
                   [](const std::string& p, const mesh::SurfaceMesh& m) {
                     mesh::write_stl(scaled(m, 1000), p, true);
                   }},
        BadSurface{"metres", "metres",
                   [](const std::string& p, const mesh::SurfaceMesh& m) {
                     mesh::write_stl(scaled(m, 0.001), p, false);
                   }},
        BadSurface{"empty", "empty",
                   [](const std::string& p, const mesh::SurfaceMesh&) { write_file(p, ""); }},
        BadSurface{"truncated_binary", "truncated binary STL",
                   [](const std::string& p, const mesh::SurfaceMesh& m) {
                     mesh::write_stl(m, p, true);
                     const std::string bytes = read_file(p);
                     write_file(p, bytes.substr(0, 84 + 50 * 1000 + 17));
                   }},
        BadSurface{"garbage", "not a readable",
                   [](const std::string& p, const mesh::SurfaceMesh&) {
                     std::string junk;
                     for (int i = 0; i < 4000; ++i)
                       junk += static_cast<char>((i * 7919 + 13) % 251);
                     write_file(p, junk);
                   }},
        BadSurface{"missing_file", "cannot be opened",
                   [](const std::string&, const mesh::SurfaceMesh&) {}}),
    [](const ::testing::TestParamInfo<BadSurface>& i) { return i.param.name; });

TEST(BatchScanSample, RunsAndNamesTheFileAndItsChecksum) {
  TempFolder folder("batch_scan_sample");
  const ProcessResult r = run_batch({"run", sample_path("invented_scan_maxillary_canine.json"),
                                     "--out", folder / "out", "--mesh-preset", "coarse"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const Json results = Json::parse(read_file(folder / "out/results.json"));
  EXPECT_EQ(results["tooth_surface"]["file"], "invented_scan_maxillary_canine.stl");
  EXPECT_EQ(results["tooth_surface"]["sha256"].get<std::string>(),
            mesh::file_sha256(sample_path("invented_scan_maxillary_canine.stl")));
  EXPECT_NE(read_file(folder / "out/summary.txt").find("SHA-256"), std::string::npos);
  // The case's copy in the output folder reads as it stands (the surface by its absolute path).
  const analysis::CaseSpec copy = analysis::load_case(folder / "out/case.json");
  ASSERT_TRUE(copy.model.tooth.scan);
  EXPECT_EQ(copy.model.tooth.scan->source_sha256,
            results["tooth_surface"]["sha256"].get<std::string>());
}

}  // namespace
}  // namespace sharpey::test
