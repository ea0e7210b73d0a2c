// Generic constrained Delaunay tetrahedralisation of a triangulated piecewise-linear complex.
// The only entry into TetGen; the tooth mesher and the verification tests both use it.
#pragma once

#include <Eigen/Core>
#include <array>
#include <vector>

#include "sharpey/mesh/volume_mesh.h"

namespace sharpey::mesh {

struct Plc {
  std::vector<Eigen::Vector3d> points;           // mm
  std::vector<std::array<int, 3>> triangles;     // facets (each one triangle)
  std::vector<int> triangle_marker;              // copied to the output faces
  struct RegionSeed {
    Eigen::Vector3d point;      // a point strictly inside the region
    int region = 0;             // copied to element_region
    double max_volume_mm3 = 0;  // <= 0: no bound
  };
  std::vector<RegionSeed> regions;
  std::vector<Eigen::Vector3d> holes;  // points inside voids to leave unmeshed
};

struct TetgenOptions {
  double radius_edge_ratio = 1.6;  // quality bound (TetGen -q)
  double min_dihedral_deg = 10.0;  // quality bound (TetGen -q)
  double max_volume_mm3 = 0;       // global bound, <= 0: none
  bool preserve_surface = false;   // no Steiner points on the input triangles (TetGen -Y)
  bool second_order = true;        // 10-node output
};

// Throws MeshError naming the stage when TetGen fails or the PLC self-intersects.
// Output faces: every input-facet triangle (split as TetGen split it) with its marker.
VolumeMesh tetrahedralize(const Plc& plc, const TetgenOptions& options);

}  // namespace sharpey::mesh
