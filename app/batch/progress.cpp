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

StudyProgress::StudyProgress(bool quiet, int n_models, int n_resumed, int n_ranks)
    : quiet_(quiet),
      n_models_(n_models),
      n_resumed_(n_resumed),
      n_ranks_(n_ranks),
      start_(std::chrono::steady_clock::now()) {}

void StudyProgress::model_done() {
  ++n_solved_;
  if (quiet_) return;
  const double seconds =
      std::chrono::duration<double>(std::chrono::steady_clock::now() - start_).count();
  const int n_done = n_resumed_ + n_solved_, n_left = n_models_ - n_done;
  const double per_minute = seconds > 0 ? 60.0 * n_solved_ / seconds : 0.0;
  std::string line =
      "study: " + std::to_string(n_done) + " of " + std::to_string(n_models_) + " models done";
  if (n_resumed_ > 0) line += " (" + std::to_string(n_resumed_) + " resumed)";
  line += ", " + std::to_string(n_ranks_) + (n_ranks_ == 1 ? " rank" : " ranks");
  char rate[64];
  std::snprintf(rate, sizeof rate, ", %.1f models/min", per_minute);
  line += rate;
  if (n_left > 0 && per_minute > 0)
    line += ", about " + duration_text(60.0 * n_left / per_minute) + " left";
  std::fprintf(stderr, "sharpey-batch: %s (%.1f s)\n", line.c_str(), seconds);
  std::fflush(stderr);
}

std::string duration_text(double seconds) {
  const long long s = static_cast<long long>(std::llround(std::fmax(0.0, seconds)));
  char text[64];
  if (s >= 3600)
    std::snprintf(text, sizeof text, "%lld h %02lld min", s / 3600, (s % 3600) / 60);
  else if (s >= 60)
    std::snprintf(text, sizeof text, "%lld min %02lld s", s / 60, s % 60);
  else
    std::snprintf(text, sizeof text, "%lld s", s);
  return text;
}

}  // namespace sharpey::batch
