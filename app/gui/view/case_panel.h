// Case panel: the label, the tooth, the ligament width, the mesh preset, the bone levels (with the
// choice of two to four to compare) and the angular defect of the selected level, the PDL and
// bone materials, the pressure thresholds with their sources, and the solve button. Geometry and
// material edits go to the session, which marks the results stale until the next solve.
#pragma once

#include <QWidget>

class QCheckBox;
class QComboBox;
class QDoubleSpinBox;
class QLabel;
class QLineEdit;
class QPushButton;
class QTableWidget;
class QVBoxLayout;

namespace sharpey::app {

class CaseSession;

class CasePanel : public QWidget {
  Q_OBJECT

 public:
  explicit CasePanel(CaseSession* session, QWidget* parent = nullptr);
  // Reloads every field from the session (after new, open, recover).
  void reload();
  // Shows whether the results match the case geometry.
  void set_stale(bool stale, bool solving);
  QPushButton* solve_button() const { return solve_; }
  QTableWidget* levels_table() const { return levels_; }

 signals:
  void solve_requested();
  void comparison_changed();
  // An edit was refused (the case is unchanged): what and why, for the window to show.
  void edit_refused(const QString& title, const QString& message);

 private:
  void build_case_form(QVBoxLayout* outer);
  void build_levels(QVBoxLayout* outer);
  void build_defect_form(QVBoxLayout* outer);
  void build_materials(QVBoxLayout* outer);
  void build_thresholds(QVBoxLayout* outer);
  void build_solve(QVBoxLayout* outer);
  void connect_case_form();
  void connect_levels();
  void reload_levels();
  void levels_edited();
  void reload_defect();
  void defect_edited();
  void material_edited(int part);

  CaseSession* session_;
  bool updating_ = false;
  QLineEdit* label_ = nullptr;
  QComboBox* tooth_ = nullptr;
  QDoubleSpinBox* pdl_width_ = nullptr;
  QComboBox* preset_ = nullptr;
  QTableWidget* levels_ = nullptr;
  QDoubleSpinBox* new_loss_ = nullptr;
  QPushButton* add_level_ = nullptr;
  QPushButton* remove_level_ = nullptr;
  QLabel* defect_title_ = nullptr;
  QDoubleSpinBox* defect_depth_ = nullptr;
  QComboBox* defect_surface_ = nullptr;
  QDoubleSpinBox* defect_width_ = nullptr;
  QDoubleSpinBox* modulus_[3] = {nullptr, nullptr, nullptr};  // MaterialPart order
  QDoubleSpinBox* poisson_[3] = {nullptr, nullptr, nullptr};
  QDoubleSpinBox* capillary_ = nullptr;
  QDoubleSpinBox* limit_ = nullptr;
  QLabel* capillary_source_ = nullptr;
  QLabel* limit_source_ = nullptr;
  QLabel* stale_ = nullptr;
  QPushButton* solve_ = nullptr;
};

// Readable tooth name: "maxillary central incisor".
QString tooth_name(int tooth_type);

}  // namespace sharpey::app
