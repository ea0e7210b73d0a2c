// Clinical analyses shared by the batch command and the desktop app (no Qt, no VTK).
//
// A Study holds one solved model per bone-level scenario of a case: its mesh, one CHOLMOD
// factorisation and six unit load cases at the bracket. Evaluating a force system is then a
// linear combination (milliseconds), so the app can update while a slider moves.
// How every quantity is computed: docs/analyses.md.
#pragma once

#include <atomic>
#include <functional>
#include <memory>
#include <string>
#include <vector>

#include "sharpey/analysis/case_spec.h"
#include "sharpey/fem/elasticity.h"
#include "sharpey/mesh/tooth_model.h"

namespace sharpey::analysis {

namespace detail {
struct LoadContext;
struct RigidResponse;
struct PdlElementTable;
class RootSurfaceSampler;
class RootMapSampler;
}  // namespace detail

// progress(stage, fraction in [0, 1]): a short stage name and the share of the work done.
using ProgressCallback = std::function<void(const std::string& stage, double fraction)>;

// Strain up to which the linear-elastic ligament is taken as valid: published bilinear fits of
// the PDL change slope at about 7.5 % strain (from memory: Poppe, Bourauel, Jaeger 2002, J Orofac
// Orthop 63:358; check-values.md sections 1 and 12). Dimensionless.
constexpr double kLinearRangeStrainLimit = 0.075;

// Centre of resistance for forces along one direction (labiolingual x or mesiodistal y): the point
// on the long axis where a force along that direction translates the tooth without rotating it
// about the perpendicular horizontal axis. From the least-squares rigid motion of the tooth's nodes
// under the unit load cases.
struct CentreOfResistance {
  Eigen::Vector3d point = Eigen::Vector3d::Zero();  // on the long axis, tooth coordinates, mm
  double from_crest_mm = 0;                         // apical distance from the alveolar crest
  double from_cej_mm = 0;                           // apical distance from the CEJ
  double fraction_embedded = 0;                     // from_crest_mm / embedded root length
};

// Grid size of the root maps a ScenarioSolution prepares.
struct RootMapGrid {
  int n_angle = 72;  // 5 degree columns
  int n_depth = 60;  // rows from the CEJ to the apex
};

struct ScenarioOptions {
  RootMapGrid root_map;
  // The Cholesky factor is only needed to solve the six unit cases; it is the largest object of a
  // scenario (about 1 GB for the standard incisor mesh), so by default it is released once they
  // are solved and solver() is no longer available (solver_statistics() stays).
  bool keep_solver = false;
  // The ordering and symbolic factorisation of this scenario's mesh with its fixed bone faces
  // (fem::SymbolicFactorisation), when it was computed ahead (Study analyses the next scenario
  // while this one factorises); null: the solver orders and analyses itself. The same bits.
  std::shared_ptr<const fem::SymbolicFactorisation> symbolic;
};

// Everything that depends on one scenario's geometry but not on the load.
class ScenarioSolution {
 public:
  // Meshes the scenario's model (spec.model with the scenario's bone loss) and solves it.
  // Stages reported: "mesh", "factorise", "unit loads", "post-processing", "done". Throws
  // InputError, MeshError, SolverError, or Cancelled when *cancel becomes true (checked between
  // stages). Running out of memory while meshing is a MeshError, while assembling, factorising
  // or solving a SolverError (each names the mesh and a coarser one as the fix).
  ScenarioSolution(const CaseSpec& spec, int scenario_index, const ProgressCallback& progress,
                   const std::atomic<bool>* cancel, ScenarioOptions options = {});
  // Same with the model already built (Study meshes the next scenario while this one is solved).
  ScenarioSolution(const CaseSpec& spec, int scenario_index, mesh::ToothModel model,
                   const ProgressCallback& progress, const std::atomic<bool>* cancel,
                   ScenarioOptions options = {});
  // Same, for one of several variants of a scenario that share its mesh and differ in materials
  // only (the band's material-only samples). `factorisation` carries a solver from one variant to
  // the next: when it holds one (built on this very mesh), it is refactorised with this case's
  // materials, its ordering and symbolic analysis reused (fem::LinearElasticSolver::refactorise);
  // when it is null, a solver is built and left in it. Results equal those of the constructor
  // above bit for bit. The solver stays with the caller (has_solver() is false), so that the
  // caller decides when its factor (the largest object of a scenario) is released.
  ScenarioSolution(const CaseSpec& spec, int scenario_index, mesh::ToothModel model,
                   std::unique_ptr<fem::LinearElasticSolver>* factorisation,
                   const ProgressCallback& progress, const std::atomic<bool>* cancel,
                   ScenarioOptions options = {});
  // Restores a solution solved earlier (read back by read_solution, solution_cache.h): the model
  // and the unit load basis as that solve left them, and its statistics. Nothing is meshed or
  // solved; everything else is derived from them as after a solve, so evaluate() gives the same
  // results bit for bit. has_solver() is false. Throws InputError for a null basis.
  ScenarioSolution(const CaseSpec& spec, int scenario_index, mesh::ToothModel model,
                   std::unique_ptr<fem::UnitLoadBasis> basis, fem::SolverStatistics statistics,
                   ScenarioOptions options = {});
  ~ScenarioSolution();
  ScenarioSolution(const ScenarioSolution&) = delete;
  ScenarioSolution& operator=(const ScenarioSolution&) = delete;

