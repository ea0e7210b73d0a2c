// bench_app: desktop-app timings on the incisor sample with the standard mesh (prints, not a
// test). Measures, in the main window as the user has it, the time from a load change to the
// repainted 3D view and its parts (evaluation by superposition, colours, iso-lines, glyphs, the
// other panels, VTK render), the render time of single frames with the bone see-through, solid
// and hidden, and the frame rate while rotating (drawn in full and as while the mouse turns it).
// Target: a load change under 50 ms end to end.
// With --first-view: opens the case as the user does (every bone level) and prints the time to
// the first painted 3D view (the first level solved), to each further level and to the end, and
// the longest the event loop went without running a 10 ms timer meanwhile (the window's
// responsiveness while the worker solves), then the same for a second open of the case in a new
// window, which reads the levels back from the saved solutions (a fresh cache folder).
// Usage (needs a display, e.g. xvfb-run -a): bench_app [CASE.json] [--mesh coarse|standard|fine]
//        [--first-view]
#include <vtkActor.h>
#include <vtkActorCollection.h>
#include <vtkCamera.h>
#include <vtkProperty.h>
#include <vtkRenderer.h>

#include <QApplication>
#include <QElapsedTimer>
#include <QTemporaryDir>
#include <QTest>
#include <QTimer>
#include <algorithm>
#include <cstdio>
#include <ctime>
#include <optional>
#include <vector>

#include "core/case_session.h"
#include "core/solve_job.h"
#include "sharpey/analysis/field_choice.h"
#include "sharpey/startup/blas_kernels.h"
#include "view/main_window.h"
#include "view/model_scene.h"
#include "view/result_view.h"
#include "view/vtk_view.h"

using namespace sharpey;

namespace {

double ms_since(const QElapsedTimer& t) { return static_cast<double>(t.nsecsElapsed()) * 1e-6; }

// CPU time of the whole process (every thread, llvmpipe's render threads included), ms: less
// affected than wall time by other programs on a shared machine.
double thread_cpu_ms() {
  timespec ts{};
  clock_gettime(CLOCK_THREAD_CPUTIME_ID, &ts);
  return static_cast<double>(ts.tv_sec) * 1e3 + static_cast<double>(ts.tv_nsec) * 1e-6;
}

double process_cpu_ms() {
  timespec ts{};
  clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &ts);
  return static_cast<double>(ts.tv_sec) * 1e3 + static_cast<double>(ts.tv_nsec) * 1e-6;
}

struct Stats {
  double sum = 0, worst = 0;
  int n = 0;
  void add(double v) {
    sum += v;
    worst = std::max(worst, v);
    ++n;
  }
  double mean() const { return n ? sum / n : 0; }
};

// Frames per second over `frames` azimuth steps, each painted synchronously.
double rotate(app::VtkView* vtk, int frames) {
  QElapsedTimer t;
  t.start();
  for (int i = 0; i < frames; ++i) {
    vtk->camera()->Azimuth(3.0);
    vtk->repaint();
  }
  return frames / (static_cast<double>(t.nsecsElapsed()) * 1e-9);
}

