// Shape functions and quadrature rules on the reference triangle {u, v >= 0, u + v <= 1}, used for
// boundary faces (areas, surface loads). Node order is VTK's: vertices 0-2 at (0,0) (1,0) (0,1),
// then midside nodes on edges (0,1) (1,2) (0,2). Barycentric L0 = 1 - u - v, L1 = u, L2 = v.
#pragma once

#include <Eigen/Core>
#include <array>
#include <cmath>
#include <vector>

namespace sharpey::core {

// Vertex pairs of the three edges, in midside-node order (node 3 + k lies on kTriEdges[k]).
inline constexpr std::array<std::array<int, 2>, 3> kTriEdges = {{{0, 1}, {1, 2}, {0, 2}}};

// Shape functions N (k values) at reference point `p` = (u, v); k = 3 or 6.
inline Eigen::VectorXd tri_shape(int k, const Eigen::Vector2d& p) {
  const double L[3] = {1.0 - p.x() - p.y(), p.x(), p.y()};
  Eigen::VectorXd N(k);
  if (k == 3) {
    for (int i = 0; i < 3; ++i) N(i) = L[i];
    return N;
  }
  for (int i = 0; i < 3; ++i) N(i) = L[i] * (2.0 * L[i] - 1.0);
  for (int e = 0; e < 3; ++e) N(3 + e) = 4.0 * L[kTriEdges[e][0]] * L[kTriEdges[e][1]];
  return N;
}

// Derivatives dN/d(u, v): k x 2 at reference point `p`; k = 3 or 6.
inline Eigen::MatrixXd tri_shape_gradient(int k, const Eigen::Vector2d& p) {
  const double L[3] = {1.0 - p.x() - p.y(), p.x(), p.y()};
  const Eigen::Vector2d dL[3] = {Eigen::Vector2d(-1, -1), Eigen::Vector2d(1, 0),
                                 Eigen::Vector2d(0, 1)};
  Eigen::MatrixXd G(k, 2);
  if (k == 3) {
    for (int i = 0; i < 3; ++i) G.row(i) = dL[i].transpose();
    return G;
  }
  for (int i = 0; i < 3; ++i) G.row(i) = ((4.0 * L[i] - 1.0) * dL[i]).transpose();
  for (int e = 0; e < 3; ++e) {
    const int a = kTriEdges[e][0], b = kTriEdges[e][1];
    G.row(3 + e) = (4.0 * (L[a] * dL[b] + L[b] * dL[a])).transpose();
  }
  return G;
}

// Reference coordinates of node i (0 to 5).
inline Eigen::Vector2d tri_node_reference(int i) {
  static const Eigen::Vector2d v[3] = {Eigen::Vector2d(0, 0), Eigen::Vector2d(1, 0),
                                       Eigen::Vector2d(0, 1)};
  if (i < 3) return v[i];
  return 0.5 * (v[kTriEdges[i - 3][0]] + v[kTriEdges[i - 3][1]]);
}

struct TriangleQuadrature {
  std::vector<Eigen::Vector2d> points;  // reference coordinates (u, v)
  std::vector<double> weights;          // sum to 1/2, the reference area
};

// Symmetric rules with positive weights, exact for polynomials up to `degree`: degree 1 (1 point),
// 2 (3 points), 5 (7 points); degrees 3 and 4 return the degree-5 rule.
// source: the 7-point rule is Radon's degree-5 formula (weights (155 -+ sqrt 15)/1200, points from
// (6 +- sqrt 15)/21), as tabulated by Dunavant 1985, Int J Numer Methods Eng 21:1129; from
// memory, verified by the monomial-exactness test in tests/mesh.
inline TriangleQuadrature tri_quadrature(int degree) {
  TriangleQuadrature q;
  auto add_aab = [&q](double a, double w) {  // 3 points: barycentric (a, a, b) permuted
    const double b = 1.0 - 2.0 * a;
    const double L[3][3] = {{b, a, a}, {a, b, a}, {a, a, b}};
    for (const auto& l : L) {
      q.points.emplace_back(l[1], l[2]);
      q.weights.push_back(0.5 * w);
    }
  };
  if (degree <= 1) {
    q.points.emplace_back(1.0 / 3.0, 1.0 / 3.0);
    q.weights.push_back(0.5);
  } else if (degree == 2) {
    add_aab(1.0 / 6.0, 1.0 / 3.0);
  } else {
    const double s15 = std::sqrt(15.0);
    q.points.emplace_back(1.0 / 3.0, 1.0 / 3.0);
    q.weights.push_back(0.5 * 9.0 / 40.0);
    add_aab((6.0 + s15) / 21.0, (155.0 + s15) / 1200.0);
    add_aab((6.0 - s15) / 21.0, (155.0 - s15) / 1200.0);
  }
  return q;
}

}  // namespace sharpey::core
