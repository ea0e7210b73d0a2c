// Exit codes of sharpey-batch (also listed in --help and docs/case-format.md).
#pragma once

namespace sharpey::batch {

enum ExitCode : int {
  kOk = 0,
  kInternalError = 1,  // an unexpected failure inside the program (please report it)
  kBadInput = 2,       // bad command line or case file (message names the key)
  kMeshFailure = 3,    // the mesher could not build the model
  kSolverFailure = 4,  // the linear system could not be solved
  kOutputFailure = 5,  // an output file could not be written
  kInterrupted = 6,    // cancelled by SIGINT / SIGTERM (Ctrl-C)
};

}  // namespace sharpey::batch
