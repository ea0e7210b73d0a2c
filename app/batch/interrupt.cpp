#include "interrupt.h"

#include <signal.h>
#include <unistd.h>

#include "exit_codes.h"

namespace sharpey::batch {

namespace {

std::atomic<bool> g_interrupted{false};
static_assert(std::atomic<bool>::is_always_lock_free, "the flag is set from a signal handler");

extern "C" void on_signal(int) {
  if (g_interrupted.exchange(true)) _exit(kInterrupted);  // second signal: stop now
}

}  // namespace

void install_interrupt_handlers() {
  struct sigaction action {};
  action.sa_handler = on_signal;
  sigemptyset(&action.sa_mask);
  action.sa_flags = SA_RESTART;
  sigaction(SIGINT, &action, nullptr);
  sigaction(SIGTERM, &action, nullptr);
}

const std::atomic<bool>* interrupt_flag() { return &g_interrupted; }

bool interrupted() { return g_interrupted.load(); }

}  // namespace sharpey::batch
