// Background work (the solve job, the allowance band) runs a few nice levels below the window's
// thread, so the window stays smooth to use meanwhile; the threads it starts (the mesher, the
// solver's OpenMP team) inherit the lower priority. Best effort: nothing happens where it is not
// allowed.
#pragma once

#include <algorithm>

#ifdef __linux__
#include <sys/resource.h>
#include <sys/syscall.h>
#include <unistd.h>
#endif

namespace sharpey::app {

// Lowers the calling thread's priority by five nice levels (at most to 19).
inline void lower_this_thread_priority() {
#ifdef __linux__
  const auto tid = static_cast<id_t>(syscall(SYS_gettid));
  const int now = getpriority(PRIO_PROCESS, tid);
  setpriority(PRIO_PROCESS, tid, std::min(19, now + 5));
#endif
}

}  // namespace sharpey::app
