// Solving a case level by level (StudySolver + Study::unsolved / add) on a coarse incisor: each
// scenario solved one at a time gives the same numbers as the all-at-once Study and as a
// scenario solved on its own; a study that grows level by level evaluates what is solved; order,
// cancellation and bad calls.
#include <gtest/gtest.h>

#include <atomic>
#include <cmath>
#include <cstdio>
#include <memory>
#include <string>
#include <tuple>
#include <vector>

#include "sharpey/analysis/study.h"
#include "sharpey/error.h"
#include "test_study_cases.h"

namespace sharpey::analysis {
namespace {

using testing::incisor_case;

LoadSpec tipping_load() {
  LoadSpec load;
  load.magnitude = 100;
  load.unit = ForceUnit::kGram;
  load.direction = Eigen::Vector3d(-1, 0.3, 0).normalized();  // lingual, a little mesial
  return load;
}

// Largest |a - b| over two fields of the same size (infinity when the sizes differ).
double max_difference(const std::vector<double>& a, const std::vector<double>& b) {
  if (a.size() != b.size()) return INFINITY;
  double worst = 0;
  for (size_t i = 0; i < a.size(); ++i) {
    if (std::isnan(a[i]) != std::isnan(b[i])) return INFINITY;
    if (!std::isnan(a[i])) worst = std::max(worst, std::abs(a[i] - b[i]));
  }
  return worst;
}

// The two results agree to 1e-12 relative to the largest pressure (1e-12 of the largest value for
// the other fields): the same meshes and the same factorisation give the same numbers up to the
// order of floating-point sums in the threaded BLAS.
void expect_same_result(const ScenarioResult& a, const ScenarioResult& b) {
  const double p = std::max(1.0, a.pressure_max_compression_kpa);
  EXPECT_EQ(a.name, b.name);
  EXPECT_EQ(a.pressure_kpa.size(), b.pressure_kpa.size());
  EXPECT_LE(max_difference(a.pressure_kpa, b.pressure_kpa), 1e-12 * p);
  EXPECT_LE(max_difference(a.von_mises_kpa, b.von_mises_kpa),
            1e-12 * std::max(1.0, a.max_von_mises_kpa));
  EXPECT_LE(max_difference(a.root_map.pressure_kpa, b.root_map.pressure_kpa), 1e-12 * p);
  EXPECT_NEAR(a.pressure_max_compression_kpa, b.pressure_max_compression_kpa, 1e-12 * p);
  EXPECT_NEAR(a.area_above_capillary_mm2, b.area_above_capillary_mm2,
              1e-12 * std::max(1.0, a.attachment_area_mm2));
  EXPECT_NEAR(a.attachment_area_mm2, b.attachment_area_mm2, 1e-12 * a.attachment_area_mm2);
  EXPECT_NEAR(a.cres_labiolingual.from_cej_mm, b.cres_labiolingual.from_cej_mm, 1e-12 * 20);
  EXPECT_NEAR(a.equivalent_force_peak_g, b.equivalent_force_peak_g,
              1e-12 * std::max(1.0, a.equivalent_force_peak_g));
  ASSERT_EQ(a.displacement_mm.cols(), b.displacement_mm.cols());
  const double u = std::max(1e-9, a.displacement_mm.cwiseAbs().maxCoeff());
  EXPECT_LE((a.displacement_mm - b.displacement_mm).cwiseAbs().maxCoeff(), 1e-12 * u);
}

class LevelByLevel : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    // The healthy scenario is the second one: until it is solved there is no reference.
    spec_ = new CaseSpec(incisor_case(mesh::MeshPreset::kCoarse, {3, 0}));
    all_at_once_ = std::make_unique<Study>(*spec_);
    StudySolver solver(*spec_);
    growing_ = std::make_unique<Study>(Study::unsolved(*spec_));
    const LoadSpec load = tipping_load();
    while (!solver.done()) {
      const int k = solver.solved_count();
      growing_->add(solver.solve_next([k](const std::string& stage, double fraction) {
        progress_.emplace_back(k, stage, fraction);
      }));
      partial_results_.push_back(growing_->evaluate(load));
      partial_healthy_.push_back(growing_->healthy_index());
    }
  }
  static void TearDownTestSuite() {
    all_at_once_.reset();
    growing_.reset();
    delete spec_;
  }
  static CaseSpec* spec_;
  static std::unique_ptr<Study> all_at_once_, growing_;
  static std::vector<std::vector<ScenarioResult>> partial_results_;
  static std::vector<int> partial_healthy_;
  static std::vector<std::tuple<int, std::string, double>> progress_;
};
CaseSpec* LevelByLevel::spec_ = nullptr;
std::unique_ptr<Study> LevelByLevel::all_at_once_, LevelByLevel::growing_;
std::vector<std::vector<ScenarioResult>> LevelByLevel::partial_results_;
std::vector<int> LevelByLevel::partial_healthy_;
std::vector<std::tuple<int, std::string, double>> LevelByLevel::progress_;

