// Convex hull of points in the plane, each tagged with its root, and the depth of a point inside
// it: the inter-radicular test of the multi-rooted tooth (multi_root_tooth.cpp) and the lesion's
// columns in its mesh (multi_root_mesh.cpp).
#pragma once

#include <Eigen/Core>
#include <vector>

namespace sharpey::mesh::detail {

struct HullPoint {
  Eigen::Vector2d p;
  int root;
};
// Andrew's monotone chain: counter-clockwise, no collinear points (fewer than 3 points: as given).
std::vector<HullPoint> convex_hull(std::vector<HullPoint> pts);
// Signed distance of p inside a counter-clockwise convex polygon (positive inside; -1 for fewer
// than 3 vertices).
double inside_depth(const std::vector<HullPoint>& hull, const Eigen::Vector2d& p);

}  // namespace sharpey::mesh::detail
