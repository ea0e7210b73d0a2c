// Small multiples of the key numbers against bone loss (one panel per number, one point per
// scenario), drawn with QPainter; also into the PDF report.
#pragma once

#include <QWidget>

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

 protected:
  void paintEvent(QPaintEvent* event) override;

 private:
  ScenarioTable table_;
};

}  // namespace sharpey::app
