// A study design: the factors of a published-style finite-element series (teeth x bone levels x
// movements x forces x materials) in a small JSON file, expanded by the batch `sweep` into case
// variations on top of a base case. Format in docs/sweeps.md ("Study designs").
#pragma once

#include <string>
#include <vector>

#include "sharpey/analysis/case_spec.h"

namespace sharpey::analysis {

constexpr int kStudyDesignVersion = 1;

struct StudyDesign {
  std::string label;  // free text; example designs say "Invented"
  // Read for a multi-rooted base case (kind multi_root_estimate, docs/molars.md): the scenario
  // factors (bone_levels_mm, furcation_*, angular_defects_mm) are then varied keys of the base
  // case's first scenario, one table row per combination, instead of a scenario list.
  bool multi_rooted = false;
  std::vector<double> bone_levels_mm;  // horizontal loss per scenario; empty: the case's scenarios
  std::string force_unit;              // "g", "cN", "N"; empty: the case's unit
  // The varied case keys in the design's order: tooth.type, the material keys, the also_vary
  // keys, load.movement, load.magnitude (each present only when the design gives it). Values are
  // case-file literals as --vary takes them.
  std::vector<CaseVariation> variations;
};

// Reads a design. Keys (all optional, at least one factor): design_version (1), label (string),
// teeth (tooth types), bone_levels_mm (distinct horizontal losses >= 0, each becomes a scenario),
// movements (movement names), forces (magnitudes > 0), force_unit, materials (object: a material
// key such as "pdl.material.young_modulus_mpa" -> array of values), also_vary (object: any other
// case key -> array of values); see docs/sweeps.md. Throws InputError naming the key (prefixed
// "design."), the value and the fix; `origin` names the file in messages.
// With `multi_rooted` (the base case is a multi-rooted tooth case) the design also knows
// furcation_degrees, furcation_horizontal_mm, furcation_vertical_mm and angular_defects_mm; teeth,
// movements, force units and materials are then those of docs/molars.md (materials:
// pdl.young_modulus_mpa, pdl.poisson_ratio), and also_vary may name keys of scenarios[0].
StudyDesign parse_study_design(const std::string& json_text, const std::string& origin = "design",
                               bool multi_rooted = false);

// `case_text` (a case file's JSON) with the design's bone levels as its scenario list and its
// force unit set. The variations are applied by the sweep, one combination at a time.
// A multi-rooted design instead keeps the case's first scenario alone (renamed "varied by the
// design") when it varies a scenario key, and, when it varies the movement without a force_unit,
// drops load.unit so that each movement takes its own unit (N mm for uprighting, N for forces).
std::string apply_study_design(const std::string& case_text, const StudyDesign& design);

}  // namespace sharpey::analysis
