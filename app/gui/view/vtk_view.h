// A Qt6 widget that shows a VTK renderer (Debian's VTK Qt module is built against Qt5, so this
// bridge replaces it).
//
// VTK renders with its own OpenGL context on an offscreen surface into a framebuffer object
// (vtkGenericOpenGLRenderWindow, FrameBlitMode BlitToCurrent); the frame is read back into an
// image that paintEvent draws like any other widget content. The window around the view then stays
// a plain raster window: with software OpenGL, composing a whole window that holds a
// QOpenGLWidget on every frame costs more than reading back the view's pixels. Rendering happens
// only in paintEvent; mouse and wheel events go to a vtkGenericRenderWindowInteractor whose render
// requests turn into update() calls. Call VtkView::set_default_surface_format() before the
// QApplication is created.
#pragma once

#include <vtkNew.h>
#include <vtkSmartPointer.h>

#include <QImage>
#include <QWidget>
#include <functional>
#include <memory>

class QOffscreenSurface;
class QPainter;
class QOpenGLContext;
class QOpenGLFramebufferObject;

class vtkCamera;
class vtkGenericOpenGLRenderWindow;
class vtkGenericRenderWindowInteractor;
class vtkObject;
class vtkRenderer;

namespace sharpey::app {

class VtkView : public QWidget {
  Q_OBJECT

 public:
  // OpenGL 3.2 core profile with depth and stencil buffers, as VTK 9 needs.
  static void set_default_surface_format();

  explicit VtkView(QWidget* parent = nullptr);
  ~VtkView() override;

  // Scene renderer (layer 0) and an overlay renderer (layer 1) that shares its camera and is
  // drawn on top, for markers that must stay visible inside the tooth.
  vtkRenderer* renderer() const;
  vtkRenderer* overlay() const;
  vtkCamera* camera() const;
  vtkGenericOpenGLRenderWindow* render_window() const;

  // Drawn over every frame shown (and over grabbed frames by the caller's choice): `draw` gets a
  // painter on the widget and the widget's size in pixels. Empty: nothing.
  void set_decoration(std::function<void(QPainter&, const QSize&)> draw);
  const std::function<void(QPainter&, const QSize&)>& decoration() const { return decoration_; }

  // Copies position, focal point, view-up and view angle from `other` (for linked views).
  void copy_camera_from(vtkCamera* other);

  // The rendered frame (rendering it first when the scene changed since the last one), in device
  // pixels; null when no OpenGL context could be made.
  QImage grabFramebuffer();

  // Quick frames (while the view turns or a load slider moves): rendered at half the width and
  // height and scaled up, a quarter of the pixels for software OpenGL. Off: full resolution.
  void set_quick(bool on);
  bool quick() const { return quick_; }

  // Size of one frame pixel in widget pixels' terms: 0.5 for quick frames, 1 otherwise. Text
  // actors follow by themselves (the render window's DPI is scaled alike, so a label keeps its
  // on-screen size); sizes given in pixels (line widths, label offsets) follow through
  // pixel_scale_changed.
  double pixel_scale() const { return quick_ ? 0.5 : 1.0; }
  // The last frame rendered (quick or full), as read back.
  const QImage& last_frame() const { return frame_; }

  // Time the last frame spent in VTK's Render (with the read-back), ms.
  double last_render_ms() const { return last_render_ms_; }
  int frames_rendered() const { return frames_; }

 signals:
  // The user moved the camera (emitted after the interactor changed it).
  void camera_changed();
  // A frame was rendered.
  void frame_rendered();
  // Emitted just before a frame is rendered at another pixel scale than the one before (see
  // pixel_scale()); a direct connection can scale pixel sizes for that frame.
  void pixel_scale_changed(double scale);
  // The user started / stopped turning, panning or zooming the view with the mouse (the scene may
  // draw with less detail in between).
  void interaction_started();
  void interaction_ended();
  // The mouse moved over the view with no button held, at VTK display coordinates (pixels from
  // the bottom left); hover_left() when it leaves the view.
  void hovered(int x, int y);
  void hover_left();

 protected:
  void paintEvent(QPaintEvent* event) override;
  void resizeEvent(QResizeEvent* event) override;
  void mousePressEvent(QMouseEvent* event) override;
  void mouseReleaseEvent(QMouseEvent* event) override;
  void mouseMoveEvent(QMouseEvent* event) override;
  void mouseDoubleClickEvent(QMouseEvent* event) override;
  void wheelEvent(QWheelEvent* event) override;
  void enterEvent(QEnterEvent* event) override;
  void leaveEvent(QEvent* event) override;

 private:
  bool make_current();
  void render_frame();
  QSize device_size() const;
  void on_window_event(vtkObject* caller, unsigned long event_id, void* call_data);
  void on_interactor_render(vtkObject* caller, unsigned long event_id, void* call_data);
  void on_style_event(vtkObject* caller, unsigned long event_id, void* call_data);
  void release_graphics();
  bool forward_mouse(QMouseEvent* event, unsigned long vtk_event);

  vtkSmartPointer<vtkGenericOpenGLRenderWindow> window_;
  vtkSmartPointer<vtkGenericRenderWindowInteractor> interactor_;
  vtkSmartPointer<vtkRenderer> renderer_;
  vtkSmartPointer<vtkRenderer> overlay_;
  std::unique_ptr<QOpenGLContext> context_;
  std::unique_ptr<QOffscreenSurface> surface_;
  std::unique_ptr<QOpenGLFramebufferObject> fbo_;
  bool context_failed_ = false;
  QImage frame_;
  bool in_paint_ = false;
  bool quick_ = false;
  double last_render_ms_ = 0;
  int base_dpi_ = 72;            // the render window's DPI for full frames
  double rendered_scale_ = 1.0;  // pixel scale of the last frame
  int frames_ = 0;
  std::function<void(QPainter&, const QSize&)> decoration_;
};

}  // namespace sharpey::app
