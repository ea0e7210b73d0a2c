// Benchmark (prints, not a test): a healthy mandibular first molar end to end, beside the 10 s
// target of issue 15:
//   1. finite elements at the standard preset's sizes (edge 0.65 mm, bone edge 2.0 mm, two PDL
//      layers, 10-node elements): build_multi_root_mesh, then multi_root_fe_cres (assembly,
//      factorisation, six unit load cases, rigid fit, CRes), time per stage;
//   2. the thin-layer estimate (surface quadrature, attachment, stiffness, two CRes, the three
//      molar movements with per-root figures and allowances).
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <ctime>

#include "sharpey/analysis/multi_root_fe.h"
#include "sharpey/analysis/multi_root_thin_layer.h"
#include "sharpey/startup/blas_kernels.h"

namespace {
using Clock = std::chrono::steady_clock;
double load_average() {
  double load[1] = {0};
  return getloadavg(load, 1) == 1 ? load[0] : -1;
}
}  // namespace

int main(int, char** argv) {
  using namespace sharpey;
  startup::use_fast_blas_kernels(argv);
  {
    const mesh::MultiRootTooth tooth =
        mesh::multi_root_handbook(mesh::MultiRootType::kMandibularFirstMolar);
    mesh::MultiRootMeshSizing sizing;
    sizing.edge_mm = 0.65;
    sizing.bone_edge_mm = 2.0;
    sizing.pdl_layers = 2;
    const Clock::time_point m0 = Clock::now();
    const std::clock_t mc0 = std::clock();
    const mesh::MultiRootMesh m = mesh::build_multi_root_mesh(tooth, mesh::MultiRootBone{}, sizing);
    const double mesh_s = std::chrono::duration<double>(Clock::now() - m0).count();
    const Clock::time_point s0 = Clock::now();
    const analysis::MultiRootFeCres fe = analysis::multi_root_fe_cres(
        m, {18600, 0.31}, {0.47, 0.45}, {1370, 0.3}, tooth.trunk_length_mm);
    const double solve_s = std::chrono::duration<double>(Clock::now() - s0).count();
    const double cpu = static_cast<double>(std::clock() - mc0) / CLOCKS_PER_SEC;
    std::printf("finite elements, standard sizes: %d nodes, %d elements, %d dofs\n",
                m.mesh.n_nodes(), m.mesh.n_elements(), fe.n_dofs);
    std::printf(
        "  mesh %.2f s, solve and CRes (6 load cases) %.2f s; end to end %.2f s wall, "
        "%.2f s CPU of this process (the mesher runs in its own process); target 10 s\n",
        mesh_s, solve_s, mesh_s + solve_s, cpu);
    std::printf("  CRes %.2f mm (buccolingual) and %.2f mm (mesiodistal) below the CEJ\n",
                fe.buccolingual.below_cej_mm, fe.mesiodistal.below_cej_mm);
  }
  const Clock::time_point t0 = Clock::now();
  const std::clock_t c0 = std::clock();
  const mesh::MultiRootTooth tooth =
      mesh::multi_root_handbook(mesh::MultiRootType::kMandibularFirstMolar);
  const analysis::MultiRootThinLayer model(tooth, mesh::MultiRootBone{}, {0.47, 0.45});
  const analysis::MultiRootCres cx = model.cres(Eigen::Vector3d::UnitX());
  const analysis::MultiRootCres cy = model.cres(Eigen::Vector3d::UnitY());
  const analysis::Thresholds thresholds = analysis::default_thresholds();
  double allowance[3] = {0, 0, 0};
  int k = 0;
  for (analysis::MolarMovement m :
       {analysis::MolarMovement::kUprighting, analysis::MolarMovement::kIntrusion,
        analysis::MolarMovement::kTranslation}) {
    model.evaluate(model.preset(m, 1.0), thresholds);
    allowance[k++] = model.allowance(m, thresholds.limit.value_kpa);
  }
  const double wall = std::chrono::duration<double>(Clock::now() - t0).count();
  const double cpu = static_cast<double>(std::clock() - c0) / CLOCKS_PER_SEC;
  std::printf(
      "healthy mandibular first molar, thin-layer estimate: %zu attached quadrature "
      "points, %.0f mm^2 attached\n",
      model.attached_points().size(), model.areas().attached_total_mm2);
  std::printf("CRes %.2f mm (buccolingual force) and %.2f mm (mesiodistal force) below the CEJ\n",
              cx.below_cej_mm, cy.below_cej_mm);
  std::printf("allowance to 16 kPa: uprighting %.2f N mm, intrusion %.2f N, translation %.2f N\n",
              allowance[0], allowance[1], allowance[2]);
  std::printf(
      "thin-layer estimate end to end: %.3f s wall, %.3f s CPU (load average %.1f, the "
      "machine is shared)\n",
      wall, cpu, load_average());
  return 0;
}