  const Scenario& scenario() const { return scenario_; }
  const mesh::ToothModel& model() const { return model_; }
  const fem::MaterialTable& materials() const { return materials_; }
  // Assembly, ordering and factorisation figures; always available.
  const fem::SolverStatistics& solver_statistics() const { return solver_statistics_; }
  // The factorised solver; only with ScenarioOptions::keep_solver (throws Error otherwise).
  bool has_solver() const { return solver_ != nullptr; }
  const fem::LinearElasticSolver& solver() const;
  const fem::UnitLoadBasis& basis() const { return *basis_; }
  const CentreOfResistance& cres_labiolingual() const { return cres_x_; }
  const CentreOfResistance& cres_mesiodistal() const { return cres_y_; }
  const std::vector<int>& pdl_nodes() const;  // global node ids of the PDL region
  // Global node ids of the embedded root: tooth nodes below the attachment level at their angle
  // around the long axis (below the crest, and below the defect floor inside an angular defect).
  // The tooth's rigid motion (centre of resistance, centre of rotation, displacements) is fitted
  // to these nodes only, so crown bending does not move the centre of resistance.
  const std::vector<int>& embedded_root_nodes() const { return embedded_root_nodes_; }
  // 1 for the PDL nodes (order of pdl_nodes()) closer than one PDL width (the crest width) to the
  // ligament's free surface (mesh::kPdlCrest faces: its top at the crest and along the walls of
  // an angular defect), measured in 3D; see pdl_crest_edge_band().
  const std::vector<char>& pdl_edge_band() const { return edge_band_; }
  // Root surface (tooth/PDL interface) area integrated on the mesh, mm^2.
  double attachment_area_mm2() const;

  // Building blocks used by evaluate() (internal types, see analysis/detail/).
  const detail::LoadContext& load_context() const { return *load_context_; }
  const detail::RigidResponse& rigid_response() const;
  const detail::RootSurfaceSampler& root_surface() const { return *root_surface_; }
  const detail::RootMapSampler& root_map_sampler() const { return *root_map_; }
  const detail::PdlElementTable& pdl_elements() const { return *pdl_elements_; }

 private:
  // `factorisation`: see the constructor above; null to own a new solver.
  void solve(const CaseSpec& spec, const ProgressCallback& progress,
             const std::atomic<bool>* cancel, const ScenarioOptions& options,
             std::unique_ptr<fem::LinearElasticSolver>* factorisation = nullptr);
  // Everything derived from model_ and basis_ (rigid response, CRes, node sets, samplers).
  void derive(const ScenarioOptions& options);

