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

// Per row: true when another row has the same bone loss.
std::vector<bool> shares_bone_loss(const ScenarioTable& t) {
  std::vector<bool> out(t.values.size(), false);
  const int x = column_of(t, KeyNumber::kBoneLoss);
  if (x < 0) return out;
  for (size_t a = 0; a < t.values.size(); ++a)
    for (size_t b = 0; b < t.values.size(); ++b)
      if (a != b && t.values[a][static_cast<size_t>(x)] == t.values[b][static_cast<size_t>(x)])
        out[a] = true;
  return out;
}
}  // namespace

AxisSpan TrendPlot::value_axis(KeyNumber k) const {
  const int c = column_of(table_, k);
  double y0 = INFINITY, y1 = -INFINITY;
  if (c >= 0)
    for (const auto& row : table_.values) {
      const double v = row[static_cast<size_t>(c)];
      if (!std::isfinite(v)) continue;
      y0 = std::min(y0, v);
      y1 = std::max(y1, v);
    }
  if (!(y1 >= y0)) return {0, 0};
  return trend_axis_span(y0, y1);
}

QStringList TrendPlot::labelled_levels() const {
  QStringList names;
  const std::vector<bool> shared = shares_bone_loss(table_);
  for (size_t r = 0; r < shared.size() && static_cast<int>(r) < table_.row_names.size(); ++r)
    if (shared[r]) names << table_.row_names[static_cast<int>(r)];
  return names;
}

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

namespace {

// One key number's panel: the plot rectangle and the data ranges it maps.
struct Panel {
  QRectF cell, plot;
  double x0 = 0, x1 = 1, y0 = 0, y1 = 1;
  int line = 0;
  QPointF to_px(double x, double y) const {
    return QPointF(plot.left() + (x - x0) / (x1 - x0) * plot.width(),
                   plot.bottom() - (y - y0) / (y1 - y0) * plot.height());
  }
};

// Value ticks with grid lines (as many as the height holds without crowding, 2 to 4), bone-loss
// ticks and the axis name.
void paint_panel_axes(QPainter& painter, const Panel& pn, const QColor& text) {
  const int line = pn.line;
  const int n_yticks = std::clamp(static_cast<int>(pn.plot.height() / (1.8 * line)), 2, 4);
  const double ystep = nice_step(pn.y0, pn.y1, n_yticks);
  painter.setPen(text);
  for (double t : nice_ticks(pn.y0, pn.y1, n_yticks)) {
    const QPointF p = pn.to_px(pn.x0, t);
    painter.setPen(QPen(QColor(222, 222, 222), 1));
    painter.drawLine(QPointF(pn.plot.left(), p.y()), QPointF(pn.plot.right(), p.y()));
    painter.setPen(text);
    painter.drawText(
        QRectF(pn.cell.left(), p.y() - line / 2.0, pn.plot.left() - pn.cell.left() - 4, line),
        Qt::AlignRight | Qt::AlignVCenter, tick_label(t, ystep));
  }
  const double xstep = nice_step(pn.x0, pn.x1, 4);
  for (double t : nice_ticks(pn.x0, pn.x1, 4)) {
    const QPointF p = pn.to_px(t, pn.y0);
    painter.drawLine(QPointF(p.x(), pn.plot.bottom()), QPointF(p.x(), pn.plot.bottom() + 3));
    painter.drawText(QRectF(p.x() - 30, pn.plot.bottom() + 3, 60, line), Qt::AlignHCenter,
                     tick_label(t, xstep));
  }
  painter.drawText(QRectF(pn.plot.left(), pn.plot.bottom() + line + 2, pn.plot.width(), line),
                   Qt::AlignHCenter, QStringLiteral("bone loss (mm)"));
}

// The values as points joined in order of bone loss.
void paint_panel_series(QPainter& painter, const Panel& pn, const std::vector<QPointF>& values,
                        const QColor& line_colour, const QColor& point_colour) {
  std::vector<QPointF> sorted = values;
  std::sort(sorted.begin(), sorted.end(), [](const QPointF& a, const QPointF& b) {
    return a.x() < b.x() || (a.x() == b.x() && a.y() < b.y());
  });
  QPainterPath path;
  for (size_t i = 0; i < sorted.size(); ++i) {
    const QPointF p = pn.to_px(sorted[i].x(), sorted[i].y());
    if (i == 0)
      path.moveTo(p);
    else
      path.lineTo(p);
  }
  painter.setPen(QPen(line_colour, 2));
  painter.setBrush(Qt::NoBrush);
  painter.drawPath(path);
  painter.setBrush(point_colour);
  painter.setPen(Qt::NoPen);
  for (const QPointF& v : values) painter.drawEllipse(pn.to_px(v.x(), v.y()), 4, 4);
}

// Levels sharing a bone loss carry their name beside the point (left of it in the right half of
// the plot), moved apart vertically by at least a line so the names never overlap.
void paint_shared_labels(QPainter& painter, const Panel& pn,
                         const std::vector<std::pair<QPointF, QString>>& points,
                         const QColor& text) {
  const QFont base_font = painter.font();
  QFont small = base_font;
  small.setPointSizeF(small.pointSizeF() * 0.85);
  painter.setFont(small);
  const QFontMetrics sfm(small);
  std::vector<std::pair<QPointF, QString>> labels;
  for (const auto& [v, name] : points) labels.emplace_back(pn.to_px(v.x(), v.y()), name);
  std::sort(labels.begin(), labels.end(), [](const auto& a, const auto& b) {
    return a.first.x() < b.first.x() || (a.first.x() == b.first.x() && a.first.y() < b.first.y());
  });
  double last_y = -INFINITY, last_x = NAN;
  painter.setPen(text);
  for (const auto& [p, level] : labels) {
    double y = p.y();
    if (p.x() == last_x) y = std::max(y, last_y + sfm.height());
    last_y = y;
    last_x = p.x();
    const double w = sfm.horizontalAdvance(level) + 2;
    const bool left = p.x() > pn.plot.center().x();
    const QRectF box(left ? p.x() - 7 - w : p.x() + 7, y - sfm.height() / 2.0, w, sfm.height());
    painter.drawText(box, (left ? Qt::AlignRight : Qt::AlignLeft) | Qt::AlignVCenter, level);
  }
  painter.setFont(base_font);
}

}  // namespace

