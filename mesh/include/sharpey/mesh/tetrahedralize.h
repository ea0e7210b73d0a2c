// Generic constrained Delaunay tetrahedralisation of a triangulated piecewise-linear complex.
// The only entry into TetGen; the tooth mesher and the verification tests both use it.
#pragma once

#include <Eigen/Core>
#include <array>
#include <atomic>
#include <string>
#include <vector>

#include "sharpey/mesh/volume_mesh.h"

namespace sharpey::mesh {

// A triangulated piecewise-linear complex: a closed, non-self-intersecting set of triangles
// (internal interfaces allowed) plus one seed point per region and optional hole points.
struct Plc {
  std::vector<Eigen::Vector3d> points;        // mm
  std::vector<std::array<int, 3>> triangles;  // facets (each one triangle), indices into points
  std::vector<int> triangle_marker;           // one per triangle, copied to the output faces
  struct RegionSeed {
    Eigen::Vector3d point;      // a point strictly inside the region
    int region = 0;             // copied to element_region; must be >= 1
    double max_volume_mm3 = 0;  // <= 0: no bound
  };
  std::vector<RegionSeed>
      regions;  // at least one; every meshed element must lie in a seeded region
  std::vector<Eigen::Vector3d> holes;  // points inside voids to leave unmeshed
};

struct TetgenOptions {
  double radius_edge_ratio =
      1.6;  // quality bound (TetGen -q), >= 1.0; <= 0 disables quality refinement
  double min_dihedral_deg = 10.0;  // quality bound (TetGen -q), 0 to 18 degrees
  double max_volume_mm3 = 0;       // global bound, <= 0: none
  bool preserve_surface = false;   // no Steiner points on the input triangles (TetGen -Y)
  bool second_order = true;        // 10-node output with straight-edge midside nodes; for curved
                                   // surfaces ask for 4 nodes and call make_second_order with a
                                   // projection (second_order.h)
  std::string stage = "tetrahedralising the PLC";  // names the step in error messages, e.g.
                                                   // "tetrahedralising the tooth/PDL/bone model"
  const std::atomic<bool>* cancel = nullptr;  // when set while TetGen runs: its process is killed
                                              // within 50 ms and tetrahedralize throws Cancelled
};

// Tetrahedralises `plc` with TetGen ("p", quality "q<ratio>/<angle>", region attributes "A",
// volume bounds "a", "Y" on request, always quiet "Q": it never prints).
//
// Output: nodes (mm), elements of 4 nodes (or 10 when options.second_order) in VTK order, each with
// positive volume; element_region = the seed's region id of the region holding the element;
// faces (3 or 6 nodes) = every input triangle as TetGen split it, on the boundary and on internal
// interfaces, with its triangle_marker. Each face is oriented so its right-hand normal points out
// of the adjacent element with the smaller region id (on the outer boundary: outward; on the
// tooth/PDL interface: from the tooth into the PDL). Nodes not used by any element are dropped.
//
// point_node (may be null) receives, per PLC point, its node index in the output (-1 if TetGen
// left it out of every element, e.g. a duplicate point), so callers can find their input points
// without matching coordinates.
//
// Throws InputError for malformed options, MeshError for a malformed PLC (index out of range,
// degenerate triangle, marker count, missing or invalid seeds) and when TetGen fails (the message
// names the stage, TetGen's reason, e.g. self-intersecting facets, and the input size), and when an
// element lies in no seeded region. TetGen runs in the separate mesher executable sharpey-mesher
// (child_process.h), so a crash or failed assertion inside TetGen also ends in a MeshError rather
// than ending the program; a mesher that cannot be started is a MeshError too (there is no
// in-process fallback). Throws Cancelled when options.cancel is set while TetGen runs.
VolumeMesh tetrahedralize(const Plc& plc, const TetgenOptions& options,
                          std::vector<int>* point_node = nullptr);

}  // namespace sharpey::mesh
