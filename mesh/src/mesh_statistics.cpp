// measure(): counts, curved volumes and areas, element quality and PDL width of a mesh.
#include "sharpey/mesh/mesh_statistics.h"

#include <Eigen/Geometry>
#include <algorithm>
#include <cmath>
#include <limits>
#include <string>

#include "sharpey/core/constants.h"
#include "sharpey/core/reference_tetrahedron.h"
#include "sharpey/core/reference_triangle.h"
#include "sharpey/error.h"

namespace sharpey::mesh {
namespace {

using sharpey::core::kPi;

void check_mesh(const VolumeMesh& m) {
  const std::string stage = "measuring the mesh: ";
  if (m.nodes_per_element != 4 && m.nodes_per_element != 10) {
    throw MeshError(stage + "elements have " + std::to_string(m.nodes_per_element) +
                    " nodes; 4 or 10 expected");
  }
  if (m.nodes_per_face != 3 && m.nodes_per_face != 6) {
    throw MeshError(stage + "faces have " + std::to_string(m.nodes_per_face) +
                    " nodes; 3 or 6 expected");
  }
  if (m.elements.size() != m.element_region.size() * static_cast<size_t>(m.nodes_per_element) ||
      m.faces.size() != m.face_marker.size() * static_cast<size_t>(m.nodes_per_face)) {
    throw MeshError(stage + "connectivity and region/marker arrays differ in length");
  }
  const int n = m.n_nodes();
  auto bad = [n](int v) { return v < 0 || v >= n; };
  if (std::any_of(m.elements.begin(), m.elements.end(), bad) ||
      std::any_of(m.faces.begin(), m.faces.end(), bad)) {
    throw MeshError(stage + "a node index is outside 0 to " + std::to_string(n - 1));
  }
}

// Dihedral angles (deg) and radius-edge ratio of the straight tetrahedron a, b, c, d.
void vertex_quality(const Eigen::Vector3d x[4], double* min_dihedral, double* max_dihedral,
                    double* radius_edge) {
  // Outward normals of the faces opposite each vertex (orientation-independent via the sign fix).
  Eigen::Vector3d n[4];
  for (int f = 0; f < 4; ++f) {
    const auto& t = core::kTetFaces[static_cast<size_t>(f)];
    n[f] = (x[t[1]] - x[t[0]]).cross(x[t[2]] - x[t[0]]);
    if (n[f].dot(x[f] - x[t[0]]) > 0) n[f] = -n[f];
    n[f].normalize();
  }
  *min_dihedral = 180, *max_dihedral = 0;
  for (const auto& e : core::kTetEdges) {
    // The two faces containing edge (e0, e1) are those opposite the other two vertices.
    int others[2], m = 0;
    for (int v = 0; v < 4; ++v)
      if (v != e[0] && v != e[1]) others[m++] = v;
    const double c = std::clamp(n[others[0]].dot(n[others[1]]), -1.0, 1.0);
    const double angle = 180.0 - std::acos(c) * 180.0 / kPi;
    *min_dihedral = std::min(*min_dihedral, angle);
    *max_dihedral = std::max(*max_dihedral, angle);
  }
  const Eigen::Vector3d a = x[1] - x[0], b = x[2] - x[0], c = x[3] - x[0];
  const double six_v = a.dot(b.cross(c));
  double shortest = std::numeric_limits<double>::max();
  for (const auto& e : core::kTetEdges) shortest = std::min(shortest, (x[e[1]] - x[e[0]]).norm());
  const Eigen::Vector3d num =
      a.squaredNorm() * b.cross(c) + b.squaredNorm() * c.cross(a) + c.squaredNorm() * a.cross(b);
  const double circumradius = num.norm() / (2.0 * std::abs(six_v));
  *radius_edge = six_v == 0 || shortest == 0 ? std::numeric_limits<double>::infinity()
                                             : circumradius / shortest;
}

// Volume, Jacobian ratio and vertex quality of every K-node element (fixed sizes: no allocation in
// the loop).
template <int K>
void measure_elements(const VolumeMesh& m, MeshStatistics& s) {
  const core::QuadratureRule rule = core::tet_quadrature(K == 10 ? 5 : 1);
  using Gradient = Eigen::Matrix<double, K, 3>;
  std::vector<Gradient> g_qp, g_nodes;
  for (const auto& p : rule.points) g_qp.push_back(core::tet_shape_gradient(K, p));
  if (K == 10) {  // for 4-node elements det J is constant: the quadrature point suffices
    for (int i = 0; i < K; ++i)
      g_nodes.push_back(core::tet_shape_gradient(K, core::tet_node_reference(i)));
  }
  s.min_jacobian_ratio = s.n_elements > 0 ? std::numeric_limits<double>::max() : 0.0;
  s.min_dihedral_deg = s.n_elements > 0 ? 180.0 : 0.0;
  Eigen::Matrix<double, 3, K> X;
  for (int e = 0; e < s.n_elements; ++e) {
    const int* el = m.element(e);
    for (int i = 0; i < K; ++i) X.col(i) = m.nodes[static_cast<size_t>(el[i])];
    double volume = 0, det_min = std::numeric_limits<double>::max(), det_max_abs = 0;
    for (size_t q = 0; q < g_qp.size(); ++q) {
      const double det = (X * g_qp[q]).determinant();
      volume += rule.weights[q] * det;
      det_min = std::min(det_min, det);
      det_max_abs = std::max(det_max_abs, std::abs(det));
    }
    for (const auto& g : g_nodes) {
      const double det = (X * g).determinant();
      det_min = std::min(det_min, det);
      det_max_abs = std::max(det_max_abs, std::abs(det));
    }
    const int region = m.element_region[static_cast<size_t>(e)];
    ++s.elements_per_region[region];
    s.volume_per_region_mm3[region] += volume;
    s.total_volume_mm3 += volume;
    const double ratio = det_max_abs > 0 ? det_min / det_max_abs : 0.0;
    if (ratio < s.min_jacobian_ratio) {
      s.min_jacobian_ratio = ratio;
      s.worst_jacobian_element = e;
    }
    if (ratio <= 0) s.inverted_elements.push_back(e);

    Eigen::Vector3d v[4];
    for (int i = 0; i < 4; ++i) v[i] = X.col(i);
    double dmin, dmax, re;
    vertex_quality(v, &dmin, &dmax, &re);
    s.min_dihedral_deg = std::min(s.min_dihedral_deg, dmin);
    s.max_dihedral_deg = std::max(s.max_dihedral_deg, dmax);
    s.max_radius_edge_ratio = std::max(s.max_radius_edge_ratio, re);
  }
  s.n_inverted_elements = static_cast<int>(s.inverted_elements.size());
}

// Area per marker of K-node faces: the integral of |x_u x x_v| over the reference triangle.
template <int K>
void measure_faces(const VolumeMesh& m, MeshStatistics& s) {
  const core::TriangleQuadrature rule = core::tri_quadrature(K == 6 ? 5 : 1);
  std::vector<Eigen::Matrix<double, K, 2>> g;
  for (const auto& p : rule.points) g.push_back(core::tri_shape_gradient(K, p));
  Eigen::Matrix<double, 3, K> Y;
  for (int f = 0; f < s.n_faces; ++f) {
    const int* fa = m.face(f);
    for (int i = 0; i < K; ++i) Y.col(i) = m.nodes[static_cast<size_t>(fa[i])];
    double area = 0;
    for (size_t q = 0; q < g.size(); ++q) {
      const Eigen::Matrix<double, 3, 2> T = Y * g[q];
      area += rule.weights[q] * T.col(0).cross(T.col(1)).norm();
    }
    s.area_per_marker_mm2[m.face_marker[static_cast<size_t>(f)]] += area;
  }
}

}  // namespace

MeshStatistics measure(const VolumeMesh& m) {
  check_mesh(m);
  MeshStatistics s;
  s.n_nodes = m.n_nodes();
  s.n_elements = m.n_elements();
  s.n_faces = m.n_faces();
  if (m.nodes_per_element == 10) {
    measure_elements<10>(m, s);
  } else {
    measure_elements<4>(m, s);
  }
  if (m.nodes_per_face == 6) {
    measure_faces<6>(m, s);
  } else {
    measure_faces<3>(m, s);
  }

  const std::vector<PdlWidthSample> widths = pdl_width_samples(m);
  s.pdl_width_samples = static_cast<int>(widths.size());
  if (!widths.empty()) {
    s.pdl_width_min_mm = std::numeric_limits<double>::max();
    double sum = 0;
    for (const auto& w : widths) {
      sum += w.width_mm;
      s.pdl_width_min_mm = std::min(s.pdl_width_min_mm, w.width_mm);
      s.pdl_width_max_mm = std::max(s.pdl_width_max_mm, w.width_mm);
    }
    s.pdl_width_mean_mm = sum / static_cast<double>(widths.size());
  }
  return s;
}

}  // namespace sharpey::mesh
