// Meshes and solves a case (analysis::StudySolver) on a worker thread, so the window never
// freezes. The bone levels are solved one at a time in the case's order and each is handed over
// as soon as it is solved (level_solved), so the first level can be shown while the others are
// solved. With a solution cache (set_cache), a level saved there earlier is read back instead of
// solved (a damaged entry is solved again), and each level solved is saved. Progress, levels,
// completion, failure and cancellation arrive as signals on the thread that owns the job.
// QtCore only.
#pragma once

#include <QObject>
#include <QString>
#include <QStringList>
#include <atomic>
#include <memory>
#include <mutex>
#include <thread>
#include <vector>

#include "sharpey/analysis/solution_cache.h"
#include "sharpey/analysis/study.h"

namespace sharpey::app {

class SolveJob : public QObject {
  Q_OBJECT

 public:
  explicit SolveJob(QObject* parent = nullptr);
  // Cancels a running solve and waits for the worker to stop.
  ~SolveJob() override;

  // Starts meshing and solving `spec`; returns false (and does nothing) while a solve runs.
  bool start(const analysis::CaseSpec& spec);
  // Asks the worker to stop at the next stage boundary; `cancelled` follows.
  void cancel();
  bool running() const { return running_; }
  // Saved solutions to read levels from and save solved levels to (null: none, every level is
  // solved). Takes effect at the next start.
  void set_cache(std::shared_ptr<const analysis::SolutionCache> cache) {
    cache_ = std::move(cache);
  }
  const analysis::SolutionCache* cache() const { return cache_.get(); }
  // Of the current (or last) start: levels meshed and solved, levels read from the cache, and
  // why saved levels could not be used or saved (damaged entries, a full disk), one per line.
  int levels_solved() const { return n_solved_; }
  int levels_from_cache() const { return n_from_cache_; }
  QString cache_notes() const;
  // The study of the current (or last) solve with the levels solved so far, in the case's order:
  // it grows by one level before each level_solved signal (on this object's thread only). Null
  // before the first level of a solve is solved.
  std::shared_ptr<const analysis::Study> study() const { return study_; }
  // The study of the last solve (complete after `finished`; the levels solved before a cancel or
  // a failure otherwise; null when none was solved); hands over ownership.
  std::shared_ptr<const analysis::Study> take_result();

 signals:
  // stage: the library's description ("scenario 2/4 (2 mm loss): factorise"); fraction in [0, 1].
  void progress(const QString& stage, double fraction);
  // Level `index` of `count` is solved and added to study(). Levels arrive in order 0, 1, ...
  void level_solved(int index, int count);
  void finished();
  // kind: "input", "meshing", "solver" or "unexpected"; message: the library's text.
  void failed(const QString& kind, const QString& message);
  void cancelled();

 private:
  void join();
  void adopt_arrived();
  // The worker's steps (worker thread; `spec` and `cache` are the worker's own).
  template <typename Fn>
  void post(Fn&& fn);
  void run(const analysis::CaseSpec& spec, const analysis::SolutionCache* cache);
  void solve_levels(const analysis::CaseSpec& spec, const analysis::SolutionCache* cache);
  // Level k from the cache, or solved on its own when its entry cannot be read.
  std::unique_ptr<analysis::ScenarioSolution> read_or_solve(const analysis::CaseSpec& spec, int k,
                                                            const analysis::SolutionCache& cache,
                                                            bool* from_cache);
  // Level k, the next one `solver` solves.
  std::unique_ptr<analysis::ScenarioSolution> solve_next(const analysis::CaseSpec& spec, int k,
                                                         analysis::StudySolver& solver);
  // Hands level k to this object's thread, then saves it to the cache when it was solved.
  void hand_over(const analysis::CaseSpec& spec, int k, const analysis::SolutionCache* cache,
                 std::unique_ptr<analysis::ScenarioSolution> solution, bool from_cache);
  // Progress of level k: `local` in [0, 1] of that level.
  void level_progress(const analysis::CaseSpec& spec, int k, const std::string& stage,
                      double local);
  // Why level k's saved solution was not used or not saved (shown by cache_notes).
  void note(const analysis::CaseSpec& spec, int k, const std::string& why);
  std::thread worker_;
  std::atomic<bool> cancel_{false};
  bool running_ = false;
  mutable std::mutex mutex_;
  // Solved by the worker, not yet added to the study (guarded by mutex_).
  std::vector<std::unique_ptr<analysis::ScenarioSolution>> arrived_;
  std::shared_ptr<const analysis::SolutionCache> cache_;
  std::atomic<int> n_solved_{0}, n_from_cache_{0};
  QStringList cache_notes_;                 // guarded by mutex_
  analysis::CaseSpec spec_;                 // of the current solve
  std::shared_ptr<analysis::Study> study_;  // this object's thread only
};

}  // namespace sharpey::app
