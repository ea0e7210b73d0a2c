// Internal element kinematics shared by stiffness, recovery and the assembly: reference tables of
// shape functions at quadrature points, Jacobians, the B matrix. Fixed-size Eigen types per node
// count K (4 or 10) keep the hot loops free of allocations.
#pragma once

#include <Eigen/Core>
#include <Eigen/LU>
#include <algorithm>
#include <string>
#include <vector>

#include "sharpey/core/reference_tetrahedron.h"
#include "sharpey/mesh/volume_mesh.h"

namespace sharpey::fem::detail {

template <int K>
using NodeCoords = Eigen::Matrix<double, 3, K>;  // columns: node positions, mm
template <int K>
using ShapeGradient = Eigen::Matrix<double, K, 3>;  // dN_a / d(coordinate)
template <int K>
using BMatrix = Eigen::Matrix<double, 6, 3 * K>;
template <int K>
using ElementMatrix = Eigen::Matrix<double, 3 * K, 3 * K>;

// Shape functions and their reference gradients at the points of one quadrature rule.
template <int K>
struct ReferenceTable {
  std::vector<Eigen::Vector3d> points;
  std::vector<double> weights;
  std::vector<Eigen::Matrix<double, K, 1>> shape;
  std::vector<ShapeGradient<K>> gradient;
};

template <int K>
ReferenceTable<K> make_reference_table(const core::QuadratureRule& rule) {
  ReferenceTable<K> t;
  t.points = rule.points;
  t.weights = rule.weights;
  for (const Eigen::Vector3d& p : rule.points) {
    t.shape.push_back(core::tet_shape(K, p));
    t.gradient.push_back(core::tet_shape_gradient(K, p));
  }
  return t;
}

// Table of the tetrahedral rule of `degree` (1, 2 or 5), built once (thread-safe static init).
template <int K>
const ReferenceTable<K>& reference_table(int degree) {
  static const ReferenceTable<K> t1 = make_reference_table<K>(core::tet_quadrature(1));
  static const ReferenceTable<K> t2 = make_reference_table<K>(core::tet_quadrature(2));
  static const ReferenceTable<K> t5 = make_reference_table<K>(core::tet_quadrature(5));
  return degree <= 1 ? t1 : (degree == 2 ? t2 : t5);
}

template <int K>
NodeCoords<K> element_coordinates(const mesh::VolumeMesh& m, int e) {
  NodeCoords<K> X;
  const int* en = m.element(e);
  for (int a = 0; a < K; ++a) X.col(a) = m.nodes[static_cast<size_t>(en[a])];
  return X;
}

// Relative tolerance on midside-node offsets below which an edge counts as straight.
inline constexpr double kStraightTolerance = 1e-9;

template <int K>
bool is_straight(const NodeCoords<K>& X) {
  if constexpr (K == 4) {
    return true;
  } else {
    for (int k = 0; k < 6; ++k) {
      const Eigen::Vector3d a = X.col(core::kTetEdges[k][0]), b = X.col(core::kTetEdges[k][1]);
      if ((X.col(4 + k) - 0.5 * (a + b)).norm() > kStraightTolerance * (b - a).norm()) return false;
    }
    return true;
  }
}

// Degree of the stiffness rule: exact for straight elements, degree 5 for curved 10-node ones.
template <int K>
int stiffness_degree(const NodeCoords<K>& X) {
  if constexpr (K == 4) {
    return 1;
  } else {
    return is_straight<K>(X) ? 2 : 5;
  }
}

// Physical shape gradients G = dN/dxi * J^-1 (K x 3) with J = X dN/dxi; returns det(J).
template <int K>
double physical_gradient(const NodeCoords<K>& X, const ShapeGradient<K>& dN, ShapeGradient<K>* G) {
  const Eigen::Matrix3d J = X * dN;  // J(i, j) = dx_i / dxi_j
  const double det = J.determinant();
  if (det != 0.0) G->noalias() = dN * J.inverse();
  return det;
}

// B (6 x 3K), Voigt xx yy zz yz xz xy, engineering shear, from physical gradients G (K x 3).
template <int K>
void fill_b(const ShapeGradient<K>& G, BMatrix<K>* B) {
  B->setZero();
  for (int a = 0; a < K; ++a) {
    const double gx = G(a, 0), gy = G(a, 1), gz = G(a, 2);
    const int c = 3 * a;
    (*B)(0, c) = gx;
    (*B)(1, c + 1) = gy;
    (*B)(2, c + 2) = gz;
    (*B)(3, c + 1) = gz;
    (*B)(3, c + 2) = gy;
    (*B)(4, c) = gz;
    (*B)(4, c + 2) = gx;
    (*B)(5, c) = gy;
    (*B)(5, c + 1) = gx;
  }
}

// Element stiffness in Ke (3K x 3K). Returns the element index-free status: the smallest det(J)
// over the quadrature points (the caller throws when it is not positive).
template <int K>
double element_stiffness_fixed(const NodeCoords<K>& X, const Eigen::Matrix<double, 6, 6>& D,
                               ElementMatrix<K>* Ke) {
  const ReferenceTable<K>& t = reference_table<K>(stiffness_degree<K>(X));
  Ke->setZero();
  double min_det = 1e300;
  ShapeGradient<K> G;
  BMatrix<K> B;
  Eigen::Matrix<double, 6, 3 * K> DB;
  for (size_t q = 0; q < t.points.size(); ++q) {
    const double det = physical_gradient<K>(X, t.gradient[q], &G);
    min_det = std::min(min_det, det);
    if (!(det > 0)) return min_det;
    fill_b<K>(G, &B);
    DB.noalias() = D * B;
    Ke->noalias() += (t.weights[q] * det) * (B.transpose() * DB);
  }
  return min_det;
}

// Isotropic kernel used by the assembly: per quadrature point and node pair (a, b),
// K_ab(i, j) += w det(J) [lambda g_a,i g_b,j + mu g_a,j g_b,i + mu (g_a . g_b) delta_ij], computed
// for b >= a and mirrored. Same result as element_stiffness_fixed with the isotropic D, with about
// a quarter of the work (B is half zeros). Returns the smallest det(J) like
// element_stiffness_fixed.
template <int K>
double element_stiffness_isotropic(const NodeCoords<K>& X, double lambda, double mu,
                                   ElementMatrix<K>* Ke) {
  const ReferenceTable<K>& t = reference_table<K>(stiffness_degree<K>(X));
  Ke->setZero();
  double min_det = 1e300;
  ShapeGradient<K> G;
  for (size_t q = 0; q < t.points.size(); ++q) {
    const double det = physical_gradient<K>(X, t.gradient[q], &G);
    min_det = std::min(min_det, det);
    if (!(det > 0)) return min_det;
    const double s = t.weights[q] * det;
    const ShapeGradient<K> Gl = (s * lambda) * G, Gm = (s * mu) * G;
    for (int b = 0; b < K; ++b) {
      for (int a = 0; a <= b; ++a) {
        const double dot = Gm.row(a).dot(G.row(b));
        auto block = Ke->template block<3, 3>(3 * a, 3 * b);
        block.noalias() += Gl.row(a).transpose() * G.row(b) + G.row(b).transpose() * Gm.row(a);
        block.diagonal().array() += dot;
      }
    }
  }
  for (int b = 0; b < K; ++b) {
    for (int a = 0; a < b; ++a) {
      Ke->template block<3, 3>(3 * b, 3 * a) = Ke->template block<3, 3>(3 * a, 3 * b).transpose();
    }
  }
  return min_det;
}

// Lame parameters of D when D has the isotropic pattern (to 1e-14 relative), else false.
inline bool isotropic_parameters(const Eigen::Matrix<double, 6, 6>& D, double* lambda, double* mu) {
  const double l = D(0, 1), m = D(3, 3);
  Eigen::Matrix<double, 6, 6> iso = Eigen::Matrix<double, 6, 6>::Zero();
  iso.topLeftCorner<3, 3>().setConstant(l);
  iso.topLeftCorner<3, 3>().diagonal().array() += 2 * m;
  iso.bottomRightCorner<3, 3>().diagonal().setConstant(m);
  if ((D - iso).cwiseAbs().maxCoeff() > 1e-14 * D.cwiseAbs().maxCoeff()) return false;
  *lambda = l;
  *mu = m;
  return true;
}

// Throws InputError unless the mesh is well formed (node count per element 4 or 10, sizes agree,
// indices in range, face node count matches the elements').
void validate_mesh(const mesh::VolumeMesh& m);

// Message for an element with a non-positive Jacobian (thrown as MeshError by the callers).
std::string inverted_element_message(const mesh::VolumeMesh& m, int e, double det);

}  // namespace sharpey::fem::detail
