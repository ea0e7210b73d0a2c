// Mesh convergence of the PDL pressure on the maxillary central incisor under 1 N lingual at the
// bracket centre: for a preset and optional explicit sizes it prints the degrees of freedom, the
// peak, the 95th percentile and the position of the peak of the nodal hydrostatic pressure in the
// PDL, and the crown-tip displacement, so that the presets can be compared with finer meshes.
//
// Usage: bench_pdl_convergence [--preset coarse|standard|fine] [--pdl-edge MM] [--bone-edge MM]
//                              [--layers N] [--ordering metis|amd|nesdis|metis-nodes] [--top K]
//                              [--mesh-only]
#include <Eigen/Dense>
#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <exception>
#include <numeric>
#include <string>
#include <vector>

#include "sharpey/core/constants.h"
#include "sharpey/fem/elasticity.h"
#include "sharpey/mesh/tooth_model.h"
#include "sharpey/startup/blas_kernels.h"

namespace {

using namespace sharpey;

double seconds_since(std::chrono::steady_clock::time_point t0) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
}

int run(int argc, char** argv) {
  mesh::ModelSpec spec;
  spec.tooth.type = mesh::ToothType::kMaxillaryCentralIncisor;
  spec.tooth.dimensions = mesh::handbook_dimensions(spec.tooth.type);
  int top = 8;
  bool mesh_only = false;
  fem::SolverOptions options;
  for (int i = 1; i < argc; ++i) {
    const bool has_value = i + 1 < argc;
    if (std::strcmp(argv[i], "--preset") == 0 && has_value) {
      spec.sizing.preset = mesh::mesh_preset_from_string(argv[++i]);
    } else if (std::strcmp(argv[i], "--pdl-edge") == 0 && has_value) {
      spec.sizing.pdl_edge_mm = std::atof(argv[++i]);
    } else if (std::strcmp(argv[i], "--bone-edge") == 0 && has_value) {
      spec.sizing.bone_edge_mm = std::atof(argv[++i]);
    } else if (std::strcmp(argv[i], "--layers") == 0 && has_value) {
      spec.sizing.pdl_layers = std::atoi(argv[++i]);
    } else if (std::strcmp(argv[i], "--ordering") == 0 && has_value) {
      const std::string o = argv[++i];
      options.ordering = o == "metis"    ? fem::Ordering::kMetis
                         : o == "amd"    ? fem::Ordering::kAmd
                         : o == "nesdis" ? fem::Ordering::kNesdis
                                         : fem::Ordering::kMetisNodes;
    } else if (std::strcmp(argv[i], "--mesh-only") == 0) {
      mesh_only = true;
    } else if (std::strcmp(argv[i], "--top") == 0 && has_value) {
      top = std::atoi(argv[++i]);
    } else {
      std::fprintf(stderr,
                   "usage: bench_pdl_convergence [--preset coarse|standard|fine] [--pdl-edge MM] "
                   "[--bone-edge MM] [--layers N] [--ordering metis|amd|nesdis|metis-nodes] [--top "
                   "K] [--mesh-only]\n");
      return 2;
    }
  }
  const mesh::MeshSizes sizes = mesh::resolve_sizing(spec.sizing);
  auto t0 = std::chrono::steady_clock::now();
  const mesh::ToothModel model = mesh::build_tooth_model(spec);
  const double t_mesh = seconds_since(t0);
  const mesh::VolumeMesh& m = model.mesh;
  const mesh::ModelGeometry& g = model.geometry;
  if (mesh_only) {
    std::printf("nodes %d (at most %d dofs), elements %d, mesh %.2f s\n", m.n_nodes(),
                3 * m.n_nodes(), m.n_elements(), t_mesh);
    return 0;
  }

  // source: check-values.md section 1 (pub), as in tests/fem/test_tooth_model_solve.cpp.
  const fem::MaterialTable materials = {{mesh::kTooth, {18600.0, 0.31}},
                                        {mesh::kPdl, {0.47, 0.45}},
                                        {mesh::kCorticalBone, {13700.0, 0.30}},
                                        {mesh::kCancellousBone, {1370.0, 0.30}}};
  t0 = std::chrono::steady_clock::now();
  const fem::LinearElasticSolver solver(m, materials, fem::fix_faces(m, mesh::kFixedBone), options);
  const double t_factor = seconds_since(t0);
  const Eigen::VectorXd u = solver.solve(fem::patch_load(
      m, mesh::kBracketPad, Eigen::Vector3d(-1, 0, 0), Eigen::Vector3d::Zero(), g.bracket_center));
  const fem::RegionField pdl = fem::recover_region(m, materials, u, mesh::kPdl);

  std::vector<double> p(pdl.nodes.size());
  for (size_t i = 0; i < p.size(); ++i)
    p[i] = fem::hydrostatic_pressure_kpa(pdl.stress_mpa.col(static_cast<Eigen::Index>(i)));
  std::vector<size_t> order(p.size());
  std::iota(order.begin(), order.end(), size_t{0});
  std::sort(order.begin(), order.end(), [&](size_t a, size_t b) { return p[a] > p[b]; });
  std::vector<double> sorted = p;
  std::sort(sorted.begin(), sorted.end());
  const double p95 = sorted[static_cast<size_t>(0.95 * static_cast<double>(sorted.size() - 1))];

  int tip = 0;
  for (int i = 1; i < m.n_nodes(); ++i) {
    if ((m.nodes[static_cast<size_t>(i)] - g.crown_tip).norm() <
        (m.nodes[static_cast<size_t>(tip)] - g.crown_tip).norm()) {
      tip = i;
    }
  }
  const double tip_mm = u.segment<3>(3 * static_cast<Eigen::Index>(tip)).norm();

  std::printf("sizes: pdl_edge %.3f mm, bone_edge %.3f mm, tooth_edge %.3f mm, %d PDL layer(s)\n",
              sizes.pdl_edge_mm, sizes.bone_edge_mm, sizes.tooth_edge_mm, sizes.pdl_layers);
  const fem::SolverStatistics& st = solver.statistics();
  std::printf(
      "dofs %d, elements %d, factor nonzeros %lld, mesh %.2f s, assemble+factorise %.2f s "
      "(analyse %.2f s, factorise %.2f s, %.1f GFlop, %s)\n",
      st.n_dofs, m.n_elements(), st.factor_nonzeros, t_mesh, t_factor, st.analyse_s, st.factorise_s,
      st.factorisation_gflop, st.ordering.c_str());
  {
    std::vector<std::vector<char>> in_region(
        5, std::vector<char>(static_cast<size_t>(m.n_nodes()), 0));
    std::vector<int> elements(5, 0);
    for (int e = 0; e < m.n_elements(); ++e) {
      const int r = std::clamp(m.element_region[static_cast<size_t>(e)], 0, 4);
      ++elements[static_cast<size_t>(r)];
      for (int k = 0; k < m.nodes_per_element; ++k)
        in_region[static_cast<size_t>(r)][static_cast<size_t>(m.element(e)[k])] = 1;
    }
    const char* names[5] = {"other", "tooth", "PDL", "cortical", "cancellous"};
    for (int r = 1; r < 5; ++r) {
      std::printf("  %-10s %7d elements, %7ld nodes\n", names[r], elements[static_cast<size_t>(r)],
                  static_cast<long>(std::count(in_region[static_cast<size_t>(r)].begin(),
                                               in_region[static_cast<size_t>(r)].end(), 1)));
    }
  }
  // Peak outside the band next to the PDL's free edge at the attachment level, where the edge
  // corner makes the linear-elastic stress singular (it grows as the mesh is refined there).
  const double band = model.spec.pdl.crest_width_mm;
  double peak_edge = -1e300, peak_below = -1e300, peak_below_03 = -1e300;
  for (size_t i = 0; i < p.size(); ++i) {
    const Eigen::Vector3d& x = m.nodes[static_cast<size_t>(pdl.nodes[i])];
    const double level = mesh::attachment_level_z_mm(model.spec, std::atan2(x.y(), x.x()));
    if (x.z() < level - band) {
      peak_below = std::max(peak_below, p[i]);
    } else {
      peak_edge = std::max(peak_edge, p[i]);
    }
    if (x.z() < level - 0.3) peak_below_03 = std::max(peak_below_03, p[i]);
  }
  std::printf(
      "peak more than %.2f mm below the attachment level %.4f kPa (more than 0.3 mm: "
      "%.4f kPa); peak in the edge band %.4f kPa\n",
      band, peak_below, peak_below_03, peak_edge);
  std::printf("crest z %.3f mm; peak %.4f kPa, 95th percentile %.4f kPa, crown tip %.5e mm\n",
              g.crest_z_mm, p[order[0]], p95, tip_mm);
  std::printf("highest nodal pressures (kPa; z below the CEJ; angle from labial toward mesial):\n");
  for (int k = 0; k < top && k < static_cast<int>(order.size()); ++k) {
    const Eigen::Vector3d& x = m.nodes[static_cast<size_t>(pdl.nodes[order[k]])];
    const double angle = std::atan2(x.y(), x.x()) * 180.0 / sharpey::core::kPi;
    std::printf("  %9.4f  z %7.3f  angle %7.1f deg  r %.3f mm\n", p[order[k]], x.z(), angle,
                std::hypot(x.x(), x.y()));
  }
  return 0;
}

}  // namespace

int main(int argc, char** argv) {
  sharpey::startup::use_fast_blas_kernels(argv);
  try {
    return run(argc, argv);
  } catch (const std::exception& e) {
    std::fprintf(stderr, "bench_pdl_convergence: %s\n", e.what());
    return 1;
  }
}
