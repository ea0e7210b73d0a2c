// Small rigid-body motion of the tooth, fitted in the least-squares sense to a displacement field,
// and the linear map from a force system at the bracket to that motion.
//
// Internal to the analysis library (used by study*.cpp and by the tests); not a stable interface.
#pragma once

#include <Eigen/Core>
#include <Eigen/Geometry>  // cross products
#include <vector>

namespace sharpey::analysis::detail {

// u(x) = translation_mm + rotation_rad x (x - centre): an infinitesimal rigid motion.
struct RigidMotion {
  Eigen::Vector3d centre = Eigen::Vector3d::Zero();          // mm
  Eigen::Vector3d translation_mm = Eigen::Vector3d::Zero();  // displacement of `centre`
  Eigen::Vector3d rotation_rad = Eigen::Vector3d::Zero();    // small-rotation vector
  double rms_residual_mm = 0;  // root-mean-square misfit of the fitted field (0 for a rigid field)

  Eigen::Vector3d displacement_at(const Eigen::Vector3d& x) const {
    return translation_mm + rotation_rad.cross(x - centre);
  }
};

// Least-squares rigid motion of the points `nodes` (indices into `points`, mm) with displacement
// `u` (3 * points.size(), node-major, mm): minimises sum_i |u_i - t - w x (x_i - c)|^2 with c the
// centroid of the selected points, every node weighted equally. Needs at least three non-collinear
// points (asserted by a clear Error otherwise).
RigidMotion fit_rigid_motion(const std::vector<Eigen::Vector3d>& points, const Eigen::VectorXd& u,
                             const std::vector<int>& nodes);

// The tooth's rigid response to a force system: motion = matrix * [F; M] with F (N) and M (N.mm)
// about `reference_point`; rows 0-2 are the translation of `centre` (mm), rows 3-5 the rotation
// (rad). Built from the six unit load cases; exact by linearity since the fit is linear in u.
struct RigidResponse {
  Eigen::Vector3d reference_point = Eigen::Vector3d::Zero();  // where F and M act (the bracket)
  Eigen::Vector3d centre = Eigen::Vector3d::Zero();           // fit centre (tooth centroid)
  Eigen::Matrix<double, 6, 6> matrix = Eigen::Matrix<double, 6, 6>::Zero();
  double max_rms_residual_mm = 0;  // largest misfit over the six unit cases (per unit load)

  RigidMotion motion(const Eigen::Vector3d& force_n, const Eigen::Vector3d& moment_nmm) const;
};

// Fits each of the six unit cases (columns of unit_u: 3n x 6, forces x, y, z then moments x, y, z
// about reference_point) over `nodes`.
RigidResponse rigid_response(const std::vector<Eigen::Vector3d>& points,
                             const Eigen::MatrixXd& unit_u, const std::vector<int>& nodes,
                             const Eigen::Vector3d& reference_point);

// Height z of the point (0, 0, z) on the long axis whose displacement along `direction` (a unit
// vector perpendicular to the axis) is zero under `motion`, i.e. the centre of rotation seen in
// the plane spanned by the axis and `direction`. Returns false (and leaves z alone) when the
// displacement along `direction` does not vary with z (no rotation about the axis normal to that
// plane: the centre of rotation is at infinity) or the point lies further than `max_distance_mm`
// from the CEJ.
bool axis_point_without_displacement(const RigidMotion& motion, const Eigen::Vector3d& direction,
                                     double max_distance_mm, double* z);

}  // namespace sharpey::analysis::detail
