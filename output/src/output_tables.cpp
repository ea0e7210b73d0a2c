// CSV outputs: summary.csv (one row per scenario), the root map of a scenario, the sweep table.
// Each starts with a `# ` comment line carrying the caution.
#include <cmath>
#include <cstdio>
#include <functional>
#include <sstream>

#include "sharpey/output/report_output.h"

namespace sharpey::analysis {

namespace {

struct Column {
  const char* name;
  std::function<double(const ScenarioResult&)> value;
};

double nan_if_missing(double g) { return g >= 0 ? g : std::nan(""); }

// The per-scenario columns shared by summary.csv and the sweep table.
const std::vector<Column>& result_columns() {
  static const std::vector<Column> columns = {
      {"bone_loss_mm", [](const ScenarioResult& r) { return r.bone_loss_mm; }},
      {"attachment_area_mm2", [](const ScenarioResult& r) { return r.attachment_area_mm2; }},
      {"cres_from_crest_mm", [](const ScenarioResult& r) { return cres_for(r).from_crest_mm; }},
      {"cres_fraction_embedded",
       [](const ScenarioResult& r) { return cres_for(r).fraction_embedded; }},
      {"mf_translation_mm", [](const ScenarioResult& r) { return r.mf_translation_mm; }},
      {"pdl_max_compression_kpa",
       [](const ScenarioResult& r) { return r.pressure_max_compression_kpa; }},
      {"pdl_max_tension_kpa", [](const ScenarioResult& r) { return r.pressure_max_tension_kpa; }},
      {"pdl_p95_compression_kpa",
       [](const ScenarioResult& r) { return r.pressure_p95_compression_kpa; }},
      {"area_above_capillary_mm2",
       [](const ScenarioResult& r) { return r.area_above_capillary_mm2; }},
      {"area_above_limit_mm2", [](const ScenarioResult& r) { return r.area_above_limit_mm2; }},
      {"max_principal_strain", [](const ScenarioResult& r) { return r.max_principal_strain; }},
      {"crown_tip_displacement_um",
       [](const ScenarioResult& r) { return r.crown_tip_displacement_um.norm(); }},
      {"apex_displacement_um",
       [](const ScenarioResult& r) { return r.apex_displacement_um.norm(); }},
      {"equivalent_force_g",
       [](const ScenarioResult& r) { return nan_if_missing(r.equivalent_force_peak_g); }},
      {"equivalent_force_p95_g",
       [](const ScenarioResult& r) { return nan_if_missing(r.equivalent_force_p95_g); }},
      {"equivalent_force_area_rule_g",
       [](const ScenarioResult& r) { return nan_if_missing(r.equivalent_force_area_rule_g); }},
      {"force_g",
       [](const ScenarioResult& r) {
         return from_newton(r.load.force_n.norm(), ForceUnit::kGram);
       }},
      {"moment_to_force_mm", [](const ScenarioResult& r) { return r.load.moment_to_force_mm; }},
  };
  return columns;
}

std::string caution_line() { return "# " + caution_text() + "\n"; }

void append_result_columns(std::ostringstream& row, const ScenarioResult& r) {
  for (const Column& c : result_columns()) row << ',' << csv_number(c.value(r));
}

void append_result_header(std::ostringstream& header) {
  for (const Column& c : result_columns()) header << ',' << c.name;
}

}  // namespace

std::string csv_number(double value) {
  if (!std::isfinite(value)) return "";
  char buffer[32];
  std::snprintf(buffer, sizeof buffer, "%.6g", value);
  return buffer;
}

std::string csv_field(const std::string& text) {
  // RFC 4180 section 2: a field holding a comma, quote or line break is enclosed in quotes, its
  // quotes doubled. A field starting with '#' is quoted too, so readers that skip our '#'
  // comment lines cannot mistake a row for one.
  if (text.find_first_of(",\"\n\r") == std::string::npos && (text.empty() || text[0] != '#'))
    return text;
  std::string quoted = "\"";
  for (char c : text) {
    if (c == '"') quoted += '"';
    quoted += c;
  }
  return quoted + "\"";
}

std::string scenario_file_stem(int index, const std::string& name) {
  std::string stem = "s" + std::to_string(index + 1) + "_";
  bool last_underscore = true;
  for (char c : name) {
    const bool safe = (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9') ||
                      c == '-' || c == '.';
    if (safe) {
      stem += c;
      last_underscore = false;
    } else if (!last_underscore) {
      stem += '_';
      last_underscore = true;
    }
    if (stem.size() >= 60) break;
  }
  while (!stem.empty() && (stem.back() == '_' || stem.back() == '.')) stem.pop_back();
  return stem;
}

std::string summary_csv(const CaseSpec& spec, const std::vector<ScenarioResult>& results) {
  std::ostringstream out;
  out << caution_line();
  out << "# " << (spec.label.empty() ? "(no label)" : spec.label) << "; pressure in kPa "
      << "(hydrostatic, compression positive), forces in grams-force, lengths in mm\n";
  out << "scenario";
  {
    std::ostringstream header;
    append_result_header(header);
    out << header.str() << '\n';
  }
  for (const ScenarioResult& r : results) {
    std::ostringstream row;
    row << csv_field(r.name);
    append_result_columns(row, r);
    out << row.str() << '\n';
  }
  return out.str();
}

std::string root_map_csv(const CaseSpec& spec, const ScenarioResult& result) {
  const RootMap& map = result.root_map;
  std::ostringstream out;
  out << caution_line();
  out << "# " << (spec.label.empty() ? "(no label)" : spec.label) << "; scenario " << result.name
      << "\n";
  out << "# PDL hydrostatic pressure in kPa (compression positive) on the unwrapped root surface: "
         "rows = depth below the CEJ (mm, cell centre), columns = angle around the root (deg, "
         "cell centre; 0 labial, 90 mesial, 180 lingual, 270 distal); empty = no PDL\n";
  out << "depth_below_cej_mm";
  const double d_angle = map.n_angle > 0 ? 360.0 / map.n_angle : 0;
  const double d_depth = map.n_depth > 0 ? (map.depth_max_mm - map.depth_min_mm) / map.n_depth : 0;
  for (int j = 0; j < map.n_angle; ++j) out << ',' << csv_number((j + 0.5) * d_angle);
  out << '\n';
  for (int i = 0; i < map.n_depth; ++i) {
    out << csv_number(map.depth_min_mm + (i + 0.5) * d_depth);
    for (int j = 0; j < map.n_angle; ++j) {
      const size_t k =
          static_cast<size_t>(i) * static_cast<size_t>(map.n_angle) + static_cast<size_t>(j);
      out << ',' << (k < map.pressure_kpa.size() ? csv_number(map.pressure_kpa[k]) : "");
    }
    out << '\n';
  }
  return out.str();
}

SweepTable::SweepTable(std::vector<std::string> varied_keys) : keys_(std::move(varied_keys)) {}

void SweepTable::add(int combination, const std::vector<std::string>& values,
                     const ScenarioResult& result) {
  std::ostringstream row;
  row << combination;
  for (size_t i = 0; i < keys_.size(); ++i)
    row << ',' << csv_field(i < values.size() ? values[i] : "");
  row << ',' << csv_field(result.name);
  append_result_columns(row, result);
  rows_.push_back(row.str());
}

std::string SweepTable::csv() const {
  std::ostringstream out;
  out << caution_line();
  out << "# full-factorial sweep: one row per (combination, scenario); pressure in kPa "
         "(hydrostatic, compression positive), forces in grams-force, lengths in mm\n";
  out << "combination";
  for (const std::string& k : keys_) out << ',' << csv_field(k);
  out << ",scenario";
  std::ostringstream header;
  append_result_header(header);
  out << header.str() << '\n';
  out << rows_text();
  return out.str();
}

std::string SweepTable::rows_text() const {
  std::string out;
  for (const std::string& r : rows_) out += r + '\n';
  return out;
}

void SweepTable::add_rows_text(const std::string& rows) {
  size_t begin = 0;
  while (begin < rows.size()) {
    const size_t end = rows.find('\n', begin);
    if (end == std::string::npos) throw Error("sweep rows do not end in a line break");
    rows_.push_back(rows.substr(begin, end - begin));
    begin = end + 1;
  }
}

}  // namespace sharpey::analysis
