// Units the app shows beside every number, and conversion from the internal units (mm, N, MPa).
// Plain logic, no widgets.
#pragma once

#include <QString>

#include "sharpey/analysis/case_spec.h"
#include "sharpey/analysis/verdict.h"

namespace sharpey::app {

// Force and moment conversions are the analysis library's (analysis::to_newton, from_newton,
// convert_force, moment_to_nmm, moment_from_nmm in case_spec.h and verdict.h).

QString force_unit_label(analysis::ForceUnit unit);   // "g", "cN", "N"
QString moment_unit_label(analysis::ForceUnit unit);  // "g·mm", "cN·mm", "N·mm"
// Decimals that keep a force readable in `unit` (g: 0, cN: 1, N: 3).
int force_decimals(analysis::ForceUnit unit);

// "12.3 kPa": a value with its unit, `decimals` after the point, thin space before the unit.
QString with_unit(double value, const QString& unit, int decimals);
// Number of decimals that shows about three significant digits of `value` (0 to 4).
int readable_decimals(double value);

}  // namespace sharpey::app
