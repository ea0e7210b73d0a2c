// Small multiples of the key numbers against bone loss (one panel per number, one point per
// scenario), drawn with QPainter; also into the PDF report.
#pragma once

#include <QWidget>

#include "core/axis_ticks.h"
#include "core/scenario_table.h"

namespace sharpey::app {

class TrendPlot : public QWidget {
  Q_OBJECT

 public:
  explicit TrendPlot(QWidget* parent = nullptr);
  void set_table(const ScenarioTable& table);
  void paint_into(QPainter& painter, const QRect& rect) const;
  QSize sizeHint() const override { return {900, 320}; }
  // Panels drawn (numbers with at least one finite value), for tests.
  int n_panels() const;
  // The value axis of the panel of `k` (trend_axis_span of its values); {0, 0} when it has none.
  AxisSpan value_axis(KeyNumber k) const;
  // The levels whose points carry their name: those sharing a bone loss with another level
  // (e.g. a 4 mm loss with and without an angular defect), which would otherwise be told apart
  // by nothing.
  QStringList labelled_levels() const;

 protected:
  void paintEvent(QPaintEvent* event) override;

 private:
  ScenarioTable table_;
};

}  // namespace sharpey::app
