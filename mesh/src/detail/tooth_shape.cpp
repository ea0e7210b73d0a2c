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

// Catmull-Rom interpolation of samples p(0..n-1) at fractional index t, with breaks at 0, `mid`
// and n - 1 beyond which the neighbour is extrapolated linearly (one-sided): value and d/dt.
template <class F>
void catmull_rom(const F& p, int n, int mid, double t, double* v, double* dv) {
  const int i = std::clamp(static_cast<int>(std::floor(t)), 0, n - 2);
  const double f = t - i;
  const int lo = i < mid ? 0 : mid, hi = i < mid ? mid : n - 1;
  const double p1 = p(i), p2 = p(i + 1);
  const double p0 = i - 1 >= lo ? p(i - 1) : 2 * p1 - p2;
  const double p3 = i + 2 <= hi ? p(i + 2) : 2 * p2 - p1;
  const double c1 = -p0 + p2, c2 = 2 * p0 - 5 * p1 + 4 * p2 - p3, c3 = -p0 + 3 * p1 - 3 * p2 + p3;
  *v = 0.5 * (2 * p1 + f * (c1 + f * (c2 + f * c3)));
  if (dv) *dv = 0.5 * (c1 + f * (2 * c2 + 3 * f * c3));
}

double lift(double, double v, double) { return v; }
Dual2 lift(const Dual2& s, double v, double dv_ds) { return chain(s, v, dv_ds); }

}  // namespace

ToothShape::ToothShape(const ToothSpec& tooth, double healthy_crest_depth_mm)
    : ideal_(tooth.ideal_root) {
  if (tooth.scan) {
    init_scan(tooth.scan);
  } else {
    init_crown(tooth, init_root(tooth, healthy_crest_depth_mm));
  }
  init_arc_table();
}

void ToothShape::init_scan(const std::shared_ptr<const RadialToothSurface>& scan) {
  scan_owner_ = scan;
  scan_ = scan_owner_.get();
  root_length_ = -scan_->apex_z_mm;
  crown_length_ = scan_->tip_z_mm;
  // The bracket pad must stay below the incisal or occlusal rounding: the top fifth of the
  // crown is treated as that rounding.
  crown_body_top_ = 0.8 * crown_length_;
  crown_cap_ = crown_length_ - crown_body_top_;
  s_cap_ = 1.0 - std::sqrt(0.2);
  scan_mean_.resize(scan_->n_z);
  for (int i = 0; i < scan_->n_z; ++i) {
    double sum = 0;
    for (int j = 0; j < scan_->n_theta; ++j) sum += scan_->radius(i, j);
    scan_mean_[i] = sum / scan_->n_theta;
  }
}

double ToothShape::init_root(const ToothSpec& tooth, double healthy_crest_depth_mm) {
  const ToothDimensions& d = tooth.dimensions;
  crown_length_ = d.crown_length_mm;
  if (ideal_ == IdealRoot::kNone) {
    root_length_ = d.root_length_mm;
    root_a_ = 0.5 * d.cervix_labiolingual_mm;
    root_b_ = 0.5 * d.cervix_mesiodistal_mm;
    fullness_ = d.root_taper_fullness;
    return 0;
  }
  root_length_ = tooth.ideal_length_mm;
  radius_ = tooth.ideal_radius_mm;
  const double L = root_length_, R = radius_;
  const double crest_height = L - healthy_crest_depth_mm;  // crest above the apex
  switch (ideal_) {
    case IdealRoot::kCylinder:
      cap_ = R / 3.0;
      u1_ = cap_ * kPi / 2 / (cap_ * kPi / 2 + L - cap_);
      return R;
    case IdealRoot::kCone:
      return init_cone_root(crest_height);
    case IdealRoot::kParaboloid:
      k_ = R / std::sqrt(crest_height);
      return k_ * std::sqrt(L);
    case IdealRoot::kNone:
      break;
  }
  return 0;
}

double ToothShape::init_cone_root(double crest_height) {
  const double L = root_length_, R = radius_;
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
  return k_ * (L + delta_);
}

