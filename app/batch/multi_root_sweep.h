// The multi-rooted part of sharpey-batch's sweep (docs/sweeps.md, "Multi-rooted teeth"): each
// combination's case checked (an invalid one becomes a failure record, not an error), its table
// rows (one per scenario: tooth and per-root figures, CRes, allowances, finite elements on
// request) and the sweep's tables, sweep.csv and sweep.json. The distribution over ranks, the
// checkpoints, the progress and the interruption are the single-rooted sweep's (batch_commands).
#pragma once

#include <string>
#include <vector>

#include "sharpey/analysis/multi_root_case.h"

namespace sharpey::batch {

// One combination of a multi-rooted sweep, read and checked.
struct MultiRootCombination {
  analysis::MultiRootCase spec;  // valid when failure is empty
  // An invalid combination's record: "key K: message" (the message names the value and the fix).
  std::string failure;
  std::string failure_key;  // the key the failure names
  // Equal for combinations that share one model (all but the load, thresholds, label and notes
  // equal); unique for an invalid combination.
  std::string model_key;
};

// Reads and checks the case text of combination `combination` (1-based): an InputError becomes
// the failure record.
MultiRootCombination check_multi_root_combination(const std::string& case_text, int combination);

// The table rows (CSV lines, each ending in '\n') of one combination: one per scenario of its
// case, evaluated as `sharpey-batch molar` evaluates it (analysis::evaluate_multi_root_case), or
// one failure record. Throws MeshError or SolverError from finite-element runs.
std::string multi_root_sweep_rows(int combination, const std::vector<std::string>& values,
                                  const MultiRootCombination& c);

// sweep.csv: the caution, a comment line, the header (combination, the varied keys, the figures)
// and `rows` (the rows of every combination in order).
std::string multi_root_sweep_csv(const std::vector<std::string>& keys, const std::string& rows);
// sweep.json: the caution, the method, the columns and one object per row (numbers as numbers,
// empty figures as null, varied values as the JSON values they were given as).
std::string multi_root_sweep_json(const std::vector<std::string>& keys, const std::string& rows);

}  // namespace sharpey::batch
