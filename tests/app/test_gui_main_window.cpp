// The whole window on the incisor sample (coarse mesh override for speed): opening meshes and
// solves at once, the 3D view shows colour-mapped pixels, the colour bar spans the computed
// pressure range, doubling the force in the panel doubles the displayed peak, and the exports
// (PDF report with its pages, caution and threshold sources; PNG; CSV/JSON/VTU) are written.
#include <gtest/gtest.h>

#include <QComboBox>
#include <QDir>
#include <QDoubleSpinBox>
#include <QFile>
#include <QFileInfo>
#include <QLabel>
#include <QLineEdit>
#include <QProcess>
#include <QProcessEnvironment>
#include <QRegularExpression>
#include <QSlider>
#include <QStandardPaths>
#include <QTableWidget>
#include <QTemporaryDir>
#include <QTest>
#include <algorithm>

#include "core/autosave_store.h"
#include "core/case_session.h"
#include "core/colour_map.h"
#include "support/image_checks.h"
#include "support/solved_sample.h"
#include "view/case_panel.h"
#include "view/colour_bar.h"
#include "view/comparison_view.h"
#include "view/load_panel.h"
#include "view/main_window.h"
#include "view/result_view.h"
#include "view/root_map_view.h"
#include "view/vtk_view.h"

namespace sharpey::app {
namespace {

using testing::colour_map_pixels;
using testing::count_pixels;

// Runs a program and returns its standard output (empty when it is missing).
QString run(const QString& program, const QStringList& args) {
  QProcess p;
  p.start(program, args);
  if (!p.waitForFinished(60000)) return {};
  return QString::fromUtf8(p.readAllStandardOutput());
}

MainWindow* g_window = nullptr;
QTemporaryDir* g_dir = nullptr;

// The window as it was when the first results arrived (while the other levels were solved).
struct FirstView {
  bool seen = false;
  bool solving = false;
  size_t results = 0;
  int levels_listed = 0;
  int coloured_pixels = 0;
  bool export_refused = false;
  QString export_message;
};
FirstView g_first;

class MainWindowTest : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    QStandardPaths::setTestModeEnabled(true);  // recent files and settings stay out of $HOME
    g_dir = new QTemporaryDir;
    MainWindowOptions options;
    options.dialogs = false;
    options.mesh_override = mesh::MeshPreset::kCoarse;
    options.autosave_folder = g_dir->filePath("autosave");
    g_window = new MainWindow(options);
    g_window->resize(1500, 920);
    g_window->show();
    ASSERT_TRUE(QTest::qWaitForWindowExposed(g_window));
    bool done = false, failed = false;
    // Disconnected below: they refer to this function's locals (a later solve, e.g. one read
    // back from the saved solutions within milliseconds, would write into a dead frame).
    const auto on_done =
        QObject::connect(g_window, &MainWindow::solve_finished, [&]() { done = true; });
    const auto on_failed =
        QObject::connect(g_window, &MainWindow::solve_failed, [&]() { failed = true; });
    QObject::connect(&g_window->session(), &CaseSession::results_changed, [&](bool interactive) {
      if (g_first.seen || interactive) return;
      g_first.seen = true;
      g_first.solving = g_window->solving();
      g_first.results = g_window->session().results().size();
      g_first.levels_listed = g_window->level_box()->count();
      g_window->show_view(ViewKind::k3D);
      QApplication::processEvents();
      g_first.coloured_pixels =
          colour_map_pixels(g_window->result_view()->vtk_view()->grabFramebuffer());
      testing::keep_image(g_window->grab().toImage(), "test_main_window_first_view");
      g_first.export_refused = !g_window->export_data(g_dir->filePath("too_early"));
      g_first.export_message = g_window->last_error();
    });
    ASSERT_TRUE(g_window->open_case(testing::incisor_sample_path()))
        << g_window->last_error().toStdString();
    EXPECT_TRUE(g_window->solving());  // opening starts the solve at once
    const bool ended = QTest::qWaitFor([&]() { return done || failed; }, 600000);
    QObject::disconnect(on_done);
    QObject::disconnect(on_failed);
    ASSERT_TRUE(ended) << "solve timed out";
    ASSERT_TRUE(done) << g_window->last_error().toStdString();
    QTest::qWait(100);
  }
  static void TearDownTestSuite() {
    delete g_window;
    delete g_dir;
  }
};