TEST_F(LevelByLevel, SameResultsAsTheAllAtOnceSolve) {
  ASSERT_TRUE(growing_->complete());
  ASSERT_EQ(growing_->solutions().size(), all_at_once_->solutions().size());
  EXPECT_EQ(growing_->healthy_index(), all_at_once_->healthy_index());
  EXPECT_EQ(growing_->healthy_index(), 1);
  const auto a = growing_->evaluate(tipping_load());
  const auto b = all_at_once_->evaluate(tipping_load());
  ASSERT_EQ(a.size(), 2u);
  ASSERT_EQ(b.size(), 2u);
  for (size_t k = 0; k < a.size(); ++k) {
    SCOPED_TRACE("scenario " + std::to_string(k));
    EXPECT_EQ(growing_->solutions()[k]->model().mesh.nodes.size(),
              all_at_once_->solutions()[k]->model().mesh.nodes.size());
    expect_same_result(a[k], b[k]);
    std::printf(
        "scenario %zu: largest nodal pressure difference, level by level vs all at once: %.3g kPa "
        "(peak %.1f kPa)\n",
        k, max_difference(a[k].pressure_kpa, b[k].pressure_kpa), b[k].pressure_max_compression_kpa);
  }
  EXPECT_GT(a[0].equivalent_force_peak_g, 0);  // the 3 mm level has its healthy reference
}

TEST_F(LevelByLevel, SameResultsAsAScenarioSolvedOnItsOwn) {
  // An independent path: the scenario meshes itself (no mesher thread, no StudySolver).
  const ScenarioSolution alone(*spec_, 0, {}, nullptr);
  const ScenarioResult a = evaluate(alone, tipping_load(), spec_->thresholds, nullptr);
  const ScenarioResult b =
      evaluate(*growing_->solutions()[0], tipping_load(), spec_->thresholds, nullptr);
  expect_same_result(a, b);
  // The study ordered and analysed the mesh on its mesher thread (fem::SymbolicFactorisation), the
  // scenario alone inside its solver: the same permutation and symbolic factor, so the same
  // factorisation work and the same displacements to the last bit (derived: same matrix, same
  // ordering, same arithmetic).
  const ScenarioSolution& ahead = *growing_->solutions()[0];
  EXPECT_EQ(alone.solver_statistics().factorisation_gflop,
            ahead.solver_statistics().factorisation_gflop);
  EXPECT_EQ((alone.basis().unit_displacements() - ahead.basis().unit_displacements())
                .cwiseAbs()
                .maxCoeff(),
            0.0);
}

TEST_F(LevelByLevel, APartialStudyEvaluatesWhatIsSolved) {
  ASSERT_EQ(partial_results_.size(), 2u);
  // After the first level: one result, no healthy reference yet (it is the second scenario).
  ASSERT_EQ(partial_results_[0].size(), 1u);
  EXPECT_EQ(partial_healthy_[0], -1);
  EXPECT_EQ(partial_results_[0][0].equivalent_force_peak_g, -1);
  EXPECT_GT(partial_results_[0][0].pressure_max_compression_kpa, 0);
  // Its pressures are already final: only the equivalent forces wait for the reference.
  const auto full = all_at_once_->evaluate(tipping_load());
  const double p = full[0].pressure_max_compression_kpa;
  EXPECT_NEAR(partial_results_[0][0].pressure_max_compression_kpa, p, 1e-12 * p);
  EXPECT_LE(max_difference(partial_results_[0][0].pressure_kpa, full[0].pressure_kpa), 1e-12 * p);
  // After the second: both, with the reference.
  ASSERT_EQ(partial_results_[1].size(), 2u);
  EXPECT_EQ(partial_healthy_[1], 1);
  expect_same_result(partial_results_[1][0], full[0]);
  expect_same_result(partial_results_[1][1], full[1]);
}

