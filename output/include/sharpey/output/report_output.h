// Report files of a solved case: results.json, summary.csv, the plain-text summary, root-map CSV,
// sweep CSV and the .vtu fields, plus the staged output folder (atomic file writing is
// sharpey/analysis/write_file_atomic.h, included here). Shared by the batch command and the
// desktop app's export. Every output carries analysis::caution_text(). Never prints.
#pragma once

#include <string>
#include <vector>

#include "sharpey/analysis/case_spec.h"
#include "sharpey/analysis/study.h"
#include "sharpey/analysis/write_file_atomic.h"
#include "sharpey/error.h"
#include "sharpey/fem/elasticity.h"
#include "sharpey/mesh/mesh_statistics.h"

namespace sharpey::analysis {

// A report file could not be written (sharpey/error.h); also known by its former name here.
using sharpey::OutputError;

// An output folder filled all at once. Files are written into a staging folder beside `folder`
// (".<name>.partial-<pid>" in the same parent, so renames stay on one file system); commit() then
// renames the staging folder to `folder` when it does not exist yet, or swaps the two folders in
// one step (renameat2 RENAME_EXCHANGE) and removes the old one. `folder` therefore always holds
// one complete run: the earlier one or the new one, never a mix, even if the process is killed.
// An existing `folder` is only replaced when it holds nothing but regular .json, .csv, .txt and
// .vtu files (an earlier run); anything else is an OutputError, checked by the constructor and
// again by commit(). Destroying an uncommitted StagedFolder removes the staging folder. Staging
// folders left by killed runs (their process gone) are removed by the next StagedFolder for the
// same folder. Throws OutputError. Testing aid: SHARPEY_TEST_KILL_OUTPUT_AT=before-swap or
// after-swap makes commit() kill its own process with SIGKILL at that point.
class StagedFolder {
 public:
  explicit StagedFolder(const std::string& folder);
  ~StagedFolder();
  StagedFolder(const StagedFolder&) = delete;
  StagedFolder& operator=(const StagedFolder&) = delete;

  // Path in the staging folder for `file_name` (a plain name, no folders).
  std::string path(const std::string& file_name) const;
  const std::string& staging_folder() const { return staging_; }
  void commit();

 private:
  std::string folder_, staging_;
  bool committed_ = false;
};

// Version of the results.json layout (its fixed key names are documented in docs/case-format.md).
constexpr int kResultsSchemaVersion = 1;

// Facts about one solved scenario beyond its ScenarioResult (all optional: an empty
// MeshStatistics (n_elements == 0) or SolverStatistics (n_dofs == 0) is left out of the report).
struct ScenarioFacts {
  mesh::ModelGeometry geometry;
  mesh::MeshStatistics mesh;
  fem::SolverStatistics solver;
  std::string model_vtu, pdl_vtu, root_map_csv;  // file names written beside results.json
};
// Geometry and solver statistics of every scenario of `study`; mesh statistics too when
// `measure_mesh` (mesh::measure: a fraction of a second per scenario).
std::vector<ScenarioFacts> scenario_facts(const Study& study, bool measure_mesh);

// Which centre of resistance describes a load: the mesiodistal one when the force's mesiodistal
// component exceeds its labiolingual one, else the labiolingual one.
enum class CresDirection { kLabiolingual, kMesiodistal };
CresDirection cres_direction_for(const ResolvedLoad& load);
const CentreOfResistance& cres_for(const ScenarioResult& result);

// results.json: top-level `units`, `sources`, `caution`, `thresholds`, `case` (echo of the case
// file), `scenarios` (one object per scenario with the fixed keys bone_loss_mm,
// attachment_area_mm2, cres_from_crest_mm, cres_fraction_embedded, mf_translation_mm,
// pdl_pressure_kpa {max_compression, max_tension, p95_compression}, area_above_capillary_mm2,
// area_above_limit_mm2, max_principal_strain, crown_tip_displacement_um, equivalent_force_g, and
// more). `facts` may be empty or hold one entry per result.
// With `allowance` (sharpey/output/allowance_output.h), a top-level "allowance" object after
// "thresholds" (allowance_json()); the other keys are unchanged.
struct AllowanceReport;
std::string results_json(const CaseSpec& spec, const std::vector<ScenarioResult>& results,
                         const std::vector<ScenarioFacts>& facts,
                         const AllowanceReport* allowance = nullptr);

// mesh_statistics.json of the batch `mesh` command: per scenario its name, geometry and mesh
// statistics, with the caution.
std::string mesh_statistics_json(const CaseSpec& spec, const std::vector<ScenarioFacts>& facts);

// summary.csv: a `# caution` comment line, then a header and one row per scenario.
std::string summary_csv(const CaseSpec& spec, const std::vector<ScenarioResult>& results);

// summary.txt: the case, the force system, the thresholds with their sources, a table of the key
// numbers per scenario with a plain reading against the thresholds, and the caution.
// With `allowance`, the force-allowance paragraph (allowance_summary_text()) closes the file.
std::string summary_text(const CaseSpec& spec, const std::vector<ScenarioResult>& results,
                         const AllowanceReport* allowance = nullptr);

// Root map of one scenario as CSV: comment lines (caution, meaning, units), then a header row of
// cell-centre angles (deg around the root, 0 labial, 90 mesial) and one row per depth below the CEJ
// (mm, cell centre) of PDL hydrostatic pressure in kPa (compression positive); empty = no PDL.
std::string root_map_csv(const CaseSpec& spec, const ScenarioResult& result);

// Full-factorial sweep table: one row per (combination, scenario).
class SweepTable {
 public:
  // `varied_keys`: the case-file paths being varied, one column each.
  explicit SweepTable(std::vector<std::string> varied_keys);
  void add(int combination, const std::vector<std::string>& values, const ScenarioResult& result);
  std::string csv() const;  // `# caution` line, header, rows
  // The rows alone, each ending in '\n': what csv() puts after the header. For tables filled in
  // parts (a distributed or resumed sweep): add_rows_text() appends such text from another table
  // with the same keys, so csv() is the same as if every row had been added here.
  std::string rows_text() const;
  void add_rows_text(const std::string& rows);
  int n_rows() const { return static_cast<int>(rows_.size()); }

 private:
  std::vector<std::string> keys_;
  std::vector<std::string> rows_;
};

// File stem of scenario `index` (0-based): "s<index+1>_<name with unsafe characters replaced>".
std::string scenario_file_stem(int index, const std::string& name);

// Writes the full model (cell array `region`, point array `displacement_mm`) to `model_path` and
// the PDL region (point arrays `hydrostatic_pressure_kpa`, `max_principal_strain`,
// `displacement_mm`, `von_mises_kpa`) to `pdl_path`, each atomically.
void write_scenario_vtu(const ScenarioSolution& solution, const ScenarioResult& result,
                        const std::string& model_path, const std::string& pdl_path);

// CSV helpers (exposed for tests): a number with 6 significant digits ("" for NaN), and a field
// quoted as RFC 4180 says when it holds a comma, quote or line break (quotes doubled), or starts
// with '#' (our comment lines).
std::string csv_number(double value);
std::string csv_field(const std::string& text);

}  // namespace sharpey::analysis
