// Tooth surface rings and the structured PDL layer of a tooth model.
//
// The tooth surface is triangulated on rings of constant meridian parameter s (or, between the
// CEJ and the cortical ring, of per-column s so that rings follow the attachment level around an
// angular defect). Rings carry n_columns points at angles 2 pi i / n_columns except near the two
// poles, where the count halves from ring to ring so that triangles keep a reasonable shape.
#include <Eigen/Geometry>
#include <algorithm>
#include <cmath>
#include <limits>

#include "detail/model_mesher.h"
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

struct RingSpec {
  std::vector<double> s;  // one value (common) or one per column
  bool fixed = true;      // must carry all columns
  int count = 0;
};

}  // namespace

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

void ModelMesher::build_tooth_surface() {
  const ToothShape& shape = frame_.shape();
  const MeshSizes& sizes = frame_.sizes();
  const double h = sizes.pdl_edge_mm;
  const double h_crown = std::min(2.0 * h, sizes.tooth_edge_mm);

  const Section<double> cervix = shape.section(-1e-9);
  const double perimeter = ellipse_perimeter(cervix.a, cervix.b);
  const int N = std::max(16, 8 * static_cast<int>(std::ceil(perimeter / (8 * h))));
  n_columns_ = N;
  crest_s_.resize(N);
  cortical_s_.resize(N);
  std::vector<double> arc_crest(N), arc_cort(N);
  for (int i = 0; i < N; ++i) {
    const double theta = 2 * kPi * i / N;
    crest_s_[i] = frame_.crest_s(theta);
    cortical_s_[i] = frame_.cortical_s(theta);
    arc_crest[i] = shape.arc(crest_s_[i]);
    arc_cort[i] = shape.arc(cortical_s_[i]);
  }

  // Ring specifications from the crown tip down to the apex.
  std::vector<RingSpec> specs;
  auto common = [](double s, bool fixed) {
    RingSpec r;
    r.s = {s};
    r.fixed = fixed;
    return r;
  };
  const double bz = frame_.bracket_z();
  const double pad_half = 0.5 * frame_.spec().bracket.length_mm;
  const double s_pad_hi = shape.s_of_z(bz + pad_half), s_pad_lo = shape.s_of_z(bz - pad_half);
  // Crown: tip segment (flexible counts), pad, lower crown down to the CEJ (s = 0).
  const double arc_tip = shape.total_arc();
  const double arc_hi = shape.arc(s_pad_hi), arc_lo = shape.arc(s_pad_lo), arc_cej = shape.arc(0);
  specs.push_back(common(1.0, false));  // the tip pole
  {
    const double t_crown = 0.5 * h_crown;
    const std::vector<double> a1 = ring_arcs(shape, arc_tip, arc_hi, h_crown, t_crown);
    for (size_t k = 0; k + 1 < a1.size(); ++k)
      specs.push_back(common(shape.s_of_arc(a1[k]), false));
    specs.push_back(common(s_pad_hi, true));
    const std::vector<double> a2 = ring_arcs(shape, arc_hi, arc_lo, h_crown, t_crown);
    for (size_t k = 0; k + 1 < a2.size(); ++k) specs.push_back(common(shape.s_of_arc(a2[k]), true));
    specs.push_back(common(s_pad_lo, true));
    const std::vector<double> a3 = ring_arcs(shape, arc_lo, arc_cej, h_crown, t_crown);
    for (size_t k = 0; k + 1 < a3.size(); ++k) specs.push_back(common(shape.s_of_arc(a3[k]), true));
    specs.push_back(common(0.0, true));
  }
  const int pad_hi_ring = [&] {
    for (size_t r = 0; r < specs.size(); ++r)
      if (specs[r].s.size() == 1 && specs[r].s[0] == s_pad_hi) return static_cast<int>(r);
    return 0;
  }();
  const int pad_lo_ring = [&] {
    for (size_t r = 0; r < specs.size(); ++r)
      if (specs[r].s.size() == 1 && specs[r].s[0] == s_pad_lo) return static_cast<int>(r);
    return 0;
  }();
  const int cej_ring = static_cast<int>(specs.size()) - 1;

  // Per-column bands: CEJ -> crest (exposed root), crest -> cortical ring, cortical ring -> a
  // common ring below the deepest cortical ring. Below the crest the rings start close together:
  // the PDL's free edge there makes the pressure rise from zero to its peak within a few PDL
  // widths, and rings h apart put the peak between two rings (the standard preset then
  // overestimated the peak by 9 % against the fine preset). The first interval is 0.6 PDL
  // widths at the crest per layer of elements across the PDL, growing by about 35 % per ring.
  const PdlSpec& pdl_spec = frame_.spec().pdl;
  const double h_crest = std::min(h, 0.6 * pdl_spec.crest_width_mm / frame_.sizes().pdl_layers);
  auto band = [&](const std::vector<double>& arc_from, const std::vector<double>& arc_to,
                  const std::vector<double>* s_last, const std::vector<double>& t,
                  bool last_common) {
    const size_t n = t.size();
    for (size_t k = 1; k <= n; ++k) {
      RingSpec r;
      if (k == n && last_common) {
        r = common(shape.s_of_arc(arc_to[0]), false);
      } else {
        r.s.resize(N);
        for (int i = 0; i < N; ++i) {
          r.s[i] = (k == n && s_last)
                       ? (*s_last)[i]
                       : shape.s_of_arc(arc_from[i] + (arc_to[i] - arc_from[i]) * t[k - 1]);
        }
      }
      specs.push_back(r);
    }
  };
  auto longest_gap = [&](const std::vector<double>& a, const std::vector<double>& b) {
    double longest = 0;
    for (int i = 0; i < N; ++i) longest = std::max(longest, std::abs(a[i] - b[i]));
    return longest;
  };
  auto uniform = [](double length, double step) {
    const int n = std::max(1, static_cast<int>(std::ceil(length / step - 1e-9)));
    std::vector<double> t;
    for (int k = 1; k <= n; ++k) t.push_back(static_cast<double>(k) / n);
    return t;
  };
  const std::vector<double> arc_cej_all(N, arc_cej);
  band(arc_cej_all, arc_crest, &crest_s_, uniform(longest_gap(arc_cej_all, arc_crest), h), false);
  crest_ring_ = static_cast<int>(specs.size()) - 1;
  const double cortical_band = longest_gap(arc_crest, arc_cort);
  band(arc_crest, arc_cort, &cortical_s_, crest_graded_fractions(cortical_band, 0.0, h_crest, h),
       false);
  cortical_ring_ = static_cast<int>(specs.size()) - 1;
  const double lowest_cort = *std::min_element(arc_cort.begin(), arc_cort.end());
  const double highest_cort = *std::max_element(arc_cort.begin(), arc_cort.end());
  double arc_u = lowest_cort - h;
  if (arc_u < 0.4 * lowest_cort) arc_u = 0.4 * lowest_cort;
  band(arc_cort, std::vector<double>(N, arc_u), nullptr,
       crest_graded_fractions(highest_cort - arc_u, cortical_band, h_crest, h), true);
  {
    // Finer rings where the root bends (the apex): the PDL sub-layer is the thickness to respect.
    const PdlSpec& pdl = frame_.spec().pdl;
    const double t = std::min({pdl.crest_width_mm, pdl.mid_width_mm, pdl.apex_width_mm}) /
                     frame_.sizes().pdl_layers;
    const std::vector<double> a = ring_arcs(shape, arc_u, 0.0, h, t);
    for (size_t k = 0; k + 1 < a.size(); ++k) specs.push_back(common(shape.s_of_arc(a[k]), false));
  }
  specs.push_back(common(-1.0, false));  // the apex pole

  // Point counts: all columns on fixed rings; near the poles halve while segments are short,
  // at most one halving per ring.
  const int n_rings = static_cast<int>(specs.size());
  auto desired = [&](const RingSpec& r, double target) {
    const Section<double> q = shape.section(r.s[0]);
    const double p = ellipse_perimeter(q.a, q.b);
    int c = N;
    while (c % 2 == 0 && c / 2 >= 12 && p / c < 0.5 * target) c /= 2;  // >= 12: at most 30 deg
    return c;
  };
  for (auto& r : specs) r.count = N;
  specs.front().count = specs.back().count = 1;
  for (int r = pad_hi_ring - 1; r >= 1; --r) {
    const int below = specs[r + 1].count;
    specs[r].count = std::min(below, std::max(desired(specs[r], h_crown), below / 2));
  }
  for (int r = cortical_ring_ + 1; r < n_rings - 1; ++r) {
    if (specs[r].fixed) continue;
    const int above = specs[r - 1].count;
    specs[r].count = std::min(above, std::max(desired(specs[r], h), above / 2));
  }

  // Points.
  rings_.assign(n_rings, {});
  for (int r = 0; r < n_rings; ++r) {
    const RingSpec& spec = specs[r];
    if (spec.count == 1) {
      const double s = spec.s[0];
      rings_[r].push_back(points_.add(
          shape.point(0, s), {PointKind::kTooth, std::numeric_limits<double>::quiet_NaN(), s}));
      continue;
    }
    for (int i = 0; i < spec.count; ++i) {
      const double theta = 2 * kPi * i / spec.count;
      const double s =
          spec.s.size() == 1 ? spec.s[0] : spec.s[static_cast<size_t>(i) * N / spec.count];
      rings_[r].push_back(points_.add(shape.point(theta, s), {PointKind::kTooth, theta, s}));
    }
  }

  // Triangles between consecutive rings (ring r above ring r + 1); outward by construction.
  const auto& x = points_.points();
  const double pad_half_width = 0.5 * frame_.spec().bracket.width_mm;
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
    if (nA == 1) {
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

void ModelMesher::build_pdl_layer() {
  const ToothShape& shape = frame_.shape();
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

  // Prisms between consecutive layers over each root triangle, three tetrahedra each. Every side
  // quad is split along the diagonal from its lower-index root vertex on the inner layer to the
  // higher-index one on the outer layer, so neighbouring prisms share their split faces.
  for (const auto& t : root_triangles_) {
    std::array<int, 3> v = t;
    std::sort(v.begin(), v.end());
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

  // Free top of the PDL between the root's crest ring and the socket's, split like the prisms.
  const std::vector<int>& crest = rings_[crest_ring_];
  const int n = static_cast<int>(crest.size());
  for (int i = 0; i < n; ++i) {
    const int lo = std::min(crest[i], crest[(i + 1) % n]);
    const int hi = std::max(crest[i], crest[(i + 1) % n]);
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
  hole_ = frame_.pdl_point(0.0, 0.5 * (crest_s_[0] - 1.0), 0.5);
}

}  // namespace sharpey::mesh::detail
