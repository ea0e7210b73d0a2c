// Vertical colour bar beside a 3D view: the colours of the current scale over the range that
// occurs, round-number ticks, the quantity and its unit, and the thresholds marked with the same
// line styles as their iso-lines. Drawn with QPainter.
#pragma once

#include <QColor>
#include <QString>
#include <QWidget>
#include <vector>

#include "core/colour_map.h"
#include "sharpey/analysis/case_spec.h"

namespace sharpey::app {

struct BarMark {
  double value = 0;
  QString text;  // e.g. "capillary 4.7"
  QColor colour;
  Qt::PenStyle style = Qt::SolidLine;
  double width = 2;
};

class ColourBar : public QWidget {
  Q_OBJECT

 public:
  explicit ColourBar(QWidget* parent = nullptr);
  void set_scale(const ColourScale& scale, const QString& title, const QString& unit);
  void set_marks(const std::vector<BarMark>& marks);
  // No scale: the bar is blank (nothing solved).
  void clear();
  bool has_scale() const { return has_scale_; }
  // A short note under the bar (e.g. on the crest edge band); empty: none.
  void set_note(const QString& note);
  const QString& note() const { return note_; }
  // The range shown (the scale's data range).
  const ValueRange& range() const { return scale_.range(); }
  const QString& unit() const { return unit_; }
  QSize sizeHint() const override { return {144, 300}; }

  // `picture` (a grabbed view) with this bar as shown drawn to its right, on `background`.
  QImage beside(const QImage& picture, const QColor& background) const;

  // Paints the bar into `rect` of any painter (also used by the PDF report).
  void paint_into(QPainter& painter, const QRect& rect) const;
  // Same drawing without a widget: scale, title, unit, marks, text colour.
  static void draw(QPainter& painter, const QRect& rect, const ColourScale& scale,
                   const QString& title, const QString& unit, const std::vector<BarMark>& marks,
                   const QColor& text);

 protected:
  void paintEvent(QPaintEvent* event) override;

 private:
  ColourScale scale_;
  QString title_, unit_;
  std::vector<BarMark> marks_;
  QString note_;
  bool has_scale_ = false;
};

QColor to_qcolor(const Rgb& rgb);

// The two pressure thresholds as bar marks: capillary dashed slate, limit solid black (the
// iso-lines' styles).
std::vector<BarMark> pressure_threshold_marks(const analysis::Thresholds& thresholds);

}  // namespace sharpey::app
