// Builds the linear (4-node) mesh of a tooth model: structured triangulations of the tooth,
// socket and bone surfaces, the structured PDL layer, and one TetGen call for tooth and bone.
// Used by build_tooth_model(); split over model_surfaces.cpp (tooth and PDL), model_bone.cpp
// (bone block) and model_build.cpp (TetGen, merging, quadratic elements).
#pragma once

#include <Eigen/Core>
#include <array>
#include <atomic>
#include <unordered_map>
#include <utility>
#include <vector>

#include "model_frame.h"
#include "sharpey/mesh/tetrahedralize.h"
#include "sharpey/mesh/volume_mesh.h"

namespace sharpey::mesh::detail {

// Which parametric surface a point lies on (for placing midside nodes on the true surface).
enum class PointKind : unsigned char { kTooth, kPdlLayer, kSocket, kBone };

struct PointInfo {
  PointKind kind = PointKind::kBone;
  double theta = 0;  // column angle; NaN at a pole
  double s = 0;      // meridian parameter of the tooth surface (tooth, PDL and socket points)
  double f = 0;      // fraction across the PDL: 0 tooth surface, 1 socket
};

// Marker of helper faces: every face of a PDL element is listed with it in the linear mesh so
// that every PDL edge gets its midside node from the exact offset map (see build_tooth_model);
// the helper faces are dropped afterwards.
constexpr int kPdlHelperMarker = -1;

// Points with merging of coincident positions (within 1e-9 mm), so surfaces built separately
// share their boundary vertices.
class PointSet {
 public:
  int add(const Eigen::Vector3d& p, const PointInfo& info);
  const std::vector<Eigen::Vector3d>& points() const { return points_; }
  const std::vector<PointInfo>& info() const { return info_; }
  int size() const { return static_cast<int>(points_.size()); }

 private:
  std::vector<Eigen::Vector3d> points_;
  std::vector<PointInfo> info_;
  std::unordered_map<long long, std::vector<int>> cells_;
};

struct BoneLayout;  // model_bone.cpp

struct Facet {
  std::array<int, 3> v;
  int marker;      // FaceMarker, or kOther for the cortical/cancellous interface
  bool to_tetgen;  // part of the PLC
  bool output;     // listed as a mesh face
};

// One ring of the tooth surface (model_surfaces.cpp).
struct RingSpec;

class ModelMesher {
 public:
  explicit ModelMesher(const ModelFrame& frame);

  // Builds everything and returns the linear mesh; `pdl_hole` etc. are internal.
  VolumeMesh build_linear(const std::atomic<bool>* cancel);  // cancel: see TetgenOptions
  const PointSet& points() const { return points_; }

 private:
  // model_surfaces.cpp
  void build_tooth_surface();
  void layout_columns();
  // Rings from the crown tip to the CEJ; returns the indices of the pad's upper and lower rings.
  std::pair<int, int> add_crown_ring_specs(std::vector<RingSpec>* specs) const;
  // Rings from below the CEJ to the apex (sets crest_ring_ and cortical_ring_).
  void add_root_ring_specs(std::vector<RingSpec>* specs);
  void set_ring_counts(std::vector<RingSpec>* specs, int pad_hi_ring) const;
  void add_ring_points(const std::vector<RingSpec>& specs);
  void add_ring_triangles(const std::vector<RingSpec>& specs, int pad_hi_ring, int pad_lo_ring,
                          int cej_ring);
  // Column indices (into column_theta_) of the points of a ring of `count` points.
  std::vector<int> ring_columns(const RingSpec& spec) const;
  void build_pdl_layer();
  void add_pdl_points();
  // Rank of each point in the order that splits the PDL prisms (see add_pdl_prisms).
  std::vector<int> prism_split_rank() const;
  void add_pdl_prisms(const std::vector<int>& rank);
  void add_pdl_free_top(const std::vector<int>& rank);
  // The socket points (outer PDL layer) of tooth ring `ring`, every column.
  std::vector<int> socket_ring(int ring) const;
  // The points of a ring of every column at the uniform columns.
  std::vector<int> uniform_subset(const std::vector<int>& all_columns) const;
  // A radial grid of the bone top from the socket: rows[0] holds the uniform columns of `ring`
  // (every column); the extra columns of an angular defect join rows[1] directly. Triangles keep
  // the construction order's orientation (see add_grid).
  void add_socket_grid(const std::vector<std::vector<int>>& rows, const std::vector<int>& ring,
                       int marker, bool output);
  // model_bone.cpp
  void build_bone();
  int bone_point(double x, double y, double z);
  int radial_ring_count(const std::vector<int>& inner, const BoneLayout& b) const;
  void add_radial_grid(const std::vector<int>& ring, double offset, int marker, bool output,
                       int n_rings, const BoneLayout& b);
  void check_unfolded(size_t first) const;
  void add_plate_strips(const BoneLayout& b);
  std::vector<double> column_z(const BoneLayout& b, double x, double y, bool with_upper) const;
  void add_side_face(const BoneLayout& b, const std::vector<double>& xs,
                     const std::vector<double>& ys, bool with_upper, int marker, bool output,
                     const Eigen::Vector3d& outward);
  void add_side_faces(const BoneLayout& b);
  void add_bone_base(const BoneLayout& b);
  void set_region_seeds();
  // model_build.cpp
  Plc make_plc(std::vector<int>* plc_to_point) const;

