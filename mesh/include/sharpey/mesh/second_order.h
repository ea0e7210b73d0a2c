// Conversion between 4-node and 10-node tetrahedral meshes.
#pragma once

#include <Eigen/Core>
#include <functional>
#include <vector>

#include "sharpey/mesh/volume_mesh.h"

namespace sharpey::mesh {

// Places the midside node of an edge that lies on marked faces.
// markers: sorted unique markers of the faces containing the edge (never empty);
// a, b: the edge's end points, mm. Returns the midside position, mm (e.g. on the true curved
// surface the faces approximate).
using MidsideProjection = std::function<Eigen::Vector3d(
    const std::vector<int>& markers, const Eigen::Vector3d& a, const Eigen::Vector3d& b)>;

// Adds one node per edge of a linear mesh (4-node elements, 3-node faces) and returns the
// quadratic mesh (10-node elements, 6-node faces, VTK order). Each edge gets exactly one midside
// node shared by every element and face on it, so the mesh stays conforming. Vertex nodes keep
// their indices; midside nodes follow. An edge on at least one face gets project(markers, a, b)
// when `project` is given, the midpoint otherwise; every other edge gets the midpoint.
// Regions and markers are copied. A projection that moves a node too far can invert elements:
// check measure(mesh).min_jacobian_ratio > 0 afterwards.
// Throws MeshError unless `linear` has 4-node elements and 3-node faces with valid indices.
VolumeMesh make_second_order(const VolumeMesh& linear, const MidsideProjection& project = {});

// Drops the midside nodes of a quadratic mesh (keeps the vertices of elements and faces, in their
// original relative order) and returns the 4-node / 3-node mesh. A linear mesh is returned as is.
VolumeMesh make_first_order(const VolumeMesh& mesh);

}  // namespace sharpey::mesh
