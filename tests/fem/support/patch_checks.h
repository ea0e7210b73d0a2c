// The three patch tests shared by the structured-grid and TetGen patch-test files
// (source: Irons & Razzaque 1972, the patch test for finite elements, citation from memory;
// common practice).
// Each runs on a box [0, 2] x [0, 1] x [0, 1.5] mm whose six sides carry the GridSide markers
// (1: x = 0, 2: x = 2, 3: y = 0, 4: y = 1, 5: z = 0, 6: z = 1.5); every region of the mesh gets the
// same material, so a region interface inside the box must be invisible to the solution.
// Header-only: see fem_checks.h.
#pragma once

#include <Eigen/Dense>
#include <algorithm>
#include <set>

#include "support/fem_checks.h"
#include "support/grid_mesh.h"

namespace sharpey::testing {

inline const fem::Material kPatchMaterial{2000.0, 0.3};
inline const Eigen::Vector3d kPatchBox(2.0, 1.0, 1.5);  // mm

inline fem::MaterialTable patch_materials(const mesh::VolumeMesh& m) {
  fem::MaterialTable table;
  for (int r : std::set<int>(m.element_region.begin(), m.element_region.end()))
    table[r] = kPatchMaterial;
  return table;
}

struct PatchErrors {
  double nodal = 0;   // max nodal |u_h - u| / max |u|
  double stress = 0;  // max |sigma_h - sigma| / max |sigma| (quadrature points or recovered nodes)
};

// Linear field u = a + B x (rotation included) prescribed at every boundary node, no load.
// stress: at the quadrature points of every element.
inline PatchErrors linear_dirichlet_patch(const mesh::VolumeMesh& m) {
  Eigen::Matrix3d B;
  B << 1.0e-3, -2.0e-4, 3.0e-4, 5.0e-4, -7.0e-4, 1.0e-4, -3.0e-4, 6.0e-4, 4.0e-4;
  const Eigen::Vector3d a(0.01, -0.02, 0.005);
  const VectorField exact = [&](const Eigen::Vector3d& x) -> Eigen::Vector3d { return a + B * x; };
  ConstraintSet constraints;
  for (int side = kXiMin; side <= kZetaMax; ++side) constraints.set_field_on_faces(m, side, exact);
  const fem::LinearElasticSolver solver(m, patch_materials(m), constraints.list());
  const Eigen::VectorXd u = solver.solve(Eigen::VectorXd(Eigen::VectorXd::Zero(3 * m.n_nodes())));

  PatchErrors errors;
  errors.nodal = max_nodal_relative_error(m, u, exact);
  const fem::Vector6d exact_stress = stress_of_gradient(kPatchMaterial, B);
  const fem::Matrix6d D = fem::elasticity_matrix(kPatchMaterial);
  for (int e = 0; e < m.n_elements(); ++e) {
    Eigen::Matrix<double, 6, Eigen::Dynamic> s;
    Eigen::Matrix3Xd points;
    fem::element_quadrature_stress(m, e, D, u, &s, &points);
    for (int p = 0; p < s.cols(); ++p) {
      errors.stress = std::max(errors.stress, (s.col(p) - exact_stress).lpNorm<Eigen::Infinity>());
    }
  }
  errors.stress /= exact_stress.lpNorm<Eigen::Infinity>();
  return errors;
}

// Constant stress: tractions t = sigma n on the six sides and only six rigid-body supports at
// three corners (set to the exact field there). stress: recovered nodal stress of every region.
inline PatchErrors constant_stress_patch(const mesh::VolumeMesh& m) {
  fem::Vector6d sigma;  // MPa, all components nonzero
  sigma << 1.5, -0.7, 0.9, 0.3, -0.4, 0.6;
  const Eigen::Matrix3d S = voigt_to_tensor(sigma);
  const double E = kPatchMaterial.young_modulus_mpa, nu = kPatchMaterial.poisson_ratio;
  // Hooke's law inverted; u = eps x has no rotation.
  const Eigen::Matrix3d eps = ((1.0 + nu) * S - nu * S.trace() * Eigen::Matrix3d::Identity()) / E;
  const VectorField exact = [&](const Eigen::Vector3d& x) -> Eigen::Vector3d { return eps * x; };

  Eigen::VectorXd f = Eigen::VectorXd::Zero(3 * m.n_nodes());
  for (int side = kXiMin; side <= kZetaMax; ++side) {
    Eigen::Vector3d n = Eigen::Vector3d::Zero();
    n[(side - 1) / 2] = (side - 1) % 2 ? 1.0 : -1.0;
    f += fem::traction_load(m, side, S * n);
  }
  ConstraintSet constraints;
  const int o = nearest_node(m, {0, 0, 0});
  const int px = nearest_node(m, {kPatchBox.x(), 0, 0});
  const int py = nearest_node(m, {0, kPatchBox.y(), 0});
  for (int c = 0; c < 3; ++c) constraints.set(o, c, exact(m.nodes[static_cast<size_t>(o)])[c]);
  constraints.set(px, 1, exact(m.nodes[static_cast<size_t>(px)])[1]);
  constraints.set(px, 2, exact(m.nodes[static_cast<size_t>(px)])[2]);
  constraints.set(py, 2, exact(m.nodes[static_cast<size_t>(py)])[2]);

  const fem::MaterialTable materials = patch_materials(m);
  const fem::LinearElasticSolver solver(m, materials, constraints.list());
  const Eigen::VectorXd u = solver.solve(f);
  PatchErrors errors;
  errors.nodal = max_nodal_relative_error(m, u, exact);
  for (const auto& [region, material] : materials) {
    const fem::RegionField field = fem::recover_region(m, materials, u, region);
    if (field.stress_mpa.cols() != static_cast<Eigen::Index>(field.nodes.size()) ||
        field.nodes.empty()) {
      errors.stress = HUGE_VAL;  // malformed recovery: fail loudly
      continue;
    }
    errors.stress =
        std::max(errors.stress, (field.stress_mpa.colwise() - sigma).cwiseAbs().maxCoeff());
  }
  errors.stress /= sigma.lpNorm<Eigen::Infinity>();
  return errors;
}

// Quadratic field u_i = a_i + B_ij x_j + 1/2 Q_ijk x_j x_k at every boundary node with the
// consistent constant body force b = -div sigma (derived: (div sigma)_i = lambda Q_kki + mu (Q_ijj
// + Q_jij)). stress: relative nodal error of the solve without the body force (must be large: shows
// the body force matters, so the check can fail).
inline PatchErrors quadratic_body_force_patch(const mesh::VolumeMesh& m) {
  Eigen::Matrix3d B;
  B << 2.0e-4, 1.0e-4, -3.0e-4, -1.0e-4, 4.0e-4, 2.0e-4, 3.0e-4, -2.0e-4, -1.0e-4;
  double Q[3][3][3];
  for (int i = 0; i < 3; ++i) {
    for (int j = 0; j < 3; ++j) {
      for (int k = j; k < 3; ++k) {
        Q[i][j][k] = Q[i][k][j] = 1.0e-4 * (1 + i + 2 * j - k) * ((i + j + k) % 2 ? 1 : -1);
      }
    }
  }
  const VectorField exact = [&](const Eigen::Vector3d& x) -> Eigen::Vector3d {
    Eigen::Vector3d u = Eigen::Vector3d(1e-3, 0, -2e-3) + B * x;
    for (int i = 0; i < 3; ++i)
      for (int j = 0; j < 3; ++j)
        for (int k = 0; k < 3; ++k) u[i] += 0.5 * Q[i][j][k] * x[j] * x[k];
    return u;
  };
  const double lambda = lame_lambda(kPatchMaterial), mu = shear_modulus(kPatchMaterial);
  Eigen::Vector3d b = Eigen::Vector3d::Zero();
  for (int i = 0; i < 3; ++i)
    for (int j = 0; j < 3; ++j) b[i] -= lambda * Q[j][j][i] + mu * (Q[i][j][j] + Q[j][i][j]);

  ConstraintSet constraints;
  for (int side = kXiMin; side <= kZetaMax; ++side) constraints.set_field_on_faces(m, side, exact);
  const fem::LinearElasticSolver solver(m, patch_materials(m), constraints.list());
  PatchErrors errors;
  errors.nodal = max_nodal_relative_error(
      m, solver.solve(body_force_load(m, [&](const Eigen::Vector3d&) { return b; })), exact);
  errors.stress = max_nodal_relative_error(
      m, solver.solve(Eigen::VectorXd(Eigen::VectorXd::Zero(3 * m.n_nodes()))), exact);
  return errors;
}

}  // namespace sharpey::testing
