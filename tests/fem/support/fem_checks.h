// Helpers of the fem verification tests, computed independently of the fem library from the
// shape functions and quadrature rules of sharpey/core/reference_tetrahedron.h: constraint sets,
// consistent body-force loads, interpolation, and L2 / H1 error norms against exact fields.
// Header-only on purpose: only the verification tests that include it link against the solver.
#pragma once

#include <Eigen/Dense>
#include <algorithm>
#include <cmath>
#include <functional>
#include <map>
#include <set>
#include <utility>
#include <vector>

#include "sharpey/core/reference_tetrahedron.h"
#include "sharpey/fem/elasticity.h"
#include "sharpey/mesh/volume_mesh.h"

namespace sharpey::testing {

using VectorField = std::function<Eigen::Vector3d(const Eigen::Vector3d&)>;
using GradientField = std::function<Eigen::Matrix3d(const Eigen::Vector3d&)>;  // (du_i/dx_j)

// Lame constants of an isotropic material, MPa.
inline double lame_lambda(const fem::Material& m) {
  return m.young_modulus_mpa * m.poisson_ratio /
         ((1.0 + m.poisson_ratio) * (1.0 - 2.0 * m.poisson_ratio));
}
inline double shear_modulus(const fem::Material& m) {
  return m.young_modulus_mpa / (2.0 * (1.0 + m.poisson_ratio));
}

// Stress (Voigt xx yy zz yz xz xy, MPa) of a displacement gradient, isotropic material.
inline fem::Vector6d stress_of_gradient(const fem::Material& m, const Eigen::Matrix3d& grad) {
  const Eigen::Matrix3d eps = 0.5 * (grad + grad.transpose());
  const Eigen::Matrix3d s =
      lame_lambda(m) * eps.trace() * Eigen::Matrix3d::Identity() + 2.0 * shear_modulus(m) * eps;
  fem::Vector6d v;
  v << s(0, 0), s(1, 1), s(2, 2), s(1, 2), s(0, 2), s(0, 1);
  return v;
}

inline Eigen::Matrix3d voigt_to_tensor(const fem::Vector6d& v) {
  Eigen::Matrix3d s;
  s << v(0), v(5), v(4), v(5), v(1), v(3), v(4), v(3), v(2);
  return s;
}

// Sorted unique nodes of the faces carrying `marker`.
inline std::vector<int> nodes_on_faces(const mesh::VolumeMesh& m, int marker) {
  std::set<int> s;
  for (int f = 0; f < m.n_faces(); ++f) {
    if (m.face_marker[static_cast<size_t>(f)] != marker) continue;
    for (int a = 0; a < m.nodes_per_face; ++a) s.insert(m.face(f)[a]);
  }
  return {s.begin(), s.end()};
}

// Prescribed dofs without duplicates (a later set() of the same dof replaces the value).
class ConstraintSet {
 public:
  void set(int node, int component, double value_mm) { values_[{node, component}] = value_mm; }
  // All three components of every node on faces with `marker` from `field`.
  void set_field_on_faces(const mesh::VolumeMesh& m, int marker, const VectorField& field) {
    for (int n : nodes_on_faces(m, marker)) {
      const Eigen::Vector3d u = field(m.nodes[static_cast<size_t>(n)]);
      for (int c = 0; c < 3; ++c) set(n, c, u[c]);
    }
  }
  // One component of every node on faces with `marker`.
  void set_component_on_faces(const mesh::VolumeMesh& m, int marker, int component, double value) {
    for (int n : nodes_on_faces(m, marker)) set(n, component, value);
  }
  std::vector<fem::DofConstraint> list() const {
    std::vector<fem::DofConstraint> out;
    for (const auto& [key, value] : values_) out.push_back({key.first, key.second, value});
    return out;
  }
  bool contains(int node, int component) const { return values_.count({node, component}) > 0; }

