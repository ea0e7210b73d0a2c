#include "solver_threads.h"

#include <dlfcn.h>
#include <omp.h>

namespace sharpey::batch {

void set_solver_threads(int n_threads) {
  omp_set_num_threads(n_threads);
  using SetThreads = void (*)(int);
  if (void* symbol = ::dlsym(RTLD_DEFAULT, "openblas_set_num_threads"))
    reinterpret_cast<SetThreads>(symbol)(n_threads);
}

}  // namespace sharpey::batch
