// sharpey: the desktop application.
// Usage: sharpey [CASE.json] [--mesh coarse|standard|fine] [--screenshots DIR]; sharpey --help
// needs no display.
#include <QApplication>
#include <QCommandLineParser>
#include <QCoreApplication>
#include <QDir>
#include <QEventLoop>
#include <QMouseEvent>
#include <QTabWidget>
#include <QTimer>
#include <cstdio>

#include "core/allowance_job.h"
#include "core/case_session.h"
#include "sharpey/error.h"
#include "sharpey/startup/blas_kernels.h"
#include "sharpey/startup/freed_memory.h"
#include "view/allowance_view.h"
#include "view/main_window.h"
#include "view/molar_window.h"
#include "view/result_view.h"
#include "view/root_map_view.h"
#include "view/vtk_view.h"

namespace {

void wait_ms(int ms) {
  QEventLoop loop;
  QTimer::singleShot(ms, &loop, &QEventLoop::quit);
  loop.exec();
}

// Moves the mouse (no button held) to a point of `widget` given as fractions of its size, so the
// hover read-out shows in the status bar.
void hover(QWidget* widget, double fx, double fy) {
  const QPointF p(fx * widget->width(), fy * widget->height());
  QMouseEvent move(QEvent::MouseMove, p, widget->mapToGlobal(p), Qt::NoButton, Qt::NoButton,
                   Qt::NoModifier);
  QApplication::sendEvent(widget, &move);
  wait_ms(150);
}

// --screenshots: once solved, writes one PNG per view (the window with a hover read-out, and the
// view's own export), the window with the case panel open, the force-allowance view and the PDF
// report, then quits.
void take_screenshots(sharpey::app::MainWindow& window, const QString& folder) {
  using sharpey::app::ViewKind;
  QDir().mkpath(folder);
  const QDir dir(folder);
  // window_<name>.png: the window; <view>.png: the view's own PNG export.
  auto shot = [&](ViewKind view, const QString& name, const QString& image, QWidget* hover_over) {
    window.show_view(view);
    QApplication::processEvents();
    if (hover_over) hover(hover_over, 0.5, 0.72);
    window.grab().toImage().save(
        dir.filePath(QStringLiteral("window_") + name + QStringLiteral(".png")));
    window.export_image(dir.filePath(image + QStringLiteral(".png")), view);
  };
  shot(ViewKind::k3D, QStringLiteral("3d"), QStringLiteral("view_3d"),
       window.result_view()->vtk_view());
  shot(ViewKind::kRootMap, QStringLiteral("root_map"), QStringLiteral("root_map"),
       window.root_map());
  shot(ViewKind::kComparison, QStringLiteral("bone_levels"), QStringLiteral("bone_levels"),
       nullptr);
  window.show_view(ViewKind::k3D);
  window.show_case_panel(true);
  QApplication::processEvents();
  wait_ms(100);
  window.grab().toImage().save(dir.filePath(QStringLiteral("window_case_panel.png")));
  window.show_case_panel(false);
  // The force allowances (every level's nominal allowances; the band too when the case asks for
  // it with allowance.band), then the report, which carries them.
  sharpey::app::AllowanceView* allowance = window.allowance_view();
  const size_t n_levels = window.session().results().size();
  for (int waited = 0; allowance->levels().size() < n_levels && waited < 30000; waited += 50)
    wait_ms(50);
  if (window.session().spec().band.enabled && allowance->compute_band()) {
    while (allowance->job().band_running()) wait_ms(200);
  }
  window.tabs()->setCurrentWidget(allowance);
  QApplication::processEvents();
  wait_ms(100);
  window.grab().toImage().save(dir.filePath(QStringLiteral("window_allowance.png")));
  window.show_view(ViewKind::k3D);
  window.export_report(dir.filePath(QStringLiteral("report.pdf")));
}

// A multi-rooted case: its window (the scenario with the most bone lost) and its PDF report.
// False when the case could not be evaluated (its message is printed).
bool take_molar_screenshots(sharpey::app::MolarWindow& molar, const QString& folder) {
  QDir dir(folder);
  dir.mkpath(QStringLiteral("."));
  QString failure;
  const auto on_failed = QObject::connect(&molar, &sharpey::app::MolarWindow::failed,
                                          [&failure](const QString& m) { failure = m; });
  while (molar.busy()) wait_ms(100);  // a finite-element case still meshing and solving
  QObject::disconnect(on_failed);
  if (!molar.has_case()) {
    std::fprintf(stderr, "sharpey: %s\n", failure.toLocal8Bit().constData());
    return false;
  }
  molar.show_scenario(static_cast<int>(molar.result().scenarios.size()) - 1);
  QApplication::processEvents();
  wait_ms(300);
  molar.grab().toImage().save(dir.filePath(QStringLiteral("window_molar.png")));
  QString error;
  if (!molar.export_report(dir.filePath(QStringLiteral("report_molar.pdf")), &error)) {
    std::fprintf(stderr, "sharpey: %s\n", error.toLocal8Bit().constData());
    return false;
  }
  return true;
}

// The command line, the same for the display-free first pass and the application.
struct CommandLine {
  QCommandLineOption mesh{
      {QStringLiteral("m"), QStringLiteral("mesh")},
      QStringLiteral("Override the case's mesh preset: coarse, standard or fine."),
      QStringLiteral("preset")};
  QCommandLineOption screenshots{
      QStringLiteral("screenshots"),
      QStringLiteral("Solve, write a PNG of every view and the PDF report to DIR, "
                     "then quit."),
      QStringLiteral("DIR")};
  void configure(QCommandLineParser& parser) const {
    parser.setApplicationDescription(QStringLiteral(
        "Sharpey: periodontal-ligament stress and strain under an orthodontic force system.\n"
        "Model estimates, not prescriptions; clinical judgement and local regulations prevail.\n"
        "Without a display, use sharpey-batch for the same results as files."));
    parser.addHelpOption();
    parser.addPositionalArgument(QStringLiteral("case"),
                                 QStringLiteral("Case file (JSON) to open and solve."));
    parser.addOption(mesh);
    parser.addOption(screenshots);
  }
};

// True when Qt can open a window: a display, or a platform plugin chosen by the user.
bool display_available() {
  return !qEnvironmentVariableIsEmpty("DISPLAY") ||
         !qEnvironmentVariableIsEmpty("WAYLAND_DISPLAY") ||
         !qEnvironmentVariableIsEmpty("QT_QPA_PLATFORM");
}

}  // namespace

