// Six unit load cases at a loaded patch, combined linearly for any force system.
#pragma once

#include <Eigen/Core>
#include <vector>

#include "sharpey/fem/material.h"
#include "sharpey/fem/recovery.h"
#include "sharpey/fem/solver.h"
#include "sharpey/mesh/volume_mesh.h"

namespace sharpey::fem {

// Six unit load cases at a bracket pad (unit forces along x, y, z in N and unit moments about
// x, y, z in N.mm, about `reference_point`), each distributed by patch_load() and all solved in one
// pass through the solver's factorisation. Any other force system at the pad is their linear
// combination: displacement and region fields in milliseconds, no new solve.
// Memory: 3n x 6 displacements plus 2 x 6 x 6 values per node of the field region.
class UnitLoadBasis {
 public:
  UnitLoadBasis(const mesh::VolumeMesh& mesh, const MaterialTable& materials,
                const LinearElasticSolver& solver, int pad_marker,
                const Eigen::Vector3d& reference_point, int field_region);
  // A basis solved earlier, from its parts (e.g. read back from a saved solution): the six unit
  // displacements (3n x 6, mm per unit load) and the six region fields, in the order of the
  // constructor above (force x, y, z, then moment x, y, z about reference_point). Throws
  // InputError when there are not six columns and six fields of one region and node set.
  UnitLoadBasis(const Eigen::Vector3d& reference_point, Eigen::MatrixXd unit_displacements,
                std::vector<RegionField> unit_fields);

  Eigen::VectorXd displacement(const Eigen::Vector3d& force_n,
                               const Eigen::Vector3d& moment_nmm) const;
  RegionField region_field(const Eigen::Vector3d& force_n, const Eigen::Vector3d& moment_nmm) const;
  // Per-case displacement (3n x 6) and fields, for analyses that need the basis itself.
  const Eigen::MatrixXd& unit_displacements() const { return u_; }
  const std::vector<RegionField>& unit_fields() const { return fields_; }
  const Eigen::Vector3d& reference_point() const { return reference_point_; }

 private:
  Eigen::Vector3d reference_point_;
  Eigen::MatrixXd u_;
  std::vector<RegionField> fields_;
};

}  // namespace sharpey::fem
