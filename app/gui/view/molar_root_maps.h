// The root maps of a multi-rooted tooth side by side: one small map per part (the trunk and each
// root), the angle around the part's own centre (0 buccal, 90 mesial) across and the depth below
// the CEJ down, one shared depth axis and one shared colour scale (the app's pressure map), cells
// above the capillary threshold outlined dashed and above the limit solid, cells with no
// ligament hatched. The cells are the library's (analysis::MultiRootScenarioResult::root_map: the
// largest pressure of the thin-layer estimate per 30-degree sector and 1 mm of depth). Drawn with
// QPainter, also into the PDF report.
#pragma once

#include <QWidget>
#include <vector>

#include "core/colour_map.h"
#include "core/molar_tables.h"

namespace sharpey::app {

class MolarRootMaps : public QWidget {
  Q_OBJECT

 public:
  explicit MolarRootMaps(QWidget* parent = nullptr);
  void set_maps(const std::vector<MolarMapPart>& parts, const analysis::Thresholds& thresholds,
                const QString& title);
  void clear();
  // Number of maps drawn (one per part) and their labels, for tests.
  int n_maps() const { return static_cast<int>(parts_.size()); }
  QStringList map_labels() const;
  // The shared colour scale's data range (kPa).
  const ValueRange& range() const { return scale_.range(); }

  // Paints the maps, their labels and the shared colour bar into `rect`.
  void paint_into(QPainter& painter, const QRect& rect) const;
  QSize sizeHint() const override { return {760, 360}; }

 protected:
  void paintEvent(QPaintEvent* event) override;

 private:
  void paint_part(QPainter& painter, const MolarMapPart& part, const QRect& plot) const;

  std::vector<MolarMapPart> parts_;
  analysis::Thresholds thresholds_;
  QString title_;
  ColourScale scale_;
  int depth_max_mm_ = 1;
};

}  // namespace sharpey::app
