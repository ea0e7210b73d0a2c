// Bone-level comparison: two to four scenarios side by side with linked cameras and one colour
// scale, then the trend plots and the table of key numbers against bone loss.
#pragma once

#include <QImage>
#include <QWidget>
#include <optional>
#include <vector>

#include "core/quantity.h"
#include "core/scenario_table.h"
#include "view/model_scene.h"
#include "view/result_view.h"

class QComboBox;
class QGridLayout;
class QLabel;
class QTableWidget;

namespace sharpey::app {

class CaseSession;
class ColourBar;
class ResultView;
class TrendPlot;

class ComparisonView : public QWidget {
  Q_OBJECT

 public:
  explicit ComparisonView(QWidget* parent = nullptr);
  ~ComparisonView() override;

  // Shows the compared scenarios of the session (its choice of two to four) and the table of all.
  void show_session(const CaseSession& session, const QString& force_text);
  void clear();

  Quantity quantity() const { return quantity_; }
  // How the cells' colour range is chosen: shared (kShown), anchored to the limit, or per level.
  void set_scale_mode(ScaleMode mode);
  ScaleMode scale_mode() const { return scale_mode_; }
  int n_views() const { return static_cast<int>(cells_.size()); }
  ResultView* view(int i) const;
  ColourBar* shared_bar() const { return bar_; }
  // The options row's boxes: they act on every cell.
  ViewOptionBoxes option_boxes() const { return {quantity_box_, bone_box_, section_box_}; }
  const ScenarioTable& table() const { return table_; }
  TrendPlot* plot() const { return plot_; }
  QTableWidget* key_number_table() const { return table_widget_; }
  // The width the key-number table needs for its names and numbers (its minimum width).
  int table_width_needed() const;
  // The side-by-side views with the shared colour bar, as shown.
  QImage grab_views();

 private:
  // show_session's steps.
  // The levels to show: the session's choice, or the first ones when fewer than two are chosen.
  static std::vector<int> compared_levels(const CaseSession& session);
  void make_cells(int n);  // n cells in a grid of two columns, cameras linked
  // The quantity's range over the `wanted` levels outside the crest edge band, and in
  // `band_range` the range inside it.
  ValueRange shared_range(const CaseSession& session, const std::vector<int>& wanted,
                          ValueRange* band_range) const;
  // The shown levels in their cells; `shared`: the one colour range (none: per level).
  void show_cells(const CaseSession& session, const QString& force_text,
                  const std::optional<ValueRange>& shared);
  void fill_table(const std::vector<analysis::ScenarioResult>& results);
  void fit_table_width();
  void link_cameras();
  struct Cell {
    QWidget* box;
    QLabel* title;
    ResultView* view;
  };
  std::vector<Cell> cells_;
  std::vector<int> shown_;  // result indices in the cells
  QWidget* grid_host_ = nullptr;
  QGridLayout* grid_ = nullptr;
  ColourBar* bar_ = nullptr;
  QComboBox* quantity_box_ = nullptr;
  QComboBox* bone_box_ = nullptr;
  QComboBox* section_box_ = nullptr;
  QLabel* note_ = nullptr;
  TrendPlot* plot_ = nullptr;
  QTableWidget* table_widget_ = nullptr;
  ScenarioTable table_;
  Quantity quantity_ = Quantity::kPressure;
  QComboBox* scale_box_ = nullptr;
  ScaleMode scale_mode_ = ScaleMode::kShown;
  bool syncing_ = false;
  const CaseSession* last_session_ = nullptr;
  QString last_force_text_;
};

}  // namespace sharpey::app
