// The CHOLMOD solver: agreement with a dense solve, many right-hand sides, orderings, prescribed
// displacements, clear errors for singular models and bad constraints.
#include <gtest/gtest.h>

#include <Eigen/Dense>
#include <algorithm>
#include <cmath>
#include <cstdlib>
#include <memory>
#include <string>
#include <vector>

#include "sharpey/core/check.h"
#include "sharpey/error.h"
#include "sharpey/fem/elasticity.h"
#include "sharpey/startup/blas_kernels.h"
#include "support/grid_mesh.h"

namespace sharpey::fem {
namespace {

using testing::grid_mesh;

const MaterialTable kMaterials{{1, {1000.0, 0.3}}, {2, {2.0, 0.45}}};

mesh::VolumeMesh small_mesh(int k) {
  mesh::VolumeMesh m = grid_mesh(2, 2, 3, k, {}, [](const Eigen::Vector3d& p) {
    return p.z() > 0.3 && p.z() < 0.7 ? 2 : 1;  // a soft layer between two stiff blocks
  });
  testing::jitter_nodes(m, 0.25, 3u);
  return m;
}

// Constraints: bottom face fixed; a few top nodes prescribed to non-zero values.
std::vector<DofConstraint> mixed_constraints(const mesh::VolumeMesh& m) {
  std::vector<DofConstraint> c = fix_faces(m, testing::kZetaMin);
  int added = 0;
  for (int i = 0; i < m.n_nodes() && added < 3; ++i) {
    if (m.nodes[static_cast<size_t>(i)].z() > 1.0 - 1e-12) {
      c.push_back({i, added % 3, 0.01 * (added + 1)});
      ++added;
    }
  }
  return c;
}

Eigen::VectorXd some_load(int n_nodes, unsigned seed) {
  std::srand(seed);
  return Eigen::VectorXd::Random(3 * n_nodes);
}

// Two independent computations: CHOLMOD on the eliminated sparse system and Eigen's dense LLT on
// the same system built here from the assembled K.
TEST(Solver, SparseCholeskyEqualsDenseSolve) {
  for (int k : {4, 10}) {
    SCOPED_TRACE(std::to_string(k) + "-node");
    const mesh::VolumeMesh m = small_mesh(k);
    const std::vector<DofConstraint> c = mixed_constraints(m);
    const LinearElasticSolver solver(m, kMaterials, c);
    const Eigen::VectorXd f = some_load(m.n_nodes(), 11u);
    const Eigen::VectorXd u = solver.solve(f);

    const int n = 3 * m.n_nodes();
    const Eigen::MatrixXd K = Eigen::MatrixXd(solver.stiffness());
    Eigen::VectorXd prescribed = Eigen::VectorXd::Zero(n);
    std::vector<char> fixed(static_cast<size_t>(n), 0);
    for (const DofConstraint& d : c) {
      fixed[static_cast<size_t>(3 * d.node + d.component)] = 1;
      prescribed(3 * d.node + d.component) = d.value_mm;
    }
    std::vector<int> free_dofs;
    for (int i = 0; i < n; ++i)
      if (!fixed[static_cast<size_t>(i)]) free_dofs.push_back(i);
    const int nf = static_cast<int>(free_dofs.size());
    Eigen::MatrixXd Kff(nf, nf);
    Eigen::VectorXd b(nf);
    const Eigen::VectorXd Kp = K * prescribed;
    for (int i = 0; i < nf; ++i) {
      b(i) = f(free_dofs[static_cast<size_t>(i)]) - Kp(free_dofs[static_cast<size_t>(i)]);
      for (int j = 0; j < nf; ++j)
        Kff(i, j) = K(free_dofs[static_cast<size_t>(i)], free_dofs[static_cast<size_t>(j)]);
    }
    const Eigen::VectorXd uf = Kff.llt().solve(b);
    Eigen::VectorXd expected = prescribed;
    for (int i = 0; i < nf; ++i) expected(free_dofs[static_cast<size_t>(i)]) = uf(i);
    EXPECT_LT((u - expected).norm(), 1e-10 * expected.norm());
    for (const DofConstraint& d : c) EXPECT_EQ(u(3 * d.node + d.component), d.value_mm);

    const SolverStatistics& s = solver.statistics();
    EXPECT_EQ(s.n_dofs, nf);
    EXPECT_LT(s.last_relative_residual, 1e-12);
    EXPECT_FALSE(s.ordering.empty());
    EXPECT_GT(s.factorisation_gflop, 0.0);
    EXPECT_GT(s.factor_nonzeros, 0);
    EXPECT_GT(s.min_pivot_ratio, 1e-8);
  }
}

TEST(Solver, ManyRightHandSidesEqualSingleSolves) {
  const mesh::VolumeMesh m = small_mesh(10);
  const LinearElasticSolver solver(m, kMaterials, fix_faces(m, testing::kZetaMin));
  Eigen::MatrixXd F(3 * m.n_nodes(), 4);
  for (int j = 0; j < 4; ++j) F.col(j) = some_load(m.n_nodes(), 20u + static_cast<unsigned>(j));
  const Eigen::MatrixXd U = solver.solve(F);
  for (int j = 0; j < 4; ++j) {
    const Eigen::VectorXd u = solver.solve(Eigen::VectorXd(F.col(j)));
    EXPECT_LT((U.col(j) - u).norm(), 1e-13 * u.norm()) << "column " << j;
  }
}

TEST(Solver, EveryOrderingGivesTheSameSolution) {
  const mesh::VolumeMesh m = small_mesh(10);
  const Eigen::VectorXd f = some_load(m.n_nodes(), 5u);
  const Eigen::VectorXd reference =
      LinearElasticSolver(m, kMaterials, mixed_constraints(m)).solve(f);
  for (Ordering o : {Ordering::kAuto, Ordering::kAmd, Ordering::kMetis, Ordering::kNesdis,
                     Ordering::kMetisNodes}) {
    SolverOptions options;
    options.ordering = o;
    const LinearElasticSolver solver(m, kMaterials, mixed_constraints(m), options);
    EXPECT_LT((solver.solve(f) - reference).norm(), 1e-11 * reference.norm()) << to_string(o);
    EXPECT_EQ(solver.statistics().requested_ordering, to_string(o));
    if (o != Ordering::kAuto) {
      EXPECT_EQ(solver.statistics().ordering, to_string(o));
    }
  }
}

// The node ordering computed ahead from the mesh and constraints (order_nodes, what a study does
// for the next scenario) is the one the solver computes itself: the same factorisation work and
// the same solution to the last bit (derived: same permutation, same arithmetic). Partly held
// nodes (mixed_constraints) and a node of no element included. Another valid ordering (reversed)
// is used as given: the same solution to round-off.
TEST(Solver, NodeOrderComputedAheadGivesTheSameBits) {
  for (int k : {4, 10}) {
    SCOPED_TRACE(std::to_string(k) + "-node");
    mesh::VolumeMesh m = small_mesh(k);
    m.nodes.emplace_back(5.0, 5.0, 5.0);  // referenced by no element
    const std::vector<DofConstraint> c = mixed_constraints(m);
    const Eigen::VectorXd f = some_load(m.n_nodes(), 41u);
    const LinearElasticSolver own(m, kMaterials, c);
    SolverOptions options;
    options.node_order = order_nodes(m, c);
    const LinearElasticSolver given(m, kMaterials, c, options);
    const Eigen::VectorXd u_own = own.solve(f), u_given = given.solve(f);
    EXPECT_EQ((u_own - u_given).cwiseAbs().maxCoeff(), 0.0);
    EXPECT_EQ(own.statistics().factorisation_gflop, given.statistics().factorisation_gflop);
    EXPECT_EQ(given.statistics().ordering, "metis-nodes");
    // Every node with a free dof once: all but the bottom face's and the unused one.
    std::vector<char> seen(static_cast<size_t>(m.n_nodes()), 0);
    for (int node : options.node_order) {
      ASSERT_TRUE(node >= 0 && node < m.n_nodes());
      EXPECT_FALSE(seen[static_cast<size_t>(node)]) << node;
      seen[static_cast<size_t>(node)] = 1;
    }
    EXPECT_FALSE(seen.back());
    EXPECT_EQ(3 * static_cast<int>(options.node_order.size()),
              own.statistics().n_dofs + 3);  // the three prescribed top dofs are single ones
    // The ordering and symbolic factorisation computed ahead from the mesh alone: the same bits.
    SolverOptions with_symbolic;
    with_symbolic.symbolic = std::make_shared<const SymbolicFactorisation>(m, c);
    const LinearElasticSolver ahead(m, kMaterials, c, with_symbolic);
    EXPECT_EQ((ahead.solve(f) - u_own).cwiseAbs().maxCoeff(), 0.0);
    EXPECT_EQ(ahead.statistics().factorisation_gflop, own.statistics().factorisation_gflop);
    EXPECT_EQ(ahead.statistics().factor_nonzeros, own.statistics().factor_nonzeros);
    EXPECT_EQ(with_symbolic.symbolic->factor_nonzeros(), own.statistics().factor_nonzeros);
    std::reverse(options.node_order.begin(), options.node_order.end());
    const LinearElasticSolver reversed(m, kMaterials, c, options);
    EXPECT_LT((reversed.solve(f) - u_own).norm(), 1e-11 * u_own.norm());
  }
}

// A given node ordering that does not fit the model, or given with another ordering: InputError.
TEST(Solver, MismatchedNodeOrderIsAnInputError) {
  const mesh::VolumeMesh m = small_mesh(4);
  const std::vector<DofConstraint> c = mixed_constraints(m);
  const std::vector<int> good = order_nodes(m, c);
  std::vector<int> missing(good.begin() + 1, good.end());
  std::vector<int> twice = good;
  twice.back() = twice.front();
  std::vector<int> outside = good;
  outside.push_back(m.n_nodes());
  for (const std::vector<int>* order : {&missing, &twice, &outside}) {
    SolverOptions options;
    options.node_order = *order;
    EXPECT_THROW(LinearElasticSolver(m, kMaterials, c, options), InputError);
  }
  SolverOptions amd;
  amd.ordering = Ordering::kAmd;
  amd.node_order = good;
  EXPECT_THROW(LinearElasticSolver(m, kMaterials, c, amd), InputError);
  EXPECT_THROW(order_nodes(m, {{m.n_nodes(), 0, 0.0}}), InputError);
  // A symbolic factorisation of other constraints (the bottom face only), or with another ordering.
  SolverOptions other;
  other.symbolic =
      std::make_shared<const SymbolicFactorisation>(m, fix_faces(m, testing::kZetaMin));
  EXPECT_THROW(LinearElasticSolver(m, kMaterials, c, other), InputError);
  other.symbolic = std::make_shared<const SymbolicFactorisation>(m, c);
  other.ordering = Ordering::kMetis;
  EXPECT_THROW(LinearElasticSolver(m, kMaterials, c, other), InputError);
  EXPECT_THROW(SymbolicFactorisation(m, {{0, 3, 0.0}}), InputError);
}

// Two computations: refactorise() with new materials (ordering and symbolic analysis reused)
// against a solver built afresh with them. Same pattern, same ordering, same arithmetic: equal to
// round-off (bit for bit in practice). Moduli a factor of 10 to 250 apart from the first ones.
TEST(Solver, RefactorisedWithNewMaterialsEqualsAFreshSolver) {
  for (int k : {4, 10}) {
    SCOPED_TRACE(std::to_string(k) + "-node");
    const mesh::VolumeMesh m = small_mesh(k);
    const std::vector<DofConstraint> c = mixed_constraints(m);
    Eigen::MatrixXd F(3 * m.n_nodes(), 2);
    F.col(0) = some_load(m.n_nodes(), 31u);
    F.col(1) = some_load(m.n_nodes(), 32u);
    LinearElasticSolver reused(m, kMaterials, c);
    const double analyse_s = reused.statistics().analyse_s;
    for (const MaterialTable& next :
         {MaterialTable{{1, {18600.0, 0.31}}, {2, {0.47, 0.45}}},
          MaterialTable{{1, {13700.0, 0.3}}, {2, {0.05, 0.49}}}, kMaterials}) {
      reused.refactorise(m, next);
      const LinearElasticSolver fresh(m, next, c);
      const Eigen::MatrixXd U = reused.solve(F), U_fresh = fresh.solve(F);
      EXPECT_LE((U - U_fresh).cwiseAbs().maxCoeff(), 1e-13 * U_fresh.cwiseAbs().maxCoeff());
      EXPECT_LT(reused.statistics().last_relative_residual, 1e-10);
      EXPECT_EQ((reused.stiffness() - fresh.stiffness()).norm(), 0.0);  // same assembly
      EXPECT_EQ(reused.materials().at(2).young_modulus_mpa, next.at(2).young_modulus_mpa);
      EXPECT_EQ(reused.statistics().min_pivot_ratio, fresh.statistics().min_pivot_ratio);
    }
    EXPECT_EQ(reused.statistics().n_numeric_factorisations, 4);  // one analysis, four numeric
    EXPECT_EQ(reused.statistics().analyse_s, analyse_s);
  }
}

// A refactorisation that fails leaves a solver that refuses to solve, with the cause, until a
// refactorisation succeeds again.
TEST(Solver, FailedRefactorisationRefusesToSolveUntilRepaired) {
  const mesh::VolumeMesh m = small_mesh(10);
  LinearElasticSolver solver(m, kMaterials, fix_faces(m, testing::kZetaMin));
  const Eigen::VectorXd f = some_load(m.n_nodes(), 7u);
  const Eigen::VectorXd u = solver.solve(f);
  EXPECT_THROW(solver.refactorise(m, {{1, {1000.0, 0.3}}, {2, {1e-15, 0.3}}}), SolverError);
  EXPECT_THROW(solver.solve(f), SolverError);
  EXPECT_THROW(solver.refactorise(m, {{1, {1000.0, 0.3}}}), InputError);  // region 2 missing
  EXPECT_THROW(solver.solve(f), SolverError);
  solver.refactorise(m, kMaterials);
  EXPECT_LE((solver.solve(f) - u).cwiseAbs().maxCoeff(), 1e-13 * u.cwiseAbs().maxCoeff());
}

// derived: prescribing the same translation on the whole boundary moves the body rigidly.
TEST(Solver, PrescribedRigidTranslationMovesEveryNode) {
  const mesh::VolumeMesh m = small_mesh(10);
  const Eigen::Vector3d t(0.01, -0.02, 0.005);
  std::vector<DofConstraint> c;
  for (int side = 1; side <= 6; ++side) {
    for (const DofConstraint& d : fix_faces(m, side))
      c.push_back({d.node, d.component, t(d.component)});
  }
  const LinearElasticSolver solver(m, kMaterials, c);
  const Eigen::VectorXd zero = Eigen::VectorXd::Zero(3 * m.n_nodes());
  const Eigen::VectorXd u = solver.solve(zero);
  for (int i = 0; i < m.n_nodes(); ++i) {
    EXPECT_LT((u.segment<3>(3 * i) - t).norm(), 1e-12 * t.norm()) << "node " << i;
  }
}

TEST(Solver, UnusedNodesAreHeldAtZero) {
  mesh::VolumeMesh m = small_mesh(4);
  m.nodes.emplace_back(5.0, 5.0, 5.0);  // referenced by no element
  const LinearElasticSolver solver(m, kMaterials, fix_faces(m, testing::kZetaMin));
  const Eigen::VectorXd u = solver.solve(some_load(m.n_nodes(), 2u));
  EXPECT_EQ(solver.statistics().n_unused_nodes, 1);
  EXPECT_EQ(u.tail<3>().norm(), 0.0);
}

TEST(Solver, UnconstrainedModelIsASolverErrorNamingTheCause) {
  for (int k : {4, 10}) {
    const mesh::VolumeMesh m = small_mesh(k);
    try {
      LinearElasticSolver solver(m, kMaterials, {});
      FAIL() << "expected SolverError, " << k << "-node";
    } catch (const SolverError& e) {
      const std::string what = e.what();
      EXPECT_NE(what.find("not held against rigid-body motion"), std::string::npos) << what;
      EXPECT_NE(what.find("node "), std::string::npos) << what;
    }
  }
}

TEST(Solver, PartlyHeldModelIsASolverError) {
  // Only one node held: the body can still rotate about it.
  const mesh::VolumeMesh m = small_mesh(10);
  EXPECT_THROW(LinearElasticSolver(m, kMaterials, {{0, 0, 0.0}, {0, 1, 0.0}, {0, 2, 0.0}}),
               SolverError);
}

TEST(Solver, RegionWithoutStiffnessIsAClearError) {
  const mesh::VolumeMesh m = small_mesh(10);
  const std::vector<DofConstraint> c = fix_faces(m, testing::kZetaMin);
  // No material for the layer: InputError naming the region.
  try {
    LinearElasticSolver solver(m, {{1, {1000.0, 0.3}}}, c);
    FAIL() << "expected InputError";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("region 2"), std::string::npos) << e.what();
  }
  // A zero modulus is rejected with the allowed range.
  EXPECT_THROW(LinearElasticSolver(m, {{1, {1000.0, 0.3}}, {2, {0.0, 0.3}}}, c), InputError);
  // A vanishing modulus leaves the upper block practically unheld: SolverError, not a crash.
  try {
    LinearElasticSolver solver(m, {{1, {1000.0, 0.3}}, {2, {1e-15, 0.3}}}, c);
    FAIL() << "expected SolverError";
  } catch (const SolverError& e) {
    EXPECT_NE(std::string(e.what()).find("zero modulus"), std::string::npos) << e.what();
  }
}

TEST(Solver, BadConstraintsAreInputErrors) {
  const mesh::VolumeMesh m = small_mesh(4);
  std::vector<DofConstraint> c = fix_faces(m, testing::kZetaMin);
  c.push_back({m.n_nodes(), 0, 0.0});
  EXPECT_THROW(LinearElasticSolver(m, kMaterials, c), InputError);
  c.back() = {0, 3, 0.0};
  EXPECT_THROW(LinearElasticSolver(m, kMaterials, c), InputError);
  c.back() = {c.front().node, c.front().component, 0.5};  // conflicts with the fixed value 0
  try {
    LinearElasticSolver solver(m, kMaterials, c);
    FAIL() << "expected InputError";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("twice"), std::string::npos) << e.what();
  }
}

