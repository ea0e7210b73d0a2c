// Force allowance outputs: results.json's "allowance" section, allowance.csv, summary.txt's
// allowance paragraph.
#include <cmath>
#include <cstdio>
#include <nlohmann/json.hpp>
#include <sstream>

#include "sharpey/analysis/detail/output_text.h"
#include "sharpey/analysis/verdict.h"
#include "sharpey/output/allowance_output.h"
#include "sharpey/output/report_output.h"

namespace sharpey::analysis {

namespace {

using Json = nlohmann::ordered_json;

constexpr AllowanceMeasure kMeasures[] = {AllowanceMeasure::kPeak, AllowanceMeasure::kP95};
constexpr AllowanceThreshold kThresholds[] = {AllowanceThreshold::kCapillary,
                                              AllowanceThreshold::kLimit};

Json number(double v) { return std::isfinite(v) ? Json(v) : Json(nullptr); }

std::string criterion(AllowanceMeasure m, AllowanceThreshold t) {
  return to_string(m) + "_" + to_string(t);  // "peak_limit", "p95_capillary", ...
}

double grams(double n) { return convert_force(n, ForceUnit::kNewton, ForceUnit::kGram); }

std::string words(MovementPreset m) {
  std::string s = to_string(m);
  for (char& c : s)
    if (c == '_') c = ' ';
  return s;
}

std::string input_words(BandInput input) {
  switch (input) {
    case BandInput::kPdlModulus:
      return "the PDL modulus";
    case BandInput::kPdlPoisson:
      return "the PDL Poisson ratio";
    case BandInput::kPdlWidth:
      return "the PDL width";
    case BandInput::kBoneLevel:
      return "the bone level (reading error)";
    case BandInput::kRootLength:
      return "the root length";
    case BandInput::kCorticalModulus:
      return "the cortical bone modulus";
    case BandInput::kCancellousModulus:
      return "the cancellous bone modulus";
  }
  return to_string(input);
}

std::string fixed(double v, int decimals) {
  char buffer[64];
  std::snprintf(buffer, sizeof buffer, "%.*f", decimals, v);
  return buffer;
}

// A force in the case's unit for text: whole grams, one decimal in cN, three in N.
std::string force_text(double n, ForceUnit unit) {
  const double v = convert_force(n, ForceUnit::kNewton, unit);
  const int decimals = unit == ForceUnit::kGram ? 0 : unit == ForceUnit::kCentinewton ? 1 : 3;
  return fixed(v, decimals) + " " + to_string(unit);
}

using detail::wrap;

Json percentiles_json(const BandPercentiles& p) {
  return {{"p10", number(p.p10)}, {"p50", number(p.p50)}, {"p90", number(p.p90)}};
}

Json nominal_json(const MovementAllowance& a) {
  Json j;
  j["movement"] = to_string(a.movement);
  j["direction"] = Json::array({a.direction.x(), a.direction.y(), a.direction.z()});
  j["moment_to_force_mm"] = number(a.moment_to_force_mm);
  j["limited_by_compression"] = a.limited_by_compression();
  j["peak_kpa_per_n"] = number(a.peak_kpa_per_n);
  j["p95_kpa_per_n"] = number(a.p95_kpa_per_n);
  j["peak_tension_kpa_per_n"] = number(a.peak_tension_kpa_per_n);
  j["crown_tip_um_per_n"] = number(a.crown_tip_um_per_n);
  Json n, g;
  for (AllowanceMeasure m : kMeasures) {
    for (AllowanceThreshold t : kThresholds) {
      n[criterion(m, t)] = number(a.force_n(m, t));
      g[criterion(m, t)] = number(grams(a.force_n(m, t)));
    }
  }
  j["allowance_n"] = n;
  j["allowance_g"] = g;
  const PracticeRange r = common_practice_range(a.movement);
  j["common_practice_g"] = {{"low", r.low_g}, {"high", r.high_g}, {"status", r.status}};
  return j;
}

Json band_json(const AllowanceBand& band) {
  Json j;
  j["samples"] = band.options.n_samples;
  j["seed"] = band.options.seed;
  j["sampling"] = "Latin hypercube, one stratum per sample and input, fixed seed";
  j["n_solves"] = band.n_solves;
  j["n_remeshed"] = band.n_remeshed;
  Json ranges = Json::array();
  for (const BandInputRange& r : band.options.ranges) {
    ranges.push_back({{"input", to_string(r.input)},
                      {"low", number(r.low)},
                      {"high", number(r.high)},
                      {"nominal", number(r.nominal)},
                      {"unit", r.unit},
                      {"distribution", to_string(r.distribution)},
                      {"varies", r.varies()},
                      {"source", r.source}});
  }
  j["ranges"] = ranges;
  Json scenarios = Json::array();
  for (const ScenarioBand& s : band.scenarios) {
    Json movements = Json::array();
    for (const MovementBand& m : s.movements) {
      Json mj;
      mj["movement"] = to_string(m.movement);
      Json n, conservative_n, conservative_g;
      for (AllowanceMeasure me : kMeasures) {
        for (AllowanceThreshold t : kThresholds) {
          n[criterion(me, t)] = percentiles_json(m.of(me, t));
          conservative_n[criterion(me, t)] = number(m.conservative_n(me, t));
          conservative_g[criterion(me, t)] = number(grams(m.conservative_n(me, t)));
        }
      }
      mj["percentiles_n"] = n;
      mj["conservative_n"] = conservative_n;
      mj["conservative_g"] = conservative_g;
      movements.push_back(mj);
    }
    scenarios.push_back(
        {{"scenario", s.scenario}, {"bone_loss_mm", s.bone_loss_mm}, {"movements", movements}});
  }
  j["scenarios"] = scenarios;
  Json sensitivity = Json::array();
  for (const InputSensitivity& s : band.sensitivity) {
    Json swing = Json::array();
    for (double v : s.swing) swing.push_back(number(v));
    sensitivity.push_back({{"input", to_string(s.input)},
                           {"low", number(s.low)},
                           {"high", number(s.high)},
                           {"swing_per_scenario", swing},
                           {"mean_swing", number(s.mean_swing)}});
  }
  j["sensitivity"] = sensitivity;
  Json inputs = Json::array();
  for (const BandInputRange& r : band.options.ranges) inputs.push_back(to_string(r.input));
  Json rows = Json::array();
  for (const BandSample& s : band.samples) {
    Json row = Json::array();
    for (double v : s.inputs) row.push_back(number(v));
    rows.push_back(row);
  }
  j["sample_inputs"] = {{"columns", inputs}, {"rows", rows}};
  return j;
}

const MovementBand* band_of(const AllowanceReport& report, size_t k, MovementPreset m) {
  if (!report.band || k >= report.band->scenarios.size()) return nullptr;
  return &report.band->scenarios[k].of(m);
}

}  // namespace

std::string allowance_json(const CaseSpec& spec, const AllowanceReport& report) {
  Json j;
  j["caution"] = caution_text();
  j["method"] =
      "largest force at the bracket, with the couple the movement needs, that keeps the PDL "
      "compression at or below a threshold; the evaluation is linear in the force, so "
      "allowance = threshold / (measure under 1 N). Measures: peak compression outside the crest "
      "edge band (peak) and area-weighted 95th percentile (p95); thresholds: capillary and limit "
      "(see thresholds). Rotation: the force of the couple (couple / lever arm). docs/analyses.md";
  j["capillary_kpa"] = number(spec.thresholds.capillary.value_kpa);
  j["limit_kpa"] = number(spec.thresholds.limit.value_kpa);
  j["case_force_unit"] = to_string(spec.load.unit);
  Json nominal = Json::array();
  for (const ScenarioAllowances& s : report.nominal) {
    Json movements = Json::array();
    for (const MovementAllowance& a : s.movements) movements.push_back(nominal_json(a));
    nominal.push_back(
        {{"scenario", s.scenario}, {"bone_loss_mm", s.bone_loss_mm}, {"movements", movements}});
  }
  j["nominal"] = nominal;
  j["band"] = report.band ? band_json(*report.band) : Json(nullptr);
  return j.dump(2);
}

std::string allowance_csv(const CaseSpec& spec, const AllowanceReport& report) {
  const std::string u = to_string(spec.load.unit);
  const auto value = [&spec](double n) {
    if (std::isinf(n)) return std::string("unbounded");
    return csv_number(convert_force(n, ForceUnit::kNewton, spec.load.unit));
  };
  std::ostringstream out;
  out << "# " << caution_text() << "\n";
  out << "# " << (spec.label.empty() ? "(no label)" : spec.label) << "; force allowances in " << u
      << " at the bracket with the couple of the movement; "
      << "peak = peak compression outside the crest edge band, p95 = area-weighted 95th "
         "percentile; capillary "
      << spec.thresholds.capillary.value_kpa << " kPa, limit " << spec.thresholds.limit.value_kpa
      << " kPa; common practice ranges: a fact of the trade, no single source\n";
  out << "# band columns: 10th/50th/90th percentiles over "
      << (report.band ? std::to_string(report.band->options.n_samples) + " sampled variations"
                      : std::string("(band not computed: empty)"))
      << "; conservative allowance = 10th percentile; unbounded = no compression\n";
  out << "scenario,bone_loss_mm,movement,common_practice_low_" << u << ",common_practice_high_"
      << u;
  for (AllowanceMeasure m : kMeasures)
    for (AllowanceThreshold t : kThresholds) out << ",nominal_" << criterion(m, t) << "_" << u;
  for (AllowanceMeasure m : kMeasures)
    for (AllowanceThreshold t : kThresholds)
      for (const char* p : {"p10", "p50", "p90"})
        out << ",band_" << criterion(m, t) << "_" << p << "_" << u;
  out << "\n";
  for (size_t k = 0; k < report.nominal.size(); ++k) {
    const ScenarioAllowances& s = report.nominal[k];
    for (const MovementAllowance& a : s.movements) {
      const PracticeRange r = common_practice_range(a.movement);
      out << csv_field(s.scenario) << ',' << csv_number(s.bone_loss_mm) << ','
          << to_string(a.movement) << ','
          << csv_number(convert_force(r.low_g, ForceUnit::kGram, spec.load.unit)) << ','
          << csv_number(convert_force(r.high_g, ForceUnit::kGram, spec.load.unit));
      for (AllowanceMeasure m : kMeasures)
        for (AllowanceThreshold t : kThresholds) out << ',' << value(a.force_n(m, t));
      const MovementBand* b = band_of(report, k, a.movement);
      for (AllowanceMeasure m : kMeasures) {
        for (AllowanceThreshold t : kThresholds) {
          if (!b) {
            out << ",,,";
            continue;
          }
          const BandPercentiles& p = b->of(m, t);
          out << ',' << value(p.p10) << ',' << value(p.p50) << ',' << value(p.p90);
        }
      }
      out << "\n";
    }
  }
  return out.str();
}

std::string allowance_summary_text(const CaseSpec& spec, const AllowanceReport& report,
                                   size_t width) {
  const ForceUnit unit = spec.load.unit;
  const std::string limit = fixed(spec.thresholds.limit.value_kpa, 1) + " kPa";
  const std::string capillary = fixed(spec.thresholds.capillary.value_kpa, 1) + " kPa";
  std::ostringstream out;
  out << "Force allowance\n";
  std::ostringstream intro;
  intro << "The largest force at the bracket, with the couple each movement needs, that keeps the "
           "peak PDL compression at or below the "
        << limit << " upper limit (and, in brackets, the " << capillary
        << " capillary pressure), in " << to_string(unit) << ". ";
  if (report.band) {
    intro << "Conservative allowance: the 10th percentile of the allowances over "
          << report.band->options.n_samples
          << " sampled variations of the tissue properties and the measured geometry (nine "
             "variations in ten allow more; Latin hypercube, seed "
          << report.band->options.seed << "). ";
  } else {
    intro << "Nominal allowance for the case's own tissue properties and geometry; the variability "
             "band was not computed (case key allowance.band, or sharpey-batch run --band), so no "
             "conservative allowance is stated. ";
  }
  intro << "Common practice ranges are a fact of the trade, not a single source.";
  out << wrap(intro.str(), width, "", "") << "\n";
  for (size_t k = 0; k < report.nominal.size(); ++k) {
    const ScenarioAllowances& s = report.nominal[k];
    out << s.scenario << " (bone loss " << fixed(s.bone_loss_mm, 1) << " mm):\n";
    for (const MovementAllowance& a : s.movements) {
      const PracticeRange r = common_practice_range(a.movement);
      const std::string practice =
          "common practice " +
          force_text(convert_force(r.low_g, ForceUnit::kGram, ForceUnit::kNewton), unit) + " to " +
          force_text(convert_force(r.high_g, ForceUnit::kGram, ForceUnit::kNewton), unit);
      std::ostringstream line;
      line << words(a.movement) << ": ";
      if (!a.limited_by_compression()) {
        line << "not limited by compression (the movement puts the ligament in tension; peak "
                "tension "
             << fixed(a.peak_tension_kpa_per_n, 1) << " kPa per N); " << practice << ".";
      } else if (const MovementBand* b = band_of(report, k, a.movement)) {
        line << "conservative allowance "
             << force_text(b->conservative_n(AllowanceMeasure::kPeak, AllowanceThreshold::kLimit),
                           unit)
             << " ("
             << force_text(
                    b->conservative_n(AllowanceMeasure::kPeak, AllowanceThreshold::kCapillary),
                    unit)
             << "); median " << force_text(b->peak_limit.p50, unit) << ", 90th percentile "
             << force_text(b->peak_limit.p90, unit) << "; nominal "
             << force_text(a.peak_limit_n, unit) << "; " << practice << ".";
      } else {
        line << "nominal allowance " << force_text(a.peak_limit_n, unit) << " ("
             << force_text(a.peak_capillary_n, unit) << "); " << practice << ".";
      }
      out << wrap(line.str(), width, "- ", "  ");
    }
  }
  if (report.band && !report.band->sensitivity.empty()) {
    const InputSensitivity& top = report.band->sensitivity.front();
    std::ostringstream s;
    s << "The input that moves the allowance most (one at a time over its range): "
      << input_words(top.input) << " (from " << top.low << " to " << top.high
      << " changes the allowances by " << fixed(100.0 * top.mean_swing, 0)
      << " % of the nominal on average).";
    if (report.band->sensitivity.size() > 1) {
      s << " Then:";
      for (size_t i = 1; i < report.band->sensitivity.size(); ++i)
        s << (i > 1 ? "," : "") << " " << input_words(report.band->sensitivity[i].input) << " "
          << fixed(100.0 * report.band->sensitivity[i].mean_swing, 0) << " %";
      s << ".";
    }
    out << "\n" << wrap(s.str(), width, "", "");
  }
  out << "\n" << wrap(caution_text(), width, "", "");
  return out.str();
}

}  // namespace sharpey::analysis
