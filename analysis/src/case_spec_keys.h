// Case-file key tables shared by the reader (case_spec_parse.cpp), the writer
// (case_spec_write.cpp) and the range checks (case_spec_validate.cpp). Private to the analysis
// library.
#pragma once

#include <string>

#include "sharpey/analysis/case_spec.h"
#include "sharpey/core/constants.h"

namespace sharpey::analysis::case_keys {

// tooth.dimensions.<key>: the ToothDimensions fields keep their own names in the case file.
struct DimensionKey {
  const char* key;
  double mesh::ToothDimensions::*field;
};
inline constexpr DimensionKey kDimensionKeys[] = {
    {"crown_length_mm", &mesh::ToothDimensions::crown_length_mm},
    {"root_length_mm", &mesh::ToothDimensions::root_length_mm},
    {"crown_mesiodistal_mm", &mesh::ToothDimensions::crown_mesiodistal_mm},
    {"cervix_mesiodistal_mm", &mesh::ToothDimensions::cervix_mesiodistal_mm},
    {"crown_labiolingual_mm", &mesh::ToothDimensions::crown_labiolingual_mm},
    {"cervix_labiolingual_mm", &mesh::ToothDimensions::cervix_labiolingual_mm},
    {"cej_curvature_mesial_mm", &mesh::ToothDimensions::cej_curvature_mesial_mm},
    {"cej_curvature_distal_mm", &mesh::ToothDimensions::cej_curvature_distal_mm},
    {"root_taper_fullness", &mesh::ToothDimensions::root_taper_fullness},
};

// bone.<key>
struct BoneKey {
  const char* key;
  double mesh::BoneSpec::*field;
};
inline constexpr BoneKey kBoneKeys[] = {
    {"crest_below_cej_mm", &mesh::BoneSpec::crest_below_cej_mm},
    {"cortical_thickness_mm", &mesh::BoneSpec::cortical_thickness_mm},
    {"labial_plate_mm", &mesh::BoneSpec::labial_plate_mm},
    {"lingual_plate_mm", &mesh::BoneSpec::lingual_plate_mm},
    {"interproximal_margin_mm", &mesh::BoneSpec::interproximal_margin_mm},
    {"depth_below_apex_mm", &mesh::BoneSpec::depth_below_apex_mm},
};

// tooth.idealised_root.shape
inline const char* ideal_root_name(mesh::IdealRoot r) {
  switch (r) {
    case mesh::IdealRoot::kCylinder:
      return "cylinder";
    case mesh::IdealRoot::kCone:
      return "cone";
    case mesh::IdealRoot::kParaboloid:
      return "paraboloid";
    case mesh::IdealRoot::kNone:
      break;
  }
  return "none";
}

// load.couple.unit: moment units accepted in the case file, N.mm per unit.
struct MomentUnit {
  const char* name;
  double nmm_per_unit;
};
inline constexpr MomentUnit kMomentUnits[] = {{"N.mm", 1.0},
                                              {"Nmm", 1.0},
                                              {"cN.mm", 0.01},
                                              {"g.mm", sharpey::core::kNewtonsPerGramForce},
                                              {"gf.mm", sharpey::core::kNewtonsPerGramForce}};

// Case-file path of a key reported by mesh::validate (a ModelSpec field path such as
// "pdl.crest_width_mm" or "loss.horizontal_mm"). `scenario` >= 0 prefixes bone-loss keys with
// "scenarios[i].". Unknown keys are returned unchanged.
std::string model_key_to_path(const std::string& key, const CaseSpec& spec, int scenario);

}  // namespace sharpey::analysis::case_keys
