// The pressure verdict and the force-unit conversions (see verdict.h).
#include "sharpey/analysis/verdict.h"

#include <cmath>
#include <cstdio>

#include "sharpey/analysis/detail/output_text.h"

namespace sharpey::analysis {

using detail::fixed;

PressureVerdict pressure_verdict(const ScenarioResult& r, const Thresholds& t) {
  PressureVerdict v;
  v.peak_kpa = r.pressure_max_compression_kpa;
  v.threshold_kpa = t.capillary.value_kpa;
  if (v.peak_kpa > t.limit.value_kpa) {
    v.level = PressureLevel::kAboveLimit;
    v.threshold_kpa = t.limit.value_kpa;
    v.area_mm2 = r.area_above_limit_mm2;
  } else if (v.peak_kpa > t.capillary.value_kpa) {
    v.level = PressureLevel::kAboveCapillary;
    v.area_mm2 = r.area_above_capillary_mm2;
  }
  if (r.attachment_area_mm2 > 0) v.area_percent = 100.0 * v.area_mm2 / r.attachment_area_mm2;
  return v;
}

std::string short_label(PressureLevel level) {
  switch (level) {
    case PressureLevel::kBelowCapillary:
      return "below capillary pressure";
    case PressureLevel::kAboveCapillary:
      return "above capillary pressure";
    case PressureLevel::kAboveLimit:
      return "above the physiological limit";
  }
  return {};
}

std::string verdict_words(const PressureVerdict& v, const Thresholds& t,
                          const std::string& squared) {
  std::string s = "peak compression " + fixed(v.peak_kpa, 1) + " kPa, ";
  const std::string area = fixed(v.area_mm2, 1) + " " + squared + " (" + fixed(v.area_percent, 0) +
                           " % of the attachment)";
  switch (v.level) {
    case PressureLevel::kAboveLimit:
      return s + "above the " + fixed(t.limit.value_kpa, 1) + " kPa physiological limit over " +
             area;
    case PressureLevel::kAboveCapillary:
      return s + "above the " + fixed(t.capillary.value_kpa, 1) + " kPa capillary pressure over " +
             area + ", under the " + fixed(t.limit.value_kpa, 1) + " kPa limit";
    case PressureLevel::kBelowCapillary:
      break;
  }
  return s + "at or under the " + fixed(t.capillary.value_kpa, 1) + " kPa capillary pressure";
}

double convert_force(double value, ForceUnit from, ForceUnit to) {
  return from == to ? value : from_newton(to_newton(value, from), to);
}

double moment_to_nmm(double value, ForceUnit unit) { return to_newton(value, unit); }

double moment_from_nmm(double value_nmm, ForceUnit unit) { return from_newton(value_nmm, unit); }

std::string moment_unit(ForceUnit unit) { return to_string(unit) + ".mm"; }

}  // namespace sharpey::analysis
