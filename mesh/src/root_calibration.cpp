// root_taper_fullness_for_area(): the root taper fullness that gives an anatomical root a
// prescribed surface area (the calibration procedure of the tooth library's per-tooth values).
#include <cmath>
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
  // The area grows monotonically and smoothly with the fullness (each section widens): regula
  // falsi with the Illinois modification keeps a bracket [lo, hi] and converges superlinearly
  // (about 8 evaluations instead of bisection's 22 for the same 1e-6).
  double f_lo = area_lo - root_area_mm2, f_hi = area_hi - root_area_mm2;
  int side = 0;
  double m = lo;
  for (int it = 0; it < 100 && hi - lo > 1e-6; ++it) {
    m = (lo * f_hi - hi * f_lo) / (f_hi - f_lo);
    const double f = area_at(m) - root_area_mm2;
    if (f == 0) return m;
    if (f < 0) {
      lo = m;
      f_lo = f;
      if (side == -1) f_hi *= 0.5;
      side = -1;
    } else {
      hi = m;
      f_hi = f;
      if (side == 1) f_lo *= 0.5;
      side = 1;
    }
    // Stop once the area is met to round-off (the bracket itself may stay wide on one side).
    if (std::abs(f) < 1e-9 * root_area_mm2) return m;
  }
  return m;
}

}  // namespace sharpey::mesh
