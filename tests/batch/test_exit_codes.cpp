// Every library error maps to its documented exit code (app/batch/exit_codes.h, --help): typed
// errors by their type, plain sharpey::Error by the stage it happens in. The model-stage failures
// are provoked for real through the library (the rigid-motion fit of collinear nodes), not built
// by hand; the documented codes are the source of every expected value.
#include <gtest/gtest.h>

#include <Eigen/Core>
#include <filesystem>
#include <new>
#include <string>
#include <system_error>
#include <vector>

#include "exit_codes.h"
#include "failure.h"
#include "sharpey/analysis/detail/rigid_motion.h"

namespace sharpey::batch {
namespace {

template <class Work>
Failure failure_of(Work&& work) {
  try {
    work();
  } catch (...) {
    return describe_failure(std::current_exception());
  }
  ADD_FAILURE() << "nothing was thrown";
  return {};
}

// The library's rigid-motion fit on three collinear nodes: it throws a plain sharpey::Error.
void fit_collinear_nodes() {
  const std::vector<Eigen::Vector3d> points = {{0, 0, 0}, {0, 0, 1}, {0, 0, 2}};
  analysis::detail::fit_rigid_motion(points, Eigen::VectorXd::Zero(9), {0, 1, 2});
}

TEST(BatchExitCodes, RigidFitFailureIsAMesherFailureNotAnOutputFailure) {
  // Before the mapping this was reported as "error" with exit 5 (output failure).
  const Failure f = failure_of([] { in_model_stage(fit_collinear_nodes); });
  EXPECT_EQ(f.exit_code, kMeshFailure) << f.message;  // documented: 3 mesher failure
  EXPECT_EQ(f.kind, "mesher failure");
  EXPECT_NE(f.message.find("rigid-body fit of the tooth failed"), std::string::npos) << f.message;
  EXPECT_FALSE(f.hint.empty());
}

TEST(BatchExitCodes, PlainLibraryErrorsAreTypedByTheirStage) {
  EXPECT_EQ(
      failure_of([] { in_output_stage([] { throw Error("cannot write \"x.vtu\""); }); }).exit_code,
      kOutputFailure);
  // Outside a stage a plain Error is unexpected: internal error (1), never an output failure.
  const Failure outside = failure_of(fit_collinear_nodes);
  EXPECT_EQ(outside.exit_code, kInternalError);
  EXPECT_NE(outside.message.find("please report it"), std::string::npos);
  // Typed errors keep their own code inside either stage.
  EXPECT_EQ(failure_of([] { in_model_stage([] { throw SolverError("singular"); }); }).exit_code,
            kSolverFailure);
  EXPECT_EQ(failure_of([] { in_output_stage([] { throw InputError("k", "bad"); }); }).exit_code,
            kBadInput);
  EXPECT_EQ(failure_of([] { in_model_stage([] { throw Cancelled(); }); }).exit_code, kInterrupted);
}

TEST(BatchExitCodes, EveryErrorTypeHasItsDocumentedCode) {
  struct Row {
    const char* name;
    int expected;  // documented in --help (app/batch/main.cpp) and docs/case-format.md
    void (*raise)();
  };
  const Row rows[] = {
      {"InputError", kBadInput, [] { throw InputError("load.magnitude", "bad"); }},
      {"MeshError", kMeshFailure, [] { throw MeshError("TetGen failed"); }},
      {"SolverError", kSolverFailure, [] { throw SolverError("not positive definite"); }},
      {"OutputError", kOutputFailure, [] { throw analysis::OutputError("cannot write"); }},
      {"filesystem_error", kOutputFailure,
       [] {
         throw std::filesystem::filesystem_error(
             "rename", std::make_error_code(std::errc::permission_denied));
       }},
      {"Cancelled", kInterrupted, [] { throw Cancelled(); }},
      {"bad_alloc", kInternalError, [] { throw std::bad_alloc(); }},
      {"std::exception", kInternalError, [] { throw std::logic_error("bug"); }},
      {"unknown", kInternalError, [] { throw 42; }},
  };
  for (const Row& r : rows) {
    SCOPED_TRACE(r.name);
    const Failure f = failure_of(r.raise);
    EXPECT_EQ(f.exit_code, r.expected);
    EXPECT_FALSE(f.kind.empty());
    EXPECT_FALSE(f.message.empty());
  }
}

}  // namespace
}  // namespace sharpey::batch
