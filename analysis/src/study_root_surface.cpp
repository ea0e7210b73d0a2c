#include <Eigen/Geometry>
#include <algorithm>
#include <cmath>
#include <sstream>
#include <unordered_map>

#include "sharpey/analysis/detail/root_surface.h"
#include "sharpey/core/reference_triangle.h"
#include "sharpey/error.h"

namespace sharpey::analysis::detail {
double triangle_fraction_above(double a, double b, double c, double level) {
  double p[3] = {a, b, c};
  std::sort(p, p + 3);
  if (level < p[0]) return 1.0;
  if (level >= p[2]) return 0.0;
  if (level <= p[1]) {  // p0 <= level <= p1 < ... : the part below is a corner triangle at p0
    const double below = (level - p[0]) * (level - p[0]) / ((p[1] - p[0]) * (p[2] - p[0]));
    return 1.0 - (std::isfinite(below) ? below : 0.0);
  }
  return (p[2] - level) * (p[2] - level) / ((p[2] - p[0]) * (p[2] - p[1]));
}

RootSurfaceSampler::RootSurfaceSampler(const mesh::VolumeMesh& mesh, int marker,
                                       const std::vector<int>& value_nodes, int subdivisions) {
  const int n = std::max(1, subdivisions);
  const int k = mesh.nodes_per_face;
  std::unordered_map<int, int> entry_of;
  entry_of.reserve(value_nodes.size());
  for (size_t i = 0; i < value_nodes.size(); ++i) entry_of[value_nodes[i]] = static_cast<int>(i);

  // Reference sub-grid: vertices (i/n, j/n), i + j <= n.
  std::vector<std::array<double, 2>> ref;
  std::vector<std::vector<int>> index(static_cast<size_t>(n + 1),
                                      std::vector<int>(static_cast<size_t>(n + 1), -1));
  for (int j = 0; j <= n; ++j) {
    for (int i = 0; i + j <= n; ++i) {
      index[static_cast<size_t>(i)][static_cast<size_t>(j)] = static_cast<int>(ref.size());
      ref.push_back({static_cast<double>(i) / n, static_cast<double>(j) / n});
    }
  }
  std::vector<std::array<int, 3>> ref_tri;
  for (int j = 0; j < n; ++j) {
    for (int i = 0; i + j < n; ++i) {
      const auto at = [&](int a, int b) {
        return index[static_cast<size_t>(a)][static_cast<size_t>(b)];
      };
      ref_tri.push_back({at(i, j), at(i + 1, j), at(i, j + 1)});
      if (i + j + 2 <= n) ref_tri.push_back({at(i + 1, j), at(i + 1, j + 1), at(i, j + 1)});
    }
  }
  const double ref_tri_area = 0.5 / (static_cast<double>(n) * n);

  std::vector<Eigen::Triplet<double>> triplets;
  int n_sub = 0;
  for (int f = 0; f < mesh.n_faces(); ++f) {
    if (mesh.face_marker[static_cast<size_t>(f)] != marker) continue;
    const int* nodes = mesh.face(f);
    int entries[6];
    for (int a = 0; a < k; ++a) {
      const auto it = entry_of.find(nodes[a]);
      if (it == entry_of.end()) {
        std::ostringstream msg;
        msg << "root-surface face " << f << " has node " << nodes[a]
            << " outside the PDL field: the PDL does not cover the root surface (mesh fault)";
        throw Error(msg.str());
      }
      entries[a] = it->second;
    }
    const int base = n_sub;
    for (const auto& r : ref) {
      const Eigen::VectorXd N = core::tri_shape(k, Eigen::Vector2d(r[0], r[1]));
      for (int a = 0; a < k; ++a) {
        if (N(a) != 0.0) triplets.emplace_back(n_sub, entries[a], N(a));
      }
      ++n_sub;
    }
    for (const auto& t : ref_tri) {
      const double xi = (ref[static_cast<size_t>(t[0])][0] + ref[static_cast<size_t>(t[1])][0] +
                         ref[static_cast<size_t>(t[2])][0]) /
                        3;
      const double eta = (ref[static_cast<size_t>(t[0])][1] + ref[static_cast<size_t>(t[1])][1] +
                          ref[static_cast<size_t>(t[2])][1]) /
                         3;
      const Eigen::MatrixXd G = core::tri_shape_gradient(k, Eigen::Vector2d(xi, eta));
      Eigen::Vector3d gx = Eigen::Vector3d::Zero(), gy = Eigen::Vector3d::Zero();
      for (int a = 0; a < k; ++a) {
        gx += G(a, 0) * mesh.nodes[static_cast<size_t>(nodes[a])];
        gy += G(a, 1) * mesh.nodes[static_cast<size_t>(nodes[a])];
      }
      const double area = gx.cross(gy).norm() * ref_tri_area;
      triangles_.push_back({base + t[0], base + t[1], base + t[2]});
      triangle_area_mm2_.push_back(area);
      area_mm2_ += area;
    }
    ++n_faces_;
  }
  interpolation_.resize(n_sub, static_cast<Eigen::Index>(value_nodes.size()));
  interpolation_.setFromTriplets(triplets.begin(), triplets.end());
}

Eigen::VectorXd RootSurfaceSampler::sample(const Eigen::VectorXd& nodal_values) const {
  return interpolation_ * nodal_values;
}

double RootSurfaceSampler::area_above(const Eigen::VectorXd& sampled, double level) const {
  double area = 0;
  for (size_t t = 0; t < triangles_.size(); ++t) {
    const auto& v = triangles_[t];
    area += triangle_area_mm2_[t] *
            triangle_fraction_above(sampled(v[0]), sampled(v[1]), sampled(v[2]), level);
  }
  return area;
}

double RootSurfaceSampler::level_exceeded_on(const Eigen::VectorXd& sampled,
                                             double area_fraction) const {
  if (sampled.size() == 0) return 0;
  const double target = std::clamp(area_fraction, 0.0, 1.0) * area_mm2_;
  double lo = sampled.minCoeff(), hi = sampled.maxCoeff();  // area_above(lo-) = all, (hi) = 0
  const double tol = 1e-9 * std::max(1e-300, hi - lo);
  // Bisection on the area above a level. Sub-triangles entirely below the bracket [lo, hi] add
  // nothing to any later level and those entirely above it add their whole area, so each step
  // keeps only the sub-triangles that straddle the bracket: the work shrinks geometrically.
  struct Straddling {
    double a, b, c, area_mm2;
  };
  std::vector<Straddling> active;
  active.reserve(triangles_.size());
  for (size_t t = 0; t < triangles_.size(); ++t) {
    const auto& v = triangles_[t];
    active.push_back({sampled(v[0]), sampled(v[1]), sampled(v[2]), triangle_area_mm2_[t]});
  }
  double area_fully_above = 0;
  while (hi - lo > tol) {
    const double mid = 0.5 * (lo + hi);
    double area = area_fully_above;
    for (const Straddling& t : active) {
      area += t.area_mm2 * triangle_fraction_above(t.a, t.b, t.c, mid);
    }
    if (area > target)
      lo = mid;
    else
      hi = mid;
    size_t kept = 0;
    for (const Straddling& t : active) {
      const double t_min = std::min({t.a, t.b, t.c}), t_max = std::max({t.a, t.b, t.c});
      if (t_max <= lo) continue;  // fraction 0 for every level >= lo
      if (t_min >= hi) {          // fraction 1 for every level < hi
        area_fully_above += t.area_mm2;
        continue;
      }
      active[kept++] = t;
    }
    active.resize(kept);
  }
  return 0.5 * (lo + hi);
}

}  // namespace sharpey::analysis::detail
