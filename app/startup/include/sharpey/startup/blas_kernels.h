// The BLAS kernels CHOLMOD's supernodal factorisation runs on.
//
// OpenBLAS chooses its kernels from the processor model when it loads. On a processor model it
// does not know (seen here: a recent Xeon under a hypervisor, reported as "Intel(R) Xeon(R)
// Processor") it falls back to its oldest x86-64 kernels ("Prescott", SSE3), four to five times
// slower in dgemm than the AVX2 or AVX-512 kernels the processor can run. OpenBLAS reads the
// documented environment variable OPENBLAS_CORETYPE only when it loads, so a program that wants the
// fast kernels sets it and starts itself again.
//
// The programs link Debian's OpenMP-threaded OpenBLAS (libopenblas0-openmp) by path when it was
// installed at build time (fem/CMakeLists.txt); its threads are libgomp's, which wait in user space
// and then sleep instead of calling sched_yield in a loop as the pthreads build's do
// (docs/fem-solver.md, "Speed"). libgomp reads OMP_THREAD_LIMIT only when it loads, so the same
// start-again sets it too.
#pragma once

#include <string>

namespace sharpey::startup {

// The kernel set the loaded OpenBLAS uses (openblas_get_corename), or "" when the BLAS in use is
// not OpenBLAS.
std::string blas_core_name();

// The OPENBLAS_CORETYPE that suits this processor better than `current_core`, or "" when
// `current_core` is fine: "SkylakeX" when the processor and the operating system support AVX-512
// F, CD, BW, DQ and VL,
// "Haswell" with AVX2 and FMA, for a current core of "Prescott" (OpenBLAS's fallback).
std::string better_blas_core(const std::string& current_core);

// How the loaded OpenBLAS runs its threads (openblas_get_parallel(): 0 serial, 1 pthreads,
// 2 OpenMP), or kNotOpenBlas when the BLAS in use is another one.
enum class BlasThreading { kNotOpenBlas, kSerial, kPthreads, kOpenMp };
BlasThreading blas_threading();

// Call first thing in main(). When OpenBLAS fell back to its slow kernels on a processor that can
// run faster ones and OPENBLAS_CORETYPE is not set, sets it and re-executes the program
// (/proc/self/exe) with the same arguments; returns normally in every other case (also when the
// re-execution fails). Setting OPENBLAS_CORETYPE or OPENBLAS_L2_SIZE yourself (to any value) turns
// this off. Likewise, when the BLAS is OpenMP-threaded and OMP_THREAD_LIMIT is not set, sets it to
// the number of online processors before starting again: CHOLMOD 3.0 opens its OpenMP regions with
// a fixed team of four, which on two cores fights OpenBLAS's own threads for the cores (a limit the
// user set is kept), and GOMP_SPINCOUNT to 10 000 rounds unless OMP_WAIT_POLICY or GOMP_SPINCOUNT
// is set (libgomp's default spin of 300 000 rounds holds shared cores; sleeping at once is slow).
// When the BLAS in use is not the OpenMP build, prints a one-line note to stderr and carries on
// (same results, more system time). A wrong kernel could not pass unnoticed: every solve checks its
// residual with Eigen's own sparse product (SolverOptions::max_relative_residual); the standard
// incisor gives 1.1e-10 with the SkylakeX kernels and 1.2e-10 with the Prescott ones, the same
// displacement checksum.
void use_fast_blas_kernels(char** argv);

}  // namespace sharpey::startup
