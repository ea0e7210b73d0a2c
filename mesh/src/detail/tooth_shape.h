// The parametric tooth surface (crown and root) in the tooth coordinate system.
//
// One closed smooth surface X(theta, s):
//   theta in [0, 2 pi): angle of the cross-section parameter, 0 = labial (+x), pi/2 = mesial (+y);
//   s in [-1, 1]: meridian parameter, -1 = root apex (a pole), 0 = CEJ (z = 0), 1 = crown tip
//   (a pole on the long axis).
// Every cross-section is horizontal (z depends on s only) and an ellipse
//   X = (cx(s) + a(s) cos theta, b(s) sin theta, z(s)),
// a = labiolingual half-width, b = mesiodistal half-width. The surface is smooth at both poles
// (horizontal tangent plane). X_theta x X_s points outward.
//
// Anatomical root: a = A rho(u), b = B rho(u), z = -L + L u^2 with u = s + 1 and
// rho(u) = sqrt(1 - (1 - u^2)^m) (A, B the cervical half-widths, L the root length,
// m = dimensions.root_taper_fullness, calibrated per tooth, 1.19 to 3.75: a full, bullet-like
// taper with a rounded apex whose radius of curvature is A^2 m / (2 L)).
// Anatomical crown: half-widths rise from the cervix to the height of contour (labiolingual) and
// to the contact areas (mesiodistal) with smoothstep blends, then an elliptical cap closes the
// crown at the incisal edge / cusp tip / occlusal outline (proportions per tooth class).
// Idealised roots (circular sections, radius r at height h above the apex):
//   cylinder:   r = R, closed by a half-ellipsoid cap of height R/3 (flattened, rounded bottom);
//   cone:       r = k (h + delta), with its tip rounded by a tangent sphere of radius 0.05 R;
//               delta (the rounding's shift of the virtual tip below the apex) is set so that the
//               radius at the healthy crest is R;
//   paraboloid: r = k sqrt(h), naturally rounded apex;
// where k is set by r = R at the healthy crest. Their crown is a cylinder of the root's CEJ radius
// and height crown_length_mm, closed by an elliptical cap.
#pragma once

#include <Eigen/Core>
#include <memory>
#include <vector>

#include "dual.h"
#include "sharpey/mesh/tooth_model.h"

namespace sharpey::mesh::detail {

template <class T>
struct Section {
  T cx, a, b, z;
};

class ToothShape {
 public:
  // `healthy_crest_depth_mm`: depth of the healthy crest below the CEJ (sets idealised radii).
  ToothShape(const ToothSpec& tooth, double healthy_crest_depth_mm);

  Section<double> section(double s) const;
  Section<Dual2> section(const Dual2& s) const;

  Eigen::Vector3d point(double theta, double s) const;
  // Unit outward normal; (0,0,-1) at the apex, (0,0,1) at the crown tip.
  Eigen::Vector3d normal(double theta, double s) const;
  // Point and (unnormalised) tangents X_theta, X_s.
  void frame(double theta, double s, Eigen::Vector3d* x, Eigen::Vector3d* x_theta,
             Eigen::Vector3d* x_s) const;

  double z(double s) const { return section(s).z; }
  // Inverse of z(s) on the root (z <= 0) or the crown (z >= 0); z is clamped to the tooth.
  double s_of_z(double z) const;

  // Arc length along the mean meridian ((a + b) / 2, z), from the apex (0) to the crown tip.
  double arc(double s) const;
  double s_of_arc(double arc_mm) const;
  double total_arc() const { return arc_.back(); }
  // Parameters s where the meridian changes formula (curvature jumps): integrate piecewise.
  std::vector<double> knots() const;
  // Curvature (1/mm) of the mean meridian at s, by central differences.
  double meridian_curvature(double s) const;

  double root_length() const { return root_length_; }
  double crown_length() const { return crown_length_; }
  // Top of the crown's body: the elliptical cap (incisal edge / cusp / occlusal outline) is above.
  double crown_body_top() const { return crown_body_top_; }
  // Cone root: distance from the apex down to the virtual sharp tip; 0 otherwise.
  double cone_delta() const { return delta_; }
  // Polar angle atan2(y, x) of the root cross-section point with parameter theta.
  double root_polar_angle(double theta) const;
  bool scanned() const { return scan_ != nullptr; }

 private:
  template <class T>
  Section<T> root_section(const T& u) const;
  template <class T>
  Section<T> crown_section(const T& s) const;
  template <class T>
  Section<T> eval(const T& s) const;
  // Scanned tooth: z(s) (root z = apex (1 - (s + 1)^2), crown z = tip (1 - (1 - s)^2), so that
  // the radius grows linearly in s away from the poles), the mean radius of a row (section), and
  // the radius r(theta, s) with its partial derivatives (bicubic Catmull-Rom on the table,
  // periodic in theta, one-sided at the poles and at the CEJ row).
  template <class T>
  T scan_z(const T& s) const;
  template <class T>
  Section<T> scan_section(const T& s) const;
  void scan_radius(double theta, double s, double* r, double* r_theta, double* r_s) const;
  // Construction steps: a scanned tooth; otherwise the root (returns the idealised crown's
  // radius, 0 for an anatomical tooth; a cone root through init_cone_root) and then the crown.
  void init_scan(const std::shared_ptr<const RadialToothSurface>& scan);
  double init_root(const ToothSpec& tooth, double healthy_crest_depth_mm);
  double init_cone_root(double crest_height);
  void init_crown(const ToothSpec& tooth, double crown_radius);
  void init_arc_table();

  const RadialToothSurface* scan_ = nullptr;
  std::shared_ptr<const RadialToothSurface> scan_owner_;
  std::vector<double> scan_mean_;  // mean radius per row

  IdealRoot ideal_ = IdealRoot::kNone;
  double root_length_ = 0, crown_length_ = 0;
  // Anatomical root
  double root_a_ = 0, root_b_ = 0, fullness_ = 1.6;
  // Idealised roots
  double radius_ = 0, k_ = 0, cap_ = 0, u1_ = 0, tip_radius_ = 0, alpha_ = 0, delta_ = 0,
         tip_center_ = 0, tip_tangent_ = 0;
  // Crown
  bool crown_cylinder_ = false;
  double a_cervix_ = 0, a_max_ = 0, z_a_max_ = 0, a_top_ = 0;
  double b_cervix_ = 0, b_max_ = 0, z_b_max_ = 0, b_top_ = 0;
  double crown_body_top_ = 0, crown_cap_ = 0, s_cap_ = 0;
  // Arc-length table on a uniform s grid.
  std::vector<double> arc_;
};

}  // namespace sharpey::mesh::detail
