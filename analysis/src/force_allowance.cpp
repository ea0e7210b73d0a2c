#include "sharpey/analysis/force_allowance.h"

#include <cmath>
#include <limits>
#include <sstream>

#include "sharpey/error.h"

namespace sharpey::analysis {

namespace {

// A measure of zero (or less: no compression) never reaches a positive threshold.
double allowance_n(double threshold_kpa, double measure_kpa_per_n) {
  if (!(measure_kpa_per_n > 0)) return std::numeric_limits<double>::infinity();
  return threshold_kpa / measure_kpa_per_n;
}

bool needs_horizontal_force(MovementPreset movement) {
  return movement != MovementPreset::kIntrusion && movement != MovementPreset::kExtrusion &&
         movement != MovementPreset::kRotation;
}

}  // namespace

std::string to_string(AllowanceMeasure measure) {
  return measure == AllowanceMeasure::kPeak ? "peak" : "p95";
}

std::string to_string(AllowanceThreshold threshold) {
  return threshold == AllowanceThreshold::kCapillary ? "capillary" : "limit";
}

double MovementAllowance::force_n(AllowanceMeasure measure, AllowanceThreshold threshold) const {
  if (measure == AllowanceMeasure::kPeak) {
    return threshold == AllowanceThreshold::kCapillary ? peak_capillary_n : peak_limit_n;
  }
  return threshold == AllowanceThreshold::kCapillary ? p95_capillary_n : p95_limit_n;
}

const MovementAllowance& ScenarioAllowances::of(MovementPreset movement) const {
  for (const MovementAllowance& m : movements) {
    if (m.movement == movement) return m;
  }
  throw Error("no allowance for the movement '" + analysis::to_string(movement) +
              "' in scenario '" + scenario + "'");
}

PracticeRange common_practice_range(MovementPreset movement) {
  // check-values.md section 9 (common practice, no single source).
  PracticeRange r;
  switch (movement) {
    case MovementPreset::kUncontrolledTipping:
    case MovementPreset::kControlledTipping:
    case MovementPreset::kRotation:
    case MovementPreset::kExtrusion:
      r.low_g = 35;
      r.high_g = 60;
      return r;
    case MovementPreset::kTranslation:
      r.low_g = 70;
      r.high_g = 120;
      return r;
    case MovementPreset::kRootMovement:
      r.low_g = 50;
      r.high_g = 100;
      return r;
    case MovementPreset::kIntrusion:
      r.low_g = 10;
      r.high_g = 20;
      return r;
    case MovementPreset::kNone:
      break;
  }
  throw Error("common_practice_range: no range for the movement 'none' (give a movement preset)");
}

LoadSpec allowance_load(const LoadSpec& case_load, MovementPreset movement) {
  if (movement == MovementPreset::kNone) {
    throw Error("allowance_load: the allowance needs a movement preset, not 'none'");
  }
  LoadSpec load = case_load;
  load.magnitude = 1.0;
  load.unit = ForceUnit::kNewton;
  load.preset = movement;
  load.couple = CoupleKind::kNone;
  load.moment_nmm.setZero();
  load.moment_to_force_mm = 0;
  const double norm = case_load.direction.norm();
  if (!std::isfinite(norm) || norm < 1e-9) {
    std::ostringstream msg;
    msg << "force direction (" << case_load.direction.transpose()
        << ") has no usable length for the force allowance; give a nonzero direction vector in "
           "tooth coordinates, e.g. (-1, 0, 0) for a lingual force";
    throw InputError("load.direction", msg.str());
  }
  Eigen::Vector3d d = case_load.direction / norm;
  if (needs_horizontal_force(movement) && std::hypot(d.x(), d.y()) < 1e-6) {
    // A vertical case force (an intrusion case): tipping, translation and root movement are
    // evaluated along the labiolingual default.
    d = named_direction("lingual");
    load.direction_name = "lingual";
  } else if (movement == MovementPreset::kIntrusion) {
    d = named_direction("intrusive");
    load.direction_name = "intrusive";
  } else if (movement == MovementPreset::kExtrusion) {
    d = named_direction("extrusive");
    load.direction_name = "extrusive";
  }
  load.direction = d;
  return load;
}

MovementAllowance movement_allowance(const ScenarioSolution& solution, const LoadSpec& case_load,
                                     MovementPreset movement, const Thresholds& thresholds) {
  const LoadSpec unit = allowance_load(case_load, movement);
  const ScenarioResult r = evaluate(solution, unit, thresholds, nullptr);
  MovementAllowance a;
  a.movement = movement;
  a.direction = movement == MovementPreset::kRotation ? Eigen::Vector3d::UnitZ() : unit.direction;
  a.peak_kpa_per_n = r.pressure_max_compression_kpa;
  a.p95_kpa_per_n = r.pressure_p95_compression_kpa;
  a.peak_tension_kpa_per_n = r.pressure_max_tension_kpa;
  a.crown_tip_um_per_n = r.crown_tip_displacement_um.norm();
  a.moment_to_force_mm = r.load.moment_to_force_mm;
  a.peak_capillary_n = allowance_n(thresholds.capillary.value_kpa, a.peak_kpa_per_n);
  a.peak_limit_n = allowance_n(thresholds.limit.value_kpa, a.peak_kpa_per_n);
  a.p95_capillary_n = allowance_n(thresholds.capillary.value_kpa, a.p95_kpa_per_n);
  a.p95_limit_n = allowance_n(thresholds.limit.value_kpa, a.p95_kpa_per_n);
  return a;
}

ScenarioAllowances scenario_allowances(const ScenarioSolution& solution, const LoadSpec& case_load,
                                       const Thresholds& thresholds) {
  ScenarioAllowances s;
  s.scenario = solution.scenario().name;
  s.bone_loss_mm = solution.scenario().loss.horizontal_mm;
  for (MovementPreset m : all_movement_presets()) {
    s.movements.push_back(movement_allowance(solution, case_load, m, thresholds));
  }
  return s;
}

std::vector<ScenarioAllowances> nominal_allowances(const Study& study) {
  std::vector<ScenarioAllowances> out;
  out.reserve(study.solutions().size());
  for (const auto& solution : study.solutions()) {
    out.push_back(scenario_allowances(*solution, study.spec().load, study.spec().thresholds));
  }
  return out;
}

}  // namespace sharpey::analysis
