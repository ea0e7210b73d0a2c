// Global assembly: symmetry, rigid-body null space, parallel strategies agree with a serial
// triplet assembly, pattern, errors.
#include <gtest/gtest.h>
#include <omp.h>

#include <Eigen/Geometry>
#include <Eigen/SparseCore>
#include <cmath>
#include <string>
#include <vector>

#include "sharpey/error.h"
#include "sharpey/fem/elasticity.h"
#include "support/grid_mesh.h"

namespace sharpey::fem {
namespace {

using testing::grid_mesh;
using testing::jitter_nodes;

Eigen::Vector3d bent(const Eigen::Vector3d& p) {  // curved map of the unit cube, mm
  const double r = 2.0 + p.x();
  const double a = 0.8 * p.y();
  return Eigen::Vector3d(r * std::cos(a), r * std::sin(a), 1.5 * p.z() + 0.2 * p.x() * p.x());
}

const MaterialTable kTwoMaterials{{1, {1000.0, 0.3}}, {2, {5.0, 0.45}}};

mesh::VolumeMesh two_region_mesh(int k, bool curved, bool jittered) {
  mesh::VolumeMesh m = grid_mesh(3, 3, 4, k, curved ? testing::PointMap(bent) : testing::PointMap{},
                                 [](const Eigen::Vector3d& p) { return p.z() < 0.5 ? 1 : 2; });
  if (jittered) jitter_nodes(m, 0.3, 7u);
  return m;
}

// Independent reference: element matrices into triplets, summed by Eigen.
Eigen::SparseMatrix<double> triplet_assembly(const mesh::VolumeMesh& m, const MaterialTable& mat) {
  std::vector<Eigen::Triplet<double>> t;
  const int k = m.nodes_per_element;
  for (int e = 0; e < m.n_elements(); ++e) {
    const Eigen::MatrixXd Ke = element_stiffness(
        m, e, elasticity_matrix(mat.at(m.element_region[static_cast<size_t>(e)])));
    const int* en = m.element(e);
    for (int a = 0; a < k; ++a)
      for (int b = 0; b < k; ++b)
        for (int r = 0; r < 3; ++r)
          for (int c = 0; c < 3; ++c)
            t.emplace_back(3 * en[a] + r, 3 * en[b] + c, Ke(3 * a + r, 3 * b + c));
  }
  Eigen::SparseMatrix<double> K(3 * m.n_nodes(), 3 * m.n_nodes());
  K.setFromTriplets(t.begin(), t.end());
  return K;
}

double max_abs(const Eigen::SparseMatrix<double>& A) {
  double v = 0;
  for (int j = 0; j < A.outerSize(); ++j)
    for (Eigen::SparseMatrix<double>::InnerIterator it(A, j); it; ++it)
      v = std::max(v, std::abs(it.value()));
  return v;
}

struct MeshCase {
  int k;
  bool curved, jittered;
  std::string name() const {
    return std::to_string(k) + "node" + (curved ? "_curved" : "") + (jittered ? "_jittered" : "");
  }
};
const MeshCase kCases[] = {
    {4, false, true}, {10, false, true}, {10, true, false}, {4, true, false}};

class AssemblyCase : public ::testing::TestWithParam<MeshCase> {};

TEST_P(AssemblyCase, SymmetricAndEqualToTripletAssembly) {
  const mesh::VolumeMesh m = two_region_mesh(GetParam().k, GetParam().curved, GetParam().jittered);
  const Eigen::SparseMatrix<double> reference = triplet_assembly(m, kTwoMaterials);
  const double scale = max_abs(reference);
  for (AssemblyStrategy s : {AssemblyStrategy::kSerial, AssemblyStrategy::kPartitioned}) {
    SCOPED_TRACE(static_cast<int>(s));
    AssemblyStatistics stats;
    const Eigen::SparseMatrix<double> K = assemble_stiffness(m, kTwoMaterials, {s, 2}, &stats);
    EXPECT_LT(max_abs(K - reference), 1e-13 * scale);
    const Eigen::SparseMatrix<double> Kt = K.transpose();
    EXPECT_LT(max_abs(K - Kt), 1e-13 * scale);
    EXPECT_EQ(stats.n_nonzeros, K.nonZeros());
    if (s == AssemblyStrategy::kPartitioned) {
      EXPECT_GT(stats.n_interface_elements, 0);
      EXPECT_LT(stats.n_interface_elements, m.n_elements());
    }
  }
}

// derived: rigid translations and infinitesimal rotations strain nothing, so K r = 0.
TEST_P(AssemblyCase, RigidBodyMotionsGiveNoForce) {
  const mesh::VolumeMesh m = two_region_mesh(GetParam().k, GetParam().curved, GetParam().jittered);
  const Eigen::SparseMatrix<double> K = assemble_stiffness(m, kTwoMaterials);
  const double scale = max_abs(K);
  for (int mode = 0; mode < 6; ++mode) {
    Eigen::VectorXd r(3 * m.n_nodes());
    for (int i = 0; i < m.n_nodes(); ++i) {
      const Eigen::Vector3d& x = m.nodes[static_cast<size_t>(i)];
      r.segment<3>(3 * i) = mode < 3 ? Eigen::Vector3d(Eigen::Vector3d::Unit(mode))
                                     : Eigen::Vector3d(Eigen::Vector3d::Unit(mode - 3).cross(x));
    }
    const double relative = (K * r).cwiseAbs().maxCoeff() / (scale * r.cwiseAbs().maxCoeff());
    EXPECT_LT(relative, 1e-13) << "mode " << mode;
  }
}

INSTANTIATE_TEST_SUITE_P(Meshes, AssemblyCase, ::testing::ValuesIn(kCases),
                         [](const ::testing::TestParamInfo<MeshCase>& param_info) {
                           return param_info.param.name();
                         });

TEST(Assembly, PartitionedWithMoreSlabsThanCores) {
  const mesh::VolumeMesh m = two_region_mesh(10, true, false);
  const Eigen::SparseMatrix<double> reference = triplet_assembly(m, kTwoMaterials);
  for (int threads : {3, 5}) {
    AssemblyStatistics stats;
    const Eigen::SparseMatrix<double> K =
        assemble_stiffness(m, kTwoMaterials, {AssemblyStrategy::kPartitioned, threads}, &stats);
    EXPECT_LT(max_abs(K - reference), 1e-13 * max_abs(reference)) << threads << " slabs";
    EXPECT_EQ(stats.n_threads, threads);
  }
}

// The OpenMP team can be smaller than the slab count asked for (OMP_THREAD_LIMIT, a nested region,
// max-active-levels 0 as the solver sets around CHOLMOD): every slab must still be added.
TEST(Assembly, PartitionedWhenTheTeamIsSmallerThanAskedFor) {
  // Long enough that some elements of each slab touch no other slab.
  const mesh::VolumeMesh m =
      grid_mesh(4, 4, 12, 10, testing::PointMap(bent),
                [](const Eigen::Vector3d& p) { return p.z() < 0.5 ? 1 : 2; });
  const Eigen::SparseMatrix<double> reference = triplet_assembly(m, kTwoMaterials);
  const int levels = omp_get_max_active_levels();
  omp_set_max_active_levels(0);  // every parallel region of this thread gets one thread
  AssemblyStatistics stats;
  const Eigen::SparseMatrix<double> K =
      assemble_stiffness(m, kTwoMaterials, {AssemblyStrategy::kPartitioned, 3}, &stats);
  omp_set_max_active_levels(levels);
  EXPECT_LT(stats.n_interface_elements, m.n_elements());
  EXPECT_LT(max_abs(K - reference), 1e-13 * max_abs(reference));
}

TEST(Assembly, PatternHoldsEveryNodePairSharingAnElementAndNothingElse) {
  const mesh::VolumeMesh m = grid_mesh(2, 2, 2, 10);
  const Eigen::SparseMatrix<double> K = assemble_stiffness(m, {{1, {1.0, 0.25}}});
  std::vector<std::vector<char>> shares(static_cast<size_t>(m.n_nodes()),
                                        std::vector<char>(static_cast<size_t>(m.n_nodes()), 0));
  for (int e = 0; e < m.n_elements(); ++e)
    for (int a = 0; a < 10; ++a)
      for (int b = 0; b < 10; ++b)
        shares[static_cast<size_t>(m.element(e)[a])][static_cast<size_t>(m.element(e)[b])] = 1;
  long long expected = 0;
  for (const auto& row : shares)
    for (char c : row) expected += 9 * c;
  EXPECT_EQ(K.nonZeros(), expected);
  for (int j = 0; j < K.outerSize(); ++j)
    for (Eigen::SparseMatrix<double>::InnerIterator it(K, j); it; ++it)
      EXPECT_TRUE(shares[static_cast<size_t>(it.row() / 3)][static_cast<size_t>(j / 3)]);
}

TEST(Assembly, RegionWithoutMaterialIsAnInputError) {
  const mesh::VolumeMesh m = two_region_mesh(4, false, false);
  try {
    assemble_stiffness(m, {{1, {1000.0, 0.3}}});
    FAIL() << "expected InputError";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("region 2"), std::string::npos) << e.what();
  }
  EXPECT_THROW(assemble_stiffness(m, {{1, {1000.0, 0.3}}, {2, {0.0, 0.3}}}), InputError);
}

TEST(Assembly, BadConnectivityIsAnInputError) {
  mesh::VolumeMesh m = grid_mesh(1, 1, 1, 4);
  m.elements[5] = m.n_nodes() + 3;
  EXPECT_THROW(assemble_stiffness(m, {{1, {1.0, 0.3}}}), InputError);
  m = grid_mesh(1, 1, 1, 4);
  m.nodes_per_element = 8;
  EXPECT_THROW(assemble_stiffness(m, {{1, {1.0, 0.3}}}), InputError);
}

TEST(Assembly, InvertedElementIsAMeshErrorFromTheParallelLoop) {
  mesh::VolumeMesh m = grid_mesh(3, 3, 3, 4);
  std::swap(m.elements[4 * 17 + 1], m.elements[4 * 17 + 2]);
  try {
    assemble_stiffness(m, {{1, {1.0, 0.3}}});
    FAIL() << "expected MeshError";
  } catch (const MeshError& e) {
    EXPECT_NE(std::string(e.what()).find("element 17"), std::string::npos) << e.what();
  }
}

TEST(Constraints, FixFacesHoldsEveryNodeOfTheMarkedFaces) {
  const mesh::VolumeMesh m = grid_mesh(2, 3, 2, 10);
  const std::vector<DofConstraint> c = fix_faces(m, testing::kZetaMin);
  // 10-node grid: (2*2+1) x (2*3+1) nodes on the face zeta = 0.
  EXPECT_EQ(c.size(), 3u * 5 * 7);
  for (const DofConstraint& d : c) {
    EXPECT_NEAR(m.nodes[static_cast<size_t>(d.node)].z(), 0.0, 1e-15);
    EXPECT_EQ(d.value_mm, 0.0);
  }
  EXPECT_THROW(fix_faces(m, 42), InputError);
}

}  // namespace
}  // namespace sharpey::fem
