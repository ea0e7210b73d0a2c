// Colour maps of the app (its own choice of colours, no Qt types): a diverging map for signed
// quantities (tension petrol blue, zero warm off-white, compression brick red) and a sequential
// map for magnitudes (ink to straw), both with lightness monotone on each side.
#pragma once

#include <array>
#include <vector>

#include "core/quantity.h"

namespace sharpey::app {

using Rgb = std::array<double, 3>;  // components in [0, 1]

// t in [-1, 1]: -1 full tension, 0 neutral, +1 full compression. Clamped.
Rgb diverging_colour(double t);
// t in [0, 1]. Clamped.
Rgb sequential_colour(double t);

// Maps values of a quantity to colours. Signed quantities are centred on zero with the scale
// limit L = max(|min|, |max|), so equal magnitudes of tension and compression look equally
// strong; the bar then shows only the part [min, max] that occurs. Unsigned quantities map
// [min, max] linearly.
class ColourScale {
 public:
  ColourScale() = default;
  ColourScale(Quantity q, ValueRange range);

  Quantity quantity() const { return quantity_; }
  const ValueRange& range() const { return range_; }  // shown on the bar
  // Range the colours are spread over: [-L, L] for signed quantities, [min, max] otherwise.
  ValueRange colour_range() const;
  Rgb colour(double value) const;
  // `n` evenly spaced colours over colour_range(), for a lookup table.
  std::vector<Rgb> table(int n) const;

 private:
  Quantity quantity_ = Quantity::kPressure;
  ValueRange range_{0, 0};
};

// Colours of the two threshold iso-lines (capillary, physiological limit) and of "no data".
Rgb capillary_line_colour();
Rgb limit_line_colour();
Rgb no_data_colour();

// Relative luminance (sRGB, WCAG definition), used by a test to check lightness is monotone.
double relative_luminance(const Rgb& c);
// Contrast ratio of two colours (WCAG definition: (L1 + 0.05) / (L2 + 0.05), lighter first).
double contrast_ratio(const Rgb& a, const Rgb& b);
// `over` with opacity `alpha` blended on `under`.
Rgb blend(const Rgb& over, double alpha, const Rgb& under);

// Background of the 3D and comparison views, the app's own design: a warm umber gradient from
// dark at the bottom to a lighter walnut at the top, dark enough for the ivory tooth, the
// see-through bone and both colour maps' light middles to stand out.
Rgb view_background_bottom();
Rgb view_background_top();
// The 3D labels: text colours and the box behind them (colour, opacity).
Rgb force_label_colour();
Rgb cres_label_colour();
Rgb crot_label_colour();
Rgb label_box_colour();
double label_box_opacity();

}  // namespace sharpey::app
