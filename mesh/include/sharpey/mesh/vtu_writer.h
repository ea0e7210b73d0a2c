// VTK XML unstructured-grid (.vtu) output of plain mesh data, written without linking VTK.
#pragma once

#include <Eigen/Core>
#include <string>
#include <vector>

#include "sharpey/mesh/volume_mesh.h"

namespace sharpey::mesh {

struct VtuArrays {
  struct PointArray {
    std::string name;
    int n_components = 1;
    std::vector<double> values;  // n_points * n_components
  };
  struct CellArray {
    std::string name;
    std::vector<double> values;  // one per cell
  };
  std::vector<PointArray> point_arrays;
  std::vector<CellArray> cell_arrays;
};

// Writes the elements (quadratic or linear tetra cells) with the cell array `region` and any
// extra arrays. The file is written to a temporary name and renamed, so it is never left
// half-written. Throws Error on I/O failure.
void write_vtu(const std::string& path, const VolumeMesh& mesh, const VtuArrays& extra = {});

// Writes the boundary/interface triangles (quadratic or linear triangle cells) with the cell
// array `marker`.
void write_boundary_vtu(const std::string& path, const VolumeMesh& mesh);

// Extracts the sub-mesh of one region (elements, their nodes renumbered, faces kept whose nodes
// are all in it); `node_map` receives, per new node, its index in the full mesh.
VolumeMesh extract_region(const VolumeMesh& mesh, int region, std::vector<int>* node_map);

}  // namespace sharpey::mesh
