// A case: tooth, ligament, bone, bone-level scenarios, force system, thresholds, mesh preset.
// Read from and written to JSON (schema documented in docs/case-format.md).
#pragma once

#include <Eigen/Core>
#include <cstddef>
#include <optional>
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
// Accepts "g", "gf", "cN", "N"; throws InputError (key "load.unit") naming the accepted units.
ForceUnit force_unit_from_string(const std::string& name);

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
std::vector<MovementPreset> all_movement_presets();  // without kNone

enum class CoupleKind { kNone, kMoment, kRatio };

// Named force directions of the case file, as unit vectors in tooth coordinates:
// labial +x, lingual -x, mesial +y, distal -y, extrusive +z, intrusive -z.
std::vector<std::string> named_directions();
// Throws InputError (key "load.direction") naming the accepted names.
Eigen::Vector3d named_direction(const std::string& name);

struct LoadSpec {
  double magnitude = 100;  // in `unit`
  ForceUnit unit = ForceUnit::kGram;
  Eigen::Vector3d direction = -Eigen::Vector3d::UnitX();  // unit vector, tooth coordinates
  double bracket_height_mm = -1;  // force application height above the CEJ; < 0: pad centre
  CoupleKind couple = CoupleKind::kNone;
  Eigen::Vector3d moment_nmm = Eigen::Vector3d::Zero();  // couple when kMoment
  double moment_to_force_mm = 0;  // when kRatio: couple opposing the force's tipping
  MovementPreset preset = MovementPreset::kNone;  // when set, the couple comes from the CRes
  // Name the direction was given by in the case file ("lingual", ...), empty for a vector or
  // angles. Only used to echo the case; `direction` is what counts (case_to_json writes the name
  // only while `direction` still equals named_direction(direction_name)).
  std::string direction_name = "lingual";
  double force_n() const { return to_newton(magnitude, unit); }
};

struct Scenario {
  std::string name;     // e.g. "healthy", "4 mm loss"
  mesh::BoneLoss loss;  // horizontal loss already converted to mm
  // >= 0 when the case file gave the horizontal loss in % of the root length (then
  // loss.horizontal_mm = percent / 100 * root length); -1 when it was given in mm.
  double horizontal_loss_percent = -1;
};

// A scanned tooth surface named by the case file (tooth.surface): the file, and the landmarks that
// place it in the tooth coordinate system or the explicit acceptance of the principal-axis
// proposal. parse_case imports it into model.tooth.scan (and model.tooth.dimensions).
struct ToothSurfaceSource {
  std::string file;  // as written in the case file, relative to its folder; empty: parametric
  std::optional<mesh::ToothLandmarks> landmarks;  // in the file's coordinates, mm
  bool accept_principal_axes = false;
  std::string resolved_path;  // the file as opened (not compared, not written)
};

// The force allowance's variability band a case asks for (case key "allowance",
// docs/case-format.md; analysis/allowance_band.h). The nominal allowances are always computed.
struct BandSpec {
  bool enabled = false;               // allowance.band: compute the band (costs many solves)
  int n_samples = 24;                 // allowance.samples: Latin hypercube samples
  int seed = 12345;                   // allowance.seed: fixed seed, >= 0
  bool sensitivity = true;            // allowance.sensitivity: one-at-a-time ranking
  double bone_level_error_mm = 0.5;   // allowance.bone_level_error_mm: +- radiographic reading
  double root_length_error_mm = 1.0;  // allowance.root_length_error_mm: +- about the case's root
};
bool operator==(const BandSpec& a, const BandSpec& b);

struct CaseSpec {
  int schema_version = kCaseSchemaVersion;
  std::string label;           // free text; samples are invented cases
  std::string notes;           // free text, optional
  mesh::ModelSpec model;       // tooth, PDL, bone, bracket, mesh sizing (loss per scenario)
  ToothSurfaceSource surface;  // scanned tooth (tooth.surface), when given
  fem::Material tooth_material{18600, 0.31};
  fem::Material pdl_material{0.47, 0.45};
  fem::Material cortical_material{13700, 0.30};
  fem::Material cancellous_material{1370, 0.30};
  std::vector<Scenario> scenarios;
  LoadSpec load;
  Thresholds thresholds = default_thresholds();
  BandSpec band;
};

