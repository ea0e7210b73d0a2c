// Iso-lines of a scalar on a regular grid (marching squares), for the threshold outlines on the
// root map. Grid coordinates: x = column index, y = row index, values at integer points.
#pragma once

#include <vector>

namespace sharpey::app {

struct IsoSegment {
  double x0 = 0, y0 = 0, x1 = 0, y1 = 0;
};

// `values`: rows * cols, row-major. Squares with a non-finite corner are skipped (no line
// through missing data). Ambiguous saddles are resolved by the mean of the four corners.
std::vector<IsoSegment> iso_segments(const std::vector<double>& values, int rows, int cols,
                                     double level);

}  // namespace sharpey::app
