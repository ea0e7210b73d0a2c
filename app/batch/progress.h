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

}  // namespace sharpey::batch