bool operator==(const Threshold& a, const Threshold& b);
bool operator==(const Thresholds& a, const Thresholds& b);
bool operator==(const LoadSpec& a, const LoadSpec& b);
bool operator==(const Scenario& a, const Scenario& b);
bool operator==(const CaseSpec& a, const CaseSpec& b);  // every field, exact
inline bool operator!=(const CaseSpec& a, const CaseSpec& b) { return !(a == b); }

// Throws InputError naming the key (JSON path), the value and the fix, for a syntax error, a wrong
// type, an unknown key or an out-of-range value. `origin` names the file in messages.
// Geometry is checked with mesh::validate for every scenario (key prefixed "scenarios[i].").
// `base_folder`: the folder a tooth.surface file is relative to (the case file's folder; empty:
// the working folder).
CaseSpec parse_case(const std::string& json_text, const std::string& origin = "case",
                    const std::string& base_folder = "");
CaseSpec load_case(const std::string& path);  // InputError (key "file") if unreadable

// Limits on a case file: its size (a case is a few kilobytes) and how deeply brackets nest (the
// schema needs four levels). parse_case refuses deeper nesting, read_case_text larger files.
constexpr size_t kMaxCaseFileBytes = 1 << 20;
constexpr int kMaxCaseNestingDepth = 64;
// The text of the case file at `path`. Throws InputError (key "file") when it cannot be read, is
// not a regular file (a folder, a FIFO, a device such as /dev/zero: refused without blocking) or
// holds more than kMaxCaseFileBytes.
std::string read_case_text(const std::string& path);
std::string case_to_json(const CaseSpec& spec);  // round-trips through parse_case
// Writes atomically (temporary file, then rename). Throws Error naming the path on failure.
void save_case(const CaseSpec& spec, const std::string& path);

// ---- variations (the batch command's --vary) ----------------------------------------------------

// One varied case-file key: a dotted path with optional array indices ("load.magnitude",
// "scenarios[1].horizontal_loss_mm", "pdl.material.young_modulus_mpa") and its values, each a JSON
// literal (number, true/false, "string", [x, y, z]) or a bare word taken as a string.
struct CaseVariation {
  std::string key;
  std::vector<std::string> values;
};
// Parses "KEY=V1,V2,..." (commas inside [...] or quotes do not split). Throws InputError with key
// "--vary" naming the option and the fix.
CaseVariation parse_variation(const std::string& option);
// Returns `json_text` (a case file) with `key` set to `value`, creating missing objects on the way.
// Does not validate the result (parse_case does). Throws InputError with key "--vary" when the path
// is malformed or runs through an array index that does not exist.
std::string set_case_value(const std::string& json_text, const std::string& key,
                           const std::string& value);

// Range checks of a CaseSpec built in code (parse_case runs them too): every value against its
// allowed range, keys named by their case-file path. Throws InputError.
void validate_case(const CaseSpec& spec);
// The load's checks of validate_case alone (keys "load..."): what a load change can break. Cheap
// (no geometry), for the app's slider drags. Throws InputError.
void validate_load(const CaseSpec& spec);

// Root length used for "% of root length" bone loss: the tooth's root length (CEJ to apex), or
// the idealised root's length.
double root_length_mm(const mesh::ToothSpec& tooth);

// The model of scenario `scenario_index`: spec.model with that scenario's bone loss.
mesh::ModelSpec scenario_model(const CaseSpec& spec, int scenario_index);

// Region id -> material for the solver.
fem::MaterialTable material_table(const CaseSpec& spec);

// A default or user-set value with where it comes from, for reports ("sources" in results.json).
struct SourcedValue {
  std::string quantity;  // e.g. "pdl.material.young_modulus_mpa"
  double value = 0;
  std::string unit;    // e.g. "MPa"
  std::string source;  // citation and status, or "set in the case file"
};
std::vector<SourcedValue> value_sources(const CaseSpec& spec);

}  // namespace sharpey::analysis