int main(int argc, char** argv) {
  sharpey::startup::use_fast_blas_kernels(argv);
  sharpey::startup::keep_freed_memory_for_reuse();  // after the possible re-execution
  const CommandLine line;
  {
    // --help and argument errors first, with no display needed (QApplication aborts without one).
    QCoreApplication probe(argc, argv);
    QCoreApplication::setApplicationName(QStringLiteral("sharpey"));
    QCommandLineParser parser;
    line.configure(parser);
    parser.process(probe);  // prints the help (exit 0) or the error (exit 1)
    if (!display_available()) {
      std::fprintf(stderr,
                   "sharpey: no display found (DISPLAY and WAYLAND_DISPLAY are empty). Start it "
                   "from a desktop "
                   "session, or use sharpey-batch to write the results as files.\n");
      return 3;
    }
  }
  sharpey::app::VtkView::set_default_surface_format();
  QApplication app(argc, argv);
  QApplication::setApplicationName(QStringLiteral("sharpey"));
  QApplication::setOrganizationName(QStringLiteral("Sharpey"));
  QApplication::setApplicationDisplayName(QStringLiteral("Sharpey"));

  QCommandLineParser parser;
  line.configure(parser);
  parser.process(app);
  const QCommandLineOption& mesh = line.mesh;
  const QCommandLineOption& screenshots = line.screenshots;

  sharpey::app::MainWindowOptions options;
  if (parser.isSet(mesh)) {
    try {
      options.mesh_override =
          sharpey::mesh::mesh_preset_from_string(parser.value(mesh).toStdString());
    } catch (const sharpey::Error& e) {
      std::fprintf(stderr, "sharpey: %s\n", e.what());
      return 2;
    }
  }
  const bool shoot = parser.isSet(screenshots);
  if (shoot) options.dialogs = false;
  sharpey::app::MainWindow window(options);
  window.show();
  if (!shoot) window.check_recovery();
  const QStringList args = parser.positionalArguments();
  if (!args.isEmpty()) {
    if (!window.open_case(args.first()) && shoot) {
      std::fprintf(stderr, "sharpey: %s\n", window.last_error().toLocal8Bit().constData());
      return 2;
    }
  }
  if (shoot && window.molar_window() && window.molar_window()->isVisible()) {
    const QString folder = parser.value(screenshots);
    QTimer::singleShot(300, &window, [&window, folder]() {
      QApplication::exit(take_molar_screenshots(*window.molar_window(), folder) ? 0 : 4);
    });
  } else if (shoot) {
    const QString folder = parser.value(screenshots);
    QObject::connect(&window, &sharpey::app::MainWindow::solve_finished, &window,
                     [&window, folder]() {
                       QTimer::singleShot(300, &window, [&window, folder]() {
                         take_screenshots(window, folder);
                         QApplication::exit(0);
                       });
                     });
    QObject::connect(&window, &sharpey::app::MainWindow::solve_failed, &window,
                     [&window](const QString& m) {
                       std::fprintf(stderr, "sharpey: %s\n", m.toLocal8Bit().constData());
                       QApplication::exit(4);
                     });
    if (args.isEmpty()) {
      std::fprintf(stderr, "sharpey: --screenshots needs a case file\n");
      return 2;
    }
  }
  return app.exec();
}
