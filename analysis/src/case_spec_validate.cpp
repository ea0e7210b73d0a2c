// Range checks of a CaseSpec, keys named by their case-file path. The geometry of every scenario
// goes through mesh::validate as well, its keys translated to case-file paths.
#include <cmath>
#include <cstdio>
#include <set>
#include <sstream>
#include <string>

#include "case_spec_keys.h"
#include "sharpey/analysis/case_spec.h"
#include "sharpey/core/constants.h"
#include "sharpey/error.h"

namespace sharpey::analysis {

namespace {

// Plausibility bounds (not clinical advice): they catch unit mistakes such as newtons typed as
// grams-force or kPa typed as MPa.
constexpr double kMaxForceN = 2000 * sharpey::core::kNewtonsPerGramForce;  // 2000 g
constexpr double kMaxMomentNmm = 200.0;                                    // about 20000 g.mm
constexpr double kMaxRatioMm = 30.0;
constexpr double kMaxThresholdKpa = 1000.0;
constexpr int kMaxScenarios = 12;

std::string num(double v) {
  std::ostringstream s;
  s << v;
  return s.str();
}

[[noreturn]] void out_of_range(const std::string& key, const std::string& value,
                               const std::string& allowed, const std::string& fix) {
  throw InputError(key, key + " = " + value + " is out of range: " + allowed + "; " + fix);
}

// Names, labels and sources are written into comment lines of CSV files, table headings and file
// names: a line break there splits a line (a reader then takes the wrong line for the header), a
// NUL or escape ends up as a raw byte. Refuses C0 controls, DEL and the UTF-8 encoded C1 controls
// (U+0080 to U+009F); `line_breaks_allowed` lets free text (notes) keep line feeds and tabs.
void check_text(const std::string& text, const std::string& key, bool line_breaks_allowed) {
  for (size_t i = 0; i < text.size(); ++i) {
    const unsigned char c = static_cast<unsigned char>(text[i]);
    const bool c1 = c == 0xC2 && i + 1 < text.size() &&
                    static_cast<unsigned char>(text[i + 1]) >= 0x80 &&
                    static_cast<unsigned char>(text[i + 1]) <= 0x9F;
    if (!(c < 0x20 || c == 0x7F || c1)) continue;
    if (line_breaks_allowed && (c == '\n' || c == '\t')) continue;
    const unsigned code = c1 ? static_cast<unsigned char>(text[i + 1]) : c;
    char shown_code[8];
    std::snprintf(shown_code, sizeof shown_code, "U+%04X", code);
    const char* what = c == '\n'   ? " (line feed)"
                       : c == '\r' ? " (carriage return)"
                       : c == '\t' ? " (tab)"
                       : c == 0    ? " (NUL)"
                                   : "";
    throw InputError(
        key, key + " holds the control character " + shown_code + what + " at byte " +
                 std::to_string(i + 1) + "; " +
                 (line_breaks_allowed ? "only line feeds and tabs are allowed here: remove it"
                                      : "it must be one line of printable text: remove it or "
                                        "replace it with a space"));
  }
}

void check_material(const fem::Material& m, const std::string& key, const std::string& typical) {
  const double E = m.young_modulus_mpa;
  if (!(std::isfinite(E) && E > 0 && E <= 1e6))
    out_of_range(key + ".young_modulus_mpa", num(E) + " MPa", "allowed 0 < E <= 1e6 MPa",
                 "give Young's modulus in MPa (" + typical + ")");
  const double nu = m.poisson_ratio;
  if (!(std::isfinite(nu) && nu >= 0 && nu < 0.5))
    out_of_range(key + ".poisson_ratio", num(nu), "allowed 0 <= nu < 0.5",
                 "use at most 0.49 for a nearly incompressible ligament");
}

// The band's own numbers; whether the shifted geometries are valid is checked when the band is
// computed (validate_band in allowance_band.cpp), since a case without a band never builds them.
void check_band(const BandSpec& b) {
  if (!(b.n_samples >= 3 && b.n_samples <= 1000))
    out_of_range("allowance.samples", std::to_string(b.n_samples), "allowed 3 to 1000",
                 "use 24 or more for stable 10th and 90th percentiles (each sample costs one "
                 "solve per scenario)");
  if (!(b.seed >= 0))
    out_of_range("allowance.seed", std::to_string(b.seed), "allowed 0 to 1000000",
                 "give any whole number from 0; the same seed gives the same band");
  if (!(std::isfinite(b.bone_level_error_mm) && b.bone_level_error_mm >= 0 &&
        b.bone_level_error_mm <= 3))
    out_of_range("allowance.bone_level_error_mm", num(b.bone_level_error_mm) + " mm",
                 "allowed 0 to 3 mm",
                 "give the +- reading error of the radiographic bone level (about 0.5 to 1 mm)");
  if (!(std::isfinite(b.root_length_error_mm) && b.root_length_error_mm >= 0 &&
        b.root_length_error_mm <= 5))
    out_of_range("allowance.root_length_error_mm", num(b.root_length_error_mm) + " mm",
                 "allowed 0 to 5 mm",
                 "give the +- uncertainty of the root length (a few mm at most)");
}

void check_threshold(const Threshold& t, const std::string& key) {
  if (!(std::isfinite(t.value_kpa) && t.value_kpa > 0 && t.value_kpa <= kMaxThresholdKpa))
    out_of_range(key + ".value_kpa", num(t.value_kpa) + " kPa",
                 "allowed 0 < value <= " + num(kMaxThresholdKpa) + " kPa",
                 "give the pressure in kPa (1 kPa = 7.5 mmHg)");
  check_text(t.source, key + ".source", false);
  if (t.source.empty())
    throw InputError(key + ".source", key +
                                          ".source is empty; say where the threshold comes from "
                                          "(a citation, or \"own choice\")");
}

void check_load(const CaseSpec& spec) {
  const LoadSpec& load = spec.load;
  const double force_n = load.force_n();
  if (!(std::isfinite(load.magnitude) && load.magnitude > 0 && force_n <= kMaxForceN + 1e-12))
    out_of_range("load.magnitude", num(load.magnitude) + " " + to_string(load.unit),
                 "allowed above 0 and up to " + num(from_newton(kMaxForceN, load.unit)) + " " +
                     to_string(load.unit) +
                     (load.unit == ForceUnit::kGram ? std::string() : std::string(" (2000 g)")),
                 "check the magnitude and load.unit (\"g\", \"cN\" or \"N\"); orthodontic forces "
                 "are usually 10 to 150 g");
  const double norm = load.direction.norm();
  if (!(std::isfinite(norm) && std::abs(norm - 1.0) < 1e-9)) {
    std::ostringstream v;
    v << "[" << load.direction.x() << ", " << load.direction.y() << ", " << load.direction.z()
      << "]";
    out_of_range("load.direction", v.str(), "a unit vector is required",
                 "normalise the direction (the case file does this for you)");
  }
  if (load.bracket_height_mm >= 0) {
    const bool anatomical = spec.model.tooth.ideal_root == mesh::IdealRoot::kNone;
    const double top = anatomical ? spec.model.tooth.dimensions.crown_length_mm : 30.0;
    if (!(load.bracket_height_mm <= top))
      out_of_range("load.application_height_mm", num(load.bracket_height_mm) + " mm",
                   "allowed 0 to " + num(top) + " mm above the CEJ" +
                       (anatomical ? " (the crown length)" : ""),
                   "give a height on the crown, or leave the key out to use the bracket centre");
  }
  if (!std::isfinite(load.bracket_height_mm))
    out_of_range("load.application_height_mm", num(load.bracket_height_mm), "must be finite",
                 "give a height in mm above the CEJ");
  if (load.couple == CoupleKind::kMoment) {
    const double m = load.moment_nmm.norm();
    if (!(std::isfinite(m) && m <= kMaxMomentNmm))
      out_of_range("load.couple.moment", num(m) + " N.mm",
                   "allowed up to " + num(kMaxMomentNmm) + " N.mm (about 20000 g.mm)",
                   "check the moment and load.couple.unit (\"N.mm\", \"cN.mm\" or \"g.mm\")");
  }
  if (load.couple == CoupleKind::kRatio) {
    const double r = load.moment_to_force_mm;
    if (!(std::isfinite(r) && std::abs(r) <= kMaxRatioMm))
      out_of_range("load.couple.moment_to_force_mm", num(r) + " mm",
                   "allowed -" + num(kMaxRatioMm) + " to " + num(kMaxRatioMm) + " mm",
                   "clinical ratios are 0 to about 15 mm (10 mm is about translation at an "
                   "incisor bracket)");
  }
  if (load.couple != CoupleKind::kNone && load.preset != MovementPreset::kNone)
    throw InputError("load.movement",
                     "load.movement = \"" + to_string(load.preset) +
                         "\" sets the couple from the centre of resistance, but load.couple is "
                         "given too; remove one of them");
}

void check_scenarios(const CaseSpec& spec) {
  const int n = static_cast<int>(spec.scenarios.size());
  if (n < 1 || n > kMaxScenarios)
    out_of_range("scenarios", std::to_string(n) + " scenarios",
                 "allowed 1 to " + std::to_string(kMaxScenarios),
                 "give between 1 and " + std::to_string(kMaxScenarios) + " bone-level scenarios");
  std::set<std::string> names;
  for (int i = 0; i < n; ++i) {
    const Scenario& s = spec.scenarios[static_cast<size_t>(i)];
    const std::string key = "scenarios[" + std::to_string(i) + "]";
    if (s.name.empty())
      throw InputError(key + ".name", key +
                                          ".name is empty; give the scenario a short name such "
                                          "as \"4 mm loss\" (or leave the key out)");
    check_text(s.name, key + ".name", false);
    if (s.name.size() > 80)
      out_of_range(key + ".name", "\"" + s.name.substr(0, 20) + "...\"", "at most 80 characters",
                   "shorten the name");
    if (!names.insert(s.name).second)
      throw InputError(key + ".name", key + ".name = \"" + s.name +
                                          "\" is used by an earlier scenario; names must be "
                                          "unique (they name the output files)");
    if (!(std::isfinite(s.loss.horizontal_mm) && s.loss.horizontal_mm >= 0))
      out_of_range(key + ".horizontal_loss_mm", num(s.loss.horizontal_mm) + " mm",
                   "allowed >= 0 mm", "give the crest's drop below the healthy crest, 0 for none");
    if (s.horizontal_loss_percent != -1 &&
        !(s.horizontal_loss_percent >= 0 && s.horizontal_loss_percent < 100))
      out_of_range(key + ".horizontal_loss_percent", num(s.horizontal_loss_percent) + " %",
                   "allowed 0 to below 100 %", "give a percentage of the root length");
    if (!(std::isfinite(s.loss.defect_depth_mm) && s.loss.defect_depth_mm >= 0))
      out_of_range(key + ".angular_defect.depth_mm", num(s.loss.defect_depth_mm) + " mm",
                   "allowed >= 0 mm", "give the defect depth below the (lowered) crest");
  }
}

// The largest horizontal_loss_percent (to 0.1 %) mesh::validate accepts for `model`, found by
// bisection on the check itself so the answer follows whatever limit the mesher sets.
double max_loss_percent(mesh::ModelSpec model) {
  const double root_mm = root_length_mm(model.tooth);
  double accepted = 0, refused = 100;
  for (int i = 0; i < 30; ++i) {
    const double mid = 0.5 * (accepted + refused);
    model.loss.horizontal_mm = mid / 100.0 * root_mm;
    try {
      mesh::validate(model);
      accepted = mid;
    } catch (const InputError& e) {
      (e.key() == "loss.horizontal_mm" ? refused : accepted) = mid;
    }
  }
  return std::floor(accepted * 10) / 10;
}

void run_mesh_validate(const CaseSpec& spec, const mesh::ModelSpec& model, int scenario) {
  try {
    mesh::validate(model);
  } catch (const InputError& e) {
    const std::string path = case_keys::model_key_to_path(e.key(), spec, scenario);
    std::string message = e.what();
    const Scenario* s = scenario >= 0 ? &spec.scenarios[static_cast<size_t>(scenario)] : nullptr;
    if (s && s->horizontal_loss_percent >= 0 && e.key() == "loss.horizontal_mm") {
      // The case gives the loss in percent: answer in percent, not in the mesher's millimetres.
      const double root_mm = root_length_mm(model.tooth);
      const double embedded_mm = root_mm - model.bone.crest_below_cej_mm - model.loss.horizontal_mm;
      message = num(s->horizontal_loss_percent) + " % bone loss (" + num(model.loss.horizontal_mm) +
                " mm of the " + num(root_mm) + " mm root) " +
                (embedded_mm > 0 ? "leaves only " + num(embedded_mm) +
                                       " mm of root in the bone, too little for the model"
                                 : std::string("leaves no root in the bone")) +
                "; use at most " + num(max_loss_percent(model)) + " %";
    }
    if (s) message = "scenario \"" + s->name + "\": " + message;
    throw InputError(path, path + ": " + message);
  }
}

}  // namespace

namespace case_keys {

std::string model_key_to_path(const std::string& key, const CaseSpec& spec, int scenario) {
  const std::string prefix =
      scenario >= 0 ? "scenarios[" + std::to_string(scenario) + "]." : std::string();
  auto starts = [&key](const std::string& p) { return key.rfind(p, 0) == 0; };
  auto tail = [&key](const std::string& p) { return key.substr(p.size()); };
  const bool uniform_pdl = spec.model.pdl.crest_width_mm == spec.model.pdl.mid_width_mm &&
                           spec.model.pdl.mid_width_mm == spec.model.pdl.apex_width_mm;
  const bool percent =
      scenario >= 0 && spec.scenarios[static_cast<size_t>(scenario)].horizontal_loss_percent >= 0;

  std::string k = key;
  if (starts("spec.")) k = tail("spec.");
  auto is = [&k](const std::string& a) { return k == a; };

  if (is("loss.horizontal_mm") || is("horizontal_mm"))
    return prefix + (percent ? "horizontal_loss_percent" : "horizontal_loss_mm");
  if (is("loss.defect_depth_mm") || is("defect_depth_mm"))
    return prefix + "angular_defect.depth_mm";
  if (is("loss.defect_width_deg") || is("defect_width_deg"))
    return prefix + "angular_defect.width_deg";
  if (is("loss.defect_surface") || is("defect_surface")) return prefix + "angular_defect.surface";
  if (k.rfind("loss.", 0) == 0 || k.rfind("loss", 0) == 0) return prefix + "angular_defect";

  if (is("tooth.ideal_radius_mm") || is("ideal_radius_mm"))
    return "tooth.idealised_root.radius_at_crest_mm";
  if (is("tooth.ideal_length_mm") || is("ideal_length_mm"))
    return "tooth.idealised_root.root_length_mm";
  for (const auto& d : kDimensionKeys) {
    const std::string name = d.key;
    if (is(name) || is("tooth.dimensions." + name) || is("dimensions." + name) ||
        is("tooth." + name))
      return "tooth.dimensions." + name;
  }
  const std::pair<const char*, const char*> pdl[] = {
      {"crest_width_mm", "crest"}, {"mid_width_mm", "mid_root"}, {"apex_width_mm", "apex"}};
  for (const auto& [field, name] : pdl)
    if (is(field) || is(std::string("pdl.") + field))
      return uniform_pdl ? std::string("pdl.width_mm")
                         : std::string("pdl.width_profile_mm.") + name;
  for (const auto& b : kBoneKeys)
    if (is(b.key) || is(std::string("bone.") + b.key)) return std::string("bone.") + b.key;
  const char* bracket[] = {"height_mm", "width_mm", "length_mm"};
  for (const char* b : bracket)
    if (is(std::string("bracket.") + b) || is(std::string("bracket_") + b))
      return std::string("bracket.") + b;
  if (is("sizing.second_order") || is("second_order")) return "mesh.quadratic";
  const char* sizing[] = {"pdl_edge_mm", "bone_edge_mm", "pdl_layers", "preset"};
  for (const char* s : sizing)
    if (is(std::string("sizing.") + s) || is(s)) return std::string("mesh.") + s;
  return key;
}

}  // namespace case_keys

void validate_load(const CaseSpec& spec) { check_load(spec); }

void validate_case(const CaseSpec& spec) {
  if (spec.schema_version != kCaseSchemaVersion)
    out_of_range("schema_version", std::to_string(spec.schema_version),
                 "this program reads version " + std::to_string(kCaseSchemaVersion),
                 "write the case with the current schema");
  check_text(spec.label, "label", false);
  check_text(spec.notes, "notes", true);
  check_material(spec.tooth_material, "tooth.material", "dentin about 18600 MPa");
  check_material(spec.pdl_material, "pdl.material", "the PDL is usually 0.05 to 0.7 MPa");
  check_material(spec.cortical_material, "bone.cortical_material", "cortical bone about 13700 MPa");
  check_material(spec.cancellous_material, "bone.cancellous_material",
                 "cancellous bone about 1370 MPa");
  check_threshold(spec.thresholds.capillary, "thresholds.capillary");
  check_threshold(spec.thresholds.limit, "thresholds.limit");
  if (!(spec.thresholds.capillary.value_kpa < spec.thresholds.limit.value_kpa))
    out_of_range(
        "thresholds.limit.value_kpa", num(spec.thresholds.limit.value_kpa) + " kPa",
        "must exceed the capillary threshold " + num(spec.thresholds.capillary.value_kpa) + " kPa",
        "the physiological limit (default 16 kPa) lies above capillary pressure "
        "(default 4.7 kPa)");
  check_band(spec.band);
  // Mesh sizes, tooth dimensions, PDL widths, bone and bracket: mesh::validate below.
  check_scenarios(spec);
  check_load(spec);

  // Geometry: the healthy model first (errors in shared parameters keep their own key), then
  // every scenario's bone loss.
  mesh::ModelSpec healthy = spec.model;
  healthy.loss = mesh::BoneLoss{};
  run_mesh_validate(spec, healthy, -1);
  for (int i = 0; i < static_cast<int>(spec.scenarios.size()); ++i)
    run_mesh_validate(spec, scenario_model(spec, i), i);
}

}  // namespace sharpey::analysis
