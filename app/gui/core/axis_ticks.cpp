#include "core/axis_ticks.h"

#include <cmath>

namespace sharpey::app {

double nice_step(double lo, double hi, int target) {
  if (!std::isfinite(lo) || !std::isfinite(hi) || !(hi > lo) || target < 1) return 0;
  const double raw = (hi - lo) / target;
  const double power = std::pow(10.0, std::floor(std::log10(raw)));
  const double fraction = raw / power;
  double nice = 10;
  if (fraction <= 1.0) nice = 1;
  else if (fraction <= 2.0) nice = 2;
  else if (fraction <= 5.0) nice = 5;
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

}  // namespace sharpey::app
