#include "view/root_map_view.h"

#include <QImage>
#include <QMouseEvent>
#include <QPainter>
#include <algorithm>
#include <cmath>

#include "core/axis_ticks.h"
#include "core/hover_readout.h"
#include "core/iso_lines.h"
#include "view/colour_bar.h"

namespace sharpey::app {

namespace {

const char* const kSideNames[] = {"labial", "mesial", "lingual", "distal", "labial"};

}  // namespace

RootMapView::RootMapView(QWidget* parent) : QWidget(parent) {
  setMinimumSize(420, 280);
  setAutoFillBackground(true);
  setMouseTracking(true);
}

HoverReadout RootMapView::readout_at(const QPoint& p) const {
  if (!has_map() || !plot_.isValid() || !plot_.contains(p)) return {};
  const double angle = (p.x() + 0.5 - plot_.left()) / plot_.width() * 360.0;
  const double depth = map_.depth_min_mm + (p.y() + 0.5 - plot_.top()) / plot_.height() *
                                               (map_.depth_max_mm - map_.depth_min_mm);
  return root_map_readout(map_, angle, depth);
}

void RootMapView::mouseMoveEvent(QMouseEvent* event) {
  emit hover_changed(describe(readout_at(event->position().toPoint())));
  QWidget::mouseMoveEvent(event);
}

void RootMapView::leaveEvent(QEvent* event) {
  emit hover_changed(QString());
  QWidget::leaveEvent(event);
}

void RootMapView::set_map(const analysis::RootMap& map, const analysis::Thresholds& thresholds,
                          const QString& title, const ValueRange* fixed_range) {
  map_ = map;
  thresholds_ = thresholds;
  title_ = title;
  scale_ =
      ColourScale(Quantity::kPressure, fixed_range ? *fixed_range : finite_range(map.pressure_kpa));
  update();
}

void RootMapView::clear() {
  map_ = analysis::RootMap{};
  update();
}

void RootMapView::paintEvent(QPaintEvent*) {
  QPainter painter(this);
  paint_into(painter, rect());
}

namespace {

const QColor kHatchBack(226, 226, 226), kHatchLine(196, 196, 196);

// The map as an image of `size`: each pixel samples the map (cell centres at (j + 0.5) / n_a of
// the width); no ligament is light diagonal hatching.
QImage map_image(const analysis::RootMap& map, const ColourScale& scale, const QSize& size) {
  QImage image(size, QImage::Format_RGB32);
  for (int py = 0; py < size.height(); ++py) {
    const double y = (py + 0.5) / size.height() * map.n_depth - 0.5;
    auto* row = reinterpret_cast<QRgb*>(image.scanLine(py));
    for (int px = 0; px < size.width(); ++px) {
      const double x = (px + 0.5) / size.width() * map.n_angle - 0.5;
      const double v = root_map_sample(map, x, y);
      row[px] = std::isfinite(v) ? to_qcolor(scale.colour(v)).rgb()
                                 : ((px + py) % 9 == 0 ? kHatchLine : kHatchBack).rgb();
    }
  }
  return image;
}

// The threshold outline pens: capillary dashed, limit solid.
std::pair<QPen, QPen> outline_pens() {
  return {QPen(to_qcolor(capillary_line_colour()), 2.0, Qt::DashLine),
          QPen(to_qcolor(limit_line_colour()), 2.6, Qt::SolidLine)};
}

// Threshold outlines: marching squares on the cell grid, with the first column repeated after the
// last so outlines close across 360 degrees. Returns the number of segments drawn.
int paint_outlines(QPainter& painter, const analysis::RootMap& map, const QRect& plot,
                   const analysis::Thresholds& thresholds) {
  const int n_a = map.n_angle, n_d = map.n_depth;
  std::vector<double> wrapped(static_cast<size_t>(n_d) * static_cast<size_t>(n_a + 1));
  for (int r = 0; r < n_d; ++r)
    for (int c = 0; c <= n_a; ++c)
      wrapped[static_cast<size_t>(r) * static_cast<size_t>(n_a + 1) + static_cast<size_t>(c)] =
          map.pressure_kpa[static_cast<size_t>(r) * static_cast<size_t>(n_a) +
                           static_cast<size_t>(c % n_a)];
  auto to_px = [&](double x, double y) {
    return QPointF(plot.left() + (x + 0.5) / n_a * plot.width(),
                   plot.top() + (y + 0.5) / n_d * plot.height());
  };
  const auto [capillary_pen, limit_pen] = outline_pens();
  const std::pair<double, QPen> outlines[] = {{thresholds.capillary.value_kpa, capillary_pen},
                                              {thresholds.limit.value_kpa, limit_pen}};
  int n_segments = 0;
  painter.save();
  painter.setClipRect(plot);
  for (const auto& [level, pen] : outlines) {
    painter.setPen(pen);
    for (const IsoSegment& s : iso_segments(wrapped, n_d, n_a + 1, level)) {
      painter.drawLine(to_px(s.x0, s.y0), to_px(s.x1, s.y1));
      ++n_segments;
    }
  }
  painter.restore();
  return n_segments;
}

// Axes: angle with the sides named, depth below the CEJ.
void paint_map_axes(QPainter& painter, const analysis::RootMap& map, const QRect& area,
                    const QRect& plot, const QColor& text, int line) {
  painter.setPen(text);
  for (int k = 0; k <= 8; ++k) {
    const double x = plot.left() + k / 8.0 * plot.width();
    painter.drawLine(QPointF(x, plot.bottom()), QPointF(x, plot.bottom() + 4));
    QString label = QStringLiteral("%1\u00b0").arg(45 * k);
    if (k % 2 == 0) label += QStringLiteral("\n") + QLatin1String(kSideNames[k / 2]);
    painter.drawText(QRectF(x - 40, plot.bottom() + 5, 80, 2 * line),
                     Qt::AlignHCenter | Qt::AlignTop, label);
  }
  painter.drawText(QRectF(plot.left(), plot.bottom() + 2 * line + 6, plot.width(), line),
                   Qt::AlignHCenter,
                   QStringLiteral("angle around the root (0\u00b0 labial, 90\u00b0 mesial)"));
  const double d0 = map.depth_min_mm, d1 = map.depth_max_mm;
  const double step = nice_step(d0, d1, 6);
  for (double d : nice_ticks(d0, d1, 6)) {
    const double y = plot.top() + (d - d0) / (d1 - d0) * plot.height();
    painter.drawLine(QPointF(plot.left() - 4, y), QPointF(plot.left(), y));
    painter.drawText(QRectF(area.left(), y - line / 2.0, plot.left() - area.left() - 6, line),
                     Qt::AlignRight | Qt::AlignVCenter, tick_label(d, step));
  }
  painter.save();
  painter.translate(area.left() + line / 2.0 + 2, plot.center().y());
  painter.rotate(-90);
  painter.drawText(QRectF(-plot.height() / 2.0, -line / 2.0, plot.height(), line), Qt::AlignCenter,
                   QStringLiteral("depth below the CEJ (mm)"));
  painter.restore();
}

// The legend above the plot, from (x, y): the two outlines and the hatching.
void paint_map_legend(QPainter& painter, int x, int y, const analysis::Thresholds& thresholds,
                      const QColor& text) {
  const QFontMetrics fm(painter.font());
  const int line = fm.height();
  auto legend_line = [&](const QPen& pen, const QString& label) {
    painter.setPen(pen);
    painter.drawLine(x, y + line / 2, x + 26, y + line / 2);
    painter.setPen(text);
    painter.drawText(QRect(x + 30, y, 400, line), Qt::AlignLeft | Qt::AlignVCenter, label);
    x += 30 + fm.horizontalAdvance(label) + 18;
  };
  const auto [capillary_pen, limit_pen] = outline_pens();
  legend_line(
      capillary_pen,
      QStringLiteral("capillary pressure %1 kPa").arg(thresholds.capillary.value_kpa, 0, 'f', 1));
  legend_line(
      limit_pen,
      QStringLiteral("physiological limit %1 kPa").arg(thresholds.limit.value_kpa, 0, 'f', 1));
  painter.fillRect(QRect(x, y + 2, 26, line - 4), kHatchBack);
  painter.setPen(kHatchLine);
  painter.drawRect(QRect(x, y + 2, 26, line - 4));
  painter.setPen(text);
  painter.drawText(QRect(x + 30, y, 300, line), Qt::AlignLeft | Qt::AlignVCenter,
                   QStringLiteral("no ligament (above the crest)"));
}

}  // namespace

void RootMapView::paint_into(QPainter& painter, const QRect& area) const {
  painter.save();
  painter.setRenderHint(QPainter::Antialiasing, true);
  const QColor text = palette().windowText().color();
  painter.fillRect(area, palette().window());
  const QFontMetrics fm(painter.font());
  const int line = fm.height();
  if (!has_map()) {
    painter.setPen(text);
    painter.drawText(area, Qt::AlignCenter,
                     QStringLiteral("No root map yet: open or solve a case."));
    painter.restore();
    return;
  }
  // Room for the colour bar as ColourBar::draw lays it out with this font: the longest threshold
  // name and its leader, the bar (20 px), then the tick labels; a fixed width clipped the labels.
  const int bar_width =
      std::max(110, fm.horizontalAdvance(QStringLiteral("capillary")) + 8 + 12 + 20 + 6 +
                        fm.horizontalAdvance(QStringLiteral("-000.0")) + 6);
  const QRect title_rect(area.left() + 8, area.top() + 4, area.width() - 16, line + 4);
  const QFont base = painter.font();
  QFont title_font = base;
  title_font.setBold(true);
  painter.setFont(title_font);
  painter.setPen(text);
  painter.drawText(title_rect, Qt::AlignLeft | Qt::AlignVCenter, title_);
  painter.setFont(base);
  const int left = area.left() + fm.horizontalAdvance(QStringLiteral("00.0")) + line + 16;
  const QRect plot(left, title_rect.bottom() + 2 * line + 6, area.right() - bar_width - left - 8,
                   area.bottom() - title_rect.bottom() - 5 * line - 16);
  if (plot.width() < 40 || plot.height() < 40) {
    painter.restore();
    return;
  }
  painter.drawImage(plot.topLeft(), map_image(map_, scale_, plot.size()));
  if (painter.device() == this) plot_ = plot;
  painter.setPen(QPen(QColor(60, 60, 60), 1));
  painter.setBrush(Qt::NoBrush);
  painter.drawRect(plot);
  n_segments_ = paint_outlines(painter, map_, plot, thresholds_);
  paint_map_axes(painter, map_, area, plot, text, line);
  paint_map_legend(painter, plot.left(), title_rect.bottom() + line / 2 + 4, thresholds_, text);
  const std::vector<BarMark> marks = pressure_threshold_marks(thresholds_);
  ColourBar::draw(
      painter,
      QRect(plot.right() + 8, plot.top() - 3 * line, bar_width, plot.height() + 3 * line + line),
      scale_, QStringLiteral("pressure"), QStringLiteral("kPa"), marks, text);
  painter.restore();
}

}  // namespace sharpey::app
