// Sampling a nodal field of the root surface onto the unwrapped (angle, depth) grid of a RootMap.
//
// Internal to the analysis library; not a stable interface.
#pragma once

#include <Eigen/Core>
#include <Eigen/SparseCore>
#include <vector>

#include "sharpey/analysis/study.h"
#include "sharpey/mesh/volume_mesh.h"

namespace sharpey::analysis::detail {

// Each face carrying `marker` is mapped to the plane (angle around the long axis in degrees,
// 0 = +x labial, 90 = +y mesial; depth below the CEJ = -z in mm) through its three corners; a cell
// centre inside a face's image gets the field interpolated with the face's shape functions at the
// corresponding reference point. Faces crossing the 0/360 seam are unwrapped; a corner on the axis
// itself (the apex pole) takes the angle of the query point, so the fan of faces around the pole
// covers the bottom rows. Cells that no face covers (above the crest, in a defect, below the apex)
// stay NaN. The interpolation weights are computed once; sample() is a sparse product.
class RootMapSampler {
 public:
  RootMapSampler(const mesh::VolumeMesh& mesh, int marker, const std::vector<int>& value_nodes,
                 int n_angle, int n_depth, double depth_min_mm, double depth_max_mm);

  // Cell (row i, column j) centre: angle (j + 0.5) * 360 / n_angle, depth
  // depth_min + (i + 0.5) * (depth_max - depth_min) / n_depth.
  RootMap sample(const Eigen::VectorXd& nodal_values) const;
  double covered_fraction() const;  // share of cells with a value

 private:
  RootMap layout_;
  Eigen::SparseMatrix<double, Eigen::RowMajor> interpolation_;  // cells x values
  std::vector<char> covered_;
};

}  // namespace sharpey::analysis::detail
