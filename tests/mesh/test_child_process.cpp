// run_in_child(): work in a forked copy of the process, as tetrahedralize() runs TetGen. Proves
// that the output arrives whole (larger than a pipe's buffer), that a crash or an abort in the
// copy is reported with its signal instead of ending the test program, and that an exception
// escaping the work ends the copy with code 126.
#include <gtest/gtest.h>

#include <csignal>
#include <cstdlib>
#include <stdexcept>
#include <string>

#include "sharpey/error.h"
#include "sharpey/mesh/child_process.h"
#include "sharpey/mesh/tetrahedralize.h"

namespace sharpey::mesh {
namespace {

TEST(ChildProcess, ReturnsEverythingTheWorkWrites) {
  std::string expected;
  for (int i = 0; i < 300000; ++i) expected += static_cast<char>('a' + i % 26);  // > 64 KiB pipe
  const ChildOutcome c = run_in_child([&](int fd) {
    return write_all(fd, expected.data(), expected.size()) ? 7 : 1;
  });
  ASSERT_TRUE(c.started) << c.error;
  EXPECT_EQ(c.exit_code, 7);
  EXPECT_EQ(c.signal, 0);
  EXPECT_EQ(c.output, expected);
}

TEST(ChildProcess, ReportsASegmentationFaultInsteadOfCrashing) {
  const ChildOutcome c = run_in_child([](int fd) {
    write_all(fd, "x", 1);
    std::raise(SIGSEGV);
    return 0;
  });
  ASSERT_TRUE(c.started) << c.error;
  EXPECT_EQ(c.signal, SIGSEGV);
  EXPECT_EQ(c.exit_code, -1);
  EXPECT_EQ(c.output, "x");
  EXPECT_NE(signal_name(c.signal).find("SIGSEGV"), std::string::npos);
}

TEST(ChildProcess, ReportsAnAbort) {
  const ChildOutcome c = run_in_child([](int) -> int { std::abort(); });
  ASSERT_TRUE(c.started) << c.error;
  EXPECT_EQ(c.signal, SIGABRT);
}

TEST(ChildProcess, AnEscapingExceptionEndsTheChildWithCode126) {
  const ChildOutcome c = run_in_child([](int) -> int { throw std::runtime_error("lost"); });
  ASSERT_TRUE(c.started) << c.error;
  EXPECT_EQ(c.exit_code, 126);
  EXPECT_EQ(c.signal, 0);
}

// TetGen's own failure (self-intersecting input) still arrives as a MeshError with its reason,
// passed back from the child (in sanitizer builds TetGen runs in-process: DEVELOPERS.md).
TEST(ChildProcess, TetgenFailureInTheChildArrivesAsMeshError) {
  // A closed unit box and one more triangle piercing its bottom face: self-intersecting.
  Plc plc;
  plc.points = {{0, 0, 0}, {1, 0, 0}, {1, 1, 0}, {0, 1, 0}, {0, 0, 1}, {1, 0, 1}, {1, 1, 1},
                {0, 1, 1}, {0.5, -0.5, 0.5}, {0.5, 1.5, 0.5}, {0.5, 0.5, -0.5}};
  plc.triangles = {{0, 2, 1}, {0, 3, 2}, {4, 5, 6}, {4, 6, 7}, {0, 1, 5}, {0, 5, 4},
                   {1, 2, 6}, {1, 6, 5}, {2, 3, 7}, {2, 7, 6}, {3, 0, 4}, {3, 4, 7},
                   {8, 9, 10}};  // pierces the box's bottom face
  plc.triangle_marker.assign(plc.triangles.size(), 1);
  plc.regions = {{{0.25, 0.25, 0.75}, 1, 0}};
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

}  // namespace
}  // namespace sharpey::mesh
