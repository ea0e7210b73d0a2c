// summary.txt: a plain-text report a clinician can read without other tools.
#include <algorithm>
#include <cmath>
#include <cstdio>
#include <functional>
#include <sstream>

#include "sharpey/analysis/detail/output_text.h"
#include "sharpey/analysis/verdict.h"
#include "sharpey/output/allowance_output.h"
#include "sharpey/output/report_output.h"

namespace sharpey::analysis {

namespace {

using detail::fixed;
using detail::wrap;

std::string spaced(std::string identifier) {
  for (char& c : identifier)
    if (c == '_') c = ' ';
  return identifier;
}

std::string direction_words(const LoadSpec& load) {
  if (!load.direction_name.empty() && named_direction(load.direction_name) == load.direction)
    return load.direction_name;
  std::ostringstream s;
  s << "along [" << fixed(load.direction.x(), 3) << ", " << fixed(load.direction.y(), 3) << ", "
    << fixed(load.direction.z(), 3) << "]";
  return s.str();
}

std::string force_system_words(const CaseSpec& spec) {
  const LoadSpec& load = spec.load;
  std::ostringstream s;
  s << fixed(load.magnitude, 1) << ' ' << to_string(load.unit) << " (" << fixed(load.force_n(), 3)
    << " N) " << direction_words(load);
  if (load.bracket_height_mm >= 0)
    s << ", applied " << fixed(load.bracket_height_mm, 1) << " mm above the CEJ";
  else
    s << ", applied at the bracket centre";
  if (load.preset != MovementPreset::kNone)
    s << "; movement " << spaced(to_string(load.preset))
      << " (couple set from the centre of resistance of each scenario)";
  else if (load.couple == CoupleKind::kRatio)
    s << "; moment-to-force ratio " << fixed(load.moment_to_force_mm, 1) << " mm";
  else if (load.couple == CoupleKind::kMoment)
    s << "; couple [" << fixed(load.moment_nmm.x(), 2) << ", " << fixed(load.moment_nmm.y(), 2)
      << ", " << fixed(load.moment_nmm.z(), 2) << "] N.mm";
  else
    s << "; no couple";
  return s.str();
}

std::string reading(const CaseSpec& spec, const ScenarioResult& r, bool is_reference) {
  const double peak = r.pressure_max_compression_kpa;
  const double capillary = spec.thresholds.capillary.value_kpa;
  const double limit = spec.thresholds.limit.value_kpa;
  const double attachment = r.attachment_area_mm2;
  auto share = [attachment](double area) {
    return attachment > 0 ? fixed(100.0 * area / attachment, 1) + " % of the attachment" : "";
  };
  // The rule is the one of every output (verdict.h).
  const PressureLevel level = pressure_verdict(r, spec.thresholds).level;
  std::ostringstream s;
  s << r.name << ": peak compression " << fixed(peak, 2) << " kPa ";
  if (level == PressureLevel::kAboveLimit)
    s << "is above the physiological limit (" << fixed(limit, 1) << " kPa) over "
      << fixed(r.area_above_limit_mm2, 2) << " mm^2 (" << share(r.area_above_limit_mm2)
      << ") and above capillary pressure over " << fixed(r.area_above_capillary_mm2, 2) << " mm^2 ("
      << share(r.area_above_capillary_mm2) << ").";
  else if (level == PressureLevel::kAboveCapillary)
    s << "is above capillary pressure (" << fixed(capillary, 1) << " kPa) over "
      << fixed(r.area_above_capillary_mm2, 2) << " mm^2 (" << share(r.area_above_capillary_mm2)
      << ") and stays below the physiological limit (" << fixed(limit, 1) << " kPa).";
  else
    s << "stays below capillary pressure (" << fixed(capillary, 1) << " kPa).";
  if (!is_reference && r.equivalent_force_peak_g >= 0)
    s << " The same peak as the reference scenario needs about "
      << fixed(r.equivalent_force_peak_g, 0)
      << " g (same 95th percentile: " << fixed(r.equivalent_force_p95_g, 0)
      << " g; attachment-area rule: " << fixed(r.equivalent_force_area_rule_g, 0) << " g).";
  if (r.beyond_linear_range) s << " " << beyond_linear_range_text(r);
  return s.str();
}

}  // namespace

namespace {

constexpr size_t kSummaryWidth = 96;

// The model in words: tooth, PDL, bone, force system, mesh and the thresholds with their sources.
void write_case_header(std::ostream& out, const CaseSpec& spec) {
  constexpr size_t kWidth = kSummaryWidth;
  const mesh::ToothSpec& tooth = spec.model.tooth;
  out << "Tooth:      ";
  if (tooth.scan)
    out << "scanned surface " << spec.surface.file << " (SHA-256 " << tooth.scan->source_sha256
        << "), " << spaced(mesh::to_string(tooth.type)) << ", root "
        << fixed(tooth.dimensions.root_length_mm, 1) << " mm, crown "
        << fixed(tooth.dimensions.crown_length_mm, 1) << " mm, placed by "
        << (spec.surface.landmarks ? "landmarks" : "the accepted principal axes") << "\n";
  else if (tooth.ideal_root == mesh::IdealRoot::kNone)
    out << spaced(mesh::to_string(tooth.type)) << ", root "
        << fixed(tooth.dimensions.root_length_mm, 1) << " mm (taper fullness "
        << fixed(tooth.dimensions.root_taper_fullness, 2) << "), crown "
        << fixed(tooth.dimensions.crown_length_mm, 1) << " mm\n";
  else
    out << "idealised root, radius " << fixed(tooth.ideal_radius_mm, 2)
        << " mm at the crest, length " << fixed(tooth.ideal_length_mm, 1) << " mm\n";
  const mesh::PdlSpec& pdl = spec.model.pdl;
  out << "PDL:        width " << fixed(pdl.crest_width_mm, 2) << " / " << fixed(pdl.mid_width_mm, 2)
      << " / " << fixed(pdl.apex_width_mm, 2) << " mm (crest / mid-root / apex), E "
      << fixed(spec.pdl_material.young_modulus_mpa, 3) << " MPa, nu "
      << fixed(spec.pdl_material.poisson_ratio, 2) << "\n";
  out << "Bone:       healthy crest " << fixed(spec.model.bone.crest_below_cej_mm, 1)
      << " mm below the CEJ\n";
  out << wrap(force_system_words(spec), kWidth, "Force:      ", "            ");
  out << "Mesh:       " << mesh::to_string(spec.model.sizing.preset) << " preset\n";
  out << wrap("Capillary threshold " + fixed(spec.thresholds.capillary.value_kpa, 1) +
                  " kPa; source: " + spec.thresholds.capillary.source,
              kWidth);
  out << wrap("Physiological limit " + fixed(spec.thresholds.limit.value_kpa, 1) +
                  " kPa; source: " + spec.thresholds.limit.source,
              kWidth);
  out << "\n";
}

// One row per quantity, one column per scenario.
void write_key_table(std::ostream& out, const std::vector<ScenarioResult>& results) {
  struct Row {
    std::string label;
    std::function<std::string(const ScenarioResult&)> cell;
  };
  const std::vector<Row> rows = {
      {"bone loss (mm)", [](const ScenarioResult& r) { return fixed(r.bone_loss_mm, 2); }},
      {"attachment area (mm^2)",
       [](const ScenarioResult& r) { return fixed(r.attachment_area_mm2, 1); }},
      {"CRes below crest (mm)",
       [](const ScenarioResult& r) { return fixed(cres_for(r).from_crest_mm, 2); }},
      {"CRes, % of embedded root",
       [](const ScenarioResult& r) { return fixed(100.0 * cres_for(r).fraction_embedded, 1); }},
      {"M/F for translation (mm)",
       [](const ScenarioResult& r) { return fixed(r.mf_translation_mm, 2); }},
      {"applied M/F (mm)",
       [](const ScenarioResult& r) { return fixed(r.load.moment_to_force_mm, 2); }},
      {"peak compression (kPa)",
       [](const ScenarioResult& r) { return fixed(r.pressure_max_compression_kpa, 2); }},
      {"95th pct compression (kPa)",
       [](const ScenarioResult& r) { return fixed(r.pressure_p95_compression_kpa, 2); }},
      {"peak tension (kPa)",
       [](const ScenarioResult& r) { return fixed(r.pressure_max_tension_kpa, 2); }},
      {"area > capillary (mm^2)",
       [](const ScenarioResult& r) { return fixed(r.area_above_capillary_mm2, 2); }},
      {"area > limit (mm^2)",
       [](const ScenarioResult& r) { return fixed(r.area_above_limit_mm2, 2); }},
      {"max principal strain (%)",
       [](const ScenarioResult& r) { return fixed(100.0 * r.max_principal_strain, 3); }},
      {"max |principal strain| (%)",
       [](const ScenarioResult& r) { return fixed(100.0 * r.max_abs_principal_strain, 3); }},
      {"PDL vol. > linear range (%)",
       [](const ScenarioResult& r) { return fixed(r.volume_beyond_linear_range_percent, 2); }},
      {"crown tip displacement (um)",
       [](const ScenarioResult& r) { return fixed(r.crown_tip_displacement_um.norm(), 2); }},
      {"apex displacement (um)",
       [](const ScenarioResult& r) { return fixed(r.apex_displacement_um.norm(), 2); }},
      {"equivalent force, peak (g)",
       [](const ScenarioResult& r) {
         return r.equivalent_force_peak_g >= 0 ? fixed(r.equivalent_force_peak_g, 0) : "n/a";
       }},
      {"equivalent force, area (g)",
       [](const ScenarioResult& r) {
         return r.equivalent_force_area_rule_g >= 0 ? fixed(r.equivalent_force_area_rule_g, 0)
                                                    : "n/a";
       }},
  };
  size_t label_width = 0;
  for (const Row& row : rows) label_width = std::max(label_width, row.label.size());
  std::vector<size_t> widths;
  for (const ScenarioResult& r : results) widths.push_back(std::max<size_t>(10, r.name.size()) + 2);
  auto pad_left = [](const std::string& s, size_t w) {
    return s.size() >= w ? s : std::string(w - s.size(), ' ') + s;
  };
  out << std::string(label_width, ' ');
  for (size_t i = 0; i < results.size(); ++i) out << pad_left(results[i].name, widths[i]);
  out << "\n";
  for (const Row& row : rows) {
    out << row.label << std::string(label_width - row.label.size(), ' ');
    for (size_t i = 0; i < results.size(); ++i) out << pad_left(row.cell(results[i]), widths[i]);
    out << "\n";
  }
  out << "\n";
}

// A reading of every scenario against the thresholds, the least bone loss as the reference.
void write_readings(std::ostream& out, const CaseSpec& spec,
                    const std::vector<ScenarioResult>& results) {
  constexpr size_t kWidth = kSummaryWidth;
  out << "Reading against the thresholds\n";
  double least_loss = INFINITY;
  for (const ScenarioResult& r : results) least_loss = std::min(least_loss, r.bone_loss_mm);
  bool reference_taken = false;
  for (const ScenarioResult& r : results) {
    const bool is_reference = !reference_taken && r.bone_loss_mm == least_loss;
    reference_taken = reference_taken || is_reference;
    out << wrap(reading(spec, r, is_reference), kWidth, "- ", "  ");
  }
}

}  // namespace

std::string summary_text(const CaseSpec& spec, const std::vector<ScenarioResult>& results,
                         const AllowanceReport* allowance) {
  constexpr size_t kWidth = kSummaryWidth;
  std::ostringstream out;
  out << "Sharpey report: " << (spec.label.empty() ? "(no label)" : spec.label) << "\n";
  out << std::string(kWidth, '=') << "\n";
  out << wrap(caution_text(), kWidth) << "\n";
  write_case_header(out, spec);
  write_key_table(out, results);
  out << "CRes: "
      << (results.empty() ||
                  cres_direction_for(results.front().load) == CresDirection::kLabiolingual
              ? "for labiolingual forces"
              : "for mesiodistal forces")
      << ", measured along the long axis from the alveolar crest.\n";
  out << "Pressure: PDL hydrostatic pressure, compression positive.\n\n";

  write_readings(out, spec, results);
  // The allowance paragraph ends with the caution itself.
  if (allowance)
    out << "\n" << allowance_summary_text(spec, *allowance, kWidth);
  else
    out << "\n" << wrap(caution_text(), kWidth);
  return out.str();
}

}  // namespace sharpey::analysis
