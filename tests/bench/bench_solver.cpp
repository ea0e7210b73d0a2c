// Solver benchmark: prints figures, asserts nothing (never run by ctest).
//
// For 10-node grid meshes of about 20k, 90k and 200k degrees of freedom and for the incisor model's
// coarse / standard / fine presets (mesh::build_tooth_model, when it is available) it prints: DOFs,
// nonzeros of the free-free stiffness block, mesh, assembly, analyse and factorise times, the
// factorisation's GFlop and GFlop/s, the time of one right-hand side, the time to build the
// six-case unit-load basis (six solves in one pass plus the field recovery), the time of a new load
// by superposition (displacement + field of one region), and the process's peak resident memory so
// far (getrusage ru_maxrss; cases run in increasing size, so it is the peak of the largest case
// run). On the incisor's coarse preset (on the smallest grid when the incisor is not run) it also
// factorises the same free-free block with Eigen's SimplicialLDLT as a baseline and prints the time
// ratio and the difference between the two solutions. The machine's load average is printed first
// and last: other processes on the cores slow every figure down.
//
// Usage: bench_solver [--grid-only] [--tooth-only] [--quick] [--preset coarse|standard|fine]
//   --quick: the smallest grid only; --preset: that incisor preset only (no grids, no baseline).
// Targets (2-core machine, issue 18), printed beside each case's figures (they apply to the
// standard preset): mesh + assembly + factorisation + six solves + recovery in 2.0 s; the
// factorisation above 60 % of the 166 GFlop/s double-precision peak; system time under 10 % of the
// CPU time (this process and the mesher); peak memory at most 1.13 GB. A new load by superposition
// under 30 ms for the PDL fields.
#include <sys/resource.h>

#include <Eigen/SparseCholesky>
#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <exception>
#include <functional>
#include <string>
#include <thread>
#include <vector>

#include "sharpey/error.h"
#include "sharpey/fem/elasticity.h"
#include "sharpey/mesh/tooth_model.h"
#include "sharpey/startup/blas_kernels.h"
#include "sharpey/startup/freed_memory.h"
#include "support/grid_mesh.h"

