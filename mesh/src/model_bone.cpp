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

// The rectangle R_in inside the plates and how the columns of the radial grids meet it.
struct BoneLayout {
  int k1 = 0, k2 = 0;                  // corner columns (see the file comment)
  std::vector<double> ys;              // y of the points along the labial and lingual edges
  std::vector<double> xin;             // x of the points along the mesial and distal edges
  std::vector<Eigen::Vector2d> outer;  // boundary point of R_in, one per column
  std::vector<double> x_lab, x_lin;    // x across the labial and lingual plates
  std::vector<double> xm;              // x of the side faces' and base's columns, lingual first
  std::vector<double> lower;           // row fractions from the base to the cancellous top
  std::vector<double> upper;           // row fractions across the cortical layer
};

namespace {

// Boundary of R_in, one point per column.
void lay_out_boundary(const ModelFrame& frame, int N, BoneLayout* b) {
  const double xBi = frame.x_labial_inner(), xLi = frame.x_lingual_inner();
  const double yM = frame.y_mesial(), yD = frame.y_distal();
  const double perimeter = 2 * ((xBi - xLi) + (yM - yD));
  const int k1 =
      std::clamp(static_cast<int>(std::lround(N * (yM - yD) / (2 * perimeter))), 1, N / 4 - 1);
  const int k2 = N / 2 - k1;
  b->k1 = k1;
  b->k2 = k2;
  b->ys = uniform_nodes(yD, yM, 2 * k1);
  b->xin = uniform_nodes(xLi, xBi, k2 - k1);
  const std::vector<double>& ys = b->ys;
  const std::vector<double>& xin = b->xin;
  b->outer.resize(N);
  for (int i = 0; i < N; ++i) {
    if (i <= k1) {
      b->outer[i] = {xBi, ys[i + k1]};
    } else if (i >= N - k1) {
      b->outer[i] = {xBi, ys[i - (N - k1)]};
    } else if (i <= k2) {
      b->outer[i] = {xin[(k2 - k1) - (i - k1)], yM};
    } else if (i <= N / 2 + k1) {
      b->outer[i] = {xLi, ys[2 * k1 - (i - k2)]};
    } else {
      b->outer[i] = {xin[i - (N / 2 + k1)], yD};
    }
  }
}

// Columns across the plates and of the side faces; rows of the side faces: the lower part runs
// from the base to the cancellous top (graded), the upper part across the cortical layer.
void lay_out_sides(const ModelFrame& frame, double pdl_edge, BoneLayout* b) {
  const double tc = frame.cortical_thickness();
  const int n_strip = std::max(1, static_cast<int>(std::lround(tc / pdl_edge)));
  b->x_lab = uniform_nodes(frame.x_labial_inner(), frame.x_labial(), n_strip);
  b->x_lin = uniform_nodes(frame.x_lingual(), frame.x_lingual_inner(), n_strip);
  b->xm.assign(b->x_lin.begin(), b->x_lin.end() - 1);
  b->xm.insert(b->xm.end(), b->xin.begin(), b->xin.end());
  b->xm.insert(b->xm.end(), b->x_lab.begin() + 1, b->x_lab.end());
  const double column_spacing = (frame.y_mesial() - frame.y_distal()) / (2 * b->k1);
  b->lower = graded_fractions(frame.crest_z() - tc - frame.z_base(), column_spacing,
                              frame.sizes().bone_edge_mm);
  b->upper = uniform_nodes(0.0, 1.0, n_strip);
}

}  // namespace

void ModelMesher::build_bone() {
  // The socket's crest and cortical rings (every column) and the crest ring's uniform columns.
  const std::vector<int> crest_all = socket_ring(crest_ring_);
  const std::vector<int> cortical_all = socket_ring(cortical_ring_);
  const std::vector<int> socket_crest = uniform_subset(crest_all);
  BoneLayout layout;
  lay_out_boundary(frame_, n_columns_, &layout);
  lay_out_sides(frame_, frame_.sizes().pdl_edge_mm, &layout);
  const int n_rings = radial_ring_count(socket_crest, layout);
  add_radial_grid(crest_all, 0.0, kFreeBone, true, n_rings, layout);
  add_radial_grid(cortical_all, frame_.cortical_thickness(), kOther, false, n_rings, layout);
  add_plate_strips(layout);
  add_side_faces(layout);
  add_bone_base(layout);
  set_region_seeds();
}