TEST_F(MainWindowTest, OpeningTheSampleSolvesAndShowsColours) {
  ASSERT_EQ(g_window->session().results().size(), 4u);
  g_window->show_view(ViewKind::k3D);
  QApplication::processEvents();
  const QImage window = g_window->grab().toImage();
  testing::keep_image(window, "test_main_window");
  const QImage view = g_window->result_view()->vtk_view()->grabFramebuffer();
  const int coloured = colour_map_pixels(view);
  EXPECT_GT(coloured, 1000) << "colour-map pixels in the 3D view";
  EXPECT_GT(colour_map_pixels(window), coloured / 2);  // the grab of the window shows them too
  EXPECT_TRUE(g_window->caution_label()->isVisible());
  EXPECT_EQ(g_window->caution_label()->text().toStdString(), analysis::caution_text());
}

TEST_F(MainWindowTest, TheHealthyLevelIsShownWhileTheOthersAreSolved) {
  ASSERT_TRUE(g_first.seen);
  EXPECT_TRUE(g_first.solving);
  EXPECT_EQ(g_first.results, 1u);
  EXPECT_EQ(g_first.levels_listed, 1);  // the selector lists the solved levels only
  EXPECT_GT(g_first.coloured_pixels, 1000) << "colour-map pixels in the first view";
  EXPECT_TRUE(g_first.export_refused);
  EXPECT_TRUE(g_first.export_message.contains(QStringLiteral("1 of 4")))
      << g_first.export_message.toStdString();
  EXPECT_FALSE(QDir(g_dir->filePath("too_early")).exists());
  EXPECT_EQ(g_window->level_box()->count(), 4);  // all listed once solved
}

TEST_F(MainWindowTest, ColourBarSpansTheComputedPressureRange) {
  const analysis::ScenarioResult* r = g_window->session().current_result();
  ASSERT_NE(r, nullptr);
  // Issue 12, point 2: the bar's ends are the key numbers (derived: both are taken over the PDL
  // outside the crest edge band), and the root map uses the same scale.
  const ColourBar* bar = g_window->result_view()->colour_bar();
  EXPECT_DOUBLE_EQ(bar->range().min, -r->pressure_max_tension_kpa);
  EXPECT_DOUBLE_EQ(bar->range().max, r->pressure_max_compression_kpa);
  EXPECT_EQ(bar->unit(), "kPa");
  EXPECT_DOUBLE_EQ(g_window->root_map()->range().max, r->pressure_max_compression_kpa);
  EXPECT_DOUBLE_EQ(g_window->root_map()->range().min, -r->pressure_max_tension_kpa);
}

TEST_F(MainWindowTest, DoublingTheForceInThePanelDoublesTheDisplayedPeak) {
  const ColourBar* bar = g_window->result_view()->colour_bar();
  const double peak = bar->range().max;
  const int frames = g_window->result_view()->vtk_view()->frames_rendered();
  QDoubleSpinBox* magnitude = g_window->load_panel()->magnitude_box();
  const double before = magnitude->value();
  magnitude->setValue(2 * before);
  QApplication::processEvents();
  // Linear elasticity: superposition doubles every pressure (derived); no new solve.
  EXPECT_NEAR(bar->range().max, 2 * peak, 1e-9 * peak);
  EXPECT_FALSE(g_window->solving());
  QTest::qWait(50);
  EXPECT_GT(g_window->result_view()->vtk_view()->frames_rendered(), frames);  // repainted
  magnitude->setValue(before);
  QApplication::processEvents();
  EXPECT_NEAR(bar->range().max, peak, 1e-9 * peak);
}

