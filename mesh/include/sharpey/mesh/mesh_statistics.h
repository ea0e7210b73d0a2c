// Measured quantities of a mesh: volumes, areas, PDL width, element quality.
#pragma once

#include <map>

#include "sharpey/mesh/volume_mesh.h"

namespace sharpey::mesh {

struct MeshStatistics {
  int n_nodes = 0, n_elements = 0, n_faces = 0;
  std::map<int, int> elements_per_region;
  std::map<int, double> volume_per_region_mm3;   // quadrature over the (curved) elements
  double total_volume_mm3 = 0;
  std::map<int, double> area_per_marker_mm2;     // e.g. kRootSurface = attachment area
  double min_dihedral_deg = 0, max_dihedral_deg = 0;
  double max_radius_edge_ratio = 0;
  double min_jacobian_ratio = 0;  // min over elements of min/max Jacobian determinant at nodes+qp
  double pdl_width_mean_mm = 0, pdl_width_min_mm = 0, pdl_width_max_mm = 0;
  int pdl_width_samples = 0;
};

MeshStatistics measure(const VolumeMesh& mesh);

}  // namespace sharpey::mesh
