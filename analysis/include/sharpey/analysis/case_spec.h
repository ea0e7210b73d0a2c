// A case: tooth, ligament, bone, bone-level scenarios, force system, thresholds, mesh preset.
// Read from and written to JSON (schema documented in docs/case-format.md).
#pragma once

#include <Eigen/Core>
#include <string>
#include <vector>

#include "sharpey/fem/elasticity.h"
#include "sharpey/mesh/tooth_model.h"

namespace sharpey::analysis {

constexpr int kCaseSchemaVersion = 1;

// A pressure threshold with the source it comes from (shown beside it everywhere).
struct Threshold {
  double value_kpa = 0;
  std::string source;
};
struct Thresholds {
  Threshold capillary;  // default 4.7 kPa, capillary blood pressure
  Threshold limit;      // default 16 kPa, upper physiological limit
};
Thresholds default_thresholds();

enum class ForceUnit { kGram, kCentinewton, kNewton };
double to_newton(double value, ForceUnit unit);
double from_newton(double value_n, ForceUnit unit);
std::string to_string(ForceUnit unit);  // "g", "cN", "N"

enum class MovementPreset {
  kNone,  // use the couple as given
  kUncontrolledTipping,
  kControlledTipping,
  kTranslation,
  kRootMovement,
  kIntrusion,
  kExtrusion,
  kRotation,
};
std::string to_string(MovementPreset p);  // snake_case identifiers used in case files
MovementPreset movement_preset_from_string(const std::string& name);

enum class CoupleKind { kNone, kMoment, kRatio };

struct LoadSpec {
  double magnitude = 100;                // in `unit`
  ForceUnit unit = ForceUnit::kGram;
  Eigen::Vector3d direction = -Eigen::Vector3d::UnitX();  // unit vector, tooth coordinates
  double bracket_height_mm = -1;         // force application height above the CEJ; < 0: pad centre
  CoupleKind couple = CoupleKind::kNone;
  Eigen::Vector3d moment_nmm = Eigen::Vector3d::Zero();  // couple when kMoment
  double moment_to_force_mm = 0;         // when kRatio: couple opposing the force's tipping
  MovementPreset preset = MovementPreset::kNone;  // when set, the couple comes from the CRes
  double force_n() const { return to_newton(magnitude, unit); }
};

struct Scenario {
  std::string name;       // e.g. "healthy", "4 mm loss"
  mesh::BoneLoss loss;    // horizontal loss already converted to mm
};

struct CaseSpec {
  int schema_version = kCaseSchemaVersion;
  std::string label;                 // free text; samples are invented cases
  mesh::ModelSpec model;             // tooth, PDL, bone, bracket, mesh sizing (loss per scenario)
  fem::Material tooth_material{18600, 0.31};
  fem::Material pdl_material{0.47, 0.45};
  fem::Material cortical_material{13700, 0.30};
  fem::Material cancellous_material{1370, 0.30};
  std::vector<Scenario> scenarios;
  LoadSpec load;
  Thresholds thresholds = default_thresholds();
};

// Throws InputError naming the key (JSON path), the value and the fix, for a syntax error, a wrong
// type, an unknown key or an out-of-range value. `origin` names the file in messages.
CaseSpec parse_case(const std::string& json_text, const std::string& origin = "case");
CaseSpec load_case(const std::string& path);
std::string case_to_json(const CaseSpec& spec);  // round-trips through parse_case
// Writes atomically (temporary file, then rename).
void save_case(const CaseSpec& spec, const std::string& path);

// Region id -> material for the solver.
fem::MaterialTable material_table(const CaseSpec& spec);

}  // namespace sharpey::analysis
