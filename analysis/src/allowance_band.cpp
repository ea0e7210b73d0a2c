#include "sharpey/analysis/allowance_band.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numeric>
#include <sstream>

#include "allowance_band_solve.h"
#include "sharpey/error.h"

namespace sharpey::analysis {

namespace {

std::string num(double v) {
  std::ostringstream s;
  s << v;
  return s.str();
}

// SplitMix64 (Steele, Lea, Flood 2014): a small generator whose output is fixed by its definition,
// unlike the standard library's distributions, so a seed gives the same band on every platform.
class SplitMix64 {
 public:
  explicit SplitMix64(std::uint64_t seed) : state_(seed) {}
  std::uint64_t next() {
    std::uint64_t z = (state_ += 0x9e3779b97f4a7c15ULL);
    z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ULL;
    z = (z ^ (z >> 27)) * 0x94d049bb133111ebULL;
    return z ^ (z >> 31);
  }
  double uniform() { return static_cast<double>(next() >> 11) * 0x1.0p-53; }  // [0, 1)

 private:
  std::uint64_t state_;
};

double map_to_range(const BandInputRange& r, double u) {
  if (r.low == r.high) return r.low;
  if (r.distribution == BandDistribution::kLogUniform) {
    return std::exp(std::log(r.low) + u * (std::log(r.high) - std::log(r.low)));
  }
  return r.low + u * (r.high - r.low);
}

const std::string& band_key(BandInput input) {
  static const std::string keys[] = {
      "allowance.ranges.pdl_modulus",       "allowance.ranges.pdl_poisson",
      "allowance.ranges.pdl_width",         "allowance.bone_level_error_mm",
      "allowance.root_length_error_mm",     "allowance.ranges.cortical_modulus",
      "allowance.ranges.cancellous_modulus"};
  return keys[static_cast<int>(input)];
}

// Physical limits of each input (not the documented ranges: those are the defaults).
void check_range(const BandInputRange& r) {
  const std::string& key = band_key(r.input);
  const std::string shown = "[" + num(r.low) + ", " + num(r.high) + "] " + r.unit;
  if (!(std::isfinite(r.low) && std::isfinite(r.high) && std::isfinite(r.nominal)))
    throw InputError(key, to_string(r.input) + " range " + shown +
                              " is not finite; give finite numbers (low <= high)");
  if (!(r.low <= r.high))
    throw InputError(key,
                     to_string(r.input) + " range " + shown + " has low > high; swap the ends");
  double min = 0, max = 0;
  bool open_min = false;
  std::string fix;
  switch (r.input) {
    case BandInput::kPdlModulus:
    case BandInput::kCorticalModulus:
    case BandInput::kCancellousModulus:
      min = 0, max = 1e6, open_min = true;
      fix =
          "give Young's moduli in MPa (PDL 0.05 to 0.7, cortical bone about 13700 to 14500, "
          "cancellous bone 350 to 2500)";
      break;
    case BandInput::kPdlPoisson:
      min = 0, max = 0.4999;
      fix = "keep the Poisson ratio within 0 to 0.49 (the PDL's published range is 0.45 to 0.49)";
      break;
    case BandInput::kPdlWidth:
      min = 0.05, max = 1.0;
      fix = "give mean PDL widths within 0.05 to 1 mm (published range 0.1 to 0.4 mm)";
      break;
    case BandInput::kBoneLevel:
    case BandInput::kRootLength:
      min = -5, max = 5;
      fix = "keep the shift within +-5 mm (a reading error is about 0.5 to 1 mm)";
      break;
  }
  if ((open_min ? !(r.low > min) : !(r.low >= min)) || !(r.high <= max))
    throw InputError(key, to_string(r.input) + " range " + shown + " is out of the allowed " +
                              (open_min ? "(" : "[") + num(min) + ", " + num(max) + "]; " + fix);
  if (r.distribution == BandDistribution::kLogUniform && !(r.low > 0))
    throw InputError(key, to_string(r.input) + " range " + shown +
                              " starts at or below 0, which a log-uniform distribution cannot "
                              "sample; give a positive lower end");
  if (r.input == BandInput::kPdlWidth && !(r.nominal > 0))
    throw InputError("pdl.width_mm", "the case's mean PDL width " + num(r.nominal) +
                                         " mm is not positive; the width range scales it");
}

void check_cancel(const std::atomic<bool>* cancel) {
  if (cancel != nullptr && cancel->load()) throw Cancelled();
}

struct PercentileSets {
  std::vector<double> peak_capillary, peak_limit, p95_capillary, p95_limit;
};

}  // namespace

std::vector<BandInput> all_band_inputs() {
  return {BandInput::kPdlModulus,       BandInput::kPdlPoisson, BandInput::kPdlWidth,
          BandInput::kBoneLevel,        BandInput::kRootLength, BandInput::kCorticalModulus,
          BandInput::kCancellousModulus};
}

std::string to_string(BandInput input) {
  switch (input) {
    case BandInput::kPdlModulus:
      return "pdl_modulus_mpa";
    case BandInput::kPdlPoisson:
      return "pdl_poisson_ratio";
    case BandInput::kPdlWidth:
      return "pdl_mean_width_mm";
    case BandInput::kBoneLevel:
      return "bone_level_shift_mm";
    case BandInput::kRootLength:
      return "root_length_change_mm";
    case BandInput::kCorticalModulus:
      return "cortical_modulus_mpa";
    case BandInput::kCancellousModulus:
      return "cancellous_modulus_mpa";
  }
  return "unknown";
}

std::string to_string(BandDistribution distribution) {
  return distribution == BandDistribution::kLogUniform ? "log-uniform" : "uniform";
}

bool BandInputRange::changes_geometry() const {
  return input == BandInput::kPdlWidth || input == BandInput::kBoneLevel ||
         input == BandInput::kRootLength;
}

std::vector<BandInputRange> default_band_ranges(const CaseSpec& spec) {
  const mesh::PdlSpec& pdl = spec.model.pdl;
  const double mean_width = (pdl.crest_width_mm + pdl.mid_width_mm + pdl.apex_width_mm) / 3.0;
  const double bone = spec.band.bone_level_error_mm, root = spec.band.root_length_error_mm;
  using D = BandDistribution;
  return {
      {BandInput::kPdlModulus, 0.05, 0.7, spec.pdl_material.young_modulus_mpa, "MPa",
       D::kLogUniform,
       "published: 0.05 to 0.7 MPa, the usual range of PDL finite-element studies (AJODO 2013; "
       "Fill et al. 2012, J Dent Biomech); log-uniform over orders of magnitude"},
      {BandInput::kPdlPoisson, 0.45, 0.49, spec.pdl_material.poisson_ratio, "", D::kUniform,
       "published: 0.45 to 0.49 (same sources)"},
      {BandInput::kPdlWidth, 0.1, 0.4, mean_width, "mm", D::kUniform,
       "published: mean about 0.2 mm, range 0.1 to 0.4 mm (secondary teaching pages; micro-CT "
       "0.16 to 0.28 mm, Tayman et al. 2020, Aust Endod J 46:365); the case's profile scaled"},
      {BandInput::kBoneLevel, -bone, bone, 0.0, "mm", D::kUniform,
       "common practice: a radiographic bone level is read to about +-0.5 to 1 mm "
       "(allowance.bone_level_error_mm); positive = crest further apical"},
      {BandInput::kRootLength, -root, root, 0.0, "mm", D::kUniform,
       "common practice: individual roots differ from the handbook mean by a few mm "
       "(allowance.root_length_error_mm)"},
      {BandInput::kCorticalModulus, 13700, 14500, spec.cortical_material.young_modulus_mpa, "MPa",
       D::kUniform, "published: 13.7 to 14.5 GPa, tabulated in FE studies (e.g. Moga et al. 2023)"},
      {BandInput::kCancellousModulus, 350, 2500, spec.cancellous_material.young_modulus_mpa, "MPa",
       D::kLogUniform,
       "published: 0.35 to 2.5 GPa, tabulated in FE studies (e.g. Moga et al. 2023); "
       "log-uniform is our choice for a range spanning a factor of 7"},
  };
}

BandOptions band_options(const CaseSpec& spec) {
  BandOptions o;
  o.n_samples = spec.band.n_samples;
  o.seed = static_cast<std::uint64_t>(spec.band.seed);
  o.sensitivity = spec.band.sensitivity;
  o.ranges = default_band_ranges(spec);
  return o;
}

CaseSpec band_sample_case(const CaseSpec& spec, const std::vector<BandInputRange>& ranges,
                          const std::vector<double>& values) {
  if (values.size() != ranges.size())
    throw Error("band_sample_case: " + std::to_string(values.size()) + " values for " +
                std::to_string(ranges.size()) + " ranges");
  CaseSpec c = spec;
  for (size_t i = 0; i < ranges.size(); ++i) {
    const double v = values[i];
    switch (ranges[i].input) {
      case BandInput::kPdlModulus:
        c.pdl_material.young_modulus_mpa = v;
        break;
      case BandInput::kPdlPoisson:
        c.pdl_material.poisson_ratio = v;
        break;
      case BandInput::kPdlWidth: {
        if (v == ranges[i].nominal) break;  // exactly the case's profile
        const double scale = v / ranges[i].nominal;
        c.model.pdl.crest_width_mm *= scale;
        c.model.pdl.mid_width_mm *= scale;
        c.model.pdl.apex_width_mm *= scale;
        break;
      }
      case BandInput::kBoneLevel:
        c.model.bone.crest_below_cej_mm += v;
        break;
      case BandInput::kRootLength:
        if (c.model.tooth.ideal_root == mesh::IdealRoot::kNone)
          c.model.tooth.dimensions.root_length_mm += v;
        else
          c.model.tooth.ideal_length_mm += v;
        break;
      case BandInput::kCorticalModulus:
        c.cortical_material.young_modulus_mpa = v;
        break;
      case BandInput::kCancellousModulus:
        c.cancellous_material.young_modulus_mpa = v;
        break;
    }
  }
  return c;
}

void validate_band(const CaseSpec& spec, const BandOptions& options) {
  if (!(options.n_samples >= 1 && options.n_samples <= kMaxBandSamples))
    throw InputError("allowance.samples",
                     "band sample count " + std::to_string(options.n_samples) +
                         " is out of range: allowed 1 to " + std::to_string(kMaxBandSamples) +
                         "; use 24 or more for stable 10th and 90th percentiles (each sample "
                         "costs one solve per scenario)");
  const std::vector<BandInput> inputs = all_band_inputs();
  if (options.ranges.size() != inputs.size())
    throw InputError("allowance.ranges", "the band needs one range per input (" +
                                             std::to_string(inputs.size()) + "), got " +
                                             std::to_string(options.ranges.size()) +
                                             "; start from default_band_ranges()");
  for (size_t i = 0; i < inputs.size(); ++i) {
    if (options.ranges[i].input != inputs[i])
      throw InputError("allowance.ranges", "band range " + std::to_string(i) + " is for " +
                                               to_string(options.ranges[i].input) + ", expected " +
                                               to_string(inputs[i]) +
                                               "; keep the order of all_band_inputs()");
    check_range(options.ranges[i]);
  }
  // Every corner of the geometric ranges must be a valid model in every scenario.
  std::vector<size_t> geometric;
  for (size_t i = 0; i < inputs.size(); ++i)
    if (options.ranges[i].changes_geometry() && options.ranges[i].varies()) geometric.push_back(i);
  for (unsigned corner = 0; corner < (1u << geometric.size()); ++corner) {
    std::vector<double> values(inputs.size());
    for (size_t i = 0; i < inputs.size(); ++i) values[i] = options.ranges[i].nominal;
    std::ostringstream where;
    for (size_t g = 0; g < geometric.size(); ++g) {
      const BandInputRange& r = options.ranges[geometric[g]];
      values[geometric[g]] = (corner >> g) & 1u ? r.high : r.low;
      where << (g ? ", " : "") << to_string(r.input) << " " << values[geometric[g]];
    }
    try {
      validate_case(band_sample_case(spec, options.ranges, values));
    } catch (const InputError& e) {
      throw InputError("allowance",
                       "the band's extreme geometry (" + where.str() +
                           ") is not a valid model: " + e.what() +
                           "; reduce allowance.bone_level_error_mm or "
                           "allowance.root_length_error_mm, or narrow the PDL width range");
    }
  }
}

std::vector<std::vector<double>> band_sample_inputs(const BandOptions& options) {
  const int n = options.n_samples;
  const size_t n_inputs = options.ranges.size();
  std::vector<std::vector<double>> rows(static_cast<size_t>(n), std::vector<double>(n_inputs));
  for (size_t i = 0; i < n_inputs; ++i) {
    const BandInputRange& r = options.ranges[i];
    if (!r.varies()) {
      for (auto& row : rows) row[i] = r.nominal;
      continue;
    }
    // One stream per input: the values of an input depend on the seed and its index only.
    SplitMix64 rng(options.seed * 0x2545f4914f6cdd1dULL + 0x632be59bd9b4e019ULL * (i + 1));
    std::vector<int> stratum(static_cast<size_t>(n));
    std::iota(stratum.begin(), stratum.end(), 0);
    for (int j = n - 1; j > 0; --j) {  // Fisher-Yates
      const auto k = static_cast<int>(rng.next() % static_cast<std::uint64_t>(j + 1));
      std::swap(stratum[static_cast<size_t>(j)], stratum[static_cast<size_t>(k)]);
    }
    for (int j = 0; j < n; ++j) {
      const double u = (stratum[static_cast<size_t>(j)] + rng.uniform()) / n;
      rows[static_cast<size_t>(j)][i] = map_to_range(r, u);
    }
  }
  return rows;
}

BandPercentiles band_percentiles(std::vector<double> values) {
  if (values.empty()) throw Error("band_percentiles: no values");
  std::sort(values.begin(), values.end());
  const auto at = [&values](double p) {
    const double pos = p * static_cast<double>(values.size() - 1);
    const auto i = static_cast<size_t>(std::floor(pos));
    const double f = pos - static_cast<double>(i);
    const double lo = values[i], hi = values[std::min(i + 1, values.size() - 1)];
    if (f == 0 || lo == hi) return lo;
    if (std::isinf(hi)) return hi;  // toward an unbounded allowance
    return lo + f * (hi - lo);
  };
  return {at(0.10), at(0.50), at(0.90)};
}

const BandPercentiles& MovementBand::of(AllowanceMeasure measure,
                                        AllowanceThreshold threshold) const {
  if (measure == AllowanceMeasure::kPeak)
    return threshold == AllowanceThreshold::kCapillary ? peak_capillary : peak_limit;
  return threshold == AllowanceThreshold::kCapillary ? p95_capillary : p95_limit;
}

const MovementBand& ScenarioBand::of(MovementPreset movement) const {
  for (const MovementBand& m : movements)
    if (m.movement == movement) return m;
  throw Error("no band for the movement '" + to_string(movement) + "' in scenario '" + scenario +
              "'");
}

namespace {

// Every solve of the band in a fixed order: the samples (scenario by scenario), then the
// sensitivity runs (each varied input low, then high, per scenario). Results are gathered in this
// order, so the band does not depend on how the solves are scheduled.
std::vector<detail::BandJob> plan_band_jobs(const CaseSpec& spec, const BandOptions& options,
                                            const std::vector<std::vector<double>>& rows) {
  const std::vector<BandInputRange>& ranges = options.ranges;
  const int n_scenarios = static_cast<int>(spec.scenarios.size());
  std::vector<detail::BandJob> jobs;
  const auto add_job = [&](std::vector<double> values, int k, std::string what) {
    detail::BandJob j;
    for (size_t i = 0; i < ranges.size(); ++i)
      j.geometric = j.geometric || (ranges[i].changes_geometry() && values[i] != ranges[i].nominal);
    j.values = std::move(values);
    j.scenario = k;
    j.what = std::move(what);
    jobs.push_back(std::move(j));
  };
  for (int j = 0; j < options.n_samples; ++j)
    for (int k = 0; k < n_scenarios; ++k)
      add_job(rows[static_cast<size_t>(j)], k,
              "band sample " + std::to_string(j + 1) + "/" + std::to_string(options.n_samples));
  if (!options.sensitivity) return jobs;
  std::vector<double> nominal_values(ranges.size());
  for (size_t i = 0; i < ranges.size(); ++i) nominal_values[i] = ranges[i].nominal;
  for (size_t i = 0; i < ranges.size(); ++i) {
    if (!ranges[i].varies()) continue;
    for (int k = 0; k < n_scenarios; ++k) {
      for (const bool high : {false, true}) {
        std::vector<double> values = nominal_values;
        values[i] = high ? ranges[i].high : ranges[i].low;
        add_job(std::move(values), k,
                "sensitivity to " + to_string(ranges[i].input) + (high ? " (high)" : " (low)"));
      }
    }
  }
  return jobs;
}

// The samples' allowances, from the solved jobs starting at *at (advanced past them).
std::vector<BandSample> gather_samples(const std::vector<std::vector<double>>& rows,
                                       int n_scenarios, std::vector<ScenarioAllowances>* solved,
                                       size_t* at) {
  std::vector<BandSample> samples;
  for (const std::vector<double>& row : rows) {
    BandSample sample;
    sample.inputs = row;
    for (int k = 0; k < n_scenarios; ++k)
      sample.allowances.push_back(std::move((*solved)[(*at)++]));
    samples.push_back(std::move(sample));
  }
  return samples;
}

// Percentiles per scenario, movement and criterion, over the samples in sample order.
std::vector<ScenarioBand> scenario_bands(const std::vector<ScenarioAllowances>& nominal,
                                         const std::vector<BandSample>& samples) {
  const std::vector<MovementPreset> movements = all_movement_presets();
  std::vector<ScenarioBand> bands;
  for (size_t k = 0; k < nominal.size(); ++k) {
    ScenarioBand sb;
    sb.scenario = nominal[k].scenario;
    sb.bone_loss_mm = nominal[k].bone_loss_mm;
    for (size_t m = 0; m < movements.size(); ++m) {
      PercentileSets sets;
      for (const BandSample& s : samples) {
        const MovementAllowance& a = s.allowances[k].movements[m];
        sets.peak_capillary.push_back(a.peak_capillary_n);
        sets.peak_limit.push_back(a.peak_limit_n);
        sets.p95_capillary.push_back(a.p95_capillary_n);
        sets.p95_limit.push_back(a.p95_limit_n);
      }
      MovementBand mb;
      mb.movement = movements[m];
      mb.peak_capillary = band_percentiles(sets.peak_capillary);
      mb.peak_limit = band_percentiles(sets.peak_limit);
      mb.p95_capillary = band_percentiles(sets.p95_capillary);
      mb.p95_limit = band_percentiles(sets.p95_limit);
      sb.movements.push_back(mb);
    }
    bands.push_back(std::move(sb));
  }
  return bands;
}

// Mean over the movements limited by compression of |allowance(high) - allowance(low)| / nominal
// (peak compression against the upper limit) in one scenario.
double scenario_swing(const ScenarioAllowances& nominal, const ScenarioAllowances& low,
                      const ScenarioAllowances& high) {
  double sum = 0;
  int n = 0;
  for (size_t m = 0; m < nominal.movements.size(); ++m) {
    const double at_nominal = nominal.movements[m].peak_limit_n;
    if (!std::isfinite(at_nominal)) continue;  // not limited by compression
    const double lo = low.movements[m].peak_limit_n, hi = high.movements[m].peak_limit_n;
    if (!std::isfinite(lo) || !std::isfinite(hi)) continue;
    sum += std::abs(hi - lo) / at_nominal;
    ++n;
  }
  return n > 0 ? sum / n : 0.0;
}

// The one-at-a-time runs of every varied input, from the solved jobs starting at *at, ranked by
// their mean swing (largest first, ties in input order).
std::vector<InputSensitivity> sensitivity_ranking(const std::vector<BandInputRange>& ranges,
                                                  const std::vector<ScenarioAllowances>& nominal,
                                                  std::vector<ScenarioAllowances>* solved,
                                                  size_t* at) {
  std::vector<InputSensitivity> ranking;
  for (const BandInputRange& r : ranges) {
    if (!r.varies()) continue;
    InputSensitivity s;
    s.input = r.input;
    s.low = r.low;
    s.high = r.high;
    for (size_t k = 0; k < nominal.size(); ++k) {
      s.at_low.push_back(std::move((*solved)[(*at)++]));
      s.at_high.push_back(std::move((*solved)[(*at)++]));
    }
    for (size_t k = 0; k < nominal.size(); ++k)
      s.swing.push_back(scenario_swing(nominal[k], s.at_low[k], s.at_high[k]));
    s.mean_swing =
        std::accumulate(s.swing.begin(), s.swing.end(), 0.0) / static_cast<double>(nominal.size());
    ranking.push_back(std::move(s));
  }
  std::stable_sort(ranking.begin(), ranking.end(),
                   [](const InputSensitivity& a, const InputSensitivity& b) {
                     return a.mean_swing > b.mean_swing;
                   });
  return ranking;
}

}  // namespace

AllowanceBand allowance_band(const Study& study, const BandOptions& options,
                             const ProgressCallback& progress, const std::atomic<bool>* cancel) {
  const CaseSpec& spec = study.spec();
  if (!study.complete())
    throw Error("allowance_band: the study is not complete; solve every scenario first");
  validate_band(spec, options);
  check_cancel(cancel);

  AllowanceBand band;
  band.options = options;
  band.nominal = nominal_allowances(study);
  const std::vector<std::vector<double>> rows = band_sample_inputs(options);
  const std::vector<detail::BandJob> jobs = plan_band_jobs(spec, options, rows);
  detail::BandSolveCounts counts;
  std::vector<ScenarioAllowances> solved =
      detail::solve_band_jobs(study, options.ranges, jobs, progress, cancel, &counts);
  band.n_solves = counts.n_solves;
  band.n_remeshed = counts.n_remeshed;
  band.n_refactorised = counts.n_refactorised;
  band.n_workers = counts.n_workers;
  band.stage_times = counts.stage_times;

  size_t at = 0;
  band.samples = gather_samples(rows, static_cast<int>(spec.scenarios.size()), &solved, &at);
  band.scenarios = scenario_bands(band.nominal, band.samples);
  if (options.sensitivity)
    band.sensitivity = sensitivity_ranking(options.ranges, band.nominal, &solved, &at);
  if (progress) progress("band done", 1.0);
  return band;
}

}  // namespace sharpey::analysis
