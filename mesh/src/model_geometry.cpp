// Areas, volumes and reference points of a model from its parametric definition, by numerical
// integration; independent of the mesh, so tests can compare the two.
#include <Eigen/Geometry>
#include <cmath>
#include <functional>

#include "detail/model_frame.h"
#include "sharpey/core/constants.h"

namespace sharpey::mesh::detail {
namespace {

using sharpey::core::kPi;
constexpr double kFdStep = 1e-6;  // central differences on the (theta, s) parameters

// Integrates f(s) over [s0, s1] with `panels` Gauss-Legendre panels of `order` points.
struct LineRule {
  std::vector<double> x, w;
  LineRule(int panels, int order) {
    std::vector<double> gx, gw;
    gauss_legendre01(order, &gx, &gw);
    for (int p = 0; p < panels; ++p) {
      for (int k = 0; k < order; ++k) {
        x.push_back((p + gx[k]) / panels);
        w.push_back(gw[k] / panels);
      }
    }
  }
};

// Tangents of a parametric map by central differences.
template <class Map>
void fd_tangents(const Map& map, double theta, double s, Eigen::Vector3d* p_theta,
                 Eigen::Vector3d* p_s) {
  *p_theta = (map(theta + kFdStep, s) - map(theta - kFdStep, s)) / (2 * kFdStep);
  *p_s = (map(theta, s + kFdStep) - map(theta, s - kFdStep)) / (2 * kFdStep);
}

// Integral over theta in [0, 2 pi) and s in [s_lo(theta), s_hi(theta)] of f(theta, s) ds dtheta;
// the s-interval is split at `knots` (where the integrand has kinks).
double integrate_band(int n_theta, const LineRule& rule, const std::vector<double>& knots,
                      const std::function<double(double)>& s_lo,
                      const std::function<double(double)>& s_hi,
                      const std::function<double(double, double)>& f) {
  double total = 0;
  std::vector<double> cuts;
  for (int i = 0; i < n_theta; ++i) {
    const double theta = 2 * kPi * (i + 0.5) / n_theta;
    const double a = s_lo(theta), b = s_hi(theta);
    cuts.assign(1, a);
    for (double k : knots)
      if (k > a && k < b) cuts.push_back(k);
    cuts.push_back(b);
    for (size_t c = 0; c + 1 < cuts.size(); ++c) {
      const double lo = cuts[c], hi = cuts[c + 1];
      double inner = 0;
      for (size_t k = 0; k < rule.x.size(); ++k)
        inner += rule.w[k] * f(theta, lo + (hi - lo) * rule.x[k]);
      total += inner * (hi - lo);
    }
  }
  return total * 2 * kPi / n_theta;
}

// Integral of g(x, y) over the rectangle [x0, x1] x [y0, y1] (2 x 2 Gauss on a fine grid).
double integrate_rectangle(double x0, double x1, double y0, double y1, double cell,
                           const std::function<double(double, double)>& g) {
  const int nx = std::max(1, static_cast<int>(std::ceil((x1 - x0) / cell)));
  const int ny = std::max(1, static_cast<int>(std::ceil((y1 - y0) / cell)));
  const double hx = (x1 - x0) / nx, hy = (y1 - y0) / ny;
  const double g1 = 0.5 - 0.5 / std::sqrt(3.0), g2 = 0.5 + 0.5 / std::sqrt(3.0);
  double total = 0;
  for (int i = 0; i < nx; ++i) {
    for (int j = 0; j < ny; ++j) {
      for (double u : {g1, g2})
        for (double v : {g1, g2}) total += g(x0 + (i + u) * hx, y0 + (j + v) * hy);
    }
  }
  return total * 0.25 * hx * hy;
}

}  // namespace

void gauss_legendre01(int n, std::vector<double>* nodes, std::vector<double>* weights) {
  nodes->assign(n, 0);
  weights->assign(n, 0);
  for (int i = 0; i < n; ++i) {
    double x = std::cos(kPi * (i + 0.75) / (n + 0.5));
    double dp = 1;
    for (int it = 0; it < 100; ++it) {
      double p0 = 1, p1 = x;
      for (int k = 2; k <= n; ++k) {
        const double p2 = ((2 * k - 1) * x * p1 - (k - 1) * p0) / k;
        p0 = p1;
        p1 = p2;
      }
      dp = n * (x * p1 - p0) / (x * x - 1);
      const double dx = p1 / dp;
      x -= dx;
      if (std::abs(dx) < 1e-15) break;
    }
    (*nodes)[i] = 0.5 * (1 - x);
    (*weights)[i] = 1.0 / ((1 - x * x) * dp * dp);
  }
}

namespace {

// The quadrature shared by every surface integral of one model: n_theta columns around the long
// axis, Gauss-Legendre panels along the meridian split at the shape's knots.
struct BandQuadrature {
  int n_theta;
  LineRule rule;
  std::vector<double> knots;
  explicit BandQuadrature(const ModelFrame& frame)
      : n_theta(frame.spec().loss.defect_depth_mm > 0 ? 240 : 96),
        rule(24, 5),
        knots(frame.shape().knots()) {}
  double band(const std::function<double(double)>& s_lo, const std::function<double(double)>& s_hi,
              const std::function<double(double, double)>& f) const {
    return integrate_band(n_theta, rule, knots, s_lo, s_hi, f);
  }
};

double apex_s(double) { return -1.0; }
double cej_s(double) { return 0.0; }

// Heights, lengths, crown tip, apex and bracket of the parametric definition.
void set_reference_points(const ModelFrame& frame, ModelGeometry* g) {
  const ToothShape& shape = frame.shape();
  g->cej_z_mm = 0;
  g->crest_z_mm = frame.crest_z();
  g->defect_bottom_z_mm = frame.crest_z() - frame.spec().loss.defect_depth_mm;
  g->apex_z_mm = frame.apex_z();
  g->root_length_mm = shape.root_length();
  g->embedded_length_mm = frame.crest_z() - frame.apex_z();
  g->crown_tip = shape.point(0, 1.0);
  g->apex = shape.point(0, -1.0);
  const double s_bracket = shape.s_of_z(frame.bracket_z());
  g->bracket_center = shape.point(0, s_bracket);
  g->bracket_normal = shape.normal(0, s_bracket);
}

// Whole root, attached and exposed root areas.
void set_root_areas(const ModelFrame& frame, const BandQuadrature& q, ModelGeometry* g) {
  const ToothShape& shape = frame.shape();
  auto area_density = [&](double theta, double s) {
    Eigen::Vector3d x, xt, xs;
    shape.frame(theta, s, &x, &xt, &xs);
    return xt.cross(xs).norm();
  };
  auto crest = [&](double theta) { return frame.crest_s(theta); };
  g->root_area_mm2 = q.band(apex_s, cej_s, area_density);
  g->attachment_area_mm2 = q.band(apex_s, crest, area_density);
  g->exposed_root_area_mm2 = q.band(crest, cej_s, area_density);
}

// Tooth: V = 1/3 closed-surface integral of x . n dA.
double tooth_volume(const ModelFrame& frame, const BandQuadrature& q) {
  const ToothShape& shape = frame.shape();
  auto flux = [&](double theta, double s) {
    Eigen::Vector3d x, xt, xs;
    shape.frame(theta, s, &x, &xt, &xs);
    return x.dot(xt.cross(xs)) / 3.0;
  };
  const double s_cap = shape.s_of_z(shape.crown_body_top());
  return q.band(apex_s, cej_s, flux) +
         q.band(
             cej_s, [&](double) { return s_cap; }, flux) +
         q.band([&](double) { return s_cap; }, [](double) { return 1.0; }, flux);
}

// PDL: the map (theta, s, t) -> root point + t w n, t in [0, 1]; its Jacobian is quadratic in t.
double pdl_volume(const ModelFrame& frame, const BandQuadrature& q) {
  const ToothShape& shape = frame.shape();
  std::vector<double> tx, tw;
  gauss_legendre01(2, &tx, &tw);
  auto pdl_density = [&](double theta, double s) {
    double v = 0;
    for (int k = 0; k < 2; ++k) {
      const double t = tx[k];
      auto map = [&](double th, double ss) { return frame.pdl_point(th, ss, t); };
      Eigen::Vector3d pt, ps;
      fd_tangents(map, theta, s, &pt, &ps);
      const Eigen::Vector3d x = shape.point(theta, s);
      const Eigen::Vector3d p_t = frame.pdl_width(x.z()) * shape.normal(theta, s);
      v += tw[k] * pt.cross(ps).dot(p_t);
    }
    return v;
  };
  auto crest = [&](double theta) { return frame.crest_s(theta); };
  return q.band(apex_s, crest, pdl_density);
}

// Area of the socket opening bounded by the ring `ring_s`, and its integral of the defect weight
// (inside it the top is crest - depth * weight(polar angle)): the star-shaped region bounded by
// the ring, integrated in the ring's parameter theta.
void socket_opening(const ModelFrame& frame, const std::function<double(double)>& ring_s,
                    double* open_area, double* open_weighted) {
  *open_area = 0;
  *open_weighted = 0;
  const int n_ring = 512;
  for (int i = 0; i < n_ring; ++i) {
    const double theta = 2 * kPi * (i + 0.5) / n_ring;
    auto ring = [&](double th) { return frame.socket_point(th, ring_s(th)); };
    const Eigen::Vector3d c = ring(theta);
    const Eigen::Vector3d dc = (ring(theta + kFdStep) - ring(theta - kFdStep)) / (2 * kFdStep);
    const double sector = 0.5 * (c.x() * dc.y() - c.y() * dc.x());
    *open_area += sector;
    *open_weighted += sector * frame.defect_weight(std::atan2(c.y(), c.x()));
  }
  *open_area *= 2 * kPi / n_ring;
  *open_weighted *= 2 * kPi / n_ring;
}

// Bone between x0 and x1 below its top lowered by `top_offset`, less the socket cavity up to the
// ring `ring_s`: divergence theorem with the field (0, 0, z) over the block minus the cavity.
// V = int_rect top - int_opening top - z_base * A_rect - int_socket z n_z dA, where the socket
// surface runs from the apex to the ring and the opening is that ring's projection.
double bone_block_volume(const ModelFrame& frame, const BandQuadrature& q, double x0, double x1,
                         double top_offset, const std::function<double(double)>& ring_s) {
  const bool defect = frame.spec().loss.defect_depth_mm > 0;
  auto socket_z_flux = [&](double theta, double s) {
    auto map = [&](double th, double ss) { return frame.socket_point(th, ss); };
    Eigen::Vector3d pt, ps;
    fd_tangents(map, theta, s, &pt, &ps);
    return frame.socket_point(theta, s).z() * pt.cross(ps).z();
  };
  const double y0 = frame.y_distal(), y1 = frame.y_mesial();
  const double rect_area = (x1 - x0) * (y1 - y0);
  const double top =
      defect ? integrate_rectangle(x0, x1, y0, y1, 0.1,
                                   [&](double x, double y) { return frame.bone_top(x, y); })
             : frame.crest_z() * rect_area;
  double open_area = 0, open_weighted = 0;
  socket_opening(frame, ring_s, &open_area, &open_weighted);
  const double open_top =
      frame.crest_z() * open_area - frame.spec().loss.defect_depth_mm * open_weighted;
  const double socket = q.band(apex_s, ring_s, socket_z_flux);
  return (top - top_offset * rect_area) - (open_top - top_offset * open_area) -
         frame.z_base() * (rect_area - open_area) - socket - frame.z_base() * open_area;
}

// Bone, cortical and cancellous volumes and the block's corners.
void set_bone(const ModelFrame& frame, const BandQuadrature& q, ModelGeometry* g) {
  g->bone_volume_mm3 = bone_block_volume(frame, q, frame.x_lingual(), frame.x_labial(), 0.0,
                                         [&](double theta) { return frame.crest_s(theta); });
  g->cancellous_volume_mm3 = bone_block_volume(
      frame, q, frame.x_lingual_inner(), frame.x_labial_inner(), frame.cortical_thickness(),
      [&](double theta) { return frame.cortical_s(theta); });
  g->cortical_volume_mm3 = g->bone_volume_mm3 - g->cancellous_volume_mm3;
  g->bone_min = {frame.x_lingual(), frame.y_distal(), frame.z_base()};
  g->bone_max = {frame.x_labial(), frame.y_mesial(), frame.crest_z()};
}

}  // namespace

ModelGeometry integrate_geometry(const ModelFrame& frame) {
  const BandQuadrature q(frame);
  ModelGeometry g;
  set_reference_points(frame, &g);
  set_root_areas(frame, q, &g);
  g.tooth_volume_mm3 = tooth_volume(frame, q);
  g.pdl_volume_mm3 = pdl_volume(frame, q);
  set_bone(frame, q, &g);
  return g;
}

}  // namespace sharpey::mesh::detail

namespace sharpey::mesh {

ModelGeometry model_geometry(const ModelSpec& spec) {
  validate(spec);
  return detail::integrate_geometry(detail::ModelFrame(spec));
}

}  // namespace sharpey::mesh
