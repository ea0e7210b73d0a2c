// Evaluation of a scenario under a load, with the healthy reference's pressure measures supplied
// when the caller already has them (Study::evaluate evaluates the healthy scenario first).
//
// Internal to the analysis library; not a stable interface.
#pragma once

#include "sharpey/analysis/field_choice.h"
#include "sharpey/analysis/study.h"

namespace sharpey::analysis::detail {

// Peak nodal compression and area-weighted 95th percentile on the root surface, kPa.
struct PressureMeasures {
  double peak_kpa = 0, p95_kpa = 0;
};

// As analysis::evaluate(); when `reference` is given it holds the healthy scenario's measures under
// the same load and `healthy` is only used for its attachment area.
ScenarioResult evaluate(const ScenarioSolution& solution, const LoadSpec& load,
                        const Thresholds& thresholds, const ScenarioSolution* healthy,
                        const PressureMeasures* reference, const FieldChoice& fields = {});

}  // namespace sharpey::analysis::detail
