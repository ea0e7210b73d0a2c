// The open case and its results: what the window shows and edits, without any widget.
//
// Holds the CaseSpec, its file state, the force-system panel state, the bone-level list and the
// solved Study (shared, immutable). Load and threshold edits re-evaluate at once by superposition
// (no new solve); while a slider is dragged only the scenario on display is evaluated and the
// others follow shortly after (flush). Geometry edits mark the results stale until the next solve.
// QtCore only, so it is tested without a display.
#pragma once

#include <QObject>
#include <QString>
#include <QTimer>
#include <memory>
#include <optional>
#include <vector>

#include "core/document_state.h"
#include "core/load_controls.h"
#include "core/quantity.h"
#include "core/scenario_list.h"
#include "sharpey/analysis/study.h"

namespace sharpey::app {

// The materials the case panel edits (the tooth's stays as the case file gives it).
enum class MaterialPart { kPdl, kCorticalBone, kCancellousBone };
QString label(MaterialPart part);         // "PDL", "cortical bone", "cancellous bone"
std::string case_key(MaterialPart part);  // "pdl.material", "bone.cortical_material", ...

class CaseSession : public QObject {
  Q_OBJECT

 public:
  explicit CaseSession(QObject* parent = nullptr);

  // ---- the case and its file ----
  const analysis::CaseSpec& spec() const { return spec_; }
  const DocumentState& document() const { return document_; }
  // A new invented case: maxillary central incisor, healthy and 3 mm loss, 100 g lingual.
  void new_case();
  // Reads a case file (analysis::load_case). Throws InputError with the library's message; the
  // open case is unchanged then. `mesh_override` replaces the file's mesh preset (a quick look
  // with a coarser mesh); saving then writes the overridden preset.
  void open(const QString& path, std::optional<mesh::MeshPreset> mesh_override = std::nullopt);
  // Takes a case built in the app (the surface import): untitled and modified, so it is saved
  // under a name the user chooses.
  void take_new(const analysis::CaseSpec& spec);
  // Takes a case recovered from an autosave copy: modified, belonging to `original_path`.
  void recover(const analysis::CaseSpec& spec, const QString& original_path);
  // Writes the case (analysis::save_case, atomic). Throws Error naming the path.
  void save(const QString& path);
  // The case as JSON (analysis::case_to_json), for autosave.
  QString case_json() const;

  // ---- edits ----
  const LoadControls& load_controls() const { return load_; }
  // interactive: a slider is moving; only the scenario on display is evaluated now.
  // A force system the case-file rules or the evaluation refuse (e.g. a zero force) changes
  // nothing: load_controls(), the case and the results stay as they were, load_refused() says why
  // (evaluation_error() keeps the message until the next accepted load).
  void set_load(const LoadControls& controls, bool interactive = false);
  void set_thresholds(double capillary_kpa, double limit_kpa);
  void set_label(const QString& label);
  void set_tooth(mesh::ToothType type);  // handbook dimensions of that tooth
  void set_mesh_preset(mesh::MeshPreset preset);
  void set_pdl_width(double width_mm);  // uniform width
  // Material edits and angular defects change the model: the results go stale until the next
  // solve. Both check the whole case first (analysis::validate_case) and throw InputError with the
  // library's message, naming the case-file key, the value and the allowed range; the case is
  // unchanged then.
  const fem::Material& material(MaterialPart part) const;
  void set_material(MaterialPart part, const fem::Material& material);
  // Angular defect of bone level `level` (index into levels()): depth below the level's lowered
  // crest in mm (0 = none), the surface it is centred on and its width around the root in degrees.
  void set_defect(int level, double depth_mm, mesh::ToothSurface surface, double width_deg);
  const ScenarioList& levels() const { return levels_; }
  // Replaces the bone-level list (names and losses); the comparison choice is kept when possible.
  // Checks the case with the new levels first (analysis::validate_case, the rules of a case file,
  // e.g. a loss the root cannot take) and throws InputError naming the level's key; the levels
  // are unchanged then.
  void set_levels(const ScenarioList& levels);
  // Comparison choice only: no geometry change.
  bool set_compared(int level, bool on);
  // True when the case geometry differs from the solved study (or nothing is solved yet).
  bool geometry_stale() const { return stale_; }
  // Counts geometry edits and case replacements (new, open, recover).
  int geometry_version() const { return geometry_version_; }

