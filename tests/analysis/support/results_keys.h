// The fixed key names of results.json that outside tools rely on (docs/case-format.md).
#pragma once

namespace sharpey::test {

inline constexpr const char* kFixedTopLevelKeys[] = {"units", "sources", "caution", "scenarios"};

// Numbers, except pdl_pressure_kpa (an object with the three keys below) and equivalent_force_g
// (a number, or null without a healthy reference).
inline constexpr const char* kFixedScenarioKeys[] = {"bone_loss_mm",
                                                     "attachment_area_mm2",
                                                     "cres_from_crest_mm",
                                                     "cres_fraction_embedded",
                                                     "mf_translation_mm",
                                                     "pdl_pressure_kpa",
                                                     "area_above_capillary_mm2",
                                                     "area_above_limit_mm2",
                                                     "max_principal_strain",
                                                     "crown_tip_displacement_um",
                                                     "equivalent_force_g"};

inline constexpr const char* kFixedPressureKeys[] = {"max_compression", "max_tension",
                                                     "p95_compression"};

}  // namespace sharpey::test
