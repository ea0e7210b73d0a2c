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

// The value axis of a trend plot for data from lo to hi: at least min_relative_span times the
// largest magnitude of the data wide (centred on the data), so differences that are small beside
// the value itself (0.001 mm of a 10 mm ratio: numerical noise) draw as a flat line, not a
// steep one; zero is included when the data lie closer to it than their own value (growth then
// reads in proportion); a margin of 8 % of the span on each side. All-zero data: -1 to 1.
struct AxisSpan {
  double lo = 0, hi = 0;
};
constexpr double kTrendMinRelativeSpan = 0.2;
AxisSpan trend_axis_span(double lo, double hi, double min_relative_span = kTrendMinRelativeSpan);

}  // namespace sharpey::app
