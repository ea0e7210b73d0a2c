// The pressure verdict of one scenario as the app words it. The rule and the sentence are the
// analysis library's (analysis::pressure_verdict, analysis::verdict_words), shared with the batch
// summary and the PDF report.
#pragma once

#include <QString>

#include "sharpey/analysis/verdict.h"

namespace sharpey::app {

using VerdictLevel = analysis::PressureLevel;

struct Verdict {
  VerdictLevel level = VerdictLevel::kBelowCapillary;
  QString headline;  // a few words ("Above capillary pressure")
  QString detail;    // the library's sentence with the numbers and their units
};

Verdict judge(const analysis::ScenarioResult& result, const analysis::Thresholds& thresholds);

// Short name of a level for tables ("below capillary pressure", ...): analysis::short_label.
QString level_label(VerdictLevel level);

}  // namespace sharpey::app