// Issue 12, point 1: a refused force leaves the field, the slider and the results on the force
// system they showed; the message goes once a valid force is applied.
TEST_F(MainWindowTest, ARefusedForceKeepsControlsAndResultsTogether) {
  CaseSession& session = g_window->session();
  LoadPanel* panel = g_window->load_panel();
  QDoubleSpinBox* magnitude = panel->magnitude_box();
  const double before = magnitude->value();
  const int slider_before = panel->magnitude_slider()->value();
  const double peak = session.current_result()->pressure_max_compression_kpa;
  const double force_n = session.current_result()->load.force_n.norm();
  // The force the results were computed for, in the panel's unit (derived: the unit conversion).
  auto shown_force = [&]() {
    return analysis::from_newton(session.current_result()->load.force_n.norm(),
                                 session.load_controls().unit);
  };
  magnitude->setValue(0);  // refused: the case-file rules want a force above 0
  QApplication::processEvents();
  EXPECT_DOUBLE_EQ(magnitude->value(), before);
  EXPECT_EQ(panel->magnitude_slider()->value(), slider_before);
  EXPECT_DOUBLE_EQ(session.load_controls().magnitude, before);
  EXPECT_DOUBLE_EQ(session.current_result()->pressure_max_compression_kpa, peak);
  EXPECT_DOUBLE_EQ(session.current_result()->load.force_n.norm(), force_n);
  EXPECT_NEAR(shown_force(), magnitude->value(), 1e-9 * before);
  EXPECT_TRUE(g_window->status_label()->text().contains(QStringLiteral("not applied")))
      << g_window->status_label()->text().toStdString();
  // Typed "-50" and Enter: whatever the field makes of it, field, session and results agree.
  QLineEdit* field = magnitude->findChild<QLineEdit*>();
  ASSERT_NE(field, nullptr);
  field->selectAll();
  QTest::keyClicks(field, QStringLiteral("-50"));
  QTest::keyClick(field, Qt::Key_Return);
  QApplication::processEvents();
  EXPECT_DOUBLE_EQ(session.load_controls().magnitude, magnitude->value());
  EXPECT_NEAR(shown_force(), magnitude->value(), 1e-9 * before);
  EXPECT_GT(magnitude->value(), 0);
  // The slider dragged to 0 (released there): refused alike.
  panel->magnitude_slider()->setValue(0);
  QApplication::processEvents();
  EXPECT_GT(session.load_controls().magnitude, 0);
  EXPECT_EQ(panel->magnitude_slider()->value(),
            slider_from_magnitude(session.load_controls().magnitude, session.load_controls().unit));
  EXPECT_NEAR(shown_force(), magnitude->value(), 1e-9 * before);
  // A valid force (another than the one shown): applied, and the message about the refused one
  // goes.
  magnitude->setValue(magnitude->value() + 10);
  QApplication::processEvents();
  EXPECT_FALSE(g_window->status_label()->text().contains(QStringLiteral("not applied")))
      << g_window->status_label()->text().toStdString();
  magnitude->setValue(before);
  QApplication::processEvents();
  EXPECT_DOUBLE_EQ(session.current_result()->pressure_max_compression_kpa, peak);
  EXPECT_NEAR(shown_force(), before, 1e-9 * before);
}

// Issue 12, point 4: the summary at the bracket follows a changed point of application, in the
// chosen force unit.
TEST_F(MainWindowTest, TheSummaryAtTheBracketFollowsThePointOfApplication) {
  CaseSession& session = g_window->session();
  const LoadControls start = session.load_controls();
  ASSERT_EQ(start.unit, analysis::ForceUnit::kGram);
  const QString at_bracket = g_window->load_panel()->resolved_text();
  LoadControls moved = start;
  moved.at_pad_centre = false;
  moved.bracket_height_mm = 2.0;
  moved.preset = analysis::MovementPreset::kNone;
  g_window->load_panel()->set_controls(moved);
  g_window->set_load(moved, false);
  QApplication::processEvents();
  const QString text = g_window->load_panel()->resolved_text();
  EXPECT_NE(text, at_bracket);
  EXPECT_TRUE(text.contains(QStringLiteral("applied 2.0\u2009mm above the CEJ")))
      << text.toStdString();
  EXPECT_TRUE(text.contains(QString::fromUtf8("g\u00b7mm about the mesiodistal axis")))
      << text.toStdString();
  // A lingual force 2 mm above the CEJ, below the bracket centre, turns about the mesiodistal axis
  // there: that moment is not 0 (derived: r x F with r along the long axis).
  const analysis::ScenarioResult* r = session.current_result();
  EXPECT_GT(std::abs(r->load.moment_nmm.y()), 0.05 * r->load.force_n.norm());
  EXPECT_NEAR(r->load.application_point.z(), 2.0, 1e-9);
  g_window->load_panel()->set_controls(start);
  g_window->set_load(start, false);
  QApplication::processEvents();
  EXPECT_EQ(g_window->load_panel()->resolved_text(), at_bracket);
}

