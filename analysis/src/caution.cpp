#include <iomanip>
#include <sstream>

#include "sharpey/analysis/study.h"

namespace sharpey::analysis {

const std::string& caution_text() {
  static const std::string text =
      "Caution: these figures are a model estimate from an idealised, linear-elastic "
      "finite-element "
      "model of one tooth, its ligament and bone; they are not a prescription. Tissue properties "
      "and "
      "anatomy vary between patients. Clinical judgement and local regulations prevail.";
  return text;
}

std::string beyond_linear_range_text(const ScenarioResult& r) {
  if (!r.beyond_linear_range) return "";
  std::ostringstream s;
  s << "Beyond the linear range: the ligament strain reaches " << std::fixed << std::setprecision(1)
    << 100.0 * r.max_abs_principal_strain << " % (limit of the linear model "
    << 100.0 * kLinearRangeStrainLimit << " %), over " << std::setprecision(1)
    << r.volume_beyond_linear_range_percent
    << " % of the ligament volume; pressures indicative only.";
  return s.str();
}

}  // namespace sharpey::analysis
