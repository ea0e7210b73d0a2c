// The one place that touches VTK's OpenGL state: kept apart from Qt's OpenGL headers, which do
// not mix with the GL loader header VTK uses.
#pragma once

class vtkGenericOpenGLRenderWindow;

namespace sharpey::app {

// Renders `window` into the framebuffer bound by the caller (VtkView's frame buffer object): lets
// VTK re-read the GL state Qt changed, renders, forces an opaque alpha channel so the compositor
// never blends the view with the window behind it, and restores the state for Qt.
void render_into_bound_framebuffer(vtkGenericOpenGLRenderWindow* window);

}  // namespace sharpey::app
