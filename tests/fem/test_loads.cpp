// Surface loads: patch_load resultant and moment, traction and pressure totals on flat and curved
// faces, and reactions that balance the applied loads.
#include <gtest/gtest.h>

#include <Eigen/Dense>
#include <cmath>
#include <string>
#include <vector>

#include "sharpey/error.h"
#include "sharpey/fem/elasticity.h"
#include "support/grid_mesh.h"

namespace sharpey::fem {
namespace {

using testing::grid_mesh;

Eigen::Vector3d resultant(const Eigen::VectorXd& f) {
  Eigen::Vector3d s = Eigen::Vector3d::Zero();
  for (long i = 0; i < f.size() / 3; ++i) s += f.segment<3>(3 * i);
  return s;
}

Eigen::Vector3d moment_about(const mesh::VolumeMesh& m, const Eigen::VectorXd& f,
                             const Eigen::Vector3d& p) {
  Eigen::Vector3d s = Eigen::Vector3d::Zero();
  for (int i = 0; i < m.n_nodes(); ++i)
    s += (m.nodes[static_cast<size_t>(i)] - p).cross(f.segment<3>(3 * i));
  return s;
}

// A doubly curved map of the unit cube (faces are curved surfaces for 10-node meshes).
Eigen::Vector3d curved(const Eigen::Vector3d& p) {
  const double r = 3.0 + p.x();
  const double a = 0.9 * p.y();
  return Eigen::Vector3d(r * std::cos(a), r * std::sin(a),
                         2.0 * p.z() + 0.3 * std::sin(2.0 * p.x()));
}

struct LoadCase {
  int k;
  bool curved;
  std::string name() const { return std::to_string(k) + (curved ? "node_curved" : "node_flat"); }
};
const LoadCase kLoadCases[] = {{4, false}, {10, false}, {4, true}, {10, true}};

class PatchLoadCase : public ::testing::TestWithParam<LoadCase> {};

// derived: the distributing coupling is statically equivalent to (F, M) at the reference point.
TEST_P(PatchLoadCase, ResultantAndMomentExact) {
  const mesh::VolumeMesh m = grid_mesh(
      3, 4, 3, GetParam().k, GetParam().curved ? testing::PointMap(curved) : testing::PointMap{});
  const Eigen::Vector3d F(0.3, -1.2, 0.7), M(4.0, 0.5, -2.5);
  for (const Eigen::Vector3d& p : {Eigen::Vector3d(0, 0, 0), Eigen::Vector3d(4.0, 1.0, 1.0),
                                   Eigen::Vector3d(-2.0, 7.0, 3.0)}) {
    SCOPED_TRACE("reference point " + std::to_string(p.x()) + "," + std::to_string(p.y()));
    for (int side : {testing::kXiMax, testing::kZetaMax}) {
      const Eigen::VectorXd f = patch_load(m, side, F, M, p);
      EXPECT_LT((resultant(f) - F).norm(), 1e-13 * F.norm()) << "side " << side;
      EXPECT_LT((moment_about(m, f, p) - M).norm(), 1e-12 * (M.norm() + 10 * F.norm()))
          << "side " << side;
      // Only nodes of the patch are loaded.
      const Eigen::VectorXd a = consistent_nodal_areas(m, side);
      for (int i = 0; i < m.n_nodes(); ++i) {
        if (a(i) == 0.0) {
          EXPECT_EQ(f.segment<3>(3 * i).norm(), 0.0);
        }
      }
    }
  }
}

// Two computations: a pure force at the area-weighted centroid spreads exactly like a uniform
// traction F / A (f_i = a_i F / A).
TEST_P(PatchLoadCase, ForceAtCentroidEqualsUniformTraction) {
  const mesh::VolumeMesh m = grid_mesh(
      3, 4, 3, GetParam().k, GetParam().curved ? testing::PointMap(curved) : testing::PointMap{});
  const Eigen::VectorXd a = consistent_nodal_areas(m, testing::kEtaMin);
  const double area = a.sum();
  Eigen::Vector3d c = Eigen::Vector3d::Zero();
  for (int i = 0; i < m.n_nodes(); ++i) c += a(i) / area * m.nodes[static_cast<size_t>(i)];
  const Eigen::Vector3d F(1.0, 2.0, -0.5);
  const Eigen::VectorXd coupled = patch_load(m, testing::kEtaMin, F, Eigen::Vector3d::Zero(), c);
  const Eigen::VectorXd traction = traction_load(m, testing::kEtaMin, F / area);
  EXPECT_LT((coupled - traction).norm(), 1e-13 * traction.norm());
}

INSTANTIATE_TEST_SUITE_P(Meshes, PatchLoadCase, ::testing::ValuesIn(kLoadCases),
                         [](const ::testing::TestParamInfo<LoadCase>& param_info) {
                           return param_info.param.name();
                         });

TEST(PatchLoad, CornerNodesOfFlatQuadraticFacesCarryNothing) {
  // derived: integral of L(2L - 1) over a flat triangle is zero.
  const mesh::VolumeMesh m = grid_mesh(2, 2, 2, 10);
  const Eigen::VectorXd a = consistent_nodal_areas(m, testing::kZetaMax);
  EXPECT_NEAR(a.sum(), 1.0, 1e-14);
  for (int f = 0; f < m.n_faces(); ++f) {
    if (m.face_marker[static_cast<size_t>(f)] != testing::kZetaMax) continue;
    for (int v = 0; v < 3; ++v) EXPECT_NEAR(a(m.face(f)[v]), 0.0, 1e-15);
  }
}

TEST(PatchLoad, MissingOrLinearPatchIsAnInputError) {
  mesh::VolumeMesh m = grid_mesh(2, 2, 2, 4);
  EXPECT_THROW(
      patch_load(m, 99, Eigen::Vector3d::UnitX(), Eigen::Vector3d::Zero(), Eigen::Vector3d::Zero()),
      InputError);
  // Squash the zeta = 1 face into a strip 1e-7 wide along x: it has area but no second moment
  // across.
  for (auto& x : m.nodes) {
    if (x.z() > 1.0 - 1e-12) x.y() = 0.5 + 1e-7 * (x.y() - 0.5);
  }
  try {
    patch_load(m, testing::kZetaMax, Eigen::Vector3d::UnitX(), Eigen::Vector3d::UnitZ(),
               Eigen::Vector3d::Zero());
    FAIL() << "expected InputError";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("line"), std::string::npos) << e.what();
  }
}

// derived: the map (x, y, z) -> (x + 0.4 x y, y, z) is quadratic, so 10-node faces represent it
// exactly; the face z = 0 becomes a plane region with curved edges and area
// integral(1 + 0.4 y) = 1.2; its area element is a degree-1 polynomial, integrated exactly.
TEST(TractionLoad, TotalEqualsTractionTimesAreaOnFlatAndInPlaneCurvedFaces) {
  const Eigen::Vector3d t(0.2, -0.1, 0.5);
  for (int k : {4, 10}) {
    const mesh::VolumeMesh box = grid_mesh(2, 3, 2, k, [](const Eigen::Vector3d& p) {
      return Eigen::Vector3d(2.0 * p.x(), 3.0 * p.y(), 0.5 * p.z());
    });
    EXPECT_LT((resultant(traction_load(box, testing::kZetaMin, t)) - 6.0 * t).norm(), 1e-13) << k;
    EXPECT_LT((resultant(traction_load(box, testing::kXiMax, t)) - 1.5 * t).norm(), 1e-13) << k;
  }
  const mesh::VolumeMesh skew = grid_mesh(3, 3, 2, 10, [](const Eigen::Vector3d& p) {
    return Eigen::Vector3d(p.x() + 0.4 * p.x() * p.y(), p.y(), p.z());
  });
  EXPECT_LT((resultant(traction_load(skew, testing::kZetaMin, t)) - 1.2 * t).norm(), 1e-13);
}

// derived: integral(n dA) over a closed surface is zero, and n dA of a 6-node face is a degree-2
// polynomial, so the pressure forces of the whole (curved) boundary sum to zero to round-off.
TEST(PressureLoad, ClosedCurvedSurfaceGivesZeroResultant) {
  for (int k : {4, 10}) {
    const mesh::VolumeMesh m = grid_mesh(3, 3, 3, k, curved);
    Eigen::Vector3d total = Eigen::Vector3d::Zero();
    for (int side = 1; side <= 6; ++side) total += resultant(pressure_load(m, side, 0.7));
    EXPECT_LT(total.norm(), 1e-13) << k << "-node";
  }
}

// derived: a top face z = 1 + h(x, y) over the unit square has integral(n_z dA) = 1 (its
// projection), whatever the bump h; the pressure resultant is -p times the vector area.
TEST(PressureLoad, BumpedFaceProjectsToItsBase) {
  const mesh::VolumeMesh m = grid_mesh(3, 3, 2, 10, [](const Eigen::Vector3d& p) {
    return Eigen::Vector3d(p.x(), p.y(),
                           p.z() * (1.0 + 0.3 * std::sin(3.0 * p.x()) * std::cos(2.0 * p.y())));
  });
  const double p = 0.25;
  const Eigen::Vector3d total = resultant(pressure_load(m, testing::kZetaMax, p));
  EXPECT_NEAR(total.z(), -p * 1.0, 1e-14);
  EXPECT_LT((total + p * vector_area(m, testing::kZetaMax)).norm(), 1e-14);
  // Outward normal of the top face: pressure pushes down.
  EXPECT_LT(total.z(), 0.0);
}

// Two computations: K u = f + r with r at the constrained dofs only; since K annihilates rigid
// motions, the reactions balance the applied force and moment.
TEST(Reactions, BalanceAppliedForceAndMoment) {
  for (int k : {4, 10}) {
    SCOPED_TRACE(std::to_string(k) + "-node");
    mesh::VolumeMesh m =
        grid_mesh(3, 3, 4, k, curved, [](const Eigen::Vector3d& p) { return p.z() < 0.5 ? 1 : 2; });
    const MaterialTable materials{{1, {13700.0, 0.3}}, {2, {0.5, 0.45}}};
    const std::vector<DofConstraint> fixed = fix_faces(m, testing::kZetaMin);
    const LinearElasticSolver solver(m, materials, fixed);
    const Eigen::Vector3d F(0.5, -0.2, 1.0), M(3.0, -1.0, 2.0), p(3.5, 1.0, 2.5);
    const Eigen::VectorXd f =
        patch_load(m, testing::kZetaMax, F, M, p) + pressure_load(m, testing::kXiMax, 0.01);
    const Eigen::VectorXd u = solver.solve(f);
    const Eigen::VectorXd r = solver.reactions(u, f);
    std::vector<char> is_fixed(static_cast<size_t>(3 * m.n_nodes()), 0);
    for (const DofConstraint& d : fixed)
      is_fixed[static_cast<size_t>(3 * d.node + d.component)] = 1;
    double free_residual = 0;
    for (long i = 0; i < r.size(); ++i) {
      if (!is_fixed[static_cast<size_t>(i)])
        free_residual = std::max(free_residual, std::abs(r(i)));
    }
    const double scale = f.cwiseAbs().maxCoeff();
    EXPECT_LT(free_residual, 1e-10 * scale);
    const Eigen::Vector3d applied_force = resultant(f), applied_moment = moment_about(m, f, p);
    EXPECT_LT((resultant(r) + applied_force).norm(), 1e-10 * applied_force.norm());
    EXPECT_LT((moment_about(m, r, p) + applied_moment).norm(), 1e-10 * applied_moment.norm());
  }
}

}  // namespace
}  // namespace sharpey::fem
