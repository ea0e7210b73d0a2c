#include "tooth_shape.h"

#include <Eigen/Geometry>
#include <algorithm>
#include <cmath>

#include "sharpey/core/constants.h"

namespace sharpey::mesh::detail {
namespace {

using sharpey::core::kPi;
constexpr int kArcIntervals = 8192;

template <class T>
T smoothstep(const T& t) {
  return t * t * (3.0 - 2.0 * t);
}

// Crown proportions per tooth class, as fractions of the crown length (heights) or of the
// maximum half-width (top half-widths). Chosen to give recognisable shapes, not measured.
struct CrownProportions {
  double a_max_height, a_top, b_max_height, b_top, cap_height;
};

CrownProportions crown_proportions(ToothType type) {
  switch (type) {
    case ToothType::kMaxillaryCanine:
    case ToothType::kMandibularCanine:
      return {0.30, 0.30, 0.55, 0.55, 0.30};  // pointed cusp
    case ToothType::kMaxillaryFirstPremolar:
    case ToothType::kMaxillarySecondPremolar:
    case ToothType::kMandibularFirstPremolar:
    case ToothType::kMandibularSecondPremolar:
      return {0.35, 0.75, 0.55, 0.80, 0.20};  // occlusal table
    default:
      return {0.25, 0.18, 0.70, 0.90, 0.12};  // incisors: thin incisal edge
  }
}

}  // namespace

ToothShape::ToothShape(const ToothSpec& tooth, double healthy_crest_depth_mm)
    : ideal_(tooth.ideal_root) {
  const ToothDimensions& d = tooth.dimensions;
  crown_length_ = d.crown_length_mm;
  double crown_radius = 0;  // idealised crown: cylinder radius
  if (ideal_ == IdealRoot::kNone) {
    root_length_ = d.root_length_mm;
    root_a_ = 0.5 * d.cervix_labiolingual_mm;
    root_b_ = 0.5 * d.cervix_mesiodistal_mm;
    fullness_ = d.root_taper_fullness;
  } else {
    root_length_ = tooth.ideal_length_mm;
    radius_ = tooth.ideal_radius_mm;
    const double L = root_length_, R = radius_;
    const double crest_height = L - healthy_crest_depth_mm;  // crest above the apex
    switch (ideal_) {
      case IdealRoot::kCylinder: {
        cap_ = R / 3.0;
        u1_ = cap_ * kPi / 2 / (cap_ * kPi / 2 + L - cap_);
        crown_radius = R;
        break;
      }
      case IdealRoot::kCone: {
        tip_radius_ = 0.05 * R;
        delta_ = 0;
        for (int it = 0; it < 100; ++it) {
          k_ = R / (crest_height + delta_);
          alpha_ = std::atan(k_);
          delta_ = tip_radius_ * (1.0 / std::sin(alpha_) - 1.0);
        }
        tip_center_ = tip_radius_ / std::sin(alpha_);
        tip_tangent_ = tip_radius_ * std::cos(alpha_) * std::cos(alpha_) / std::sin(alpha_);
        const double cap_arc = tip_radius_ * (kPi / 2 - alpha_);
        const double cone_arc = (L + delta_ - tip_tangent_) / std::cos(alpha_);
        u1_ = cap_arc / (cap_arc + cone_arc);
        crown_radius = k_ * (L + delta_);
        break;
      }
      case IdealRoot::kParaboloid: {
        k_ = R / std::sqrt(crest_height);
        crown_radius = k_ * std::sqrt(L);
        break;
      }
      case IdealRoot::kNone:
        break;
    }
  }

  if (ideal_ == IdealRoot::kNone) {
    const CrownProportions p = crown_proportions(tooth.type);
    const double Lc = crown_length_;
    a_cervix_ = 0.5 * d.cervix_labiolingual_mm;
    a_max_ = 0.5 * d.crown_labiolingual_mm;
    b_cervix_ = 0.5 * d.cervix_mesiodistal_mm;
    b_max_ = 0.5 * d.crown_mesiodistal_mm;
    a_top_ = p.a_top * a_max_;
    b_top_ = p.b_top * b_max_;
    crown_cap_ = p.cap_height * Lc;
    z_a_max_ = p.a_max_height * Lc;
    z_b_max_ = p.b_max_height * Lc;
  } else {
    a_cervix_ = a_max_ = a_top_ = crown_radius;
    b_cervix_ = b_max_ = b_top_ = crown_radius;
    crown_cap_ = std::min(crown_radius, 0.3 * crown_length_);
    z_a_max_ = z_b_max_ = 0.5 * (crown_length_ - crown_cap_);
  }
  crown_body_top_ = crown_length_ - crown_cap_;
  // Match the parameter speed of body and cap at their joint.
  s_cap_ = crown_body_top_ / (crown_body_top_ + crown_cap_ * kPi / 2);

  arc_.resize(kArcIntervals + 1);
  arc_[0] = 0;
  auto mean_meridian = [this](double s) {
    const Section<double> q = section(s);
    return Eigen::Vector2d(0.5 * (q.a + q.b), q.z);
  };
  Eigen::Vector2d prev = mean_meridian(-1.0);
  for (int j = 1; j <= kArcIntervals; ++j) {
    const Eigen::Vector2d p = mean_meridian(-1.0 + 2.0 * j / kArcIntervals);
    arc_[j] = arc_[j - 1] + (p - prev).norm();
    prev = p;
  }
}

template <class T>
Section<T> ToothShape::root_section(const T& u) const {
  using std::cos;
  using std::expm1;
  using std::log1p;
  using std::sin;
  using std::sqrt;
  const double L = root_length_;
  switch (ideal_) {
    case IdealRoot::kNone: {
      const T u2 = u * u;
      const T rho = sqrt(-expm1(fullness_ * log1p(-u2)));
      return {T(0.0), root_a_ * rho, root_b_ * rho, -L + L * u2};
    }
    case IdealRoot::kCylinder: {
      if (value(u) <= u1_) {
        const T phi = (kPi / 2 / u1_) * u;
        const T r = radius_ * sin(phi);
        return {T(0.0), r, r, -L + cap_ * (1.0 - cos(phi))};
      }
      const T h = cap_ + (L - cap_) * (u - u1_) / (1.0 - u1_);
      return {T(0.0), T(radius_), T(radius_), -L + h};
    }
    case IdealRoot::kCone: {
      T hv, r;
      if (value(u) <= u1_) {
        const T psi = ((kPi / 2 - alpha_) / u1_) * u;
        hv = tip_center_ - tip_radius_ * cos(psi);
        r = tip_radius_ * sin(psi);
      } else {
        hv = tip_tangent_ + (L + delta_ - tip_tangent_) * (u - u1_) / (1.0 - u1_);
        r = k_ * hv;
      }
      return {T(0.0), r, r, -L - delta_ + hv};
    }
    case IdealRoot::kParaboloid: {
      const T r = (k_ * std::sqrt(L)) * u;
      return {T(0.0), r, r, -L + L * u * u};
    }
  }
  return {T(0.0), T(0.0), T(0.0), T(0.0)};
}

template <class T>
Section<T> ToothShape::crown_section(const T& s) const {
  using std::cos;
  using std::sin;
  if (value(s) <= s_cap_) {
    const T z = (crown_body_top_ / s_cap_) * s;
    auto blend = [&](double v0, double v_max, double z_max, double v_top) -> T {
      if (value(z) <= z_max) return v0 + (v_max - v0) * smoothstep(z / z_max);
      return v_max + (v_top - v_max) * smoothstep((z - z_max) / (crown_body_top_ - z_max));
    };
    return {T(0.0), blend(a_cervix_, a_max_, z_a_max_, a_top_),
            blend(b_cervix_, b_max_, z_b_max_, b_top_), z};
  }
  const T phi = (kPi / 2 / (1.0 - s_cap_)) * (s - s_cap_);
  return {T(0.0), a_top_ * cos(phi), b_top_ * cos(phi), crown_body_top_ + crown_cap_ * sin(phi)};
}

template <class T>
Section<T> ToothShape::eval(const T& s) const {
  if (value(s) < 0) return root_section(s + 1.0);
  return crown_section(s);
}

Section<double> ToothShape::section(double s) const { return eval(std::clamp(s, -1.0, 1.0)); }
Section<Dual2> ToothShape::section(const Dual2& s) const { return eval(s); }

Eigen::Vector3d ToothShape::point(double theta, double s) const {
  const Section<double> q = section(s);
  return {q.cx + q.a * std::cos(theta), q.b * std::sin(theta), q.z};
}

void ToothShape::frame(double theta, double s, Eigen::Vector3d* x, Eigen::Vector3d* x_theta,
                       Eigen::Vector3d* x_s) const {
  const Dual2 t(theta, 1, 0), ss(std::clamp(s, -1.0, 1.0), 0, 1);
  const Section<Dual2> q = section(ss);
  const Dual2 px = q.cx + q.a * cos(t), py = q.b * sin(t), pz = q.z;
  if (x) *x = {px.v, py.v, pz.v};
  if (x_theta) *x_theta = {px.d[0], py.d[0], pz.d[0]};
  if (x_s) *x_s = {px.d[1], py.d[1], pz.d[1]};
}

Eigen::Vector3d ToothShape::normal(double theta, double s) const {
  if (s <= -1.0 + 1e-12) return -Eigen::Vector3d::UnitZ();
  if (s >= 1.0 - 1e-12) return Eigen::Vector3d::UnitZ();
  Eigen::Vector3d x, xt, xs;
  frame(theta, s, &x, &xt, &xs);
  return xt.cross(xs).normalized();
}

double ToothShape::s_of_z(double z) const {
  double lo = -1, hi = 0;
  if (z > 0) {
    lo = 0;
    hi = 1;
  }
  for (int it = 0; it < 64; ++it) {
    const double mid = 0.5 * (lo + hi);
    if (section(mid).z < z) {
      lo = mid;
    } else {
      hi = mid;
    }
  }
  return 0.5 * (lo + hi);
}

double ToothShape::arc(double s) const {
  const double x = (std::clamp(s, -1.0, 1.0) + 1.0) * 0.5 * kArcIntervals;
  const int j = std::min(static_cast<int>(x), kArcIntervals - 1);
  const double f = x - j;
  return arc_[j] + f * (arc_[j + 1] - arc_[j]);
}

double ToothShape::s_of_arc(double arc_mm) const {
  if (arc_mm <= 0) return -1.0;
  if (arc_mm >= arc_.back()) return 1.0;
  const auto it = std::upper_bound(arc_.begin(), arc_.end(), arc_mm);
  const int j = static_cast<int>(it - arc_.begin()) - 1;
  const double f = (arc_mm - arc_[j]) / (arc_[j + 1] - arc_[j]);
  return -1.0 + 2.0 * (j + f) / kArcIntervals;
}

std::vector<double> ToothShape::knots() const {
  std::vector<double> k = {0.0, s_cap_};
  if (ideal_ == IdealRoot::kCylinder || ideal_ == IdealRoot::kCone) k.push_back(u1_ - 1.0);
  std::sort(k.begin(), k.end());
  return k;
}

double ToothShape::meridian_curvature(double s) const {
  const double ds = 1e-4;
  s = std::clamp(s, -1.0 + 2 * ds, 1.0 - 2 * ds);
  auto m = [this](double t) {
    const Section<double> q = section(t);
    return Eigen::Vector2d(0.5 * (q.a + q.b), q.z);
  };
  const Eigen::Vector2d d1 = (m(s + ds) - m(s - ds)) / (2 * ds);
  const Eigen::Vector2d d2 = (m(s + ds) - 2 * m(s) + m(s - ds)) / (ds * ds);
  const double speed = d1.norm();
  return std::abs(d1.x() * d2.y() - d1.y() * d2.x()) / (speed * speed * speed);
}

double ToothShape::root_polar_angle(double theta) const {
  const Section<double> q = section(-0.5);
  return std::atan2(q.b * std::sin(theta), q.cx + q.a * std::cos(theta));
}

}  // namespace sharpey::mesh::detail
