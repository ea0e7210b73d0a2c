// Node adjacency of a mesh (nodes sharing an element), the basis of the stiffness sparsity pattern.
#pragma once

#include <vector>

#include "sharpey/mesh/volume_mesh.h"

namespace sharpey::fem::detail {

// CSR lists: the elements of each node, and each node's neighbours (itself included), ascending.
struct NodeGraph {
  std::vector<long long> element_ptr;  // n + 1
  std::vector<int> node_elements;      // element ids per node, ascending
  std::vector<long long> ptr;          // n + 1
  std::vector<int> adjacent;           // neighbour node ids per node, ascending
  int degree(int i) const { return static_cast<int>(ptr[i + 1] - ptr[i]); }
};

// Built on all cores. Nodes of no element have an empty list (not even themselves).
NodeGraph build_node_graph(const mesh::VolumeMesh& m);

}  // namespace sharpey::fem::detail
