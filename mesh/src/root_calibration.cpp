// root_taper_fullness_for_area(): the root taper fullness that gives an anatomical root a
// prescribed surface area (the calibration procedure of the tooth library's per-tooth values).
#include <sstream>

#include "sharpey/error.h"
#include "sharpey/mesh/tooth_model.h"

namespace sharpey::mesh {

double root_taper_fullness_for_area(const ModelSpec& spec, double root_area_mm2) {
  const std::string key = "tooth.dimensions.root_taper_fullness";
  if (spec.tooth.ideal_root != IdealRoot::kNone)
    throw InputError(key,
                     "the root taper fullness applies to anatomical roots only; the case has "
                     "an idealised root (tooth.idealised_root): remove it to calibrate");
  ModelSpec s = spec;
  auto area_at = [&s](double fullness) {
    s.tooth.dimensions.root_taper_fullness = fullness;
    return model_geometry(s).root_area_mm2;
  };
  double lo = kMinRootTaperFullness, hi = kMaxRootTaperFullness;
  const double area_lo = area_at(lo), area_hi = area_at(hi);
  if (!(root_area_mm2 >= area_lo && root_area_mm2 <= area_hi)) {
    std::ostringstream m;
    m << "no root taper fullness gives a root area of " << root_area_mm2
      << " mm^2 with a root length " << spec.tooth.dimensions.root_length_mm
      << " mm and cervical widths " << spec.tooth.dimensions.cervix_labiolingual_mm << " x "
      << spec.tooth.dimensions.cervix_mesiodistal_mm << " mm: the fullness range "
      << kMinRootTaperFullness << " to " << kMaxRootTaperFullness << " reaches " << area_lo
      << " to " << area_hi
      << " mm^2; check the area and the dimensions (the root area grows with the widths and "
         "length)";
    throw InputError(key, m.str());
  }
  // The area grows monotonically with the fullness (each section widens): bisection.
  while (hi - lo > 1e-6) {
    const double mid = 0.5 * (lo + hi);
    if (area_at(mid) < root_area_mm2) {
      lo = mid;
    } else {
      hi = mid;
    }
  }
  return 0.5 * (lo + hi);
}

}  // namespace sharpey::mesh