void TrendPlot::paint_into(QPainter& painter, const QRect& area) const {
  painter.save();
  painter.setRenderHint(QPainter::Antialiasing, true);
  const QColor text = palette().windowText().color();
  const int x_col = column_of(table_, KeyNumber::kBoneLoss);
  const std::vector<KeyNumber> keys = plotted_key_numbers();
  const int n = static_cast<int>(keys.size());
  // Three panels a row when each gets a readable width, else two.
  const int cols = n > 4 ? (area.width() >= 3 * 150 ? 3 : 2) : n;
  const int rows = (n + cols - 1) / std::max(1, cols);
  const QFontMetrics fm(painter.font());
  const int line = fm.height();
  if (x_col < 0 || table_.values.empty() || n == 0) {
    painter.setPen(text);
    painter.drawText(area, Qt::AlignCenter, QStringLiteral("No results to plot yet."));
    painter.restore();
    return;
  }
  const std::vector<bool> shared = shares_bone_loss(table_);
  const double cell_w = area.width() / static_cast<double>(cols);
  const double cell_h = area.height() / static_cast<double>(rows);
  std::vector<double> xs;
  for (const auto& row : table_.values) xs.push_back(row[static_cast<size_t>(x_col)]);
  Panel pn;
  pn.line = line;
  pn.x0 = *std::min_element(xs.begin(), xs.end());
  pn.x1 = *std::max_element(xs.begin(), xs.end());
  if (!(pn.x1 > pn.x0)) pn.x1 = pn.x0 + 1;
  const double xpad = 0.06 * (pn.x1 - pn.x0);
  pn.x0 -= xpad;
  pn.x1 += xpad;
  for (int k = 0; k < n; ++k) {
    const int c = column_of(table_, keys[static_cast<size_t>(k)]);
    pn.cell =
        QRectF(area.left() + (k % cols) * cell_w, area.top() + (k / cols) * cell_h, cell_w, cell_h);
    // The title whole: on one line, or wrapped on two when the panel is too narrow for one; the
    // plot starts below it.
    const QString name = title(keys[static_cast<size_t>(k)]);
    const QString unit = QStringLiteral("(") + unit_label(keys[static_cast<size_t>(k)]) + ')';
    const double room = pn.cell.width() - 4;
    const int title_lines = fm.horizontalAdvance(name + ' ' + unit) > room ? 2 : 1;
    pn.plot = QRectF(pn.cell.left() + fm.horizontalAdvance(QStringLiteral("0000.0")) + 8,
                     pn.cell.top() + title_lines * line + 6,
                     pn.cell.width() - fm.horizontalAdvance(QStringLiteral("0000.0")) - 20,
                     pn.cell.height() - (2 + title_lines) * line - 14);
    painter.setPen(text);
    painter.drawText(QRectF(pn.cell.left() + 2, pn.cell.top() + 2, room, title_lines * line),
                     Qt::AlignHCenter | Qt::AlignTop | Qt::TextWordWrap, name + ' ' + unit);
    if (c < 0 || pn.plot.height() < 20 || pn.plot.width() < 20) continue;
    std::vector<QPointF> values;
    std::vector<std::pair<QPointF, QString>> shared_points;
    for (size_t r = 0; r < table_.values.size(); ++r) {
      const double v = table_.values[r][static_cast<size_t>(c)];
      if (!std::isfinite(v)) continue;
      values.emplace_back(xs[r], v);
      if (shared[r])
        shared_points.emplace_back(values.back(), table_.row_names[static_cast<int>(r)]);
    }
    painter.setPen(QPen(QColor(150, 150, 150), 1));
    painter.setBrush(Qt::NoBrush);
    painter.drawRect(pn.plot);
    if (values.empty()) {
      painter.setPen(text);
      painter.drawText(pn.plot, Qt::AlignCenter, QStringLiteral("n/a"));
      continue;
    }
    const AxisSpan span = value_axis(keys[static_cast<size_t>(k)]);
    pn.y0 = span.lo;
    pn.y1 = span.hi;
    paint_panel_axes(painter, pn, text);
    paint_panel_series(painter, pn, values, kLineColour, kPointColour);
    paint_shared_labels(painter, pn, shared_points, text);
  }
  painter.restore();
}

}  // namespace sharpey::app
