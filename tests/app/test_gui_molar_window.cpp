// A multi-rooted case in the app (issue 15, point 4): the main window opens the invented
// mandibular first molar sample in the window of its own instead of refusing it; the tables hold
// the analysis library's numbers, one root map per part (trunk and each root), the caution shows,
// and the PDF report has its pages with the caution on each.
#include <gtest/gtest.h>

#include <QDir>
#include <QFile>
#include <QLabel>
#include <QListWidget>
#include <QProcess>
#include <QRegularExpression>
#include <QStandardPaths>
#include <QTableWidget>
#include <QTemporaryDir>
#include <QTest>
#include <QTimer>
#include <cmath>
#include <limits>

#include "support/image_checks.h"
#include "view/main_window.h"
#include "view/molar_root_maps.h"
#include "view/molar_scene.h"
#include "view/molar_window.h"
#include "view/vtk_view.h"

namespace sharpey::app {
namespace {

const QString kSample =
    QStringLiteral(SHARPEY_SOURCE_DIR "/samples/invented_mandibular_first_molar_uprighting.json");

QString run(const QString& program, const QStringList& args) {
  QProcess p;
  p.start(program, args);
  if (!p.waitForFinished(60000)) return {};
  return QString::fromUtf8(p.readAllStandardOutput());
}

double cell(const QTableWidget* t, int row, int column) {
  const QTableWidgetItem* item = t->item(row, column);
  return item ? item->data(Qt::UserRole).toDouble() : std::numeric_limits<double>::quiet_NaN();
}

MainWindow* g_window = nullptr;
QTemporaryDir* g_dir = nullptr;

class MolarWindowTest : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    QStandardPaths::setTestModeEnabled(true);
    g_dir = new QTemporaryDir;
    MainWindowOptions options;
    options.dialogs = false;
    options.autosave_folder = g_dir->filePath("autosave");
    g_window = new MainWindow(options);
    g_window->show();
    ASSERT_TRUE(g_window->open_case(kSample)) << g_window->last_error().toStdString();
    ASSERT_NE(g_window->molar_window(), nullptr);
    ASSERT_TRUE(QTest::qWaitForWindowExposed(g_window->molar_window()));
    QTest::qWait(100);
  }
  static void TearDownTestSuite() {
    delete g_window;
    delete g_dir;
  }
  MolarWindow& molar() { return *g_window->molar_window(); }
  // The library's own evaluation of the sample, independent of the window.
  static const analysis::MultiRootCaseResult& library() {
    static const analysis::MultiRootCaseResult r =
        analysis::evaluate_multi_root_case(analysis::load_multi_root_case(kSample.toStdString()));
    return r;
  }
};

TEST_F(MolarWindowTest, OpensTheSampleInsteadOfRefusingIt) {
  EXPECT_TRUE(molar().isVisible());
  EXPECT_TRUE(molar().has_case());
  EXPECT_EQ(molar().scenario_list()->count(), 3);
  EXPECT_TRUE(g_window->last_error().isEmpty()) << g_window->last_error().toStdString();
  // The caution, whole and visible.
  EXPECT_TRUE(molar().caution_label()->isVisible());
  EXPECT_EQ(molar().caution_label()->text().toStdString(), analysis::caution_text());
}

