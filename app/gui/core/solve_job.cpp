#include "core/solve_job.h"

#include <QMetaObject>

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

bool SolveJob::start(const analysis::CaseSpec& spec) {
  if (running_) return false;
  join();
  cancel_ = false;
  running_ = true;
  worker_ = std::thread([this, spec]() {
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
      auto study = std::make_shared<const analysis::Study>(spec, on_progress, &cancel_);
      std::lock_guard<std::mutex> lock(mutex_);
      result_ = std::move(study);
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
      if (was_cancelled) emit cancelled();
      else if (!kind.isEmpty()) emit failed(kind, message);
      else emit finished();
    });
  });
  return true;
}

void SolveJob::cancel() { cancel_ = true; }

std::shared_ptr<const analysis::Study> SolveJob::take_result() {
  std::lock_guard<std::mutex> lock(mutex_);
  return std::move(result_);
}

}  // namespace sharpey::app
