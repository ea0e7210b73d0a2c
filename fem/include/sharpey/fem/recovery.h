// Strain and stress recovery and the scalar measures derived from them.
#pragma once

#include <Eigen/Core>
#include <vector>

#include "sharpey/fem/material.h"
#include "sharpey/mesh/volume_mesh.h"

namespace sharpey::fem {

// Stress and strain per node of one region, from that region's elements only (no averaging
// across material interfaces). Nodal values are the average over the region's elements of the
// element field extrapolated from its quadrature points to the node: for 10-node elements the
// values at the 4 points of the degree-2 rule define a linear field, evaluated at the 10 nodes;
// 4-node elements have one constant value.
struct RegionField {
  int region = 0;
  std::vector<int> nodes;                               // global node ids of the region, ascending
  Eigen::Matrix<double, 6, Eigen::Dynamic> stress_mpa;  // 6 x nodes.size(), Voigt
  Eigen::Matrix<double, 6, Eigen::Dynamic> strain;  // 6 x nodes.size(), Voigt, engineering shear
};
// u: 3n displacement, mm. Throws InputError when no element has `region` or it has no material.
RegionField recover_region(const mesh::VolumeMesh& mesh, const MaterialTable& materials,
                           const Eigen::VectorXd& u, int region);
// The same for several displacement fields at once (3n x m, one field per column): the element
// geometry is evaluated once for all of them.
std::vector<RegionField> recover_region(const mesh::VolumeMesh& mesh,
                                        const MaterialTable& materials, const Eigen::MatrixXd& U,
                                        int region);

// Stress at the quadrature points of element e (6 x n_qp) and their physical positions (3 x n_qp).
// The points are those of the recovery rule: the 4-point degree-2 rule for 10-node elements, the
// centroid for 4-node elements. Either output may be null.
void element_quadrature_stress(const mesh::VolumeMesh& mesh, int e, const Matrix6d& D,
                               const Eigen::VectorXd& u,
                               Eigen::Matrix<double, 6, Eigen::Dynamic>* stress_mpa,
                               Eigen::Matrix3Xd* points_mm);

// Scalar measures. Hydrostatic pressure p = -trace(sigma)/3, compression positive, in kPa.
double hydrostatic_pressure_kpa(const Vector6d& stress_mpa);
double von_mises_mpa(const Vector6d& stress_mpa);
Eigen::Vector3d principal_stresses_mpa(const Vector6d& stress_mpa);  // descending
Eigen::Vector3d principal_strains(const Vector6d& strain);           // descending (tensor strains)
// Von Mises equivalent strain: sqrt(2/3 e_dev : e_dev) with tensor deviatoric strain.
double equivalent_strain(const Vector6d& strain);

}  // namespace sharpey::fem