// derived (two computations: the window's cells and the library's evaluation of the same file),
// to 1e-9; the forces in N and in g (1 gf = 0.00980665 N, the standard gravity: published, CGPM
// 1901, via analysis::from_newton).
TEST_F(MolarWindowTest, PerRootTableHoldsTheLibrarysNumbers) {
  for (analysis::ForceUnit unit : {analysis::ForceUnit::kNewton, analysis::ForceUnit::kGram}) {
    molar().set_force_unit(unit);
    for (int s = 0; s < 3; ++s) {
      SCOPED_TRACE("scenario " + std::to_string(s) + ", unit " + analysis::to_string(unit));
      molar().show_scenario(s);
      const analysis::MultiRootScenarioResult& r = library().scenarios[static_cast<size_t>(s)];
      const QTableWidget* t = molar().root_table();
      ASSERT_EQ(t->columnCount(), static_cast<int>(r.result.roots.size()) + 1);
      ASSERT_EQ(t->rowCount(), 6);
      for (size_t c = 0; c <= r.result.roots.size(); ++c) {
        const analysis::RootFigures& f =
            c < r.result.roots.size() ? r.result.roots[c] : r.result.tooth;
        const int col = static_cast<int>(c);
        EXPECT_NEAR(cell(t, 0, col), f.attachment_area_mm2, 1e-9);
        EXPECT_NEAR(cell(t, 1, col), f.peak_compression_kpa, 1e-9);
        EXPECT_NEAR(cell(t, 2, col), f.peak_tension_kpa, 1e-9);
        EXPECT_NEAR(cell(t, 3, col), f.area_above_capillary_mm2, 1e-9);
        EXPECT_NEAR(cell(t, 4, col), f.area_above_limit_mm2, 1e-9);
        const double per_n = unit == analysis::ForceUnit::kGram ? 1 / 0.00980665 : 1.0;
        EXPECT_NEAR(cell(t, 5, col), f.reaction_n.norm() * per_n, 1e-9);
      }
      const QTableWidget* cres = molar().cres_table();
      EXPECT_NEAR(cell(cres, 0, 0), r.cres_mesiodistal.below_cej_mm, 1e-9);
      EXPECT_NEAR(cell(cres, 0, 1), r.cres_mesiodistal.below_furcation_mm, 1e-9);
      EXPECT_NEAR(cell(cres, 1, 0), r.cres_buccolingual.below_cej_mm, 1e-9);
      EXPECT_NEAR(cell(cres, 1, 1), r.cres_buccolingual.below_furcation_mm, 1e-9);
    }
  }
  molar().set_force_unit(analysis::ForceUnit::kNewton);
}

// The allowances against the thin-layer model built here from the case (an independent call of
// analysis::MultiRootThinLayer::allowance), to 1e-9 relative; the case's own movement also
// against the batch report's figure (threshold over the peak per unit). derived.
TEST_F(MolarWindowTest, AllowanceOfEachMovementIsTheLibrarys) {
  const analysis::MultiRootCase spec = analysis::load_multi_root_case(kSample.toStdString());
  molar().set_force_unit(analysis::ForceUnit::kNewton);
  const analysis::MolarMovement movements[] = {analysis::MolarMovement::kUprighting,
                                               analysis::MolarMovement::kIntrusion,
                                               analysis::MolarMovement::kTranslation};
  for (int s = 0; s < 3; ++s) {
    SCOPED_TRACE("scenario " + std::to_string(s));
    molar().show_scenario(s);
    const analysis::MultiRootThinLayer model(mesh::multi_root_handbook(spec.type),
                                             spec.scenarios[static_cast<size_t>(s)].bone, spec.pdl);
    const QTableWidget* t = molar().allowance_table();
    ASSERT_EQ(t->rowCount(), 3);
    for (int m = 0; m < 3; ++m) {
      const double cap = model.allowance(movements[m], spec.thresholds.capillary.value_kpa);
      const double lim = model.allowance(movements[m], spec.thresholds.limit.value_kpa);
      EXPECT_NEAR(cell(t, m, 0), cap, 1e-9 * cap);
      EXPECT_NEAR(cell(t, m, 1), lim, 1e-9 * lim);
    }
    const double batch = library().scenarios[static_cast<size_t>(s)].allowance_limit;
    EXPECT_NEAR(cell(t, 0, 1), batch, 1e-9 * batch);  // the sample is an uprighting case
  }
}

