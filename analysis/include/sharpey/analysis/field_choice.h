// Evaluating only part of a scenario's results: a view that follows a slider needs the field it
// shows, not every field (issue 12, point 14).
#pragma once

#include "sharpey/analysis/study.h"

namespace sharpey::analysis {

// The per-node fields evaluate() computes beyond the pressure (always computed: the verdict, the
// pressure peaks, the areas and the root map need it) and the rigid motion at the bracket,
// crown tip and apex and the centre of rotation (always computed: a few 6 x 6 products).
struct FieldChoice {
  // max_principal_strain_field, equivalent_strain_field and the strain maxima and linear-range
  // figures derived from them.
  bool strains = true;
  bool von_mises = true;  // von_mises_kpa and max_von_mises_kpa
  // displacement_mm (every node) and rigid_fit_rms_um (a least-squares fit over the root).
  bool displacement = true;
  // Without the strain fields (strains false): still the strain maxima (max_principal_strain,
  // max_equivalent_strain, max_abs_principal_strain) and the linear-range figures
  // (beyond_linear_range, volume_beyond_linear_range_percent), the same bit for bit as with the
  // fields; the principal values are computed only at the nodes whose bounds (Gershgorin discs,
  // the Frobenius norm) let them hold a maximum, so a slider drag keeps the linear-range flag
  // for a fraction of the fields' cost.
  bool strain_maxima = true;
};

// As evaluate() (study.h), leaving out what `fields` does not ask for: those fields are empty,
// their maxima NaN, beyond_linear_range false and volume_beyond_linear_range_percent NaN when the
// strains and strain_maxima are left out, rigid_fit_rms_um NaN without the displacement. Everything
// computed is the same, bit for bit, as evaluate() gives.
ScenarioResult evaluate(const ScenarioSolution& solution, const LoadSpec& load,
                        const Thresholds& thresholds, const ScenarioSolution* healthy,
                        const FieldChoice& fields);

}  // namespace sharpey::analysis
