#include <cmath>
#include <sstream>
#include <string>

#include "sharpey/error.h"
#include "sharpey/fem/elasticity.h"

namespace sharpey::fem {

Matrix6d elasticity_matrix(const Material& m) {
  const double E = m.young_modulus_mpa;
  const double nu = m.poisson_ratio;
  if (!(E > 0) || !std::isfinite(E)) {
    std::ostringstream s;
    s << "Young's modulus " << E << " MPa is not positive; give a modulus > 0 MPa "
      << "(the PDL is usually 0.05 to 0.7 MPa, dentin about 18600 MPa)";
    throw InputError("young_modulus_mpa", s.str());
  }
  if (!(nu > -1.0 && nu < 0.5)) {
    std::ostringstream s;
    s << "Poisson ratio " << nu << " is outside (-1, 0.5); an isotropic solid needs -1 < nu < 0.5 "
      << "(use at most 0.49 for a nearly incompressible ligament)";
    throw InputError("poisson_ratio", s.str());
  }
  // D: 6 x 6 in Voigt order xx yy zz yz xz xy, engineering shear strains, MPa.
  const double lambda = E * nu / ((1 + nu) * (1 - 2 * nu));
  const double mu = E / (2 * (1 + nu));
  Matrix6d D = Matrix6d::Zero();
  D.topLeftCorner<3, 3>().setConstant(lambda);
  D.topLeftCorner<3, 3>().diagonal().array() += 2 * mu;
  D.bottomRightCorner<3, 3>().diagonal().setConstant(mu);
  return D;
}

}  // namespace sharpey::fem

namespace sharpey::fem {

const Material& material_of(const MaterialTable& materials, int region) {
  const auto it = materials.find(region);
  if (it != materials.end()) return it->second;
  std::ostringstream s;
  s << "region " << region << " of the mesh has no material; the material table covers regions {";
  bool first = true;
  for (const auto& [id, m] : materials) {
    s << (first ? "" : ", ") << id;
    first = false;
  }
  s << "}; add a Young's modulus and Poisson ratio for region " << region;
  throw InputError("materials[" + std::to_string(region) + "]", s.str());
}

}  // namespace sharpey::fem
