#include "core/case_session.h"

#include <QElapsedTimer>
#include <algorithm>

#include "core/surface_import.h"
#include "sharpey/analysis/field_choice.h"
#include "sharpey/error.h"

namespace sharpey::app {

QString label(MaterialPart part) {
  switch (part) {
    case MaterialPart::kPdl:
      return QStringLiteral("PDL");
    case MaterialPart::kCorticalBone:
      return QStringLiteral("cortical bone");
    case MaterialPart::kCancellousBone:
      return QStringLiteral("cancellous bone");
  }
  return {};
}

std::string case_key(MaterialPart part) {
  switch (part) {
    case MaterialPart::kPdl:
      return "pdl.material";
    case MaterialPart::kCorticalBone:
      return "bone.cortical_material";
    case MaterialPart::kCancellousBone:
      return "bone.cancellous_material";
  }
  return {};
}

namespace {

// Works for const and non-const specs alike.
template <typename Spec>
auto& material_of(Spec& spec, MaterialPart part) {
  switch (part) {
    case MaterialPart::kPdl:
      return spec.pdl_material;
    case MaterialPart::kCorticalBone:
      return spec.cortical_material;
    case MaterialPart::kCancellousBone:
      break;
  }
  return spec.cancellous_material;
}

}  // namespace

CaseSession::CaseSession(QObject* parent) : QObject(parent) {
  flush_timer_.setSingleShot(true);
  flush_timer_.setInterval(250);
  connect(&flush_timer_, &QTimer::timeout, this, &CaseSession::flush);
  new_case();
}

void CaseSession::new_case() {
  adopt(default_new_case());
  document_.reset_untitled();
  emit document_changed();
}

void CaseSession::take_new(const analysis::CaseSpec& spec) {
  adopt(spec);
  document_.reset_untitled();
  document_.mark_modified();
  emit document_changed();
}

void CaseSession::open(const QString& path, std::optional<mesh::MeshPreset> mesh_override) {
  analysis::CaseSpec spec = analysis::load_case(path.toStdString());  // throws before any change
  if (mesh_override) spec.model.sizing.preset = *mesh_override;
  adopt(std::move(spec));
  document_.opened(path);
  emit document_changed();
}

void CaseSession::recover(const analysis::CaseSpec& spec, const QString& original_path) {
  adopt(spec);
  document_.recovered(original_path);
  emit document_changed();
}

void CaseSession::save(const QString& path) {
  analysis::save_case(spec_with_load(), path.toStdString());
  document_.saved(path);
  emit document_changed();
}

QString CaseSession::case_json() const {
  return QString::fromStdString(analysis::case_to_json(spec_with_load()));
}

analysis::CaseSpec CaseSession::spec_with_load() const {
  analysis::CaseSpec spec = spec_;
  spec.scenarios = levels_.scenarios();
  return spec;
}

void CaseSession::adopt(analysis::CaseSpec spec) {
  spec_ = std::move(spec);
  load_ = from_load_spec(spec_.load);
  levels_ = ScenarioList(spec_.scenarios);
  study_.reset();
  results_.clear();
  current_ = 0;
  pending_ = false;
  reference_pending_ = false;
  fields_pending_ = false;
  stale_ = true;
  ++geometry_version_;
  error_.clear();
  flush_timer_.stop();
  emit case_replaced();
}

void CaseSession::modified() {
  const bool was = document_.modified();
  document_.mark_modified();
  if (!was) emit document_changed();
}

void CaseSession::geometry_edit() {
  modified();
  stale_ = true;
  ++geometry_version_;
  emit geometry_changed();
}

void CaseSession::set_load(const LoadControls& controls, bool interactive) {
  // A refused force system (e.g. a zero force) leaves the load, the case and the results as they
  // were, so the controls can be put back and never disagree with what is shown.
  const LoadControls previous_controls = load_;
  const analysis::LoadSpec previous_spec = spec_.load;
  load_ = controls;
  spec_.load = to_load_spec(controls);
  // The case file names the direction ("lingual") when it is one of the named ones.
  spec_.load.direction_name = controls.direction == DirectionChoice::kAngles
                                  ? std::string()
                                  : label(controls.direction).toStdString();
  QString refused;
  try {
    // The case-file rules for the load, also before any solve. Only the load's own rules decide
    // here (other keys are checked where they are edited), and checking the whole case (every
    // bone level's geometry) would cost a slider drag several ms per value.
    analysis::validate_load(spec_with_load());
  } catch (const InputError& e) {
    refused = QString::fromStdString(e.what());
  }
  if (refused.isEmpty() && evaluate(interactive)) {
    modified();
    return;
  }
  if (refused.isEmpty()) refused = error_;
  load_ = previous_controls;
  spec_.load = previous_spec;
  error_ = refused;
  emit load_refused(error_);
}

void CaseSession::set_thresholds(double capillary_kpa, double limit_kpa) {
  if (capillary_kpa == spec_.thresholds.capillary.value_kpa &&
      limit_kpa == spec_.thresholds.limit.value_kpa)
    return;
  spec_.thresholds.capillary.value_kpa = capillary_kpa;
  spec_.thresholds.limit.value_kpa = limit_kpa;
  modified();
  evaluate(false);
}

void CaseSession::set_label(const QString& label) {
  if (label.toStdString() == spec_.label) return;
  spec_.label = label.toStdString();
  modified();
}

void CaseSession::set_tooth(mesh::ToothType type) {
  if (type == spec_.model.tooth.type && spec_.model.tooth.ideal_root == mesh::IdealRoot::kNone &&
      !spec_.model.tooth.scan)
    return;
  spec_.model.tooth.type = type;
  spec_.model.tooth.dimensions = mesh::handbook_dimensions(type);
  spec_.model.tooth.ideal_root = mesh::IdealRoot::kNone;
  // Choosing a tooth from the list means its handbook surface: a scanned surface is dropped.
  spec_.model.tooth.scan.reset();
  spec_.surface = analysis::ToothSurfaceSource{};
  geometry_edit();
}

void CaseSession::set_mesh_preset(mesh::MeshPreset preset) {
  if (preset == spec_.model.sizing.preset) return;
  spec_.model.sizing.preset = preset;
  geometry_edit();
}

void CaseSession::set_pdl_width(double width_mm) {
  mesh::PdlSpec& p = spec_.model.pdl;
  if (p.crest_width_mm == width_mm && p.mid_width_mm == width_mm && p.apex_width_mm == width_mm)
    return;
  p.crest_width_mm = p.mid_width_mm = p.apex_width_mm = width_mm;
  geometry_edit();
}

const fem::Material& CaseSession::material(MaterialPart part) const {
  return material_of(spec_, part);
}

void CaseSession::set_material(MaterialPart part, const fem::Material& m) {
  const fem::Material& old = material(part);
  if (old.young_modulus_mpa == m.young_modulus_mpa && old.poisson_ratio == m.poisson_ratio) return;
  analysis::CaseSpec edited = spec_with_load();
  material_of(edited, part) = m;
  analysis::validate_case(edited);  // throws before any change
  material_of(spec_, part) = m;
  geometry_edit();
}

void CaseSession::set_defect(int level, double depth_mm, mesh::ToothSurface surface,
                             double width_deg) {
  if (level < 0 || level >= levels_.size())
    throw InputError("scenarios", "bone level " + std::to_string(level + 1) +
                                      " does not exist; the case has " +
                                      std::to_string(levels_.size()) + " levels");
  mesh::BoneLoss loss = levels_.at(level).loss;
  if (loss.defect_depth_mm == depth_mm && loss.defect_surface == surface &&
      loss.defect_width_deg == width_deg)
    return;
  loss.defect_depth_mm = depth_mm;
  loss.defect_surface = surface;
  loss.defect_width_deg = width_deg;
  ScenarioList edited = levels_;
  edited.set_loss(level, loss);
  analysis::CaseSpec check = spec_with_load();
  check.scenarios = edited.scenarios();
  set_levels(edited);  // throws before any change (depth, width and geometry checks)
}

void CaseSession::set_levels(const ScenarioList& levels) {
  analysis::CaseSpec check = spec_with_load();
  check.scenarios = levels.scenarios();
  analysis::validate_case(check);  // throws before any change: the case-file rules, on entry
  levels_ = levels;
  spec_.scenarios = levels_.scenarios();
  geometry_edit();
}

bool CaseSession::set_compared(int level, bool on) { return levels_.set_compared(level, on); }

void CaseSession::set_study(std::shared_ptr<const analysis::Study> study,
                            std::optional<int> solved_geometry) {
  // The same study grown by some levels (solved one by one): the levels already evaluated under
  // the current load keep their results when their healthy reference was already there.
  size_t keep = 0;
  if (study && study == study_ && !pending_ && error_.isEmpty() &&
      results_.size() < study->solutions().size()) {
    const int h = study->healthy_index();
    if (h >= 0 && static_cast<size_t>(h) < results_.size()) keep = results_.size();
  }
  const bool grown = study && study == study_;
  const int was = current_;
  study_ = std::move(study);
  stale_ = solved_geometry && *solved_geometry != geometry_version_;
  current_ = std::clamp(current_, 0, study_ ? static_cast<int>(study_->solutions().size()) - 1 : 0);
  evaluate(false, keep);
  // A grown study keeps the level on display: results_changed has already said what changed.
  if (!grown || current_ != was) emit current_changed(current_);
}

void CaseSession::set_current(int index) {
  if (!study_ || index < 0 || index >= static_cast<int>(results_.size()) || index == current_)
    return;
  current_ = index;
  // The newly shown scenario must reflect the latest load.
  if (pending_) flush();
  emit current_changed(current_);
}

const analysis::ScenarioResult* CaseSession::current_result() const {
  if (current_ < 0 || current_ >= static_cast<int>(results_.size())) return nullptr;
  return &results_[static_cast<size_t>(current_)];
}

const analysis::ScenarioSolution* CaseSession::solution(int index) const {
  if (!study_ || index < 0 || index >= static_cast<int>(study_->solutions().size())) return nullptr;
  return study_->solutions()[static_cast<size_t>(index)].get();
}

const analysis::ScenarioSolution* CaseSession::current_solution() const {
  return solution(current_);
}

bool CaseSession::evaluate(bool interactive, size_t keep) {
  if (!study_) {
    error_.clear();
    return true;
  }
  const auto& solutions = study_->solutions();
  const int h = study_->healthy_index();
  const analysis::ScenarioSolution* healthy =
      h >= 0 ? solutions[static_cast<size_t>(h)].get() : nullptr;
  QElapsedTimer timer;
  timer.start();
  try {
    if (interactive && results_.size() == solutions.size()) {
      // While a slider moves, a bone level other than the healthy one is evaluated without the
      // healthy reference (which would double the work); the flush adds the equivalent forces.
      const analysis::ScenarioSolution* shown = solutions[static_cast<size_t>(current_)].get();
      const bool skip_reference = healthy != nullptr && healthy != shown;
      // Only the field on display beyond the pressure (issue 12, point 14).
      analysis::FieldChoice fields;
      fields.strains = shown_quantity_ == Quantity::kMaxPrincipalStrain ||
                       shown_quantity_ == Quantity::kEquivalentStrain;
      // Without the strain fields, still their maxima and the linear-range flag: the flag beside
      // the verdict must follow the force shown (exact, a fraction of the fields' cost).
      fields.strain_maxima = true;
      fields.von_mises = shown_quantity_ == Quantity::kVonMises;
      fields.displacement = shown_quantity_ == Quantity::kDisplacement;
      results_[static_cast<size_t>(current_)] = analysis::evaluate(
          *shown, spec_.load, spec_.thresholds, skip_reference ? nullptr : healthy, fields);
      reference_pending_ = skip_reference;
      fields_pending_ = !(fields.strains && fields.von_mises && fields.displacement);
      pending_ = true;  // the fields left out, and the other levels
      if (pending_) flush_timer_.start();
    } else {
      keep = std::min(keep, results_.size());
      std::vector<analysis::ScenarioResult> all(
          results_.begin(), results_.begin() + static_cast<std::ptrdiff_t>(keep));
      for (size_t k = keep; k < solutions.size(); ++k)
        all.push_back(analysis::evaluate(*solutions[k], spec_.load, spec_.thresholds, healthy));
      results_ = std::move(all);
      pending_ = false;
      reference_pending_ = false;
      fields_pending_ = false;
      flush_timer_.stop();
    }
    error_.clear();
    last_evaluation_ms_ = static_cast<double>(timer.nsecsElapsed()) * 1e-6;
  } catch (const Error& e) {
    // An unusable load (e.g. zero force): keep the last results and say why.
    error_ = QString::fromStdString(e.what());
    emit evaluation_failed(error_);
    return false;
  }
  emit results_changed(interactive);
  return true;
}

void CaseSession::flush() {
  if (!pending_) return;
  evaluate(false);
}

}  // namespace sharpey::app
