#include "allowance_band_solve.h"

#include <dlfcn.h>
#include <omp.h>

#include <algorithm>
#include <chrono>
#include <condition_variable>
#include <exception>
#include <memory>
#include <mutex>
#include <system_error>
#include <thread>

#include "sharpey/error.h"
#include "study_memory.h"

namespace sharpey::analysis::detail {

namespace {

using Clock = std::chrono::steady_clock;
double seconds_since(Clock::time_point t0) {
  return std::chrono::duration<double>(Clock::now() - t0).count();
}

// OpenBLAS's thread count is one setting for the whole process (openblas_set_num_threads; Debian
// 12's OpenBLAS 0.3.21 has no per-thread one). While a band runs it is 1, so the BLAS calls inside
// CHOLMOD's factorisation and solves run on the worker that makes them and sum in the same order
// whatever the thread count; the cores are used by solving samples side by side instead. The count
// the process had is restored when the last band running in it ends. Looked up at run time, so any
// BLAS links (with another BLAS this does nothing). Other solves of the process that run at the
// same time (the app solving new levels while a cancelled band winds down) also get one BLAS
// thread meanwhile: slower, and their last bits may differ from a solve with more threads.
// The OpenMP-threaded OpenBLAS takes a calling thread's count from its OpenMP thread count, but
// 0.3.21 keeps it in one global variable too and runs on the calling thread alone when that is 1
// (num_cpu_avail): the same process-wide setting serves both builds. There openblas_set_num_threads
// also sets the calling thread's OpenMP thread count, which is put back here (the band's caller
// keeps its own).
class SingleThreadedBlas {
 public:
  SingleThreadedBlas() {
    const std::lock_guard<std::mutex> lock(state().mutex);
    if (state().n_active++ == 0 && set_ != nullptr) {
      state().saved = get_ != nullptr ? get_() : 0;
      set_keeping_openmp(1);
    }
  }
  ~SingleThreadedBlas() {
    const std::lock_guard<std::mutex> lock(state().mutex);
    if (--state().n_active == 0 && set_ != nullptr && state().saved > 0)
      set_keeping_openmp(state().saved);
  }
  SingleThreadedBlas(const SingleThreadedBlas&) = delete;
  SingleThreadedBlas& operator=(const SingleThreadedBlas&) = delete;

 private:
  struct State {
    std::mutex mutex;
    int n_active = 0;  // bands running
    int saved = 0;     // the count before the first of them
  };
  static State& state() {
    static State s;
    return s;
  }
  void set_keeping_openmp(int n_blas_threads) const {
    const int n_openmp_threads = omp_get_max_threads();
    set_(n_blas_threads);
    omp_set_num_threads(n_openmp_threads);
  }
  using GetThreads = int (*)();
  using SetThreads = void (*)(int);
  const GetThreads get_ =
      reinterpret_cast<GetThreads>(::dlsym(RTLD_DEFAULT, "openblas_get_num_threads"));
  const SetThreads set_ =
      reinterpret_cast<SetThreads>(::dlsym(RTLD_DEFAULT, "openblas_set_num_threads"));
};

// OpenMP's thread count (the fem library's assembly and stress recovery, Eigen) is a setting of
// each thread: one on a worker's thread while it solves, restored afterwards (a worker may be the
// calling thread).
class SingleThreadedOpenMp {
 public:
  SingleThreadedOpenMp() : saved_(omp_get_max_threads()) { omp_set_num_threads(1); }
  ~SingleThreadedOpenMp() { omp_set_num_threads(saved_); }
  SingleThreadedOpenMp(const SingleThreadedOpenMp&) = delete;
  SingleThreadedOpenMp& operator=(const SingleThreadedOpenMp&) = delete;

