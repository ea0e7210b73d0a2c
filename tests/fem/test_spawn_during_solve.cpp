// The mesher runs as a separate program started with posix_spawn (mesh/child_process.h) on a
// second thread while the solver factorises on the first. With fork() this needed a lock between
// fem and mesh (OpenBLAS shuts its thread pool down in a pthread_atfork handler, and a fork during
// a threaded BLAS call hung the program in a probe on this machine); posix_spawn runs no atfork
// handler, and the lock is gone. This test does what the Study does, many times over:
// factorisations and solves of the coarse incisor on one thread, programs started in a loop on
// another. It must finish (a watchdog ends the process with a failure after 10 minutes instead of
// letting a deadlock run into ctest's limit) with the same displacement every time (derived: the
// same system solved again).
#include <gtest/gtest.h>

#include <atomic>
#include <chrono>
#include <condition_variable>
#include <cstdio>
#include <cstdlib>
#include <mutex>
#include <thread>

#include "sharpey/fem/elasticity.h"
#include "sharpey/mesh/child_process.h"
#include "sharpey/mesh/tooth_model.h"

namespace sharpey::fem {
namespace {

TEST(SpawnDuringSolve, FactorisationsAndSpawnsOnTwoThreadsNeitherHangNorChangeTheResult) {
  // Deadlock watchdog, not a speed check: the whole test takes seconds.
  std::mutex watch_mutex;
  std::condition_variable watch;
  bool finished = false;
  std::thread watchdog([&] {
    std::unique_lock<std::mutex> lock(watch_mutex);
    if (!watch.wait_for(lock, std::chrono::minutes(10), [&] { return finished; })) {
      std::fprintf(stderr, "SpawnDuringSolve: no progress in 10 minutes (deadlock)\n");
      std::_Exit(1);
    }
  });

  mesh::ModelSpec spec;
  spec.sizing.preset = mesh::MeshPreset::kCoarse;
  const mesh::ToothModel model = mesh::build_tooth_model(spec);
  const mesh::VolumeMesh& m = model.mesh;
  // source: check-values.md section 1 (pub), as in test_tooth_model_solve.cpp.
  const MaterialTable materials = {{mesh::kTooth, {18600.0, 0.31}},
                                   {mesh::kPdl, {0.47, 0.45}},
                                   {mesh::kCorticalBone, {13700.0, 0.30}},
                                   {mesh::kCancellousBone, {1370.0, 0.30}}};
  const Eigen::VectorXd f = patch_load(m, mesh::kBracketPad, Eigen::Vector3d(-1, 0, 0),
                                       Eigen::Vector3d::Zero(), model.geometry.bracket_center);

  std::atomic<bool> solving{true};
  std::atomic<int> spawns{0};
  std::thread spawner([&] {
    while (solving) {
      const mesh::ChildOutcome c = mesh::run_program("/bin/true", {}, "", nullptr);
      if (c.started && c.exit_code == 0) ++spawns;
    }
  });
  Eigen::VectorXd first;
  for (int round = 0; round < 4; ++round) {
    const LinearElasticSolver solver(m, materials, fix_faces(m, mesh::kFixedBone));
    const Eigen::VectorXd u = solver.solve(f);
    if (round == 0) first = u;
    EXPECT_LT((u - first).norm(), 1e-12 * first.norm()) << "round " << round;
  }
  solving = false;
  spawner.join();
  {
    const std::lock_guard<std::mutex> lock(watch_mutex);
    finished = true;
  }
  watch.notify_one();
  watchdog.join();
  std::printf("%d programs started during 4 factorisations and solves\n", spawns.load());
  EXPECT_GT(spawns.load(), 0);
}

}  // namespace
}  // namespace sharpey::fem
