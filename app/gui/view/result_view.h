// The 3D result view of one scenario: a VTK view of the model with the PDL coloured by the
// chosen quantity, a colour bar with units and threshold marks, and the view options (quantity,
// bone style, section, force-system glyphs, reset camera).
#pragma once

#include <QImage>
#include <QTimer>
#include <QWidget>
#include <functional>
#include <memory>
#include <optional>
#include <vector>

#include "core/quantity.h"
#include "sharpey/analysis/study.h"
#include "view/colour_bar.h"
#include "view/model_scene.h"

class QCheckBox;
class QComboBox;
class QHBoxLayout;
class QPainter;
class QToolButton;
class QVBoxLayout;

namespace sharpey::app {

class VtkView;

// Threshold iso-line levels in a quantity's unit: only pressure has them.
bool has_threshold_lines(Quantity q);
// The colour bar's capillary and limit marks, drawn like their iso-lines (none for a quantity
// without threshold lines).
std::vector<BarMark> threshold_marks(const analysis::Thresholds& thresholds, Quantity q);

// The colour bar's note on the crest edge band: its range when it goes beyond the scale shown
// (the band is drawn clamped to the scale's ends and bounded by a line in the 3D view).
QString band_note(const ValueRange& shown, const ValueRange& band, const QString& unit);

// The display options row the 3D view and the comparison share: "Colour by" with the quantity,
// then the bone style and the section. Each box calls its handler with the value chosen.
struct ViewOptionBoxes {
  QComboBox* quantity = nullptr;
  QComboBox* bone = nullptr;
  QComboBox* section = nullptr;
};
struct ViewOptionHandlers {
  std::function<void(Quantity)> quantity;
  std::function<void(BoneStyle)> bone;
  std::function<void(SectionPlane)> section;
};
// Adds the label and the three boxes to `row`; the connections live as long as `context`.
ViewOptionBoxes add_view_options(QHBoxLayout* row, QObject* context, const ViewOptionHandlers& on);

class ResultView : public QWidget {
  Q_OBJECT

 public:
  explicit ResultView(QWidget* parent = nullptr);
  ~ResultView() override;

  // Shows a scenario (rebuilds the geometry when `solution` differs from the last one) with
  // `result`; `fixed_range`, when given, replaces the data range (shared comparison scale).
  void show_result(const analysis::ScenarioSolution& solution,
                   const analysis::ScenarioResult& result, const analysis::Thresholds& thresholds,
                   const QString& force_text,
                   const std::optional<ValueRange>& fixed_range = std::nullopt);
  void clear();

  Quantity quantity() const { return quantity_; }
  void set_quantity(Quantity q);
  void set_bone_style(BoneStyle style);
  // How the colour range is chosen (core/quantity.h; kPerLevel is the comparison's).
  void set_scale_mode(ScaleMode mode);
  ScaleMode scale_mode() const { return scale_mode_; }
  void set_section(SectionPlane plane);
  void reset_camera();
  // Preset view: the tooth seen from one side (also the "view from" box of the options row).
  void look_from(ViewSide side);
  // The orientation marker (labial / lingual / mesial / distal / crown as seen now) drawn into a
  // frame of `size` pixels; also drawn over the view and into grab_image().
  void draw_marker(QPainter& painter, const QSize& size) const;
  // Quick drawing while the view turns or a load slider moves: no see-through bone, half the
  // resolution (ModelScene::set_interacting, VtkView::set_quick). Off: full frame.
  void set_interacting(bool on);
  // Hides the option strip or the colour bar (the comparison grid shares both).
  void set_options_visible(bool visible);
  void set_bar_visible(bool visible);

  // The options row's boxes (hidden in the comparison's cells).
  ViewOptionBoxes option_boxes() const { return {quantity_box_, bone_box_, section_box_}; }
  VtkView* vtk_view() const { return view_; }
  ColourBar* colour_bar() const { return bar_; }
  ModelScene* scene() const { return scene_.get(); }
  // The view with its colour bar, as shown.
  QImage grab_image();
  // The range shown (core/quantity.h: over the PDL nodes outside the crest edge band), in the
  // quantity's unit, and the range over the band's nodes (drawn clamped to the scale).
  const ValueRange& shown_range() const { return range_; }
  const ValueRange& band_range() const { return band_range_; }
  // analysis::pdl_crest_edge_band of the solution shown (one flag per PDL node).
  const std::vector<char>& band() const { return band_; }
  // Read-out of the shown quantity at VTK display point (x, y) (see ModelScene::readout_at).
  HoverReadout readout_at(int x, int y);

 signals:
  void quantity_changed(Quantity q);
  // Text of the read-out under the mouse (empty when there is no PDL under it).
  void hover_changed(const QString& text);

 private:
  QToolButton* build_options(QVBoxLayout* outer);
  void build_view(QVBoxLayout* outer);
  void connect_options(QToolButton* reset);
  void connect_view_events();
  void refresh();

  VtkView* view_ = nullptr;
  ColourBar* bar_ = nullptr;
  QWidget* options_ = nullptr;
  QComboBox* quantity_box_ = nullptr;
  QComboBox* bone_box_ = nullptr;
  QComboBox* section_box_ = nullptr;
  QCheckBox* glyphs_box_ = nullptr;
  QComboBox* view_box_ = nullptr;
  QComboBox* scale_box_ = nullptr;
  ScaleMode scale_mode_ = ScaleMode::kShown;
  ValueRange frozen_;      // the kept range of ScaleMode::kFixed
  bool refreeze_ = false;  // the quantity changed under kFixed: keep the new quantity's range
  std::unique_ptr<ModelScene> scene_;
  Quantity quantity_ = Quantity::kPressure;
  const analysis::ScenarioSolution* solution_ = nullptr;
  analysis::ScenarioResult result_;
  analysis::Thresholds thresholds_;
  QString force_text_;
  std::optional<ValueRange> fixed_range_;
  ValueRange range_, band_range_;
  std::vector<char> band_;  // analysis::pdl_crest_edge_band of the solution shown
  bool camera_set_ = false;
  // The hover read-out picks at most every 40 ms, at the newest mouse position.
  QTimer hover_timer_;
  int hover_x_ = -1, hover_y_ = -1;
};

}  // namespace sharpey::app
