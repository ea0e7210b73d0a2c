// The worker-thread solve and the case session on a small real case (coarse mesh, two bone
// levels), solved once for all tests. QtCore only: no display needed.
#include <gtest/gtest.h>

#include <QCoreApplication>
#include <QEventLoop>
#include <QTemporaryDir>
#include <QTimer>
#include <algorithm>
#include <cmath>

#include "core/case_session.h"
#include "core/solve_job.h"
#include "sharpey/error.h"

namespace sharpey::app {
namespace {

analysis::CaseSpec small_case() {
  analysis::CaseSpec spec;
  spec.label = "Invented test case: coarse incisor, healthy and 3 mm loss";
  spec.model.sizing.preset = mesh::MeshPreset::kCoarse;
  analysis::Scenario healthy;
  healthy.name = "healthy";
  analysis::Scenario reduced;
  reduced.name = "3 mm loss";
  reduced.loss.horizontal_mm = 3.0;
  spec.scenarios = {healthy, reduced};
  return spec;
}

// Runs the event loop until `done` or the timeout; returns false on timeout.
bool wait_for(const std::function<bool()>& done, int timeout_ms) {
  QEventLoop loop;
  QTimer poll;
  QObject::connect(&poll, &QTimer::timeout, &loop, [&]() {
    if (done()) loop.quit();
  });
  poll.start(20);
  QTimer::singleShot(timeout_ms, &loop, &QEventLoop::quit);
  loop.exec();
  return done();
}

std::shared_ptr<const analysis::Study> g_study;
std::vector<double> g_fractions;
// Per level_solved signal: index, count, levels in job.study(), job still running.
struct LevelSignal {
  int index, count, levels_in_study;
  bool running;
};
std::vector<LevelSignal> g_levels;
std::vector<size_t> g_session_results;  // results in a session fed with each partial study
double g_first_level_peak = 0;          // scenario 0's peak compression after the first level
std::vector<analysis::ScenarioResult> g_grown_results;  // that session's results at the end

class SolvedCase : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    SolveJob job;
    bool finished = false;
    QObject::connect(&job, &SolveJob::progress,
                     [](const QString&, double f) { g_fractions.push_back(f); });
    QObject::connect(&job, &SolveJob::finished, [&]() { finished = true; });
    QObject::connect(&job, &SolveJob::failed, [](const QString& kind, const QString& message) {
      ADD_FAILURE() << kind.toStdString() << ": " << message.toStdString();
    });
    CaseSession session;
    session.recover(small_case(), {});
    QObject::connect(&job, &SolveJob::level_solved, [&](int index, int count) {
      const auto study = job.study();
      g_levels.push_back(
          {index, count, study ? static_cast<int>(study->solutions().size()) : -1, job.running()});
      session.set_study(study);
      g_session_results.push_back(session.results().size());
      if (index == 0 && !session.results().empty())
        g_first_level_peak = session.results()[0].pressure_max_compression_kpa;
    });
    ASSERT_TRUE(job.start(small_case()));
    EXPECT_FALSE(job.start(small_case()));  // one solve at a time
    ASSERT_TRUE(wait_for([&]() { return finished; }, 300000));
    g_study = job.take_result();
    g_grown_results = session.results();
  }
};

TEST_F(SolvedCase, WorkerReportsProgressAndDeliversTheStudy) {
  ASSERT_TRUE(g_study);
  EXPECT_EQ(g_study->solutions().size(), 2u);
  ASSERT_FALSE(g_fractions.empty());
  for (size_t i = 1; i < g_fractions.size(); ++i)
    EXPECT_GE(g_fractions[i], g_fractions[i - 1] - 1e-12);
  EXPECT_DOUBLE_EQ(g_fractions.back(), 1.0);
}

