// 4-node <-> 10-node conversion with one shared midside node per edge.
#include "sharpey/mesh/second_order.h"

#include <algorithm>
#include <cstdint>
#include <string>
#include <unordered_map>
#include <utility>

#include "sharpey/core/reference_tetrahedron.h"
#include "sharpey/core/reference_triangle.h"
#include "sharpey/error.h"

namespace sharpey::mesh {
namespace {

void check_linear(const VolumeMesh& m) {
  if (m.nodes_per_element != 4 || m.nodes_per_face != 3) {
    throw MeshError(
        "converting to a quadratic mesh: the input must have 4-node elements and 3-node "
        "faces, it has " +
        std::to_string(m.nodes_per_element) + "-node elements and " +
        std::to_string(m.nodes_per_face) + "-node faces");
  }
  if (m.elements.size() != m.element_region.size() * 4 ||
      m.faces.size() != m.face_marker.size() * 3) {
    throw MeshError(
        "converting to a quadratic mesh: connectivity and region/marker arrays differ "
        "in length");
  }
  const int n = m.n_nodes();
  auto valid = [n](int v) { return v >= 0 && v < n; };
  if (!std::all_of(m.elements.begin(), m.elements.end(), valid) ||
      !std::all_of(m.faces.begin(), m.faces.end(), valid)) {
    throw MeshError("converting to a quadratic mesh: a node index is outside 0 to " +
                    std::to_string(n - 1));
  }
}

// Numbers the edges of a mesh: each unordered vertex pair gets one id.
class EdgeNumbering {
 public:
  explicit EdgeNumbering(int n_nodes) : n_(static_cast<std::uint64_t>(n_nodes)) {}
  int id(int a, int b) {
    if (a > b) std::swap(a, b);
    const std::uint64_t key = static_cast<std::uint64_t>(a) * n_ + static_cast<std::uint64_t>(b);
    const auto [it, inserted] = ids_.emplace(key, static_cast<int>(ends_.size()));
    if (inserted) ends_.push_back({a, b});
    return it->second;
  }
  void reserve(size_t n) {
    ids_.reserve(n);
    ends_.reserve(n);
  }
  const std::vector<std::array<int, 2>>& ends() const { return ends_; }

