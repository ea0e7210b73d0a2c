#include "sharpey/analysis/study.h"

#include <exception>
#include <future>
#include <sstream>
#include <system_error>

#include "sharpey/analysis/detail/evaluation.h"
#include "sharpey/error.h"
#include "study_memory.h"

namespace sharpey::analysis {

namespace {

void require_scenarios(const CaseSpec& spec) {
  if (spec.scenarios.empty()) {
    throw InputError("scenarios",
                     "the case has no bone-level scenario; add at least one (e.g. a healthy "
                     "scenario without bone loss)");
  }
}

}  // namespace

// The mesher, METIS and CHOLMOD's symbolic analysis are single-threaded while assembly and
// factorisation use both cores: scenario k + 1 is meshed, ordered and analysed
// (fem::SymbolicFactorisation: the mesh is all they need; tens of MB) on a second thread while
// scenario k is solved. At most one scenario is prepared at a time, so memory stays at one model
// being prepared plus the solved ones; the stiffness matrix and the numeric factor of scenario
// k + 1 are only made once scenario k is done. Progress is reported from the calling thread only.
struct StudySolver::Ahead {
  struct Prepared {
    mesh::ToothModel model;
    std::shared_ptr<const fem::SymbolicFactorisation> symbolic;
  };
  int index = 0;  // the scenario being prepared
  std::future<Prepared> prepared;
};

StudySolver::StudySolver(CaseSpec spec, const std::atomic<bool>* cancel)
    : spec_(std::move(spec)), cancel_(cancel) {
  require_scenarios(spec_);
}

// A pending future's destructor waits for its mesher to finish.
StudySolver::~StudySolver() = default;

std::unique_ptr<ScenarioSolution> StudySolver::solve_next(const ProgressCallback& progress) {
  const int n = scenario_count();
  if (done()) {
    throw InputError("scenarios", "all " + std::to_string(n) +
                                      " scenarios of the case are already solved; nothing is left "
                                      "to solve");
  }
  const auto cancelled = [this] { return cancel_ != nullptr && cancel_->load(); };
  const auto build = [this](int k) {
    mesh::ModelSpec m = spec_.model;
    const Scenario& scenario = spec_.scenarios[static_cast<size_t>(k)];
    m.loss = scenario.loss;
    Ahead::Prepared p{detail::build_scenario_model(m, scenario.name, cancel_), {}};
    if (cancel_ != nullptr && cancel_->load()) return p;  // the caller throws Cancelled
    try {
      p.symbolic = std::make_shared<const fem::SymbolicFactorisation>(
          p.model.mesh, detail::scenario_constraints(p.model.mesh));
    } catch (const std::exception&) {
      // Out of memory here (or any failure of the analysis): the scenario's solver analyses on
      // its own thread instead and reports a failure there, with its usual message and type.
    }
    return p;
  };
  // No second thread to be had (thread or memory limits): mesh on this thread when get() asks.
  const auto start_meshing = [&build](int k) {
    try {
      return std::async(std::launch::async, build, k);
    } catch (const std::system_error&) {
      return std::async(std::launch::deferred, build, k);
    }
  };
  const int k = next_;
  const auto overall = [&progress, n, k](const std::string& stage, double fraction) {
    if (progress) progress(stage, (k + fraction) / n);
  };
  // A model meshed ahead for another scenario (the last call stopped while solving, before this
  // scenario was done) is dropped: its destructor waits for the mesher.
  if (ahead_ && ahead_->index != k) ahead_.reset();
  if (!ahead_) {
    if (cancelled()) throw Cancelled();
    ahead_ = std::make_unique<Ahead>();
    ahead_->index = k;
    ahead_->prepared = start_meshing(k);
  }
  const std::string prefix = "scenario " + std::to_string(k + 1) + "/" + std::to_string(n) + " (" +
                             spec_.scenarios[static_cast<size_t>(k)].name + "): ";
  overall(prefix + "mesh", 0.0);
  // get() rethrows the mesher's exception; the future is then empty, so a later call meshes anew.
  std::future<Ahead::Prepared> pending = std::move(ahead_->prepared);
  ahead_.reset();
  Ahead::Prepared prepared = pending.get();
  if (cancelled()) throw Cancelled();
  if (k + 1 < n) {
    ahead_ = std::make_unique<Ahead>();
    ahead_->index = k + 1;
    ahead_->prepared = start_meshing(k + 1);
  }
  const ProgressCallback local = [&](const std::string& stage, double fraction) {
    overall(prefix + stage, fraction);
  };
  ScenarioOptions options;
  options.symbolic = std::move(prepared.symbolic);
  auto solution = std::make_unique<ScenarioSolution>(spec_, k, std::move(prepared.model), local,
                                                     cancel_, std::move(options));
  ++next_;
  if (done() && progress) progress("done", 1.0);
  return solution;
}

Study::Study(CaseSpec spec, const ProgressCallback& progress, const std::atomic<bool>* cancel)
    : spec_(std::move(spec)) {
  // On any exception, the solver's destructor waits for the mesher of the next scenario to finish
  // (a few seconds at most).
  StudySolver solver(spec_, cancel);
  while (!solver.done()) solutions_.push_back(solver.solve_next(progress));
}

Study::Study(UnsolvedTag, CaseSpec spec) : spec_(std::move(spec)) { require_scenarios(spec_); }

Study Study::unsolved(CaseSpec spec) { return Study(UnsolvedTag{}, std::move(spec)); }

void Study::add(std::unique_ptr<ScenarioSolution> solution) {
  const size_t k = solutions_.size();
  if (k >= spec_.scenarios.size()) {
    throw InputError("scenarios", "all " + std::to_string(k) +
                                      " scenarios of the study are already solved; no scenario "
                                      "can be added");
  }
  if (!solution) throw Error("Study::add: no solution given (null)");
  const Scenario& expected = spec_.scenarios[k];
  const Scenario& got = solution->scenario();
  if (got.name != expected.name || got.loss.horizontal_mm != expected.loss.horizontal_mm ||
      got.loss.defect_depth_mm != expected.loss.defect_depth_mm) {
    throw Error("Study::add: expected the solution of scenario " + std::to_string(k + 1) + " (" +
                expected.name + "), got one of \"" + got.name +
                "\"; add the scenarios in the case's order");
  }
  solutions_.push_back(std::move(solution));
}

int Study::healthy_index() const {
  int best = -1;
  for (int k = 0; k < static_cast<int>(spec_.scenarios.size()); ++k) {
    const mesh::BoneLoss& a = spec_.scenarios[static_cast<size_t>(k)].loss;
    if (best < 0) {
      best = k;
      continue;
    }
    const mesh::BoneLoss& b = spec_.scenarios[static_cast<size_t>(best)].loss;
    if (a.horizontal_mm < b.horizontal_mm ||
        (a.horizontal_mm == b.horizontal_mm && a.defect_depth_mm < b.defect_depth_mm)) {
      best = k;
    }
  }
  // Built level by level: the reference is not there until it is solved.
  return best < static_cast<int>(solutions_.size()) ? best : -1;
}

std::vector<ScenarioResult> Study::evaluate(const LoadSpec& load) const {
  std::vector<ScenarioResult> results(solutions_.size());
  const int h = healthy_index();
  if (h < 0) {
    // Only on a study built level by level whose healthy scenario is not solved yet.
    for (size_t k = 0; k < solutions_.size(); ++k)
      results[k] = detail::evaluate(*solutions_[k], load, spec_.thresholds, nullptr, nullptr);
    return results;
  }
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
