#include "view/molar_window.h"

#include <QAction>
#include <QComboBox>
#include <QDir>
#include <QFileDialog>
#include <QFileInfo>
#include <QHeaderView>
#include <QLabel>
#include <QListWidget>
#include <QMenuBar>
#include <QMessageBox>
#include <QSplitter>
#include <QStandardPaths>
#include <QStatusBar>
#include <QTableWidget>
#include <QThread>
#include <QVBoxLayout>
#include <algorithm>

#include "core/units.h"
#include "sharpey/error.h"
#include "view/caution_label.h"
#include "view/molar_root_maps.h"
#include "view/molar_scene.h"
#include "view/report_writer.h"
#include "view/vtk_view.h"

namespace sharpey::app {

namespace {

QLabel* section_title(const QString& text) {
  auto* label = new QLabel(QStringLiteral("<b>%1</b>").arg(text));
  label->setWordWrap(true);
  return label;
}

QTableWidget* new_table() {
  auto* table = new QTableWidget;
  table->setEditTriggers(QAbstractItemView::NoEditTriggers);
  table->setSelectionMode(QAbstractItemView::NoSelection);
  table->verticalHeader()->setSectionResizeMode(QHeaderView::ResizeToContents);
  table->horizontalHeader()->setSectionResizeMode(QHeaderView::ResizeToContents);
  table->setWordWrap(false);
  table->setHorizontalScrollBarPolicy(Qt::ScrollBarAlwaysOff);
  table->setVerticalScrollBarPolicy(Qt::ScrollBarAlwaysOff);
  return table;
}

// The shared colour scale of a scenario: its root map cells' range.
ColourScale scenario_scale(const analysis::MultiRootScenarioResult& r) {
  std::vector<double> values;
  for (const analysis::MultiRootMapCell& c : r.root_map) values.push_back(c.pressure_kpa);
  return ColourScale(Quantity::kPressure, finite_range(values));
}

}  // namespace

void fill_molar_table(QTableWidget* table, const MolarTable& t) {
  table->clear();
  table->setColumnCount(static_cast<int>(t.columns.size()));
  table->setRowCount(static_cast<int>(t.rows.size()));
  table->setHorizontalHeaderLabels(t.columns);
  QStringList names;
  for (size_t r = 0; r < t.rows.size(); ++r) {
    names << t.rows[r].name;
    for (size_t c = 0; c < t.rows[r].values.size(); ++c) {
      const double v = t.rows[r].values[c];
      auto* item = new QTableWidgetItem(molar_cell_text(v, t.decimals_at(r, c)));
      item->setData(Qt::UserRole, v);
      item->setTextAlignment(Qt::AlignRight | Qt::AlignVCenter);
      table->setItem(static_cast<int>(r), static_cast<int>(c), item);
    }
  }
  table->setVerticalHeaderLabels(names);
  table->resizeColumnsToContents();
  table->resizeRowsToContents();
  int height = table->horizontalHeader()->sizeHint().height() + 2 * table->frameWidth() + 4;
  for (int r = 0; r < table->rowCount(); ++r) height += table->rowHeight(r);
  table->setFixedHeight(height);
}

MolarWindow::MolarWindow(QWidget* parent) : QMainWindow(parent) {
  setWindowFlag(Qt::Window);
  setWindowTitle(QStringLiteral("Sharpey: multi-rooted tooth"));
  auto* central = new QWidget;
  auto* outer = new QVBoxLayout(central);
  outer->setContentsMargins(4, 4, 4, 4);
  header_ = new QLabel;
  header_->setWordWrap(true);
  header_->setTextFormat(Qt::RichText);
  outer->addWidget(header_);
  auto* split = new QSplitter(Qt::Horizontal);
  split->addWidget(build_left());
  split->addWidget(build_middle());
  split->addWidget(build_right());
  split->setStretchFactor(1, 1);
  split->setSizes({250, 760, 480});
  outer->addWidget(split, 1);
  caution_ = new_caution_label();
  outer->addWidget(caution_);
  setCentralWidget(central);
  build_menu();
  resize(1500, 940);
}

// A background evaluation cannot be interrupted (the library takes no cancel flag here): wait for
// it, at most a few tens of seconds for a finite-element case.
MolarWindow::~MolarWindow() {
  for (QThread* t : workers_) {
    t->wait();
    delete t;
  }
}

void MolarWindow::build_menu() {
  QMenu* file = menuBar()->addMenu(QStringLiteral("&File"));
  QAction* report = file->addAction(QStringLiteral("Export PDF &report…"));
  report->setShortcut(QKeySequence(Qt::CTRL | Qt::Key_R));
  connect(report, &QAction::triggered, this, &MolarWindow::export_report_dialog);
  QAction* close_action = file->addAction(QStringLiteral("&Close"));
  close_action->setShortcut(QKeySequence::Close);
  connect(close_action, &QAction::triggered, this, &QWidget::close);
}

QWidget* MolarWindow::build_left() {
  auto* left = new QWidget;
  auto* col = new QVBoxLayout(left);
  col->addWidget(section_title(QStringLiteral("Scenarios")));
  scenarios_ = new QListWidget;
  scenarios_->setToolTip(QStringLiteral("Bone scenario shown in the 3D view, maps and tables"));
  col->addWidget(scenarios_, 1);
  col->addWidget(section_title(QStringLiteral("Force unit")));
  unit_box_ = new QComboBox;
  for (analysis::ForceUnit u : {analysis::ForceUnit::kGram, analysis::ForceUnit::kCentinewton,
                                analysis::ForceUnit::kNewton})
    unit_box_->addItem(force_unit_label(u), static_cast<int>(u));
  col->addWidget(unit_box_);
  connect(scenarios_, &QListWidget::currentRowChanged, this, [this](int row) {
    if (row >= 0) show_scenario(row);
  });
  connect(unit_box_, &QComboBox::currentIndexChanged, this, [this](int) {
    set_force_unit(static_cast<analysis::ForceUnit>(unit_box_->currentData().toInt()));
  });
  return left;
}

QWidget* MolarWindow::build_middle() {
  auto* split = new QSplitter(Qt::Vertical);
  view_ = new VtkView;
  view_->setMinimumSize(360, 300);
  scene_ = std::make_unique<MolarScene>(view_);
  maps_ = new MolarRootMaps;
  split->addWidget(view_);
  split->addWidget(maps_);
  split->setSizes({470, 360});
  return split;
}

QWidget* MolarWindow::build_right() {
  auto* right = new QWidget;
  auto* col = new QVBoxLayout(right);
  col->addWidget(section_title(QStringLiteral("Per root, under the case's load")));
  root_table_ = new_table();
  col->addWidget(root_table_);
  col->addWidget(section_title(QStringLiteral("Centre of resistance (CRes)")));
  cres_table_ = new_table();
  col->addWidget(cres_table_);
  col->addWidget(section_title(QStringLiteral("Allowance of each molar movement")));
  allowance_table_ = new_table();
  col->addWidget(allowance_table_);
  fe_title_ = section_title(QStringLiteral("Finite elements (coarse mesh), beside the estimate"));
  col->addWidget(fe_title_);
  fe_table_ = new_table();
  col->addWidget(fe_table_);
  fe_area_table_ = new_table();
  col->addWidget(fe_area_table_);
  col->addStretch(1);
  return right;
}

bool MolarWindow::open(const QString& path, QString* error) {
  analysis::MultiRootCase spec;
  analysis::MultiRootCaseResult result;
  ++generation_;
  pending_ = 0;
  try {
    spec = analysis::load_multi_root_case(path.toStdString());
    if (spec.finite_elements) {
      evaluate_in_background(spec, path);
      return true;
    }
    result = analysis::evaluate_multi_root_case(spec);
  } catch (const Error& e) {
    if (error) *error = QString::fromStdString(e.what());
    return false;
  }
  show_case(spec, result, path);
  return true;
}

// Meshing and solving every scenario takes seconds each: on a worker thread, the window usable
// meanwhile; its result is shown only if no other case was opened since.
void MolarWindow::evaluate_in_background(const analysis::MultiRootCase& spec, const QString& path) {
  const int generation = generation_;
  pending_ = 1;
  statusBar()->showMessage(QStringLiteral("%1: meshing and solving %2 scenario(s) with finite "
                                          "elements (about 10 s each)…")
                               .arg(QFileInfo(path).fileName())
                               .arg(spec.scenarios.size()));
  auto result = std::make_shared<analysis::MultiRootCaseResult>();
  auto message = std::make_shared<QString>();
  QThread* worker = QThread::create([spec, result, message]() {
    try {
      *result = analysis::evaluate_multi_root_case(spec);
    } catch (const Error& e) {
      *message = QString::fromStdString(e.what());
    }
  });
  workers_.push_back(worker);
  connect(worker, &QThread::finished, this, [=]() {
    workers_.erase(std::find(workers_.begin(), workers_.end(), worker));
    worker->deleteLater();
    if (generation != generation_) return;
    pending_ = 0;
    if (!message->isEmpty()) {
      statusBar()->showMessage(*message);
      emit failed(*message);
      return;
    }
    show_case(spec, *result, path);
    emit evaluated();
  });
  worker->start();
}

void MolarWindow::show_case(const analysis::MultiRootCase& spec,
                            const analysis::MultiRootCaseResult& result, const QString& path) {
  spec_ = spec;
  result_ = result;
  case_file_ = QFileInfo(path).fileName();
  setWindowTitle(QStringLiteral("Sharpey: %1 (multi-rooted tooth)").arg(case_file_));
  header_->setText(QStringLiteral("<b>%1</b><br>%2<br><i>%3.</i>")
                       .arg(QString::fromStdString(spec_.label).toHtmlEscaped(),
                            describe_molar_case(spec_).toHtmlEscaped(), molar_method_label()));
  const QSignalBlocker block_list(scenarios_);
  const QSignalBlocker block_unit(unit_box_);
  scenarios_->clear();
  for (const analysis::MultiRootScenario& s : spec_.scenarios)
    scenarios_->addItem(QString::fromStdString(s.name));
  unit_ = molar_case_force_unit(spec_);
  unit_box_->setCurrentIndex(unit_box_->findData(static_cast<int>(unit_)));
  current_ = 0;
  scenarios_->setCurrentRow(0);
  refresh();
  statusBar()->showMessage(
      QStringLiteral("%1 scenario(s) evaluated by the thin-layer estimate%2.")
          .arg(result_.scenarios.size())
          .arg(spec_.finite_elements ? QStringLiteral(" and by finite elements") : QString()));
}

void MolarWindow::show_scenario(int index) {
  if (index < 0 || index >= static_cast<int>(result_.scenarios.size())) return;
  current_ = index;
  if (scenarios_->currentRow() != index) {
    const QSignalBlocker block(scenarios_);
    scenarios_->setCurrentRow(index);
  }
  refresh();
}

void MolarWindow::set_force_unit(analysis::ForceUnit unit) {
  unit_ = unit;
  const int i = unit_box_->findData(static_cast<int>(unit));
  if (unit_box_->currentIndex() != i) {
    const QSignalBlocker block(unit_box_);
    unit_box_->setCurrentIndex(i);
  }
  refresh();
}

void MolarWindow::refresh() {
  if (!has_case()) return;
  const analysis::MultiRootScenarioResult& r = result_.scenarios[static_cast<size_t>(current_)];
  fill_molar_table(root_table_, molar_root_table(r, spec_.thresholds, unit_));
  fill_molar_table(cres_table_, molar_cres_table(r));
  fill_molar_table(allowance_table_, molar_allowance_table(r, spec_.thresholds, unit_));
  fill_molar_table(fe_table_, molar_fe_table(r));
  fill_molar_table(fe_area_table_, molar_fe_area_table(r, spec_.thresholds, spec_.movement, unit_));
  fe_title_->setVisible(r.has_finite_elements);
  fe_table_->setVisible(r.has_finite_elements);
  fe_area_table_->setVisible(r.has_finite_elements);
  const QString name = QString::fromStdString(r.name);
  maps_->set_maps(molar_map_parts(result_.tooth, r.root_map), spec_.thresholds,
                  QStringLiteral("Root maps, %1: largest pressure per 30° by 1 mm cell "
                                 "(thin-layer estimate)")
                      .arg(name));
  scene_->show(r, scenario_scale(r), QStringLiteral("Root surface, %1").arg(name));
}

QImage MolarWindow::view_image() { return view_->grab().toImage(); }

bool MolarWindow::export_report(const QString& path, QString* error) {
  MolarReportInputs in;
  in.spec = &spec_;
  in.result = &result_;
  in.unit = unit_;
  in.case_file = case_file_;
  // Each scenario's 3D view, then back to the one on display.
  const int shown = current_;
  for (int k = 0; k < static_cast<int>(result_.scenarios.size()); ++k) {
    show_scenario(k);
    in.views.push_back(view_image());
  }
  show_scenario(shown);
  const int pages = write_molar_report(path, in, error);
  if (pages != molar_report_page_count(in)) return false;
  statusBar()->showMessage(QStringLiteral("Report written to %1.").arg(path));
  return true;
}

void MolarWindow::export_report_dialog() {
  if (!has_case()) return;
  const QString documents = QStandardPaths::writableLocation(QStandardPaths::DocumentsLocation);
  const QString suggested =
      QDir(documents).filePath(QFileInfo(case_file_).completeBaseName() + QStringLiteral(".pdf"));
  const QString path = QFileDialog::getSaveFileName(this, QStringLiteral("Export PDF report"),
                                                    suggested, QStringLiteral("PDF (*.pdf)"));
  if (path.isEmpty()) return;
  QString error;
  if (!export_report(path, &error))
    QMessageBox::warning(this, QStringLiteral("Could not write the report"), error);
}

}  // namespace sharpey::app
