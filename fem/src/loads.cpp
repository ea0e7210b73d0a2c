#include "sharpey/fem/loads.h"

#include <Eigen/Dense>
#include <cmath>
#include <sstream>
#include <string>
#include <vector>

#include "detail/kinematics.h"
#include "sharpey/core/reference_triangle.h"
#include "sharpey/error.h"

namespace sharpey::fem {
namespace {

// Integrals over the faces with `marker` of N_i dA (scalar, per node) and N_i n dA (vector, per
// node), n dA = (dx/du x dx/dv) du dv. The degree-5 rule integrates N_i n dA (degree 4) exactly.
struct FaceIntegrals {
  Eigen::VectorXd area;         // n: integral N_i dA
  Eigen::VectorXd vector_area;  // 3n: integral N_i n dA
  std::vector<int> nodes;       // nodes of the marked faces, ascending
};

FaceIntegrals integrate_faces(const mesh::VolumeMesh& m, int marker) {
  detail::validate_mesh(m);
  const int n = m.n_nodes(), k = m.nodes_per_face;
  const core::TriangleQuadrature rule = core::tri_quadrature(5);
  std::vector<Eigen::VectorXd> N;
  std::vector<Eigen::MatrixXd> dN;
  for (const Eigen::Vector2d& p : rule.points) {
    N.push_back(core::tri_shape(k, p));
    dN.push_back(core::tri_shape_gradient(k, p));
  }
  FaceIntegrals out;
  out.area = Eigen::VectorXd::Zero(n);
  out.vector_area = Eigen::VectorXd::Zero(3 * n);
  Eigen::Matrix3Xd X(3, k);
  for (int f = 0; f < m.n_faces(); ++f) {
    if (m.face_marker[static_cast<size_t>(f)] != marker) continue;
    const int* fn = m.face(f);
    for (int a = 0; a < k; ++a) {
      X.col(a) = m.nodes[static_cast<size_t>(fn[a])];
      out.nodes.push_back(fn[a]);
    }
    for (size_t q = 0; q < rule.points.size(); ++q) {
      const Eigen::Vector3d xu = X * dN[q].col(0), xv = X * dN[q].col(1);
      const Eigen::Vector3d n_da = rule.weights[q] * xu.cross(xv);
      const double da = n_da.norm();
      for (int a = 0; a < k; ++a) {
        out.area(fn[a]) += N[q](a) * da;
        out.vector_area.segment<3>(3 * fn[a]) += N[q](a) * n_da;
      }
    }
  }
  if (out.nodes.empty()) {
    throw InputError("marker", "no boundary face carries marker " + std::to_string(marker) +
                                   ", so the load has nowhere to act; check the face markers of "
                                   "the mesh (e.g. the bracket pad)");
  }
  std::sort(out.nodes.begin(), out.nodes.end());
  out.nodes.erase(std::unique(out.nodes.begin(), out.nodes.end()), out.nodes.end());
  return out;
}

}  // namespace

Eigen::VectorXd consistent_nodal_areas(const mesh::VolumeMesh& mesh, int marker) {
  return integrate_faces(mesh, marker).area;
}

Eigen::Vector3d vector_area(const mesh::VolumeMesh& mesh, int marker) {
  const FaceIntegrals fi = integrate_faces(mesh, marker);
  Eigen::Vector3d total = Eigen::Vector3d::Zero();
  for (int i : fi.nodes) total += fi.vector_area.segment<3>(3 * i);
  return total;
}

Eigen::VectorXd traction_load(const mesh::VolumeMesh& mesh, int marker,
                              const Eigen::Vector3d& traction_mpa) {
  const FaceIntegrals fi = integrate_faces(mesh, marker);
  Eigen::VectorXd f = Eigen::VectorXd::Zero(3 * mesh.n_nodes());
  for (int i : fi.nodes) f.segment<3>(3 * i) = fi.area(i) * traction_mpa;
  return f;
}

Eigen::VectorXd pressure_load(const mesh::VolumeMesh& mesh, int marker, double pressure_mpa) {
  const FaceIntegrals fi = integrate_faces(mesh, marker);
  return -pressure_mpa * fi.vector_area;
}

Eigen::VectorXd patch_load(const mesh::VolumeMesh& mesh, int marker, const Eigen::Vector3d& force_n,
                           const Eigen::Vector3d& moment_nmm,
                           const Eigen::Vector3d& reference_point) {
  const FaceIntegrals fi = integrate_faces(mesh, marker);
  double area = 0;
  for (int i : fi.nodes) area += fi.area(i);
  if (!(area > 0)) {
    throw InputError("marker", "the faces with marker " + std::to_string(marker) +
                                   " have no area; check the mesh of the loaded patch");
  }
  // Weighted centroid and the inertia-like tensor of the patch about it.
  Eigen::Vector3d c = Eigen::Vector3d::Zero();
  for (int i : fi.nodes) c += (fi.area(i) / area) * mesh.nodes[static_cast<size_t>(i)];
  Eigen::Matrix3d J = Eigen::Matrix3d::Zero();
  for (int i : fi.nodes) {
    const Eigen::Vector3d r = mesh.nodes[static_cast<size_t>(i)] - c;
    J += (fi.area(i) / area) * (r.squaredNorm() * Eigen::Matrix3d::Identity() - r * r.transpose());
  }
  const Eigen::Vector3d j_eigen = Eigen::SelfAdjointEigenSolver<Eigen::Matrix3d>(J).eigenvalues();
  if (!(j_eigen(0) > 1e-10 * j_eigen(2))) {
    std::ostringstream s;
    s << "the faces with marker " << marker << " lie (nearly) on a line (second moments "
      << j_eigen.transpose() << " mm^2), so a moment cannot be distributed over them; load a patch "
      << "with some extent in two directions";
    throw InputError("marker", s.str());
  }
  const Eigen::Vector3d moment_c = moment_nmm + (reference_point - c).cross(force_n);
  const Eigen::Vector3d theta = J.ldlt().solve(moment_c);
  Eigen::VectorXd f = Eigen::VectorXd::Zero(3 * mesh.n_nodes());
  for (int i : fi.nodes) {
    const Eigen::Vector3d r = mesh.nodes[static_cast<size_t>(i)] - c;
    f.segment<3>(3 * i) = (fi.area(i) / area) * (force_n + theta.cross(r));
  }
  return f;
}

}  // namespace sharpey::fem
