#include "sharpey/fem/recovery.h"

#include <omp.h>

#include <Eigen/Eigenvalues>
#include <algorithm>
#include <cmath>
#include <string>

#include "detail/kinematics.h"
#include "sharpey/core/check.h"
#include "sharpey/error.h"
#include "sharpey/fem/element.h"

namespace sharpey::fem {
namespace {

// Recovery points (degree-2 rule for 10-node, centroid for 4-node) and the matrix taking values at
// those points to values at the K nodes: for 10-node elements the 4 values define the linear field
// sum_j c_j L_j (barycentric L_j), evaluated at the nodes.
template <int K>
struct RecoveryTable {
  static constexpr int kPoints = K == 10 ? 4 : 1;
  const detail::ReferenceTable<K>* points = nullptr;
  Eigen::Matrix<double, K, kPoints> to_nodes;
};

template <int K>
const RecoveryTable<K>& recovery_table() {
  static const RecoveryTable<K> table = [] {
    RecoveryTable<K> t;
    t.points = &detail::reference_table<K>(K == 10 ? 2 : 1);
    if constexpr (K == 4) {
      t.to_nodes.setOnes();
    } else {
      auto barycentric = [](const Eigen::Vector3d& p) {
        return Eigen::Vector4d(1.0 - p.x() - p.y() - p.z(), p.x(), p.y(), p.z());
      };
      Eigen::Matrix4d A;  // A(q, j) = L_j(point q)
      for (int q = 0; q < 4; ++q)
        A.row(q) = barycentric(t.points->points[static_cast<size_t>(q)]).transpose();
      Eigen::Matrix<double, K, 4> at_nodes;
      for (int a = 0; a < K; ++a)
        at_nodes.row(a) = barycentric(core::tet_node_reference(a)).transpose();
      t.to_nodes = at_nodes * A.inverse();
    }
    return t;
  }();
  return table;
}

template <int K>
void recover_fixed(const mesh::VolumeMesh& m, const std::vector<int>& elements,
                   const std::vector<int>& local_of, int n_local, const Eigen::MatrixXd& U,
                   Eigen::MatrixXd* strain_sum, Eigen::VectorXi* count) {
  const RecoveryTable<K>& table = recovery_table<K>();
  constexpr int Q = RecoveryTable<K>::kPoints;
  const long m_fields = U.cols();
  const int n_threads = omp_get_max_threads();
  std::vector<Eigen::MatrixXd> partial(static_cast<size_t>(n_threads));
  bool inverted = false;
  int inverted_element = -1;
  double inverted_det = 0;
#pragma omp parallel num_threads(n_threads)
  {
    Eigen::MatrixXd& acc = partial[static_cast<size_t>(omp_get_thread_num())];
    acc = Eigen::MatrixXd::Zero(6 * m_fields, n_local);
    Eigen::MatrixXd ue(3 * K, m_fields), strain_q(6 * Q, m_fields), node_strain(6, m_fields);
    detail::ShapeGradient<K> G;
    detail::BMatrix<K> B;
#pragma omp for schedule(static)
    for (size_t i = 0; i < elements.size(); ++i) {
      const int e = elements[i];
      const int* en = m.element(e);
      const detail::NodeCoords<K> X = detail::element_coordinates<K>(m, e);
      for (int a = 0; a < K; ++a) ue.middleRows(3 * a, 3) = U.middleRows(3 * en[a], 3);
      for (int q = 0; q < Q; ++q) {
        const double det =
            detail::physical_gradient<K>(X, table.points->gradient[static_cast<size_t>(q)], &G);
        if (!(det > 0)) {
#pragma omp critical(sharpey_fem_recovery_error)
          if (!inverted) {
            inverted = true;
            inverted_element = e;
            inverted_det = det;
          }
          G.setZero();
        }
        detail::fill_b<K>(G, &B);
        strain_q.middleRows(6 * q, 6).noalias() = B * ue;
      }
      for (int a = 0; a < K; ++a) {
        node_strain.setZero();
        for (int q = 0; q < Q; ++q)
          node_strain += table.to_nodes(a, q) * strain_q.middleRows(6 * q, 6);
        const int l = local_of[static_cast<size_t>(en[a])];
        for (long j = 0; j < m_fields; ++j) acc.block(6 * j, l, 6, 1) += node_strain.col(j);
      }
    }
  }
  if (inverted)
    throw MeshError(detail::inverted_element_message(m, inverted_element, inverted_det));
  *strain_sum = Eigen::MatrixXd::Zero(6 * m_fields, n_local);
  for (const auto& p : partial) *strain_sum += p;
  *count = Eigen::VectorXi::Zero(n_local);
  for (int e : elements) {
    const int* en = m.element(e);
    for (int a = 0; a < K; ++a) ++(*count)(local_of[static_cast<size_t>(en[a])]);
  }
}

}  // namespace

std::vector<RegionField> recover_region(const mesh::VolumeMesh& mesh,
                                        const MaterialTable& materials, const Eigen::MatrixXd& U,
                                        int region) {
  detail::validate_mesh(mesh);
  SHARPEY_ASSERT(U.rows() == 3 * mesh.n_nodes(), "recover_region: the displacement has " +
                                                     std::to_string(U.rows()) + " rows, the mesh " +
                                                     std::to_string(3 * mesh.n_nodes()) + " dofs");
  std::vector<int> elements;
  for (int e = 0; e < mesh.n_elements(); ++e) {
    if (mesh.element_region[static_cast<size_t>(e)] == region) elements.push_back(e);
  }
  if (elements.empty()) {
    throw InputError("region", "no element of the mesh belongs to region " +
                                   std::to_string(region) + "; pick a region the mesh has");
  }
  const Matrix6d D = elasticity_matrix(material_of(materials, region));
  const int k = mesh.nodes_per_element;
  std::vector<int> nodes;
  for (int e : elements) nodes.insert(nodes.end(), mesh.element(e), mesh.element(e) + k);
  std::sort(nodes.begin(), nodes.end());
  nodes.erase(std::unique(nodes.begin(), nodes.end()), nodes.end());
  std::vector<int> local_of(static_cast<size_t>(mesh.n_nodes()), -1);
  for (size_t i = 0; i < nodes.size(); ++i)
    local_of[static_cast<size_t>(nodes[i])] = static_cast<int>(i);
  const int n_local = static_cast<int>(nodes.size());

  Eigen::MatrixXd strain_sum;
  Eigen::VectorXi count;
  if (k == 4) {
    recover_fixed<4>(mesh, elements, local_of, n_local, U, &strain_sum, &count);
  } else {
    recover_fixed<10>(mesh, elements, local_of, n_local, U, &strain_sum, &count);
  }
  const Eigen::RowVectorXd inverse_count = count.cast<double>().cwiseInverse().transpose();
  std::vector<RegionField> fields(static_cast<size_t>(U.cols()));
  for (long j = 0; j < U.cols(); ++j) {
    RegionField& f = fields[static_cast<size_t>(j)];
    f.region = region;
    f.nodes = nodes;
    f.strain = strain_sum.middleRows(6 * j, 6).array().rowwise() * inverse_count.array();
    f.stress_mpa = D * f.strain;
  }
  return fields;
}

RegionField recover_region(const mesh::VolumeMesh& mesh, const MaterialTable& materials,
                           const Eigen::VectorXd& u, int region) {
  const Eigen::MatrixXd U = u;
  return std::move(recover_region(mesh, materials, U, region).front());
}

void element_quadrature_stress(const mesh::VolumeMesh& mesh, int e, const Matrix6d& D,
                               const Eigen::VectorXd& u,
                               Eigen::Matrix<double, 6, Eigen::Dynamic>* stress_mpa,
                               Eigen::Matrix3Xd* points_mm) {
  const int k = mesh.nodes_per_element;
  const core::QuadratureRule rule = core::tet_quadrature(k == 10 ? 2 : 1);
  const int n_q = static_cast<int>(rule.points.size());
  Eigen::VectorXd ue(3 * k);
  const int* en = mesh.element(e);
  for (int a = 0; a < k; ++a) ue.segment<3>(3 * a) = u.segment<3>(3 * en[a]);
  if (stress_mpa) stress_mpa->resize(6, n_q);
  if (points_mm) points_mm->resize(3, n_q);
  for (int q = 0; q < n_q; ++q) {
    const Eigen::Vector3d& p = rule.points[static_cast<size_t>(q)];
    if (stress_mpa) {
      double det = 0;
      const Eigen::MatrixXd B = strain_displacement(mesh, e, p, &det);
      if (!(det > 0)) throw MeshError(detail::inverted_element_message(mesh, e, det));
      stress_mpa->col(q) = D * (B * ue);
    }
    if (points_mm) {
      const Eigen::VectorXd N = core::tet_shape(k, p);
      Eigen::Vector3d x = Eigen::Vector3d::Zero();
      for (int a = 0; a < k; ++a) x += N(a) * mesh.nodes[static_cast<size_t>(en[a])];
      points_mm->col(q) = x;
    }
  }
}

double hydrostatic_pressure_kpa(const Vector6d& s) { return -(s(0) + s(1) + s(2)) / 3.0 * 1000.0; }

double von_mises_mpa(const Vector6d& s) {
  const double d01 = s(0) - s(1), d12 = s(1) - s(2), d20 = s(2) - s(0);
  return std::sqrt(0.5 * (d01 * d01 + d12 * d12 + d20 * d20) +
                   3.0 * (s(3) * s(3) + s(4) * s(4) + s(5) * s(5)));
}

namespace {
// Closed form for 3 x 3 (Eigen's computeDirect: scaled, trigonometric cubic roots), several times
// faster than the iterative solver; the app evaluates it at every PDL node on each load change.
Eigen::Vector3d descending_eigenvalues(const Eigen::Matrix3d& T) {
  Eigen::SelfAdjointEigenSolver<Eigen::Matrix3d> eig;
  eig.computeDirect(T, Eigen::EigenvaluesOnly);
  const Eigen::Vector3d v = eig.eigenvalues();  // ascending
  return Eigen::Vector3d(v(2), v(1), v(0));
}
}  // namespace

Eigen::Vector3d principal_stresses_mpa(const Vector6d& s) {
  Eigen::Matrix3d T;
  T << s(0), s(5), s(4), s(5), s(1), s(3), s(4), s(3), s(2);
  return descending_eigenvalues(T);
}

Eigen::Vector3d principal_strains(const Vector6d& e) {
  Eigen::Matrix3d T;  // tensor strain: half the engineering shear
  T << e(0), 0.5 * e(5), 0.5 * e(4), 0.5 * e(5), e(1), 0.5 * e(3), 0.5 * e(4), 0.5 * e(3), e(2);
  return descending_eigenvalues(T);
}

double equivalent_strain(const Vector6d& e) {
  const double mean = (e(0) + e(1) + e(2)) / 3.0;
  const double d0 = e(0) - mean, d1 = e(1) - mean, d2 = e(2) - mean;
  // e_dev : e_dev with tensor shear (eps_ij = gamma_ij / 2), off-diagonal terms counted twice.
  const double contraction =
      d0 * d0 + d1 * d1 + d2 * d2 + 0.5 * (e(3) * e(3) + e(4) * e(4) + e(5) * e(5));
  return std::sqrt(2.0 / 3.0 * contraction);
}

}  // namespace sharpey::fem
