#include "core/allowance_job.h"

#include <QMetaObject>
#include <algorithm>

#include "core/worker_priority.h"
#include "sharpey/error.h"

namespace sharpey::app {

bool AllowanceJob::LoadKey::operator==(const LoadKey& o) const {
  return direction == o.direction && bracket_height_mm == o.bracket_height_mm &&
         capillary_kpa == o.capillary_kpa && limit_kpa == o.limit_kpa;
}

AllowanceJob::LoadKey AllowanceJob::key_of(const analysis::LoadSpec& load,
                                           const analysis::Thresholds& t) {
  LoadKey k;
  k.direction = load.direction;
  k.bracket_height_mm = load.bracket_height_mm;
  k.capillary_kpa = t.capillary.value_kpa;
  k.limit_kpa = t.limit.value_kpa;
  return k;
}

AllowanceJob::AllowanceJob(QObject* parent) : QObject(parent) {}

AllowanceJob::~AllowanceJob() {
  band_cancel_ = true;
  join_nominal();
  join_band();
}

void AllowanceJob::join_nominal() {
  if (nominal_worker_.joinable()) nominal_worker_.join();
}

void AllowanceJob::join_band() {
  if (band_worker_.joinable()) band_worker_.join();
}

void AllowanceJob::update(std::shared_ptr<const analysis::Study> study,
                          const analysis::LoadSpec& load, const analysis::Thresholds& thresholds) {
  if (study != study_) {
    if (band_running_) band_cancel_ = true;
    band_.reset();
    ++band_generation_;
    nominal_.clear();
    ++generation_;
    study_ = std::move(study);
  }
  const LoadKey key = key_of(load, thresholds);
  if (!(key == key_)) {
    nominal_.clear();
    ++generation_;
    key_ = key;
  }
  load_ = load;
  thresholds_ = thresholds;
  if (!study_) {
    emit nominal_ready(0);
    return;
  }
  if (nominal_.size() < study_->solutions().size()) start_nominal();
}

void AllowanceJob::start_nominal() {
  if (nominal_running_) {
    nominal_again_ = true;
    return;
  }
  join_nominal();
  // The worker reads the solutions only (heap objects the study never moves); the study itself
  // may grow on this thread meanwhile, so the worker never touches it.
  std::vector<const analysis::ScenarioSolution*> levels;
  for (size_t k = nominal_.size(); k < study_->solutions().size(); ++k)
    levels.push_back(study_->solutions()[k].get());
  const size_t first = nominal_.size();
  nominal_running_ = true;
  nominal_worker_ = std::thread([this, levels, first, keep = study_, load = load_,
                                 thresholds = thresholds_, generation = generation_]() {
    auto post = [this](auto&& fn) { QMetaObject::invokeMethod(this, fn, Qt::QueuedConnection); };
    std::vector<analysis::ScenarioAllowances> computed;
    QString error;
    try {
      for (const analysis::ScenarioSolution* s : levels)
        computed.push_back(analysis::scenario_allowances(*s, load, thresholds));
    } catch (const std::exception& e) {
      error = QString::fromStdString(e.what());
    }
    post([this, computed = std::move(computed), error, first, generation]() mutable {
      nominal_running_ = false;
      const bool current = generation == generation_ && nominal_.size() == first;
      if (current && error.isEmpty()) {
        for (auto& a : computed) nominal_.push_back(std::move(a));
        emit nominal_ready(static_cast<int>(nominal_.size()));
      } else if (current) {
        emit nominal_failed(error);
      }
      // Levels or a new force direction arrived meanwhile: compute what is still missing.
      const bool again = nominal_again_ || !current;
      nominal_again_ = false;
      if (again && study_ && nominal_.size() < study_->solutions().size()) start_nominal();
    });
  });
}

bool AllowanceJob::start_band(const analysis::BandOptions& options, QString* why) {
  auto refuse = [why](const QString& text) {
    if (why) *why = text;
    return false;
  };
  if (band_running_) return refuse(QStringLiteral("the variability band is already running"));
  if (!study_ || !study_->complete())
    return refuse(
        QStringLiteral("the band needs every bone level solved; wait for the solve to finish"));
  join_band();
  band_cancel_ = false;
  band_running_ = true;
  band_key_ = key_of(study_->spec().load, study_->spec().thresholds);
  band_worker_ = std::thread([this, options, study = study_, generation = band_generation_]() {
    lower_this_thread_priority();
    auto post = [this](auto&& fn) { QMetaObject::invokeMethod(this, fn, Qt::QueuedConnection); };
    auto progress = [this, post, generation](const std::string& stage, double fraction) {
      post([this, text = QString::fromStdString(stage), fraction, generation]() {
        if (generation == band_generation_) emit band_progress(text, fraction);
      });
    };
    try {
      std::shared_ptr<const analysis::AllowanceBand> band =
          std::make_shared<const analysis::AllowanceBand>(
              analysis::allowance_band(*study, options, progress, &band_cancel_));
      post([this, band, generation]() {
        band_running_ = false;
        if (generation != band_generation_) return;
        band_ = band;
        emit band_finished();
      });
    } catch (const Cancelled&) {
      post([this, generation]() {
        band_running_ = false;
        if (generation == band_generation_) emit band_cancelled();
      });
    } catch (const std::exception& e) {
      post([this, message = QString::fromStdString(e.what()), generation]() {
        band_running_ = false;
        if (generation == band_generation_) emit band_failed(message);
      });
    }
  });
  return true;
}

void AllowanceJob::cancel_band() {
  if (band_running_) band_cancel_ = true;
}

bool AllowanceJob::band_matches_load() const { return band_ && band_key_ == key_; }

}  // namespace sharpey::app
