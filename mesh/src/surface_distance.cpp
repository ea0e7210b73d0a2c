#include "sharpey/mesh/surface_distance.h"

#include <cmath>
#include <limits>
#include <string>

#include "detail/triangle_tree.h"
#include "sharpey/error.h"

namespace sharpey::mesh {

std::vector<double> distance_to_faces(const VolumeMesh& m, const std::vector<int>& nodes,
                                      int marker) {
  const int k = m.nodes_per_face;
  if ((k != 3 && k != 6) || m.faces.size() != m.face_marker.size() * static_cast<size_t>(k)) {
    throw MeshError(
        "measuring distances to a surface: faces must have 3 or 6 nodes and one marker each");
  }
  auto check_node = [&](int v) {
    if (v < 0 || v >= m.n_nodes()) {
      throw MeshError("measuring distances to a surface: node index " + std::to_string(v) +
                      " is outside 0 to " + std::to_string(m.n_nodes() - 1));
    }
  };
  static const int kSub[4][3] = {{0, 3, 5}, {3, 1, 4}, {5, 4, 2}, {3, 4, 5}};
  std::vector<detail::SearchTriangle> tris;
  for (int f = 0; f < m.n_faces(); ++f) {
    if (m.face_marker[static_cast<size_t>(f)] != marker) continue;
    const int* face = m.face(f);
    for (int i = 0; i < k; ++i) check_node(face[i]);
    const int n_sub = k == 6 ? 4 : 1;
    for (int s = 0; s < n_sub; ++s) {
      detail::SearchTriangle t;
      t.face = f;
      for (int c = 0; c < 3; ++c) {
        const int local = k == 6 ? kSub[s][c] : c;
        t.x[static_cast<size_t>(c)] = m.nodes[static_cast<size_t>(face[local])];
        t.ref[static_cast<size_t>(c)] = Eigen::Vector2d::Zero();  // not used here
      }
      tris.push_back(t);
    }
  }
  std::vector<double> distance(nodes.size(), std::numeric_limits<double>::infinity());
  if (tris.empty()) return distance;
  const detail::TriangleTree tree(tris);
  for (size_t i = 0; i < nodes.size(); ++i) {
    check_node(nodes[i]);
    const Eigen::Vector3d& p = m.nodes[static_cast<size_t>(nodes[i])];
    Eigen::Vector3d closest;
    double s = 0, t = 0;
    tree.nearest(p, &closest, &s, &t);
    distance[i] = (closest - p).norm();
  }
  return distance;
}

}  // namespace sharpey::mesh
