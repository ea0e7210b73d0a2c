// results.json: the machine-readable report of a solved case. The key names documented as fixed
// in docs/case-format.md are read by outside tools: keep them.
#include <cmath>
#include <initializer_list>
#include <nlohmann/json.hpp>
#include <utility>

#include "sharpey/output/allowance_output.h"
#include "sharpey/output/report_output.h"

namespace sharpey::analysis {

namespace {

using Json = nlohmann::ordered_json;

// JSON has no NaN or infinity: write null instead.
Json number(double v) { return std::isfinite(v) ? Json(v) : Json(nullptr); }
Json vec(const Eigen::Vector3d& v) {
  return Json::array({number(v.x()), number(v.y()), number(v.z())});
}
// -1 marks "not available" in ScenarioResult's equivalent forces.
Json optional_force(double g) { return g >= 0 ? number(g) : Json(nullptr); }

// Adds `key: number(value)` for each pair, in the order given (the key order is part of the file).
void put_numbers(Json& j, std::initializer_list<std::pair<const char*, double>> fields) {
  for (const auto& [key, value] : fields) j[key] = number(value);
}

// {"<id>": to_json(value), ...} for a map keyed by region id or face marker.
template <class Map, class ToJson>
Json by_id(const Map& map, ToJson to_json) {
  Json out = Json::object();
  for (const auto& [id, value] : map) out[std::to_string(id)] = to_json(value);
  return out;
}

Json cres_json(const CentreOfResistance& c) {
  Json j;
  j["point_mm"] = vec(c.point);
  put_numbers(j, {{"from_crest_mm", c.from_crest_mm},
                  {"from_cej_mm", c.from_cej_mm},
                  {"fraction_embedded", c.fraction_embedded}});
  return j;
}

Json geometry_json(const mesh::ModelGeometry& g) {
  Json j;
  put_numbers(j, {{"crest_z_mm", g.crest_z_mm},
                  {"apex_z_mm", g.apex_z_mm},
                  {"root_length_mm", g.root_length_mm},
                  {"embedded_length_mm", g.embedded_length_mm}});
  j["crown_tip_mm"] = vec(g.crown_tip);
  j["apex_mm"] = vec(g.apex);
  j["bracket_center_mm"] = vec(g.bracket_center);
  put_numbers(j, {{"root_area_mm2", g.root_area_mm2},
                  {"attachment_area_mm2", g.attachment_area_mm2},
                  {"exposed_root_area_mm2", g.exposed_root_area_mm2},
                  {"tooth_volume_mm3", g.tooth_volume_mm3},
                  {"pdl_volume_mm3", g.pdl_volume_mm3},
                  {"bone_volume_mm3", g.bone_volume_mm3}});
  return j;
}

Json mesh_json(const mesh::MeshStatistics& s) {
  Json j;
  j["n_nodes"] = s.n_nodes;
  j["n_elements"] = s.n_elements;
  j["n_faces"] = s.n_faces;
  j["elements_per_region"] = by_id(s.elements_per_region, [](int n) { return Json(n); });
  j["volume_per_region_mm3"] = by_id(s.volume_per_region_mm3, number);
  j["area_per_marker_mm2"] = by_id(s.area_per_marker_mm2, number);
  put_numbers(j, {{"min_dihedral_deg", s.min_dihedral_deg},
                  {"max_dihedral_deg", s.max_dihedral_deg},
                  {"max_radius_edge_ratio", s.max_radius_edge_ratio},
                  {"min_jacobian_ratio", s.min_jacobian_ratio}});
  j["pdl_width_mm"] = {{"mean", number(s.pdl_width_mean_mm)},
                       {"min", number(s.pdl_width_min_mm)},
                       {"max", number(s.pdl_width_max_mm)},
                       {"samples", s.pdl_width_samples}};
  return j;
}

Json solver_json(const fem::SolverStatistics& s) {
  Json j;
  j["n_dofs"] = s.n_dofs;
  j["n_nonzeros"] = s.n_nonzeros;
  put_numbers(j, {{"assembly_s", s.assembly_s},
                  {"analyse_s", s.analyse_s},
                  {"factorise_s", s.factorise_s},
                  {"factorisation_gflop", s.factorisation_gflop},
                  {"last_relative_residual", s.last_relative_residual}});
  j["ordering"] = s.ordering;
  return j;
}

// The opening keys every report file shares: schema version, program, label and the caution.
Json report_head(const CaseSpec& spec) {
  Json j;
  j["results_schema_version"] = kResultsSchemaVersion;
  j["program"] = "Sharpey";
  j["label"] = spec.label;
  j["caution"] = caution_text();
  return j;
}

// The closing keys every report file shares (the scenarios, then an echo of the case), as text.
std::string report_text(Json j, Json scenarios, const CaseSpec& spec) {
  j["scenarios"] = std::move(scenarios);
  j["case"] = Json::parse(case_to_json(spec));
  return j.dump(2) + "\n";
}

Json scenario_json(const CaseSpec& spec, const ScenarioResult& r, const ScenarioFacts* facts,
                   const Scenario* scenario) {
  Json j;
  j["name"] = r.name;
  // Fixed keys first.
  const CentreOfResistance& cres = cres_for(r);
  put_numbers(j, {{"bone_loss_mm", r.bone_loss_mm},
                  {"attachment_area_mm2", r.attachment_area_mm2},
                  {"cres_from_crest_mm", cres.from_crest_mm},
                  {"cres_fraction_embedded", cres.fraction_embedded},
                  {"mf_translation_mm", r.mf_translation_mm}});
  j["pdl_pressure_kpa"] = {
      {"max_compression", number(r.pressure_max_compression_kpa)},
      {"max_tension", number(r.pressure_max_tension_kpa)},
      {"p95_compression", number(r.pressure_p95_compression_kpa)},
      {"max_compression_crest_edge", number(r.pressure_max_compression_crest_edge_kpa)}};
  put_numbers(j, {{"area_above_capillary_mm2", r.area_above_capillary_mm2},
                  {"area_above_limit_mm2", r.area_above_limit_mm2},
                  {"max_principal_strain", r.max_principal_strain},
                  {"crown_tip_displacement_um", r.crown_tip_displacement_um.norm()}});
  j["equivalent_force_g"] = optional_force(r.equivalent_force_peak_g);

  // Further detail.
  if (scenario) {
    if (scenario->horizontal_loss_percent >= 0)
      j["bone_loss_percent_of_root"] = number(scenario->horizontal_loss_percent);
    if (scenario->loss.defect_depth_mm > 0)
      j["angular_defect"] = {{"surface", mesh::to_string(scenario->loss.defect_surface)},
                             {"depth_mm", number(scenario->loss.defect_depth_mm)},
                             {"width_deg", number(scenario->loss.defect_width_deg)}};
  }
  put_numbers(j, {{"area_above_capillary_percent", r.area_above_capillary_percent},
                  {"area_above_limit_percent", r.area_above_limit_percent}});
  j["cres_direction"] =
      cres_direction_for(r.load) == CresDirection::kMesiodistal ? "mesiodistal" : "labiolingual";
  j["cres"] = {{"labiolingual", cres_json(r.cres_labiolingual)},
               {"mesiodistal", cres_json(r.cres_mesiodistal)}};
  // null when the motion has no centre of rotation on the axis (translation, pure rotation
  // about the long axis).
  j["centre_of_rotation_mm"] =
      r.centre_of_rotation_defined ? vec(r.centre_of_rotation) : Json(nullptr);
  put_numbers(j, {{"max_equivalent_strain", r.max_equivalent_strain},
                  {"max_von_mises_kpa", r.max_von_mises_kpa}});
  j["crown_tip_displacement_vector_um"] = vec(r.crown_tip_displacement_um);
  j["apex_displacement_um"] = number(r.apex_displacement_um.norm());
  j["apex_displacement_vector_um"] = vec(r.apex_displacement_um);
  j["rotation_deg"] = vec(r.rotation_deg);
  j["rigid_fit_rms_um"] = number(r.rigid_fit_rms_um);
  j["linear_range"] = {
      {"strain_limit", number(kLinearRangeStrainLimit)},
      {"strain_limit_source",
       "bilinear PDL fits change slope near 7.5 % strain (from memory: Poppe, Bourauel, Jaeger "
       "2002, J Orofac Orthop 63:358)"},
      {"max_abs_principal_strain", number(r.max_abs_principal_strain)},
      {"beyond", r.beyond_linear_range},
      {"volume_beyond_percent", number(r.volume_beyond_linear_range_percent)},
      {"note", beyond_linear_range_text(r)}};
  j["equivalent_force"] = {
      {"same_peak_g", optional_force(r.equivalent_force_peak_g)},
      {"same_p95_g", optional_force(r.equivalent_force_p95_g)},
      {"attachment_area_rule_g", optional_force(r.equivalent_force_area_rule_g)},
      {"applied_g", number(from_newton(spec.load.force_n(), ForceUnit::kGram))}};
  j["load"] = {{"force_n", vec(r.load.force_n)},
               {"force_g", number(from_newton(r.load.force_n.norm(), ForceUnit::kGram))},
               {"moment_nmm", vec(r.load.moment_nmm)},
               {"application_point_mm", vec(r.load.application_point)},
               {"moment_to_force_mm", number(r.load.moment_to_force_mm)}};
  if (facts) {
    j["geometry"] = geometry_json(facts->geometry);
    if (facts->mesh.n_elements > 0) j["mesh"] = mesh_json(facts->mesh);
    if (facts->solver.n_dofs > 0) j["solver"] = solver_json(facts->solver);
    Json files = Json::object();
    if (!facts->model_vtu.empty()) files["model_vtu"] = facts->model_vtu;
    if (!facts->pdl_vtu.empty()) files["pdl_vtu"] = facts->pdl_vtu;
    if (!facts->root_map_csv.empty()) files["root_map_csv"] = facts->root_map_csv;
    if (!files.empty()) j["files"] = files;
  }
  return j;
}

}  // namespace

CresDirection cres_direction_for(const ResolvedLoad& load) {
  return std::abs(load.force_n.y()) > std::abs(load.force_n.x()) ? CresDirection::kMesiodistal
                                                                 : CresDirection::kLabiolingual;
}

const CentreOfResistance& cres_for(const ScenarioResult& result) {
  return cres_direction_for(result.load) == CresDirection::kMesiodistal ? result.cres_mesiodistal
                                                                        : result.cres_labiolingual;
}

std::vector<ScenarioFacts> scenario_facts(const Study& study, bool measure_mesh) {
  std::vector<ScenarioFacts> facts;
  for (const auto& solution : study.solutions()) {
    ScenarioFacts f;
    f.geometry = solution->model().geometry;
    if (measure_mesh) f.mesh = mesh::measure(solution->model().mesh);
    f.solver = solution->solver_statistics();
    facts.push_back(std::move(f));
  }
  return facts;
}

std::string results_json(const CaseSpec& spec, const std::vector<ScenarioResult>& results,
                         const std::vector<ScenarioFacts>& facts,
                         const AllowanceReport* allowance) {
  Json j = report_head(spec);
  j["units"] = {{"length", "mm (keys ending _mm)"},
                {"area", "mm^2 (keys ending _mm2)"},
                {"displacement", "micrometre (keys ending _um)"},
                {"pressure",
                 "kPa (keys ending _kpa); hydrostatic pressure p = -trace(stress)/3, "
                 "compression positive"},
                {"force", "N (keys ending _n) or grams-force (keys ending _g; 1 g = 0.00980665 N)"},
                {"moment", "N.mm (keys ending _nmm)"},
                {"angle", "degree (keys ending _deg)"},
                {"strain", "dimensionless (mm/mm)"},
                {"coordinates",
                 "tooth system: origin on the long axis at the CEJ, x labial, "
                 "y mesial, z toward the crown"}};
  Json sources = Json::array();
  for (const SourcedValue& s : value_sources(spec))
    sources.push_back({{"quantity", s.quantity},
                       {"value", number(s.value)},
                       {"unit", s.unit},
                       {"source", s.source}});
  j["sources"] = sources;
  if (const auto& scan = spec.model.tooth.scan) {
    // The scanned surface by name and checksum only: no patient data is copied into outputs.
    j["tooth_surface"] = {
        {"file", spec.surface.file},
        {"sha256", scan->source_sha256},
        {"placement", spec.surface.landmarks ? "landmarks" : "principal axes (accepted)"}};
  }
  j["thresholds"] = {{"capillary_kpa", number(spec.thresholds.capillary.value_kpa)},
                     {"capillary_source", spec.thresholds.capillary.source},
                     {"limit_kpa", number(spec.thresholds.limit.value_kpa)},
                     {"limit_source", spec.thresholds.limit.source}};
  if (allowance) j["allowance"] = Json::parse(allowance_json(spec, *allowance));
  Json scenarios = Json::array();
  for (size_t i = 0; i < results.size(); ++i) {
    const ScenarioFacts* f = i < facts.size() ? &facts[i] : nullptr;
    const Scenario* s = i < spec.scenarios.size() ? &spec.scenarios[i] : nullptr;
    scenarios.push_back(scenario_json(spec, results[i], f, s));
  }
  return report_text(std::move(j), std::move(scenarios), spec);
}

std::string mesh_statistics_json(const CaseSpec& spec, const std::vector<ScenarioFacts>& facts) {
  Json j = report_head(spec);
  j["units"] = {{"length", "mm"}, {"area", "mm^2"}, {"volume", "mm^3"}, {"angle", "degree"}};
  j["regions"] = {{"1", "tooth"}, {"2", "PDL"}, {"3", "cortical bone"}, {"4", "cancellous bone"}};
  j["face_markers"] = {{"1", "root surface (PDL inner)"},
                       {"2", "socket surface (PDL outer)"},
                       {"3", "crown surface"},
                       {"4", "bracket pad"},
                       {"5", "fixed bone"},
                       {"6", "exposed root"},
                       {"7", "free bone"},
                       {"8", "PDL crest"},
                       {"9", "other"}};
  Json scenarios = Json::array();
  for (size_t i = 0; i < facts.size(); ++i) {
    Json s;
    s["name"] = i < spec.scenarios.size() ? spec.scenarios[i].name : std::to_string(i + 1);
    s["bone_loss_mm"] =
        i < spec.scenarios.size() ? number(spec.scenarios[i].loss.horizontal_mm) : Json(nullptr);
    s["geometry"] = geometry_json(facts[i].geometry);
    s["mesh"] = mesh_json(facts[i].mesh);
    if (!facts[i].model_vtu.empty()) s["files"] = {{"mesh_vtu", facts[i].model_vtu}};
    scenarios.push_back(s);
  }
  return report_text(std::move(j), std::move(scenarios), spec);
}

}  // namespace sharpey::analysis
