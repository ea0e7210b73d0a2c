#include "core/axis_ticks.h"

#include <algorithm>
#include <cmath>

namespace sharpey::app {

double nice_step(double lo, double hi, int target) {
  if (!std::isfinite(lo) || !std::isfinite(hi) || !(hi > lo) || target < 1) return 0;
  const double raw = (hi - lo) / target;
  const double power = std::pow(10.0, std::floor(std::log10(raw)));
  const double fraction = raw / power;
  double nice = 10;
  if (fraction <= 1.0)
    nice = 1;
  else if (fraction <= 2.0)
    nice = 2;
  else if (fraction <= 5.0)
    nice = 5;
  return nice * power;
}

std::vector<double> nice_ticks(double lo, double hi, int target) {
  std::vector<double> ticks;
  const double step = nice_step(lo, hi, target);
  if (!(step > 0)) return ticks;
  const double first = std::ceil(lo / step - 1e-9) * step;
  for (double v = first; v <= hi + 1e-9 * step; v += step) {
    // Snap accumulated round-off (and -0) to the grid.
    double snapped = std::round(v / step) * step;
    if (std::abs(snapped) < 1e-12 * step) snapped = 0;
    ticks.push_back(snapped);
  }
  return ticks;
}

QString tick_label(double value, double step) {
  int decimals = 0;
  if (step > 0 && step < 1) decimals = static_cast<int>(std::ceil(-std::log10(step) - 1e-9));
  return QString::number(value, 'f', decimals);
}

AxisSpan trend_axis_span(double lo, double hi, double min_relative_span) {
  AxisSpan s{lo, hi};
  // Zero in view when it is close (the smallest value under half the largest).
  if (s.lo > 0 && s.lo < 0.5 * s.hi) s.lo = 0;
  if (s.hi < 0 && s.hi > 0.5 * s.lo) s.hi = 0;
  const double magnitude = std::max(std::abs(lo), std::abs(hi));
  const double min_span = min_relative_span * magnitude;
  if (s.hi - s.lo < min_span) {
    const double mid = 0.5 * (lo + hi);
    s.lo = mid - 0.5 * min_span;
    s.hi = mid + 0.5 * min_span;
  }
  if (!(s.hi > s.lo)) {  // all values zero (or equal to zero span)
    s.lo -= 1;
    s.hi += 1;
  }
  const double pad = 0.08 * (s.hi - s.lo);
  return {s.lo - pad, s.hi + pad};
}

}  // namespace sharpey::app
