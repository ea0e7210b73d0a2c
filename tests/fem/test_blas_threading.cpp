// The OpenBLAS build the programs run on and a factorisation large enough for OpenBLAS to split its
// calls over threads. fem/CMakeLists.txt links Debian's OpenMP-threaded OpenBLAS by path, and
// startup::use_fast_blas_kernels (this program's main) sets OMP_THREAD_LIMIT before starting again.
// With that build a threaded dsyrk hangs when its OpenMP team is smaller than the work it split
// (docs/fem-solver.md, "Speed"), so these cases carry a ctest TIMEOUT. blas_builds_same_bits.cmake
// runs the factorisation case under the pthreads build and under the OpenMP build and compares
// the bits of the solutions it writes (SHARPEY_BLAS_BITS_FILE).
#include <dlfcn.h>
#include <gtest/gtest.h>
#include <omp.h>
#include <unistd.h>

#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <string>
#include <thread>

#include "sharpey/fem/elasticity.h"
#include "sharpey/startup/blas_kernels.h"
#include "support/grid_mesh.h"

namespace sharpey::fem {
namespace {

using startup::blas_threading;
using startup::BlasThreading;

// A stiff block on a softer one, bottom fixed: 10 x 10 x 10 cells of 10-node tetrahedra, about
// 27 000 free dofs. The separators of the ordering give supernodes of about a thousand columns,
// far above the sizes where OpenBLAS threads dsyrk, dgemm and dpotrf.
mesh::VolumeMesh block_mesh() {
  mesh::VolumeMesh m = testing::grid_mesh(
      10, 10, 10, 10, {}, [](const Eigen::Vector3d& p) { return p.z() > 0.5 ? 2 : 1; });
  testing::jitter_nodes(m, 0.2, 7u);
  return m;
}

const MaterialTable kMaterials{{1, {500.0, 0.3}}, {2, {2000.0, 0.45}}};

Eigen::VectorXd block_load(int n_nodes) {
  std::srand(17u);
  return Eigen::VectorXd::Random(3 * n_nodes);
}

void set_threads(int n) {
  omp_set_num_threads(n);
  using SetThreads = void (*)(int);
  if (const auto f = reinterpret_cast<SetThreads>(dlsym(RTLD_DEFAULT, "openblas_set_num_threads")))
    f(n);
}

// FNV-1a over the bytes of every entry: equal only when every bit is.
std::uint64_t bits_hash(const Eigen::VectorXd& u) {
  std::uint64_t h = 1469598103934665603ull;
  for (Eigen::Index i = 0; i < u.size(); ++i) {
    unsigned char bytes[sizeof(double)];
    std::memcpy(bytes, &u(i), sizeof(double));
    for (const unsigned char b : bytes) h = (h ^ b) * 1099511628211ull;
  }
  return h;
}

const char* threading_name(BlasThreading t) {
  switch (t) {
    case BlasThreading::kOpenMp:
      return "openmp";
    case BlasThreading::kPthreads:
      return "pthreads";
    case BlasThreading::kSerial:
      return "serial";
    default:
      return "not-openblas";
  }
}

// common practice: a program links the OpenMP build by path (run path), so without LD_LIBRARY_PATH
// it runs on it, CHOLMOD included (one libopenblas.so.0 in the process), with the thread limit and
// the wait policy set at start.
TEST(BlasThreading, ProgramsRunOnTheOpenMpBuildWithAThreadLimit) {
#ifndef SHARPEY_OPENMP_OPENBLAS_LINKED
  GTEST_SKIP() << "built without libopenblas0-openmp (scripts/common.sh lists it): the programs "
                  "run on the system's BLAS";
#else
  if (std::getenv("LD_LIBRARY_PATH") != nullptr)
    GTEST_SKIP() << "LD_LIBRARY_PATH is set and comes before the run path: "
                 << std::getenv("LD_LIBRARY_PATH");
  EXPECT_EQ(threading_name(blas_threading()), std::string("openmp"));
  // The BLAS and LAPACK entry points CHOLMOD calls (dgemm_, dsyrk_, dpotrf_) and OpenBLAS itself
  // are the OpenMP build's: one OpenBLAS in the process.
  for (const char* symbol : {"openblas_get_parallel", "dgemm_", "dsyrk_", "dpotrf_"}) {
    Dl_info info{};
    ASSERT_NE(dladdr(dlsym(RTLD_DEFAULT, symbol), &info), 0) << symbol;
    EXPECT_NE(std::string(info.dli_fname).find("openblas-openmp"), std::string::npos)
        << symbol << " from " << info.dli_fname;
  }
  ASSERT_NE(std::getenv("OMP_THREAD_LIMIT"), nullptr);
  EXPECT_EQ(omp_get_thread_limit(), std::atoi(std::getenv("OMP_THREAD_LIMIT")));
  // ... and waiting OpenMP threads that do not hold shared cores (or the user's own choice).
  EXPECT_TRUE(std::getenv("OMP_WAIT_POLICY") != nullptr ||
              std::getenv("GOMP_SPINCOUNT") != nullptr);
#endif
}

// derived: the same matrix factorised by the same kernels: every build gives a solution whose
// residual is that of a direct solve. The bits are compared across builds by the cmake script.
TEST(BlasThreading, ThreadedFactorisationFinishes) {
  const mesh::VolumeMesh m = block_mesh();
  const Eigen::VectorXd f = block_load(m.n_nodes());
  const int n_threads = std::max(2, omp_get_max_threads());
  set_threads(n_threads);
  const LinearElasticSolver solver(m, kMaterials, fix_faces(m, testing::kZetaMin));
  const Eigen::VectorXd u = solver.solve(f);
  EXPECT_LT(solver.statistics().last_relative_residual, 1e-12);
  EXPECT_GT(solver.statistics().n_dofs, 25000);
  const SolverStatistics& s = solver.statistics();
  std::printf("dofs %d gflop %.2f assembly %.2f analyse %.2f factorise %.2f solve %.2f\n", s.n_dofs,
              s.factorisation_gflop, s.assembly_s, s.analyse_s, s.factorise_s, s.last_solve_s);
  if (const char* path = std::getenv("SHARPEY_BLAS_BITS_FILE")) {
    std::FILE* out = std::fopen(path, "w");
    ASSERT_NE(out, nullptr) << path;
    std::fprintf(out, "blas %s\nthreads %d\nsolution %016llx\n", threading_name(blas_threading()),
                 n_threads, static_cast<unsigned long long>(bits_hash(u)));
    std::fclose(out);
  }
}

// derived: a calling thread with one OpenMP thread while OpenBLAS is set to several (a band's
// worker beside the app's solves): the solver then serialises CHOLMOD's regions, which is safe
// only because OpenBLAS follows the caller's count; it finishes with a direct solve's residual.
TEST(BlasThreading, OneThreadCallerFinishes) {
  const mesh::VolumeMesh m = block_mesh();
  const Eigen::VectorXd f = block_load(m.n_nodes());
  set_threads(2);
  omp_set_num_threads(1);
  const LinearElasticSolver solver(m, kMaterials, fix_faces(m, testing::kZetaMin));
  solver.solve(f);
  EXPECT_LT(solver.statistics().last_relative_residual, 1e-12);
}

// derived: two solves at once on two threads of the program (the app solving while a band winds
// down), each asking OpenBLAS for several threads, both finish with a direct solve's residual.
TEST(BlasThreading, TwoSolvesAtOnceFinish) {
  const mesh::VolumeMesh m = block_mesh();
  const Eigen::VectorXd f = block_load(m.n_nodes());
  set_threads(std::max(2, omp_get_max_threads()));
  double residual[2] = {1, 1};
  auto solve = [&](int k) {
    const LinearElasticSolver solver(m, kMaterials, fix_faces(m, testing::kZetaMin));
    solver.solve(f);
    residual[k] = solver.statistics().last_relative_residual;
  };
  std::thread other(solve, 1);
  solve(0);
  other.join();
  EXPECT_LT(residual[0], 1e-12);
  EXPECT_LT(residual[1], 1e-12);
}

}  // namespace
}  // namespace sharpey::fem
