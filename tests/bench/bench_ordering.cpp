// Benchmark (prints, not a test): the analysis stage of the incisor's bone levels. For each level
// (horizontal loss 0, 2, 4 and 6 mm, the sample case's) on one preset it meshes and assembles the
// model, then times the node ordering alone (fem::order_nodes: node graph and METIS, what the
// solver runs beside the assembly), the whole analysis (fem::estimate_ordering: the ordering
// and CHOLMOD's symbolic factorisation, from K) and the same from the mesh alone
// (fem::SymbolicFactorisation, what a study computes ahead), and prints the factorisation work and
// the entries of L that the ordering gives. No numeric factorisation: a few seconds per level.
// Other processes slow every time down (check `uptime`); the GFlop and nnz(L) do not depend on the
// machine.
//
//   bench_ordering [--preset coarse|standard|fine] [--repeat N]
#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <exception>

#include "sharpey/error.h"
#include "sharpey/fem/elasticity.h"
#include "sharpey/mesh/tooth_model.h"
#include "sharpey/startup/blas_kernels.h"

namespace {

using namespace sharpey;
using Clock = std::chrono::steady_clock;

double seconds_since(Clock::time_point t0) {
  return std::chrono::duration<double>(Clock::now() - t0).count();
}

// Materials as in check-values.md section 1 (published); they do not change the pattern.
const fem::MaterialTable kMaterials = {{mesh::kTooth, {18600.0, 0.31}},
                                       {mesh::kPdl, {0.47, 0.45}},
                                       {mesh::kCorticalBone, {13700.0, 0.30}},
                                       {mesh::kCancellousBone, {1370.0, 0.30}}};

void run_level(mesh::MeshPreset preset, double loss_mm, int repeat) {
  mesh::ModelSpec spec;
  spec.sizing.preset = preset;
  spec.loss.horizontal_mm = loss_mm;
  const mesh::ToothModel model = mesh::build_tooth_model(spec);
  const Eigen::SparseMatrix<double> K = fem::assemble_stiffness(model.mesh, kMaterials);
  const std::vector<fem::DofConstraint> fixed = fem::fix_faces(model.mesh, mesh::kFixedBone);
  for (int r = 0; r < repeat; ++r) {
    const auto t0 = Clock::now();
    const std::vector<int> order = fem::order_nodes(model.mesh, fixed);
    const double order_s = seconds_since(t0);
    const fem::OrderingEstimate e = fem::estimate_ordering(K, fixed, fem::Ordering::kMetisNodes);
    const fem::SymbolicFactorisation ahead(model.mesh, fixed);
    std::printf("%6.1f %8d %9zu %10.3f %10.3f %9.3f %9.2f %11lld %s\n", loss_mm,
                model.mesh.n_elements(), order.size(), order_s, e.analyse_s, ahead.analyse_s(),
                e.factorisation_gflop, e.factor_nonzeros,
                ahead.factorisation_gflop() == e.factorisation_gflop ? "same" : "DIFFERENT");
    std::fflush(stdout);
  }
}

}  // namespace

int main(int argc, char** argv) {
  sharpey::startup::use_fast_blas_kernels(argv);
  mesh::MeshPreset preset = mesh::MeshPreset::kStandard;
  int repeat = 1;
  for (int i = 1; i < argc; ++i) {
    try {
      if (std::strcmp(argv[i], "--preset") == 0 && i + 1 < argc) {
        preset = mesh::mesh_preset_from_string(argv[++i]);
      } else if (std::strcmp(argv[i], "--repeat") == 0 && i + 1 < argc) {
        repeat = std::max(1, std::atoi(argv[++i]));
      } else {
        std::fprintf(stderr,
                     "bench_ordering: unknown option '%s'; use --preset coarse|standard|fine or "
                     "--repeat N\n",
                     argv[i]);
        return 2;
      }
    } catch (const sharpey::Error& e) {
      std::fprintf(stderr, "bench_ordering: %s\n", e.what());
      return 2;
    }
  }
  std::printf("bench_ordering: %s preset\n", mesh::to_string(preset).c_str());
  std::printf("%6s %8s %9s %10s %10s %9s %9s %11s %s\n", "loss", "elements", "nodes", "order_s",
              "analyse_s", "ahead_s", "GFlop", "nnz(L)", "ahead's GFlop");
  try {
    for (double loss : {0.0, 2.0, 4.0, 6.0}) run_level(preset, loss, repeat);
  } catch (const std::exception& e) {
    std::fprintf(stderr, "bench_ordering: %s\n", e.what());
    return 1;
  }
  return 0;
}
