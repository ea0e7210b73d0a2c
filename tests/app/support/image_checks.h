// Pixel checks shared by the GUI tests.
#pragma once

#include <QColor>
#include <QImage>
#include <functional>

namespace sharpey::app::testing {

// Number of pixels of `image` for which `pick` is true.
int count_pixels(const QImage& image, const std::function<bool(const QColor&)>& pick);
// Number of distinct colours (quantised to 5 bits per channel).
int count_colours(const QImage& image);
// Pixels close to a colour of the diverging pressure map away from its neutral middle (the PDL
// colours): saturated enough to be neither background grey nor tooth ivory.
int colour_map_pixels(const QImage& image);

}  // namespace sharpey::app::testing
