#include "view/vtk_paint.h"

#include <vtkGenericOpenGLRenderWindow.h>
#include <vtkOpenGLState.h>
#include <vtk_glew.h>

namespace sharpey::app {

void render_into_bound_framebuffer(vtkGenericOpenGLRenderWindow* window) {
  vtkOpenGLState* state = window->GetState();
  state->Reset();
  state->Push();
  // Qt leaves GL_LESS; VTK draws coincident geometry (iso-lines on surfaces) with GL_LEQUAL.
  state->vtkglDepthFunc(GL_LEQUAL);
  window->Render();
  state->vtkglColorMask(GL_FALSE, GL_FALSE, GL_FALSE, GL_TRUE);
  state->vtkglClearColor(0, 0, 0, 1);
  state->vtkglClear(GL_COLOR_BUFFER_BIT);
  state->Pop();
}

}  // namespace sharpey::app
