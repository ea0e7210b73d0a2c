// The Qt6 / VTK bridge: VTK renders inside the QOpenGLWidget, grabs see it, the interactor moves
// the camera, and linked cameras follow.
#include <gtest/gtest.h>

#include <QApplication>
#include <QMouseEvent>
#include <QTest>
#include <QVBoxLayout>
#include <vtkActor.h>
#include <vtkCamera.h>
#include <vtkNew.h>
#include <vtkPolyDataMapper.h>
#include <vtkProperty.h>
#include <vtkRenderer.h>
#include <vtkSphereSource.h>

#include "support/image_checks.h"
#include "view/vtk_view.h"

namespace sharpey::app {
namespace {

using testing::count_pixels;

// A red sphere on a white background.
void add_sphere(VtkView& view) {
  vtkNew<vtkSphereSource> sphere;
  sphere->SetThetaResolution(32);
  sphere->SetPhiResolution(32);
  vtkNew<vtkPolyDataMapper> mapper;
  mapper->SetInputConnection(sphere->GetOutputPort());
  vtkNew<vtkActor> actor;
  actor->SetMapper(mapper);
  actor->GetProperty()->SetColor(1, 0, 0);
  actor->GetProperty()->SetAmbient(1.0);
  actor->GetProperty()->SetDiffuse(0.0);
  view.renderer()->AddActor(actor);
  view.renderer()->SetBackground(1, 1, 1);
  view.renderer()->ResetCamera();
}

bool is_red(const QColor& c) { return c.red() > 200 && c.green() < 60 && c.blue() < 60; }

TEST(VtkView, RendersIntoTheQtFramebuffer) {
  VtkView view;
  view.resize(320, 240);
  add_sphere(view);
  view.show();
  ASSERT_TRUE(QTest::qWaitForWindowExposed(&view));
  const QImage image = view.grabFramebuffer();
  ASSERT_FALSE(image.isNull());
  const int red = count_pixels(image, is_red);
  const int total = image.width() * image.height();
  // The sphere fills a good part of the view but not all of it.
  EXPECT_GT(red, total / 10);
  EXPECT_LT(red, total * 9 / 10);
  EXPECT_GT(view.frames_rendered(), 0);
}

TEST(VtkView, WidgetGrabOfAParentIncludesTheView) {
  QWidget parent;
  auto* layout = new QVBoxLayout(&parent);
  auto* view = new VtkView;
  layout->addWidget(view);
  parent.resize(300, 300);
  add_sphere(*view);
  parent.show();
  ASSERT_TRUE(QTest::qWaitForWindowExposed(&parent));
  const QImage image = parent.grab().toImage();
  EXPECT_GT(count_pixels(image, is_red), image.width() * image.height() / 20);
}

TEST(VtkView, DraggingRotatesTheCameraAndLinkedViewsFollow) {
  QWidget parent;
  auto* layout = new QVBoxLayout(&parent);
  auto* a = new VtkView;
  auto* b = new VtkView;
  layout->addWidget(a);
  layout->addWidget(b);
  parent.resize(300, 500);
  add_sphere(*a);
  add_sphere(*b);
  QObject::connect(a, &VtkView::camera_changed, b, [a, b]() { b->copy_camera_from(a->camera()); });
  parent.show();
  ASSERT_TRUE(QTest::qWaitForWindowExposed(&parent));
  double before[3];
  a->camera()->GetPosition(before);
  const QPoint start(a->width() / 2, a->height() / 2);
  QTest::mousePress(a, Qt::LeftButton, Qt::NoModifier, start);
  for (int i = 1; i <= 10; ++i) {
    QMouseEvent move(QEvent::MouseMove, QPointF(start + QPoint(6 * i, 0)),
                     a->mapToGlobal(QPointF(start + QPoint(6 * i, 0))), Qt::NoButton,
                     Qt::LeftButton, Qt::NoModifier);
    QApplication::sendEvent(a, &move);
  }
  QTest::mouseRelease(a, Qt::LeftButton, Qt::NoModifier, start + QPoint(60, 0));
  double after[3], linked[3];
  a->camera()->GetPosition(after);
  b->camera()->GetPosition(linked);
  const double moved = std::hypot(after[0] - before[0], after[1] - before[1], after[2] - before[2]);
  EXPECT_GT(moved, 1e-3);
  for (int i = 0; i < 3; ++i) EXPECT_NEAR(linked[i], after[i], 1e-9);
}

}  // namespace
}  // namespace sharpey::app
