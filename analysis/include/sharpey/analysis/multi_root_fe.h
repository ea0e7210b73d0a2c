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

// Finite-element PDL hydrostatic pressure per part under `load` (a force through a point plus a
// couple, spread over the crown's nodes as the unit cases are): the largest compression and
// tension over the PDL nodes of each root (as RootFigures; attachment and reaction fields are
// left 0), skipping the nodes within one crest width below the crest and, with a furcation
// lesion, the septum at the roof under a lower crest or an angular defect, within one crest
// width of the PDL's free faces (the free edge's
// band, as the single-rooted results do). `tooth` entry over every PDL node outside the band.
struct MultiRootFePressure {
  RootFigures tooth;
  std::vector<RootFigures> roots;
};
MultiRootFePressure multi_root_fe_pressure(
    const mesh::MultiRootMesh& mesh, const mesh::MultiRootTooth& tooth,
    const mesh::MultiRootBone& bone, const fem::Material& tooth_material, const fem::Material& pdl,
    const fem::Material& bone_material, const MultiRootLoad& load);

}  // namespace sharpey::analysis
