// Measured quantities of a mesh: volumes, areas, PDL width, element quality.
#pragma once

#include <Eigen/Core>
#include <map>
#include <vector>

#include "sharpey/mesh/volume_mesh.h"

namespace sharpey::mesh {

struct MeshStatistics {
  int n_nodes = 0, n_elements = 0, n_faces = 0;
  std::map<int, int> elements_per_region;
  std::map<int, double> volume_per_region_mm3;  // quadrature over the (curved) elements
  double total_volume_mm3 = 0;
  std::map<int, double> area_per_marker_mm2;  // e.g. kRootSurface = attachment area
  double min_dihedral_deg = 0,
         max_dihedral_deg = 0;  // over the straight tetrahedra of the vertices
  double max_radius_edge_ratio =
      0;                          // circumradius / shortest edge, on the vertices (regular: 0.612)
  double min_jacobian_ratio = 0;  // min over elements of min det J / max |det J| at nodes + qp
  int n_inverted_elements = 0;    // elements with det J <= 0 somewhere (min_jacobian_ratio <= 0)
  std::vector<int> inverted_elements;  // their indices, ascending
  int worst_jacobian_element = -1;     // the element with min_jacobian_ratio
  // Width of the PDL: distance from the root surface (kRootSurface faces) to the socket surface
  // (kSocketSurface faces), sampled at every node of the root-surface faces; mean is over samples.
  double pdl_width_mean_mm = 0, pdl_width_min_mm = 0, pdl_width_max_mm = 0;
  int pdl_width_samples = 0;
};

// Measures `mesh` (4- or 10-node elements, 3- or 6-node faces). Volumes and areas integrate the
// curved (isoparametric) geometry: volume with the degree-5 tetrahedral rule (exact for straight
// elements), area with the degree-5 triangle rule. The Jacobian ratio is checked at the nodes and
// the quadrature points of every element; 1 for straight-sided elements, <= 0 for inverted ones.
// Throws MeshError when the connectivity is malformed (array sizes, node indices).
MeshStatistics measure(const VolumeMesh& mesh);

// One PDL width sample: a node on the root surface, its nearest point on the socket surface and
// their distance.
struct PdlWidthSample {
  int node = -1;                                         // root-surface node index in the mesh
  Eigen::Vector3d root_point = Eigen::Vector3d::Zero();  // mm, the node's position
  Eigen::Vector3d socket_point =
      Eigen::Vector3d::Zero();  // mm, nearest point on the socket surface
  double width_mm = 0;          // |socket_point - root_point|
};

// Samples the distance from every node of the faces marked `root_marker` to the nearest point of
// the faces marked `socket_marker` (6-node faces: the curved quadratic surface, found on its four
// flat sub-triangles and refined by Newton steps on the patch; 3-node faces: the flat triangles).
// Uses a bounding-volume hierarchy (boxes plus normal slabs): about 0.1 s of processor time for
// 8e4 flat socket faces and 4e4 samples, 0.6 s for 8e4 curved faces and 1.6e5 samples
// (tests/bench/bench_mesh_statistics.cpp). Returns samples in ascending node order; empty when
// either surface has no faces.
std::vector<PdlWidthSample> pdl_width_samples(const VolumeMesh& mesh,
                                              int root_marker = kRootSurface,
                                              int socket_marker = kSocketSurface);

}  // namespace sharpey::mesh