TEST_F(MolarWindowTest, OneRootMapPerPartWithTheRootsNamed) {
  const mesh::MultiRootTooth tooth =
      mesh::multi_root_handbook(mesh::MultiRootType::kMandibularFirstMolar);
  for (int s = 0; s < 3; ++s) {
    molar().show_scenario(s);
    const MolarRootMaps* maps = molar().root_maps();
    // One map per root plus the trunk.
    EXPECT_EQ(maps->n_maps(), static_cast<int>(tooth.roots.size()) + 1);
    int root_maps = 0;
    for (const QString& label : maps->map_labels())
      if (label.endsWith(QStringLiteral(" root"))) ++root_maps;
    EXPECT_EQ(root_maps, static_cast<int>(tooth.roots.size()));
    // The shared scale spans the library's cells.
    double top = -1e300;
    for (const analysis::MultiRootMapCell& c : library().scenarios[static_cast<size_t>(s)].root_map)
      top = std::max(top, c.pressure_kpa);
    EXPECT_DOUBLE_EQ(maps->range().max, top);
  }
}

// The 3D view draws every surface point: attached ones coloured, the lost ones apart; the loss
// scenarios lose surface the healthy one keeps. derived (counts of the library's flags).
TEST_F(MolarWindowTest, TheThreeDViewTellsAttachedFromLostSurface) {
  int lost_healthy = -1;
  for (int s = 0; s < 3; ++s) {
    molar().show_scenario(s);
    const analysis::MultiRootScenarioResult& r = library().scenarios[static_cast<size_t>(s)];
    int attached = 0;
    for (const mesh::RootSurfacePoint& p : r.surface) attached += p.attached ? 1 : 0;
    EXPECT_EQ(molar().scene()->n_attached(), attached);
    EXPECT_EQ(molar().scene()->n_lost(), static_cast<int>(r.surface.size()) - attached);
    if (s == 0) lost_healthy = molar().scene()->n_lost();
    if (s > 0) {
      EXPECT_GT(molar().scene()->n_lost(), lost_healthy);
    }
  }
  const QImage image = molar().view_image();
  ASSERT_FALSE(image.isNull());
  EXPECT_GT(testing::colour_map_pixels(image), 500);
}

TEST_F(MolarWindowTest, PdfReportHasAPagePerScenarioAndTheCautionOnEach) {
  const QString pdf = g_dir->filePath("molar.pdf");
  QString error;
  ASSERT_TRUE(molar().export_report(pdf, &error)) << error.toStdString();
  const QString info = run(QStringLiteral("pdfinfo"), {pdf});
  ASSERT_FALSE(info.isEmpty()) << "pdfinfo (poppler-utils) is needed for this test";
  // The summary page and one per scenario.
  EXPECT_TRUE(info.contains(QRegularExpression(QStringLiteral("Pages:\\s+4\\b"))))
      << info.toStdString();
  for (int page = 1; page <= 4; ++page) {
    SCOPED_TRACE("page " + std::to_string(page));
    const QString text = run(QStringLiteral("pdftotext"),
                             {QStringLiteral("-f"), QString::number(page), QStringLiteral("-l"),
                              QString::number(page), pdf, QStringLiteral("-")})
                             .simplified();
    EXPECT_TRUE(text.contains(QStringLiteral("Clinical judgement and local regulations prevail")));
    EXPECT_TRUE(text.contains(QStringLiteral("hin-layer estimate")));
  }
  const QString scenario = run(QStringLiteral("pdftotext"),
                               {QStringLiteral("-f"), QStringLiteral("4"), QStringLiteral("-l"),
                                QStringLiteral("4"), pdf, QStringLiteral("-")})
                               .simplified();
  EXPECT_TRUE(scenario.contains(QStringLiteral("mesial root")));
  EXPECT_TRUE(scenario.contains(QStringLiteral("distal root")));
  EXPECT_TRUE(scenario.contains(QStringLiteral("uprighting")));
}