TEST_F(MainWindowTest, TheTwoOptionRowsOfferTheSameChoicesAndActOnTheirViews) {
  g_window->show_view(ViewKind::kComparison);
  QApplication::processEvents();
  ComparisonView* comparison = g_window->comparison();
  ASSERT_GE(comparison->n_views(), 2);
  const ViewOptionBoxes a = g_window->result_view()->option_boxes();
  const ViewOptionBoxes b = comparison->option_boxes();
  auto entries = [](const QComboBox* box) {
    QStringList out;
    for (int i = 0; i < box->count(); ++i) out << box->itemText(i);
    return out;
  };
  EXPECT_EQ(entries(a.quantity), entries(b.quantity));
  EXPECT_EQ(entries(a.bone), entries(b.bone));
  EXPECT_EQ(entries(a.section), entries(b.section));
  // The comparison's row acts on every cell; the 3D view's row on its own view only.
  b.quantity->setCurrentIndex(b.quantity->findData(static_cast<int>(Quantity::kVonMises)));
  b.section->setCurrentIndex(b.section->findData(static_cast<int>(SectionPlane::kMesiodistal)));
  for (int i = 0; i < comparison->n_views(); ++i) {
    EXPECT_EQ(comparison->view(i)->quantity(), Quantity::kVonMises);
    EXPECT_EQ(comparison->view(i)->scene()->section(), SectionPlane::kMesiodistal);
  }
  EXPECT_EQ(g_window->result_view()->quantity(), Quantity::kPressure);
  a.section->setCurrentIndex(a.section->findData(static_cast<int>(SectionPlane::kLabiolingual)));
  EXPECT_EQ(g_window->result_view()->scene()->section(), SectionPlane::kLabiolingual);
  EXPECT_EQ(comparison->view(0)->scene()->section(), SectionPlane::kMesiodistal);
  // Back as the other tests expect it.
  b.quantity->setCurrentIndex(b.quantity->findData(static_cast<int>(Quantity::kPressure)));
  b.section->setCurrentIndex(b.section->findData(static_cast<int>(SectionPlane::kNone)));
  a.section->setCurrentIndex(a.section->findData(static_cast<int>(SectionPlane::kNone)));
  g_window->show_view(ViewKind::k3D);
  QApplication::processEvents();
}

// Issue 12, point 7: in the comparison, a scale per level (the healthy level keeps its own range)
// or one anchored to the limit.
TEST_F(MainWindowTest, TheComparisonOffersPerLevelAndLimitAnchoredScales) {
  g_window->show_view(ViewKind::kComparison);
  QApplication::processEvents();
  ComparisonView* comparison = g_window->comparison();
  ASSERT_GE(comparison->n_views(), 2);
  const auto& results = g_window->session().results();
  comparison->set_scale_mode(ScaleMode::kPerLevel);
  QApplication::processEvents();
  for (int i = 0; i < comparison->n_views(); ++i) {
    SCOPED_TRACE(i);
    EXPECT_TRUE(comparison->view(i)->colour_bar()->isVisible());
    const std::string name = results[static_cast<size_t>(i)].name;
    EXPECT_DOUBLE_EQ(comparison->view(i)->colour_bar()->range().max,
                     results[static_cast<size_t>(i)].pressure_max_compression_kpa)
        << name;
  }
  EXPECT_FALSE(comparison->shared_bar()->isVisible());
  comparison->set_scale_mode(ScaleMode::kThresholds);
  QApplication::processEvents();
  const double limit = g_window->session().spec().thresholds.limit.value_kpa;
  EXPECT_TRUE(comparison->shared_bar()->isVisible());
  EXPECT_DOUBLE_EQ(comparison->shared_bar()->range().max, limit);
  for (int i = 0; i < comparison->n_views(); ++i)
    EXPECT_DOUBLE_EQ(comparison->view(i)->colour_bar()->range().max, limit);
  comparison->set_scale_mode(ScaleMode::kShown);
  g_window->show_view(ViewKind::k3D);
  QApplication::processEvents();
}

