// Writing a case file: CaseSpec -> JSON text that parse_case reads back to an equal CaseSpec.
// Values equal to their defaults are still written where a reader benefits from seeing them
// (materials, bone, thresholds); tooth dimensions are written only where they differ from the
// handbook values of the tooth type.
#include <nlohmann/json.hpp>

#include "case_spec_keys.h"
#include "sharpey/analysis/case_spec.h"
#include "sharpey/analysis/write_file_atomic.h"

namespace sharpey::analysis {

namespace {

using Json = nlohmann::ordered_json;

Json material_json(const fem::Material& m) {
  Json j;
  j["young_modulus_mpa"] = m.young_modulus_mpa;
  j["poisson_ratio"] = m.poisson_ratio;
  return j;
}

Json vector_json(const Eigen::Vector3d& v) { return Json::array({v.x(), v.y(), v.z()}); }

Json tooth_json(const CaseSpec& spec) {
  const mesh::ToothSpec& tooth = spec.model.tooth;
  Json j;
  j["type"] = mesh::to_string(tooth.type);
  const mesh::ToothDimensions handbook = mesh::handbook_dimensions(tooth.type);
  Json dims = Json::object();
  for (const auto& k : case_keys::kDimensionKeys)
    if (tooth.dimensions.*k.field != handbook.*k.field) dims[k.key] = tooth.dimensions.*k.field;
  if (!dims.empty() && spec.surface.file.empty()) j["dimensions"] = dims;
  if (!spec.surface.file.empty()) {
    Json f;
    f["file"] = spec.surface.file;
    if (spec.surface.accept_principal_axes) f["accept_principal_axes"] = true;
    if (spec.surface.landmarks) {
      const mesh::ToothLandmarks& l = *spec.surface.landmarks;
      Json m;
      m["apex"] = vector_json(l.apex);
      m["crown_tip"] = vector_json(l.crown_tip);
      m["cej_labial"] = vector_json(l.cej_labial);
      m["cej_lingual"] = vector_json(l.cej_lingual);
      m["cej_mesial"] = vector_json(l.cej_mesial);
      m["cej_distal"] = vector_json(l.cej_distal);
      f["landmarks"] = m;
    }
    j["surface"] = f;
  }
  if (tooth.ideal_root != mesh::IdealRoot::kNone) {
    Json r;
    r["shape"] = case_keys::ideal_root_name(tooth.ideal_root);
    r["radius_at_crest_mm"] = tooth.ideal_radius_mm;
    r["root_length_mm"] = tooth.ideal_length_mm;
    j["idealised_root"] = r;
  }
  j["material"] = material_json(spec.tooth_material);
  return j;
}

Json pdl_json(const CaseSpec& spec) {
  const mesh::PdlSpec& pdl = spec.model.pdl;
  Json j;
  if (pdl.crest_width_mm == pdl.mid_width_mm && pdl.mid_width_mm == pdl.apex_width_mm) {
    j["width_mm"] = pdl.crest_width_mm;
  } else {
    j["width_profile_mm"] = {
        {"crest", pdl.crest_width_mm}, {"mid_root", pdl.mid_width_mm}, {"apex", pdl.apex_width_mm}};
  }
  j["material"] = material_json(spec.pdl_material);
  return j;
}

Json bone_json(const CaseSpec& spec) {
  Json j;
  for (const auto& k : case_keys::kBoneKeys) j[k.key] = spec.model.bone.*k.field;
  j["cortical_material"] = material_json(spec.cortical_material);
  j["cancellous_material"] = material_json(spec.cancellous_material);
  return j;
}

Json bracket_json(const CaseSpec& spec) {
  const mesh::BracketSpec& b = spec.model.bracket;
  Json j = Json::object();
  if (b.height_mm >= 0) j["height_mm"] = b.height_mm;
  j["width_mm"] = b.width_mm;
  j["length_mm"] = b.length_mm;
  return j;
}

Json mesh_json(const CaseSpec& spec) {
  const mesh::MeshSizing& s = spec.model.sizing;
  Json j;
  j["preset"] = mesh::to_string(s.preset);
  if (s.pdl_edge_mm != 0) j["pdl_edge_mm"] = s.pdl_edge_mm;
  if (s.bone_edge_mm != 0) j["bone_edge_mm"] = s.bone_edge_mm;
  if (s.pdl_layers != 0) j["pdl_layers"] = s.pdl_layers;
  j["quadratic"] = s.second_order;
  return j;
}

Json scenario_json(const Scenario& s) {
  Json j;
  j["name"] = s.name;
  if (s.horizontal_loss_percent >= 0)
    j["horizontal_loss_percent"] = s.horizontal_loss_percent;
  else
    j["horizontal_loss_mm"] = s.loss.horizontal_mm;
  const mesh::BoneLoss defaults;
  if (s.loss.defect_depth_mm != 0 || s.loss.defect_surface != defaults.defect_surface ||
      s.loss.defect_width_deg != defaults.defect_width_deg) {
    j["angular_defect"] = {{"surface", mesh::to_string(s.loss.defect_surface)},
                           {"depth_mm", s.loss.defect_depth_mm},
                           {"width_deg", s.loss.defect_width_deg}};
  }
  return j;
}

Json load_json(const LoadSpec& load) {
  Json j;
  j["magnitude"] = load.magnitude;
  j["unit"] = to_string(load.unit);
  bool named = false;
  if (!load.direction_name.empty()) {
    for (const std::string& n : named_directions())
      if (n == load.direction_name && named_direction(n) == load.direction) named = true;
  }
  if (named)
    j["direction"] = load.direction_name;
  else
    j["direction"] = vector_json(load.direction);
  if (load.bracket_height_mm >= 0) j["application_height_mm"] = load.bracket_height_mm;
  if (load.couple == CoupleKind::kMoment)
    j["couple"] = {{"moment", vector_json(load.moment_nmm)}, {"unit", "N.mm"}};
  else if (load.couple == CoupleKind::kRatio)
    j["couple"] = {{"moment_to_force_mm", load.moment_to_force_mm}};
  j["movement"] = to_string(load.preset);
  return j;
}

Json threshold_json(const Threshold& t) {
  Json j;
  j["value_kpa"] = t.value_kpa;
  j["source"] = t.source;
  return j;
}

}  // namespace

std::string case_to_json(const CaseSpec& spec) {
  Json j;
  j["schema_version"] = spec.schema_version;
  j["label"] = spec.label;
  if (!spec.notes.empty()) j["notes"] = spec.notes;
  j["tooth"] = tooth_json(spec);
  j["pdl"] = pdl_json(spec);
  j["bone"] = bone_json(spec);
  j["bracket"] = bracket_json(spec);
  Json scenarios = Json::array();
  for (const Scenario& s : spec.scenarios) scenarios.push_back(scenario_json(s));
  j["scenarios"] = scenarios;
  j["load"] = load_json(spec.load);
  j["thresholds"] = {{"capillary", threshold_json(spec.thresholds.capillary)},
                     {"limit", threshold_json(spec.thresholds.limit)}};
  j["mesh"] = mesh_json(spec);
  // Written only when it differs from the defaults, so cases without a band read as before.
  if (!(spec.band == BandSpec{})) {
    const BandSpec& b = spec.band;
    j["allowance"] = {{"band", b.enabled},
                      {"samples", b.n_samples},
                      {"seed", b.seed},
                      {"sensitivity", b.sensitivity},
                      {"bone_level_error_mm", b.bone_level_error_mm},
                      {"root_length_error_mm", b.root_length_error_mm}};
  }
  return j.dump(2) + "\n";
}

void save_case(const CaseSpec& spec, const std::string& path) {
  write_file_atomic(path, case_to_json(spec));
}

}  // namespace sharpey::analysis