TEST_F(SolvedCase, LevelsArriveOneByOneWhileTheWorkerRuns) {
  ASSERT_EQ(g_levels.size(), 2u);
  for (int k = 0; k < 2; ++k) {
    EXPECT_EQ(g_levels[static_cast<size_t>(k)].index, k);
    EXPECT_EQ(g_levels[static_cast<size_t>(k)].count, 2);
    EXPECT_EQ(g_levels[static_cast<size_t>(k)].levels_in_study, k + 1);  // the study grows
    EXPECT_EQ(g_session_results[static_cast<size_t>(k)], static_cast<size_t>(k + 1));
  }
  // The first level is handed over while the second is still being solved.
  EXPECT_TRUE(g_levels[0].running);
  ASSERT_TRUE(g_study);
  EXPECT_TRUE(g_study->complete());
  // What the session showed for the healthy level before the other was solved is final.
  CaseSession session;
  session.recover(small_case(), {});
  session.set_study(g_study);
  EXPECT_EQ(session.results()[0].pressure_max_compression_kpa, g_first_level_peak);
  // A session fed level by level (the later level evaluated alone, the first kept) ends with the
  // results of one fed the whole study.
  ASSERT_EQ(g_grown_results.size(), session.results().size());
  for (size_t k = 0; k < g_grown_results.size(); ++k) {
    const auto& a = g_grown_results[k];
    const auto& b = session.results()[k];
    EXPECT_EQ(a.name, b.name);
    EXPECT_EQ(a.pressure_kpa, b.pressure_kpa);
    EXPECT_EQ(a.pressure_max_compression_kpa, b.pressure_max_compression_kpa);
    EXPECT_EQ(a.equivalent_force_peak_g, b.equivalent_force_peak_g);
    EXPECT_EQ(a.equivalent_force_area_rule_g, b.equivalent_force_area_rule_g);
  }
  EXPECT_GT(g_grown_results[1].equivalent_force_peak_g, 0);  // the reduced level has its reference
}

TEST_F(SolvedCase, DoublingTheForceDoublesThePressures) {
  CaseSession session;
  session.recover(small_case(), {});
  session.set_study(g_study);
  ASSERT_EQ(session.results().size(), 2u);
  const double peak = session.results()[1].pressure_max_compression_kpa;
  ASSERT_GT(peak, 0);
  LoadControls c = session.load_controls();
  c.magnitude *= 2;
  session.set_load(c);
  // Linear elasticity: superposition scales every pressure with the force (derived).
  EXPECT_NEAR(session.results()[1].pressure_max_compression_kpa, 2 * peak, 1e-9 * peak);
  EXPECT_EQ(session.study(), g_study.get());  // no new solve
}

TEST_F(SolvedCase, InteractiveEditsUpdateTheShownScenarioFirst) {
  CaseSession session;
  session.recover(small_case(), {});
  session.set_study(g_study);
  session.set_current(0);
  const double healthy = session.results()[0].pressure_max_compression_kpa;
  const double reduced = session.results()[1].pressure_max_compression_kpa;
  int interactive_updates = 0;
  QObject::connect(&session, &CaseSession::results_changed, [&](bool interactive) {
    if (interactive) ++interactive_updates;
  });
  LoadControls c = session.load_controls();
  c.magnitude *= 1.5;
  session.set_load(c, true);
  EXPECT_EQ(interactive_updates, 1);
  EXPECT_NEAR(session.results()[0].pressure_max_compression_kpa, 1.5 * healthy, 1e-9 * healthy);
  EXPECT_TRUE(session.has_pending());
  EXPECT_DOUBLE_EQ(session.results()[1].pressure_max_compression_kpa, reduced);  // not yet
  // Showing the other scenario brings it up to date first.
  session.set_current(1);
  EXPECT_FALSE(session.has_pending());
  EXPECT_NEAR(session.results()[1].pressure_max_compression_kpa, 1.5 * reduced, 1e-9 * reduced);
  // Dragging on the reduced level: evaluated without the healthy reference (half the work), the
  // equivalent forces follow with the flush and equal a full evaluation.
  ASSERT_GE(session.results()[1].equivalent_force_peak_g, 0);
  c.magnitude *= 1.2;
  session.set_load(c, true);
  EXPECT_TRUE(session.reference_pending());
  EXPECT_EQ(session.results()[1].equivalent_force_peak_g, -1);
  EXPECT_NEAR(session.results()[1].pressure_max_compression_kpa, 1.8 * reduced, 1e-9 * reduced);
  session.flush();
  EXPECT_FALSE(session.reference_pending());
  const analysis::ScenarioResult full =
      analysis::evaluate(*g_study->solutions()[1], session.spec().load, session.spec().thresholds,
                         g_study->solutions()[static_cast<size_t>(g_study->healthy_index())].get());
  EXPECT_NEAR(session.results()[1].equivalent_force_peak_g, full.equivalent_force_peak_g,
              1e-9 * full.equivalent_force_peak_g);
  EXPECT_NEAR(session.results()[1].equivalent_force_area_rule_g, full.equivalent_force_area_rule_g,
              1e-9 * full.equivalent_force_area_rule_g);
  // The deferred evaluation also happens by itself.
  c.magnitude /= 1.2;
  c.magnitude *= 2;
  session.set_load(c, true);
  EXPECT_TRUE(session.has_pending());
  EXPECT_TRUE(wait_for([&]() { return !session.has_pending(); }, 5000));
  EXPECT_NEAR(session.results()[0].pressure_max_compression_kpa, 3 * healthy, 1e-9 * healthy);
}

