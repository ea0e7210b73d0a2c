// Nearest-point queries on a set of flat triangles: a bounding-volume hierarchy (axis-aligned
// boxes plus a slab along the mean normal). Used by the PDL-width measurement and the distance to
// the ligament's free edge. Internal to the mesh library.
#pragma once

#include <Eigen/Dense>
#include <algorithm>
#include <array>
#include <limits>
#include <vector>

namespace sharpey::mesh::detail {

using Eigen::Vector2d;
using Eigen::Vector3d;

// A flat triangle to search, with the parent face it belongs to and the parent reference
// coordinates of its corners (for the Newton refinement on curved faces).
struct SearchTriangle {
  std::array<Vector3d, 3> x;
  int face = -1;
  std::array<Vector2d, 3> ref;
};

// Closest point to p on triangle (a, b, c); returns barycentric weights of b and c in (s, t).
inline Vector3d closest_point_on_triangle(const Vector3d& p, const Vector3d& a, const Vector3d& b,
                                          const Vector3d& c, double* s, double* t) {
  // Walk the Voronoi regions of the vertices, then the edges, then the interior.
  const Vector3d ab = b - a, ac = c - a, ap = p - a;
  const double d1 = ab.dot(ap), d2 = ac.dot(ap);
  if (d1 <= 0 && d2 <= 0) {
    *s = 0, *t = 0;
    return a;
  }
  const Vector3d bp = p - b;
  const double d3 = ab.dot(bp), d4 = ac.dot(bp);
  if (d3 >= 0 && d4 <= d3) {
    *s = 1, *t = 0;
    return b;
  }
  const Vector3d cp = p - c;
  const double d5 = ab.dot(cp), d6 = ac.dot(cp);
  if (d6 >= 0 && d5 <= d6) {
    *s = 0, *t = 1;
    return c;
  }
  const double vc = d1 * d4 - d3 * d2;
  if (vc <= 0 && d1 >= 0 && d3 <= 0) {
    *s = d1 / (d1 - d3), *t = 0;
    return a + *s * ab;
  }
  const double vb = d5 * d2 - d1 * d6;
  if (vb <= 0 && d2 >= 0 && d6 <= 0) {
    *s = 0, *t = d2 / (d2 - d6);
    return a + *t * ac;
  }
  const double va = d3 * d6 - d5 * d4;
  if (va <= 0 && (d4 - d3) >= 0 && (d5 - d6) >= 0) {
    const double w = (d4 - d3) / ((d4 - d3) + (d5 - d6));
    *s = 1 - w, *t = w;
    return b + w * (c - b);
  }
  const double denom = 1.0 / (va + vb + vc);
  *s = vb * denom, *t = vc * denom;
  return a + *s * ab + *t * ac;
}

// Bounding-volume hierarchy over triangles (axis-aligned boxes plus a slab along the mean normal,
// median split on the longest axis)
// with a depth-first nearest-point query that visits the nearer child first and prunes boxes
// farther than the best distance found so far.
class TriangleTree {
 public:
  explicit TriangleTree(const std::vector<SearchTriangle>& tris) : tris_(tris) {
    order_.resize(tris_.size());
    centroid_.resize(tris_.size());
    for (size_t i = 0; i < tris_.size(); ++i) {
      order_[i] = static_cast<int>(i);
      centroid_[i] = (tris_[i].x[0] + tris_[i].x[1] + tris_[i].x[2]) / 3.0;
    }
    nodes_.reserve(2 * tris_.size() + 1);
    build(0, static_cast<int>(tris_.size()));
    // Copy the corners in leaf order so a query reads neighbouring triangles from adjacent memory.
    leaf_x_.reserve(tris_.size());
    for (int i : order_) leaf_x_.push_back(tris_[static_cast<size_t>(i)].x);
  }

  // Index of the nearest triangle, its closest point and barycentric (s, t) there.
  int nearest(const Vector3d& p, Vector3d* closest, double* s, double* t) const {
    Query q{p, std::numeric_limits<double>::max(), -1, Vector3d::Zero(), 0, 0};
    visit(0, q);
    *closest = q.point;
    *s = q.s;
    *t = q.t;
    return q.tri;
  }