namespace {

using namespace sharpey;
using Clock = std::chrono::steady_clock;

double seconds_since(Clock::time_point t0) {
  return std::chrono::duration<double>(Clock::now() - t0).count();
}

std::string load_average() {
  std::FILE* file = std::fopen("/proc/loadavg", "r");
  if (!file) return "(unknown)";
  char buffer[128] = {0};
  const bool ok = std::fgets(buffer, sizeof buffer, file) != nullptr;
  std::fclose(file);
  std::string text = ok ? buffer : "(unknown)";
  while (!text.empty() && (text.back() == '\n' || text.back() == ' ')) text.pop_back();
  return text;
}

double peak_rss_mb() {
  rusage usage{};
  getrusage(RUSAGE_SELF, &usage);
  return static_cast<double>(usage.ru_maxrss) / 1024.0;  // ru_maxrss is in KiB on Linux
}

// CPU time of this process and its reaped children (the mesher), user and system, and minor faults.
struct CpuUse {
  double user_s = 0, system_s = 0;
  long minor_faults = 0;
};
CpuUse cpu_use() {
  CpuUse c;
  for (int who : {RUSAGE_SELF, RUSAGE_CHILDREN}) {
    rusage u{};
    getrusage(who, &u);
    c.user_s +=
        static_cast<double>(u.ru_utime.tv_sec) + 1e-6 * static_cast<double>(u.ru_utime.tv_usec);
    c.system_s +=
        static_cast<double>(u.ru_stime.tv_sec) + 1e-6 * static_cast<double>(u.ru_stime.tv_usec);
    c.minor_faults += u.ru_minflt;
  }
  return c;
}

// Issue 18's targets for one standard-preset level on the 2-core machine (2 x 2.6 GHz x 32 double
// flop per cycle = 166 GFlop/s peak), printed beside the figures of a case.
constexpr double kTargetLevelS = 2.0, kPeakGflops = 166.0, kTargetPeakFraction = 0.60,
                 kTargetSystemFraction = 0.10, kTargetPeakMb = 1130.0;

void print_targets(double total_s, double gflops, const CpuUse& before, const CpuUse& after) {
  const double user = after.user_s - before.user_s, sys = after.system_s - before.system_s;
  const double sys_fraction = user + sys > 0 ? sys / (user + sys) : 0.0;
  const auto verdict = [](bool met) { return met ? "met" : "NOT met"; };
  std::printf(
      "%-22s targets (standard level): end to end %.2f s (target %.1f s: %s); "
      "factorisation %.1f GFlop/s = %.0f %% of %.0f (target > %.0f %%: %s);\n",
      "", total_s, kTargetLevelS, verdict(total_s <= kTargetLevelS), gflops,
      100 * gflops / kPeakGflops, kPeakGflops, 100 * kTargetPeakFraction,
      verdict(gflops >= kTargetPeakFraction * kPeakGflops));
  std::printf(
      "%-22s CPU %.2f s user + %.2f s system = %.0f %% system (target < %.0f %%: %s); "
      "%ld minor page faults; peak memory %.0f MB (target <= %.0f MB: %s)\n",
      "", user, sys, 100 * sys_fraction, 100 * kTargetSystemFraction,
      verdict(sys_fraction < kTargetSystemFraction), after.minor_faults - before.minor_faults,
      peak_rss_mb(), kTargetPeakMb, verdict(peak_rss_mb() <= kTargetPeakMb));
}

struct BenchCase {
  std::string name;
  mesh::VolumeMesh mesh;
  double mesh_s = 0;
  CpuUse cpu_before_mesh;  // process CPU use before the mesh was built
  fem::MaterialTable materials;
  std::vector<fem::DofConstraint> constraints;
  int pad_marker = 0;
  Eigen::Vector3d reference_point = Eigen::Vector3d::Zero();
  int field_region = 1;
};

void print_header() {
  std::printf("%-22s %8s %9s %11s %7s %8s %8s %9s %8s %8s %9s %9s %9s %10s %9s\n", "case",
              "elements", "dofs", "nnz(K_ff)", "mesh_s", "assem_s", "analy_s", "factor_s", "GFlop",
              "GFlop/s", "1rhs_ms", "basis_s", "total_s", "superp_ms", "peak_MB");
}

// Free-free block of K and the reduced right-hand side f_f - K_fc u_c, for the baseline solve.
void reduce(const Eigen::SparseMatrix<double>& K,
            const std::vector<fem::DofConstraint>& constraints, const Eigen::VectorXd& f,
            Eigen::SparseMatrix<double>* K_ff, Eigen::VectorXd* f_f, std::vector<int>* free_dofs) {
  const int n = static_cast<int>(K.rows());
  Eigen::VectorXd u_c = Eigen::VectorXd::Zero(n);
  std::vector<int> index(static_cast<size_t>(n), 0);
  for (const auto& c : constraints) {
    index[static_cast<size_t>(3 * c.node + c.component)] = -1;
    u_c[3 * c.node + c.component] = c.value_mm;
  }
  free_dofs->clear();
  for (int i = 0; i < n; ++i) {
    if (index[static_cast<size_t>(i)] == 0) {
      index[static_cast<size_t>(i)] = static_cast<int>(free_dofs->size());
      free_dofs->push_back(i);
    }
  }
  const Eigen::VectorXd rhs = f - K * u_c;
  std::vector<Eigen::Triplet<double>> triplets;
  for (int j = 0; j < K.outerSize(); ++j) {
    if (index[static_cast<size_t>(j)] < 0) continue;
    for (Eigen::SparseMatrix<double>::InnerIterator it(K, j); it; ++it) {
      const int i = static_cast<int>(it.row());
      if (index[static_cast<size_t>(i)] >= 0) {
        triplets.emplace_back(index[static_cast<size_t>(i)], index[static_cast<size_t>(j)],
                              it.value());
      }
    }
  }
  const int n_free = static_cast<int>(free_dofs->size());
  K_ff->resize(n_free, n_free);
  K_ff->setFromTriplets(triplets.begin(), triplets.end());
  f_f->resize(n_free);
  for (int k = 0; k < n_free; ++k) (*f_f)[k] = rhs[(*free_dofs)[static_cast<size_t>(k)]];
}

void run(const BenchCase& c, bool baseline) {
  const auto t_total = Clock::now();
  const fem::LinearElasticSolver solver(c.mesh, c.materials, c.constraints);
  const Eigen::VectorXd f = fem::patch_load(c.mesh, c.pad_marker, Eigen::Vector3d(1.0, 0.3, -0.2),
                                            Eigen::Vector3d::Zero(), c.reference_point);
  auto t0 = Clock::now();
  const Eigen::VectorXd u = solver.solve(f);
  const double one_rhs_s = seconds_since(t0);
  const fem::SolverStatistics stats = solver.statistics();  // after the solve: residual filled in

  t0 = Clock::now();
  const fem::UnitLoadBasis basis(c.mesh, c.materials, solver, c.pad_marker, c.reference_point,
                                 c.field_region);
  const double basis_s = seconds_since(t0);
  const double total_s = c.mesh_s + seconds_since(t_total);

  const int repeats = 20;
  double checksum = 0;
  t0 = Clock::now();
  for (int r = 0; r < repeats; ++r) {
    const Eigen::Vector3d F(0.5 + 0.01 * r, -0.2, 0.1), M(0.0, 1.0 + 0.1 * r, 0.0);
    const Eigen::VectorXd ur = basis.displacement(F, M);
    const fem::RegionField field = basis.region_field(F, M);
    checksum += ur[0] + field.stress_mpa(0, 0);
  }
  const double superpose_ms = 1000.0 * seconds_since(t0) / repeats;

  std::printf(
      "%-22s %8d %9d %11lld %7.2f %8.2f %8.2f %9.2f %8.2f %8.2f %9.1f %9.2f %9.2f %10.2f %9.0f\n",
      c.name.c_str(), c.mesh.n_elements(), stats.n_dofs, stats.n_nonzeros, c.mesh_s,
      stats.assembly_s, stats.analyse_s, stats.factorise_s, stats.factorisation_gflop,
      stats.factorise_s > 0 ? stats.factorisation_gflop / stats.factorise_s : 0.0,
      1000.0 * one_rhs_s, basis_s, total_s, superpose_ms, peak_rss_mb());
  std::printf(
      "%-22s ordering %s, relative residual %.1e, field region %d: %zu nodes (checksum %.3g)\n", "",
      stats.ordering.c_str(), stats.last_relative_residual, c.field_region,
      basis.unit_fields().empty() ? size_t{0} : basis.unit_fields()[0].nodes.size(), checksum);
  print_targets(total_s, stats.factorise_s > 0 ? stats.factorisation_gflop / stats.factorise_s : 0,
                c.cpu_before_mesh, cpu_use());
  std::fflush(stdout);  // progress stays visible when the output goes to a file

  if (baseline) {
    Eigen::SparseMatrix<double> K_ff;
    Eigen::VectorXd f_f;
    std::vector<int> free_dofs;
    reduce(solver.stiffness(), c.constraints, f, &K_ff, &f_f, &free_dofs);
    t0 = Clock::now();
    Eigen::SimplicialLDLT<Eigen::SparseMatrix<double>> ldlt(K_ff);
    const double ldlt_s = seconds_since(t0);
    if (ldlt.info() != Eigen::Success) {
      std::printf("%-22s Eigen SimplicialLDLT failed\n", "");
      return;
    }
    const Eigen::VectorXd u_f = ldlt.solve(f_f);
    double diff = 0, norm = 0;
    for (size_t k = 0; k < free_dofs.size(); ++k) {
      diff = std::max(diff, std::abs(u_f[static_cast<Eigen::Index>(k)] - u[free_dofs[k]]));
      norm = std::max(norm, std::abs(u[free_dofs[k]]));
    }
    std::printf(
        "%-22s baseline Eigen SimplicialLDLT (AMD) analyse+factorise %.2f s = %.1f x CHOLMOD's "
        "%.2f s; max |u_eigen - u_cholmod| / max |u| = %.1e\n",
        "", ldlt_s, ldlt_s / (stats.analyse_s + stats.factorise_s),
        stats.analyse_s + stats.factorise_s, diff / norm);
  }
}

// n^3 cells of a 10 mm cube, 10-node: 3 (2n+1)^3 degrees of freedom; bottom fixed, load on top.
BenchCase grid_case(int n) {
  BenchCase c;
  c.cpu_before_mesh = cpu_use();
  const auto t0 = Clock::now();
  c.mesh = testing::grid_mesh(n, n, n, 10,
                              [](const Eigen::Vector3d& p) -> Eigen::Vector3d { return 10.0 * p; });
  c.mesh_s = seconds_since(t0);
  c.name = "grid " + std::to_string(n) + "^3 10-node";
  c.materials = {{1, fem::Material{1000.0, 0.3}}};
  c.constraints = fem::fix_faces(c.mesh, testing::kZetaMin);
  c.pad_marker = testing::kZetaMax;
  c.reference_point = Eigen::Vector3d(5, 5, 10);
  c.field_region = 1;
  return c;
}

// The default incisor model at a preset; materials as in check-values.md section 1 (pub).
BenchCase tooth_case(mesh::MeshPreset preset) {
  BenchCase c;
  mesh::ModelSpec spec;
  spec.sizing.preset = preset;
  c.cpu_before_mesh = cpu_use();
  const auto t0 = Clock::now();
  mesh::ToothModel model = mesh::build_tooth_model(spec);
  c.mesh_s = seconds_since(t0);
  c.mesh = std::move(model.mesh);
  c.name = "incisor " + mesh::to_string(preset);
  c.materials = {{mesh::kTooth, {18600.0, 0.31}},
                 {mesh::kPdl, {0.47, 0.45}},
                 {mesh::kCorticalBone, {13700.0, 0.30}},
                 {mesh::kCancellousBone, {1370.0, 0.30}}};
  c.constraints = fem::fix_faces(c.mesh, mesh::kFixedBone);
  c.pad_marker = mesh::kBracketPad;
  c.reference_point = model.geometry.bracket_center;
  c.field_region = mesh::kPdl;
  return c;
}

}  // namespace

