#include "model_frame.h"

#include <algorithm>
#include <cmath>
#include <limits>

#include "sharpey/core/constants.h"

namespace sharpey::mesh::detail {
namespace {

using sharpey::core::kPi;
constexpr int kOutlineSamples = 720;

double surface_angle(ToothSurface s) {
  switch (s) {
    case ToothSurface::kLabial:
      return 0.0;
    case ToothSurface::kMesial:
      return kPi / 2;
    case ToothSurface::kLingual:
      return kPi;
    case ToothSurface::kDistal:
      return -kPi / 2;
  }
  return 0.0;
}

}  // namespace

double wrap_angle(double a) {
  a = std::remainder(a, 2 * kPi);
  return a <= -kPi ? a + 2 * kPi : a;
}

ModelFrame::ModelFrame(const ModelSpec& spec)
    : spec_(spec),
      shape_(spec.tooth, spec.bone.crest_below_cej_mm),
      sizes_(resolve_sizing(spec.sizing)) {
  crest_z_ = crest_height(spec);
  apex_z_ = apex_height(spec);
  defect_depth_ = spec.loss.defect_depth_mm;
  defect_radial_ = std::max(1.0, defect_depth_);

  // Socket crest ring (with the defect) for the trough's distance function.
  outline_.reserve(kOutlineSamples);
  for (int j = 0; j < kOutlineSamples; ++j) {
    const double theta = 2 * kPi * j / kOutlineSamples;
    const Eigen::Vector3d p = socket_point(theta, crest_s(theta));
    outline_.emplace_back(p.x(), p.y());
  }
  // Block extents from the socket's section at the crest (without the defect).
  const double s_crest = shape_.s_of_z(crest_z_);
  double x_max = -1e300, x_min = 1e300, y_max = -1e300, y_min = 1e300;
  for (int j = 0; j < kOutlineSamples; ++j) {
    const Eigen::Vector3d p = socket_point(2 * kPi * j / kOutlineSamples, s_crest);
    x_max = std::max(x_max, p.x());
    x_min = std::min(x_min, p.x());
    y_max = std::max(y_max, p.y());
    y_min = std::min(y_min, p.y());
  }
  x_labial_ = x_max + spec.bone.labial_plate_mm;
  x_lingual_ = x_min - spec.bone.lingual_plate_mm;
  y_mesial_ = y_max + spec.bone.interproximal_margin_mm;
  y_distal_ = y_min - spec.bone.interproximal_margin_mm;
  z_base_ = apex_z_ - spec.pdl.apex_width_mm - spec.bone.depth_below_apex_mm;

  bracket_z_ = spec.bracket.height_mm < 0 ? 0.5 * shape_.crown_length() : spec.bracket.height_mm;
}

double pdl_width_profile(const PdlSpec& p, double crest_z, double apex_z, double z) {
  const double t = std::clamp((crest_z - z) / (crest_z - apex_z), 0.0, 1.0);
  if (t <= 0.5) return p.crest_width_mm + (p.mid_width_mm - p.crest_width_mm) * 2 * t;
  return p.mid_width_mm + (p.apex_width_mm - p.mid_width_mm) * (2 * t - 1);
}

double defect_weight(const BoneLoss& loss, double polar) {
  if (loss.defect_depth_mm <= 0) return 0.0;
  const double width = loss.defect_width_deg * kPi / 180.0;
  const double delta = wrap_angle(polar - surface_angle(loss.defect_surface));
  if (std::abs(delta) >= 0.5 * width) return 0.0;
  const double c = std::cos(kPi * delta / width);
  return c * c;
}

double crest_height(const ModelSpec& spec) {
  return -(spec.bone.crest_below_cej_mm + spec.loss.horizontal_mm);
}

double apex_height(const ModelSpec& spec) {
  if (spec.tooth.scan) return spec.tooth.scan->apex_z_mm;
  return spec.tooth.ideal_root == IdealRoot::kNone ? -spec.tooth.dimensions.root_length_mm
                                                   : -spec.tooth.ideal_length_mm;
}

double ModelFrame::pdl_width(double z) const {
  return pdl_width_profile(spec_.pdl, crest_z_, apex_z_, z);
}

Eigen::Vector3d ModelFrame::pdl_point(double theta, double s, double f) const {
  const Eigen::Vector3d x = shape_.point(theta, s);
  if (f == 0.0) return x;
  return x + f * pdl_width(x.z()) * shape_.normal(theta, s);
}

double ModelFrame::defect_weight(double polar) const {
  return detail::defect_weight(spec_.loss, polar);
}

double ModelFrame::attachment_z(double polar) const {
  return crest_z_ - defect_depth_ * defect_weight(polar);
}

double ModelFrame::crest_s(double theta) const {
  return shape_.s_of_z(attachment_z(shape_.root_polar_angle(theta)));
}

double ModelFrame::cortical_s(double theta) const {
  return shape_.s_of_z(attachment_z(shape_.root_polar_angle(theta)) - cortical_thickness());
}

double ModelFrame::outline_distance(double x, double y) const {
  const Eigen::Vector2d p(x, y);
  double best = std::numeric_limits<double>::infinity();
  bool inside = false;
  const size_t n = outline_.size();
  for (size_t i = 0, j = n - 1; i < n; j = i++) {
    const Eigen::Vector2d& a = outline_[j];
    const Eigen::Vector2d& b = outline_[i];
    const Eigen::Vector2d ab = b - a;
    const double t = std::clamp((p - a).dot(ab) / ab.squaredNorm(), 0.0, 1.0);
    best = std::min(best, (a + t * ab - p).squaredNorm());
    if ((a.y() > y) != (b.y() > y) && x < a.x() + (y - a.y()) / (b.y() - a.y()) * (b.x() - a.x())) {
      inside = !inside;
    }
  }
  const double d = std::sqrt(best);
  return inside ? -d : d;
}

double ModelFrame::bone_top(double x, double y) const {
  const double w = defect_weight(std::atan2(y, x));
  if (w == 0.0) return crest_z_;
  const double d = outline_distance(x, y);
  double psi = 1.0;
  if (d >= defect_radial_) {
    psi = 0.0;
  } else if (d > 0) {
    const double t = d / defect_radial_;
    psi = 1.0 - t * t * (3.0 - 2.0 * t);
  }
  return crest_z_ - defect_depth_ * w * psi;
}

}  // namespace sharpey::mesh::detail