  Scenario scenario_;
  mesh::ToothModel model_;
  fem::MaterialTable materials_;
  std::unique_ptr<fem::LinearElasticSolver> solver_;
  fem::SolverStatistics solver_statistics_;
  std::unique_ptr<fem::UnitLoadBasis> basis_;
  CentreOfResistance cres_x_, cres_y_;
  std::vector<int> embedded_root_nodes_;
  std::vector<char> edge_band_;
  std::unique_ptr<detail::LoadContext> load_context_;
  std::unique_ptr<detail::RootSurfaceSampler> root_surface_;
  std::unique_ptr<detail::RootMapSampler> root_map_;
  std::unique_ptr<detail::PdlElementTable> pdl_elements_;
};

// A force system resolved to a force and a couple at the bracket centre.
struct ResolvedLoad {
  Eigen::Vector3d force_n = Eigen::Vector3d::Zero();
  Eigen::Vector3d moment_nmm =
      Eigen::Vector3d::Zero();  // about the bracket centre (force + couple)
  Eigen::Vector3d application_point = Eigen::Vector3d::Zero();
  // |couple component opposing tipping| / |F|, mm; signed: positive when the couple opposes the
  // force's tipping about the centre of resistance. Rotation preset: the lever arm (half the
  // mesiodistal crown width).
  double moment_to_force_mm = 0;
  Eigen::Vector3d couple_nmm = Eigen::Vector3d::Zero();  // the couple alone (no force moment)
  MovementPreset preset = MovementPreset::kNone;
};
// Applies the load spec (units, direction, bracket height, couple or ratio, movement preset);
// the presets are solved on this scenario's rigid response (docs/analyses.md). Throws InputError
// for an unusable magnitude, direction or height.
ResolvedLoad resolve_load(const LoadSpec& load, const ScenarioSolution& solution);

// PDL pressure over the unwrapped root surface: angle around the long axis (degrees, 0 = labial,
// 90 = mesial) by depth below the CEJ (mm). Cells with no PDL (above the crest) are NaN.
// Cell (row i, column j) is centred at angle (j + 0.5) * 360 / n_angle and depth
// depth_min_mm + (i + 0.5) * (depth_max_mm - depth_min_mm) / n_depth; depth runs from the CEJ (0)
// to the apex for every scenario, so maps of one case line up.
struct RootMap {
  int n_angle = 0, n_depth = 0;
  double depth_min_mm = 0, depth_max_mm = 0;
  std::vector<double> pressure_kpa;  // n_depth rows * n_angle columns, row-major
  // 1 for the cells in the band next to the ligament's free surface (pdl_crest_edge_band(): the
  // band indicator interpolated to the cell is at least one half), where the pressure is
  // mesh-dependent; same layout as pressure_kpa. Empty when not computed.
  std::vector<char> edge_band;
};

struct ScenarioResult {
  std::string name;
  double bone_loss_mm = 0;
  double attachment_area_mm2 = 0;  // root surface in the PDL, integrated on the mesh
  CentreOfResistance cres_labiolingual, cres_mesiodistal;
  double mf_translation_mm = 0;  // moment-to-force ratio at the bracket for translation
  ResolvedLoad load;
  // On the long axis, mm; only meaningful when centre_of_rotation_defined (false for a translation,
  // centre further than 1000 mm, and for a turn about the long axis alone); NaN otherwise.
  Eigen::Vector3d centre_of_rotation = Eigen::Vector3d::Zero();
  bool centre_of_rotation_defined = false;
  // Hydrostatic pressure p = -trace(sigma)/3, compression positive, kPa. Peaks over the PDL nodes
  // more than one PDL width (crest width) below the attachment level: in the band above, next to
  // the ligament's free edge, the linear-elastic stresses are singular and their nodal maxima grow
  // as the mesh is refined (docs/analyses.md); that band's peak compression is reported apart.
  // The 95th percentile is area-weighted over the root surface (the level exceeded on 5 % of the
  // attachment area; 0 when less than 5 % of it is compressed).
  double pressure_max_compression_kpa = 0;
  double pressure_max_tension_kpa = 0;  // positive number: magnitude of the most tensile value
  double pressure_p95_compression_kpa = 0;
  double pressure_max_compression_crest_edge_kpa = 0;  // in the edge band (mesh-dependent)
  // Root-surface area where the pressure exceeds the thresholds (compression), mm^2 and % of the
  // attachment area.
  double area_above_capillary_mm2 = 0, area_above_limit_mm2 = 0;
  double area_above_capillary_percent = 0, area_above_limit_percent = 0;
  // Over the PDL nodes outside the edge band, like the pressure peaks.
  double max_principal_strain = 0, max_equivalent_strain = 0;
  double max_von_mises_kpa = 0;
  // Validity of the linear-elastic ligament. Published bilinear fits of the ligament change slope
  // at about 7.5 % strain (kLinearRangeStrainLimit); beyond it the linear model's stresses are
  // indicative only. max_abs_principal_strain: the largest principal strain magnitude
  // (tension or compression) over the PDL nodes outside the edge band; beyond_linear_range when it
  // exceeds the limit; the share of the PDL volume (elements outside the edge band whose mean
  // nodal principal strain magnitude exceeds the limit) in percent of the whole PDL volume.
  double max_abs_principal_strain = 0;
  bool beyond_linear_range = false;
  double volume_beyond_linear_range_percent = 0;
  // Of the embedded root's fitted rigid motion (ScenarioSolution::embedded_root_nodes()) at the
  // crown tip and the apex, micrometres: crown bending is not included.
  Eigen::Vector3d crown_tip_displacement_um = Eigen::Vector3d::Zero();
  Eigen::Vector3d apex_displacement_um = Eigen::Vector3d::Zero();
  Eigen::Vector3d rotation_deg = Eigen::Vector3d::Zero();  // rigid-body rotation of the root
  // Misfit of the rigid motion over the embedded root's nodes (root bending), micrometres.
  double rigid_fit_rms_um = 0;
  // Same direction and moment-to-force ratio; -1 when no healthy reference scenario exists.
  double equivalent_force_peak_g = -1;
  double equivalent_force_p95_g = -1;
  double equivalent_force_area_rule_g = -1;  // force x attachment area / healthy attachment area