TEST_F(LevelByLevel, ProgressRisesOverTheWholeCaseAndEndsDone) {
  ASSERT_FALSE(progress_.empty());
  double last = 0;
  bool second_started = false;
  for (const auto& [k, stage, fraction] : progress_) {
    EXPECT_GE(fraction, last - 1e-12) << stage;
    last = fraction;
    const std::string prefix = "scenario " + std::to_string(k + 1) + "/2 (";
    if (stage != "done") {
      EXPECT_EQ(stage.rfind(prefix, 0), 0u) << stage;
    }
    // Each call covers its own half of the case.
    EXPECT_GE(fraction, 0.5 * k - 1e-12) << stage;
    EXPECT_LE(fraction, 0.5 * (k + 1) + 1e-12) << stage;
    if (k == 1) second_started = true;
  }
  EXPECT_TRUE(second_started);
  EXPECT_EQ(std::get<1>(progress_.back()), "done");
  EXPECT_DOUBLE_EQ(std::get<2>(progress_.back()), 1.0);
}

TEST(LevelByLevelCalls, WrongOrderNullAndTooManyAreRefused) {
  const CaseSpec spec = incisor_case(mesh::MeshPreset::kCoarse, {0, 2});
  Study study = Study::unsolved(spec);
  EXPECT_FALSE(study.complete());
  EXPECT_EQ(study.healthy_index(), -1);
  EXPECT_TRUE(study.evaluate(tipping_load()).empty());
  EXPECT_THROW(study.add(nullptr), Error);
  // Scenario 2 solved on its own cannot be added first.
  auto second = std::make_unique<ScenarioSolution>(spec, 1, ProgressCallback{}, nullptr);
  EXPECT_THROW(study.add(std::move(second)), Error);
  EXPECT_TRUE(study.solutions().empty());
  StudySolver solver(spec);
  study.add(solver.solve_next());
  study.add(solver.solve_next());
  EXPECT_TRUE(study.complete());
  EXPECT_TRUE(solver.done());
  EXPECT_THROW(solver.solve_next(), InputError);
  auto again = std::make_unique<ScenarioSolution>(spec, 0, ProgressCallback{}, nullptr);
  EXPECT_THROW(study.add(std::move(again)), InputError);
  EXPECT_THROW(Study::unsolved(incisor_case(mesh::MeshPreset::kCoarse, {})), InputError);
  EXPECT_THROW(StudySolver(incisor_case(mesh::MeshPreset::kCoarse, {})), InputError);
}

TEST(LevelByLevelCalls, CancelBetweenAndDuringLevels) {
  const CaseSpec spec = incisor_case(mesh::MeshPreset::kCoarse, {0, 2, 4});
  std::atomic<bool> cancel{false};
  StudySolver solver(spec, &cancel);
  const auto first = solver.solve_next();
  ASSERT_TRUE(first);
  EXPECT_EQ(solver.solved_count(), 1);
  // Pressed between two levels (the next one is being meshed ahead): the next call stops.
  cancel = true;
  EXPECT_THROW(solver.solve_next(), Cancelled);
  EXPECT_EQ(solver.solved_count(), 1);
  // Pressed while the next level is factorised.
  cancel = false;
  const auto progress = [&cancel](const std::string& stage, double) {
    if (stage.find("factorise") != std::string::npos) cancel = true;
  };
  EXPECT_THROW(solver.solve_next(progress), Cancelled);
  EXPECT_EQ(solver.solved_count(), 1);
  // The solved level stays usable after the cancel.
  const ScenarioResult r = evaluate(*first, tipping_load(), spec.thresholds, nullptr);
  EXPECT_GT(r.pressure_max_compression_kpa, 0);
  // Going on after the cancel solves the second level (not the third, meshed ahead meanwhile).
  cancel = false;
  const auto second = solver.solve_next();
  ASSERT_TRUE(second);
  EXPECT_EQ(second->scenario().name, spec.scenarios[1].name);
  EXPECT_EQ(solver.solved_count(), 2);
  const ScenarioSolution alone(spec, 1, {}, nullptr);
  expect_same_result(evaluate(*second, tipping_load(), spec.thresholds, nullptr),
                     evaluate(alone, tipping_load(), spec.thresholds, nullptr));
}

}  // namespace
}  // namespace sharpey::analysis
