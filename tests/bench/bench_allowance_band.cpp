// Benchmark (prints, not a test): the force allowance's variability band for one scenario (the
// healthy maxillary central incisor of the sample case) on the standard preset, 24 samples, the
// default ranges, without the sensitivity runs; prints the wall time beside the 60 s target on 2
// cores (issue 11), the time per solve, how many solves remeshed, the CPU time, where a solve's
// time goes (mesh, assembly, analysis, factorisation, unit loads, post-processing, evaluation),
// and the nominal allowances and the band per movement. Also the time of the nominal allowances
// (seven evaluations). The band solves as many samples at once as OpenMP's thread count (set
// OMP_NUM_THREADS=1 for one at a time).
//
//   bench_allowance_band [--samples N] [--preset coarse|standard|fine] [--sensitivity]
#include <sys/resource.h>

#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <string>

#include "sharpey/analysis/allowance_band.h"
#include "sharpey/startup/blas_kernels.h"
#include "sharpey/startup/freed_memory.h"

namespace {

using Clock = std::chrono::steady_clock;
double seconds_since(Clock::time_point t0) {
  return std::chrono::duration<double>(Clock::now() - t0).count();
}

double load_average() {
  double load[1] = {0};
  return getloadavg(load, 1) == 1 ? load[0] : -1;
}

// User + system CPU time of the process and of its finished children (the mesher processes) so
// far, s.
double cpu_seconds() {
  const auto s = [](const timeval& t) { return static_cast<double>(t.tv_sec) + 1e-6 * t.tv_usec; };
  double total = 0;
  for (const int who : {RUSAGE_SELF, RUSAGE_CHILDREN}) {
    rusage u{};
    getrusage(who, &u);
    total += s(u.ru_utime) + s(u.ru_stime);
  }
  return total;
}

// Where a solve's time goes: each stage's wall time summed over the band's solves (the workers run
// side by side, so the sum is about n_workers times the band's wall time), and per solve.
void print_stage_times(const sharpey::analysis::AllowanceBand& band) {
  const sharpey::analysis::BandStageTimes& t = band.stage_times;
  const double n = band.n_solves;
  const double total = t.mesh_s + t.assembly_s + t.analyse_s + t.factorise_s + t.unit_loads_s +
                       t.post_processing_s + t.evaluate_s;
  std::printf("  per solve (wall time on its worker, mean of %d):\n", band.n_solves);
  const auto row = [n](const char* what, double s) {
    std::printf("    %-36s %7.2f s\n", what, s / n);
  };
  row("mesh (TetGen process, 10-node)", t.mesh_s);
  row("assembly", t.assembly_s);
  row("ordering and symbolic analysis", t.analyse_s);
  row("numeric factorisation", t.factorise_s);
  row("unit load cases (solves, PDL fields)", t.unit_loads_s);
  row("post-processing (samplers)", t.post_processing_s);
  row("evaluation (seven movements)", t.evaluate_s);
  row("sum", total);
}

}  // namespace

int main(int argc, char** argv) {
  sharpey::startup::use_fast_blas_kernels(argv);
  sharpey::startup::keep_freed_memory_for_reuse();  // after the possible re-execution
  using namespace sharpey;
  using namespace sharpey::analysis;
  const std::string source = __FILE__;
  const std::string path = source.substr(0, source.rfind("/tests/bench/")) +
                           "/samples/maxillary_central_incisor_bone_loss.json";
  int n_samples = 24;
  bool sensitivity = false;
  mesh::MeshPreset preset = mesh::MeshPreset::kStandard;
  for (int i = 1; i < argc; ++i) {
    if (!std::strcmp(argv[i], "--samples") && i + 1 < argc) {
      n_samples = std::atoi(argv[++i]);
    } else if (!std::strcmp(argv[i], "--preset") && i + 1 < argc) {
      preset = mesh::mesh_preset_from_string(argv[++i]);
    } else if (!std::strcmp(argv[i], "--sensitivity")) {
      sensitivity = true;
    } else {
      std::fprintf(stderr, "usage: %s [--samples N] [--preset P] [--sensitivity]\n", argv[0]);
      return 2;
    }
  }
  CaseSpec spec = load_case(path);
  spec.scenarios.resize(1);  // the healthy scenario: "one scenario" of the target
  spec.model.sizing.preset = preset;
  std::printf("band benchmark: %s, scenario '%s', %s preset, %d samples%s, load average %.2f\n",
              path.c_str(), spec.scenarios[0].name.c_str(), mesh::to_string(preset).c_str(),
              n_samples, sensitivity ? " + sensitivity" : "", load_average());

  auto t0 = Clock::now();
  const Study study(spec);
  std::printf("  nominal study (mesh + solve)          %8.2f s\n", seconds_since(t0));
  t0 = Clock::now();
  const std::vector<ScenarioAllowances> nominal = nominal_allowances(study);
  std::printf("  nominal allowances (7 evaluations)    %8.3f s\n", seconds_since(t0));

  BandOptions options = band_options(spec);
  options.n_samples = n_samples;
  options.sensitivity = sensitivity;
  const double cpu_before_s = cpu_seconds();
  t0 = Clock::now();
  const AllowanceBand band = allowance_band(study, options);
  const double band_s = seconds_since(t0);
  const double band_cpu_s = cpu_seconds() - cpu_before_s;
  std::printf(
      "  band: %d solves (%d remeshed, %d refactorised) on %d workers %8.2f s  (%.2f s "
      "per solve)\n",
      band.n_solves, band.n_remeshed, band.n_refactorised, band.n_workers, band_s,
      band_s / band.n_solves);
  const bool target_case = n_samples == 24 && preset == mesh::MeshPreset::kStandard && !sensitivity;
  std::printf("  target: 24 samples, one scenario, standard preset, under 60 s on 2 cores: %s\n",
              !target_case ? "(not this configuration)" : (band_s < 60 ? "met" : "NOT met"));
  std::printf("  band CPU time %.1f s (user + system, meshers included), %.2f s per solve\n",
              band_cpu_s, band_cpu_s / band.n_solves);
  print_stage_times(band);
  rusage u{};
  getrusage(RUSAGE_SELF, &u);
  std::printf("  peak memory %.0f MB, load average now %.2f\n",
              static_cast<double>(u.ru_maxrss) / 1024.0, load_average());
  std::printf("\n  %-22s %10s %10s %10s %10s   (peak compression vs upper limit, g)\n", "movement",
              "nominal", "p10", "p50", "p90");
  const auto g = [](double n) { return n / 0.00980665; };
  for (const MovementAllowance& a : nominal[0].movements) {
    const BandPercentiles& p = band.scenarios[0].of(a.movement).peak_limit;
    std::printf("  %-22s %10.1f %10.1f %10.1f %10.1f\n", to_string(a.movement).c_str(),
                g(a.peak_limit_n), g(p.p10), g(p.p50), g(p.p90));
  }
  for (const InputSensitivity& s : band.sensitivity)
    std::printf("  sensitivity %-24s mean swing %5.1f %%\n", to_string(s.input).c_str(),
                100 * s.mean_swing);
  return 0;
}
