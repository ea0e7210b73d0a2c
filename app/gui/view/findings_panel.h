// Findings: the key numbers of the scenario on display, each with its unit, and a plain verdict
// against the pressure thresholds in the app's own words and colours.
#pragma once

#include <QWidget>
#include <utility>
#include <vector>

#include "core/verdict.h"
#include "sharpey/analysis/study.h"

class QGridLayout;
class QLabel;

namespace sharpey::app {

class FindingsPanel : public QWidget {
  Q_OBJECT

 public:
  explicit FindingsPanel(QWidget* parent = nullptr);
  // reference_pending: the equivalent forces wait for the end of a slider drag
  // (CaseSession::reference_pending).
  void show_result(const analysis::ScenarioResult& result, const analysis::Thresholds& thresholds,
                   bool stale, bool reference_pending = false);
  void clear();
  // Text of the headline and of the numbers (for tests and the report).
  QString headline() const;
  QString numbers_text() const;

 private:
  QLabel* scenario_ = nullptr;
  QLabel* badge_ = nullptr;
  QLabel* detail_ = nullptr;
  QGridLayout* grid_ = nullptr;
  QWidget* numbers_ = nullptr;
  QLabel* stale_ = nullptr;
  // The key-number rows (name, value), kept while their count stays the same: a load change
  // during a slider drag only sets their texts (creating labels and laying them out again cost
  // more than the rest of the panel).
  std::vector<std::pair<QLabel*, QLabel*>> rows_;
  void clear_rows();
};

// Colours of the verdict levels (background, text): the app's own choice.
QColor verdict_background(VerdictLevel level);

// The key numbers of a result as (label, value with unit) rows, shared with the PDF report.
// reference_pending: rows for the equivalent forces say they follow when the slider stops.
std::vector<std::pair<QString, QString>> key_number_rows(const analysis::ScenarioResult& r,
                                                         bool reference_pending = false);

}  // namespace sharpey::app
