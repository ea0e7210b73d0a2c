#include <cmath>
#include <sstream>

#include "sharpey/analysis/detail/centre_of_resistance.h"
#include "sharpey/error.h"

namespace sharpey::analysis::detail {

double centre_of_resistance_height(const RigidResponse& response,
                                   const Eigen::Vector3d& direction) {
  const Eigen::Vector3d d = direction.normalized();
  const Eigen::Vector3d n = Eigen::Vector3d::UnitZ().cross(d);
  const Eigen::Matrix3d W_F = response.matrix.block<3, 3>(3, 0);  // rad per N
  const Eigen::Matrix3d W_M = response.matrix.block<3, 3>(3, 3);  // rad per N.mm
  const Eigen::Vector3d r = response.reference_point;
  const double alpha = n.dot(W_F * d + W_M * (-r).cross(d));
  const double beta = n.dot(W_M * Eigen::Vector3d::UnitZ().cross(d));
  if (!(std::abs(beta) > 0) || !std::isfinite(alpha / beta)) {
    std::ostringstream msg;
    msg << "centre of resistance undefined: a couple about (" << n.transpose()
        << ") does not rotate the tooth (rotation per N.mm " << beta
        << "); the model is not held elastically (check the materials and the fixed bone faces)";
    throw SolverError(msg.str());
  }
  return -alpha / beta;
}

CentreOfResistance describe_centre_of_resistance(double z_mm, const mesh::ModelGeometry& geometry) {
  CentreOfResistance c;
  c.point = Eigen::Vector3d(0, 0, z_mm);
  c.from_crest_mm = geometry.crest_z_mm - z_mm;
  c.from_cej_mm = geometry.cej_z_mm - z_mm;
  c.fraction_embedded =
      geometry.embedded_length_mm > 0 ? c.from_crest_mm / geometry.embedded_length_mm : 0.0;
  return c;
}

}  // namespace sharpey::analysis::detail
