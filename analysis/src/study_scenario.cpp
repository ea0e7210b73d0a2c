#include <algorithm>
#include <new>
#include <sstream>

#include "sharpey/analysis/detail/centre_of_resistance.h"
#include "sharpey/analysis/detail/load_resolution.h"
#include "sharpey/analysis/detail/pdl_regions.h"
#include "sharpey/analysis/detail/rigid_motion.h"
#include "sharpey/analysis/detail/root_map.h"
#include "sharpey/analysis/detail/root_surface.h"
#include "sharpey/analysis/study.h"
#include "sharpey/core/check.h"
#include "sharpey/error.h"
#include "study_memory.h"

namespace sharpey::analysis {

namespace detail {

namespace {

std::string sizes_text(const mesh::MeshSizing& sizing) {
  const mesh::MeshSizes z = mesh::resolve_sizing(sizing);
  std::ostringstream s;
  s << mesh::to_string(sizing.preset) << " preset: PDL edge " << z.pdl_edge_mm << " mm, bone edge "
    << z.bone_edge_mm << " mm, " << z.pdl_layers << " PDL layer" << (z.pdl_layers == 1 ? "" : "s");
  return s.str();
}

constexpr const char* kLessMemory =
    "use a coarser mesh (mesh.preset \"coarse\", or larger mesh.pdl_edge_mm and "
    "mesh.bone_edge_mm, fewer mesh.pdl_layers), fewer scenarios per run, or a computer with more "
    "free memory";

}  // namespace

mesh::ToothModel build_scenario_model(const mesh::ModelSpec& model, const std::string& scenario,
                                      const std::atomic<bool>* cancel) {
  try {
    return mesh::build_tooth_model(model, cancel);
  } catch (const std::bad_alloc&) {
    throw MeshError("meshing scenario '" + scenario + "' ran out of memory (" +
                    sizes_text(model.sizing) + "); " + kLessMemory);
  }
}

std::vector<fem::DofConstraint> scenario_constraints(const mesh::VolumeMesh& mesh) {
  return fem::fix_faces(mesh, mesh::kFixedBone);
}

std::string solver_out_of_memory_message(const std::string& scenario, int n_nodes, int n_elements) {
  std::ostringstream s;
  s << "solving scenario '" << scenario << "' ran out of memory while assembling, factorising or "
    << "solving the stiffness matrix of " << n_nodes << " nodes (" << 3L * n_nodes
    << " displacement unknowns) and " << n_elements << " elements; " << kLessMemory;
  return s.str();
}

}  // namespace detail

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
  model_ = detail::build_scenario_model(model_of(spec, scenario_index), scenario_.name, cancel);
  solve(spec, progress, cancel, options);
}

ScenarioSolution::ScenarioSolution(const CaseSpec& spec, int scenario_index, mesh::ToothModel model,
                                   const ProgressCallback& progress,
                                   const std::atomic<bool>* cancel, ScenarioOptions options)
    : scenario_(checked_scenario(spec, scenario_index)), model_(std::move(model)) {
  solve(spec, progress, cancel, options);
}

ScenarioSolution::ScenarioSolution(const CaseSpec& spec, int scenario_index, mesh::ToothModel model,
                                   std::unique_ptr<fem::LinearElasticSolver>* factorisation,
                                   const ProgressCallback& progress,
                                   const std::atomic<bool>* cancel, ScenarioOptions options)
    : scenario_(checked_scenario(spec, scenario_index)), model_(std::move(model)) {
  SHARPEY_ASSERT(factorisation != nullptr, "ScenarioSolution: factorisation must not be null");
  options.keep_solver = false;  // the caller keeps it
  solve(spec, progress, cancel, options, factorisation);
}

ScenarioSolution::ScenarioSolution(const CaseSpec& spec, int scenario_index, mesh::ToothModel model,
                                   std::unique_ptr<fem::UnitLoadBasis> basis,
                                   fem::SolverStatistics statistics, ScenarioOptions options)
    : scenario_(checked_scenario(spec, scenario_index)),
      model_(std::move(model)),
      materials_(material_table(spec)),
      solver_statistics_(std::move(statistics)),
      basis_(std::move(basis)) {
  if (!basis_) {
    throw InputError("unit_load_basis", "restoring scenario '" + scenario_.name +
                                            "' needs its unit load basis; none was given");
  }
  derive(options);
}

ScenarioSolution::~ScenarioSolution() = default;

void ScenarioSolution::solve(const CaseSpec& spec, const ProgressCallback& progress,
                             const std::atomic<bool>* cancel, const ScenarioOptions& options,
                             std::unique_ptr<fem::LinearElasticSolver>* factorisation) {
  const mesh::VolumeMesh& m = model_.mesh;
  const mesh::ModelGeometry& g = model_.geometry;
  check_cancel(cancel);
  report(progress, "factorise", 0.25);
  materials_ = material_table(spec);
  // CHOLMOD reports its own out-of-memory as a SolverError; Eigen's containers (assembly,
  // right-hand sides, the PDL fields) throw std::bad_alloc, which is the same failure.
  std::unique_ptr<fem::LinearElasticSolver>& held = factorisation ? *factorisation : solver_;
  try {
    if (held) {
      held->refactorise(m, materials_);  // same mesh, new materials: numeric factorisation only
    } else {
      fem::SolverOptions solver_options;
      solver_options.symbolic = options.symbolic;
      held = std::make_unique<fem::LinearElasticSolver>(
          m, materials_, detail::scenario_constraints(m), solver_options);
    }
    check_cancel(cancel);
    report(progress, "unit loads", 0.75);
    basis_ = std::make_unique<fem::UnitLoadBasis>(m, materials_, *held, mesh::kBracketPad,
                                                  g.bracket_center, mesh::kPdl);
  } catch (const std::bad_alloc&) {
    held.reset();
    throw SolverError(
        detail::solver_out_of_memory_message(scenario_.name, m.n_nodes(), m.n_elements()));
  }
  solver_statistics_ = held->statistics();
  if (!options.keep_solver) solver_.reset();  // the factor is no longer needed
  check_cancel(cancel);
  report(progress, "post-processing", 0.9);
  derive(options);
  report(progress, "done", 1.0);
}

void ScenarioSolution::derive(const ScenarioOptions& options) {
  const mesh::VolumeMesh& m = model_.mesh;
  const mesh::ModelGeometry& g = model_.geometry;
  embedded_root_nodes_ = detail::embedded_root_nodes(model_);
  edge_band_ = detail::free_edge_band(model_, pdl_nodes());
  pdl_elements_ = std::make_unique<detail::PdlElementTable>(m, pdl_nodes());

  load_context_ = std::make_unique<detail::LoadContext>();
  detail::LoadContext& c = *load_context_;
  c.response = detail::rigid_response(m.nodes, basis_->unit_displacements(), embedded_root_nodes_,
                                      g.bracket_center);
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
