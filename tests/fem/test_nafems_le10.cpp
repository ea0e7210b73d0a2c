// NAFEMS benchmark LE10 "thick plate pressure" (source: NAFEMS, The Standard NAFEMS Benchmarks,
// 1990, test LE10; set-up as restated in public verification reports, check-values.md section 10
// item 4). Target: sigma_yy = -5.38 MPa at D = (2, 0, 0.6).
// Tolerances: the error is the discretisation error of each fixed mesh, deterministic up to
// round-off, so each tolerance sits a little above the error measured on 2026-12-02 (printed by
// the test, docs/verification.md section 5). The target itself is given to 3 digits: -5.38 stands
// for anything from -5.375 to -5.385, +-0.093 %, so no tolerance can be tighter than about 0.1 %.
//
// Geometry (lengths in m in the benchmark; used here as mm numerically, which leaves stresses in
// MPa unchanged for this linear problem): a quarter of a plate between the ellipses
// x^2/2^2 + y^2/1^2 = 1 (inner) and x^2/3.25^2 + y^2/2.75^2 = 1 (outer), 0 <= z <= 0.6.
// Material: E = 210 GPa = 210000 MPa, nu = 0.3. Load: uniform pressure 1 MPa on the upper face
// z = 0.6. Constraints: face y = 0: u_y = 0; face x = 0: u_x = 0; outer curved face: u_x = u_y = 0;
// the line of the outer curved face at mid-thickness z = 0.3: u_z = 0.
// Mesh: mapped grid between the ellipses (the point at parameter theta on the inner ellipse joined
// by a straight line to the point at the same parameter on the outer one), 10-node elements with
// midside nodes on the elliptic boundaries, graded toward D (cells grow geometrically, 3 : 1 from
// the inner to the outer ellipse and 2 : 1 from y = 0 to x = 0). Measured: uniform grids converge
// slowly from below (-5.12 MPa on 4 x 8 x 4 cells to -5.30 MPa on 16 x 32 x 8, 109k DOFs) because
// sigma_yy varies steeply near D; the graded grids reach -5.32 (6 x 12 x 4) and -5.37 (12 x 24 x
// 6).
#include <gtest/gtest.h>

#include <Eigen/Dense>
#include <algorithm>
#include <cmath>
#include <iostream>
#include <string>

#include "support/fem_checks.h"
#include "support/grid_mesh.h"

