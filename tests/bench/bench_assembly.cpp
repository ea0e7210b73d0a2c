// Measures the choices made in the fem library: assembly strategy (coloured, atomic, serial) and
// the fill-reducing ordering of the CHOLMOD factorisation (AMD, METIS, NESDIS, CHOLMOD's default),
// on unstructured TetGen meshes of an invented three-layer block (stiff core, thin soft layer,
// stiff shell), 10-node elements. Prints figures; not a test.
//
// usage: bench_assembly [--analyse-only] [max element volume mm^3 ...]   (default: 1.0 0.3)
// The numeric factorisation is run for METIS and NESDIS only (AMD's fill is far larger on these
// meshes, see the analysis lines).
#include <omp.h>

#include <array>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <map>
#include <string>
#include <vector>

#include "sharpey/fem/elasticity.h"
#include "sharpey/mesh/second_order.h"
#include "sharpey/mesh/tetrahedralize.h"
#include "sharpey/startup/blas_kernels.h"

namespace {

using sharpey::fem::AssemblyOptions;
using sharpey::fem::AssemblyStatistics;
using sharpey::fem::AssemblyStrategy;

// Nested boxes: core [-h,h], layer to h + t, shell to H; faces of the outer box are fixed.
sharpey::mesh::Plc nested_boxes(double max_volume) {
  sharpey::mesh::Plc plc;
  // Each face split into n x n squares (two triangles each) on a lattice shared by the faces.
  auto add_box = [&plc](double h, double top, int marker) {
    const int n = 8;
    std::map<std::array<int, 3>, int> id;
    auto point = [&](int i, int j, int k) {
      const std::array<int, 3> key{i, j, k};
      const auto it = id.find(key);
      if (it != id.end()) return it->second;
      const double bottom = -2.0 * h;
      plc.points.emplace_back(-h + 2.0 * h * i / n, -h + 2.0 * h * j / n,
                              bottom + (top - bottom) * k / n);
      return id[key] = static_cast<int>(plc.points.size()) - 1;
    };
    for (int axis = 0; axis < 3; ++axis) {
      for (int side = 0; side <= n; side += n) {
        for (int a = 0; a < n; ++a) {
          for (int b = 0; b < n; ++b) {
            std::array<int, 3> c[4];
            const int da[4] = {0, 1, 1, 0}, db[4] = {0, 0, 1, 1};
            for (int q = 0; q < 4; ++q) {
              c[q][axis] = side;
              c[q][(axis + 1) % 3] = a + da[q];
              c[q][(axis + 2) % 3] = b + db[q];
            }
            int v[4];
            for (int q = 0; q < 4; ++q) v[q] = point(c[q][0], c[q][1], c[q][2]);
            plc.triangles.push_back({v[0], v[1], v[2]});
            plc.triangles.push_back({v[0], v[2], v[3]});
            plc.triangle_marker.push_back(marker);
            plc.triangle_marker.push_back(marker);
          }
        }
      }
    }
  };
  add_box(2.0, 4.0, 1);
  add_box(2.2, 4.2, 2);
  add_box(4.0, 5.0, 5);
  plc.regions.push_back({Eigen::Vector3d(0, 0, 0), 1, max_volume});
  plc.regions.push_back({Eigen::Vector3d(2.1, 0, 0), 2, max_volume / 20});
  plc.regions.push_back({Eigen::Vector3d(3.0, 0, 0), 3, max_volume});
  return plc;
}

double seconds(std::chrono::steady_clock::time_point t0) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
}

}  // namespace

