// Variability band of the force allowance: how far the allowances of force_allowance.h move when
// the tissue properties and the measured geometry vary within their documented ranges.
//
// A Latin hypercube over the uncertain inputs (fixed seed), one solve per sample and scenario, the
// allowances of every sample, their 10th, 50th and 90th percentiles (the 10th is the conservative
// allowance), and a one-at-a-time sensitivity ranking. It costs many solves (n_samples per
// scenario, plus two per input for the sensitivity), so the batch command computes it only when
// asked (case key allowance.band or --band). Method, inputs and sources: docs/analyses.md,
// "Variability band". No Qt, no VTK; never prints.
#pragma once

#include <atomic>
#include <cstdint>
#include <string>
#include <vector>

#include "sharpey/analysis/case_spec.h"
#include "sharpey/analysis/force_allowance.h"
#include "sharpey/analysis/study.h"

namespace sharpey::analysis {

// The uncertain inputs, in the order they are sampled and reported.
enum class BandInput {
  kPdlModulus,        // PDL Young's modulus, MPa
  kPdlPoisson,        // PDL Poisson ratio
  kPdlWidth,          // PDL width: the case's profile scaled to this mean width, mm
  kBoneLevel,         // alveolar crest shifted apically by this much (reading error), mm
  kRootLength,        // root length changed by this much, mm
  kCorticalModulus,   // cortical bone Young's modulus, MPa
  kCancellousModulus  // cancellous bone Young's modulus, MPa
};
std::vector<BandInput> all_band_inputs();
std::string to_string(BandInput input);  // "pdl_modulus", "pdl_poisson", "pdl_width_mm", ...

enum class BandDistribution { kUniform, kLogUniform };
std::string to_string(BandDistribution distribution);  // "uniform", "log-uniform"

// One input's range. low <= nominal is not required (a case's own value may lie outside the
// published range); low == high fixes the input at that value, and a range with low == high ==
// nominal takes the input out of the band (no variation).
struct BandInputRange {
  BandInput input = BandInput::kPdlModulus;
  double low = 0, high = 0;
  double nominal = 0;  // the case's value
  std::string unit;    // "MPa", "", "mm"
  BandDistribution distribution = BandDistribution::kUniform;
  std::string source;  // status and source (check-values.md sections 1, 2, 12)
  bool varies() const { return low != high || low != nominal; }
  bool changes_geometry() const;  // PDL width, bone level, root length: a new mesh per value
};

// The documented ranges for `spec` (check-values.md section 12):
//   PDL modulus   0.05 to 0.7 MPa, log-uniform (published);
//   PDL Poisson   0.45 to 0.49, uniform (published);
//   PDL width     0.1 to 0.4 mm mean width, uniform, the case's profile scaled (published);
//   bone level    +- spec.band.bone_level_error_mm about the read level, uniform (practice);
//   root length   +- spec.band.root_length_error_mm about the case's, uniform (practice);
//   cortical      13700 to 14500 MPa, uniform (published);
//   cancellous    350 to 2500 MPa, log-uniform (published range; log-uniform is our choice).
std::vector<BandInputRange> default_band_ranges(const CaseSpec& spec);

struct BandOptions {
  int n_samples = 24;
  std::uint64_t seed = 12345;  // BandSpec::seed's default
  bool sensitivity = true;     // the one-at-a-time ranking: two more solves per varied input
  std::vector<BandInputRange> ranges;  // one per input of all_band_inputs(), in that order
};
// The options a case asks for (spec.band) with default_band_ranges(spec).
BandOptions band_options(const CaseSpec& spec);

// Percentiles over the samples, N (linear interpolation between order statistics; +infinity
// where the samples' allowances are, see MovementAllowance).
struct BandPercentiles {
  double p10 = 0, p50 = 0, p90 = 0;
};
struct MovementBand {
  MovementPreset movement = MovementPreset::kNone;
  BandPercentiles peak_capillary, peak_limit, p95_capillary, p95_limit;
  const BandPercentiles& of(AllowanceMeasure measure, AllowanceThreshold threshold) const;
  // The conservative allowance: the 10th percentile (nine samples in ten allow more), N.
  double conservative_n(AllowanceMeasure measure, AllowanceThreshold threshold) const {
    return of(measure, threshold).p10;
  }
};
struct ScenarioBand {
  std::string scenario;
  double bone_loss_mm = 0;
  std::vector<MovementBand> movements;                    // order of all_movement_presets()
  const MovementBand& of(MovementPreset movement) const;  // throws Error when absent
};

struct BandSample {
  std::vector<double> inputs;                  // one value per range, in the ranges' order
  std::vector<ScenarioAllowances> allowances;  // one per scenario
};

// One input moved alone to the ends of its range, every other input at its nominal value.
struct InputSensitivity {
  BandInput input = BandInput::kPdlModulus;
  double low = 0, high = 0;
  std::vector<ScenarioAllowances> at_low, at_high;  // one per scenario
  // Per scenario: the mean over the movements compression limits of
  // |allowance(high) - allowance(low)| / nominal allowance, peak compression against the upper
  // limit (the same ratio for the capillary threshold, by linearity). Dimensionless.
  std::vector<double> swing;
  double mean_swing = 0;  // over the scenarios: the ranking key
};

// Time per stage of the band's solves, summed over them, s. Several workers solve at once, so the
// sums exceed the band's wall time (about n_workers times).
struct BandStageTimes {
  double mesh_s = 0;             // meshing (TetGen in its process, second-order nodes)
  double assembly_s = 0;         // stiffness assembly (fem::SolverStatistics::assembly_s)
  double analyse_s = 0;          // ordering and symbolic analysis (not repeated by refactorising)
  double factorise_s = 0;        // numeric factorisation
  double unit_loads_s = 0;       // the unit load cases: solves and PDL fields
  double post_processing_s = 0;  // root nodes, edge band, root surface and root map samplers
  double evaluate_s = 0;         // the movements' allowances
};

struct AllowanceBand {
  BandOptions options;
  std::vector<ScenarioAllowances> nominal;  // one per scenario
  std::vector<BandSample> samples;          // in sample order
  std::vector<ScenarioBand> scenarios;      // the percentiles
  // Inputs that vary, largest mean_swing first (ties in input order); empty without
  // options.sensitivity.
  std::vector<InputSensitivity> sensitivity;
  int n_solves = 0;    // scenario solves the band needed (samples and sensitivity)
  int n_remeshed = 0;  // of those, solves that meshed a new model (geometry changed)
  // Of the others (materials changed only), solves that refactorised the previous material-only
  // solve's solver (numeric factorisation only). A scenario's material-only solves are cut into
  // one run per worker and the first of each run analyses afresh, so this is their number minus
  // min(n_workers, their number), per scenario.
  int n_refactorised = 0;
  int n_workers = 0;  // solves run side by side (the caller's thread count, at most one per solve)
  BandStageTimes stage_times;
};

// Checks `options` against `spec`: sample count (1 to kMaxBandSamples), every range finite, low <=
// high, inside the physical limits (moduli > 0, Poisson 0 to 0.5, widths 0.05 to 1 mm, shifts
// within +-5 mm), and the extreme geometries valid for every scenario. Throws InputError naming the
// value (case key where there is one) and the fix.
constexpr int kMaxBandSamples = 1000;
void validate_band(const CaseSpec& spec, const BandOptions& options);

// The Latin hypercube: options.n_samples rows, one value per range (ranges that do not vary keep
// their nominal value). Each input has its own random stream derived from the seed and its index,
// so it is reproducible bit for bit on any machine and thread count.
std::vector<std::vector<double>> band_sample_inputs(const BandOptions& options);

// `spec` with one value per range applied (materials, PDL width profile, crest level, root length).
CaseSpec band_sample_case(const CaseSpec& spec, const std::vector<BandInputRange>& ranges,
                          const std::vector<double>& values);

// The band of every scenario of `study` (which must be complete). The solves (samples, then the
// sensitivity runs) are gathered in sample order whatever the order they ran in, and every solve
// runs on one thread: the band is the same bit for bit for a fixed seed at any thread count.
// Parallelism comes from solving several samples at once: as many workers as the calling thread's
// OpenMP thread count (omp_get_max_threads(), the count the caller set for its solves), each with
// its own mesher process and factor. While the band runs, OpenBLAS is set to one thread for the
// whole process (its count is process-wide) and restored afterwards. A sample that changes only
// materials reuses the study's mesh of that scenario and, within a worker's run of such samples,
// the symbolic factorisation (fem::LinearElasticSolver::refactorise); one that changes the
// geometry is meshed anew. Peak memory: up to n_workers factors at once (about 1.1 GB each for the
// standard incisor). progress("band sample i/n, scenario k/K: stage", fraction), called from the
// workers one call at a time; Cancelled when *cancel becomes true (checked between and inside
// solves; meshers are killed). Throws InputError (validate_band), MeshError, SolverError.
AllowanceBand allowance_band(const Study& study, const BandOptions& options,
                             const ProgressCallback& progress = {},
                             const std::atomic<bool>* cancel = nullptr);

// Percentiles of `values` (any order; +infinity allowed), linear interpolation between order
// statistics at position p (n - 1). Throws Error for an empty vector.
BandPercentiles band_percentiles(std::vector<double> values);

}  // namespace sharpey::analysis
