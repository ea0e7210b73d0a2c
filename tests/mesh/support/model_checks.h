// Helpers for the tooth-model mesh tests: face adjacency, element and enclosed volumes, face
// normals. Header-only; used by tests/mesh/test_model_*.cpp.
#pragma once

#include <gtest/gtest.h>

#include <Eigen/Geometry>
#include <algorithm>
#include <array>
#include <map>
#include <vector>

#include "sharpey/core/reference_tetrahedron.h"
#include "sharpey/core/reference_triangle.h"
#include "sharpey/mesh/mesh_statistics.h"
#include "sharpey/mesh/tooth_model.h"
#include "sharpey/mesh/volume_mesh.h"

namespace sharpey::mesh::test {

// The default model (maxillary central incisor, healthy) at one mesh preset, built and measured
// once for all cases of a test suite.
template <MeshPreset kPreset>
class IncisorFixture : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    ModelSpec spec;
    spec.sizing.preset = kPreset;
    model_ = new ToothModel(build_tooth_model(spec));
    stats_ = new MeshStatistics(measure(model_->mesh));
  }
  static void TearDownTestSuite() {
    delete model_;
    delete stats_;
    model_ = nullptr;
    stats_ = nullptr;
  }
  static inline const ToothModel* model_ = nullptr;
  static inline const MeshStatistics* stats_ = nullptr;
};

using Triple = std::array<int, 3>;

inline Triple sorted_triple(int a, int b, int c) {
  Triple t{a, b, c};
  std::sort(t.begin(), t.end());
  return t;
}

// One use of a face by an element: the element and its local face (opposite vertex).
struct FaceUse {
  int element;
  int local;
};

// Element faces keyed by their sorted vertex triple.
inline std::map<Triple, std::vector<FaceUse>> element_faces(const VolumeMesh& m) {
  std::map<Triple, std::vector<FaceUse>> faces;
  for (int e = 0; e < m.n_elements(); ++e) {
    const int* t = m.element(e);
    for (int f = 0; f < 4; ++f) {
      const auto& lf = core::kTetFaces[f];
      faces[sorted_triple(t[lf[0]], t[lf[1]], t[lf[2]])].push_back({e, f});
    }
  }
  return faces;
}

// The six nodes (3 vertices, 3 midside) of local face f of element e, in the face's own VTK order
// (vertices as in core::kTetFaces, then midside nodes on its edges (0,1) (1,2) (0,2)).
inline std::array<int, 6> face_nodes(const VolumeMesh& m, int e, int f) {
  const int* t = m.element(e);
  const auto& lf = core::kTetFaces[f];
  std::array<int, 6> n{t[lf[0]], t[lf[1]], t[lf[2]], -1, -1, -1};
  if (m.nodes_per_element == 10) {
    auto midside = [&](int a, int b) {
      for (int k = 0; k < 6; ++k) {
        const int p = core::kTetEdges[k][0], q = core::kTetEdges[k][1];
        if ((p == a && q == b) || (p == b && q == a)) return t[4 + k];
      }
      return -1;
    };
    n[3] = midside(lf[0], lf[1]);
    n[4] = midside(lf[1], lf[2]);
    n[5] = midside(lf[0], lf[2]);
  }
  return n;
}

inline Eigen::Vector3d element_centroid(const VolumeMesh& m, int e) {
  Eigen::Vector3d c = Eigen::Vector3d::Zero();
  for (int k = 0; k < 4; ++k) c += m.nodes[m.element(e)[k]];
  return c / 4;
}

// Volume of element e by the degree-5 rule on its (possibly curved) geometry.
inline double element_volume(const VolumeMesh& m, int e) {
  const int k = m.nodes_per_element;
  Eigen::MatrixXd x(3, k);
  for (int i = 0; i < k; ++i) x.col(i) = m.nodes[m.element(e)[i]];
  const core::QuadratureRule q = core::tet_quadrature(5);
  double v = 0;
  for (size_t i = 0; i < q.points.size(); ++i)
    v += q.weights[i] * (x * core::tet_shape_gradient(k, q.points[i])).determinant();
  return v;
}

// (1/3) integral of x . n dA over a face given by its nodes (3 or 6) in VTK order, with n the
// right-hand normal. Summed over a closed outward surface this is the enclosed volume.
inline double face_flux(const VolumeMesh& m, const int* nodes, int n_nodes) {
  Eigen::MatrixXd x(3, n_nodes);
  for (int i = 0; i < n_nodes; ++i) x.col(i) = m.nodes[nodes[i]];
  const core::TriangleQuadrature q = core::tri_quadrature(5);
  double flux = 0;
  for (size_t i = 0; i < q.points.size(); ++i) {
    const Eigen::Vector3d p = x * core::tri_shape(n_nodes, q.points[i]);
    const Eigen::MatrixXd d = x * core::tri_shape_gradient(n_nodes, q.points[i]);
    flux += q.weights[i] * p.dot(Eigen::Vector3d(d.col(0)).cross(Eigen::Vector3d(d.col(1)))) / 3;
  }
  return flux;
}

// Straight-sided normal (not normalised) of mesh face f from its vertices.
inline Eigen::Vector3d face_normal(const VolumeMesh& m, int f) {
  const int* v = m.face(f);
  return (m.nodes[v[1]] - m.nodes[v[0]]).cross(m.nodes[v[2]] - m.nodes[v[0]]);
}

inline Eigen::Vector3d face_centroid(const VolumeMesh& m, int f) {
  const int* v = m.face(f);
  return (m.nodes[v[0]] + m.nodes[v[1]] + m.nodes[v[2]]) / 3;
}

}  // namespace sharpey::mesh::test