int ModelMesher::bone_point(double x, double y, double z) {
  return points_.add({x, y, z}, PointInfo{PointKind::kBone, 0, 0});
}

// Rings of the radial grids between the socket and R_in: the median gap over 1.2 PDL edges.
int ModelMesher::radial_ring_count(const std::vector<int>& inner, const BoneLayout& b) const {
  const int N = n_columns_;
  const auto& X = points_.points();
  std::vector<double> gaps(N);
  for (int i = 0; i < N; ++i) gaps[i] = (b.outer[i] - X[inner[i]].head<2>()).norm();
  std::vector<double> sorted = gaps;
  std::nth_element(sorted.begin(), sorted.begin() + N / 2, sorted.end());
  const double h = frame_.sizes().pdl_edge_mm;
  return std::max(2, static_cast<int>(std::lround(sorted[N / 2] / (1.2 * h))));
}

// A radial grid from the socket ring `inner` out to R_in, `offset` below the bone top.
void ModelMesher::add_radial_grid(const std::vector<int>& ring, double offset, int marker,
                                  bool output, int K, const BoneLayout& b) {
  const int N = n_columns_;
  const auto& X = points_.points();
  const std::vector<int> inner = uniform_subset(ring);
  std::vector<std::vector<int>> rows(K + 1, std::vector<int>(N));
  rows[0] = inner;
  for (int k = 1; k <= K; ++k) {
    const double t = std::pow(static_cast<double>(k) / K, 1.25);
    for (int i = 0; i < N; ++i) {
      const Eigen::Vector2d p =
          k == K ? b.outer[i] : Eigen::Vector2d((1 - t) * X[inner[i]].head<2>() + t * b.outer[i]);
      rows[k][i] = bone_point(p.x(), p.y(), frame_.bone_top(p.x(), p.y()) - offset);
    }
  }
  const size_t first = facets_.size();
  add_socket_grid(rows, ring, marker, output);
  check_unfolded(first);
  for (size_t f = first; f < facets_.size(); ++f) orient(&facets_[f], Eigen::Vector3d::UnitZ());
}

// Unfolded, all triangles from `first` on project with the same orientation; a fold means the
// socket comes too close to the inner face of a plate.
void ModelMesher::check_unfolded(size_t first) const {
  const auto& X = points_.points();
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
}

// Top strips over the labial and lingual plates.
void ModelMesher::add_plate_strips(const BoneLayout& b) {
  const Eigen::Vector3d up = Eigen::Vector3d::UnitZ();
  for (const auto* xs : {&b.x_lab, &b.x_lin}) {
    std::vector<std::vector<int>> rows;
    for (double x : *xs) {
      std::vector<int> row;
      for (double y : b.ys) row.push_back(bone_point(x, y, frame_.bone_top(x, y)));
      rows.push_back(row);
    }
    add_grid(rows, false, kFreeBone, true, true, [&](const Eigen::Vector3d&) { return up; });
  }
}

// Heights of a side face's column at (x, y), from the base up; with the cortical layer on top
// when `with_upper`.
std::vector<double> ModelMesher::column_z(const BoneLayout& b, double x, double y,
                                          bool with_upper) const {
  const double tc = frame_.cortical_thickness(), zb = frame_.z_base();
  const double t = frame_.bone_top(x, y);
  std::vector<double> z;
  for (double f : b.lower) z.push_back(zb + f * (t - tc - zb));
  z.back() = t - tc;
  if (with_upper) {
    for (size_t k = 1; k < b.upper.size(); ++k) z.push_back(t - tc + b.upper[k] * tc);
    z.back() = t;
  }
  return z;
}

