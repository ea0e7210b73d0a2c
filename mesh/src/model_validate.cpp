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

// What some ranges depend on besides their own value: the root length (the idealised root's when
// there is one) and, for the bracket pad, the crown's width and the top of its body.
struct Derived {
  double root_length_mm = 0;
  double crown_width_mm = 0;
  double body_top_mm = 0;
};

// An upper bound and its reason worked out from the model.
struct Limit {
  double hi;
  std::string why;
};

// One range check of the validation tables: a new parameter is one row.
struct RangeRow {
  const char* key;   // the ModelSpec field path after the table's prefix (the case key)
  const char* what;  // the quantity, for a person
  double (*value)(const ModelSpec&);
  double lo, hi;
  const char* unit;         // "" for a pure number
  const char* why;          // why the range (the message then says to use a value in it)
  bool open_below = false;  // lo < v instead of lo <= v
  // A value of 0 (or below) keeps the preset's: checked only when positive or not finite.
  bool zero_keeps_preset = false;
  // Set when the upper bound and the reason depend on the model: they replace hi and why.
  Limit (*limit)(const ModelSpec&, const Derived&) = nullptr;
};

// Walks a table of range checks in its order; throws InputError at the first value outside.
template <size_t N>
void check_rows(const RangeRow (&rows)[N], const std::string& prefix, const ModelSpec& spec,
                const Derived& derived) {
  for (const RangeRow& row : rows) {
    const double v = row.value(spec);
    if (row.zero_keeps_preset && std::isfinite(v) && v <= 0) continue;
    const Limit limit = row.limit ? row.limit(spec, derived) : Limit{row.hi, row.why};
    if (row.open_below)
      check_positive_range(prefix + row.key, row.what, v, row.lo, limit.hi, row.unit, limit.why);
    else
      check_range(prefix + row.key, row.what, v, row.lo, limit.hi, row.unit, limit.why);
  }
}

constexpr const char* kAnatomical = "outside the range of human single-rooted teeth";

// tooth.dimensions.<key> (tooth.surface.measured_<key> for a scanned tooth).
const RangeRow kDimensionRows[] = {
    {"crown_length_mm", "crown length",
     [](const ModelSpec& s) { return s.tooth.dimensions.crown_length_mm; }, 3, 16, "mm",
     kAnatomical},
    {"root_length_mm", "root length",
     [](const ModelSpec& s) { return s.tooth.dimensions.root_length_mm; }, 5, 25, "mm",
     kAnatomical},
    {"crown_mesiodistal_mm", "mesiodistal crown width",
     [](const ModelSpec& s) { return s.tooth.dimensions.crown_mesiodistal_mm; }, 2, 14, "mm",
     kAnatomical},
    {"cervix_mesiodistal_mm", "mesiodistal cervical width",
     [](const ModelSpec& s) { return s.tooth.dimensions.cervix_mesiodistal_mm; }, 1.5, 12, "mm",
     kAnatomical},
    {"crown_labiolingual_mm", "labiolingual crown width",
     [](const ModelSpec& s) { return s.tooth.dimensions.crown_labiolingual_mm; }, 2, 14, "mm",
     kAnatomical},
    {"cervix_labiolingual_mm", "labiolingual cervical width",
     [](const ModelSpec& s) { return s.tooth.dimensions.cervix_labiolingual_mm; }, 1.5, 12, "mm",
     kAnatomical},
    {"cej_curvature_mesial_mm", "mesial CEJ curvature",
     [](const ModelSpec& s) { return s.tooth.dimensions.cej_curvature_mesial_mm; }, 0, 6, "mm",
     kAnatomical},
    {"cej_curvature_distal_mm", "distal CEJ curvature",
     [](const ModelSpec& s) { return s.tooth.dimensions.cej_curvature_distal_mm; }, 0, 6, "mm",
     kAnatomical},
    {"root_taper_fullness", "root taper fullness",
     [](const ModelSpec& s) { return s.tooth.dimensions.root_taper_fullness; },
     kMinRootTaperFullness, kMaxRootTaperFullness, "",
     "1 gives a paraboloid-like root, 4 one that keeps over 95 % of its cervical width to "
     "mid-root; the ten teeth's calibrated values lie between 1.19 and 3.75"},
};

// An idealised root (cylinder, cone, paraboloid).
const RangeRow kIdealRootRows[] = {
    {"tooth.ideal_length_mm", "idealised root length",
     [](const ModelSpec& s) { return s.tooth.ideal_length_mm; }, 4, 30, "mm",
     "the verification roots are meant to resemble real roots"},
    {"tooth.ideal_radius_mm", "idealised root radius",
     [](const ModelSpec& s) { return s.tooth.ideal_radius_mm; }, 0.5, 6, "mm", "", false, false,
     [](const ModelSpec& s, const Derived&) {
       return Limit{std::min(6.0, s.tooth.ideal_length_mm / 3),
                    "the radius must be positive and at most a third of the root length " +
                        fmt(s.tooth.ideal_length_mm) + " mm (and at most 6 mm)"};
     }},
};

