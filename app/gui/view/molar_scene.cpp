#include "view/molar_scene.h"

#include <vtkActor.h>
#include <vtkCamera.h>
#include <vtkCellArray.h>
#include <vtkPointData.h>
#include <vtkPoints.h>
#include <vtkPolyData.h>
#include <vtkPolyDataMapper.h>
#include <vtkProperty.h>
#include <vtkRenderer.h>
#include <vtkUnsignedCharArray.h>

#include <QPainter>
#include <algorithm>
#include <cmath>
#include <map>
#include <utility>
#include <vector>

#include "view/colour_bar.h"
#include "view/vtk_view.h"

namespace sharpey::app {

Rgb lost_surface_colour() { return {0.56, 0.54, 0.50}; }  // stone grey

namespace {

unsigned char byte(double v) { return static_cast<unsigned char>(std::lround(255 * v)); }

// The legend over the view: the two kinds of surface and the method.
void paint_legend(QPainter& p, const QSize& size, const QString& title) {
  const int line = p.fontMetrics().height();
  const QRect box(8, size.height() - 5 * line - 12, std::min(size.width() - 16, 30 * line),
                  5 * line + 4);
  p.fillRect(box, QColor(15, 13, 10, 190));
  p.setPen(QColor(245, 238, 225));
  p.drawText(box.adjusted(6, 2, -6, 0), Qt::AlignLeft | Qt::AlignTop, title);
  const auto swatch = [&](int row, const QColor& c, const QString& text) {
    const QRect s(box.left() + 6, box.top() + 4 + row * line + line / 4, line / 2 + 4,
                  line / 2 + 2);
    p.fillRect(s, c);
    p.drawText(QRect(s.right() + 6, box.top() + 2 + row * line, box.width() - 3 * line, line),
               Qt::AlignLeft | Qt::AlignVCenter, text);
  };
  swatch(1, to_qcolor(diverging_colour(0.8)),
         QStringLiteral("ligament attached: pressure, scale of the root maps"));
  swatch(2, to_qcolor(lost_surface_colour()), QStringLiteral("bone lost: no ligament"));
  p.drawText(box.adjusted(6, 3 * line + 2, -6, 0), Qt::AlignLeft | Qt::AlignTop,
             QStringLiteral("Root surface only (no crown); first seen from buccal,\n"
                            "mesial to the right. Thin-layer estimate."));
}

// The trunk's and each root's quadrature points lie on rings (one height, one count around):
// neighbouring rings of a part with the same count are joined by quads, so the surface reads as a
// surface. The roof and a cylinder's end disc are not rings; they stay points.
std::vector<std::vector<vtkIdType>> ring_quads(const std::vector<mesh::RootSurfacePoint>& surface,
                                               std::vector<bool>* in_quad) {
  std::map<std::pair<int, double>, std::vector<vtkIdType>> rings;  // (part, z) -> point ids
  for (size_t i = 0; i < surface.size(); ++i) {
    if (surface[i].part == mesh::kRoofPart) continue;
    rings[{surface[i].part, surface[i].x.z()}].push_back(static_cast<vtkIdType>(i));
  }
  for (auto& [key, ids] : rings)
    std::sort(ids.begin(), ids.end(), [&](vtkIdType a, vtkIdType b) {
      return surface[a].angle_rad < surface[b].angle_rad;
    });
  std::vector<std::vector<vtkIdType>> quads;
  for (auto below = rings.begin(); below != rings.end(); ++below) {
    const auto above = std::next(below);
    if (above == rings.end() || above->first.first != below->first.first) continue;
    const std::vector<vtkIdType>&a = below->second, &b = above->second;
    if (a.size() != b.size() || a.size() < 3) continue;
    for (size_t k = 0; k < a.size(); ++k) {
      const size_t next = (k + 1) % a.size();
      quads.push_back({a[k], a[next], b[next], b[k]});
      for (const vtkIdType id : quads.back()) (*in_quad)[static_cast<size_t>(id)] = true;
    }
  }
  return quads;
}

}  // namespace

MolarScene::MolarScene(VtkView* view) : view_(view) {
  vtkRenderer* scene = view_->renderer();
  scene->GradientBackgroundOn();
  const Rgb bottom = view_background_bottom(), top = view_background_top();
  scene->SetBackground(bottom[0], bottom[1], bottom[2]);
  scene->SetBackground2(top[0], top[1], top[2]);
  actor_ = vtkSmartPointer<vtkActor>::New();
  actor_->GetProperty()->RenderPointsAsSpheresOn();
  actor_->GetProperty()->SetPointSize(4.0f);
  scene->AddActor(actor_);
}

void MolarScene::show(const analysis::MultiRootScenarioResult& r, const ColourScale& scale,
                      const QString& title) {
  vtkNew<vtkPoints> points;
  vtkNew<vtkCellArray> vertices, quads;
  vtkNew<vtkUnsignedCharArray> colours;
  std::vector<bool> in_quad(r.surface.size(), false);
  for (const std::vector<vtkIdType>& q : ring_quads(r.surface, &in_quad))
    quads->InsertNextCell(static_cast<vtkIdType>(q.size()), q.data());
  colours->SetNumberOfComponents(3);
  n_attached_ = n_lost_ = 0;
  for (size_t i = 0; i < r.surface.size(); ++i) {
    const Eigen::Vector3d& x = r.surface[i].x;
    const vtkIdType id = points->InsertNextPoint(x.x(), x.y(), x.z());
    if (!in_quad[i]) vertices->InsertNextCell(1, &id);
    const bool attached = r.surface[i].attached;
    const Rgb c = attached ? scale.colour(r.surface_pressure_kpa[i]) : lost_surface_colour();
    colours->InsertNextTuple3(byte(c[0]), byte(c[1]), byte(c[2]));
    ++(attached ? n_attached_ : n_lost_);
  }
  vtkNew<vtkPolyData> poly;
  poly->SetPoints(points);
  poly->SetVerts(vertices);
  poly->SetPolys(quads);
  poly->GetPointData()->SetScalars(colours);
  vtkNew<vtkPolyDataMapper> mapper;
  mapper->SetInputData(poly);
  mapper->SetColorModeToDirectScalars();
  actor_->SetMapper(mapper);
  if (!camera_set_) reset_camera(r);
  view_->set_decoration([title](QPainter& p, const QSize& size) { paint_legend(p, size, title); });
  view_->update();
}

// From the buccal side (x toward the viewer), the crown up, a little from above and mesial.
void MolarScene::reset_camera(const analysis::MultiRootScenarioResult& r) {
  if (r.surface.empty()) return;
  vtkCamera* camera = view_->camera();
  camera->SetFocalPoint(0, 0, -6);
  camera->SetPosition(100, 30, 20);
  camera->SetViewUp(0, 0, 1);
  view_->renderer()->ResetCamera();
  camera->Zoom(1.3);
  camera_set_ = true;
}

}  // namespace sharpey::app
