// build_tooth_model(): surfaces and PDL layer (model_surfaces.cpp, model_bone.cpp), one TetGen
// call for tooth and bone with the PDL as a hole, merging, and quadratic elements whose midside
// nodes lie on the exact tooth and socket surfaces.
#include <Eigen/Geometry>
#include <algorithm>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <sstream>
#include <unordered_map>
#include <unordered_set>

#include "detail/model_mesher.h"
#include "detail/triangle_key.h"
#include "sharpey/core/reference_tetrahedron.h"
#include "sharpey/error.h"
#include "sharpey/mesh/second_order.h"

namespace sharpey::mesh {
namespace {
// Smallest accepted ratio of the smallest to the largest Jacobian determinant in an element.
constexpr double kMinJacobianRatio = 0.05;
}  // namespace
namespace detail {
namespace {

// Bit-exact position key: TetGen returns input points unchanged.
struct PositionKey {
  std::uint64_t b[3];
  explicit PositionKey(const Eigen::Vector3d& p) {
    for (int k = 0; k < 3; ++k) {
      const double v = p[k] == 0.0 ? 0.0 : p[k];  // -0 and +0 alike
      std::memcpy(&b[k], &v, sizeof v);
    }
  }
  bool operator==(const PositionKey& o) const {
    return b[0] == o.b[0] && b[1] == o.b[1] && b[2] == o.b[2];
  }
};
struct PositionKeyHash {
  size_t operator()(const PositionKey& k) const {
    std::uint64_t h = 1469598103934665603ull;
    for (std::uint64_t x : k.b) h = (h ^ x) * 1099511628211ull;
    return static_cast<size_t>(h);
  }
};

}  // namespace

Plc ModelMesher::make_plc(std::vector<int>* plc_to_point) const {
  Plc plc;
  std::vector<int> point_to_plc(points_.size(), -1);
  plc_to_point->clear();
  for (const Facet& f : facets_) {
    if (!f.to_tetgen) continue;
    std::array<int, 3> t{};
    for (int k = 0; k < 3; ++k) {
      int& q = point_to_plc[f.v[k]];
      if (q < 0) {
        q = static_cast<int>(plc.points.size());
        plc.points.push_back(points_.points()[f.v[k]]);
        plc_to_point->push_back(f.v[k]);
      }
      t[k] = q;
    }
    plc.triangles.push_back(t);
    plc.triangle_marker.push_back(f.marker);
  }
  plc.regions = seeds_;
  plc.holes = {hole_};
  return plc;
}

VolumeMesh ModelMesher::build_linear(const std::atomic<bool>* cancel) {
  build_tooth_surface();
  build_pdl_layer();
  build_bone();

  std::vector<int> plc_to_point;
  const Plc plc = make_plc(&plc_to_point);
  TetgenOptions options;
  options.preserve_surface = true;
  options.second_order = false;
  options.radius_edge_ratio = frame_.sizes().solid_radius_edge_ratio;
  options.cancel = cancel;
  const VolumeMesh tet = tetrahedralize(plc, options);

  VolumeMesh mesh;
  mesh.nodes_per_element = 4;
  mesh.nodes_per_face = 3;
  mesh.nodes = points_.points();
  std::unordered_map<PositionKey, int, PositionKeyHash> input;
  input.reserve(plc_to_point.size() * 2);
  for (int p : plc_to_point) input.emplace(PositionKey(points_.points()[p]), p);
  std::vector<int> node_map(tet.n_nodes());
  for (int i = 0; i < tet.n_nodes(); ++i) {
    const auto it = input.find(PositionKey(tet.nodes[i]));
    if (it != input.end()) {
      node_map[i] = it->second;
    } else {
      node_map[i] = mesh.n_nodes();
      mesh.nodes.push_back(tet.nodes[i]);
    }
  }
  for (int e = 0; e < tet.n_elements(); ++e) {
    for (int k = 0; k < 4; ++k) mesh.elements.push_back(node_map[tet.element(e)[k]]);
    mesh.element_region.push_back(tet.element_region[e]);
  }

  // The preserved surfaces must come back as element faces, or the PDL would not conform.
  std::unordered_set<TriangleKey, TriangleKeyHash> element_faces;
  element_faces.reserve(static_cast<size_t>(mesh.n_elements()) * 4);
  for (int e = 0; e < mesh.n_elements(); ++e) {
    const int* t = mesh.element(e);
    for (const auto& f : core::kTetFaces) element_faces.emplace(t[f[0]], t[f[1]], t[f[2]]);
  }
  int n_missing = 0;
  for (const Facet& f : facets_) {
    if (f.to_tetgen && !element_faces.count(TriangleKey(f.v[0], f.v[1], f.v[2]))) ++n_missing;
  }
  if (n_missing > 0) {
    throw MeshError("tetrahedralising tooth and bone: TetGen changed " + std::to_string(n_missing) +
                    " of the preserved surface triangles, so the PDL layer would not conform");
  }

  for (const auto& t : pdl_tets_) {
    mesh.elements.insert(mesh.elements.end(), t.begin(), t.end());
    mesh.element_region.push_back(kPdl);
  }
  for (const Facet& f : facets_) {
    if (!f.output) continue;
    mesh.faces.insert(mesh.faces.end(), f.v.begin(), f.v.end());
    mesh.face_marker.push_back(f.marker);
  }
  std::unordered_set<TriangleKey, TriangleKeyHash> pdl_faces;
  for (const auto& t : pdl_tets_) {
    for (const auto& lf : core::kTetFaces) {
      if (!pdl_faces.emplace(t[lf[0]], t[lf[1]], t[lf[2]]).second) continue;
      for (int k : lf) mesh.faces.push_back(t[k]);
      mesh.face_marker.push_back(kPdlHelperMarker);
    }
  }
  return mesh;
}

namespace {

std::string describe(const ModelSpec& spec) {
  std::ostringstream s;
  s << "tooth " << to_string(spec.tooth.type);
  switch (spec.tooth.ideal_root) {
    case IdealRoot::kCylinder:
      s << " (idealised cylinder root)";
      break;
    case IdealRoot::kCone:
      s << " (idealised cone root)";
      break;
    case IdealRoot::kParaboloid:
      s << " (idealised paraboloid root)";
      break;
    case IdealRoot::kNone:
      break;
  }
  const MeshSizes z = resolve_sizing(spec.sizing);
  s << ", " << to_string(spec.sizing.preset) << " mesh (PDL edge " << z.pdl_edge_mm
    << " mm, bone edge " << z.bone_edge_mm << " mm, " << z.pdl_layers << " PDL layer"
    << (z.pdl_layers > 1 ? "s" : "") << "), horizontal loss " << spec.loss.horizontal_mm
    << " mm, angular defect " << spec.loss.defect_depth_mm << " mm";
  return s.str();
}

// Minimum over the nodes and degree-2 quadrature points of det J, divided by the maximum.
double jacobian_ratio(const VolumeMesh& mesh, int e, const std::vector<Eigen::MatrixXd>& grads) {
  const int* t = mesh.element(e);
  Eigen::Matrix<double, 3, 10> x;
  for (int k = 0; k < 10; ++k) x.col(k) = mesh.nodes[t[k]];
  double lo = 1e300, hi = -1e300;
  for (const Eigen::MatrixXd& g : grads) {
    const double det = (x * g).determinant();
    lo = std::min(lo, det);
    hi = std::max(hi, det);
  }
  return hi > 0 ? lo / hi : -1.0;
}

// Curved midside nodes can fold thin PDL elements where the surface bends strongly within an
// element (root apex, incisal edge) on coarse meshes. Pull the midside nodes of such elements
// back toward their edge midpoints (halving the offset each pass, straight after eight passes)
// until every element's Jacobian ratio is at least `min_ratio`. Returns the number of moves.
int straighten_folded(VolumeMesh* mesh, double min_ratio) {
  std::vector<Eigen::MatrixXd> grads;
  for (int k = 0; k < 10; ++k)
    grads.push_back(core::tet_shape_gradient(10, core::tet_node_reference(k)));
  for (const Eigen::Vector3d& p : core::tet_quadrature(2).points)
    grads.push_back(core::tet_shape_gradient(10, p));
  std::vector<int> suspects(mesh->n_elements());
  for (int e = 0; e < mesh->n_elements(); ++e) suspects[e] = e;
  int n_moves = 0;
  for (int pass = 0; pass < 12 && !suspects.empty(); ++pass) {
    std::vector<int> bad;
    for (int e : suspects)
      if (jacobian_ratio(*mesh, e, grads) < min_ratio) bad.push_back(e);
    if (bad.empty()) break;
    const double keep = pass < 8 ? 0.5 : 0.0;
    std::unordered_set<int> moved;
    for (int e : bad) {
      const int* t = mesh->element(e);
      for (int k = 0; k < 6; ++k) {
        const int m = t[4 + k];
        if (!moved.insert(m).second) continue;
        const Eigen::Vector3d mid =
            0.5 * (mesh->nodes[t[core::kTetEdges[k][0]]] + mesh->nodes[t[core::kTetEdges[k][1]]]);
        if ((mesh->nodes[m] - mid).squaredNorm() == 0) continue;
        mesh->nodes[m] = mid + keep * (mesh->nodes[m] - mid);
        ++n_moves;
      }
    }
    // Elements sharing a moved node may change; check them (and the bad ones) next pass.
    std::unordered_set<int> next;
    for (int e = 0; e < mesh->n_elements(); ++e) {
      const int* t = mesh->element(e);
      for (int k = 4; k < 10; ++k)
        if (moved.count(t[k])) {
          next.insert(e);
          break;
        }
    }
    suspects.assign(next.begin(), next.end());
  }
  return n_moves;
}

}  // namespace
}  // namespace detail

ToothModel build_tooth_model(const ModelSpec& spec, const std::atomic<bool>* cancel) {
  validate(spec);
  const detail::ModelFrame frame(spec);
  detail::ModelMesher mesher(frame);
  VolumeMesh linear;
  try {
    linear = mesher.build_linear(cancel);
  } catch (const MeshError& e) {
    throw MeshError(std::string(e.what()) + " [" + detail::describe(spec) + "]");
  }

  ToothModel model;
  model.spec = spec;
  model.geometry = detail::integrate_geometry(frame);
  auto drop_layer_faces = [](VolumeMesh* mesh) {
    size_t kept = 0;
    const int n = mesh->nodes_per_face;
    for (int f = 0; f < mesh->n_faces(); ++f) {
      if (mesh->face_marker[f] < 0) continue;
      std::copy(mesh->face(f), mesh->face(f) + n, mesh->faces.begin() + kept * n);
      mesh->face_marker[kept++] = mesh->face_marker[f];
    }
    mesh->faces.resize(kept * n);
    mesh->face_marker.resize(kept);
  };
  if (!spec.sizing.second_order) {
    model.mesh = std::move(linear);
    drop_layer_faces(&model.mesh);
    return model;
  }

  // Midside nodes on the exact geometry: edges of the tooth surface, of the socket and of every
  // PDL element take the image of their parametric midpoint under the offset map
  // (theta, s, f) -> tooth surface point + f * width * normal (f = 0 tooth, 1 socket), so the PDL
  // elements are smooth images of straight prisms and stay valid however thin their layers.
  const detail::PointSet& points = mesher.points();
  std::unordered_map<detail::PositionKey, int, detail::PositionKeyHash> lookup;
  lookup.reserve(static_cast<size_t>(points.size()) * 2);
  for (int p = 0; p < points.size(); ++p) {
    if (points.info()[p].kind != detail::PointKind::kBone)
      lookup.emplace(detail::PositionKey(points.points()[p]), p);
  }
  auto project = [&](const std::vector<int>& markers, const Eigen::Vector3d& a,
                     const Eigen::Vector3d& b) -> Eigen::Vector3d {
    auto has = [&](int m) { return std::find(markers.begin(), markers.end(), m) != markers.end(); };
    const auto ia = lookup.find(detail::PositionKey(a));
    const auto ib = lookup.find(detail::PositionKey(b));
    if (ia == lookup.end() || ib == lookup.end()) return 0.5 * (a + b);
    const detail::PointInfo& pa = points.info()[ia->second];
    const detail::PointInfo& pb = points.info()[ib->second];
    const bool tooth =
        pa.kind == detail::PointKind::kTooth && pb.kind == detail::PointKind::kTooth &&
        (has(kRootSurface) || has(kExposedRoot) || has(kCrownSurface) || has(kBracketPad));
    const bool socket = pa.kind == detail::PointKind::kSocket &&
                        pb.kind == detail::PointKind::kSocket && has(kSocketSurface);
    if (!(tooth || socket || has(detail::kPdlHelperMarker))) return 0.5 * (a + b);
    double ta = pa.theta, tb = pb.theta;
    if (std::isnan(ta)) ta = tb;
    if (std::isnan(tb)) tb = ta;
    const double theta = std::isnan(ta) ? 0.0 : ta + 0.5 * detail::wrap_angle(tb - ta);
    return frame.pdl_point(theta, 0.5 * (pa.s + pb.s), 0.5 * (pa.f + pb.f));
  };
  model.mesh = make_second_order(linear, project);
  drop_layer_faces(&model.mesh);
  detail::straighten_folded(&model.mesh, kMinJacobianRatio);
  return model;
}

}  // namespace sharpey::mesh
