// Meshing benchmark (prints figures, not a test): time, node and element counts, degrees of
// freedom and mesh quality per preset for the maxillary central incisor, healthy and with 4 mm of
// horizontal bone loss. Usage: bench_mesh [repetitions]
#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <exception>

#include "sharpey/mesh/mesh_statistics.h"
#include "sharpey/mesh/tooth_model.h"

int main(int argc, char** argv) {
  using namespace sharpey::mesh;
  const int repetitions = argc > 1 ? std::max(1, std::atoi(argv[1])) : 1;
  std::printf("%-9s %-8s %9s %9s %9s %10s %7s %7s %9s %9s\n", "preset", "loss_mm", "time_s",
              "nodes", "elements", "dofs", "pdl_el", "layers", "min_dih", "min_jac");
  try {
    for (MeshPreset preset : {MeshPreset::kCoarse, MeshPreset::kStandard, MeshPreset::kFine}) {
      for (double loss : {0.0, 4.0}) {
        ModelSpec spec;
        spec.sizing.preset = preset;
        spec.loss.horizontal_mm = loss;
        double best = 1e300;
        ToothModel model;
        for (int r = 0; r < repetitions; ++r) {
          const auto t0 = std::chrono::steady_clock::now();
          model = build_tooth_model(spec);
          const auto t1 = std::chrono::steady_clock::now();
          best = std::min(best, std::chrono::duration<double>(t1 - t0).count());
        }
        const MeshStatistics s = measure(model.mesh);
        std::printf("%-9s %-8.1f %9.2f %9d %9d %10d %7d %7d %9.2f %9.3f\n",
                    to_string(preset).c_str(), loss, best, s.n_nodes, s.n_elements, 3 * s.n_nodes,
                    s.elements_per_region.count(kPdl) ? s.elements_per_region.at(kPdl) : 0,
                    resolve_sizing(spec.sizing).pdl_layers, s.min_dihedral_deg,
                    s.min_jacobian_ratio);
      }
    }
  } catch (const std::exception& e) {
    std::fprintf(stderr, "bench_mesh: %s\n", e.what());
    return 1;
  }
  return 0;
}