TEST_F(MainWindowTest, ABurstOfSliderValuesIsEvaluatedOnceAtTheNewestValue) {
  CaseSession& session = g_window->session();
  const LoadControls start = session.load_controls();
  int evaluations = 0;
  const auto counter =
      QObject::connect(&session, &CaseSession::results_changed, [&]() { ++evaluations; });
  LoadControls c = start;
  for (int i = 1; i <= 10; ++i) {
    c.magnitude = start.magnitude + i;
    g_window->set_load(c, true);  // as the load panel sends them while the slider moves
  }
  EXPECT_EQ(evaluations, 0);  // nothing applied while the burst is being delivered
  EXPECT_FALSE(g_window->result_view()->scene()->interacting());
  QCoreApplication::sendPostedEvents(g_window, QEvent::MetaCall);
  EXPECT_EQ(evaluations, 1);
  EXPECT_EQ(session.load_controls().magnitude, start.magnitude + 10);
  EXPECT_TRUE(g_window->result_view()->scene()->interacting());  // drawn the quick way meanwhile
  g_window->set_load(start, false);  // the slider is released: applied at once, full detail
  EXPECT_EQ(evaluations, 2);
  EXPECT_FALSE(g_window->result_view()->scene()->interacting());
  EXPECT_EQ(session.load_controls().magnitude, start.magnitude);
  QObject::disconnect(counter);
  QApplication::processEvents();
}

// Issue 12, point 11: saves and exports start in the documents folder, never the samples'.
TEST_F(MainWindowTest, SavesAndExportsStartInTheDocumentsFolder) {
  const QString documents = QStandardPaths::writableLocation(QStandardPaths::DocumentsLocation);
  const QString samples = QFileInfo(testing::incisor_sample_path()).absolutePath();
  for (const QString& name :
       {QStringLiteral("case.json"), QStringLiteral("x_report.pdf"), QString()}) {
    const QString path = g_window->suggested_path(name);
    EXPECT_FALSE(path.startsWith(samples)) << path.toStdString();
    EXPECT_TRUE(path.startsWith(documents.isEmpty() ? QDir::homePath() : documents))
        << path.toStdString();
  }
  // The case file's name is kept, in the documents folder.
  EXPECT_EQ(g_window->file_stem(), QFileInfo(testing::incisor_sample_path()).completeBaseName());
}

// Issue 12, point 11: `sharpey --help` works without a display (it used to abort with 134), and
// without one the app says what to do instead of aborting.
TEST(Command, HelpWorksWithoutADisplay) {
  const QString program = QStringLiteral(SHARPEY_BINARY_DIR "/app/gui/sharpey");
  ASSERT_TRUE(QFileInfo::exists(program)) << program.toStdString();
  QProcessEnvironment env = QProcessEnvironment::systemEnvironment();
  for (const char* name : {"DISPLAY", "WAYLAND_DISPLAY", "QT_QPA_PLATFORM"})
    env.remove(QString::fromLatin1(name));
  auto run_without_display = [&](const QStringList& args, QString* out, QString* err) {
    QProcess p;
    p.setProcessEnvironment(env);
    p.start(program, args);
    EXPECT_TRUE(p.waitForFinished(60000));
    *out = QString::fromUtf8(p.readAllStandardOutput());
    *err = QString::fromUtf8(p.readAllStandardError());
    return p.exitStatus() == QProcess::NormalExit ? p.exitCode() : -1;
  };
  QString out, err;
  EXPECT_EQ(run_without_display({QStringLiteral("--help")}, &out, &err), 0) << err.toStdString();
  EXPECT_TRUE(out.contains(QStringLiteral("--mesh"))) << out.toStdString();
  EXPECT_TRUE(out.contains(QStringLiteral("--screenshots")));
  EXPECT_EQ(run_without_display({}, &out, &err), 3);
  EXPECT_TRUE(err.contains(QStringLiteral("sharpey-batch"))) << err.toStdString();
}

