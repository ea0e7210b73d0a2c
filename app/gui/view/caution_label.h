// The caution (analysis::caution_text()) as the app's windows show it: always visible at the
// bottom, on the same tint as the caution box of the PDF report.
#pragma once

class QLabel;

namespace sharpey::app {

QLabel* new_caution_label();

}  // namespace sharpey::app
