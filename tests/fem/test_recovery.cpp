// Recovery: exact uniaxial bar, exact nodal strains of quadratic fields, no averaging across
// material interfaces, scalar measures against closed forms.
#include <gtest/gtest.h>

#include <Eigen/Dense>
#include <algorithm>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <string>
#include <vector>

#include "sharpey/error.h"
#include "sharpey/fem/elasticity.h"
#include "support/grid_mesh.h"

namespace sharpey::fem {
namespace {

using testing::grid_mesh;

class UniaxialBar : public ::testing::TestWithParam<int> {};

// derived: a prismatic bar under end traction with roller supports has the uniform stress
// sigma_xx = F / A, u_x = F x / (E A) and lateral u = -nu F y / (E A) (elementary strength of
// materials); a linear field, so both elements reproduce it exactly on a jittered mesh.
TEST_P(UniaxialBar, ExactStressAndDisplacement) {
  const int k = GetParam();
  const double L = 20.0, a = 2.0, b = 3.0, E = 210.0, nu = 0.3, F = 1.5;
  mesh::VolumeMesh m = grid_mesh(6, 2, 2, k, [&](const Eigen::Vector3d& p) {
    return Eigen::Vector3d(L * p.x(), a * p.y(), b * p.z());
  });
  testing::jitter_nodes(m, 0.3, 11u);
  const MaterialTable materials{{1, {E, nu}}};
  std::vector<DofConstraint> c;
  for (const DofConstraint& d : fix_faces(m, testing::kXiMin))
    if (d.component == 0) c.push_back(d);
  for (const DofConstraint& d : fix_faces(m, testing::kEtaMin))
    if (d.component == 1) c.push_back(d);
  for (const DofConstraint& d : fix_faces(m, testing::kZetaMin))
    if (d.component == 2) c.push_back(d);
  const LinearElasticSolver solver(m, materials, c);
  const double area = a * b;
  const Eigen::VectorXd u =
      solver.solve(traction_load(m, testing::kXiMax, Eigen::Vector3d(F / area, 0, 0)));
  const double strain = F / (E * area);
  for (int i = 0; i < m.n_nodes(); ++i) {
    const Eigen::Vector3d& x = m.nodes[static_cast<size_t>(i)];
    const Eigen::Vector3d expected(strain * x.x(), -nu * strain * x.y(), -nu * strain * x.z());
    EXPECT_LT((u.segment<3>(3 * i) - expected).norm(), 1e-10 * strain * L) << "node " << i;
  }
  const RegionField field = recover_region(m, materials, u, 1);
  ASSERT_EQ(field.nodes.size(), static_cast<size_t>(m.n_nodes()));
  Vector6d sigma = Vector6d::Zero();
  sigma(0) = F / area;
  Vector6d eps = Vector6d::Zero();
  eps << strain, -nu * strain, -nu * strain, 0, 0, 0;
  for (long j = 0; j < field.stress_mpa.cols(); ++j) {
    EXPECT_LT((field.stress_mpa.col(j) - sigma).norm(), 1e-9 * sigma(0))
        << "node " << field.nodes[static_cast<size_t>(j)];
    EXPECT_LT((field.strain.col(j) - eps).norm(), 1e-9 * strain);
  }
  // Scalar measures of the uniaxial state (derived).
  const Vector6d s0 = field.stress_mpa.col(0);
  EXPECT_NEAR(von_mises_mpa(s0), F / area, 1e-9 * F / area);
  EXPECT_NEAR(hydrostatic_pressure_kpa(s0), -1000.0 * F / area / 3.0, 1e-6 * F / area);
}

INSTANTIATE_TEST_SUITE_P(Elements, UniaxialBar, ::testing::Values(4, 10),
                         [](const ::testing::TestParamInfo<int>& param_info) {
                           return std::to_string(param_info.param) + "node";
                         });

// A quadratic displacement field has linear strains; on straight 10-node elements the four
// degree-2 points carry the exact strain, and the linear extrapolation makes every nodal value
// exact (derived). Regions keep their own stress at shared nodes: D1 eps on one side, D2 eps on the
// other.
TEST(Recovery, QuadraticFieldExactAtNodesPerRegion) {
  mesh::VolumeMesh m =
      grid_mesh(3, 3, 4, 10, {}, [](const Eigen::Vector3d& p) { return p.z() < 0.5 ? 1 : 2; });
  testing::jitter_nodes(m, 0.3, 5u);
  const MaterialTable materials{{1, {100.0, 0.25}}, {2, {3.0, 0.45}}};
  auto displacement = [](const Eigen::Vector3d& x) {
    return Eigen::Vector3d(0.01 * x.x() * x.y() + 0.002 * x.z(),
                           0.03 * x.x() * x.x() - 0.02 * x.y() * x.z(),
                           0.015 * x.z() * x.z() + 0.01 * x.x() * x.y());
  };
  auto strain = [](const Eigen::Vector3d& x) {
    Vector6d e;
    e << 0.01 * x.y(), -0.02 * x.z(), 0.03 * x.z(), -0.02 * x.y() + 0.01 * x.x(),
        0.002 + 0.01 * x.y(), 0.01 * x.x() + 0.06 * x.x();
    return e;
  };
  Eigen::VectorXd u(3 * m.n_nodes());
  for (int i = 0; i < m.n_nodes(); ++i)
    u.segment<3>(3 * i) = displacement(m.nodes[static_cast<size_t>(i)]);
  int shared = 0;
  const RegionField lower = recover_region(m, materials, u, 1);
  const RegionField upper = recover_region(m, materials, u, 2);
  for (const RegionField* f : {&lower, &upper}) {
    const Matrix6d D = elasticity_matrix(materials.at(f->region));
    for (size_t j = 0; j < f->nodes.size(); ++j) {
      const Vector6d e = strain(m.nodes[static_cast<size_t>(f->nodes[j])]);
      EXPECT_LT((f->strain.col(static_cast<long>(j)) - e).norm(), 1e-12) << "region " << f->region;
      EXPECT_LT((f->stress_mpa.col(static_cast<long>(j)) - D * e).norm(), 1e-10)
          << "region " << f->region;
    }
  }
  for (int node : lower.nodes)
    shared += std::binary_search(upper.nodes.begin(), upper.nodes.end(), node);
  EXPECT_EQ(shared, 7 * 7);  // the interface z = 0.5 of the 10-node grid
}

// A linear field in 4-node elements: constant strain in every element, exact at every node.
TEST(Recovery, LinearElementsReproduceConstantStrain) {
  mesh::VolumeMesh m = grid_mesh(3, 2, 2, 4);
  testing::jitter_nodes(m, 0.3, 9u);
  Eigen::Matrix3d H;
  H << 0.01, 0.002, -0.003, 0.004, -0.005, 0.0, 0.001, 0.002, 0.003;
  Eigen::VectorXd u(3 * m.n_nodes());
  for (int i = 0; i < m.n_nodes(); ++i) u.segment<3>(3 * i) = H * m.nodes[static_cast<size_t>(i)];
  const RegionField f = recover_region(m, {{1, {10.0, 0.3}}}, u, 1);
  Vector6d e;
  e << H(0, 0), H(1, 1), H(2, 2), H(1, 2) + H(2, 1), H(0, 2) + H(2, 0), H(0, 1) + H(1, 0);
  for (long j = 0; j < f.strain.cols(); ++j) EXPECT_LT((f.strain.col(j) - e).norm(), 1e-14);
}

TEST(Recovery, SeveralFieldsAtOnceEqualOneByOne) {
  const mesh::VolumeMesh m = grid_mesh(2, 2, 2, 10, [](const Eigen::Vector3d& p) {
    return Eigen::Vector3d(p.x() + 0.1 * p.y() * p.y(), p.y(), p.z());
  });
  const MaterialTable materials{{1, {10.0, 0.3}}};
  std::srand(3);
  const Eigen::MatrixXd U = Eigen::MatrixXd::Random(3 * m.n_nodes(), 3);
  const std::vector<RegionField> all = recover_region(m, materials, U, 1);
  ASSERT_EQ(all.size(), 3u);
  for (int j = 0; j < 3; ++j) {
    const RegionField one = recover_region(m, materials, Eigen::VectorXd(U.col(j)), 1);
    EXPECT_LT((all[static_cast<size_t>(j)].stress_mpa - one.stress_mpa).norm(),
              1e-13 * one.stress_mpa.norm());
  }
}

TEST(Recovery, QuadraturePointsAndStress) {
  const mesh::VolumeMesh m = grid_mesh(1, 1, 1, 10);
  const Matrix6d D = elasticity_matrix({10.0, 0.3});
  const Eigen::VectorXd u = Eigen::VectorXd::Zero(3 * m.n_nodes());
  Eigen::Matrix<double, 6, Eigen::Dynamic> stress;
  Eigen::Matrix3Xd points;
  element_quadrature_stress(m, 0, D, u, &stress, &points);
  ASSERT_EQ(points.cols(), 4);
  EXPECT_EQ(stress.norm(), 0.0);
  // The mean of the 4 symmetric points is the element centroid (derived).
  Eigen::Vector3d centroid = Eigen::Vector3d::Zero();
  for (int a = 0; a < 4; ++a) centroid += 0.25 * m.nodes[static_cast<size_t>(m.element(0)[a])];
  EXPECT_LT((points.rowwise().mean() - centroid).norm(), 1e-15);
}

TEST(Recovery, UnknownRegionIsAnInputError) {
  const mesh::VolumeMesh m = grid_mesh(1, 1, 1, 4);
  const Eigen::VectorXd u = Eigen::VectorXd::Zero(3 * m.n_nodes());
  EXPECT_THROW(recover_region(m, {{1, {10.0, 0.3}}}, u, 7), InputError);
  EXPECT_THROW(recover_region(m, {{2, {10.0, 0.3}}}, u, 1), InputError);
}

// The closed-form principal values against Eigen's iterative symmetric eigensolver (an independent
// computation) on random tensors, including nearly repeated principal values.
TEST(ScalarMeasures, PrincipalValuesMatchTheIterativeEigensolver) {
  std::srand(7);
  double worst = 0;
  for (int trial = 0; trial < 2000; ++trial) {
    Eigen::Matrix3d A = Eigen::Matrix3d::Random();
    Eigen::Matrix3d T = 0.5 * (A + A.transpose());
    if (trial % 4 == 1) T += 50.0 * Eigen::Matrix3d::Identity();  // nearly equal values
    if (trial % 4 == 2) T *= 1e-6;                                // strain-sized entries
    Vector6d s;
    s << T(0, 0), T(1, 1), T(2, 2), T(1, 2), T(0, 2), T(0, 1);
    const Eigen::Vector3d ascending =
        Eigen::SelfAdjointEigenSolver<Eigen::Matrix3d>(T, Eigen::EigenvaluesOnly).eigenvalues();
    const Eigen::Vector3d expected(ascending(2), ascending(1), ascending(0));
    worst = std::max(worst, (principal_stresses_mpa(s) - expected).norm() / T.norm());
  }
  std::printf("closed-form vs iterative principal values: worst %.1e of |T|\n", worst);
  EXPECT_LT(worst, 1e-12);
}

// Scalar measures against closed forms (derived from the definitions).
TEST(ScalarMeasures, ClosedForms) {
  Vector6d s;
  s << -2.0, -2.0, -2.0, 0, 0, 0;  // hydrostatic compression of 2 MPa
  EXPECT_NEAR(hydrostatic_pressure_kpa(s), 2000.0, 1e-12);
  EXPECT_NEAR(von_mises_mpa(s), 0.0, 1e-12);
  s << 0, 0, 0, 0, 0, 1.5;  // pure shear tau_xy
  EXPECT_NEAR(von_mises_mpa(s), std::sqrt(3.0) * 1.5, 1e-12);
  EXPECT_LT((principal_stresses_mpa(s) - Eigen::Vector3d(1.5, 0.0, -1.5)).norm(), 1e-12);
  // A diagonal tensor rotated about z keeps its principal values.
  const double c = std::cos(0.4), n = std::sin(0.4);
  Eigen::Matrix3d R;
  R << c, -n, 0, n, c, 0, 0, 0, 1;
  const Eigen::Matrix3d T = R * Eigen::Vector3d(3.0, -1.0, 0.5).asDiagonal() * R.transpose();
  s << T(0, 0), T(1, 1), T(2, 2), T(1, 2), T(0, 2), T(0, 1);
  EXPECT_LT((principal_stresses_mpa(s) - Eigen::Vector3d(3.0, 0.5, -1.0)).norm(), 1e-12);
  // Engineering shear gamma: tensor principal strains +-gamma/2, equivalent strain gamma/sqrt(3).
  Vector6d e;
  e << 0, 0, 0, 0.004, 0, 0;
  EXPECT_LT((principal_strains(e) - Eigen::Vector3d(0.002, 0.0, -0.002)).norm(), 1e-15);
  EXPECT_NEAR(equivalent_strain(e), 0.004 / std::sqrt(3.0), 1e-15);
  // Incompressible uniaxial strain (e, -e/2, -e/2): equivalent strain e.
  e << 0.01, -0.005, -0.005, 0, 0, 0;
  EXPECT_NEAR(equivalent_strain(e), 0.01, 1e-15);
  // Volumetric strain has no equivalent (deviatoric) strain.
  e << 0.003, 0.003, 0.003, 0, 0, 0;
  EXPECT_NEAR(equivalent_strain(e), 0.0, 1e-15);
}

}  // namespace
}  // namespace sharpey::fem
