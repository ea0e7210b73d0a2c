#include "view/colour_bar.h"

#include <QFontMetrics>
#include <QLinearGradient>
#include <QPainter>
#include <QPainterPath>
#include <QPolygonF>
#include <algorithm>
#include <cmath>

#include "core/axis_ticks.h"
#include "core/label_layout.h"

namespace sharpey::app {

namespace {
constexpr int kLeader = 8;  // px between a threshold name and the bar, for its leader line

// `font` made smaller by `factor`, in the unit it is given in: a pixel-sized font (the PDF report
// paints with one) has no point size, and giving it one (6 pt at 300 dpi) made the labels huge.
// The floor (6 pt or 6 px, for legibility) never makes the result larger than `font` itself.
QFont smaller(const QFont& font, double factor) {
  QFont out = font;
  if (font.pointSizeF() > 0) {
    const double pt = font.pointSizeF();
    out.setPointSizeF(std::max(std::min(6.0, pt), pt * factor));
  } else if (font.pixelSize() > 0) {
    const int px = font.pixelSize();
    out.setPixelSize(std::max(std::min(6, px), static_cast<int>(std::lround(px * factor))));
  }
  return out;
}
}  // namespace

QColor to_qcolor(const Rgb& rgb) {
  return QColor::fromRgbF(static_cast<float>(rgb[0]), static_cast<float>(rgb[1]),
                          static_cast<float>(rgb[2]));
}

std::vector<BarMark> pressure_threshold_marks(const analysis::Thresholds& thresholds) {
  return {{thresholds.capillary.value_kpa, QStringLiteral("capillary"),
           to_qcolor(capillary_line_colour()), Qt::DashLine, 2.0},
          {thresholds.limit.value_kpa, QStringLiteral("limit"), to_qcolor(limit_line_colour()),
           Qt::SolidLine, 3.0}};
}

ColourBar::ColourBar(QWidget* parent) : QWidget(parent) {
  setMinimumWidth(132);
  setSizePolicy(QSizePolicy::Fixed, QSizePolicy::Expanding);
}

void ColourBar::set_scale(const ColourScale& scale, const QString& title, const QString& unit) {
  scale_ = scale;
  title_ = title;
  unit_ = unit;
  has_scale_ = true;
  update();
}

void ColourBar::set_marks(const std::vector<BarMark>& marks) {
  marks_ = marks;
  update();
}

void ColourBar::clear() {
  has_scale_ = false;
  marks_.clear();
  note_.clear();
  update();
}

void ColourBar::set_note(const QString& note) {
  note_ = note;
  update();
}

void ColourBar::paintEvent(QPaintEvent*) {
  QPainter painter(this);
  painter.fillRect(rect(), palette().window());
  paint_into(painter, rect());
}

void ColourBar::paint_into(QPainter& painter, const QRect& area) const {
  if (!has_scale_) return;
  if (note_.isEmpty()) {
    draw(painter, area, scale_, title_, unit_, marks_, palette().windowText().color());
    return;
  }
  painter.save();
  const QFont small = smaller(painter.font(), 0.85);
  painter.setFont(small);
  const QRect room(area.left() + 4, area.top(), area.width() - 8, area.height());
  const QRect needed = QFontMetrics(small).boundingRect(room, Qt::TextWordWrap, note_);
  const QRect note_rect(room.left(), area.bottom() - needed.height() - 4, room.width(),
                        needed.height() + 2);
  painter.setPen(palette().windowText().color());
  painter.drawText(note_rect, Qt::AlignLeft | Qt::AlignTop | Qt::TextWordWrap, note_);
  painter.restore();
  draw(painter, QRect(area.left(), area.top(), area.width(), note_rect.top() - area.top() - 6),
       scale_, title_, unit_, marks_, palette().windowText().color());
}

QImage ColourBar::beside(const QImage& picture, const QColor& background) const {
  QImage out(picture.width() + width(), std::max(picture.height(), height()), QImage::Format_RGB32);
  out.fill(background);
  QPainter p(&out);
  p.drawImage(0, 0, picture);
  p.translate(picture.width(), 0);
  const_cast<ColourBar*>(this)->render(&p);
  return out;
}

namespace {

// The bar's geometry and value-to-height mapping.
struct BarFrame {
  QRect area, bar;
  ValueRange range;
  int line = 0;
  bool flat() const { return !(range.max > range.min); }
  double y_of(double v) const {
    if (flat()) return 0.5 * (bar.top() + bar.bottom());
    return bar.bottom() - (v - range.min) / (range.max - range.min) * bar.height();
  }
};

// The title (up to two lines) and the bold unit; returns the unit line's bottom.
int paint_bar_heading(QPainter& painter, const QRect& area, const QString& title,
                      const QString& unit, const QColor& text, int line) {
  const QRect titlerect(area.left() + 2, area.top() + 4, area.width() - 4, 2 * line);
  painter.setPen(text);
  painter.drawText(titlerect, Qt::AlignHCenter | Qt::AlignTop | Qt::TextWordWrap, title);
  const QFont base = painter.font();
  QFont bold = base;
  bold.setBold(true);
  painter.setFont(bold);
  const QRect unitrect(area.left(), titlerect.bottom() + 2, area.width(), line);
  painter.drawText(unitrect, Qt::AlignHCenter, QStringLiteral("[%1]").arg(unit));
  painter.setFont(base);
  return unitrect.bottom();
}

// One line of colour per pixel row, so the bar shows exactly the map's colours; then its frame.
void paint_gradient(QPainter& painter, const BarFrame& f, const ColourScale& scale) {
  const QRect& bar = f.bar;
  for (int y = bar.top(); y <= bar.bottom(); ++y) {
    const double t = f.flat() ? 0.5 : (bar.bottom() - y) / static_cast<double>(bar.height());
    const double v = f.range.min + t * (f.range.max - f.range.min);
    painter.setPen(to_qcolor(scale.colour(v)));
    painter.drawLine(bar.left(), y, bar.right(), y);
  }
  painter.setPen(QPen(QColor(40, 40, 40), 1));
  painter.setBrush(Qt::NoBrush);
  painter.drawRect(bar);
}

// Ticks with labels right of the bar, and the extremes written inside the frame's ends.
void paint_bar_ticks(QPainter& painter, const BarFrame& f, const QColor& text) {
  const QRect& bar = f.bar;
  const ValueRange& r = f.range;
  const int line = f.line;
  const int n_ticks = std::max(2, bar.height() / (2 * line));
  const double step = nice_step(r.min, r.max, n_ticks);
  for (double v : nice_ticks(r.min, r.max, n_ticks)) {
    const double y = f.y_of(v);
    painter.setPen(text);
    painter.drawLine(QPointF(bar.right(), y), QPointF(bar.right() + 4, y));
    painter.drawText(
        QRectF(bar.right() + 6, y - line / 2.0, f.area.right() - bar.right() - 6, line),
        Qt::AlignLeft | Qt::AlignVCenter, tick_label(v, step));
  }
  const QFont base = painter.font();
  painter.setFont(smaller(base, 0.85));
  painter.setPen(text);
  painter.drawText(QRect(f.area.left(), bar.top() - line - 2, f.area.width(), line),
                   Qt::AlignHCenter, QStringLiteral("max %1").arg(r.max, 0, 'f', 1));
  painter.drawText(QRect(f.area.left(), bar.bottom() + 2, f.area.width(), line), Qt::AlignHCenter,
                   QStringLiteral("min %1").arg(r.min, 0, 'f', 1));
  painter.setFont(base);  // the names were measured in this font
}

// Threshold marks across the bar; their names left of it (tick values are right of it). Each name
// sits just above its line; names that would overlap (thresholds close together on a wide range)
// are moved apart, kept beside the bar, and joined to their line by a leader.
void paint_bar_marks(QPainter& painter, const BarFrame& f, const std::vector<BarMark>& marks) {
  const QRect& bar = f.bar;
  const int line = f.line;
  std::vector<const BarMark*> shown;
  std::vector<double> wanted;
  for (const BarMark& m : marks) {
    if (m.value < f.range.min || m.value > f.range.max) continue;
    shown.push_back(&m);
    wanted.push_back(f.y_of(m.value) - line / 2.0);
  }
  const std::vector<double> centres =
      spread_labels(wanted, line, bar.top() - 1.0, bar.bottom() + 1.0);
  const double text_right = bar.left() - 7 - kLeader;
  for (size_t i = 0; i < shown.size(); ++i) {
    const BarMark& m = *shown[i];
    const double y = f.y_of(m.value);
    painter.setPen(QPen(m.colour, m.width, m.style));
    painter.drawLine(QPointF(bar.left() - 6, y), QPointF(bar.right(), y));
    painter.setPen(QPen(m.colour, 1));
    const double c = centres[i];
    // The leader: from the end of the name to the start of the line.
    if (std::abs(c - wanted[i]) > 0.5)
      painter.drawPolyline(QPolygonF(
          {QPointF(text_right + 1, c), QPointF(text_right + 3, c), QPointF(bar.left() - 6, y)}));
    painter.drawText(QRectF(f.area.left(), c - line / 2.0, text_right - f.area.left(), line),
                     Qt::AlignRight | Qt::AlignVCenter, m.text);
  }
}

}  // namespace

void ColourBar::draw(QPainter& painter, const QRect& area, const ColourScale& scale,
                     const QString& title, const QString& unit, const std::vector<BarMark>& marks,
                     const QColor& text) {
  painter.save();
  painter.setRenderHint(QPainter::Antialiasing, true);
  const QFontMetrics fm(painter.font());
  BarFrame f;
  f.area = area;
  f.line = fm.height();
  f.range = scale.range();
  // From the top: title (up to two lines), unit, "max", the bar, "min".
  const int top = paint_bar_heading(painter, area, title, unit, text, f.line) + f.line + 8;
  const int bottom = area.bottom() - f.line - 6;
  // Room left of the bar for the longest threshold name and its leader line.
  int names = 0;
  for (const BarMark& m : marks) names = std::max(names, fm.horizontalAdvance(m.text));
  f.bar =
      QRect(area.left() + std::max(46, names + kLeader + 12), top, 20, std::max(10, bottom - top));
  paint_gradient(painter, f, scale);
  paint_bar_ticks(painter, f, text);
  paint_bar_marks(painter, f, marks);
  painter.restore();
}

}  // namespace sharpey::app