TEST_F(MolarWindowTest, ABadMultiRootedFileIsRefusedNamingTheKey) {
  const QString path = g_dir->filePath("bad_molar.json");
  QFile f(path);
  ASSERT_TRUE(f.open(QIODevice::WriteOnly));
  f.write(R"({"schema_version": 1, "kind": "multi_root_estimate",
             "tooth": {"type": "mandibular_first_molar"},
             "scenarios": [{"name": "x", "horizontal_loss_mm": 3,
                            "furcation": {"degree": 2, "horizontal_mm": 1}}],
             "load": {"movement": "uprighting", "magnitude": 10}})");
  f.close();
  EXPECT_FALSE(g_window->open_case(path));
  EXPECT_TRUE(g_window->last_error().contains(QStringLiteral("scenarios[0]")))
      << g_window->last_error().toStdString();
  // The case shown before stays.
  EXPECT_EQ(molar().scenario_list()->count(), 3);
}

// A case with finite elements is meshed and solved on a worker thread: open() returns at once,
// the event loop keeps running, and the finite-element table then holds the evaluation's figures
// (those figures themselves are checked in tests/analysis/test_multi_root_fe*.cpp). One healthy
// scenario, coarse sizes: one solve, about 10 s.
TEST_F(MolarWindowTest, AFiniteElementCaseIsEvaluatedInTheBackground) {
  const QString path = g_dir->filePath("fe_molar.json");
  QFile f(path);
  ASSERT_TRUE(f.open(QIODevice::WriteOnly));
  f.write(R"({"schema_version": 1, "kind": "multi_root_estimate", "label": "invented check",
             "tooth": {"type": "mandibular_first_molar"}, "scenarios": [{"name": "healthy"}],
             "load": {"movement": "translation", "magnitude": 1, "unit": "N"},
             "finite_elements": true})");
  f.close();
  MolarWindow window;
  QString error;
  ASSERT_TRUE(window.open(path, &error)) << error.toStdString();
  EXPECT_TRUE(window.busy());
  int ticks = 0;
  QTimer timer;
  QObject::connect(&timer, &QTimer::timeout, [&]() { ++ticks; });
  timer.start(50);
  bool done = false;
  QObject::connect(&window, &MolarWindow::evaluated, [&]() { done = true; });
  ASSERT_TRUE(QTest::qWaitFor([&]() { return done; }, 600000));
  EXPECT_GT(ticks, 2);  // the window's thread went on meanwhile
  ASSERT_TRUE(window.result().scenarios.at(0).has_finite_elements);
  const analysis::MultiRootFeFigures& fe = window.result().scenarios[0].finite_elements;
  const QTableWidget* t = window.fe_table();
  ASSERT_EQ(t->rowCount(), 2 + static_cast<int>(fe.roots.size()) + 1);
  EXPECT_EQ(cell(t, 0, 0), fe.mesiodistal.below_cej_mm);
  EXPECT_EQ(cell(t, 1, 0), fe.buccolingual.below_cej_mm);
  for (size_t k = 0; k < fe.roots.size(); ++k)
    EXPECT_EQ(cell(t, 2 + static_cast<int>(k), 1), fe.roots[k].peak_compression_kpa);
  EXPECT_EQ(cell(t, t->rowCount() - 1, 1), fe.tooth.peak_compression_kpa);
  // The finite-element areas per root and for the tooth, and the case's load to each threshold.
  const QTableWidget* a = window.fe_area_table();
  ASSERT_EQ(a->columnCount(), static_cast<int>(fe.roots.size()) + 1);
  ASSERT_EQ(a->rowCount(), 5);
  for (size_t k = 0; k < fe.roots.size(); ++k) {
    EXPECT_EQ(cell(a, 0, static_cast<int>(k)), fe.roots[k].attachment_area_mm2);
    EXPECT_EQ(cell(a, 1, static_cast<int>(k)), fe.roots[k].area_above_capillary_mm2);
    EXPECT_EQ(cell(a, 2, static_cast<int>(k)), fe.roots[k].area_above_limit_mm2);
  }
  const int whole = a->columnCount() - 1;
  EXPECT_EQ(cell(a, 0, whole), fe.tooth.attachment_area_mm2);
  EXPECT_NEAR(cell(a, 4, whole), fe.allowance_limit, 1e-12);  // the case's unit is N
}

}  // namespace
}  // namespace sharpey::app
