// The PDF report (QPdfWriter + QPainter): the case, the force system, the thresholds with their
// sources, the verdict and key numbers of the scenario on display, its 3D view and root map, the
// bone-level comparison (views, table, trend plots), the force allowances of every bone level
// (table and chart, with the band when it was computed), and the caution on every page.
#pragma once

#include <QImage>
#include <QString>
#include <vector>

#include "core/load_controls.h"
#include "sharpey/analysis/allowance_band.h"
#include "sharpey/analysis/force_allowance.h"
#include "sharpey/analysis/multi_root_case.h"
#include "sharpey/analysis/study.h"

namespace sharpey::app {

struct ReportInputs {
  const analysis::CaseSpec* spec = nullptr;
  const std::vector<analysis::ScenarioResult>* results = nullptr;
  int current = 0;     // scenario on display
  LoadControls load;   // as set in the panel
  QString case_file;   // file name or "Untitled case"
  QImage view_3d;      // 3D view with its colour bar
  QImage comparison;   // side-by-side views with the shared colour bar (may be null)
  bool stale = false;  // results older than the geometry
  // Nominal force allowances, one per level of `results` (null or fewer: no allowance pages), and
  // the band when it was computed under the present force direction and thresholds (may be null).
  const std::vector<analysis::ScenarioAllowances>* allowances = nullptr;
  const analysis::AllowanceBand* allowance_band = nullptr;
};

// Writes the report; returns the number of pages written (0 on failure, with `error`).
int write_report(const QString& path, const ReportInputs& inputs, QString* error = nullptr);

// Pages before the allowances: case and reading, 3D and root map, comparison.
inline constexpr int kReportPages = 3;
// Bone levels whose allowances share a page.
inline constexpr int kAllowanceLevelsPerPage = 2;
// Number of pages write_report produces for `inputs`: kReportPages, plus one page per
// kAllowanceLevelsPerPage levels when every level has its allowances.
int report_page_count(const ReportInputs& inputs);

// The multi-rooted report (a case of kind "multi_root_estimate", view/molar_window.h): page 1 the
// case, the method (thin-layer estimate) and the scenarios side by side; then a page per scenario
// with its 3D view, the per-root, centre-of-resistance and allowance tables (and the
// finite-element figures when the case asks for them) and the root maps side by side. The caution
// on every page.
struct MolarReportInputs {
  const analysis::MultiRootCase* spec = nullptr;
  const analysis::MultiRootCaseResult* result = nullptr;
  analysis::ForceUnit unit = analysis::ForceUnit::kNewton;  // forces and couples shown in it
  QString case_file;
  std::vector<QImage> views;  // the 3D view of each scenario (missing ones: none drawn)
};
int write_molar_report(const QString& path, const MolarReportInputs& inputs,
                       QString* error = nullptr);
// 1 + the number of scenarios.
int molar_report_page_count(const MolarReportInputs& inputs);

}  // namespace sharpey::app
