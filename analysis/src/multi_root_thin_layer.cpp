#include "sharpey/analysis/multi_root_thin_layer.h"

#include <Eigen/Dense>
#include <cmath>
#include <limits>
#include <sstream>

#include "sharpey/error.h"

namespace sharpey::analysis {
namespace {

// B (3 x 6): displacement of point x under the rigid motion (t, omega): v = t + omega x x.
Eigen::Matrix<double, 3, 6> rigid_map(const Eigen::Vector3d& x) {
  Eigen::Matrix<double, 3, 6> B;
  B.leftCols<3>().setIdentity();
  B.rightCols<3>() << 0, x.z(), -x.y(), -x.z(), 0, x.x(), x.y(), -x.x(), 0;
  return B;
}

Eigen::Matrix<double, 6, 1> wrench(const MultiRootLoad& load) {
  Eigen::Matrix<double, 6, 1> w;
  w.head<3>() = load.force_n;
  w.tail<3>() = load.point_mm.cross(load.force_n) + load.couple_nmm;
  return w;
}

}  // namespace

std::string to_string(MolarMovement m) {
  switch (m) {
    case MolarMovement::kUprighting:
      return "uprighting";
    case MolarMovement::kIntrusion:
      return "intrusion";
    case MolarMovement::kTranslation:
      return "translation";
  }
  return "?";
}

MolarMovement molar_movement_from_string(const std::string& name) {
  for (MolarMovement m :
       {MolarMovement::kUprighting, MolarMovement::kIntrusion, MolarMovement::kTranslation})
    if (to_string(m) == name) return m;
  throw InputError("movement", "unknown molar movement \"" + name +
                                   "\"; use uprighting, intrusion or translation");
}

MultiRootThinLayer::MultiRootThinLayer(const mesh::MultiRootTooth& tooth,
                                       const mesh::MultiRootBone& bone, const fem::Material& pdl)
    : tooth_(tooth) {
  const double E = pdl.young_modulus_mpa, nu = pdl.poisson_ratio;
  if (!(E > 0) || !(nu > -1 && nu < 0.5)) {
    std::ostringstream s;
    s << "PDL material E " << E << " MPa, nu " << nu
      << " is not a valid isotropic material; use E > 0 and -1 < nu < 0.5 (published PDL values: "
         "E 0.05 to 0.7 MPa, nu 0.45 to 0.49)";
    throw InputError("materials.pdl", s.str());
  }
  const double mu = E / (2 * (1 + nu)), lambda = E * nu / ((1 + nu) * (1 - 2 * nu));
  k_n_ = lambda + 2 * mu;
  k_s_ = mu;
  k_bulk_ = lambda + 2.0 * mu / 3.0;
  std::vector<mesh::RootSurfacePoint> all = mesh::root_surface_points(tooth);
  mesh::attach(tooth, bone, &all);
  areas_ = mesh::root_areas(tooth, all);
  if (areas_.attached_total_mm2 < 10) {
    std::ostringstream s;
    s << "only " << areas_.attached_total_mm2
      << " mm^2 of the root stays attached: the tooth would not be held; reduce the bone loss or "
         "the furcation lesion";
    throw InputError("bone_loss_mm", s.str());
  }
  for (const mesh::RootSurfacePoint& p : all) {
    if (!p.attached) continue;
    points_.push_back(p);
    const Eigen::Matrix3d k = (k_n_ - k_s_) / p.pdl_width_mm * p.normal * p.normal.transpose() +
                              k_s_ / p.pdl_width_mm * Eigen::Matrix3d::Identity();
    const Eigen::Matrix<double, 3, 6> B = rigid_map(p.x);
    K_ += p.area_mm2 * B.transpose() * k * B;
  }
}

MultiRootCres MultiRootThinLayer::cres(const Eigen::Vector3d& direction) const {
  const Eigen::Vector3d d = direction.normalized();
  const Eigen::Matrix<double, 6, 6> C = K_.inverse();
  // Rotation under the force d through p: C_rt d + C_rr (p x d) = 0, so p x d = m with
  // m = -C_rr^-1 C_rt d; p = d x m solves it up to m's component along d (a twist about d no
  // choice of p removes).
  const Eigen::Vector3d m =
      -C.bottomRightCorner<3, 3>().ldlt().solve(C.bottomLeftCorner<3, 3>() * d);
  MultiRootCres c;
  c.point_mm = d.cross(m);
  // Report the point of the line of action nearest the tooth axis height-wise: for a horizontal
  // d, the line is horizontal and its height is fixed; for a vertical one, take the furcation
  // plane.
  if (std::abs(d.z()) > 0.9) c.point_mm += (-tooth_.trunk_length_mm - c.point_mm.z()) / d.z() * d;
  c.below_cej_mm = -c.point_mm.z();
  c.below_furcation_mm = c.below_cej_mm - tooth_.trunk_length_mm;
  Eigen::Matrix<double, 6, 1> w;
  w.head<3>() = d;
  w.tail<3>() = c.point_mm.cross(d);
  c.residual_rad_per_n = (C * w).tail<3>().norm();
  return c;
}

MultiRootResult MultiRootThinLayer::evaluate(const MultiRootLoad& load,
                                             const Thresholds& thresholds) const {
  const Eigen::Matrix<double, 6, 1> u = K_.ldlt().solve(wrench(load));
  MultiRootResult r;
  r.translation_mm = u.head<3>();
  r.rotation_rad = u.tail<3>();
  r.tooth.name = "tooth";
  r.roots.resize(tooth_.roots.size());
  for (size_t i = 0; i < tooth_.roots.size(); ++i) r.roots[i].name = tooth_.roots[i].name;
  auto add = [&](RootFigures* f, const mesh::RootSurfacePoint& p, double pressure_kpa,
                 const Eigen::Vector3d& force) {
    f->attachment_area_mm2 += p.area_mm2;
    f->peak_compression_kpa = std::max(f->peak_compression_kpa, pressure_kpa);
    f->peak_tension_kpa = std::max(f->peak_tension_kpa, -pressure_kpa);
    if (pressure_kpa > thresholds.capillary.value_kpa) f->area_above_capillary_mm2 += p.area_mm2;
    if (pressure_kpa > thresholds.limit.value_kpa) f->area_above_limit_mm2 += p.area_mm2;
    f->reaction_n += force;
  };
  for (const mesh::RootSurfacePoint& p : points_) {
    const Eigen::Vector3d v = rigid_map(p.x) * u;
    const double vn = v.dot(p.normal);
    const double pressure_kpa = 1000.0 * k_bulk_ * vn / p.pdl_width_mm;  // MPa -> kPa
    const Eigen::Vector3d force =
        -p.area_mm2 / p.pdl_width_mm * (k_n_ * vn * p.normal + k_s_ * (v - vn * p.normal));
    add(&r.tooth, p, pressure_kpa, force);
    if (p.part >= 0) add(&r.roots[p.part], p, pressure_kpa, force);
    r.reaction_force_n += force;
    r.reaction_moment_nmm += p.x.cross(force);
  }
  return r;
}

std::vector<double> MultiRootThinLayer::pressure_kpa(const MultiRootLoad& load) const {
  const Eigen::Matrix<double, 6, 1> u = K_.ldlt().solve(wrench(load));
  std::vector<double> p;
  p.reserve(points_.size());
  for (const mesh::RootSurfacePoint& q : points_)
    p.push_back(1000.0 * k_bulk_ * (rigid_map(q.x) * u).dot(q.normal) / q.pdl_width_mm);
  return p;
}

MultiRootLoad MultiRootThinLayer::preset(MolarMovement movement, double magnitude) const {
  MultiRootLoad load;
  switch (movement) {
    case MolarMovement::kUprighting:
      load.couple_nmm = {magnitude, 0, 0};
      break;
    case MolarMovement::kIntrusion: {
      const MultiRootCres c = cres(Eigen::Vector3d::UnitZ());
      load.force_n = {0, 0, -magnitude};
      load.point_mm = {c.point_mm.x(), c.point_mm.y(), tooth_.crown_length_mm};
      break;
    }
    case MolarMovement::kTranslation: {
      const MultiRootCres c = cres(Eigen::Vector3d::UnitY());
      load.force_n = {0, magnitude, 0};
      load.point_mm = c.point_mm;
      break;
    }
  }
  return load;
}

double MultiRootThinLayer::allowance(MolarMovement movement, double threshold_kpa) const {
  Thresholds t = default_thresholds();
  const MultiRootResult r = evaluate(preset(movement, 1.0), t);
  if (r.tooth.peak_compression_kpa <= 0) return std::numeric_limits<double>::infinity();
  return threshold_kpa / r.tooth.peak_compression_kpa;
}

}  // namespace sharpey::analysis
