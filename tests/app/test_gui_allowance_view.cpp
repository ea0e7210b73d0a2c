// The force-allowance view through the whole window, on the incisor sample cut to two bone levels
// (coarse mesh; a band of three samples without the sensitivity runs, for speed): the nominal
// allowances shown per level and movement are the analysis library's, the apply button sets the
// force controls to the allowance in the user's unit, the band runs in the background and can be
// stopped, and the PDF report has an allowance section for every level with the caution.
#include <gtest/gtest.h>

#include <QApplication>
#include <QComboBox>
#include <QLabel>
#include <QProcess>
#include <QPushButton>
#include <QRegularExpression>
#include <QStandardPaths>
#include <QTabWidget>
#include <QTemporaryDir>
#include <QTest>
#include <QTimer>
#include <cmath>

#include "core/allowance_job.h"
#include "core/case_session.h"
#include "core/units.h"
#include "support/image_checks.h"
#include "support/solved_sample.h"
#include "view/allowance_view.h"
#include "view/load_panel.h"
#include "view/main_window.h"

namespace sharpey::app {
namespace {

using analysis::ForceUnit;
using analysis::MovementPreset;

MainWindow* g_window = nullptr;
QTemporaryDir* g_dir = nullptr;

QString run(const QString& program, const QStringList& args) {
  QProcess p;
  p.start(program, args);
  if (!p.waitForFinished(60000)) return {};
  return QString::fromUtf8(p.readAllStandardOutput());
}

class AllowanceViewTest : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    QStandardPaths::setTestModeEnabled(true);
    g_dir = new QTemporaryDir;
    analysis::CaseSpec spec = testing::coarse_incisor(2);
    spec.band.n_samples = 3;  // the smallest the case file allows
    spec.band.sensitivity = false;
    const QString path = g_dir->filePath("two_levels.json");
    analysis::save_case(spec, path.toStdString());
    MainWindowOptions options;
    options.dialogs = false;
    options.autosave_folder = g_dir->filePath("autosave");
    g_window = new MainWindow(options);
    g_window->resize(1500, 920);
    g_window->show();
    ASSERT_TRUE(QTest::qWaitForWindowExposed(g_window));
    bool done = false, failed = false;
    const auto a = QObject::connect(g_window, &MainWindow::solve_finished, [&]() { done = true; });
    const auto b = QObject::connect(g_window, &MainWindow::solve_failed, [&]() { failed = true; });
    ASSERT_TRUE(g_window->open_case(path)) << g_window->last_error().toStdString();
    const bool ended = QTest::qWaitFor([&]() { return done || failed; }, 600000);
    QObject::disconnect(a);
    QObject::disconnect(b);
    ASSERT_TRUE(ended && done) << g_window->last_error().toStdString();
    AllowanceView* view = g_window->allowance_view();
    ASSERT_TRUE(QTest::qWaitFor([&]() { return view->levels().size() == 2; }, 60000))
        << "nominal allowances of both levels";
  }
  static void TearDownTestSuite() {
    delete g_window;
    delete g_dir;
  }
  static AllowanceView* view() { return g_window->allowance_view(); }
};

// Source of truth: the analysis library's allowances of each solved level under the case's
// force system (computed here again, independently of the view's worker).
TEST_F(AllowanceViewTest, ShowsTheLibrarysNominalAllowancesPerLevelAndMovement) {
  const CaseSession& s = g_window->session();
  ASSERT_EQ(s.results().size(), 2u);
  const ForceUnit unit = s.load_controls().unit;
  for (int k = 0; k < 2; ++k) {
    const analysis::ScenarioAllowances expected =
        analysis::scenario_allowances(*s.solution(k), s.spec().load, s.spec().thresholds);
    const AllowanceLevel& level = view()->levels()[static_cast<size_t>(k)];
    EXPECT_EQ(level.name.toStdString(), expected.scenario);
    ASSERT_EQ(level.rows.size(), expected.movements.size());
    for (const analysis::MovementAllowance& a : expected.movements) {
      SCOPED_TRACE(expected.scenario + " " + analysis::to_string(a.movement));
      const AllowanceRow* row = level.row(a.movement);
      ASSERT_NE(row, nullptr);
      EXPECT_EQ(row->limited, a.limited_by_compression());
      if (!a.limited_by_compression()) {
        EXPECT_TRUE(std::isinf(row->nominal));
        continue;
      }
      const double want = analysis::convert_force(a.peak_limit_n, ForceUnit::kNewton, unit);
      EXPECT_NEAR(row->nominal, want, 1e-9 * want);
    }
  }
  // Derived (project acceptance, docs/analyses.md 12.1): every allowance falls with bone loss.
  for (const AllowanceRow& healthy : view()->levels()[0].rows) {
    if (!healthy.limited) continue;
    EXPECT_LT(view()->levels()[1].row(healthy.movement)->nominal, healthy.nominal)
        << analysis::to_string(healthy.movement);
  }
  // The caution is on the view, and the view draws something.
  g_window->tabs()->setCurrentWidget(view());
  QApplication::processEvents();
  EXPECT_TRUE(view()->caution_label()->isVisible());
  EXPECT_EQ(view()->caution_label()->text().toStdString(), analysis::caution_text());
  const QImage charts = view()->grab_charts();
  testing::keep_image(charts, "test_allowance_view_nominal");
  EXPECT_GT(testing::count_colours(charts), 8);
}

