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
  Eigen::Vector3d point = Eigen::Vector3d::Zero();       // application point
  Eigen::Vector3d couple_unit = Eigen::Vector3d::UnitY();  // c_hat
};

Eigen::Vector3d checked_direction(const LoadSpec& load) {
  switch (load.preset) {
    case MovementPreset::kIntrusion: return -Eigen::Vector3d::UnitZ();
    case MovementPreset::kExtrusion: return Eigen::Vector3d::UnitZ();
    default: break;
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
        << " must be positive; give the force in " << to_string(load.unit) << ", e.g. 100 g";
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
  const double z_c = wx + wy > 1e-12 ? (wx * context.cres_x_z_mm + wy * context.cres_y_z_mm) / (wx + wy)
                                      : 0.5 * (context.cres_x_z_mm + context.cres_y_z_mm);
  const Eigen::Vector3d tipping = (g.point - Eigen::Vector3d(0, 0, z_c)).cross(g.force_n);
  if (tipping.norm() > 1e-9 * magnitude_n) {
    g.couple_unit = -tipping.normalized();
  } else {
    // The line of action passes through the CRes: no tipping to oppose; keep a conventional axis.
    const Eigen::Vector3d h(f_hat.x(), f_hat.y(), 0);
    g.couple_unit = h.norm() > 1e-9 ? Eigen::Vector3d(-Eigen::Vector3d::UnitZ().cross(h).normalized())
                                    : Eigen::Vector3d(Eigen::Vector3d::UnitY());
  }
  return g;
}

// Rigid motion of the force (with its moment about the bracket) plus kappa times the unit couple.
struct MotionPair {
  RigidMotion base, per_kappa;
};

MotionPair motions(const ForceGeometry& g, const LoadContext& context) {
  const Eigen::Vector3d r = context.response.reference_point;
  MotionPair m;
  m.base = context.response.motion(g.force_n, (g.point - r).cross(g.force_n));
  m.per_kappa = context.response.motion(Eigen::Vector3d::Zero(), g.force_n.norm() * g.couple_unit);
  return m;
}

double kappa_for_no_rotation(const MotionPair& m) {
  const double den = m.per_kappa.rotation_rad.squaredNorm();
  if (!(den > 0)) throw SolverError("translation couple undefined: a couple does not rotate the tooth");
  return -m.base.rotation_rad.dot(m.per_kappa.rotation_rad) / den;
}

double kappa_for_centre_of_rotation(const MotionPair& m, const ForceGeometry& g, double z,
                                    const char* what) {
  // Displacement of the axis point along the force's tipping plane: d = c_hat x e_z.
  const Eigen::Vector3d d = g.couple_unit.cross(Eigen::Vector3d::UnitZ());
  const Eigen::Vector3d q(0, 0, z);
  const double den = d.dot(m.per_kappa.displacement_at(q));
  const double num = d.dot(m.base.displacement_at(q));
  if (d.norm() < 1e-9 || !(std::abs(den) > 1e-12 * std::abs(num))) {
    std::ostringstream msg;
    msg << what << " undefined for this force: no couple moves the centre of rotation to z = " << z
        << " mm; use a force with a component perpendicular to the long axis";
    throw SolverError(msg.str());
  }
  return -num / den;
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
  double kappa = 0;
  Eigen::Vector3d extra_couple = Eigen::Vector3d::Zero();  // part of a given moment off c_hat
  switch (load.preset) {
    case MovementPreset::kNone:
      if (load.couple == CoupleKind::kRatio) {
        kappa = load.moment_to_force_mm;
      } else if (load.couple == CoupleKind::kMoment) {
        kappa = load.moment_nmm.dot(g.couple_unit) / magnitude_n;
        extra_couple = load.moment_nmm - kappa * magnitude_n * g.couple_unit;
      }
      break;
    case MovementPreset::kUncontrolledTipping: kappa = 0; break;
    case MovementPreset::kControlledTipping:
      kappa = kappa_for_centre_of_rotation(motions(g, context), g, context.apex_z_mm,
                                           "controlled tipping");
      break;
    case MovementPreset::kRootMovement:
      kappa = kappa_for_centre_of_rotation(motions(g, context), g, g.point.z(), "root movement");
      break;
    case MovementPreset::kTranslation:
    case MovementPreset::kIntrusion:
    case MovementPreset::kExtrusion: kappa = kappa_for_no_rotation(motions(g, context)); break;
    case MovementPreset::kRotation: break;  // handled above
  }
  out.force_n = g.force_n;
  out.application_point = g.point;
  out.couple_nmm = kappa * magnitude_n * g.couple_unit + extra_couple;
  out.moment_nmm = (g.point - r).cross(g.force_n) + out.couple_nmm;
  out.moment_to_force_mm = kappa;
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
