// Tick values for colour bars and plot axes: round numbers (1, 2 or 5 times a power of ten).
#pragma once

#include <QString>
#include <vector>

namespace sharpey::app {

// Ticks inside [lo, hi], about `target` of them, all multiples of one round step; empty for an
// empty or non-finite range.
std::vector<double> nice_ticks(double lo, double hi, int target = 6);
// The step nice_ticks chose (0 when none).
double nice_step(double lo, double hi, int target = 6);
// Tick label with as many decimals as the step needs.
QString tick_label(double value, double step);

}  // namespace sharpey::app
