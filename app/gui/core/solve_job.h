// Meshes and solves a case (analysis::Study) on a worker thread, so the window never freezes.
// Progress, completion, failure and cancellation arrive as signals on the thread that owns the
// job. QtCore only.
#pragma once

#include <QObject>
#include <QString>
#include <atomic>
#include <memory>
#include <mutex>
#include <thread>

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
  // The study of the last `finished` signal (null before); hands over ownership.
  std::shared_ptr<const analysis::Study> take_result();

 signals:
  // stage: the library's description ("scenario 2/4 (2 mm loss): factorise"); fraction in [0, 1].
  void progress(const QString& stage, double fraction);
  void finished();
  // kind: "input", "meshing", "solver" or "unexpected"; message: the library's text.
  void failed(const QString& kind, const QString& message);
  void cancelled();

 private:
  void join();
  std::thread worker_;
  std::atomic<bool> cancel_{false};
  bool running_ = false;
  std::mutex mutex_;
  std::shared_ptr<const analysis::Study> result_;
};

}  // namespace sharpey::app
