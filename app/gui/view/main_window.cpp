#include "view/main_window.h"

#include <QAction>
#include <QApplication>
#include <QCloseEvent>
#include <QComboBox>
#include <QCoreApplication>
#include <QDialog>
#include <QDir>
#include <QFileDialog>
#include <QFileInfo>
#include <QHBoxLayout>
#include <QKeySequence>
#include <QLabel>
#include <QMenu>
#include <QMenuBar>
#include <QPainter>
#include <QProgressBar>
#include <QScrollArea>
#include <QSettings>
#include <QSplitter>
#include <QStandardPaths>
#include <QStatusBar>
#include <QTabWidget>
#include <QTextBrowser>
#include <QTimer>
#include <QToolBar>
#include <QToolBox>
#include <QToolButton>
#include <QVBoxLayout>

#include "core/allowance_job.h"
#include "core/autosave_store.h"
#include "core/case_session.h"
#include "core/document_state.h"
#include "core/help_text.h"
#include "core/solution_cache_folder.h"
#include "core/solve_job.h"
#include "core/units.h"
#include "sharpey/analysis/multi_root_case.h"
#include "sharpey/error.h"
#include "sharpey/output/report_output.h"
#include "view/allowance_view.h"
#include "view/case_panel.h"
#include "view/caution_label.h"
#include "view/comparison_view.h"
#include "view/findings_panel.h"
#include "view/icons.h"
#include "view/import_dialog.h"
#include "view/load_panel.h"
#include "view/molar_window.h"
#include "view/report_writer.h"
#include "view/result_view.h"
#include "view/root_map_view.h"
#include "view/vtk_view.h"

