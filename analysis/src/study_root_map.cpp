#include <algorithm>
#include <cmath>
#include <limits>
#include <sstream>
#include <unordered_map>

#include "sharpey/analysis/detail/root_map.h"
#include "sharpey/core/constants.h"
#include "sharpey/core/reference_triangle.h"
#include "sharpey/error.h"

namespace sharpey::analysis::detail {
namespace {

using sharpey::core::kPi;
constexpr double kPoleRadiusMm = 1e-6;  // a corner this close to the axis has no angle

}  // namespace

namespace {

// A face unrolled onto the map: angle (deg, within 180 of one another, in [lo, hi]) and depth
// below the CEJ of its corners; a corner on the axis (a pole) takes any angle.
struct UnrolledFace {
  double angle[3], depth[3];
  bool pole[3];
  double lo, hi;
};

// Unrolls the corners of `nodes`; false for a face with two corners on the axis or one that
// surrounds the axis (no single angle range).
bool unroll_face(const mesh::VolumeMesh& mesh, const int* nodes, UnrolledFace& u) {
  int n_pole = 0, ref = -1;
  for (int a = 0; a < 3; ++a) {
    const Eigen::Vector3d& x = mesh.nodes[static_cast<size_t>(nodes[a])];
    u.depth[a] = -x.z();
    u.pole[a] = std::hypot(x.x(), x.y()) < kPoleRadiusMm;
    u.angle[a] = u.pole[a] ? 0.0 : std::atan2(x.y(), x.x()) * 180.0 / kPi;
    if (u.pole[a])
      ++n_pole;
    else if (ref < 0)
      ref = a;
  }
  if (n_pole > 1) return false;  // degenerate face on the axis
  u.lo = std::numeric_limits<double>::infinity();
  u.hi = -u.lo;
  for (int a = 0; a < 3; ++a) {
    if (u.pole[a]) continue;
    u.angle[a] += 360.0 * std::round((u.angle[ref] - u.angle[a]) / 360.0);  // within 180 of ref
    u.lo = std::min(u.lo, u.angle[a]);
    u.hi = std::max(u.hi, u.angle[a]);
  }
  return u.hi - u.lo <= 180.0;
}

// The cells whose centres an unrolled face covers (not covered before) get the face's
// interpolation weights on the value entries of its `k` nodes.
void rasterise_face(const UnrolledFace& u, const int* entries, int k, const RootMap& layout,
                    std::vector<char>& covered, std::vector<Eigen::Triplet<double>>& triplets) {
  const int n_angle = layout.n_angle, n_depth = layout.n_depth;
  const double depth_min_mm = layout.depth_min_mm;
  const double d_angle = 360.0 / n_angle, d_depth = (layout.depth_max_mm - depth_min_mm) / n_depth;
  const double* depth = u.depth;
  const double d_lo = std::min({depth[0], depth[1], depth[2]});
  const double d_hi = std::max({depth[0], depth[1], depth[2]});
  const int i0 = std::max(0, static_cast<int>(std::ceil((d_lo - depth_min_mm) / d_depth - 0.5)));
  const int i1 =
      std::min(n_depth - 1, static_cast<int>(std::floor((d_hi - depth_min_mm) / d_depth - 0.5)));
  for (double shift : {-360.0, 0.0, 360.0}) {
    // Cell centres theta_j + shift inside [lo, hi].
    const int j0 = std::max(0, static_cast<int>(std::ceil((u.lo - shift) / d_angle - 0.5)));
    const int j1 =
        std::min(n_angle - 1, static_cast<int>(std::floor((u.hi - shift) / d_angle - 0.5)));
    for (int j = j0; j <= j1; ++j) {
      const double q_angle = (j + 0.5) * d_angle + shift;
      double a2[3];
      for (int a = 0; a < 3; ++a) a2[a] = u.pole[a] ? q_angle : u.angle[a];
      // Barycentric coordinates of (q_angle, q_depth) in the image triangle.
      const double det =
          (a2[1] - a2[0]) * (depth[2] - depth[0]) - (a2[2] - a2[0]) * (depth[1] - depth[0]);
      if (std::abs(det) < 1e-14) continue;
      for (int i = i0; i <= i1; ++i) {
        const size_t cell =
            static_cast<size_t>(i) * static_cast<size_t>(n_angle) + static_cast<size_t>(j);
        if (covered[cell]) continue;
        const double q_depth = depth_min_mm + (i + 0.5) * d_depth;
        const double xi =
            ((q_angle - a2[0]) * (depth[2] - depth[0]) - (a2[2] - a2[0]) * (q_depth - depth[0])) /
            det;
        const double eta =
            ((a2[1] - a2[0]) * (q_depth - depth[0]) - (q_angle - a2[0]) * (depth[1] - depth[0])) /
            det;
        const double tol = 1e-9;
        if (xi < -tol || eta < -tol || xi + eta > 1 + tol) continue;
        const Eigen::VectorXd N = core::tri_shape(k, Eigen::Vector2d(xi, eta));
        for (int a = 0; a < k; ++a) {
          if (N(a) != 0.0) triplets.emplace_back(static_cast<int>(cell), entries[a], N(a));
        }
        covered[cell] = 1;
      }
    }
  }
}

}  // namespace

RootMapSampler::RootMapSampler(const mesh::VolumeMesh& mesh, int marker,
                               const std::vector<int>& value_nodes, int n_angle, int n_depth,
                               double depth_min_mm, double depth_max_mm) {
  if (n_angle < 1 || n_depth < 1 || !(depth_max_mm > depth_min_mm)) {
    std::ostringstream msg;
    msg << "root map grid " << n_angle << " x " << n_depth << " over depths " << depth_min_mm
        << " to " << depth_max_mm
        << " mm is empty; use at least 1 x 1 cells and a positive depth range";
    throw InputError("root_map", msg.str());
  }
  layout_.n_angle = n_angle;
  layout_.n_depth = n_depth;
  layout_.depth_min_mm = depth_min_mm;
  layout_.depth_max_mm = depth_max_mm;
  const int n_cells = n_angle * n_depth;
  covered_.assign(static_cast<size_t>(n_cells), 0);

  std::unordered_map<int, int> entry_of;
  for (size_t i = 0; i < value_nodes.size(); ++i) entry_of[value_nodes[i]] = static_cast<int>(i);

  const int k = mesh.nodes_per_face;
  std::vector<Eigen::Triplet<double>> triplets;
  for (int f = 0; f < mesh.n_faces(); ++f) {
    if (mesh.face_marker[static_cast<size_t>(f)] != marker) continue;
    const int* nodes = mesh.face(f);
    int entries[6];
    bool complete = true;
    for (int a = 0; a < k; ++a) {
      const auto it = entry_of.find(nodes[a]);
      complete = complete && it != entry_of.end();
      entries[a] = complete ? it->second : -1;
    }
    if (!complete) continue;  // the RootSurfaceSampler reports such a mesh fault
    UnrolledFace u;
    if (unroll_face(mesh, nodes, u)) rasterise_face(u, entries, k, layout_, covered_, triplets);
  }
  interpolation_.resize(n_cells, static_cast<Eigen::Index>(value_nodes.size()));
  interpolation_.setFromTriplets(triplets.begin(), triplets.end());
}

RootMap RootMapSampler::sample(const Eigen::VectorXd& nodal_values) const {
  RootMap map = layout_;
  const Eigen::VectorXd v = interpolation_ * nodal_values;
  map.pressure_kpa.resize(covered_.size());
  for (size_t c = 0; c < covered_.size(); ++c) {
    map.pressure_kpa[c] =
        covered_[c] ? v(static_cast<Eigen::Index>(c)) : std::numeric_limits<double>::quiet_NaN();
  }
  return map;
}

double RootMapSampler::covered_fraction() const {
  if (covered_.empty()) return 0;
  return static_cast<double>(std::count(covered_.begin(), covered_.end(), 1)) /
         static_cast<double>(covered_.size());
}

}  // namespace sharpey::analysis::detail
