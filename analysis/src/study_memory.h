// Running out of memory in the two long stages of a scenario, reported as that stage's typed
// error (MeshError while meshing, SolverError while solving) with the fix, so that callers (the
// batch command's exit codes, the app's dialogs) tell the two apart like any other failure.
#pragma once

#include <atomic>
#include <string>
#include <vector>

#include "sharpey/fem/assembly.h"
#include "sharpey/mesh/tooth_model.h"

namespace sharpey::analysis::detail {

// mesh::build_tooth_model(model); std::bad_alloc from any allocation on the way (surfaces, TetGen,
// the second-order nodes) becomes a MeshError naming the scenario, the mesh sizes and the fix.
// TetGen's own out-of-memory code already arrives as a MeshError and passes through unchanged.
mesh::ToothModel build_scenario_model(const mesh::ModelSpec& model, const std::string& scenario,
                                      const std::atomic<bool>* cancel = nullptr);

// The model's constraints in a study: the kFixedBone faces held at zero.
std::vector<fem::DofConstraint> scenario_constraints(const mesh::VolumeMesh& mesh);

// Message of the SolverError thrown when an allocation fails while the scenario's model (n_nodes
// nodes, n_elements elements) is assembled, factorised, solved or post-processed.
std::string solver_out_of_memory_message(const std::string& scenario, int n_nodes, int n_elements);

}  // namespace sharpey::analysis::detail
