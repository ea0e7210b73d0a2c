// .vtu fields of a solved scenario: the full model with its displacement, and the PDL with the
// pressure, strain and displacement fields (through mesh::write_vtu, which writes atomically).
#include <string>
#include <unordered_map>

#include "sharpey/mesh/vtu_writer.h"
#include "sharpey/output/report_output.h"

namespace sharpey::analysis {

void write_scenario_vtu(const ScenarioSolution& solution, const ScenarioResult& result,
                        const std::string& model_path, const std::string& pdl_path) {
  const mesh::VolumeMesh& full = solution.model().mesh;
  const Eigen::Matrix3Xd& u = result.displacement_mm;
  const bool has_displacement = u.cols() == full.n_nodes();

  mesh::VtuArrays model_arrays;
  if (has_displacement) {
    mesh::VtuArrays::PointArray d{"displacement_mm", 3, {}};
    d.values.assign(u.data(), u.data() + u.size());
    model_arrays.point_arrays.push_back(std::move(d));
  }
  mesh::write_vtu(model_path, full, model_arrays);

  std::vector<int> node_map;
  const mesh::VolumeMesh pdl = mesh::extract_region(full, mesh::kPdl, &node_map);
  std::unordered_map<int, size_t> entry_of;  // global node -> index in the PDL fields
  const std::vector<int>& pdl_nodes = solution.pdl_nodes();
  for (size_t i = 0; i < pdl_nodes.size(); ++i) entry_of[pdl_nodes[i]] = i;

  auto field = [&](const char* name, const std::vector<double>& values) {
    mesh::VtuArrays::PointArray a{name, 1, {}};
    a.values.reserve(node_map.size());
    for (int global : node_map) {
      const auto it = entry_of.find(global);
      a.values.push_back(it != entry_of.end() && it->second < values.size() ? values[it->second]
                                                                            : 0.0);
    }
    return a;
  };
  mesh::VtuArrays pdl_arrays;
  pdl_arrays.point_arrays.push_back(field("hydrostatic_pressure_kpa", result.pressure_kpa));
  pdl_arrays.point_arrays.push_back(
      field("max_principal_strain", result.max_principal_strain_field));
  pdl_arrays.point_arrays.push_back(field("equivalent_strain", result.equivalent_strain_field));
  pdl_arrays.point_arrays.push_back(field("von_mises_kpa", result.von_mises_kpa));
  {
    // 1 where the node lies in the band next to the PDL's free edge that the reported maxima
    // leave out (analysis::pdl_crest_edge_band).
    const std::vector<char> band = pdl_crest_edge_band(solution);
    pdl_arrays.point_arrays.push_back(
        field("crest_edge_band", std::vector<double>(band.begin(), band.end())));
  }
  if (has_displacement) {
    mesh::VtuArrays::PointArray d{"displacement_mm", 3, {}};
    d.values.reserve(3 * node_map.size());
    for (int global : node_map)
      for (int c = 0; c < 3; ++c) d.values.push_back(u(c, global));
    pdl_arrays.point_arrays.push_back(std::move(d));
  }
  mesh::write_vtu(pdl_path, pdl, pdl_arrays);
}

}  // namespace sharpey::analysis
