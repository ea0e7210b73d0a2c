#include "core/display_mesh.h"

#include <Eigen/Geometry>
#include <algorithm>
#include <cmath>
#include <cstdint>
#include <unordered_map>

#include "sharpey/core/reference_tetrahedron.h"

namespace sharpey::app {

namespace {

bool in_group(int region, const std::vector<int>& regions) {
  return std::find(regions.begin(), regions.end(), region) != regions.end();
}

// Local index of the midside node on the edge between local vertices a and b.
int midside(int a, int b) {
  for (int e = 0; e < 6; ++e) {
    const auto& edge = core::kTetEdges[static_cast<size_t>(e)];
    if ((edge[0] == a && edge[1] == b) || (edge[0] == b && edge[1] == a)) return 4 + e;
  }
  return -1;
}

struct FaceRecord {
  std::array<int, 3> key;  // sorted corner node ids
  int element;
  int face;
};

// Compact numbering of the global nodes a surface uses.
class NodeCompactor {
 public:
  explicit NodeCompactor(DisplaySurface* s) : surface_(s) {}
  int operator()(int global) {
    const auto [it, inserted] = index_.emplace(global, static_cast<int>(surface_->nodes.size()));
    if (inserted) surface_->nodes.push_back(global);
    return it->second;
  }