// The linear-range flag and the strain maxima follow the force during a slider drag, whatever
// quantity is shown (issue 12, point 14): while dragging they equal a full evaluation at the same
// force (derived: the drag evaluates the same strains, bit for bit), on both sides of the limit.
TEST_F(SolvedCase, TheLinearRangeFlagFollowsTheForceWhileDragging) {
  CaseSession session;
  session.recover(small_case(), {});
  session.set_study(g_study);
  session.set_current(0);
  session.set_shown_quantity(Quantity::kPressure);
  const double strain_at_start = session.results()[0].max_abs_principal_strain;
  ASSERT_GT(strain_at_start, 0);
  LoadControls c = session.load_controls();
  // Forces below and above the one that reaches the limit (strain is linear in the force).
  const double at_limit = c.magnitude * analysis::kLinearRangeStrainLimit / strain_at_start;
  for (double factor : {0.5, 1.5}) {
    SCOPED_TRACE(factor);
    c.magnitude = std::min(factor * at_limit, 2000.0);
    session.set_load(c, true);
    ASSERT_TRUE(session.has_pending());  // a drag: only part evaluated
    const analysis::ScenarioResult full = analysis::evaluate(
        *g_study->solutions()[0], session.spec().load, session.spec().thresholds, nullptr);
    EXPECT_EQ(session.results()[0].beyond_linear_range, full.beyond_linear_range);
    EXPECT_EQ(session.results()[0].max_abs_principal_strain, full.max_abs_principal_strain);
    EXPECT_EQ(session.results()[0].max_principal_strain, full.max_principal_strain);
  }
  if (at_limit * 1.5 <= 2000.0) {
    EXPECT_TRUE(session.results()[0].beyond_linear_range);
  }
  session.flush();
}

TEST_F(SolvedCase, ChangingTheDisplayUnitChangesNoResult) {
  CaseSession session;
  session.recover(small_case(), {});
  session.set_study(g_study);
  const double peak = session.results()[1].pressure_max_compression_kpa;
  LoadControls c = session.load_controls();
  c.set_unit(analysis::ForceUnit::kNewton);
  session.set_load(c);
  EXPECT_NEAR(session.results()[1].pressure_max_compression_kpa, peak, 1e-9 * peak);
}

TEST_F(SolvedCase, ThresholdsChangeTheAreasWithoutANewSolve) {
  CaseSession session;
  session.recover(small_case(), {});
  session.set_study(g_study);
  const double area = session.results()[0].area_above_capillary_mm2;
  session.set_thresholds(0.5 * session.spec().thresholds.capillary.value_kpa,
                         session.spec().thresholds.limit.value_kpa);
  EXPECT_GT(session.results()[0].area_above_capillary_mm2, area);
  EXPECT_FALSE(session.geometry_stale());
}