// Opens `path` in a fresh window on the saved solutions in `cache_folder` and times the
// progressive solve (or read-back) of every bone level. `detail`: also time building and
// switching the 3D scene.
int time_first_view(const QString& path, std::optional<mesh::MeshPreset> preset,
                    const QString& cache_folder, bool detail) {
  app::MainWindowOptions options;
  options.dialogs = false;
  options.autosave_interval_ms = 3600000;
  options.mesh_override = preset;
  options.solution_cache_folder = cache_folder;
  app::MainWindow window(options);
  window.resize(1600, 1000);
  window.show();
  if (!QTest::qWaitForWindowExposed(&window)) return 1;
  app::CaseSession& session = window.session();
  QElapsedTimer clock;
  std::vector<double> level_s;        // when each new level was on screen
  std::vector<double> level_eval_ms;  // the evaluation by superposition that went with it
  double first_paint_s = -1;
  size_t levels_seen = 0;
  bool done = false, failed = false;
  QObject::connect(&session, &app::CaseSession::results_changed, [&](bool interactive) {
    if (interactive || session.results().size() <= levels_seen) return;
    levels_seen = session.results().size();
    if (first_paint_s < 0) {
      window.result_view()->vtk_view()->repaint();  // the first frame on screen
      first_paint_s = static_cast<double>(clock.nsecsElapsed()) * 1e-9;
    }
    level_s.push_back(static_cast<double>(clock.nsecsElapsed()) * 1e-9);
    level_eval_ms.push_back(session.last_evaluation_ms());
  });
  QObject::connect(&window, &app::MainWindow::solve_finished, [&]() { done = true; });
  QObject::connect(&window, &app::MainWindow::solve_failed, [&](const QString& m) {
    std::fprintf(stderr, "solve failed: %s\n", m.toLocal8Bit().constData());
    failed = true;
  });
  // Responsiveness: the longest gap between two ticks of a 10 ms timer while solving.
  QTimer tick;
  QElapsedTimer since_tick;
  double worst_gap_ms = 0;
  std::vector<std::pair<double, double>> stalls;  // (when, s; how long, ms) for gaps over 200 ms
  QObject::connect(&tick, &QTimer::timeout, [&]() {
    const double gap = ms_since(since_tick);
    worst_gap_ms = std::max(worst_gap_ms, gap);
    if (gap > 200) stalls.emplace_back(static_cast<double>(clock.nsecsElapsed()) * 1e-9, gap);
    since_tick.restart();
  });
  clock.start();
  since_tick.start();
  tick.start(10);
  if (!window.open_case(path)) return 1;
  if (!QTest::qWaitFor([&]() { return done || failed; }, 3600000) || failed) return 1;
  const double total_s = static_cast<double>(clock.nsecsElapsed()) * 1e-9;
  tick.stop();
  std::printf("case: %s, %s mesh, %zu bone levels\n", path.toLocal8Bit().constData(),
              mesh::to_string(session.spec().model.sizing.preset).c_str(),
              session.results().size());
  std::printf("first view (first level solved, 3D view painted): %.1f s after opening\n",
              first_paint_s);
  for (size_t k = 0; k < level_s.size(); ++k)
    std::printf("  %zu level(s) on screen at %.1f s (evaluation %.0f ms)\n", k + 1, level_s[k],
                level_eval_ms[k]);
  std::printf("all levels solved: %.1f s; longest event-loop stall while solving: %.0f ms\n",
              total_s, worst_gap_ms);
  for (const auto& [when, gap] : stalls)
    std::printf("  stall of %.0f ms ending at %.1f s\n", gap, when);
  std::printf("levels solved: %d, read from the saved solutions: %d\n",
              window.solve_job().levels_solved(), window.solve_job().levels_from_cache());
  if (!detail) return 0;
  // What showing a level costs the window once it is solved: the 3D scene built for a model it
  // has not shown (as for the first level), and a whole refresh for a level it has shown.
  if (session.results().size() > 1) {
    app::ResultView* view = window.result_view();
    const auto& t = session.spec().thresholds;
    QElapsedTimer part;
    part.start();
    view->show_result(*session.solution(1), session.results()[1], t, QStringLiteral("100 g"));
    view->vtk_view()->repaint();
    const double build_ms = ms_since(part);
    part.restart();
    view->show_result(*session.solution(0), session.results()[0], t, QStringLiteral("100 g"));
    view->vtk_view()->repaint();
    const double rebuild_ms = ms_since(part);
    part.restart();
    session.set_current(1);
    QApplication::processEvents();
    view->vtk_view()->repaint();
    const double switch_ms = ms_since(part);
    std::printf(
        "3D scene of a new model built and painted: %.0f ms (again: %.0f ms); whole window "
        "switched "
        "to another level and painted: %.0f ms\n",
        build_ms, rebuild_ms, switch_ms);
  }
  return 0;
}

}  // namespace

