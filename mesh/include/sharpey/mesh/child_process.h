// Running another program as a child process, so that a crash inside third-party code (a
// segmentation fault or a failed assertion in TetGen) ends the child, not this program, and so a
// cancel request can stop it at once. tetrahedralize() runs TetGen this way, in the small mesher
// executable `sharpey-mesher` (mesh/tools/mesher_main.cpp). The child is started with posix_spawn:
// this process is never forked, so no lock is needed around threads (BLAS, OpenMP, Qt) that run
// meanwhile.
#pragma once

#include <sys/types.h>

#include <atomic>
#include <string>
#include <vector>

namespace sharpey::mesh {

struct ChildOutcome {
  bool started = false;    // false: the program could not be started (nothing ran); see `error`
  bool cancelled = false;  // the cancel flag was seen: the child was killed (SIGKILL) and reaped
  pid_t pid = -1;          // the child's process id (reaped when run_program returns)
  int exit_code = -1;      // its exit code when it ended normally, else -1
  int signal = 0;          // the signal that ended it (SIGSEGV, SIGABRT, SIGKILL, ...), else 0
  std::string output;      // every byte it wrote to its standard output
  std::string error;       // why it could not be started or followed (when !started)
};

// Runs `program` (a path) with `args` (argv[1...]) by posix_spawn, in a process group of its own
// (so a terminal's Ctrl-C reaches this program, which decides), with SIGINT, SIGTERM and SIGPIPE
// at their default action and no signal blocked. Writes `input` to the child's standard input,
// collects its standard output, and waits for it; stderr is shared with this program. While it
// waits it polls `cancel` (may be null) every 50 ms: once set, the child is killed with SIGKILL,
// reaped, and the outcome says `cancelled`. Never throws for the child's failures; the caller
// reads the outcome.
ChildOutcome run_program(const std::string& program, const std::vector<std::string>& args,
                         const std::string& input, const std::atomic<bool>* cancel);

// Path of the mesher executable `sharpey-mesher`: the environment variable SHARPEY_MESHER when set
// (non-empty); otherwise `sharpey-mesher` in the folder of the running program (/proc/self/exe),
// when it exists there (an installed layout); otherwise the path it was built at in this build
// tree (so sharpey, sharpey-batch and every test find it wherever they are built).
std::string mesher_executable();

// Writes all `size` bytes to `fd`, retrying after interruptions and partial writes; false on error.
bool write_all(int fd, const void* data, size_t size);

// Name of a signal for messages ("SIGSEGV (segmentation fault)").
std::string signal_name(int signal);

}  // namespace sharpey::mesh
