#include "view/molar_root_maps.h"

#include <QPainter>
#include <algorithm>
#include <cmath>

#include "view/colour_bar.h"

namespace sharpey::app {

namespace {

const char* const kMolarSides[] = {"B", "M", "L", "D", "B"};  // buccal, mesial, lingual, distal

}  // namespace

MolarRootMaps::MolarRootMaps(QWidget* parent) : QWidget(parent) {
  setMinimumSize(420, 260);
  setAutoFillBackground(true);
}

void MolarRootMaps::set_maps(const std::vector<MolarMapPart>& parts,
                             const analysis::Thresholds& thresholds, const QString& title) {
  parts_ = parts;
  thresholds_ = thresholds;
  title_ = title;
  std::vector<double> values;
  depth_max_mm_ = 1;
  for (const MolarMapPart& p : parts_)
    for (const analysis::MultiRootMapCell& c : p.cells) {
      values.push_back(c.pressure_kpa);
      depth_max_mm_ = std::max(depth_max_mm_, c.depth_mm + 1);
    }
  scale_ = ColourScale(Quantity::kPressure, finite_range(values));
  update();
}

void MolarRootMaps::clear() {
  parts_.clear();
  update();
}

QStringList MolarRootMaps::map_labels() const {
  QStringList out;
  for (const MolarMapPart& p : parts_) out << p.name;
  return out;
}

void MolarRootMaps::paintEvent(QPaintEvent*) {
  QPainter painter(this);
  painter.fillRect(rect(), palette().window());
  paint_into(painter, rect());
}

// One part's map: the no-ligament background, the cells, their threshold outlines, the axes.
void MolarRootMaps::paint_part(QPainter& painter, const MolarMapPart& part,
                               const QRect& plot) const {
  painter.fillRect(plot, QBrush(to_qcolor(no_data_colour()), Qt::BDiagPattern));
  painter.setPen(QPen(QColor(120, 120, 120), 1));
  painter.drawRect(plot);
  const double cell_w = plot.width() / 12.0;
  const double cell_h = static_cast<double>(plot.height()) / depth_max_mm_;
  double peak = 0;
  for (const analysis::MultiRootMapCell& c : part.cells) {
    const QRectF cell(plot.left() + c.sector * cell_w, plot.top() + c.depth_mm * cell_h, cell_w,
                      cell_h);
    painter.fillRect(cell, to_qcolor(scale_.colour(c.pressure_kpa)));
    peak = std::max(peak, c.pressure_kpa);
  }
  for (const analysis::MultiRootMapCell& c : part.cells) {
    const QRectF cell(plot.left() + c.sector * cell_w, plot.top() + c.depth_mm * cell_h, cell_w,
                      cell_h);
    if (c.pressure_kpa > thresholds_.limit.value_kpa)
      painter.setPen(QPen(to_qcolor(limit_line_colour()), 2.5));
    else if (c.pressure_kpa > thresholds_.capillary.value_kpa)
      painter.setPen(QPen(to_qcolor(capillary_line_colour()), 1.5, Qt::DashLine));
    else
      continue;
    painter.setBrush(Qt::NoBrush);
    painter.drawRect(cell.adjusted(1.5, 1.5, -1.5, -1.5));
  }
  const int line = painter.fontMetrics().height();
  painter.setPen(palette().windowText().color());
  QFont bold = painter.font();
  bold.setBold(true);
  const QFont saved = painter.font();
  painter.setFont(bold);
  painter.drawText(QRect(plot.left(), plot.top() - 2 * line - 4, plot.width(), line),
                   Qt::AlignHCenter | Qt::AlignBottom, part.name);
  painter.setFont(saved);
  painter.drawText(QRect(plot.left(), plot.top() - line - 2, plot.width(), line),
                   Qt::AlignHCenter | Qt::AlignBottom,
                   part.cells.empty() ? QStringLiteral("no ligament")
                                      : QStringLiteral("peak %1 kPa").arg(peak, 0, 'f', 1));
  for (int k = 0; k <= 4; ++k) {
    const int x = plot.left() + k * plot.width() / 4;
    painter.drawText(QRect(x - line, plot.bottom() + 2, 2 * line, line), Qt::AlignCenter,
                     QString::fromLatin1(kMolarSides[k]));
  }
}

void MolarRootMaps::paint_into(QPainter& painter, const QRect& rect) const {
  const int line = painter.fontMetrics().height();
  painter.setPen(palette().windowText().color());
  painter.drawText(QRect(rect.left() + 4, rect.top() + 2, rect.width() - 8, line),
                   Qt::AlignLeft | Qt::AlignVCenter, title_);
  if (parts_.empty()) return;
  const int bar_width = std::max(150, rect.width() / 6);
  const int axis_width = 3 * line;
  const int top = rect.top() + 4 * line;
  const int bottom = rect.bottom() - 2 * line;
  const int n = static_cast<int>(parts_.size());
  const int gap = line;
  const int room = rect.width() - bar_width - axis_width - 8;
  const int map_width = std::max(40, (room - (n - 1) * gap) / n);
  // The shared depth axis on the left, in mm below the CEJ.
  painter.setPen(palette().windowText().color());
  const int step = depth_max_mm_ > 10 ? 2 : 1;
  for (int d = 0; d <= depth_max_mm_; d += step) {
    const int y = top + (bottom - top) * d / depth_max_mm_;
    painter.drawText(QRect(rect.left(), y - line / 2, axis_width - 6, line),
                     Qt::AlignRight | Qt::AlignVCenter, QString::number(d));
  }
  painter.save();
  painter.translate(rect.left() + line / 2, (top + bottom) / 2);
  painter.rotate(-90);
  painter.drawText(QRect(-(bottom - top) / 2, -line / 2, bottom - top, line), Qt::AlignCenter,
                   QStringLiteral("mm below the CEJ"));
  painter.restore();
  for (int k = 0; k < n; ++k) {
    const QRect plot(rect.left() + axis_width + k * (map_width + gap), top, map_width,
                     bottom - top);
    paint_part(painter, parts_[static_cast<size_t>(k)], plot);
  }
  const std::vector<BarMark> marks = pressure_threshold_marks(thresholds_);
  ColourBar::draw(
      painter,
      QRect(rect.right() - bar_width + 8, top - 2 * line, bar_width - 8, bottom - top + 2 * line),
      scale_, QStringLiteral("pressure"), QStringLiteral("kPa"), marks,
      palette().windowText().color());
}

}  // namespace sharpey::app
