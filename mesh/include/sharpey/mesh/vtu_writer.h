// VTK XML unstructured-grid (.vtu) output of plain mesh data, written without linking VTK.
//
// Format: VTK XML UnstructuredGrid version 1.0, data in one appended block in raw binary (host byte
// order, declared in the header; UInt64 block sizes), readable by VTK 9 and ParaView. Points
// Float64, connectivity/offsets Int64, types UInt8, `region` / `marker` Int32, extra arrays
// Float64.
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

// Writes the elements (QUADRATIC_TETRA = 24 or TETRA = 10 cells, VTK node order as in VolumeMesh)
// with the cell array `region` and any extra arrays: point arrays have one tuple per mesh node,
// cell arrays one value per element. The file is written to a temporary name in the same folder
// and renamed, so it is never left half-written.
// Throws InputError (key = the array name) when an extra array has the wrong size or a bad name,
// MeshError for malformed connectivity, and Error naming the path when the file cannot be written.
void write_vtu(const std::string& path, const VolumeMesh& mesh, const VtuArrays& extra = {});

// Writes the boundary/interface triangles (QUADRATIC_TRIANGLE = 22 or TRIANGLE = 5 cells) with
// the cell array `marker`. Only the nodes used by faces are written (renumbered in ascending
// order); extra point arrays are given per mesh node (n_nodes tuples) and are reduced the same way;
// extra cell arrays have one value per face. Atomic and throwing as write_vtu.
void write_boundary_vtu(const std::string& path, const VolumeMesh& mesh,
                        const VtuArrays& extra = {});

// Extracts the sub-mesh of one region (elements, their nodes renumbered in ascending order of the
// old index, faces kept whose nodes are all in it); `node_map` (may be null) receives, per new
// node, its index in the full mesh. A region with no elements gives an empty mesh.
VolumeMesh extract_region(const VolumeMesh& mesh, int region, std::vector<int>* node_map);

}  // namespace sharpey::mesh
