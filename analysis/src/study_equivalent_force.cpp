#include <cmath>

#include "sharpey/analysis/detail/equivalent_force.h"

namespace sharpey::analysis::detail {

double equivalent_force_by_pressure(double force, double healthy_measure, double scenario_measure) {
  if (!(scenario_measure > 0) || !(healthy_measure > 0) || !std::isfinite(force)) return -1;
  return force * healthy_measure / scenario_measure;
}

double equivalent_force_by_area(double force, double scenario_area_mm2, double healthy_area_mm2) {
  if (!(healthy_area_mm2 > 0) || !std::isfinite(force)) return -1;
  return force * scenario_area_mm2 / healthy_area_mm2;
}

}  // namespace sharpey::analysis::detail
