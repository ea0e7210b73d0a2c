// Study designs (teeth x bone levels x movements x forces x materials) read from JSON and turned
// into case variations, so every combination goes through the case reader like a --vary sweep.
#include "sharpey/analysis/study_design.h"

#include <algorithm>
#include <cmath>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "sharpey/analysis/multi_root_thin_layer.h"
#include "sharpey/error.h"

namespace sharpey::analysis {

namespace {

using Json = nlohmann::ordered_json;

const char* const kKnownKeys[] = {"design_version",
                                  "label",
                                  "teeth",
                                  "bone_levels_mm",
                                  "movements",
                                  "forces",
                                  "force_unit",
                                  "materials",
                                  "also_vary",
                                  "furcation_degrees",
                                  "furcation_horizontal_mm",
                                  "furcation_vertical_mm",
                                  "angular_defects_mm"};
const char* const kMaterialPrefixes[] = {"tooth.material.", "pdl.material.",
                                         "bone.cortical_material.", "bone.cancellous_material."};
// The material keys of a multi-rooted case (docs/molars.md).
const char* const kMultiRootMaterials[] = {"pdl.young_modulus_mpa", "pdl.poisson_ratio"};
// A multi-rooted design's scenario factors: design key -> key of the base case's first scenario.
const char* const kMultiRootScenarioFactors[][2] = {
    {"bone_levels_mm", "scenarios[0].horizontal_loss_mm"},
    {"furcation_degrees", "scenarios[0].furcation.degree"},
    {"furcation_horizontal_mm", "scenarios[0].furcation.horizontal_mm"},
    {"furcation_vertical_mm", "scenarios[0].furcation.vertical_mm"},
    {"angular_defects_mm", "scenarios[0].angular_defect.depth_mm"}};
constexpr const char* kMultiRootScenarioPrefix = "scenarios[0].";

std::string known_keys() {
  std::string out;
  for (const char* k : kKnownKeys) out += (out.empty() ? "" : ", ") + std::string(k);
  return out;
}

[[noreturn]] void bad(const std::string& key, const std::string& origin, const std::string& what) {
  throw InputError("design." + key, origin + ": " + what);
}

// A design value as the --vary text that set_case_value reads back to the same JSON value.
std::string literal(const Json& value) {
  if (value.is_string()) {
    const std::string text = value.get<std::string>();
    const Json reread = Json::parse(text, nullptr, /*allow_exceptions=*/false);
    return reread.is_discarded() ? text : value.dump();  // "true", "12": keep the quotes
  }
  return value.dump();
}

// A non-empty array of distinct values of `key` (a factor's list).
const Json& factor_array(const Json& root, const std::string& key, const std::string& origin,
                         const std::string& example) {
  const Json& list = root.at(key);
  if (!list.is_array() || list.empty())
    bad(key, origin,
        "\"" + key + "\" is " + (list.is_array() ? "empty" : "not a list") +
            "; give a non-empty list of values, e.g. \"" + key + "\": " + example);
  for (size_t i = 0; i < list.size(); ++i)
    for (size_t j = 0; j < i; ++j)
      if (list[i] == list[j])
        bad(key, origin,
            "\"" + key + "\" lists " + list[i].dump() +
                " twice; give each value once (a repeated value would solve the same combination "
                "twice)");
  return list;
}

CaseVariation variation(const std::string& case_key, const Json& list) {
  CaseVariation v;
  v.key = case_key;
  for (const Json& value : list) v.values.push_back(literal(value));
  return v;
}

// Refuses `case_key` under "materials" when it is not a material key of the case's kind.
void check_material_key(const std::string& key, const std::string& case_key,
                        const std::string& origin, bool multi_rooted) {
  if (multi_rooted) {
    if (std::none_of(std::begin(kMultiRootMaterials), std::end(kMultiRootMaterials),
                     [&](const char* m) { return case_key == m; }))
      bad(key + "." + case_key, origin,
          "\"" + case_key +
              "\" in \"materials\" is not a material key of a multi-rooted case; use "
              "pdl.young_modulus_mpa or pdl.poisson_ratio, or put other keys under \"also_vary\"");
    return;
  }
  if (std::none_of(std::begin(kMaterialPrefixes), std::end(kMaterialPrefixes),
                   [&](const char* p) { return case_key.rfind(p, 0) == 0; }))
    bad(key + "." + case_key, origin,
        "\"" + case_key +
            "\" in \"materials\" is not a material key; use tooth.material.*, pdl.material.*, "
            "bone.cortical_material.* or bone.cancellous_material.* (e.g. "
            "pdl.material.young_modulus_mpa), or put other keys under \"also_vary\"");
}

// Refuses a key that the design's own factors set. A multi-rooted design may vary the keys of
// the first scenario (the one it keeps) that its factors leave alone.
void check_not_a_factor_key(const std::string& key, const std::string& case_key,
                            const std::string& origin, bool multi_rooted) {
  const bool scenario_key = case_key.rfind("scenarios", 0) == 0 &&
                            !(multi_rooted && case_key.rfind(kMultiRootScenarioPrefix, 0) == 0);
  for (const char* fixed : {"tooth.type", "load.movement", "load.magnitude", "load.unit"})
    if (case_key == fixed || scenario_key)
      bad(key + "." + case_key, origin,
          "\"" + case_key +
              "\" is set by the design's own factors (teeth, bone_levels_mm, "
              "movements, forces, force_unit" +
              (multi_rooted ? ", furcation_*, angular_defects_mm; other keys of scenarios[0]"
                            : "") +
              "); give it there, not under \"" + key + "\"");
}

// Keys of an object factor (materials, also_vary), each a case key with a list of values.
void add_key_lists(const Json& root, const std::string& key, const std::string& origin,
                   bool materials_only, bool multi_rooted, std::vector<CaseVariation>* out) {
  const Json& object = root.at(key);
  if (!object.is_object() || object.empty())
    bad(key, origin,
        "\"" + key + "\" must be a non-empty object of case keys and value lists, e.g. \"" + key +
            "\": {\"" +
            (multi_rooted ? "pdl.young_modulus_mpa" : "pdl.material.young_modulus_mpa") +
            "\": [0.47, 0.94]}");
  for (auto it = object.begin(); it != object.end(); ++it) {
    const std::string& case_key = it.key();
    if (materials_only) check_material_key(key, case_key, origin, multi_rooted);
    check_not_a_factor_key(key, case_key, origin, multi_rooted);
    for (const CaseVariation& earlier : *out)
      if (earlier.key == case_key)
        bad(key + "." + case_key, origin,
            "\"" + case_key + "\" is varied twice in the design; give all its values in one list");
    out->push_back(variation(case_key, factor_array(object, case_key, origin, "[1, 2]")));
  }
}

}  // namespace

namespace {

// design_version (when given, the one this program reads) and label.
void read_version_and_label(const Json& root, const std::string& origin, StudyDesign& design) {
  if (root.contains("design_version")) {
    const Json& v = root.at("design_version");
    if (!v.is_number_integer() || v.get<long long>() != kStudyDesignVersion)
      bad("design_version", origin,
          "design_version " + v.dump() + " is not supported; this program reads version " +
              std::to_string(kStudyDesignVersion) + " (a newer file needs a newer program)");
  }
  if (root.contains("label")) {
    if (!root.at("label").is_string()) bad("label", origin, "\"label\" must be a string");
    design.label = root.at("label").get<std::string>();
  }
}

// teeth: tooth-type names.
void read_teeth(const Json& root, const std::string& origin, StudyDesign& design) {
  if (root.contains("teeth")) {
    const Json& teeth = factor_array(root, "teeth", origin, "[\"maxillary_canine\"]");
    for (const Json& t : teeth)
      if (!t.is_string())
        bad("teeth", origin,
            "tooth " + t.dump() + " is not a name; give tooth types such as \"mandibular_canine\"");
    design.variations.push_back(variation("tooth.type", teeth));
  }
}

// A factor of numbers >= 0; `what` names one value and `meaning` what it must be in messages.
const Json& non_negative_factor(const Json& root, const std::string& key, const std::string& origin,
                                const std::string& what, const std::string& meaning) {
  const Json& list = factor_array(root, key, origin, "[0, 2, 4]");
  for (const Json& b : list)
    if (!b.is_number() || !std::isfinite(b.get<double>()) || b.get<double>() < 0)
      bad(key, origin,
          what + " " + b.dump() + " is not " + meaning + "; give numbers >= 0, e.g. [0, 2, 4]");
  return list;
}

// bone_levels_mm: horizontal losses >= 0, the scenarios of every model.
void read_bone_levels(const Json& root, const std::string& origin, StudyDesign& design) {
  if (root.contains("bone_levels_mm"))
    for (const Json& b : non_negative_factor(root, "bone_levels_mm", origin, "bone level",
                                             "a horizontal loss in mm"))
      design.bone_levels_mm.push_back(b.get<double>());
}

// A multi-rooted design's scenario factors (bone levels, furcation degree and depths, angular
// defect depth): varied keys of the first scenario. In a single-rooted design only bone_levels_mm
// is known; the others are refused.
void read_scenario_factors(const Json& root, const std::string& origin, StudyDesign& design) {
  for (const auto& [key, case_key] : kMultiRootScenarioFactors) {
    if (!root.contains(key)) continue;
    if (!design.multi_rooted) {
      if (std::string(key) == "bone_levels_mm") continue;  // read_bone_levels
      bad(key, origin,
          std::string("\"") + key +
              "\" is a factor of multi-rooted designs (a base case of kind "
              "multi_root_estimate, docs/molars.md); this base case is single-rooted: remove it");
    }
    const bool degree = std::string(key) == "furcation_degrees";
    design.variations.push_back(variation(
        case_key, non_negative_factor(root, key, origin, degree ? "furcation degree" : key,
                                      degree ? "a degree (0 to 3)" : "a depth in mm")));
  }
}

// movements of a multi-rooted case: uprighting, intrusion, translation.
void check_multi_root_movements(const Json& movements, const std::string& origin) {
  for (const Json& m : movements) {
    try {
      molar_movement_from_string(m.is_string() ? m.get<std::string>() : m.dump());
    } catch (const InputError&) {
      bad("movements", origin,
          "movement " + m.dump() +
              " is unknown for a multi-rooted tooth; use uprighting, intrusion or translation");
    }
  }
}

// movements: movement preset names.
void read_movements(const Json& root, const std::string& origin, StudyDesign& design) {
  if (root.contains("movements") && design.multi_rooted) {
    const Json& movements = factor_array(root, "movements", origin, "[\"uprighting\"]");
    check_multi_root_movements(movements, origin);
    design.variations.push_back(variation("load.movement", movements));
  } else if (root.contains("movements")) {
    const Json& movements = factor_array(root, "movements", origin, "[\"translation\"]");
    for (const Json& m : movements) {
      bool known = false;
      for (MovementPreset p : all_movement_presets())
        known = known || (m.is_string() && m == to_string(p));
      if (!known) {
        std::string names;
        for (MovementPreset p : all_movement_presets())
          names += (names.empty() ? "" : ", ") + to_string(p);
        bad("movements", origin, "movement " + m.dump() + " is unknown; use " + names);
      }
    }
    design.variations.push_back(variation("load.movement", movements));
  }
}

// forces: magnitudes > 0 in force_unit.
void read_forces(const Json& root, const std::string& origin, StudyDesign& design) {
  if (root.contains("forces")) {
    const Json& forces = factor_array(root, "forces", origin, "[50, 100, 150]");
    for (const Json& f : forces)
      if (!f.is_number() || !std::isfinite(f.get<double>()) || f.get<double>() <= 0)
        bad("forces", origin,
            "force " + f.dump() +
                " is not a magnitude; give numbers > 0 in force_unit, e.g. "
                "[50, 100, 150]");
    design.variations.push_back(variation("load.magnitude", forces));
  }
}

// force_unit: g, cN or N.
void read_force_unit(const Json& root, const std::string& origin, StudyDesign& design) {
  if (root.contains("force_unit")) {
    const Json& u = root.at("force_unit");
    if (design.multi_rooted) {
      for (const char* unit : {"N", "cN", "g", "N mm", "g mm"})
        if (u == unit) design.force_unit = unit;
      if (design.force_unit.empty())
        bad("force_unit", origin,
            "force_unit " + u.dump() +
                " is not a unit of a multi-rooted case; use \"N\", \"cN\" or \"g\" for "
                "intrusion and translation, \"N mm\" or \"g mm\" for uprighting");
      return;
    }
    if (!u.is_string()) bad("force_unit", origin, "\"force_unit\" must be \"g\", \"cN\" or \"N\"");
    try {
      force_unit_from_string(u.get<std::string>());
    } catch (const InputError& e) {
      bad("force_unit", origin, e.what());
    }
    design.force_unit = u.get<std::string>();
  }
}

}  // namespace

StudyDesign parse_study_design(const std::string& json_text, const std::string& origin,
                               bool multi_rooted) {
  const Json root = Json::parse(json_text, nullptr, /*allow_exceptions=*/false);
  if (root.is_discarded() || !root.is_object())
    throw InputError("design", origin +
                                   ": not a JSON object; a design looks like {\"teeth\": "
                                   "[\"maxillary_canine\"], \"bone_levels_mm\": [0, 2, 4], "
                                   "\"forces\": [50, 100]} (docs/sweeps.md, Study designs)");
  for (auto it = root.begin(); it != root.end(); ++it)
    if (std::find(std::begin(kKnownKeys), std::end(kKnownKeys), it.key()) == std::end(kKnownKeys))
      bad(it.key(), origin, "unknown key \"" + it.key() + "\"; a design knows " + known_keys());

  // The factors in table order: teeth, materials, also_vary, movements, forces.
  StudyDesign design;
  design.multi_rooted = multi_rooted;
  read_version_and_label(root, origin, design);
  read_teeth(root, origin, design);
  if (!multi_rooted) read_bone_levels(root, origin, design);
  read_scenario_factors(root, origin, design);
  if (root.contains("materials"))
    add_key_lists(root, "materials", origin, true, multi_rooted, &design.variations);
  if (root.contains("also_vary"))
    add_key_lists(root, "also_vary", origin, false, multi_rooted, &design.variations);
  read_movements(root, origin, design);
  read_forces(root, origin, design);
  read_force_unit(root, origin, design);
  if (design.variations.empty() && design.bone_levels_mm.empty())
    bad("teeth", origin,
        "the design varies nothing; give at least one of teeth, bone_levels_mm, movements, forces, "
        "materials, also_vary");
  return design;
}

namespace {

// A multi-rooted design on its base case: the first scenario alone when a scenario key is varied,
// and no load.unit when the movement is varied without a force_unit.
std::string apply_multi_root_design(const std::string& case_text, const StudyDesign& design) {
  Json root = Json::parse(case_text, nullptr, /*allow_exceptions=*/false);
  if (!root.is_object()) return case_text;  // the case reader says what is wrong
  bool scenario_varied = false, movement_varied = false;
  for (const CaseVariation& v : design.variations) {
    scenario_varied = scenario_varied || v.key.rfind(kMultiRootScenarioPrefix, 0) == 0;
    movement_varied = movement_varied || v.key == "load.movement";
  }
  if (scenario_varied) {
    Json first = root.contains("scenarios") && root["scenarios"].is_array() &&
                         !root["scenarios"].empty() && root["scenarios"][0].is_object()
                     ? root["scenarios"][0]
                     : Json::object();
    first["name"] = "varied by the design";
    root["scenarios"] = Json::array({first});
  }
  if (!design.force_unit.empty())
    root["load"]["unit"] = design.force_unit;
  else if (movement_varied && root.contains("load") && root["load"].is_object())
    root["load"].erase("unit");
  return root.dump(2);
}

}  // namespace

std::string apply_study_design(const std::string& case_text, const StudyDesign& design) {
  if (design.multi_rooted) return apply_multi_root_design(case_text, design);
  std::string text = case_text;
  if (!design.bone_levels_mm.empty()) {
    Json scenarios = Json::array();
    for (double level : design.bone_levels_mm) scenarios.push_back({{"horizontal_loss_mm", level}});
    text = set_case_value(text, "scenarios", scenarios.dump());
  }
  if (!design.force_unit.empty()) text = set_case_value(text, "load.unit", design.force_unit);
  return text;
}

}  // namespace sharpey::analysis