  // Per PDL node (same order as ScenarioSolution::pdl_nodes()).
  std::vector<double> pressure_kpa, max_principal_strain_field, equivalent_strain_field,
      von_mises_kpa;
  Eigen::Matrix3Xd displacement_mm;  // 3 x all mesh nodes
  RootMap root_map;
};

// 1 for the PDL nodes (order of ScenarioSolution::pdl_nodes()) closer than one PDL width (the
// crest width) to the ligament's free surface, in 3D (the top of the ligament at the crest and
// along an angular defect's walls): the band next to the free edge that the reported maxima leave
// out (ScenarioResult::pressure_max_compression_kpa). Computed once per scenario.
const std::vector<char>& pdl_crest_edge_band(const ScenarioSolution& solution);

// Evaluates one scenario under `load`. `healthy` (may be null) is the reference for the
// equivalent force. No new solve: superposition of the unit cases.
ScenarioResult evaluate(const ScenarioSolution& solution, const LoadSpec& load,
                        const Thresholds& thresholds, const ScenarioSolution* healthy);

// All scenarios of a case.
class Study {
 public:
  // Level by level (with StudySolver): a study of `spec` with no scenario solved yet; add()
  // appends the solved scenarios in the case's order. Throws InputError like the constructor
  // below when the case has no scenario.
  static Study unsolved(CaseSpec spec);

