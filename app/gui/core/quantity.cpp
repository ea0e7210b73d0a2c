#include "core/quantity.h"

#include <algorithm>
#include <cmath>
#include <limits>

namespace sharpey::app {

std::vector<Quantity> all_quantities() {
  return {Quantity::kPressure, Quantity::kMaxPrincipalStrain, Quantity::kEquivalentStrain,
          Quantity::kVonMises, Quantity::kDisplacement};
}

QString label(Quantity q) {
  switch (q) {
    case Quantity::kPressure:
      return QStringLiteral("hydrostatic pressure");
    case Quantity::kMaxPrincipalStrain:
      return QStringLiteral("max. principal strain");
    case Quantity::kEquivalentStrain:
      return QStringLiteral("equivalent strain");
    case Quantity::kVonMises:
      return QStringLiteral("von Mises stress");
    case Quantity::kDisplacement:
      return QStringLiteral("displacement");
  }
  return {};
}

QString unit_label(Quantity q) {
  switch (q) {
    case Quantity::kPressure:
      return QStringLiteral("kPa");
    case Quantity::kMaxPrincipalStrain:
      return QStringLiteral("%");
    case Quantity::kEquivalentStrain:
      return QStringLiteral("%");
    case Quantity::kVonMises:
      return QStringLiteral("kPa");
    case Quantity::kDisplacement:
      return QString::fromUtf8("\u00b5m");
  }
  return {};
}

QString short_label(Quantity q) { return label(q) + QStringLiteral(" (") + unit_label(q) + ')'; }

bool is_signed(Quantity q) {
  return q == Quantity::kPressure || q == Quantity::kMaxPrincipalStrain;
}

std::vector<double> quantity_values(const analysis::ScenarioResult& r, Quantity q,
                                    const std::vector<int>& pdl_nodes) {
  const size_t n = pdl_nodes.size();
  std::vector<double> out(n, std::numeric_limits<double>::quiet_NaN());
  auto copy_scaled = [&](const std::vector<double>& field, double scale) {
    for (size_t i = 0; i < std::min(n, field.size()); ++i) out[i] = field[i] * scale;
  };
  switch (q) {
    case Quantity::kPressure:
      copy_scaled(r.pressure_kpa, 1.0);
      break;
    case Quantity::kMaxPrincipalStrain:
      copy_scaled(r.max_principal_strain_field, 100.0);
      break;
    case Quantity::kEquivalentStrain:
      copy_scaled(r.equivalent_strain_field, 100.0);
      break;
    case Quantity::kVonMises:
      copy_scaled(r.von_mises_kpa, 1.0);
      break;
    case Quantity::kDisplacement:
      for (size_t i = 0; i < n; ++i) {
        const int node = pdl_nodes[i];
        if (node >= 0 && node < r.displacement_mm.cols())
          out[i] = 1000.0 * r.displacement_mm.col(node).norm();
      }
      break;
  }
  return out;
}

ValueRange finite_range(const std::vector<double>& values) {
  ValueRange r{std::numeric_limits<double>::infinity(), -std::numeric_limits<double>::infinity()};
  for (double v : values) {
    if (!std::isfinite(v)) continue;
    r.min = std::min(r.min, v);
    r.max = std::max(r.max, v);
  }
  if (!r.valid()) return {0, 0};
  return r;
}

ValueRange finite_range(const std::vector<double>& values, const std::vector<char>& band,
                        bool in_band) {
  ValueRange r{std::numeric_limits<double>::infinity(), -std::numeric_limits<double>::infinity()};
  for (size_t i = 0; i < values.size(); ++i) {
    const bool inside = i < band.size() && band[i] != 0;
    if (inside != in_band || !std::isfinite(values[i])) continue;
    r.min = std::min(r.min, values[i]);
    r.max = std::max(r.max, values[i]);
  }
  if (!r.valid()) return {0, 0};
  return r;
}

ValueRange merge(const ValueRange& a, const ValueRange& b) {
  return {std::min(a.min, b.min), std::max(a.max, b.max)};
}

QString label(ScaleMode mode) {
  switch (mode) {
    case ScaleMode::kShown:
      return QStringLiteral("scale: range shown");
    case ScaleMode::kFixed:
      return QStringLiteral("scale: fixed at the current range");
    case ScaleMode::kThresholds:
      return QStringLiteral("scale: anchored to the limit");
    case ScaleMode::kPerLevel:
      return QStringLiteral("scale: each level its own");
  }
  return {};
}

ValueRange scale_range(ScaleMode mode, Quantity q, const ValueRange& shown, const ValueRange& fixed,
                       double limit_kpa) {
  switch (mode) {
    case ScaleMode::kFixed:
      return fixed;
    case ScaleMode::kThresholds:
      if (q == Quantity::kPressure && limit_kpa > 0) return {-limit_kpa, limit_kpa};
      return shown;
    case ScaleMode::kShown:
    case ScaleMode::kPerLevel:
      break;
  }
  return shown;
}

}  // namespace sharpey::app
