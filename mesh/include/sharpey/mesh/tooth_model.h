// Parametric tooth / PDL / alveolar-bone model and its quadratic tetrahedral mesh.
//
// Tooth coordinate system, used everywhere in Sharpey: origin on the tooth's long axis at the
// level of the cemento-enamel junction (CEJ), z toward the crown (so the root has z < 0),
// x labial (buccal), y mesial. Lengths in mm.
#pragma once

#include <Eigen/Core>
#include <atomic>
#include <memory>
#include <string>
#include <vector>

#include "sharpey/mesh/tooth_surface.h"
#include "sharpey/mesh/volume_mesh.h"

namespace sharpey::mesh {

// The ten single-rooted permanent teeth.
enum class ToothType {
  kMaxillaryCentralIncisor,
  kMaxillaryLateralIncisor,
  kMaxillaryCanine,
  kMaxillaryFirstPremolar,
  kMaxillarySecondPremolar,
  kMandibularCentralIncisor,
  kMandibularLateralIncisor,
  kMandibularCanine,
  kMandibularFirstPremolar,
  kMandibularSecondPremolar,
};

// Stable snake_case identifiers ("maxillary_central_incisor", ...) used in case files.
std::string to_string(ToothType type);
// Throws InputError naming the accepted identifiers.
ToothType tooth_type_from_string(const std::string& name);
std::vector<ToothType> all_tooth_types();

// Handbook-average dimensions, mm (check-values.md section 3).
struct ToothDimensions {
  double crown_length_mm = 0;
  double root_length_mm = 0;
  double crown_mesiodistal_mm = 0;
  double cervix_mesiodistal_mm = 0;
  double crown_labiolingual_mm = 0;
  double cervix_labiolingual_mm = 0;
  double cej_curvature_mesial_mm = 0;
  double cej_curvature_distal_mm = 0;
  // Shape of the root's taper along its length (dimensionless exponent m of rho below): 1 gives a
  // paraboloid-like root, larger values a fuller root that keeps its width longer and tapers in
  // its apical part. Not a handbook value: the handbook gives the cervical widths and the length
  // only. handbook_dimensions() sets it per tooth, calibrated so that the root area matches
  // Jepsen's 1963 figure for that tooth (from memory; root_calibration_area_mm2(),
  // root_taper_fullness_for_area(), docs/analyses.md "Root calibration"). The member default 1.6
  // is the maxillary central incisor's calibrated value.
  double root_taper_fullness = 1.6;
};
// Allowed range of ToothDimensions::root_taper_fullness.
constexpr double kMinRootTaperFullness = 1.0;
constexpr double kMaxRootTaperFullness = 4.0;
ToothDimensions handbook_dimensions(ToothType type);
// "pub (secondary copy)" or "mem" as in check-values.md, with the source named.
std::string handbook_status(ToothType type);
// The root surface area, mm^2 (CEJ to apex), that handbook_dimensions(type).root_taper_fullness was
// calibrated to: Jepsen 1963, from memory (check-values.md section 4; the only set covering all
// ten teeth). Published measurements of other studies are kept apart for validation
// (tests/mesh/test_root_validation.cpp).
double root_calibration_area_mm2(ToothType type);

// Idealised roots for verification: bodies of revolution about the long axis with circular
// cross-sections of radius r(h) at height h above the apex (the root's lowest point, at
// z = -ideal_length_mm), scaled so that r = ideal_radius_mm at the HEALTHY alveolar crest
// (bone.crest_below_cej_mm below the CEJ; bone loss does not change the root):
//   kCylinder:   r = R, closed at the apex by a half-ellipsoid of height R/3;
//   kCone:       r = k (h + delta): a cone whose tip is rounded by a tangent sphere of radius
//                0.05 R, so the virtual (sharp) tip lies delta below the apex (delta ~ 0.03 L for
//                R = 3, L = 12); cone_virtual_tip_below_apex_mm() returns it;
//   kParaboloid: r = k sqrt(h), smooth rounded apex.
// With depth d below the crest and embedded length L, these are r(d) = R, R (1 - d/L') with
// L' = L + delta, and R sqrt(1 - d/L). The crown above is a cylinder of the root's CEJ radius and
// height dimensions.crown_length_mm, closed by an elliptical cap, carrying the bracket pad.
// root_section() gives the exact radius at any height.
enum class IdealRoot { kNone, kCylinder, kCone, kParaboloid };

// Anatomical teeth: horizontal elliptical cross-sections. Root half-widths (cervix_labiolingual/2,
// cervix_mesiodistal/2) times rho(u) = sqrt(1 - (1 - u^2)^m), u^2 = height above the apex /
// root length, m = dimensions.root_taper_fullness (calibrated per tooth, 1.19 to 3.75): a full
// taper with a rounded apex. Crown: from the cervical ellipse to the labiolingual height of contour
// and the mesiodistal contact areas, closed by an elliptical cap (incisal edge, cusp or occlusal
// outline; proportions per tooth class). The CEJ is modelled as the plane z = 0: the CEJ curvature
// values are carried in ToothDimensions (and validated) but not used by the geometry; the alveolar
// crest is level (not scalloped between teeth).
struct ToothSpec {
  ToothType type = ToothType::kMaxillaryCentralIncisor;
  ToothDimensions dimensions = handbook_dimensions(ToothType::kMaxillaryCentralIncisor);
  IdealRoot ideal_root = IdealRoot::kNone;  // kNone: anatomical tooth of `type`
  double ideal_radius_mm = 3.0;             // radius at the healthy crest (idealised roots)
  double ideal_length_mm = 12.0;            // root length below the CEJ (idealised roots)
  // A scanned tooth (import_tooth_surface(), already in the tooth coordinate system): when set it
  // replaces the parametric surface (ideal_root must be kNone); `type` still names the tooth and
  // `dimensions` must hold scanned_dimensions(*scan). Shared, immutable.
  std::shared_ptr<const RadialToothSurface> scan;
};

// Dimensions measured on a scanned tooth: crown and root lengths along the axis, cervical widths
// at z = 0 and the crown's largest widths; root_taper_fullness keeps its default (unused).
ToothDimensions scanned_dimensions(const RadialToothSurface& scan);

// PDL width profile: linear in depth from the crest (after horizontal loss) to mid-way to the
// apex, then linear to the apex (hourglass when mid < crest, apex). The socket surface is the root
// surface offset along its normal by this width, so the width is exact by construction.
struct PdlSpec {
  double crest_width_mm = 0.20;
  double mid_width_mm = 0.20;
  double apex_width_mm = 0.20;
};

// Alveolar bone: a block with vertical sides around the socket. Its labial and lingual faces lie
// labial_plate_mm / lingual_plate_mm outside the socket's widest point at the crest, its mesial
// and distal faces interproximal_margin_mm outside, its base depth_below_apex_mm below the socket
// bottom. Cortical shell: the labial and lingual plates and the top layer (thickness
// cortical_thickness_mm); cancellous core: the rest, reaching the mesial, distal and basal cut
// faces (held fixed, kFixedBone) and the socket below the cortical layer.
struct BoneSpec {
  double crest_below_cej_mm = 1.5;       // healthy crest, common practice 1 to 2 mm
  double cortical_thickness_mm = 0.6;    // cortical shell (labial, lingual plates and crest top)
  double labial_plate_mm = 1.5;          // bone labial of the socket at the crest
  double lingual_plate_mm = 2.0;         // bone lingual of the socket at the crest
  double interproximal_margin_mm = 1.5;  // bone mesial and distal of the socket
  double depth_below_apex_mm = 3.0;      // block extends this far below the apex
};

enum class ToothSurface { kMesial, kDistal, kLabial, kLingual };
std::string to_string(ToothSurface s);
ToothSurface tooth_surface_from_string(const std::string& name);

// Bone loss. The angular defect lowers the attachment level on the root by
// defect_depth * cos^2(pi * delta / width) at polar angle delta from the named surface's centre
// (|delta| < width / 2; labial 0 deg, mesial +90, lingual 180, distal -90 around the long axis),
// and the bone top beside it as a trough that rises back to the crest over a radial distance of
// max(1 mm, defect depth) from the socket.
struct BoneLoss {
  double horizontal_mm = 0;    // crest lowered by this much below the healthy crest
  double defect_depth_mm = 0;  // angular (vertical) defect depth below the lowered crest; 0 = none
  ToothSurface defect_surface = ToothSurface::kMesial;
  double defect_width_deg = 60;  // angular width of the defect around the root
};

// Bracket pad: the crown-surface faces on the labial side between the heights
// height_mm -/+ length_mm / 2 whose centroid lies within width_mm / 2 of the mid-sagittal plane
// (y = 0); its area is width x length to within one column of faces.
struct BracketSpec {
  double height_mm = -1;   // centre height above the CEJ; < 0 means crown mid-height
  double width_mm = 3.0;   // mesiodistal extent of the pad
  double length_mm = 3.0;  // occluso-gingival extent of the pad
};

enum class MeshPreset { kCoarse, kStandard, kFine };
std::string to_string(MeshPreset p);
MeshPreset mesh_preset_from_string(const std::string& name);

// Preset sizes (pdl_edge_mm / bone_edge_mm / pdl_layers): see resolve_sizing().
struct MeshSizing {
  MeshPreset preset = MeshPreset::kStandard;
  // Explicit controls; <= 0 keeps the preset's value.
  double pdl_edge_mm = 0;    // target edge length along the PDL surfaces
  double bone_edge_mm = 0;   // target edge length in the bone far from the PDL
  int pdl_layers = 0;        // elements across the PDL width (>= 1; fine preset 2)
  bool second_order = true;  // 10-node tetrahedra (default) or 4-node for comparison
};

struct ModelSpec {
  ToothSpec tooth;
  PdlSpec pdl;
  BoneSpec bone;
  BoneLoss loss;
  BracketSpec bracket;
  MeshSizing sizing;
};

// The tooth surface of `spec` (parametric or scanned) as a closed triangle surface in the tooth
// coordinate system: n_rings rings equally spaced along the mean meridian's arc length between
// the two poles, each of n_columns points starting at angle phase_rad, joined by triangles
// outward. For tests, round trips and invented sample scans.
SurfaceMesh tooth_surface_triangles(const ModelSpec& spec, int n_columns, int n_rings,
                                    double phase_rad = 0);

// Geometry facts of a built model that the analyses need, all in the tooth coordinate system.
// The crest is the attachment level on the root: the PDL's upper edge on the root surface lies at
// crest_z_mm (lower inside an angular defect); the bone top meets the socket a few hundredths of a
// millimetre lower (the PDL's free top runs from the root outward along the root normal).
struct ModelGeometry {
  double cej_z_mm = 0;            // always 0
  double crest_z_mm = 0;          // alveolar crest after horizontal loss (negative)
  double defect_bottom_z_mm = 0;  // lowest attachment level (crest minus defect depth)
  double apex_z_mm = 0;           // root apex (negative)
  double root_length_mm = 0;      // CEJ to apex along the axis
  double embedded_length_mm = 0;  // crest to apex along the axis
  Eigen::Vector3d crown_tip = Eigen::Vector3d::Zero();  // incisal edge / cusp tip on the axis
  Eigen::Vector3d apex = Eigen::Vector3d::Zero();
  Eigen::Vector3d bracket_center = Eigen::Vector3d::Zero();   // on the labial crown surface
  Eigen::Vector3d bracket_normal = Eigen::Vector3d::UnitX();  // outward, labial
  double root_area_mm2 = 0;        // whole root surface CEJ to apex, from the parametric definition
  double attachment_area_mm2 = 0;  // PDL-covered root surface, from the parametric definition
  double exposed_root_area_mm2 = 0;  // root above the crest, from the parametric definition
  double tooth_volume_mm3 = 0, pdl_volume_mm3 = 0, bone_volume_mm3 = 0;  // parametric definition
  double cortical_volume_mm3 = 0, cancellous_volume_mm3 = 0;             // parts of bone_volume_mm3
  Eigen::Vector3d bone_min = Eigen::Vector3d::Zero();  // corners of the bone block, mm
  Eigen::Vector3d bone_max = Eigen::Vector3d::Zero();  // (its top is at the crest)
};

struct ToothModel {
  ModelSpec spec;
  ModelGeometry geometry;
  VolumeMesh mesh;
};

// Element sizes a MeshSizing resolves to (explicit controls override the preset):
//   coarse:   pdl_edge 0.9 mm, bone_edge 3.0 mm, 1 layer across the PDL (fast tests, quick looks);
//   standard: pdl_edge 0.65 mm, bone_edge 2.0 mm, 2 layers, tooth and bone graded faster away
//             from the ligament (maxillary central incisor: about 84k degrees of freedom with
//             10-node elements);
//   fine:     pdl_edge 0.38 mm, bone_edge 1.5 mm, 2 layers (about 2.7 times standard).
// pdl_edge sets the spacing of the points around and along the root (finer where the root bends,
// at the apex); the crown uses twice that; tooth_edge_mm (interior of the tooth) follows
// bone_edge_mm. Below the attachment level the rings start 0.6 PDL widths / pdl_layers apart and
// grow by about 35 % per ring up to pdl_edge, to resolve the pressure's rise from the PDL's free
// edge. Two layers across the PDL: with one, the peak pressure came out 12 % above the fine
// preset's (docs/verification.md, "Tooth model").
struct MeshSizes {
  double pdl_edge_mm = 0, bone_edge_mm = 0, tooth_edge_mm = 0;
  int pdl_layers = 1;
  // TetGen's radius-edge quality bound in the tooth and the bone (the PDL layer is structured and
  // does not depend on it): the larger the bound, the faster the elements grow away from the
  // fine surfaces of the root and the socket. Standard 2.5, coarse and fine 1.6 (TetGen's
  // minimum dihedral angle of 10 degrees is kept for all). With 2.5 the standard incisor needs
  // 10 % fewer dofs and 30 % fewer factorisation flops; peak and 95th-percentile pressure, CRes
  // and crown tip of the samples move by less than 0.1 % (docs/fem-solver.md section 11). Fine
  // stays the reference the standard preset is checked against; coarse keeps the meshes its many
  // test figures were measured on.
  double solid_radius_edge_ratio = 1.6;
};
MeshSizes resolve_sizing(const MeshSizing& sizing);

// Cross-section of the root at height z_mm (apex <= z <= 0): half-widths of the ellipse.
// Idealised roots: both equal the radius r. Throws InputError when z is outside the root.
struct RootSection {
  double labiolingual_half_mm = 0;  // along x
  double mesiodistal_half_mm = 0;   // along y
};
RootSection root_section(const ModelSpec& spec, double z_mm);

// Idealised cone only: distance from the apex down to the cone's virtual sharp tip (the apex is
// rounded), mm; 0 for the other roots.
double cone_virtual_tip_below_apex_mm(const ModelSpec& spec);

// The requested PDL width at height z_mm (crest to apex profile of spec.pdl), mm.
double requested_pdl_width_mm(const ModelSpec& spec, double z_mm);

// Attachment level (upper edge of the PDL on the root) at polar angle `angle_rad` around the long
// axis (0 labial, pi/2 mesial): the crest after horizontal loss, lowered inside an angular defect.
double attachment_level_z_mm(const ModelSpec& spec, double angle_rad);

// Checks every parameter; throws InputError naming the value, the allowed range and why.
void validate(const ModelSpec& spec);

// The geometry facts of build_tooth_model() from the parametric definition alone, without
// meshing (validates first; a few tens of milliseconds).
ModelGeometry model_geometry(const ModelSpec& spec);

// Root calibration: the root_taper_fullness in [kMinRootTaperFullness, kMaxRootTaperFullness] at
// which the anatomical root of spec (spec.tooth.dimensions' cervical widths and root length; their
// fullness is ignored) has the whole-root surface area root_area_mm2 (CEJ to apex, as
// model_geometry().root_area_mm2, which grows with the fullness). Regula falsi (Illinois) on a
// bracket, to 1e-6 in the fullness or 1e-9 relative in the area, about 10 evaluations of
// model_geometry(). Throws InputError (key
// tooth.dimensions.root_taper_fullness) naming the reachable areas when root_area_mm2 lies
// outside them, and for idealised roots.
double root_taper_fullness_for_area(const ModelSpec& spec, double root_area_mm2);

// Builds the geometry and meshes it with TetGen. Throws InputError for impossible geometry and
// MeshError (naming the stage and parameters) when TetGen fails. Never prints.
//
// Mesh: regions kTooth, kPdl, kCorticalBone, kCancellousBone; faces with their FaceMarker.
// Root (kRootSurface, kExposedRoot), crown (kCrownSurface, kBracketPad) and socket
// (kSocketSurface) faces have their normal pointing away from the tooth; bone faces (kFreeBone,
// kFixedBone) point out of the bone; kPdlCrest faces point up, out of the PDL. The PDL is a
// structured layer (sizes().pdl_layers tetrahedra across, each prism split into three), with the
// same nodes as the tooth and bone on its two surfaces; 10-node elements have their midside nodes
// on the exact root and socket surfaces (and on the crown), elsewhere at edge midpoints.
// `cancel` (may be null): when set while TetGen runs, its process is killed and Cancelled thrown.
ToothModel build_tooth_model(const ModelSpec& spec, const std::atomic<bool>* cancel = nullptr);

}  // namespace sharpey::mesh
