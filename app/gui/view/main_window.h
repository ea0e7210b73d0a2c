// The Sharpey main window: case and force-system panels on the left, the 3D view, root map and
// bone-level comparison in the middle, the findings on the right, the caution always visible at
// the bottom, solve progress with a cancel button in the status bar. File handling (new, open,
// samples, recent files, save, save as, unsaved-changes prompt, autosave with recovery) and the
// exports (PNG, PDF report, CSV / JSON / VTU) live here; every number comes from the library.
#pragma once

#include <QMainWindow>
#include <QMessageBox>
#include <QString>
#include <functional>
#include <memory>
#include <optional>

#include "core/load_controls.h"
#include "sharpey/mesh/tooth_model.h"

class QAction;
class QComboBox;
class QLabel;
class QMenu;
class QProgressBar;
class QTabWidget;
class QToolBox;
class QToolButton;

namespace sharpey::app {

class AllowanceView;
class AutosaveStore;
class CaseSession;
class CasePanel;
class ComparisonView;
class FindingsPanel;
class LoadPanel;
class MolarWindow;
class ResultView;
class RootMapView;
class SolveJob;

struct MainWindowOptions {
  QString autosave_folder;  // empty: <app data>/autosave
  int autosave_interval_ms = 20000;
  std::optional<mesh::MeshPreset> mesh_override;  // --mesh: replaces the case's preset on open
  // Saved solutions: empty uses solution_cache_folder() (SHARPEY_CACHE_DIR or the per-user
  // cache folder); SHARPEY_CACHE_MAX_MB=0 switches the cache off.
  QString solution_cache_folder;
  bool dialogs = true;  // false (tests): no modal dialogs; errors are recorded, prompts use answers
};

enum class ViewKind { k3D, kRootMap, kComparison };

class MainWindow : public QMainWindow {
  Q_OBJECT

 public:
  explicit MainWindow(const MainWindowOptions& options = {});
  ~MainWindow() override;

  // ---- files ----
  void new_case();
  // Opens a case file and starts meshing and solving it. False (and an error) on a bad file. A
  // multi-rooted case (kind "multi_root_estimate") opens in its own window (molar_window()).
  bool open_case(const QString& path);
  bool save();
  bool save_as(const QString& path);
  // Asks about unsaved changes; true when the caller may go on (saved or discarded).
  bool maybe_save();
  // File > Import tooth surface: the import dialog (view/import_dialog.h).
  void import_surface();
  // Takes a case the import built (untitled, modified) and starts meshing and solving it.
  void take_imported_case(const analysis::CaseSpec& spec);
  // Offers the autosaved copies of sessions that ended without closing; recovers the chosen one.
  void check_recovery();

  // ---- force system ----
  // What the load panel calls: `interactive` while a slider is dragged (only the newest of a
  // burst of values is applied, once the event queue is empty; the 3D view draws the quick way
  // until a non-interactive change ends the drag).
  void set_load(const LoadControls& controls, bool interactive);

  // ---- solving ----
  void solve();
  void cancel_solve();
  bool solving() const;

  // Where a save or export dialog starts: `file_name` in the user's documents folder, never the
  // folder of the bundled samples (a reflexive save must not overwrite a shipped sample).
  QString suggested_path(const QString& file_name) const;
  // File name stem for saves and exports: the case file's, else "sharpey_case".
  QString file_stem() const;

  // ---- exports ----
  QImage view_image(ViewKind which);
  // The PNG carries a caption under the view (and as its "Description" text): the case label, the
  // bone level, the force system, the quantity and the caution.
  bool export_image(const QString& path, ViewKind which);
  QString image_caption(ViewKind which) const;
  bool export_report(const QString& path);
  bool export_data(const QString& folder);

  // ---- parts, for tests ----
  CaseSession& session() { return *session_; }
  const SolveJob& solve_job() const { return *job_; }
  ResultView* result_view() const { return result_view_; }
  RootMapView* root_map() const { return root_map_; }
  ComparisonView* comparison() const { return comparison_; }
  LoadPanel* load_panel() const { return load_panel_; }
  CasePanel* case_panel() const { return case_panel_; }
  FindingsPanel* findings() const { return findings_; }
  AllowanceView* allowance_view() const { return allowance_; }
  // The window of the multi-rooted case opened last (null before the first).
  MolarWindow* molar_window() const { return molar_; }
  QTabWidget* tabs() const { return tabs_; }
  QLabel* caution_label() const { return caution_; }
  QLabel* hover_label() const { return hover_; }
  QLabel* status_label() const { return status_; }
  QComboBox* level_box() const { return scenario_box_; }  // the bone-level selector
  void show_view(ViewKind which);
  // Opens the case panel (true) or the force-system panel (false) on the left.
  void show_case_panel(bool on);
  // The last error shown to the user (also recorded when dialogs are off).
  const QString& last_error() const { return last_error_; }
  int prompts_shown() const { return prompts_; }
  // Answer given to prompts when dialogs are off (default: discard unsaved changes, recover).
  void set_prompt_answer(QMessageBox::StandardButton answer) { prompt_answer_ = answer; }
  AutosaveStore& autosave() { return *autosave_; }
  void autosave_now();

