// Thick-walled cylinder under internal pressure, plane strain (Lame solution; source: Timoshenko &
// Goodier, Theory of Elasticity, thick-walled cylinder; formulas restated in check-values.md
// section 10 item 3):
//   sigma_r = p a^2/(b^2-a^2) (1 - b^2/r^2), sigma_theta = p a^2/(b^2-a^2) (1 + b^2/r^2),
//   u_r = (1+nu) p a^2 [(1-2nu) r + b^2/r] / (E (b^2-a^2)), sigma_z = nu (sigma_r + sigma_theta).
// Model: a quarter annulus a <= r <= b, 0 <= theta <= 90 deg, mapped grid with 10-node elements
// whose midside nodes lie on the circles; u_z = 0 on both ends (plane strain), u_y = 0 on y = 0 and
// u_x = 0 on x = 0 (symmetry); pressure on the inner surface. Acceptance: radial displacement and
// hoop stress within 1 % at every node (recovered nodal stress, what the program displays) and at
// every quadrature point of the 8 x 12 mesh; every error smaller than on the 4 x 6 mesh.
#include <gtest/gtest.h>

#include <Eigen/Dense>
#include <cmath>
#include <iostream>
#include <string>

#include "support/fem_checks.h"
#include "support/grid_mesh.h"

