#include "core/solve_job.h"

#include <QMetaObject>
#include <algorithm>

#include "sharpey/error.h"

#ifdef __linux__
#include <sys/resource.h>
#include <sys/syscall.h>
#include <unistd.h>
#endif

namespace sharpey::app {

namespace {

// The window's thread comes first: the solve (and the threads it starts: the mesher, the solver's
// OpenMP team) runs a few nice levels lower, so the first levels on screen stay smooth to use
// while the others are solved. Best effort: nothing happens where it is not allowed.
void lower_this_thread_priority() {
#ifdef __linux__
  const auto tid = static_cast<id_t>(syscall(SYS_gettid));
  const int now = getpriority(PRIO_PROCESS, tid);
  setpriority(PRIO_PROCESS, tid, std::min(19, now + 5));
#endif
}

}  // namespace

SolveJob::SolveJob(QObject* parent) : QObject(parent) {}

SolveJob::~SolveJob() {
  cancel_ = true;
  join();
}

void SolveJob::join() {
  if (worker_.joinable()) worker_.join();
}

bool SolveJob::start(const analysis::CaseSpec& spec) {
  if (running_) return false;
  join();
  cancel_ = false;
  running_ = true;
  spec_ = spec;
  study_.reset();
  {
    std::lock_guard<std::mutex> lock(mutex_);
    arrived_.clear();
  }
  worker_ = std::thread([this, spec]() {
    lower_this_thread_priority();
    // Signals are posted to this object's thread; they are dropped if the job is gone by then
    // (the destructor joins first, so `this` outlives the worker).
    auto post = [this](auto&& fn) { QMetaObject::invokeMethod(this, fn, Qt::QueuedConnection); };
    const analysis::ProgressCallback on_progress = [&](const std::string& stage, double fraction) {
      const QString text = QString::fromStdString(stage);
      post([this, text, fraction]() { emit progress(text, fraction); });
    };
    QString kind, message;
    bool was_cancelled = false;
    try {
      analysis::StudySolver solver(spec, &cancel_);
      const int count = solver.scenario_count();
      while (!solver.done()) {
        auto solution = solver.solve_next(on_progress);
        const int index = solver.solved_count() - 1;
        {
          std::lock_guard<std::mutex> lock(mutex_);
          arrived_.push_back(std::move(solution));
        }
        post([this, index, count]() {
          adopt_arrived();
          emit level_solved(index, count);
        });
      }
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
      if (was_cancelled) emit cancelled();
      else if (!kind.isEmpty()) emit failed(kind, message);
      else emit finished();
    });
  });
  return true;
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

}  // namespace sharpey::app
