// PDL width: nearest-point distance from root-surface nodes to the socket surface, with a bucket
// grid over the socket triangles.
#include <algorithm>
#include <array>
#include <cmath>
#include <limits>
#include <string>
#include <vector>

#include <Eigen/Dense>

#include "sharpey/error.h"
#include "sharpey/mesh/mesh_statistics.h"
#include "sharpey/mesh/reference_triangle.h"

namespace sharpey::mesh {
namespace {

using Eigen::Vector2d;
using Eigen::Vector3d;

// A flat triangle to search, with the parent face it belongs to and the parent reference
// coordinates of its corners (for the Newton refinement on curved faces).
struct SearchTriangle {
  std::array<Vector3d, 3> x;
  int face = -1;
  std::array<Vector2d, 3> ref;
};

// Closest point to p on triangle (a, b, c); returns barycentric weights of b and c in (s, t).
Vector3d closest_point_on_triangle(const Vector3d& p, const Vector3d& a, const Vector3d& b,
                                   const Vector3d& c, double* s, double* t) {
  // Walk the Voronoi regions of the vertices, then the edges, then the interior.
  const Vector3d ab = b - a, ac = c - a, ap = p - a;
  const double d1 = ab.dot(ap), d2 = ac.dot(ap);
  if (d1 <= 0 && d2 <= 0) {
    *s = 0, *t = 0;
    return a;
  }
  const Vector3d bp = p - b;
  const double d3 = ab.dot(bp), d4 = ac.dot(bp);
  if (d3 >= 0 && d4 <= d3) {
    *s = 1, *t = 0;
    return b;
  }
  const Vector3d cp = p - c;
  const double d5 = ab.dot(cp), d6 = ac.dot(cp);
  if (d6 >= 0 && d5 <= d6) {
    *s = 0, *t = 1;
    return c;
  }
  const double vc = d1 * d4 - d3 * d2;
  if (vc <= 0 && d1 >= 0 && d3 <= 0) {
    *s = d1 / (d1 - d3), *t = 0;
    return a + *s * ab;
  }
  const double vb = d5 * d2 - d1 * d6;
  if (vb <= 0 && d2 >= 0 && d6 <= 0) {
    *s = 0, *t = d2 / (d2 - d6);
    return a + *t * ac;
  }
  const double va = d3 * d6 - d5 * d4;
  if (va <= 0 && (d4 - d3) >= 0 && (d5 - d6) >= 0) {
    const double w = (d4 - d3) / ((d4 - d3) + (d5 - d6));
    *s = 1 - w, *t = w;
    return b + w * (c - b);
  }
  const double denom = 1.0 / (va + vb + vc);
  *s = vb * denom, *t = vc * denom;
  return a + *s * ab + *t * ac;
}

// Uniform bucket grid over triangles; each triangle is listed in every cell its box touches.
class TriangleGrid {
 public:
  explicit TriangleGrid(const std::vector<SearchTriangle>& tris) : tris_(tris) {
    Vector3d lo = Vector3d::Constant(std::numeric_limits<double>::max());
    Vector3d hi = -lo;
    double extent_sum = 0;
    for (const auto& t : tris_) {
      const Vector3d tlo = t.x[0].cwiseMin(t.x[1]).cwiseMin(t.x[2]);
      const Vector3d thi = t.x[0].cwiseMax(t.x[1]).cwiseMax(t.x[2]);
      lo = lo.cwiseMin(tlo);
      hi = hi.cwiseMax(thi);
      extent_sum += (thi - tlo).maxCoeff();
    }
    const Vector3d size = (hi - lo).cwiseMax(1e-12);
    h_ = std::max(extent_sum / static_cast<double>(tris_.size()), 1e-9 * size.maxCoeff());
    // Keep the cell count within a few per triangle.
    const double max_cells = 4.0 * static_cast<double>(tris_.size()) + 64.0;
    while ((size / h_).array().ceil().prod() > max_cells) h_ *= 1.25;
    lo_ = lo;
    for (int d = 0; d < 3; ++d) n_[d] = std::max(1, static_cast<int>(std::ceil(size[d] / h_)));

    std::vector<int> count(static_cast<size_t>(n_[0]) * n_[1] * n_[2] + 1, 0);
    auto for_cells = [this](const SearchTriangle& t, auto&& visit) {
      const auto a = cell_of(t.x[0].cwiseMin(t.x[1]).cwiseMin(t.x[2]));
      const auto b = cell_of(t.x[0].cwiseMax(t.x[1]).cwiseMax(t.x[2]));
      for (int i = a[0]; i <= b[0]; ++i)
        for (int j = a[1]; j <= b[1]; ++j)
          for (int k = a[2]; k <= b[2]; ++k) visit(index(i, j, k));
    };
    for (const auto& t : tris_) for_cells(t, [&count](size_t c) { ++count[c + 1]; });
    for (size_t c = 1; c < count.size(); ++c) count[c] += count[c - 1];
    start_ = count;
    items_.resize(static_cast<size_t>(count.back()));
    for (size_t i = 0; i < tris_.size(); ++i) {
      for_cells(tris_[i], [&](size_t c) { items_[static_cast<size_t>(count[c]++)] = static_cast<int>(i); });
    }
  }

