#include "view/icons.h"

#include <QPainter>
#include <QPainterPath>
#include <QPixmap>

namespace sharpey::app {

namespace {

const QColor kInk(44, 62, 80);
const QColor kAccent(201, 111, 43);
const QColor kPaper(250, 248, 242);

// A sheet of paper with a folded corner, in a 32 x 32 box.
void sheet(QPainter& p) {
  QPainterPath path;
  path.moveTo(7, 3);
  path.lineTo(20, 3);
  path.lineTo(26, 9);
  path.lineTo(26, 29);
  path.lineTo(7, 29);
  path.closeSubpath();
  p.setBrush(kPaper);
  p.setPen(QPen(kInk, 1.6));
  p.drawPath(path);
  p.drawLine(QPointF(20, 3), QPointF(20, 9));
  p.drawLine(QPointF(20, 9), QPointF(26, 9));
}

// A tooth outline (crown above, one tapering root), used by the app and solve icons.
void tooth(QPainter& p, const QColor& fill) {
  QPainterPath path;
  path.moveTo(9, 4);
  path.cubicTo(12, 2, 20, 2, 23, 4);
  path.cubicTo(25, 9, 24, 13, 21, 16);
  path.cubicTo(20, 22, 18, 28, 16, 30);
  path.cubicTo(14, 28, 12, 22, 11, 16);
  path.cubicTo(8, 13, 7, 9, 9, 4);
  p.setBrush(fill);
  p.setPen(QPen(kInk, 1.6));
  p.drawPath(path);
}

// One function per icon, drawing on a 32 x 32 transparent pixmap.
void draw_new(QPainter& p) {
  sheet(p);
  p.setPen(QPen(kAccent, 2.4));
  p.drawLine(QPointF(16.5, 13), QPointF(16.5, 24));
  p.drawLine(QPointF(11, 18.5), QPointF(22, 18.5));
}

void draw_open(QPainter& p) {
  p.setPen(QPen(kInk, 1.6));
  p.setBrush(QColor(231, 196, 120));
  p.drawRect(QRectF(3, 9, 26, 18));
  p.drawRect(QRectF(3, 6, 10, 4));
  p.setBrush(QColor(244, 219, 158));
  QPainterPath flap;
  flap.moveTo(6, 14);
  flap.lineTo(31, 14);
  flap.lineTo(27, 27);
  flap.lineTo(3, 27);
  flap.closeSubpath();
  p.drawPath(flap);
}

void draw_save(QPainter& p) {
  p.setPen(QPen(kInk, 1.6));
  p.setBrush(QColor(223, 230, 238));
  p.drawRoundedRect(QRectF(4, 4, 24, 24), 3, 3);
  p.setPen(QPen(kAccent, 2.6));
  p.drawLine(QPointF(16, 8), QPointF(16, 20));
  p.drawLine(QPointF(11, 15.5), QPointF(16, 20.5));
  p.drawLine(QPointF(21, 15.5), QPointF(16, 20.5));
  p.setPen(QPen(kInk, 1.6));
  p.drawLine(QPointF(9, 24), QPointF(23, 24));
}

void draw_solve(QPainter& p) {
  tooth(p, kPaper);
  p.setPen(QPen(kAccent, 2.2));
  p.drawLine(QPointF(2, 9), QPointF(10, 9));
  p.drawLine(QPointF(7, 6), QPointF(10, 9));
  p.drawLine(QPointF(7, 12), QPointF(10, 9));
}

void draw_cancel(QPainter& p) {
  p.setPen(QPen(QColor(156, 59, 46), 3.0));
  p.drawEllipse(QRectF(5, 5, 22, 22));
  p.drawLine(QPointF(11, 11), QPointF(21, 21));
  p.drawLine(QPointF(21, 11), QPointF(11, 21));
}

void draw_image(QPainter& p) {
  p.setPen(QPen(kInk, 1.6));
  p.setBrush(kPaper);
  p.drawRect(QRectF(3, 6, 26, 20));
  p.setPen(Qt::NoPen);
  p.setBrush(QColor(82, 122, 148));
  p.drawPolygon(QPolygonF(
      {QPointF(5, 24), QPointF(13, 13), QPointF(19, 20), QPointF(22, 17), QPointF(27, 24)}));
  p.setBrush(kAccent);
  p.drawEllipse(QRectF(20, 8, 5, 5));
}

void draw_report(QPainter& p) {
  sheet(p);
  p.setPen(QPen(kInk, 1.2));
  for (int i = 0; i < 4; ++i) p.drawLine(QPointF(10, 13 + 4 * i), QPointF(23, 13 + 4 * i));
  p.setPen(QPen(kAccent, 2.0));
  p.drawLine(QPointF(10, 9), QPointF(17, 9));
}

void draw_export_data(QPainter& p) {
  sheet(p);
  p.setPen(QPen(kInk, 1.0));
  for (int r = 0; r < 4; ++r)
    for (int c = 0; c < 3; ++c) p.drawRect(QRectF(9.5 + 5 * c, 12 + 4 * r, 5, 4));
}

void draw_app(QPainter& p) {
  tooth(p, QColor(238, 232, 214));
  p.setPen(Qt::NoPen);
  p.setBrush(QColor(176, 72, 40, 200));
  p.drawEllipse(QRectF(17, 17, 5, 7));
  p.setBrush(QColor(36, 96, 120, 200));
  p.drawEllipse(QRectF(10, 17, 5, 7));
}

}  // namespace

QIcon make_icon(IconKind kind) {
  QPixmap pixmap(32, 32);
  pixmap.fill(Qt::transparent);
  QPainter p(&pixmap);
  p.setRenderHint(QPainter::Antialiasing, true);
  switch (kind) {
    case IconKind::kNew:
      draw_new(p);
      break;
    case IconKind::kOpen:
      draw_open(p);
      break;
    case IconKind::kSave:
      draw_save(p);
      break;
    case IconKind::kSolve:
      draw_solve(p);
      break;
    case IconKind::kCancel:
      draw_cancel(p);
      break;
    case IconKind::kImage:
      draw_image(p);
      break;
    case IconKind::kReport:
      draw_report(p);
      break;
    case IconKind::kExportData:
      draw_export_data(p);
      break;
    case IconKind::kApp:
      draw_app(p);
      break;
  }
  return QIcon(pixmap);
}

}  // namespace sharpey::app
