#include <Eigen/Dense>
#include <cmath>
#include <string>

#include "sharpey/analysis/detail/rigid_motion.h"
#include "sharpey/error.h"

namespace sharpey::analysis::detail {
namespace {

Eigen::Matrix3d cross_matrix(const Eigen::Vector3d& r) {
  Eigen::Matrix3d m;
  m << 0, -r.z(), r.y(), r.z(), 0, -r.x(), -r.y(), r.x(), 0;
  return m;
}

// Normal-equation matrix of the fit about `centre` and its Cholesky factor.
struct FitSystem {
  Eigen::Vector3d centre = Eigen::Vector3d::Zero();
  Eigen::LDLT<Eigen::Matrix<double, 6, 6>> ldlt;
};

FitSystem fit_system(const std::vector<Eigen::Vector3d>& points, const std::vector<int>& nodes) {
  if (nodes.size() < 3) {
    throw Error("rigid-body fit of the tooth needs at least 3 nodes, got " +
                std::to_string(nodes.size()) + ": the mesh has no tooth region");
  }
  FitSystem s;
  for (int i : nodes) s.centre += points[static_cast<size_t>(i)];
  s.centre /= static_cast<double>(nodes.size());
  // Row block of node i: u_i = t - [r_i]x w, so B_i = [I, -[r_i]x].
  Eigen::Matrix<double, 6, 6> A = Eigen::Matrix<double, 6, 6>::Zero();
  double extent2 = 0;
  for (int i : nodes) {
    const Eigen::Vector3d r = points[static_cast<size_t>(i)] - s.centre;
    const Eigen::Matrix3d C = cross_matrix(r);
    A.topLeftCorner<3, 3>() += Eigen::Matrix3d::Identity();
    A.topRightCorner<3, 3>() -= C;
    A.bottomLeftCorner<3, 3>() -= C.transpose();
    A.bottomRightCorner<3, 3>() += C.transpose() * C;
    extent2 = std::max(extent2, r.squaredNorm());
  }
  // Collinear points leave the rotation about their line undetermined.
  const Eigen::SelfAdjointEigenSolver<Eigen::Matrix3d> eig(A.bottomRightCorner<3, 3>());
  if (eig.eigenvalues()(0) <= 1e-10 * extent2 * static_cast<double>(nodes.size())) {
    throw Error("rigid-body fit of the tooth failed: its nodes are (nearly) collinear");
  }
  s.ldlt.compute(A);
  return s;
}

RigidMotion solve_fit(const FitSystem& s, const std::vector<Eigen::Vector3d>& points,
                      const double* u, const std::vector<int>& nodes) {
  Eigen::Matrix<double, 6, 1> rhs = Eigen::Matrix<double, 6, 1>::Zero();
  for (int i : nodes) {
    const Eigen::Vector3d r = points[static_cast<size_t>(i)] - s.centre;
    const Eigen::Vector3d ui(u[3 * i], u[3 * i + 1], u[3 * i + 2]);
    rhs.head<3>() += ui;
    rhs.tail<3>() -= cross_matrix(r).transpose() * ui;
  }
  const Eigen::Matrix<double, 6, 1> x = s.ldlt.solve(rhs);
  RigidMotion m;
  m.centre = s.centre;
  m.translation_mm = x.head<3>();
  m.rotation_rad = x.tail<3>();
  double sum2 = 0;
  for (int i : nodes) {
    const Eigen::Vector3d ui(u[3 * i], u[3 * i + 1], u[3 * i + 2]);
    sum2 += (ui - m.displacement_at(points[static_cast<size_t>(i)])).squaredNorm();
  }
  m.rms_residual_mm = std::sqrt(sum2 / static_cast<double>(nodes.size()));
  return m;
}

}  // namespace

RigidMotion fit_rigid_motion(const std::vector<Eigen::Vector3d>& points, const Eigen::VectorXd& u,
                             const std::vector<int>& nodes) {
  return solve_fit(fit_system(points, nodes), points, u.data(), nodes);
}

RigidMotion RigidResponse::motion(const Eigen::Vector3d& force_n,
                                  const Eigen::Vector3d& moment_nmm) const {
  Eigen::Matrix<double, 6, 1> load;
  load << force_n, moment_nmm;
  const Eigen::Matrix<double, 6, 1> x = matrix * load;
  RigidMotion m;
  m.centre = centre;
  m.translation_mm = x.head<3>();
  m.rotation_rad = x.tail<3>();
  return m;
}

RigidResponse rigid_response(const std::vector<Eigen::Vector3d>& points,
                             const Eigen::MatrixXd& unit_u, const std::vector<int>& nodes,
                             const Eigen::Vector3d& reference_point) {
  const FitSystem s = fit_system(points, nodes);
  RigidResponse r;
  r.reference_point = reference_point;
  r.centre = s.centre;
  for (int k = 0; k < 6; ++k) {
    const RigidMotion m = solve_fit(s, points, unit_u.col(k).data(), nodes);
    r.matrix.col(k) << m.translation_mm, m.rotation_rad;
    r.max_rms_residual_mm = std::max(r.max_rms_residual_mm, m.rms_residual_mm);
  }
  return r;
}

bool axis_point_without_displacement(const RigidMotion& motion, const Eigen::Vector3d& direction,
                                     double max_distance_mm, double* z) {
  // d . u(0, 0, z) = d . (t + w x (q0 - c)) + z d . (w x e_z) = a + b z.
  const Eigen::Vector3d q0 = Eigen::Vector3d::Zero();
  const double a = direction.dot(motion.displacement_at(q0));
  const double b = direction.dot(motion.rotation_rad.cross(Eigen::Vector3d::UnitZ()));
  if (!(std::abs(b) * max_distance_mm > std::abs(a))) return false;  // also catches b = 0, NaN
  *z = -a / b;
  return true;
}

}  // namespace sharpey::analysis::detail
