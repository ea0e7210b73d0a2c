#include "view/findings_panel.h"

#include <QGridLayout>
#include <QLabel>
#include <QVBoxLayout>
#include <cmath>

#include "core/units.h"
#include "sharpey/output/report_output.h"

namespace sharpey::app {

QColor verdict_background(VerdictLevel level) {
  switch (level) {
    case VerdictLevel::kBelowCapillary:
      return QColor(0x5e, 0x8c, 0x6a);  // sage
    case VerdictLevel::kAboveCapillary:
      return QColor(0xc2, 0x8a, 0x1e);  // ochre
    case VerdictLevel::kAboveLimit:
      return QColor(0x9c, 0x3b, 0x2e);  // brick
  }
  return Qt::gray;
}

std::vector<std::pair<QString, QString>> key_number_rows(const analysis::ScenarioResult& r,
                                                         bool reference_pending) {
  const QString mm = QStringLiteral("mm"), kpa = QStringLiteral("kPa"),
                mm2 = QString::fromUtf8("mm\u00b2"), um = QString::fromUtf8("\u00b5m"),
                g = QStringLiteral("g");
  const analysis::CentreOfResistance& cres = analysis::cres_for(r);
  const bool mesiodistal = &cres == &r.cres_mesiodistal;
  std::vector<std::pair<QString, QString>> rows = {
      {QStringLiteral("bone loss"), with_unit(r.bone_loss_mm, mm, 1)},
      {QStringLiteral("attachment area"), with_unit(r.attachment_area_mm2, mm2, 0)},
      {QStringLiteral("peak compression"), with_unit(r.pressure_max_compression_kpa, kpa, 1)},
      {QStringLiteral("95th pct. compression"), with_unit(r.pressure_p95_compression_kpa, kpa, 1)},
      {QStringLiteral("peak tension"), with_unit(r.pressure_max_tension_kpa, kpa, 1)},
      {QStringLiteral("above capillary pressure"),
       with_unit(r.area_above_capillary_mm2, mm2, 1) + QStringLiteral(" (") +
           with_unit(r.area_above_capillary_percent, QStringLiteral("%"), 0) + ')'},
      {QStringLiteral("above physiological limit"),
       with_unit(r.area_above_limit_mm2, mm2, 1) + QStringLiteral(" (") +
           with_unit(r.area_above_limit_percent, QStringLiteral("%"), 0) + ')'},
      // Left out while a slider moves (only the field on display is evaluated then).
      {QStringLiteral("max. principal strain"),
       std::isfinite(r.max_principal_strain)
           ? with_unit(100 * r.max_principal_strain, QStringLiteral("%"), 2)
           : QStringLiteral("when the slider stops")},
      {QStringLiteral("max. von Mises stress"), std::isfinite(r.max_von_mises_kpa)
                                                    ? with_unit(r.max_von_mises_kpa, kpa, 1)
                                                    : QStringLiteral("when the slider stops")},
      {mesiodistal ? QStringLiteral("CRes (mesiodistal)") : QStringLiteral("CRes (labiolingual)"),
       with_unit(cres.from_crest_mm, mm, 1) + QStringLiteral(" below crest, ") +
           with_unit(100 * cres.fraction_embedded, QStringLiteral("%"), 0) +
           QStringLiteral(" of embedded root")},
      {QStringLiteral("M/F for translation"), with_unit(r.mf_translation_mm, mm, 1)},
      {QStringLiteral("M/F applied"), with_unit(r.load.moment_to_force_mm, mm, 1)},
      {QStringLiteral("centre of rotation"),
       r.centre_of_rotation_defined
           ? with_unit(-r.centre_of_rotation.z(), mm, 1) + QStringLiteral(" below the CEJ")
           : QStringLiteral("none (translation or pure rotation)")},
      {QStringLiteral("crown tip displacement"),
       with_unit(r.crown_tip_displacement_um.norm(), um, 1)},
      {QStringLiteral("apex displacement"), with_unit(r.apex_displacement_um.norm(), um, 1)},
  };
  if (r.equivalent_force_peak_g >= 0) {
    rows.push_back({QStringLiteral("equivalent force (same peak)"),
                    with_unit(r.equivalent_force_peak_g, g, 0)});
    rows.push_back({QStringLiteral("equivalent force (area rule)"),
                    with_unit(r.equivalent_force_area_rule_g, g, 0)});
  } else if (reference_pending) {
    const QString later = QStringLiteral("when the slider stops");
    rows.push_back({QStringLiteral("equivalent force (same peak)"), later});
    rows.push_back({QStringLiteral("equivalent force (area rule)"), later});
  }
  return rows;
}

FindingsPanel::FindingsPanel(QWidget* parent) : QWidget(parent) {
  auto* outer = new QVBoxLayout(this);
  scenario_ = new QLabel;
  scenario_->setStyleSheet(QStringLiteral("font-weight: bold; font-size: 11pt;"));
  scenario_->setWordWrap(true);
  outer->addWidget(scenario_);
  badge_ = new QLabel;
  badge_->setWordWrap(true);
  badge_->setMargin(6);
  outer->addWidget(badge_);
  detail_ = new QLabel;
  detail_->setWordWrap(true);
  outer->addWidget(detail_);
  stale_ =
      new QLabel(QStringLiteral("These numbers belong to the last solve, not to the edited "
                                "geometry."));
  stale_->setWordWrap(true);
  stale_->setStyleSheet(QStringLiteral("background: #f6e7c1; color: #5b4100; padding: 4px;"));
  outer->addWidget(stale_);
  numbers_ = new QWidget;
  grid_ = new QGridLayout(numbers_);
  grid_->setContentsMargins(0, 6, 0, 0);
  grid_->setVerticalSpacing(3);
  outer->addWidget(numbers_);
  outer->addStretch(1);
  clear();
}

void FindingsPanel::clear() {
  scenario_->setText(QStringLiteral("No results yet"));
  badge_->clear();
  badge_->setStyleSheet(QString());
  detail_->setText(QStringLiteral("Open a case or a sample; it is meshed and solved at once."));
  stale_->hide();
  clear_rows();
}

void FindingsPanel::clear_rows() {
  while (QLayoutItem* item = grid_->takeAt(0)) {
    delete item->widget();
    delete item;
  }
  rows_.clear();
}

void FindingsPanel::show_result(const analysis::ScenarioResult& r, const analysis::Thresholds& t,
                                bool stale, bool reference_pending) {
  scenario_->setText(QStringLiteral("Bone level: ") + QString::fromStdString(r.name));
  const Verdict v = judge(r, t);
  const QColor back = verdict_background(v.level);
  badge_->setText(v.headline);
  // A style sheet set again restyles the label even when it is the same: only on a change.
  const QString badge_style =
      QStringLiteral("background: %1; color: white; font-weight: bold; border-radius: 4px;")
          .arg(back.name());
  if (badge_->styleSheet() != badge_style) badge_->setStyleSheet(badge_style);
  // A scenario whose ligament strain leaves the linear range says so beside the verdict.
  detail_->setText(r.beyond_linear_range
                       ? v.detail + QStringLiteral("\n\n") +
                             QString::fromStdString(analysis::beyond_linear_range_text(r))
                       : v.detail);
  stale_->setVisible(stale);
  const auto rows = key_number_rows(r, reference_pending);
  if (rows.size() != rows_.size()) {
    clear_rows();
    int row = 0;
    for (size_t k = 0; k < rows.size(); ++k) {
      auto* l = new QLabel;
      l->setStyleSheet(QStringLiteral("color: #444;"));
      auto* n = new QLabel;
      n->setTextInteractionFlags(Qt::TextSelectableByMouse);
      n->setWordWrap(true);
      grid_->addWidget(l, row, 0, Qt::AlignTop);
      grid_->addWidget(n, row, 1, Qt::AlignTop);
      rows_.emplace_back(l, n);
      ++row;
    }
  }
  for (size_t k = 0; k < rows.size(); ++k) {
    rows_[k].first->setText(rows[k].first);  // QLabel::setText returns at once on equal text
    rows_[k].second->setText(rows[k].second);
  }
}

QString FindingsPanel::headline() const { return badge_->text(); }

QString FindingsPanel::numbers_text() const {
  QString out;
  for (int i = 0; i < grid_->count(); ++i)
    if (auto* l = qobject_cast<QLabel*>(grid_->itemAt(i)->widget())) out += l->text() + '\n';
  return out;
}

}  // namespace sharpey::app
