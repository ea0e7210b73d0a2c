// Cases built in code for the analysis tests (test_study_*, test_cres_*, test_clinical_*).
// Invented scenarios for verification, not patient data.
#pragma once

#include <string>
#include <vector>

#include "sharpey/analysis/case_spec.h"
#include "sharpey/analysis/study.h"

namespace sharpey::testing {

// Maxillary central incisor with handbook dimensions, one scenario per horizontal bone loss (mm).
inline analysis::CaseSpec incisor_case(mesh::MeshPreset preset,
                                       const std::vector<double>& losses_mm) {
  analysis::CaseSpec spec;
  spec.label = "invented verification case: maxillary central incisor";
  spec.model.tooth.type = mesh::ToothType::kMaxillaryCentralIncisor;
  spec.model.tooth.dimensions = mesh::handbook_dimensions(spec.model.tooth.type);
  spec.model.sizing.preset = preset;
  for (double loss : losses_mm) {
    analysis::Scenario s;
    s.name = loss == 0 ? "healthy" : std::to_string(static_cast<int>(loss)) + " mm loss";
    s.loss.horizontal_mm = loss;
    spec.scenarios.push_back(s);
  }
  return spec;
}

// A force of `grams` along `direction` at the bracket pad centre with a movement preset.
inline analysis::LoadSpec force_g(double grams, const Eigen::Vector3d& direction,
                                  analysis::MovementPreset preset) {
  analysis::LoadSpec load;
  load.magnitude = grams;
  load.unit = analysis::ForceUnit::kGram;
  load.direction = direction;
  load.preset = preset;
  return load;
}

inline analysis::LoadSpec lingual_g(double grams, analysis::MovementPreset preset) {
  return force_g(grams, -Eigen::Vector3d::UnitX(), preset);
}

}  // namespace sharpey::testing
