// build_multi_root_mesh(): faceted tooth surface, structured PDL prisms, bone box, TetGen.
#include <Eigen/Geometry>
#include <algorithm>
#include <array>
#include <climits>
#include <cmath>
#include <cstdio>
#include <functional>
#include <map>
#include <set>

#include "detail/model_frame.h"
#include "detail/model_mesher.h"
#include "detail/planar_triangulation.h"
#include "multi_root_hull.h"
#include "multi_root_lesion_loops.h"
#include "sharpey/core/constants.h"
#include "sharpey/error.h"
#include "sharpey/mesh/multi_root_tooth.h"
#include "sharpey/mesh/second_order.h"
#include "sharpey/mesh/tetrahedralize.h"

namespace sharpey::mesh {
namespace {

using sharpey::core::kPi;
constexpr double kDeg = kPi / 180.0;

struct Tri {
  std::array<int, 3> v;
  int marker;
  int part;  // INT_MIN: not on the tooth
  bool to_tetgen;
};

double ellipse_perimeter(double a, double b) {
  const double h = (a - b) * (a - b) / ((a + b) * (a + b));
  return kPi * (a + b) * (1 + 3 * h / (10 + std::sqrt(4 - 3 * h)));
}

// A root's axis point t_mm below the furcation plane (horizontal position).
Eigen::Vector2d root_centre(const RootSpec& spec, double t) {
  const double slope = std::tan(spec.tilt_deg * kDeg);
  const double dx = slope * std::cos(spec.tilt_direction_deg * kDeg);
  const double dy = slope * std::sin(spec.tilt_direction_deg * kDeg);
  return Eigen::Vector2d(spec.foot_x_mm + dx * t, spec.foot_y_mm + dy * t);
}

// Points per ring around a root (a multiple of four, at least 12).
int root_ring_size(const RootSpec& spec, double h) {
  return std::max(
      12,
      4 * static_cast<int>(std::ceil(ellipse_perimeter(spec.half_x_mm, spec.half_y_mm) / (4 * h))));
}

// Point i of n of a root's ring t_mm below the furcation plane (horizontal position).
Eigen::Vector2d root_ring_point(const RootSpec& spec, double t, int i, int n) {
  double rho = 1;
  if (spec.profile != RootProfile::kCylinder)
    rho = std::sqrt(std::max(0.0, 1 - std::pow(t / spec.length_mm, spec.taper_fullness)));
  const Eigen::Vector2d c = root_centre(spec, t);
  const Eigen::Vector2d o = root_section_offset(spec, 2 * kPi * i / n, t);
  return Eigen::Vector2d(c.x() + rho * o.x(), c.y() + rho * o.y());
}

class Builder {
 public:
  Builder(const MultiRootTooth& tooth, const MultiRootBone& bone, const MultiRootMeshSizing& s)
      : tooth_(tooth), bone_(bone), h_(s.edge_mm), layers_(s.pdl_layers) {
    // A degree III lesion under an outer crest below the furcation plane: the septum's top
    // lowered to vertical_mm below the roof across the furcation (validate_multi_root_mesh).
    // The same with the septum at the roof (t_in_ 0, no lesion): attached inside the roots' hull
    // up to the roof, the roof outside it free.
    t_out_ = -tooth.trunk_length_mm - outer_crest_z_mm(bone);
    // Degree I or II (two roots, one entrance): the septum's top lowered to vertical_mm below the
    // roof from the entrance up to the horizontal depth, at the roof beyond it.
    const int degree = bone.furcation.degree;
    partial_ = bone.septum_to_roof && (degree == 1 || degree == 2) && t_out_ > 0;
    lesion_ = bone.septum_to_roof && (degree == 3 || partial_ || (degree == 0 && t_out_ > 0));
    t_in_ = degree > 0 ? bone.furcation.vertical_mm : 0.0;
  }

  MultiRootMesh build(const MultiRootMeshSizing& sizing, const std::atomic<bool>* cancel);

 private:
  int add(const Eigen::Vector3d& p, int part) {
    const int i = points_.add(p, detail::PointInfo{});
    if (static_cast<int>(part_.size()) <= i) part_.resize(i + 1, INT_MIN);
    if (part_[i] == INT_MIN) part_[i] = part;
    return i;
  }
  std::vector<int> ring(double cx, double cy, double ax, double ay, double z, int n, int part) {
    std::vector<int> r;
    for (int i = 0; i < n; ++i) {
      const double th = 2 * kPi * i / n;
      r.push_back(add({cx + ax * std::cos(th), cy + ay * std::sin(th), z}, part));
    }
    return r;
  }
  void tri(int a, int b, int c, int marker, int part, const Eigen::Vector3d& outward,
           bool to_tetgen = true) {
    const auto& x = points_.points();
    Tri t{{a, b, c}, marker, part, to_tetgen};
    if ((x[b] - x[a]).cross(x[c] - x[a]).dot(outward) < 0) std::swap(t.v[1], t.v[2]);
    tris_.push_back(t);
  }
  // Joins ring A to ring B (same counts, or one a pole); outward(centroid) orients.
  template <class Out>
  void join(const std::vector<int>& A, const std::vector<int>& B, int marker, int part,
            const Out& outward) {
    const auto& x = points_.points();
    auto c3 = [&](int a, int b, int c) { return ((x[a] + x[b] + x[c]) / 3.0).eval(); };
    if (A.size() == 1 || B.size() == 1) {
      const int pole = A.size() == 1 ? A[0] : B[0];
      const std::vector<int>& R = A.size() == 1 ? B : A;
      for (size_t i = 0; i < R.size(); ++i) {
        const int a = R[i], b = R[(i + 1) % R.size()];
        tri(pole, a, b, marker, part, outward(c3(pole, a, b)));
      }
      return;
    }
    for (size_t i = 0; i < A.size(); ++i) {
      const int a = A[i], b = A[(i + 1) % A.size()], c = B[(i + 1) % B.size()], d = B[i];
      if ((x[a] - x[c]).squaredNorm() <= (x[b] - x[d]).squaredNorm()) {
        tri(a, b, c, marker, part, outward(c3(a, b, c)));
        tri(a, c, d, marker, part, outward(c3(a, c, d)));
      } else {
        tri(a, b, d, marker, part, outward(c3(a, b, d)));
        tri(b, c, d, marker, part, outward(c3(b, c, d)));
      }
    }
  }
  // Tooth surface, in this order: crown dome, trunk (returns its rim at the furcation plane),
  // each root (appends its foot ring), furcation roof.
  void tooth_surface();
  std::vector<int> crown_dome(int n_around);
  std::vector<int> trunk(const std::vector<int>& cervix, int n_around);
  std::vector<int> trunk_with_defect(const std::vector<int>& cervix, int n_around);
  double crest_z(const Eigen::Vector2d& p) const;
  std::vector<int> root(size_t r);
  std::vector<double> crest_depths(size_t r, int n) const;
  double warped_depth(const RootSpec& spec, double t, double crest_t) const;
  void furcation_roof(const std::vector<int>& rim, const std::vector<std::vector<int>>& feet);
  void roof_domain(const std::vector<std::vector<int>>& outlines, int marker);
  // Degree III lesion: which ring points of each root lie on the roots' hull (outer) and the
  // roots' order around it; the markers of a root's new band of triangles; the free faces of the
  // PDL at the lesion's edge and the socket's loops and walls for the bone's top.
  void classify_hull();
  bool inner_column(size_t r, int i) const {
    const std::vector<char>& o = outer_[r];
    return !(o[i] && o[(i + 1) % o.size()]);
  }
  void partial_lesion_columns();
  Eigen::Vector2d foot_point(int r, int i) const {
    const int n = static_cast<int>(top_[r].size());
    return root_ring_point(tooth_.roots[r], 0.0, ((i % n) + n) % n, n);
  }
  double lesion_reach(const Eigen::Vector2d& d, double support, double depth) const;
  void settle_lesion_loops(std::vector<std::vector<int>>* labels,
                           const std::vector<Eigen::Vector2d>& direction,
                           const std::vector<double>& level);
  void partial_lesion_loops(const std::vector<std::vector<int>>& label,
                            const std::vector<Eigen::Vector2d>& direction);
  void split_hull_edges(const std::vector<std::vector<int>>& label,
                        const std::vector<Eigen::Vector2d>& direction,
                        const std::vector<double>& level);
  // Index of root r's ring at depth t below the furcation plane (one lies there exactly).
  size_t ring_level(size_t r, double t) const {
    const std::vector<double>& d = ring_t_[r];
    return static_cast<size_t>(
        std::find_if(d.begin(), d.end(), [&](double v) { return std::abs(v - t) < 1e-12; }) -
        d.begin());
  }
  void mark_lesion_band(size_t r, size_t first, double t, const std::vector<int>& ring_r);
  void free_strip(int u, int v, const Eigen::Vector3d& outward,
                  const std::map<int, std::vector<int>>& layer);
  void pdl_lesion(const std::map<int, std::vector<int>>& layer);
  void lesion_floor(const std::map<int, std::vector<int>>& layer);
  using ZOf = std::function<double(const Eigen::Vector2d&)>;  // height of a planar face's point
  using Planar =
      std::function<void(const std::vector<std::vector<Eigen::Vector2d>>&, const std::vector<int>&,
                         const ZOf&, int, const Eigen::Vector3d&)>;
  void lesion_bone_top(const Planar& planar);
  // PDL: offset directions, the points across the layer, the prisms, the free top at the crest.
  void pdl_layer();
  std::map<int, Eigen::Vector3d> offset_directions(std::map<int, double>* miter) const;
  std::map<int, std::vector<int>> layer_points();
  void spread_foot_corners(std::map<int, Eigen::Vector3d>* offset) const;
  void prisms(const std::map<int, std::vector<int>>& layer);
  void pdl_crest(const std::map<int, std::vector<int>>& layer);
  void bone_block();
  // Build: the PLC, TetGen, the linear mesh in our point numbering, the conformity check.
  Plc make_plc(std::vector<int>* from_plc) const;
  void check_conforming(const VolumeMesh& linear) const;

