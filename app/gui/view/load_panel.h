// Force-system panel: magnitude (slider and field, g / cN / N), direction (named or free
// angles), application height, couple (moment or moment-to-force ratio) and movement presets.
// Mirrors a LoadControls; every edit emits `changed` (interactive while the slider is dragged).
#pragma once

#include <QWidget>

#include "core/load_controls.h"
#include "sharpey/analysis/study.h"

class QCheckBox;
class QComboBox;
class QDoubleSpinBox;
class QFormLayout;
class QLabel;
class QSlider;

namespace sharpey::app {

class LoadPanel : public QWidget {
  Q_OBJECT

 public:
  explicit LoadPanel(QWidget* parent = nullptr);
  // Shows `controls` without emitting `changed`.
  void set_controls(const LoadControls& controls);
  const LoadControls& controls() const { return controls_; }
  // The force system the library resolved (shown under the controls).
  // In the panel's force unit; the point of application and the moment about the bracket centre
  // follow the force system (a force above the bracket gives a moment there).
  void set_resolved(const analysis::ScenarioResult* result);
  QString resolved_text() const;

  // For tests: the magnitude slider.
  QSlider* magnitude_slider() const { return slider_; }
  QDoubleSpinBox* magnitude_box() const { return magnitude_; }
  QComboBox* unit_box() const { return unit_; }
  QComboBox* direction_box() const { return direction_; }
  QComboBox* preset_box() const { return preset_; }

 signals:
  void changed(const sharpey::app::LoadControls& controls, bool interactive);

 private:
  // The constructor's steps: each adds its rows to `form`, in the panel's order.
  void add_force_rows(QFormLayout* form);
  void add_direction_rows(QFormLayout* form);
  void add_application_rows(QFormLayout* form);
  void add_couple_rows(QFormLayout* form);
  void add_preset_rows(QFormLayout* form);
  void connect_force_controls();
  void connect_couple_controls();
  void sync_widgets();
  void edited(bool interactive);

  LoadControls controls_;
  bool updating_ = false;
  QSlider* slider_ = nullptr;
  QDoubleSpinBox* magnitude_ = nullptr;
  QComboBox* unit_ = nullptr;
  QComboBox* direction_ = nullptr;
  QDoubleSpinBox* azimuth_ = nullptr;
  QDoubleSpinBox* elevation_ = nullptr;
  QCheckBox* at_pad_ = nullptr;
  QDoubleSpinBox* height_ = nullptr;
  QComboBox* couple_ = nullptr;
  QDoubleSpinBox* moment_[3] = {nullptr, nullptr, nullptr};
  QLabel* moment_unit_ = nullptr;
  QDoubleSpinBox* ratio_ = nullptr;
  QWidget* moment_row_ = nullptr;
  QWidget* ratio_row_ = nullptr;
  QComboBox* preset_ = nullptr;
  QLabel* preset_note_ = nullptr;
  QLabel* resolved_ = nullptr;
};

}  // namespace sharpey::app
