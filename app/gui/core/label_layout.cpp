#include "core/label_layout.h"

#include <algorithm>
#include <cmath>
#include <numeric>

namespace sharpey::app {

std::vector<double> spread_labels(const std::vector<double>& anchors, double height, double lo,
                                  double hi) {
  const size_t n = anchors.size();
  std::vector<double> out(n, lo + 0.5 * height);
  if (n == 0) return out;
  height = std::max(0.0, height);
  // Sorted by anchor (stable: equal anchors keep their given order).
  std::vector<size_t> order(n);
  std::iota(order.begin(), order.end(), size_t{0});
  auto anchor = [&](size_t i) { return std::isfinite(anchors[i]) ? anchors[i] : lo; };
  std::stable_sort(order.begin(), order.end(),
                   [&](size_t a, size_t b) { return anchor(a) < anchor(b); });
  // With z_k = centre_k - k * height the spacing rule becomes z nondecreasing: the least-squares
  // nondecreasing fit to a_k - k * height (pool adjacent violators) gives the least total move.
  struct Block {
    double sum;
    int count;
    double mean() const { return sum / count; }
  };
  std::vector<Block> blocks;
  for (size_t k = 0; k < n; ++k) {
    blocks.push_back({anchor(order[k]) - static_cast<double>(k) * height, 1});
    while (blocks.size() > 1 && blocks[blocks.size() - 2].mean() > blocks.back().mean()) {
      const Block last = blocks.back();
      blocks.pop_back();
      blocks.back().sum += last.sum;
      blocks.back().count += last.count;
    }
  }
  // Inside [lo, hi]: z_k in [lo + h/2, hi - h/2 - (n - 1) h]; clamping keeps z nondecreasing and,
  // z's cost being convex and separable under the order constraint, stays the least move.
  const double z_lo = lo + 0.5 * height;
  const double z_hi = hi - 0.5 * height - static_cast<double>(n - 1) * height;
  const bool fits = z_hi >= z_lo;
  size_t k = 0;
  for (const Block& b : blocks) {
    for (int j = 0; j < b.count; ++j, ++k) {
      const double z = fits ? std::clamp(b.mean(), z_lo, z_hi) : z_lo;
      out[order[k]] = z + static_cast<double>(k) * height;
    }
  }
  return out;
}

}  // namespace sharpey::app
