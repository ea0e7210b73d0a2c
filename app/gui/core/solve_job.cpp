#include "core/solve_job.h"

#include <QMetaObject>
#include <algorithm>
#include <filesystem>
#include <system_error>
#include <utility>

#include "core/worker_priority.h"
#include "sharpey/error.h"

namespace sharpey::app {

SolveJob::SolveJob(QObject* parent) : QObject(parent) {}

SolveJob::~SolveJob() {
  cancel_ = true;
  join();
}

void SolveJob::join() {
  if (worker_.joinable()) worker_.join();
}

namespace {

// "scenario 2/4 (2 mm loss): ", as the library prefixes its stages.
std::string level_prefix(const analysis::CaseSpec& spec, int k) {
  return "scenario " + std::to_string(k + 1) + "/" + std::to_string(spec.scenarios.size()) + " (" +
         spec.scenarios[static_cast<size_t>(k)].name + "): ";
}

// The stage without the library's "scenario j/m (name): " prefix.
std::string bare_stage(const std::string& stage) {
  const size_t at = stage.find("): ");
  return stage.rfind("scenario ", 0) == 0 && at != std::string::npos ? stage.substr(at + 3) : stage;
}

}  // namespace

bool SolveJob::start(const analysis::CaseSpec& spec) {
  if (running_) return false;
  join();
  cancel_ = false;
  running_ = true;
  spec_ = spec;
  study_.reset();
  n_solved_ = 0;
  n_from_cache_ = 0;
  {
    std::lock_guard<std::mutex> lock(mutex_);
    arrived_.clear();
    cache_notes_.clear();
  }
  worker_ = std::thread([this, spec, cache = cache_]() { run(spec, cache.get()); });
  return true;
}

// Signals are posted to this object's thread; they are dropped if the job is gone by then
// (the destructor joins first, so `this` outlives the worker).
template <typename Fn>
void SolveJob::post(Fn&& fn) {
  QMetaObject::invokeMethod(this, std::forward<Fn>(fn), Qt::QueuedConnection);
}

void SolveJob::run(const analysis::CaseSpec& spec, const analysis::SolutionCache* cache) {
  lower_this_thread_priority();
  QString kind, message;
  bool was_cancelled = false;
  try {
    solve_levels(spec, cache);
  } catch (const Cancelled&) {
    was_cancelled = true;
  } catch (const InputError& e) {
    kind = QStringLiteral("input");
    message = QString::fromStdString(e.what());
  } catch (const MeshError& e) {
    kind = QStringLiteral("meshing");
    message = QString::fromStdString(e.what());
  } catch (const SolverError& e) {
    kind = QStringLiteral("solver");
    message = QString::fromStdString(e.what());
  } catch (const std::exception& e) {
    kind = QStringLiteral("unexpected");
    message = QString::fromStdString(e.what());
  }
  post([this, kind, message, was_cancelled]() {
    running_ = false;
    join();
    adopt_arrived();
    if (was_cancelled)
      emit cancelled();
    else if (!kind.isEmpty())
      emit failed(kind, message);
    else
      emit finished();
  });
}

void SolveJob::level_progress(const analysis::CaseSpec& spec, int k, const std::string& stage,
                              double local) {
  const int count = static_cast<int>(spec.scenarios.size());
  const QString text = QString::fromStdString(level_prefix(spec, k) + stage);
  const double fraction = (k + std::clamp(local, 0.0, 1.0)) / std::max(1, count);
  post([this, text, fraction]() { emit progress(text, fraction); });
}

void SolveJob::note(const analysis::CaseSpec& spec, int k, const std::string& why) {
  std::lock_guard<std::mutex> lock(mutex_);
  cache_notes_ << QString::fromStdString(spec.scenarios[static_cast<size_t>(k)].name + ": " + why);
}

void SolveJob::solve_levels(const analysis::CaseSpec& spec, const analysis::SolutionCache* cache) {
  const int count = static_cast<int>(spec.scenarios.size());
  // Levels with a saved entry are read back; the others are solved by one StudySolver over
  // them alone, so the next one is meshed while one is solved, as without a cache.
  std::vector<char> saved(static_cast<size_t>(count), 0);
  analysis::CaseSpec rest = spec;
  rest.scenarios.clear();
  for (int k = 0; k < count; ++k) {
    std::error_code ec;
    saved[static_cast<size_t>(k)] =
        cache &&
        std::filesystem::exists(cache->entry_path(analysis::solution_cache_key(spec, k)), ec);
    if (!saved[static_cast<size_t>(k)])
      rest.scenarios.push_back(spec.scenarios[static_cast<size_t>(k)]);
  }
  std::unique_ptr<analysis::StudySolver> solver;
  // A case without levels: the solver says so (InputError).
  if (!rest.scenarios.empty() || count == 0)
    solver = std::make_unique<analysis::StudySolver>(rest, &cancel_);
  for (int k = 0; k < count; ++k) {
    if (cancel_) throw Cancelled();
    bool from_cache = false;
    std::unique_ptr<analysis::ScenarioSolution> solution =
        saved[static_cast<size_t>(k)] ? read_or_solve(spec, k, *cache, &from_cache)
                                      : solve_next(spec, k, *solver);
    hand_over(spec, k, cache, std::move(solution), from_cache);
  }
  if (count > 0) post([this]() { emit progress(QStringLiteral("done"), 1.0); });
}

std::unique_ptr<analysis::ScenarioSolution> SolveJob::read_or_solve(
    const analysis::CaseSpec& spec, int k, const analysis::SolutionCache& cache, bool* from_cache) {
  level_progress(spec, k, "reading the saved solution", 0.0);
  std::string why;
  std::unique_ptr<analysis::ScenarioSolution> solution = cache.load(spec, k, &why);
  *from_cache = solution != nullptr;
  if (*from_cache) return solution;
  // Damaged or unreadable: solved again, and said why (an entry another instance evicted since
  // it was seen is simply solved).
  if (why != analysis::kSolutionNotSaved) note(spec, k, why);
  return std::make_unique<analysis::ScenarioSolution>(
      spec, k, [&](const std::string& stage, double f) { level_progress(spec, k, stage, f); },
      &cancel_);
}

std::unique_ptr<analysis::ScenarioSolution> SolveJob::solve_next(const analysis::CaseSpec& spec,
                                                                 int k,
                                                                 analysis::StudySolver& solver) {
  const int j = solver.solved_count();
  const int m = solver.scenario_count();
  return solver.solve_next([&](const std::string& stage, double f) {
    level_progress(spec, k, bare_stage(stage), f * m - j);
  });
}

void SolveJob::hand_over(const analysis::CaseSpec& spec, int k,
                         const analysis::SolutionCache* cache,
                         std::unique_ptr<analysis::ScenarioSolution> solution, bool from_cache) {
  const int count = static_cast<int>(spec.scenarios.size());
  // Saved after it is handed over, from bytes written now: the window may drop the level
  // (another case opened) while the file is written.
  std::string key, bytes;
  if (from_cache) {
    ++n_from_cache_;
  } else {
    ++n_solved_;
    if (cache) {
      key = analysis::solution_cache_key(spec, k);
      bytes = analysis::write_solution(*solution, key);
    }
  }
  {
    std::lock_guard<std::mutex> lock(mutex_);
    arrived_.push_back(std::move(solution));
  }
  post([this, k, count]() {
    adopt_arrived();
    emit level_solved(k, count);
  });
  std::string why;
  if (!bytes.empty() && !cache->store_entry(key, bytes, &why)) note(spec, k, "not saved: " + why);
}

void SolveJob::adopt_arrived() {
  std::vector<std::unique_ptr<analysis::ScenarioSolution>> solved;
  {
    std::lock_guard<std::mutex> lock(mutex_);
    solved.swap(arrived_);
  }
  for (auto& s : solved) {
    if (!study_) study_ = std::make_shared<analysis::Study>(analysis::Study::unsolved(spec_));
    study_->add(std::move(s));
  }
}

void SolveJob::cancel() { cancel_ = true; }

std::shared_ptr<const analysis::Study> SolveJob::take_result() { return std::move(study_); }

QString SolveJob::cache_notes() const {
  std::lock_guard<std::mutex> lock(mutex_);
  return cache_notes_.join(QLatin1Char('\n'));
}

}  // namespace sharpey::app
