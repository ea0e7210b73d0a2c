// Surfaces of the alveolar bone block, all structured so that they share their boundary points:
//   top (free): a radial grid from the socket's crest ring out to the rectangle R_in bounded by
//     the inner faces of the labial and lingual cortical plates, plus two strips over the plates;
//   cancellous top (interface): the same radial grid from the socket's cortical ring, one cortical
//     thickness lower;
//   labial and lingual faces (free), mesial, distal and basal faces (fixed), and the two inner
//     walls of the plates (interface): tensor grids whose columns are the grids' boundary points.
// Column i of a radial grid joins the socket ring's uniform column i to boundary point i of R_in
// (the extra socket columns around an angular defect join the grid's first row: add_socket_grid);
// the corners of R_in sit on columns k1, N/2 - k1, N/2 + k1 and N - k1 so that opposite edges
// carry the same points.
#include <Eigen/Geometry>
#include <algorithm>
#include <cmath>

#include "detail/model_mesher.h"
#include "sharpey/error.h"

namespace sharpey::mesh::detail {
namespace {

// Fractions 0 = bottom ... 1 = top of a height `length` cut into steps that grow from `h_top` at
// the top to at most `h_bottom`, by at most 30 % per step.
std::vector<double> graded_fractions(double length, double h_top, double h_bottom) {
  std::vector<double> steps;
  double sum = 0, h = h_top;
  while (sum + 0.5 * h < length) {
    steps.push_back(h);
    sum += h;
    h = std::min(h_bottom, 1.3 * h);
  }
  if (steps.empty()) steps.push_back(length), sum = length;
  std::vector<double> f(steps.size() + 1);
  f[0] = 1.0;
  for (size_t k = 0; k < steps.size(); ++k) f[k + 1] = f[k] - steps[k] / sum;
  f.back() = 0.0;
  std::reverse(f.begin(), f.end());
  return f;
}

std::vector<double> uniform_nodes(double a, double b, int n) {
  std::vector<double> v(n + 1);
  for (int k = 0; k <= n; ++k) v[k] = a + (b - a) * k / n;
  v.front() = a;
  v.back() = b;
  return v;
}

}  // namespace

void ModelMesher::build_bone() {
  const int N = n_columns_;
  const double h = frame_.sizes().pdl_edge_mm;
  const double tc = frame_.cortical_thickness();
  const double xB = frame_.x_labial(), xBi = frame_.x_labial_inner();
  const double xL = frame_.x_lingual(), xLi = frame_.x_lingual_inner();
  const double yM = frame_.y_mesial(), yD = frame_.y_distal(), zb = frame_.z_base();
  const PointInfo bone{PointKind::kBone, 0, 0};

  // The socket's crest and cortical rings (every column) and the crest ring's uniform columns.
  const std::vector<int> crest_all = socket_ring(crest_ring_);
  const std::vector<int> cortical_all = socket_ring(cortical_ring_);
  const std::vector<int> socket_crest = uniform_subset(crest_all);

  // Boundary of R_in, one point per column.
  const double perimeter = 2 * ((xBi - xLi) + (yM - yD));
  const int k1 =
      std::clamp(static_cast<int>(std::lround(N * (yM - yD) / (2 * perimeter))), 1, N / 4 - 1);
  const int k2 = N / 2 - k1;
  const std::vector<double> ys = uniform_nodes(yD, yM, 2 * k1);
  const std::vector<double> xin = uniform_nodes(xLi, xBi, k2 - k1);
  std::vector<Eigen::Vector2d> boundary(N);
  for (int i = 0; i < N; ++i) {
    if (i <= k1) {
      boundary[i] = {xBi, ys[i + k1]};
    } else if (i >= N - k1) {
      boundary[i] = {xBi, ys[i - (N - k1)]};
    } else if (i <= k2) {
      boundary[i] = {xin[(k2 - k1) - (i - k1)], yM};
    } else if (i <= N / 2 + k1) {
      boundary[i] = {xLi, ys[2 * k1 - (i - k2)]};
    } else {
      boundary[i] = {xin[i - (N / 2 + k1)], yD};
    }
  }

  auto top = [&](double x, double y) { return frame_.bone_top(x, y); };
  auto pt = [&](double x, double y, double z) { return points_.add({x, y, z}, bone); };
  const Eigen::Vector3d up = Eigen::Vector3d::UnitZ();

  // Radial grids (bone top and cancellous top).
  const auto& X = points_.points();
  std::vector<double> gaps(N);
  for (int i = 0; i < N; ++i) gaps[i] = (boundary[i] - X[socket_crest[i]].head<2>()).norm();
  std::vector<double> sorted = gaps;
  std::nth_element(sorted.begin(), sorted.begin() + N / 2, sorted.end());
  const int K = std::max(2, static_cast<int>(std::lround(sorted[N / 2] / (1.2 * h))));
  auto radial_grid = [&](const std::vector<int>& ring, double offset, int marker, bool output) {
    const std::vector<int> inner = uniform_subset(ring);
    std::vector<std::vector<int>> rows(K + 1, std::vector<int>(N));
    rows[0] = inner;
    for (int k = 1; k <= K; ++k) {
      const double t = std::pow(static_cast<double>(k) / K, 1.25);
      for (int i = 0; i < N; ++i) {
        const Eigen::Vector2d p =
            k == K ? boundary[i]
                   : Eigen::Vector2d((1 - t) * X[inner[i]].head<2>() + t * boundary[i]);
        rows[k][i] = pt(p.x(), p.y(), top(p.x(), p.y()) - offset);
      }
    }
    const size_t first = facets_.size();
    add_socket_grid(rows, ring, marker, output);
    // Unfolded, all triangles project with the same orientation; a fold means the socket comes
    // too close to the inner face of a plate.
    int n_up = 0, n_down = 0;
    for (size_t f = first; f < facets_.size(); ++f) {
      const auto& v = facets_[f].v;
      const double nz = (X[v[1]] - X[v[0]]).cross(X[v[2]] - X[v[0]]).z();
      (nz > 0 ? n_up : n_down) += 1;
      if (nz == 0) n_up = n_down = 1;
    }
    if (n_up > 0 && n_down > 0) {
      throw MeshError(
          "building the bone top: the surface between the socket and the cortical plates folds "
          "over (the socket lies too close to the inner face of a plate); use thicker plates or a "
          "thinner cortical layer");
    }
    for (size_t f = first; f < facets_.size(); ++f) orient(&facets_[f], up);
  };
  radial_grid(crest_all, 0.0, kFreeBone, true);
  radial_grid(cortical_all, tc, kOther, false);

  // Top strips over the labial and lingual plates.
  const int n_strip = std::max(1, static_cast<int>(std::lround(tc / h)));
  const std::vector<double> x_lab = uniform_nodes(xBi, xB, n_strip);
  const std::vector<double> x_lin = uniform_nodes(xL, xLi, n_strip);
  for (const auto* xs : {&x_lab, &x_lin}) {
    std::vector<std::vector<int>> rows;
    for (double x : *xs) {
      std::vector<int> row;
      for (double y : ys) row.push_back(pt(x, y, top(x, y)));
      rows.push_back(row);
    }
    add_grid(rows, false, kFreeBone, true, true, [&](const Eigen::Vector3d&) { return up; });
  }

  // Columns of the side faces and the base.
  std::vector<double> xm(x_lin.begin(), x_lin.end() - 1);
  xm.insert(xm.end(), xin.begin(), xin.end());
  xm.insert(xm.end(), x_lab.begin() + 1, x_lab.end());

  // Rows: the lower part runs from the base to the cancellous top (graded), the upper part
  // across the cortical layer.
  const double column_spacing = (yM - yD) / (2 * k1);
  const std::vector<double> lower =
      graded_fractions(frame_.crest_z() - tc - zb, column_spacing, frame_.sizes().bone_edge_mm);
  const std::vector<double> upper_nodes = uniform_nodes(0.0, 1.0, n_strip);
  auto column_z = [&](double x, double y, bool with_upper) {
    const double t = top(x, y);
    std::vector<double> z;
    for (double f : lower) z.push_back(zb + f * (t - tc - zb));
    z.back() = t - tc;
    if (with_upper) {
      for (size_t k = 1; k < upper_nodes.size(); ++k) z.push_back(t - tc + upper_nodes[k] * tc);
      z.back() = t;
    }
    return z;
  };
  // A vertical face through the points (x[c], y[c]); rows from the base up.
  auto side_face = [&](const std::vector<double>& xs, const std::vector<double>& yv,
                       bool with_upper, int marker, bool output, const Eigen::Vector3d& outward) {
    std::vector<std::vector<double>> zs;
    for (size_t c = 0; c < xs.size(); ++c) zs.push_back(column_z(xs[c], yv[c], with_upper));
    std::vector<std::vector<int>> rows(zs[0].size());
    for (size_t r = 0; r < rows.size(); ++r)
      for (size_t c = 0; c < xs.size(); ++c) rows[r].push_back(pt(xs[c], yv[c], zs[c][r]));
    add_grid(rows, false, marker, true, output, [&](const Eigen::Vector3d&) { return outward; });
  };
  const std::vector<double> at_ym(xm.size(), yM), at_yd(xm.size(), yD);
  side_face(xm, at_ym, true, kFixedBone, true, Eigen::Vector3d::UnitY());
  side_face(xm, at_yd, true, kFixedBone, true, -Eigen::Vector3d::UnitY());
  side_face(std::vector<double>(ys.size(), xB), ys, true, kFreeBone, true,
            Eigen::Vector3d::UnitX());
  side_face(std::vector<double>(ys.size(), xL), ys, true, kFreeBone, true,
            -Eigen::Vector3d::UnitX());
  side_face(std::vector<double>(ys.size(), xBi), ys, false, kOther, false,
            Eigen::Vector3d::UnitX());
  side_face(std::vector<double>(ys.size(), xLi), ys, false, kOther, false,
            -Eigen::Vector3d::UnitX());

  // Base.
  std::vector<std::vector<int>> base;
  for (double y : ys) {
    std::vector<int> row;
    for (double x : xm) row.push_back(pt(x, y, zb));
    base.push_back(row);
  }
  add_grid(base, false, kFixedBone, true, true, [&](const Eigen::Vector3d&) { return -up; });

  // Region seeds and volume bounds (regular tetrahedron of the target edge).
  const double tooth_edge = frame_.sizes().tooth_edge_mm, bone_edge = frame_.sizes().bone_edge_mm;
  auto bound = [](double e) { return e * e * e / (6.0 * std::sqrt(2.0)); };
  seeds_.clear();
  seeds_.push_back(
      {Eigen::Vector3d(0, 0, 0.5 * frame_.shape().crown_length()), kTooth, bound(tooth_edge)});
  seeds_.push_back(
      {Eigen::Vector3d(xB - 0.5 * tc, 0.5 * (yM + yD), 0.5 * (zb + frame_.crest_z() - tc)),
       kCorticalBone, bound(bone_edge)});
  const double socket_bottom = frame_.apex_z() - frame_.spec().pdl.apex_width_mm;
  seeds_.push_back(
      {Eigen::Vector3d(0, 0, 0.5 * (zb + socket_bottom)), kCancellousBone, bound(bone_edge)});
}

}  // namespace sharpey::mesh::detail
