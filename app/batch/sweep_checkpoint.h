// Checkpoints of a sweep: the rows of each solved model, saved in the output folder as soon as the
// model is done, so that a sweep stopped or killed resumes where it stopped and solves no model
// twice. Each file holds one model's rows and names the sweep they belong to (a fingerprint of
// every combination's case and values), so a changed sweep never takes rows of another. The files
// are .csv (an output folder may hold them) and disappear with the folder's swap when the
// finished sweep is committed.
#pragma once

#include <map>
#include <string>
#include <vector>

namespace sharpey::batch {

class SweepCheckpoint {
 public:
  // `folder`: the --out folder; `fingerprint`: of the whole sweep (sweep_fingerprint);
  // `n_models`: how many models (groups of combinations sharing one solved model) it has.
  SweepCheckpoint(std::string folder, std::string fingerprint, int n_models);

  // Removes the temporary files of checkpoint writes that a killed run left in `folder` (only
  // ours: hidden names starting ".sweep_checkpoint_"), so the folder is again one an output can
  // replace. A missing folder is fine.
  static void remove_stale_temporaries(const std::string& folder);

  // The rows saved by earlier runs of this same sweep: model index (0-based) -> rows text.
  std::map<int, std::string> load() const;
  // Saves the rows of model `model` atomically (temporary file, fsync, rename). Throws
  // analysis::OutputError.
  void save(int model, const std::string& rows) const;
  std::string file_name(int model) const;

 private:
  std::string header(int model) const;
  std::string folder_, fingerprint_;
  int n_models_;
};

// 16 hex digits identifying a sweep: FNV-1a (64 bit) over `keys` (the varied keys, and anything
// else that changes the rows, such as the thread count) and, per combination, its values and its
// whole case (as written by case_to_json).
std::string sweep_fingerprint(const std::vector<std::string>& keys,
                              const std::vector<std::vector<std::string>>& values,
                              const std::vector<std::string>& case_json);

}  // namespace sharpey::batch
