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
// tension over the PDL nodes of each root, skipping the nodes within one crest width below the
// crest and, with a furcation lesion, the septum at the roof under a lower crest or an angular
// defect, within one crest width of the PDL's free faces (the free edge's band, as the
// single-rooted results do). `tooth` entry over every PDL node outside the band.
// Areas (RootFigures attachment_area_mm2 and area_above_*; reaction_n is left 0): over the PDL's
// root-side faces (kRootSurface, the tooth/PDL interface), each face's part that of the PDL
// element behind it. The attachment area is the whole root-side surface of the part (the band
// included). The area above a threshold is lumped at the faces' nodes: each 6-node face split at
// its midside nodes into four triangles, a third of each triangle's area to each of its nodes
// (a corner A/12, a midside node A/4; A/3 per node of a 3-node face), a node's share counted when
// its recovered pressure exceeds the threshold; nodes in the band never count.
struct MultiRootFeSurfaceShare {
  int part = 0;         // mesh::kTrunkPart, mesh::kRoofPart or the root index
  double area_mm2 = 0;  // the node's lumped share of one face
  double pressure_kpa = 0;
  bool in_band = false;
};
struct MultiRootFePressure {
  RootFigures tooth;
  std::vector<RootFigures> roots;
  std::vector<MultiRootFeSurfaceShare> surface;  // one per (root-side face, node)
};
MultiRootFePressure multi_root_fe_pressure(
    const mesh::MultiRootMesh& mesh, const mesh::MultiRootTooth& tooth,
    const mesh::MultiRootBone& bone, const fem::Material& tooth_material, const fem::Material& pdl,
    const fem::Material& bone_material, const MultiRootLoad& load,
    const Thresholds& thresholds = default_thresholds());

// Root-side area (lumped as above) outside the band where the pressure exceeds `threshold_kpa`:
// on part `part` (a root index, mesh::kTrunkPart or mesh::kRoofPart), or on the whole tooth when
// `part` is kWholeTooth.
constexpr int kWholeTooth = -1000;
double multi_root_fe_area_above_mm2(const MultiRootFePressure& fe, int part, double threshold_kpa);

}  // namespace sharpey::analysis
