// PDL width: nearest-point distance from root-surface nodes to the socket surface, with a
// bounding-volume hierarchy over the socket triangles.
#include <Eigen/Dense>
#include <algorithm>
#include <array>
#include <cmath>
#include <cstdint>
#include <limits>
#include <string>
#include <utility>
#include <vector>

#include "detail/triangle_tree.h"
#include "sharpey/core/reference_triangle.h"
#include "sharpey/error.h"
#include "sharpey/mesh/mesh_statistics.h"

namespace sharpey::mesh {
namespace {

using detail::SearchTriangle;
using detail::TriangleTree;
using Eigen::Vector2d;
using Eigen::Vector3d;

// 63-bit Morton code of p inside `box` (21 bits per axis).
std::uint64_t morton_code(const Vector3d& p, const Eigen::AlignedBox3d& box) {
  const Vector3d size = box.sizes().cwiseMax(1e-300);
  std::uint64_t code = 0;
  std::uint64_t c[3];
  for (int d = 0; d < 3; ++d) {
    const double u = std::clamp((p[d] - box.min()[d]) / size[d], 0.0, 1.0);
    c[d] = static_cast<std::uint64_t>(u * 2097151.0);
  }
  for (int bit = 20; bit >= 0; --bit) {
    for (int d = 0; d < 3; ++d) code = (code << 1) | ((c[d] >> bit) & 1u);
  }
  return code;
}

// Projects (u, v) onto the reference triangle.
Vector2d clamp_to_triangle(Vector2d uv) {
  uv = uv.cwiseMax(0.0);
  const double excess = uv.sum() - 1.0;
  if (excess > 0) {
    uv.array() -= 0.5 * excess;
    uv = uv.cwiseMax(0.0);
    uv /= std::max(uv.sum(), 1.0);
  }
  return uv;
}

// Gauss-Newton refinement of the nearest point on a curved 6-node face, starting at `uv`.
Vector3d refine_on_patch(const VolumeMesh& m, int face, const Vector3d& p, Vector2d uv,
                         const Vector3d& start) {
  Eigen::Matrix<double, 3, 6> X;
  for (int i = 0; i < 6; ++i) X.col(i) = m.nodes[static_cast<size_t>(m.face(face)[i])];
  Vector3d best = start;
  double best_d = (start - p).squaredNorm();
  for (int it = 0; it < 4; ++it) {
    const Vector3d x = X * core::tri_shape(6, uv);
    const Eigen::Matrix<double, 3, 2> J = X * core::tri_shape_gradient(6, uv);
    const Eigen::Matrix2d A = J.transpose() * J;
    const Vector2d step = A.ldlt().solve(-J.transpose() * (x - p));
    if (!step.allFinite()) break;
    uv = clamp_to_triangle(uv + step);
    const Vector3d y = X * core::tri_shape(6, uv);
    const double d = (y - p).squaredNorm();
    if (d >= best_d) break;
    best = y;
    best_d = d;
  }
  return best;
}

}  // namespace

std::vector<PdlWidthSample> pdl_width_samples(const VolumeMesh& m, int root_marker,
                                              int socket_marker) {
  const int k = m.nodes_per_face;
  if ((k != 3 && k != 6) || m.faces.size() != m.face_marker.size() * static_cast<size_t>(k)) {
    throw MeshError("measuring the PDL width: faces must have 3 or 6 nodes and one marker each");
  }
  for (int v : m.faces) {
    if (v < 0 || v >= m.n_nodes()) {
      throw MeshError("measuring the PDL width: face node index " + std::to_string(v) +
                      " is outside 0 to " + std::to_string(m.n_nodes() - 1));
    }
  }
  // Flat search triangles: each 6-node face split into four at its midside nodes.
  static const int kSub[4][3] = {{0, 3, 5}, {3, 1, 4}, {5, 4, 2}, {3, 4, 5}};
  std::vector<SearchTriangle> tris;
  std::vector<bool> is_root(static_cast<size_t>(m.n_nodes()), false);
  for (int f = 0; f < m.n_faces(); ++f) {
    const int marker = m.face_marker[static_cast<size_t>(f)];
    const int* nodes = m.face(f);
    if (marker == root_marker) {
      for (int i = 0; i < k; ++i) is_root[static_cast<size_t>(nodes[i])] = true;
    }
    if (marker != socket_marker) continue;
    const int n_sub = k == 6 ? 4 : 1;
    for (int s = 0; s < n_sub; ++s) {
      SearchTriangle t;
      t.face = f;
      for (int c = 0; c < 3; ++c) {
        const int local = k == 6 ? kSub[s][c] : c;
        t.x[static_cast<size_t>(c)] = m.nodes[static_cast<size_t>(nodes[local])];
        t.ref[static_cast<size_t>(c)] = core::tri_node_reference(local);
      }
      tris.push_back(t);
    }
  }
  std::vector<PdlWidthSample> samples;
  if (tris.empty()) return samples;
  const TriangleTree tree(tris);
  // Query in Morton (Z-curve) order so consecutive queries walk the same part of the tree; the
  // samples are returned in ascending node order.
  std::vector<int> roots;
  Eigen::AlignedBox3d box;
  for (int v = 0; v < m.n_nodes(); ++v) {
    if (!is_root[static_cast<size_t>(v)]) continue;
    roots.push_back(v);
    box.extend(m.nodes[static_cast<size_t>(v)]);
  }
  std::vector<std::pair<std::uint64_t, int>> by_code;
  by_code.reserve(roots.size());
  for (int v : roots) by_code.emplace_back(morton_code(m.nodes[static_cast<size_t>(v)], box), v);
  std::sort(by_code.begin(), by_code.end());
  samples.resize(roots.size());
  for (const auto& [code, v] : by_code) {
    PdlWidthSample& sample = samples[static_cast<size_t>(
        std::lower_bound(roots.begin(), roots.end(), v) - roots.begin())];
    sample.node = v;
    sample.root_point = m.nodes[static_cast<size_t>(v)];
    double s = 0, t = 0;
    Vector3d closest = Vector3d::Zero();
    const int tri = tree.nearest(sample.root_point, &closest, &s, &t);
    if (k == 6) {
      const SearchTriangle& st = tris[static_cast<size_t>(tri)];
      const Vector2d uv = (1 - s - t) * st.ref[0] + s * st.ref[1] + t * st.ref[2];
      closest = refine_on_patch(m, st.face, sample.root_point, uv, closest);
    }
    sample.socket_point = closest;
    sample.width_mm = (closest - sample.root_point).norm();
  }
  return samples;
}

}  // namespace sharpey::mesh