 signals:
  void solve_finished();
  void solve_failed(const QString& message);

 protected:
  void closeEvent(QCloseEvent* event) override;

 private:
  void build_menus();
  QList<QAction*> build_file_menu(QMenu* file);
  QList<QAction*> build_export_menu(QMenu* exports);
  void build_help_menu();
  void build_toolbar(const QList<QAction*>& file_actions, QAction* solve_action,
                     const QList<QAction*>& export_actions);
  QImage captioned(const QImage& picture, const QString& caption) const;
  void build_layout();
  QWidget* build_left_panels();
  QWidget* build_views();
  void build_status_bar();
  void connect_layout();
  void connect_session();
  void connect_solve_job();
  void restore_recent_files();
  void refresh_results(bool interactive);
  void refresh_scenario_choice();
  void refresh_title();
  void refresh_recent_menu();
  void refresh_comparison();
  void refresh_root_map();
  void show_error(const QString& title, const QString& message);
  // False (and an error titled `title`) while the study on display lacks some bone levels.
  bool every_level_solved(const QString& title);
  QMessageBox::StandardButton ask(const QString& title, const QString& text,
                                  QMessageBox::StandardButtons buttons,
                                  QMessageBox::StandardButton fallback);
  QString force_text() const;
  void set_solving_ui(bool on);
  // True (and the job's levels dropped, and a solve asked for meanwhile started) when the job that
  // just ended belonged to a replaced case.
  bool end_discarded_job();
  void apply_pending_load(bool interactive);
  void remember_recent(const QString& path);
  bool open_molar_case(const QString& path);
  bool open_keeps_case(const QString& path) const;

  MainWindowOptions options_;
  std::unique_ptr<CaseSession> session_;
  std::unique_ptr<SolveJob> job_;
  std::unique_ptr<AutosaveStore> autosave_;
  QString autosaved_json_;
  CasePanel* case_panel_ = nullptr;
  LoadPanel* load_panel_ = nullptr;
  ResultView* result_view_ = nullptr;
  RootMapView* root_map_ = nullptr;
  ComparisonView* comparison_ = nullptr;
  FindingsPanel* findings_ = nullptr;
  AllowanceView* allowance_ = nullptr;  // the force-allowance tab
  MolarWindow* molar_ = nullptr;        // a window of its own, child of this one
  QTabWidget* tabs_ = nullptr;
  QToolBox* left_panels_ = nullptr;
  QComboBox* scenario_box_ = nullptr;
  QLabel* load_summary_ = nullptr;
  QLabel* caution_ = nullptr;
  QLabel* status_ = nullptr;
  QLabel* hover_ = nullptr;
  QProgressBar* progress_ = nullptr;
  QToolButton* cancel_ = nullptr;
  QMenu* recent_menu_ = nullptr;
  QMenu* samples_menu_ = nullptr;
  QString last_error_;
  int prompts_ = 0;
  QMessageBox::StandardButton prompt_answer_ = QMessageBox::Discard;
  bool comparison_dirty_ = true;
  bool root_map_dirty_ = true;  // the root map waits for the current result (hidden during a drag)
  bool load_error_shown_ = false;             // the status bar shows why a force system was refused
  std::optional<LoadControls> pending_load_;  // newest load-panel state not yet applied
  bool load_queued_ = false;
  bool discard_job_ =
      false;  // the running solve is of a case since replaced: its levels are dropped
  bool solve_again_ = false;  // solve() was asked for while such a solve was stopping
  int solve_geometry_ = 0;    // the session's geometry_version() when the running solve started
};

// Folder of the bundled sample cases (SHARPEY_SAMPLES_DIR, the installed share folder, or the
// source tree's samples/).
QString samples_folder();

}  // namespace sharpey::app