constexpr const char* kPdlWhy =
    "the PDL must have a positive width; adult widths are about 0.1 to 0.4 mm";
const RangeRow kPdlRows[] = {
    {"pdl.crest_width_mm", "PDL width at the crest",
     [](const ModelSpec& s) { return s.pdl.crest_width_mm; }, 0, 1, "mm", kPdlWhy, true},
    {"pdl.mid_width_mm", "PDL width at mid-root",
     [](const ModelSpec& s) { return s.pdl.mid_width_mm; }, 0, 1, "mm", kPdlWhy, true},
    {"pdl.apex_width_mm", "PDL width at the apex",
     [](const ModelSpec& s) { return s.pdl.apex_width_mm; }, 0, 1, "mm", kPdlWhy, true},
};

const RangeRow kBoneRows[] = {
    {"bone.crest_below_cej_mm", "healthy crest depth below the CEJ",
     [](const ModelSpec& s) { return s.bone.crest_below_cej_mm; }, 0.25, 5, "mm", "", false, false,
     [](const ModelSpec&, const Derived& d) {
       return Limit{std::min(5.0, d.root_length_mm - kMinEmbeddedMm),
                    "a healthy crest lies about 1 to 2 mm below the CEJ, and at least " +
                        fmt(kMinEmbeddedMm) + " mm of the " + fmt(d.root_length_mm) +
                        " mm root must stay embedded"};
     }},
    {"bone.labial_plate_mm", "labial bone plate thickness",
     [](const ModelSpec& s) { return s.bone.labial_plate_mm; }, 0.3, 10, "mm",
     "the block must hold a plate labial of the socket"},
    {"bone.lingual_plate_mm", "lingual bone plate thickness",
     [](const ModelSpec& s) { return s.bone.lingual_plate_mm; }, 0.3, 10, "mm",
     "the block must hold a plate lingual of the socket"},
    {"bone.interproximal_margin_mm", "interproximal bone margin",
     [](const ModelSpec& s) { return s.bone.interproximal_margin_mm; }, 0.5, 10, "mm",
     "the block must extend mesial and distal of the socket"},
    {"bone.depth_below_apex_mm", "bone depth below the apex",
     [](const ModelSpec& s) { return s.bone.depth_below_apex_mm; }, 0.5, 20, "mm",
     "the block must extend below the socket"},
    {"bone.cortical_thickness_mm", "cortical thickness",
     [](const ModelSpec& s) { return s.bone.cortical_thickness_mm; }, 0.05, 3, "mm",
     "the cortical shell must have a positive thickness", true},
};

// An angular defect (checked when its depth is positive).
const RangeRow kDefectRows[] = {
    {"loss.defect_width_deg", "angular defect width",
     [](const ModelSpec& s) { return s.loss.defect_width_deg; }, 20, 180, "deg",
     "an angular defect spans part of the root's circumference"},
};

// The bracket pad on the crown body (between the CEJ and the incisal/occlusal rounding).
const RangeRow kBracketRows[] = {
    {"bracket.width_mm", "bracket pad width", [](const ModelSpec& s) { return s.bracket.width_mm; },
     0.5, 0, "mm", "", false, false,
     [](const ModelSpec&, const Derived& d) {
       return Limit{std::floor(0.8 * d.crown_width_mm * 10) / 10,
                    "the pad must fit on the labial face of the crown (" +
                        fmt(std::round(d.crown_width_mm * 10) / 10) + " mm wide)"};
     }},
    {"bracket.length_mm", "bracket pad length",
     [](const ModelSpec& s) { return s.bracket.length_mm; }, 0.5, 0, "mm", "", false, false,
     [](const ModelSpec&, const Derived& d) {
       return Limit{std::floor((d.body_top_mm - 0.5) * 10) / 10,
                    "the pad must fit between the CEJ and the incisal or occlusal rounding"};
     }},
};

const RangeRow kSizingRows[] = {
    {"sizing.pdl_edge_mm", "PDL edge length",
     [](const ModelSpec& s) { return s.sizing.pdl_edge_mm; }, 0.1, 2.0, "mm",
     "finer meshes take too long, coarser ones cannot follow the root (0 keeps the "
     "preset's value)",
     false, true},
    {"sizing.bone_edge_mm", "bone edge length",
     [](const ModelSpec& s) { return s.sizing.bone_edge_mm; }, 0.3, 10.0, "mm",
     "0 keeps the preset's value", false, true},
};

