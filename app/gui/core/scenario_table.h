// The key numbers of the bone-level comparison as a table (rows = scenarios, columns = numbers
// with units), shared by the on-screen table, the trend plots, the CSV export and the PDF report.
#pragma once

#include <QString>
#include <QStringList>
#include <vector>

#include "sharpey/analysis/study.h"

namespace sharpey::app {

enum class KeyNumber {
  kBoneLoss,              // mm
  kAttachmentArea,        // mm^2
  kPeakCompression,       // kPa
  kPeakTension,           // kPa
  kAreaAboveCapillary,    // mm^2
  kAreaAboveLimit,        // mm^2
  kCresFromCrest,         // mm, for the force's dominant horizontal direction
  kCresFraction,          // % of the embedded root
  kMfTranslation,         // mm
  kEquivalentForcePeak,   // g
  kEquivalentForceArea,   // g
  kCrownTipDisplacement,  // um
};
std::vector<KeyNumber> all_key_numbers();
QString title(KeyNumber k);       // "peak compression"
QString unit_label(KeyNumber k);  // "kPa"
int decimals(KeyNumber k);
// Numbers drawn as trend plots against bone loss.
std::vector<KeyNumber> plotted_key_numbers();

// Value of one key number (NaN where it does not apply, e.g. no healthy reference).
double key_value(const analysis::ScenarioResult& r, KeyNumber k);

struct ScenarioTable {
  std::vector<KeyNumber> columns;
  QStringList row_names;
  std::vector<std::vector<double>> values;  // [row][column]
  // "12.3" or "n/a".
  QString cell_text(int row, int column) const;
  QString header_text(int column) const;  // "peak compression (kPa)"
  // CSV with a header line; `comment` lines (e.g. the caution) are written first with '# '.
  QString to_csv(const QStringList& comment) const;
};

ScenarioTable make_table(const std::vector<analysis::ScenarioResult>& results,
                         const std::vector<KeyNumber>& columns = all_key_numbers());

}  // namespace sharpey::app
