#include "view/trend_plot.h"

#include <QPainter>
#include <QPainterPath>
#include <algorithm>
#include <cmath>

#include "core/axis_ticks.h"

namespace sharpey::app {

namespace {
constexpr QColor kLineColour(52, 92, 128);
constexpr QColor kPointColour(176, 72, 40);

int column_of(const ScenarioTable& t, KeyNumber k) {
  for (size_t i = 0; i < t.columns.size(); ++i)
    if (t.columns[i] == k) return static_cast<int>(i);
  return -1;
}
}  // namespace

TrendPlot::TrendPlot(QWidget* parent) : QWidget(parent) { setMinimumHeight(220); }

void TrendPlot::set_table(const ScenarioTable& table) {
  table_ = table;
  update();
}

int TrendPlot::n_panels() const {
  int n = 0;
  for (KeyNumber k : plotted_key_numbers()) {
    const int c = column_of(table_, k);
    if (c < 0) continue;
    for (const auto& row : table_.values)
      if (std::isfinite(row[static_cast<size_t>(c)])) {
        ++n;
        break;
      }
  }
  return n;
}

void TrendPlot::paintEvent(QPaintEvent*) {
  QPainter painter(this);
  painter.fillRect(rect(), palette().window());
  paint_into(painter, rect());
}

void TrendPlot::paint_into(QPainter& painter, const QRect& area) const {
  painter.save();
  painter.setRenderHint(QPainter::Antialiasing, true);
  const QColor text = palette().windowText().color();
  const int x_col = column_of(table_, KeyNumber::kBoneLoss);
  const std::vector<KeyNumber> keys = plotted_key_numbers();
  const int n = static_cast<int>(keys.size());
  const int cols = n > 4 ? 3 : n;
  const int rows = (n + cols - 1) / std::max(1, cols);
  const QFontMetrics fm(painter.font());
  const int line = fm.height();
  if (x_col < 0 || table_.values.empty() || n == 0) {
    painter.setPen(text);
    painter.drawText(area, Qt::AlignCenter, QStringLiteral("No results to plot yet."));
    painter.restore();
    return;
  }
  const double cell_w = area.width() / static_cast<double>(cols);
  const double cell_h = area.height() / static_cast<double>(rows);
  std::vector<double> xs;
  for (const auto& row : table_.values) xs.push_back(row[static_cast<size_t>(x_col)]);
  double x0 = *std::min_element(xs.begin(), xs.end()), x1 = *std::max_element(xs.begin(), xs.end());
  if (!(x1 > x0)) x1 = x0 + 1;
  const double xpad = 0.06 * (x1 - x0);
  x0 -= xpad;
  x1 += xpad;
  for (int k = 0; k < n; ++k) {
    const int c = column_of(table_, keys[static_cast<size_t>(k)]);
    const QRectF cell(area.left() + (k % cols) * cell_w, area.top() + (k / cols) * cell_h, cell_w, cell_h);
    const QRectF plot(cell.left() + fm.horizontalAdvance(QStringLiteral("0000.0")) + 8, cell.top() + line + 6,
                      cell.width() - fm.horizontalAdvance(QStringLiteral("0000.0")) - 20,
                      cell.height() - 3 * line - 14);
    painter.setPen(text);
    painter.drawText(QRectF(cell.left(), cell.top() + 2, cell.width(), line), Qt::AlignHCenter,
                     title(keys[static_cast<size_t>(k)]) + QStringLiteral(" (") + unit_label(keys[static_cast<size_t>(k)]) + ')');
    if (c < 0 || plot.height() < 20 || plot.width() < 20) continue;
    std::vector<QPointF> values;
    double y0 = INFINITY, y1 = -INFINITY;
    for (size_t r = 0; r < table_.values.size(); ++r) {
      const double v = table_.values[r][static_cast<size_t>(c)];
      if (!std::isfinite(v)) continue;
      values.emplace_back(xs[r], v);
      y0 = std::min(y0, v);
      y1 = std::max(y1, v);
    }
    painter.setPen(QPen(QColor(150, 150, 150), 1));
    painter.setBrush(Qt::NoBrush);
    painter.drawRect(plot);
    if (values.empty()) {
      painter.setPen(text);
      painter.drawText(plot, Qt::AlignCenter, QStringLiteral("n/a"));
      continue;
    }
    // Include zero when it is close, so growth reads in proportion.
    if (y0 > 0 && y0 < 0.5 * y1) y0 = 0;
    if (!(y1 > y0)) {
      y0 -= 1;
      y1 += 1;
    }
    const double ypad = 0.08 * (y1 - y0);
    y0 -= ypad;
    y1 += ypad;
    auto to_px = [&](double x, double y) {
      return QPointF(plot.left() + (x - x0) / (x1 - x0) * plot.width(),
                     plot.bottom() - (y - y0) / (y1 - y0) * plot.height());
    };
    const double ystep = nice_step(y0, y1, 4);
    painter.setPen(text);
    for (double t : nice_ticks(y0, y1, 4)) {
      const QPointF p = to_px(x0, t);
      painter.setPen(QPen(QColor(222, 222, 222), 1));
      painter.drawLine(QPointF(plot.left(), p.y()), QPointF(plot.right(), p.y()));
      painter.setPen(text);
      painter.drawText(QRectF(cell.left(), p.y() - line / 2.0, plot.left() - cell.left() - 4, line),
                       Qt::AlignRight | Qt::AlignVCenter, tick_label(t, ystep));
    }
    const double xstep = nice_step(x0, x1, 4);
    for (double t : nice_ticks(x0, x1, 4)) {
      const QPointF p = to_px(t, y0);
      painter.drawLine(QPointF(p.x(), plot.bottom()), QPointF(p.x(), plot.bottom() + 3));
      painter.drawText(QRectF(p.x() - 30, plot.bottom() + 3, 60, line), Qt::AlignHCenter, tick_label(t, xstep));
    }
    painter.drawText(QRectF(plot.left(), plot.bottom() + line + 2, plot.width(), line), Qt::AlignHCenter,
                     QStringLiteral("bone loss (mm)"));
    std::sort(values.begin(), values.end(), [](const QPointF& a, const QPointF& b) { return a.x() < b.x(); });
    QPainterPath path;
    for (size_t i = 0; i < values.size(); ++i) {
      const QPointF p = to_px(values[i].x(), values[i].y());
      if (i == 0) path.moveTo(p);
      else path.lineTo(p);
    }
    painter.setPen(QPen(kLineColour, 2));
    painter.setBrush(Qt::NoBrush);
    painter.drawPath(path);
    painter.setBrush(kPointColour);
    painter.setPen(Qt::NoPen);
    for (const QPointF& v : values) painter.drawEllipse(to_px(v.x(), v.y()), 4, 4);
  }
  painter.restore();
}

}  // namespace sharpey::app
