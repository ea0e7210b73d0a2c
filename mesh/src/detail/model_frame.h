// The resolved geometric definition of a tooth model: the tooth surface, the PDL offset, the
// attachment level around the root, the bone block and its top surface. Shared by the mesher
// (model_build.cpp) and the numerical integration of areas and volumes (model_geometry.cpp).
#pragma once

#include <Eigen/Core>
#include <vector>

#include "sharpey/mesh/tooth_model.h"
#include "tooth_shape.h"

namespace sharpey::mesh::detail {

class ModelFrame {
 public:
  // `spec` must have passed validate().
  explicit ModelFrame(const ModelSpec& spec);

  const ModelSpec& spec() const { return spec_; }
  const ToothShape& shape() const { return shape_; }
  const MeshSizes& sizes() const { return sizes_; }

  double crest_z() const { return crest_z_; }  // after horizontal loss
  double apex_z() const { return apex_z_; }
  double cortical_thickness() const { return spec_.bone.cortical_thickness_mm; }

  // Requested PDL width at height z (mm).
  double pdl_width(double z) const;
  // Point at fraction f in [0, 1] across the PDL from the root surface (0) to the socket (1).
  Eigen::Vector3d pdl_point(double theta, double s, double f) const;
  Eigen::Vector3d socket_point(double theta, double s) const { return pdl_point(theta, s, 1.0); }

  // Angular defect weight in [0, 1] at polar angle `polar` (rad) around the long axis.
  double defect_weight(double polar) const;
  // Attachment level on the root at polar angle `polar`.
  double attachment_z(double polar) const;
  // Root meridian parameter s of the attachment level (crest ring) and of the cortical ring
  // (attachment level minus the cortical thickness) in the column theta.
  double crest_s(double theta) const;
  double cortical_s(double theta) const;

  // Height of the bone top at (x, y): the crest, lowered by the angular-defect trough.
  double bone_top(double x, double y) const;

  // Bone block: x from lingual to labial, y from distal to mesial, z from base to the crest.
  double x_labial() const { return x_labial_; }
  double x_lingual() const { return x_lingual_; }
  double y_mesial() const { return y_mesial_; }
  double y_distal() const { return y_distal_; }
  double z_base() const { return z_base_; }
  // Inner faces of the labial and lingual cortical plates.
  double x_labial_inner() const { return x_labial_ - cortical_thickness(); }
  double x_lingual_inner() const { return x_lingual_ + cortical_thickness(); }

  // Bracket pad: centre height, lower and upper edge heights.
  double bracket_z() const { return bracket_z_; }

 private:
  double outline_distance(double x, double y) const;

  ModelSpec spec_;
  ToothShape shape_;
  MeshSizes sizes_;
  double crest_z_ = 0, apex_z_ = 0;
  double defect_depth_ = 0, defect_radial_ = 1;
  double x_labial_ = 0, x_lingual_ = 0, y_mesial_ = 0, y_distal_ = 0, z_base_ = 0;
  double bracket_z_ = 0;
  std::vector<Eigen::Vector2d> outline_;  // socket crest ring projected on z = 0, closed loop
};

// Wraps an angle to (-pi, pi].
double wrap_angle(double a);

// PDL width at height z for a crest at crest_z and the apex at apex_z (piecewise linear profile).
double pdl_width_profile(const PdlSpec& pdl, double crest_z, double apex_z, double z);
// Angular-defect weight in [0, 1] at polar angle `polar` (0 where there is no defect).
double defect_weight(const BoneLoss& loss, double polar);
// Crest height after horizontal loss and the apex height of a specification.
double crest_height(const ModelSpec& spec);
double apex_height(const ModelSpec& spec);

}  // namespace sharpey::mesh::detail

namespace sharpey::mesh::detail {

// Areas and volumes of the parametric definition by numerical integration (Gauss-Legendre along
// the meridian, the periodic trapezoidal rule around it), plus the model's reference points.
ModelGeometry integrate_geometry(const ModelFrame& frame);

// n-point Gauss-Legendre rule on [0, 1]: nodes and weights (sum 1).
void gauss_legendre01(int n, std::vector<double>* nodes, std::vector<double>* weights);

}  // namespace sharpey::mesh::detail
