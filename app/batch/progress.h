// Progress lines on stderr for long steps ("sharpey-batch: [ 40%] meshing scenario 2 of 4").
#pragma once

#include <chrono>
#include <string>

namespace sharpey::batch {

class Progress {
 public:
  explicit Progress(bool quiet) : quiet_(quiet), start_(std::chrono::steady_clock::now()) {}
  // `fraction` in [0, 1] of the current step; prints when the stage changes or every 10 %.
  void report(const std::string& stage, double fraction);
  // A one-off line (always printed unless quiet).
  void note(const std::string& text);

 private:
  bool quiet_;
  std::chrono::steady_clock::time_point start_;
  std::string last_stage_;
  int last_decile_ = -1;
};

// Progress of a whole sweep across its ranks, printed by rank 0 when a model is done anywhere:
// "study: 12 of 90 models done (3 resumed), 2 ranks, 5.3 models/min, about 14 min 40 s left".
// The rate is that of this run (models solved since it started, by all ranks together); models
// taken from checkpoints count as done but not toward the rate.
class StudyProgress {
 public:
  StudyProgress(bool quiet, int n_models, int n_resumed, int n_ranks);
  void model_done();
  int n_solved() const { return n_solved_; }

 private:
  bool quiet_;
  int n_models_, n_resumed_, n_ranks_, n_solved_ = 0;
  std::chrono::steady_clock::time_point start_;
};

// "2 h 05 min", "14 min 40 s", "35 s".
std::string duration_text(double seconds);

}  // namespace sharpey::batch