 private:
  DisplaySurface* surface_;
  std::unordered_map<int, int> index_;
};

}  // namespace

DisplaySurface region_boundary(const mesh::VolumeMesh& mesh, const std::vector<int>& regions) {
  return visible_boundary(mesh, regions, {});
}

DisplaySurface visible_boundary(const mesh::VolumeMesh& mesh, const std::vector<int>& regions,
                                const std::vector<int>& covering) {
  std::vector<FaceRecord> faces;
  for (int e = 0; e < mesh.n_elements(); ++e) {
    const int region = mesh.element_region[static_cast<size_t>(e)];
    const bool mine = in_group(region, regions);
    if (!mine && !in_group(region, covering)) continue;
    const int* n = mesh.element(e);
    for (int f = 0; f < 4; ++f) {
      const auto& tri = core::kTetFaces[static_cast<size_t>(f)];
      std::array<int, 3> key = {n[tri[0]], n[tri[1]], n[tri[2]]};
      std::sort(key.begin(), key.end());
      // face < 0 marks a face of a covering element.
      faces.push_back({key, e, mine ? f : -1});
    }
  }
  std::sort(faces.begin(), faces.end(),
            [](const FaceRecord& a, const FaceRecord& b) { return a.key < b.key; });

  DisplaySurface surface;
  NodeCompactor compact(&surface);
  const bool split = mesh.nodes_per_element == 10;
  for (size_t i = 0; i < faces.size();) {
    size_t j = i + 1;
    while (j < faces.size() && faces[j].key == faces[i].key) ++j;
    // On the boundary of the group and not hidden: exactly one face there, the group's own.
    if (j - i == 1 && faces[i].face >= 0) {
      const int* n = mesh.element(faces[i].element);
      const auto& tri = core::kTetFaces[static_cast<size_t>(faces[i].face)];
      const int a = compact(n[tri[0]]), b = compact(n[tri[1]]), c = compact(n[tri[2]]);
      if (split) {
        const int ab = compact(n[midside(tri[0], tri[1])]);
        const int bc = compact(n[midside(tri[1], tri[2])]);
        const int ca = compact(n[midside(tri[2], tri[0])]);
        surface.triangles.push_back({a, ab, ca});
        surface.triangles.push_back({ab, b, bc});
        surface.triangles.push_back({ca, bc, c});
        surface.triangles.push_back({ab, bc, ca});
      } else {
        surface.triangles.push_back({a, b, c});
      }
    }
    i = j;
  }
  return surface;
}

DisplaySection plane_section(const mesh::VolumeMesh& mesh, const std::vector<int>& regions,
                             const Eigen::Vector3d& origin, const Eigen::Vector3d& normal) {
  DisplaySection section;
  const Eigen::Vector3d n = normal.normalized();
  std::unordered_map<std::uint64_t, int> point_of_edge;
  auto distance = [&](int node) { return n.dot(mesh.nodes[static_cast<size_t>(node)] - origin); };
  // Point where the plane crosses the edge between nodes a and b (signed distances da, db).
  auto edge_point = [&](int a, int b, double da, double db) {
    if (a > b) {
      std::swap(a, b);
      std::swap(da, db);
    }
    const std::uint64_t key = (static_cast<std::uint64_t>(a) << 32) | static_cast<std::uint32_t>(b);
    const auto found = point_of_edge.find(key);
    if (found != point_of_edge.end()) return found->second;
    const int index = static_cast<int>(section.points.size());
    section.points.push_back({a, b, da / (da - db)});
    point_of_edge.emplace(key, index);
    return index;
  };
  auto cut_tet = [&](const std::array<int, 4>& v) {
    double d[4];
    int above[4], below[4], n_above = 0, n_below = 0;
    for (int i = 0; i < 4; ++i) {
      d[i] = distance(v[static_cast<size_t>(i)]);
      if (d[i] >= 0)
        above[n_above++] = i;
      else
        below[n_below++] = i;
    }
    if (n_above == 0 || n_below == 0) return;
    auto p = [&](int i, int j) {
      return edge_point(v[static_cast<size_t>(i)], v[static_cast<size_t>(j)], d[i], d[j]);
    };
    if (n_above == 1 || n_below == 1) {
      const int lone = n_above == 1 ? above[0] : below[0];
      const int* others = n_above == 1 ? below : above;
      section.triangles.push_back({p(lone, others[0]), p(lone, others[1]), p(lone, others[2])});
    } else {  // two and two: a quadrilateral in cyclic order
      const int a0 = above[0], a1 = above[1], b0 = below[0], b1 = below[1];
      const int q0 = p(a0, b0), q1 = p(a0, b1), q2 = p(a1, b1), q3 = p(a1, b0);
      section.triangles.push_back({q0, q1, q2});
      section.triangles.push_back({q0, q2, q3});
    }
  };
  // The eight linear sub-tetrahedra of a 10-node tetrahedron: four at the corners and four
  // around the diagonal between the midside nodes of edges (0,1) and (2,3).
  static constexpr int kSubTets[8][4] = {{0, 4, 6, 7}, {4, 1, 5, 8}, {6, 5, 2, 9}, {7, 8, 9, 3},
                                         {4, 9, 6, 7}, {4, 9, 7, 8}, {4, 9, 8, 5}, {4, 9, 5, 6}};
  for (int e = 0; e < mesh.n_elements(); ++e) {
    if (!in_group(mesh.element_region[static_cast<size_t>(e)], regions)) continue;
    const int* nodes = mesh.element(e);
    double lo = INFINITY, hi = -INFINITY;
    for (int i = 0; i < mesh.nodes_per_element; ++i) {
      const double d = distance(nodes[i]);
      lo = std::min(lo, d);
      hi = std::max(hi, d);
    }
    if (lo >= 0 || hi < 0) continue;
    if (mesh.nodes_per_element == 10) {
      for (const auto& s : kSubTets) cut_tet({nodes[s[0]], nodes[s[1]], nodes[s[2]], nodes[s[3]]});
    } else {
      cut_tet({nodes[0], nodes[1], nodes[2], nodes[3]});
    }
  }
  return section;
}

std::vector<Segment3> triangle_iso_lines(const std::vector<Eigen::Vector3d>& points,
                                         const std::vector<std::array<int, 3>>& triangles,
                                         const std::vector<double>& values, double level) {
  std::vector<Segment3> out;
  for (const auto& tri : triangles) {
    double v[3];
    bool finite = true;
    for (int k = 0; k < 3; ++k) {
      v[k] = values[static_cast<size_t>(tri[static_cast<size_t>(k)])];
      finite = finite && std::isfinite(v[k]);
    }
    if (!finite) continue;
    Eigen::Vector3d crossing[3];
    int n = 0;
    for (int k = 0; k < 3; ++k) {
      const int l = (k + 1) % 3;
      const bool hk = v[k] >= level, hl = v[l] >= level;
      if (hk == hl) continue;
      const double t = (level - v[k]) / (v[l] - v[k]);
      const Eigen::Vector3d& pk = points[static_cast<size_t>(tri[static_cast<size_t>(k)])];
      const Eigen::Vector3d& pl = points[static_cast<size_t>(tri[static_cast<size_t>(l)])];
      crossing[n++] = pk + t * (pl - pk);
    }
    if (n == 2) out.emplace_back(crossing[0], crossing[1]);
  }
  return out;
}

double total_area(const std::vector<Eigen::Vector3d>& points,
                  const std::vector<std::array<int, 3>>& triangles) {
  double area = 0;
  for (const auto& t : triangles) {
    const Eigen::Vector3d& a = points[static_cast<size_t>(t[0])];
    area +=
        0.5 *
        (points[static_cast<size_t>(t[1])] - a).cross(points[static_cast<size_t>(t[2])] - a).norm();
  }
  return area;
}

}  // namespace sharpey::app
