#include "core/load_controls.h"

#include <algorithm>
#include <cmath>

#include "core/units.h"
#include "sharpey/core/constants.h"

namespace sharpey::app {

namespace {
using sharpey::core::kPi;
constexpr double kDeg = kPi / 180.0;
}  // namespace

std::vector<DirectionChoice> all_direction_choices() {
  return {DirectionChoice::kLabial, DirectionChoice::kLingual,   DirectionChoice::kMesial,
          DirectionChoice::kDistal, DirectionChoice::kIntrusive, DirectionChoice::kExtrusive,
          DirectionChoice::kAngles};
}

QString label(DirectionChoice choice) {
  switch (choice) {
    case DirectionChoice::kLabial:
      return QStringLiteral("labial");
    case DirectionChoice::kLingual:
      return QStringLiteral("lingual");
    case DirectionChoice::kMesial:
      return QStringLiteral("mesial");
    case DirectionChoice::kDistal:
      return QStringLiteral("distal");
    case DirectionChoice::kIntrusive:
      return QStringLiteral("intrusive");
    case DirectionChoice::kExtrusive:
      return QStringLiteral("extrusive");
    case DirectionChoice::kAngles:
      return QStringLiteral("free angles");
  }
  return {};
}

Eigen::Vector3d direction_vector(DirectionChoice choice) {
  switch (choice) {
    case DirectionChoice::kLabial:
      return Eigen::Vector3d::UnitX();
    case DirectionChoice::kLingual:
      return -Eigen::Vector3d::UnitX();
    case DirectionChoice::kMesial:
      return Eigen::Vector3d::UnitY();
    case DirectionChoice::kDistal:
      return -Eigen::Vector3d::UnitY();
    case DirectionChoice::kIntrusive:
      return -Eigen::Vector3d::UnitZ();
    case DirectionChoice::kExtrusive:
      return Eigen::Vector3d::UnitZ();
    case DirectionChoice::kAngles:
      break;
  }
  return Eigen::Vector3d::Zero();
}

std::optional<DirectionChoice> named_choice_for(const Eigen::Vector3d& direction) {
  const double n = direction.norm();
  if (!(n > 0)) return std::nullopt;
  for (DirectionChoice c : all_direction_choices()) {
    if (c == DirectionChoice::kAngles) continue;
    if ((direction / n - direction_vector(c)).norm() < 1e-6) return c;
  }
  return std::nullopt;
}

Eigen::Vector3d direction_from_angles(double azimuth_deg, double elevation_deg) {
  const double az = azimuth_deg * kDeg, el = elevation_deg * kDeg;
  Eigen::Vector3d d(std::cos(el) * std::cos(az), std::cos(el) * std::sin(az), std::sin(el));
  // Snap round-off so that e.g. 180 degrees gives exactly -x.
  for (int i = 0; i < 3; ++i)
    if (std::abs(d(i)) < 1e-12) d(i) = 0;
  return d.normalized();
}

void angles_from_direction(const Eigen::Vector3d& direction, double* azimuth_deg,
                           double* elevation_deg) {
  const Eigen::Vector3d d = direction.normalized();
  const double horizontal = std::hypot(d.x(), d.y());
  *elevation_deg = std::atan2(d.z(), horizontal) / kDeg;
  // Vertical forces have no azimuth; keep 0.
  *azimuth_deg = horizontal < 1e-12 ? 0.0 : std::atan2(d.y(), d.x()) / kDeg;
  if (*azimuth_deg <= -180.0 + 1e-12) *azimuth_deg = 180.0;
}

QString label(analysis::MovementPreset preset) {
  using P = analysis::MovementPreset;
  switch (preset) {
    case P::kNone:
      return QStringLiteral("none (couple as set)");
    case P::kUncontrolledTipping:
      return QStringLiteral("uncontrolled tipping");
    case P::kControlledTipping:
      return QStringLiteral("controlled tipping");
    case P::kTranslation:
      return QStringLiteral("translation (bodily)");
    case P::kRootMovement:
      return QStringLiteral("root movement");
    case P::kIntrusion:
      return QStringLiteral("intrusion");
    case P::kExtrusion:
      return QStringLiteral("extrusion");
    case P::kRotation:
      return QStringLiteral("rotation about the long axis");
  }
  return {};
}

QString label(analysis::CoupleKind kind) {
  switch (kind) {
    case analysis::CoupleKind::kNone:
      return QStringLiteral("no couple");
    case analysis::CoupleKind::kMoment:
      return QStringLiteral("moment");
    case analysis::CoupleKind::kRatio:
      return QStringLiteral("moment-to-force ratio");
  }
  return {};
}

std::vector<analysis::MovementPreset> panel_presets() {
  using P = analysis::MovementPreset;
  return {P::kNone,         P::kUncontrolledTipping, P::kControlledTipping, P::kTranslation,
          P::kRootMovement, P::kIntrusion,           P::kExtrusion,         P::kRotation};
}

void LoadControls::set_unit(analysis::ForceUnit new_unit) {
  if (new_unit == unit) return;
  magnitude = analysis::convert_force(magnitude, unit, new_unit);
  for (int i = 0; i < 3; ++i) moment(i) = analysis::convert_force(moment(i), unit, new_unit);
  unit = new_unit;
}

void LoadControls::set_direction(DirectionChoice choice) {
  direction = choice;
  if (choice != DirectionChoice::kAngles)
    angles_from_direction(app::direction_vector(choice), &azimuth_deg, &elevation_deg);
}

void LoadControls::set_angles(double azimuth, double elevation) {
  azimuth_deg = azimuth;
  elevation_deg = std::clamp(elevation, -90.0, 90.0);
  const auto named = named_choice_for(direction_from_angles(azimuth_deg, elevation_deg));
  direction = named ? *named : DirectionChoice::kAngles;
}

Eigen::Vector3d LoadControls::direction_vector() const {
  if (direction == DirectionChoice::kAngles)
    return direction_from_angles(azimuth_deg, elevation_deg);
  return app::direction_vector(direction);
}

double LoadControls::force_n() const { return analysis::to_newton(magnitude, unit); }

analysis::LoadSpec to_load_spec(const LoadControls& c) {
  analysis::LoadSpec load;
  load.magnitude = c.magnitude;
  load.unit = c.unit;
  load.direction = c.direction_vector();
  load.bracket_height_mm = c.at_pad_centre ? -1.0 : c.bracket_height_mm;
  load.couple = c.couple;
  load.moment_nmm = Eigen::Vector3d::Zero();
  for (int i = 0; i < 3; ++i) load.moment_nmm(i) = analysis::moment_to_nmm(c.moment(i), c.unit);
  load.moment_to_force_mm = c.moment_to_force_mm;
  load.preset = c.preset;
  return load;
}

LoadControls from_load_spec(const analysis::LoadSpec& load) {
  LoadControls c;
  c.magnitude = load.magnitude;
  c.unit = load.unit;
  const auto named = named_choice_for(load.direction);
  if (named) {
    c.set_direction(*named);
  } else {
    c.direction = DirectionChoice::kAngles;
    angles_from_direction(load.direction, &c.azimuth_deg, &c.elevation_deg);
  }
  c.at_pad_centre = load.bracket_height_mm < 0;
  c.bracket_height_mm = c.at_pad_centre ? 0.0 : load.bracket_height_mm;
  c.couple = load.couple;
  for (int i = 0; i < 3; ++i)
    c.moment(i) = analysis::moment_from_nmm(load.moment_nmm(i), load.unit);
  c.moment_to_force_mm = load.moment_to_force_mm;
  c.preset = load.preset;
  return c;
}

double slider_max(analysis::ForceUnit unit) {
  switch (unit) {
    case analysis::ForceUnit::kGram:
      return 500.0;
    case analysis::ForceUnit::kCentinewton:
      return 500.0;
    case analysis::ForceUnit::kNewton:
      return 5.0;
  }
  return 500.0;
}

int slider_from_magnitude(double magnitude, analysis::ForceUnit unit) {
  const double t = magnitude / slider_max(unit);
  return static_cast<int>(std::lround(std::clamp(t, 0.0, 1.0) * kSliderSteps));
}

double magnitude_from_slider(int position, analysis::ForceUnit unit) {
  return slider_max(unit) * std::clamp(position, 0, kSliderSteps) / kSliderSteps;
}

QString describe(const LoadControls& c) {
  QString text = with_unit(c.magnitude, force_unit_label(c.unit), force_decimals(c.unit));
  if (c.direction == DirectionChoice::kAngles) {
    text += QStringLiteral(" at azimuth %1\u00b0, elevation %2\u00b0")
                .arg(c.azimuth_deg, 0, 'f', 0)
                .arg(c.elevation_deg, 0, 'f', 0);
  } else {
    text += QLatin1Char(' ') + label(c.direction);
  }
  text += c.at_pad_centre ? QStringLiteral(" at the bracket centre")
                          : QStringLiteral(" at %1 above the CEJ")
                                .arg(with_unit(c.bracket_height_mm, QStringLiteral("mm"), 1));
  if (c.preset != analysis::MovementPreset::kNone) {
    text += QStringLiteral(", %1 preset").arg(label(c.preset));
  } else if (c.couple == analysis::CoupleKind::kRatio) {
    text +=
        QStringLiteral(", M/F %1").arg(with_unit(c.moment_to_force_mm, QStringLiteral("mm"), 1));
  } else if (c.couple == analysis::CoupleKind::kMoment) {
    text += QStringLiteral(", couple (%1, %2, %3) %4")
                .arg(c.moment.x(), 0, 'f', 0)
                .arg(c.moment.y(), 0, 'f', 0)
                .arg(c.moment.z(), 0, 'f', 0)
                .arg(moment_unit_label(c.unit));
  }
  return text;
}

QString describe_resolved(const analysis::ScenarioResult& r, analysis::ForceUnit unit) {
  const analysis::ResolvedLoad& l = r.load;
  const int decimals = force_decimals(unit);
  const QString force =
      with_unit(analysis::from_newton(l.force_n.norm(), unit), force_unit_label(unit), decimals);
  auto moment = [&](const Eigen::Vector3d& m_nmm) {
    const QString u = moment_unit_label(unit);
    auto c = [&](double v) { return with_unit(analysis::moment_from_nmm(v, unit), u, decimals); };
    return QStringLiteral(
               "%1 about the labiolingual axis, %2 about the mesiodistal axis, %3 about the long "
               "axis")
        .arg(c(m_nmm.x()), c(m_nmm.y()), c(m_nmm.z()));
  };
  return QStringLiteral(
             "At the bracket (%1): force %2 (%3), applied %4 above the CEJ.\n"
             "Moment about the bracket centre (force and couple): %5.\n"
             "Couple alone: %6; its moment-to-force ratio %7.")
      .arg(QString::fromStdString(r.name), force,
           with_unit(l.force_n.norm(), QStringLiteral("N"), 3),
           with_unit(l.application_point.z(), QStringLiteral("mm"), 1), moment(l.moment_nmm),
           moment(l.couple_nmm), with_unit(l.moment_to_force_mm, QStringLiteral("mm"), 1));
}

}  // namespace sharpey::app
