#include "support/grid_mesh.h"

#include <Eigen/Dense>
#include <algorithm>
#include <array>
#include <cmath>
#include <map>
#include <random>
#include <string>
#include <utility>
#include <vector>

#include "sharpey/core/reference_tetrahedron.h"
#include "sharpey/error.h"

namespace sharpey::testing {
namespace {

using Index3 = std::array<int, 3>;  // position on the half-spacing grid: 2 * (cell index) + {0,1}

// det(dx/dxi) of element e at reference point p.
double jacobian_determinant(const mesh::VolumeMesh& m, int e, const Eigen::Vector3d& p) {
  const int k = m.nodes_per_element;
  const Eigen::MatrixXd G = core::tet_shape_gradient(k, p);  // k x 3
  Eigen::Matrix3d J = Eigen::Matrix3d::Zero();
  const int* en = m.element(e);
  for (int i = 0; i < k; ++i) J += m.nodes[static_cast<size_t>(en[i])] * G.row(i);
  return J.determinant();
}

// Smallest Jacobian determinant of element e over its nodes (enough to catch inversion for the
// straight or mildly curved elements of these tests).
double min_jacobian(const mesh::VolumeMesh& m, int e) {
  double d = jacobian_determinant(m, e, Eigen::Vector3d(0.25, 0.25, 0.25));
  if (m.nodes_per_element == 10) {
    for (int i = 0; i < 10; ++i)
      d = std::min(d, jacobian_determinant(m, e, core::tet_node_reference(i)));
  }
  return d;
}

}  // namespace

mesh::VolumeMesh grid_mesh(int nx, int ny, int nz, int nodes_per_element, const PointMap& map,
                           const RegionOf& region_of) {
  if (nx < 1 || ny < 1 || nz < 1) {
    throw InputError("grid_mesh.n", "grid_mesh: cell counts must be >= 1, got " +
                                        std::to_string(nx) + " x " + std::to_string(ny) + " x " +
                                        std::to_string(nz) +
                                        "; pass at least one cell per direction");
  }
  if (nodes_per_element != 4 && nodes_per_element != 10) {
    throw InputError(
        "grid_mesh.nodes_per_element",
        "grid_mesh: nodes_per_element must be 4 or 10, got " + std::to_string(nodes_per_element));
  }
  const bool quadratic = nodes_per_element == 10;
  const Index3 n_half = {2 * nx + 1, 2 * ny + 1, 2 * nz + 1};
  const Index3 n_cells = {nx, ny, nz};

  // Node ids on the half-spacing grid; linear meshes use only the even (vertex) points.
  mesh::VolumeMesh m;
  m.nodes_per_element = nodes_per_element;
  m.nodes_per_face = quadratic ? 6 : 3;
  std::vector<int> id(static_cast<size_t>(n_half[0]) * n_half[1] * n_half[2], -1);
  auto flat = [&](const Index3& h) {
    return static_cast<size_t>(h[0]) +
           static_cast<size_t>(n_half[0]) * (h[1] + static_cast<size_t>(n_half[1]) * h[2]);
  };
  auto unit = [&](const Index3& h) {
    return Eigen::Vector3d(0.5 * h[0] / nx, 0.5 * h[1] / ny, 0.5 * h[2] / nz);
  };
  for (int k = 0; k < n_half[2]; ++k) {
    for (int j = 0; j < n_half[1]; ++j) {
      for (int i = 0; i < n_half[0]; ++i) {
        if (!quadratic && (i % 2 || j % 2 || k % 2)) continue;
        const Index3 h = {i, j, k};
        id[flat(h)] = m.n_nodes();
        const Eigen::Vector3d x = unit(h);
        m.nodes.push_back(map ? map(x) : x);
      }
    }
  }
  auto midpoint = [](const Index3& a, const Index3& b) {
    return Index3{(a[0] + b[0]) / 2, (a[1] + b[1]) / 2, (a[2] + b[2]) / 2};
  };

  // The six Kuhn tetrahedra of a cell: one per permutation of the axes, walking from the cell's low
  // corner to its high corner one axis at a time.
  const std::array<Index3, 6> permutations = {
      {{0, 1, 2}, {0, 2, 1}, {1, 0, 2}, {1, 2, 0}, {2, 0, 1}, {2, 1, 0}}};
  for (int ck = 0; ck < nz; ++ck) {
    for (int cj = 0; cj < ny; ++cj) {
      for (int ci = 0; ci < nx; ++ci) {
        const Eigen::Vector3d centre((ci + 0.5) / nx, (cj + 0.5) / ny, (ck + 0.5) / nz);
        const int region = region_of ? region_of(centre) : 1;
        for (const Index3& perm : permutations) {
          std::array<Index3, 4> v;
          v[0] = {2 * ci, 2 * cj, 2 * ck};
          for (int s = 0; s < 3; ++s) {
            v[s + 1] = v[s];
            v[s + 1][perm[s]] += 2;
          }
          // Orientation judged from the mapped vertices; swapping vertices 1 and 2 flips it.
          auto x = [&](int a) { return m.nodes[static_cast<size_t>(id[flat(v[a])])]; };
          if ((x(1) - x(0)).cross(x(2) - x(0)).dot(x(3) - x(0)) < 0) std::swap(v[1], v[2]);
          for (int a = 0; a < 4; ++a) m.elements.push_back(id[flat(v[a])]);
          if (quadratic) {
            for (const auto& edge : core::kTetEdges) {
              m.elements.push_back(id[flat(midpoint(v[edge[0]], v[edge[1]]))]);
            }
          }
          m.element_region.push_back(region);

          // Element faces lying on a side of the cube are boundary faces.
          for (const auto& f : core::kTetFaces) {
            for (int axis = 0; axis < 3; ++axis) {
              for (int side = 0; side < 2; ++side) {
                const int level = side ? 2 * n_cells[axis] : 0;
                if (v[f[0]][axis] != level || v[f[1]][axis] != level || v[f[2]][axis] != level)
                  continue;
                for (int a = 0; a < 3; ++a) m.faces.push_back(id[flat(v[f[a]])]);
                if (quadratic) {
                  m.faces.push_back(id[flat(midpoint(v[f[0]], v[f[1]]))]);
                  m.faces.push_back(id[flat(midpoint(v[f[1]], v[f[2]]))]);
                  m.faces.push_back(id[flat(midpoint(v[f[0]], v[f[2]]))]);
                }
                m.face_marker.push_back(1 + 2 * axis + side);
              }
            }
          }
        }
      }
    }
  }
  return m;
}

void jitter_nodes(mesh::VolumeMesh& m, double fraction, unsigned seed) {
  if (!(fraction >= 0.0 && fraction < 0.5)) {
    throw InputError("jitter_nodes.fraction", "jitter_nodes: fraction must lie in [0, 0.5), got " +
                                                  std::to_string(fraction));
  }
  const int k = m.nodes_per_element;
  const int n_nodes = m.n_nodes();

  // Boundary vertices: vertices of element faces that belong to a single element.
  std::map<std::array<int, 3>, int> face_count;
  for (int e = 0; e < m.n_elements(); ++e) {
    const int* en = m.element(e);
    for (const auto& f : core::kTetFaces) {
      std::array<int, 3> key = {en[f[0]], en[f[1]], en[f[2]]};
      std::sort(key.begin(), key.end());
      ++face_count[key];
    }
  }
  std::vector<char> on_boundary(static_cast<size_t>(n_nodes), 0);
  for (const auto& [key, count] : face_count) {
    if (count == 1) {
      for (int v : key) on_boundary[static_cast<size_t>(v)] = 1;
    }
  }

  // Vertex -> incident elements, and the shortest incident edge length.
  std::vector<std::vector<int>> elements_of(static_cast<size_t>(n_nodes));
  std::vector<double> spacing(static_cast<size_t>(n_nodes), HUGE_VAL);
  std::vector<char> is_vertex(static_cast<size_t>(n_nodes), 0);
  for (int e = 0; e < m.n_elements(); ++e) {
    const int* en = m.element(e);
    for (int a = 0; a < 4; ++a) {
      elements_of[static_cast<size_t>(en[a])].push_back(e);
      is_vertex[static_cast<size_t>(en[a])] = 1;
    }
    for (const auto& edge : core::kTetEdges) {
      const int a = en[edge[0]], b = en[edge[1]];
      const double h = (m.nodes[static_cast<size_t>(a)] - m.nodes[static_cast<size_t>(b)]).norm();
      spacing[static_cast<size_t>(a)] = std::min(spacing[static_cast<size_t>(a)], h);
      spacing[static_cast<size_t>(b)] = std::min(spacing[static_cast<size_t>(b)], h);
    }
  }

  // Midside nodes to re-centre after a vertex moves: (midside node, other vertex) per vertex.
  std::vector<std::vector<std::pair<int, int>>> midsides_of(static_cast<size_t>(n_nodes));
  if (k == 10) {
    for (int e = 0; e < m.n_elements(); ++e) {
      const int* en = m.element(e);
      for (int s = 0; s < 6; ++s) {
        const int a = en[core::kTetEdges[static_cast<size_t>(s)][0]];
        const int b = en[core::kTetEdges[static_cast<size_t>(s)][1]];
        midsides_of[static_cast<size_t>(a)].emplace_back(en[4 + s], b);
        midsides_of[static_cast<size_t>(b)].emplace_back(en[4 + s], a);
      }
    }
  }

  // Uniform numbers from the raw engine output, so a seed gives the same mesh with any library.
  std::mt19937 engine(seed);
  auto uniform = [&engine]() {
    return 2.0 * static_cast<double>(engine()) / static_cast<double>(std::mt19937::max()) - 1.0;
  };
  for (int v = 0; v < n_nodes; ++v) {
    const size_t vi = static_cast<size_t>(v);
    if (!is_vertex[vi] || on_boundary[vi]) continue;
    Eigen::Vector3d d;
    do {
      d = Eigen::Vector3d(uniform(), uniform(), uniform());
    } while (d.squaredNorm() > 1.0);  // uniform in the unit ball
    d *= fraction * spacing[vi];
    const Eigen::Vector3d origin = m.nodes[vi];
    for (int attempt = 0; attempt < 6; ++attempt, d *= 0.5) {
      m.nodes[vi] = origin + d;
      for (const auto& [mid, other] : midsides_of[vi]) {
        m.nodes[static_cast<size_t>(mid)] =
            0.5 * (m.nodes[vi] + m.nodes[static_cast<size_t>(other)]);
      }
      bool valid = true;
      for (int e : elements_of[vi]) valid = valid && min_jacobian(m, e) > 0.0;
      if (valid) break;
      if (attempt == 5) {  // give up on this vertex: put it back on its straight edges
        m.nodes[vi] = origin;
        for (const auto& [mid, other] : midsides_of[vi]) {
          m.nodes[static_cast<size_t>(mid)] =
              0.5 * (m.nodes[vi] + m.nodes[static_cast<size_t>(other)]);
        }
      }
    }
  }
}

}  // namespace sharpey::testing