TEST_F(AllowanceViewTest, ApplySetsTheForceControlsToTheAllowanceInTheUsersUnit) {
  // The user's unit: cN.
  LoadControls c = g_window->session().load_controls();
  c.set_unit(ForceUnit::kCentinewton);
  g_window->load_panel()->set_controls(c);
  g_window->set_load(c, false);
  ASSERT_TRUE(QTest::qWaitFor([&]() { return view()->levels().size() == 2; }, 60000));
  g_window->level_box()->setCurrentIndex(1);  // the 2 mm loss level on display
  QApplication::processEvents();
  view()->set_movement(MovementPreset::kTranslation);
  // No band yet: the nominal allowance, rounded down to the field's 0.1 cN.
  const double nominal = view()->levels()[1].row(MovementPreset::kTranslation)->nominal;
  ASSERT_TRUE(view()->apply_allowance()) << view()->status_text().toStdString();
  const LoadControls& applied = g_window->session().load_controls();
  EXPECT_EQ(applied.unit, ForceUnit::kCentinewton);
  EXPECT_EQ(applied.preset, MovementPreset::kTranslation);
  EXPECT_NEAR(applied.magnitude, std::floor(nominal * 10) / 10, 1e-9);
  EXPECT_LE(applied.magnitude, nominal);
  EXPECT_EQ(g_window->load_panel()->controls().magnitude, applied.magnitude);  // the panel too
  EXPECT_TRUE(view()->status_text().contains(QStringLiteral("nominal")));

  // The band, in the background: the window keeps handling events while it runs.
  int ticks = 0;
  QTimer tick;
  QObject::connect(&tick, &QTimer::timeout, [&]() { ++ticks; });
  tick.start(50);
  ASSERT_TRUE(view()->compute_band()) << view()->status_text().toStdString();
  EXPECT_TRUE(view()->job().band_running());
  ASSERT_TRUE(QTest::qWaitFor([&]() { return !view()->job().band_running(); }, 600000));
  tick.stop();
  ASSERT_NE(view()->job().band(), nullptr) << view()->status_text().toStdString();
  EXPECT_GT(ticks, 5) << "the event loop ran while the band was computed";
  ASSERT_TRUE(view()->job().band_matches_load());
  const AllowanceRow* row = view()->levels()[1].row(MovementPreset::kTranslation);
  ASSERT_TRUE(row->has_band());
  const double p10_cn = analysis::convert_force(
      view()
          ->job()
          .band()
          ->scenarios[1]
          .of(MovementPreset::kTranslation)
          .conservative_n(analysis::AllowanceMeasure::kPeak, analysis::AllowanceThreshold::kLimit),
      ForceUnit::kNewton, ForceUnit::kCentinewton);
  EXPECT_NEAR(row->band_p10, p10_cn, 1e-9 * p10_cn);
  ASSERT_TRUE(view()->apply_allowance()) << view()->status_text().toStdString();
  EXPECT_NEAR(g_window->session().load_controls().magnitude, std::floor(p10_cn * 10) / 10, 1e-9);
  EXPECT_TRUE(view()->status_text().contains(QStringLiteral("conservative")));
  EXPECT_EQ(view()->apply_button()->text(), QStringLiteral("Apply conservative allowance"));
  testing::keep_image(view()->grab_charts(), "test_allowance_view_band");
}

TEST_F(AllowanceViewTest, BandCanBeStopped) {
  ASSERT_TRUE(view()->compute_band()) << view()->status_text().toStdString();
  bool cancelled = false;
  const auto on =
      QObject::connect(&view()->job(), &AllowanceJob::band_cancelled, [&]() { cancelled = true; });
  view()->job().cancel_band();
  ASSERT_TRUE(QTest::qWaitFor([&]() { return !view()->job().band_running(); }, 120000));
  QObject::disconnect(on);
  EXPECT_TRUE(cancelled);
  EXPECT_TRUE(view()->status_text().contains(QStringLiteral("stopped")));
  EXPECT_EQ(view()->levels().size(), 2u);  // the nominal allowances stay
}

TEST_F(AllowanceViewTest, ReportHasAnAllowanceSectionForEveryLevel) {
  const QString pdf = g_dir->filePath("report.pdf");
  ASSERT_TRUE(g_window->export_report(pdf)) << g_window->last_error().toStdString();
  const QString info = run(QStringLiteral("pdfinfo"), {pdf});
  ASSERT_FALSE(info.isEmpty()) << "pdfinfo (poppler-utils) is needed for this test";
  EXPECT_TRUE(info.contains(QRegularExpression(QStringLiteral("Pages:\\s+4\\b"))))
      << info.toStdString();
  // Page 4: the allowances of both levels (two to a page), with the caution.
  const QString text = run(QStringLiteral("pdftotext"),
                           {QStringLiteral("-f"), QStringLiteral("4"), pdf, QStringLiteral("-")})
                           .simplified();
  EXPECT_TRUE(text.contains(QStringLiteral("Force allowance")));
  ASSERT_EQ(view()->levels().size(), g_window->session().results().size());
  for (const AllowanceLevel& level : view()->levels()) {
    const QString heading =
        QStringLiteral("%1 (bone loss %2 mm)").arg(level.name).arg(level.bone_loss_mm, 0, 'f', 1);
    EXPECT_TRUE(text.contains(heading)) << heading.toStdString() << "\n" << text.toStdString();
  }
  EXPECT_TRUE(text.contains(QStringLiteral("common practice")));
  EXPECT_TRUE(text.contains(QStringLiteral("conservative")));
  EXPECT_TRUE(text.contains(QStringLiteral("not a prescription")));
  EXPECT_TRUE(text.contains(QStringLiteral("unbounded")));  // extrusion
}

}  // namespace
}  // namespace sharpey::app
