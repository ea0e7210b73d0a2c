#include <Eigen/LU>
#include <cmath>
#include <limits>
#include <sstream>

#include "sharpey/analysis/detail/load_resolution.h"
#include "sharpey/error.h"

namespace sharpey::analysis::detail {
namespace {

constexpr double kFarAwayMm = 1000.0;  // a centre of rotation further than this means translation

// The force's line of action and the couple direction that opposes its tipping.
struct ForceGeometry {
  Eigen::Vector3d force_n = Eigen::Vector3d::Zero();
  Eigen::Vector3d point = Eigen::Vector3d::Zero();         // application point
  Eigen::Vector3d couple_unit = Eigen::Vector3d::UnitY();  // c_hat
};

Eigen::Vector3d checked_direction(const LoadSpec& load) {
  switch (load.preset) {
    case MovementPreset::kIntrusion:
      return -Eigen::Vector3d::UnitZ();
    case MovementPreset::kExtrusion:
      return Eigen::Vector3d::UnitZ();
    default:
      break;
  }
  const double norm = load.direction.norm();
  if (!std::isfinite(norm) || norm < 1e-9) {
    std::ostringstream msg;
    msg << "force direction (" << load.direction.transpose()
        << ") has no usable length; give a nonzero direction vector in tooth coordinates "
           "(x labial, y mesial, z toward the crown), e.g. (-1, 0, 0) for a lingual force";
    throw InputError("load.direction", msg.str());
  }
  return load.direction / norm;
}

ForceGeometry force_geometry(const LoadSpec& load, const LoadContext& context) {
  const double magnitude_n = load.force_n();
  if (!std::isfinite(magnitude_n) || !(magnitude_n > 0)) {
    std::ostringstream msg;
    msg << "force magnitude " << load.magnitude << " " << to_string(load.unit)
        << " must be positive; give a magnitude above 0 (orthodontic forces are typically 10 to "
           "150 g, about 0.1 to 1.5 N)";
    throw InputError("load.magnitude", msg.str());
  }
  ForceGeometry g;
  const Eigen::Vector3d f_hat = checked_direction(load);
  g.force_n = magnitude_n * f_hat;
  g.point = context.response.reference_point;
  if (load.bracket_height_mm >= 0) {
    if (load.bracket_height_mm > context.crown_tip_z_mm) {
      std::ostringstream msg;
      msg << "force application height " << load.bracket_height_mm
          << " mm above the CEJ lies above the crown tip (" << context.crown_tip_z_mm
          << " mm); use a height between 0 and " << context.crown_tip_z_mm
          << " mm, or a negative value for the bracket pad centre";
      throw InputError("load.bracket_height_mm", msg.str());
    }
    g.point.z() = load.bracket_height_mm;
  }
  // Centre of resistance for this direction: blend of the x and y heights by the squared
  // horizontal components (the direction's own CRes for x or y forces).
  const double wx = f_hat.x() * f_hat.x(), wy = f_hat.y() * f_hat.y();
  const double z_c = wx + wy > 1e-12
                         ? (wx * context.cres_x_z_mm + wy * context.cres_y_z_mm) / (wx + wy)
                         : 0.5 * (context.cres_x_z_mm + context.cres_y_z_mm);
  // Only the tipping part of the force's moment about the CRes (perpendicular to the long axis)
  // sets c_hat; a torque about the axis (a mesial force at a labial bracket) is not tipping.
  Eigen::Vector3d tipping = (g.point - Eigen::Vector3d(0, 0, z_c)).cross(g.force_n);
  tipping.z() = 0;
  if (tipping.norm() > 1e-9 * magnitude_n) {
    g.couple_unit = -tipping.normalized();
  } else {
    // The line of action passes through the CRes: no tipping to oppose; keep a conventional axis.
    const Eigen::Vector3d h(f_hat.x(), f_hat.y(), 0);
    g.couple_unit = h.norm() > 1e-9
                        ? Eigen::Vector3d(-Eigen::Vector3d::UnitZ().cross(h).normalized())
                        : Eigen::Vector3d(Eigen::Vector3d::UnitY());
  }
  return g;
}

// The couple that leaves the tooth without rotation: W_M C = -w(force), W_M the rotation per unit
// couple (3 x 3, invertible for an elastically held tooth).
Eigen::Vector3d couple_for_no_rotation(const ForceGeometry& g, const LoadContext& context) {
  const Eigen::Vector3d r = context.response.reference_point;
  const Eigen::Vector3d w0 =
      context.response.motion(g.force_n, (g.point - r).cross(g.force_n)).rotation_rad;
  const Eigen::Matrix3d W_M = context.response.matrix.block<3, 3>(3, 3);
  const Eigen::FullPivLU<Eigen::Matrix3d> lu(W_M);
  if (!lu.isInvertible()) {
    throw SolverError(
        "translation couple undefined: some couple does not rotate the tooth; the "
        "model is not held elastically (check the materials and the fixed bone faces)");
  }
  return -lu.solve(w0);
}

// The couple C = kappa |F| c_hat + tau |F| e_z that puts the centre of rotation at the axis point
// of height z (no displacement along d = c_hat x e_z there) with no turn about the long axis.
Eigen::Vector3d couple_for_centre_of_rotation(const ForceGeometry& g, const LoadContext& context,
                                              double z, const char* what) {
  const Eigen::Vector3d r = context.response.reference_point;
  const double f = g.force_n.norm();
  const RigidMotion base = context.response.motion(g.force_n, (g.point - r).cross(g.force_n));
  const RigidMotion per_kappa = context.response.motion(Eigen::Vector3d::Zero(), f * g.couple_unit);
  const RigidMotion per_tau =
      context.response.motion(Eigen::Vector3d::Zero(), f * Eigen::Vector3d::UnitZ());
  const Eigen::Vector3d d = g.couple_unit.cross(Eigen::Vector3d::UnitZ());
  const Eigen::Vector3d q(0, 0, z);
  Eigen::Matrix2d A;
  A << d.dot(per_kappa.displacement_at(q)), d.dot(per_tau.displacement_at(q)),
      per_kappa.rotation_rad.z(), per_tau.rotation_rad.z();
  const Eigen::Vector2d b(-d.dot(base.displacement_at(q)), -base.rotation_rad.z());
  const Eigen::FullPivLU<Eigen::Matrix2d> lu(A);
  if (!lu.isInvertible()) {
    std::ostringstream msg;
    msg << what << " undefined for this force: no couple moves the centre of rotation to z = " << z
        << " mm; use a force with a component perpendicular to the long axis";
    throw SolverError(msg.str());
  }
  const Eigen::Vector2d x = lu.solve(b);
  return f * (x(0) * g.couple_unit + x(1) * Eigen::Vector3d::UnitZ());
}

}  // namespace

ResolvedLoad resolve_load(const LoadSpec& load, const LoadContext& context) {
  ResolvedLoad out;
  const Eigen::Vector3d r = context.response.reference_point;
  if (load.preset == MovementPreset::kRotation) {
    const double magnitude_n = load.force_n();
    if (!std::isfinite(magnitude_n) || !(magnitude_n > 0)) {
      std::ostringstream msg;
      msg << "force magnitude " << load.magnitude << " " << to_string(load.unit)
          << " must be positive (the rotation couple is this force times half the crown width)";
      throw InputError("load.magnitude", msg.str());
    }
    const double lever_mm = 0.5 * context.crown_mesiodistal_mm;
    out.application_point = r;
    out.couple_nmm = magnitude_n * lever_mm * Eigen::Vector3d::UnitZ();
    out.moment_nmm = out.couple_nmm;
    out.moment_to_force_mm = lever_mm;
    out.preset = load.preset;
    return out;
  }
  const ForceGeometry g = force_geometry(load, context);
  const double magnitude_n = g.force_n.norm();
  Eigen::Vector3d couple = Eigen::Vector3d::Zero();
  switch (load.preset) {
    case MovementPreset::kNone:
      if (load.couple == CoupleKind::kRatio) {
        couple = load.moment_to_force_mm * magnitude_n * g.couple_unit;
      } else if (load.couple == CoupleKind::kMoment) {
        couple = load.moment_nmm;
      }
      break;
    case MovementPreset::kUncontrolledTipping:
      break;
    case MovementPreset::kControlledTipping:
      couple = couple_for_centre_of_rotation(g, context, context.apex_z_mm, "controlled tipping");
      break;
    case MovementPreset::kRootMovement:
      couple = couple_for_centre_of_rotation(g, context, g.point.z(), "root movement");
      break;
    case MovementPreset::kTranslation:
    case MovementPreset::kIntrusion:
    case MovementPreset::kExtrusion:
      couple = couple_for_no_rotation(g, context);
      break;
    case MovementPreset::kRotation:
      break;  // handled above
  }
  out.force_n = g.force_n;
  out.application_point = g.point;
  out.couple_nmm = couple;
  out.moment_nmm = (g.point - r).cross(g.force_n) + couple;
  out.moment_to_force_mm = couple.dot(g.couple_unit) / magnitude_n;
  out.preset = load.preset;
  return out;
}

double translation_moment_to_force(const LoadSpec& load, const LoadContext& context) {
  LoadSpec t = load;
  if (t.preset != MovementPreset::kIntrusion && t.preset != MovementPreset::kExtrusion) {
    t.preset = MovementPreset::kTranslation;
  }
  return resolve_load(t, context).moment_to_force_mm;
}

bool centre_of_rotation(const RigidMotion& motion, Eigen::Vector3d* point) {
  const Eigen::Vector3d w = motion.rotation_rad;
  const Eigen::Vector3d d = w.cross(Eigen::Vector3d::UnitZ());  // horizontal, normal to w_h
  if (!(d.norm() > 1e-3 * w.norm())) return false;  // no rotation, or about the long axis only
  double z = 0;
  if (!axis_point_without_displacement(motion, d.normalized(), kFarAwayMm, &z)) return false;
  *point = Eigen::Vector3d(0, 0, z);
  return true;
}

}  // namespace sharpey::analysis::detail
