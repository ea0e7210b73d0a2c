// bench_app: desktop-app timings on the incisor sample with the standard mesh (prints, not a
// test). Measures the time from a load change to the repainted 3D view (evaluation by
// superposition, colours, iso-lines, glyphs, VTK render) and the frame rate while rotating.
// Target: a load change under 50 ms end to end.
// Usage (needs a display, e.g. xvfb-run -a): bench_app [CASE.json] [--mesh coarse|standard|fine]
#include <QApplication>
#include <QElapsedTimer>
#include <QTest>
#include <cstdio>
#include <vtkCamera.h>

#include "core/case_session.h"
#include "core/solve_job.h"
#include "view/result_view.h"
#include "view/vtk_view.h"

using namespace sharpey;

int main(int argc, char** argv) {
  app::VtkView::set_default_surface_format();
  QApplication qt(argc, argv);
  QString path = QStringLiteral(SHARPEY_SOURCE_DIR "/samples/maxillary_central_incisor_bone_loss.json");
  std::optional<mesh::MeshPreset> preset = mesh::MeshPreset::kStandard;
  const QStringList args = QApplication::arguments();
  for (int i = 1; i < args.size(); ++i) {
    if (args[i] == "--mesh" && i + 1 < args.size()) preset = mesh::mesh_preset_from_string(args[++i].toStdString());
    else path = args[i];
  }
  app::CaseSession session;
  session.open(path, preset);
  // One bone level is enough for the view timings.
  app::ScenarioList levels = session.levels();
  while (levels.size() > 1) levels.remove(levels.size() - 1);
  session.set_levels(levels);
  QElapsedTimer solve_timer;
  solve_timer.start();
  app::SolveJob job;
  bool done = false;
  QObject::connect(&job, &app::SolveJob::finished, [&]() { done = true; });
  QObject::connect(&job, &app::SolveJob::failed, [&](const QString&, const QString& m) {
    std::fprintf(stderr, "solve failed: %s\n", m.toLocal8Bit().constData());
    std::exit(1);
  });
  analysis::CaseSpec spec = session.spec();
  job.start(spec);
  if (!QTest::qWaitFor([&]() { return done; }, 3600000)) return 1;
  session.set_study(job.take_result());
  const auto* solution = session.current_solution();
  std::printf("case: %s\nmesh: %s preset, %d nodes, %d elements, %zu PDL nodes; mesh+solve %.1f s\n",
              path.toLocal8Bit().constData(), mesh::to_string(spec.model.sizing.preset).c_str(),
              solution->model().mesh.n_nodes(), solution->model().mesh.n_elements(),
              solution->pdl_nodes().size(), solve_timer.elapsed() / 1000.0);

  app::ResultView view;
  view.resize(1000, 760);
  view.show();
  if (!QTest::qWaitForWindowExposed(&view)) return 1;
  view.show_result(*solution, *session.current_result(), session.spec().thresholds, "100 g");
  QApplication::processEvents();
  app::VtkView* vtk = view.vtk_view();

  // Load changes: evaluate (current scenario, as while dragging), update the view, render.
  const int n_changes = 20;
  double eval_ms = 0, total_ms = 0, render_ms = 0, worst_ms = 0;
  app::LoadControls c = session.load_controls();
  for (int i = 0; i < n_changes; ++i) {
    QElapsedTimer t;
    t.start();
    c.magnitude = 60 + 5 * i;
    session.set_load(c, true);
    const double e = t.nsecsElapsed() * 1e-6;
    view.show_result(*solution, *session.current_result(), session.spec().thresholds, "load");
    vtk->repaint();  // synchronous paint, as the next frame would do
    const double total = t.nsecsElapsed() * 1e-6;
    eval_ms += e;
    total_ms += total;
    render_ms += vtk->last_render_ms();
    worst_ms = std::max(worst_ms, total);
  }
  std::printf("load change to repainted view: mean %.1f ms (evaluation %.1f ms, VTK render %.1f ms), "
              "worst %.1f ms over %d changes; target < 50 ms\n",
              total_ms / n_changes, eval_ms / n_changes, render_ms / n_changes, worst_ms, n_changes);

  // Rotation: azimuth steps with a synchronous repaint each.
  for (bool translucent : {true, false}) {
    view.set_bone_style(translucent ? app::BoneStyle::kTranslucent : app::BoneStyle::kOpaque);
    QApplication::processEvents();
    const int frames = 60;
    QElapsedTimer t;
    t.start();
    for (int i = 0; i < frames; ++i) {
      vtk->camera()->Azimuth(3.0);
      vtk->repaint();
    }
    const double s = t.nsecsElapsed() * 1e-9;
    std::printf("rotating, bone %s: %.1f frames per second (%d frames, %.2f s)\n",
                translucent ? "see-through (depth peeling)" : "solid", frames / s, frames, s);
  }
  return 0;
}