void ToothShape::init_crown(const ToothSpec& tooth, double crown_radius) {
  if (ideal_ == IdealRoot::kNone) {
    const ToothDimensions& d = tooth.dimensions;
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
}

void ToothShape::init_arc_table() {
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
T ToothShape::scan_z(const T& s) const {
  if (value(s) < 0) return scan_->apex_z_mm * (1.0 - (s + 1.0) * (s + 1.0));
  return scan_->tip_z_mm * (1.0 - (1.0 - s) * (1.0 - s));
}

template <class T>
Section<T> ToothShape::scan_section(const T& s) const {
  const int n = scan_->n_z;
  const double dt_ds = 0.5 * (n - 1);
  double v = 0, dv = 0;
  catmull_rom([&](int i) { return scan_mean_[i]; }, n, (n - 1) / 2, (value(s) + 1.0) * dt_ds, &v,
              &dv);
  const T r = lift(s, v, dv * dt_ds);
  return {T(0.0), r, r, scan_z(s)};
}

void ToothShape::scan_radius(double theta, double s, double* r, double* r_theta,
                             double* r_s) const {
  const int n = scan_->n_z, m = scan_->n_theta;
  const double dt_ds = 0.5 * (n - 1), du_dtheta = m / (2 * kPi);
  double u = std::fmod(theta, 2 * kPi) * du_dtheta;
  if (u < 0) u += m;
  const int j = std::min(static_cast<int>(u), m - 1);
  const double f = u - j;
  auto row = [&](int i, double* dv) {
    const double p0 = scan_->radius(i, (j + m - 1) % m), p1 = scan_->radius(i, j);
    const double p2 = scan_->radius(i, (j + 1) % m), p3 = scan_->radius(i, (j + 2) % m);
    const double c1 = -p0 + p2, c2 = 2 * p0 - 5 * p1 + 4 * p2 - p3, c3 = -p0 + 3 * p1 - 3 * p2 + p3;
    if (dv) *dv = 0.5 * (c1 + f * (2 * c2 + 3 * f * c3));
    return 0.5 * (2 * p1 + f * (c1 + f * (c2 + f * c3)));
  };
  const double t = (std::clamp(s, -1.0, 1.0) + 1.0) * dt_ds;
  double dr_dt = 0, rt = 0;
  catmull_rom([&](int i) { return row(i, nullptr); }, n, (n - 1) / 2, t, r, &dr_dt);
  catmull_rom(
      [&](int i) {
        double d = 0;
        row(i, &d);
        return d;
      },
      n, (n - 1) / 2, t, &rt, nullptr);
  if (r_s) *r_s = dr_dt * dt_ds;
  if (r_theta) *r_theta = rt * du_dtheta;
}

template <class T>
Section<T> ToothShape::eval(const T& s) const {
  if (scan_) return scan_section(s);
  if (value(s) < 0) return root_section(s + 1.0);
  return crown_section(s);
}

Section<double> ToothShape::section(double s) const { return eval(std::clamp(s, -1.0, 1.0)); }
Section<Dual2> ToothShape::section(const Dual2& s) const { return eval(s); }

Eigen::Vector3d ToothShape::point(double theta, double s) const {
  if (scan_) {
    s = std::clamp(s, -1.0, 1.0);
    double r = 0;
    scan_radius(theta, s, &r, nullptr, nullptr);
    return {r * std::cos(theta), r * std::sin(theta), scan_z(s)};
  }
  const Section<double> q = section(s);
  return {q.cx + q.a * std::cos(theta), q.b * std::sin(theta), q.z};
}

void ToothShape::frame(double theta, double s, Eigen::Vector3d* x, Eigen::Vector3d* x_theta,
                       Eigen::Vector3d* x_s) const {
  if (scan_) {
    s = std::clamp(s, -1.0, 1.0);
    double r = 0, r_t = 0, r_s = 0;
    scan_radius(theta, s, &r, &r_t, &r_s);
    const double c = std::cos(theta), sn = std::sin(theta);
    const Dual2 z = scan_z(Dual2(s, 1, 0));
    if (x) *x = {r * c, r * sn, z.v};
    if (x_theta) *x_theta = {r_t * c - r * sn, r_t * sn + r * c, 0};
    if (x_s) *x_s = {r_s * c, r_s * sn, z.d[0]};
    return;
  }
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
  if (scan_) return std::atan2(std::sin(theta), std::cos(theta));
  const Section<double> q = section(-0.5);
  return std::atan2(q.b * std::sin(theta), q.cx + q.a * std::cos(theta));
}

}  // namespace sharpey::mesh::detail
