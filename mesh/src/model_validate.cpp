// validate(): range checks of every model parameter, with messages that name the value, the
// allowed range, the reason and the fix.
#include <algorithm>
#include <cmath>
#include <sstream>
#include <string>

#include "detail/tooth_shape.h"
#include "sharpey/error.h"
#include "sharpey/mesh/tooth_model.h"

namespace sharpey::mesh {
namespace {

// Shortest exact-looking text of a length: 14 -> "14.0", 0.25 -> "0.25".
std::string fmt(double v) {
  if (!std::isfinite(v)) return std::isnan(v) ? "NaN" : (v > 0 ? "infinity" : "-infinity");
  std::ostringstream s;
  for (int digits = 1; digits <= 4; ++digits) {
    const double scale = std::pow(10.0, digits);
    if (std::abs(std::round(v * scale) - v * scale) < 1e-6 || digits == 4) {
      s.setf(std::ios::fixed);
      s.precision(digits);
      s << v;
      break;
    }
  }
  return s.str();
}

// Throws unless lo <= v <= hi (NaN fails). `what` names the quantity for a person, `unit` its
// unit, `why` the reason for the range.
void check_range(const std::string& key, const std::string& what, double v, double lo, double hi,
                 const std::string& unit, const std::string& why) {
  if (v >= lo && v <= hi) return;
  const std::string u = unit.empty() ? "" : " " + unit;
  throw InputError(key, what + " " + fmt(v) + u + " is outside the allowed range " + fmt(lo) +
                            " to " + fmt(hi) + u + " (" + key + "): " + why +
                            "; use a value in that range");
}

// Same for a range open at lo: lo < v <= hi.
void check_positive_range(const std::string& key, const std::string& what, double v, double lo,
                          double hi, const std::string& unit, const std::string& why) {
  if (v > lo && v <= hi) return;
  throw InputError(key, what + " " + fmt(v) + " " + unit + " is outside the allowed range above " +
                            fmt(lo) + " up to " + fmt(hi) + " " + unit + " (" + key + "): " + why +
                            "; use a value in that range");
}

constexpr double kMinEmbeddedMm = 1.5;  // shortest embedded root the model accepts
constexpr double kMinBelowCorticalMm = 0.5;

}  // namespace

void validate(const ModelSpec& spec) {
  const ToothSpec& tooth = spec.tooth;
  const auto types = all_tooth_types();
  if (std::find(types.begin(), types.end(), tooth.type) == types.end()) {
    throw InputError("tooth.type",
                     "unknown tooth type value " + std::to_string(static_cast<int>(tooth.type)));
  }
  const ToothDimensions& d = tooth.dimensions;
  // A scanned tooth's dimensions are measured on the surface (scanned_dimensions()); out-of-range
  // values name the surface key.
  const std::string dims = tooth.scan ? "tooth.surface.measured_" : "tooth.dimensions.";
  if (tooth.scan) {
    const ToothDimensions m = scanned_dimensions(*tooth.scan);
    if (m.root_length_mm != d.root_length_mm || m.crown_length_mm != d.crown_length_mm ||
        m.cervix_labiolingual_mm != d.cervix_labiolingual_mm ||
        m.cervix_mesiodistal_mm != d.cervix_mesiodistal_mm ||
        m.crown_labiolingual_mm != d.crown_labiolingual_mm ||
        m.crown_mesiodistal_mm != d.crown_mesiodistal_mm) {
      throw InputError("tooth.dimensions",
                       "the dimensions of a scanned tooth are measured on its surface (root " +
                           fmt(m.root_length_mm) + " mm, crown " + fmt(m.crown_length_mm) +
                           " mm) and cannot be set; remove tooth.dimensions or tooth.surface");
    }
  }
  if (tooth.scan && tooth.ideal_root != IdealRoot::kNone) {
    throw InputError("tooth.ideal_root",
                     "a scanned tooth surface and an idealised root exclude "
                     "each other; remove tooth.ideal_root or tooth.surface");
  }
  const std::string anat = "outside the range of human single-rooted teeth";
  check_range(dims + "crown_length_mm", "crown length", d.crown_length_mm, 3, 16, "mm", anat);
  check_range(dims + "root_length_mm", "root length", d.root_length_mm, 5, 25, "mm", anat);
  check_range(dims + "crown_mesiodistal_mm", "mesiodistal crown width", d.crown_mesiodistal_mm, 2,
              14, "mm", anat);
  check_range(dims + "cervix_mesiodistal_mm", "mesiodistal cervical width", d.cervix_mesiodistal_mm,
              1.5, 12, "mm", anat);
  check_range(dims + "crown_labiolingual_mm", "labiolingual crown width", d.crown_labiolingual_mm,
              2, 14, "mm", anat);
  check_range(dims + "cervix_labiolingual_mm", "labiolingual cervical width",
              d.cervix_labiolingual_mm, 1.5, 12, "mm", anat);
  check_range(dims + "cej_curvature_mesial_mm", "mesial CEJ curvature", d.cej_curvature_mesial_mm,
              0, 6, "mm", anat);
  check_range(dims + "cej_curvature_distal_mm", "distal CEJ curvature", d.cej_curvature_distal_mm,
              0, 6, "mm", anat);
  check_range(dims + "root_taper_fullness", "root taper fullness", d.root_taper_fullness,
              kMinRootTaperFullness, kMaxRootTaperFullness, "",
              "1 gives a paraboloid-like root, 4 one that keeps over 95 % of its cervical width to "
              "mid-root; the ten teeth's calibrated values lie between 1.19 and 3.75");

  double root_length = d.root_length_mm;
  switch (tooth.ideal_root) {
    case IdealRoot::kNone:
      break;
    case IdealRoot::kCylinder:
    case IdealRoot::kCone:
    case IdealRoot::kParaboloid:
      check_range("tooth.ideal_length_mm", "idealised root length", tooth.ideal_length_mm, 4, 30,
                  "mm", "the verification roots are meant to resemble real roots");
      check_range("tooth.ideal_radius_mm", "idealised root radius", tooth.ideal_radius_mm, 0.5,
                  std::min(6.0, tooth.ideal_length_mm / 3), "mm",
                  "the radius must be positive and at most a third of the root length " +
                      fmt(tooth.ideal_length_mm) + " mm (and at most 6 mm)");
      root_length = tooth.ideal_length_mm;
      break;
    default:
      throw InputError("tooth.ideal_root", "unknown idealised root value " +
                                               std::to_string(static_cast<int>(tooth.ideal_root)) +
                                               "; use none, cylinder, cone or paraboloid");
  }

  const std::string pdl_why =
      "the PDL must have a positive width; adult widths are about 0.1 to 0.4 mm";
  check_positive_range("pdl.crest_width_mm", "PDL width at the crest", spec.pdl.crest_width_mm, 0,
                       1, "mm", pdl_why);
  check_positive_range("pdl.mid_width_mm", "PDL width at mid-root", spec.pdl.mid_width_mm, 0, 1,
                       "mm", pdl_why);
  check_positive_range("pdl.apex_width_mm", "PDL width at the apex", spec.pdl.apex_width_mm, 0, 1,
                       "mm", pdl_why);

  const BoneSpec& b = spec.bone;
  check_range("bone.crest_below_cej_mm", "healthy crest depth below the CEJ", b.crest_below_cej_mm,
              0.25, std::min(5.0, root_length - kMinEmbeddedMm), "mm",
              "a healthy crest lies about 1 to 2 mm below the CEJ, and at least " +
                  fmt(kMinEmbeddedMm) + " mm of the " + fmt(root_length) +
                  " mm root must stay embedded");
  check_range("bone.labial_plate_mm", "labial bone plate thickness", b.labial_plate_mm, 0.3, 10,
              "mm", "the block must hold a plate labial of the socket");
  check_range("bone.lingual_plate_mm", "lingual bone plate thickness", b.lingual_plate_mm, 0.3, 10,
              "mm", "the block must hold a plate lingual of the socket");
  check_range("bone.interproximal_margin_mm", "interproximal bone margin",
              b.interproximal_margin_mm, 0.5, 10, "mm",
              "the block must extend mesial and distal of the socket");
  check_range("bone.depth_below_apex_mm", "bone depth below the apex", b.depth_below_apex_mm, 0.5,
              20, "mm", "the block must extend below the socket");
  check_positive_range("bone.cortical_thickness_mm", "cortical thickness", b.cortical_thickness_mm,
                       0.05, 3, "mm", "the cortical shell must have a positive thickness");
  const double thinnest_plate = std::min(b.labial_plate_mm, b.lingual_plate_mm);
  if (b.cortical_thickness_mm >= thinnest_plate) {
    const bool labial = b.labial_plate_mm <= b.lingual_plate_mm;
    throw InputError("bone.cortical_thickness_mm",
                     "cortical thickness " + fmt(b.cortical_thickness_mm) +
                         " mm is not less than the " + (labial ? "labial" : "lingual") +
                         " plate thickness " + fmt(thinnest_plate) +
                         " mm: the cancellous core must lie inside the plates; use a cortical "
                         "thickness below " +
                         fmt(thinnest_plate) + " mm or thicker plates");
  }

  const BoneLoss& loss = spec.loss;
  const double max_horizontal = root_length - b.crest_below_cej_mm - kMinEmbeddedMm;
  if (!(loss.horizontal_mm >= 0)) {
    throw InputError("loss.horizontal_mm", "horizontal bone loss " + fmt(loss.horizontal_mm) +
                                               " mm is negative; use 0 for a healthy crest");
  }
  if (loss.horizontal_mm > max_horizontal) {
    throw InputError("loss.horizontal_mm",
                     "bone loss " + fmt(loss.horizontal_mm) +
                         " mm leaves no embedded root: the root of this "
                         "tooth is " +
                         fmt(root_length) + " mm long and the healthy crest lies " +
                         fmt(b.crest_below_cej_mm) + " mm below the CEJ; use at most " +
                         fmt(max_horizontal) + " mm (at least " + fmt(kMinEmbeddedMm) +
                         " mm of root must stay embedded)");
  }
  const double embedded = root_length - b.crest_below_cej_mm - loss.horizontal_mm;
  if (b.cortical_thickness_mm > embedded - kMinBelowCorticalMm) {
    throw InputError(
        "bone.cortical_thickness_mm",
        "cortical thickness " + fmt(b.cortical_thickness_mm) +
            " mm leaves too little root in the cancellous bone: the embedded root is " +
            fmt(embedded) + " mm long; use a cortical thickness of at most " +
            fmt(embedded - kMinBelowCorticalMm) + " mm or less bone loss");
  }
  if (!(loss.defect_depth_mm >= 0)) {
    throw InputError("loss.defect_depth_mm", "angular defect depth " + fmt(loss.defect_depth_mm) +
                                                 " mm is negative; use 0 for no defect");
  }
  if (loss.defect_depth_mm > 0) {
    const double max_defect = std::min(embedded - kMinEmbeddedMm,
                                       embedded - b.cortical_thickness_mm - kMinBelowCorticalMm);
    if (loss.defect_depth_mm > max_defect) {
      throw InputError("loss.defect_depth_mm",
                       "angular defect depth " + fmt(loss.defect_depth_mm) +
                           " mm is deeper than the remaining root allows: after " +
                           fmt(loss.horizontal_mm) + " mm horizontal loss the embedded root is " +
                           fmt(embedded) + " mm long, and at least " + fmt(kMinEmbeddedMm) +
                           " mm (and the cortical layer plus " + fmt(kMinBelowCorticalMm) +
                           " mm) must stay attached; use at most " +
                           fmt(std::max(0.0, max_defect)) + " mm");
    }
    check_range("loss.defect_width_deg", "angular defect width", loss.defect_width_deg, 20, 180,
                "deg", "an angular defect spans part of the root's circumference");
    switch (loss.defect_surface) {
      case ToothSurface::kMesial:
      case ToothSurface::kDistal:
      case ToothSurface::kLabial:
      case ToothSurface::kLingual:
        break;
      default:
        throw InputError("loss.defect_surface",
                         "unknown defect surface value " +
                             std::to_string(static_cast<int>(loss.defect_surface)) +
                             "; use mesial, distal, labial or lingual");
    }
  }

  // Bracket pad on the crown body (between the CEJ and the incisal/occlusal rounding).
  const BracketSpec& br = spec.bracket;
  const detail::ToothShape shape(tooth, b.crest_below_cej_mm);
  const double body_top = shape.crown_body_top();
  const double crown_width = 2 * shape.section(shape.s_of_z(0.5 * body_top)).b;
  check_range("bracket.width_mm", "bracket pad width", br.width_mm, 0.5,
              std::floor(0.8 * crown_width * 10) / 10, "mm",
              "the pad must fit on the labial face of the crown (" +
                  fmt(std::round(crown_width * 10) / 10) + " mm wide)");
  check_range("bracket.length_mm", "bracket pad length", br.length_mm, 0.5,
              std::floor((body_top - 0.5) * 10) / 10, "mm",
              "the pad must fit between the CEJ and the incisal or occlusal rounding");
  const double centre = br.height_mm < 0 ? 0.5 * shape.crown_length() : br.height_mm;
  const double lo = 0.5 + 0.5 * br.length_mm, hi = body_top - 0.5 * br.length_mm;
  if (!std::isfinite(br.height_mm) || centre < lo || centre > hi) {
    throw InputError("bracket.height_mm",
                     "bracket pad centred " + fmt(centre) +
                         " mm above the CEJ is off the crown: a " + fmt(br.length_mm) +
                         " mm pad must lie between 0.5 mm above the CEJ and " + fmt(body_top) +
                         " mm, where the incisal or occlusal rounding begins (crown length " +
                         fmt(shape.crown_length()) + " mm); use a height between " + fmt(lo) +
                         " and " + fmt(hi) + " mm (or -1 for mid-crown)");
  }

  const MeshSizing& z = spec.sizing;
  switch (z.preset) {
    case MeshPreset::kCoarse:
    case MeshPreset::kStandard:
    case MeshPreset::kFine:
      break;
    default:
      throw InputError("sizing.preset", "unknown mesh preset value " +
                                            std::to_string(static_cast<int>(z.preset)) +
                                            "; use coarse, standard or fine");
  }
  if (!std::isfinite(z.pdl_edge_mm) || z.pdl_edge_mm > 0) {
    check_range("sizing.pdl_edge_mm", "PDL edge length", z.pdl_edge_mm, 0.1, 2.0, "mm",
                "finer meshes take too long, coarser ones cannot follow the root (0 keeps the "
                "preset's value)");
  }
  if (!std::isfinite(z.bone_edge_mm) || z.bone_edge_mm > 0) {
    check_range("sizing.bone_edge_mm", "bone edge length", z.bone_edge_mm, 0.3, 10.0, "mm",
                "0 keeps the preset's value");
  }
  if (z.pdl_layers != 0) {
    if (z.pdl_layers < 1 || z.pdl_layers > 4) {
      throw InputError("sizing.pdl_layers",
                       "PDL layers " + std::to_string(z.pdl_layers) +
                           " is outside the allowed range 1 to 4 (sizing.pdl_layers): at least one "
                           "element must span the PDL and more than four cost much and add little; "
                           "use 1, 2 (fine preset) or 0 for the preset's value");
    }
  }
  const MeshSizes sizes = resolve_sizing(z);
  if (sizes.bone_edge_mm < sizes.pdl_edge_mm) {
    throw InputError("sizing.bone_edge_mm",
                     "bone edge length " + fmt(sizes.bone_edge_mm) +
                         " mm is below the PDL edge length " + fmt(sizes.pdl_edge_mm) +
                         " mm: the bone is meshed at least as coarsely as the PDL; raise it to " +
                         fmt(sizes.pdl_edge_mm) + " mm or more");
  }
}

}  // namespace sharpey::mesh