TEST_F(SolvedCase, AZeroForceIsRefusedWithAMessageAndResultsStay) {
  CaseSession session;
  session.recover(small_case(), {});
  session.set_study(g_study);
  const double peak = session.results()[0].pressure_max_compression_kpa;
  QString message;
  QObject::connect(&session, &CaseSession::load_refused, [&](const QString& m) { message = m; });
  const LoadControls before = session.load_controls();
  LoadControls c = before;
  c.magnitude = 0;
  session.set_load(c);
  EXPECT_FALSE(message.isEmpty());
  EXPECT_TRUE(message.contains(QStringLiteral("load.magnitude"))) << message.toStdString();
  EXPECT_DOUBLE_EQ(session.results()[0].pressure_max_compression_kpa, peak);
  // The refused force is not kept: the controls are those of the results (issue 12, point 1).
  EXPECT_DOUBLE_EQ(session.load_controls().magnitude, before.magnitude);
  EXPECT_DOUBLE_EQ(session.spec().load.magnitude, before.magnitude);
}

TEST(CaseSession, GeometryEditsMarkResultsStale) {
  CaseSession session;
  EXPECT_TRUE(session.geometry_stale());  // nothing solved yet
  int stale_signals = 0;
  QObject::connect(&session, &CaseSession::geometry_changed, [&]() { ++stale_signals; });
  session.set_tooth(mesh::ToothType::kMandibularCanine);
  session.set_mesh_preset(mesh::MeshPreset::kCoarse);
  session.set_pdl_width(0.25);
  EXPECT_EQ(stale_signals, 3);
  EXPECT_TRUE(session.document().modified());
  EXPECT_DOUBLE_EQ(session.spec().model.tooth.dimensions.root_length_mm,
                   mesh::handbook_dimensions(mesh::ToothType::kMandibularCanine).root_length_mm);
}

TEST(CaseSession, SaveAndOpenRoundTrip) {
  QTemporaryDir dir;
  ASSERT_TRUE(dir.isValid());
  CaseSession session;
  LoadControls c = session.load_controls();
  c.magnitude = 75;
  c.set_angles(30, -10);
  c.couple = analysis::CoupleKind::kRatio;
  c.moment_to_force_mm = 8;
  session.set_load(c);
  ScenarioList levels = session.levels();
  levels.add(5.0);
  session.set_levels(levels);
  const QString path = dir.filePath("round_trip.json");
  session.save(path);
  EXPECT_FALSE(session.document().modified());
  EXPECT_EQ(session.document().path(), path);

  CaseSession other;
  other.open(path);
  EXPECT_FALSE(other.document().modified());
  EXPECT_EQ(other.spec().scenarios.size(), 3u);
  EXPECT_DOUBLE_EQ(other.load_controls().magnitude, 75);
  EXPECT_EQ(other.load_controls().direction, DirectionChoice::kAngles);
  EXPECT_NEAR(other.load_controls().azimuth_deg, 30, 1e-9);
  EXPECT_EQ(other.load_controls().couple, analysis::CoupleKind::kRatio);
  EXPECT_EQ(other.case_json(), session.case_json());
}

TEST(CaseSession, ABadFileLeavesTheOpenCaseAsItWas) {
  QTemporaryDir dir;
  ASSERT_TRUE(dir.isValid());
  const QString path = dir.filePath("bad.json");
  QFile f(path);
  ASSERT_TRUE(f.open(QIODevice::WriteOnly));
  f.write("{\"schema_version\": 1, \"tooth\": {\"type\": \"maxillary_centrl_incisor\"}}");
  f.close();
  CaseSession session;
  const QString before = session.case_json();
  try {
    session.open(path);
    FAIL() << "a misspelt tooth type was accepted";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("maxillary_centrl_incisor"), std::string::npos)
        << e.what();
  }
  EXPECT_EQ(session.case_json(), before);
}

