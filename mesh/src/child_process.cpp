#include "sharpey/mesh/child_process.h"

#include <fcntl.h>
#include <sys/prctl.h>
#include <sys/syscall.h>
#include <sys/types.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cerrno>
#include <csignal>
#include <cstring>
#include <mutex>
#include <string>

namespace sharpey::mesh {

bool write_all(int fd, const void* data, size_t size) {
  const char* p = static_cast<const char*>(data);
  while (size > 0) {
    const ssize_t n = ::write(fd, p, size);
    if (n < 0) {
      if (errno == EINTR) continue;
      return false;
    }
    p += n;
    size -= static_cast<size_t>(n);
  }
  return true;
}

std::string signal_name(int signal) {
  switch (signal) {
    case SIGSEGV: return "SIGSEGV (segmentation fault)";
    case SIGABRT: return "SIGABRT (failed assertion or abort)";
    case SIGBUS: return "SIGBUS (bus error)";
    case SIGFPE: return "SIGFPE (arithmetic error)";
    case SIGILL: return "SIGILL (illegal instruction)";
    case SIGKILL: return "SIGKILL (killed, e.g. by the out-of-memory killer)";
    default: return "signal " + std::to_string(signal);
  }
}

std::shared_mutex& fork_mutex() {
  static std::shared_mutex mutex;
  return mutex;
}

ChildOutcome run_in_child(const std::function<int(int fd)>& work) {
  ChildOutcome outcome;
  int fds[2];
  if (::pipe2(fds, O_CLOEXEC) != 0) {
    outcome.error = std::string("pipe() failed: ") + std::strerror(errno);
    return outcome;
  }
  const pid_t parent = ::getpid();
  pid_t pid;
  {
    const std::unique_lock<std::shared_mutex> no_blas_call_running(fork_mutex());
    pid = ::fork();
  }
  if (pid < 0) {
    outcome.error = std::string("fork() failed: ") + std::strerror(errno);
    ::close(fds[0]);
    ::close(fds[1]);
    return outcome;
  }
  if (pid == 0) {
    ::close(fds[0]);
    // The child ends with the parent (killed, or stopped by Ctrl-C): no orphan keeps meshing.
    ::prctl(PR_SET_PDEATHSIG, SIGKILL);
    if (::getppid() != parent) {
      ::syscall(SYS_exit_group, 125);
      ::_exit(125);  // not reached
    }
    // A crash ends the child by its signal, for the parent to report: no handler installed by
    // the program or a sanitizer runtime turns it into something else.
    for (const int sig : {SIGSEGV, SIGBUS, SIGFPE, SIGILL, SIGABRT}) std::signal(sig, SIG_DFL);
    int code = 126;
    try {
      code = work(fds[1]);
    } catch (...) {
      code = 126;
    }
    // The exit system call itself, not _exit(): sanitizer runtimes intercept _exit() to run
    // their exit-time checks, which need locks another thread of the parent may have held at
    // the fork.
    ::syscall(SYS_exit_group, code);
    ::_exit(code);  // not reached
  }
  outcome.started = true;
  ::close(fds[1]);
  char buffer[1 << 16];
  for (;;) {
    const ssize_t n = ::read(fds[0], buffer, sizeof buffer);
    if (n > 0) {
      outcome.output.append(buffer, static_cast<size_t>(n));
    } else if (n == 0 || errno != EINTR) {
      break;
    }
  }
  ::close(fds[0]);
  int status = 0;
  while (::waitpid(pid, &status, 0) < 0) {
    if (errno != EINTR) {
      outcome.error = std::string("waitpid() failed: ") + std::strerror(errno);
      return outcome;
    }
  }
  if (WIFEXITED(status)) outcome.exit_code = WEXITSTATUS(status);
  if (WIFSIGNALED(status)) outcome.signal = WTERMSIG(status);
  return outcome;
}

}  // namespace sharpey::mesh