  // Index of the nearest triangle, its closest point and barycentric (s, t) there.
  int nearest(const Vector3d& p, Vector3d* closest, double* s, double* t) const {
    const auto c = cell_of(p);
    double best = std::numeric_limits<double>::max();
    int best_tri = -1;
    const int max_ring = std::max({n_[0], n_[1], n_[2]});
    for (int r = 0; r <= max_ring; ++r) {
      for (int i = std::max(0, c[0] - r); i <= std::min(n_[0] - 1, c[0] + r); ++i) {
        for (int j = std::max(0, c[1] - r); j <= std::min(n_[1] - 1, c[1] + r); ++j) {
          const bool inner = std::abs(i - c[0]) < r && std::abs(j - c[1]) < r;
          for (int k = std::max(0, c[2] - r); k <= std::min(n_[2] - 1, c[2] + r); ++k) {
            if (inner && std::abs(k - c[2]) < r) {  // interior of the ring: seen already
              k = c[2] + r - 1;
              continue;
            }
            const size_t cell = index(i, j, k);
            for (int q = start_[cell]; q < start_[cell + 1]; ++q) {
              const SearchTriangle& tri = tris_[static_cast<size_t>(items_[static_cast<size_t>(q)])];
              double ss, tt;
              const Vector3d x = closest_point_on_triangle(p, tri.x[0], tri.x[1], tri.x[2], &ss, &tt);
              const double d = (x - p).squaredNorm();
              if (d < best) {
                best = d;
                best_tri = items_[static_cast<size_t>(q)];
                *closest = x;
                *s = ss;
                *t = tt;
              }
            }
          }
        }
      }
      // Cells beyond ring r are at least r cell widths away from p's cell.
      if (best_tri >= 0 && std::sqrt(best) <= r * h_) break;
    }
    return best_tri;
  }

 private:
  std::array<int, 3> cell_of(const Vector3d& p) const {
    std::array<int, 3> c;
    for (int d = 0; d < 3; ++d) {
      const int i = static_cast<int>(std::floor((p[d] - lo_[d]) / h_));
      c[static_cast<size_t>(d)] = std::clamp(i, 0, n_[d] - 1);
    }
    return c;
  }
  size_t index(int i, int j, int k) const {
    return (static_cast<size_t>(i) * static_cast<size_t>(n_[1]) + static_cast<size_t>(j)) *
               static_cast<size_t>(n_[2]) +
           static_cast<size_t>(k);
  }

  const std::vector<SearchTriangle>& tris_;
  Vector3d lo_;
  double h_ = 1;
  std::array<int, 3> n_{};
  std::vector<int> start_, items_;
};

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
    const Vector3d x = X * tri_shape(6, uv);
    const Eigen::Matrix<double, 3, 2> J = X * tri_shape_gradient(6, uv);
    const Eigen::Matrix2d A = J.transpose() * J;
    const Vector2d step = A.ldlt().solve(-J.transpose() * (x - p));
    if (!step.allFinite()) break;
    uv = clamp_to_triangle(uv + step);
    const Vector3d y = X * tri_shape(6, uv);
    const double d = (y - p).squaredNorm();
    if (d >= best_d) break;
    best = y;
    best_d = d;
  }
  return best;
}

}  // namespace

std::vector<PdlWidthSample> pdl_width_samples(const VolumeMesh& m, int root_marker, int socket_marker) {
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
        t.ref[static_cast<size_t>(c)] = tri_node_reference(local);
      }
      tris.push_back(t);
    }
  }
  std::vector<PdlWidthSample> samples;
  if (tris.empty()) return samples;
  const TriangleGrid grid(tris);
  for (int v = 0; v < m.n_nodes(); ++v) {
    if (!is_root[static_cast<size_t>(v)]) continue;
    PdlWidthSample sample;
    sample.node = v;
    sample.root_point = m.nodes[static_cast<size_t>(v)];
    double s = 0, t = 0;
    Vector3d closest = Vector3d::Zero();
    const int tri = grid.nearest(sample.root_point, &closest, &s, &t);
    if (k == 6) {
      const SearchTriangle& st = tris[static_cast<size_t>(tri)];
      const Vector2d uv = (1 - s - t) * st.ref[0] + s * st.ref[1] + t * st.ref[2];
      closest = refine_on_patch(m, st.face, sample.root_point, uv, closest);
    }
    sample.socket_point = closest;
    sample.width_mm = (closest - sample.root_point).norm();
    samples.push_back(sample);
  }
  return samples;
}

}  // namespace sharpey::mesh
