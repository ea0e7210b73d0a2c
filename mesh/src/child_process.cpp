#include "sharpey/mesh/child_process.h"

#include <fcntl.h>
#include <poll.h>
#include <spawn.h>
#include <sys/socket.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cerrno>
#include <csignal>
#include <cstdlib>
#include <cstring>
#include <string>

extern char** environ;  // POSIX: the environment of this process

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
    case SIGSEGV:
      return "SIGSEGV (segmentation fault)";
    case SIGABRT:
      return "SIGABRT (failed assertion or abort)";
    case SIGBUS:
      return "SIGBUS (bus error)";
    case SIGFPE:
      return "SIGFPE (arithmetic error)";
    case SIGILL:
      return "SIGILL (illegal instruction)";
    case SIGKILL:
      return "SIGKILL (killed, e.g. by the out-of-memory killer)";
    default:
      return "signal " + std::to_string(signal);
  }
}

std::string mesher_executable() {
  if (const char* path = std::getenv("SHARPEY_MESHER"); path && *path) return path;
  char self[4096];
  const ssize_t n = ::readlink("/proc/self/exe", self, sizeof self - 1);
  if (n > 0) {
    std::string beside(self, static_cast<size_t>(n));
    beside = beside.substr(0, beside.rfind('/') + 1) + "sharpey-mesher";
    if (::access(beside.c_str(), X_OK) == 0) return beside;
  }
  return SHARPEY_MESHER_BUILD_PATH;
}

namespace {

// Reaps `pid`, retrying after interruptions; fills exit_code / signal.
void reap(pid_t pid, ChildOutcome* outcome) {
  int status = 0;
  while (::waitpid(pid, &status, 0) < 0) {
    if (errno != EINTR) return;
  }
  if (WIFEXITED(status)) outcome->exit_code = WEXITSTATUS(status);
  if (WIFSIGNALED(status)) outcome->signal = WTERMSIG(status);
}

// Starts `program` with `args` by posix_spawn, `child_fd` as its standard input and output, in a
// process group of its own with the usual signals at their default action and none blocked.
// Returns posix_spawn's error number (0 when started) and the child's id in `pid`.
int spawn_child(const std::string& program, const std::vector<std::string>& args, int child_fd,
                pid_t* pid) {
  posix_spawn_file_actions_t actions;
  posix_spawnattr_t attributes;
  posix_spawn_file_actions_init(&actions);
  posix_spawn_file_actions_adddup2(&actions, child_fd, STDIN_FILENO);
  posix_spawn_file_actions_adddup2(&actions, child_fd, STDOUT_FILENO);
  posix_spawnattr_init(&attributes);
  sigset_t none, defaults;
  sigemptyset(&none);
  sigemptyset(&defaults);
  for (const int sig : {SIGINT, SIGTERM, SIGPIPE, SIGHUP}) sigaddset(&defaults, sig);
  posix_spawnattr_setsigmask(&attributes, &none);
  posix_spawnattr_setsigdefault(&attributes, &defaults);
  posix_spawnattr_setpgroup(&attributes, 0);
  posix_spawnattr_setflags(&attributes,
                           POSIX_SPAWN_SETSIGMASK | POSIX_SPAWN_SETSIGDEF | POSIX_SPAWN_SETPGROUP);
  std::vector<std::string> argv_text = {program};
  argv_text.insert(argv_text.end(), args.begin(), args.end());
  std::vector<char*> argv;
  for (std::string& a : argv_text) argv.push_back(a.data());
  argv.push_back(nullptr);
  const int spawn_error =
      ::posix_spawn(pid, program.c_str(), &actions, &attributes, argv.data(), environ);
  posix_spawn_file_actions_destroy(&actions);
  posix_spawnattr_destroy(&attributes);
  return spawn_error;
}

// Writes `input` to the child through `fd` and collects its output into `outcome` until the child
// closes its end, or kills it (SIGKILL) once `cancel` is set.
void exchange(int fd, pid_t pid, const std::string& input, const std::atomic<bool>* cancel,
              ChildOutcome* outcome) {
  size_t written = 0;
  bool input_open = true;
  char buffer[1 << 16];
  for (;;) {
    if (cancel != nullptr && cancel->load()) {
      ::kill(pid, SIGKILL);
      outcome->cancelled = true;
      return;
    }
    if (input_open && written == input.size()) {
      ::shutdown(fd, SHUT_WR);  // the child reads to the end of its input
      input_open = false;
    }
    pollfd p{fd, static_cast<short>(POLLIN | (input_open ? POLLOUT : 0)), 0};
    const int ready = ::poll(&p, 1, 50);  // 50 ms: the longest a cancel request waits
    if (ready < 0 && errno != EINTR) return;
    if (ready <= 0) continue;
    if (input_open && (p.revents & POLLOUT)) {
      const ssize_t n =
          ::send(fd, input.data() + written, input.size() - written, MSG_NOSIGNAL | MSG_DONTWAIT);
      if (n > 0) {
        written += static_cast<size_t>(n);
      } else if (n < 0 && errno != EINTR && errno != EAGAIN) {
        input_open = false;  // the child stopped reading (it ended); its outcome tells why
      }
    }
    if (p.revents & (POLLIN | POLLHUP | POLLERR)) {
      const ssize_t n = ::recv(fd, buffer, sizeof buffer, MSG_DONTWAIT);
      if (n > 0) {
        outcome->output.append(buffer, static_cast<size_t>(n));
      } else if (n == 0 || (errno != EINTR && errno != EAGAIN)) {
        return;  // the child closed its end: it has ended (or is ending)
      }
    }
  }
}

}  // namespace

ChildOutcome run_program(const std::string& program, const std::vector<std::string>& args,
                         const std::string& input, const std::atomic<bool>* cancel) {
  ChildOutcome outcome;
  // One socket pair carries both directions (the child's stdin and stdout): send() with
  // MSG_NOSIGNAL reports a child that died before reading its input as EPIPE, not as a SIGPIPE
  // that would end this program.
  int fds[2];
  if (::socketpair(AF_UNIX, SOCK_STREAM | SOCK_CLOEXEC, 0, fds) != 0) {
    outcome.error = std::string("socketpair() failed: ") + std::strerror(errno);
    return outcome;
  }
  pid_t pid = -1;
  const int spawn_error = spawn_child(program, args, fds[1], &pid);
  ::close(fds[1]);
  if (spawn_error != 0) {
    ::close(fds[0]);
    outcome.error = "cannot start \"" + program + "\": " + std::strerror(spawn_error);
    return outcome;
  }
  outcome.started = true;
  outcome.pid = pid;
  exchange(fds[0], pid, input, cancel, &outcome);
  ::close(fds[0]);
  reap(pid, &outcome);
  return outcome;
}

}  // namespace sharpey::mesh