 private:
  int saved_;
};

// Progress of the whole band from several workers: the jobs done plus the running jobs' fractions,
// over the job count; one call of the caller's callback at a time, never decreasing.
class BandProgress {
 public:
  BandProgress(const ProgressCallback& progress, size_t n_jobs, int n_workers)
      : progress_(progress), n_jobs_(n_jobs), running_(static_cast<size_t>(n_workers), 0.0) {}
  void report(int worker, const std::string& stage, double fraction) {
    if (!progress_) return;
    const std::lock_guard<std::mutex> lock(mutex_);
    running_[static_cast<size_t>(worker)] = std::clamp(fraction, 0.0, 1.0);
    double sum = static_cast<double>(n_done_);
    for (const double f : running_) sum += f;
    shown_ = std::max(shown_, std::min(1.0, sum / static_cast<double>(n_jobs_)));
    progress_(stage, shown_);
  }
  void job_done(int worker) {
    const std::lock_guard<std::mutex> lock(mutex_);
    running_[static_cast<size_t>(worker)] = 0;
    ++n_done_;
  }

 private:
  const ProgressCallback& progress_;
  size_t n_jobs_;
  std::mutex mutex_;
  std::vector<double> running_;  // per worker
  size_t n_done_ = 0;
  double shown_ = 0;
};

// What a worker takes at a time: one geometric job, or a run of material-only jobs of one scenario
// (job indices, in job order) solved by one solver refactorised from job to job.
struct WorkUnit {
  std::vector<size_t> jobs;
  bool material_only = false;
};

// The geometric jobs one by one (job order), then each scenario's material-only jobs cut into
// min(n_workers, count) contiguous runs of near-equal length. Depends on the jobs and the worker
// count only, so the counters do too.
std::vector<WorkUnit> work_units(const std::vector<BandJob>& jobs, int n_workers, int n_scenarios) {
  std::vector<WorkUnit> units;
  for (size_t i = 0; i < jobs.size(); ++i)
    if (jobs[i].geometric) units.push_back({{i}, false});
  for (int k = 0; k < n_scenarios; ++k) {
    std::vector<size_t> same;
    for (size_t i = 0; i < jobs.size(); ++i)
      if (!jobs[i].geometric && jobs[i].scenario == k) same.push_back(i);
    const size_t n_runs = std::min(same.size(), static_cast<size_t>(n_workers));
    size_t at = 0;
    for (size_t r = 0; r < n_runs; ++r) {
      const size_t length = same.size() / n_runs + (r < same.size() % n_runs ? 1 : 0);
      units.push_back(
          {{same.begin() + static_cast<long>(at), same.begin() + static_cast<long>(at + length)},
           true});
      at += length;
    }
  }
  return units;
}

// The stage a ScenarioSolution reports last, timed: "unit loads" to "post-processing" to "done".
struct StageClock {
  Clock::time_point unit_loads, post_processing, done;
  void mark(const std::string& stage) {
    if (stage == "unit loads") unit_loads = Clock::now();
    if (stage == "post-processing") post_processing = Clock::now();
    if (stage == "done") done = Clock::now();
  }
};

// The workers and what they share. Results are stored by job index.
class BandPool {
 public:
  BandPool(const Study& study, const std::vector<BandInputRange>& ranges,
           const std::vector<BandJob>& jobs, std::vector<WorkUnit> units, BandProgress* progress)
      : study_(study),
        ranges_(ranges),
        jobs_(jobs),
        units_(std::move(units)),
        progress_(progress),
        solved_(jobs.size()) {}

  // Takes units until none is left or a solve failed; `cancel` goes to the solves and meshers.
  void work(int worker, const std::atomic<bool>* cancel);
  // Stops the workers at their next check (a failure elsewhere, or the caller's cancel).
  void stop() { stop_ = true; }
  const std::atomic<bool>* stop_flag() const { return &stop_; }
  // The first failure in job order, else Cancelled when a solve was cancelled; then the results.
  std::vector<ScenarioAllowances> take_results();
  BandStageTimes stage_times() const { return times_; }

