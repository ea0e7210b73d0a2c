#include "view/caution_label.h"

#include <QLabel>

#include "sharpey/output/report_output.h"

namespace sharpey::app {

QLabel* new_caution_label() {
  auto* label = new QLabel(QString::fromStdString(analysis::caution_text()));
  label->setWordWrap(true);
  label->setStyleSheet(
      QStringLiteral("background: #f6e7c1; color: #463200; padding: 6px; "
                     "border-left: 5px solid #9c6e14;"));
  return label;
}

}  // namespace sharpey::app
