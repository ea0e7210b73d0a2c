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
  // Also mesh and solve every scenario (mesh::build_multi_root_mesh, coarse sizes; dentin
  // 18.6 GPa and cancellous bone 1.37 GPa, check-values.md section 1): the finite-element CRes and
  // per-root peak pressure beside the estimate. Every scenario must be meshable
  // (validate_multi_root_mesh).
  bool finite_elements = false;
};

// Parses and validates (every scenario's tooth and bone); InputError names the key and the fix,
// prefixed with `origin`.
MultiRootCase parse_multi_root_case(const std::string& json_text,
                                    const std::string& origin = "case");
MultiRootCase load_multi_root_case(const std::string& path);

// Evaluates every scenario and writes multi_root_results.json, multi_root_summary.txt and
// <n>_root_map.csv (n the scenario's index) into `folder` (created by the caller). Each output
// carries caution_text(). Throws OutputError when a file cannot be written, MeshError or
// SolverError from the finite-element runs.
void run_multi_root_case(const MultiRootCase& spec, const std::string& folder);

}  // namespace sharpey::analysis
