#include "sharpey/startup/blas_kernels.h"

#include <dlfcn.h>
#include <unistd.h>

#include <cstdio>
#include <cstdlib>
#include <string>
#include <utility>
#include <vector>

namespace sharpey::startup {

std::string blas_core_name() {
  // Looked up at run time: the program links the reference BLAS interface (libblas.so.3), which
  // Debian's alternatives point at OpenBLAS or at another implementation.
  using CoreName = char* (*)();
  const auto fn = reinterpret_cast<CoreName>(dlsym(RTLD_DEFAULT, "openblas_get_corename"));
  if (!fn) return "";
  const char* name = fn();
  return name ? std::string(name) : std::string();
}

std::string better_blas_core(const std::string& current_core) {
  if (current_core != "Prescott") return "";
#if defined(__x86_64__) && (defined(__GNUC__) || defined(__clang__))
  __builtin_cpu_init();
  // The instruction sets OpenBLAS's SkylakeX kernels are built for, all of them.
  if (__builtin_cpu_supports("avx512f") && __builtin_cpu_supports("avx512cd") &&
      __builtin_cpu_supports("avx512bw") && __builtin_cpu_supports("avx512dq") &&
      __builtin_cpu_supports("avx512vl")) {
    return "SkylakeX";
  }
  if (__builtin_cpu_supports("avx2") && __builtin_cpu_supports("fma")) return "Haswell";
#endif
  return "";
}

BlasThreading blas_threading() {
  using GetParallel = int (*)();
  const auto fn = reinterpret_cast<GetParallel>(dlsym(RTLD_DEFAULT, "openblas_get_parallel"));
  if (!fn) return BlasThreading::kNotOpenBlas;
  switch (fn()) {
    case 0:
      return BlasThreading::kSerial;
    case 2:
      return BlasThreading::kOpenMp;
    default:
      return BlasThreading::kPthreads;
  }
}

namespace {

// The environment variables to set before the program starts again (name, value); none when the
// program runs as it should already.
std::vector<std::pair<std::string, std::string>> settings_for_restart() {
  std::vector<std::pair<std::string, std::string>> settings;
  // A machine that sets either variable has chosen its kernels on purpose (some processors need a
  // particular choice); leave it alone.
  if (std::getenv("OPENBLAS_CORETYPE") == nullptr && std::getenv("OPENBLAS_L2_SIZE") == nullptr) {
    const std::string better = better_blas_core(blas_core_name());
    if (!better.empty()) settings.emplace_back("OPENBLAS_CORETYPE", better);
  }
  if (std::getenv("OMP_THREAD_LIMIT") == nullptr && blas_threading() == BlasThreading::kOpenMp) {
    // The processors online, not those this process is bound to: a thread count fixed by the
    // program (a sweep's --threads) then gets the same team, and the same bits, on any binding.
    const long n_processors = sysconf(_SC_NPROCESSORS_ONLN);
    settings.emplace_back("OMP_THREAD_LIMIT", std::to_string(n_processors > 0 ? n_processors : 1));
  }
  // libgomp's waiting threads spin (by default some 300 000 rounds) before they sleep, and never
  // give their core away meanwhile. On cores shared with other programs the thread that has the
  // work then waits for the spinner's time slice: the standard incisor's factorisation took 41 s
  // instead of 5 to 8 at a load of 6 on two cores. Threads that sleep at once (passive) cost a
  // wake-up per parallel region: 4.3 s instead of 1.9 on an idle machine. A short spin of 10 000
  // rounds gave the idle machine's speed (1.8 to 1.9 s) and the best of the three under two busy
  // loops (docs/fem-solver.md, "Speed", steps 5 to 7). A choice the user made is kept.
  if (std::getenv("OMP_WAIT_POLICY") == nullptr && std::getenv("GOMP_SPINCOUNT") == nullptr &&
      blas_threading() == BlasThreading::kOpenMp) {
    settings.emplace_back("GOMP_SPINCOUNT", "10000");
  }
  return settings;
}

void note_other_blas() {
  const BlasThreading threading = blas_threading();
  if (threading == BlasThreading::kOpenMp) return;
  const char* which = threading == BlasThreading::kNotOpenBlas ? "a BLAS other than OpenBLAS"
                      : threading == BlasThreading::kSerial    ? "the serial OpenBLAS"
                                                               : "the pthreads OpenBLAS";
  std::fprintf(stderr,
               "note: running on %s, not the OpenMP-threaded OpenBLAS (Debian package "
               "libopenblas0-openmp): same results, more system time\n",
               which);
}

}  // namespace

void use_fast_blas_kernels(char** argv) {
  if (argv == nullptr) return;
  bool changed = false;
  for (const auto& [name, value] : settings_for_restart())
    changed = setenv(name.c_str(), value.c_str(), 1) == 0 || changed;
  if (changed) execv("/proc/self/exe", argv);
  // Not restarted (nothing to change, or the re-execution failed): carry on as loaded.
  note_other_blas();
}

}  // namespace sharpey::startup