  // Meshes and solves every scenario. progress(stage, fraction in [0, 1]); cancel may be null.
  // Throws InputError, MeshError, SolverError, Cancelled (out of memory: as ScenarioSolution).
  // Meshes scenario k + 1 on a second thread while k is solved, or on this thread when no thread
  // can be started.
  Study(CaseSpec spec, const ProgressCallback& progress = {},
        const std::atomic<bool>* cancel = nullptr);
  const CaseSpec& spec() const { return spec_; }
  const std::vector<std::unique_ptr<ScenarioSolution>>& solutions() const { return solutions_; }
  // Index of the healthy reference (least bone loss among the case's scenarios), used for the
  // equivalent force. -1 while that scenario is not solved yet (a study built level by level).
  int healthy_index() const;
  // One result per solved scenario; without the healthy reference (not solved yet) the
  // equivalent forces are -1.
  std::vector<ScenarioResult> evaluate(const LoadSpec& load) const;

  // Level by level: appends the solution of scenario solutions().size() of spec() (the next one
  // in the case's order, e.g. from StudySolver::solve_next). Throws Error for a null solution or
  // one of another scenario, InputError when every scenario is already there.
  void add(std::unique_ptr<ScenarioSolution> solution);
  // True when every scenario of the case is solved (always for the constructor above).
  bool complete() const { return solutions_.size() == spec_.scenarios.size(); }

 private:
  struct UnsolvedTag {};
  Study(UnsolvedTag, CaseSpec spec);
  CaseSpec spec_;
  std::vector<std::unique_ptr<ScenarioSolution>> solutions_;
};

// Solves the scenarios of a case one at a time, in the case's order, so that each can be used as
// soon as it is solved (the app shows the healthy level while the others are solved). The same
// work as Study's constructor, which uses it: while one scenario is solved, the next one is meshed
// on a second thread (or on the calling thread when no thread can be started), so the results are
// those of the all-at-once solve. Not thread-safe: one thread calls solve_next.
class StudySolver {
 public:
  // Throws InputError when the case has no scenario. Nothing is meshed before solve_next.
  explicit StudySolver(CaseSpec spec, const std::atomic<bool>* cancel = nullptr);
  // Waits for a mesher started ahead (a few seconds at most).
  ~StudySolver();
  StudySolver(const StudySolver&) = delete;
  StudySolver& operator=(const StudySolver&) = delete;

  const CaseSpec& spec() const { return spec_; }
  int scenario_count() const { return static_cast<int>(spec_.scenarios.size()); }
  int solved_count() const { return next_; }  // the index solve_next solves
  bool done() const { return next_ >= scenario_count(); }
  // Meshes (or takes the model meshed ahead) and solves the next scenario. progress(stage,
  // fraction): the stage prefixed "scenario k/n (name): " and the share of the whole case, as
  // Study's constructor reports it ("done", 1.0 after the last scenario). Throws InputError when
  // done(), and otherwise as Study's constructor (Cancelled when *cancel becomes true). After a
  // throw the same scenario is next: calling again (e.g. with *cancel reset) solves it anew.
  std::unique_ptr<ScenarioSolution> solve_next(const ProgressCallback& progress = {});

 private:
  struct Ahead;
  CaseSpec spec_;
  const std::atomic<bool>* cancel_;
  int next_ = 0;
  std::unique_ptr<Ahead> ahead_;  // the mesher of scenario next_, once started
};

// The caution every output carries.
const std::string& caution_text();

// The flag every output shows beside a scenario whose ligament strain leaves the linear range
// (ScenarioResult::beyond_linear_range): "Beyond the linear range: ... pressures indicative only."
// with the strain reached and the volume share; empty when the scenario is within the range.
std::string beyond_linear_range_text(const ScenarioResult& result);

}  // namespace sharpey::analysis
