// run_program(): another program as a child process, as tetrahedralize() runs TetGen in the
// sharpey-mesher executable. Proves that input and output arrive whole (larger than a socket's
// buffer), that a crash in the child is reported with its signal instead of ending the test
// program, that a child that never finishes is killed and reaped once the cancel flag is set (no
// timing assertion: the flag is set after the child says it runs, and the test waits for the
// outcome), and that tetrahedralize() has no in-process fallback.
#include <gtest/gtest.h>
#include <signal.h>
#include <stdlib.h>
#include <sys/stat.h>
#include <unistd.h>

#include <atomic>
#include <cerrno>
#include <chrono>
#include <csignal>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <string>
#include <thread>

#include "sharpey/error.h"
#include "sharpey/mesh/child_process.h"
#include "sharpey/mesh/tetrahedralize.h"

namespace sharpey::mesh {
namespace {

class TempFolder {
 public:
  TempFolder() {
    char pattern[] = "/tmp/sharpey-child-XXXXXX";
    path_ = ::mkdtemp(pattern);
  }
  ~TempFolder() { std::filesystem::remove_all(path_); }
  std::string operator/(const std::string& name) const { return path_ + "/" + name; }

 private:
  std::string path_;
};

// A shell script that writes its process id to `marker` (atomically, by a rename) and then
// sleeps for ever in the same process (exec): a child that never finishes.
std::string never_finishing_script(const TempFolder& folder, const std::string& marker) {
  const std::string path = folder / "never-finishes.sh";
  std::ofstream(path) << "#!/bin/sh\necho $$ > '" << marker << ".tmp'\nmv '" << marker << ".tmp' '"
                      << marker << "'\nexec sleep 100000\n";
  ::chmod(path.c_str(), 0755);
  return path;
}

using Clock = std::chrono::steady_clock;

// Sets `flag` once `marker` exists (polls; waits as long as it takes) and records when.
std::thread cancel_when_started(const std::string& marker, std::atomic<bool>* flag,
                                Clock::time_point* set_at) {
  return std::thread([marker, flag, set_at] {
    while (!std::filesystem::exists(marker))
      std::this_thread::sleep_for(std::chrono::milliseconds(10));
    *set_at = Clock::now();
    flag->store(true);
  });
}

// A figure, not a check (no timed tests): from setting the cancel flag to the caller regaining
// control.
void print_reaction(const char* what, Clock::time_point set_at) {
  std::printf("%s: cancel flag to return %.1f ms\n", what,
              std::chrono::duration<double, std::milli>(Clock::now() - set_at).count());
}

bool process_gone(pid_t pid) { return ::kill(pid, 0) != 0 && errno == ESRCH; }

// A closed unit box: a valid PLC.
Plc unit_box() {
  Plc plc;
  plc.points = {{0, 0, 0}, {1, 0, 0}, {1, 1, 0}, {0, 1, 0},
                {0, 0, 1}, {1, 0, 1}, {1, 1, 1}, {0, 1, 1}};
  plc.triangles = {{0, 2, 1}, {0, 3, 2}, {4, 5, 6}, {4, 6, 7}, {0, 1, 5}, {0, 5, 4},
                   {1, 2, 6}, {1, 6, 5}, {2, 3, 7}, {2, 7, 6}, {3, 0, 4}, {3, 4, 7}};
  plc.triangle_marker.assign(plc.triangles.size(), 1);
  plc.regions = {{{0.25, 0.25, 0.75}, 1, 0}};
  return plc;
}

TEST(ChildProcess, InputAndOutputArriveWhole) {
  std::string text;
  for (int i = 0; i < 300000; ++i) text += static_cast<char>('a' + i % 26);  // > socket buffer
  const ChildOutcome c = run_program("/bin/cat", {}, text, nullptr);
  ASSERT_TRUE(c.started) << c.error;
  EXPECT_EQ(c.exit_code, 0);
  EXPECT_EQ(c.signal, 0);
  EXPECT_FALSE(c.cancelled);
  EXPECT_EQ(c.output, text);
}

TEST(ChildProcess, ReportsACrashWithItsSignal) {
  const ChildOutcome c = run_program("/bin/sh", {"-c", "printf x; kill -SEGV $$"}, "", nullptr);
  ASSERT_TRUE(c.started) << c.error;
  EXPECT_EQ(c.signal, SIGSEGV);
  EXPECT_EQ(c.exit_code, -1);
  EXPECT_EQ(c.output, "x");
  EXPECT_NE(signal_name(c.signal).find("SIGSEGV"), std::string::npos);
}

TEST(ChildProcess, AProgramThatCannotStartIsReported) {
  const ChildOutcome c = run_program("/nonexistent/program", {}, "", nullptr);
  EXPECT_FALSE(c.started);
  EXPECT_NE(c.error.find("/nonexistent/program"), std::string::npos) << c.error;
}

TEST(ChildProcess, ACancelledChildThatNeverFinishesIsKilledAndReaped) {
  TempFolder folder;
  const std::string marker = folder / "started";
  std::atomic<bool> cancel{false};
  Clock::time_point set_at;
  std::thread canceller = cancel_when_started(marker, &cancel, &set_at);
  const ChildOutcome c = run_program(never_finishing_script(folder, marker), {}, "", &cancel);
  canceller.join();
  print_reaction("run_program", set_at);
  ASSERT_TRUE(c.started) << c.error;
  EXPECT_TRUE(c.cancelled);
  EXPECT_EQ(c.signal, SIGKILL);
  std::string pid_text;
  std::ifstream(marker) >> pid_text;
  EXPECT_EQ(pid_text, std::to_string(c.pid)) << "the script ran in the child itself";
  EXPECT_TRUE(process_gone(c.pid)) << "the child was killed and reaped";
}

TEST(ChildProcess, TheMesherIsFoundInTheBuildTree) {
  ASSERT_EQ(std::getenv("SHARPEY_MESHER"), nullptr);
  const std::string path = mesher_executable();
  EXPECT_EQ(::access(path.c_str(), X_OK), 0) << path;
}

// TetGen's own failure (self-intersecting input) arrives from the mesher process as a MeshError
// with its reason.
TEST(ChildProcess, TetgenFailureInTheMesherArrivesAsMeshError) {
  // The unit box and one more triangle piercing its bottom face: self-intersecting.
  Plc plc = unit_box();
  plc.points.insert(plc.points.end(), {{0.5, -0.5, 0.5}, {0.5, 1.5, 0.5}, {0.5, 0.5, -0.5}});
  plc.triangles.push_back({8, 9, 10});
  plc.triangle_marker.push_back(1);
  TetgenOptions options;
  options.second_order = false;
  options.stage = "meshing a self-intersecting test box";
  try {
    tetrahedralize(plc, options);
    FAIL() << "a self-intersecting PLC was meshed";
  } catch (const MeshError& e) {
    const std::string what = e.what();
    EXPECT_NE(what.find("meshing a self-intersecting test box"), std::string::npos) << what;
    // TetGen itself refused it (code 3: self-intersection), not the checks made before TetGen.
    EXPECT_NE(what.find("TetGen code 3"), std::string::npos) << what;
  }
}

// The mesher replaced by a program that never finishes (SHARPEY_MESHER): cancelling stops it and
// tetrahedralize throws Cancelled; a mesher that cannot be started is a MeshError, with no
// fallback to TetGen in this process.
TEST(ChildProcess, TetrahedralizeIsCancelledWhileTheMesherRuns) {
  TempFolder folder;
  const std::string marker = folder / "started";
  ASSERT_EQ(::setenv("SHARPEY_MESHER", never_finishing_script(folder, marker).c_str(), 1), 0);
  std::atomic<bool> cancel{false};
  Clock::time_point set_at;
  std::thread canceller = cancel_when_started(marker, &cancel, &set_at);
  TetgenOptions options;
  options.cancel = &cancel;
  EXPECT_THROW(tetrahedralize(unit_box(), options), Cancelled);
  canceller.join();
  print_reaction("tetrahedralize", set_at);
  ::unsetenv("SHARPEY_MESHER");
  std::string pid_text;
  std::ifstream(marker) >> pid_text;
  EXPECT_TRUE(process_gone(static_cast<pid_t>(std::stol(pid_text))));
}

TEST(ChildProcess, NoMesherMeansAMeshErrorNotAFallback) {
  ASSERT_EQ(::setenv("SHARPEY_MESHER", "/nonexistent/sharpey-mesher", 1), 0);
  try {
    tetrahedralize(unit_box(), TetgenOptions());
    ADD_FAILURE() << "meshed without the mesher program";
  } catch (const MeshError& e) {
    EXPECT_NE(std::string(e.what()).find("/nonexistent/sharpey-mesher"), std::string::npos)
        << e.what();
  }
  ::unsetenv("SHARPEY_MESHER");
  // With the real mesher the same box meshes.
  const VolumeMesh mesh = tetrahedralize(unit_box(), TetgenOptions());
  EXPECT_GT(mesh.n_elements(), 0);
}

}  // namespace
}  // namespace sharpey::mesh
