// How many threads one model solve uses in a sweep. The solver's results depend, in their last
// bits, on how many threads sum them (OpenMP assembly, OpenBLAS inside CHOLMOD): a sweep fixes the
// count, so its sweep.csv is the same bytes however it is started (one process, mpirun -n N,
// srun) and whatever cores a rank is bound to. Parallelism across a sweep comes from ranks.
#pragma once

namespace sharpey::batch {

// Sets the OpenMP thread count of this (the main) thread's parallel regions and, when the BLAS in
// use is OpenBLAS, its thread count (openblas_set_num_threads, looked up at run time so any BLAS
// links). `n_threads` >= 1.
void set_solver_threads(int n_threads);

}  // namespace sharpey::batch