// The tooth type, and a scanned tooth's dimensions and idealised root (both excluded).
void check_tooth(const ToothSpec& tooth) {
  const auto types = all_tooth_types();
  if (std::find(types.begin(), types.end(), tooth.type) == types.end()) {
    throw InputError("tooth.type",
                     "unknown tooth type value " + std::to_string(static_cast<int>(tooth.type)));
  }
  const ToothDimensions& d = tooth.dimensions;
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
}

// Checks the idealised root, if any; returns the root length the bone checks use.
double checked_root_length(const ModelSpec& spec) {
  const ToothSpec& tooth = spec.tooth;
  switch (tooth.ideal_root) {
    case IdealRoot::kNone:
      return tooth.dimensions.root_length_mm;
    case IdealRoot::kCylinder:
    case IdealRoot::kCone:
    case IdealRoot::kParaboloid:
      check_rows(kIdealRootRows, "", spec, Derived{});
      return tooth.ideal_length_mm;
    default:
      throw InputError("tooth.ideal_root", "unknown idealised root value " +
                                               std::to_string(static_cast<int>(tooth.ideal_root)) +
                                               "; use none, cylinder, cone or paraboloid");
  }
}

// The cortical shell inside the thinner plate.
void check_cortical_in_plates(const BoneSpec& b) {
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
}

// Horizontal loss that leaves enough root embedded, and enough of it below the cortical layer.
// Returns the embedded root length.
double check_horizontal_loss(const ModelSpec& spec, double root_length) {
  const BoneSpec& b = spec.bone;
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
  return embedded;
}

// An angular defect: depth within the embedded root, width and surface.
void check_defect(const ModelSpec& spec, double embedded) {
  const BoneSpec& b = spec.bone;
  const BoneLoss& loss = spec.loss;
  if (!(loss.defect_depth_mm >= 0)) {
    throw InputError("loss.defect_depth_mm", "angular defect depth " + fmt(loss.defect_depth_mm) +
                                                 " mm is negative; use 0 for no defect");
  }
  if (!(loss.defect_depth_mm > 0)) return;
  const double max_defect =
      std::min(embedded - kMinEmbeddedMm, embedded - b.cortical_thickness_mm - kMinBelowCorticalMm);
  if (loss.defect_depth_mm > max_defect) {
    throw InputError("loss.defect_depth_mm",
                     "angular defect depth " + fmt(loss.defect_depth_mm) +
                         " mm is deeper than the remaining root allows: after " +
                         fmt(loss.horizontal_mm) + " mm horizontal loss the embedded root is " +
                         fmt(embedded) + " mm long, and at least " + fmt(kMinEmbeddedMm) +
                         " mm (and the cortical layer plus " + fmt(kMinBelowCorticalMm) +
                         " mm) must stay attached; use at most " + fmt(std::max(0.0, max_defect)) +
                         " mm");
  }
  check_rows(kDefectRows, "", spec, Derived{});
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

// The bracket pad's size and height on the crown body.
void check_bracket(const ModelSpec& spec, Derived derived) {
  const BracketSpec& br = spec.bracket;
  const detail::ToothShape shape(spec.tooth, spec.bone.crest_below_cej_mm);
  const double body_top = shape.crown_body_top();
  derived.body_top_mm = body_top;
  derived.crown_width_mm = 2 * shape.section(shape.s_of_z(0.5 * body_top)).b;
  check_rows(kBracketRows, "", spec, derived);
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
}

// Mesh preset, edge lengths and PDL layers.
void check_sizing(const ModelSpec& spec) {
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
  check_rows(kSizingRows, "", spec, Derived{});
  if (z.pdl_layers != 0 && (z.pdl_layers < 1 || z.pdl_layers > 4)) {
    throw InputError("sizing.pdl_layers",
                     "PDL layers " + std::to_string(z.pdl_layers) +
                         " is outside the allowed range 1 to 4 (sizing.pdl_layers): at least one "
                         "element must span the PDL and more than four cost much and add little; "
                         "use 1, 2 (fine preset) or 0 for the preset's value");
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

}  // namespace

void validate(const ModelSpec& spec) {
  check_tooth(spec.tooth);
  // A scanned tooth's dimensions are measured on the surface (scanned_dimensions()); out-of-range
  // values name the surface key.
  const std::string dims = spec.tooth.scan ? "tooth.surface.measured_" : "tooth.dimensions.";
  check_rows(kDimensionRows, dims, spec, Derived{});
  Derived derived;
  derived.root_length_mm = checked_root_length(spec);
  check_rows(kPdlRows, "", spec, derived);
  check_rows(kBoneRows, "", spec, derived);
  check_cortical_in_plates(spec.bone);
  const double embedded = check_horizontal_loss(spec, derived.root_length_mm);
  check_defect(spec, embedded);
  check_bracket(spec, derived);
  check_sizing(spec);
}

}  // namespace sharpey::mesh