namespace sharpey::testing {
namespace {

constexpr double kA = 5.0, kB = 10.0, kHeight = 1.0;  // mm
constexpr double kPressure = 2.0;                     // MPa
const fem::Material kMaterial{1000.0, 0.3};

double exact_hoop(double r) {
  return kPressure * kA * kA / (kB * kB - kA * kA) * (1.0 + kB * kB / (r * r));
}
double exact_radial_stress(double r) {
  return kPressure * kA * kA / (kB * kB - kA * kA) * (1.0 - kB * kB / (r * r));
}
double exact_radial_displacement(double r) {
  const double E = kMaterial.young_modulus_mpa, nu = kMaterial.poisson_ratio;
  return (1.0 + nu) * kPressure * kA * kA * ((1.0 - 2.0 * nu) * r + kB * kB / r) /
         (E * (kB * kB - kA * kA));
}

struct LameErrors {
  double nodal_ur = 0, nodal_hoop = 0, nodal_radial = 0, nodal_axial = 0, nodal_ut = 0;  // nodes
  double qp_hoop = 0, qp_radial = 0, qp_axial = 0;  // quadrature points
  double reaction_x = 0;                            // on the x = 0 plane, N
};

// Relative errors: u_r and sigma_theta against their exact value at the point, u_theta against
// u_r(b), sigma_r and sigma_z against p (they pass through zero or are small).
LameErrors solve_quarter_annulus(int n_radial, int n_circumferential) {
  const mesh::VolumeMesh m =
      grid_mesh(n_radial, n_circumferential, 1, 10, [](const Eigen::Vector3d& p) {
        const double r = kA + (kB - kA) * p.x(), t = 0.5 * M_PI * p.y();
        return Eigen::Vector3d(r * std::cos(t), r * std::sin(t), kHeight * p.z());
      });
  // Sides: xi=0 inner surface, xi=1 outer, eta=0 the y=0 plane, eta=1 the x=0 plane, zeta the ends.
  ConstraintSet constraints;
  constraints.set_component_on_faces(m, kEtaMin, 1, 0.0);
  constraints.set_component_on_faces(m, kEtaMax, 0, 0.0);
  constraints.set_component_on_faces(m, kZetaMin, 2, 0.0);
  constraints.set_component_on_faces(m, kZetaMax, 2, 0.0);
  const fem::MaterialTable materials = {{1, kMaterial}};
  const fem::LinearElasticSolver solver(m, materials, constraints.list());
  const Eigen::VectorXd f = fem::pressure_load(m, kXiMin, kPressure);
  const Eigen::VectorXd u = solver.solve(f);
  const double axial = kMaterial.poisson_ratio * 2.0 * kPressure * kA * kA / (kB * kB - kA * kA);

  LameErrors err;
  auto stress_errors = [&](const Eigen::Vector3d& x, const fem::Vector6d& stress, double* hoop,
                           double* radial, double* z) {
    const double r = std::hypot(x.x(), x.y());
    const Eigen::Vector3d er(x.x() / r, x.y() / r, 0), et(-x.y() / r, x.x() / r, 0);
    const Eigen::Matrix3d s = voigt_to_tensor(stress);
    *hoop = std::max(*hoop, std::abs(et.dot(s * et) / exact_hoop(r) - 1.0));
    *radial = std::max(*radial, std::abs(er.dot(s * er) - exact_radial_stress(r)) / kPressure);
    *z = std::max(*z, std::abs(s(2, 2) - axial) / kPressure);
  };
  const fem::RegionField field = fem::recover_region(m, materials, u, 1);
  for (size_t j = 0; j < field.nodes.size(); ++j) {
    const int n = field.nodes[j];
    const Eigen::Vector3d& x = m.nodes[static_cast<size_t>(n)];
    const double r = std::hypot(x.x(), x.y());
    const Eigen::Vector3d er(x.x() / r, x.y() / r, 0), et(-x.y() / r, x.x() / r, 0);
    const Eigen::Vector3d un = u.segment<3>(3 * n);
    err.nodal_ur =
        std::max(err.nodal_ur, std::abs(un.dot(er) / exact_radial_displacement(r) - 1.0));
    err.nodal_ut = std::max(err.nodal_ut, std::abs(un.dot(et)) / exact_radial_displacement(kB));
    stress_errors(x, field.stress_mpa.col(static_cast<Eigen::Index>(j)), &err.nodal_hoop,
                  &err.nodal_radial, &err.nodal_axial);
  }
  const fem::Matrix6d D = fem::elasticity_matrix(kMaterial);
  for (int e = 0; e < m.n_elements(); ++e) {
    Eigen::Matrix<double, 6, Eigen::Dynamic> s;
    Eigen::Matrix3Xd points;
    fem::element_quadrature_stress(m, e, D, u, &s, &points);
    for (int p = 0; p < s.cols(); ++p) {
      stress_errors(points.col(p), s.col(p), &err.qp_hoop, &err.qp_radial, &err.qp_axial);
    }
  }
  const Eigen::VectorXd reactions = solver.reactions(u, f);
  for (int n : nodes_on_faces(m, kEtaMax)) err.reaction_x += reactions[3 * n];

  std::cout << "[lame " << n_radial << "x" << n_circumferential << "x1, 10-node] nodes: u_r "
            << err.nodal_ur << ", sigma_theta " << err.nodal_hoop << ", sigma_r/p "
            << err.nodal_radial << ", sigma_z/p " << err.nodal_axial << ", u_theta/u_r(b) "
            << err.nodal_ut << "; quadrature points: sigma_theta " << err.qp_hoop << ", sigma_r/p "
            << err.qp_radial << ", sigma_z/p " << err.qp_axial << "\n";
  return err;
}

TEST(Lame, RadialDisplacementAndHoopStressWithinOnePercent) {
  const LameErrors coarse = solve_quarter_annulus(4, 6);
  const LameErrors fine = solve_quarter_annulus(8, 12);
  RecordProperty("nodal_ur_error", std::to_string(fine.nodal_ur));
  RecordProperty("nodal_hoop_error", std::to_string(fine.nodal_hoop));
  RecordProperty("quadrature_hoop_error", std::to_string(fine.qp_hoop));
  // Acceptance on the 8 x 12 mesh.
  EXPECT_LT(fine.nodal_ur, 0.01);
  EXPECT_LT(fine.nodal_hoop, 0.01);
  EXPECT_LT(fine.qp_hoop, 0.01);
  EXPECT_LT(fine.qp_radial, 0.01);
  EXPECT_LT(fine.qp_axial, 0.01);
  EXPECT_LT(fine.nodal_ut, 0.001);  // the exact field has no circumferential displacement
  // Refinement reduces every error.
  EXPECT_LT(fine.nodal_ur, coarse.nodal_ur);
  EXPECT_LT(fine.nodal_hoop, coarse.nodal_hoop);
  EXPECT_LT(fine.nodal_radial, coarse.nodal_radial);
  EXPECT_LT(fine.qp_hoop, coarse.qp_hoop);
  // Equilibrium: the x reaction on the x = 0 plane balances the pressure's x resultant on the
  // quarter, p a H (derived).
  for (const LameErrors* e : {&coarse, &fine}) {
    EXPECT_NEAR(e->reaction_x, -kPressure * kA * kHeight, 1e-9 * kPressure * kA * kHeight);
  }
}

}  // namespace
}  // namespace sharpey::testing
