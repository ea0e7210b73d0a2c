#include "core/hover_readout.h"

#include <Eigen/Geometry>
#include <algorithm>
#include <cmath>
#include <limits>

#include "core/units.h"
#include "sharpey/core/constants.h"

namespace sharpey::app {

namespace {

using sharpey::core::kPi;
constexpr double kNan = std::numeric_limits<double>::quiet_NaN();

// Angle wrapped into [0, 360).
double wrap_360(double angle_deg) {
  double a = std::fmod(angle_deg, 360.0);
  if (a < 0) a += 360.0;
  return a >= 360.0 ? 0.0 : a;
}

}  // namespace

double angle_around_axis_deg(const Eigen::Vector3d& p) {
  if (p.x() == 0 && p.y() == 0) return 0;
  return std::atan2(p.y(), p.x()) * 180.0 / kPi;
}

QString side_name(double angle_deg) {
  static const char* const kSides[8] = {"labial",  "mesiolabial",  "mesial", "mesiolingual",
                                        "lingual", "distolingual", "distal", "distolabial"};
  const int sector = static_cast<int>(std::floor(wrap_360(angle_deg + 22.5) / 45.0)) % 8;
  return QString::fromLatin1(kSides[sector]);
}

double value_on_triangle(const std::vector<Eigen::Vector3d>& points,
                         const std::vector<std::array<int, 3>>& triangles,
                         const std::vector<double>& values, int triangle,
                         const Eigen::Vector3d& p) {
  if (triangle < 0 || triangle >= static_cast<int>(triangles.size())) return kNan;
  const std::array<int, 3>& t = triangles[static_cast<size_t>(triangle)];
  for (int k : t)
    if (k < 0 || k >= static_cast<int>(points.size()) || k >= static_cast<int>(values.size()))
      return kNan;
  const Eigen::Vector3d& a = points[static_cast<size_t>(t[0])];
  const Eigen::Vector3d e1 = points[static_cast<size_t>(t[1])] - a;
  const Eigen::Vector3d e2 = points[static_cast<size_t>(t[2])] - a;
  const Eigen::Vector3d d = p - a;
  // Barycentric coordinates of the projection of p onto the triangle's plane.
  const double d11 = e1.dot(e1), d12 = e1.dot(e2), d22 = e2.dot(e2);
  const double det = d11 * d22 - d12 * d12;
  if (!(det > 1e-12 * d11 * d22) || !std::isfinite(det)) return kNan;
  const double r1 = d.dot(e1), r2 = d.dot(e2);
  double w1 = (d22 * r1 - d12 * r2) / det;
  double w2 = (d11 * r2 - d12 * r1) / det;
  double w0 = 1.0 - w1 - w2;
  // A pick can land a hair outside the triangle: clip the weights and renormalise.
  w0 = std::max(0.0, w0);
  w1 = std::max(0.0, w1);
  w2 = std::max(0.0, w2);
  const double sum = w0 + w1 + w2;
  const double v0 = values[static_cast<size_t>(t[0])], v1 = values[static_cast<size_t>(t[1])],
               v2 = values[static_cast<size_t>(t[2])];
  if (!(std::isfinite(v0) && std::isfinite(v1) && std::isfinite(v2))) return kNan;
  return (w0 * v0 + w1 * v1 + w2 * v2) / sum;
}

HoverReadout surface_readout(const std::vector<Eigen::Vector3d>& points,
                             const std::vector<std::array<int, 3>>& triangles,
                             const std::vector<double>& values, Quantity quantity, int triangle,
                             const Eigen::Vector3d& p) {
  HoverReadout r;
  r.quantity = quantity;
  if (triangle < 0 || triangle >= static_cast<int>(triangles.size())) return r;
  r.has_position = true;
  r.depth_mm = -p.z();
  r.angle_deg = angle_around_axis_deg(p);
  r.value = value_on_triangle(points, triangles, values, triangle, p);
  r.has_value = std::isfinite(r.value);
  return r;
}

double root_map_sample(const analysis::RootMap& m, double x, double y) {
  if (m.n_angle <= 0 || m.n_depth <= 0) return kNan;
  auto at = [&](int row, int col) {
    col = ((col % m.n_angle) + m.n_angle) % m.n_angle;
    row = std::clamp(row, 0, m.n_depth - 1);
    return m.pressure_kpa[static_cast<size_t>(row) * static_cast<size_t>(m.n_angle) +
                          static_cast<size_t>(col)];
  };
  const int c0 = static_cast<int>(std::floor(x)), r0 = static_cast<int>(std::floor(y));
  const double fx = x - c0, fy = y - r0;
  const double v00 = at(r0, c0), v01 = at(r0, c0 + 1), v10 = at(r0 + 1, c0),
               v11 = at(r0 + 1, c0 + 1);
  if (std::isfinite(v00) && std::isfinite(v01) && std::isfinite(v10) && std::isfinite(v11))
    return (1 - fy) * ((1 - fx) * v00 + fx * v01) + fy * ((1 - fx) * v10 + fx * v11);
  return at(static_cast<int>(std::lround(y)), static_cast<int>(std::lround(x)));
}

HoverReadout root_map_readout(const analysis::RootMap& map, double angle_deg, double depth_mm) {
  HoverReadout r;
  r.quantity = Quantity::kPressure;
  const double span = map.depth_max_mm - map.depth_min_mm;
  if (map.n_angle <= 0 || map.n_depth <= 0 || !(span > 0) || !std::isfinite(angle_deg) ||
      !(depth_mm >= map.depth_min_mm && depth_mm <= map.depth_max_mm) ||
      map.pressure_kpa.size() !=
          static_cast<size_t>(map.n_angle) * static_cast<size_t>(map.n_depth))
    return r;
  r.has_position = true;
  const double a = wrap_360(angle_deg);
  r.angle_deg = a > 180.0 ? a - 360.0 : a;
  r.depth_mm = depth_mm;
  const double x = a / 360.0 * map.n_angle - 0.5;
  const double y = (depth_mm - map.depth_min_mm) / span * map.n_depth - 0.5;
  r.value = root_map_sample(map, x, y);
  r.has_value = std::isfinite(r.value);
  return r;
}

QString describe(const HoverReadout& r) {
  if (!r.has_position) return {};
  const QString where =
      QStringLiteral("%1 below the CEJ, %2 (%3\u00b0)")
          .arg(with_unit(r.depth_mm, QStringLiteral("mm"), 1), side_name(r.angle_deg))
          .arg(std::lround(r.angle_deg));
  if (!r.has_value) return QStringLiteral("no ligament | ") + where;
  return label(r.quantity) + ' ' +
         with_unit(r.value, unit_label(r.quantity), readable_decimals(r.value)) +
         QStringLiteral(" | ") + where;
}

}  // namespace sharpey::app
