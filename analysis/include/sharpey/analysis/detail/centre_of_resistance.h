// Centre of resistance from the tooth's rigid response to the unit load cases.
//
// Internal to the analysis library; not a stable interface.
#pragma once

#include <Eigen/Core>

#include "sharpey/analysis/detail/rigid_motion.h"
#include "sharpey/analysis/study.h"
#include "sharpey/mesh/tooth_model.h"

namespace sharpey::analysis::detail {

// Height z (mm, tooth coordinates) of the point (0, 0, z) on the long axis such that a force along
// the horizontal unit vector `direction`, with its line of action through that point, produces no
// rotation about the horizontal axis e_z x direction (the tipping axis of that force).
//
// Method: a unit force along d at q = (0, 0, z) equals, at the reference point r, the force d and
// the moment (q - r) x d = (-r) x d + z (e_z x d). The fitted rotation is linear in the load, so
// its component about n = e_z x d is theta(z) = alpha + z beta with
//   alpha = n . (W_F d + W_M ((-r) x d)),  beta = n . W_M (e_z x d),
// W_F and W_M being the rotation rows of the rigid response (per unit force, per unit moment).
// The centre of resistance is z = -alpha / beta. Throws SolverError when beta vanishes (a couple
// that does not rotate the tooth: a model not held elastically).
double centre_of_resistance_height(const RigidResponse& response, const Eigen::Vector3d& direction);

// Fills the reported distances: from the crest and from the CEJ (positive apically) and the
// fraction of the embedded root length (crest to apex).
CentreOfResistance describe_centre_of_resistance(double z_mm, const mesh::ModelGeometry& geometry);

}  // namespace sharpey::analysis::detail