 private:
  std::uint64_t n_;
  std::unordered_map<std::uint64_t, int> ids_;
  std::vector<std::array<int, 2>> ends_;
};

}  // namespace

VolumeMesh make_second_order(const VolumeMesh& linear, const MidsideProjection& project) {
  check_linear(linear);
  const int n_vertices = linear.n_nodes();
  const int n_elements = linear.n_elements();
  const int n_faces = linear.n_faces();

  EdgeNumbering edges(n_vertices);
  edges.reserve(static_cast<size_t>(n_elements) * 7 / 5 + static_cast<size_t>(n_faces) * 3 / 2 +
                16);
  VolumeMesh q;
  q.nodes_per_element = 10;
  q.nodes_per_face = 6;
  q.element_region = linear.element_region;
  q.face_marker = linear.face_marker;
  q.elements.resize(static_cast<size_t>(n_elements) * 10);
  q.faces.resize(static_cast<size_t>(n_faces) * 6);

  // Midside node ids are edge ids offset by the vertex count; positions are filled in afterwards.
  for (int e = 0; e < n_elements; ++e) {
    const int* t = linear.element(e);
    int* out = q.elements.data() + static_cast<size_t>(e) * 10;
    for (int k = 0; k < 4; ++k) out[k] = t[k];
    for (int k = 0; k < 6; ++k)
      out[4 + k] = n_vertices + edges.id(t[core::kTetEdges[k][0]], t[core::kTetEdges[k][1]]);
  }
  std::vector<std::pair<int, int>> edge_marker;  // (edge id, marker) for edges on faces
  edge_marker.reserve(static_cast<size_t>(n_faces) * 3);
  for (int f = 0; f < n_faces; ++f) {
    const int* tri = linear.face(f);
    int* out = q.faces.data() + static_cast<size_t>(f) * 6;
    for (int k = 0; k < 3; ++k) out[k] = tri[k];
    for (int k = 0; k < 3; ++k) {
      const int edge = edges.id(tri[core::kTriEdges[k][0]], tri[core::kTriEdges[k][1]]);
      out[3 + k] = n_vertices + edge;
      edge_marker.emplace_back(edge, linear.face_marker[static_cast<size_t>(f)]);
    }
  }
  std::sort(edge_marker.begin(), edge_marker.end());
  edge_marker.erase(std::unique(edge_marker.begin(), edge_marker.end()), edge_marker.end());

  const auto& ends = edges.ends();
  q.nodes = linear.nodes;
  q.nodes.resize(static_cast<size_t>(n_vertices) + ends.size());
  for (size_t k = 0; k < ends.size(); ++k) {
    q.nodes[static_cast<size_t>(n_vertices) + k] =
        0.5 * (linear.nodes[static_cast<size_t>(ends[k][0])] +
               linear.nodes[static_cast<size_t>(ends[k][1])]);
  }
  if (project) {
    std::vector<int> markers;
    for (size_t i = 0; i < edge_marker.size();) {
      const int edge = edge_marker[i].first;
      markers.clear();
      for (; i < edge_marker.size() && edge_marker[i].first == edge; ++i) {
        markers.push_back(edge_marker[i].second);
      }
      const auto& ab = ends[static_cast<size_t>(edge)];
      q.nodes[static_cast<size_t>(n_vertices + edge)] =
          project(markers, linear.nodes[static_cast<size_t>(ab[0])],
                  linear.nodes[static_cast<size_t>(ab[1])]);
    }
  }
  return q;
}

VolumeMesh make_first_order(const VolumeMesh& mesh) {
  if (mesh.nodes_per_element == 4 && mesh.nodes_per_face == 3) return mesh;
  if (mesh.nodes_per_element != 10 || mesh.nodes_per_face != 6) {
    throw MeshError(
        "converting to a linear mesh: expected 10-node elements and 6-node faces, got " +
        std::to_string(mesh.nodes_per_element) + " and " + std::to_string(mesh.nodes_per_face));
  }
  const int n = mesh.n_nodes();
  std::vector<int> new_index(static_cast<size_t>(n), -1);
  auto mark = [&](int v) {
    if (v < 0 || v >= n) throw MeshError("converting to a linear mesh: node index out of range");
    new_index[static_cast<size_t>(v)] = 0;
  };
  for (int e = 0; e < mesh.n_elements(); ++e) {
    for (int k = 0; k < 4; ++k) mark(mesh.element(e)[k]);
  }
  for (int f = 0; f < mesh.n_faces(); ++f) {
    for (int k = 0; k < 3; ++k) mark(mesh.face(f)[k]);
  }
  VolumeMesh lin;
  lin.nodes_per_element = 4;
  lin.nodes_per_face = 3;
  for (int v = 0; v < n; ++v) {
    if (new_index[static_cast<size_t>(v)] < 0) continue;
    new_index[static_cast<size_t>(v)] = lin.n_nodes();
    lin.nodes.push_back(mesh.nodes[static_cast<size_t>(v)]);
  }
  lin.element_region = mesh.element_region;
  lin.face_marker = mesh.face_marker;
  lin.elements.reserve(static_cast<size_t>(mesh.n_elements()) * 4);
  for (int e = 0; e < mesh.n_elements(); ++e) {
    for (int k = 0; k < 4; ++k)
      lin.elements.push_back(new_index[static_cast<size_t>(mesh.element(e)[k])]);
  }
  lin.faces.reserve(static_cast<size_t>(mesh.n_faces()) * 3);
  for (int f = 0; f < mesh.n_faces(); ++f) {
    for (int k = 0; k < 3; ++k)
      lin.faces.push_back(new_index[static_cast<size_t>(mesh.face(f)[k])]);
  }
  return lin;
}

}  // namespace sharpey::mesh
