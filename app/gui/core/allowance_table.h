// What the allowance view and the PDF report show of the force allowances (analysis library:
// force_allowance.h, allowance_band.h), in the user's force unit: one row per movement and bone
// level with the nominal allowance, the variability band (10th, 50th, 90th percentiles; the
// conservative allowance is the 10th) and the common-practice range beside it, and the force
// controls that apply a conservative allowance. No numerics of its own: every figure is the
// library's, converted with its unit functions. QtCore only, tested without a display.
#pragma once

#include <QString>
#include <QStringList>
#include <optional>
#include <vector>

#include "core/load_controls.h"
#include "sharpey/analysis/allowance_band.h"
#include "sharpey/analysis/force_allowance.h"

namespace sharpey::app {

// Which allowance is shown: measure (peak or 95th percentile of compression) against a threshold
// (upper limit or capillary pressure). The default is the one summary.txt states: peak against
// the upper limit.
struct AllowanceCriterion {
  analysis::AllowanceMeasure measure = analysis::AllowanceMeasure::kPeak;
  analysis::AllowanceThreshold threshold = analysis::AllowanceThreshold::kLimit;
};
// "peak compression at or below the upper limit (16.0 kPa)", for captions.
QString describe(const AllowanceCriterion& criterion, const analysis::Thresholds& thresholds);

// One movement at one bone level, forces in the user's unit (+infinity: not limited by
// compression; NaN: the band was not computed).
struct AllowanceRow {
  analysis::MovementPreset movement = analysis::MovementPreset::kNone;
  bool limited = true;  // false: the movement does not compress the ligament
  double nominal = 0;
  double band_p10 = NAN, band_p50 = NAN, band_p90 = NAN;
  double practice_low = 0, practice_high = 0;  // common practice (check-values.md section 9)
  bool has_band() const { return !std::isnan(band_p10); }
};

struct AllowanceLevel {
  QString name;
  double bone_loss_mm = 0;
  std::vector<AllowanceRow> rows;  // order of analysis::all_movement_presets()
  const AllowanceRow* row(analysis::MovementPreset movement) const;  // null when absent
};

// The levels in `unit` under `criterion`. `band` may be null (not computed); its scenarios must
// then match `nominal` one to one (the same study), else it is ignored.
std::vector<AllowanceLevel> allowance_levels(
    const std::vector<analysis::ScenarioAllowances>& nominal, const analysis::AllowanceBand* band,
    const AllowanceCriterion& criterion, analysis::ForceUnit unit);

// A force for a table cell: "31 g", "unbounded" (+infinity), "" (NaN).
QString allowance_text(double force, analysis::ForceUnit unit);
// "35 to 60 g (common practice)".
QString practice_text(const AllowanceRow& row, analysis::ForceUnit unit);
// "24 to 41 g (median 30 g)" or "" without the band.
QString band_text(const AllowanceRow& row, analysis::ForceUnit unit);

// The table of one level for the report: a header and one row of cells per movement (movement,
// nominal, conservative = band 10th percentile or "no band", band median and 90th percentile, the
// common-practice range "35 to 60 g").
struct AllowanceTable {
  QStringList header;
  std::vector<QStringList> cells;
};
AllowanceTable allowance_table(const AllowanceLevel& level, analysis::ForceUnit unit);

// The largest force the chart of `levels` needs on its axis (band, nominal, practice range and
// `current`, whichever is largest and finite), in the unit of the rows.
double allowance_axis_max(const std::vector<AllowanceLevel>& levels, double current);

// The force the apply action sets: the conservative allowance (the band's 10th percentile) of
// `movement` when the band is there, else the nominal allowance (`is_conservative` says which),
// rounded down to what the force field shows in `unit`, so the force set never exceeds it. Empty
// when the movement is not limited by compression (no allowance to apply).
struct AppliedAllowance {
  double force = 0;  // in `unit`
  bool is_conservative = false;
};
std::optional<AppliedAllowance> allowance_to_apply(const AllowanceRow& row,
                                                   analysis::ForceUnit unit);

// The force controls after applying `force` (in controls.unit) of `movement`: the movement preset
// and the direction its allowance was evaluated under (analysis::allowance_load of the present
// load), the force's magnitude, the unit and the point of application kept.
LoadControls controls_for_allowance(const LoadControls& present, analysis::MovementPreset movement,
                                    double force);

}  // namespace sharpey::app