TEST(SolveJob, CancelStopsTheWorker) {
  SolveJob job;
  bool cancelled = false, finished = false;
  QObject::connect(&job, &SolveJob::cancelled, [&]() { cancelled = true; });
  QObject::connect(&job, &SolveJob::finished, [&]() { finished = true; });
  ASSERT_TRUE(job.start(small_case()));
  job.cancel();
  ASSERT_TRUE(wait_for([&]() { return cancelled || finished; }, 120000));
  EXPECT_TRUE(cancelled);
  EXPECT_FALSE(job.running());
  EXPECT_FALSE(job.take_result());
}

TEST(SolveJob, AHealthyLevelSolvedLastStillGivesTheOthersTheirReference) {
  analysis::CaseSpec spec = small_case();
  std::swap(spec.scenarios[0], spec.scenarios[1]);  // 3 mm loss first, healthy second
  SolveJob job;
  CaseSession session;
  session.recover(spec, {});
  std::vector<double> first_level_equivalent;
  bool finished = false;
  QObject::connect(&job, &SolveJob::finished, [&]() { finished = true; });
  QObject::connect(&job, &SolveJob::level_solved, [&](int, int) {
    session.set_study(job.study());
    first_level_equivalent.push_back(session.results()[0].equivalent_force_peak_g);
  });
  ASSERT_TRUE(job.start(spec));
  ASSERT_TRUE(wait_for([&]() { return finished; }, 300000));
  ASSERT_EQ(first_level_equivalent.size(), 2u);
  EXPECT_EQ(first_level_equivalent[0], -1);  // no healthy reference yet
  EXPECT_GT(first_level_equivalent[1], 0);   // re-evaluated once the healthy level came
  EXPECT_LT(first_level_equivalent[1],
            100);  // with bone lost a lighter force reaches the healthy peak
}

TEST(SolveJob, CancelAfterTheFirstLevelKeepsIt) {
  analysis::CaseSpec spec = small_case();
  analysis::Scenario more;
  more.name = "5 mm loss";
  more.loss.horizontal_mm = 5.0;
  spec.scenarios.push_back(more);
  SolveJob job;
  bool cancelled = false, finished = false;
  QObject::connect(&job, &SolveJob::cancelled, [&]() { cancelled = true; });
  QObject::connect(&job, &SolveJob::finished, [&]() { finished = true; });
  QObject::connect(&job, &SolveJob::level_solved, [&](int index, int) {
    if (index == 0) job.cancel();  // the user presses cancel once the first level is shown
  });
  ASSERT_TRUE(job.start(spec));
  ASSERT_TRUE(wait_for([&]() { return cancelled || finished; }, 300000));
  EXPECT_TRUE(cancelled);
  const auto study = job.take_result();
  ASSERT_TRUE(study);
  EXPECT_FALSE(study->complete());
  EXPECT_GE(study->solutions().size(), 1u);
  EXPECT_LT(study->solutions().size(), 3u);
  CaseSession session;
  session.recover(spec, {});
  session.set_study(study);
  EXPECT_EQ(session.results().size(), study->solutions().size());
  EXPECT_GT(session.results()[0].pressure_max_compression_kpa, 0);
}

TEST(SolveJob, LibraryErrorsArriveWithTheirMessage) {
  analysis::CaseSpec spec = small_case();
  spec.scenarios[0].loss.horizontal_mm = 40.0;  // deeper than the root is long
  SolveJob job;
  QString kind, message;
  QObject::connect(&job, &SolveJob::failed, [&](const QString& k, const QString& m) {
    kind = k;
    message = m;
  });
  ASSERT_TRUE(job.start(spec));
  ASSERT_TRUE(wait_for([&]() { return !job.running(); }, 120000));
  EXPECT_EQ(kind, "input");
  EXPECT_TRUE(message.contains("40")) << message.toStdString();
}

}  // namespace
}  // namespace sharpey::app

int main(int argc, char** argv) {
  QCoreApplication app(argc, argv);
  ::testing::InitGoogleTest(&argc, argv);
  return RUN_ALL_TESTS();
}
