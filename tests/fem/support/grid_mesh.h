// Structured tetrahedral test meshes for the fem tests and benchmarks.
//
// grid_mesh() builds an nx x ny x nz grid of cells on the unit cube [0,1]^3 ("unit coordinates"
// xi, eta, zeta), splits every cell into the six Kuhn (Freudenthal) tetrahedra along its main
// diagonal, which makes the split conforming across neighbouring cells, and places every node,
// midside nodes included, at map(unit position). A curved map therefore puts the boundary nodes of
// 10-node elements exactly on the curved surface it describes.
#pragma once

#include <Eigen/Core>
#include <functional>

#include "sharpey/mesh/volume_mesh.h"

namespace sharpey::testing {

// Side markers of grid_mesh() boundary faces.
enum GridSide : int {
  kXiMin = 1,    // xi = 0
  kXiMax = 2,    // xi = 1
  kEtaMin = 3,   // eta = 0
  kEtaMax = 4,   // eta = 1
  kZetaMin = 5,  // zeta = 0
  kZetaMax = 6,  // zeta = 1
};

using PointMap = std::function<Eigen::Vector3d(const Eigen::Vector3d&)>;
using RegionOf = std::function<int(const Eigen::Vector3d&)>;

// nx, ny, nz >= 1 cells per direction; nodes_per_element 4 or 10 (VTK order, see
// sharpey/core/reference_tetrahedron.h). `map` sends unit coordinates to physical ones (mm);
// empty = identity. Every element is oriented to positive volume (judged from its mapped vertices),
// so a map that reverses orientation is fine. Boundary faces (3 or 6 nodes) on the six sides carry
// GridSide markers with outward right-hand normals. element_region = region_of(cell centre in unit
// coordinates), or 1 if region_of is empty. Nodes are numbered lexicographically (xi fastest) on
// the grid of vertices (4-node) or of vertices and half-spacing points (10-node). Throws InputError
// for bad counts.
mesh::VolumeMesh grid_mesh(int nx, int ny, int nz, int nodes_per_element, const PointMap& map = {},
                           const RegionOf& region_of = {});

// Moves every vertex that is not on the boundary of the mesh (boundary: faces used by a single
// element) by a random vector of length up to `fraction` times the shortest edge at that vertex,
// deterministic for a given seed. Midside nodes of edges with a moved vertex are re-centred on the
// straight edge. A move that would make an incident element's Jacobian non-positive is halved until
// it does not (up to a few times, then skipped), so the mesh stays valid. fraction in [0, 0.5).
void jitter_nodes(mesh::VolumeMesh& mesh, double fraction, unsigned seed);

}  // namespace sharpey::testing
