// Display geometry derived from a mesh::VolumeMesh: the boundary surface of a group of regions,
// a plane section through it, and iso-lines on triangles. Plain geometry (no VTK, no Qt) so that
// the 3D view only hands finished triangles to VTK and tests can check them without a display.
#pragma once

#include <Eigen/Core>
#include <array>
#include <utility>
#include <vector>

#include "sharpey/mesh/volume_mesh.h"

namespace sharpey::app {

// Boundary of the union of the elements whose region is in `regions`: faces not shared by two
// such elements. Quadratic faces are split into four flat triangles through their midside nodes.
// Triangles are oriented with the outward normal by the right-hand rule.
struct DisplaySurface {
  std::vector<int> nodes;                     // global node id of each surface point
  std::vector<std::array<int, 3>> triangles;  // indices into `nodes`
};
DisplaySurface region_boundary(const mesh::VolumeMesh& mesh, const std::vector<int>& regions);

// The part of the boundary of `regions` that can be seen from outside the model: the faces of
// region_boundary(mesh, regions) that are not also faces of an element of `covering` (an opaque
// neighbour hides them: the root under the PDL, the PDL's root side, the bone's socket wall).
DisplaySurface visible_boundary(const mesh::VolumeMesh& mesh, const std::vector<int>& regions,
                                const std::vector<int>& covering);

// A point on a mesh edge: position (and any nodal value) = (1 - t) * at(a) + t * at(b).
struct EdgePoint {
  int a = 0, b = 0;  // global node ids
  double t = 0;
};

// Section of the elements of `regions` by the plane through `origin` with normal `normal`.
// Quadratic elements are cut as their eight linear sub-tetrahedra (through the midside nodes).
struct DisplaySection {
  std::vector<EdgePoint> points;
  std::vector<std::array<int, 3>> triangles;  // indices into `points`
};
DisplaySection plane_section(const mesh::VolumeMesh& mesh, const std::vector<int>& regions,
                             const Eigen::Vector3d& origin, const Eigen::Vector3d& normal);

// Interpolates per-node data (indexed by global node id) at section points.
template <typename T>
T interpolate(const EdgePoint& p, const T& at_a, const T& at_b) {
  return (1.0 - p.t) * at_a + p.t * at_b;
}

// Iso-line segments of `values` (one per point) at `level` on flat triangles. Triangles with a
// non-finite value are skipped.
using Segment3 = std::pair<Eigen::Vector3d, Eigen::Vector3d>;
std::vector<Segment3> triangle_iso_lines(const std::vector<Eigen::Vector3d>& points,
                                         const std::vector<std::array<int, 3>>& triangles,
                                         const std::vector<double>& values, double level);

// Total area of triangles, mm^2 (for tests and statistics).
double total_area(const std::vector<Eigen::Vector3d>& points,
                  const std::vector<std::array<int, 3>>& triangles);

}  // namespace sharpey::app
