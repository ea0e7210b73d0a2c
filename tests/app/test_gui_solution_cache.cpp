// Solved bone levels kept on disk (issue 12, point 13), through the whole window on a coarse
// two-level incisor case (invented): the second open of a solved case shows its results with no
// level solved, equal bit for bit to the fresh solve; F5 on an unchanged case solves nothing and
// an edited level alone is solved; a damaged entry is solved again with a message; a real
// instance killed while it solves leaves a cache the next one uses (a half-written temporary file
// beside it is ignored).
#include <gtest/gtest.h>

#include <QDir>
#include <QFile>
#include <QFileInfo>
#include <QLabel>
#include <QProcess>
#include <QProcessEnvironment>
#include <QStandardPaths>
#include <QTemporaryDir>
#include <QTest>
#include <cstring>
#include <memory>

#include "core/case_session.h"
#include "core/scenario_list.h"
#include "core/solve_job.h"
#include "sharpey/analysis/case_spec.h"
#include "sharpey/analysis/solution_cache.h"
#include "support/image_checks.h"
#include "support/solved_sample.h"
#include "view/main_window.h"
#include "view/result_view.h"
#include "view/vtk_view.h"

namespace sharpey::app {
namespace {

bool same_bits(const std::vector<double>& a, const std::vector<double>& b) {
  return a.size() == b.size() && std::memcmp(a.data(), b.data(), a.size() * sizeof(double)) == 0;
}

struct SolveRun {
  bool finished = false;
  int solved = -1, from_cache = -1;
  QString status, notes;
  std::vector<analysis::ScenarioResult> results;
};

class SolutionCacheWindowTest : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    QStandardPaths::setTestModeEnabled(true);
    dir_ = new QTemporaryDir;
    case_path_ = dir_->filePath(QStringLiteral("two_levels.json"));
    analysis::CaseSpec spec = testing::coarse_incisor(2);
    spec.label = "Invented test case: incisor, two bone levels";
    analysis::save_case(spec, case_path_.toStdString());
  }
  static void TearDownTestSuite() { delete dir_; }

  // A new window (as a new instance would open it) on `cache_folder`, opening `path` (or
  // pressing F5 on the open case when `window` is given), until the solve ends.
  static SolveRun open(const QString& cache_folder, MainWindow* window = nullptr,
                       bool press_f5 = false) {
    std::unique_ptr<MainWindow> own;
    if (!window) {
      MainWindowOptions options;
      options.dialogs = false;
      options.autosave_folder = dir_->filePath(QStringLiteral("autosave"));
      options.solution_cache_folder = cache_folder;
      own = std::make_unique<MainWindow>(options);
      window = own.get();
      window->resize(1200, 800);
      window->show();
      EXPECT_TRUE(QTest::qWaitForWindowExposed(window));
    }
    SolveRun run;
    bool failed = false;
    auto c1 = QObject::connect(window, &MainWindow::solve_finished, [&]() { run.finished = true; });
    auto c2 = QObject::connect(window, &MainWindow::solve_failed, [&]() { failed = true; });
    if (press_f5)
      window->solve();
    else
      EXPECT_TRUE(window->open_case(case_path_)) << window->last_error().toStdString();
    EXPECT_TRUE(QTest::qWaitFor([&]() { return run.finished || failed; }, 300000));
    QObject::disconnect(c1);
    QObject::disconnect(c2);
    run.solved = window->solve_job().levels_solved();
    run.from_cache = window->solve_job().levels_from_cache();
    run.status = window->status_label()->text();
    run.notes = window->solve_job().cache_notes();
    run.results = window->session().results();
    return run;
  }

  static QTemporaryDir* dir_;
  static QString case_path_;
};
QTemporaryDir* SolutionCacheWindowTest::dir_ = nullptr;
QString SolutionCacheWindowTest::case_path_;

void expect_same_results(const std::vector<analysis::ScenarioResult>& a,
                         const std::vector<analysis::ScenarioResult>& b) {
  ASSERT_EQ(a.size(), b.size());
  for (size_t k = 0; k < a.size(); ++k) {
    SCOPED_TRACE("level " + std::to_string(k));
    EXPECT_TRUE(same_bits(a[k].pressure_kpa, b[k].pressure_kpa));
    EXPECT_TRUE(same_bits(a[k].von_mises_kpa, b[k].von_mises_kpa));
    EXPECT_TRUE(same_bits(a[k].root_map.pressure_kpa, b[k].root_map.pressure_kpa));
    EXPECT_TRUE(a[k].displacement_mm == b[k].displacement_mm);
    EXPECT_EQ(a[k].pressure_max_compression_kpa, b[k].pressure_max_compression_kpa);
    EXPECT_EQ(a[k].cres_labiolingual.from_crest_mm, b[k].cres_labiolingual.from_crest_mm);
    EXPECT_EQ(a[k].equivalent_force_peak_g, b[k].equivalent_force_peak_g);
  }
}