  // ---- results ----
  // Takes a study solved from this case's geometry (from SolveJob) and evaluates it. The study may
  // hold only the levels solved so far (SolveJob::study()); call again with it each time it grows:
  // results() then has one entry per solved level, and equivalent forces stay -1 until the
  // healthy level is solved.
  // `solved_geometry`: geometry_version() when the solve started; when the geometry was edited
  // since, the results are shown but marked stale.
  void set_study(std::shared_ptr<const analysis::Study> study,
                 std::optional<int> solved_geometry = std::nullopt);
  const analysis::Study* study() const { return study_.get(); }
  // The same study, shared (for work that outlives a call, e.g. the allowances' worker).
  std::shared_ptr<const analysis::Study> shared_study() const { return study_; }
  const std::vector<analysis::ScenarioResult>& results() const { return results_; }
  int current() const { return current_; }
  void set_current(int index);  // index into results()
  const analysis::ScenarioResult* current_result() const;
  const analysis::ScenarioSolution* current_solution() const;
  const analysis::ScenarioSolution* solution(int index) const;
  // True while some results still reflect an older load (after interactive edits).
  bool has_pending() const { return pending_; }
  // True while the scenario on display was evaluated interactively without its healthy reference
  // (that would evaluate the healthy scenario too): its equivalent forces are -1 until flush().
  bool reference_pending() const { return reference_pending_; }
  // The quantity the views show: while a slider moves only that field is evaluated (with the
  // pressure, which the verdict and the key numbers need, and the strain maxima and linear-range
  // figures, which the flag beside the verdict needs); the other fields and their maxima follow
  // when the slider stops (flush, or the next non-interactive change).
  void set_shown_quantity(Quantity q) { shown_quantity_ = q; }
  // True while the current result was evaluated interactively with only the shown field.
  bool fields_pending() const { return fields_pending_; }
  // Evaluates the scenarios left behind by interactive edits.
  void flush();
  // Last evaluation error (empty when the last evaluation succeeded).
  const QString& evaluation_error() const { return error_; }
  // Time the last evaluation by superposition took, ms (for the benchmark and the status bar).
  double last_evaluation_ms() const { return last_evaluation_ms_; }

 signals:
  void case_replaced();     // new, open or recover: everything changed
  void document_changed();  // title or modified flag
  void geometry_changed();  // results are stale
  void results_changed(bool interactive);
  void current_changed(int index);
  void evaluation_failed(const QString& message);
  // set_load refused a force system; load_controls() is the one still shown.
  void load_refused(const QString& message);

 private:
  void adopt(analysis::CaseSpec spec);
  void modified();
  void geometry_edit();
  // keep: the first `keep` results are current (a grown study); only the others are evaluated.
  // False (and evaluation_failed) when the library refused the load; the results then stay.
  bool evaluate(bool interactive, size_t keep = 0);
  analysis::CaseSpec spec_with_load() const;

  analysis::CaseSpec spec_;
  DocumentState document_;
  LoadControls load_;
  ScenarioList levels_;
  bool stale_ = true;
  int geometry_version_ = 0;
  std::shared_ptr<const analysis::Study> study_;
  std::vector<analysis::ScenarioResult> results_;
  int current_ = 0;
  bool pending_ = false;
  bool reference_pending_ = false;
  bool fields_pending_ = false;
  Quantity shown_quantity_ = Quantity::kPressure;
  QString error_;
  QTimer flush_timer_;
  double last_evaluation_ms_ = 0;
};

}  // namespace sharpey::app