TEST_F(MainWindowTest, PdfReportHasItsPagesTheCautionAndTheSources) {
  const QString pdf = g_dir->filePath("report.pdf");
  ASSERT_TRUE(g_window->export_report(pdf)) << g_window->last_error().toStdString();
  ASSERT_TRUE(QFile::exists(pdf));
  const QString info = run(QStringLiteral("pdfinfo"), {pdf});
  ASSERT_FALSE(info.isEmpty()) << "pdfinfo (poppler-utils) is needed for this test";
  // Three pages, then the force allowances of the four levels, two to a page.
  EXPECT_TRUE(info.contains(QRegularExpression(QStringLiteral("Pages:\\s+5\\b"))))
      << info.toStdString();
  // pdftotext breaks lines: compare with all white space collapsed.
  const QString text = run(QStringLiteral("pdftotext"), {pdf, QStringLiteral("-")}).simplified();
  const auto squeeze = [](QString s) {
    return s.replace(QString::fromUtf8("\ufb01"), QStringLiteral("fi")).simplified();
  };
  const QString plain = squeeze(text);
  EXPECT_TRUE(plain.contains(squeeze(QString::fromStdString(analysis::caution_text()))))
      << plain.left(400).toStdString();
  const auto& t = g_window->session().spec().thresholds;
  EXPECT_TRUE(plain.contains(squeeze(QString::fromStdString(t.capillary.source))));
  EXPECT_TRUE(plain.contains(squeeze(QString::fromStdString(t.limit.source))));
  EXPECT_TRUE(plain.contains(QStringLiteral("6 mm loss")));  // the comparison page
}

TEST_F(MainWindowTest, ImagesAndDataExports) {
  for (ViewKind v : {ViewKind::k3D, ViewKind::kRootMap, ViewKind::kComparison}) {
    const QString png = g_dir->filePath(QStringLiteral("view_%1.png").arg(static_cast<int>(v)));
    ASSERT_TRUE(g_window->export_image(png, v));
    QImage image(png);
    EXPECT_GT(image.width(), 200);
    EXPECT_GT(testing::count_colours(image), 50) << "view " << static_cast<int>(v);
  }
  const QString folder = g_dir->filePath("data");
  ASSERT_TRUE(g_window->export_data(folder)) << g_window->last_error().toStdString();
  const QDir dir(folder);
  EXPECT_TRUE(dir.exists("results.json"));
  EXPECT_TRUE(dir.exists("summary.csv"));
  EXPECT_EQ(dir.entryList({"*.vtu"}).size(), 8);
  EXPECT_EQ(dir.entryList({"*_root_map.csv"}).size(), 4);
  QFile csv(dir.filePath("summary.csv"));
  ASSERT_TRUE(csv.open(QIODevice::ReadOnly));
  EXPECT_TRUE(csv.readLine().startsWith("#"));  // the caution line first
}

// Issue 12, point 9: an exported PNG carries a caption (drawn under the view and stored as its
// Description text): case label, bone level, force system, quantity and the caution.
TEST_F(MainWindowTest, ExportedImagesCarryACaption) {
  const QString png = g_dir->filePath(QStringLiteral("captioned.png"));
  ASSERT_TRUE(g_window->export_image(png, ViewKind::k3D));
  const QImage image(png);
  const QImage bare = g_window->view_image(ViewKind::k3D);
  EXPECT_EQ(image.width(), bare.width());
  EXPECT_GT(image.height(), bare.height() + 40) << "room for the caption";
  const QString caption = image.text(QStringLiteral("Description"));
  const CaseSession& session = g_window->session();
  EXPECT_TRUE(caption.contains(QString::fromStdString(session.spec().label)))
      << caption.toStdString();
  EXPECT_TRUE(caption.contains(QStringLiteral("bone level: ") +
                               QString::fromStdString(session.current_result()->name)));
  EXPECT_TRUE(caption.contains(describe(session.load_controls())));
  EXPECT_TRUE(caption.contains(QStringLiteral("hydrostatic pressure (kPa)")));
  EXPECT_TRUE(caption.contains(QString::fromStdString(analysis::caution_text())));
  testing::keep_image(image, "test_captioned_png");
  // The caption strip is drawn: dark text pixels below the view.
  const QImage strip = image.copy(0, bare.height(), image.width(), image.height() - bare.height());
  EXPECT_GT(count_pixels(strip, [](const QColor& c) { return c.lightness() < 90; }), 200);
}

