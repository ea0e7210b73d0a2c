// The root map: PDL hydrostatic pressure over the unwrapped root surface (angle around the root
// by depth below the CEJ) as a 2D image, the thresholds outlined, the part without ligament
// (above the crest) hatched. Drawn with QPainter, also into the PDF report.
#pragma once

#include <QWidget>

#include "core/colour_map.h"
#include "core/hover_readout.h"
#include "sharpey/analysis/study.h"

namespace sharpey::app {

class RootMapView : public QWidget {
  Q_OBJECT

 public:
  explicit RootMapView(QWidget* parent = nullptr);
  // `fixed_range` (optional) replaces the map's own pressure range (shared comparison scale).
  void set_map(const analysis::RootMap& map, const analysis::Thresholds& thresholds,
               const QString& title, const ValueRange* fixed_range = nullptr);
  void clear();
  bool has_map() const { return map_.n_angle > 0; }
  const ValueRange& range() const { return scale_.range(); }
  // Number of threshold outline segments drawn at the last paint (for tests).
  int n_outline_segments() const { return n_segments_; }

  // Paints the whole map (image, outlines, axes, legend, colour bar) into `rect`.
  void paint_into(QPainter& painter, const QRect& rect) const;
  QSize sizeHint() const override { return {820, 520}; }

  // The pressure and position under widget point `p` (as last painted); no position outside the
  // map's plot.
  HoverReadout readout_at(const QPoint& p) const;

 signals:
  // Text of the read-out under the mouse (empty when the mouse leaves the map).
  void hover_changed(const QString& text);

 protected:
  void paintEvent(QPaintEvent* event) override;
  void mouseMoveEvent(QMouseEvent* event) override;
  void leaveEvent(QEvent* event) override;

 private:
  analysis::RootMap map_;
  analysis::Thresholds thresholds_;
  QString title_;
  ColourScale scale_;
  mutable int n_segments_ = 0;
  mutable QRect plot_;  // where the map image was last painted, widget coordinates
};

}  // namespace sharpey::app
