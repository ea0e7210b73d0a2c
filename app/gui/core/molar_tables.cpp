#include "core/molar_tables.h"

#include <cmath>
#include <functional>
#include <limits>

#include "core/units.h"
#include "sharpey/analysis/verdict.h"

namespace sharpey::app {

namespace {

constexpr double kNone = std::numeric_limits<double>::quiet_NaN();

QString kpa(double v) { return QString::number(v, 'g', 3); }

// A movement's allowance converted: couples (uprighting) in unit mm, forces in unit.
double allowance_in(analysis::MolarMovement m, double base_value, analysis::ForceUnit unit) {
  if (std::isinf(base_value)) return base_value;
  return m == analysis::MolarMovement::kUprighting ? analysis::moment_from_nmm(base_value, unit)
                                                   : analysis::from_newton(base_value, unit);
}

}  // namespace

QString molar_method_label() {
  return QStringLiteral(
      "Thin-layer estimate (rigid tooth and bone, the ligament as springs over the attached root "
      "surface): not a finite-element solution; its pressures compare scenarios and roots");
}

QString molar_tooth_name(mesh::MultiRootType type) {
  QString name = QString::fromStdString(mesh::to_string(type));
  name.replace(QLatin1Char('_'), QLatin1Char(' '));
  name[0] = name[0].toUpper();
  return name;
}

QString describe_molar_case(const analysis::MultiRootCase& spec) {
  return QStringLiteral("%1; %2 %3 %4")
      .arg(molar_tooth_name(spec.type), QString::fromStdString(analysis::to_string(spec.movement)))
      .arg(spec.magnitude)
      .arg(QString::fromStdString(spec.unit));
}

analysis::ForceUnit molar_case_force_unit(const analysis::MultiRootCase& spec) {
  if (spec.unit == "g" || spec.unit == "g mm") return analysis::ForceUnit::kGram;
  if (spec.unit == "cN") return analysis::ForceUnit::kCentinewton;
  return analysis::ForceUnit::kNewton;
}

MolarTable molar_root_table(const analysis::MultiRootScenarioResult& r,
                            const analysis::Thresholds& thresholds, analysis::ForceUnit unit) {
  std::vector<const analysis::RootFigures*> parts;
  MolarTable t;
  for (const analysis::RootFigures& f : r.result.roots) {
    parts.push_back(&f);
    t.columns << QString::fromStdString(f.name) + QStringLiteral(" root");
  }
  parts.push_back(&r.result.tooth);
  t.columns << QStringLiteral("whole tooth");
  t.decimals.assign(parts.size(), 1);
  const auto row = [&](const QString& name,
                       const std::function<double(const analysis::RootFigures&)>& pick) {
    MolarRow out{name, {}};
    for (const analysis::RootFigures* f : parts) out.values.push_back(pick(*f));
    t.rows.push_back(out);
  };
  row(QStringLiteral("attachment area (mm²)"),
      [](const analysis::RootFigures& f) { return f.attachment_area_mm2; });
  row(QStringLiteral("peak compression (kPa)"),
      [](const analysis::RootFigures& f) { return f.peak_compression_kpa; });
  row(QStringLiteral("peak tension (kPa)"),
      [](const analysis::RootFigures& f) { return f.peak_tension_kpa; });
  row(QStringLiteral("area above %1 kPa (mm²)").arg(kpa(thresholds.capillary.value_kpa)),
      [](const analysis::RootFigures& f) { return f.area_above_capillary_mm2; });
  row(QStringLiteral("area above %1 kPa (mm²)").arg(kpa(thresholds.limit.value_kpa)),
      [](const analysis::RootFigures& f) { return f.area_above_limit_mm2; });
  row(QStringLiteral("force carried (%1)").arg(force_unit_label(unit)),
      [unit](const analysis::RootFigures& f) {
        return analysis::from_newton(f.reaction_n.norm(), unit);
      });
  t.row_decimals = {1, 1, 1, 1, 1, force_decimals(unit) + 1};
  return t;
}

MolarTable molar_cres_table(const analysis::MultiRootScenarioResult& r) {
  MolarTable t;
  t.columns = {QStringLiteral("below CEJ (mm)"), QStringLiteral("below furcation (mm)")};
  t.decimals = {2, 2};
  t.rows.push_back({QStringLiteral("mesiodistal force"),
                    {r.cres_mesiodistal.below_cej_mm, r.cres_mesiodistal.below_furcation_mm}});
  t.rows.push_back({QStringLiteral("buccolingual force"),
                    {r.cres_buccolingual.below_cej_mm, r.cres_buccolingual.below_furcation_mm}});
  return t;
}

QString molar_movement_label(analysis::MolarMovement m, analysis::ForceUnit unit) {
  const QString name = QString::fromStdString(analysis::to_string(m));
  return m == analysis::MolarMovement::kUprighting
             ? QStringLiteral("%1 (couple, %2)").arg(name, moment_unit_label(unit))
             : QStringLiteral("%1 (force, %2)").arg(name, force_unit_label(unit));
}

MolarTable molar_allowance_table(const analysis::MultiRootScenarioResult& r,
                                 const analysis::Thresholds& thresholds, analysis::ForceUnit unit) {
  MolarTable t;
  t.columns = {QStringLiteral("peak ≤ %1 kPa").arg(kpa(thresholds.capillary.value_kpa)),
               QStringLiteral("peak ≤ %1 kPa").arg(kpa(thresholds.limit.value_kpa))};
  const int decimals = force_decimals(unit);
  t.decimals = {decimals, decimals};
  for (const analysis::MolarAllowance& a : r.allowances)
    t.rows.push_back(
        {molar_movement_label(a.movement, unit),
         {allowance_in(a.movement, a.capillary, unit), allowance_in(a.movement, a.limit, unit)}});
  return t;
}

MolarTable molar_fe_table(const analysis::MultiRootScenarioResult& r) {
  MolarTable t;
  if (!r.has_finite_elements) return t;
  const analysis::MultiRootFeFigures& fe = r.finite_elements;
  t.columns = {QStringLiteral("CRes below CEJ (mm)"), QStringLiteral("peak compr. (kPa)")};
  t.decimals = {2, 1};
  t.rows.push_back({QStringLiteral("mesiodistal force"), {fe.mesiodistal.below_cej_mm, kNone}});
  t.rows.push_back({QStringLiteral("buccolingual force"), {fe.buccolingual.below_cej_mm, kNone}});
  for (const analysis::RootFigures& f : fe.roots)
    t.rows.push_back({QString::fromStdString(f.name) + QStringLiteral(" root"),
                      {kNone, f.peak_compression_kpa}});
  t.rows.push_back({QStringLiteral("whole tooth"), {kNone, fe.tooth.peak_compression_kpa}});
  return t;
}

MolarTable molar_fe_area_table(const analysis::MultiRootScenarioResult& r,
                               const analysis::Thresholds& thresholds,
                               analysis::MolarMovement movement, analysis::ForceUnit unit) {
  MolarTable t;
  if (!r.has_finite_elements) return t;
  const analysis::MultiRootFeFigures& fe = r.finite_elements;
  std::vector<const analysis::RootFigures*> parts;
  for (const analysis::RootFigures& f : fe.roots) {
    parts.push_back(&f);
    t.columns << QString::fromStdString(f.name) + QStringLiteral(" root");
  }
  parts.push_back(&fe.tooth);
  t.columns << QStringLiteral("whole tooth");
  t.decimals.assign(parts.size(), 1);
  const auto row = [&](const QString& name, double analysis::RootFigures::*field) {
    MolarRow out{name, {}};
    for (const analysis::RootFigures* f : parts) out.values.push_back(f->*field);
    t.rows.push_back(out);
  };
  row(QStringLiteral("root-side PDL area (mm²)"), &analysis::RootFigures::attachment_area_mm2);
  row(QStringLiteral("area above %1 kPa (mm²)").arg(kpa(thresholds.capillary.value_kpa)),
      &analysis::RootFigures::area_above_capillary_mm2);
  row(QStringLiteral("area above %1 kPa (mm²)").arg(kpa(thresholds.limit.value_kpa)),
      &analysis::RootFigures::area_above_limit_mm2);
  const QString unit_label = movement == analysis::MolarMovement::kUprighting
                                 ? moment_unit_label(unit)
                                 : force_unit_label(unit);
  for (const auto& [threshold, allowance] :
       {std::pair{thresholds.capillary.value_kpa, fe.allowance_capillary},
        std::pair{thresholds.limit.value_kpa, fe.allowance_limit}}) {
    const double base = allowance < 0 ? std::numeric_limits<double>::infinity() : allowance;
    MolarRow out{QStringLiteral("case's load to %1 kPa (%2)").arg(kpa(threshold), unit_label),
                 std::vector<double>(parts.size(), kNone)};
    out.values.back() = allowance_in(movement, base, unit);
    t.rows.push_back(out);
  }
  const int d = force_decimals(unit);
  t.row_decimals = {0, 1, 1, d, d};
  return t;
}

QString molar_cell_text(double value, int decimals) {
  if (std::isnan(value)) return QStringLiteral("—");
  if (std::isinf(value)) return QStringLiteral("not limited");
  return QString::number(value, 'f', decimals);
}

std::vector<MolarMapPart> molar_map_parts(const mesh::MultiRootTooth& tooth,
                                          const std::vector<analysis::MultiRootMapCell>& cells) {
  std::vector<MolarMapPart> parts;
  parts.push_back({mesh::kTrunkPart, QStringLiteral("trunk"), {}});
  for (size_t k = 0; k < tooth.roots.size(); ++k)
    parts.push_back(
        {static_cast<int>(k),
         QString::fromStdString(analysis::multi_root_part_name(tooth, static_cast<int>(k))) +
             QStringLiteral(" root"),
         {}});
  for (const analysis::MultiRootMapCell& c : cells)
    parts[static_cast<size_t>(c.part + 1)].cells.push_back(c);
  return parts;
}

}  // namespace sharpey::app
