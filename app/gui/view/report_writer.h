// The PDF report (QPdfWriter + QPainter): the case, the force system, the thresholds with their
// sources, the verdict and key numbers of the scenario on display, its 3D view and root map, the
// bone-level comparison (views, table, trend plots), and the caution on every page.
#pragma once

#include <QImage>
#include <QString>
#include <vector>

#include "core/load_controls.h"
#include "sharpey/analysis/study.h"

namespace sharpey::app {

struct ReportInputs {
  const analysis::CaseSpec* spec = nullptr;
  const std::vector<analysis::ScenarioResult>* results = nullptr;
  int current = 0;             // scenario on display
  LoadControls load;           // as set in the panel
  QString case_file;           // file name or "Untitled case"
  QImage view_3d;              // 3D view with its colour bar
  QImage comparison;           // side-by-side views with the shared colour bar (may be null)
  bool stale = false;          // results older than the geometry
};

// Writes the report; returns the number of pages written (0 on failure, with `error`).
int write_report(const QString& path, const ReportInputs& inputs, QString* error = nullptr);

// Number of pages write_report produces.
inline constexpr int kReportPages = 3;

}  // namespace sharpey::app