// A vertical face through the points (xs[c], ys[c]); rows from the base up.
void ModelMesher::add_side_face(const BoneLayout& b, const std::vector<double>& xs,
                                const std::vector<double>& ys, bool with_upper, int marker,
                                bool output, const Eigen::Vector3d& outward) {
  std::vector<std::vector<double>> zs;
  for (size_t c = 0; c < xs.size(); ++c) zs.push_back(column_z(b, xs[c], ys[c], with_upper));
  std::vector<std::vector<int>> rows(zs[0].size());
  for (size_t r = 0; r < rows.size(); ++r)
    for (size_t c = 0; c < xs.size(); ++c) rows[r].push_back(bone_point(xs[c], ys[c], zs[c][r]));
  add_grid(rows, false, marker, true, output, [&](const Eigen::Vector3d&) { return outward; });
}

// Mesial, distal (fixed), labial and lingual (free) faces and the plates' inner walls.
void ModelMesher::add_side_faces(const BoneLayout& b) {
  const double xB = frame_.x_labial(), xL = frame_.x_lingual();
  const double xBi = frame_.x_labial_inner(), xLi = frame_.x_lingual_inner();
  const std::vector<double> at_ym(b.xm.size(), frame_.y_mesial());
  const std::vector<double> at_yd(b.xm.size(), frame_.y_distal());
  const size_t n_y = b.ys.size();
  add_side_face(b, b.xm, at_ym, true, kFixedBone, true, Eigen::Vector3d::UnitY());
  add_side_face(b, b.xm, at_yd, true, kFixedBone, true, -Eigen::Vector3d::UnitY());
  add_side_face(b, std::vector<double>(n_y, xB), b.ys, true, kFreeBone, true,
                Eigen::Vector3d::UnitX());
  add_side_face(b, std::vector<double>(n_y, xL), b.ys, true, kFreeBone, true,
                -Eigen::Vector3d::UnitX());
  add_side_face(b, std::vector<double>(n_y, xBi), b.ys, false, kOther, false,
                Eigen::Vector3d::UnitX());
  add_side_face(b, std::vector<double>(n_y, xLi), b.ys, false, kOther, false,
                -Eigen::Vector3d::UnitX());
}

void ModelMesher::add_bone_base(const BoneLayout& b) {
  std::vector<std::vector<int>> base;
  for (double y : b.ys) {
    std::vector<int> row;
    for (double x : b.xm) row.push_back(bone_point(x, y, frame_.z_base()));
    base.push_back(row);
  }
  add_grid(base, false, kFixedBone, true, true,
           [&](const Eigen::Vector3d&) { return -Eigen::Vector3d::UnitZ(); });
}

// Region seeds and volume bounds (regular tetrahedron of the target edge).
void ModelMesher::set_region_seeds() {
  const double tc = frame_.cortical_thickness(), zb = frame_.z_base();
  const double tooth_edge = frame_.sizes().tooth_edge_mm, bone_edge = frame_.sizes().bone_edge_mm;
  auto bound = [](double e) { return e * e * e / (6.0 * std::sqrt(2.0)); };
  seeds_.clear();
  seeds_.push_back(
      {Eigen::Vector3d(0, 0, 0.5 * frame_.shape().crown_length()), kTooth, bound(tooth_edge)});
  seeds_.push_back(
      {Eigen::Vector3d(frame_.x_labial() - 0.5 * tc, 0.5 * (frame_.y_mesial() + frame_.y_distal()),
                       0.5 * (zb + frame_.crest_z() - tc)),
       kCorticalBone, bound(bone_edge)});
  const double socket_bottom = frame_.apex_z() - frame_.spec().pdl.apex_width_mm;
  seeds_.push_back(
      {Eigen::Vector3d(0, 0, 0.5 * (zb + socket_bottom)), kCancellousBone, bound(bone_edge)});
}

}  // namespace sharpey::mesh::detail
