// The force allowances of the solved bone levels, computed off the window's thread.
//
// Nominal allowances (analysis::scenario_allowances: seven evaluations per level by linearity, a
// fraction of a second) follow every solved level at once: update() is called whenever the study
// grows or the force direction, point of application or thresholds change, and computes what is
// missing on a worker thread; nominal_ready follows. A force magnitude change needs nothing (the
// allowances do not depend on it). The variability band (analysis::allowance_band: many solves)
// runs only when asked (start_band), on a second worker a few nice levels down, with progress,
// cancellable at any time; it belongs to the study it was started on and is dropped with it.
// QtCore only.
#pragma once

#include <QObject>
#include <QString>
#include <atomic>
#include <memory>
#include <thread>
#include <vector>

#include "sharpey/analysis/allowance_band.h"
#include "sharpey/analysis/force_allowance.h"
#include "sharpey/analysis/study.h"

namespace sharpey::app {

class AllowanceJob : public QObject {
  Q_OBJECT

 public:
  explicit AllowanceJob(QObject* parent = nullptr);
  // Cancels the band and waits for both workers.
  ~AllowanceJob() override;

  // The study on display (levels solved so far; may grow later, on this thread only), the force
  // system and thresholds of the case. Computes the nominal allowances of the levels that have
  // none for this direction, point of application and thresholds. A different study drops the
  // allowances and the band of the previous one (a running band is cancelled). Null: clears all.
  void update(std::shared_ptr<const analysis::Study> study, const analysis::LoadSpec& load,
              const analysis::Thresholds& thresholds);
  // The nominal allowances computed so far, one per level in order (may lag the study).
  const std::vector<analysis::ScenarioAllowances>& nominal() const { return nominal_; }
  bool nominal_running() const { return nominal_running_; }

  // Starts the band of the study given to update() (it must be complete) with `options`; false
  // (with the reason) when it cannot start: no complete study, a band already running.
  bool start_band(const analysis::BandOptions& options, QString* why = nullptr);
  void cancel_band();
  bool band_running() const { return band_running_; }
  // The last band of the present study (null before one finished). band_matches_load(): it was
  // computed under the force direction, point of application and thresholds of the last
  // update() (the band is computed under those of the solved case).
  const analysis::AllowanceBand* band() const { return band_.get(); }
  bool band_matches_load() const;

 signals:
  void nominal_ready(int n_levels);
  void nominal_failed(const QString& message);
  void band_progress(const QString& stage, double fraction);
  void band_finished();
  void band_failed(const QString& message);
  void band_cancelled();

 private:
  struct LoadKey {
    Eigen::Vector3d direction = Eigen::Vector3d::Zero();
    double bracket_height_mm = 0;
    double capillary_kpa = 0, limit_kpa = 0;
    bool operator==(const LoadKey& o) const;
  };
  static LoadKey key_of(const analysis::LoadSpec& load, const analysis::Thresholds& t);
  void start_nominal();
  void join_nominal();
  void join_band();

  std::shared_ptr<const analysis::Study> study_;
  analysis::LoadSpec load_;
  analysis::Thresholds thresholds_;
  LoadKey key_;
  std::vector<analysis::ScenarioAllowances> nominal_;
  std::thread nominal_worker_;
  bool nominal_running_ = false;
  bool nominal_again_ = false;  // an update arrived while the worker ran
  int generation_ = 0;          // results of an older generation are dropped
  std::thread band_worker_;
  std::atomic<bool> band_cancel_{false};
  bool band_running_ = false;
  int band_generation_ = 0;  // a band of an older study is dropped
  std::shared_ptr<const analysis::AllowanceBand> band_;
  LoadKey band_key_;
};

}  // namespace sharpey::app