 private:
  std::map<std::pair<int, int>, double> values_;
};

// Jacobian dx/dxi (3 x 3) of element e at reference point p, and the shape-function gradients.
struct ElementPoint {
  Eigen::VectorXd N;      // k shape values
  Eigen::MatrixXd dN_dx;  // k x 3 physical gradients
  Eigen::Vector3d x;      // physical position, mm
  double det_j = 0;       // mm^3 per reference volume
};
inline ElementPoint element_point(const mesh::VolumeMesh& m, int e, const Eigen::Vector3d& p) {
  const int k = m.nodes_per_element;
  ElementPoint q;
  q.N = core::tet_shape(k, p);
  const Eigen::MatrixXd G = core::tet_shape_gradient(k, p);
  Eigen::Matrix3d J = Eigen::Matrix3d::Zero();  // J(i, j) = dx_i / dxi_j
  q.x.setZero();
  for (int a = 0; a < k; ++a) {
    const Eigen::Vector3d& xa = m.nodes[static_cast<size_t>(m.element(e)[a])];
    J += xa * G.row(a);
    q.x += q.N(a) * xa;
  }
  q.det_j = J.determinant();
  q.dN_dx = G * J.inverse();
  return q;
}

// Consistent nodal forces f_a = integral(N_a b dV) of a body force b (N/mm^3), degree-5 rule.
inline Eigen::VectorXd body_force_load(const mesh::VolumeMesh& m, const VectorField& b) {
  const core::QuadratureRule rule = core::tet_quadrature(5);
  Eigen::VectorXd f = Eigen::VectorXd::Zero(3 * m.n_nodes());
  for (int e = 0; e < m.n_elements(); ++e) {
    for (size_t p = 0; p < rule.points.size(); ++p) {
      const ElementPoint q = element_point(m, e, rule.points[p]);
      const Eigen::Vector3d bw = b(q.x) * (rule.weights[p] * q.det_j);
      for (int a = 0; a < m.nodes_per_element; ++a) {
        f.segment<3>(3 * m.element(e)[a]) += q.N(a) * bw;
      }
    }
  }
  return f;
}

// Nodal interpolant of a field (3n, node-major).
inline Eigen::VectorXd interpolate(const mesh::VolumeMesh& m, const VectorField& u) {
  Eigen::VectorXd v(3 * m.n_nodes());
  for (int i = 0; i < m.n_nodes(); ++i) v.segment<3>(3 * i) = u(m.nodes[static_cast<size_t>(i)]);
  return v;
}

// max_i |u_h - u|_inf over nodes, divided by max_i |u|_inf.
inline double max_nodal_relative_error(const mesh::VolumeMesh& m, const Eigen::VectorXd& u_h,
                                       const VectorField& u) {
  const Eigen::VectorXd exact = interpolate(m, u);
  return (u_h - exact).lpNorm<Eigen::Infinity>() / exact.lpNorm<Eigen::Infinity>();
}

// Relative L2 error ||u_h - u|| / ||u|| and relative H1-seminorm error |u_h - u|_1 / |u|_1 over
// the mesh (degree-5 rule on every element, isoparametric map).
struct ErrorNorms {
  double l2 = 0, h1 = 0;
};
inline ErrorNorms relative_errors(const mesh::VolumeMesh& m, const Eigen::VectorXd& u_h,
                                  const VectorField& u, const GradientField& grad_u) {
  const core::QuadratureRule rule = core::tet_quadrature(5);
  double e0 = 0, n0 = 0, e1 = 0, n1 = 0;
  for (int e = 0; e < m.n_elements(); ++e) {
    for (size_t p = 0; p < rule.points.size(); ++p) {
      const ElementPoint q = element_point(m, e, rule.points[p]);
      Eigen::Vector3d uh = Eigen::Vector3d::Zero();
      Eigen::Matrix3d gh = Eigen::Matrix3d::Zero();
      for (int a = 0; a < m.nodes_per_element; ++a) {
        const Eigen::Vector3d ua = u_h.segment<3>(3 * m.element(e)[a]);
        uh += q.N(a) * ua;
        gh += ua * q.dN_dx.row(a);
      }
      const double w = rule.weights[p] * q.det_j;
      const Eigen::Vector3d ue = u(q.x);
      const Eigen::Matrix3d ge = grad_u(q.x);
      e0 += w * (uh - ue).squaredNorm();
      n0 += w * ue.squaredNorm();
      e1 += w * (gh - ge).squaredNorm();
      n1 += w * ge.squaredNorm();
    }
  }
  return {std::sqrt(e0 / n0), std::sqrt(e1 / n1)};
}

// Index of the node nearest to x.
inline int nearest_node(const mesh::VolumeMesh& m, const Eigen::Vector3d& x) {
  int best = 0;
  for (int i = 1; i < m.n_nodes(); ++i) {
    if ((m.nodes[static_cast<size_t>(i)] - x).squaredNorm() <
        (m.nodes[static_cast<size_t>(best)] - x).squaredNorm()) {
      best = i;
    }
  }
  return best;
}

}  // namespace sharpey::testing
