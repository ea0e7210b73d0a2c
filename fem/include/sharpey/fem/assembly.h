// Global stiffness assembly and displacement constraints.
#pragma once

#include <Eigen/SparseCore>
#include <string>
#include <vector>

#include "sharpey/fem/material.h"
#include "sharpey/mesh/volume_mesh.h"

namespace sharpey::fem {

// How element blocks are added into the shared value array when several threads assemble.
enum class AssemblyStrategy {
  kPartitioned,  // elements split into one spatial slab per thread; each thread adds the elements
                 // whose nodes all belong to its slab, then the slab-interface elements are added
                 // serially (one barrier; robust when the machine is busy)
  kSerial,       // one thread
};

struct AssemblyOptions {
  AssemblyStrategy strategy = AssemblyStrategy::kPartitioned;  // chosen by measurement
  int n_threads = 0;                                           // <= 0: OpenMP's default (all cores)
};

struct AssemblyStatistics {
  double pattern_s = 0;                // sparsity pattern from the connectivity
  double colouring_s = 0;              // slab partition (kPartitioned)
  double values_s = 0;                 // element matrices and their addition
  long long n_interface_elements = 0;  // kPartitioned: elements added serially
  int n_threads = 0;
  long long n_nonzeros = 0;  // stored entries of the full matrix
};

// Global stiffness K (3n x 3n, N/mm, full symmetric storage, column-major), assembled on all cores.
// The pattern is computed once from the connectivity (every pair of nodes sharing an element gets a
// dense 3 x 3 block); nodes used by no element get no entries (empty rows and columns).
// Throws InputError for a region without material or invalid connectivity, MeshError for an
// inverted element.
Eigen::SparseMatrix<double> assemble_stiffness(const mesh::VolumeMesh& mesh,
                                               const MaterialTable& materials);
Eigen::SparseMatrix<double> assemble_stiffness(const mesh::VolumeMesh& mesh,
                                               const MaterialTable& materials,
                                               const AssemblyOptions& options,
                                               AssemblyStatistics* statistics = nullptr);

// Prescribed displacement of one degree of freedom (component 0,1,2 = x,y,z), mm. Eliminated
// from the system, no penalty factors.
struct DofConstraint {
  int node = 0;
  int component = 0;
  double value_mm = 0;
};
// Fixes all three components of every node on faces carrying `marker`.
// Throws InputError when no face carries the marker.
std::vector<DofConstraint> fix_faces(const mesh::VolumeMesh& mesh, int marker);

}  // namespace sharpey::fem
