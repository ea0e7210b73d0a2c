// Convex hull and inside depth (multi_root_hull.h).
#include "multi_root_hull.h"

#include <algorithm>

namespace sharpey::mesh::detail {

std::vector<HullPoint> convex_hull(std::vector<HullPoint> pts) {
  std::sort(pts.begin(), pts.end(), [](const HullPoint& a, const HullPoint& b) {
    return a.p.x() < b.p.x() || (a.p.x() == b.p.x() && a.p.y() < b.p.y());
  });
  if (pts.size() < 3) return pts;
  auto cross = [](const Eigen::Vector2d& o, const Eigen::Vector2d& a, const Eigen::Vector2d& b) {
    return (a.x() - o.x()) * (b.y() - o.y()) - (a.y() - o.y()) * (b.x() - o.x());
  };
  std::vector<HullPoint> h(2 * pts.size());
  size_t k = 0;
  for (size_t i = 0; i < pts.size(); ++i) {
    while (k >= 2 && cross(h[k - 2].p, h[k - 1].p, pts[i].p) <= 0) --k;
    h[k++] = pts[i];
  }
  for (size_t i = pts.size() - 1, lo = k + 1; i > 0; --i) {
    while (k >= lo && cross(h[k - 2].p, h[k - 1].p, pts[i - 1].p) <= 0) --k;
    h[k++] = pts[i - 1];
  }
  h.resize(k - 1);
  return h;
}

// Signed distance of p inside a counter-clockwise convex polygon (positive inside).
double inside_depth(const std::vector<HullPoint>& hull, const Eigen::Vector2d& p) {
  if (hull.size() < 3) return -1.0;
  double d = 1e300;
  for (size_t i = 0; i < hull.size(); ++i) {
    const Eigen::Vector2d a = hull[i].p, b = hull[(i + 1) % hull.size()].p;
    const Eigen::Vector2d e = (b - a).normalized();
    d = std::min(d, e.x() * (p.y() - a.y()) - e.y() * (p.x() - a.x()));
  }
  return d;
}

}  // namespace sharpey::mesh::detail
