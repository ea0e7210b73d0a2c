#include "view/comparison_view.h"

#include <QComboBox>
#include <QGridLayout>
#include <QHeaderView>
#include <QLabel>
#include <QPainter>
#include <QScrollBar>
#include <QSplitter>
#include <QTableWidget>
#include <QVBoxLayout>

#include "core/case_session.h"
#include "view/colour_bar.h"
#include "view/result_view.h"
#include "view/trend_plot.h"
#include "view/vtk_view.h"

namespace sharpey::app {

ComparisonView::ComparisonView(QWidget* parent) : QWidget(parent) {
  auto* outer = new QVBoxLayout(this);
  outer->setContentsMargins(0, 0, 0, 0);
  auto* options = new QHBoxLayout;
  options->setContentsMargins(4, 2, 4, 2);
  ViewOptionHandlers handlers;
  handlers.quantity = [this](Quantity q) {
    quantity_ = q;
    if (last_session_) show_session(*last_session_, last_force_text_);
  };
  handlers.bone = [this](BoneStyle style) {
    for (const Cell& c : cells_) c.view->set_bone_style(style);
  };
  handlers.section = [this](SectionPlane plane) {
    for (const Cell& c : cells_) c.view->set_section(plane);
  };
  const ViewOptionBoxes boxes = add_view_options(options, this, handlers);
  quantity_box_ = boxes.quantity;
  bone_box_ = boxes.bone;
  section_box_ = boxes.section;
  scale_box_ = new QComboBox;
  for (ScaleMode m : {ScaleMode::kShown, ScaleMode::kThresholds, ScaleMode::kPerLevel})
    scale_box_->addItem(
        m == ScaleMode::kShown ? QStringLiteral("scale: shared range shown") : label(m),
        static_cast<int>(m));
  scale_box_->setToolTip(
      QStringLiteral("One range for every level, one anchored to the physiological limit, or "
                     "each level on its own range (a healthy level is not washed out)"));
  connect(scale_box_, &QComboBox::currentIndexChanged, this, [this]() {
    scale_mode_ = static_cast<ScaleMode>(scale_box_->currentData().toInt());
    if (last_session_) show_session(*last_session_, last_force_text_);
  });
  options->addWidget(scale_box_);
  note_ = new QLabel(QStringLiteral("Cameras move together."));
  note_->setStyleSheet(QStringLiteral("color: #555;"));
  options->addSpacing(12);
  options->addWidget(note_, 1);
  outer->addLayout(options);

  auto* split = new QSplitter(Qt::Vertical);
  auto* top = new QWidget;
  auto* top_row = new QHBoxLayout(top);
  top_row->setContentsMargins(0, 0, 0, 0);
  top_row->setSpacing(0);
  grid_host_ = new QWidget;
  grid_ = new QGridLayout(grid_host_);
  grid_->setContentsMargins(0, 0, 0, 0);
  grid_->setSpacing(3);
  bar_ = new ColourBar;
  top_row->addWidget(grid_host_, 1);
  top_row->addWidget(bar_);
  split->addWidget(top);

  auto* bottom = new QSplitter(Qt::Horizontal);
  plot_ = new TrendPlot;
  table_widget_ = new QTableWidget;
  table_widget_->setEditTriggers(QAbstractItemView::NoEditTriggers);
  table_widget_->verticalHeader()->setVisible(true);
  // Compact rows, so the twelve numbers fit beside the plots without scrolling.
  table_widget_->verticalHeader()->setSectionResizeMode(QHeaderView::Fixed);
  table_widget_->verticalHeader()->setDefaultSectionSize(table_widget_->fontMetrics().height() + 6);
  table_widget_->setHorizontalScrollBarPolicy(Qt::ScrollBarAlwaysOff);
  bottom->addWidget(plot_);
  bottom->addWidget(table_widget_);
  bottom->setStretchFactor(0, 1);
  bottom->setStretchFactor(1, 0);
  bottom->setCollapsible(0, false);
  bottom->setCollapsible(1, false);
  split->addWidget(bottom);
  split->setStretchFactor(0, 3);
  split->setStretchFactor(1, 2);
  outer->addWidget(split, 1);
}

ComparisonView::~ComparisonView() = default;

ResultView* ComparisonView::view(int i) const { return cells_[static_cast<size_t>(i)].view; }

void ComparisonView::clear() {
  for (const Cell& c : cells_) c.box->deleteLater();
  cells_.clear();
  shown_.clear();
  last_session_ = nullptr;
  bar_->clear();
  table_ = ScenarioTable{};
  table_widget_->clear();
  table_widget_->setRowCount(0);
  table_widget_->setColumnCount(0);
  plot_->set_table(table_);
}

void ComparisonView::show_session(const CaseSession& session, const QString& force_text) {
  last_session_ = &session;
  last_force_text_ = force_text;
  const std::vector<int> wanted = compared_levels(session);
  if (wanted.size() != cells_.size()) make_cells(static_cast<int>(wanted.size()));
  shown_ = wanted;
  ValueRange band{0, 0};
  ValueRange range = shared_range(session, wanted, &band);
  const double limit_kpa = session.spec().thresholds.limit.value_kpa;
  const bool per_level = scale_mode_ == ScaleMode::kPerLevel;
  range = scale_range(scale_mode_, quantity_, range, range, limit_kpa);
  show_cells(session, force_text, per_level ? std::nullopt : std::optional<ValueRange>(range));
  bar_->setVisible(!per_level);  // per level: each cell shows its own bar
  const ColourScale scale(quantity_, range);
  bar_->set_scale(scale, label(quantity_), unit_label(quantity_));
  bar_->set_marks(threshold_marks(session.spec().thresholds, quantity_));
  bar_->set_note(band_note(range, band, unit_label(quantity_)));
  fill_table(session.results());
}

std::vector<int> ComparisonView::compared_levels(const CaseSession& session) {
  const int n_results = static_cast<int>(session.results().size());
  std::vector<int> wanted;
  for (int i : session.levels().compared())
    if (i < n_results) wanted.push_back(i);
  if (wanted.size() < 2) {  // fewer than two chosen: the first ones
    wanted.clear();
    for (int i = 0; i < std::min<int>(ScenarioList::kMaxCompared, n_results); ++i)
      wanted.push_back(i);
  }
  return wanted;
}

void ComparisonView::make_cells(int n) {
  for (const Cell& c : cells_) c.box->deleteLater();
  cells_.clear();
  const int columns = n <= 2 ? n : 2;
  for (int k = 0; k < n; ++k) {
    Cell cell;
    cell.box = new QWidget;
    auto* v = new QVBoxLayout(cell.box);
    v->setContentsMargins(0, 0, 0, 0);
    v->setSpacing(0);
    cell.title = new QLabel;
    cell.title->setAlignment(Qt::AlignCenter);
    cell.title->setStyleSheet(
        QStringLiteral("font-weight: bold; padding: 2px; background: #e6e2d8;"));
    cell.view = new ResultView;
    cell.view->set_options_visible(false);
    cell.view->set_bar_visible(false);
    cell.view->set_bone_style(static_cast<BoneStyle>(bone_box_->currentData().toInt()));
    cell.view->set_section(static_cast<SectionPlane>(section_box_->currentData().toInt()));
    v->addWidget(cell.title);
    v->addWidget(cell.view, 1);
    grid_->addWidget(cell.box, k / columns, k % columns);
    cells_.push_back(cell);
  }
  link_cameras();
}

ValueRange ComparisonView::shared_range(const CaseSession& session, const std::vector<int>& wanted,
                                        ValueRange* band_range) const {
  // One scale over every shown scenario, each range shown as the 3D view defines it
  // (core/quantity.h: outside the crest edge band).
  const auto& results = session.results();
  ValueRange range{0, 0}, band{0, 0};
  bool first = true;
  for (int i : wanted) {
    const auto* s = session.solution(i);
    if (!s) continue;
    const std::vector<double> values =
        quantity_values(results[static_cast<size_t>(i)], quantity_, s->pdl_nodes());
    const std::vector<char> in_band = analysis::pdl_crest_edge_band(*s);
    const ValueRange r = finite_range(values, in_band, false),
                     b = finite_range(values, in_band, true);
    range = first ? r : merge(range, r);
    band = first ? b : merge(band, b);
    first = false;
  }
  *band_range = band;
  return range;
}

void ComparisonView::show_cells(const CaseSession& session, const QString& force_text,
                                const std::optional<ValueRange>& shared) {
  const auto& results = session.results();
  for (size_t k = 0; k < shown_.size(); ++k) {
    const int i = shown_[k];
    const auto* s = session.solution(i);
    if (!s) continue;
    cells_[k].view->set_bar_visible(!shared);
    const auto& r = results[static_cast<size_t>(i)];
    cells_[k].title->setText(QStringLiteral("%1  \u2013  peak compression %2 kPa")
                                 .arg(QString::fromStdString(r.name))
                                 .arg(r.pressure_max_compression_kpa, 0, 'f', 1));
    cells_[k].view->set_quantity(quantity_);
    cells_[k].view->show_result(*s, r, session.spec().thresholds, force_text, shared);
  }
}

void ComparisonView::fill_table(const std::vector<analysis::ScenarioResult>& results) {
  table_ = make_table(results);
  plot_->set_table(table_);
  table_widget_->clear();
  table_widget_->setColumnCount(table_.row_names.size());
  table_widget_->setRowCount(static_cast<int>(table_.columns.size()));
  table_widget_->setHorizontalHeaderLabels(table_.row_names);
  QStringList rows;
  for (int c = 0; c < static_cast<int>(table_.columns.size()); ++c) rows << table_.header_text(c);
  table_widget_->setVerticalHeaderLabels(rows);
  for (int r = 0; r < table_.row_names.size(); ++r)
    for (int c = 0; c < static_cast<int>(table_.columns.size()); ++c) {
      auto* item = new QTableWidgetItem(table_.cell_text(r, c));
      item->setTextAlignment(Qt::AlignRight | Qt::AlignVCenter);
      table_widget_->setItem(c, r, item);
    }
  table_widget_->resizeColumnsToContents();
  fit_table_width();
}

void ComparisonView::fit_table_width() {
  // Never narrower than its names and numbers need (with room for a vertical scroll bar): the
  // trend plots beside it take what is left.
  int need = table_widget_->verticalHeader()->sizeHint().width() + 2 * table_widget_->frameWidth() +
             table_widget_->verticalScrollBar()->sizeHint().width() + 2;
  for (int c = 0; c < table_widget_->columnCount(); ++c) need += table_widget_->columnWidth(c);
  table_widget_->setMinimumWidth(need);
}

int ComparisonView::table_width_needed() const { return table_widget_->minimumWidth(); }

void ComparisonView::link_cameras() {
  for (size_t a = 0; a < cells_.size(); ++a) {
    VtkView* source = cells_[a].view->vtk_view();
    connect(source, &VtkView::camera_changed, this, [this, source]() {
      if (syncing_) return;
      syncing_ = true;
      for (const Cell& c : cells_)
        if (c.view->vtk_view() != source) c.view->vtk_view()->copy_camera_from(source->camera());
      syncing_ = false;
    });
  }
  // Start from the same camera.
  if (cells_.size() > 1)
    for (size_t a = 1; a < cells_.size(); ++a)
      cells_[a].view->vtk_view()->copy_camera_from(cells_[0].view->vtk_view()->camera());
}

void ComparisonView::set_scale_mode(ScaleMode mode) {
  scale_box_->setCurrentIndex(scale_box_->findData(static_cast<int>(mode)));
}

QImage ComparisonView::grab_views() {
  // Per level, every cell carries its own bar.
  if (!bar_->isVisible() && scale_mode_ == ScaleMode::kPerLevel)
    return grid_host_->grab().toImage();
  return bar_->beside(grid_host_->grab().toImage(), palette().window().color());
}

}  // namespace sharpey::app
