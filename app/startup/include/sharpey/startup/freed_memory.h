// How the C library's allocator hands large freed blocks back to the operating system.
//
// glibc serves every allocation above its mmap threshold (128 kB, growing to at most 32 MB) with a
// fresh mmap and returns it with munmap on free. A solve allocates and frees blocks of hundreds of
// megabytes (the Cholesky factor, CHOLMOD's workspace, the stiffness matrix), so every solve after
// the first touches fresh pages again: a minor page fault per 4 kB page, in the kernel, about a
// fifth of a second of system time per standard-preset level on the development machine
// (docs/fem-solver.md, "Speed").
#pragma once

namespace sharpey::startup {

// Call first thing in main() of a program that solves more than one model (the app, sharpey-batch,
// the benchmarks): allocations come from the heap instead of separate mappings (mallopt
// M_MMAP_MAX = 0) and freed heap memory is kept for the next solve instead of being returned to
// the operating system (M_TRIM_THRESHOLD at its largest). The peak memory stays that of the
// largest solve; what is freed after it stays resident in the process and is reused. Does nothing
// when the MALLOC_MMAP_MAX_ or MALLOC_TRIM_THRESHOLD_ environment variable or GLIBC_TUNABLES is set
// (the machine chose its allocator settings), and with a C library other than glibc.
void keep_freed_memory_for_reuse();

}  // namespace sharpey::startup
