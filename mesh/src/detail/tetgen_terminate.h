// Link anchor for the terminatetetgen() replacement in tetgen_terminate.cpp.
#pragma once

namespace sharpey::mesh::detail {
// Always true; calling it makes the linker keep tetgen_terminate.cpp's object file.
bool tetgen_termination_fix_linked();
}  // namespace sharpey::mesh::detail
