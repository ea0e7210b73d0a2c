// sharpey-mesher: TetGen in a process of its own, started by tetrahedralize() (child_process.h).
// Reads one request on standard input, writes the mesh or TetGen's failure on standard output.
// Argument: the parent's process id; the mesher ends with its parent (Linux PR_SET_PDEATHSIG), so
// no orphan keeps meshing after the program that asked for it is gone.
#include <signal.h>
#include <sys/prctl.h>
#include <unistd.h>

#include <cstdlib>

#include "detail/mesher_protocol.h"

int main(int argc, char** argv) {
  ::prctl(PR_SET_PDEATHSIG, SIGKILL);
  // The parent may have ended before the line above: then this process has a new parent.
  if (argc > 1 && ::getppid() != static_cast<pid_t>(std::atol(argv[1]))) return 3;
  return sharpey::mesh::detail::run_mesher(STDIN_FILENO, STDOUT_FILENO);
}
