#include "core/units.h"

#include <cmath>

namespace sharpey::app {

QString force_unit_label(analysis::ForceUnit unit) {
  switch (unit) {
    case analysis::ForceUnit::kGram:
      return QStringLiteral("g");
    case analysis::ForceUnit::kCentinewton:
      return QStringLiteral("cN");
    case analysis::ForceUnit::kNewton:
      return QStringLiteral("N");
  }
  return {};
}

QString moment_unit_label(analysis::ForceUnit unit) {
  return force_unit_label(unit) + QString::fromUtf8("\u00b7mm");
}

int force_decimals(analysis::ForceUnit unit) {
  switch (unit) {
    case analysis::ForceUnit::kGram:
      return 0;
    case analysis::ForceUnit::kCentinewton:
      return 1;
    case analysis::ForceUnit::kNewton:
      return 3;
  }
  return 2;
}

QString with_unit(double value, const QString& unit, int decimals) {
  if (!std::isfinite(value)) return QStringLiteral("n/a");
  // Avoid "-0.0".
  const double shown = std::abs(value) < 0.5 * std::pow(10.0, -decimals) ? 0.0 : value;
  QString text = QString::number(shown, 'f', decimals);
  if (unit.isEmpty()) return text;
  return text + QChar(0x2009) + unit;
}

int readable_decimals(double value) {
  const double a = std::abs(value);
  if (!(a > 0) || !std::isfinite(a)) return 1;
  if (a >= 100) return 0;
  if (a >= 10) return 1;
  if (a >= 1) return 2;
  if (a >= 0.1) return 3;
  return 4;
}

}  // namespace sharpey::app
