// Force allowance: the largest force at the bracket, with the couple a movement needs, that keeps
// the PDL compression of a solved scenario at or below a pressure threshold. One implementation
// for the batch command, the app's allowance view and the PDF report (no Qt, no VTK).
//
// The evaluation of a scenario is linear in the force magnitude (the unit load cases are
// superposed, and a movement preset's couple scales with the force), so the peak and the 95th
// percentile of compression under a force F are F times their values under 1 N, and the allowance
// against a threshold t is t / (measure under 1 N): one evaluation per movement. Method, inputs and
// limits: docs/analyses.md, "Force allowance". Every output stating an allowance carries
// analysis::caution_text().
#pragma once

#include <Eigen/Core>
#include <string>
#include <vector>

#include "sharpey/analysis/case_spec.h"
#include "sharpey/analysis/study.h"

namespace sharpey::analysis {

// Which pressure measure the allowance keeps below a threshold: the peak nodal compression outside
// the crest edge band (ScenarioResult::pressure_max_compression_kpa), or the area-weighted 95th
// percentile of compression (ScenarioResult::pressure_p95_compression_kpa).
enum class AllowanceMeasure { kPeak, kP95 };
// Which threshold of Thresholds: the capillary pressure or the upper physiological limit.
enum class AllowanceThreshold { kCapillary, kLimit };
std::string to_string(AllowanceMeasure measure);      // "peak", "p95"
std::string to_string(AllowanceThreshold threshold);  // "capillary", "limit"

// The allowances of one movement in one scenario. Forces in newtons (the internal unit; convert
// with convert_force() of verdict.h for display). An allowance is +infinity when its measure is
// zero under the movement (no compression, or less than 5 % of the attachment area compressed for
// the 95th percentile): no force of that movement reaches the threshold by that measure.
struct MovementAllowance {
  MovementPreset movement = MovementPreset::kNone;
  // Unit force direction evaluated (allowance_load()); rotation: the couple's axis, +z.
  Eigen::Vector3d direction = -Eigen::Vector3d::UnitX();
  // The measures under a force of 1 N (rotation: a couple of 1 N times the lever arm), kPa per N.
  double peak_kpa_per_n = 0;
  double p95_kpa_per_n = 0;
  // Peak tension (magnitude, ScenarioResult::pressure_max_tension_kpa) under 1 N, kPa per N: for
  // information where compression does not limit the force (extrusion stretches the ligament:
  // in the linear-elastic model it has no compression outside the crest edge band).
  double peak_tension_kpa_per_n = 0;
  // Length of the crown tip's displacement (ScenarioResult::crown_tip_displacement_um) under 1 N,
  // micrometres per N: the displacement at an allowance is this times the allowance.
  double crown_tip_um_per_n = 0;
  // The moment-to-force ratio the movement's couple has, mm (ResolvedLoad::moment_to_force_mm).
  double moment_to_force_mm = 0;
  // Allowances, N.
  double peak_capillary_n = 0, peak_limit_n = 0;
  double p95_capillary_n = 0, p95_limit_n = 0;
  double force_n(AllowanceMeasure measure, AllowanceThreshold threshold) const;
  // False when the movement produces no compression by either measure (every allowance infinite).
  bool limited_by_compression() const { return peak_kpa_per_n > 0; }
};

// The allowances of one scenario, one entry per movement in the order of all_movement_presets().
struct ScenarioAllowances {
  std::string scenario;     // the scenario's name
  double bone_loss_mm = 0;  // its horizontal loss
  std::vector<MovementAllowance> movements;
  // The entry of `movement`; throws Error when it is absent.
  const MovementAllowance& of(MovementPreset movement) const;
};

// The range of forces used in practice for a movement, grams-force (check-values.md section 9:
// common practice, no single source; a plausibility bound, never a prescription). Tipping (both
// kinds), rotation and extrusion 35 to 60 g, translation 70 to 120 g, root movement 50 to 100 g,
// intrusion 10 to 20 g. Throws Error for MovementPreset::kNone.
struct PracticeRange {
  double low_g = 0, high_g = 0;
  std::string status = "common practice";  // shown beside the range everywhere
};
PracticeRange common_practice_range(MovementPreset movement);

// The load an allowance is evaluated under: `case_load` (its direction and bracket height) with the
// movement preset `movement` and a magnitude of 1 N. Direction: the case's; when it has no
// horizontal component (a vertical force, as an intrusion case gives), the labiolingual default
// (lingual, -x) for the movements that need a horizontal force; intrusion and extrusion use their
// own vertical directions and rotation its couple about the long axis (as resolve_load does).
// Throws InputError (key "load.direction") for a direction without usable length.
LoadSpec allowance_load(const LoadSpec& case_load, MovementPreset movement);

// The allowances of `movement` in a solved scenario: one evaluation under allowance_load().
// Throws InputError for an unusable load, SolverError when the movement's couple is undefined.
MovementAllowance movement_allowance(const ScenarioSolution& solution, const LoadSpec& case_load,
                                     MovementPreset movement, const Thresholds& thresholds);

// Every movement of all_movement_presets() in one scenario (seven evaluations, milliseconds each:
// the app can show them as soon as a level is solved).
ScenarioAllowances scenario_allowances(const ScenarioSolution& solution, const LoadSpec& case_load,
                                       const Thresholds& thresholds);

// Every solved scenario of `study` under its case's load and thresholds: the nominal allowances
// (the case's own materials and geometry). Always computed by the batch command.
std::vector<ScenarioAllowances> nominal_allowances(const Study& study);

}  // namespace sharpey::analysis
