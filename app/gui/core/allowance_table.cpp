#include "core/allowance_table.h"

#include <algorithm>
#include <cmath>

#include "core/units.h"
#include "sharpey/analysis/verdict.h"

namespace sharpey::app {

namespace {

double in_unit(double newtons, analysis::ForceUnit unit) {
  if (std::isinf(newtons)) return newtons;
  return analysis::convert_force(newtons, analysis::ForceUnit::kNewton, unit);
}

}  // namespace

QString describe(const AllowanceCriterion& c, const analysis::Thresholds& t) {
  const bool limit = c.threshold == analysis::AllowanceThreshold::kLimit;
  const double kpa = limit ? t.limit.value_kpa : t.capillary.value_kpa;
  return QStringLiteral("%1 at or below the %2 (%3)")
      .arg(c.measure == analysis::AllowanceMeasure::kPeak
               ? QStringLiteral("peak compression")
               : QStringLiteral("95th percentile of compression"),
           limit ? QStringLiteral("upper limit") : QStringLiteral("capillary pressure"),
           with_unit(kpa, QStringLiteral("kPa"), 1));
}

const AllowanceRow* AllowanceLevel::row(analysis::MovementPreset movement) const {
  for (const AllowanceRow& r : rows)
    if (r.movement == movement) return &r;
  return nullptr;
}

std::vector<AllowanceLevel> allowance_levels(
    const std::vector<analysis::ScenarioAllowances>& nominal, const analysis::AllowanceBand* band,
    const AllowanceCriterion& criterion, analysis::ForceUnit unit) {
  // A band of another study (other levels) is not shown beside these allowances.
  bool band_matches = band && band->scenarios.size() == nominal.size();
  for (size_t k = 0; band_matches && k < nominal.size(); ++k)
    band_matches = band->scenarios[k].scenario == nominal[k].scenario;
  std::vector<AllowanceLevel> levels;
  for (size_t k = 0; k < nominal.size(); ++k) {
    const analysis::ScenarioAllowances& s = nominal[k];
    AllowanceLevel level;
    level.name = QString::fromStdString(s.scenario);
    level.bone_loss_mm = s.bone_loss_mm;
    for (const analysis::MovementAllowance& a : s.movements) {
      AllowanceRow row;
      row.movement = a.movement;
      row.limited = a.limited_by_compression();
      row.nominal = in_unit(a.force_n(criterion.measure, criterion.threshold), unit);
      if (band_matches) {
        const analysis::BandPercentiles& p =
            band->scenarios[k].of(a.movement).of(criterion.measure, criterion.threshold);
        row.band_p10 = in_unit(p.p10, unit);
        row.band_p50 = in_unit(p.p50, unit);
        row.band_p90 = in_unit(p.p90, unit);
      }
      const analysis::PracticeRange practice = analysis::common_practice_range(a.movement);
      row.practice_low = analysis::convert_force(practice.low_g, analysis::ForceUnit::kGram, unit);
      row.practice_high =
          analysis::convert_force(practice.high_g, analysis::ForceUnit::kGram, unit);
      level.rows.push_back(row);
    }
    levels.push_back(std::move(level));
  }
  return levels;
}

QString allowance_text(double force, analysis::ForceUnit unit) {
  if (std::isnan(force)) return {};
  if (std::isinf(force)) return QStringLiteral("unbounded");
  return with_unit(force, force_unit_label(unit), force_decimals(unit));
}

QString practice_text(const AllowanceRow& row, analysis::ForceUnit unit) {
  const int d = force_decimals(unit);
  return QStringLiteral("%1 to %2 (%3)")
      .arg(QString::number(row.practice_low, 'f', d),
           with_unit(row.practice_high, force_unit_label(unit), d),
           QString::fromStdString(analysis::PracticeRange{}.status));
}

QString band_text(const AllowanceRow& row, analysis::ForceUnit unit) {
  if (!row.has_band()) return {};
  if (!row.limited) return QStringLiteral("unbounded");
  return QStringLiteral("%1 to %2 (median %3)")
      .arg(std::isinf(row.band_p10) ? QStringLiteral("unbounded")
                                    : QString::number(row.band_p10, 'f', force_decimals(unit)),
           allowance_text(row.band_p90, unit), allowance_text(row.band_p50, unit));
}

AllowanceTable allowance_table(const AllowanceLevel& level, analysis::ForceUnit unit) {
  AllowanceTable t;
  t.header = {QStringLiteral("movement"),     QStringLiteral("nominal"),
              QStringLiteral("conservative"), QStringLiteral("median"),
              QStringLiteral("90th pct."),    QStringLiteral("common practice")};
  const int d = force_decimals(unit);
  for (const AllowanceRow& r : level.rows) {
    const bool band = r.has_band();
    t.cells.push_back({label(r.movement), allowance_text(r.nominal, unit),
                       band ? allowance_text(r.band_p10, unit) : QStringLiteral("no band"),
                       band ? allowance_text(r.band_p50, unit) : QString(),
                       band ? allowance_text(r.band_p90, unit) : QString(),
                       QStringLiteral("%1 to %2")
                           .arg(QString::number(r.practice_low, 'f', d),
                                with_unit(r.practice_high, force_unit_label(unit), d))});
  }
  return t;
}

double allowance_axis_max(const std::vector<AllowanceLevel>& levels, double current) {
  double top = std::isfinite(current) ? std::max(0.0, current) : 0.0;
  for (const AllowanceLevel& level : levels) {
    for (const AllowanceRow& r : level.rows) {
      for (double v : {r.nominal, r.band_p10, r.band_p50, r.band_p90, r.practice_high})
        if (std::isfinite(v)) top = std::max(top, v);
    }
  }
  return top;
}

std::optional<AppliedAllowance> allowance_to_apply(const AllowanceRow& row,
                                                   analysis::ForceUnit unit) {
  if (!row.limited) return std::nullopt;
  AppliedAllowance a;
  a.is_conservative = row.has_band();
  const double force = a.is_conservative ? row.band_p10 : row.nominal;
  if (!std::isfinite(force)) return std::nullopt;
  const double step = std::pow(10.0, -force_decimals(unit));
  // Down to the field's resolution, so the force set never exceeds the allowance.
  a.force = std::floor(force / step) * step;
  if (!(a.force > 0)) return std::nullopt;
  return a;
}

LoadControls controls_for_allowance(const LoadControls& present, analysis::MovementPreset movement,
                                    double force) {
  analysis::LoadSpec load = analysis::allowance_load(to_load_spec(present), movement);
  load.unit = present.unit;
  load.magnitude = force;
  return from_load_spec(load);
}

}  // namespace sharpey::app
