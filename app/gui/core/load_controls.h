// State of the force-system panel and its translation into an analysis::LoadSpec (and back).
// Plain logic, no widgets: the panel only mirrors this struct.
#pragma once

#include <Eigen/Core>
#include <QString>
#include <optional>
#include <vector>

#include "sharpey/analysis/case_spec.h"
#include "sharpey/analysis/study.h"

namespace sharpey::app {

// How the force direction is given: one of the six named directions of the tooth coordinate
// system (labial +x, lingual -x, mesial +y, distal -y, extrusive +z, intrusive -z), or free angles.
enum class DirectionChoice { kLabial, kLingual, kMesial, kDistal, kIntrusive, kExtrusive, kAngles };
std::vector<DirectionChoice> all_direction_choices();
QString label(DirectionChoice choice);
// Unit vector of a named choice (kAngles has none: use direction_from_angles).
Eigen::Vector3d direction_vector(DirectionChoice choice);
// The named choice whose vector equals `direction` (within 1e-6), if any.
std::optional<DirectionChoice> named_choice_for(const Eigen::Vector3d& direction);

// Free angles: azimuth around the long axis from labial (+x) toward mesial (+y), degrees;
// elevation toward the crown (+z), degrees in [-90, 90].
Eigen::Vector3d direction_from_angles(double azimuth_deg, double elevation_deg);
// Inverse of direction_from_angles for a nonzero vector; azimuth in (-180, 180].
void angles_from_direction(const Eigen::Vector3d& direction, double* azimuth_deg,
                           double* elevation_deg);

QString label(analysis::MovementPreset preset);
QString label(analysis::CoupleKind kind);
// Presets offered in the panel, kNone first.
std::vector<analysis::MovementPreset> panel_presets();

struct LoadControls {
  double magnitude = 100;  // in `unit`
  analysis::ForceUnit unit = analysis::ForceUnit::kGram;
  DirectionChoice direction = DirectionChoice::kLingual;
  double azimuth_deg = 180;  // kept equal to the direction's angles
  double elevation_deg = 0;
  bool at_pad_centre = true;     // force at the bracket pad centre
  double bracket_height_mm = 0;  // above the CEJ, when !at_pad_centre
  analysis::CoupleKind couple = analysis::CoupleKind::kNone;
  Eigen::Vector3d moment = Eigen::Vector3d::Zero();  // couple components in `unit`.mm
  double moment_to_force_mm = 0;                     // when couple == kRatio
  analysis::MovementPreset preset = analysis::MovementPreset::kNone;

  // Switches the display unit, converting the magnitude and the moment so the load is unchanged.
  void set_unit(analysis::ForceUnit new_unit);
  // Picks a named direction (angles follow) or kAngles (angles kept).
  void set_direction(DirectionChoice choice);
  // Sets free angles; the direction becomes kAngles unless they match a named direction.
  void set_angles(double azimuth, double elevation);
  Eigen::Vector3d direction_vector() const;
  double force_n() const;
};

analysis::LoadSpec to_load_spec(const LoadControls& controls);
LoadControls from_load_spec(const analysis::LoadSpec& load);

// The magnitude slider: integer positions 0..kSliderSteps over 0..slider_max(unit).
inline constexpr int kSliderSteps = 1000;
double slider_max(analysis::ForceUnit unit);  // 500 g, 500 cN, 5 N
int slider_from_magnitude(double magnitude, analysis::ForceUnit unit);
double magnitude_from_slider(int position, analysis::ForceUnit unit);

// One-line description of the force system for titles and reports, e.g.
// "100 g lingual at the bracket centre, translation preset".
QString describe(const LoadControls& controls);

// The force system a result was evaluated under, as resolved at the bracket, in `unit` (forces in
// g, cN or N, moments in that unit times mm with each component named by the axis it turns about):
// the point of application, the moment about the bracket centre (force and couple), the couple
// alone and its moment-to-force ratio. Three sentences, separated by line breaks.
QString describe_resolved(const analysis::ScenarioResult& result, analysis::ForceUnit unit);

}  // namespace sharpey::app
