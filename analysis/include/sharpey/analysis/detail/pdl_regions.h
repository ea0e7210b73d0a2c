// Parts of a solved model that the evaluation selects nodes or elements from: the embedded root
// (for the rigid fit), the band next to the ligament's free edge (left out of the peaks) and the
// PDL elements with their volumes (for volume shares).
//
// Internal to the analysis library (used by study*.cpp and by the tests); not a stable interface.
#pragma once

#include <vector>

#include "sharpey/mesh/tooth_model.h"

namespace sharpey::analysis::detail {

// Tooth nodes strictly below the attachment level at their angle around the long axis
// (mesh::attachment_level_z_mm), ascending. Throws SolverError when fewer than four remain (no
// embedded root to fit a rigid motion to).
std::vector<int> embedded_root_nodes(const mesh::ToothModel& model);

// 1 for each of `pdl_nodes` whose 3D distance to the nearest free PDL face (mesh::kPdlCrest) is
// less than the crest width of the ligament (model.spec.pdl.crest_width_mm), else 0.
std::vector<char> free_edge_band(const mesh::ToothModel& model, const std::vector<int>& pdl_nodes);

// The PDL elements: for each, its nodes as positions in the PDL node list and its volume.
struct PdlElementTable {
  // pdl_nodes: ascending global ids of the PDL region's nodes (ScenarioSolution::pdl_nodes()).
  PdlElementTable(const mesh::VolumeMesh& mesh, const std::vector<int>& pdl_nodes);

  int nodes_per_element = 0;
  std::vector<int> local_nodes;    // n_elements * nodes_per_element positions in pdl_nodes
  std::vector<double> volume_mm3;  // of the straight tetrahedron through the corner nodes
  double total_volume_mm3 = 0;

  int n_elements() const { return static_cast<int>(volume_mm3.size()); }
  // Percentage of the total PDL volume held by the elements whose mean nodal value of `field`
  // (one value per PDL node) exceeds `limit`, leaving out the elements all of whose corner nodes
  // lie in `band` (same order as the PDL nodes).
  double volume_percent_above(const std::vector<double>& field, double limit,
                              const std::vector<char>& band) const;
};

}  // namespace sharpey::analysis::detail
