// Simple closed triangulated surfaces for the mesh-infrastructure tests (header-only so that it
// adds nothing to the other mesh test executables). All shapes are invented test geometry.
#pragma once

#include <Eigen/Core>
#include <Eigen/Geometry>
#include <array>
#include <cmath>
#include <map>
#include <utility>
#include <vector>

#include "sharpey/mesh/tetrahedralize.h"

namespace sharpey::mesh::test {

// Appends the surface of the box [lo, hi] to `plc`: 8 points, 12 triangles. Side markers are
// `marker_base` + 0..5 for the sides x = lo, x = hi, y = lo, y = hi, z = lo, z = hi, unless
// `single_marker` >= 0, which marks all sides alike.
inline void add_box(Plc& plc, const Eigen::Vector3d& lo, const Eigen::Vector3d& hi, int marker_base,
                    int single_marker = -1) {
  const int base = static_cast<int>(plc.points.size());
  for (int k = 0; k < 8; ++k) {
    plc.points.emplace_back((k & 1) ? hi.x() : lo.x(), (k & 2) ? hi.y() : lo.y(),
                            (k & 4) ? hi.z() : lo.z());
  }
  // Each side as a quad of corner indices (bit 0 = x, bit 1 = y, bit 2 = z).
  const int quads[6][4] = {{0, 2, 6, 4}, {1, 5, 7, 3}, {0, 4, 5, 1},
                           {2, 3, 7, 6}, {0, 1, 3, 2}, {4, 6, 7, 5}};
  for (int s = 0; s < 6; ++s) {
    const int* q = quads[s];
    const int marker = single_marker >= 0 ? single_marker : marker_base + s;
    plc.triangles.push_back({base + q[0], base + q[1], base + q[2]});
    plc.triangles.push_back({base + q[0], base + q[2], base + q[3]});
    plc.triangle_marker.push_back(marker);
    plc.triangle_marker.push_back(marker);
  }
}

// Geodesic sphere: the icosahedron subdivided `levels` times, vertices on the sphere.
struct TriSurface {
  std::vector<Eigen::Vector3d> points;
  std::vector<std::array<int, 3>> triangles;
};

inline TriSurface icosphere(const Eigen::Vector3d& center, double radius, int levels) {
  const double t = (1.0 + std::sqrt(5.0)) / 2.0;
  std::vector<Eigen::Vector3d> unit = {{-1, t, 0}, {1, t, 0}, {-1, -t, 0}, {1, -t, 0},
                                       {0, -1, t}, {0, 1, t}, {0, -1, -t}, {0, 1, -t},
                                       {t, 0, -1}, {t, 0, 1}, {-t, 0, -1}, {-t, 0, 1}};
  for (auto& p : unit) p.normalize();
  std::vector<std::array<int, 3>> tris = {
      {0, 11, 5},  {0, 5, 1},  {0, 1, 7},  {0, 7, 10}, {0, 10, 11}, {1, 5, 9}, {5, 11, 4},
      {11, 10, 2}, {10, 7, 6}, {7, 1, 8},  {3, 9, 4},  {3, 4, 2},   {3, 2, 6}, {3, 6, 8},
      {3, 8, 9},   {4, 9, 5},  {2, 4, 11}, {6, 2, 10}, {8, 6, 7},   {9, 8, 1}};
  for (int l = 0; l < levels; ++l) {
    std::map<std::pair<int, int>, int> mid;
    auto midpoint = [&](int a, int b) {
      const auto key = std::make_pair(std::min(a, b), std::max(a, b));
      const auto it = mid.find(key);
      if (it != mid.end()) return it->second;
      unit.push_back((unit[static_cast<size_t>(a)] + unit[static_cast<size_t>(b)]).normalized());
      const int id = static_cast<int>(unit.size()) - 1;
      mid.emplace(key, id);
      return id;
    };
    std::vector<std::array<int, 3>> next;
    for (const auto& f : tris) {
      const int a = midpoint(f[0], f[1]), b = midpoint(f[1], f[2]), c = midpoint(f[2], f[0]);
      next.push_back({f[0], a, c});
      next.push_back({f[1], b, a});
      next.push_back({f[2], c, b});
      next.push_back({a, b, c});
    }
    tris = std::move(next);
  }
  TriSurface s;
  for (const auto& p : unit) s.points.push_back(center + radius * p);
  s.triangles = std::move(tris);
  return s;
}

inline void add_surface(Plc& plc, const TriSurface& s, int marker) {
  const int base = static_cast<int>(plc.points.size());
  plc.points.insert(plc.points.end(), s.points.begin(), s.points.end());
  for (const auto& f : s.triangles) {
    plc.triangles.push_back({base + f[0], base + f[1], base + f[2]});
    plc.triangle_marker.push_back(marker);
  }
}

// Signed volume of the 4-node tetrahedron given by the first four node indices of `t`.
inline double tet_volume(const std::vector<Eigen::Vector3d>& x, const int* t) {
  return (x[static_cast<size_t>(t[1])] - x[static_cast<size_t>(t[0])])
             .dot((x[static_cast<size_t>(t[2])] - x[static_cast<size_t>(t[0])])
                      .cross(x[static_cast<size_t>(t[3])] - x[static_cast<size_t>(t[0])])) /
         6.0;
}

}  // namespace sharpey::mesh::test
