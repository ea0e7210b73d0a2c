// The surface import dialog (view/import_dialog.h) on the invented sample scan: a bad file shows
// the library's message in the dialog and builds nothing; the sample surface is drawn with its
// axis and landmarks; confirming builds a case naming the surface, and the window solves that
// case like any other (coarse mesh for speed).
#include <gtest/gtest.h>

#include <QApplication>
#include <QCheckBox>
#include <QComboBox>
#include <QFile>
#include <QFileInfo>
#include <QPushButton>
#include <QStandardPaths>
#include <QTemporaryDir>
#include <QTest>

#include "core/case_session.h"
#include "support/image_checks.h"
#include "support/solved_sample.h"
#include "view/import_dialog.h"
#include "view/main_window.h"
#include "view/vtk_view.h"

namespace sharpey::app {
namespace {

const QString kScan =
    QStringLiteral(SHARPEY_SOURCE_DIR "/samples/invented_scan_maxillary_canine.stl");

// An open surface: the sample with its last 40 triangles left out (derived: every removed
// triangle leaves boundary edges, which the library reports as "not closed").
QString write_open_surface(const QTemporaryDir& dir) {
  mesh::SurfaceMesh s = mesh::read_tooth_surface(kScan.toStdString());
  s.triangles.resize(s.triangles.size() - 40);
  const QString path = dir.filePath(QStringLiteral("open.stl"));
  mesh::write_stl(s, path.toStdString(), true);
  return path;
}

TEST(ImportDialog, ABadFileShowsTheMessageAndBuildsNothing) {
  QTemporaryDir dir;
  ImportDialog dialog(dir.path());
  dialog.show();
  ASSERT_TRUE(QTest::qWaitForWindowExposed(&dialog));
  const QString garbage = dir.filePath(QStringLiteral("garbage.stl"));
  QFile f(garbage);
  ASSERT_TRUE(f.open(QIODevice::WriteOnly));
  f.write(QByteArray(300, 'x'));
  f.close();
  const QString open = write_open_surface(dir);
  for (const QString& path : {garbage, open, dir.filePath(QStringLiteral("missing.ply"))}) {
    SCOPED_TRACE(path.toStdString());
    EXPECT_FALSE(dialog.open_surface(path));
    EXPECT_FALSE(dialog.message().isEmpty());
    EXPECT_EQ(dialog.message(), dialog.import_state().error());
    EXPECT_TRUE(dialog.message().contains(QStringLiteral("tooth surface")))
        << dialog.message().toStdString();
    EXPECT_FALSE(dialog.create_button()->isEnabled());
    EXPECT_FALSE(dialog.create_case());
    EXPECT_FALSE(dialog.built_case());
    EXPECT_TRUE(dialog.isVisible());  // still open: the user chooses another file
  }
  dialog.open_surface(open);
  EXPECT_TRUE(dialog.message().contains(QStringLiteral("not closed"), Qt::CaseInsensitive))
      << dialog.message().toStdString();
}

TEST(ImportDialog, TheSampleScanBecomesACaseThatSolves) {
  QStandardPaths::setTestModeEnabled(true);
  QTemporaryDir dir;
  ImportDialog dialog(dir.path());
  dialog.resize(1000, 640);
  dialog.show();
  ASSERT_TRUE(QTest::qWaitForWindowExposed(&dialog));
  ASSERT_TRUE(dialog.open_surface(kScan)) << dialog.message().toStdString();
  EXPECT_EQ(dialog.import_state().axis_source(), AxisSource::kPrincipalAxes);
  QApplication::processEvents();
  // The surface (ivory, see-through) and the amber axis and end marks are drawn.
  const QImage frame = dialog.view()->grabFramebuffer();
  ASSERT_FALSE(frame.isNull());
  const int amber = testing::count_pixels(frame, [](const QColor& c) {
    return c.red() > 200 && c.green() > 130 && c.green() < 200 && c.blue() < 110;
  });
  EXPECT_GT(amber, 50) << "axis and landmark pixels";

  EXPECT_FALSE(dialog.create_button()->isEnabled());  // not confirmed yet
  dialog.tooth_box()->setCurrentIndex(
      dialog.tooth_box()->findData(static_cast<int>(mesh::ToothType::kMaxillaryCanine)));
  dialog.confirm_box()->setChecked(true);
  EXPECT_TRUE(dialog.create_button()->isEnabled());
  QApplication::processEvents();
  testing::keep_image(dialog.grab().toImage(), "test_import_dialog");  // docs/screenshots
  // Turning the axis round takes the confirmation back.
  dialog.swap_mesial_box()->setChecked(true);
  EXPECT_FALSE(dialog.confirm_box()->isChecked());
  EXPECT_FALSE(dialog.create_button()->isEnabled());
  dialog.swap_mesial_box()->setChecked(false);
  dialog.confirm_box()->setChecked(true);
  ASSERT_TRUE(dialog.create_case()) << dialog.message().toStdString();
  EXPECT_EQ(dialog.result(), QDialog::Accepted);
  ASSERT_TRUE(dialog.built_case());
  analysis::CaseSpec spec = *dialog.built_case();
  ASSERT_TRUE(spec.model.tooth.scan);
  EXPECT_EQ(spec.model.tooth.type, mesh::ToothType::kMaxillaryCanine);
  EXPECT_TRUE(QFileInfo(QString::fromStdString(spec.surface.file)).isAbsolute());
  EXPECT_TRUE(spec.surface.landmarks.has_value());

  // The window takes the case (untitled, modified) and solves it like any other.
  MainWindowOptions options;
  options.dialogs = false;
  options.autosave_folder = dir.filePath(QStringLiteral("autosave"));
  MainWindow window(options);
  window.resize(1400, 900);
  window.show();
  ASSERT_TRUE(QTest::qWaitForWindowExposed(&window));
  bool done = false, failed = false;
  QObject::connect(&window, &MainWindow::solve_finished, [&]() { done = true; });
  QObject::connect(&window, &MainWindow::solve_failed, [&]() { failed = true; });
  spec.model.sizing.preset = mesh::MeshPreset::kCoarse;  // speed only
  window.take_imported_case(spec);
  EXPECT_TRUE(window.session().document().untitled());
  EXPECT_TRUE(window.session().document().modified());
  ASSERT_TRUE(QTest::qWaitFor([&]() { return done || failed; }, 600000)) << "solve timed out";
  ASSERT_TRUE(done) << window.last_error().toStdString();
  ASSERT_EQ(window.session().results().size(), 2u);
  EXPECT_TRUE(window.session().spec().model.tooth.scan);
  EXPECT_GT(window.session().results()[0].pressure_max_compression_kpa, 0);
}

}  // namespace
}  // namespace sharpey::app
