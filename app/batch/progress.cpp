#include "progress.h"

#include <cmath>
#include <cstdio>

namespace sharpey::batch {

void Progress::report(const std::string& stage, double fraction) {
  if (quiet_) return;
  const int decile = static_cast<int>(std::floor(std::fmax(0.0, std::fmin(1.0, fraction)) * 10));
  if (stage == last_stage_ && decile == last_decile_) return;
  last_stage_ = stage;
  last_decile_ = decile;
  const double seconds =
      std::chrono::duration<double>(std::chrono::steady_clock::now() - start_).count();
  std::fprintf(stderr, "sharpey-batch: [%3d%%] %s (%.1f s)\n", decile * 10, stage.c_str(), seconds);
  std::fflush(stderr);
}

void Progress::note(const std::string& text) {
  if (quiet_) return;
  std::fprintf(stderr, "sharpey-batch: %s\n", text.c_str());
  std::fflush(stderr);
}

}  // namespace sharpey::batch
