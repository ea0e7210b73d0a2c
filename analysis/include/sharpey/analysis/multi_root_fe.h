// Finite-element centre of resistance of a multi-rooted tooth (mesh::build_multi_root_mesh): six
// unit load cases on the crown (three forces through its centroid, three couples), the tooth's
// rigid motion fitted to its nodes, the 6 x 6 compliance, and the CRes as in the thin-layer
// estimate (multi_root_thin_layer.h) so that the two can be compared. docs/molars.md.
#pragma once

#include <Eigen/Core>

#include "sharpey/analysis/multi_root_thin_layer.h"
#include "sharpey/fem/material.h"
#include "sharpey/mesh/multi_root_tooth.h"

namespace sharpey::analysis {

struct MultiRootFeCres {
  MultiRootCres buccolingual, mesiodistal;  // forces along x and along y
  Eigen::Matrix<double, 6, 6> compliance;   // about the origin: (F N, M N mm) -> (u mm, rad)
  double max_equilibrium_error_n = 0;       // |sum of reactions + applied| over the cases
  double max_rigid_fit_rms_um = 0;          // misfit of the tooth's rigid motion
  int n_dofs = 0;
};

// Solves the mesh with the given tooth, PDL and bone materials (regions kTooth, kPdl,
// kCancellousBone), kFixedBone faces fixed. Throws InputError / SolverError from the solver.
MultiRootFeCres multi_root_fe_cres(const mesh::MultiRootMesh& mesh, const fem::Material& tooth,
                                   const fem::Material& pdl, const fem::Material& bone,
                                   double trunk_length_mm);

}  // namespace sharpey::analysis
