// CaseSpec basics: units, named directions and presets, defaults with their sources, materials,
// per-scenario models and exact comparison. Parsing lives in case_spec_parse.cpp, writing in
// case_spec_write.cpp, range checks in case_spec_validate.cpp.
#include "sharpey/analysis/case_spec.h"

#include <cmath>
#include <sstream>
#include <stdexcept>

#include "case_spec_keys.h"
#include "sharpey/core/check.h"
#include "sharpey/core/constants.h"
#include "sharpey/error.h"

namespace sharpey::analysis {

namespace {

// 1 gram-force = standard gravity x 1 g (definition of the gram-force).
constexpr double kNewtonPerGram = sharpey::core::kNewtonsPerGramForce;

struct PresetName {
  MovementPreset preset;
  const char* name;
};
constexpr PresetName kPresetNames[] = {
    {MovementPreset::kNone, "none"},
    {MovementPreset::kUncontrolledTipping, "uncontrolled_tipping"},
    {MovementPreset::kControlledTipping, "controlled_tipping"},
    {MovementPreset::kTranslation, "translation"},
    {MovementPreset::kRootMovement, "root_movement"},
    {MovementPreset::kIntrusion, "intrusion"},
    {MovementPreset::kExtrusion, "extrusion"},
    {MovementPreset::kRotation, "rotation"},
};

struct DirectionName {
  const char* name;
  double x, y, z;
};
constexpr DirectionName kDirections[] = {
    {"labial", 1, 0, 0},  {"lingual", -1, 0, 0},  {"mesial", 0, 1, 0},
    {"distal", 0, -1, 0}, {"extrusive", 0, 0, 1}, {"intrusive", 0, 0, -1},
};

bool same(const fem::Material& a, const fem::Material& b) {
  return a.young_modulus_mpa == b.young_modulus_mpa && a.poisson_ratio == b.poisson_ratio;
}

bool same(const mesh::ToothDimensions& a, const mesh::ToothDimensions& b) {
  for (const case_keys::DimensionKey& k : case_keys::kDimensionKeys)
    if (a.*k.field != b.*k.field) return false;
  return true;
}

bool same(const mesh::BoneLoss& a, const mesh::BoneLoss& b) {
  return a.horizontal_mm == b.horizontal_mm && a.defect_depth_mm == b.defect_depth_mm &&
         a.defect_surface == b.defect_surface && a.defect_width_deg == b.defect_width_deg;
}

bool same(const mesh::ToothLandmarks& a, const mesh::ToothLandmarks& b) {
  return a.apex == b.apex && a.crown_tip == b.crown_tip && a.cej_labial == b.cej_labial &&
         a.cej_lingual == b.cej_lingual && a.cej_mesial == b.cej_mesial &&
         a.cej_distal == b.cej_distal;
}

bool same(const ToothSurfaceSource& a, const ToothSurfaceSource& b) {
  if (a.file != b.file || a.accept_principal_axes != b.accept_principal_axes) return false;
  if (a.landmarks.has_value() != b.landmarks.has_value()) return false;
  return !a.landmarks || same(*a.landmarks, *b.landmarks);
}

bool same(const mesh::ModelSpec& a, const mesh::ModelSpec& b) {
  const auto& ta = a.tooth;
  const auto& tb = b.tooth;
  return ta.type == tb.type && same(ta.dimensions, tb.dimensions) &&
         ta.ideal_root == tb.ideal_root && ta.ideal_radius_mm == tb.ideal_radius_mm &&
         ta.ideal_length_mm == tb.ideal_length_mm && a.pdl.crest_width_mm == b.pdl.crest_width_mm &&
         a.pdl.mid_width_mm == b.pdl.mid_width_mm && a.pdl.apex_width_mm == b.pdl.apex_width_mm &&
         a.bone.crest_below_cej_mm == b.bone.crest_below_cej_mm &&
         a.bone.cortical_thickness_mm == b.bone.cortical_thickness_mm &&
         a.bone.labial_plate_mm == b.bone.labial_plate_mm &&
         a.bone.lingual_plate_mm == b.bone.lingual_plate_mm &&
         a.bone.interproximal_margin_mm == b.bone.interproximal_margin_mm &&
         a.bone.depth_below_apex_mm == b.bone.depth_below_apex_mm && same(a.loss, b.loss) &&
         a.bracket.height_mm == b.bracket.height_mm && a.bracket.width_mm == b.bracket.width_mm &&
         a.bracket.length_mm == b.bracket.length_mm && a.sizing.preset == b.sizing.preset &&
         a.sizing.pdl_edge_mm == b.sizing.pdl_edge_mm &&
         a.sizing.bone_edge_mm == b.sizing.bone_edge_mm &&
         a.sizing.pdl_layers == b.sizing.pdl_layers &&
         a.sizing.second_order == b.sizing.second_order;
}

}  // namespace

// ---- thresholds ---------------------------------------------------------------------------------

Thresholds default_thresholds() {
  Thresholds t;
  t.capillary.value_kpa = 4.7;
  t.capillary.source =
      "capillary blood pressure (35 mmHg): Hohmann et al. 2007, Angle Orthod 77:653 (from "
      "memory); same figure in Moga et al. 2023, Healthcare 11:2622 (published)";
  t.limit.value_kpa = 16.0;
  t.limit.source =
      "upper physiological limit (about 80 % of systolic pressure): Moga et al. 2023, Int J "
      "Environ Res Public Health 20:1889; Moga et al. 2024, Appl Sci (published)";
  return t;
}

// ---- units --------------------------------------------------------------------------------------

double to_newton(double value, ForceUnit unit) {
  switch (unit) {
    case ForceUnit::kGram:
      return value * kNewtonPerGram;
    case ForceUnit::kCentinewton:
      return value * 0.01;
    case ForceUnit::kNewton:
      return value;
  }
  return value;
}

double from_newton(double value_n, ForceUnit unit) {
  switch (unit) {
    case ForceUnit::kGram:
      return value_n / kNewtonPerGram;
    case ForceUnit::kCentinewton:
      return value_n * 100.0;
    case ForceUnit::kNewton:
      return value_n;
  }
  return value_n;
}

std::string to_string(ForceUnit unit) {
  switch (unit) {
    case ForceUnit::kGram:
      return "g";
    case ForceUnit::kCentinewton:
      return "cN";
    case ForceUnit::kNewton:
      return "N";
  }
  return "?";
}

ForceUnit force_unit_from_string(const std::string& name) {
  if (name == "g" || name == "gf") return ForceUnit::kGram;
  if (name == "cN") return ForceUnit::kCentinewton;
  if (name == "N") return ForceUnit::kNewton;
  throw InputError("load.unit", "unknown force unit \"" + name +
                                    "\"; use \"g\" (grams-force), \"cN\" (centinewtons) or \"N\"");
}

// ---- presets and directions ---------------------------------------------------------------------

std::string to_string(MovementPreset p) {
  for (const PresetName& n : kPresetNames)
    if (n.preset == p) return n.name;
  return "none";
}

MovementPreset movement_preset_from_string(const std::string& name) {
  for (const PresetName& n : kPresetNames)
    if (name == n.name) return n.preset;
  std::ostringstream s;
  s << "unknown movement \"" << name << "\"; use one of:";
  for (const PresetName& n : kPresetNames) s << ' ' << n.name;
  throw InputError("load.movement", s.str());
}

std::vector<MovementPreset> all_movement_presets() {
  std::vector<MovementPreset> presets;
  for (const PresetName& n : kPresetNames)
    if (n.preset != MovementPreset::kNone) presets.push_back(n.preset);
  return presets;
}

std::vector<std::string> named_directions() {
  std::vector<std::string> names;
  for (const DirectionName& d : kDirections) names.emplace_back(d.name);
  return names;
}

Eigen::Vector3d named_direction(const std::string& name) {
  for (const DirectionName& d : kDirections)
    if (name == d.name) return Eigen::Vector3d(d.x, d.y, d.z);
  std::ostringstream s;
  s << "unknown direction \"" << name << "\"; use one of:";
  for (const DirectionName& d : kDirections) s << ' ' << d.name;
  s << ", a unit vector [x, y, z] or angles {\"azimuth_deg\": ..., \"elevation_deg\": ...}";
  throw InputError("load.direction", s.str());
}

// ---- comparison ---------------------------------------------------------------------------------

bool operator==(const Threshold& a, const Threshold& b) {
  return a.value_kpa == b.value_kpa && a.source == b.source;
}

bool operator==(const Thresholds& a, const Thresholds& b) {
  return a.capillary == b.capillary && a.limit == b.limit;
}

bool operator==(const LoadSpec& a, const LoadSpec& b) {
  return a.magnitude == b.magnitude && a.unit == b.unit && a.direction == b.direction &&
         a.bracket_height_mm == b.bracket_height_mm && a.couple == b.couple &&
         a.moment_nmm == b.moment_nmm && a.moment_to_force_mm == b.moment_to_force_mm &&
         a.preset == b.preset && a.direction_name == b.direction_name;
}

bool operator==(const Scenario& a, const Scenario& b) {
  return a.name == b.name && same(a.loss, b.loss) &&
         a.horizontal_loss_percent == b.horizontal_loss_percent;
}

bool operator==(const BandSpec& a, const BandSpec& b) {
  return a.enabled == b.enabled && a.n_samples == b.n_samples && a.seed == b.seed &&
         a.sensitivity == b.sensitivity && a.bone_level_error_mm == b.bone_level_error_mm &&
         a.root_length_error_mm == b.root_length_error_mm;
}

bool operator==(const CaseSpec& a, const CaseSpec& b) {
  return a.schema_version == b.schema_version && a.label == b.label && a.notes == b.notes &&
         same(a.model, b.model) && same(a.tooth_material, b.tooth_material) &&
         same(a.pdl_material, b.pdl_material) && same(a.cortical_material, b.cortical_material) &&
         same(a.cancellous_material, b.cancellous_material) && a.scenarios == b.scenarios &&
         a.load == b.load && a.thresholds == b.thresholds && same(a.surface, b.surface) &&
         a.band == b.band;
}

// ---- models and materials -----------------------------------------------------------------------

double root_length_mm(const mesh::ToothSpec& tooth) {
  return tooth.ideal_root == mesh::IdealRoot::kNone ? tooth.dimensions.root_length_mm
                                                    : tooth.ideal_length_mm;
}

mesh::ModelSpec scenario_model(const CaseSpec& spec, int scenario_index) {
  SHARPEY_ASSERT(
      scenario_index >= 0 && scenario_index < static_cast<int>(spec.scenarios.size()),
      "scenario_model: scenario index " + std::to_string(scenario_index) + " out of range");
  mesh::ModelSpec model = spec.model;
  model.loss = spec.scenarios[static_cast<size_t>(scenario_index)].loss;
  return model;
}

fem::MaterialTable material_table(const CaseSpec& spec) {
  return {{mesh::kTooth, spec.tooth_material},
          {mesh::kPdl, spec.pdl_material},
          {mesh::kCorticalBone, spec.cortical_material},
          {mesh::kCancellousBone, spec.cancellous_material}};
}

// ---- sources ------------------------------------------------------------------------------------

std::vector<SourcedValue> value_sources(const CaseSpec& spec) {
  const CaseSpec defaults;
  const std::string user = "set in the case file";
  const std::string fe_tables =
      "tabulated in published PDL finite-element studies, e.g. Moga et al. 2023, Int J Environ "
      "Res Public Health 20:1889 (published)";
  std::vector<SourcedValue> out;
  auto add = [&](const std::string& quantity, double value, double default_value,
                 const std::string& unit, const std::string& source) {
    out.push_back({quantity, value, unit, value == default_value ? source : user});
  };

  out.push_back({"thresholds.capillary.value_kpa", spec.thresholds.capillary.value_kpa, "kPa",
                 spec.thresholds.capillary.source});
  out.push_back({"thresholds.limit.value_kpa", spec.thresholds.limit.value_kpa, "kPa",
                 spec.thresholds.limit.source});
  add("pdl.material.young_modulus_mpa", spec.pdl_material.young_modulus_mpa,
      defaults.pdl_material.young_modulus_mpa, "MPa",
      "fitted to tooth mobility: AJODO 2013, Estimation of PDL equivalent mechanical parameters "
      "(published); usual range 0.05 to 0.7 MPa, Fill et al. 2012, J Dent Biomech (published)");
  add("pdl.material.poisson_ratio", spec.pdl_material.poisson_ratio,
      defaults.pdl_material.poisson_ratio, "", "AJODO 2013, as above (published)");
  add("tooth.material.young_modulus_mpa", spec.tooth_material.young_modulus_mpa,
      defaults.tooth_material.young_modulus_mpa, "MPa", "dentin, " + fe_tables);
  add("tooth.material.poisson_ratio", spec.tooth_material.poisson_ratio,
      defaults.tooth_material.poisson_ratio, "", "dentin, " + fe_tables);
  add("bone.cortical_material.young_modulus_mpa", spec.cortical_material.young_modulus_mpa,
      defaults.cortical_material.young_modulus_mpa, "MPa", "cortical bone, " + fe_tables);
  add("bone.cortical_material.poisson_ratio", spec.cortical_material.poisson_ratio,
      defaults.cortical_material.poisson_ratio, "", "cortical bone, " + fe_tables);
  add("bone.cancellous_material.young_modulus_mpa", spec.cancellous_material.young_modulus_mpa,
      defaults.cancellous_material.young_modulus_mpa, "MPa",
      "cancellous bone (1.37 GPa the most common value), " + fe_tables);
  add("bone.cancellous_material.poisson_ratio", spec.cancellous_material.poisson_ratio,
      defaults.cancellous_material.poisson_ratio, "", "cancellous bone, " + fe_tables);
  const std::string width_source =
      "mean PDL width about 0.2 mm, range 0.1 to 0.4 mm (published, secondary teaching pages); "
      "micro-CT 0.16 to 0.28 mm, Tayman et al. 2020, Aust Endod J 46:365 (published)";
  add("pdl.width_profile_mm.crest", spec.model.pdl.crest_width_mm,
      defaults.model.pdl.crest_width_mm, "mm", width_source);
  add("pdl.width_profile_mm.mid_root", spec.model.pdl.mid_width_mm, defaults.model.pdl.mid_width_mm,
      "mm", width_source);
  add("pdl.width_profile_mm.apex", spec.model.pdl.apex_width_mm, defaults.model.pdl.apex_width_mm,
      "mm", width_source);
  add("bone.crest_below_cej_mm", spec.model.bone.crest_below_cej_mm,
      defaults.model.bone.crest_below_cej_mm, "mm",
      "healthy crest 1 to 2 mm apical to the CEJ (common practice); 0.4 to 1.9 mm on bite-wings, "
      "Hausmann et al. 1991, J Periodontol 62:570 (published)");
  if (spec.model.tooth.ideal_root == mesh::IdealRoot::kNone) {
    const mesh::ToothDimensions handbook = mesh::handbook_dimensions(spec.model.tooth.type);
    const mesh::ToothDimensions& d = spec.model.tooth.dimensions;
    const std::string dims_source =
        "dental anatomy handbook average (Wheeler's Dental Anatomy, "
        "Physiology and Occlusion, Table 1-1): " +
        mesh::handbook_status(spec.model.tooth.type);
    for (const case_keys::DimensionKey& k : case_keys::kDimensionKeys) {
      if (k.field == &mesh::ToothDimensions::root_taper_fullness) continue;  // below
      add(std::string("tooth.dimensions.") + k.key, d.*k.field, handbook.*k.field, "mm",
          dims_source);
    }
    add("tooth.dimensions.root_taper_fullness", d.root_taper_fullness, handbook.root_taper_fullness,
        "",
        "not a handbook value: calibrated per tooth so that the root area (CEJ to apex) equals "
        "Jepsen 1963's " +
            std::to_string(std::lround(mesh::root_calibration_area_mm2(spec.model.tooth.type))) +
            " mm^2 for this tooth (from memory); validated against published CBCT and "
            "extracted-tooth areas (docs/analyses.md, Root calibration)");
  }
  out.push_back({"gram_force_in_newton", kNewtonPerGram, "N",
                 "definition of the gram-force (standard gravity 9.80665 m/s^2)"});
  return out;
}

}  // namespace sharpey::analysis
