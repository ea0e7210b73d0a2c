#include "core/verdict.h"

#include "core/units.h"

namespace sharpey::app {

namespace {
QString kpa(double v) { return with_unit(v, QStringLiteral("kPa"), 1); }
QString mm2(double v) { return with_unit(v, QString::fromUtf8("mm\u00b2"), 1); }
QString percent_of(double part, double whole) {
  if (!(whole > 0)) return QStringLiteral("n/a");
  return with_unit(100.0 * part / whole, QStringLiteral("%"), 0);
}
}  // namespace

QString short_label(VerdictLevel level) {
  switch (level) {
    case VerdictLevel::kBelowCapillary: return QStringLiteral("below capillary pressure");
    case VerdictLevel::kAboveCapillary: return QStringLiteral("capillary pressure passed");
    case VerdictLevel::kAboveLimit: return QStringLiteral("physiological limit passed");
  }
  return {};
}

Verdict judge(const analysis::ScenarioResult& r, const analysis::Thresholds& t) {
  Verdict v;
  const double peak = r.pressure_max_compression_kpa;
  const double cap = t.capillary.value_kpa, lim = t.limit.value_kpa;
  if (peak >= lim && r.area_above_limit_mm2 > 0) {
    v.level = VerdictLevel::kAboveLimit;
    v.headline = QStringLiteral("Too much compression");
    v.detail = QStringLiteral("Peak compression %1 exceeds the physiological limit %2 over %3 "
                              "(%4 of the attachment). Consider a lighter force or a different "
                              "moment-to-force ratio.")
                   .arg(kpa(peak), kpa(lim), mm2(r.area_above_limit_mm2),
                        percent_of(r.area_above_limit_mm2, r.attachment_area_mm2));
  } else if (peak >= cap && r.area_above_capillary_mm2 > 0) {
    v.level = VerdictLevel::kAboveCapillary;
    v.headline = QStringLiteral("Capillary pressure passed locally");
    v.detail = QStringLiteral("Peak compression %1 stays under the physiological limit %2 but "
                              "passes capillary pressure %3 over %4 (%5 of the attachment), where "
                              "ligament vessels may be squeezed.")
                   .arg(kpa(peak), kpa(lim), kpa(cap), mm2(r.area_above_capillary_mm2),
                        percent_of(r.area_above_capillary_mm2, r.attachment_area_mm2));
  } else {
    v.level = VerdictLevel::kBelowCapillary;
    v.headline = QStringLiteral("Compression below capillary pressure");
    v.detail = QStringLiteral("Peak compression %1 stays under capillary pressure %2 everywhere on "
                              "the root.")
                   .arg(kpa(peak), kpa(cap));
  }
  return v;
}

}  // namespace sharpey::app