namespace sharpey::app {

QString samples_folder() {
  const QByteArray env = qgetenv("SHARPEY_SAMPLES_DIR");
  if (!env.isEmpty()) return QString::fromLocal8Bit(env);
  const QString installed = QDir(QCoreApplication::applicationDirPath())
                                .filePath(QStringLiteral("../share/sharpey/samples"));
  if (QFileInfo::exists(installed)) return QDir::cleanPath(installed);
  return QStringLiteral(SHARPEY_SOURCE_DIR "/samples");
}

namespace {
const char* const kRecentKey = "recent_files";

QString autosave_default_folder() {
  return QDir(QStandardPaths::writableLocation(QStandardPaths::AppDataLocation))
      .filePath(QStringLiteral("autosave"));
}
}  // namespace

MainWindow::MainWindow(const MainWindowOptions& options)
    : options_(options),
      session_(std::make_unique<CaseSession>()),
      job_(std::make_unique<SolveJob>()),
      autosave_(std::make_unique<AutosaveStore>(options.autosave_folder.isEmpty()
                                                    ? autosave_default_folder()
                                                    : options.autosave_folder)) {
  setWindowIcon(make_icon(IconKind::kApp));
  build_layout();
  build_menus();
  connect_session();
  job_->set_cache(make_solution_cache(options.solution_cache_folder));

  connect_solve_job();
  auto* autosave_timer = new QTimer(this);
  connect(autosave_timer, &QTimer::timeout, this, &MainWindow::autosave_now);
  autosave_timer->start(options_.autosave_interval_ms);

  restore_recent_files();
  case_panel_->reload();
  load_panel_->set_controls(session_->load_controls());
  refresh_title();
  resize(1480, 920);
}

MainWindow::~MainWindow() {
  job_->cancel();
  job_.reset();  // joins the worker before the session goes
}

// The solve job's progress, levels and end, shown as they come.
void MainWindow::connect_solve_job() {
  connect(job_.get(), &SolveJob::progress, this, [this](const QString& stage, double fraction) {
    progress_->setValue(static_cast<int>(1000 * fraction));
    // Once levels are shown, say how many while the others are solved.
    const auto study = job_->study();
    const QString shown = study ? QStringLiteral("%1 of %2 bone levels shown; ")
                                      .arg(study->solutions().size())
                                      .arg(study->spec().scenarios.size())
                                : QString();
    status_->setText(shown.isEmpty() ? QStringLiteral("Meshing and solving: ") + stage
                                     : shown + QStringLiteral("meshing and solving: ") + stage);
  });
  // Each bone level is shown as soon as it is solved; the level selector and the comparison list
  // the solved ones.
  connect(job_.get(), &SolveJob::level_solved, this, [this](int index, int count) {
    if (discard_job_) return;
    session_->set_study(job_->study(), solve_geometry_);
    if (index + 1 < count)
      status_->setText(QStringLiteral("%1 of %2 bone levels shown; the others follow.")
                           .arg(index + 1)
                           .arg(count));
  });
  connect(job_.get(), &SolveJob::finished, this, [this]() {
    if (end_discarded_job()) return;
    set_solving_ui(false);
    const auto study = job_->take_result();
    if (study && session_->study() != study.get()) session_->set_study(study, solve_geometry_);
    // Say where the levels came from, and why a saved one could not be used.
    QString text = QStringLiteral("Solved %1 bone level(s).").arg(session_->results().size());
    const int from_cache = job_->levels_from_cache();
    if (from_cache > 0 && job_->levels_solved() == 0)
      text = QStringLiteral("%1 bone level(s) shown from the saved solutions; nothing solved.")
                 .arg(from_cache);
    else if (from_cache > 0)
      text = QStringLiteral("Solved %1 bone level(s); %2 shown from the saved solutions.")
                 .arg(job_->levels_solved())
                 .arg(from_cache);
    const QString notes = job_->cache_notes();
    if (!notes.isEmpty())
      text += QStringLiteral(" Saved solution not used or not saved (") +
              notes.split(QLatin1Char('\n')).join(QStringLiteral("; ")) + QStringLiteral(").");
    status_->setText(text);
    emit solve_finished();
  });
  // Levels solved before a cancel or a failure stay shown.
  auto partial_note = [this](bool failed) {
    const auto study = job_->take_result();
    if (!study) return QStringLiteral("the previous results (if any) are still shown.");
    return QStringLiteral("%1 of %2 bone levels solved and shown; %3")
        .arg(study->solutions().size())
        .arg(study->spec().scenarios.size())
        .arg(failed ? QStringLiteral("correct the level the message names before solving again.")
                    : QStringLiteral("solve again (F5) for the rest."));
  };
  connect(job_.get(), &SolveJob::cancelled, this, [this, partial_note]() {
    if (end_discarded_job()) return;
    set_solving_ui(false);
    status_->setText(QStringLiteral("Solve cancelled; ") + partial_note(false));
    emit solve_failed(QStringLiteral("cancelled"));
  });
  connect(job_.get(), &SolveJob::failed, this,
          [this, partial_note](const QString& kind, const QString& message) {
            if (end_discarded_job()) return;
            set_solving_ui(false);
            status_->setText(QStringLiteral("Solve failed (%1); ").arg(kind) + partial_note(true));
            show_error(QStringLiteral("Could not mesh and solve the case"),
                       QStringLiteral("The %1 step stopped:\n\n%2").arg(kind, message));
            emit solve_failed(message);
          });
}

// The recent-files list as saved, without the files that have gone.
void MainWindow::restore_recent_files() {
  QSettings settings;
  RecentFiles recent;
  recent.set_paths(settings.value(QLatin1String(kRecentKey)).toStringList());
  recent.remove_missing();
  settings.setValue(QLatin1String(kRecentKey), recent.paths());
  refresh_recent_menu();
}

// ---------------------------------------------------------------------------------------------
// Layout

namespace {
QScrollArea* scrolled(QWidget* w) {
  auto* scroll = new QScrollArea;
  scroll->setWidget(w);
  scroll->setWidgetResizable(true);
  scroll->setFrameShape(QFrame::NoFrame);
  return scroll;
}
}  // namespace

void MainWindow::build_layout() {
  auto* central = new QWidget;
  auto* outer = new QVBoxLayout(central);
  outer->setContentsMargins(4, 4, 4, 4);
  outer->setSpacing(4);
  auto* split = new QSplitter(Qt::Horizontal);
  split->addWidget(build_left_panels());
  split->addWidget(build_views());
  // Right: findings.
  findings_ = new FindingsPanel;
  auto* right = scrolled(findings_);
  right->setMinimumWidth(300);
  split->addWidget(right);
  split->setStretchFactor(0, 0);
  split->setStretchFactor(1, 1);
  split->setStretchFactor(2, 0);
  split->setSizes({340, 820, 320});
  outer->addWidget(split, 1);

  // The caution, always visible.
  caution_ = new_caution_label();
  outer->addWidget(caution_);
  setCentralWidget(central);

  build_status_bar();
  connect_layout();
}

// Left: force system first (used most), then the case.
QWidget* MainWindow::build_left_panels() {
  auto* left = new QToolBox;
  load_panel_ = new LoadPanel;
  case_panel_ = new CasePanel(session_.get());
  left->addItem(scrolled(load_panel_), QStringLiteral("Force system"));
  left->addItem(scrolled(case_panel_), QStringLiteral("Case and bone levels"));
  left->setMinimumWidth(320);
  left_panels_ = left;
  return left;
}

// Middle: which bone level, then the views.
QWidget* MainWindow::build_views() {
  auto* middle = new QWidget;
  auto* mid = new QVBoxLayout(middle);
  mid->setContentsMargins(0, 0, 0, 0);
  auto* choice = new QHBoxLayout;
  scenario_box_ = new QComboBox;
  scenario_box_->setMinimumWidth(160);
  scenario_box_->setToolTip(
      QStringLiteral("Bone level shown in the 3D view, the root map and the findings"));
  load_summary_ = new QLabel;
  load_summary_->setStyleSheet(QStringLiteral("color: #3b4652;"));
  choice->addWidget(new QLabel(QStringLiteral("<b>Bone level</b>")));
  choice->addWidget(scenario_box_);
  choice->addSpacing(16);
  choice->addWidget(load_summary_, 1);
  mid->addLayout(choice);
  tabs_ = new QTabWidget;
  result_view_ = new ResultView;
  root_map_ = new RootMapView;
  comparison_ = new ComparisonView;
  tabs_->addTab(result_view_, QStringLiteral("3D"));
  tabs_->addTab(root_map_, QStringLiteral("Root map"));
  tabs_->addTab(comparison_, QStringLiteral("Bone levels compared"));
  // Force allowance: follows the session itself; its apply button sets the force panel.
  allowance_ = new AllowanceView(session_.get());
  tabs_->addTab(allowance_, QStringLiteral("Force allowance"));
  connect(allowance_, &AllowanceView::apply_requested, this, [this](const LoadControls& c) {
    load_panel_->set_controls(c);
    set_load(c, false);
  });
  mid->addWidget(tabs_, 1);

  return middle;
}

// The status line, the hover read-out, the progress bar and the cancel button.
void MainWindow::build_status_bar() {
  status_ = new QLabel(QStringLiteral("Ready."));
  progress_ = new QProgressBar;
  progress_->setRange(0, 1000);
  progress_->setMaximumWidth(260);
  progress_->setTextVisible(true);
  progress_->setFormat(QStringLiteral("%p %"));
  cancel_ = new QToolButton;
  cancel_->setIcon(make_icon(IconKind::kCancel));
  cancel_->setText(QStringLiteral("Cancel"));
  cancel_->setToolButtonStyle(Qt::ToolButtonTextBesideIcon);
  cancel_->setToolTip(QStringLiteral("Stop meshing and solving"));
  statusBar()->addWidget(status_, 1);
  // Hover read-out of the 3D view and the root map: value with unit, depth below the CEJ, side.
  hover_ = new QLabel;
  hover_->setObjectName(QStringLiteral("hover_readout"));
  hover_->setTextFormat(Qt::PlainText);
  statusBar()->addPermanentWidget(hover_);
  connect(result_view_, &ResultView::hover_changed, hover_, &QLabel::setText);
  // Another quantity chosen right after a drag: the fields left out then are evaluated now.
  connect(result_view_, &ResultView::quantity_changed, this, [this]() {
    if (session_->fields_pending()) session_->flush();
  });
  connect(root_map_, &RootMapView::hover_changed, hover_, &QLabel::setText);
  statusBar()->addPermanentWidget(progress_);
  statusBar()->addPermanentWidget(cancel_);
  progress_->hide();
  cancel_->hide();
  connect(cancel_, &QToolButton::clicked, this, &MainWindow::cancel_solve);
}

void MainWindow::connect_layout() {
  connect(scenario_box_, &QComboBox::currentIndexChanged, this, [this](int index) {
    if (index >= 0) session_->set_current(index);
  });
  connect(load_panel_, &LoadPanel::changed, this, &MainWindow::set_load);
  connect(case_panel_, &CasePanel::solve_requested, this, &MainWindow::solve);
  connect(case_panel_, &CasePanel::edit_refused, this, &MainWindow::show_error);
  connect(case_panel_, &CasePanel::comparison_changed, this, [this]() {
    comparison_dirty_ = true;
    refresh_comparison();
  });
  connect(tabs_, &QTabWidget::currentChanged, this, [this]() {
    refresh_root_map();
    refresh_comparison();
  });
}

void MainWindow::build_menus() {
  QMenu* file = menuBar()->addMenu(QStringLiteral("&File"));
  const QList<QAction*> file_actions = build_file_menu(file);  // new, open, save
  QMenu* exports = file->addMenu(QStringLiteral("&Export"));
  const QList<QAction*> export_actions = build_export_menu(exports);  // image, report, data
  file->addSeparator();
  QAction* quit = file->addAction(QStringLiteral("&Quit"), this, &QWidget::close);
  quit->setShortcut(QKeySequence::Quit);

  QMenu* run = menuBar()->addMenu(QStringLiteral("&Solve"));
  QAction* solve_action = run->addAction(
      make_icon(IconKind::kSolve), QStringLiteral("&Mesh and solve"), this, &MainWindow::solve);
  solve_action->setShortcut(QKeySequence(Qt::Key_F5));
  run->addAction(make_icon(IconKind::kCancel), QStringLiteral("&Cancel"), this,
                 &MainWindow::cancel_solve);

  QMenu* view = menuBar()->addMenu(QStringLiteral("&View"));
  view->addAction(QStringLiteral("&3D"), this, [this]() { show_view(ViewKind::k3D); })
      ->setShortcut(QKeySequence(Qt::CTRL | Qt::Key_1));
  view->addAction(QStringLiteral("&Root map"), this, [this]() { show_view(ViewKind::kRootMap); })
      ->setShortcut(QKeySequence(Qt::CTRL | Qt::Key_2));
  view->addAction(QStringLiteral("&Bone levels compared"), this,
                  [this]() { show_view(ViewKind::kComparison); })
      ->setShortcut(QKeySequence(Qt::CTRL | Qt::Key_3));

  build_help_menu();
  build_toolbar(file_actions, solve_action, export_actions);
}

// File: new, open, samples, import, recent, save, save as. Returns new, open and save.
QList<QAction*> MainWindow::build_file_menu(QMenu* file) {
  QAction* new_action =
      file->addAction(make_icon(IconKind::kNew), QStringLiteral("&New case"), this, [this]() {
        if (maybe_save()) new_case();
      });
  new_action->setShortcut(QKeySequence::New);
  QAction* open_action = file->addAction(
      make_icon(IconKind::kOpen), QStringLiteral("&Open case\u2026"), this, [this]() {
        if (!maybe_save()) return;
        const QString path =
            QFileDialog::getOpenFileName(this, QStringLiteral("Open case"), samples_folder(),
                                         QStringLiteral("Sharpey cases (*.json)"));
        if (!path.isEmpty()) open_case(path);
      });
  open_action->setShortcut(QKeySequence::Open);
  samples_menu_ = file->addMenu(QStringLiteral("Open &sample"));
  const QDir samples(samples_folder());
  for (const QString& name :
       samples.entryList({QStringLiteral("*.json")}, QDir::Files, QDir::Name)) {
    const QString path = samples.filePath(name);
    samples_menu_->addAction(QFileInfo(name).completeBaseName().replace('_', ' '), this,
                             [this, path]() {
                               if (open_keeps_case(path) || maybe_save()) open_case(path);
                             });
  }
  samples_menu_->setEnabled(!samples_menu_->isEmpty());
  file->addAction(QStringLiteral("&Import tooth surface\u2026"), this, [this]() {
    if (maybe_save()) import_surface();
  });
  recent_menu_ = file->addMenu(QStringLiteral("Open &recent"));
  file->addSeparator();
  QAction* save_action = file->addAction(make_icon(IconKind::kSave), QStringLiteral("&Save"), this,
                                         [this]() { save(); });
  save_action->setShortcut(QKeySequence::Save);
  QAction* save_as_action = file->addAction(QStringLiteral("Save &as\u2026"), this, [this]() {
    const QString path = QFileDialog::getSaveFileName(
        this, QStringLiteral("Save case as"), suggested_path(file_stem() + QStringLiteral(".json")),
        QStringLiteral("Sharpey cases (*.json)"));
    if (!path.isEmpty())
      save_as(path.endsWith(QStringLiteral(".json")) ? path : path + QStringLiteral(".json"));
  });
  save_as_action->setShortcut(QKeySequence::SaveAs);
  file->addSeparator();
  return {new_action, open_action, save_action};
}

// File > Export: image, PDF report, data. Returns the three actions.
QList<QAction*> MainWindow::build_export_menu(QMenu* exports) {
  QAction* image_action = exports->addAction(
      make_icon(IconKind::kImage), QStringLiteral("&Image of the current view (PNG)\u2026"), this,
      [this]() {
        const ViewKind which = tabs_->currentIndex() == 1   ? ViewKind::kRootMap
                               : tabs_->currentIndex() == 2 ? ViewKind::kComparison
                                                            : ViewKind::k3D;
        const QString path =
            QFileDialog::getSaveFileName(this, QStringLiteral("Export image"),
                                         suggested_path(file_stem() + QStringLiteral(".png")),
                                         QStringLiteral("PNG images (*.png)"));
        if (!path.isEmpty())
          export_image(path.endsWith(QStringLiteral(".png")) ? path : path + QStringLiteral(".png"),
                       which);
      });
  QAction* report_action = exports->addAction(
      make_icon(IconKind::kReport), QStringLiteral("&PDF report\u2026"), this, [this]() {
        const QString path = QFileDialog::getSaveFileName(
            this, QStringLiteral("Export PDF report"),
            suggested_path(file_stem() + QStringLiteral("_report.pdf")),
            QStringLiteral("PDF documents (*.pdf)"));
        if (!path.isEmpty())
          export_report(path.endsWith(QStringLiteral(".pdf")) ? path
                                                              : path + QStringLiteral(".pdf"));
      });
  QAction* data_action = exports->addAction(
      make_icon(IconKind::kExportData), QStringLiteral("&Results as CSV, JSON and VTU\u2026"), this,
      [this]() {
        const QString folder = QFileDialog::getExistingDirectory(
            this, QStringLiteral("Export results to folder"), suggested_path(QString()));
        if (!folder.isEmpty()) export_data(folder);
      });
  return {image_action, report_action, data_action};
}

void MainWindow::build_help_menu() {
  QMenu* help = menuBar()->addMenu(QStringLiteral("&Help"));
  help->addAction(QStringLiteral("&What the numbers mean"), this, [this]() {
    auto* dialog = new QDialog(this);
    dialog->setAttribute(Qt::WA_DeleteOnClose);
    dialog->setWindowTitle(QStringLiteral("What the numbers mean"));
    auto* layout = new QVBoxLayout(dialog);
    auto* text = new QTextBrowser;
    text->setHtml(help_html(session_->spec().thresholds));
    layout->addWidget(text);
    dialog->resize(640, 720);
    dialog->show();
  });
  help->addAction(QStringLiteral("&Reading the results"), this, [this]() {
    QMessageBox::information(
        this, QStringLiteral("Reading the results"),
        QStringLiteral(
            "Colours show the ligament's hydrostatic pressure (compression positive, kPa) or the "
            "quantity chosen above the view. The dashed line marks capillary pressure, the solid "
            "line the physiological limit; both values and their sources are in the case panel.\n\n"
            "CRes: centre of resistance for the force's direction. CRot: centre of rotation "
            "produced by the force system.\n\n") +
            QString::fromStdString(analysis::caution_text()));
  });
  help->addAction(QStringLiteral("&About Sharpey"), this, [this]() {
    QMessageBox::about(
        this, QStringLiteral("About Sharpey"),
        QStringLiteral("Sharpey: finite-element estimate of periodontal-ligament stress and "
                       "strain under an orthodontic force system, healthy and with bone loss.\n\n"
                       "Licence: AGPL-3.0-or-later.\n\n") +
            QString::fromStdString(analysis::caution_text()));
  });
}

// The toolbar: file actions, solve, exports, each with a short label under its icon.
void MainWindow::build_toolbar(const QList<QAction*>& file_actions, QAction* solve_action,
                               const QList<QAction*>& export_actions) {
  QToolBar* bar = addToolBar(QStringLiteral("Main"));
  bar->setObjectName(QStringLiteral("main_toolbar"));
  bar->setIconSize(QSize(24, 24));
  bar->setToolButtonStyle(Qt::ToolButtonTextUnderIcon);
  bar->addActions(file_actions);
  bar->addSeparator();
  bar->addAction(solve_action);
  bar->addSeparator();
  bar->addActions(export_actions);
  const QStringList labels = {QStringLiteral("New"),    QStringLiteral("Open"),
                              QStringLiteral("Save"),   QStringLiteral("Image"),
                              QStringLiteral("Report"), QStringLiteral("Data")};
  const QList<QAction*> labelled = file_actions + export_actions;
  for (int i = 0; i < labelled.size(); ++i) labelled[i]->setIconText(labels[i]);
  solve_action->setIconText(QStringLiteral("Solve"));
}

void MainWindow::connect_session() {
  CaseSession* s = session_.get();
  connect(s, &CaseSession::case_replaced, this, [this]() {
    // A solve still running is of the old case: stop it and drop what it still delivers.
    if (solving()) {
      job_->cancel();
      discard_job_ = true;
    }
    case_panel_->reload();
    load_panel_->set_controls(session_->load_controls());
    result_view_->clear();
    root_map_->clear();
    comparison_->clear();
    findings_->clear();
    load_panel_->set_resolved(nullptr);
    refresh_scenario_choice();
    case_panel_->set_stale(false, solving());
    load_summary_->setText(describe(session_->load_controls()));
  });
  connect(s, &CaseSession::document_changed, this, &MainWindow::refresh_title);
  connect(s, &CaseSession::geometry_changed, this, [this]() {
    case_panel_->set_stale(session_->study() != nullptr, solving());
    if (const auto* r = session_->current_result())
      findings_->show_result(*r, session_->spec().thresholds, true);
  });
  connect(s, &CaseSession::results_changed, this, &MainWindow::refresh_results);
  connect(s, &CaseSession::current_changed, this, [this](int index) {
    if (scenario_box_->currentIndex() != index) scenario_box_->setCurrentIndex(index);
    refresh_results(true);
  });
  connect(s, &CaseSession::evaluation_failed, this, [this](const QString& message) {
    status_->setText(QStringLiteral("Force system not applied: ") + message);
    load_error_shown_ = true;
    last_error_ = message;
  });
  // A refused force: the panel shows again the force system the results are for.
  connect(s, &CaseSession::load_refused, this, [this](const QString& message) {
    load_panel_->set_controls(session_->load_controls());
    status_->setText(
        QStringLiteral("Force system not applied, %1 still shown: %2").arg(force_text(), message));
    load_error_shown_ = true;
    last_error_ = message;
  });
}

// ---------------------------------------------------------------------------------------------
// Results

void MainWindow::set_load(const LoadControls& controls, bool interactive) {
  // A dragged slider sends more values than can be shown: keep only the newest and apply it
  // when the event queue is empty, so at most one evaluation and one repaint are pending.
  pending_load_ = controls;
  if (!interactive) {
    apply_pending_load(false);
    return;
  }
  if (!load_queued_) {
    load_queued_ = true;
    QTimer::singleShot(0, this, [this]() { apply_pending_load(true); });
  }
}

void MainWindow::apply_pending_load(bool interactive) {
  load_queued_ = false;
  if (!pending_load_) return;
  const LoadControls c = *pending_load_;
  pending_load_.reset();
  // While a slider moves the 3D view draws the quick way (no see-through bone).
  result_view_->set_interacting(interactive);
  session_->set_shown_quantity(result_view_->quantity());
  session_->set_load(c, interactive);
}

QString MainWindow::force_text() const {
  const LoadControls& c = session_->load_controls();
  return with_unit(c.magnitude, force_unit_label(c.unit), force_decimals(c.unit));
}

void MainWindow::refresh_results(bool interactive) {
  load_summary_->setText(describe(session_->load_controls()));
  // An accepted force system replaces the message about a refused one.
  if (load_error_shown_) {
    load_error_shown_ = false;
    status_->setText(QStringLiteral("Force system applied: %1.").arg(force_text()));
  }
  const analysis::ScenarioResult* r = session_->current_result();
  const analysis::ScenarioSolution* s = session_->current_solution();
  if (!r || !s) return;
  const auto& t = session_->spec().thresholds;
  result_view_->show_result(*s, *r, t, force_text());
  findings_->show_result(*r, t, session_->geometry_stale(), session_->reference_pending());
  load_panel_->set_resolved(r);
  // While a slider moves, a root map not on screen waits until it is shown (or the slider stops).
  root_map_dirty_ = true;
  if (!interactive || tabs_->currentWidget() == root_map_) refresh_root_map();
  if (!interactive) {
    refresh_scenario_choice();
    comparison_dirty_ = true;
    refresh_comparison();
  }
}

void MainWindow::refresh_root_map() {
  const analysis::ScenarioResult* r = session_->current_result();
  if (!root_map_dirty_ || !r) return;
  // The root map's scale is the 3D view's range shown for pressure (core/quantity.h).
  const ValueRange pressure_range = finite_range(r->pressure_kpa, result_view_->band(), false);
  root_map_->set_map(
      r->root_map, session_->spec().thresholds,
      QStringLiteral("Root map, %1: hydrostatic pressure").arg(QString::fromStdString(r->name)),
      &pressure_range);
  root_map_dirty_ = false;
}

void MainWindow::refresh_comparison() {
  // The comparison redraws up to four models: only when it is on screen.
  if (!comparison_dirty_ || tabs_->currentWidget() != comparison_ || session_->results().empty())
    return;
  comparison_->show_session(*session_, force_text());
  comparison_dirty_ = false;
}

void MainWindow::refresh_scenario_choice() {
  const QSignalBlocker block(scenario_box_);
  scenario_box_->clear();
  for (const auto& r : session_->results()) scenario_box_->addItem(QString::fromStdString(r.name));
  scenario_box_->setCurrentIndex(session_->current());
  scenario_box_->setEnabled(scenario_box_->count() > 1);
}

void MainWindow::show_case_panel(bool on) { left_panels_->setCurrentIndex(on ? 1 : 0); }

void MainWindow::show_view(ViewKind which) {
  tabs_->setCurrentIndex(which == ViewKind::k3D ? 0 : which == ViewKind::kRootMap ? 1 : 2);
  refresh_comparison();
}

// ---------------------------------------------------------------------------------------------
// Files

QString MainWindow::suggested_path(const QString& file_name) const {
  QString folder = QStandardPaths::writableLocation(QStandardPaths::DocumentsLocation);
  if (folder.isEmpty()) folder = QDir::homePath();
  return file_name.isEmpty() ? folder : QDir(folder).filePath(file_name);
}

QString MainWindow::file_stem() const {
  const QString path = session_->document().path();
  return path.isEmpty() ? QStringLiteral("sharpey_case") : QFileInfo(path).completeBaseName();
}

void MainWindow::refresh_title() { setWindowTitle(session_->document().window_title()); }

void MainWindow::refresh_recent_menu() {
  recent_menu_->clear();
  const QStringList paths = QSettings().value(QLatin1String(kRecentKey)).toStringList();
  for (const QString& path : paths) {
    recent_menu_
        ->addAction(QFileInfo(path).fileName(), this,
                    [this, path]() {
                      if (open_keeps_case(path) || maybe_save()) open_case(path);
                    })
        ->setToolTip(path);
  }
  recent_menu_->setEnabled(!paths.isEmpty());
}

void MainWindow::remember_recent(const QString& path) {
  QSettings settings;
  RecentFiles recent;
  recent.set_paths(settings.value(QLatin1String(kRecentKey)).toStringList());
  recent.add(path);
  settings.setValue(QLatin1String(kRecentKey), recent.paths());
  refresh_recent_menu();
}

void MainWindow::new_case() {
  cancel_solve();
  session_->new_case();
  autosave_->discard();
  autosaved_json_.clear();
  status_->setText(QStringLiteral("New case: set it up, then mesh and solve (F5)."));
}

bool MainWindow::open_case(const QString& path) {
  if (open_keeps_case(path)) return open_molar_case(path);
  try {
    session_->open(path, options_.mesh_override);
  } catch (const Error& e) {
    show_error(QStringLiteral("Could not open the case"), QString::fromStdString(e.what()));
    return false;
  }
  autosave_->discard();
  autosaved_json_.clear();
  remember_recent(path);
  solve();
  return true;
}

// A multi-rooted case opens beside the case here, which then needs no question about saving it.
bool MainWindow::open_keeps_case(const QString& path) const {
  return analysis::is_multi_root_case_file(path.toStdString());
}

// A multi-rooted case: shown in its own window (view/molar_window.h); the case in this window
// stays as it was.
bool MainWindow::open_molar_case(const QString& path) {
  if (!molar_) {
    molar_ = new MolarWindow(this);
    connect(molar_, &MolarWindow::failed, this, [this](const QString& message) {
      show_error(QStringLiteral("Could not evaluate the case"), message);
    });
  }
  QString error;
  if (!molar_->open(path, &error)) {
    show_error(QStringLiteral("Could not open the case"), error);
    return false;
  }
  remember_recent(path);
  molar_->show();
  molar_->raise();
  status_->setText(QStringLiteral("Multi-rooted case %1 shown in its own window.")
                       .arg(QFileInfo(path).fileName()));
  return true;
}

// The surface import (view/import_dialog.h): the case it builds replaces the open one, untitled,
// and is solved at once.
void MainWindow::import_surface() {
  ImportDialog dialog(samples_folder(), this);
  if (dialog.exec() != QDialog::Accepted || !dialog.built_case()) return;
  take_imported_case(*dialog.built_case());
}

void MainWindow::take_imported_case(const analysis::CaseSpec& spec) {
  cancel_solve();
  session_->take_new(spec);
  autosave_->discard();
  autosaved_json_.clear();
  solve();
}

bool MainWindow::save() {
  if (session_->document().save_needs_path()) {
    if (!options_.dialogs) return false;
    const QString path = QFileDialog::getSaveFileName(
        this, QStringLiteral("Save case"), suggested_path(file_stem() + QStringLiteral(".json")),
        QStringLiteral("Sharpey cases (*.json)"));
    if (path.isEmpty()) return false;
    return save_as(path.endsWith(QStringLiteral(".json")) ? path : path + QStringLiteral(".json"));
  }
  return save_as(session_->document().path());
}

bool MainWindow::save_as(const QString& path) {
  try {
    session_->save(path);
  } catch (const Error& e) {
    show_error(QStringLiteral("Could not save the case"), QString::fromStdString(e.what()));
    return false;
  }
  autosave_->discard();
  autosaved_json_.clear();
  remember_recent(path);
  status_->setText(QStringLiteral("Saved %1.").arg(path));
  return true;
}

bool MainWindow::maybe_save() {
  if (!session_->document().needs_save_prompt()) return true;
  const auto answer =
      ask(QStringLiteral("Unsaved changes"),
          QStringLiteral("%1 has changes that are not saved. Save them first?")
              .arg(session_->document().display_name()),
          QMessageBox::Save | QMessageBox::Discard | QMessageBox::Cancel, prompt_answer_);
  if (answer == QMessageBox::Save) return save();
  return answer == QMessageBox::Discard;
}

void MainWindow::autosave_now() {
  if (!session_->document().modified()) return;
  const QString json = session_->case_json();
  if (json == autosaved_json_) return;
  QString error;
  if (autosave_->write(json, session_->document().path(),
                       QString::fromStdString(session_->spec().label), &error)) {
    autosaved_json_ = json;
  } else {
    status_->setText(QStringLiteral("Autosave failed: ") + error);
  }
}

void MainWindow::check_recovery() {
  const auto found = autosave_->recoverable();
  if (found.empty()) return;
  // The newest copy is offered; older ones are left for a later start.
  const RecoverableCase* newest = &found.front();
  for (const auto& f : found)
    if (f.saved_at > newest->saved_at) newest = &f;
  const auto answer = ask(
      QStringLiteral("Recover unsaved work"),
      QStringLiteral(
          "Sharpey did not close normally. An autosaved copy of \"%1\" (%2) from %3 exists. "
          "Recover it?")
          .arg(newest->label,
               newest->original_path.isEmpty() ? QStringLiteral("untitled") : newest->original_path,
               newest->saved_at.toLocalTime().toString(QStringLiteral("yyyy-MM-dd HH:mm"))),
      QMessageBox::Yes | QMessageBox::No, QMessageBox::Yes);
  if (answer != QMessageBox::Yes) {
    AutosaveStore::remove(*newest);
    return;
  }
  try {
    const analysis::CaseSpec spec = analysis::load_case(newest->case_path.toStdString());
    session_->recover(spec, newest->original_path);
    AutosaveStore::remove(*newest);
    autosave_now();  // the recovered work now belongs to this session
    solve();
  } catch (const Error& e) {
    show_error(QStringLiteral("Could not recover the case"), QString::fromStdString(e.what()));
  }
}

void MainWindow::closeEvent(QCloseEvent* event) {
  if (!maybe_save()) {
    event->ignore();
    return;
  }
  cancel_solve();
  autosave_->discard();
  event->accept();
}

// ---------------------------------------------------------------------------------------------
// Solving

bool MainWindow::solving() const { return job_->running(); }

void MainWindow::solve() {
  if (solving()) {
    // The solve of a replaced case is stopping: this one starts when it has.
    if (discard_job_) solve_again_ = true;
    return;
  }
  analysis::CaseSpec spec = session_->spec();
  spec.scenarios = session_->levels().scenarios();
  solve_geometry_ = session_->geometry_version();
  if (!job_->start(spec)) return;
  set_solving_ui(true);
  status_->setText(QStringLiteral("Meshing and solving\u2026"));
}

bool MainWindow::end_discarded_job() {
  if (!discard_job_) return false;
  discard_job_ = false;
  job_->take_result();
  set_solving_ui(false);
  if (solve_again_) {
    solve_again_ = false;
    solve();
  }
  return true;
}

void MainWindow::cancel_solve() {
  if (solving()) {
    job_->cancel();
    status_->setText(QStringLiteral("Cancelling after the current step\u2026"));
  }
}

void MainWindow::set_solving_ui(bool on) {
  progress_->setVisible(on);
  cancel_->setVisible(on);
  if (on) progress_->setValue(0);
  case_panel_->set_stale(!on && session_->study() && session_->geometry_stale(), on);
}

// ---------------------------------------------------------------------------------------------
// Exports

QImage MainWindow::view_image(ViewKind which) {
  switch (which) {
    case ViewKind::k3D:
      return result_view_->grab_image();
    case ViewKind::kRootMap:
      return root_map_->grab().toImage();
    case ViewKind::kComparison:
      if (tabs_->currentWidget() != comparison_) {
        const int was = tabs_->currentIndex();
        show_view(ViewKind::kComparison);
        QApplication::processEvents();
        const QImage image = comparison_->grab_views();
        tabs_->setCurrentIndex(was);
        return image;
      }
      return comparison_->grab_views();
  }
  return {};
}

QString MainWindow::image_caption(ViewKind which) const {
  const analysis::ScenarioResult* r = session_->current_result();
  QString level;
  if (which == ViewKind::kComparison) {
    QStringList names;
    for (const auto& result : session_->results()) names << QString::fromStdString(result.name);
    level = QStringLiteral("bone levels compared: ") + names.join(QStringLiteral(", "));
  } else {
    level = QStringLiteral("bone level: ") +
            (r ? QString::fromStdString(r->name) : QStringLiteral("none solved"));
  }
  const Quantity q = which == ViewKind::kRootMap      ? Quantity::kPressure
                     : which == ViewKind::kComparison ? comparison_->quantity()
                                                      : result_view_->quantity();
  return QStringLiteral("%1\n%2; force system: %3; colours: %4 (%5).\n%6")
      .arg(QString::fromStdString(session_->spec().label), level,
           describe(session_->load_controls()), label(q), unit_label(q),
           QString::fromStdString(analysis::caution_text()));
}

QImage MainWindow::captioned(const QImage& picture, const QString& caption) const {
  // The caption under the picture, wrapped to its width, on the window's background.
  QFont font = this->font();
  const QFontMetrics fm(font);
  const int margin = 8;
  const QRect room(margin, 0, std::max(200, picture.width() - 2 * margin), 100000);
  const QRect needed = fm.boundingRect(room, Qt::TextWordWrap, caption);
  QImage out(picture.width(), picture.height() + needed.height() + 2 * margin,
             QImage::Format_RGB32);
  out.fill(palette().window().color());
  QPainter p(&out);
  p.drawImage(0, 0, picture);
  p.setFont(font);
  p.setPen(palette().windowText().color());
  p.drawText(QRect(margin, picture.height() + margin, room.width(), needed.height()),
             Qt::TextWordWrap, caption);
  p.end();
  out.setText(QStringLiteral("Description"), caption);
  return out;
}

bool MainWindow::export_image(const QString& path, ViewKind which) {
  const QImage view = view_image(which);
  const QImage image = view.isNull() ? view : captioned(view, image_caption(which));
  if (image.isNull() || !image.save(path, "PNG")) {
    show_error(QStringLiteral("Could not export the image"),
               QStringLiteral("Writing %1 failed (no permission, or the folder does not exist).")
                   .arg(path));
    return false;
  }
  status_->setText(QStringLiteral("Image written to %1.").arg(path));
  return true;
}

bool MainWindow::export_report(const QString& path) {
  if (session_->results().empty()) {
    show_error(QStringLiteral("No report yet"),
               QStringLiteral("There are no results yet: open or solve a case first."));
    return false;
  }
  if (!every_level_solved(QStringLiteral("No report yet"))) return false;
  ReportInputs in;
  in.spec = &session_->spec();
  in.results = &session_->results();
  in.current = session_->current();
  in.load = session_->load_controls();
  in.case_file = session_->document().display_name();
  in.view_3d = view_image(ViewKind::k3D);
  in.comparison = session_->results().size() > 1 ? view_image(ViewKind::kComparison) : QImage();
  in.stale = session_->geometry_stale();
  // The allowances of every level: the view's, or (while they are still being computed for a new
  // force direction) computed here, a fraction of a second.
  const AllowanceJob& allowance = allowance_->job();
  std::vector<analysis::ScenarioAllowances> allowances = allowance.nominal();
  try {
    for (size_t k = allowances.size(); k < session_->results().size(); ++k)
      allowances.push_back(analysis::scenario_allowances(*session_->solution(static_cast<int>(k)),
                                                         session_->spec().load,
                                                         session_->spec().thresholds));
    in.allowances = &allowances;
    if (allowance.band_matches_load()) in.allowance_band = allowance.band();
  } catch (const Error& e) {
    status_->setText(QStringLiteral("Report without allowances: ") + e.what());
  }
  QString error;
  if (write_report(path, in, &error) != report_page_count(in)) {
    show_error(QStringLiteral("Could not write the report"), error);
    return false;
  }
  status_->setText(QStringLiteral("Report written to %1.").arg(path));
  return true;
}

bool MainWindow::export_data(const QString& folder) {
  const analysis::Study* study = session_->study();
  if (!study || session_->results().empty()) {
    show_error(QStringLiteral("Nothing to export"),
               QStringLiteral("There are no results yet: open or solve a case first."));
    return false;
  }
  if (!every_level_solved(QStringLiteral("Nothing to export yet"))) return false;
  try {
    const QDir dir(folder);
    if (!dir.exists() && !QDir().mkpath(folder))
      throw analysis::OutputError("cannot create the folder " + folder.toStdString());
    const auto& results = session_->results();
    const analysis::CaseSpec& spec = study->spec();
    auto out = [&](const std::string& name) {
      return dir.filePath(QString::fromStdString(name)).toStdString();
    };
    analysis::write_file_atomic(
        out("results.json"),
        analysis::results_json(session_->spec(), results, analysis::scenario_facts(*study, false)));
    analysis::write_file_atomic(out("summary.csv"),
                                analysis::summary_csv(session_->spec(), results));
    analysis::write_file_atomic(out("summary.txt"),
                                analysis::summary_text(session_->spec(), results));
    for (size_t k = 0; k < results.size(); ++k) {
      const std::string stem = analysis::scenario_file_stem(static_cast<int>(k), results[k].name);
      analysis::write_file_atomic(out(stem + "_root_map.csv"),
                                  analysis::root_map_csv(spec, results[k]));
      analysis::write_scenario_vtu(*study->solutions()[k], results[k], out(stem + "_model.vtu"),
                                   out(stem + "_pdl.vtu"));
    }
  } catch (const Error& e) {
    show_error(QStringLiteral("Could not export the results"), QString::fromStdString(e.what()));
    return false;
  }
  status_->setText(QStringLiteral("Results written to %1.").arg(folder));
  return true;
}

bool MainWindow::every_level_solved(const QString& title) {
  session_->flush();  // results left behind by a slider (other levels, fields left out) first
  const analysis::Study* study = session_->study();
  if (!study || study->complete()) return true;
  const QString n = QString::number(study->spec().scenarios.size());
  const QString k = QString::number(study->solutions().size());
  show_error(
      title,
      solving()
          ? QStringLiteral("Only %1 of %2 bone levels are solved so far: wait until the others are "
                           "solved.")
                .arg(k, n)
          : QStringLiteral("Only %1 of %2 bone levels are solved (the solve was stopped): mesh and "
                           "solve again (F5) first.")
                .arg(k, n));
  return false;
}

// ---------------------------------------------------------------------------------------------
// Dialogs

void MainWindow::show_error(const QString& title, const QString& message) {
  last_error_ = message;
  if (options_.dialogs) QMessageBox::warning(this, title, message);
}

QMessageBox::StandardButton MainWindow::ask(const QString& title, const QString& text,
                                            QMessageBox::StandardButtons buttons,
                                            QMessageBox::StandardButton fallback) {
  ++prompts_;
  if (!options_.dialogs) return fallback;
  return QMessageBox::question(this, title, text, buttons);
}

}  // namespace sharpey::app
