// Triangulation of a planar domain bounded by closed loops (the first the outer boundary, the
// others holes), keeping every boundary edge as given: used for the furcation roof and the bone
// block's top and base around a multi-rooted tooth. Implemented with CGAL's constrained Delaunay
// triangulation (mesh/src/cgal/planar_triangulation.cpp, the mesh_cgal object library).
#pragma once

#include <Eigen/Core>
#include <array>
#include <vector>

namespace sharpey::mesh::detail {

// loops: closed polygons, no repeated end point, not crossing one another. Interior points are
// added on a square grid of spacing `spacing_mm`, kept at least 0.6 spacing away from every
// boundary point. Output: *points = the loops' points in order (loop 0 first), then the interior
// points; triangles counter-clockwise (normal +z), inside the outer loop and outside the holes.
// Throws MeshError when a boundary edge is lost (crossing loops).
std::vector<std::array<int, 3>> triangulate_planar(
    const std::vector<std::vector<Eigen::Vector2d>>& loops, double spacing_mm,
    std::vector<Eigen::Vector2d>* points);

}  // namespace sharpey::mesh::detail
