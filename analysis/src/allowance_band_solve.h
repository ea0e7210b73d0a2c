// The variability band's solves (allowance_band.h): the scenario solves a band needs, and the pool
// of workers that runs them side by side, each solve on one thread. Internal to the analysis
// library; method and figures in docs/analyses.md, "Variability band".
#pragma once

#include <atomic>
#include <string>
#include <vector>

#include "sharpey/analysis/allowance_band.h"

namespace sharpey::analysis::detail {

// One scenario solve of the band: a sample's (or a sensitivity run's) input values in one scenario.
struct BandJob {
  std::vector<double> values;  // one per range, in the ranges' order
  int scenario = 0;
  std::string what;        // for progress: "band sample 3/24", "sensitivity to ... (low)"
  bool geometric = false;  // the geometry differs from the study's: meshed anew
};

// What the solves took, for AllowanceBand's counters (same meaning as there).
struct BandSolveCounts {
  int n_solves = 0, n_remeshed = 0, n_refactorised = 0, n_workers = 0;
  BandStageTimes stage_times;
};

// Solves every job of `jobs` (the study's spec with each job's values, ranges as in BandOptions)
// and returns each job's allowances, in job order whatever the order of the solves.
//
// Workers: omp_get_max_threads() of the calling thread (the thread count the caller asked for),
// at most one per job. Each worker solves one job at a time on its own thread alone: OpenMP's
// count (assembly, recovery) is 1 on the worker's thread, and OpenBLAS is set to one thread for
// the process while any band runs (the previous count restored after the last one ends; its
// setting is process-wide), so a job's figures do not depend on the number of workers. Geometric
// jobs each mesh their own model (one mesher process per worker). The material-only jobs of a
// scenario are cut into one contiguous run per worker; within a run the first job analyses and
// factorises the study's mesh and the others refactorise that solver
// (fem::LinearElasticSolver::refactorise, equal to a fresh solve bit for bit). At most one factor
// per worker is alive at a time.
//
// progress(stage, fraction) is called from the workers, one call at a time, with a fraction that
// never decreases. Cancelled when *cancel becomes true (forwarded to the running solves and
// meshers within about 50 ms). The first failure in job order is rethrown once every worker has
// stopped (the others stop at their next check): InputError, MeshError, SolverError.
std::vector<ScenarioAllowances> solve_band_jobs(
    const Study& study, const std::vector<BandInputRange>& ranges, const std::vector<BandJob>& jobs,
    const ProgressCallback& progress, const std::atomic<bool>* cancel, BandSolveCounts* counts);

}  // namespace sharpey::analysis::detail
