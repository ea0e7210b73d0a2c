// The pressure verdict of one scenario against the two thresholds, and the force-unit
// conversions a verdict and a force system are read in. One implementation for the app (findings,
// PDF report), the batch summary and every other output.
#pragma once

#include <string>

#include "sharpey/analysis/case_spec.h"
#include "sharpey/analysis/study.h"

namespace sharpey::analysis {

enum class PressureLevel {
  kBelowCapillary,  // peak compression at or under capillary pressure
  kAboveCapillary,  // above capillary pressure, at or under the physiological limit
  kAboveLimit,      // above the physiological limit
};

// The verdict and the numbers it rests on (kPa, mm^2, % of the attachment area).
struct PressureVerdict {
  PressureLevel level = PressureLevel::kBelowCapillary;
  double peak_kpa = 0;       // ScenarioResult::pressure_max_compression_kpa
  double threshold_kpa = 0;  // the threshold passed (capillary when none is)
  double area_mm2 = 0;       // root-surface area above that threshold (0 when none is passed)
  double area_percent = 0;   // the same as % of the attachment area (0 without attachment)
};

// The rule, the same everywhere: a threshold is passed when the peak compression (outside the
// crest edge band, as the key numbers) is strictly greater than it; the area reported is the
// root-surface area where the compression exceeds that threshold. Thresholds in kPa.
PressureVerdict pressure_verdict(const ScenarioResult& result, const Thresholds& thresholds);

// A few words for tables: "below capillary pressure", "above capillary pressure", "above the
// physiological limit".
std::string short_label(PressureLevel level);

// One factual sentence: "peak compression 18.2 kPa, above the 16.0 kPa physiological limit over
// 42.0 mm^2 (12 % of the attachment)" ("mm^2" as written; `squared` replaces it, e.g. "mm²").
std::string verdict_words(const PressureVerdict& verdict, const Thresholds& thresholds,
                          const std::string& squared = "mm^2");

// Force in `to` from a value in `from` (grams-force, centinewtons or newtons; through to_newton
// and from_newton of case_spec.h, 1 gf = 0.00980665 N).
double convert_force(double value, ForceUnit from, ForceUnit to);
// Moments in the force unit times mm (g.mm, cN.mm, N.mm) to and from N.mm.
double moment_to_nmm(double value, ForceUnit unit);
double moment_from_nmm(double value_nmm, ForceUnit unit);
// "g.mm", "cN.mm", "N.mm".
std::string moment_unit(ForceUnit unit);

}  // namespace sharpey::analysis