TEST(Solver, WrongLoadSizeIsRejected) {
  const mesh::VolumeMesh m = small_mesh(4);
  const LinearElasticSolver solver(m, kMaterials, fix_faces(m, testing::kZetaMin));
  const Eigen::VectorXd short_load = Eigen::VectorXd::Zero(5);
  EXPECT_THROW(solver.solve(short_load), ProgrammingError);
  Eigen::VectorXd f = Eigen::VectorXd::Zero(3 * m.n_nodes());
  f(4) = std::nan("");
  EXPECT_THROW(solver.solve(f), InputError);
}

}  // namespace
}  // namespace sharpey::fem

namespace sharpey::fem {
namespace {

// derived: the kernel choice only ever replaces OpenBLAS's fallback, and only with a kernel set
// the processor supports (checked by the compiler's cpu feature test).
TEST(BlasKernels, OnlyTheFallbackIsReplaced) {
  using startup::better_blas_core;
  using startup::blas_core_name;
  EXPECT_EQ(better_blas_core("SkylakeX"), "");
  EXPECT_EQ(better_blas_core("Haswell"), "");
  EXPECT_EQ(better_blas_core(""), "");  // not OpenBLAS
  const std::string better = better_blas_core("Prescott");
  EXPECT_TRUE(better.empty() || better == "SkylakeX" || better == "Haswell") << better;
  // The test program itself ran use_fast_blas_kernels first (tests/support/test_main.cpp).
  const std::string running = blas_core_name();
  if (!running.empty() && std::getenv("OPENBLAS_CORETYPE") == nullptr &&
      std::getenv("OPENBLAS_L2_SIZE") == nullptr) {
    EXPECT_EQ(better_blas_core(running), "") << "still on " << running;
  }
}

}  // namespace
}  // namespace sharpey::fem