 private:
  static constexpr int kLeafSize = 4;
  struct Node {
    Eigen::AlignedBox3d box;
    // Slab {x : slab_lo <= axis . x <= slab_hi} holding the node's triangles, axis close to their
    // common normal: on smooth surfaces it bounds the distance far better than the box does.
    Vector3d axis = Vector3d::UnitX();
    double slab_lo = 0, slab_hi = 0;
    int first = 0, count = 0;   // leaf: triangles order_[first, first + count)
    int left = -1, right = -1;  // inner node: children
  };
  struct Query {
    Vector3d p;
    double best;  // squared distance
    int tri;
    Vector3d point;
    double s, t;
  };

  void fit_slab(Node& node, int first, int last) const {
    Vector3d normal_sum = Vector3d::Zero();
    for (int i = first; i < last; ++i) {
      const auto& x = tris_[static_cast<size_t>(order_[static_cast<size_t>(i)])].x;
      const Vector3d n = (x[1] - x[0]).cross(x[2] - x[0]);
      normal_sum += normal_sum.dot(n) < 0 ? -n : n;  // orientation-independent sum of area normals
    }
    node.axis = normal_sum.norm() > 0 ? normal_sum.normalized() : Vector3d::UnitX();
    node.slab_lo = std::numeric_limits<double>::max();
    node.slab_hi = -std::numeric_limits<double>::max();
    for (int i = first; i < last; ++i) {
      for (const auto& x : tris_[static_cast<size_t>(order_[static_cast<size_t>(i)])].x) {
        node.slab_lo = std::min(node.slab_lo, node.axis.dot(x));
        node.slab_hi = std::max(node.slab_hi, node.axis.dot(x));
      }
    }
  }

  int build(int first, int last) {
    const int id = static_cast<int>(nodes_.size());
    nodes_.emplace_back();
    Eigen::AlignedBox3d box, centres;
    for (int i = first; i < last; ++i) {
      const SearchTriangle& tri = tris_[static_cast<size_t>(order_[static_cast<size_t>(i)])];
      for (const auto& x : tri.x) box.extend(x);
      centres.extend(centroid_[static_cast<size_t>(order_[static_cast<size_t>(i)])]);
    }
    nodes_[static_cast<size_t>(id)].box = box;
    fit_slab(nodes_[static_cast<size_t>(id)], first, last);
    if (last - first <= kLeafSize) {
      nodes_[static_cast<size_t>(id)].first = first;
      nodes_[static_cast<size_t>(id)].count = last - first;
      return id;
    }
    int axis = 0;
    centres.sizes().maxCoeff(&axis);
    const int mid = (first + last) / 2;
    std::nth_element(order_.begin() + first, order_.begin() + mid, order_.begin() + last,
                     [this, axis](int a, int b) {
                       return centroid_[static_cast<size_t>(a)][axis] <
                              centroid_[static_cast<size_t>(b)][axis];
                     });
    const int left = build(first, mid);
    const int right = build(mid, last);
    nodes_[static_cast<size_t>(id)].left = left;
    nodes_[static_cast<size_t>(id)].right = right;
    return id;
  }

  // Squared lower bound of the distance from p to the node's triangles.
  static double lower_bound(const Node& n, const Vector3d& p) {
    const double a = n.axis.dot(p);
    const double slab = std::max({0.0, a - n.slab_hi, n.slab_lo - a});
    return std::max(n.box.squaredExteriorDistance(p), slab * slab);
  }

  void visit(int id, Query& q) const {
    const Node& n = nodes_[static_cast<size_t>(id)];
    if (n.left < 0) {
      for (int i = n.first; i < n.first + n.count; ++i) {
        const auto& x3 = leaf_x_[static_cast<size_t>(i)];
        double ss, tt;
        const Vector3d x = closest_point_on_triangle(q.p, x3[0], x3[1], x3[2], &ss, &tt);
        const double d = (x - q.p).squaredNorm();
        if (d < q.best) q = Query{q.p, d, order_[static_cast<size_t>(i)], x, ss, tt};
      }
      return;
    }
    const double dl = lower_bound(nodes_[static_cast<size_t>(n.left)], q.p);
    const double dr = lower_bound(nodes_[static_cast<size_t>(n.right)], q.p);
    const bool left_first = dl <= dr;
    const int near = left_first ? n.left : n.right, far = left_first ? n.right : n.left;
    if (std::min(dl, dr) < q.best) visit(near, q);
    if (std::max(dl, dr) < q.best) visit(far, q);
  }

  const std::vector<SearchTriangle>& tris_;
  std::vector<int> order_;
  std::vector<std::array<Vector3d, 3>> leaf_x_;
  std::vector<Vector3d> centroid_;
  std::vector<Node> nodes_;
};

}  // namespace sharpey::mesh::detail
