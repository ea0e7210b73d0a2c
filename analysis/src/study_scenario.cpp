#include <algorithm>
#include <sstream>

#include "sharpey/analysis/detail/centre_of_resistance.h"
#include "sharpey/analysis/detail/load_resolution.h"
#include "sharpey/analysis/detail/rigid_motion.h"
#include "sharpey/analysis/detail/root_map.h"
#include "sharpey/analysis/detail/root_surface.h"
#include "sharpey/analysis/study.h"
#include "sharpey/error.h"

namespace sharpey::analysis {
namespace {

const Scenario& checked_scenario(const CaseSpec& spec, int index) {
  if (index < 0 || index >= static_cast<int>(spec.scenarios.size())) {
    std::ostringstream msg;
    msg << "scenario index " << index << " is out of range: the case has " << spec.scenarios.size()
        << " bone-level scenario(s)";
    if (spec.scenarios.empty()) msg << "; add at least one scenario (e.g. one without bone loss)";
    throw InputError("scenarios", msg.str());
  }
  return spec.scenarios[static_cast<size_t>(index)];
}

mesh::ModelSpec model_of(const CaseSpec& spec, int index) {
  mesh::ModelSpec m = spec.model;
  m.loss = checked_scenario(spec, index).loss;
  return m;
}

void check_cancel(const std::atomic<bool>* cancel) {
  if (cancel != nullptr && cancel->load()) throw Cancelled();
}

void report(const ProgressCallback& progress, const char* stage, double fraction) {
  if (progress) progress(stage, fraction);
}

}  // namespace

ScenarioSolution::ScenarioSolution(const CaseSpec& spec, int scenario_index,
                                   const ProgressCallback& progress,
                                   const std::atomic<bool>* cancel, ScenarioOptions options)
    : scenario_(checked_scenario(spec, scenario_index)) {
  check_cancel(cancel);
  report(progress, "mesh", 0.0);
  model_ = mesh::build_tooth_model(model_of(spec, scenario_index));
  solve(spec, progress, cancel, options);
}

ScenarioSolution::ScenarioSolution(const CaseSpec& spec, int scenario_index, mesh::ToothModel model,
                                   const ProgressCallback& progress,
                                   const std::atomic<bool>* cancel, ScenarioOptions options)
    : scenario_(checked_scenario(spec, scenario_index)), model_(std::move(model)) {
  solve(spec, progress, cancel, options);
}

ScenarioSolution::~ScenarioSolution() = default;

void ScenarioSolution::solve(const CaseSpec& spec, const ProgressCallback& progress,
                             const std::atomic<bool>* cancel, const ScenarioOptions& options) {
  const mesh::VolumeMesh& m = model_.mesh;
  const mesh::ModelGeometry& g = model_.geometry;
  check_cancel(cancel);
  report(progress, "factorise", 0.25);
  materials_ = material_table(spec);
  solver_ = std::make_unique<fem::LinearElasticSolver>(m, materials_,
                                                       fem::fix_faces(m, mesh::kFixedBone));
  check_cancel(cancel);
  report(progress, "unit loads", 0.75);
  basis_ = std::make_unique<fem::UnitLoadBasis>(m, materials_, *solver_, mesh::kBracketPad,
                                                g.bracket_center, mesh::kPdl);
  solver_statistics_ = solver_->statistics();
  if (!options.keep_solver) solver_.reset();  // the factor is no longer needed
  check_cancel(cancel);
  report(progress, "post-processing", 0.9);

  for (int e = 0; e < m.n_elements(); ++e) {
    if (m.element_region[static_cast<size_t>(e)] != mesh::kTooth) continue;
    tooth_nodes_.insert(tooth_nodes_.end(), m.element(e), m.element(e) + m.nodes_per_element);
  }
  std::sort(tooth_nodes_.begin(), tooth_nodes_.end());
  tooth_nodes_.erase(std::unique(tooth_nodes_.begin(), tooth_nodes_.end()), tooth_nodes_.end());

  load_context_ = std::make_unique<detail::LoadContext>();
  detail::LoadContext& c = *load_context_;
  c.response =
      detail::rigid_response(m.nodes, basis_->unit_displacements(), tooth_nodes_, g.bracket_center);
  c.cres_x_z_mm = detail::centre_of_resistance_height(c.response, Eigen::Vector3d::UnitX());
  c.cres_y_z_mm = detail::centre_of_resistance_height(c.response, Eigen::Vector3d::UnitY());
  c.crown_tip_z_mm = g.crown_tip.z();
  c.apex_z_mm = g.apex.z();
  c.crown_mesiodistal_mm = model_.spec.tooth.dimensions.crown_mesiodistal_mm;
  cres_x_ = detail::describe_centre_of_resistance(c.cres_x_z_mm, g);
  cres_y_ = detail::describe_centre_of_resistance(c.cres_y_z_mm, g);

  root_surface_ = std::make_unique<detail::RootSurfaceSampler>(m, mesh::kRootSurface, pdl_nodes());
  // Depth below the CEJ (z = 0) from the CEJ to the apex, the same range for every scenario.
  root_map_ = std::make_unique<detail::RootMapSampler>(m, mesh::kRootSurface, pdl_nodes(),
                                                       options.root_map.n_angle,
                                                       options.root_map.n_depth, 0.0, -g.apex_z_mm);
  report(progress, "done", 1.0);
}

const fem::LinearElasticSolver& ScenarioSolution::solver() const {
  if (!solver_) {
    throw Error("the factorisation of scenario '" + scenario_.name +
                "' was released once its unit load cases were solved; construct the "
                "ScenarioSolution with ScenarioOptions::keep_solver to keep it");
  }
  return *solver_;
}

const std::vector<int>& ScenarioSolution::pdl_nodes() const {
  return basis_->unit_fields().front().nodes;
}

double ScenarioSolution::attachment_area_mm2() const { return root_surface_->area_mm2(); }

const detail::RigidResponse& ScenarioSolution::rigid_response() const {
  return load_context_->response;
}

ResolvedLoad resolve_load(const LoadSpec& load, const ScenarioSolution& solution) {
  return detail::resolve_load(load, solution.load_context());
}

}  // namespace sharpey::analysis
