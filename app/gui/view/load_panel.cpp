#include "view/load_panel.h"

#include <QCheckBox>
#include <QComboBox>
#include <QDoubleSpinBox>
#include <QFormLayout>
#include <QHBoxLayout>
#include <QLabel>
#include <QSlider>
#include <QVBoxLayout>
#include <cmath>

#include "core/units.h"

namespace sharpey::app {

namespace {
QDoubleSpinBox* spin(double lo, double hi, int decimals, const QString& suffix) {
  auto* s = new QDoubleSpinBox;
  s->setRange(lo, hi);
  s->setDecimals(decimals);
  s->setSuffix(suffix);
  s->setKeyboardTracking(false);
  s->setAccelerated(true);
  return s;
}
}  // namespace

LoadPanel::LoadPanel(QWidget* parent) : QWidget(parent) {
  auto* form = new QFormLayout(this);
  form->setFieldGrowthPolicy(QFormLayout::AllNonFixedFieldsGrow);
  add_force_rows(form);
  add_direction_rows(form);
  add_application_rows(form);
  add_couple_rows(form);
  add_preset_rows(form);
  connect_force_controls();
  connect_couple_controls();
  sync_widgets();
}

// Magnitude: field, unit and slider.
void LoadPanel::add_force_rows(QFormLayout* form) {
  auto* mag_row = new QWidget;
  auto* mag = new QHBoxLayout(mag_row);
  mag->setContentsMargins(0, 0, 0, 0);
  magnitude_ = spin(0, 5000, 0, QString());
  unit_ = new QComboBox;
  for (auto u : {analysis::ForceUnit::kGram, analysis::ForceUnit::kCentinewton,
                 analysis::ForceUnit::kNewton})
    unit_->addItem(force_unit_label(u), static_cast<int>(u));
  mag->addWidget(magnitude_, 1);
  mag->addWidget(unit_);
  form->addRow(QStringLiteral("Force"), mag_row);
  slider_ = new QSlider(Qt::Horizontal);
  slider_->setRange(0, kSliderSteps);
  slider_->setToolTip(QStringLiteral("Drag to change the force; colours and numbers follow"));
  form->addRow(QString(), slider_);
}

// Direction: named or free angles.
void LoadPanel::add_direction_rows(QFormLayout* form) {
  direction_ = new QComboBox;
  for (DirectionChoice d : all_direction_choices())
    direction_->addItem(label(d), static_cast<int>(d));
  form->addRow(QStringLiteral("Direction"), direction_);
  auto* angle_row = new QWidget;
  auto* angles = new QHBoxLayout(angle_row);
  angles->setContentsMargins(0, 0, 0, 0);
  azimuth_ = spin(-180, 180, 0, QStringLiteral("\u00b0"));
  azimuth_->setWrapping(true);
  azimuth_->setToolTip(
      QStringLiteral("Azimuth around the long axis: 0\u00b0 labial, 90\u00b0 mesial"));
  elevation_ = spin(-90, 90, 0, QStringLiteral("\u00b0"));
  elevation_->setToolTip(QStringLiteral("Elevation: +90\u00b0 extrusive, -90\u00b0 intrusive"));
  angles->addWidget(new QLabel(QStringLiteral("az")));
  angles->addWidget(azimuth_, 1);
  angles->addWidget(new QLabel(QStringLiteral("el")));
  angles->addWidget(elevation_, 1);
  form->addRow(QString(), angle_row);
}

// Point of application.
void LoadPanel::add_application_rows(QFormLayout* form) {
  at_pad_ = new QCheckBox(QStringLiteral("at the bracket centre"));
  form->addRow(QStringLiteral("Applied"), at_pad_);
  height_ = spin(0, 15, 1, QStringLiteral(" mm above CEJ"));
  form->addRow(QString(), height_);
}

// Couple: none, a moment or a moment-to-force ratio.
void LoadPanel::add_couple_rows(QFormLayout* form) {
  couple_ = new QComboBox;
  for (auto k :
       {analysis::CoupleKind::kNone, analysis::CoupleKind::kMoment, analysis::CoupleKind::kRatio})
    couple_->addItem(label(k), static_cast<int>(k));
  form->addRow(QStringLiteral("Couple"), couple_);
  moment_row_ = new QWidget;
  auto* mrow = new QHBoxLayout(moment_row_);
  mrow->setContentsMargins(0, 0, 0, 0);
  const char* axes[3] = {"x", "y", "z"};
  for (int i = 0; i < 3; ++i) {
    moment_[i] = spin(-20000, 20000, 0, QString());
    moment_[i]->setToolTip(QStringLiteral("Couple about the %1 axis").arg(QLatin1String(axes[i])));
    mrow->addWidget(new QLabel(QLatin1String(axes[i])));
    mrow->addWidget(moment_[i], 1);
  }
  moment_unit_ = new QLabel;
  mrow->addWidget(moment_unit_);
  form->addRow(QString(), moment_row_);
  ratio_row_ = new QWidget;
  auto* rrow = new QHBoxLayout(ratio_row_);
  rrow->setContentsMargins(0, 0, 0, 0);
  ratio_ = spin(-30, 30, 1, QStringLiteral(" mm"));
  ratio_->setToolTip(
      QStringLiteral("Moment-to-force ratio: the couple opposing the force's tipping, "
                     "divided by the force"));
  rrow->addWidget(ratio_, 1);
  form->addRow(QString(), ratio_row_);
}

// Movement preset, its note and the force system resolved by the library.
void LoadPanel::add_preset_rows(QFormLayout* form) {
  preset_ = new QComboBox;
  for (auto p : panel_presets()) preset_->addItem(label(p), static_cast<int>(p));
  preset_->setToolTip(QStringLiteral("Sets the couple from this scenario's centre of resistance"));
  form->addRow(QStringLiteral("Movement"), preset_);
  preset_note_ = new QLabel;
  preset_note_->setWordWrap(true);
  preset_note_->setStyleSheet(QStringLiteral("color: #5a5a5a;"));
  form->addRow(QString(), preset_note_);
  resolved_ = new QLabel;
  resolved_->setWordWrap(true);
  resolved_->setTextInteractionFlags(Qt::TextSelectableByMouse);
  resolved_->setStyleSheet(QStringLiteral("color: #2f3b47; background: #eef1f4; padding: 4px;"));
  form->addRow(resolved_);
}

// Magnitude, unit, direction and point of application write into controls_.
void LoadPanel::connect_force_controls() {
  connect(slider_, &QSlider::valueChanged, this, [this](int position) {
    if (updating_) return;
    controls_.magnitude = magnitude_from_slider(position, controls_.unit);
    edited(slider_->isSliderDown());
  });
  connect(slider_, &QSlider::sliderReleased, this, [this]() { edited(false); });
  connect(magnitude_, &QDoubleSpinBox::valueChanged, this, [this](double v) {
    if (updating_) return;
    controls_.magnitude = v;
    edited(false);
  });
  connect(unit_, &QComboBox::currentIndexChanged, this, [this]() {
    if (updating_) return;
    controls_.set_unit(static_cast<analysis::ForceUnit>(unit_->currentData().toInt()));
    edited(false);
  });
  connect(direction_, &QComboBox::currentIndexChanged, this, [this]() {
    if (updating_) return;
    controls_.set_direction(static_cast<DirectionChoice>(direction_->currentData().toInt()));
    edited(false);
  });
  auto angles_edited = [this]() {
    if (updating_) return;
    controls_.set_angles(azimuth_->value(), elevation_->value());
    edited(false);
  };
  connect(azimuth_, &QDoubleSpinBox::valueChanged, this, angles_edited);
  connect(elevation_, &QDoubleSpinBox::valueChanged, this, angles_edited);
  connect(at_pad_, &QCheckBox::toggled, this, [this](bool on) {
    if (updating_) return;
    controls_.at_pad_centre = on;
    edited(false);
  });
  connect(height_, &QDoubleSpinBox::valueChanged, this, [this](double v) {
    if (updating_) return;
    controls_.bracket_height_mm = v;
    edited(false);
  });
}

// Couple, moment, ratio and preset write into controls_.
void LoadPanel::connect_couple_controls() {
  connect(couple_, &QComboBox::currentIndexChanged, this, [this]() {
    if (updating_) return;
    controls_.couple = static_cast<analysis::CoupleKind>(couple_->currentData().toInt());
    edited(false);
  });
  for (int i = 0; i < 3; ++i)
    connect(moment_[i], &QDoubleSpinBox::valueChanged, this, [this, i](double v) {
      if (updating_) return;
      controls_.moment(i) = v;
      edited(false);
    });
  connect(ratio_, &QDoubleSpinBox::valueChanged, this, [this](double v) {
    if (updating_) return;
    controls_.moment_to_force_mm = v;
    edited(false);
  });
  connect(preset_, &QComboBox::currentIndexChanged, this, [this]() {
    if (updating_) return;
    controls_.preset = static_cast<analysis::MovementPreset>(preset_->currentData().toInt());
    edited(false);
  });
}

void LoadPanel::set_controls(const LoadControls& controls) {
  controls_ = controls;
  sync_widgets();
}

void LoadPanel::edited(bool interactive) {
  sync_widgets();
  emit changed(controls_, interactive);
}

void LoadPanel::sync_widgets() {
  updating_ = true;
  const LoadControls& c = controls_;
  magnitude_->setDecimals(force_decimals(c.unit));
  magnitude_->setSingleStep(c.unit == analysis::ForceUnit::kNewton ? 0.05 : 5);
  magnitude_->setValue(c.magnitude);
  if (!slider_->isSliderDown()) slider_->setValue(slider_from_magnitude(c.magnitude, c.unit));
  unit_->setCurrentIndex(unit_->findData(static_cast<int>(c.unit)));
  direction_->setCurrentIndex(direction_->findData(static_cast<int>(c.direction)));
  azimuth_->setValue(c.azimuth_deg);
  elevation_->setValue(c.elevation_deg);
  at_pad_->setChecked(c.at_pad_centre);
  height_->setEnabled(!c.at_pad_centre);
  height_->setValue(c.bracket_height_mm);
  couple_->setCurrentIndex(couple_->findData(static_cast<int>(c.couple)));
  for (int i = 0; i < 3; ++i) moment_[i]->setValue(c.moment(i));
  moment_unit_->setText(moment_unit_label(c.unit));
  ratio_->setValue(c.moment_to_force_mm);
  preset_->setCurrentIndex(preset_->findData(static_cast<int>(c.preset)));
  const bool preset = c.preset != analysis::MovementPreset::kNone;
  couple_->setEnabled(!preset);
  moment_row_->setVisible(c.couple == analysis::CoupleKind::kMoment);
  ratio_row_->setVisible(c.couple == analysis::CoupleKind::kRatio);
  moment_row_->setEnabled(!preset);
  ratio_row_->setEnabled(!preset);
  preset_note_->setVisible(preset);
  preset_note_->setText(
      QStringLiteral("The preset sets the couple (and for intrusion, extrusion and "
                     "rotation the force) from the centre of resistance of the "
                     "scenario shown."));
  updating_ = false;
}

void LoadPanel::set_resolved(const analysis::ScenarioResult* r) {
  if (!r) {
    resolved_->setText(QStringLiteral("Resolved at the bracket: not solved yet."));
    return;
  }
  resolved_->setText(describe_resolved(*r, controls_.unit));
}

QString LoadPanel::resolved_text() const { return resolved_->text(); }

}  // namespace sharpey::app
