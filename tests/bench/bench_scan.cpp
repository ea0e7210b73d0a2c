// Benchmark (prints, not a test) for scanned tooth surfaces, and the generator of the invented
// sample scan.
//
//   bench_scan [--preset coarse|standard|fine] [--triangles N]
//       A scan of about N triangles (default 200000: the maxillary central incisor's parametric
//       surface re-tessellated, with 0.01 mm noise) to results: time to read, check and resample,
//       to mesh and solve (healthy scenario), and to evaluate. Default preset: standard.
//   bench_scan --round-trip [--preset P]
//       The parametric incisor against its own surface written to STL and imported: root area,
//       peak pressure, 95th percentile and CRes of both (the issue's acceptance on the standard
//       preset; the CTest test analysis_test_scan_import checks the coarse preset).
//   bench_scan --write-sample FOLDER
//       Writes the invented sample scan (a maxillary canine) and prints its landmarks.
#include <sys/resource.h>
#include <unistd.h>

#include <Eigen/Geometry>
#include <chrono>
#include <cstdio>
#include <cstring>
#include <fstream>
#include <random>
#include <sstream>
#include <string>

#include "sharpey/analysis/case_spec.h"
#include "sharpey/analysis/study.h"
#include "sharpey/error.h"
#include "sharpey/mesh/tooth_model.h"
#include "sharpey/mesh/tooth_surface.h"
#include "sharpey/startup/blas_kernels.h"

namespace {

using namespace sharpey;
using Clock = std::chrono::steady_clock;
double seconds_since(Clock::time_point t0) {
  return std::chrono::duration<double>(Clock::now() - t0).count();
}

std::string vec(const Eigen::Vector3d& v) {
  std::ostringstream s;
  s.precision(10);
  s << "[" << v.x() << ", " << v.y() << ", " << v.z() << "]";
  return s.str();
}

// Measurement-like noise: each vertex moved along its normal by a normal deviate of sigma_mm,
// tapered to zero within 1 mm of the long axis (the tiny triangles at the poles would fold).
void add_noise(mesh::SurfaceMesh* s, double sigma_mm, unsigned seed) {
  std::vector<Eigen::Vector3d> normals(s->vertices.size(), Eigen::Vector3d::Zero());
  for (const auto& t : s->triangles) {
    const Eigen::Vector3d n =
        (s->vertices[t[1]] - s->vertices[t[0]]).cross(s->vertices[t[2]] - s->vertices[t[0]]);
    for (int k = 0; k < 3; ++k) normals[t[k]] += n;
  }
  std::mt19937 rng(seed);
  std::normal_distribution<double> noise(0.0, sigma_mm);
  for (size_t v = 0; v < s->vertices.size(); ++v) {
    const double taper = std::min(1.0, s->vertices[v].head<2>().norm() / 1.0);
    s->vertices[v] += taper * noise(rng) * normals[v].normalized();
  }
}

mesh::ToothLandmarks landmarks_of(const mesh::ModelSpec& spec, const Eigen::Affine3d& motion) {
  const mesh::ModelGeometry g = mesh::model_geometry(spec);
  const mesh::RootSection cej = mesh::root_section(spec, 0.0);
  mesh::ToothLandmarks l;
  l.apex = motion * g.apex;
  l.crown_tip = motion * g.crown_tip;
  l.cej_labial = motion * Eigen::Vector3d(cej.labiolingual_half_mm, 0, 0);
  l.cej_lingual = motion * Eigen::Vector3d(-cej.labiolingual_half_mm, 0, 0);
  l.cej_mesial = motion * Eigen::Vector3d(0, cej.mesiodistal_half_mm, 0);
  l.cej_distal = motion * Eigen::Vector3d(0, -cej.mesiodistal_half_mm, 0);
  return l;
}

std::string landmarks_json(const mesh::ToothLandmarks& l) {
  return "{\"apex\": " + vec(l.apex) + ", \"crown_tip\": " + vec(l.crown_tip) +
         ", \"cej_labial\": " + vec(l.cej_labial) + ", \"cej_lingual\": " + vec(l.cej_lingual) +
         ", \"cej_mesial\": " + vec(l.cej_mesial) + ", \"cej_distal\": " + vec(l.cej_distal) + "}";
}

std::string case_json(const std::string& type, const std::string& surface,
                      const std::string& preset) {
  return R"({"schema_version": 1, "label": "Invented benchmark case",
  "tooth": {"type": ")" +
         type + "\"" + surface + R"(},
  "pdl": {"width_mm": 0.2},
  "scenarios": [{"name": "healthy", "horizontal_loss_mm": 0}],
  "load": {"magnitude": 100, "unit": "g", "direction": "lingual"},
  "mesh": {"preset": ")" +
         preset + R"("}})";
}

void print_results(const char* what, const analysis::Study& study, double area_mm2) {
  for (const analysis::ScenarioResult& r : study.evaluate(study.spec().load)) {
    std::printf(
        "%-10s root area %8.2f mm^2  peak %7.3f kPa  p95 %7.3f kPa  CRes %6.3f mm below the "
        "crest\n",
        what, area_mm2, r.pressure_max_compression_kpa, r.pressure_p95_compression_kpa,
        r.cres_labiolingual.from_crest_mm);
  }
}

}  // namespace

