// Tooth surface rings and the structured PDL layer of a tooth model.
//
// The tooth surface is triangulated on rings of constant meridian parameter s (or, between the
// CEJ and the cortical ring, of per-column s so that rings follow the attachment level around an
// angular defect). Rings carry n_columns points at angles 2 pi i / n_columns except near the two
// poles, where the count halves from ring to ring so that triangles keep a reasonable shape.
// With an angular defect, the rings from just below the CEJ down to just below the deepest
// cortical ring (the per-column rings) carry extra columns in and next to the defect's span
// (interval_parts); they join the rings without them, and the bone top's radial grids, by
// zipper triangles (add_zipper). Without a defect the mesh is exactly the uniform one.
#include <Eigen/Geometry>
#include <algorithm>
#include <cmath>
#include <limits>

#include "detail/model_mesher.h"
#include "sharpey/core/check.h"
#include "sharpey/core/constants.h"
#include "sharpey/error.h"

namespace sharpey::mesh::detail {
namespace {

using sharpey::core::kPi;
constexpr double kMergeTolerance = 1e-9;  // mm
constexpr double kCell = 1e-6;            // mm, hash cell of PointSet

long long cell_key(long long i, long long j, long long k) {
  return (i * 73856093LL) ^ (j * 19349663LL) ^ (k * 83492791LL);
}

// Perimeter of an ellipse (Ramanujan's second approximation).
double ellipse_perimeter(double a, double b) {
  const double h = (a - b) * (a - b) / ((a + b) * (a + b));
  return kPi * (a + b) * (1 + 3 * h / (10 + std::sqrt(4 - 3 * h)));
}

// Arc positions of rings strictly after arc0 up to arc1 (included), spaced at most h_max apart
// and close enough where the meridian bends that the sagitta of a ring interval stays below a
// quarter of `thickness` (the layer the surface bounds) and the meridian turns by at most 20 deg
// per interval: density max(1/h_max, sqrt(k/(2 t)), k/0.35).
std::vector<double> ring_arcs(const ToothShape& shape, double arc0, double arc1, double h_max,
                              double thickness) {
  const int n_samples = 400;
  std::vector<double> cumulative(n_samples + 1, 0.0);
  auto density = [&](double arc) {
    const double k = shape.meridian_curvature(shape.s_of_arc(arc));
    return std::max({1.0 / h_max, std::sqrt(k / (2 * thickness)), k / 0.35});
  };
  const double step = (arc1 - arc0) / n_samples;
  for (int j = 0; j < n_samples; ++j)
    cumulative[j + 1] = cumulative[j] + std::abs(step) * density(arc0 + (j + 0.5) * step);
  const int n = std::max(1, static_cast<int>(std::ceil(cumulative.back() - 1e-9)));
  std::vector<double> arcs;
  for (int k = 1; k < n; ++k) {
    const double target = cumulative.back() * k / n;
    const int j = static_cast<int>(std::upper_bound(cumulative.begin(), cumulative.end(), target) -
                                   cumulative.begin()) -
                  1;
    const double f = (target - cumulative[j]) / (cumulative[j + 1] - cumulative[j]);
    arcs.push_back(arc0 + (j + f) * step);
  }
  arcs.push_back(arc1);
  return arcs;
}

// Fractions t_1 < ... < t_n = 1 of a band that starts `d_start` mm below the attachment level
// and is `length` mm long, spaced by the local ring spacing h(d) = min(h_max, h_crest + (g - 1) d)
// at depth d: rings start h_crest apart at the crest and grow by about the factor g per ring.
std::vector<double> crest_graded_fractions(double length, double d_start, double h_crest,
                                           double h_max) {
  constexpr double g = 1.35;
  const int n_samples = 200;
  std::vector<double> cumulative(n_samples + 1, 0.0);
  for (int j = 0; j < n_samples; ++j) {
    const double d = d_start + (j + 0.5) * length / n_samples;
    cumulative[j + 1] =
        cumulative[j] + (length / n_samples) / std::min(h_max, h_crest + (g - 1) * d);
  }
  const int n = std::max(1, static_cast<int>(std::lround(cumulative.back())));
  std::vector<double> t;
  for (int k = 1; k < n; ++k) {
    const double target = cumulative.back() * k / n;
    const int j = static_cast<int>(std::upper_bound(cumulative.begin(), cumulative.end(), target) -
                                   cumulative.begin()) -
                  1;
    t.push_back((j + (target - cumulative[j]) / (cumulative[j + 1] - cumulative[j])) / n_samples);
  }
  t.push_back(1.0);
  return t;
}

// The first ring interval below the crest: 0.6 PDL widths at the crest per layer of elements
// across the PDL (see add_root_ring_specs), at most the PDL edge.
double first_crest_interval(const ModelFrame& frame) {
  return std::min(frame.sizes().pdl_edge_mm,
                  0.6 * frame.spec().pdl.crest_width_mm / frame.sizes().pdl_layers);
}

// Per uniform column interval: the number of parts it is cut into (1, or an even number in and
// next to an angular defect's span, so that the extra columns are laid out the same way on both
// sides of the defect's centre). `arc_mm`: the columns' spacing along the cervix.
std::vector<int> interval_parts(const ModelFrame& frame, int n_columns, double arc_mm) {
  std::vector<int> parts(n_columns, 1);
  if (frame.spec().loss.defect_depth_mm <= 0) return parts;
  // Extra columns at most a quarter of the PDL edge apart, and at most twice the first ring
  // interval below the crest (add_root_ring_specs): the defect's floor is a narrow notch (its
  // radius of curvature a few hundredths of a mm) whose nearby pressure the uniform columns (up to
  // a third of the defect's width apart) leave unresolved; the rings below it start a fraction
  // of a PDL width apart, and columns much further apart than that shear the elements there.
  const double target_mm =
      std::min(0.25 * frame.sizes().pdl_edge_mm, 2 * first_crest_interval(frame));
  int m = static_cast<int>(std::ceil(arc_mm / target_mm - 1e-9));
  m += m % 2;
  if (m < 2) return parts;
  constexpr int kSamples = 16;
  std::vector<char> inside(n_columns, 0);
  for (int i = 0; i < n_columns; ++i) {
    for (int k = 0; k <= kSamples && !inside[i]; ++k) {
      const double theta = 2 * kPi * (i + static_cast<double>(k) / kSamples) / n_columns;
      inside[i] = frame.defect_weight(frame.shape().root_polar_angle(theta)) > 0;
    }
  }
  // The defect's intervals and one more on each side.
  for (int i = 0; i < n_columns; ++i) {
    if (inside[i] || inside[(i + 1) % n_columns] || inside[(i + n_columns - 1) % n_columns])
      parts[i] = m;
  }
  return parts;
}

}  // namespace

struct RingSpec {
  std::vector<double> s;  // one value (common) or one per column (of column_theta_)
  bool fixed = true;      // must carry all columns
  int count = 0;
};

int PointSet::add(const Eigen::Vector3d& p, const PointInfo& info) {
  const long long i = static_cast<long long>(std::floor(p.x() / kCell));
  const long long j = static_cast<long long>(std::floor(p.y() / kCell));
  const long long k = static_cast<long long>(std::floor(p.z() / kCell));
  for (long long di = -1; di <= 1; ++di)
    for (long long dj = -1; dj <= 1; ++dj)
      for (long long dk = -1; dk <= 1; ++dk) {
        const auto it = cells_.find(cell_key(i + di, j + dj, k + dk));
        if (it == cells_.end()) continue;
        for (int q : it->second)
          if ((points_[q] - p).norm() < kMergeTolerance) return q;
      }
  points_.push_back(p);
  info_.push_back(info);
  cells_[cell_key(i, j, k)].push_back(size() - 1);
  return size() - 1;
}

ModelMesher::ModelMesher(const ModelFrame& frame) : frame_(frame) {}

void ModelMesher::add_facet(int a, int b, int c, int marker, bool to_tetgen, bool output) {
  facets_.push_back({{a, b, c}, marker, to_tetgen, output});
}

void ModelMesher::add_quad(int a, int b, int c, int d, int marker, bool to_tetgen, bool output) {
  const auto& x = points_.points();
  if ((x[a] - x[c]).squaredNorm() <= (x[b] - x[d]).squaredNorm()) {
    add_facet(a, b, c, marker, to_tetgen, output);
    add_facet(a, c, d, marker, to_tetgen, output);
  } else {
    add_facet(a, b, d, marker, to_tetgen, output);
    add_facet(b, c, d, marker, to_tetgen, output);
  }
}

void ModelMesher::orient(Facet* f, const Eigen::Vector3d& outward) const {
  const auto& x = points_.points();
  const Eigen::Vector3d n = (x[f->v[1]] - x[f->v[0]]).cross(x[f->v[2]] - x[f->v[0]]);
  if (n.dot(outward) < 0) std::swap(f->v[1], f->v[2]);
}

void ModelMesher::layout_columns() {
  const ToothShape& shape = frame_.shape();
  const double h = frame_.sizes().pdl_edge_mm;
  const Section<double> cervix = shape.section(-1e-9);
  const double perimeter = ellipse_perimeter(cervix.a, cervix.b);
  const int N = std::max(16, 8 * static_cast<int>(std::ceil(perimeter / (8 * h))));
  n_columns_ = N;
  const std::vector<int> parts = interval_parts(frame_, N, perimeter / N);
  column_theta_.clear();
  uniform_column_.clear();
  for (int i = 0; i < N; ++i) {
    uniform_column_.push_back(static_cast<int>(column_theta_.size()));
    column_theta_.push_back(2 * kPi * i / N);
    for (int k = 1; k < parts[i]; ++k)
      column_theta_.push_back(2 * kPi * (i + static_cast<double>(k) / parts[i]) / N);
  }
  const size_t M = column_theta_.size();
  crest_s_.resize(M);
  cortical_s_.resize(M);
  for (size_t c = 0; c < M; ++c) {
    crest_s_[c] = frame_.crest_s(column_theta_[c]);
    cortical_s_[c] = frame_.cortical_s(column_theta_[c]);
  }
}

namespace {

RingSpec common_ring(double s, bool fixed) {
  RingSpec r;
  r.s = {s};
  r.fixed = fixed;
  return r;
}

}  // namespace

std::pair<int, int> ModelMesher::add_crown_ring_specs(std::vector<RingSpec>* specs) const {
  const ToothShape& shape = frame_.shape();
  const MeshSizes& sizes = frame_.sizes();
  const double h_crown = std::min(2.0 * sizes.pdl_edge_mm, sizes.tooth_edge_mm);
  const double bz = frame_.bracket_z();
  const double pad_half = 0.5 * frame_.spec().bracket.length_mm;
  const double s_pad_hi = shape.s_of_z(bz + pad_half), s_pad_lo = shape.s_of_z(bz - pad_half);
  // Crown: tip segment (flexible counts), pad, lower crown down to the CEJ (s = 0).
  const double arc_tip = shape.total_arc();
  const double arc_hi = shape.arc(s_pad_hi), arc_lo = shape.arc(s_pad_lo), arc_cej = shape.arc(0);
  specs->push_back(common_ring(1.0, false));  // the tip pole
  const double t_crown = 0.5 * h_crown;
  const std::vector<double> a1 = ring_arcs(shape, arc_tip, arc_hi, h_crown, t_crown);
  for (size_t k = 0; k + 1 < a1.size(); ++k)
    specs->push_back(common_ring(shape.s_of_arc(a1[k]), false));
  const int pad_hi_ring = static_cast<int>(specs->size());
  specs->push_back(common_ring(s_pad_hi, true));
  const std::vector<double> a2 = ring_arcs(shape, arc_hi, arc_lo, h_crown, t_crown);
  for (size_t k = 0; k + 1 < a2.size(); ++k)
    specs->push_back(common_ring(shape.s_of_arc(a2[k]), true));
  const int pad_lo_ring = static_cast<int>(specs->size());
  specs->push_back(common_ring(s_pad_lo, true));
  const std::vector<double> a3 = ring_arcs(shape, arc_lo, arc_cej, h_crown, t_crown);
  for (size_t k = 0; k + 1 < a3.size(); ++k)
    specs->push_back(common_ring(shape.s_of_arc(a3[k]), true));
  specs->push_back(common_ring(0.0, true));
  return {pad_hi_ring, pad_lo_ring};
}

// Per-column bands: CEJ -> crest (exposed root), crest -> cortical ring, cortical ring -> a common
// ring below the deepest cortical ring. Below the crest the rings start close together: the PDL's
// free edge there makes the pressure rise from zero to its peak within a few PDL widths, and rings
// h apart put the peak between two rings (the standard preset then overestimated the peak by 9 %
// against the fine preset). The first interval is 0.6 PDL widths at the crest per layer of
// elements across the PDL, growing by about 35 % per ring.
void ModelMesher::add_root_ring_specs(std::vector<RingSpec>* specs) {
  const ToothShape& shape = frame_.shape();
  const double h = frame_.sizes().pdl_edge_mm;
  const int M = static_cast<int>(column_theta_.size());
  std::vector<double> arc_crest(M), arc_cort(M);
  for (int i = 0; i < M; ++i) {
    arc_crest[i] = shape.arc(crest_s_[i]);
    arc_cort[i] = shape.arc(cortical_s_[i]);
  }
  const PdlSpec& pdl_spec = frame_.spec().pdl;
  const double h_crest = first_crest_interval(frame_);
  auto band = [&](const std::vector<double>& arc_from, const std::vector<double>& arc_to,
                  const std::vector<double>* s_last, const std::vector<double>& t,
                  bool last_common) {
    const size_t n = t.size();
    for (size_t k = 1; k <= n; ++k) {
      RingSpec r;
      if (k == n && last_common) {
        r = common_ring(shape.s_of_arc(arc_to[0]), false);
      } else {
        r.s.resize(M);
        for (int i = 0; i < M; ++i) {
          r.s[i] = (k == n && s_last)
                       ? (*s_last)[i]
                       : shape.s_of_arc(arc_from[i] + (arc_to[i] - arc_from[i]) * t[k - 1]);
        }
      }
      specs->push_back(r);
    }
  };
  auto longest_gap = [&](const std::vector<double>& a, const std::vector<double>& b) {
    double longest = 0;
    for (int i = 0; i < M; ++i) longest = std::max(longest, std::abs(a[i] - b[i]));
    return longest;
  };
  auto uniform = [](double length, double step) {
    const int n = std::max(1, static_cast<int>(std::ceil(length / step - 1e-9)));
    std::vector<double> t;
    for (int k = 1; k <= n; ++k) t.push_back(static_cast<double>(k) / n);
    return t;
  };
  const std::vector<double> arc_cej_all(M, shape.arc(0));
  band(arc_cej_all, arc_crest, &crest_s_, uniform(longest_gap(arc_cej_all, arc_crest), h), false);
  crest_ring_ = static_cast<int>(specs->size()) - 1;
  const double cortical_band = longest_gap(arc_crest, arc_cort);
  band(arc_crest, arc_cort, &cortical_s_, crest_graded_fractions(cortical_band, 0.0, h_crest, h),
       false);
  cortical_ring_ = static_cast<int>(specs->size()) - 1;
  const double lowest_cort = *std::min_element(arc_cort.begin(), arc_cort.end());
  const double highest_cort = *std::max_element(arc_cort.begin(), arc_cort.end());
  double arc_u = lowest_cort - h;
  if (arc_u < 0.4 * lowest_cort) arc_u = 0.4 * lowest_cort;
  band(arc_cort, std::vector<double>(M, arc_u), nullptr,
       crest_graded_fractions(highest_cort - arc_u, cortical_band, h_crest, h), true);
  // Finer rings where the root bends (the apex): the PDL sub-layer is the thickness to respect.
  const double t =
      std::min({pdl_spec.crest_width_mm, pdl_spec.mid_width_mm, pdl_spec.apex_width_mm}) /
      frame_.sizes().pdl_layers;
  const std::vector<double> a = ring_arcs(shape, arc_u, 0.0, h, t);
  for (size_t k = 0; k + 1 < a.size(); ++k)
    specs->push_back(common_ring(shape.s_of_arc(a[k]), false));
  specs->push_back(common_ring(-1.0, false));  // the apex pole
}

// Point counts: per-column rings carry every column, the other fixed rings the uniform ones;
// near the poles halve while segments are short, at most one halving per ring.
void ModelMesher::set_ring_counts(std::vector<RingSpec>* specs, int pad_hi_ring) const {
  const ToothShape& shape = frame_.shape();
  const double h = frame_.sizes().pdl_edge_mm;
  const double h_crown = std::min(2.0 * h, frame_.sizes().tooth_edge_mm);
  const int N = n_columns_, M = static_cast<int>(column_theta_.size());
  auto desired = [&](const RingSpec& r, double target) {
    const Section<double> q = shape.section(r.s[0]);
    const double p = ellipse_perimeter(q.a, q.b);
    int c = N;
    while (c % 2 == 0 && c / 2 >= 12 && p / c < 0.5 * target) c /= 2;  // >= 12: at most 30 deg
    return c;
  };
  std::vector<RingSpec>& rings = *specs;
  const int n_rings = static_cast<int>(rings.size());
  for (auto& r : rings) r.count = r.s.size() > 1 ? M : N;
  rings.front().count = rings.back().count = 1;
  for (int r = pad_hi_ring - 1; r >= 1; --r) {
    const int below = rings[r + 1].count;
    rings[r].count = std::min(below, std::max(desired(rings[r], h_crown), below / 2));
  }
  for (int r = cortical_ring_ + 1; r < n_rings - 1; ++r) {
    if (rings[r].fixed) continue;
    const int above = std::min(rings[r - 1].count, N);
    rings[r].count = std::min(above, std::max(desired(rings[r], h), above / 2));
  }
}

std::vector<int> ModelMesher::ring_columns(const RingSpec& spec) const {
  std::vector<int> columns;
  if (spec.s.size() > 1) {
    for (int c = 0; c < static_cast<int>(column_theta_.size()); ++c) columns.push_back(c);
  } else {
    for (int i = 0; i < spec.count; ++i)
      columns.push_back(uniform_column_[i * n_columns_ / spec.count]);
  }
  return columns;
}

void ModelMesher::add_ring_points(const std::vector<RingSpec>& specs) {
  const ToothShape& shape = frame_.shape();
  rings_.assign(specs.size(), {});
  for (size_t r = 0; r < specs.size(); ++r) {
    const RingSpec& spec = specs[r];
    if (spec.count == 1) {
      const double s = spec.s[0];
      rings_[r].push_back(points_.add(
          shape.point(0, s), {PointKind::kTooth, std::numeric_limits<double>::quiet_NaN(), s}));
      continue;
    }
    for (int i = 0; i < spec.count; ++i) {
      const bool per_column = spec.s.size() > 1;
      const double theta = per_column ? column_theta_[i] : 2 * kPi * i / spec.count;
      const double s = per_column ? spec.s[i] : spec.s[0];
      rings_[r].push_back(points_.add(shape.point(theta, s), {PointKind::kTooth, theta, s}));
    }
  }
}

// Triangles between consecutive rings (ring r above ring r + 1); outward by construction.
void ModelMesher::add_ring_triangles(const std::vector<RingSpec>& specs, int pad_hi_ring,
                                     int pad_lo_ring, int cej_ring) {
  const auto& x = points_.points();
  const double pad_half_width = 0.5 * frame_.spec().bracket.width_mm;
  const int n_rings = static_cast<int>(rings_.size());
  const int M = static_cast<int>(column_theta_.size());
  for (int r = 0; r + 1 < n_rings; ++r) {
    const std::vector<int>& A = rings_[r];
    const std::vector<int>& B = rings_[r + 1];
    const int nA = static_cast<int>(A.size()), nB = static_cast<int>(B.size());
    const size_t first = facets_.size();
    int marker = kRootSurface;
    if (r + 1 <= cej_ring) {
      marker = kCrownSurface;
    } else if (r + 1 <= crest_ring_) {
      marker = kExposedRoot;
    }
    auto tri = [&](int a, int b, int c) { add_facet(a, b, c, marker, true, true); };
    if (nA > 1 && nB > 1 && nA != nB && (nA == M || nB == M) && M != n_columns_) {
      // A ring with the extra columns of an angular defect next to one without: in add_grid's
      // orientation the lower ring comes first.
      add_zipper(B, ring_columns(specs[r + 1]), A, ring_columns(specs[r]), M, marker, true, true);
    } else if (nA == 1) {
      for (int k = 0; k < nB; ++k) tri(A[0], B[k], B[(k + 1) % nB]);
    } else if (nB == 1) {
      for (int k = 0; k < nA; ++k) tri(A[k], B[0], A[(k + 1) % nA]);
    } else if (nA == nB) {
      for (int i = 0; i < nA; ++i)
        add_quad(A[i], B[i], B[(i + 1) % nB], A[(i + 1) % nA], marker, true, true);
    } else if (nA == 2 * nB) {
      for (int k = 0; k < nB; ++k) {
        tri(A[2 * k], B[k], A[2 * k + 1]);
        tri(A[2 * k + 1], B[k], B[(k + 1) % nB]);
        tri(A[2 * k + 1], B[(k + 1) % nB], A[(2 * k + 2) % nA]);
      }
    } else if (nB == 2 * nA) {
      for (int k = 0; k < nA; ++k) {
        tri(A[k], B[2 * k], B[2 * k + 1]);
        tri(A[k], B[2 * k + 1], A[(k + 1) % nA]);
        tri(A[(k + 1) % nA], B[2 * k + 1], B[(2 * k + 2) % nB]);
      }
    } else {
      throw MeshError("building the tooth surface: rings of " + std::to_string(nA) + " and " +
                      std::to_string(nB) + " points cannot be joined (internal error)");
    }
    for (size_t f = first; f < facets_.size(); ++f) {
      Facet& facet = facets_[f];
      if (marker == kCrownSurface && r >= pad_hi_ring && r + 1 <= pad_lo_ring) {
        const Eigen::Vector3d c = (x[facet.v[0]] + x[facet.v[1]] + x[facet.v[2]]) / 3.0;
        if (c.x() > 0 && std::abs(c.y()) <= pad_half_width) facet.marker = kBracketPad;
      }
      if (marker == kRootSurface) root_triangles_.push_back(facet.v);
    }
  }
}

void ModelMesher::build_tooth_surface() {
  layout_columns();
  // Ring specifications from the crown tip down to the apex.
  std::vector<RingSpec> specs;
  const auto [pad_hi_ring, pad_lo_ring] = add_crown_ring_specs(&specs);
  const int cej_ring = static_cast<int>(specs.size()) - 1;
  add_root_ring_specs(&specs);
  set_ring_counts(&specs, pad_hi_ring);
  add_ring_points(specs);
  add_ring_triangles(specs, pad_hi_ring, pad_lo_ring, cej_ring);
}

std::vector<int> ModelMesher::socket_ring(int ring) const {
  std::vector<int> socket;
  for (int p : rings_[ring]) socket.push_back(layer_.back()[p]);
  return socket;
}

std::vector<int> ModelMesher::uniform_subset(const std::vector<int>& all_columns) const {
  std::vector<int> subset(n_columns_);
  for (int i = 0; i < n_columns_; ++i) subset[i] = all_columns[uniform_column_[i]];
  return subset;
}

void ModelMesher::add_socket_grid(const std::vector<std::vector<int>>& rows,
                                  const std::vector<int>& ring, int marker, bool output) {
  auto keep = [](const Eigen::Vector3d&) {
    return Eigen::Vector3d::Zero().eval();  // keep the construction order's orientation
  };
  if (ring.size() == rows[0].size()) {
    add_grid(rows, true, marker, true, output, keep);
    return;
  }
  std::vector<int> all_columns(ring.size());
  for (size_t c = 0; c < ring.size(); ++c) all_columns[c] = static_cast<int>(c);
  add_zipper(ring, all_columns, rows[1], uniform_column_, static_cast<int>(ring.size()), marker,
             true, output);
  add_grid(std::vector<std::vector<int>>(rows.begin() + 1, rows.end()), true, marker, true, output,
           keep);
}

void ModelMesher::add_zipper(const std::vector<int>& p, const std::vector<int>& p_columns,
                             const std::vector<int>& q, const std::vector<int>& q_columns,
                             int n_columns, int marker, bool to_tetgen, bool output) {
  const int nP = static_cast<int>(p.size()), nQ = static_cast<int>(q.size());
  SHARPEY_ASSERT(p_columns.front() == 0 && q_columns.front() == 0 && nP != nQ,
                 "add_zipper: rows must start at column 0 and differ in size");
  const bool p_finer = nP > nQ;
  auto column = [&](const std::vector<int>& cols, int i) {
    return i < static_cast<int>(cols.size()) ? cols[i] : n_columns;
  };
  int i = 0, j = 0;
  while (i < nP || j < nQ) {
    const int p1 = column(p_columns, i + 1), q1 = column(q_columns, j + 1);
    if (i < nP && j < nQ && p_columns[i] == q_columns[j] && p1 == q1) {
      // An interval without extra columns: a quad, split like add_grid's.
      add_quad(p[i], p[(i + 1) % nP], q[(j + 1) % nQ], q[j], marker, to_tetgen, output);
      ++i;
      ++j;
      continue;
    }
    bool advance_p = false;
    if (i == nP) {
      advance_p = false;
    } else if (j == nQ) {
      advance_p = true;
    } else if (p_finer) {
      advance_p = p1 <= q1 && 2 * p1 <= column(q_columns, j) + q1;
    } else {
      advance_p = !(q1 <= p1 && 2 * q1 <= column(p_columns, i) + p1);
    }
    if (advance_p) {
      add_facet(p[i], p[(i + 1) % nP], q[j % nQ], marker, to_tetgen, output);
      ++i;
    } else {
      add_facet(p[i % nP], q[(j + 1) % nQ], q[j], marker, to_tetgen, output);
      ++j;
    }
  }
}

void ModelMesher::build_pdl_layer() {
  add_pdl_points();
  const std::vector<int> rank = prism_split_rank();
  add_pdl_prisms(rank);
  add_pdl_free_top(rank);
  hole_ = frame_.pdl_point(0.0, 0.5 * (crest_s_[0] - 1.0), 0.5);
}

void ModelMesher::add_pdl_points() {
  const int n_layers = frame_.sizes().pdl_layers;
  layer_.assign(n_layers + 1, std::vector<int>(points_.size(), -1));
  for (int p = 0; p < points_.size(); ++p) layer_[0][p] = p;
  for (size_t r = crest_ring_; r < rings_.size(); ++r) {
    for (int p : rings_[r]) {
      const PointInfo info = points_.info()[p];
      const double theta = std::isnan(info.theta) ? 0.0 : info.theta;
      for (int k = 1; k <= n_layers; ++k) {
        const double f = static_cast<double>(k) / n_layers;
        const PointKind kind = k == n_layers ? PointKind::kSocket : PointKind::kPdlLayer;
        layer_[k][p] =
            points_.add(frame_.pdl_point(theta, info.s, f), {kind, info.theta, info.s, f});
      }
    }
  }
}

// Without an angular defect the point index. With one, the order of (ring, |angle|), which the
// mirror image y -> -y keeps: mirrored defects (mesial and distal) then get mirror-image PDL
// elements (two points of one triangle never share both keys: a column and its mirror image are
// never neighbours). Meshes without a defect keep the index order they have always had.
std::vector<int> ModelMesher::prism_split_rank() const {
  std::vector<int> rank(points_.size());
  for (int p = 0; p < points_.size(); ++p) rank[p] = p;
  if (column_theta_.size() == static_cast<size_t>(n_columns_)) return rank;
  struct Key {
    int ring;
    double angle;
    int point;
  };
  std::vector<Key> keys;
  for (size_t r = crest_ring_; r < rings_.size(); ++r) {
    for (int p : rings_[r]) {
      const double theta = points_.info()[p].theta;
      keys.push_back(
          {static_cast<int>(r), std::isnan(theta) ? 0.0 : std::abs(wrap_angle(theta)), p});
    }
  }
  std::sort(keys.begin(), keys.end(), [](const Key& a, const Key& b) {
    return a.ring != b.ring ? a.ring < b.ring : a.angle < b.angle;
  });
  for (size_t k = 0; k < keys.size(); ++k) rank[keys[k].point] = static_cast<int>(k);
  return rank;
}

// Prisms between consecutive layers over each root triangle, three tetrahedra each. Every side
// quad is split along the diagonal from its lower-ranked root vertex on the inner layer to the
// higher-ranked one on the outer layer, so neighbouring prisms share their split faces.
void ModelMesher::add_pdl_prisms(const std::vector<int>& rank) {
  const int n_layers = frame_.sizes().pdl_layers;
  for (const auto& t : root_triangles_) {
    std::array<int, 3> v = t;
    std::sort(v.begin(), v.end(), [&](int a, int b) { return rank[a] < rank[b]; });
    for (int k = 0; k < n_layers; ++k) {
      const int a = layer_[k][v[0]], b = layer_[k][v[1]], c = layer_[k][v[2]];
      const int a1 = layer_[k + 1][v[0]], b1 = layer_[k + 1][v[1]], c1 = layer_[k + 1][v[2]];
      pdl_tets_.push_back({a, a1, b1, c1});
      pdl_tets_.push_back({a, b, c, c1});
      pdl_tets_.push_back({a, b, c1, b1});
    }
    add_facet(layer_[n_layers][t[0]], layer_[n_layers][t[1]], layer_[n_layers][t[2]],
              kSocketSurface, true, true);
  }
  const auto& x = points_.points();
  for (auto& tet : pdl_tets_) {
    const double v =
        (x[tet[1]] - x[tet[0]]).dot((x[tet[2]] - x[tet[0]]).cross(x[tet[3]] - x[tet[0]]));
    if (v < 0) std::swap(tet[1], tet[2]);
  }
}

// Free top of the PDL between the root's crest ring and the socket's, split like the prisms.
void ModelMesher::add_pdl_free_top(const std::vector<int>& rank) {
  const ToothShape& shape = frame_.shape();
  const int n_layers = frame_.sizes().pdl_layers;
  const std::vector<int>& crest = rings_[crest_ring_];
  const int n = static_cast<int>(crest.size());
  for (int i = 0; i < n; ++i) {
    const int p = crest[i], q = crest[(i + 1) % n];
    const int lo = rank[p] < rank[q] ? p : q;
    const int hi = rank[p] < rank[q] ? q : p;
    const PointInfo& info = points_.info()[crest[i]];
    Eigen::Vector3d xt, xs;
    shape.frame(info.theta, info.s, nullptr, &xt, &xs);
    for (int k = 0; k < n_layers; ++k) {
      for (const auto& tri :
           {std::array<int, 3>{layer_[k][lo], layer_[k][hi], layer_[k + 1][hi]},
            std::array<int, 3>{layer_[k][lo], layer_[k + 1][hi], layer_[k + 1][lo]}}) {
        Facet f{tri, kPdlCrest, false, true};
        orient(&f, xs);
        facets_.push_back(f);
      }
    }
  }
}

}  // namespace sharpey::mesh::detail