  void add_facet(int a, int b, int c, int marker, bool to_tetgen, bool output);
  // Adds the two triangles of the quad (a, b, c, d) (in cyclic order) split along its shorter
  // diagonal, oriented like the quad.
  void add_quad(int a, int b, int c, int d, int marker, bool to_tetgen, bool output);
  // Structured grid: rows[r][c] point indices; quads between consecutive rows and columns.
  // `closed`: the columns wrap around. `outward`: each triangle is flipped if its normal has a
  // negative dot product with outward(centroid).
  template <class Outward>
  void add_grid(const std::vector<std::vector<int>>& rows, bool closed, int marker, bool to_tetgen,
                bool output, const Outward& outward);
  void orient(Facet* f, const Eigen::Vector3d& outward) const;
  // Triangles between two closed rows of points p and q whose column indices (ascending, both
  // starting at column 0) differ, one row holding every column of the other: oriented like
  // add_grid's (p the first row). Each point of the finer row between two consecutive points of
  // the coarser one joins the nearer of the two (the middle one both), so that mirror-image
  // column layouts give mirror-image triangles.
  void add_zipper(const std::vector<int>& p, const std::vector<int>& p_columns,
                  const std::vector<int>& q, const std::vector<int>& q_columns, int n_columns,
                  int marker, bool to_tetgen, bool output);

  const ModelFrame& frame_;
  PointSet points_;
  std::vector<Facet> facets_;
  int n_columns_ = 0;  // uniform columns: angle 2 pi i / n_columns_
  // Every column (uniform ones plus the extra ones around an angular defect), by ascending angle
  // theta; uniform_column_[i]: the index of uniform column i among them.
  std::vector<double> column_theta_;
  std::vector<int> uniform_column_;
  // Tooth rings (from the crown tip to the apex): point indices; poles are rings of one point.
  std::vector<std::vector<int>> rings_;
  int crest_ring_ = 0, cortical_ring_ = 0;          // indices into rings_
  std::vector<std::array<int, 3>> root_triangles_;  // tooth triangles below the crest
  // layer_[k][p]: the point at fraction k / n_layers across the PDL above tooth point p
  // (-1 where p is above the crest). layer_[0][p] = p.
  std::vector<std::vector<int>> layer_;
  std::vector<std::array<int, 4>> pdl_tets_;
  std::vector<double> crest_s_, cortical_s_;  // per column (of column_theta_)
  Eigen::Vector3d hole_ = Eigen::Vector3d::Zero();
  std::vector<Plc::RegionSeed> seeds_;
};

template <class Outward>
void ModelMesher::add_grid(const std::vector<std::vector<int>>& rows, bool closed, int marker,
                           bool to_tetgen, bool output, const Outward& outward) {
  const std::vector<Eigen::Vector3d>& x = points_.points();
  for (size_t r = 0; r + 1 < rows.size(); ++r) {
    const size_t n = rows[r].size();
    const size_t n_quads = closed ? n : n - 1;
    for (size_t c = 0; c < n_quads; ++c) {
      const size_t c1 = (c + 1) % n;
      const size_t first = facets_.size();
      add_quad(rows[r][c], rows[r][c1], rows[r + 1][c1], rows[r + 1][c], marker, to_tetgen, output);
      for (size_t f = first; f < facets_.size(); ++f) {
        const auto& v = facets_[f].v;
        orient(&facets_[f], outward((x[v[0]] + x[v[1]] + x[v[2]]) / 3.0));
      }
    }
  }
}

}  // namespace sharpey::mesh::detail
