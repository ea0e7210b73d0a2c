#include "core/iso_lines.h"

#include <cmath>

namespace sharpey::app {

std::vector<IsoSegment> iso_segments(const std::vector<double>& values, int rows, int cols,
                                     double level) {
  std::vector<IsoSegment> out;
  auto at = [&](int r, int c) {
    return values[static_cast<size_t>(r) * static_cast<size_t>(cols) + static_cast<size_t>(c)];
  };
  for (int r = 0; r + 1 < rows; ++r) {
    for (int c = 0; c + 1 < cols; ++c) {
      // Corners counter-clockwise: 0 (c, r), 1 (c+1, r), 2 (c+1, r+1), 3 (c, r+1).
      const double v[4] = {at(r, c), at(r, c + 1), at(r + 1, c + 1), at(r + 1, c)};
      const double px[4] = {double(c), double(c + 1), double(c + 1), double(c)};
      const double py[4] = {double(r), double(r), double(r + 1), double(r + 1)};
      if (!std::isfinite(v[0]) || !std::isfinite(v[1]) || !std::isfinite(v[2]) ||
          !std::isfinite(v[3]))
        continue;
      int mask = 0;
      for (int k = 0; k < 4; ++k)
        if (v[k] >= level) mask |= 1 << k;
      if (mask == 0 || mask == 15) continue;
      // Crossing point on edge k (from corner k to corner k+1).
      auto cross = [&](int k, double* x, double* y) {
        const int a = k, b = (k + 1) % 4;
        const double t = (level - v[a]) / (v[b] - v[a]);
        *x = px[a] + t * (px[b] - px[a]);
        *y = py[a] + t * (py[b] - py[a]);
      };
      auto add = [&](int e0, int e1) {
        IsoSegment s;
        cross(e0, &s.x0, &s.y0);
        cross(e1, &s.x1, &s.y1);
        out.push_back(s);
      };
      // Edges crossed: those whose two corners lie on different sides.
      int edges[4];
      int n = 0;
      for (int k = 0; k < 4; ++k) {
        const bool a = (mask >> k) & 1, b = (mask >> ((k + 1) % 4)) & 1;
        if (a != b) edges[n++] = k;
      }
      if (n == 2) {
        add(edges[0], edges[1]);
      } else {  // saddle: four crossings
        const bool centre_high = 0.25 * (v[0] + v[1] + v[2] + v[3]) >= level;
        const bool corner0_high = mask & 1;
        // Pair edges so that the high (or low) centre joins the high (or low) corners.
        if (centre_high == corner0_high) {
          add(0, 1);
          add(2, 3);
        } else {
          add(3, 0);
          add(1, 2);
        }
      }
    }
  }
  return out;
}

}  // namespace sharpey::app