 private:
  ScenarioAllowances solve(int worker, size_t i, std::unique_ptr<fem::LinearElasticSolver>* reused,
                           const std::atomic<bool>* cancel, BandStageTimes* times) const;
  void fail(size_t job, std::exception_ptr error);

  const Study& study_;
  const std::vector<BandInputRange>& ranges_;
  const std::vector<BandJob>& jobs_;
  const std::vector<WorkUnit> units_;
  BandProgress* progress_;
  std::vector<ScenarioAllowances> solved_;
  std::atomic<size_t> next_unit_{0};
  std::atomic<bool> stop_{false};
  std::mutex mutex_;  // guards what follows
  BandStageTimes times_;
  std::exception_ptr error_;
  size_t error_job_ = 0;
  bool cancelled_ = false;
};

void add_times(const BandStageTimes& t, BandStageTimes* sum) {
  sum->mesh_s += t.mesh_s;
  sum->assembly_s += t.assembly_s;
  sum->analyse_s += t.analyse_s;
  sum->factorise_s += t.factorise_s;
  sum->unit_loads_s += t.unit_loads_s;
  sum->post_processing_s += t.post_processing_s;
  sum->evaluate_s += t.evaluate_s;
}

ScenarioAllowances BandPool::solve(int worker, size_t i,
                                   std::unique_ptr<fem::LinearElasticSolver>* reused,
                                   const std::atomic<bool>* cancel, BandStageTimes* times) const {
  const BandJob& job = jobs_[i];
  const CaseSpec sample = band_sample_case(study_.spec(), ranges_, job.values);
  const std::string stage = job.what + ", scenario " + std::to_string(job.scenario + 1) + "/" +
                            std::to_string(sample.scenarios.size()) + ": ";
  StageClock clock;
  const ProgressCallback inner = [&](const std::string& st, double f) {
    clock.mark(st);
    progress_->report(worker, stage + st, f);
  };
  mesh::ToothModel model;
  if (job.geometric) {
    inner("mesh", 0.0);
    const Clock::time_point t0 = Clock::now();
    model = build_scenario_model(scenario_model(sample, job.scenario),
                                 sample.scenarios[static_cast<size_t>(job.scenario)].name, cancel);
    times->mesh_s += seconds_since(t0);
  } else {
    model = study_.solutions()[static_cast<size_t>(job.scenario)]->model();
  }
  const bool analyses = reused == nullptr || *reused == nullptr;
  const std::unique_ptr<const ScenarioSolution> solution =
      reused == nullptr ? std::make_unique<const ScenarioSolution>(sample, job.scenario,
                                                                   std::move(model), inner, cancel)
                        : std::make_unique<const ScenarioSolution>(
                              sample, job.scenario, std::move(model), reused, inner, cancel);
  const fem::SolverStatistics& s = solution->solver_statistics();
  times->assembly_s += s.assembly_s;
  times->analyse_s += analyses ? s.analyse_s : 0.0;
  times->factorise_s += s.factorise_s;
  times->unit_loads_s +=
      std::chrono::duration<double>(clock.post_processing - clock.unit_loads).count();
  times->post_processing_s +=
      std::chrono::duration<double>(clock.done - clock.post_processing).count();
  const Clock::time_point t0 = Clock::now();
  ScenarioAllowances allowances = scenario_allowances(*solution, sample.load, sample.thresholds);
  times->evaluate_s += seconds_since(t0);
  return allowances;
}

void BandPool::work(int worker, const std::atomic<bool>* cancel) {
  const SingleThreadedOpenMp one_thread;
  BandStageTimes times;
  for (size_t u = next_unit_++; u < units_.size() && !stop_; u = next_unit_++) {
    const WorkUnit& unit = units_[u];
    std::unique_ptr<fem::LinearElasticSolver> reused;  // this run's solver; freed at its end
    for (const size_t i : unit.jobs) {
      try {
        if (cancel != nullptr && cancel->load()) throw Cancelled();
        solved_[i] = solve(worker, i, unit.material_only ? &reused : nullptr, cancel, &times);
      } catch (...) {
        fail(i, std::current_exception());
        break;
      }
      progress_->job_done(worker);
    }
  }
  const std::lock_guard<std::mutex> lock(mutex_);
  add_times(times, &times_);
}

void BandPool::fail(size_t job, std::exception_ptr error) {
  stop_ = true;
  const std::lock_guard<std::mutex> lock(mutex_);
  try {
    std::rethrow_exception(error);
  } catch (const Cancelled&) {
    cancelled_ = true;  // the caller's cancel, or another worker's failure stopping this one
    return;
  } catch (...) {
  }
  if (!error_ || job < error_job_) {
    error_ = error;
    error_job_ = job;
  }
}

std::vector<ScenarioAllowances> BandPool::take_results() {
  if (error_) std::rethrow_exception(error_);
  if (cancelled_ || stop_) throw Cancelled();
  return std::move(solved_);
}

// Runs pool.work on n_workers threads of their own and waits, passing the caller's cancel on to
// the pool every 50 ms. Returns the number of threads started (0: none could be).
int run_workers(BandPool* pool, int n_workers, const std::atomic<bool>* cancel) {
  std::mutex mutex;
  std::condition_variable finished;
  int n_running = 0;
  std::vector<std::thread> threads;
  for (int w = 0; w < n_workers; ++w) {
    {
      const std::lock_guard<std::mutex> lock(mutex);
      ++n_running;
    }
    try {
      threads.emplace_back([pool, w, &mutex, &finished, &n_running] {
        pool->work(w, pool->stop_flag());
        const std::lock_guard<std::mutex> lock(mutex);
        --n_running;
        finished.notify_all();
      });
    } catch (const std::system_error&) {
      const std::lock_guard<std::mutex> lock(mutex);
      --n_running;
      break;  // fewer workers: the units are taken by those that run
    }
  }
  std::unique_lock<std::mutex> lock(mutex);
  while (n_running > 0) {
    finished.wait_for(lock, std::chrono::milliseconds(50));
    if (cancel != nullptr && cancel->load()) pool->stop();
  }
  lock.unlock();
  for (std::thread& t : threads) t.join();
  return static_cast<int>(threads.size());
}

}  // namespace

std::vector<ScenarioAllowances> solve_band_jobs(
    const Study& study, const std::vector<BandInputRange>& ranges, const std::vector<BandJob>& jobs,
    const ProgressCallback& progress, const std::atomic<bool>* cancel, BandSolveCounts* counts) {
  const int n_scenarios = static_cast<int>(study.spec().scenarios.size());
  int n_workers = std::max(1, omp_get_max_threads());  // the caller's thread count
  if (jobs.size() < static_cast<size_t>(n_workers))
    n_workers = std::max(1, static_cast<int>(jobs.size()));
  std::vector<WorkUnit> units = work_units(jobs, n_workers, n_scenarios);
  *counts = BandSolveCounts{};
  for (const WorkUnit& u : units) {
    if (u.material_only) counts->n_refactorised += static_cast<int>(u.jobs.size()) - 1;
    if (!u.material_only) ++counts->n_remeshed;
  }
  BandProgress band_progress(progress, jobs.size(), n_workers);
  BandPool pool(study, ranges, jobs, std::move(units), &band_progress);
  const SingleThreadedBlas one_blas_thread;
  counts->n_workers = run_workers(&pool, n_workers, cancel);
  if (counts->n_workers == 0) {  // no thread could be started: the calling thread works alone
    counts->n_workers = 1;
    pool.work(0, cancel);
  }
  std::vector<ScenarioAllowances> solved = pool.take_results();
  counts->n_solves = static_cast<int>(jobs.size());
  counts->stage_times = pool.stage_times();
  return solved;
}

}  // namespace sharpey::analysis::detail
