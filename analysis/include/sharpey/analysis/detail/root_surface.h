// Integrals of a nodal field over the root surface (the tooth/PDL interface): attachment area, area
// where the field exceeds a threshold, and the level exceeded on a given share of the area.
//
// Internal to the analysis library; not a stable interface.
#pragma once

#include <Eigen/Core>
#include <Eigen/SparseCore>
#include <array>
#include <vector>

#include "sharpey/mesh/volume_mesh.h"

namespace sharpey::analysis::detail {

// Each face carrying `marker` (3- or 6-node triangles) is split into n^2 sub-triangles in its
// reference coordinates. The field is interpolated with the face's own shape functions (quadratic
// on 6-node faces) at the sub-triangle vertices and taken as linear on each sub-triangle, so the
// area where it exceeds a level is integrated exactly for that piecewise-linear field (sub-triangle
// fractions, not a node count). Sub-triangle areas come from the curved face's Jacobian at the
// sub-triangle centroid, so their sum converges to the true curved area.
class RootSurfaceSampler {
 public:
  // value_nodes[k]: global node id of entry k of the nodal vectors later passed to sample().
  // Throws Error when a face node has no entry (the field does not cover the surface).
  RootSurfaceSampler(const mesh::VolumeMesh& mesh, int marker, const std::vector<int>& value_nodes,
                     int subdivisions = 4);

  int n_faces() const { return n_faces_; }
  double area_mm2() const { return area_mm2_; }

  // Field values at the sub-triangle vertices (input: one value per entry of value_nodes).
  Eigen::VectorXd sample(const Eigen::VectorXd& nodal_values) const;
  // Area (mm^2) where the sampled field is strictly above `level`.
  double area_above(const Eigen::VectorXd& sampled, double level) const;
  // The level exceeded on exactly `area_fraction` (0..1) of the surface: the (1 - fraction)
  // area-weighted quantile of the field. Bisection on area_above to 1e-9 of the field's range.
  double level_exceeded_on(const Eigen::VectorXd& sampled, double area_fraction) const;

 private:
  int n_faces_ = 0;
  double area_mm2_ = 0;
  Eigen::SparseMatrix<double, Eigen::RowMajor> interpolation_;  // n_sub_vertices x n_values
  std::vector<std::array<int, 3>> triangles_;                   // into the sub-vertices
  std::vector<double> triangle_area_mm2_;
};

// Share (0..1) of a triangle whose linear field has vertex values a, b, c that lies strictly above
// `level` (exact for the linear field).
double triangle_fraction_above(double a, double b, double c, double level);

}  // namespace sharpey::analysis::detail
