#include "core/verdict.h"

namespace sharpey::app {

QString level_label(VerdictLevel level) {
  return QString::fromStdString(analysis::short_label(level));
}

Verdict judge(const analysis::ScenarioResult& r, const analysis::Thresholds& t) {
  const analysis::PressureVerdict pv = analysis::pressure_verdict(r, t);
  Verdict v;
  v.level = pv.level;
  v.headline = level_label(pv.level);
  v.headline[0] = v.headline[0].toUpper();
  v.detail = QString::fromStdString(analysis::verdict_words(pv, t, "mm\u00b2"));
  v.detail[0] = v.detail[0].toUpper();
  v.detail += '.';
  return v;
}

}  // namespace sharpey::app