TEST_F(MainWindowTest, UnsavedChangesArePromptedAndAutosaved) {
  const int prompts = g_window->prompts_shown();
  LoadControls c = g_window->session().load_controls();
  c.magnitude += 10;
  g_window->session().set_load(c);
  EXPECT_TRUE(g_window->session().document().modified());
  g_window->autosave_now();
  EXPECT_TRUE(g_window->autosave().has_copy());
  g_window->set_prompt_answer(QMessageBox::Cancel);
  EXPECT_FALSE(g_window->maybe_save());
  EXPECT_EQ(g_window->prompts_shown(), prompts + 1);
  const QString saved = g_dir->filePath("saved.json");
  ASSERT_TRUE(g_window->save_as(saved));
  EXPECT_FALSE(g_window->autosave().has_copy());  // saved: nothing left to recover
  EXPECT_TRUE(g_window->maybe_save());            // no prompt without changes
  EXPECT_EQ(g_window->prompts_shown(), prompts + 1);
  EXPECT_TRUE(g_window->windowTitle().startsWith("saved.json"));
}

TEST_F(MainWindowTest, ABadCaseFileShowsTheLibraryMessage) {
  const QString bad = g_dir->filePath("bad.json");
  QFile f(bad);
  ASSERT_TRUE(f.open(QIODevice::WriteOnly));
  f.write(
      "{ \"schema_version\": 1, \"tooth\": { \"type\": \"maxillary_central_incisor\" }, "
      "\"scenarios\": [ { \"name\": \"healthy\", \"horizontal_loss_mm\": 0 } ], "
      "\"load\": { \"magnitude\": \"heavy\" } }");
  f.close();
  EXPECT_FALSE(g_window->open_case(bad));
  EXPECT_TRUE(g_window->last_error().contains("load.magnitude"))
      << g_window->last_error().toStdString();
  EXPECT_EQ(g_window->session().results().size(), 4u);  // the open case stays
}

// Waits for the window's next solve to end; true when it finished.
bool wait_for_solve() {
  bool done = false, failed = false;
  const auto a = QObject::connect(g_window, &MainWindow::solve_finished, [&]() { done = true; });
  const auto b = QObject::connect(g_window, &MainWindow::solve_failed, [&]() { failed = true; });
  const bool ended = QTest::qWaitFor([&]() { return done || failed; }, 600000);
  QObject::disconnect(a);
  QObject::disconnect(b);
  return ended && done;
}

