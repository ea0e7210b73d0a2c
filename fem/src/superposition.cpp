#include "sharpey/fem/superposition.h"

#include "sharpey/error.h"
#include "sharpey/fem/loads.h"

namespace sharpey::fem {

UnitLoadBasis::UnitLoadBasis(const mesh::VolumeMesh& mesh, const MaterialTable& materials,
                             const LinearElasticSolver& solver, int pad_marker,
                             const Eigen::Vector3d& reference_point, int field_region)
    : reference_point_(reference_point) {
  const Eigen::Vector3d zero = Eigen::Vector3d::Zero();
  Eigen::MatrixXd F(3 * mesh.n_nodes(), 6);
  for (int j = 0; j < 3; ++j) {
    F.col(j) = patch_load(mesh, pad_marker, Eigen::Vector3d::Unit(j), zero, reference_point);
    F.col(3 + j) = patch_load(mesh, pad_marker, zero, Eigen::Vector3d::Unit(j), reference_point);
  }
  u_ = solver.solve(F);  // one pass through the factor for all six cases
  fields_ = recover_region(mesh, materials, u_, field_region);
}

UnitLoadBasis::UnitLoadBasis(const Eigen::Vector3d& reference_point,
                             Eigen::MatrixXd unit_displacements,
                             std::vector<RegionField> unit_fields)
    : reference_point_(reference_point),
      u_(std::move(unit_displacements)),
      fields_(std::move(unit_fields)) {
  if (u_.cols() != 6 || fields_.size() != 6) {
    throw InputError("unit_load_basis", "a unit load basis needs six load cases; got " +
                                            std::to_string(u_.cols()) +
                                            " displacement columns and " +
                                            std::to_string(fields_.size()) + " region fields");
  }
  for (const RegionField& f : fields_) {
    const auto n = static_cast<Eigen::Index>(f.nodes.size());
    if (f.region != fields_.front().region || f.nodes != fields_.front().nodes ||
        f.stress_mpa.cols() != n || f.strain.cols() != n) {
      throw InputError("unit_load_basis",
                       "the six region fields of a unit load basis must cover one region with "
                       "the same nodes, one stress and strain column per node");
    }
  }
}

namespace {
Eigen::Matrix<double, 6, 1> coefficients(const Eigen::Vector3d& force_n,
                                         const Eigen::Vector3d& moment_nmm) {
  Eigen::Matrix<double, 6, 1> c;
  c << force_n, moment_nmm;
  return c;
}
}  // namespace

Eigen::VectorXd UnitLoadBasis::displacement(const Eigen::Vector3d& force_n,
                                            const Eigen::Vector3d& moment_nmm) const {
  return u_ * coefficients(force_n, moment_nmm);
}

RegionField UnitLoadBasis::region_field(const Eigen::Vector3d& force_n,
                                        const Eigen::Vector3d& moment_nmm) const {
  const Eigen::Matrix<double, 6, 1> c = coefficients(force_n, moment_nmm);
  RegionField out;
  out.region = fields_.front().region;
  out.nodes = fields_.front().nodes;
  out.stress_mpa = c(0) * fields_[0].stress_mpa;
  out.strain = c(0) * fields_[0].strain;
  for (int j = 1; j < 6; ++j) {
    out.stress_mpa += c(j) * fields_[static_cast<size_t>(j)].stress_mpa;
    out.strain += c(j) * fields_[static_cast<size_t>(j)].strain;
  }
  return out;
}

}  // namespace sharpey::fem
