// The PDL quantities the app can colour by, their display units, and their values per PDL node
// taken from an analysis::ScenarioResult (no computation beyond unit scaling and vector length).
#pragma once

#include <QString>
#include <vector>

#include "sharpey/analysis/study.h"

namespace sharpey::app {

enum class Quantity {
  kPressure,            // hydrostatic pressure, kPa, compression positive
  kMaxPrincipalStrain,  // %, tensor strain
  kEquivalentStrain,    // %, von Mises equivalent strain
  kVonMises,            // kPa
  kDisplacement,        // displacement magnitude, um
};
std::vector<Quantity> all_quantities();
QString label(Quantity q);        // "hydrostatic pressure"
QString unit_label(Quantity q);   // "kPa"
QString short_label(Quantity q);  // "p" style axis label with unit, e.g. "pressure (kPa)"
// Signed quantities get a diverging colour map centred on zero.
bool is_signed(Quantity q);

// Values per PDL node, in the display unit, same order as `pdl_nodes`
// (ScenarioSolution::pdl_nodes(); the result's per-node fields follow that order).
std::vector<double> quantity_values(const analysis::ScenarioResult& result, Quantity q,
                                    const std::vector<int>& pdl_nodes);

struct ValueRange {
  double min = 0, max = 0;
  bool valid() const { return min <= max; }
};
// Smallest and largest finite value; {0, 0} for no finite values.
ValueRange finite_range(const std::vector<double>& values);
// The same over part of the PDL nodes: those with band[i] == 0 (in_band false) or band[i] != 0
// (in_band true); nodes past the end of `band` count as outside it. {0, 0} when none is finite.
//
// "The range shown" has one definition for every quantity and every view: the range over the
// PDL nodes outside the crest edge band (analysis::pdl_crest_edge_band), the nodes the key
// numbers (peak compression and tension, max. principal strain, von Mises) are taken over, so
// the colour bar's ends are those numbers. The band, where the linear-elastic stresses are
// singular and grow with mesh refinement, is shown clamped to the scale and marked apart.
ValueRange finite_range(const std::vector<double>& values, const std::vector<char>& band,
                        bool in_band);
ValueRange merge(const ValueRange& a, const ValueRange& b);

// How the colour scale's range is chosen.
enum class ScaleMode {
  kShown,       // the range shown (above): follows the force
  kFixed,       // a range kept from the moment it was chosen: 50 g looks paler than 100 g
  kThresholds,  // pressure: -limit to +limit, so colours mean the same pressure in every view and
                // every bone level (full compression colour at the physiological limit); other
                // quantities have no threshold and keep the range shown
  kPerLevel,    // comparison only: every bone level on its own range shown
};
QString label(ScaleMode mode);
// The range the colours are spread over for `mode`: `shown` for kShown and kPerLevel, `fixed` for
// kFixed, [-limit_kpa, limit_kpa] for pressure under kThresholds.
ValueRange scale_range(ScaleMode mode, Quantity q, const ValueRange& shown, const ValueRange& fixed,
                       double limit_kpa);

}  // namespace sharpey::app
