// The window of a multi-rooted case (kind "multi_root_estimate", docs/molars.md), opened by the
// main window wherever it opens cases. Left: the case and its scenarios, the force unit. Middle:
// the root surface in 3D (attached and lost surface told apart) over the root maps of the trunk
// and each root side by side. Right: the per-root table, the centre of resistance, the allowance
// of each molar movement and, when the case asks for them, the finite-element figures. The
// caution at the bottom. Every number is analysis::evaluate_multi_root_case's; every figure is
// labelled as the thin-layer estimate. File > Export PDF report writes the multi-rooted report
// (view/report_writer.h).
#pragma once

#include <QMainWindow>
#include <memory>
#include <vector>

#include "core/molar_tables.h"
#include "sharpey/analysis/multi_root_case.h"

class QComboBox;
class QLabel;
class QListWidget;
class QTableWidget;
class QThread;

namespace sharpey::app {

class MolarRootMaps;
class MolarScene;
class VtkView;

class MolarWindow : public QMainWindow {
  Q_OBJECT

 public:
  explicit MolarWindow(QWidget* parent = nullptr);
  ~MolarWindow() override;

  // Reads and evaluates the case; false with `error` (the library's message) and nothing changed
  // on a bad file. The thin-layer estimate is evaluated at once; a case with finite_elements is
  // evaluated on a worker thread (busy() meanwhile; evaluated() or failed() when it ends; the
  // window shows the case when it is done).
  bool open(const QString& path, QString* error);
  bool has_case() const { return !result_.scenarios.empty(); }
  bool busy() const { return pending_ > 0; }
  void show_scenario(int index);
  int current() const { return current_; }
  void set_force_unit(analysis::ForceUnit unit);
  analysis::ForceUnit force_unit() const { return unit_; }

  // The 3D view with its legend, as shown.
  QImage view_image();
  // Writes the PDF report; false with `error` on failure.
  bool export_report(const QString& path, QString* error);
  QString case_file() const { return case_file_; }

 signals:
  void evaluated();
  void failed(const QString& message);

 public:
  // ---- parts, for tests ----
  const analysis::MultiRootCase& spec() const { return spec_; }
  const analysis::MultiRootCaseResult& result() const { return result_; }
  QListWidget* scenario_list() const { return scenarios_; }
  QTableWidget* root_table() const { return root_table_; }
  QTableWidget* cres_table() const { return cres_table_; }
  QTableWidget* allowance_table() const { return allowance_table_; }
  QTableWidget* fe_table() const { return fe_table_; }
  QTableWidget* fe_area_table() const { return fe_area_table_; }
  MolarRootMaps* root_maps() const { return maps_; }
  MolarScene* scene() const { return scene_.get(); }
  QLabel* caution_label() const { return caution_; }

 private:
  void build_menu();
  QWidget* build_left();
  QWidget* build_middle();
  QWidget* build_right();
  void refresh();
  void show_case(const analysis::MultiRootCase& spec, const analysis::MultiRootCaseResult& result,
                 const QString& path);
  void evaluate_in_background(const analysis::MultiRootCase& spec, const QString& path);
  void export_report_dialog();

  analysis::MultiRootCase spec_;
  analysis::MultiRootCaseResult result_;
  QString case_file_;
  int generation_ = 0;             // of the last open(): an older background evaluation is dropped
  int pending_ = 0;                // background evaluations of the last open() still running
  std::vector<QThread*> workers_;  // running background evaluations (waited for on close)
  int current_ = 0;
  analysis::ForceUnit unit_ = analysis::ForceUnit::kNewton;
  QLabel* header_ = nullptr;
  QListWidget* scenarios_ = nullptr;
  QComboBox* unit_box_ = nullptr;
  VtkView* view_ = nullptr;
  std::unique_ptr<MolarScene> scene_;
  MolarRootMaps* maps_ = nullptr;
  QTableWidget* root_table_ = nullptr;
  QTableWidget* cres_table_ = nullptr;
  QTableWidget* allowance_table_ = nullptr;
  QTableWidget* fe_table_ = nullptr;
  QTableWidget* fe_area_table_ = nullptr;
  QLabel* fe_title_ = nullptr;
  QLabel* caution_ = nullptr;
};

// Fills `table` from `t`: the formatted values shown, the library's value (double) under
// Qt::UserRole of each cell.
void fill_molar_table(QTableWidget* table, const MolarTable& t);

}  // namespace sharpey::app
