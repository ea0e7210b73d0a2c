// Units the app shows beside every number, and conversion from the internal units (mm, N, MPa).
// Plain logic, no widgets.
#pragma once

#include <QString>

#include "sharpey/analysis/case_spec.h"

namespace sharpey::app {

// 1 gram-force in newtons (standard gravity).
inline constexpr double kNewtonPerGramForce = 0.00980665;

// Force in newtons from a value in `unit` and back (same rule as analysis::to_newton, kept here so
// the panel can convert while the user types; a test checks both agree).
double force_to_newton(double value, analysis::ForceUnit unit);
double force_from_newton(double value_n, analysis::ForceUnit unit);
// Converts a force value between display units.
double convert_force(double value, analysis::ForceUnit from, analysis::ForceUnit to);

// Moments are shown in the force unit times mm (g.mm, cN.mm, N.mm).
double moment_to_nmm(double value, analysis::ForceUnit unit);
double moment_from_nmm(double value_nmm, analysis::ForceUnit unit);

QString force_unit_label(analysis::ForceUnit unit);   // "g", "cN", "N"
QString moment_unit_label(analysis::ForceUnit unit);  // "g·mm", "cN·mm", "N·mm"
// Decimals that keep a force readable in `unit` (g: 0, cN: 1, N: 3).
int force_decimals(analysis::ForceUnit unit);

// "12.3 kPa": a value with its unit, `decimals` after the point, thin space before the unit.
QString with_unit(double value, const QString& unit, int decimals);
// Number of decimals that shows about three significant digits of `value` (0 to 4).
int readable_decimals(double value);

}  // namespace sharpey::app
