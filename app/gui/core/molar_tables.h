// The tables the app and the PDF report show for a multi-rooted case (docs/molars.md): per-root
// figures, the centre of resistance, the allowance of each molar movement and the root map cells
// grouped by part. Every number is the analysis library's (analysis::evaluate_multi_root_case);
// here they are only picked, converted to the user's force unit and labelled. Plain logic, no
// widgets.
#pragma once

#include <QString>
#include <QStringList>
#include <vector>

#include "sharpey/analysis/case_spec.h"
#include "sharpey/analysis/multi_root_case.h"

namespace sharpey::app {

// One row: its name and one value per column (NaN: no value; +infinity: not limited).
struct MolarRow {
  QString name;
  std::vector<double> values;
};

struct MolarTable {
  QStringList columns;            // column titles, units included
  std::vector<int> decimals;      // per column
  std::vector<int> row_decimals;  // per row instead, when not empty
  std::vector<MolarRow> rows;
  int decimals_at(size_t row, size_t column) const {
    return row_decimals.empty() ? decimals[column] : row_decimals[row];
  }
};

// A column per root (in the tooth's order), then the whole tooth (trunk, furcation roof and
// roots); rows: attachment area mm^2, peak compression and tension kPa, area above the capillary
// and the limit thresholds mm^2, force the ligament carries on the part (length of its reaction)
// in `unit`.
MolarTable molar_root_table(const analysis::MultiRootScenarioResult& r,
                            const analysis::Thresholds& thresholds, analysis::ForceUnit unit);

// Centre of resistance for mesiodistal and buccolingual forces: mm below the CEJ and below the
// furcation plane (negative: above it).
MolarTable molar_cres_table(const analysis::MultiRootScenarioResult& r);

// The three molar movements: the largest magnitude keeping the tooth's peak compression at or
// below the capillary and the limit threshold, in `unit` (a couple in unit times mm for
// uprighting).
MolarTable molar_allowance_table(const analysis::MultiRootScenarioResult& r,
                                 const analysis::Thresholds& thresholds, analysis::ForceUnit unit);

// The finite-element figures when the case asked for them: CRes and peak compression per root.
MolarTable molar_fe_table(const analysis::MultiRootScenarioResult& r);

// The finite-element areas when the case asked for them (analysis/multi_root_fe.h), per root and
// for the whole tooth: root-side PDL area, areas above the two thresholds, and the case's
// `movement` to each threshold (whole tooth column; in `unit`, unit mm for uprighting).
MolarTable molar_fe_area_table(const analysis::MultiRootScenarioResult& r,
                               const analysis::Thresholds& thresholds,
                               analysis::MolarMovement movement, analysis::ForceUnit unit);

// "uprighting (couple, g·mm)" style row names.
QString molar_movement_label(analysis::MolarMovement m, analysis::ForceUnit unit);

// A value as a table shows it: fixed decimals, "—" for NaN, "not limited" for +infinity.
QString molar_cell_text(double value, int decimals);

// The root map cells of one part (trunk or a root), with the part's name.
struct MolarMapPart {
  int part = 0;
  QString name;
  std::vector<analysis::MultiRootMapCell> cells;
};
// Parts in the library's order (trunk first, then the roots), each with its cells.
std::vector<MolarMapPart> molar_map_parts(const mesh::MultiRootTooth& tooth,
                                          const std::vector<analysis::MultiRootMapCell>& cells);

// The force unit the case's load is given in ("g" and "g mm": grams-force; "cN": centinewton;
// "N" and "N mm": newton).
analysis::ForceUnit molar_case_force_unit(const analysis::MultiRootCase& spec);

// One line on the case: tooth, movement and magnitude as in the case file.
QString describe_molar_case(const analysis::MultiRootCase& spec);
QString molar_tooth_name(mesh::MultiRootType type);

// Labels every figure carries.
QString molar_method_label();  // the thin-layer estimate, not finite elements

}  // namespace sharpey::app
