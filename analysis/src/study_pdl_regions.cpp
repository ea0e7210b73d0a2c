#include <Eigen/Geometry>
#include <algorithm>
#include <cmath>
#include <string>

#include "sharpey/analysis/detail/pdl_regions.h"
#include "sharpey/error.h"
#include "sharpey/mesh/surface_distance.h"

namespace sharpey::analysis::detail {

std::vector<int> embedded_root_nodes(const mesh::ToothModel& model) {
  const mesh::VolumeMesh& m = model.mesh;
  std::vector<char> is_tooth(static_cast<size_t>(m.n_nodes()), 0);
  for (int e = 0; e < m.n_elements(); ++e) {
    if (m.element_region[static_cast<size_t>(e)] != mesh::kTooth) continue;
    for (int k = 0; k < m.nodes_per_element; ++k)
      is_tooth[static_cast<size_t>(m.element(e)[k])] = 1;
  }
  std::vector<int> nodes;
  for (int v = 0; v < m.n_nodes(); ++v) {
    if (!is_tooth[static_cast<size_t>(v)]) continue;
    const Eigen::Vector3d& x = m.nodes[static_cast<size_t>(v)];
    if (x.z() < mesh::attachment_level_z_mm(model.spec, std::atan2(x.y(), x.x())))
      nodes.push_back(v);
  }
  if (nodes.size() < 4) {
    throw SolverError("the tooth has " + std::to_string(nodes.size()) +
                      " mesh nodes below the alveolar crest, too few to fit the root's rigid "
                      "motion; use less bone loss or a finer mesh preset");
  }
  return nodes;
}

std::vector<char> free_edge_band(const mesh::ToothModel& model, const std::vector<int>& pdl_nodes) {
  const double width = model.spec.pdl.crest_width_mm;
  const std::vector<double> d = mesh::distance_to_faces(model.mesh, pdl_nodes, mesh::kPdlCrest);
  std::vector<char> band(pdl_nodes.size(), 0);
  for (size_t i = 0; i < band.size(); ++i) band[i] = d[i] < width ? 1 : 0;
  return band;
}

PdlElementTable::PdlElementTable(const mesh::VolumeMesh& m, const std::vector<int>& pdl_nodes)
    : nodes_per_element(m.nodes_per_element) {
  for (int e = 0; e < m.n_elements(); ++e) {
    if (m.element_region[static_cast<size_t>(e)] != mesh::kPdl) continue;
    const int* nodes = m.element(e);
    for (int k = 0; k < m.nodes_per_element; ++k) {
      const auto it = std::lower_bound(pdl_nodes.begin(), pdl_nodes.end(), nodes[k]);
      if (it == pdl_nodes.end() || *it != nodes[k]) {
        throw SolverError("PDL element " + std::to_string(e) + " has node " +
                          std::to_string(nodes[k]) + " outside the PDL node list");
      }
      local_nodes.push_back(static_cast<int>(it - pdl_nodes.begin()));
    }
    const Eigen::Vector3d& a = m.nodes[static_cast<size_t>(nodes[0])];
    const double v = std::abs((m.nodes[static_cast<size_t>(nodes[1])] - a)
                                  .cross(m.nodes[static_cast<size_t>(nodes[2])] - a)
                                  .dot(m.nodes[static_cast<size_t>(nodes[3])] - a)) /
                     6.0;
    volume_mm3.push_back(v);
    total_volume_mm3 += v;
  }
}

double PdlElementTable::volume_percent_above(const std::vector<double>& field, double limit,
                                             const std::vector<char>& band) const {
  if (!(total_volume_mm3 > 0)) return 0.0;
  double above = 0;
  for (int e = 0; e < n_elements(); ++e) {
    const int* local = local_nodes.data() + static_cast<size_t>(e) * nodes_per_element;
    bool all_corners_in_band = true;
    for (int k = 0; k < 4; ++k) all_corners_in_band &= band[static_cast<size_t>(local[k])] != 0;
    if (all_corners_in_band) continue;
    double mean = 0;
    for (int k = 0; k < nodes_per_element; ++k) mean += field[static_cast<size_t>(local[k])];
    mean /= nodes_per_element;
    if (mean > limit) above += volume_mm3[static_cast<size_t>(e)];
  }
  return 100.0 * above / total_volume_mm3;
}

}  // namespace sharpey::analysis::detail
