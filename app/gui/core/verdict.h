// A plain-language verdict on the PDL pressure of one scenario against the two thresholds.
// Wording is the app's own; the numbers come from analysis::ScenarioResult.
#pragma once

#include <QString>

#include "sharpey/analysis/study.h"

namespace sharpey::app {

enum class VerdictLevel {
  kBelowCapillary,  // peak compression under the capillary threshold
  kAboveCapillary,  // some of the root above capillary pressure, none above the limit
  kAboveLimit,      // some of the root above the physiological limit
};

struct Verdict {
  VerdictLevel level = VerdictLevel::kBelowCapillary;
  QString headline;  // a few words
  QString detail;    // one or two sentences with the numbers and their units
};

Verdict judge(const analysis::ScenarioResult& result, const analysis::Thresholds& thresholds);

// Short name of a level for tables ("below capillary", ...).
QString short_label(VerdictLevel level);

}  // namespace sharpey::app
