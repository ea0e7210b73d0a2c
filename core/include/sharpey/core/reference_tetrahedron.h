// Shape functions and quadrature rules on the reference tetrahedron
// {xi, eta, zeta >= 0, xi + eta + zeta <= 1}, shared by the mesher (Jacobian checks) and the
// solver (element matrices, recovery).
//
// Node order is VTK's: vertices 0-3 at (0,0,0) (1,0,0) (0,1,0) (0,0,1), then midside nodes on edges
// (0,1) (1,2) (0,2) (0,3) (1,3) (2,3). Barycentric coordinates L0 = 1 - xi - eta - zeta, L1 = xi,
// L2 = eta, L3 = zeta.
#pragma once

#include <Eigen/Core>
#include <array>
#include <vector>

namespace sharpey::core {

// Vertex pairs of the six edges, in midside-node order (node 4 + k lies on kTetEdges[k]).
inline constexpr std::array<std::array<int, 2>, 6> kTetEdges = {
    {{0, 1}, {1, 2}, {0, 2}, {0, 3}, {1, 3}, {2, 3}}};

// The four faces as vertex triples, numbered by the opposite vertex (face i lies opposite vertex
// i), ordered so the right-hand normal points out of the tetrahedron when its volume is positive.
inline constexpr std::array<std::array<int, 3>, 4> kTetFaces = {
    {{1, 2, 3}, {0, 3, 2}, {0, 1, 3}, {0, 2, 1}}};

// Shape functions N (k values) at reference point `p`; k = 4 or 10.
inline Eigen::VectorXd tet_shape(int k, const Eigen::Vector3d& p) {
  const double L[4] = {1.0 - p.x() - p.y() - p.z(), p.x(), p.y(), p.z()};
  Eigen::VectorXd N(k);
  if (k == 4) {
    for (int i = 0; i < 4; ++i) N(i) = L[i];
    return N;
  }
  for (int i = 0; i < 4; ++i) N(i) = L[i] * (2.0 * L[i] - 1.0);
  for (int e = 0; e < 6; ++e) N(4 + e) = 4.0 * L[kTetEdges[e][0]] * L[kTetEdges[e][1]];
  return N;
}

// Derivatives dN/d(xi, eta, zeta): k x 3 at reference point `p`; k = 4 or 10.
inline Eigen::MatrixXd tet_shape_gradient(int k, const Eigen::Vector3d& p) {
  const double L[4] = {1.0 - p.x() - p.y() - p.z(), p.x(), p.y(), p.z()};
  const Eigen::Vector3d dL[4] = {Eigen::Vector3d(-1, -1, -1), Eigen::Vector3d(1, 0, 0),
                                 Eigen::Vector3d(0, 1, 0), Eigen::Vector3d(0, 0, 1)};
  Eigen::MatrixXd G(k, 3);
  if (k == 4) {
    for (int i = 0; i < 4; ++i) G.row(i) = dL[i].transpose();
    return G;
  }
  for (int i = 0; i < 4; ++i) G.row(i) = ((4.0 * L[i] - 1.0) * dL[i]).transpose();
  for (int e = 0; e < 6; ++e) {
    const int a = kTetEdges[e][0], b = kTetEdges[e][1];
    G.row(4 + e) = (4.0 * (L[a] * dL[b] + L[b] * dL[a])).transpose();
  }
  return G;
}

// Reference coordinates of the k nodes (k = 4 or 10).
inline Eigen::Vector3d tet_node_reference(int i) {
  static const Eigen::Vector3d v[4] = {Eigen::Vector3d(0, 0, 0), Eigen::Vector3d(1, 0, 0),
                                       Eigen::Vector3d(0, 1, 0), Eigen::Vector3d(0, 0, 1)};
  if (i < 4) return v[i];
  return 0.5 * (v[kTetEdges[i - 4][0]] + v[kTetEdges[i - 4][1]]);
}

struct QuadratureRule {
  std::vector<Eigen::Vector3d> points;  // reference coordinates
  std::vector<double> weights;          // sum to 1/6, the reference volume
};

// Symmetric rules with positive weights, exact for polynomials up to `degree`:
// degree 1 (1 point), 2 (4 points), 5 (14 points). Any other degree <= 5 returns the next exact
// rule. source: the 4-point and 14-point rules are the standard symmetric tetrahedral rules (e.g.
// Keast 1986, Comput Methods Appl Mech Eng 55:339; Walkington's tables); values from memory,
// verified by the monomial-exactness test in tests/mesh.
inline QuadratureRule tet_quadrature(int degree) {
  QuadratureRule q;
  auto add_a3b = [&q](double a, double w) {  // 4 points: (a, a, a) permuted with b = 1 - 3a
    const double b = 1.0 - 3.0 * a;
    const double L[4][4] = {{b, a, a, a}, {a, b, a, a}, {a, a, b, a}, {a, a, a, b}};
    for (const auto& l : L) {
      q.points.emplace_back(l[1], l[2], l[3]);
      q.weights.push_back(w);
    }
  };
  if (degree <= 1) {
    q.points.emplace_back(0.25, 0.25, 0.25);
    q.weights.push_back(1.0 / 6.0);
  } else if (degree == 2) {
    add_a3b(0.1381966011250105, 1.0 / 24.0);
  } else {
    add_a3b(0.0927352503108912, 0.01224884051939366);
    add_a3b(0.3108859192633006, 0.01878132095300264);
    const double a = 0.4544962958743504, b = 0.5 - a;  // 6 points: two coordinates a, two b
    const double L[6][4] = {{a, a, b, b}, {a, b, a, b}, {a, b, b, a},
                            {b, a, a, b}, {b, a, b, a}, {b, b, a, a}};
    for (const auto& l : L) {
      q.points.emplace_back(l[1], l[2], l[3]);
      q.weights.push_back(0.007091003462846911);
    }
  }
  return q;
}

}  // namespace sharpey::core
