#include "sharpey/fem/element.h"

#include <sstream>
#include <string>

#include "detail/kinematics.h"
#include "sharpey/error.h"

namespace sharpey::fem {
namespace detail {

void validate_mesh(const mesh::VolumeMesh& m) {
  const int k = m.nodes_per_element;
  if (k != 4 && k != 10) {
    throw InputError("mesh.nodes_per_element",
                     "mesh has " + std::to_string(k) +
                         " nodes per element; the solver takes 4-node or 10-node tetrahedra");
  }
  const size_t n_elements = m.element_region.size();
  if (m.elements.size() != n_elements * static_cast<size_t>(k)) {
    throw InputError("mesh.elements", "mesh connectivity has " + std::to_string(m.elements.size()) +
                                          " entries but " + std::to_string(n_elements) +
                                          " elements of " + std::to_string(k) + " nodes need " +
                                          std::to_string(n_elements * k));
  }
  if (n_elements == 0) throw InputError("mesh.elements", "mesh has no elements");
  const int n = m.n_nodes();
  for (size_t i = 0; i < m.elements.size(); ++i) {
    if (m.elements[i] < 0 || m.elements[i] >= n) {
      throw InputError("mesh.elements", "element " + std::to_string(i / k) + " refers to node " +
                                            std::to_string(m.elements[i]) + ", outside 0.." +
                                            std::to_string(n - 1));
    }
  }
  const int kf = m.nodes_per_face;
  if (m.n_faces() > 0) {
    if (kf != (k == 10 ? 6 : 3)) {
      throw InputError("mesh.nodes_per_face", "mesh has " + std::to_string(kf) + "-node faces on " +
                                                  std::to_string(k) + "-node elements; use " +
                                                  std::to_string(k == 10 ? 6 : 3) + "-node faces");
    }
    if (m.faces.size() != m.face_marker.size() * static_cast<size_t>(kf)) {
      throw InputError("mesh.faces", "face connectivity size does not match the face count");
    }
    for (size_t i = 0; i < m.faces.size(); ++i) {
      if (m.faces[i] < 0 || m.faces[i] >= n) {
        throw InputError("mesh.faces", "face " + std::to_string(i / kf) + " refers to node " +
                                           std::to_string(m.faces[i]) + ", outside 0.." +
                                           std::to_string(n - 1));
      }
    }
  }
}

std::string inverted_element_message(const mesh::VolumeMesh& m, int e, double det) {
  std::ostringstream s;
  s << "element " << e << " (region " << m.element_region[static_cast<size_t>(e)]
    << ", first node at (" << m.nodes[static_cast<size_t>(m.element(e)[0])].transpose()
    << ") mm) has a non-positive Jacobian determinant " << det
    << " at a quadrature point: it is inverted or degenerate (node order or a midside node moved "
       "too far); remesh, or reduce the curvature given to its midside nodes";
  return s.str();
}

}  // namespace detail

bool element_is_straight(const mesh::VolumeMesh& mesh, int e) {
  if (mesh.nodes_per_element == 4) return true;
  return detail::is_straight<10>(detail::element_coordinates<10>(mesh, e));
}

core::QuadratureRule stiffness_quadrature(const mesh::VolumeMesh& mesh, int e) {
  if (mesh.nodes_per_element == 4) return core::tet_quadrature(1);
  return core::tet_quadrature(
      detail::stiffness_degree<10>(detail::element_coordinates<10>(mesh, e)));
}

namespace {
template <int K>
Eigen::MatrixXd stiffness_of(const mesh::VolumeMesh& mesh, int e, const Matrix6d& D) {
  detail::ElementMatrix<K> Ke;
  const double det =
      detail::element_stiffness_fixed<K>(detail::element_coordinates<K>(mesh, e), D, &Ke);
  if (!(det > 0)) throw MeshError(detail::inverted_element_message(mesh, e, det));
  return Ke;
}

template <int K>
Eigen::MatrixXd b_of(const mesh::VolumeMesh& mesh, int e, const Eigen::Vector3d& p, double* det) {
  const detail::NodeCoords<K> X = detail::element_coordinates<K>(mesh, e);
  const detail::ShapeGradient<K> dN = core::tet_shape_gradient(K, p);
  detail::ShapeGradient<K> G = detail::ShapeGradient<K>::Zero();
  const double d = detail::physical_gradient<K>(X, dN, &G);
  if (det) *det = d;
  detail::BMatrix<K> B;
  detail::fill_b<K>(G, &B);
  return B;
}
}  // namespace

Eigen::MatrixXd element_stiffness(const mesh::VolumeMesh& mesh, int e, const Matrix6d& D) {
  if (mesh.nodes_per_element == 4) return stiffness_of<4>(mesh, e, D);
  if (mesh.nodes_per_element == 10) return stiffness_of<10>(mesh, e, D);
  detail::validate_mesh(mesh);  // throws with the reason
  return {};
}

Eigen::MatrixXd strain_displacement(const mesh::VolumeMesh& mesh, int e, const Eigen::Vector3d& p,
                                    double* det_jacobian) {
  if (mesh.nodes_per_element == 4) return b_of<4>(mesh, e, p, det_jacobian);
  if (mesh.nodes_per_element == 10) return b_of<10>(mesh, e, p, det_jacobian);
  detail::validate_mesh(mesh);
  return {};
}

}  // namespace sharpey::fem
