#include "support/image_checks.h"

#include <cstdlib>
#include <set>
#include <vector>

#include "view/colour_bar.h"

namespace sharpey::app::testing {

int count_pixels(const QImage& image, const std::function<bool(const QColor&)>& pick) {
  const QImage img = image.convertToFormat(QImage::Format_RGB32);
  int n = 0;
  for (int y = 0; y < img.height(); ++y)
    for (int x = 0; x < img.width(); ++x)
      if (pick(QColor(img.pixel(x, y)))) ++n;
  return n;
}

int colour_map_pixels(const QImage& image) {
  std::vector<QColor> palette;
  for (int i = -20; i <= 20; ++i)
    if (std::abs(i) >= 4) palette.push_back(to_qcolor(diverging_colour(i / 20.0)));
  return count_pixels(image, [&](const QColor& c) {
    if (c.hsvSaturationF() < 0.25f) return false;
    for (const QColor& p : palette)
      if (std::abs(c.red() - p.red()) + std::abs(c.green() - p.green()) +
              std::abs(c.blue() - p.blue()) <
          60)
        return true;
    return false;
  });
}

int count_colours(const QImage& image) {
  const QImage img = image.convertToFormat(QImage::Format_RGB32);
  std::set<unsigned> colours;
  for (int y = 0; y < img.height(); ++y)
    for (int x = 0; x < img.width(); ++x) {
      const QRgb p = img.pixel(x, y);
      colours.insert(((qRed(p) >> 3) << 10) | ((qGreen(p) >> 3) << 5) | (qBlue(p) >> 3));
    }
  return static_cast<int>(colours.size());
}

}  // namespace sharpey::app::testing
