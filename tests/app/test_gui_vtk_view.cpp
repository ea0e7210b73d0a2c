// The Qt6 / VTK bridge: VTK renders inside the QOpenGLWidget, grabs see it, the interactor moves
// the camera, and linked cameras follow.
#include <gtest/gtest.h>
#include <vtkActor.h>
#include <vtkBillboardTextActor3D.h>
#include <vtkCamera.h>
#include <vtkNew.h>
#include <vtkPolyDataMapper.h>
#include <vtkProperty.h>
#include <vtkRenderer.h>
#include <vtkSphereSource.h>
#include <vtkTextProperty.h>

#include <QApplication>
#include <QMouseEvent>
#include <QTest>
#include <QVBoxLayout>
#include <cstdio>

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

// Height in pixels of the rows holding pure-yellow pixels (the label's text), 0 when none.
int yellow_rows(const QImage& image) {
  int first = -1, last = -1;
  for (int y = 0; y < image.height(); ++y)
    for (int x = 0; x < image.width(); ++x) {
      const QColor c = image.pixelColor(x, y);
      if (c.red() > 200 && c.green() > 200 && c.blue() < 80) {
        if (first < 0) first = y;
        last = y;
        break;
      }
    }
  return first < 0 ? 0 : last - first + 1;
}

TEST(VtkView, LabelsKeepTheirScreenSizeInHalfResolutionFrames) {
  VtkView view;
  view.resize(400, 300);
  add_sphere(view);
  vtkNew<vtkBillboardTextActor3D> label;
  label->SetInput("Wg");  // an ascender and a descender: the full text height
  label->GetTextProperty()->SetFontSize(24);
  label->GetTextProperty()->SetColor(1, 1, 0);
  label->GetTextProperty()->SetBackgroundColor(0, 0, 0);
  label->GetTextProperty()->SetBackgroundOpacity(1.0);
  label->SetPosition(0, 0, 0);
  view.overlay()->AddActor(label);
  double scales_seen = 0;
  QObject::connect(&view, &VtkView::pixel_scale_changed, [&](double s) { scales_seen = s; });
  view.show();
  ASSERT_TRUE(QTest::qWaitForWindowExposed(&view));
  view.repaint();
  const QImage full = view.last_frame();
  view.set_quick(true);
  view.repaint();
  const QImage quick = view.last_frame();
  EXPECT_DOUBLE_EQ(scales_seen, 0.5);
  EXPECT_DOUBLE_EQ(view.pixel_scale(), 0.5);
  ASSERT_EQ(quick.height() * 2, full.height());
  const int h_full = yellow_rows(full), h_quick = yellow_rows(quick);
  ASSERT_GT(h_full, 10);
  // The quick frame is shown twice as large: the text must be half as tall in it (a frame pixel
  // or two of rounding in the font size allowed).
  EXPECT_NEAR(2.0 * h_quick, h_full, 4.0) << "full " << h_full << " px, quick " << h_quick << " px";
  std::printf("label height: full frame %d px, quick frame %d px (shown at twice that)\n", h_full,
              h_quick);
  view.set_quick(false);
  view.repaint();
  EXPECT_DOUBLE_EQ(scales_seen, 1.0);
  EXPECT_EQ(yellow_rows(view.last_frame()), h_full);
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