int main(int argc, char** argv) {
  startup::use_fast_blas_kernels(argv);
  std::string preset = "standard", sample_folder;
  bool round_trip = false;
  long n_triangles = 200000;
  for (int i = 1; i < argc; ++i) {
    if (std::strcmp(argv[i], "--preset") == 0 && i + 1 < argc) {
      preset = argv[++i];
    } else if (std::strcmp(argv[i], "--triangles") == 0 && i + 1 < argc) {
      n_triangles = std::atol(argv[++i]);
    } else if (std::strcmp(argv[i], "--round-trip") == 0) {
      round_trip = true;
    } else if (std::strcmp(argv[i], "--write-sample") == 0 && i + 1 < argc) {
      sample_folder = argv[++i];
    } else {
      std::fprintf(stderr, "unknown argument %s\n", argv[i]);
      return 2;
    }
  }
  try {
    if (!sample_folder.empty()) {
      // The invented sample: a handbook-average maxillary canine, re-tessellated (90 columns,
      // 110 rings), 0.01 mm noise, placed in made-up scanner coordinates; landmarks picked with
      // 0.05 mm error.
      mesh::ModelSpec spec;
      spec.tooth.type = mesh::ToothType::kMaxillaryCanine;
      spec.tooth.dimensions = mesh::handbook_dimensions(spec.tooth.type);
      mesh::SurfaceMesh s = mesh::tooth_surface_triangles(spec, 90, 110, 0.021);
      add_noise(&s, 0.01, 14);
      const Eigen::Affine3d motion =
          Eigen::Translation3d(12.4, 48.1, -3.7) *
          Eigen::AngleAxisd(2.1, Eigen::Vector3d(0.3, -0.8, 0.5).normalized());
      for (auto& v : s.vertices) v = motion * v;
      mesh::ToothLandmarks l = landmarks_of(spec, motion);
      std::mt19937 rng(7);
      std::normal_distribution<double> pick(0.0, 0.05 / std::sqrt(3.0));
      for (Eigen::Vector3d* p :
           {&l.apex, &l.crown_tip, &l.cej_labial, &l.cej_lingual, &l.cej_mesial, &l.cej_distal})
        *p += Eigen::Vector3d(pick(rng), pick(rng), pick(rng));
      const std::string path = sample_folder + "/invented_scan_maxillary_canine.stl";
      mesh::write_stl(s, path, true, "invented sample, not patient data (Sharpey bench_scan)");
      std::printf("wrote %s: %zu triangles\nlandmarks: %s\n", path.c_str(), s.triangles.size(),
                  landmarks_json(l).c_str());
      return 0;
    }

    const std::string folder = "/tmp/sharpey_bench_scan_" + std::to_string(getpid());
    const std::string mkdir = "mkdir -p " + folder;
    if (std::system(mkdir.c_str()) != 0) return 1;
    const mesh::ModelSpec base;
    if (round_trip) {
      const mesh::SurfaceMesh s = mesh::tooth_surface_triangles(base, 120, 300, 0.0123);
      mesh::write_stl(s, folder + "/incisor.stl", true);
      const std::string surface = ", \"surface\": {\"file\": \"incisor.stl\", \"landmarks\": " +
                                  landmarks_json(landmarks_of(base, Eigen::Affine3d::Identity())) +
                                  "}";
      const auto a = analysis::parse_case(case_json("maxillary_central_incisor", "", preset));
      const auto b = analysis::parse_case(case_json("maxillary_central_incisor", surface, preset),
                                          "case", folder);
      std::printf("round trip, %s preset, %zu-triangle STL\n", preset.c_str(), s.triangles.size());
      print_results("parametric", analysis::Study(a), mesh::model_geometry(a.model).root_area_mm2);
      print_results("imported", analysis::Study(b), mesh::model_geometry(b.model).root_area_mm2);
    } else {
      const int n_columns = static_cast<int>(std::lround(std::sqrt(n_triangles / 2.0)));
      const int n_rings = static_cast<int>(n_triangles / (2 * n_columns));
      mesh::SurfaceMesh s = mesh::tooth_surface_triangles(base, n_columns, n_rings, 0.0123);
      add_noise(&s, 0.01, 3);
      mesh::write_stl(s, folder + "/scan.stl", true);
      const std::string surface = ", \"surface\": {\"file\": \"scan.stl\", \"landmarks\": " +
                                  landmarks_json(landmarks_of(base, Eigen::Affine3d::Identity())) +
                                  "}";
      std::printf("scan of %zu triangles to results, %s preset (load average: see uptime)\n",
                  s.triangles.size(), preset.c_str());
      const auto t0 = Clock::now();
      const auto spec = analysis::parse_case(
          case_json("maxillary_central_incisor", surface, preset), "case", folder);
      const double t_import = seconds_since(t0);
      const auto t1 = Clock::now();
      const analysis::Study study(spec);
      const double t_solve = seconds_since(t1);
      const auto t2 = Clock::now();
      print_results("scan", study, mesh::model_geometry(spec.model).root_area_mm2);
      const double t_eval = seconds_since(t2);
      std::printf(
          "read, check, place, resample  %7.2f s\nmesh and solve                %7.2f s\n"
          "evaluate                      %7.2f s\ntotal                         %7.2f s\n",
          t_import, t_solve, t_eval, seconds_since(t0));
    }
    const std::string rm = "rm -rf " + folder;
    return std::system(rm.c_str()) == 0 ? 0 : 1;
  } catch (const Error& e) {
    std::fprintf(stderr, "error: %s\n", e.what());
    return 1;
  }
}