TEST_F(SolutionCacheWindowTest, SecondOpenShowsResultsWithoutASolve) {
  const QString cache = dir_->filePath(QStringLiteral("cache_reopen"));
  const SolveRun first = open(cache);
  ASSERT_TRUE(first.finished);
  EXPECT_EQ(first.solved, 2);
  EXPECT_EQ(first.from_cache, 0);
  EXPECT_EQ(analysis::SolutionCache(cache.toStdString(), 1).entry_count(), 2);

  // A second instance opening the same case.
  MainWindowOptions options;
  options.dialogs = false;
  options.autosave_folder = dir_->filePath(QStringLiteral("autosave"));
  options.solution_cache_folder = cache;
  MainWindow window(options);
  window.resize(1200, 800);
  window.show();
  ASSERT_TRUE(QTest::qWaitForWindowExposed(&window));
  const SolveRun second = open(cache, nullptr);
  ASSERT_TRUE(second.finished);
  EXPECT_EQ(second.solved, 0);
  EXPECT_EQ(second.from_cache, 2);
  EXPECT_TRUE(second.status.contains(QStringLiteral("nothing solved")))
      << second.status.toStdString();
  expect_same_results(first.results, second.results);

  // In a window kept open: the colours are on screen; F5 on the unchanged case solves nothing.
  const SolveRun shown = open(cache, &window, false);
  EXPECT_EQ(shown.solved, 0);
  window.show_view(ViewKind::k3D);
  QApplication::processEvents();
  EXPECT_GT(testing::colour_map_pixels(window.result_view()->vtk_view()->grabFramebuffer()), 1000);
  const SolveRun f5 = open(cache, &window, true);
  EXPECT_EQ(f5.solved, 0);
  EXPECT_EQ(f5.from_cache, 2);
  expect_same_results(first.results, f5.results);

  // One level edited: only that one is solved.
  ScenarioList levels = window.session().levels();
  mesh::BoneLoss loss = levels.at(1).loss;
  loss.horizontal_mm += 0.5;
  levels.set_loss(1, loss);
  window.session().set_levels(levels);
  const SolveRun after_edit = open(cache, &window, true);
  EXPECT_EQ(after_edit.solved, 1);
  EXPECT_EQ(after_edit.from_cache, 1);
}

TEST_F(SolutionCacheWindowTest, DamagedEntryIsSolvedAgain) {
  const QString cache = dir_->filePath(QStringLiteral("cache_damaged"));
  const SolveRun first = open(cache);
  ASSERT_EQ(first.solved, 2);
  const analysis::SolutionCache store(cache.toStdString(), 1);
  const QString entry = QString::fromStdString(
      store.entry_path(analysis::solution_cache_key(testing::coarse_incisor(2), 1)));
  QFile file(entry);
  ASSERT_TRUE(file.open(QIODevice::ReadWrite));
  file.seek(file.size() / 2);
  char c = 0;
  file.getChar(&c);
  file.seek(file.size() / 2);
  file.putChar(static_cast<char>(c ^ 0x40));
  file.close();
  const SolveRun again = open(cache);
  ASSERT_TRUE(again.finished);
  EXPECT_EQ(again.from_cache, 1);
  EXPECT_EQ(again.solved, 1);
  EXPECT_TRUE(again.notes.contains(QStringLiteral("checksum"))) << again.notes.toStdString();
  EXPECT_TRUE(again.status.contains(QStringLiteral("checksum"))) << again.status.toStdString();
  expect_same_results(first.results, again.results);
  // Saved anew: the next open solves nothing.
  EXPECT_EQ(open(cache).solved, 0);
}

TEST_F(SolutionCacheWindowTest, CacheSurvivesAKilledInstance) {
  const QString cache = dir_->filePath(QStringLiteral("cache_killed"));
  QDir().mkpath(cache);
  // The real program, on its own settings and data folders, killed (SIGKILL) once it has saved
  // its first level while it solves the second.
  QProcess program;
  QProcessEnvironment env = QProcessEnvironment::systemEnvironment();
  env.insert(QStringLiteral("SHARPEY_CACHE_DIR"), cache);
  env.insert(QStringLiteral("XDG_CONFIG_HOME"), dir_->filePath(QStringLiteral("killed_config")));
  env.insert(QStringLiteral("XDG_DATA_HOME"), dir_->filePath(QStringLiteral("killed_data")));
  program.setProcessEnvironment(env);
  program.start(QStringLiteral(SHARPEY_BINARY_DIR "/app/gui/sharpey"), {case_path_});
  ASSERT_TRUE(program.waitForStarted(30000));
  const analysis::SolutionCache store(cache.toStdString(), 1);
  const bool saved_one = QTest::qWaitFor([&]() { return store.entry_count() >= 1; }, 300000);
  program.kill();
  program.waitForFinished(30000);
  ASSERT_TRUE(saved_one) << "the program saved no level";
  // What a kill in the middle of writing leaves: half an entry under a temporary name, here for
  // the level not saved yet (if the program got that far, its entry is removed first).
  const analysis::CaseSpec spec = testing::coarse_incisor(2);
  const std::string second = store.entry_path(analysis::solution_cache_key(spec, 1));
  QFile::remove(QString::fromStdString(second));
  const std::string bytes = analysis::write_solution(*testing::solved_incisor(2)->solutions()[1],
                                                     analysis::solution_cache_key(spec, 1));
  const QFileInfo info(QString::fromStdString(second));
  QFile temp(
      info.dir().filePath(QStringLiteral(".") + info.fileName() + QStringLiteral(".tmp-4242-0")));
  ASSERT_TRUE(temp.open(QIODevice::WriteOnly));
  temp.write(bytes.data(), static_cast<qint64>(bytes.size() / 2));
  temp.close();

  const SolveRun next = open(cache);
  ASSERT_TRUE(next.finished);
  EXPECT_EQ(next.from_cache, 1);
  EXPECT_EQ(next.solved, 1);
  EXPECT_TRUE(next.notes.isEmpty()) << next.notes.toStdString();
  ASSERT_EQ(next.results.size(), 2u);
  EXPECT_GT(next.results[1].pressure_max_compression_kpa, 0);
  EXPECT_EQ(store.entry_count(), 2);
}

}  // namespace
}  // namespace sharpey::app
