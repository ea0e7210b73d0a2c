// Isotropic linear-elastic materials, one per mesh region.
#pragma once

#include <Eigen/Core>
#include <map>

namespace sharpey::fem {

using Vector6d = Eigen::Matrix<double, 6, 1>;
using Matrix6d = Eigen::Matrix<double, 6, 6>;

struct Material {
  double young_modulus_mpa = 0;
  double poisson_ratio = 0;
};
// Region id -> material. Every region present in the mesh needs an entry (else InputError).
using MaterialTable = std::map<int, Material>;

// D: 6 x 6 isotropic elasticity matrix, MPa, Voigt order xx yy zz yz xz xy with engineering shear
// strains. Throws InputError for E <= 0 or nu outside (-1, 0.5).
Matrix6d elasticity_matrix(const Material& m);

// The material of `region`; throws InputError naming the region and the regions that have one
// when the table has no entry for it.
const Material& material_of(const MaterialTable& materials, int region);

}  // namespace sharpey::fem
