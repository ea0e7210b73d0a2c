// Least-squares rigid-body fit of the tooth and the axis point without displacement.
#include <gtest/gtest.h>

#include <random>

#include "sharpey/analysis/detail/rigid_motion.h"
#include "sharpey/error.h"

namespace sharpey::analysis::detail {
namespace {

std::vector<Eigen::Vector3d> random_points(int n, unsigned seed) {
  std::mt19937 rng(seed);
  std::uniform_real_distribution<double> d(-5.0, 5.0);
  std::vector<Eigen::Vector3d> p;
  for (int i = 0; i < n; ++i) p.emplace_back(d(rng), d(rng), 3.0 * d(rng));
  return p;
}

std::vector<int> all(int n) {
  std::vector<int> v(static_cast<size_t>(n));
  for (int i = 0; i < n; ++i) v[static_cast<size_t>(i)] = i;
  return v;
}

Eigen::VectorXd field_of(const std::vector<Eigen::Vector3d>& p, const Eigen::Vector3d& t,
                         const Eigen::Vector3d& w, const Eigen::Vector3d& about) {
  Eigen::VectorXd u(3 * static_cast<Eigen::Index>(p.size()));
  for (size_t i = 0; i < p.size(); ++i) {
    u.segment<3>(3 * static_cast<Eigen::Index>(i)) = t + w.cross(p[i] - about);
  }
  return u;
}

// Derived: a field that is exactly rigid is reproduced to round-off.
TEST(RigidMotion, ExactRigidFieldIsRecovered) {
  const auto p = random_points(200, 1);
  const Eigen::Vector3d t(1e-3, -2e-3, 0.5e-3), w(2e-4, -1e-4, 3e-4), about(1, 2, -3);
  const RigidMotion m = fit_rigid_motion(p, field_of(p, t, w, about), all(200));
  EXPECT_LT((m.rotation_rad - w).norm(), 1e-15);
  for (const auto& x : {Eigen::Vector3d(0, 0, 0), Eigen::Vector3d(3, -1, 7)}) {
    EXPECT_LT((m.displacement_at(x) - (t + w.cross(x - about))).norm(), 1e-15);
  }
  EXPECT_LT(m.rms_residual_mm, 1e-15);
}

// Derived: adding a field orthogonal to the rigid motions (here a uniform dilation about the
// centroid: zero mean, and sum r x r = 0) leaves the fitted motion unchanged; its rms is the
// misfit.
TEST(RigidMotion, DeformationOrthogonalToRigidModesIsIgnored) {
  auto p = random_points(300, 2);
  Eigen::Vector3d c = Eigen::Vector3d::Zero();
  for (const auto& x : p) c += x;
  c /= 300.0;
  const Eigen::Vector3d t(1e-3, 0, 0), w(0, 2e-4, 0);
  Eigen::VectorXd u = field_of(p, t, w, c);
  const Eigen::Matrix3d S = 1e-4 * Eigen::Matrix3d::Identity();
  double sum2 = 0;
  for (size_t i = 0; i < p.size(); ++i) {
    const Eigen::Vector3d s = S * (p[i] - c);
    u.segment<3>(3 * static_cast<Eigen::Index>(i)) += s;
    sum2 += s.squaredNorm();
  }
  const RigidMotion m = fit_rigid_motion(p, u, all(300));
  EXPECT_LT((m.rotation_rad - w).norm(), 1e-14);
  EXPECT_LT((m.translation_mm - t).norm(), 1e-14);
  EXPECT_NEAR(m.rms_residual_mm, std::sqrt(sum2 / 300.0), 1e-14);
}

// Derived: the fit is linear, so the response matrix rebuilt from six rigid unit fields is exact.
TEST(RigidMotion, ResponseMatrixFromUnitCases) {
  const auto p = random_points(50, 3);
  Eigen::Matrix<double, 6, 6> A = Eigen::Matrix<double, 6, 6>::Random() * 1e-3;
  const Eigen::Vector3d bracket(3, 0, 5);
  Eigen::Vector3d c = Eigen::Vector3d::Zero();
  for (const auto& x : p) c += x;
  c /= 50.0;
  Eigen::MatrixXd U(150, 6);
  for (int k = 0; k < 6; ++k) U.col(k) = field_of(p, A.col(k).head<3>(), A.col(k).tail<3>(), c);
  const RigidResponse r = rigid_response(p, U, all(50), bracket);
  EXPECT_LT((r.centre - c).norm(), 1e-12);
  EXPECT_LT((r.matrix - A).norm(), 1e-15);
  const Eigen::Vector3d F(0.3, -0.2, 0.1), M(2, 1, -1);
  const RigidMotion m = r.motion(F, M);
  Eigen::Matrix<double, 6, 1> load;
  load << F, M;
  EXPECT_LT((m.translation_mm - (A * load).head<3>()).norm(), 1e-15);
  EXPECT_EQ(r.reference_point, bracket);
}

TEST(RigidMotion, CollinearPointsAreRejected) {
  std::vector<Eigen::Vector3d> p;
  for (int i = 0; i < 10; ++i) p.emplace_back(0, 0, i);
  EXPECT_THROW(fit_rigid_motion(p, Eigen::VectorXd::Zero(30), all(10)), Error);
  EXPECT_THROW(fit_rigid_motion(p, Eigen::VectorXd::Zero(30), {0, 1}), Error);
}

// Derived: a rotation about the y axis through (0, 0, z0) leaves that axis point in place.
TEST(RigidMotion, AxisPointWithoutDisplacement) {
  RigidMotion m;
  m.centre = Eigen::Vector3d(0.5, 0.1, -4);
  const Eigen::Vector3d pivot(0, 0, -9.25), w(0, 3e-4, 0);
  m.rotation_rad = w;
  m.translation_mm = w.cross(m.centre - pivot);
  double z = 0;
  ASSERT_TRUE(axis_point_without_displacement(m, Eigen::Vector3d::UnitX(), 1000, &z));
  EXPECT_NEAR(z, -9.25, 1e-12);
  // Pure translation: no such point.
  m.rotation_rad.setZero();
  m.translation_mm = Eigen::Vector3d(1e-3, 0, 0);
  EXPECT_FALSE(axis_point_without_displacement(m, Eigen::Vector3d::UnitX(), 1000, &z));
  // Far away (2000 mm) counts as translation too.
  m.rotation_rad = w;
  m.translation_mm = w.cross(m.centre - Eigen::Vector3d(0, 0, -2000));
  EXPECT_FALSE(axis_point_without_displacement(m, Eigen::Vector3d::UnitX(), 1000, &z));
}

}  // namespace
}  // namespace sharpey::analysis::detail
