#include "sharpey/analysis/study.h"

#include <future>
#include <sstream>
#include <system_error>

#include "sharpey/analysis/detail/evaluation.h"
#include "sharpey/error.h"
#include "study_memory.h"

namespace sharpey::analysis {

Study::Study(CaseSpec spec, const ProgressCallback& progress, const std::atomic<bool>* cancel)
    : spec_(std::move(spec)) {
  const int n = static_cast<int>(spec_.scenarios.size());
  if (n == 0) {
    throw InputError("scenarios",
                     "the case has no bone-level scenario; add at least one (e.g. a healthy "
                     "scenario without bone loss)");
  }
  const auto cancelled = [cancel] { return cancel != nullptr && cancel->load(); };
  // The mesher is single-threaded while assembly and factorisation use both cores: mesh scenario
  // k + 1 on a second thread while scenario k is solved (at most one mesher runs at a time, so
  // memory stays at one model being meshed plus the solved ones). Progress is reported from the
  // calling thread only.
  const auto build = [this](int k) {
    mesh::ModelSpec m = spec_.model;
    const Scenario& scenario = spec_.scenarios[static_cast<size_t>(k)];
    m.loss = scenario.loss;
    return detail::build_scenario_model(m, scenario.name);
  };
  // No second thread to be had (thread or memory limits): mesh on this thread when get() asks.
  const auto start_meshing = [&build](int k) {
    try {
      return std::async(std::launch::async, build, k);
    } catch (const std::system_error&) {
      return std::async(std::launch::deferred, build, k);
    }
  };
  const auto overall = [&progress, n](int k, const std::string& stage, double fraction) {
    if (progress) progress(stage, (k + fraction) / n);
  };
  if (cancelled()) throw Cancelled();
  std::future<mesh::ToothModel> next = start_meshing(0);
  for (int k = 0; k < n; ++k) {
    const std::string prefix = "scenario " + std::to_string(k + 1) + "/" + std::to_string(n) +
                               " (" + spec_.scenarios[static_cast<size_t>(k)].name + "): ";
    overall(k, prefix + "mesh", 0.0);
    // get() rethrows the mesher's exception. On any exception below, the pending future's
    // destructor waits for the mesher of the next scenario to finish (a few seconds at most).
    mesh::ToothModel model = next.get();
    if (cancelled()) throw Cancelled();
    if (k + 1 < n) next = start_meshing(k + 1);
    const ProgressCallback local = [&](const std::string& stage, double fraction) {
      overall(k, prefix + stage, fraction);
    };
    solutions_.push_back(
        std::make_unique<ScenarioSolution>(spec_, k, std::move(model), local, cancel));
  }
  if (progress) progress("done", 1.0);
}

int Study::healthy_index() const {
  int best = -1;
  for (int k = 0; k < static_cast<int>(solutions_.size()); ++k) {
    const mesh::BoneLoss& a = solutions_[static_cast<size_t>(k)]->scenario().loss;
    if (best < 0) {
      best = k;
      continue;
    }
    const mesh::BoneLoss& b = solutions_[static_cast<size_t>(best)]->scenario().loss;
    if (a.horizontal_mm < b.horizontal_mm ||
        (a.horizontal_mm == b.horizontal_mm && a.defect_depth_mm < b.defect_depth_mm)) {
      best = k;
    }
  }
  return best;
}

std::vector<ScenarioResult> Study::evaluate(const LoadSpec& load) const {
  std::vector<ScenarioResult> results(solutions_.size());
  const int h = healthy_index();
  if (h < 0) return results;
  // The healthy scenario first: its pressure measures are every other scenario's reference.
  const ScenarioSolution* healthy = solutions_[static_cast<size_t>(h)].get();
  results[static_cast<size_t>(h)] =
      detail::evaluate(*healthy, load, spec_.thresholds, healthy, nullptr);
  detail::PressureMeasures reference;
  reference.peak_kpa = results[static_cast<size_t>(h)].pressure_max_compression_kpa;
  reference.p95_kpa = results[static_cast<size_t>(h)].pressure_p95_compression_kpa;
  for (size_t k = 0; k < solutions_.size(); ++k) {
    if (static_cast<int>(k) == h) continue;
    results[k] = detail::evaluate(*solutions_[k], load, spec_.thresholds, healthy, &reference);
  }
  return results;
}

}  // namespace sharpey::analysis
