#include "view/vtk_view.h"

#include <vtkCallbackCommand.h>
#include <vtkCamera.h>
#include <vtkCommand.h>
#include <vtkGenericOpenGLRenderWindow.h>
#include <vtkGenericRenderWindowInteractor.h>
#include <vtkInteractorStyleTrackballCamera.h>
#include <vtkRenderer.h>

#include <QElapsedTimer>
#include <QMouseEvent>
#include <QOffscreenSurface>
#include <QOpenGLContext>
#include <QOpenGLFramebufferObject>
#include <QPainter>
#include <QSurfaceFormat>
#include <QWheelEvent>
#include <algorithm>
#include <cmath>

#include "view/vtk_paint.h"

namespace sharpey::app {

void VtkView::set_default_surface_format() {
  QSurfaceFormat format;
  format.setRenderableType(QSurfaceFormat::OpenGL);
  format.setVersion(3, 2);
  format.setProfile(QSurfaceFormat::CoreProfile);
  format.setRedBufferSize(8);
  format.setGreenBufferSize(8);
  format.setBlueBufferSize(8);
  format.setAlphaBufferSize(8);
  format.setDepthBufferSize(24);
  format.setStencilBufferSize(8);
  format.setSwapBehavior(QSurfaceFormat::DoubleBuffer);
  QSurfaceFormat::setDefaultFormat(format);
}

VtkView::VtkView(QWidget* parent) : QWidget(parent) {
  setAttribute(Qt::WA_OpaquePaintEvent);  // every pixel comes from the frame
  setFocusPolicy(Qt::StrongFocus);
  setMouseTracking(true);  // for the hover read-out
  setMinimumSize(160, 120);

  window_ = vtkSmartPointer<vtkGenericOpenGLRenderWindow>::New();
  window_->SetMultiSamples(0);
  window_->SetFrameBlitModeToBlitToCurrent();
  window_->SetNumberOfLayers(2);
  base_dpi_ = window_->GetDPI();
  for (unsigned long id : {vtkCommand::WindowMakeCurrentEvent, vtkCommand::WindowIsCurrentEvent,
                           vtkCommand::WindowSupportsOpenGLEvent, vtkCommand::WindowIsDirectEvent,
                           vtkCommand::WindowFrameEvent})
    window_->AddObserver(id, this, &VtkView::on_window_event);

  renderer_ = vtkSmartPointer<vtkRenderer>::New();
  renderer_->SetLayer(0);
  overlay_ = vtkSmartPointer<vtkRenderer>::New();
  overlay_->SetLayer(1);
  overlay_->SetInteractive(0);
  overlay_->SetActiveCamera(renderer_->GetActiveCamera());
  window_->AddRenderer(renderer_);
  window_->AddRenderer(overlay_);

  interactor_ = vtkSmartPointer<vtkGenericRenderWindowInteractor>::New();
  interactor_->SetRenderWindow(window_);
  interactor_->EnableRenderOff();  // renders happen in paintEvent only
  vtkNew<vtkInteractorStyleTrackballCamera> style;
  interactor_->SetInteractorStyle(style);
  style->AddObserver(vtkCommand::StartInteractionEvent, this, &VtkView::on_style_event);
  style->AddObserver(vtkCommand::EndInteractionEvent, this, &VtkView::on_style_event);
  interactor_->AddObserver(vtkCommand::RenderEvent, this, &VtkView::on_interactor_render);
  interactor_->Initialize();
}

VtkView::~VtkView() {
  if (context_ && make_current()) {
    release_graphics();
    fbo_.reset();
    context_->doneCurrent();
  }
  window_->RemoveAllObservers();
  interactor_->RemoveAllObservers();
  if (vtkInteractorObserver* style = interactor_->GetInteractorStyle()) style->RemoveAllObservers();
}

vtkRenderer* VtkView::renderer() const { return renderer_; }
vtkRenderer* VtkView::overlay() const { return overlay_; }
vtkCamera* VtkView::camera() const { return renderer_->GetActiveCamera(); }
vtkGenericOpenGLRenderWindow* VtkView::render_window() const { return window_; }

void VtkView::copy_camera_from(vtkCamera* other) {
  vtkCamera* mine = camera();
  if (other == mine) return;
  mine->SetPosition(other->GetPosition());
  mine->SetFocalPoint(other->GetFocalPoint());
  mine->SetViewUp(other->GetViewUp());
  mine->SetViewAngle(other->GetViewAngle());
  mine->SetParallelProjection(other->GetParallelProjection());
  mine->SetParallelScale(other->GetParallelScale());
  renderer_->ResetCameraClippingRange();
  update();
}

void VtkView::release_graphics() {
  if (window_->GetReadyForRendering()) {
    window_->Finalize();
    window_->SetReadyForRendering(false);
  }
}

bool VtkView::make_current() {
  if (context_failed_) return false;
  if (!context_) {
    // VTK's own context, on an offscreen surface: shares nothing with the window's painting.
    context_ = std::make_unique<QOpenGLContext>();
    context_->setFormat(QSurfaceFormat::defaultFormat());
    surface_ = std::make_unique<QOffscreenSurface>();
    surface_->setFormat(context_->format());
    surface_->create();
    if (!context_->create() || !surface_->isValid() || !context_->makeCurrent(surface_.get())) {
      context_failed_ = true;
      return false;
    }
    window_->SetOwnContext(0);
    window_->SetReadyForRendering(true);
    window_->OpenGLInitContext();
    return true;
  }
  return QOpenGLContext::currentContext() == context_.get() ||
         context_->makeCurrent(surface_.get());
}

QSize VtkView::device_size() const {
  const qreal scale = devicePixelRatioF() * (quick_ ? 0.5 : 1.0);
  return {std::max(1, static_cast<int>(width() * scale)),
          std::max(1, static_cast<int>(height() * scale))};
}

void VtkView::set_quick(bool on) {
  if (quick_ == on) return;
  quick_ = on;
  const QSize size = device_size();
  interactor_->UpdateSize(size.width(), size.height());
  update();
}

void VtkView::render_frame() {
  if (!make_current()) return;
  const QSize size = device_size();
  if (!fbo_ || fbo_->size() != size) {
    fbo_ = std::make_unique<QOpenGLFramebufferObject>(
        size, QOpenGLFramebufferObject::CombinedDepthStencil);
  }
  interactor_->UpdateSize(size.width(), size.height());
  // Text is sized in points at the window's DPI: half the DPI in a half-resolution frame keeps the
  // labels their size on screen once the frame is scaled up.
  const double scale = pixel_scale();
  window_->SetDPI(std::max(1, static_cast<int>(std::lround(base_dpi_ * scale))));
  if (scale != rendered_scale_) {
    rendered_scale_ = scale;
    emit pixel_scale_changed(scale);
  }
  in_paint_ = true;
  QElapsedTimer timer;
  timer.start();
  fbo_->bind();
  render_into_bound_framebuffer(window_);
  frame_ = fbo_->toImage(true);  // top row first
  fbo_->release();
  last_render_ms_ = static_cast<double>(timer.nsecsElapsed()) * 1e-6;
  ++frames_;
  in_paint_ = false;
  emit frame_rendered();
}

QImage VtkView::grabFramebuffer() {
  // Always at full resolution (exports, tests).
  const bool was = quick_;
  quick_ = false;
  render_frame();
  quick_ = was;
  if (was) interactor_->UpdateSize(device_size().width(), device_size().height());
  return frame_;
}

void VtkView::resizeEvent(QResizeEvent* event) {
  const QSize size = device_size();
  interactor_->UpdateSize(size.width(), size.height());
  QWidget::resizeEvent(event);
}

void VtkView::paintEvent(QPaintEvent*) {
  render_frame();
  QPainter painter(this);
  if (frame_.isNull()) {
    painter.fillRect(rect(), palette().window());
    painter.drawText(rect(), Qt::AlignCenter,
                     QStringLiteral("No OpenGL: the 3D view cannot be drawn."));
    return;
  }
  if (quick_) {
    painter.setRenderHint(QPainter::SmoothPixmapTransform, true);
    painter.drawImage(rect(), frame_);
  } else {
    QImage shown = frame_;
    shown.setDevicePixelRatio(devicePixelRatioF());
    painter.drawImage(QPointF(0, 0), shown);
  }
  if (decoration_) decoration_(painter, size());
}

void VtkView::set_decoration(std::function<void(QPainter&, const QSize&)> draw) {
  decoration_ = std::move(draw);
  update();
}

void VtkView::on_window_event(vtkObject*, unsigned long event_id, void* call_data) {
  switch (event_id) {
    case vtkCommand::WindowMakeCurrentEvent:
      make_current();
      break;
    case vtkCommand::WindowIsCurrentEvent:
      *static_cast<bool*>(call_data) =
          context_ && QOpenGLContext::currentContext() == context_.get();
      break;
    case vtkCommand::WindowSupportsOpenGLEvent:
      *static_cast<int*>(call_data) = 1;
      break;
    case vtkCommand::WindowIsDirectEvent:
      *static_cast<int*>(call_data) = 1;
      break;
    case vtkCommand::WindowFrameEvent:
      // A render outside paintEvent (should not happen): show it at the next paint.
      if (!in_paint_) update();
      break;
    default:
      break;
  }
}

void VtkView::on_style_event(vtkObject*, unsigned long event_id, void*) {
  if (event_id == vtkCommand::StartInteractionEvent)
    emit interaction_started();
  else if (event_id == vtkCommand::EndInteractionEvent)
    emit interaction_ended();
}

void VtkView::on_interactor_render(vtkObject*, unsigned long, void*) {
  update();
  emit camera_changed();
}

bool VtkView::forward_mouse(QMouseEvent* event, unsigned long vtk_event) {
  const qreal dpr = devicePixelRatioF();
  const QPointF p = event->position();
  interactor_->SetEventInformationFlipY(static_cast<int>(p.x() * dpr),
                                        static_cast<int>(p.y() * dpr),
                                        (event->modifiers() & Qt::ControlModifier) ? 1 : 0,
                                        (event->modifiers() & Qt::ShiftModifier) ? 1 : 0, 0,
                                        event->type() == QEvent::MouseButtonDblClick ? 1 : 0);
  interactor_->SetAltKey((event->modifiers() & Qt::AltModifier) ? 1 : 0);
  interactor_->InvokeEvent(vtk_event, event);
  return true;
}

void VtkView::mousePressEvent(QMouseEvent* event) {
  switch (event->button()) {
    case Qt::LeftButton:
      forward_mouse(event, vtkCommand::LeftButtonPressEvent);
      break;
    case Qt::MiddleButton:
      forward_mouse(event, vtkCommand::MiddleButtonPressEvent);
      break;
    case Qt::RightButton:
      forward_mouse(event, vtkCommand::RightButtonPressEvent);
      break;
    default:
      break;
  }
}

void VtkView::mouseReleaseEvent(QMouseEvent* event) {
  switch (event->button()) {
    case Qt::LeftButton:
      forward_mouse(event, vtkCommand::LeftButtonReleaseEvent);
      break;
    case Qt::MiddleButton:
      forward_mouse(event, vtkCommand::MiddleButtonReleaseEvent);
      break;
    case Qt::RightButton:
      forward_mouse(event, vtkCommand::RightButtonReleaseEvent);
      break;
    default:
      break;
  }
}

void VtkView::mouseMoveEvent(QMouseEvent* event) {
  forward_mouse(event, vtkCommand::MouseMoveEvent);
  if (event->buttons() == Qt::NoButton) {
    int x = 0, y = 0;
    interactor_->GetEventPosition(x, y);
    emit hovered(x, y);
  }
}

void VtkView::mouseDoubleClickEvent(QMouseEvent* event) {
  if (event->button() == Qt::LeftButton) forward_mouse(event, vtkCommand::LeftButtonPressEvent);
}

void VtkView::wheelEvent(QWheelEvent* event) {
  const qreal dpr = devicePixelRatioF();
  const QPointF p = event->position();
  interactor_->SetEventInformationFlipY(static_cast<int>(p.x() * dpr),
                                        static_cast<int>(p.y() * dpr),
                                        (event->modifiers() & Qt::ControlModifier) ? 1 : 0,
                                        (event->modifiers() & Qt::ShiftModifier) ? 1 : 0);
  const int delta = event->angleDelta().y();
  if (delta > 0)
    interactor_->InvokeEvent(vtkCommand::MouseWheelForwardEvent, event);
  else if (delta < 0)
    interactor_->InvokeEvent(vtkCommand::MouseWheelBackwardEvent, event);
  event->accept();
}

void VtkView::enterEvent(QEnterEvent* event) {
  interactor_->InvokeEvent(vtkCommand::EnterEvent, event);
  QWidget::enterEvent(event);
}

void VtkView::leaveEvent(QEvent* event) {
  interactor_->InvokeEvent(vtkCommand::LeaveEvent, event);
  emit hover_left();
  QWidget::leaveEvent(event);
}

}  // namespace sharpey::app
