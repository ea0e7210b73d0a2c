// Convergence on a manufactured smooth solution (method of manufactured solutions; source: Roache,
// Verification and Validation in Computational Science and Engineering, 1998; optimal a-priori
// rates h^(p+1) in L2 and h^p in H1 for degree-p isoparametric elements, source: Ciarlet, The
// Finite Element Method for Elliptic Problems, 1978; both citations from memory). u is a product of
// sines per component on a gently curved cube; its boundary values are prescribed at the boundary
// nodes and the consistent body force b = -div sigma(u) = -(mu lap u + (lambda + mu) grad div u)
// (derived) is applied. Asserted: L2 rate 2 (4-node) and 3 (10-node), H1 rate 1 and 2, each within
// +-0.3, between the two finest meshes.
#include <gtest/gtest.h>

#include <Eigen/Dense>
#include <array>
#include <cmath>
#include <iostream>
#include <string>
#include <vector>

#include "support/fem_checks.h"
#include "support/grid_mesh.h"

namespace sharpey::testing {
namespace {

const fem::Material kMaterial{1000.0, 0.3};

// u_c = A_c prod_d sin(k_cd x_d + p_cd), mm.
struct SineField {
  std::array<double, 3> amplitude = {{1.0e-3, -0.8e-3, 0.6e-3}};
  double k[3][3] = {{2.1, 1.3, 1.7}, {1.1, 2.4, 0.9}, {1.6, 1.2, 2.2}};
  double phase[3][3] = {{0.3, 0.8, 0.5}, {0.7, 0.2, 1.0}, {0.4, 0.9, 0.1}};

  double factor(int c, int d, const Eigen::Vector3d& x, int derivative) const {
    const double t = k[c][d] * x[d] + phase[c][d];
    switch (derivative) {
      case 0:
        return std::sin(t);
      case 1:
        return k[c][d] * std::cos(t);
      default:
        return -k[c][d] * k[c][d] * std::sin(t);
    }
  }
  // d^(n_0 + n_1 + n_2) u_c / dx_0^n_0 dx_1^n_1 dx_2^n_2
  double derivative(int c, const std::array<int, 3>& n, const Eigen::Vector3d& x) const {
    double v = amplitude[static_cast<size_t>(c)];
    for (int d = 0; d < 3; ++d) v *= factor(c, d, x, n[static_cast<size_t>(d)]);
    return v;
  }
  Eigen::Vector3d value(const Eigen::Vector3d& x) const {
    return {derivative(0, {0, 0, 0}, x), derivative(1, {0, 0, 0}, x), derivative(2, {0, 0, 0}, x)};
  }
  Eigen::Matrix3d gradient(const Eigen::Vector3d& x) const {
    Eigen::Matrix3d g;
    for (int c = 0; c < 3; ++c)
      for (int j = 0; j < 3; ++j) {
        std::array<int, 3> n = {0, 0, 0};
        n[static_cast<size_t>(j)] = 1;
        g(c, j) = derivative(c, n, x);
      }
    return g;
  }
  double second(int c, int i, int j, const Eigen::Vector3d& x) const {
    std::array<int, 3> n = {0, 0, 0};
    ++n[static_cast<size_t>(i)];
    ++n[static_cast<size_t>(j)];
    return derivative(c, n, x);
  }
  // b = -(mu lap u + (lambda + mu) grad div u)
  Eigen::Vector3d body_force(const Eigen::Vector3d& x) const {
    const double lambda = lame_lambda(kMaterial), mu = shear_modulus(kMaterial);
    Eigen::Vector3d b;
    for (int i = 0; i < 3; ++i) {
      double lap = 0, grad_div = 0;
      for (int j = 0; j < 3; ++j) {
        lap += second(i, j, j, x);
        grad_div += second(j, j, i, x);
      }
      b[i] = -(mu * lap + (lambda + mu) * grad_div);
    }
    return b;
  }
};

// A gently curved unit cube: every element of the mapped grid is curved.
Eigen::Vector3d curved_cube(const Eigen::Vector3d& p) {
  return p + 0.04 * Eigen::Vector3d(std::sin(M_PI * p.y()) * std::sin(M_PI * p.z()),
                                    std::sin(M_PI * p.z()) * std::sin(M_PI * p.x()),
                                    std::sin(M_PI * p.x()) * std::sin(M_PI * p.y()));
}

ErrorNorms solve_and_measure(int n, int nodes_per_element, const SineField& field) {
  const mesh::VolumeMesh m = grid_mesh(n, n, n, nodes_per_element, curved_cube);
  const VectorField exact = [&](const Eigen::Vector3d& x) { return field.value(x); };
  ConstraintSet constraints;
  for (int side = kXiMin; side <= kZetaMax; ++side) constraints.set_field_on_faces(m, side, exact);
  const fem::LinearElasticSolver solver(m, {{1, kMaterial}}, constraints.list());
  const Eigen::VectorXd u = solver.solve(
      body_force_load(m, [&](const Eigen::Vector3d& x) { return field.body_force(x); }));
  return relative_errors(m, u, exact, [&](const Eigen::Vector3d& x) { return field.gradient(x); });
}

struct ConvergenceCase {
  int nodes_per_element;
  std::vector<int> cells;   // per direction, each level doubles the previous one
  double l2_rate, h1_rate;  // expected
};

class Convergence : public ::testing::TestWithParam<ConvergenceCase> {};

TEST_P(Convergence, OptimalRates) {
  const ConvergenceCase c = GetParam();
  const SineField field;
  std::vector<ErrorNorms> errors;
  for (int n : c.cells) {
    errors.push_back(solve_and_measure(n, c.nodes_per_element, field));
    std::cout << "[convergence k=" << c.nodes_per_element << "] n=" << n << " relative L2 error "
              << errors.back().l2 << ", H1 error " << errors.back().h1;
    if (errors.size() > 1) {
      const ErrorNorms& a = errors[errors.size() - 2];
      std::cout << ", rates L2 " << std::log2(a.l2 / errors.back().l2) << " H1 "
                << std::log2(a.h1 / errors.back().h1);
    }
    std::cout << "\n";
  }
  const ErrorNorms& coarse = errors[errors.size() - 2];
  const ErrorNorms& fine = errors.back();
  const double l2_rate = std::log2(coarse.l2 / fine.l2);
  const double h1_rate = std::log2(coarse.h1 / fine.h1);
  RecordProperty("l2_rate", std::to_string(l2_rate));
  RecordProperty("h1_rate", std::to_string(h1_rate));
  EXPECT_NEAR(l2_rate, c.l2_rate, 0.3);
  EXPECT_NEAR(h1_rate, c.h1_rate, 0.3);
  for (size_t i = 1; i < errors.size(); ++i) EXPECT_LT(errors[i].l2, errors[i - 1].l2);
}

std::string case_name(const ::testing::TestParamInfo<ConvergenceCase>& info) {
  return "k" + std::to_string(info.param.nodes_per_element);
}

INSTANTIATE_TEST_SUITE_P(ManufacturedSine, Convergence,
                         ::testing::Values(ConvergenceCase{4, {4, 8, 16}, 2.0, 1.0},
                                           ConvergenceCase{10, {2, 4, 8}, 3.0, 2.0}),
                         case_name);

}  // namespace
}  // namespace sharpey::testing
