#include "sharpey/startup/blas_kernels.h"

#include <dlfcn.h>
#include <unistd.h>

#include <cstdlib>

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

void use_fast_blas_kernels(char** argv) {
  // A machine that sets either variable has chosen its kernels on purpose (some processors need a
  // particular choice); leave it alone.
  if (std::getenv("OPENBLAS_CORETYPE") != nullptr || std::getenv("OPENBLAS_L2_SIZE") != nullptr ||
      argv == nullptr) {
    return;
  }
  const std::string better = better_blas_core(blas_core_name());
  if (better.empty()) return;
  if (setenv("OPENBLAS_CORETYPE", better.c_str(), 1) != 0) return;
  execv("/proc/self/exe", argv);
  // Still here: the re-execution failed; carry on with the kernels OpenBLAS chose.
}

}  // namespace sharpey::startup
