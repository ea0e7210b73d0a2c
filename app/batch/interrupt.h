// SIGINT / SIGTERM handling: the first signal asks the running work to stop at the next check
// (the library's cancel flag); a second one ends the process at once with exit code 6. Output
// folders are staged (analysis::StagedFolder), so neither way leaves a partial file behind.
#pragma once

#include <atomic>

namespace sharpey::batch {

void install_interrupt_handlers();
// The flag handed to analysis::Study and checked between steps.
const std::atomic<bool>* interrupt_flag();
bool interrupted();

}  // namespace sharpey::batch
