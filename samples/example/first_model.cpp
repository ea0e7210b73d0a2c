// A first program on Sharpey's library: build a model in code, solve it, read the answers.
//
// An invented case (not patient data): a maxillary central incisor with handbook dimensions,
// healthy and with 4 mm of horizontal bone loss, coarse mesh. A 100 g lingual force at the
// bracket, first as it comes (uncontrolled tipping), then with the couple that translates the
// tooth. Built and run by CTest (sample_first_model), so this stays a working tutorial.
// The steps follow the library's own rhythm: describe the case, solve each bone level once,
// then evaluate any force system on the solved levels without a new solve.
#include <cstdio>
#include <exception>

#include "sharpey/analysis/case_spec.h"
#include "sharpey/analysis/study.h"

namespace an = sharpey::analysis;
namespace mesh = sharpey::mesh;

// Step 1: the case. Every field has a documented default (docs/case-format.md); here only the
// tooth, the mesh preset and the bone levels are set.
an::CaseSpec describe_case() {
  an::CaseSpec spec;
  spec.label = "Invented example: maxillary central incisor";
  spec.model.tooth.type = mesh::ToothType::kMaxillaryCentralIncisor;
  spec.model.tooth.dimensions = mesh::handbook_dimensions(spec.model.tooth.type);
  spec.model.sizing.preset = mesh::MeshPreset::kCoarse;
  for (double loss_mm : {0.0, 4.0}) {
    an::Scenario level;
    level.name = loss_mm == 0 ? "healthy" : "4 mm loss";
    level.loss.horizontal_mm = loss_mm;
    spec.scenarios.push_back(level);
  }
  return spec;
}

// Step 3: a force system, 100 g toward the lingual (-x in tooth coordinates).
an::LoadSpec lingual_force(an::MovementPreset movement) {
  an::LoadSpec load;
  load.magnitude = 100;
  load.unit = an::ForceUnit::kGram;
  load.direction = Eigen::Vector3d(-1, 0, 0);
  load.preset = movement;
  return load;
}

void print(const an::ScenarioResult& r, const char* movement) {
  std::printf(
      "%-10s %-21s peak %6.1f kPa  95th pct %6.1f kPa  CRes %.2f mm below the crest "
      "(%.1f %% of the embedded root)  M/F %.1f mm\n",
      r.name.c_str(), movement, r.pressure_max_compression_kpa, r.pressure_p95_compression_kpa,
      r.cres_labiolingual.from_crest_mm, 100 * r.cres_labiolingual.fraction_embedded,
      r.load.moment_to_force_mm);
  if (r.beyond_linear_range)
    std::printf("           %s\n", an::beyond_linear_range_text(r).c_str());
}

int main() {
  try {
    // Step 2: mesh and solve every level (the slow part: one factorisation per level).
    const an::Study study(describe_case());
    // Step 4: evaluate force systems on the solved levels (superposition, milliseconds).
    for (auto movement :
         {an::MovementPreset::kUncontrolledTipping, an::MovementPreset::kTranslation}) {
      for (const an::ScenarioResult& r : study.evaluate(lingual_force(movement)))
        print(r, an::to_string(movement).c_str());
    }
    std::printf("%s\n", an::caution_text().c_str());
    return 0;
  } catch (const std::exception& e) {
    std::fprintf(stderr, "first_model: %s\n", e.what());
    return 1;
  }
}
