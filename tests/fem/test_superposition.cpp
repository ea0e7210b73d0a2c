// Superposition of the six unit load cases equals a direct solve for any force system.
#include <gtest/gtest.h>

#include <Eigen/Dense>
#include <cmath>
#include <random>

#include "sharpey/fem/elasticity.h"
#include "support/grid_mesh.h"

namespace sharpey::fem {
namespace {

using testing::grid_mesh;

// An invented two-material block: a stiff upper part (a "crown") loaded on a side patch, a soft
// lower layer, fixed at the base.
struct Model {
  mesh::VolumeMesh mesh;
  MaterialTable materials{{1, {20000.0, 0.3}}, {2, {0.5, 0.45}}};
  Eigen::Vector3d reference{1.2, 0.4, 2.1};
};

Model make_model() {
  Model m;
  m.mesh = grid_mesh(
      3, 3, 4, 10,
      [](const Eigen::Vector3d& p) {
        return Eigen::Vector3d(p.x() + 0.1 * p.z() * p.z(), p.y(), 3.0 * p.z());
      },
      [](const Eigen::Vector3d& p) { return p.z() < 0.5 ? 2 : 1; });
  return m;
}

TEST(Superposition, EqualsDirectSolveForRandomForceSystems) {
  const Model m = make_model();
  const LinearElasticSolver solver(m.mesh, m.materials, fix_faces(m.mesh, testing::kZetaMin));
  const UnitLoadBasis basis(m.mesh, m.materials, solver, testing::kXiMax, m.reference, 2);
  EXPECT_EQ(basis.unit_displacements().cols(), 6);
  EXPECT_EQ(basis.unit_fields().size(), 6u);
  std::mt19937 rng(42);
  std::uniform_real_distribution<double> uniform(-1.0, 1.0);
  for (int trial = 0; trial < 4; ++trial) {
    SCOPED_TRACE("trial " + std::to_string(trial));
    const Eigen::Vector3d F(uniform(rng), uniform(rng), uniform(rng));
    const Eigen::Vector3d M(10 * uniform(rng), 10 * uniform(rng), 10 * uniform(rng));
    const Eigen::VectorXd f = patch_load(m.mesh, testing::kXiMax, F, M, m.reference);
    const Eigen::VectorXd u_direct = solver.solve(f);
    const RegionField direct = recover_region(m.mesh, m.materials, u_direct, 2);

    const Eigen::VectorXd u = basis.displacement(F, M);
    const RegionField combined = basis.region_field(F, M);
    EXPECT_LT((u - u_direct).norm(), 1e-9 * u_direct.norm());
    ASSERT_EQ(combined.nodes, direct.nodes);
    EXPECT_LT((combined.stress_mpa - direct.stress_mpa).norm(), 1e-9 * direct.stress_mpa.norm());
    EXPECT_LT((combined.strain - direct.strain).norm(), 1e-9 * direct.strain.norm());
  }
}

TEST(Superposition, CombinationNeedsNoSolve) {
  const Model m = make_model();
  const LinearElasticSolver solver(m.mesh, m.materials, fix_faces(m.mesh, testing::kZetaMin));
  EXPECT_EQ(solver.statistics().n_solves, 0);
  const UnitLoadBasis basis(m.mesh, m.materials, solver, testing::kXiMax, m.reference, 2);
  // The basis is one pass through the factor for its six right-hand sides.
  EXPECT_EQ(solver.statistics().n_solves, 1);
  const RegionField field = basis.region_field({0.3, 0.0, -0.1}, {0.0, 2.0, 0.0});
  const Eigen::VectorXd u = basis.displacement({0.0, -0.2, 0.4}, {1.0, 0.0, -3.0});
  EXPECT_EQ(field.stress_mpa.cols(), static_cast<long>(field.nodes.size()));
  EXPECT_EQ(u.size(), 3 * m.mesh.n_nodes());
  // Combining the unit cases for new force systems solved nothing more.
  EXPECT_EQ(solver.statistics().n_solves, 1);
  // The counter does count: a direct solve adds one.
  solver.solve(patch_load(m.mesh, testing::kXiMax, {0.3, 0.0, -0.1}, {0.0, 2.0, 0.0}, m.reference));
  EXPECT_EQ(solver.statistics().n_solves, 2);
}

}  // namespace
}  // namespace sharpey::fem
