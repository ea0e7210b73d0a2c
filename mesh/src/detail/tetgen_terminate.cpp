// Replacement for TetGen 1.5.0's terminatetetgen(), which frees the mesh's memory pools and then
// throws; the tetgenmesh destructor frees them a second time while the exception unwinds and the
// program crashes (seen with Debian's libtet 1.5.0 on self-intersecting input). libtet calls the
// function through its PLT, so this definition takes precedence: it only throws the error code and
// leaves the freeing to the destructor. Deliberately does not include tetgen.h (whose inline
// version has the double free); tetgen_adapter.cpp calls tetgen_termination_fix_linked() so the
// linker always pulls this file in next to the adapter.
#include "tetgen_terminate.h"

class tetgenmesh;

void terminatetetgen(tetgenmesh* /*mesh*/, int code);
void terminatetetgen(tetgenmesh* /*mesh*/, int code) { throw code; }

namespace sharpey::mesh::detail {
bool tetgen_termination_fix_linked() { return true; }
}  // namespace sharpey::mesh::detail
