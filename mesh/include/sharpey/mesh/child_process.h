// Running a piece of work in a forked copy of this process, so that a crash inside third-party
// code (a segmentation fault or a failed assertion in TetGen) ends the copy, not the program: the
// caller gets the copy's output, or how it ended, and can report the failure. tetrahedralize()
// runs TetGen this way.
#pragma once

#include <functional>
#include <shared_mutex>
#include <string>

namespace sharpey::mesh {

struct ChildOutcome {
  bool started = false;  // false: fork() or pipe() failed (nothing ran); see `error`
  int exit_code = -1;    // the work's return value when it ended normally, else -1
  int signal = 0;        // the signal that ended the copy (SIGSEGV, SIGABRT, ...), else 0
  std::string output;    // every byte the work wrote to its file descriptor
  std::string error;     // why nothing ran (when !started)
};

// Runs `work(fd)` in a child made by fork(); the work writes its result to `fd` (write_all) and
// returns an exit code (0 to 124). The child never returns into the caller's code: it ends with
// the exit system call after `work`, and an exception escaping `work` ends it with code 126; it
// is killed when the thread that started it ends (Linux PR_SET_PDEATHSIG), so it never outlives
// the program. The parent reads
// everything written, waits for the child and returns how it ended. Only the calling thread
// exists in the child, so `work` must not wait on other threads or locks they may hold (glibc's
// malloc and stdio are safe across fork).
ChildOutcome run_in_child(const std::function<int(int fd)>& work);

// Guards fork() against threaded BLAS calls in other threads. OpenBLAS (its pthread build, Debian's
// default) registers a pthread_atfork handler that shuts its thread pool down before every fork;
// if another thread is inside a threaded BLAS call at that moment, the call or the fork can hang.
// Code that calls BLAS (CHOLMOD's factorisation and solves, fem/solver.cpp) holds a shared lock for
// the call; run_in_child holds the exclusive lock for the fork() itself only.
std::shared_mutex& fork_mutex();

// Writes all `size` bytes to `fd`, retrying after interruptions and partial writes; false on error.
bool write_all(int fd, const void* data, size_t size);

// Name of a signal for messages ("SIGSEGV (segmentation fault)").
std::string signal_name(int signal);

}  // namespace sharpey::mesh
