// Turning a load specification into a force and a couple at the bracket, including the movement
// presets solved from the tooth's rigid response.
//
// Internal to the analysis library; not a stable interface.
#pragma once

#include <Eigen/Core>

#include "sharpey/analysis/case_spec.h"
#include "sharpey/analysis/detail/rigid_motion.h"
#include "sharpey/analysis/study.h"

namespace sharpey::analysis::detail {

// What the load resolution needs to know about one scenario.
struct LoadContext {
  RigidResponse response;     // reference_point = bracket centre (where the unit cases act)
  double crown_tip_z_mm = 0;  // upper limit of the application height
  double apex_z_mm = 0;       // controlled tipping puts the centre of rotation here
  double cres_x_z_mm = 0;     // centre-of-resistance heights for x and y forces
  double cres_y_z_mm = 0;
  double crown_mesiodistal_mm = 0;  // lever arm of the rotation preset is half of it
};

// Resolves `load`:
// - force: magnitude (converted to N) along the unit direction; intrusion / extrusion presets use
//   -z / +z; the rotation preset applies no net force.
// - application point: the bracket centre, or at `bracket_height_mm` above the CEJ straight above
//   or below it (same x and y; the crown's curvature is ignored). The force's moment about the
//   bracket centre is included in the resolved moment.
// - couple direction c_hat: opposite to the tipping part (perpendicular to the long axis) of the
//   force's moment about the centre of resistance, m = (p - c) x F with c on the long axis at the
//   CRes height for the force's horizontal direction (x and y heights blended by the squared
//   direction components). The moment-to-force ratio reported is kappa = C . c_hat / |F| (mm,
//   positive when the couple opposes tipping).
// - couple C from the couple kind (none: 0; ratio: kappa |F| c_hat; moment: as given) or the
// preset:
//     uncontrolled tipping  no couple
//     controlled tipping    C = kappa |F| c_hat + tau |F| e_z with the axis point at the apex
//     height
//                           not moving along d = c_hat x e_z and no turn about the long axis
//     translation           C cancelling the whole rotation: W_M C = -w(force), 3 x 3
//     root movement         as controlled tipping, with the axis point at the application height
//     intrusion, extrusion  as translation, force along -z / +z
//     rotation              no force; a couple |F| * (crown mesiodistal width / 2) about +z
//                           (counter-clockwise seen from the crown); kappa = width / 2
//   Each preset is a small linear system on the superposed rigid motion.
// Throws InputError ("load.magnitude", "load.direction", "load.bracket_height_mm") for values the
// resolution cannot use, SolverError when a preset's equation is degenerate.
ResolvedLoad resolve_load(const LoadSpec& load, const LoadContext& context);

// Moment-to-force ratio (mm) of the translation couple for the load's force (its preset
// replaced by translation; intrusion and extrusion keep their vertical force; the rotation preset
// uses the load's direction).
double translation_moment_to_force(const LoadSpec& load, const LoadContext& context);

// Centre of rotation of `motion` on the long axis: the axis point that does not move perpendicular
// to the axis in the plane of rotation (the plane containing the axis and perpendicular to the
// horizontal part of the rotation vector). Returns false when the tooth translates (the centre is
// further than 1000 mm away) or turns about its own long axis (no plane of rotation).
bool centre_of_rotation(const RigidMotion& motion, Eigen::Vector3d* point);

}  // namespace sharpey::analysis::detail