namespace sharpey::testing {
namespace {

constexpr double kTarget = -5.38;  // MPa, sigma_yy at D (source: NAFEMS LE10, 1990)

// Geometric grading of a unit coordinate over n cells whose sizes grow from the first to the last
// by `ratio` in total; linear inside each cell, so midside nodes stay at the cell midpoints of the
// graded coordinate and the only curvature is the ellipses'.
double graded(double x, int n, double ratio) {
  const double r = n > 1 ? std::pow(ratio, 1.0 / (n - 1)) : 1.0;
  const auto level = [&](int i) {
    return r == 1.0 ? static_cast<double>(i) / n : (std::pow(r, i) - 1.0) / (std::pow(r, n) - 1.0);
  };
  const int i = std::min(n - 1, static_cast<int>(std::floor(x * n + 1e-12)));
  return level(i) + (x * n - i) * (level(i + 1) - level(i));
}

mesh::VolumeMesh le10_mesh(int n_radial, int n_circumferential, int n_thickness,
                           int nodes_per_element) {
  return grid_mesh(n_radial, n_circumferential, n_thickness, nodes_per_element,
                   [&](const Eigen::Vector3d& p) -> Eigen::Vector3d {
                     const double s = graded(p.x(), n_radial, 3.0);
                     const double t = 0.5 * M_PI * graded(p.y(), n_circumferential, 2.0);
                     const Eigen::Vector2d inner(2.0 * std::cos(t), 1.0 * std::sin(t));
                     const Eigen::Vector2d outer(3.25 * std::cos(t), 2.75 * std::sin(t));
                     const Eigen::Vector2d xy = (1.0 - s) * inner + s * outer;
                     return {xy.x(), xy.y(), 0.6 * p.z()};
                   });
}

// sigma_yy (MPa) at D from the recovered nodal stress.
double sigma_yy_at_d(int n_radial, int n_circumferential, int n_thickness, int nodes_per_element) {
  const mesh::VolumeMesh m = le10_mesh(n_radial, n_circumferential, n_thickness, nodes_per_element);
  ConstraintSet constraints;
  constraints.set_component_on_faces(m, kEtaMin, 1, 0.0);  // y = 0
  constraints.set_component_on_faces(m, kEtaMax, 0, 0.0);  // x = 0
  constraints.set_component_on_faces(m, kXiMax, 0, 0.0);   // outer curved face
  constraints.set_component_on_faces(m, kXiMax, 1, 0.0);
  int n_line = 0;
  for (int n : nodes_on_faces(m, kXiMax)) {
    if (std::abs(m.nodes[static_cast<size_t>(n)].z() - 0.3) < 1e-12) {
      constraints.set(n, 2, 0.0);
      ++n_line;
    }
  }
  EXPECT_GT(n_line, 0) << "no nodes on the mid-thickness line: use an even number of layers";
  const fem::MaterialTable materials = {{1, fem::Material{210000.0, 0.3}}};
  const fem::LinearElasticSolver solver(m, materials, constraints.list());
  const Eigen::VectorXd u = solver.solve(fem::pressure_load(m, kZetaMax, 1.0));
  const fem::RegionField field = fem::recover_region(m, materials, u, 1);
  const int d = nearest_node(m, {2.0, 0.0, 0.6});
  EXPECT_LT((m.nodes[static_cast<size_t>(d)] - Eigen::Vector3d(2.0, 0.0, 0.6)).norm(), 1e-12);
  for (size_t j = 0; j < field.nodes.size(); ++j) {
    if (field.nodes[j] == d) return field.stress_mpa(1, static_cast<Eigen::Index>(j));
  }
  ADD_FAILURE() << "node D not in the recovered field";
  return 0;
}

TEST(NafemsLe10, SigmaYyAtPointD) {
  // Two refinements of the graded grid (radial x circumferential x thickness).
  struct Level {
    int n_radial, n_circumferential, n_thickness;
    double tolerance;
  };
  const Level levels[] = {
      // Measured -1.07 %; 1.5 %: the discretisation error plus 0.4 % for the target's rounding
      // (0.093 %) and round-off.
      {6, 12, 4, 0.015},
      // Measured -0.21 %; 0.5 % (2.4x): the measured error plus the target's rounding (0.093 %)
      // with a margin for round-off; the rounding alone is half the measured error, so a bound
      // much closer to 0.21 % would test the target's last digit, not the solver.
      {12, 24, 6, 0.005},
  };
  double previous_error = 1.0;
  for (const Level& l : levels) {
    const double value = sigma_yy_at_d(l.n_radial, l.n_circumferential, l.n_thickness, 10);
    const double error = value / kTarget - 1.0;
    std::cout << "[nafems le10 10-node " << l.n_radial << "x" << l.n_circumferential << "x"
              << l.n_thickness << "] sigma_yy(D) = " << value
              << " MPa, error vs -5.38: " << 100.0 * error << " % (tolerance "
              << 100.0 * l.tolerance << " %)\n";
    RecordProperty("sigma_yy_D_mpa_" + std::to_string(l.n_radial), std::to_string(value));
    EXPECT_LT(std::abs(error), l.tolerance)
        << l.n_radial << " x " << l.n_circumferential << " x " << l.n_thickness;
    // Refinement brings the value closer to the target (derived: convergence of the method).
    EXPECT_LT(std::abs(error), std::abs(previous_error)) << "no gain from refinement";
    previous_error = error;
  }
}

TEST(NafemsLe10, LinearElementsAreFarOffOnTheSameMesh) {
  // For docs/verification.md: 4-node tetrahedra are stiff in bending. Asserted: the 4-node error
  // (measured -15.2 %) is larger than 3 %, twice the coarser 10-node mesh's tolerance, on the
  // finer graded mesh (a property, not a target).
  const double value = sigma_yy_at_d(12, 24, 6, 4);
  std::cout << "[nafems le10 4-node 12x24x6] sigma_yy(D) = " << value
            << " MPa, error vs -5.38: " << 100.0 * (value / kTarget - 1.0) << " %\n";
  EXPECT_LT(value, 0.0);
  EXPECT_GT(std::abs(value / kTarget - 1.0), 0.03);
}

}  // namespace
}  // namespace sharpey::testing
