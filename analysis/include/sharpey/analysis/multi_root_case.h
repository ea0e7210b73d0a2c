// Multi-rooted tooth case files: the thin-layer estimate (multi_root_thin_layer.h) of a molar or
// the two-rooted maxillary first premolar over bone-level scenarios with furcation involvement,
// and its report (multi_root_results.json, multi_root_summary.txt, a root map per scenario).
// Schema: docs/molars.md, "Case file". Run by `sharpey-batch molar` (or `run`) CASE --out DIR;
// swept by `sharpey-batch sweep` (docs/sweeps.md, "Multi-rooted teeth").
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
  // per-root peak pressure, root-side areas and allowance beside the estimate. Every scenario must
  // be meshable (validate_multi_root_mesh).
  bool finite_elements = false;
};

// Parses and validates (every scenario's tooth and bone); InputError names the key and the fix,
// prefixed with `origin`.
MultiRootCase parse_multi_root_case(const std::string& json_text,
                                    const std::string& origin = "case");
MultiRootCase load_multi_root_case(const std::string& path);
// True when `path` holds a JSON object whose "kind" is "multi_root_estimate" (false for anything
// else, an unreadable file, not a regular file, a file over the case reader's size limit or not
// JSON: the caller's own reader then says what is wrong). Never blocks on a pipe.
bool is_multi_root_case_file(const std::string& path);

// One cell of a scenario's root map: on part `part` (mesh::kTrunkPart or a root index; the roof is
// left out), depth_mm to depth_mm + 1 below the CEJ, sector 30 * sector to 30 * sector + 30
// degrees around the part's own centre (0 buccal, 90 mesial); the largest hydrostatic pressure of
// the attached points in the cell, kPa (compression > 0).
struct MultiRootMapCell {
  int part = mesh::kTrunkPart;
  int depth_mm = 0;
  int sector = 0;
  double pressure_kpa = 0;
};

// The allowance of one molar movement (MultiRootThinLayer::allowance): the largest magnitude, N
// (N mm for uprighting), keeping the tooth's peak compression at or below each threshold;
// +infinity when the movement compresses nothing.
struct MolarAllowance {
  MolarMovement movement = MolarMovement::kUprighting;
  double capillary = 0, limit = 0;
};

// Finite-element figures of a scenario (MultiRootCase::finite_elements).
struct MultiRootFeFigures {
  int n_dofs = 0;
  MultiRootCres buccolingual, mesiodistal;
  RootFigures tooth;
  std::vector<RootFigures> roots;
  // Attachment and areas above the thresholds in tooth and roots: multi_root_fe_pressure's
  // root-side areas (multi_root_fe.h). The case's movement to each threshold in the case's base
  // unit, from the finite-element tooth peak per unit of the load (linear model); negative when
  // the movement compresses nothing.
  double allowance_capillary = -1, allowance_limit = -1;
};

// Everything the reports show of one scenario, under the case's load.
struct MultiRootScenarioResult {
  std::string name;
  mesh::RootAreas areas;
  MultiRootCres cres_buccolingual, cres_mesiodistal;  // forces along x and along y
  MultiRootResult result;                             // the case's load (tooth and per root)
  // The case's movement to each threshold in the case's base unit (N, or N mm for uprighting):
  // threshold over the peak per unit; negative when the movement compresses nothing.
  double allowance_capillary = -1, allowance_limit = -1;
  std::vector<MolarAllowance> allowances;  // uprighting, intrusion, translation
  std::vector<MultiRootMapCell> root_map;  // by part, depth, sector
  // The whole root surface (mesh::root_surface_points, attached flags set) and the layer's
  // pressure at each point under the case's load, kPa (NaN where nothing is attached).
  std::vector<mesh::RootSurfacePoint> surface;
  std::vector<double> surface_pressure_kpa;
  bool has_finite_elements = false;
  MultiRootFeFigures finite_elements;
};

struct MultiRootCaseResult {
  mesh::MultiRootTooth tooth;
  double magnitude = 0;   // the load in N (N mm for uprighting)
  std::string base_unit;  // "N" or "N mm"
  std::vector<MultiRootScenarioResult> scenarios;
};

// The name of a root-map part: "trunk" or the root's name.
std::string multi_root_part_name(const mesh::MultiRootTooth& tooth, int part);

// Evaluates every scenario (and meshes and solves it when spec.finite_elements). Throws
// MeshError or SolverError from the finite-element runs.
MultiRootCaseResult evaluate_multi_root_case(const MultiRootCase& spec);

// Evaluates every scenario and writes multi_root_results.json, multi_root_summary.txt and
// <n>_root_map.csv (n the scenario's index) into `folder` (created by the caller). Each output
// carries caution_text(). Throws OutputError when a file cannot be written, MeshError or
// SolverError from the finite-element runs.
void run_multi_root_case(const MultiRootCase& spec, const std::string& folder);

}  // namespace sharpey::analysis