// Issue 12, points 4 and 5, at the widget level: a bone loss typed into the case panel's table is
// checked on entry with the case-file rules; a refused one changes nothing, an accepted one
// renames a generated level name.
TEST_F(MainWindowTest, TheCasePanelChecksABoneLossOnEntry) {
  CaseSession& session = g_window->session();
  g_window->show_case_panel(true);
  QApplication::processEvents();
  QTableWidget* table = g_window->case_panel()->levels_table();
  ASSERT_EQ(table->rowCount(), 4);
  ASSERT_EQ(session.levels().at(3).name, "6 mm loss");
  const bool stale_before = session.geometry_stale();
  // 15 mm: more than the incisor's root (about 13 mm, source: the tooth library's handbook
  // dimensions) can lose; refused at once, not a minute later by the mesher.
  table->item(3, 2)->setText(QStringLiteral("15"));
  QApplication::processEvents();
  EXPECT_TRUE(g_window->last_error().contains(QStringLiteral("scenarios[3]")))
      << g_window->last_error().toStdString();
  EXPECT_DOUBLE_EQ(session.levels().at(3).loss.horizontal_mm, 6.0);
  EXPECT_EQ(table->item(3, 2)->text().toDouble(), 6.0);
  EXPECT_EQ(session.geometry_stale(), stale_before);
  EXPECT_EQ(session.results().size(), 4u);  // nothing solved is thrown away
  // 5 mm: accepted; the generated name follows the value.
  table->item(3, 2)->setText(QStringLiteral("5"));
  QApplication::processEvents();
  EXPECT_DOUBLE_EQ(session.levels().at(3).loss.horizontal_mm, 5.0);
  EXPECT_EQ(session.levels().at(3).name, "5 mm loss");
  EXPECT_EQ(table->item(3, 1)->text(), QStringLiteral("5 mm loss"));
  EXPECT_TRUE(session.geometry_stale());
  // Back as it was.
  table->item(3, 2)->setText(QStringLiteral("6"));
  QApplication::processEvents();
  EXPECT_EQ(session.levels().at(3).name, "6 mm loss");
  g_window->show_case_panel(false);
}

// These two solve again: defined last, so the tests above see the sample as first solved.
TEST_F(MainWindowTest, ReopeningWhileSolvingDropsTheOldSolveAndSolvesTheNewCase) {
  CaseSession& session = g_window->session();
  g_window->solve();
  ASSERT_TRUE(g_window->solving());
  // The first level of this solve arrives; then the same file is opened again.
  const analysis::Study* before = session.study();
  ASSERT_TRUE(
      QTest::qWaitFor([&]() { return session.study() != before || !g_window->solving(); }, 600000));
  ASSERT_TRUE(g_window->solving()) << "the solve ended before the test could reopen";
  const analysis::Study* dropped = session.study();
  bool old_levels_after_reopen = false;
  const auto watch = QObject::connect(&session, &CaseSession::results_changed, [&]() {
    if (session.study() == dropped) old_levels_after_reopen = true;
  });
  ASSERT_TRUE(g_window->open_case(testing::incisor_sample_path()));
  EXPECT_TRUE(session.results().empty());  // the new case shows nothing until its first level
  ASSERT_TRUE(wait_for_solve()) << g_window->last_error().toStdString();
  QObject::disconnect(watch);
  EXPECT_FALSE(old_levels_after_reopen);
  EXPECT_NE(session.study(), dropped);
  EXPECT_EQ(session.results().size(), 4u);
  EXPECT_FALSE(session.geometry_stale());
}

TEST_F(MainWindowTest, AGeometryEditDuringTheSolveLeavesTheResultsStale) {
  CaseSession& session = g_window->session();
  g_window->solve();
  ASSERT_TRUE(g_window->solving());
  session.set_pdl_width(0.25);  // while the levels are being solved
  ASSERT_TRUE(wait_for_solve()) << g_window->last_error().toStdString();
  EXPECT_EQ(session.results().size(), 4u);
  EXPECT_TRUE(session.geometry_stale()) << "results of the old width shown as current";
}

// Issue 12, point 11: File > New leaves nothing of the old case on screen, the colour bars too.
// Last: it replaces the sample.
TEST_F(MainWindowTest, NewCaseClearsTheColourBars) {
  g_window->show_view(ViewKind::kComparison);
  QApplication::processEvents();
  EXPECT_TRUE(g_window->result_view()->colour_bar()->has_scale());
  EXPECT_TRUE(g_window->comparison()->shared_bar()->has_scale());
  g_window->new_case();
  QApplication::processEvents();
  EXPECT_FALSE(g_window->result_view()->colour_bar()->has_scale());
  EXPECT_FALSE(g_window->comparison()->shared_bar()->has_scale());
  EXPECT_TRUE(g_window->result_view()->colour_bar()->note().isEmpty());
  EXPECT_FALSE(g_window->root_map()->has_map());
  g_window->show_view(ViewKind::k3D);
}

}  // namespace
}  // namespace sharpey::app
