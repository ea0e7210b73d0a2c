// Parametric tooth / PDL / alveolar-bone model and its quadratic tetrahedral mesh.
//
// Tooth coordinate system, used everywhere in Sharpey: origin on the tooth's long axis at the
// level of the cemento-enamel junction (CEJ), z toward the crown (so the root has z < 0),
// x labial (buccal), y mesial. Lengths in mm.
#pragma once

#include <Eigen/Core>
#include <string>
#include <vector>

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
};
ToothDimensions handbook_dimensions(ToothType type);
// "pub (secondary copy)" or "mem" as in check-values.md, with the source named.
std::string handbook_status(ToothType type);

// Idealised roots for verification: a rigid-ish body of revolution with the given radius at the
// crest and embedded length; the crown above is a short cylinder carrying the bracket pad.
enum class IdealRoot { kNone, kCylinder, kCone, kParaboloid };

struct ToothSpec {
  ToothType type = ToothType::kMaxillaryCentralIncisor;
  ToothDimensions dimensions = handbook_dimensions(ToothType::kMaxillaryCentralIncisor);
  IdealRoot ideal_root = IdealRoot::kNone;  // kNone: anatomical tooth of `type`
  double ideal_radius_mm = 3.0;             // radius at the crest (idealised roots)
  double ideal_length_mm = 12.0;            // root length below the CEJ (idealised roots)
};

// PDL width profile: linear from crest to mid-root to apex (hourglass when mid < crest, apex).
struct PdlSpec {
  double crest_width_mm = 0.20;
  double mid_width_mm = 0.20;
  double apex_width_mm = 0.20;
};

struct BoneSpec {
  double crest_below_cej_mm = 1.5;     // healthy crest, common practice 1 to 2 mm
  double cortical_thickness_mm = 0.6;  // cortical shell (labial, lingual plates and crest top)
  double labial_plate_mm = 1.5;        // bone labial of the socket at the crest
  double lingual_plate_mm = 2.0;       // bone lingual of the socket at the crest
  double interproximal_margin_mm = 1.5;  // bone mesial and distal of the socket
  double depth_below_apex_mm = 3.0;    // block extends this far below the apex
};

enum class ToothSurface { kMesial, kDistal, kLabial, kLingual };
std::string to_string(ToothSurface s);
ToothSurface tooth_surface_from_string(const std::string& name);

struct BoneLoss {
  double horizontal_mm = 0;          // crest lowered by this much below the healthy crest
  double defect_depth_mm = 0;        // angular (vertical) defect depth below the lowered crest; 0 = none
  ToothSurface defect_surface = ToothSurface::kMesial;
  double defect_width_deg = 60;      // angular width of the defect around the root
};

struct BracketSpec {
  double height_mm = -1;     // centre height above the CEJ; < 0 means crown mid-height
  double width_mm = 3.0;     // mesiodistal extent of the pad
  double length_mm = 3.0;    // occluso-gingival extent of the pad
};

enum class MeshPreset { kCoarse, kStandard, kFine };
std::string to_string(MeshPreset p);
MeshPreset mesh_preset_from_string(const std::string& name);

struct MeshSizing {
  MeshPreset preset = MeshPreset::kStandard;
  // Explicit controls; <= 0 keeps the preset's value.
  double pdl_edge_mm = 0;      // target edge length along the PDL surfaces
  double bone_edge_mm = 0;     // target edge length in the bone far from the PDL
  int pdl_layers = 0;          // elements across the PDL width (>= 1; fine preset 2)
  bool second_order = true;    // 10-node tetrahedra (default) or 4-node for comparison
};

struct ModelSpec {
  ToothSpec tooth;
  PdlSpec pdl;
  BoneSpec bone;
  BoneLoss loss;
  BracketSpec bracket;
  MeshSizing sizing;
};

// Geometry facts of a built model that the analyses need, all in the tooth coordinate system.
struct ModelGeometry {
  double cej_z_mm = 0;                 // always 0
  double crest_z_mm = 0;               // alveolar crest after horizontal loss (negative)
  double apex_z_mm = 0;                // root apex (negative)
  double root_length_mm = 0;           // CEJ to apex along the axis
  double embedded_length_mm = 0;       // crest to apex along the axis
  Eigen::Vector3d crown_tip = Eigen::Vector3d::Zero();      // incisal edge / cusp tip on the axis
  Eigen::Vector3d apex = Eigen::Vector3d::Zero();
  Eigen::Vector3d bracket_center = Eigen::Vector3d::Zero(); // on the labial crown surface
  Eigen::Vector3d bracket_normal = Eigen::Vector3d::UnitX(); // outward, labial
  double root_area_mm2 = 0;            // whole root surface CEJ to apex, from the parametric definition
  double attachment_area_mm2 = 0;      // PDL-covered root surface, from the parametric definition
  double exposed_root_area_mm2 = 0;    // root above the crest, from the parametric definition
  double tooth_volume_mm3 = 0, pdl_volume_mm3 = 0, bone_volume_mm3 = 0;  // parametric definition
};

struct ToothModel {
  ModelSpec spec;
  ModelGeometry geometry;
  VolumeMesh mesh;
};

// Checks every parameter; throws InputError naming the value, the allowed range and why.
void validate(const ModelSpec& spec);

// Builds the geometry and meshes it with TetGen. Throws InputError for impossible geometry and
// MeshError (naming the stage and parameters) when TetGen fails. Never prints.
ToothModel build_tooth_model(const ModelSpec& spec);

}  // namespace sharpey::mesh