  const MultiRootTooth& tooth_;
  const MultiRootBone& bone_;
  double h_;
  int layers_;
  detail::PointSet points_;
  std::vector<int> part_;
  std::vector<Tri> tris_;
  std::vector<std::vector<int>> crest_rings_, socket_crests_;
  std::vector<std::vector<int>> feet_;  // each root's top ring (on the furcation plane)
  std::set<std::array<int, 3>> flat_;   // roof and cylinder-end triangles (sorted vertices)
  std::vector<std::array<int, 4>> pdl_tets_;
  std::vector<int> pdl_tet_part_;
  Eigen::Vector3d hole_ = Eigen::Vector3d::Zero();
  Eigen::Vector3d bone_seed_ = Eigen::Vector3d::Zero();
  bool lesion_ = false, partial_ = false;
  std::vector<std::vector<double>> top_;  // per root and column: depth where attachment starts
  // Partial: the roof's inner loop (root, ring index of each point) split into the lesions' and
  // the septum's loops (multi_root_lesion_loops.h).
  // ring index i of root r as {r, i}, a hull edge's split point as {-1, k}.
  std::vector<std::array<int, 2>> inner_loop_;
  detail::InnerLoopSplit split_;
  // Per hull edge k: where a lesion's back edge crosses it (when the lesion holds one end of the
  // edge only): the roof point, and the bone's column below its socket point (bottom to top,
  // with the depths below the furcation plane, the socket point's as 0).
  struct HullSplit {
    bool active = false;
    int roof = -1;
    double s = 0.5;  // along the edge, from order_[k]'s arc end
    Eigen::Vector2d xy = Eigen::Vector2d::Zero();
    std::vector<int> column;
    std::vector<double> column_t;
  };
  std::vector<HullSplit> hull_split_;
  std::vector<int> entry_;  // per lesion label: its loop's first point in inner_loop_
  std::vector<int> hull_column(int k, double t1, double t2) const;
  void split_columns(const std::map<int, std::vector<int>>& layer);
  std::vector<int> socket_column(size_t r, int b, double t1, double t2,
                                 const std::map<int, std::vector<int>>& layer) const;
  void hull_edge_walls(size_t k, const Eigen::Vector3d& centre,
                       const std::map<int, std::vector<int>>& layer);
  int roof_vertex(int m) const {
    const auto& v = inner_loop_[m];
    return v[0] >= 0 ? rings_[v[0]][0][v[1]] : hull_split_[v[1]].roof;
  }
  double t_out_ = 0, t_in_ = 0;           // outer crest and septum top below the furcation plane
  std::vector<std::vector<char>> outer_;  // per root and ring index: on the roots' hull
  std::vector<int> order_, arc_start_, arc_end_;      // roots counter-clockwise; their outer arcs
  std::vector<std::vector<std::vector<int>>> rings_;  // per root, its rings from the foot down
  std::vector<std::vector<double>> ring_t_;           // and their depths
  std::set<int> horizontal_;                          // offset horizontally (the bone's tops)
  std::vector<int> outer_top_;                        // socket loop at the crest
  std::vector<std::vector<int>> floors_;              // socket loops at the septum's top
  struct Wall {
    std::vector<int> p, q;   // socket columns, bottom to top
    Eigen::Vector3d toward;  // a point on the lower side (the wall faces it)
  };
  std::vector<Wall> walls_;
};

void Builder::tooth_surface() {
  const double A = tooth_.cervix_half_x_mm, B = tooth_.cervix_half_y_mm;
  const int N = std::max(16, 4 * static_cast<int>(std::ceil(ellipse_perimeter(A, B) / (4 * h_))));
  if (lesion_) classify_hull();
  const std::vector<int> cervix = crown_dome(N);
  const std::vector<int> rim = trunk(cervix, N);
  std::vector<std::vector<int>> feet;
  for (size_t r = 0; r < tooth_.roots.size(); ++r) feet.push_back(root(r));
  furcation_roof(rim, feet);
  feet_ = feet;
}

// Crown: a half-ellipsoid dome over the cervical ellipse, rings from the pole down to the CEJ,
// three edges apart (the crown only carries the load to the root: 40 000 times stiffer than the
// ligament); returns the ring at the CEJ.
std::vector<int> Builder::crown_dome(int n_around) {
  const double A = tooth_.cervix_half_x_mm, B = tooth_.cervix_half_y_mm;
  const double Lc = tooth_.crown_length_mm;
  const int n_crown =
      std::max(3, static_cast<int>(std::ceil(0.5 * kPi * std::max(A, Lc) / (3.0 * h_))));
  std::vector<std::vector<int>> crown;
  for (int k = n_crown - 1; k >= 0; --k) {
    const double phi = 0.5 * kPi * k / n_crown;
    crown.push_back(
        ring(0, 0, A * std::cos(phi), B * std::cos(phi), Lc * std::sin(phi), n_around, kTrunkPart));
  }
  const std::vector<int> top{add({0, 0, Lc}, kTrunkPart)};
  auto dome_out = [&](const Eigen::Vector3d& c) {
    return Eigen::Vector3d(c.x() / (A * A), c.y() / (B * B), c.z() / (Lc * Lc));
  };
  join(top, crown.front(), kCrownSurface, kTrunkPart, dome_out);
  for (size_t k = 0; k + 1 < crown.size(); ++k)
    join(crown[k], crown[k + 1], kCrownSurface, kTrunkPart, dome_out);
  return crown.back();
}

// Trunk: CEJ -> crest -> furcation plane (a ring exactly at the crest when the crest lies on the
// trunk, which is then recorded as a crest ring); returns the rim at the furcation plane.
std::vector<int> Builder::trunk(const std::vector<int>& cervix, int n_around) {
  if (bone_.loss.defect_depth_mm > 0 && outer_crest_z_mm(bone_) > -tooth_.trunk_length_mm)
    return trunk_with_defect(cervix, n_around);
  const double A = tooth_.cervix_half_x_mm, B = tooth_.cervix_half_y_mm;
  const double T = tooth_.trunk_length_mm;
  const double zf = -T, zc = outer_crest_z_mm(bone_);
  auto trunk_ring = [&](double z) {
    const double f = -z / T;
    return ring(0, 0, A + (tooth_.furcation_half_x_mm - A) * f,
                B + (tooth_.furcation_half_y_mm - B) * f, z, n_around, kTrunkPart);
  };
  auto lateral = [](const Eigen::Vector3d& c) { return Eigen::Vector3d(c.x(), c.y(), 0); };
  std::vector<int> prev = cervix;
  const bool above =
      zc > zf;  // crest on the trunk; else on the roots (level through the furcation)
  const double z_split = above ? zc : zf;
  const int n1 = std::max(1, static_cast<int>(std::ceil(-z_split / h_)));
  for (int k = 1; k <= n1; ++k) {
    std::vector<int> r = trunk_ring(z_split * k / n1);
    join(prev, r, kExposedRoot, kTrunkPart, lateral);
    prev = r;
  }
  if (above) {
    crest_rings_.push_back(prev);
    const int n2 = std::max(1, static_cast<int>(std::ceil((zc - zf) / h_)));
    for (int k = 1; k <= n2; ++k) {
      std::vector<int> r = trunk_ring(zc + (zf - zc) * k / n2);
      join(prev, r, kRootSurface, kTrunkPart, lateral);
      prev = r;
    }
  }
  return prev;
}

// Crest height (z) over the point p: the outer crest lowered by the angular defect's profile at
// p's polar angle around the tooth's axis (as the thin layer's attach()).
double Builder::crest_z(const Eigen::Vector2d& p) const {
  if (bone_.loss.defect_depth_mm <= 0) return outer_crest_z_mm(bone_);
  return outer_crest_z_mm(bone_) -
         bone_.loss.defect_depth_mm * detail::defect_weight(bone_.loss, std::atan2(p.y(), p.x()));
}

// Trunk with an angular defect (the crest on the trunk everywhere): the crest ring follows the
// defect's profile (each point at the crest over its own polar angle, found by three fixed-point
// steps, as the ring's sections change with height), the rings above and below it spread evenly
// between the CEJ, that ring and the furcation plane.
std::vector<int> Builder::trunk_with_defect(const std::vector<int>& cervix, int n_around) {
  const double A = tooth_.cervix_half_x_mm, B = tooth_.cervix_half_y_mm;
  const double T = tooth_.trunk_length_mm, zf = -T;
  auto point = [&](int i, double z) {
    const double f = -z / T, th = 2 * kPi * i / n_around;
    return Eigen::Vector3d((A + (tooth_.furcation_half_x_mm - A) * f) * std::cos(th),
                           (B + (tooth_.furcation_half_y_mm - B) * f) * std::sin(th), z);
  };
  std::vector<double> crest(n_around, outer_crest_z_mm(bone_));
  for (int i = 0; i < n_around; ++i)
    for (int step = 0; step < 3; ++step) crest[i] = crest_z(point(i, crest[i]).head<2>());
  const double lowest = *std::min_element(crest.begin(), crest.end());
  const double highest = *std::max_element(crest.begin(), crest.end());
  auto lateral = [](const Eigen::Vector3d& c) { return Eigen::Vector3d(c.x(), c.y(), 0); };
  auto next_ring = [&](const std::vector<int>& prev, int marker, auto z_of) {
    std::vector<int> r;
    for (int i = 0; i < n_around; ++i) r.push_back(add(point(i, z_of(i)), kTrunkPart));
    join(prev, r, marker, kTrunkPart, lateral);
    return r;
  };
  std::vector<int> prev = cervix;
  const int n1 = std::max(1, static_cast<int>(std::ceil(-lowest / h_)));
  for (int k = 1; k <= n1; ++k)
    prev = next_ring(prev, kExposedRoot, [&](int i) { return crest[i] * k / n1; });
  crest_rings_.push_back(prev);
  const int n2 = std::max(1, static_cast<int>(std::ceil((highest - zf) / h_)));
  for (int k = 1; k <= n2; ++k)
    prev =
        next_ring(prev, kRootSurface, [&](int i) { return crest[i] + (zf - crest[i]) * k / n2; });
  return prev;
}

// Depths below the furcation plane of a root's rings: above the crest (crest below the furcation
// plane) uniform, below it crowding toward the apex; a cylinder ends with a ring at its full
// length (closed by a flat disc).
std::vector<double> root_ring_depths(const RootSpec& spec, double tc, double h) {
  std::vector<double> depths;
  const int m_up = tc > 0 ? std::max(1, static_cast<int>(std::ceil(tc / h))) : 0;
  for (int j = 0; j < m_up; ++j) depths.push_back(tc * j / m_up);
  const double below = spec.length_mm - tc;
  const int m_lo = std::max(4, static_cast<int>(std::ceil(below / h)));
  for (int j = 0; j < m_lo; ++j) {
    const double v = static_cast<double>(j) / m_lo;
    depths.push_back(tc + below * (1 - (1 - v) * (1 - v)));
  }
  if (spec.profile == RootProfile::kCylinder) depths.push_back(spec.length_mm);
  return depths;
}

// With a lesion: rings exactly at both levels (t1, t2 below the furcation plane, either order),
// uniform above and between them, crowding toward the apex below.
std::vector<double> root_ring_depths_lesion(const RootSpec& spec, double t1, double t2, double h) {
  const double a = std::min(t1, t2), b = std::max(t1, t2);
  std::vector<double> depths;
  const int m1 = a > 0 ? std::max(1, static_cast<int>(std::ceil(a / h))) : 0;
  for (int j = 0; j < m1; ++j) depths.push_back(a * j / m1);
  const int m2 = std::max(1, static_cast<int>(std::ceil((b - a) / h)));
  for (int j = 0; j < m2; ++j) depths.push_back(a + (b - a) * j / m2);
  for (double t : root_ring_depths(spec, b, h))
    if (t >= b) depths.push_back(t);
  return depths;
}

// An angular defect under an outer crest below the furcation plane (the septum at the roof): per
// point i of root r's rings, the depth below the furcation plane of the crest over its polar angle
// around the tooth's axis (three fixed-point steps, as the root's sections move with depth);
// t_out_ everywhere without a defect.
std::vector<double> Builder::crest_depths(size_t r, int n) const {
  std::vector<double> crest(n, t_out_);
  if (!lesion_ || bone_.loss.defect_depth_mm <= 0) return crest;
  const double zf = -tooth_.trunk_length_mm;
  for (int i = 0; i < n; ++i)
    for (int step = 0; step < 3; ++step)
      crest[i] = zf - crest_z(root_ring_point(tooth_.roots[r], crest[i], i, n));
  return crest;
}

// A ring's depth t (its ring at t_out_ the crest ring) at a point whose crest lies crest_t below
// the furcation plane: piecewise linear through the foot, the crest ring (to crest_t), the
// septum's top in a lesion (unmoved, a plane) and the apex, so the rings between two of these
// spread in the same proportions (validate_multi_root_mesh keeps the crest 0.6 mm above a lower
// septum's top).
double Builder::warped_depth(const RootSpec& spec, double t, double crest_t) const {
  if (crest_t == t_out_) return t;
  std::vector<std::pair<double, double>> knots{{0.0, 0.0}, {t_out_, crest_t}};
  if (t_in_ > 0) knots.emplace_back(t_in_, t_in_);
  knots.emplace_back(spec.length_mm, spec.length_mm);
  std::sort(knots.begin(), knots.end());
  for (size_t k = 1; k < knots.size(); ++k)
    if (t <= knots[k].first) {
      const auto [t0, d0] = knots[k - 1];
      const auto [t1, d1] = knots[k];
      return d0 + (d1 - d0) * (t - t0) / (t1 - t0);
    }
  return t;
}

// Root r: rings from the foot down, the apex a pole; returns the foot ring.
std::vector<int> Builder::root(size_t r) {
  const RootSpec& spec = tooth_.roots[r];
  const double zf = -tooth_.trunk_length_mm, zc = outer_crest_z_mm(bone_);
  const bool above = zc > zf;
  const int part = static_cast<int>(r);
  const int n = root_ring_size(spec, h_);
  auto out = [&](const Eigen::Vector3d& c) {
    const Eigen::Vector2d o = root_centre(spec, zf - c.z());
    return Eigen::Vector3d(c.x() - o.x(), c.y() - o.y(), -0.05 * spec.half_x_mm);
  };
  const double tc = above ? 0.0 : zf - zc;
  const std::vector<double> depths =
      lesion_ ? root_ring_depths_lesion(spec, t_out_, t_in_, h_) : root_ring_depths(spec, tc, h_);
  const bool cylinder = spec.profile == RootProfile::kCylinder;
  const std::vector<double> crest = crest_depths(r, n);
  std::vector<int> foot, prev_r;
  rings_.emplace_back();
  ring_t_.emplace_back();
  for (size_t j = 0; j < depths.size(); ++j) {
    const double t = depths[j];
    std::vector<int> rr;
    for (int i = 0; i < n; ++i) {
      const double ti = warped_depth(spec, t, crest[i]);
      const Eigen::Vector2d p = root_ring_point(spec, ti, i, n);
      rr.push_back(add({p.x(), p.y(), zf - ti}, part));
    }
    if (j == 0) {
      foot = rr;
    } else {
      const size_t first = tris_.size();
      join(prev_r, rr, t <= tc + 1e-12 ? kExposedRoot : kRootSurface, part, out);
      if (lesion_) mark_lesion_band(r, first, t, rr);
    }
    if (!above && !lesion_ && std::abs(t - tc) < 1e-12) crest_rings_.push_back(rr);
    rings_.back().push_back(rr);
    ring_t_.back().push_back(t);
    prev_r = rr;
  }
  const Eigen::Vector2d c = root_centre(spec, spec.length_mm);
  const std::vector<int> apex{add({c.x(), c.y(), zf - spec.length_mm}, part)};
  const size_t before = tris_.size();
  join(prev_r, apex, kRootSurface, part, [&](const Eigen::Vector3d& q) {
    return Eigen::Vector3d(0.2 * (q.x() - c.x()), 0.2 * (q.y() - c.y()), -1.0);
  });
  if (cylinder)
    for (size_t i = before; i < tris_.size(); ++i) {
      std::array<int, 3> g = tris_[i].v;
      std::sort(g.begin(), g.end());
      flat_.insert(g);
    }
  return foot;
}

// Two-level attachment (a lesion, or the septum at the roof under a lower crest): a ring point is
// outer when it lies on the hull of the roots' rings (within the thin layer's 0.05 mm margin,
// multi_root_tooth.cpp) at the crest's or the septum's depth; each root's outer points must form
// one arc (start to end counter-clockwise), the roots are ordered counter-clockwise around the
// mean of their feet. Each column's attachment starts at the crest (outer), at the septum's top
// (inside a lesion) or at the roof (the septum at the roof).
void Builder::classify_hull() {
  const size_t R = tooth_.roots.size();
  outer_.assign(R, {});
  for (size_t r = 0; r < R; ++r) outer_[r].assign(root_ring_size(tooth_.roots[r], h_), 0);
  for (double t : {t_out_, t_in_}) {
    std::vector<detail::HullPoint> all;
    for (size_t r = 0; r < R; ++r)
      for (size_t i = 0; i < outer_[r].size(); ++i)
        all.push_back({root_ring_point(tooth_.roots[r], t, static_cast<int>(i),
                                       static_cast<int>(outer_[r].size())),
                       static_cast<int>(r)});
    const std::vector<detail::HullPoint> hull = detail::convex_hull(all);
    size_t k = 0;
    for (size_t r = 0; r < R; ++r)
      for (size_t i = 0; i < outer_[r].size(); ++i)
        outer_[r][i] |= detail::inside_depth(hull, all[k++].p) <= 0.05;
  }
  Eigen::Vector2d mean = Eigen::Vector2d::Zero();
  for (const RootSpec& spec : tooth_.roots)
    mean += Eigen::Vector2d(spec.foot_x_mm, spec.foot_y_mm) / R;
  arc_start_.assign(R, -1);
  arc_end_.assign(R, -1);
  for (size_t r = 0; r < R; ++r) {
    const std::vector<char>& o = outer_[r];
    const int n = static_cast<int>(o.size());
    int starts = 0;
    for (int i = 0; i < n; ++i) {
      if (o[i] && !o[(i + n - 1) % n]) ++starts, arc_start_[r] = i;
      if (o[i] && !o[(i + 1) % n]) arc_end_[r] = i;
    }
    if (starts != 1)
      throw MeshError("meshing the furcation lesion: root " + std::to_string(r + 1) +
                      " meets the "
                      "roots' hull in " +
                      std::to_string(starts) + " arcs instead of one");
    order_.push_back(static_cast<int>(r));
  }
  auto angle = [&](int r) {
    return std::atan2(tooth_.roots[r].foot_y_mm - mean.y(), tooth_.roots[r].foot_x_mm - mean.x());
  };
  std::sort(order_.begin(), order_.end(), [&](int a, int b) { return angle(a) < angle(b); });
  top_.assign(R, {});
  for (size_t r = 0; r < R; ++r)
    for (size_t i = 0; i < outer_[r].size(); ++i)
      top_[r].push_back(inner_column(r, static_cast<int>(i)) ? (partial_ ? 0.0 : t_in_) : t_out_);
  if (partial_) partial_lesion_columns();
}

// Degree I or II: each entrance's hull edge (the one facing its probing direction) and the inner
// columns whose foot-level midpoint lies within the horizontal depth of the entrance (measured
// from the roots' hull along the probing direction, as the thin layer does; deepened where the
// back edge would graze a root: lesion_reach), on every root, the entrance's two columns always.
// A hull edge whose two columns differ is split where the back edge crosses it
// (split_hull_edges); small pieces cut off beside a root go to the septum (settle_lesion_loops).
void Builder::partial_lesion_columns() {
  const FurcationInvolvement& f = bone_.furcation;
  const double depth = f.horizontal_mm > 0 ? f.horizontal_mm : (f.degree == 1 ? 2.0 : 4.0);
  const int R = static_cast<int>(order_.size());
  auto foot = [&](int r, int i) { return foot_point(r, i); };
  std::vector<std::vector<int>> label(top_.size());
  for (size_t r = 0; r < top_.size(); ++r) label[r].assign(top_[r].size(), -1);
  std::vector<Eigen::Vector2d> direction(R, Eigen::Vector2d::Zero());
  std::vector<double> level(R, 0.0);  // the back edge's line: p . direction = level
  for (FurcationEntrance e : f.entrances) {
    const Eigen::Vector2d d = e == FurcationEntrance::kBuccal    ? Eigen::Vector2d(1, 0)
                              : e == FurcationEntrance::kLingual ? Eigen::Vector2d(-1, 0)
                              : e == FurcationEntrance::kMesial  ? Eigen::Vector2d(0, 1)
                                                                 : Eigen::Vector2d(0, -1);
    double support = -1e300;
    for (size_t r = 0; r < top_.size(); ++r)
      for (size_t i = 0; i < top_[r].size(); ++i)
        support = std::max(support, foot(static_cast<int>(r), static_cast<int>(i)).dot(d));
    // The entrance: the hull edge whose midpoint lies farthest along d.
    auto hull_mid = [&](int k) {
      const int P = order_[k], Q = order_[(k + 1) % R];
      return (0.5 * (foot(P, arc_end_[P]) + foot(Q, arc_start_[Q]))).eval();
    };
    int k = 0;
    for (int j = 1; j < R; ++j)
      if (hull_mid(j).dot(d) > hull_mid(k).dot(d)) k = j;
    direction[k] = d;
    const double reach = lesion_reach(d, support, depth);
    auto within = [&](const Eigen::Vector2d& p) { return support - p.dot(d) <= reach; };
    for (size_t r = 0; r < top_.size(); ++r)
      for (int c = 0; c < static_cast<int>(top_[r].size()); ++c)
        if (inner_column(r, c) && within(0.5 * (foot(r, c) + foot(r, c + 1))))
          label[r][c] = label[r][c] < 0 ? k : R;  // R: two lesions meet (split_inner_loop)
    level[k] = support - reach;
    // The lesion enters at its hull edge on both roots.
    const int P = order_[k], Q = order_[(k + 1) % R], nq = static_cast<int>(top_[Q].size());
    label[P][arc_end_[P]] = label[Q][(arc_start_[Q] + nq - 1) % nq] = k;
  }
  settle_lesion_loops(&label, direction, level);
  for (size_t r = 0; r < top_.size(); ++r)
    for (size_t c = 0; c < top_[r].size(); ++c)
      if (label[r][c] >= 0) top_[r][c] = t_in_;
  for (HullSplit& h : hull_split_)
    if (h.active) h.roof = add({h.xy.x(), h.xy.y(), -tooth_.trunk_length_mm}, kRoofPart);
}

// The depth to which a lesion from direction d (support: the roots' farthest foot point along d)
// takes the roots' columns: the requested depth, deepened as follows.
// Where the back edge's line runs along a root's face (within 30 degrees) closer than two
// ligament widths beyond it, or passes within two widths of a root's tip, the septum's strip
// there would be thinner than the socket's layer and the back wall would cut into it: the
// face or tip goes into the lesion and the line moves two widths past it (a few passes, as the
// moved line may meet another face).
double Builder::lesion_reach(const Eigen::Vector2d& d, double support, double depth) const {
  auto foot = [&](int r, int i) { return foot_point(r, i); };
  const double clear = 2 * bone_.pdl.crest_width_mm;
  double reach = depth;
  for (int pass = 0; pass < 4; ++pass) {
    double deeper = reach;
    for (size_t r = 0; r < top_.size(); ++r)
      for (int c = 0; c < static_cast<int>(top_[r].size()); ++c) {
        const Eigen::Vector2d p = foot(r, c), q = foot(r, c + 1);
        const double mid = support - 0.5 * (p + q).dot(d);
        if (inner_column(r, c) && mid > reach && mid <= reach + clear &&
            std::abs((q - p).normalized().dot(d)) < 0.5)
          deeper = std::max(deeper, support - std::min(p.dot(d), q.dot(d)) + clear);
        // A root's tip (deepest or shallowest point of its ring along d) within two widths of
        // the line, on either side: the back wall would graze it.
        const Eigen::Vector2d o = foot(r, c - 1);
        const double tip = support - p.dot(d);
        const bool extreme = (o.dot(d) - p.dot(d)) * (q.dot(d) - p.dot(d)) > 0;
        const int n = static_cast<int>(top_[r].size());
        if (inner_column(r, c) && inner_column(r, (c + n - 1) % n) && extreme &&
            std::abs(tip - reach) < clear)
          deeper = std::max(deeper, tip + clear);
      }
    if (deeper == reach) break;
    reach = deeper;
  }
  return reach;
}

// Lesion and septum loops across the roof for the labelled columns (hull splits included).
void Builder::settle_lesion_loops(std::vector<std::vector<int>>* labels,
                                  const std::vector<Eigen::Vector2d>& direction,
                                  const std::vector<double>& level) {
  std::vector<std::vector<int>>& label = *labels;
  // A piece of a lesion cut off beside a hull edge or a root (the back edge's line crossing the
  // roof twice there) smaller than kMinPiece of roof goes to the septum: its walls would pass
  // within a socket's width of the roots.
  constexpr double kMinPiece = 0.5;  // mm^2
  for (int pass = 0;; ++pass) {
    split_hull_edges(label, direction, level);
    partial_lesion_loops(label, direction);
    bool changed = false;
    for (size_t l = 0; l < split_.lesion_loops.size(); ++l) {
      const std::vector<int>& loop = split_.lesion_loops[l];
      if (split_.lesion_area_mm2[l] >= kMinPiece || pass > 3 ||
          std::find(loop.begin(), loop.end(), entry_[split_.lesion_label[l]]) != loop.end())
        continue;
      for (int m : loop)
        if (inner_loop_[m][0] >= 0) label[inner_loop_[m][0]][inner_loop_[m][1]] = -1;
      changed = true;
    }
    if (!changed) break;
  }
}

// A hull edge whose two columns differ (a lesion on one root's side only): the lesion's back edge
// crosses it where the line p . direction = level does (kept 15 % of the edge from either end), a
// new roof point there.
void Builder::split_hull_edges(const std::vector<std::vector<int>>& label,
                               const std::vector<Eigen::Vector2d>& direction,
                               const std::vector<double>& level) {
  const int R = static_cast<int>(order_.size());
  hull_split_.assign(R, HullSplit{});
  for (int j = 0; j < R; ++j) {
    const int P = order_[j], Q = order_[(j + 1) % R];
    const int np = static_cast<int>(top_[P].size()), nq = static_cast<int>(top_[Q].size());
    const int lp = label[P][arc_end_[P]], lq = label[Q][(arc_start_[Q] + nq - 1) % nq];
    if (lp == lq) continue;
    if (lp >= 0 && lq >= 0)
      throw MeshError("meshing the furcation lesion: two lesions meet on the roots' hull");
    const int L = std::max(lp, lq);
    const Eigen::Vector2d a = root_ring_point(tooth_.roots[P], 0.0, arc_end_[P], np);
    const Eigen::Vector2d b = root_ring_point(tooth_.roots[Q], 0.0, arc_start_[Q], nq);
    const double along = (b - a).dot(direction[L]);
    const double s = std::abs(along) < 1e-9 ? 0.5 : (level[L] - a.dot(direction[L])) / along;
    hull_split_[j].active = true;
    hull_split_[j].s = std::clamp(s, 0.15, 0.85);
    hull_split_[j].xy = a + hull_split_[j].s * (b - a);
  }
}

// The roof's inner loop (each root's inner arc in the reverse of the roots' order, joined along
// the hull) with its edges' labels, split into the lesions' and the septum's loops; a lesion's
// loop starts where it enters (its hull edge's end on order_[k]).
void Builder::partial_lesion_loops(const std::vector<std::vector<int>>& label,
                                   const std::vector<Eigen::Vector2d>& direction) {
  const int R = static_cast<int>(order_.size());
  std::vector<Eigen::Vector2d> pts;
  std::vector<int> edge_label, entry(R, -1);
  inner_loop_.clear();
  for (int k = R; k-- > 0;) {
    const int r = order_[k], n = static_cast<int>(top_[r].size());
    for (int i = arc_end_[r];; i = (i + 1) % n) {
      if (i == arc_end_[r]) entry[k] = static_cast<int>(pts.size());
      inner_loop_.push_back({r, i});
      pts.push_back(root_ring_point(tooth_.roots[r], 0.0, i, n));
      // Column i, then (at the arc's start) the hull edge, labelled as the column before it up
      // to its split point, as the next root's last column beyond.
      edge_label.push_back(label[r][i == arc_start_[r] ? (i + n - 1) % n : i]);
      if (i == arc_start_[r]) break;
    }
    const int j = (k + R - 1) % R;  // the hull edge from order_[j]'s arc end to r's arc start
    if (hull_split_[j].active) {
      inner_loop_.push_back({-1, j});
      pts.push_back(hull_split_[j].xy);
      edge_label.push_back(label[order_[j]][arc_end_[order_[j]]]);
    }
  }
  for (int& l : edge_label)
    if (l >= R) throw MeshError("meshing the furcation lesion: two lesions meet; use degree III");
  split_ = detail::split_inner_loop(pts, edge_label, direction, entry);
  entry_ = entry;
}

// Socket points of root r's vertex b between depths t1 and t2 below the furcation plane, bottom
// to top.
std::vector<int> Builder::socket_column(size_t r, int b, double t1, double t2,
                                        const std::map<int, std::vector<int>>& layer) const {
  std::vector<int> c;
  const size_t j1 = ring_level(r, t1), j2 = ring_level(r, t2);
  for (size_t j = std::max(j1, j2) + 1; j-- > std::min(j1, j2);)
    c.push_back(layer.at(rings_[r][j][b])[layers_]);
  return c;
}

// The bone's column below a hull edge's split point: at the depths of the roots' rings down to
// the lower of the crest and the septum's top, each point on the segment joining the two roots'
// ring points there at the split's fraction (the roots diverge: a vertical column would run into
// one of them), topped by the split point's socket point.
void Builder::split_columns(const std::map<int, std::vector<int>>& layer) {
  const double bottom = std::max(t_in_, t_out_);
  const int R = static_cast<int>(order_.size());
  const auto& x = points_.points();
  for (int k = 0; k < R; ++k) {
    HullSplit& h = hull_split_[k];
    if (h.roof < 0) continue;
    const int top = layer.at(h.roof)[layers_];
    const int P = order_[k], Q = order_[(k + 1) % R];
    const std::vector<double>& depths = ring_t_[P];
    for (size_t j = depths.size(); j-- > 1;) {
      if (depths[j] > bottom + 1e-12) continue;
      const Eigen::Vector3d a = x[rings_[P][j][arc_end_[P]]];
      const Eigen::Vector3d b = x[rings_[Q][ring_level(Q, depths[j])][arc_start_[Q]]];
      h.column.push_back(add(a + h.s * (b - a), INT_MIN));
      h.column_t.push_back(depths[j]);
    }
    h.column.push_back(top);
    h.column_t.push_back(0.0);
  }
}

// Hull edge k's split column between depths t1 and t2 (0: its socket point), bottom to top.
std::vector<int> Builder::hull_column(int k, double t1, double t2) const {
  const HullSplit& h = hull_split_[k];
  std::vector<int> c;
  for (size_t j = 0; j < h.column.size(); ++j)
    if (h.column_t[j] >= std::min(t1, t2) - 1e-12 && h.column_t[j] <= std::max(t1, t2) + 1e-12)
      c.push_back(h.column[j]);
  return c;
}

// Hull edge k (order_[k]'s arc end to the next root's arc start): the socket's crest loop along
// order_[k]'s outer arc (and the edge's split point), the wall of bone from the crest to the
// columns' tops facing the lower side (two walls, meeting at the split column, when a lesion holds
// one end only), and the roof's PDL ending along the part where the septum reaches the roof.
void Builder::hull_edge_walls(size_t k, const Eigen::Vector3d& centre,
                              const std::map<int, std::vector<int>>& layer) {
  const auto& x = points_.points();
  const size_t R = order_.size();
  const size_t r = order_[k], r2 = order_[(k + 1) % R];
  const std::vector<int>& ring_c = rings_[r][ring_level(r, t_out_)];
  const int n = static_cast<int>(ring_c.size()), n2 = static_cast<int>(top_[r2].size());
  for (int i = arc_start_[r];; i = (i + 1) % n) {
    outer_top_.push_back(layer.at(ring_c[i])[layers_]);
    if (i == arc_end_[r]) break;
  }
  const double t_a = top_[r][arc_end_[r]], t_b = top_[r2][(arc_start_[r2] + n2 - 1) % n2];
  const int foot_a = rings_[r][0][arc_end_[r]], foot_b = rings_[r2][0][arc_start_[r2]];
  auto wall = [&](std::vector<int> p, std::vector<int> q, double t) {
    Wall w{std::move(p), std::move(q), centre};
    if (t < t_out_) w.toward = 2 * x[w.p.front()] - centre;  // the septum stands up
    walls_.push_back(w);
  };
  const bool split = partial_ && hull_split_[k].roof >= 0;
  if (!split) {
    if (t_a != t_b)
      throw MeshError("meshing the furcation lesion: it reaches one root only at a hull edge");
    wall(socket_column(r, arc_end_[r], t_out_, t_a, layer),
         socket_column(r2, arc_start_[r2], t_out_, t_a, layer), t_a);
    if (t_a == 0)  // the roof's PDL ends along the hull edge
      free_strip(foot_a, foot_b, -Eigen::Vector3d::UnitZ(), layer);
    return;
  }
  const int c = hull_split_[k].roof;
  outer_top_.push_back(hull_column(static_cast<int>(k), t_out_, t_out_).front());
  wall(socket_column(r, arc_end_[r], t_out_, t_a, layer),
       hull_column(static_cast<int>(k), t_out_, t_a), t_a);
  wall(hull_column(static_cast<int>(k), t_out_, t_b),
       socket_column(r2, arc_start_[r2], t_out_, t_b, layer), t_b);
  free_strip(t_a == 0 ? foot_a : foot_b, c, -Eigen::Vector3d::UnitZ(), layer);
}

// Markers of the band of triangles join() just added to root r (two per column, column order),
// the lower ring at depth t: attached below the column's top (top_). Records the points of the
// bone's two tops (offset horizontally).
void Builder::mark_lesion_band(size_t r, size_t first, double t, const std::vector<int>& ring_r) {
  const int n = static_cast<int>(ring_r.size());
  const std::vector<double>& top = top_[r];
  for (int i = 0; i < n; ++i)
    for (int k = 0; k < 2; ++k)
      tris_[first + 2 * i + k].marker = t > top[i] + 1e-12 ? kRootSurface : kExposedRoot;
  for (int i = 0; i < n; ++i) {
    const bool inner = top[i] == t_in_ || top[(i + n - 1) % n] == t_in_;
    if (std::abs(t - t_out_) < 1e-12 && outer_[r][i]) horizontal_.insert(ring_r[i]);
    if (std::abs(t - t_in_) < 1e-12 && inner) horizontal_.insert(ring_r[i]);
  }
}

// Furcation roof: the rim minus the feet, triangulated in its plane.
void Builder::furcation_roof(const std::vector<int>& rim,
                             const std::vector<std::vector<int>>& feet) {
  const double zf = -tooth_.trunk_length_mm;
  const bool above = outer_crest_z_mm(bone_) > zf;
  if (!lesion_ || (t_in_ > 0 && !partial_)) {
    std::vector<std::vector<int>> outlines{rim};
    outlines.insert(outlines.end(), feet.begin(), feet.end());
    roof_domain(outlines, above ? kRootSurface : kExposedRoot);
    return;
  }
  // The septum at the roof under a crest below it: attached inside the roots' hull (the feet's
  // inner arcs joined along the hull), free outside it.
  std::vector<int> outer, inner;
  for (size_t k = 0; k < order_.size(); ++k) {
    const int r = order_[k], n = static_cast<int>(feet[r].size());
    for (int i = arc_start_[r];; i = (i + 1) % n) {
      outer.push_back(feet[r][i]);
      if (i == arc_end_[r]) break;
    }
    if (partial_ && hull_split_[k].roof >= 0) outer.push_back(hull_split_[k].roof);
  }
  for (size_t k = order_.size(); k-- > 0;) {
    const int r = order_[k], n = static_cast<int>(feet[r].size());
    for (int i = arc_end_[r];; i = (i + 1) % n) {
      inner.push_back(feet[r][i]);
      if (i == arc_start_[r]) break;
    }
  }
  roof_domain({rim, outer}, kExposedRoot);
  if (!partial_) {
    roof_domain({inner}, kRootSurface);
    return;
  }
  // Degree I or II: each lesion's loop free, the septum's loops attached.
  auto ids = [&](const std::vector<int>& loop) {
    std::vector<int> out;
    for (int m : loop) out.push_back(roof_vertex(m));
    return out;
  };
  for (const std::vector<int>& loop : split_.lesion_loops) roof_domain({ids(loop)}, kExposedRoot);
  for (const std::vector<int>& loop : split_.septum_loops) roof_domain({ids(loop)}, kRootSurface);
}

// Roof triangles in the domain bounded by the outlines (the first the outer boundary, the others
// holes), triangulated in the furcation plane.
void Builder::roof_domain(const std::vector<std::vector<int>>& outlines, int marker) {
  const double zf = -tooth_.trunk_length_mm;
  std::vector<std::vector<Eigen::Vector2d>> loops;
  std::vector<int> boundary;
  for (const std::vector<int>& loop : outlines) {
    loops.emplace_back();
    for (int i : loop) {
      loops.back().push_back(points_.points()[i].head<2>());
      boundary.push_back(i);
    }
  }
  std::vector<Eigen::Vector2d> pts2;
  const std::vector<std::array<int, 3>> roof = detail::triangulate_planar(loops, h_, &pts2);
  std::vector<int> index(pts2.size());
  for (size_t i = 0; i < pts2.size(); ++i)
    index[i] = i < boundary.size() ? boundary[i] : add({pts2[i].x(), pts2[i].y(), zf}, kRoofPart);
  for (const auto& t : roof)
    tri(index[t[0]], index[t[1]], index[t[2]], marker, kRoofPart, -Eigen::Vector3d::UnitZ());
}

void Builder::pdl_layer() {
  const std::map<int, std::vector<int>> layer = layer_points();
  prisms(layer);
  if (lesion_) {
    pdl_lesion(layer);
  } else {
    pdl_crest(layer);
  }
  // A point inside the PDL, mid-way across at the first root's mid-length.
  const auto& x = points_.points();
  const double zf = -tooth_.trunk_length_mm;
  for (const auto& [v, l] : layer) {
    if (part_[v] == 0 && x[v].z() < zf - 0.4 * tooth_.roots[0].length_mm) {
      hole_ = 0.5 * (x[l.front()] + x[l.back()]);
      break;
    }
  }
}

// Offset direction per attached vertex: area-weighted over the attached triangles, except where
// the roof meets a wall (the rim, convex, and the roots' top rings, concave): there the bisector
// of the roof's and the wall's mean directions, so that a narrow strip of roof does not tilt the
// offset, mitred so that both faces keep the width (the socket has a sharp corner there). On the
// crest ring horizontal, so the socket's crest ring stays in the crest plane.
std::map<int, Eigen::Vector3d> Builder::offset_directions(std::map<int, double>* miter) const {
  const auto& x = points_.points();
  std::map<int, Eigen::Vector3d> normal, wall, roof;
  for (const Tri& t : tris_) {
    if (t.marker != kRootSurface) continue;
    const Eigen::Vector3d n = (x[t.v[1]] - x[t.v[0]]).cross(x[t.v[2]] - x[t.v[0]]);
    for (int v : t.v) {
      normal.emplace(v, Eigen::Vector3d::Zero()).first->second += n;
      std::array<int, 3> g = t.v;
      std::sort(g.begin(), g.end());
      const bool flat = t.part == kRoofPart || flat_.count(g) > 0;
      (flat ? roof : wall).emplace(v, Eigen::Vector3d::Zero()).first->second += n.normalized();
    }
  }
  std::set<int> crest;
  for (const auto& r : crest_rings_) crest.insert(r.begin(), r.end());
  crest.insert(horizontal_.begin(), horizontal_.end());
  for (auto& [v, n] : normal) {
    double m = 1.0;
    if (roof.count(v) && wall.count(v)) {
      const Eigen::Vector3d r = roof[v].normalized(), w = wall[v].normalized();
      n = (r + w).normalized();
      m = 1.0 / std::max(n.dot(r), 0.6);
    }
    if (crest.count(v)) n.z() = 0;
    n.normalize();
    (*miter)[v] = m;
  }
  return normal;
}

// Per attached vertex: its points across the layer (the vertex itself first, the socket last),
// offset by the hourglass width profile of its part.
std::map<int, std::vector<int>> Builder::layer_points() {
  std::map<int, double> miter;
  const std::map<int, Eigen::Vector3d> normal = offset_directions(&miter);
  const auto& x = points_.points();
  const double zc = outer_crest_z_mm(bone_);
  const double zf = -tooth_.trunk_length_mm;
  const double lowest = lowest_apex_z_mm(tooth_);
  std::map<int, Eigen::Vector3d> offset;
  for (const auto& [v, n] : normal) {
    const int part = part_[v];
    const double apex = part >= 0 ? zf - tooth_.roots[part].length_mm : lowest;
    const double top = part >= 0 ? std::min(zc, zf) : zc;
    const double w = detail::pdl_width_profile(bone_.pdl, top, apex, x[v].z());
    offset[v] = w * miter[v] * n;
  }
  spread_foot_corners(&offset);
  std::map<int, std::vector<int>> layer;
  for (const auto& [v, o] : offset) {
    std::vector<int> l{v};
    for (int k = 1; k <= layers_; ++k)
      l.push_back(points_.add(x[v] + (static_cast<double>(k) / layers_) * o, detail::PointInfo{}));
    layer[v] = l;
  }
  part_.resize(points_.size(), INT_MIN);
  return layer;
}

// The socket's corner at a root's foot lies a width into the roof (horizontally); a roof point
// closer to the foot than that, offset straight down, would fold the socket's roof over that
// corner (most often beside a concave furcal face, where the corners' offsets converge). Roof
// points within three widths of a foot therefore move with the nearest foot corner's horizontal
// offset, fading linearly with distance: the order across the strip is kept (derived: the
// moved distance d + h (1 - d / 3w) grows with d while h < 3w) and the vertical offset, hence
// the layer's width under the roof, is unchanged.
void Builder::spread_foot_corners(std::map<int, Eigen::Vector3d>* offset) const {
  const auto& x = points_.points();
  auto horizontal = [&](int v) {
    const auto it = offset->find(v);
    return it == offset->end() ? Eigen::Vector2d::Zero().eval() : it->second.head<2>().eval();
  };
  for (auto& [v, o] : *offset) {
    if (part_[v] != kRoofPart) continue;
    const Eigen::Vector2d p = x[v].head<2>();
    double best = 1e300;
    Eigen::Vector2d h = Eigen::Vector2d::Zero();
    for (const std::vector<int>& foot : feet_)
      for (size_t i = 0; i < foot.size(); ++i) {
        const int a = foot[i], b = foot[(i + 1) % foot.size()];
        const Eigen::Vector2d xa = x[a].head<2>(), ab = x[b].head<2>() - xa;
        const double s = std::clamp((p - xa).dot(ab) / ab.squaredNorm(), 0.0, 1.0);
        const double d = (xa + s * ab - p).norm();
        if (d < best) best = d, h = (1 - s) * horizontal(a) + s * horizontal(b);
      }
    const double reach = 3 * std::abs(o.z());
    if (best < reach) o.head<2>() += h * (1 - best / reach);
  }
}

// Three tetrahedra per prism and layer over each attached triangle (split by sorted vertex
// numbers, so neighbours share faces), positively oriented; the socket triangles on top.
void Builder::prisms(const std::map<int, std::vector<int>>& layer) {
  const auto& x = points_.points();
  const size_t n_tris = tris_.size();
  for (size_t i = 0; i < n_tris; ++i) {
    const Tri t = tris_[i];
    if (t.marker != kRootSurface) continue;
    std::array<int, 3> v = t.v;
    std::sort(v.begin(), v.end());
    const std::vector<int>&l0 = layer.at(v[0]), &l1 = layer.at(v[1]), &l2 = layer.at(v[2]);
    for (int k = 0; k < layers_; ++k) {
      const int a = l0[k], b = l1[k], c = l2[k];
      const int a1 = l0[k + 1], b1 = l1[k + 1], c1 = l2[k + 1];
      for (const std::array<int, 4>& e :
           {std::array<int, 4>{a, a1, b1, c1}, std::array<int, 4>{a, b, c, c1},
            std::array<int, 4>{a, b, c1, b1}}) {
        pdl_tets_.push_back(e);
        pdl_tet_part_.push_back(t.part);
      }
    }
    const Eigen::Vector3d out = (x[t.v[1]] - x[t.v[0]]).cross(x[t.v[2]] - x[t.v[0]]);
    tri(layer.at(t.v[0])[layers_], layer.at(t.v[1])[layers_], layer.at(t.v[2])[layers_],
        kSocketSurface, INT_MIN, out);
  }
  for (auto& tet : pdl_tets_) {
    const double vol =
        (x[tet[1]] - x[tet[0]]).dot((x[tet[2]] - x[tet[0]]).cross(x[tet[3]] - x[tet[0]]));
    if (vol < 0) std::swap(tet[1], tet[2]);
  }
}

// Free top of the PDL at the crest, split like the prisms' side faces (not given to TetGen);
// records the socket's crest rings for the bone's top.
void Builder::pdl_crest(const std::map<int, std::vector<int>>& layer) {
  for (const std::vector<int>& ring_c : crest_rings_) {
    const int n = static_cast<int>(ring_c.size());
    std::vector<int> socket;
    for (int i = 0; i < n; ++i) {
      free_strip(ring_c[i], ring_c[(i + 1) % n], Eigen::Vector3d::UnitZ(), layer);
      socket.push_back(layer.at(ring_c[i])[layers_]);
    }
    socket_crests_.push_back(socket);
  }
}

// The PDL's free face across the layer over the root edge u-v (kPdlCrest, not given to TetGen),
// split like the prisms' side faces.
void Builder::free_strip(int u, int v, const Eigen::Vector3d& outward,
                         const std::map<int, std::vector<int>>& layer) {
  const std::vector<int>&l_lo = layer.at(std::min(u, v)), &l_hi = layer.at(std::max(u, v));
  for (int k = 0; k < layers_; ++k) {
    tri(l_lo[k], l_hi[k], l_hi[k + 1], kPdlCrest, INT_MIN, outward, false);
    tri(l_lo[k], l_hi[k + 1], l_lo[k + 1], kPdlCrest, INT_MIN, outward, false);
  }
}

// Two-level attachment: the PDL's free faces along each column's top ring (none where the septum
// reaches the roof), down the vertical edges where two columns' tops differ, and along the roof's
// hull edges where the septum meets the roof; the socket's loop at the crest (the outer arcs
// counter-clockwise, jumping from root to root along the hull) and, per hull edge, the two socket
// columns joined by a bone wall; then the lesion's floor (lesion_floor).
void Builder::pdl_lesion(const std::map<int, std::vector<int>>& layer) {
  const auto& x = points_.points();
  auto level = [&](size_t r, double t) { return ring_level(r, t); };
  for (size_t r = 0; r < rings_.size(); ++r) {
    const std::vector<std::vector<int>>& R = rings_[r];
    const std::vector<double>& top = top_[r];
    const int n = static_cast<int>(top.size());
    for (int i = 0; i < n; ++i) {
      if (top[i] == 0) continue;  // the septum at the roof: attached on
      const std::vector<int>& ring_r = R[level(r, top[i])];
      free_strip(ring_r[i], ring_r[(i + 1) % n], Eigen::Vector3d::UnitZ(), layer);
    }
    for (int i = 0; i < n; ++i) {  // where two columns' tops differ: the free side between them
      const int prev = (i + n - 1) % n;
      if (top[prev] == top[i]) continue;
      const int side = top[i] > top[prev] ? (i + 1) % n : prev;
      const size_t j1 = level(r, top[prev]), j2 = level(r, top[i]);
      for (size_t j = std::min(j1, j2); j < std::max(j1, j2); ++j)
        free_strip(R[j][i], R[j + 1][i], x[R[j][side]] - x[R[j][i]], layer);
    }
  }
  Eigen::Vector3d centre = Eigen::Vector3d::Zero();
  for (const RootSpec& spec : tooth_.roots)
    centre += Eigen::Vector3d(spec.foot_x_mm, spec.foot_y_mm, 0) / tooth_.roots.size();
  if (partial_) split_columns(layer);
  for (size_t k = 0; k < order_.size(); ++k) hull_edge_walls(k, centre, layer);
  lesion_floor(layer);
}

// The lesion's floor: the socket's loop at the septum's top (degree III: the inner arcs, the
// roots in the reverse order; degree I or II: the lesion's arcs on its two roots), and for
// degree I or II the back wall from the floor up to the socket's roof with the roof's PDL
// ending along it.
void Builder::lesion_floor(const std::map<int, std::vector<int>>& layer) {
  auto level = [&](size_t r, double t) { return ring_level(r, t); };
  auto socket = [&](int v) { return layer.at(v)[layers_]; };
  auto arc = [&](size_t r, int from, int to, std::vector<int>* out) {
    const std::vector<int>& ring_s = rings_[r][level(r, t_in_)];
    const int n = static_cast<int>(ring_s.size());
    for (int i = from;; i = (i + 1) % n) {
      out->push_back(socket(ring_s[i]));
      if (i == to) break;
    }
  };
  if (t_in_ == 0) return;
  if (!partial_) {
    floors_.emplace_back();
    for (size_t k = order_.size(); k-- > 0;)
      arc(order_[k], arc_end_[order_[k]], arc_start_[order_[k]], &floors_.back());
    return;
  }
  const auto& x = points_.points();
  // Socket (or bone) points from the septum's top up to depth t (0: the roof).
  auto column = [&](int m, double t) {
    const auto [r, i] = inner_loop_[m];
    return r >= 0 ? socket_column(r, i, t_in_, t, layer) : hull_column(i, t_in_, t);
  };
  for (size_t l = 0; l < split_.lesion_loops.size(); ++l) {
    floors_.emplace_back();
    for (int m : split_.lesion_loops[l]) floors_.back().push_back(column(m, t_in_).front());
    for (const auto& [a, b] : split_.cuts[l]) {
      // The back wall faces the lesion (on lesion_side of a -> b at the roof).
      const Eigen::Vector3d pa = x[roof_vertex(a)], pb = x[roof_vertex(b)];
      const Eigen::Vector3d left(pa.y() - pb.y(), pb.x() - pa.x(), 0);
      walls_.push_back(
          Wall{column(a, 0.0), column(b, 0.0), 0.5 * (pa + pb) + split_.lesion_side[l] * left});
      free_strip(roof_vertex(a), roof_vertex(b), -Eigen::Vector3d::UnitZ(), layer);
    }
  }
}

void Builder::bone_block() {
  const auto& x = points_.points();
  const double zc = outer_crest_z_mm(bone_);
  Eigen::Vector3d lo(1e300, 1e300, 1e300), hi(-1e300, -1e300, -1e300);
  for (const Tri& t : tris_)
    if (t.marker == kSocketSurface)
      for (int v : t.v) lo = lo.cwiseMin(x[v]), hi = hi.cwiseMax(x[v]);
  const double xL = lo.x() - 2.0, xB = hi.x() + 1.5, yD = lo.y() - 1.5, yM = hi.y() + 1.5;
  const double zb = lo.z() - 3.0;
  const double hb = 1.5 * h_;
  // Rectangle boundary, counter-clockwise from the disto-lingual corner, corners included once.
  const std::array<Eigen::Vector2d, 4> corner{Eigen::Vector2d(xL, yD), Eigen::Vector2d(xB, yD),
                                              Eigen::Vector2d(xB, yM), Eigen::Vector2d(xL, yM)};
  std::vector<Eigen::Vector2d> rect;
  std::array<std::vector<Eigen::Vector2d>, 4> side_pts;
  for (int s = 0; s < 4; ++s) {
    const Eigen::Vector2d a = corner[s], b = corner[(s + 1) % 4];
    const int n = std::max(2, static_cast<int>(std::ceil((b - a).norm() / hb)));
    for (int k = 0; k <= n; ++k) {
      const Eigen::Vector2d p = a + (b - a) * (static_cast<double>(k) / n);
      side_pts[s].push_back(p);
      if (k < n) rect.push_back(p);
    }
  }
  auto planar = [&](const std::vector<std::vector<Eigen::Vector2d>>& loops,
                    const std::vector<int>& known, const ZOf& z_of, int marker,
                    const Eigen::Vector3d& out) {
    std::vector<Eigen::Vector2d> p2;
    const auto t2 = detail::triangulate_planar(loops, hb, &p2);
    std::vector<int> idx(p2.size());
    for (size_t i = 0; i < p2.size(); ++i)
      idx[i] = i < known.size() && known[i] >= 0
                   ? known[i]
                   : add({p2[i].x(), p2[i].y(), z_of(p2[i])}, INT_MIN);
    for (const auto& t : t2) tri(idx[t[0]], idx[t[1]], idx[t[2]], marker, INT_MIN, out);
  };
  // Top: the rectangle around the socket's crest ring.
  std::vector<std::vector<Eigen::Vector2d>> top_loops{rect};
  std::vector<int> known(rect.size(), -1);
  std::vector<std::vector<int>> holes = socket_crests_;
  if (lesion_) holes.push_back(outer_top_);
  for (const std::vector<int>& loop : holes) {
    top_loops.emplace_back();
    for (int v : loop) {
      top_loops.back().push_back(x[v].head<2>());
      known.push_back(v);
    }
  }
  // The top follows the crest (lowered by an angular defect over its polar angle).
  const ZOf top = [&](const Eigen::Vector2d& p) { return crest_z(p); };
  planar(top_loops, known, top, kFreeBone, Eigen::Vector3d::UnitZ());
  if (lesion_) lesion_bone_top(planar);
  planar(
      {rect}, {}, [&](const Eigen::Vector2d&) { return zb; }, kFixedBone,
      -Eigen::Vector3d::UnitZ());
  // Sides.
  const int nz = std::max(2, static_cast<int>(std::ceil((zc - zb) / (2 * h_))));
  const std::array<Eigen::Vector3d, 4> outward{-Eigen::Vector3d::UnitY(), Eigen::Vector3d::UnitX(),
                                               Eigen::Vector3d::UnitY(), -Eigen::Vector3d::UnitX()};
  const std::array<int, 4> marker{kFixedBone, kFreeBone, kFixedBone, kFreeBone};
  for (int s = 0; s < 4; ++s) {
    std::vector<std::vector<int>> rows;
    for (int j = 0; j <= nz; ++j) {
      std::vector<int> row;
      for (const Eigen::Vector2d& p : side_pts[s])
        row.push_back(add({p.x(), p.y(), zb + (top(p) - zb) * j / nz}, INT_MIN));
      rows.push_back(row);
    }
    for (int j = 0; j < nz; ++j)
      for (size_t c = 0; c + 1 < rows[j].size(); ++c) {
        tri(rows[j][c], rows[j][c + 1], rows[j + 1][c + 1], marker[s], INT_MIN, outward[s]);
        tri(rows[j][c], rows[j + 1][c + 1], rows[j + 1][c], marker[s], INT_MIN, outward[s]);
      }
  }
  bone_seed_ = Eigen::Vector3d(xB - 0.3, yM - 0.3, zb + 0.3);
}

// Two-level attachment: the lesions' floors (planes at the septum's top inside their socket
// loops) and the walls of bone between two roots' socket columns (zipped bottom to top, no new
// points), each facing its lower side.
void Builder::lesion_bone_top(const Planar& planar) {
  const auto& x = points_.points();
  const double zs = -tooth_.trunk_length_mm - t_in_;
  for (const std::vector<int>& floor : floors_) {  // none: the septum's top is the socket's roof
    std::vector<Eigen::Vector2d> loop;
    for (int v : floor) loop.push_back(x[v].head<2>());
    planar(
        {loop}, floor, [&](const Eigen::Vector2d&) { return zs; }, kFreeBone,
        Eigen::Vector3d::UnitZ());
  }
  for (const auto& [P, Q, toward] : walls_) {
    const Eigen::Vector3d d = x[Q.front()] - x[P.front()];
    Eigen::Vector3d out(d.y(), -d.x(), 0);
    if (out.dot(toward - x[P.front()]) < 0) out = -out;  // toward the lower side
    size_t i = 0, j = 0;
    while (i + 1 < P.size() || j + 1 < Q.size()) {
      const bool step_p =
          j + 1 >= Q.size() || (i + 1 < P.size() && x[P[i + 1]].z() <= x[Q[j + 1]].z());
      if (step_p) {
        tri(P[i], Q[j], P[i + 1], kFreeBone, INT_MIN, out);
        ++i;
      } else {
        tri(P[i], Q[j], Q[j + 1], kFreeBone, INT_MIN, out);
        ++j;
      }
    }
  }
}

// PLC: every triangle but the PDL's free top; from_plc maps PLC points to ours.
Plc Builder::make_plc(std::vector<int>* from_plc) const {
  Plc plc;
  std::vector<int> to_plc(points_.size(), -1);
  for (const Tri& t : tris_) {
    if (!t.to_tetgen) continue;
    std::array<int, 3> q{};
    for (int k = 0; k < 3; ++k) {
      int& i = to_plc[t.v[k]];
      if (i < 0) {
        i = static_cast<int>(plc.points.size());
        plc.points.push_back(points_.points()[t.v[k]]);
        from_plc->push_back(t.v[k]);
      }
      q[k] = i;
    }
    plc.triangles.push_back(q);
    plc.triangle_marker.push_back(t.marker);
  }
  return plc;
}

// The preserved triangles must be element faces, or the PDL would not conform.
void Builder::check_conforming(const VolumeMesh& linear) const {
  std::set<std::array<int, 3>> faces;
  for (int e = 0; e < linear.n_elements(); ++e) {
    const int* t = linear.element(e);
    for (const auto& f :
         {std::array<int, 3>{t[0], t[1], t[2]}, std::array<int, 3>{t[0], t[1], t[3]},
          std::array<int, 3>{t[0], t[2], t[3]}, std::array<int, 3>{t[1], t[2], t[3]}}) {
      std::array<int, 3> g = f;
      std::sort(g.begin(), g.end());
      faces.insert(g);
    }
  }
  int missing = 0;
  for (const Tri& t : tris_) {
    if (!t.to_tetgen) continue;
    std::array<int, 3> g = t.v;
    std::sort(g.begin(), g.end());
    missing += faces.count(g) == 0;
  }
  if (missing > 0)
    throw MeshError("meshing the multi-rooted tooth: TetGen changed " + std::to_string(missing) +
                    " preserved surface triangles, so the PDL would not conform");
}

// TetGen's mesh in our point numbering (our points first, TetGen's new ones after); tooth and
// bone elements get no part.
VolumeMesh renumbered(const VolumeMesh& tet, const std::vector<Eigen::Vector3d>& points,
                      const std::vector<int>& point_node, const std::vector<int>& from_plc,
                      std::vector<int>* element_part) {
  VolumeMesh linear;
  linear.nodes_per_element = 4;
  linear.nodes_per_face = 3;
  linear.nodes = points;
  std::vector<int> node_map(tet.n_nodes(), -1);
  for (size_t i = 0; i < point_node.size(); ++i)
    if (point_node[i] >= 0) node_map[point_node[i]] = from_plc[i];
  for (int i = 0; i < tet.n_nodes(); ++i) {
    if (node_map[i] >= 0) continue;
    node_map[i] = static_cast<int>(linear.nodes.size());
    linear.nodes.push_back(tet.nodes[i]);
  }
  for (int e = 0; e < tet.n_elements(); ++e) {
    for (int k = 0; k < 4; ++k) linear.elements.push_back(node_map[tet.element(e)[k]]);
    linear.element_region.push_back(tet.element_region[e]);
    element_part->push_back(INT_MIN);
  }
  return linear;
}

MultiRootMesh Builder::build(const MultiRootMeshSizing& sizing, const std::atomic<bool>* cancel) {
  tooth_surface();
  pdl_layer();
  bone_block();
  std::vector<int> from_plc;
  Plc plc = make_plc(&from_plc);
  auto bound = [](double e) { return e * e * e / (6.0 * std::sqrt(2.0)); };
  plc.regions.push_back({Eigen::Vector3d(0, 0, 0.5 * tooth_.crown_length_mm), kTooth,
                         bound(std::max(2.0 * h_, sizing.bone_edge_mm))});
  plc.regions.push_back({bone_seed_, kCancellousBone, bound(sizing.bone_edge_mm)});
  plc.holes.push_back(hole_);
  TetgenOptions options;
  options.preserve_surface = true;
  options.second_order = false;
  options.cancel = cancel;
  options.stage = "tetrahedralising the multi-rooted tooth and its bone";
  std::vector<int> point_node;
  const VolumeMesh tet = tetrahedralize(plc, options, &point_node);

  MultiRootMesh out;
  VolumeMesh linear = renumbered(tet, points_.points(), point_node, from_plc, &out.element_part);
  check_conforming(linear);
  for (size_t i = 0; i < pdl_tets_.size(); ++i) {
    linear.elements.insert(linear.elements.end(), pdl_tets_[i].begin(), pdl_tets_[i].end());
    linear.element_region.push_back(kPdl);
    out.element_part.push_back(pdl_tet_part_[i]);
  }
  for (const Tri& t : tris_) {
    linear.faces.insert(linear.faces.end(), t.v.begin(), t.v.end());
    linear.face_marker.push_back(t.marker);
  }
  out.node_part.assign(linear.nodes.size(), INT_MIN);
  for (const Tri& t : tris_)
    if (t.part != INT_MIN)
      for (int v : t.v) out.node_part[v] = part_[v];
  out.mesh = sizing.second_order ? make_second_order(linear) : linear;
  out.node_part.resize(out.mesh.nodes.size(), INT_MIN);
  return out;
}

}  // namespace

namespace {
std::string mm(double v) {
  char text[32];
  std::snprintf(text, sizeof text, "%.2f mm", v);
  return text;
}
}  // namespace

// Degree I or II on a three-rooted tooth: how deep (mm, from the entrance along its probing
// direction, as the thin layer measures) a lesion can reach before its back edge meets the third
// root (the root not beside the entrance). Feet sampled at 360 points each. The mesh allows 0.7 mm
// less: the 0.3 mm margin of its other levels and two ligament widths, by which the back edge
// moves past a face or tip it grazes (partial_lesion_columns).
double partial_lesion_reach_mm(const MultiRootTooth& tooth, FurcationEntrance entrance) {
  std::vector<detail::HullPoint> pts;
  for (size_t r = 0; r < tooth.roots.size(); ++r) {
    const RootSpec& spec = tooth.roots[r];
    for (int i = 0; i < 360; ++i)
      pts.push_back({Eigen::Vector2d(spec.foot_x_mm, spec.foot_y_mm) +
                         root_section_offset(spec, 2 * kPi * i / 360),
                     static_cast<int>(r)});
  }
  const std::vector<detail::HullPoint> hull = detail::convex_hull(pts);
  const Eigen::Vector2d d = entrance == FurcationEntrance::kBuccal    ? Eigen::Vector2d(1, 0)
                            : entrance == FurcationEntrance::kLingual ? Eigen::Vector2d(-1, 0)
                            : entrance == FurcationEntrance::kMesial  ? Eigen::Vector2d(0, 1)
                                                                      : Eigen::Vector2d(0, -1);
  double support = -1e300;
  for (const detail::HullPoint& h : hull) support = std::max(support, h.p.dot(d));
  const size_t H = hull.size();
  size_t best = H;  // the entrance: the edge between two roots whose midpoint lies farthest along d
  for (size_t i = 0; i < H; ++i)
    if (hull[i].root != hull[(i + 1) % H].root &&
        (best == H ||
         (hull[i].p + hull[(i + 1) % H].p).dot(d) > (hull[best].p + hull[(best + 1) % H].p).dot(d)))
      best = i;
  const int a = hull[best].root, b = hull[(best + 1) % H].root;
  double reach = 1e300;
  for (const detail::HullPoint& q : pts)
    if (q.root != a && q.root != b) reach = std::min(reach, support - q.p.dot(d));
  return reach;
}

void validate_multi_root_mesh(const MultiRootTooth& tooth, const MultiRootBone& bone,
                              const MultiRootMeshSizing& sizing) {
  validate(tooth, bone);
  const int degree = bone.furcation.degree;
  const double gap_defect =
      outer_crest_z_mm(bone) - bone.loss.defect_depth_mm + tooth.trunk_length_mm;
  const double crest_gap = outer_crest_z_mm(bone) + tooth.trunk_length_mm;
  // On the trunk everywhere, or on the roots everywhere (the outer crest already below the
  // furcation plane, the septum at the roof): the crest ring follows the profile.
  const bool on_roots = crest_gap <= -0.3 && bone.septum_to_roof;
  // With a lesion whose septum's top lies below the crest: the defect's floor at least 0.6 mm
  // above it (the septum's top stays a plane; at 0.5 mm a sliver of bone was cut off between
  // the walls, TetGen left it unseeded).
  const double floor_t = -crest_gap + bone.loss.defect_depth_mm;
  const bool clear_of_septum = degree == 0 || bone.furcation.vertical_mm < -crest_gap ||
                               floor_t <= bone.furcation.vertical_mm - 0.6;
  if (bone.loss.defect_depth_mm > 0 &&
      ((gap_defect < 0.3 && !on_roots) || (degree != 0 && !on_roots) || !clear_of_septum))
    throw InputError(
        "angular_defect.depth_mm",
        "the multi-rooted mesh covers an angular defect only with the crest on the "
        "trunk everywhere (its floor at least 0.3 mm above the furcation plane, "
        "here " +
            mm(gap_defect) +
            ") and no furcation lesion, or, with horizontal loss taking the crest at "
            "least 0.3 mm below the furcation plane, on the roots everywhere (with a "
            "furcation lesion its floor at least 0.6 mm above the septum's top, here " +
            mm(bone.furcation.vertical_mm - floor_t) +
            "); use the thin-layer estimate (finite_elements false) for this "
            "scenario");
  const double gap = outer_crest_z_mm(bone) + tooth.trunk_length_mm;  // crest above the plane
  if ((degree == 1 || degree == 2) && bone.septum_to_roof &&
      (tooth.roots.size() < 2 || tooth.type == MultiRootType::kMaxillaryFirstPremolarTwoRoots ||
       tooth.type == MultiRootType::kMaxillarySecondMolar || gap > 0))
    throw InputError("furcation.degree",
                     "the multi-rooted mesh covers degree I and II furcation lesions only on the "
                     "mandibular molars and the maxillary first molar, with the outer crest below "
                     "the furcation plane (the two-rooted premolar's narrow roof gave inverted "
                     "elements; on the maxillary second molar's close roots the lesion's back "
                     "edge could not keep clear of them); use the thin-layer estimate "
                     "(finite_elements false) for this scenario");
  if ((degree == 1 || degree == 2) && bone.septum_to_roof && tooth.roots.size() == 3)
    for (FurcationEntrance e : bone.furcation.entrances) {
      const double reach = partial_lesion_reach_mm(tooth, e);
      const double depth = bone.furcation.horizontal_mm > 0 ? bone.furcation.horizontal_mm
                                                            : (degree == 1 ? 2.0 : 4.0);
      if (depth > reach - 0.7)
        throw InputError(
            "furcation.horizontal_mm",
            "on this " + to_string(tooth.type) +
                " the multi-rooted mesh covers a furcation lesion from the " + to_string(e) +
                " entrance up to " + mm(reach - 0.7) + " deep (here " + mm(depth) +
                "): deeper, its back edge would reach the third root, whose faces the "
                "mesh does not split; use at most " +
                mm(reach - 0.7) + ", or the thin-layer estimate (finite_elements false)");
    }
  if (std::abs(gap) < 0.3)
    throw InputError("bone_loss_mm",
                     "the multi-rooted mesh needs the crest at least 0.3 mm above or below the "
                     "furcation plane; change the horizontal loss a little");
  const bool lesion = degree > 0 && bone.septum_to_roof;
  if (lesion && gap > 0)
    throw InputError("furcation.degree",
                     "a degree III furcation lesion is meshed with the outer crest below the "
                     "furcation plane only (above it the lesion would be a closed tunnel in the "
                     "bone); add horizontal loss or use the thin-layer estimate");
  if (lesion && std::abs(gap + bone.furcation.vertical_mm) < 0.3)
    throw InputError("furcation.vertical_mm",
                     "the multi-rooted mesh needs the septum's top in a furcation lesion at "
                     "least 0.3 mm above or below the outer crest; change vertical_mm a little");
  if (!(sizing.edge_mm >= 0.2 && sizing.edge_mm <= 2.0) || sizing.pdl_layers < 1 ||
      sizing.pdl_layers > 3 || !(sizing.bone_edge_mm >= sizing.edge_mm))
    throw InputError("mesh",
                     "multi-rooted mesh sizes: edge 0.2 to 2 mm, bone edge at least the "
                     "edge, 1 to 3 PDL layers");
}

MultiRootMesh build_multi_root_mesh(const MultiRootTooth& tooth, const MultiRootBone& bone,
                                    const MultiRootMeshSizing& sizing,
                                    const std::atomic<bool>* cancel) {
  validate_multi_root_mesh(tooth, bone, sizing);
  Builder b(tooth, bone, sizing);
  return b.build(sizing, cancel);
}

}  // namespace sharpey::mesh
