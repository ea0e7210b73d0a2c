#include "view/result_view.h"

#include <QCheckBox>
#include <QComboBox>
#include <QFontMetricsF>
#include <QHBoxLayout>
#include <QLabel>
#include <QPainter>
#include <QToolButton>
#include <QVBoxLayout>
#include <algorithm>
#include <cmath>

#include "core/units.h"
#include "view/colour_bar.h"
#include "view/vtk_view.h"

namespace sharpey::app {

bool has_threshold_lines(Quantity q) { return q == Quantity::kPressure; }

std::vector<BarMark> threshold_marks(const analysis::Thresholds& thresholds, Quantity q) {
  if (!has_threshold_lines(q)) return {};
  return pressure_threshold_marks(thresholds);
}

QString band_note(const ValueRange& shown, const ValueRange& band, const QString& unit) {
  const bool beyond = band.max > shown.max || band.min < shown.min;
  if (!beyond) return QStringLiteral("Crest edge band (above the violet line): within the scale.");
  const int decimals = readable_decimals(std::max(std::abs(band.min), std::abs(band.max)));
  return QStringLiteral(
             "Crest edge band (above the violet line): %1 to %2, drawn at the scale's "
             "ends; left out of the key numbers.")
      .arg(with_unit(band.min, unit, decimals), with_unit(band.max, unit, decimals));
}

ViewOptionBoxes add_view_options(QHBoxLayout* row, QObject* context, const ViewOptionHandlers& on) {
  ViewOptionBoxes boxes;
  boxes.quantity = new QComboBox;
  for (Quantity q : all_quantities()) boxes.quantity->addItem(short_label(q), static_cast<int>(q));
  boxes.quantity->setToolTip(QStringLiteral("Quantity the ligament is coloured by"));
  boxes.bone = new QComboBox;
  for (BoneStyle s : {BoneStyle::kTranslucent, BoneStyle::kOpaque, BoneStyle::kHidden})
    boxes.bone->addItem(label(s), static_cast<int>(s));
  boxes.bone->setToolTip(QStringLiteral("How the alveolar bone is drawn"));
  boxes.section = new QComboBox;
  for (SectionPlane s :
       {SectionPlane::kNone, SectionPlane::kLabiolingual, SectionPlane::kMesiodistal})
    boxes.section->addItem(label(s), static_cast<int>(s));
  boxes.section->setToolTip(QStringLiteral("Cut the model along the long axis of the tooth"));
  row->addWidget(new QLabel(QStringLiteral("Colour by")));
  row->addWidget(boxes.quantity);
  row->addSpacing(8);
  row->addWidget(boxes.bone);
  row->addWidget(boxes.section);
  // Each handler gets the value of the entry chosen.
  auto hook = [context](QComboBox* box, auto handler, auto as_value) {
    if (!handler) return;
    QObject::connect(box, &QComboBox::currentIndexChanged, context,
                     [box, handler, as_value]() { handler(as_value(box->currentData().toInt())); });
  };
  hook(boxes.quantity, on.quantity, [](int v) { return static_cast<Quantity>(v); });
  hook(boxes.bone, on.bone, [](int v) { return static_cast<BoneStyle>(v); });
  hook(boxes.section, on.section, [](int v) { return static_cast<SectionPlane>(v); });
  return boxes;
}

ResultView::ResultView(QWidget* parent) : QWidget(parent) {
  auto* outer = new QVBoxLayout(this);
  outer->setContentsMargins(0, 0, 0, 0);
  outer->setSpacing(2);
  QToolButton* reset = build_options(outer);
  build_view(outer);
  connect_options(reset);
  connect_view_events();
}

// The row of display options above the view: quantity, bone, section, force system, colour range,
// view side and reset. Returns the reset button for connect_options().
QToolButton* ResultView::build_options(QVBoxLayout* outer) {
  options_ = new QWidget;
  auto* opt = new QHBoxLayout(options_);
  opt->setContentsMargins(4, 2, 4, 2);
  ViewOptionHandlers handlers;
  handlers.quantity = [this](Quantity q) { set_quantity(q); };
  handlers.bone = [this](BoneStyle style) {
    scene_->set_bone_style(style);
    view_->update();
  };
  handlers.section = [this](SectionPlane plane) {
    scene_->set_section(plane);
    scene_->reset_camera();
    view_->update();
  };
  const ViewOptionBoxes boxes = add_view_options(opt, this, handlers);
  quantity_box_ = boxes.quantity;
  bone_box_ = boxes.bone;
  section_box_ = boxes.section;
  glyphs_box_ = new QCheckBox(QStringLiteral("force system"));
  glyphs_box_->setChecked(true);
  glyphs_box_->setToolTip(
      QStringLiteral("Force arrow, couple, centre of resistance (CRes) and "
                     "centre of rotation (CRot)"));
  auto* reset = new QToolButton;
  reset->setText(QStringLiteral("Reset view"));
  view_box_ = new QComboBox;
  view_box_->addItem(QStringLiteral("view from\u2026"), -1);
  for (ViewSide side : all_view_sides()) view_box_->addItem(label(side), static_cast<int>(side));
  view_box_->setToolTip(QStringLiteral("Look at the tooth from one side"));
  scale_box_ = new QComboBox;
  for (ScaleMode m : {ScaleMode::kShown, ScaleMode::kFixed, ScaleMode::kThresholds})
    scale_box_->addItem(label(m), static_cast<int>(m));
  scale_box_->setToolTip(
      QStringLiteral("Range of the colours: the range shown follows the force; a fixed range "
                     "or one anchored to the physiological limit lets weaker forces look paler"));
  opt->addWidget(glyphs_box_);
  opt->addWidget(scale_box_);
  opt->addStretch(1);
  opt->addWidget(view_box_);
  opt->addWidget(reset);
  outer->addWidget(options_);
  return reset;
}

// The VTK view with the colour bar beside it, and the scene drawn in it.
void ResultView::build_view(QVBoxLayout* outer) {
  auto* row = new QHBoxLayout;
  row->setSpacing(0);
  view_ = new VtkView;
  bar_ = new ColourBar;
  row->addWidget(view_, 1);
  row->addWidget(bar_);
  outer->addLayout(row, 1);

  scene_ = std::make_unique<ModelScene>(view_->renderer(), view_->overlay());
  // Half-resolution frames: pixel sizes follow, so labels and lines keep their look on screen.
  connect(view_, &VtkView::pixel_scale_changed, this,
          [this](double scale) { scene_->set_pixel_scale(scale); });
}

void ResultView::connect_options(QToolButton* reset) {
  connect(glyphs_box_, &QCheckBox::toggled, this, [this](bool on) {
    scene_->set_glyphs_visible(on);
    view_->update();
  });
  connect(reset, &QToolButton::clicked, this, &ResultView::reset_camera);
  connect(scale_box_, &QComboBox::currentIndexChanged, this,
          [this]() { set_scale_mode(static_cast<ScaleMode>(scale_box_->currentData().toInt())); });
  connect(view_box_, &QComboBox::activated, this, [this]() {
    const int side = view_box_->currentData().toInt();
    if (side >= 0) look_from(static_cast<ViewSide>(side));
    view_box_->setCurrentIndex(0);
  });
}

// Decoration, hover read-out and the lighter frames while the mouse turns the view.
void ResultView::connect_view_events() {
  view_->set_decoration(
      [this](QPainter& painter, const QSize& size) { draw_marker(painter, size); });
  // Fewer triangles while the mouse turns the view; full detail for the still frame.
  connect(view_, &VtkView::interaction_started, this, [this]() {
    set_interacting(true);
    hover_timer_.stop();
    emit hover_changed(QString());
  });
  hover_timer_.setSingleShot(true);
  hover_timer_.setInterval(40);
  connect(&hover_timer_, &QTimer::timeout, this,
          [this]() { emit hover_changed(describe(readout_at(hover_x_, hover_y_))); });
  connect(view_, &VtkView::hovered, this, [this](int x, int y) {
    hover_x_ = x;
    hover_y_ = y;
    if (!hover_timer_.isActive()) hover_timer_.start();
  });
  connect(view_, &VtkView::hover_left, this, [this]() {
    hover_timer_.stop();
    emit hover_changed(QString());
  });
  connect(view_, &VtkView::interaction_ended, this, [this]() { set_interacting(false); });
}

ResultView::~ResultView() = default;

void ResultView::set_interacting(bool on) {
  scene_->set_interacting(on);
  view_->set_quick(on);
  view_->update();
}

HoverReadout ResultView::readout_at(int x, int y) {
  if (!solution_) return {};
  return scene_->readout_at(x, y, quantity_);
}

void ResultView::set_options_visible(bool visible) { options_->setVisible(visible); }
void ResultView::set_bar_visible(bool visible) { bar_->setVisible(visible); }

void ResultView::set_quantity(Quantity q) {
  if (q == quantity_) return;
  quantity_ = q;
  refreeze_ = scale_mode_ == ScaleMode::kFixed;  // a fixed range belongs to one quantity
  const int index = quantity_box_->findData(static_cast<int>(q));
  if (quantity_box_->currentIndex() != index) quantity_box_->setCurrentIndex(index);
  refresh();
  emit quantity_changed(q);
}

void ResultView::set_scale_mode(ScaleMode mode) {
  // Fixed: the colours keep the range on screen now.
  if (mode == ScaleMode::kFixed)
    frozen_ = scale_range(scale_mode_, quantity_, range_, frozen_, thresholds_.limit.value_kpa);
  scale_mode_ = mode;
  const int index = scale_box_->findData(static_cast<int>(mode));
  if (index >= 0 && scale_box_->currentIndex() != index) scale_box_->setCurrentIndex(index);
  refresh();
}

void ResultView::set_bone_style(BoneStyle style) {
  bone_box_->setCurrentIndex(bone_box_->findData(static_cast<int>(style)));
}

void ResultView::set_section(SectionPlane plane) {
  section_box_->setCurrentIndex(section_box_->findData(static_cast<int>(plane)));
}

void ResultView::reset_camera() {
  scene_->reset_camera();
  view_->update();
}

void ResultView::clear() {
  solution_ = nullptr;
  band_.clear();
  range_ = band_range_ = ValueRange{};
  bar_->clear();
  scene_->clear();
  view_->update();
}

void ResultView::show_result(const analysis::ScenarioSolution& solution,
                             const analysis::ScenarioResult& result,
                             const analysis::Thresholds& thresholds, const QString& force_text,
                             const std::optional<ValueRange>& fixed_range) {
  if (&solution != solution_) {
    solution_ = &solution;
    scene_->set_model(solution.model().mesh, solution.pdl_nodes(), solution.model().geometry);
    band_ = analysis::pdl_crest_edge_band(solution);
    scene_->set_band(band_);
    if (!camera_set_) {
      // Start on the side the force loads (the compressed crest faces the reader).
      scene_->look_from(loaded_side(result.load.force_n), true);
      camera_set_ = true;
    }
  }
  result_ = result;
  thresholds_ = thresholds;
  force_text_ = force_text;
  fixed_range_ = fixed_range;
  refresh();
}

void ResultView::refresh() {
  if (!solution_) return;
  const std::vector<double> values = quantity_values(result_, quantity_, solution_->pdl_nodes());
  range_ = finite_range(values, band_, false);
  band_range_ = finite_range(values, band_, true);
  if (refreeze_) {
    frozen_ = range_;
    refreeze_ = false;
  }
  const ValueRange own =
      scale_range(scale_mode_, quantity_, range_, frozen_, thresholds_.limit.value_kpa);
  const ColourScale scale(quantity_, fixed_range_ ? *fixed_range_ : own);
  scene_->set_field(values, scale);
  const bool lines = has_threshold_lines(quantity_);
  scene_->set_iso_levels(thresholds_.capillary.value_kpa, thresholds_.limit.value_kpa, lines);
  scene_->set_load_glyphs(result_, force_text_);
  bar_->set_scale(scale, label(quantity_), unit_label(quantity_));
  bar_->set_marks(threshold_marks(thresholds_, quantity_));
  bar_->set_note(band_note(scale.range(), band_range_, unit_label(quantity_)));
  view_->update();
}

void ResultView::look_from(ViewSide side) {
  scene_->look_from(side);
  view_->update();
}

void ResultView::draw_marker(QPainter& painter, const QSize& size) const {
  if (!solution_) return;
  // A small compass in the lower left: the tooth's directions as seen now.
  Eigen::Vector3d right, up;
  scene_->screen_axes(&right, &up);
  const double radius = std::clamp(std::min(size.width(), size.height()) * 0.09, 34.0, 60.0);
  // Room for a label on either side of the disc.
  const QPointF centre(radius + 56, size.height() - radius - 24);
  painter.save();
  painter.setRenderHint(QPainter::Antialiasing, true);
  const Rgb box = label_box_colour();
  QColor disc = to_qcolor(box);
  disc.setAlphaF(static_cast<float>(label_box_opacity()));
  painter.setPen(Qt::NoPen);
  painter.setBrush(disc);
  painter.drawEllipse(centre, radius + 16, radius + 16);
  QFont font = painter.font();
  font.setPointSizeF(std::max(7.0, font.pointSizeF() * 0.85));
  painter.setFont(font);
  const QFontMetricsF fm(font);
  struct Arm {
    Eigen::Vector3d axis;
    const char* name;
    bool main;  // drawn as a full arm; the others only as a label at the tip
  };
  const Arm arms[] = {{Eigen::Vector3d::UnitX(), "labial", true},
                      {-Eigen::Vector3d::UnitX(), "lingual", false},
                      {Eigen::Vector3d::UnitY(), "mesial", true},
                      {-Eigen::Vector3d::UnitY(), "distal", false},
                      {Eigen::Vector3d::UnitZ(), "crown", true}};
  const QColor ink = to_qcolor(cres_label_colour());
  for (const Arm& a : arms) {
    const QPointF tip = centre + QPointF(a.axis.dot(right), -a.axis.dot(up)) * radius;
    if (a.main) {
      painter.setPen(QPen(ink, 2));
      painter.drawLine(centre, tip);
    }
    const QString text = QString::fromLatin1(a.name);
    const QSizeF t = fm.size(Qt::TextSingleLine, text);
    const QPointF away = tip - centre;
    const double len = std::hypot(away.x(), away.y());
    // A direction pointing at or away from the reader has no room on screen: no label.
    if (len < 0.3 * radius) continue;
    const QPointF at =
        len > 1 ? tip + away / len * (0.5 * t.width() * std::abs(away.x() / len) + 4) : tip;
    painter.setPen(a.main ? ink : ink.darker(130));
    painter.drawText(QRectF(at.x() - t.width() / 2, at.y() - t.height() / 2, t.width(), t.height()),
                     Qt::AlignCenter, text);
  }
  painter.restore();
}

QImage ResultView::grab_image() {
  QImage scene = view_->grabFramebuffer();
  if (!scene.isNull()) {
    QPainter painter(&scene);
    draw_marker(painter, scene.size());
  }
  if (!bar_->isVisible()) return scene;
  return bar_->beside(scene, palette().window().color());
}

}  // namespace sharpey::app