int main(int argc, char** argv) {
  sharpey::startup::use_fast_blas_kernels(argv);
  app::VtkView::set_default_surface_format();
  QApplication qt(argc, argv);
  QString path =
      QStringLiteral(SHARPEY_SOURCE_DIR "/samples/maxillary_central_incisor_bone_loss.json");
  std::optional<mesh::MeshPreset> preset = mesh::MeshPreset::kStandard;
  const QStringList args = QApplication::arguments();
  bool first_view = false;
  for (int i = 1; i < args.size(); ++i) {
    if (args[i] == "--mesh" && i + 1 < args.size())
      preset = mesh::mesh_preset_from_string(args[++i].toStdString());
    else if (args[i] == "--first-view")
      first_view = true;
    else
      path = args[i];
  }
  if (first_view) {
    // A fresh cache folder: the first open solves every level, the second (a new window, as a
    // new instance) reads them back.
    QTemporaryDir cache;
    std::printf("-- first open (nothing saved) --\n");
    if (const int rc = time_first_view(path, preset, cache.path(), true)) return rc;
    std::printf("-- second open (levels saved by the first) --\n");
    return time_first_view(path, preset, cache.path(), false);
  }

  app::MainWindowOptions options;
  options.dialogs = false;
  options.autosave_interval_ms = 3600000;
  app::MainWindow window(options);
  window.resize(1600, 1000);
  window.show();
  if (!QTest::qWaitForWindowExposed(&window)) return 1;
  app::CaseSession& session = window.session();
  session.open(path, preset);
  // One bone level is enough for the view timings.
  app::ScenarioList levels = session.levels();
  while (levels.size() > 1) levels.remove(levels.size() - 1);
  session.set_levels(levels);
  QElapsedTimer solve_timer;
  solve_timer.start();
  bool done = false;
  QObject::connect(&window, &app::MainWindow::solve_finished, [&]() { done = true; });
  QObject::connect(&window, &app::MainWindow::solve_failed, [&](const QString& m) {
    std::fprintf(stderr, "solve failed: %s\n", m.toLocal8Bit().constData());
    std::exit(1);
  });
  window.solve();
  if (!QTest::qWaitFor([&]() { return done; }, 3600000)) return 1;
  const double solve_s = static_cast<double>(solve_timer.elapsed()) / 1000.0;
  const auto* solution = session.current_solution();
  if (!solution) return 1;
  app::ResultView* view = window.result_view();
  app::VtkView* vtk = view->vtk_view();
  window.show_view(app::ViewKind::k3D);
  QApplication::processEvents();
  vtk->repaint();
  std::printf(
      "case: %s\nmesh: %s preset, %d nodes, %d elements, %zu PDL nodes; mesh+solve %.1f s\n",
      path.toLocal8Bit().constData(), mesh::to_string(session.spec().model.sizing.preset).c_str(),
      solution->model().mesh.n_nodes(), solution->model().mesh.n_elements(),
      solution->pdl_nodes().size(), solve_s);
  std::printf("view %d x %d px; surfaces drawn: %d triangles, %d coloured points\n", vtk->width(),
              vtk->height(), view->scene()->n_triangles(), view->scene()->n_coloured_points());

  // Load changes as while a slider is dragged (through the window, as the load panel sends them):
  // the session evaluates the scenario on display and the window refreshes every panel; then one
  // synchronous paint of the 3D view.
  const int n_changes = 20;
  Stats total, eval, window_refresh, scalars, iso, glyphs, render, cpu;
  app::LoadControls c = session.load_controls();
  for (int i = 0; i < n_changes; ++i) {
    c.magnitude = 60 + 5 * i;
    QElapsedTimer t;
    t.start();
    const double cpu_start = process_cpu_ms();
    window.set_load(c, true);
    // The coalesced change runs as a queued call once the event queue is empty; run it (and
    // nothing else, so the view is painted once, below).
    QCoreApplication::sendPostedEvents(&window, QEvent::MetaCall);
    const double after_refresh = ms_since(t);
    vtk->repaint();
    total.add(ms_since(t));
    cpu.add(process_cpu_ms() - cpu_start);
    eval.add(session.last_evaluation_ms());
    window_refresh.add(after_refresh - session.last_evaluation_ms());
    const app::SceneTimings& s = view->scene()->last_timings();
    scalars.add(s.scalars_ms);
    iso.add(s.iso_lines_ms);
    glyphs.add(s.glyphs_ms);
    render.add(vtk->last_render_ms());
  }
  window.set_load(c, false);  // the slider is released: full detail again
  QApplication::processEvents();
  vtk->repaint();
  std::printf(
      "load change to repainted view: mean %.1f ms, worst %.1f ms over %d changes (target < 25 "
      "ms)\n",
      total.mean(), total.worst, n_changes);
  std::printf("  CPU time of the process per load change (all threads): mean %.1f ms\n",
              cpu.mean());
  std::printf(
      "  evaluation by superposition %.1f ms; window refresh %.1f ms (of which colours %.2f ms, "
      "iso-lines %.2f ms, glyphs %.2f ms); VTK render %.1f ms; the rest (Qt paint and "
      "composition) %.1f ms\n",
      eval.mean(), window_refresh.mean(), scalars.mean(), iso.mean(), glyphs.mean(), render.mean(),
      total.mean() - eval.mean() - window_refresh.mean() - render.mean());

  // The evaluation alone in CPU time of this thread (less disturbed by other programs than wall
  // time): every field, what a drag evaluates (pressure with the strain maxima, no fields), and
  // the pressure alone.
  {
    const analysis::LoadSpec load = session.spec().load;
    const auto& t = session.spec().thresholds;
    auto cpu_of = [&](const analysis::FieldChoice& fields) {
      const int n = 20;
      const double start = thread_cpu_ms();
      for (int i = 0; i < n; ++i) analysis::evaluate(*solution, load, t, nullptr, fields);
      return (thread_cpu_ms() - start) / n;
    };
    const double all = cpu_of(analysis::FieldChoice{});
    const double drag = cpu_of(analysis::FieldChoice{false, false, false, true});
    const double pressure = cpu_of(analysis::FieldChoice{false, false, false, false});
    std::printf(
        "evaluation, CPU time of one thread: every field %.1f ms; as during a drag "
        "(pressure and the strain maxima) %.1f ms; pressure alone %.1f ms\n",
        all, drag, pressure);
  }

  // Single frames, camera still, per bone style.
  for (app::BoneStyle style :
       {app::BoneStyle::kTranslucent, app::BoneStyle::kOpaque, app::BoneStyle::kHidden}) {
    view->set_bone_style(style);
    QApplication::processEvents();
    Stats frame;
    for (int i = 0; i < 10; ++i) {
      vtk->camera()->Azimuth(0.5);
      vtk->repaint();
      frame.add(vtk->last_render_ms());
    }
    std::printf("frame render, %s: %.1f ms\n", app::label(style).toLocal8Bit().constData(),
                frame.mean());
  }

  // Where a still frame's time goes: the full repaint (VTK render plus Qt's composition of the
  // window) and the VTK render alone, with one feature of the scene switched off at a time.
  {
    view->set_bone_style(app::BoneStyle::kTranslucent);
    QApplication::processEvents();
    vtkRenderer* scene = vtk->renderer();
    auto frame = [&](const char* what) {
      Stats render_ms, repaint_ms;
      for (int i = 0; i < 8; ++i) {
        vtk->camera()->Azimuth(0.5);
        QElapsedTimer t;
        t.start();
        vtk->repaint();
        repaint_ms.add(ms_since(t));
        render_ms.add(vtk->last_render_ms());
      }
      std::printf("  still frame, %s: repaint %.1f ms, VTK render %.1f ms\n", what,
                  repaint_ms.mean(), render_ms.mean());
    };
    frame("as shown");
    scene->GradientBackgroundOff();
    frame("plain background");
    scene->GradientBackgroundOn();
    vtk->overlay()->DrawOff();
    frame("no overlay (glyphs, labels)");
    vtk->overlay()->DrawOn();
    vtkActorCollection* actors = scene->GetActors();
    actors->InitTraversal();
    std::vector<vtkActor*> all;
    while (vtkActor* a = actors->GetNextActor()) all.push_back(a);
    for (vtkActor* a : all) a->GetProperty()->BackfaceCullingOn();
    frame("back faces culled");
    for (vtkActor* a : all) a->GetProperty()->BackfaceCullingOff();
    for (vtkActor* a : all) a->GetProperty()->SetSpecular(0);
    frame("no specular");
    for (vtkActor* a : all) a->GetProperty()->SetInterpolationToFlat();
    frame("flat, no specular");
    for (vtkActor* a : all) a->GetProperty()->SetInterpolationToGouraud();
    const int w = vtk->width(), h = vtk->height();
    vtk->resize(w / 2, h / 2);
    QApplication::processEvents();
    frame("view at half width and height");
    vtk->resize(w, h);
    QApplication::processEvents();
  }

  // Rotation: azimuth steps with a synchronous repaint each, drawn in full and as while the mouse
  // turns the view (no see-through bone, half resolution).
  for (app::BoneStyle style : {app::BoneStyle::kTranslucent, app::BoneStyle::kOpaque}) {
    view->set_bone_style(style);
    QApplication::processEvents();
    const double still = rotate(vtk, 40);
    view->set_interacting(true);
    const double quick = rotate(vtk, 40);
    view->set_interacting(false);
    std::printf(
        "rotating, %s: %.1f frames per second drawn in full, %.1f as while the mouse turns it\n",
        app::label(style).toLocal8Bit().constData(), still, quick);
  }
  return 0;
}
