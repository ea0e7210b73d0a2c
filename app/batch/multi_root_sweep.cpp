#include "multi_root_sweep.h"

#include <cmath>
#include <functional>
#include <limits>
#include <nlohmann/json.hpp>
#include <sstream>

#include "sharpey/error.h"
#include "sharpey/output/report_output.h"

namespace sharpey::batch {

namespace {

using Json = nlohmann::ordered_json;
using analysis::csv_field;
using analysis::csv_number;

// Root columns per row: the most roots a multi-rooted tooth has (maxillary molars).
constexpr size_t kMaxRoots = 3;

// One scenario of a solved combination, as its row reads it.
struct RowSource {
  const analysis::MultiRootCase& spec;
  const analysis::MultiRootCaseResult& all;
  const analysis::MultiRootScenarioResult& s;
};

// An allowance as a figure: none (NaN, an empty cell) when the movement compresses nothing.
double allowance_figure(double a) {
  return a < 0 || !std::isfinite(a) ? std::numeric_limits<double>::quiet_NaN() : a;
}

const analysis::RootFigures* root_or_null(const std::vector<analysis::RootFigures>& roots,
                                          size_t i) {
  return i < roots.size() ? &roots[i] : nullptr;
}

// The figure columns in table order: put(name, cell) with cell() the row's CSV text. The header
// calls it without evaluating the cells, so `r` is only read inside them.
using Cell = std::function<std::string()>;
template <class Put>
void walk_figures(const RowSource* r, Put&& put) {
  const auto number = [&put](const char* name, std::function<double()> f) {
    put(name, [f] { return csv_number(f()); });
  };
  put("tooth", [r] { return mesh::to_string(r->spec.type); });
  put("load_unit", [r] { return r->all.base_unit; });
  number("attachment_area_mm2", [r] { return r->s.areas.attached_total_mm2; });
  number("root_area_mm2", [r] { return r->s.areas.total_mm2; });
  number("cres_mesiodistal_below_cej_mm", [r] { return r->s.cres_mesiodistal.below_cej_mm; });
  number("cres_mesiodistal_below_furcation_mm",
         [r] { return r->s.cres_mesiodistal.below_furcation_mm; });
  number("cres_buccolingual_below_cej_mm", [r] { return r->s.cres_buccolingual.below_cej_mm; });
  number("cres_buccolingual_below_furcation_mm",
         [r] { return r->s.cres_buccolingual.below_furcation_mm; });
  number("allowance_capillary", [r] { return allowance_figure(r->s.allowance_capillary); });
  number("allowance_limit", [r] { return allowance_figure(r->s.allowance_limit); });
  const char* const movement_columns[][2] = {
      {"uprighting_allowance_capillary_nmm", "uprighting_allowance_limit_nmm"},
      {"intrusion_allowance_capillary_n", "intrusion_allowance_limit_n"},
      {"translation_allowance_capillary_n", "translation_allowance_limit_n"}};
  for (size_t m = 0; m < 3; ++m) {  // the order of MultiRootScenarioResult::allowances
    number(movement_columns[m][0],
           [r, m] { return allowance_figure(r->s.allowances[m].capillary); });
    number(movement_columns[m][1], [r, m] { return allowance_figure(r->s.allowances[m].limit); });
  }
  number("tooth_peak_compression_kpa", [r] { return r->s.result.tooth.peak_compression_kpa; });
  number("tooth_peak_tension_kpa", [r] { return r->s.result.tooth.peak_tension_kpa; });
  number("tooth_area_above_capillary_mm2",
         [r] { return r->s.result.tooth.area_above_capillary_mm2; });
  number("tooth_area_above_limit_mm2", [r] { return r->s.result.tooth.area_above_limit_mm2; });
}

// The per-root columns: root1_* to root3_*, empty past the tooth's roots.
template <class Put>
void walk_root_figures(const RowSource* r, Put&& put) {
  const auto number = [&put](const std::string& name, std::function<double()> f) {
    put(name.c_str(), [f] { return csv_number(f()); });
  };
  for (size_t i = 0; i < kMaxRoots; ++i) {
    const std::string p = "root" + std::to_string(i + 1) + "_";
    const auto root = [r, i] { return root_or_null(r->s.result.roots, i); };
    const auto figure = [root](double analysis::RootFigures::*field) {
      return [root, field] {
        const analysis::RootFigures* f = root();
        return f ? f->*field : std::numeric_limits<double>::quiet_NaN();
      };
    };
    put((p + "name").c_str(), [root] { return root() ? csv_field(root()->name) : ""; });
    number(p + "attachment_area_mm2", figure(&analysis::RootFigures::attachment_area_mm2));
    number(p + "peak_compression_kpa", figure(&analysis::RootFigures::peak_compression_kpa));
    number(p + "peak_tension_kpa", figure(&analysis::RootFigures::peak_tension_kpa));
    number(p + "area_above_capillary_mm2",
           figure(&analysis::RootFigures::area_above_capillary_mm2));
    number(p + "area_above_limit_mm2", figure(&analysis::RootFigures::area_above_limit_mm2));
    number(p + "load_n", [root] {
      return root() ? root()->reaction_n.norm() : std::numeric_limits<double>::quiet_NaN();
    });
  }
}

// The finite-element columns (empty unless the combination asks for finite_elements).
template <class Put>
void walk_fe_figures(const RowSource* r, Put&& put) {
  const auto fe = [r](std::function<double(const analysis::MultiRootFeFigures&)> f) -> Cell {
    return [r, f] {
      return r->s.has_finite_elements ? csv_number(f(r->s.finite_elements)) : std::string();
    };
  };
  put("fe_dofs", fe([](const auto& x) { return static_cast<double>(x.n_dofs); }));
  put("fe_cres_mesiodistal_below_cej_mm",
      fe([](const auto& x) { return x.mesiodistal.below_cej_mm; }));
  put("fe_cres_buccolingual_below_cej_mm",
      fe([](const auto& x) { return x.buccolingual.below_cej_mm; }));
  put("fe_tooth_peak_compression_kpa",
      fe([](const auto& x) { return x.tooth.peak_compression_kpa; }));
  for (size_t i = 0; i < kMaxRoots; ++i)
    put(("fe_root" + std::to_string(i + 1) + "_peak_compression_kpa").c_str(),
        fe([i](const auto& x) {
          return i < x.roots.size() ? x.roots[i].peak_compression_kpa
                                    : std::numeric_limits<double>::quiet_NaN();
        }));
}

// Every column after the varied keys, in table order.
template <class Put>
void walk_columns(const RowSource* r, Put&& put) {
  walk_figures(r, put);
  walk_root_figures(r, put);
  walk_fe_figures(r, put);
}

std::string row_start(int combination, const std::vector<std::string>& values) {
  std::string row = std::to_string(combination);
  for (const std::string& v : values) row += "," + csv_field(v);
  return row;
}

// Splits one CSV line written by csv_field (RFC 4180 quoting) into its fields.
std::vector<std::string> split_csv_line(const std::string& line) {
  std::vector<std::string> fields(1);
  bool quoted = false;
  for (size_t i = 0; i < line.size(); ++i) {
    const char c = line[i];
    if (quoted && c == '"' && i + 1 < line.size() && line[i + 1] == '"') {
      fields.back() += '"';
      ++i;
    } else if (c == '"') {
      quoted = !quoted;
    } else if (c == ',' && !quoted) {
      fields.emplace_back();
    } else {
      fields.back() += c;
    }
  }
  return fields;
}

// A varied value as the JSON value it was given as (a bare word is a string).
Json value_json(const std::string& cell) {
  const Json parsed = Json::parse(cell, nullptr, /*allow_exceptions=*/false);
  return parsed.is_discarded() ? Json(cell) : parsed;
}

// A figure cell as JSON: a number (an integer when written as one), null when empty.
Json figure_json(const std::string& cell) {
  return cell.empty() ? Json(nullptr) : value_json(cell);
}

std::vector<std::string> column_names(const std::vector<std::string>& keys) {
  std::vector<std::string> names = {"combination"};
  names.insert(names.end(), keys.begin(), keys.end());
  names.insert(names.end(), {"scenario", "status"});
  walk_columns(nullptr, [&names](const char* name, const Cell&) { names.push_back(name); });
  names.push_back("failure");
  return names;
}

}  // namespace

MultiRootCombination check_multi_root_combination(const std::string& case_text, int combination) {
  MultiRootCombination c;
  const std::string origin = "combination " + std::to_string(combination);
  try {
    c.spec = analysis::parse_multi_root_case(case_text, origin);
  } catch (const InputError& e) {
    c.failure = "key " + e.key() + ": " + e.what();
    c.failure_key = e.key();
    c.model_key = "invalid " + std::to_string(combination);
    return c;
  }
  Json model = Json::parse(case_text);
  for (const char* k : {"load", "thresholds", "label", "notes"}) model.erase(k);
  c.model_key = model.dump();
  return c;
}

std::string multi_root_sweep_rows(int combination, const std::vector<std::string>& values,
                                  const MultiRootCombination& c) {
  const std::string start = row_start(combination, values);
  if (!c.failure.empty()) {
    std::string row = start + ",,invalid";
    walk_columns(nullptr, [&row](const char*, const Cell&) { row += ","; });
    return row + "," + csv_field(c.failure) + "\n";
  }
  const analysis::MultiRootCaseResult all = analysis::evaluate_multi_root_case(c.spec);
  std::string rows;
  for (const analysis::MultiRootScenarioResult& s : all.scenarios) {
    const RowSource source{c.spec, all, s};
    std::string row = start + "," + csv_field(s.name) + ",ok";
    walk_columns(&source, [&row](const char*, const Cell& cell) { row += "," + cell(); });
    rows += row + ",\n";
  }
  return rows;
}

std::string multi_root_sweep_csv(const std::vector<std::string>& keys, const std::string& rows) {
  std::ostringstream out;
  out << "# " << analysis::caution_text() << "\n"
      << "# multi-rooted sweep: one row per (combination, scenario), or one failure record per "
         "invalid combination (status invalid, the key and the fix under failure); thin-layer "
         "estimate (docs/molars.md), fe_*: finite elements when the case asks for them; pressure "
         "kPa (compression positive), areas mm^2, lengths mm, allowances in load_unit (N, or N mm "
         "for uprighting) to the case's capillary and limit thresholds, empty when the movement "
         "compresses nothing\n";
  const std::vector<std::string> names = column_names(keys);
  for (size_t i = 0; i < names.size(); ++i) out << (i ? "," : "") << csv_field(names[i]);
  out << "\n" << rows;
  return out.str();
}

std::string multi_root_sweep_json(const std::vector<std::string>& keys, const std::string& rows) {
  Json j;
  j["caution"] = analysis::caution_text();
  j["method"] =
      "thin-layer (Winkler) estimate of each multi-rooted case, as sharpey-batch molar "
      "computes it (docs/molars.md); fe_* columns: the finite-element model when the case asks "
      "for it";
  const std::vector<std::string> names = column_names(keys);
  j["columns"] = names;
  j["rows"] = Json::array();
  std::istringstream in(rows);
  for (std::string line; std::getline(in, line);) {
    const std::vector<std::string> cells = split_csv_line(line);
    if (cells.size() != names.size())
      throw Error("a sweep row has " + std::to_string(cells.size()) + " fields, not " +
                  std::to_string(names.size()) + " (internal error)");
    Json row;
    for (size_t i = 0; i < names.size(); ++i) {
      const std::string& n = names[i];
      const bool varied = i <= keys.size();  // and the combination's number
      const bool text = n == "scenario" || n == "status" || n == "failure" || n == "tooth" ||
                        n == "load_unit" || n.find("_name") != std::string::npos;
      row[n] = varied ? value_json(cells[i]) : text ? Json(cells[i]) : figure_json(cells[i]);
    }
    j["rows"].push_back(row);
  }
  return j.dump(2) + "\n";
}

}  // namespace sharpey::batch
