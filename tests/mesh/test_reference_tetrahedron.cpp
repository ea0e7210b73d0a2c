// Reference tetrahedron: quadrature exactness, shape-function identities, gradients.
#include <gtest/gtest.h>

#include <Eigen/Geometry>
#include <algorithm>
#include <cmath>
#include <random>

#include "sharpey/core/reference_tetrahedron.h"

namespace sharpey::mesh {
namespace {

double factorial(int n) { return n <= 1 ? 1.0 : n * factorial(n - 1); }

// derived: integral over the reference tetrahedron of xi^a eta^b zeta^c = a! b! c! / (a+b+c+3)!
double exact_monomial_integral(int a, int b, int c) {
  return factorial(a) * factorial(b) * factorial(c) / factorial(a + b + c + 3);
}

double rule_monomial_integral(const core::QuadratureRule& q, int a, int b, int c) {
  double s = 0;
  for (size_t i = 0; i < q.points.size(); ++i) {
    const auto& p = q.points[i];
    s += q.weights[i] * std::pow(p.x(), a) * std::pow(p.y(), b) * std::pow(p.z(), c);
  }
  return s;
}

class QuadratureExactness : public testing::TestWithParam<int> {};

TEST_P(QuadratureExactness, MonomialsUpToDegreeAreExact) {
  const int degree = GetParam();
  const core::QuadratureRule q = core::tet_quadrature(degree);
  ASSERT_EQ(q.points.size(), q.weights.size());
  for (size_t i = 0; i < q.points.size(); ++i) {
    EXPECT_GT(q.weights[i], 0.0);
    const auto& p = q.points[i];
    EXPECT_GE(std::min({p.x(), p.y(), p.z(), 1.0 - p.x() - p.y() - p.z()}), 0.0) << "point outside";
  }
  for (int a = 0; a <= degree; ++a) {
    for (int b = 0; a + b <= degree; ++b) {
      for (int c = 0; a + b + c <= degree; ++c) {
        EXPECT_NEAR(rule_monomial_integral(q, a, b, c), exact_monomial_integral(a, b, c), 1e-15)
            << "monomial xi^" << a << " eta^" << b << " zeta^" << c << ", rule degree " << degree;
      }
    }
  }
}

// The rules are not exact one degree higher (so the exactness test above is not trivially met).
TEST_P(QuadratureExactness, NotExactOneDegreeHigher) {
  const int degree = GetParam();
  const core::QuadratureRule q = core::tet_quadrature(degree);
  double worst = 0;
  for (int a = 0; a <= degree + 1; ++a) {
    for (int b = 0; a + b <= degree + 1; ++b) {
      const int c = degree + 1 - a - b;
      worst = std::max(
          worst, std::abs(rule_monomial_integral(q, a, b, c) - exact_monomial_integral(a, b, c)));
    }
  }
  EXPECT_GT(worst, 1e-8);
}

INSTANTIATE_TEST_SUITE_P(Rules, QuadratureExactness, testing::Values(1, 2, 5),
                         [](const testing::TestParamInfo<int>& i) {
                           return "degree" + std::to_string(i.param);
                         });

TEST(Quadrature, IntermediateDegreesReturnAnExactRule) {
  for (int degree : {3, 4}) {
    const core::QuadratureRule q = core::tet_quadrature(degree);
    for (int a = 0; a <= degree; ++a) {
      const int b = degree - a;
      EXPECT_NEAR(rule_monomial_integral(q, a, b, 0), exact_monomial_integral(a, b, 0), 1e-15)
          << "degree " << degree;
    }
  }
}

std::vector<Eigen::Vector3d> sample_points() {
  std::mt19937 rng(42);
  std::uniform_real_distribution<double> u(0.0, 1.0);
  std::vector<Eigen::Vector3d> pts;
  while (pts.size() < 40) {
    Eigen::Vector3d p(u(rng), u(rng), u(rng));
    if (p.sum() <= 1.0) pts.push_back(p);
  }
  pts.emplace_back(0, 0, 0);
  pts.emplace_back(1, 0, 0);
  return pts;
}

class ShapeFunctions : public testing::TestWithParam<int> {};

TEST_P(ShapeFunctions, PartitionOfUnityAndZeroGradientSum) {
  const int k = GetParam();
  for (const auto& p : sample_points()) {
    EXPECT_NEAR(core::tet_shape(k, p).sum(), 1.0, 1e-14);
    EXPECT_LT(core::tet_shape_gradient(k, p).colwise().sum().norm(), 1e-13);
  }
}

TEST_P(ShapeFunctions, KroneckerPropertyAtNodes) {
  const int k = GetParam();
  for (int j = 0; j < k; ++j) {
    const Eigen::VectorXd N = core::tet_shape(k, core::tet_node_reference(j));
    for (int i = 0; i < k; ++i)
      EXPECT_NEAR(N(i), i == j ? 1.0 : 0.0, 1e-15) << "N" << i << " at node " << j;
  }
}

TEST_P(ShapeFunctions, GradientMatchesCentralDifferences) {
  const int k = GetParam();
  const double h = 1e-6;
  for (const auto& p : sample_points()) {
    const Eigen::MatrixXd G = core::tet_shape_gradient(k, p);
    for (int d = 0; d < 3; ++d) {
      const Eigen::Vector3d e = h * Eigen::Vector3d::Unit(d);
      const Eigen::VectorXd fd = (core::tet_shape(k, p + e) - core::tet_shape(k, p - e)) / (2 * h);
      EXPECT_LT((G.col(d) - fd).cwiseAbs().maxCoeff(), 1e-8);
    }
  }
}

// Interpolating a polynomial of the element's degree through the nodes reproduces it.
TEST_P(ShapeFunctions, ReproducesPolynomialsOfItsDegree) {
  const int k = GetParam();
  auto f = [k](const Eigen::Vector3d& x) {
    const double linear = 0.3 + 1.7 * x.x() - 2.1 * x.y() + 0.9 * x.z();
    return k == 4 ? linear
                  : linear + 1.3 * x.x() * x.y() - 0.7 * x.z() * x.z() + 2.2 * x.y() * x.z();
  };
  Eigen::VectorXd nodal(k);
  for (int i = 0; i < k; ++i) nodal(i) = f(core::tet_node_reference(i));
  for (const auto& p : sample_points()) EXPECT_NEAR(core::tet_shape(k, p).dot(nodal), f(p), 1e-13);
}

INSTANTIATE_TEST_SUITE_P(Elements, ShapeFunctions, testing::Values(4, 10),
                         [](const testing::TestParamInfo<int>& i) {
                           return "nodes" + std::to_string(i.param);
                         });

TEST(ReferenceTetrahedron, FacesPointOutward) {
  for (int f = 0; f < 4; ++f) {
    const auto& t = core::kTetFaces[static_cast<size_t>(f)];
    const Eigen::Vector3d a = core::tet_node_reference(t[0]), b = core::tet_node_reference(t[1]),
                          c = core::tet_node_reference(t[2]);
    const Eigen::Vector3d n = (b - a).cross(c - a);
    // Opposite vertex f must lie on the negative side.
    EXPECT_LT(n.dot(core::tet_node_reference(f) - a), 0.0) << "face " << f;
  }
}

}  // namespace
}  // namespace sharpey::mesh