int main(int argc, char** argv) {
  sharpey::startup::use_fast_blas_kernels(argv);
  std::setvbuf(stdout, nullptr, _IOLBF, 0);  // line-buffered even into a file
  std::vector<double> volumes;
  bool factorise = true;
  for (int i = 1; i < argc; ++i) {
    if (std::string(argv[i]) == "--analyse-only") {
      factorise = false;
    } else {
      volumes.push_back(std::atof(argv[i]));
    }
  }
  if (volumes.empty()) volumes = {1.0, 0.3};
  const sharpey::fem::MaterialTable materials{
      {1, {18600, 0.31}}, {2, {0.47, 0.45}}, {3, {13700, 0.3}}};
  std::printf("threads available: %d\n", omp_get_max_threads());
  for (double v : volumes) {
    sharpey::mesh::TetgenOptions options;
    options.second_order = false;
    options.max_volume_mm3 = v;
    const sharpey::mesh::VolumeMesh linear =
        sharpey::mesh::tetrahedralize(nested_boxes(v), options);
    const sharpey::mesh::VolumeMesh m = sharpey::mesh::make_second_order(linear);
    std::printf("\nmesh: max volume %.4g mm^3, %d elements, %d nodes, %d dofs\n", v, m.n_elements(),
                m.n_nodes(), 3 * m.n_nodes());
    struct Run {
      const char* name;
      AssemblyStrategy strategy;
      int threads;
    };
    for (const Run& r : {Run{"serial", AssemblyStrategy::kSerial, 1},
                         Run{"partitioned 2 threads", AssemblyStrategy::kPartitioned, 2}}) {
      double best = 1e300;
      AssemblyStatistics stats;
      for (int rep = 0; rep < 3; ++rep) {
        const auto t0 = std::chrono::steady_clock::now();
        const auto K = sharpey::fem::assemble_stiffness(
            m, materials, AssemblyOptions{r.strategy, r.threads}, &stats);
        best = std::min(best, seconds(t0));
      }
      std::printf(
          "  assembly %-22s best of 3 %.3f s (pattern %.3f, partition %.3f, values %.3f; "
          "%lld interface elements), nnz %lld\n",
          r.name, best, stats.pattern_s, stats.colouring_s, stats.values_s,
          stats.n_interface_elements, stats.n_nonzeros);
    }
    const std::vector<sharpey::fem::DofConstraint> fixed = sharpey::fem::fix_faces(m, 5);
    const auto K = sharpey::fem::assemble_stiffness(m, materials);
    using sharpey::fem::Ordering;
    for (Ordering o : {Ordering::kAuto, Ordering::kAmd, Ordering::kMetis, Ordering::kNesdis,
                       Ordering::kMetisNodes}) {
      const sharpey::fem::OrderingEstimate e = sharpey::fem::estimate_ordering(K, fixed, o);
      std::printf("  analysis %-7s -> %-7s %.2f s, %.1f GFlop, nnz(L) %.1f M\n",
                  sharpey::fem::to_string(o).c_str(), e.ordering.c_str(), e.analyse_s,
                  e.factorisation_gflop, e.factor_nonzeros / 1e6);
    }
    if (!factorise) continue;
    for (Ordering o : {Ordering::kMetis, Ordering::kNesdis, Ordering::kMetisNodes}) {
      sharpey::fem::SolverOptions so;
      so.ordering = o;
      const sharpey::fem::LinearElasticSolver solver(m, materials, fixed, so);
      Eigen::MatrixXd F = Eigen::MatrixXd::Zero(3 * m.n_nodes(), 6);
      for (int j = 0; j < 6; ++j) F(3 * (m.n_nodes() / 2) + j % 3, j) = 1.0;
      solver.solve(F);
      const auto& s = solver.statistics();
      std::printf(
          "  solver %-7s assembly %.2f s, analyse %.2f s, factorise %.2f s (%.1f GFlop/s), L %.0f "
          "MB, "
          "6-RHS solve %.3f s, residual %.1e, min pivot ratio %.1e\n",
          s.ordering.c_str(), s.assembly_s, s.analyse_s, s.factorise_s,
          s.factorisation_gflop / s.factorise_s, s.factor_mb, s.last_solve_s,
          s.last_relative_residual, s.min_pivot_ratio);
    }
  }
  return 0;
}
