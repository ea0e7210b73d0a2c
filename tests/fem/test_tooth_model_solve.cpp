// The solver on the real tooth model (maxillary central incisor): equilibrium of the reactions,
// superposition of the unit load cases against direct solves, and mesh convergence of the PDL
// pressure and crown-tip displacement between the standard and fine presets.
//
// Each TEST builds its own models: ctest runs every TEST in its own process, so the convergence
// checks share one TEST (one standard and one fine solve) instead of a fixture.
#include <gtest/gtest.h>

#include <Eigen/Dense>
#include <algorithm>
#include <cmath>
#include <cstdio>
#include <limits>
#include <random>
#include <utility>
#include <vector>

#include "sharpey/fem/elasticity.h"
#include "sharpey/mesh/surface_distance.h"
#include "sharpey/mesh/tooth_model.h"

namespace sharpey::fem {
namespace {

// source: check-values.md section 1 (pub): dentin 18.6 GPa / 0.31, PDL 0.47 MPa / 0.45 (AJODO
// 2013), cortical bone 13.7 GPa / 0.30, cancellous bone 1.37 GPa / 0.30 (tables of published FE
// studies).
MaterialTable tooth_materials() {
  return {{mesh::kTooth, {18600.0, 0.31}},
          {mesh::kPdl, {0.47, 0.45}},
          {mesh::kCorticalBone, {13700.0, 0.30}},
          {mesh::kCancellousBone, {1370.0, 0.30}}};
}

mesh::ToothModel incisor(mesh::MeshPreset preset) {
  mesh::ModelSpec spec;
  spec.tooth.type = mesh::ToothType::kMaxillaryCentralIncisor;
  spec.tooth.dimensions = mesh::handbook_dimensions(spec.tooth.type);
  spec.sizing.preset = preset;
  return mesh::build_tooth_model(spec);
}

Eigen::Vector3d node_vector(const Eigen::VectorXd& v, int node) {
  return v.segment<3>(3 * static_cast<Eigen::Index>(node));
}

// Resultant and moment about `point` of the nodal forces of the listed nodes.
void resultant(const mesh::VolumeMesh& m, const Eigen::VectorXd& f, const std::vector<int>& nodes,
               const Eigen::Vector3d& point, Eigen::Vector3d* force, Eigen::Vector3d* moment) {
  force->setZero();
  moment->setZero();
  for (int n : nodes) {
    const Eigen::Vector3d fn = node_vector(f, n);
    *force += fn;
    *moment += (m.nodes[static_cast<size_t>(n)] - point).cross(fn);
  }
}

std::vector<int> all_nodes(const mesh::VolumeMesh& m) {
  std::vector<int> nodes(static_cast<size_t>(m.n_nodes()));
  for (int i = 0; i < m.n_nodes(); ++i) nodes[static_cast<size_t>(i)] = i;
  return nodes;
}

std::vector<int> constrained_nodes(const std::vector<DofConstraint>& constraints) {
  std::vector<int> nodes;
  for (const DofConstraint& c : constraints) nodes.push_back(c.node);
  std::sort(nodes.begin(), nodes.end());
  nodes.erase(std::unique(nodes.begin(), nodes.end()), nodes.end());
  return nodes;
}

// Point 8 (derived: static equilibrium of the discrete system). For a random force system at the
// bracket, the reactions at the fixed bone faces balance the applied force and the applied moment
// about several points to 1e-8 relative.
TEST(ToothModelSolve, ReactionsBalanceTheAppliedForceSystem) {
  const mesh::ToothModel model = incisor(mesh::MeshPreset::kCoarse);
  const mesh::VolumeMesh& m = model.mesh;
  const mesh::ModelGeometry& g = model.geometry;
  const MaterialTable materials = tooth_materials();
  const std::vector<DofConstraint> fixed = fix_faces(m, mesh::kFixedBone);
  const LinearElasticSolver solver(m, materials, fixed);
  const std::vector<int> support = constrained_nodes(fixed);
  const double size_mm = (g.bone_max - g.bone_min).norm() + (g.crown_tip - g.apex).norm();

  std::mt19937 rng(8);
  std::uniform_real_distribution<double> uniform(-1.0, 1.0);
  for (int trial = 0; trial < 3; ++trial) {
    SCOPED_TRACE("trial " + std::to_string(trial));
    const Eigen::Vector3d F(uniform(rng), uniform(rng), uniform(rng));
    const Eigen::Vector3d M(10 * uniform(rng), 10 * uniform(rng), 10 * uniform(rng));
    const Eigen::VectorXd f = patch_load(m, mesh::kBracketPad, F, M, g.bracket_center);
    const Eigen::VectorXd u = solver.solve(f);
    const Eigen::VectorXd r = solver.reactions(u, f);
    std::printf("trial %d: %d dofs, relative residual %.3e\n", trial, solver.statistics().n_dofs,
                solver.statistics().last_relative_residual);

    const std::vector<Eigen::Vector3d> points = {g.bracket_center, Eigen::Vector3d(0, 0, 0), g.apex,
                                                 g.bone_min, Eigen::Vector3d(3.0, -7.0, 11.0)};
    for (const Eigen::Vector3d& point : points) {
      SCOPED_TRACE("moments about (" + std::to_string(point.x()) + ", " +
                   std::to_string(point.y()) + ", " + std::to_string(point.z()) + ")");
      Eigen::Vector3d applied_f, applied_m, reaction_f, reaction_m;
      resultant(m, f, all_nodes(m), point, &applied_f, &applied_m);
      resultant(m, r, support, point, &reaction_f, &reaction_m);
      // The applied nodal forces are the requested force system (patch_load's contract).
      const Eigen::Vector3d requested_m = M + (g.bracket_center - point).cross(F);
      EXPECT_LT((applied_f - F).norm(), 1e-12 * F.norm());
      EXPECT_LT((applied_m - requested_m).norm(),
                1e-12 * (requested_m.norm() + F.norm() * size_mm));
      // Scale of the moment balance: the moment itself plus the force times the model's size, so
      // the check stays meaningful about a point where the applied moment happens to be small.
      const double force_err = (reaction_f + applied_f).norm() / applied_f.norm();
      const double moment_err =
          (reaction_m + applied_m).norm() / (applied_m.norm() + applied_f.norm() * size_mm);
      std::printf("  about (%.1f, %.1f, %.1f): force balance %.2e, moment balance %.2e\n",
                  point.x(), point.y(), point.z(), force_err, moment_err);
      EXPECT_LT(force_err, 1e-8);
      EXPECT_LT(moment_err, 1e-8);
    }
  }
}

// Point 9 (derived: linearity). The six unit load cases combined for a random force system give
// the displacement and the PDL stress and strain of a direct solve to 1e-9 relative.
TEST(ToothModelSolve, UnitLoadBasisEqualsDirectSolve) {
  const mesh::ToothModel model = incisor(mesh::MeshPreset::kCoarse);
  const mesh::VolumeMesh& m = model.mesh;
  const Eigen::Vector3d& c = model.geometry.bracket_center;
  const MaterialTable materials = tooth_materials();
  const LinearElasticSolver solver(m, materials, fix_faces(m, mesh::kFixedBone));
  const UnitLoadBasis basis(m, materials, solver, mesh::kBracketPad, c, mesh::kPdl);

  std::mt19937 rng(9);
  std::uniform_real_distribution<double> uniform(-1.0, 1.0);
  for (int trial = 0; trial < 3; ++trial) {
    SCOPED_TRACE("trial " + std::to_string(trial));
    const Eigen::Vector3d F(uniform(rng), uniform(rng), uniform(rng));
    const Eigen::Vector3d M(10 * uniform(rng), 10 * uniform(rng), 10 * uniform(rng));
    const Eigen::VectorXd u_direct = solver.solve(patch_load(m, mesh::kBracketPad, F, M, c));
    const RegionField direct = recover_region(m, materials, u_direct, mesh::kPdl);
    const Eigen::VectorXd u = basis.displacement(F, M);
    const RegionField combined = basis.region_field(F, M);
    ASSERT_EQ(combined.nodes, direct.nodes);
    const double du = (u - u_direct).norm() / u_direct.norm();
    const double ds = (combined.stress_mpa - direct.stress_mpa).norm() / direct.stress_mpa.norm();
    const double de = (combined.strain - direct.strain).norm() / direct.strain.norm();
    std::printf("trial %d: displacement %.2e, PDL stress %.2e, PDL strain %.2e (relative)\n", trial,
                du, ds, de);
    EXPECT_LT(du, 1e-9);
    EXPECT_LT(ds, 1e-9);
    EXPECT_LT(de, 1e-9);
  }
}

// Figures of one preset under 1 N lingual (-x) at the bracket centre.
struct ConvergenceFigures {
  int dofs = 0;
  // Max over the PDL nodes more than one PDL width (the crest width) away from the ligament's free
  // surface (kPdlCrest faces), in 3D: the peak the analyses report
  // (analysis::ScenarioResult::pressure_max_compression_kpa, analysis::pdl_crest_edge_band).
  double peak_pressure_kpa = 0;
  Eigen::Vector3d peak_x_mm = Eigen::Vector3d::Zero();  // position of the node carrying it
  // Max over the band next to the free edge, where the linear-elastic stress is singular.
  double edge_band_peak_kpa = 0;
  double p95_pressure_kpa = 0;  // 95th percentile, PDL element volume weighted
  double crest_z_mm = 0;
  double apex_z_mm = 0;
  double crown_tip_mm = 0;  // |u| at the node nearest geometry.crown_tip
};

ConvergenceFigures lingual_tipping(mesh::MeshPreset preset) {
  const mesh::ToothModel model = incisor(preset);
  const mesh::VolumeMesh& m = model.mesh;
  const mesh::ModelGeometry& g = model.geometry;
  const MaterialTable materials = tooth_materials();
  const LinearElasticSolver solver(m, materials, fix_faces(m, mesh::kFixedBone));
  const Eigen::VectorXd u = solver.solve(patch_load(m, mesh::kBracketPad, Eigen::Vector3d(-1, 0, 0),
                                                    Eigen::Vector3d::Zero(), g.bracket_center));
  const RegionField pdl = recover_region(m, materials, u, mesh::kPdl);

  ConvergenceFigures out;
  out.dofs = solver.statistics().n_dofs;
  out.crest_z_mm = g.crest_z_mm;
  out.apex_z_mm = g.apex_z_mm;
  out.peak_pressure_kpa = -std::numeric_limits<double>::infinity();
  out.edge_band_peak_kpa = -std::numeric_limits<double>::infinity();
  std::vector<double> local(static_cast<size_t>(m.n_nodes()), 0.0);
  const std::vector<double> to_free_edge = mesh::distance_to_faces(m, pdl.nodes, mesh::kPdlCrest);
  for (size_t i = 0; i < pdl.nodes.size(); ++i) {
    const double p = hydrostatic_pressure_kpa(pdl.stress_mpa.col(static_cast<Eigen::Index>(i)));
    const Eigen::Vector3d& x = m.nodes[static_cast<size_t>(pdl.nodes[i])];
    local[static_cast<size_t>(pdl.nodes[i])] = p;
    if (to_free_edge[i] < model.spec.pdl.crest_width_mm) {
      out.edge_band_peak_kpa = std::max(out.edge_band_peak_kpa, p);
    } else if (p > out.peak_pressure_kpa) {
      out.peak_pressure_kpa = p;
      out.peak_x_mm = x;
    }
  }
  // Volume-weighted 95th percentile of the element-mean nodal pressure.
  std::vector<std::pair<double, double>> by_volume;  // (pressure, volume)
  double total = 0;
  for (int e = 0; e < m.n_elements(); ++e) {
    if (m.element_region[static_cast<size_t>(e)] != mesh::kPdl) continue;
    const int* t = m.element(e);
    double mean = 0;
    for (int k = 0; k < m.nodes_per_element; ++k) mean += local[static_cast<size_t>(t[k])];
    mean /= m.nodes_per_element;
    const Eigen::Vector3d& a = m.nodes[static_cast<size_t>(t[0])];
    const double v = std::abs((m.nodes[static_cast<size_t>(t[1])] - a)
                                  .dot((m.nodes[static_cast<size_t>(t[2])] - a)
                                           .cross(m.nodes[static_cast<size_t>(t[3])] - a))) /
                     6.0;
    by_volume.emplace_back(mean, v);
    total += v;
  }
  std::sort(by_volume.begin(), by_volume.end());
  double below = 0;
  for (const auto& [p, v] : by_volume) {
    below += v;
    if (below >= 0.95 * total) {
      out.p95_pressure_kpa = p;
      break;
    }
  }

  int tip = 0;
  for (int i = 1; i < m.n_nodes(); ++i) {
    if ((m.nodes[static_cast<size_t>(i)] - g.crown_tip).norm() <
        (m.nodes[static_cast<size_t>(tip)] - g.crown_tip).norm()) {
      tip = i;
    }
  }
  out.crown_tip_mm = node_vector(u, tip).norm();
  std::printf(
      "%-8s %7d dofs: peak PDL pressure %.4f kPa at (%.3f, %.3f, %.3f) mm (crest %.3f mm), "
      "edge band %.4f kPa, 95th percentile %.4f kPa, crown tip %.5e mm "
      "(node %.3f mm from the tip)\n",
      mesh::to_string(preset).c_str(), out.dofs, out.peak_pressure_kpa, out.peak_x_mm.x(),
      out.peak_x_mm.y(), out.peak_x_mm.z(), out.crest_z_mm, out.edge_band_peak_kpa,
      out.p95_pressure_kpa, out.crown_tip_mm,
      (m.nodes[static_cast<size_t>(tip)] - g.crown_tip).norm());
  return out;
}

double relative_difference(double a, double reference) {
  return std::abs(a - reference) / std::abs(reference);
}

// Point 10 (derived: mesh convergence; the 5 % tolerance is the project's acceptance figure).
// 1 N lingual at the bracket centre of the maxillary central incisor, standard vs fine preset:
// the peak PDL hydrostatic pressure (outside the band one PDL width deep next to the free edge,
// as the analyses report it), the crown-tip displacement and the volume-weighted 95th percentile.
// In the edge band the linear-elastic pressure is singular (bonded corner of a nearly
// incompressible layer): its nodal maximum grows as the layers get thinner (measured at the
// standard surface spacing: 43.9 kPa with two layers, 58.8 kPa with three), so it is printed, not
// compared. Measured (Release): standard 83 631 dofs (93 093 before issue 18's grading), fine
// 247 791 dofs; peak 52.17 vs 52.21 kPa (0.08 %); crown tip 2.5048e-2 vs 2.5054e-2 mm (0.03 %);
// see docs/verification.md.
TEST(ToothModelSolve, StandardPresetPeakPressureAndCrownTipWithinFivePercentOfFine) {
  const ConvergenceFigures standard = lingual_tipping(mesh::MeshPreset::kStandard);
  const ConvergenceFigures fine = lingual_tipping(mesh::MeshPreset::kFine);
  const double d_peak = relative_difference(standard.peak_pressure_kpa, fine.peak_pressure_kpa);
  const double d_p95 = relative_difference(standard.p95_pressure_kpa, fine.p95_pressure_kpa);
  const double d_tip = relative_difference(standard.crown_tip_mm, fine.crown_tip_mm);
  std::printf("standard vs fine: peak %.2f %%, 95th percentile %.2f %%, crown tip %.2f %%\n",
              100 * d_peak, 100 * d_p95, 100 * d_tip);
  EXPECT_LT(d_peak, 0.05);
  EXPECT_LT(d_tip, 0.05);
  EXPECT_LT(d_p95, 0.05);
  // Where the peak lies (derived: a lingual force at the bracket, above the centre of resistance,
  // tips the crown lingually about a point below the centre of resistance, compressing the
  // lingual cervical ligament and the labial apical one; the cervical side carries the larger
  // pressure because the crown's lever arm is largest there): lingual (x < 0), in the cervical
  // third of the embedded root.
  for (const ConvergenceFigures* f : {&standard, &fine}) {
    EXPECT_LT(f->peak_x_mm.x(), 0.0);
    EXPECT_GT(f->peak_x_mm.z(), f->crest_z_mm - (f->crest_z_mm - f->apex_z_mm) / 3.0);
  }
}

}  // namespace
}  // namespace sharpey::fem
