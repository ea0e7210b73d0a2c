// Element kernels: symmetry, rigid-body null space, scaling, B-matrix layout, exact energies.
#include <gtest/gtest.h>

#include <Eigen/Dense>
#include <Eigen/Eigenvalues>
#include <cmath>
#include <string>

#include "sharpey/error.h"
#include "sharpey/fem/elasticity.h"

namespace sharpey::fem {
namespace {

const Material kSteelLike{200000.0, 0.3};

// One tetrahedron with vertices a, b, c, d (positive volume), midside nodes on the edge midpoints
// (10-node) or no midside nodes (4-node).
mesh::VolumeMesh single_element(int k, const Eigen::Vector3d& a, const Eigen::Vector3d& b,
                                const Eigen::Vector3d& c, const Eigen::Vector3d& d) {
  mesh::VolumeMesh m;
  m.nodes = {a, b, c, d};
  m.nodes_per_element = k;
  m.nodes_per_face = k == 10 ? 6 : 3;
  if (k == 10) {
    for (const auto& e : core::kTetEdges) m.nodes.push_back(0.5 * (m.nodes[e[0]] + m.nodes[e[1]]));
  }
  for (int i = 0; i < k; ++i) m.elements.push_back(i);
  m.element_region = {1};
  return m;
}

mesh::VolumeMesh skewed_element(int k) {
  return single_element(k, Eigen::Vector3d(0.1, -0.2, 0.05), Eigen::Vector3d(1.3, 0.1, -0.1),
                        Eigen::Vector3d(0.2, 0.9, 0.3), Eigen::Vector3d(0.4, 0.3, 1.1));
}

// Curved 10-node element: midside nodes pushed off their edges by up to 12 % of the edge length.
mesh::VolumeMesh curved_element() {
  mesh::VolumeMesh m = skewed_element(10);
  const Eigen::Vector3d push[6] = {{0.02, -0.1, 0.03}, {0.08, 0.05, 0.0},   {-0.09, 0.02, 0.04},
                                   {-0.05, 0.0, 0.02}, {0.06, -0.03, 0.05}, {0.0, 0.07, 0.06}};
  for (int e = 0; e < 6; ++e) m.nodes[4 + e] += push[e];
  return m;
}

struct ElementCase {
  std::string name;
  mesh::VolumeMesh mesh;
};

std::vector<ElementCase> element_cases() {
  return {{"linear_reference", single_element(4, {0, 0, 0}, {1, 0, 0}, {0, 1, 0}, {0, 0, 1})},
          {"linear_skewed", skewed_element(4)},
          {"quadratic_reference", single_element(10, {0, 0, 0}, {1, 0, 0}, {0, 1, 0}, {0, 0, 1})},
          {"quadratic_skewed", skewed_element(10)},
          {"quadratic_curved", curved_element()}};
}

class ElementProperties : public ::testing::TestWithParam<int> {
 protected:
  ElementCase c_ = element_cases()[static_cast<size_t>(GetParam())];
};

TEST_P(ElementProperties, StiffnessIsSymmetric) {
  SCOPED_TRACE(c_.name);
  const Eigen::MatrixXd K = element_stiffness(c_.mesh, 0, elasticity_matrix(kSteelLike));
  EXPECT_LT((K - K.transpose()).norm(), 1e-14 * K.norm());
}

// derived: a free elastic body has exactly the six rigid-body motions as zero-energy modes.
TEST_P(ElementProperties, ExactlySixZeroEigenvaluesRestPositive) {
  SCOPED_TRACE(c_.name);
  const Eigen::MatrixXd K = element_stiffness(c_.mesh, 0, elasticity_matrix(kSteelLike));
  Eigen::SelfAdjointEigenSolver<Eigen::MatrixXd> eig(K);
  const Eigen::VectorXd lambda = eig.eigenvalues();  // ascending
  const double largest = lambda.maxCoeff();
  int n_zero = 0;
  for (int i = 0; i < lambda.size(); ++i) {
    if (std::abs(lambda(i)) < 1e-10 * largest) ++n_zero;
  }
  EXPECT_EQ(n_zero, 6);
  EXPECT_GT(lambda(6), 1e-10 * largest) << "smallest non-rigid eigenvalue";
  // The rigid motions themselves produce no force.
  const int k = c_.mesh.nodes_per_element;
  for (int mode = 0; mode < 6; ++mode) {
    Eigen::VectorXd u(3 * k);
    for (int a = 0; a < k; ++a) {
      const Eigen::Vector3d x = c_.mesh.nodes[static_cast<size_t>(a)];
      Eigen::Vector3d v = Eigen::Vector3d::Zero();
      if (mode < 3)
        v(mode) = 1.0;
      else
        v = Eigen::Vector3d::Unit(mode - 3).cross(x);
      u.segment<3>(3 * a) = v;
    }
    EXPECT_LT((K * u).norm(), 1e-12 * K.norm() * u.norm()) << "mode " << mode;
  }
}

// derived: K = integral(B^T D B dV) with B ~ 1/L and dV ~ L^3, so K ~ L; strains of the same
// displacement gradient, and hence stresses, do not depend on the length scale.
TEST_P(ElementProperties, ScalingByLengthFactor) {
  SCOPED_TRACE(c_.name);
  const Matrix6d D = elasticity_matrix(kSteelLike);
  const Eigen::MatrixXd K = element_stiffness(c_.mesh, 0, D);
  Eigen::Matrix3d H;
  H << 1e-3, 2e-4, -3e-4, 5e-4, -2e-3, 1e-4, 0, 7e-4, 1.5e-3;
  for (double s : {1e-3, 1e3}) {
    SCOPED_TRACE("scale " + std::to_string(s));
    mesh::VolumeMesh scaled = c_.mesh;
    for (auto& x : scaled.nodes) x *= s;
    const Eigen::MatrixXd Ks = element_stiffness(scaled, 0, D);
    EXPECT_LT((Ks - s * K).norm(), 1e-12 * s * K.norm());
    Eigen::VectorXd u(3 * scaled.n_nodes());
    for (int a = 0; a < scaled.n_nodes(); ++a)
      u.segment<3>(3 * a) = H * scaled.nodes[static_cast<size_t>(a)];
    Eigen::Matrix<double, 6, Eigen::Dynamic> stress;
    element_quadrature_stress(scaled, 0, D, u, &stress, nullptr);
    Vector6d expected_strain;
    expected_strain << H(0, 0), H(1, 1), H(2, 2), H(1, 2) + H(2, 1), H(0, 2) + H(2, 0),
        H(0, 1) + H(1, 0);
    const Vector6d expected = D * expected_strain;
    for (int q = 0; q < stress.cols(); ++q) {
      EXPECT_LT((stress.col(q) - expected).norm(), 1e-10 * expected.norm()) << "point " << q;
    }
  }
}

INSTANTIATE_TEST_SUITE_P(Elements, ElementProperties, ::testing::Range(0, 5),
                         [](const ::testing::TestParamInfo<int>& param_info) {
                           return element_cases()[static_cast<size_t>(param_info.param)].name;
                         });

TEST(StrainDisplacement, VoigtOrderAndEngineeringShear) {
  // derived: u = (a y + c z, b z, 0) gives gamma_xy = a, gamma_yz = b, gamma_xz = c.
  const mesh::VolumeMesh m = skewed_element(10);
  const double a = 0.3, b = -0.7, c = 0.11;
  Eigen::VectorXd u(30);
  for (int i = 0; i < 10; ++i) {
    const Eigen::Vector3d x = m.nodes[static_cast<size_t>(i)];
    u.segment<3>(3 * i) << a * x.y() + c * x.z(), b * x.z(), 0.0;
  }
  double det = 0;
  const Eigen::MatrixXd B = strain_displacement(m, 0, Eigen::Vector3d(0.2, 0.3, 0.1), &det);
  const Eigen::VectorXd strain = B * u;
  Vector6d expected;
  expected << 0, 0, 0, b, c, a;
  EXPECT_LT((strain - expected).norm(), 1e-13);
  // det(J) = 6 V for the straight element.
  const Eigen::Matrix3d E = (Eigen::Matrix3d() << m.nodes[1] - m.nodes[0], m.nodes[2] - m.nodes[0],
                             m.nodes[3] - m.nodes[0])
                                .finished();
  EXPECT_NEAR(det, E.determinant(), 1e-14);
}

// derived: for u = H x the strain is constant and the energy u^T K u = V eps^T D eps (4-node: the
// closed-form constant-strain element; 10-node: the same field).
TEST(ElementStiffness, LinearFieldEnergyMatchesClosedForm) {
  const Matrix6d D = elasticity_matrix(kSteelLike);
  Eigen::Matrix3d H;
  H << 0.01, -0.02, 0.005, 0.003, 0.004, -0.01, 0.02, 0.0, -0.006;
  Vector6d eps;
  eps << H(0, 0), H(1, 1), H(2, 2), H(1, 2) + H(2, 1), H(0, 2) + H(2, 0), H(0, 1) + H(1, 0);
  for (int k : {4, 10}) {
    const mesh::VolumeMesh m = skewed_element(k);
    const Eigen::Matrix3d E = (Eigen::Matrix3d() << m.nodes[1] - m.nodes[0],
                               m.nodes[2] - m.nodes[0], m.nodes[3] - m.nodes[0])
                                  .finished();
    const double volume = E.determinant() / 6.0;
    Eigen::VectorXd u(3 * k);
    for (int a = 0; a < k; ++a) u.segment<3>(3 * a) = H * m.nodes[static_cast<size_t>(a)];
    const double energy = u.dot(element_stiffness(m, 0, D) * u);
    const double expected = volume * eps.dot(D * eps);
    EXPECT_NEAR(energy, expected, 1e-12 * expected) << k << "-node";
  }
}

// derived: a quadratic displacement field has linear strains, so the 10-node stiffness (exact
// degree-2 rule on a straight element) must give the energy integral computed independently from
// the analytic strain with the degree-5 rule.
TEST(ElementStiffness, QuadraticFieldEnergyExactOnStraightElement) {
  const Matrix6d D = elasticity_matrix(kSteelLike);
  const mesh::VolumeMesh m = skewed_element(10);
  auto displacement = [](const Eigen::Vector3d& x) {
    return Eigen::Vector3d(0.01 * x.x() * x.y() - 0.02 * x.z() * x.z(),
                           0.03 * x.x() * x.x() + 0.01 * x.y() * x.z(),
                           -0.02 * x.y() * x.y() + 0.015 * x.x() * x.z());
  };
  auto strain = [](const Eigen::Vector3d& x) {
    Vector6d e;
    e << 0.01 * x.y(), 0.01 * x.z(), 0.015 * x.x(),
        0.01 * x.y() - 0.04 * x.y(),    // du_y/dz + du_z/dy
        -0.04 * x.z() + 0.015 * x.z(),  // du_x/dz + du_z/dx
        0.01 * x.x() + 0.06 * x.x();    // du_x/dy + du_y/dx
    return e;
  };
  Eigen::VectorXd u(30);
  for (int a = 0; a < 10; ++a) u.segment<3>(3 * a) = displacement(m.nodes[static_cast<size_t>(a)]);
  const double energy = u.dot(element_stiffness(m, 0, D) * u);
  const Eigen::Matrix3d E = (Eigen::Matrix3d() << m.nodes[1] - m.nodes[0], m.nodes[2] - m.nodes[0],
                             m.nodes[3] - m.nodes[0])
                                .finished();
  const core::QuadratureRule rule = core::tet_quadrature(5);
  double expected = 0;
  for (size_t q = 0; q < rule.points.size(); ++q) {
    const Eigen::Vector3d x = m.nodes[0] + E * rule.points[q];
    expected += rule.weights[q] * E.determinant() * strain(x).dot(D * strain(x));
  }
  EXPECT_NEAR(energy, expected, 1e-12 * expected);
}

TEST(ElementStiffness, QuadratureDependsOnCurvature) {
  EXPECT_EQ(stiffness_quadrature(skewed_element(4), 0).points.size(), 1u);
  EXPECT_EQ(stiffness_quadrature(skewed_element(10), 0).points.size(), 4u);
  EXPECT_EQ(stiffness_quadrature(curved_element(), 0).points.size(), 14u);
  EXPECT_TRUE(element_is_straight(skewed_element(10), 0));
  EXPECT_FALSE(element_is_straight(curved_element(), 0));
}

TEST(ElementStiffness, InvertedElementThrowsMeshError) {
  mesh::VolumeMesh m = skewed_element(10);
  std::swap(m.nodes[1], m.nodes[2]);  // reverses the orientation
  try {
    element_stiffness(m, 0, elasticity_matrix(kSteelLike));
    FAIL() << "expected MeshError";
  } catch (const MeshError& e) {
    EXPECT_NE(std::string(e.what()).find("element 0"), std::string::npos) << e.what();
    EXPECT_NE(std::string(e.what()).find("non-positive Jacobian"), std::string::npos) << e.what();
  }
}

TEST(Material, InvalidValuesNameTheValueAndRange) {
  try {
    elasticity_matrix({0.0, 0.3});
    FAIL();
  } catch (const InputError& e) {
    EXPECT_EQ(e.key(), "young_modulus_mpa");
  }
  try {
    elasticity_matrix({1.0, 0.5});
    FAIL();
  } catch (const InputError& e) {
    EXPECT_EQ(e.key(), "poisson_ratio");
    EXPECT_NE(std::string(e.what()).find("(-1, 0.5)"), std::string::npos);
  }
  MaterialTable table{{1, kSteelLike}, {3, kSteelLike}};
  try {
    material_of(table, 2);
    FAIL();
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("region 2"), std::string::npos) << e.what();
    EXPECT_NE(std::string(e.what()).find("{1, 3}"), std::string::npos) << e.what();
  }
}

// derived: D for E, nu gives sigma_xx / eps_xx = E under uniaxial stress (lateral strain -nu eps).
TEST(Material, UniaxialStressRecoversYoungAndPoisson) {
  const Material mat{1234.5, 0.37};
  const Matrix6d D = elasticity_matrix(mat);
  Vector6d eps = Vector6d::Zero();
  eps << 1.0, -mat.poisson_ratio, -mat.poisson_ratio, 0, 0, 0;
  const Vector6d s = D * eps;
  EXPECT_NEAR(s(0), mat.young_modulus_mpa, 1e-9 * mat.young_modulus_mpa);
  EXPECT_NEAR(s(1), 0.0, 1e-9 * mat.young_modulus_mpa);
  EXPECT_NEAR(s(2), 0.0, 1e-9 * mat.young_modulus_mpa);
}

}  // namespace
}  // namespace sharpey::fem