int main(int argc, char** argv) {
  sharpey::startup::use_fast_blas_kernels(argv);
  sharpey::startup::keep_freed_memory_for_reuse();  // after the possible re-execution
  bool grids = true, teeth = true, quick = false;
  std::vector<mesh::MeshPreset> presets = {mesh::MeshPreset::kCoarse, mesh::MeshPreset::kStandard,
                                           mesh::MeshPreset::kFine};
  bool baseline = true;
  for (int i = 1; i < argc; ++i) {
    if (std::strcmp(argv[i], "--grid-only") == 0) {
      teeth = false;
    } else if (std::strcmp(argv[i], "--tooth-only") == 0) {
      grids = false;
    } else if (std::strcmp(argv[i], "--quick") == 0) {
      quick = true;
      teeth = false;
    } else if (std::strcmp(argv[i], "--preset") == 0 && i + 1 < argc) {
      try {
        presets = {mesh::mesh_preset_from_string(argv[++i])};
      } catch (const sharpey::Error& e) {
        std::fprintf(stderr, "bench_solver: %s\n", e.what());
        return 2;
      }
      grids = false;
      baseline = false;
    } else {
      std::fprintf(stderr,
                   "bench_solver: unknown option '%s'; use --grid-only, --tooth-only, --quick or "
                   "--preset coarse|standard|fine\n",
                   argv[i]);
      return 2;
    }
  }
  std::printf(
      "bench_solver: %u hardware threads, OMP_NUM_THREADS=%s, BLAS kernels %s, "
      "load average %s\n",
      std::thread::hardware_concurrency(),
      std::getenv("OMP_NUM_THREADS") ? std::getenv("OMP_NUM_THREADS") : "(unset)",
      sharpey::startup::blas_core_name().c_str(), load_average().c_str());
  print_header();
  try {
    if (grids) {
      const std::vector<int> sizes = quick ? std::vector<int>{9} : std::vector<int>{9, 15, 20};
      for (size_t i = 0; i < sizes.size(); ++i) run(grid_case(sizes[i]), i == 0 && !teeth);
    }
    if (teeth) {
      for (mesh::MeshPreset p : presets) {
        try {
          run(tooth_case(p), baseline && p == mesh::MeshPreset::kCoarse);
        } catch (const sharpey::Error& e) {
          std::printf("incisor %s: not available: %s\n", mesh::to_string(p).c_str(), e.what());
        }
      }
    }
  } catch (const std::exception& e) {
    std::fprintf(stderr, "bench_solver: %s\n", e.what());
    return 1;
  }
  std::printf("load average at the end: %s\n", load_average().c_str());
  return 0;
}
