// The mesher executable's side of tetrahedralize() (mesh/tools/mesher_main.cpp): the parent
// writes the PLC and TetGen options as plain data to the mesher's standard input and reads the
// linear mesh, or TetGen's failure, from its standard output (tetgen_adapter.cpp has both sides).
#pragma once

namespace sharpey::mesh::detail {

// Reads the whole input from `in_fd`, runs TetGen and writes the report to `out_fd`. Returns the
// process exit code: 0 with a report written (a mesh or a MeshError message), 1 when the report
// could not be written, 2 for input that is not a mesher request.
int run_mesher(int in_fd, int out_fd);

}  // namespace sharpey::mesh::detail
