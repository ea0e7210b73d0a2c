// The force-allowance view: for every solved bone level, one chart with a row per movement: the
// variability band (10th to 90th percentile, median marked) as a bar, the nominal allowance as a
// diamond, the common-practice range beside it as a strip under the bar (check-values.md section
// 9, marked common practice), and the present force as a dashed line. Nominal allowances follow
// each solved level at once (AllowanceJob, off the window's thread); the band runs only when asked,
// in the background with progress and a cancel button. One button applies the conservative
// allowance of the chosen movement at the bone level on display to the force controls. The
// caution (analysis::caution_text) is always visible under the charts.
#pragma once

#include <QColor>
#include <QWidget>
#include <vector>

#include "core/allowance_table.h"

class QComboBox;
class QHBoxLayout;
class QLabel;
class QProgressBar;
class QPushButton;

namespace sharpey::app {

class AllowanceJob;
class CaseSession;

// Draws the chart of one level into `rect`: rows per movement, an axis from 0 to `axis_max` in
// `unit`, the present force (`current`, NaN: none) as a dashed line and the row of `highlighted`
// shaded. Used by the view and the PDF report.
struct AllowanceChartStyle {
  bool highlight_level = false;      // the level on display: title marked
  bool title = true;                 // the level's name above the rows
  QColor background{250, 250, 248};  // what the chart is drawn on
};
void paint_allowance_chart(QPainter& painter, const QRect& rect, const AllowanceLevel& level,
                           double axis_max, double current, analysis::MovementPreset highlighted,
                           analysis::ForceUnit unit, const AllowanceChartStyle& style = {});
// The legend line under the charts (colours and marks explained), drawn into `rect`.
void paint_allowance_legend(QPainter& painter, const QRect& rect, bool with_band);

class AllowanceCharts;

class AllowanceView : public QWidget {
  Q_OBJECT

 public:
  // Follows `session` (levels solved, force system, thresholds, level on display).
  explicit AllowanceView(CaseSession* session, QWidget* parent = nullptr);
  ~AllowanceView() override;

  AllowanceJob& job() { return *job_; }
  // What is drawn, in the user's force unit (one entry per level with nominal allowances).
  const std::vector<AllowanceLevel>& levels() const { return levels_; }
  AllowanceCriterion criterion() const { return criterion_; }
  // The movement the apply button applies; follows a preset chosen in the force panel.
  analysis::MovementPreset movement() const;
  void set_movement(analysis::MovementPreset movement);
  void set_criterion(const AllowanceCriterion& criterion);
  // Starts the band (as the button does); false with the reason in status_text().
  bool compute_band();
  // Applies the allowance of movement() at the level on display (as the button does); false when
  // there is none to apply (the reason in status_text()).
  bool apply_allowance();
  QString status_text() const;
  QPushButton* apply_button() const { return apply_; }
  QPushButton* band_button() const { return band_; }
  QLabel* caution_label() const { return caution_; }
  // The charts as an image, for screenshots.
  QImage grab_charts();

 signals:
  // Nominal allowances of `n_levels` levels are drawn (after each arrives).
  void nominal_shown(int n_levels);
  // The apply button: the force controls to set (the window mirrors them in the force panel).
  void apply_requested(const sharpey::app::LoadControls& controls);

 private:
  QHBoxLayout* build_controls();  // the row of controls above the charts
  void build_layout();
  void connect_controls();
  void connect_job();
  void refresh();
  void follow_session(bool interactive);

  CaseSession* session_;
  std::unique_ptr<AllowanceJob> job_;
  AllowanceCriterion criterion_;
  analysis::MovementPreset followed_preset_ = analysis::MovementPreset::kNone;  // force panel's
  std::vector<AllowanceLevel> levels_;
  AllowanceCharts* charts_ = nullptr;
  QComboBox* movement_box_ = nullptr;
  QComboBox* criterion_box_ = nullptr;
  QPushButton* band_ = nullptr;
  QPushButton* cancel_ = nullptr;
  QPushButton* apply_ = nullptr;
  QProgressBar* progress_ = nullptr;
  QLabel* status_ = nullptr;
  QLabel* notes_ = nullptr;
  QLabel* caution_ = nullptr;
};

}  // namespace sharpey::app
