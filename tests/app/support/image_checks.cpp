#include "support/image_checks.h"

#include <set>

namespace sharpey::app::testing {

int count_pixels(const QImage& image, const std::function<bool(const QColor&)>& pick) {
  const QImage img = image.convertToFormat(QImage::Format_RGB32);
  int n = 0;
  for (int y = 0; y < img.height(); ++y)
    for (int x = 0; x < img.width(); ++x)
      if (pick(QColor(img.pixel(x, y)))) ++n;
  return n;
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
