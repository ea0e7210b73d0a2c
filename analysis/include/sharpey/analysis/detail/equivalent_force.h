// Equivalent force for a reduced periodontium.
//
// Internal to the analysis library; not a stable interface.
#pragma once

namespace sharpey::analysis::detail {

// The force (same direction and moment-to-force ratio) that gives the reduced periodontium the same
// value of a pressure measure as the healthy one: everything is linear in the load, so
// F_eq = F * measure_healthy / measure_scenario. Returns -1 when the scenario's measure is not
// positive (no compression to match).
double equivalent_force_by_pressure(double force, double healthy_measure, double scenario_measure);

// The attachment-area rule (common practice): F_eq = F * attachment area / healthy attachment area.
// Returns -1 when the healthy area is not positive.
double equivalent_force_by_area(double force, double scenario_area_mm2, double healthy_area_mm2);

}  // namespace sharpey::analysis::detail
