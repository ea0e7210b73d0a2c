#include "core/colour_map.h"

#include <algorithm>
#include <cmath>

namespace sharpey::app {

namespace {

struct Stop {
  double t;
  Rgb c;
};

Rgb interpolate(const Stop* stops, int n, double t) {
  if (t <= stops[0].t) return stops[0].c;
  for (int i = 1; i < n; ++i) {
    if (t <= stops[i].t) {
      const double s = (t - stops[i - 1].t) / (stops[i].t - stops[i - 1].t);
      Rgb out;
      for (size_t k = 0; k < 3; ++k) out[k] = (1 - s) * stops[i - 1].c[k] + s * stops[i].c[k];
      return out;
    }
  }
  return stops[n - 1].c;
}

// Control points chosen for this app: lightness falls steadily away from the neutral middle.
constexpr Stop kDiverging[] = {
    {-1.00, {0.082, 0.255, 0.373}},  // deep petrol
    {-0.65, {0.196, 0.447, 0.557}}, {-0.30, {0.525, 0.737, 0.776}},
    {0.00, {0.957, 0.945, 0.906}},                                  // warm off-white
    {0.30, {0.953, 0.761, 0.494}},                                  // apricot
    {0.65, {0.855, 0.443, 0.204}},  {1.00, {0.525, 0.118, 0.106}},  // brick
};
constexpr Stop kSequential[] = {
    {0.00, {0.118, 0.098, 0.239}},  // ink
    {0.25, {0.247, 0.243, 0.510}}, {0.50, {0.188, 0.478, 0.541}},
    {0.75, {0.471, 0.714, 0.404}}, {1.00, {0.976, 0.910, 0.557}},  // straw
};

}  // namespace

Rgb diverging_colour(double t) {
  return interpolate(kDiverging, static_cast<int>(std::size(kDiverging)), std::clamp(t, -1.0, 1.0));
}

Rgb sequential_colour(double t) {
  return interpolate(kSequential, static_cast<int>(std::size(kSequential)),
                     std::clamp(t, 0.0, 1.0));
}

ColourScale::ColourScale(Quantity q, ValueRange range) : quantity_(q), range_(range) {}

ValueRange ColourScale::colour_range() const {
  if (is_signed(quantity_)) {
    double limit = std::max(std::abs(range_.min), std::abs(range_.max));
    if (!(limit > 0)) limit = 1.0;
    return {-limit, limit};
  }
  if (!(range_.max > range_.min)) return {range_.min, range_.min + 1.0};
  return range_;
}

Rgb ColourScale::colour(double value) const {
  if (!std::isfinite(value)) return no_data_colour();
  const ValueRange r = colour_range();
  if (is_signed(quantity_)) return diverging_colour(value / r.max);
  return sequential_colour((value - r.min) / (r.max - r.min));
}

std::vector<Rgb> ColourScale::table(int n) const {
  std::vector<Rgb> out;
  const ValueRange r = colour_range();
  for (int i = 0; i < n; ++i) {
    const double v = r.min + (r.max - r.min) * (n == 1 ? 0.5 : static_cast<double>(i) / (n - 1));
    out.push_back(colour(v));
  }
  return out;
}

Rgb capillary_line_colour() { return {0.129, 0.169, 0.251}; }  // slate
Rgb limit_line_colour() { return {0.0, 0.0, 0.0}; }
Rgb no_data_colour() { return {0.80, 0.80, 0.80}; }

double relative_luminance(const Rgb& c) {
  auto lin = [](double v) { return v <= 0.04045 ? v / 12.92 : std::pow((v + 0.055) / 1.055, 2.4); };
  return 0.2126 * lin(c[0]) + 0.7152 * lin(c[1]) + 0.0722 * lin(c[2]);
}

}  // namespace sharpey::app

namespace sharpey::app {

double contrast_ratio(const Rgb& a, const Rgb& b) {
  const double la = relative_luminance(a), lb = relative_luminance(b);
  return (std::max(la, lb) + 0.05) / (std::min(la, lb) + 0.05);
}

Rgb blend(const Rgb& over, double alpha, const Rgb& under) {
  return {alpha * over[0] + (1 - alpha) * under[0], alpha * over[1] + (1 - alpha) * under[1],
          alpha * over[2] + (1 - alpha) * under[2]};
}

Rgb view_background_bottom() { return {0.105, 0.090, 0.075}; }
Rgb view_background_top() { return {0.290, 0.255, 0.205}; }
Rgb force_label_colour() { return {0.98, 0.78, 0.12}; }
Rgb cres_label_colour() { return {1.0, 1.0, 1.0}; }
Rgb crot_label_colour() { return {0.30, 0.90, 0.95}; }
Rgb label_box_colour() { return {0.06, 0.05, 0.04}; }
double label_box_opacity() { return 0.7; }

}  // namespace sharpey::app
