// The surface import dialog: choose a scanned tooth surface (STL, PLY, OBJ), look at it in 3D with
// its landmarks and the tooth axis they give (or the principal-axis proposal), turn the axis round
// where needed, choose the tooth type, confirm, and get a case that names the surface
// (tooth.surface) and solves like any other. The logic is core/surface_import.h; a file the
// library refuses shows its message here and nothing else changes.
#pragma once

#include <QDialog>
#include <memory>
#include <optional>
#include <vector>

#include "core/colour_map.h"
#include "core/surface_import.h"

class QCheckBox;
class QComboBox;
class QFormLayout;
class QHBoxLayout;
class QLabel;
class QPushButton;
class QVBoxLayout;

namespace sharpey::app {

class VtkView;

class ImportDialog : public QDialog {
  Q_OBJECT

 public:
  // `start_folder`: where the file choosers open.
  explicit ImportDialog(const QString& start_folder, QWidget* parent = nullptr);
  ~ImportDialog() override;

  // What the buttons do, callable without the file choosers (tests, scripted use). Each returns
  // false and shows the message in the dialog when the file is refused.
  bool open_surface(const QString& path);
  bool open_landmarks(const QString& case_path);
  // Builds the case (SurfaceImport::build_case) and accepts the dialog; false with the message
  // shown when the library refuses it or the axis is not confirmed.
  bool create_case();

  const SurfaceImport& import_state() const { return import_; }
  // The controls, for tests: the tooth type box, the three swaps and the confirmation.
  QComboBox* tooth_box() const { return tooth_; }
  QCheckBox* confirm_box() const { return confirm_; }
  QCheckBox* swap_crown_box() const { return swap_crown_; }
  QCheckBox* swap_labial_box() const { return swap_labial_; }
  QCheckBox* swap_mesial_box() const { return swap_mesial_; }
  QPushButton* create_button() const { return create_; }
  VtkView* view() const { return view_; }
  // The message line (a refused file, what to check next).
  QString message() const;
  // The case built by create_case().
  const std::optional<analysis::CaseSpec>& built_case() const { return case_; }

 private:
  // The constructor's steps, in the dialog's order.
  void add_view(QHBoxLayout* layout);
  void add_file_rows(QFormLayout* form);
  void add_axis_rows(QFormLayout* form);
  void add_swap_boxes(QVBoxLayout* side);
  void add_tooth_and_confirmation(QVBoxLayout* side);
  void add_message_and_buttons(QVBoxLayout* side);
  // Shows the import's state: controls, surface, axis and landmarks, camera.
  void refresh();
  void refresh_controls(bool have_surface);
  void show_surface(const mesh::SurfaceMesh& surface);
  void show_axis_and_landmarks(const std::vector<ShownLandmark>& marks, double length_mm);
  void add_label(const QString& text, const Eigen::Vector3d& at, const Rgb& colour);
  void aim_camera(const std::vector<ShownLandmark>& marks, double length_mm);
  void show_message(const QString& text, bool is_error);

  QString start_folder_;
  SurfaceImport import_;
  std::optional<analysis::CaseSpec> case_;
  QLabel* file_label_ = nullptr;
  QLabel* axis_label_ = nullptr;
  QLabel* message_ = nullptr;
  QLabel* summary_ = nullptr;
  QPushButton* landmarks_button_ = nullptr;
  QPushButton* proposal_button_ = nullptr;
  QCheckBox* swap_crown_ = nullptr;
  QCheckBox* swap_labial_ = nullptr;
  QCheckBox* swap_mesial_ = nullptr;
  QComboBox* tooth_ = nullptr;
  QCheckBox* confirm_ = nullptr;
  QPushButton* create_ = nullptr;
  VtkView* view_ = nullptr;
  struct Scene;
  std::unique_ptr<Scene> scene_;
};

}  // namespace sharpey::app
