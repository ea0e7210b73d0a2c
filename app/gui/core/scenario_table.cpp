#include "core/scenario_table.h"

#include <cmath>
#include <limits>

#include "sharpey/output/report_output.h"

namespace sharpey::app {

namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

double or_nan(double v) { return v < 0 ? kNaN : v; }
}  // namespace

std::vector<KeyNumber> all_key_numbers() {
  return {KeyNumber::kBoneLoss,
          KeyNumber::kAttachmentArea,
          KeyNumber::kPeakCompression,
          KeyNumber::kPeakTension,
          KeyNumber::kAreaAboveCapillary,
          KeyNumber::kAreaAboveLimit,
          KeyNumber::kCresFromCrest,
          KeyNumber::kCresFraction,
          KeyNumber::kMfTranslation,
          KeyNumber::kEquivalentForcePeak,
          KeyNumber::kEquivalentForceArea,
          KeyNumber::kCrownTipDisplacement};
}

std::vector<KeyNumber> plotted_key_numbers() {
  return {KeyNumber::kPeakCompression, KeyNumber::kAreaAboveCapillary,  KeyNumber::kCresFromCrest,
          KeyNumber::kMfTranslation,   KeyNumber::kEquivalentForcePeak, KeyNumber::kAttachmentArea};
}

QString title(KeyNumber k) {
  switch (k) {
    case KeyNumber::kBoneLoss:
      return QStringLiteral("bone loss");
    case KeyNumber::kAttachmentArea:
      return QStringLiteral("attachment area");
    case KeyNumber::kPeakCompression:
      return QStringLiteral("peak compression");
    case KeyNumber::kPeakTension:
      return QStringLiteral("peak tension");
    case KeyNumber::kAreaAboveCapillary:
      return QStringLiteral("area above capillary pressure");
    case KeyNumber::kAreaAboveLimit:
      return QStringLiteral("area above physiological limit");
    case KeyNumber::kCresFromCrest:
      return QStringLiteral("CRes below crest");
    case KeyNumber::kCresFraction:
      return QStringLiteral("CRes, share of embedded root");
    case KeyNumber::kMfTranslation:
      return QStringLiteral("M/F for translation");
    case KeyNumber::kEquivalentForcePeak:
      return QStringLiteral("equivalent force (same peak)");
    case KeyNumber::kEquivalentForceArea:
      return QStringLiteral("equivalent force (area rule)");
    case KeyNumber::kCrownTipDisplacement:
      return QStringLiteral("crown tip displacement");
  }
  return {};
}

QString unit_label(KeyNumber k) {
  switch (k) {
    case KeyNumber::kBoneLoss:
      return QStringLiteral("mm");
    case KeyNumber::kAttachmentArea:
      return QString::fromUtf8("mm\u00b2");
    case KeyNumber::kPeakCompression:
      return QStringLiteral("kPa");
    case KeyNumber::kPeakTension:
      return QStringLiteral("kPa");
    case KeyNumber::kAreaAboveCapillary:
      return QString::fromUtf8("mm\u00b2");
    case KeyNumber::kAreaAboveLimit:
      return QString::fromUtf8("mm\u00b2");
    case KeyNumber::kCresFromCrest:
      return QStringLiteral("mm");
    case KeyNumber::kCresFraction:
      return QStringLiteral("%");
    case KeyNumber::kMfTranslation:
      return QStringLiteral("mm");
    case KeyNumber::kEquivalentForcePeak:
      return QStringLiteral("g");
    case KeyNumber::kEquivalentForceArea:
      return QStringLiteral("g");
    case KeyNumber::kCrownTipDisplacement:
      return QString::fromUtf8("\u00b5m");
  }
  return {};
}

int decimals(KeyNumber k) {
  switch (k) {
    case KeyNumber::kBoneLoss:
      return 1;
    case KeyNumber::kAttachmentArea:
      return 0;
    case KeyNumber::kPeakCompression:
      return 1;
    case KeyNumber::kPeakTension:
      return 1;
    case KeyNumber::kAreaAboveCapillary:
      return 1;
    case KeyNumber::kAreaAboveLimit:
      return 1;
    case KeyNumber::kCresFromCrest:
      return 1;
    case KeyNumber::kCresFraction:
      return 0;
    case KeyNumber::kMfTranslation:
      return 1;
    case KeyNumber::kEquivalentForcePeak:
      return 0;
    case KeyNumber::kEquivalentForceArea:
      return 0;
    case KeyNumber::kCrownTipDisplacement:
      return 1;
  }
  return 1;
}

double key_value(const analysis::ScenarioResult& r, KeyNumber k) {
  switch (k) {
    case KeyNumber::kBoneLoss:
      return r.bone_loss_mm;
    case KeyNumber::kAttachmentArea:
      return r.attachment_area_mm2;
    case KeyNumber::kPeakCompression:
      return r.pressure_max_compression_kpa;
    case KeyNumber::kPeakTension:
      return r.pressure_max_tension_kpa;
    case KeyNumber::kAreaAboveCapillary:
      return r.area_above_capillary_mm2;
    case KeyNumber::kAreaAboveLimit:
      return r.area_above_limit_mm2;
    case KeyNumber::kCresFromCrest:
      return analysis::cres_for(r).from_crest_mm;
    case KeyNumber::kCresFraction:
      return 100.0 * analysis::cres_for(r).fraction_embedded;
    case KeyNumber::kMfTranslation:
      return r.mf_translation_mm;
    case KeyNumber::kEquivalentForcePeak:
      return or_nan(r.equivalent_force_peak_g);
    case KeyNumber::kEquivalentForceArea:
      return or_nan(r.equivalent_force_area_rule_g);
    case KeyNumber::kCrownTipDisplacement:
      return r.crown_tip_displacement_um.norm();
  }
  return kNaN;
}

QString ScenarioTable::cell_text(int row, int column) const {
  const double v = values[static_cast<size_t>(row)][static_cast<size_t>(column)];
  if (!std::isfinite(v)) return QStringLiteral("n/a");
  return QString::number(v, 'f', decimals(columns[static_cast<size_t>(column)]));
}

QString ScenarioTable::header_text(int column) const {
  const KeyNumber k = columns[static_cast<size_t>(column)];
  return title(k) + QStringLiteral(" (") + unit_label(k) + ')';
}

QString ScenarioTable::to_csv(const QStringList& comment) const {
  auto quote = [](QString s) {
    if (s.contains(',') || s.contains('"')) s = '"' + s.replace('"', QStringLiteral("\"\"")) + '"';
    return s;
  };
  QString out;
  for (const QString& line : comment) out += QStringLiteral("# ") + line + '\n';
  out += QStringLiteral("scenario");
  for (int c = 0; c < static_cast<int>(columns.size()); ++c) out += ',' + quote(header_text(c));
  out += '\n';
  for (int r = 0; r < row_names.size(); ++r) {
    out += quote(row_names[r]);
    for (int c = 0; c < static_cast<int>(columns.size()); ++c) out += ',' + cell_text(r, c);
    out += '\n';
  }
  return out;
}

ScenarioTable make_table(const std::vector<analysis::ScenarioResult>& results,
                         const std::vector<KeyNumber>& columns) {
  ScenarioTable t;
  t.columns = columns;
  for (const auto& r : results) {
    t.row_names.append(QString::fromStdString(r.name));
    std::vector<double> row;
    for (KeyNumber k : columns) row.push_back(key_value(r, k));
    t.values.push_back(row);
  }
  return t;
}

}  // namespace sharpey::app
