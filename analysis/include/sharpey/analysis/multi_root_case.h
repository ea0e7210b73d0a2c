// Multi-rooted tooth case files: the thin-layer estimate (multi_root_thin_layer.h) of a molar or
// the two-rooted maxillary first premolar over bone-level scenarios with furcation involvement,
// and its report (multi_root_results.json, multi_root_summary.txt, a root map per scenario).
// Schema: docs/molars.md, "Case file". Run by `sharpey-batch molar CASE --out DIR`.
#pragma once

#include <string>
#include <vector>

#include "sharpey/analysis/case_spec.h"
#include "sharpey/analysis/multi_root_thin_layer.h"

namespace sharpey::analysis {

struct MultiRootScenario {
  std::string name;
  mesh::MultiRootBone bone;
};

struct MultiRootCase {
  std::string label, notes;
  mesh::MultiRootType type = mesh::MultiRootType::kMandibularFirstMolar;
  fem::Material pdl{0.47, 0.45};
  std::vector<MultiRootScenario> scenarios;
  MolarMovement movement = MolarMovement::kUprighting;
  double magnitude = 10;      // N, or N mm for uprighting
  std::string unit = "N mm";  // as read: "N", "cN", "g" (forces), "N mm", "g mm" (couples)
  Thresholds thresholds = default_thresholds();
};

// Parses and validates (every scenario's tooth and bone); InputError names the key and the fix,
// prefixed with `origin`.
MultiRootCase parse_multi_root_case(const std::string& json_text,
                                    const std::string& origin = "case");
MultiRootCase load_multi_root_case(const std::string& path);

// Evaluates every scenario and writes multi_root_results.json, multi_root_summary.txt and
// <n>_root_map.csv (n the scenario's index) into `folder` (created by the caller). Each output
// carries caution_text(). Throws OutputError when a file cannot be written.
void run_multi_root_case(const MultiRootCase& spec, const std::string& folder);

}  // namespace sharpey::analysis
