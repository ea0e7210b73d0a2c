// Multi-rooted teeth (molars and the two-rooted maxillary first premolar): parametric geometry,
// root areas per root, and the attachment left by horizontal loss, angular defects and furcation
// involvement, and a finite-element mesh (build_multi_root_mesh, below; the single-rooted mesher
// of tooth_model.h builds one star-shaped root). The case files and reports use the thin-layer
// estimate of analysis/multi_root_thin_layer.h, checked against finite elements on these meshes
// (analysis/multi_root_fe.h; docs/molars.md says what each can and cannot tell).
//
// Tooth coordinate system as in tooth_model.h: origin on the long axis at the CEJ, z toward the
// crown, x buccal, y mesial. Lengths in mm.
//
// Geometry: a root trunk of horizontal elliptical sections centred on the axis, linear in depth
// from the cervical ellipse at the CEJ (z = 0) to the furcation ellipse at z = -trunk_length_mm;
// its flat bottom between the roots is the furcation roof. Each root starts from an elliptical
// foot on that plane (inside the furcation ellipse, apart from the other feet) and runs down by
// length_mm along a straight axis tilted by tilt_deg toward tilt_direction_deg; its horizontal
// sections keep the foot's section (an ellipse with a concave furcal face: root_section_offset)
// times rho(u) = sqrt(1 - (1 - u^2)^m) (u^2 = height above the apex / length, m =
// taper_fullness, as the single-rooted anatomical root), or stay constant for a cylinder (closed
// by a flat disc).
#pragma once

#include <Eigen/Core>
#include <atomic>
#include <string>
#include <vector>

#include "sharpey/mesh/tooth_model.h"

namespace sharpey::mesh {

enum class MultiRootType {
  kMaxillaryFirstMolar,
  kMaxillarySecondMolar,
  kMandibularFirstMolar,
  kMandibularSecondMolar,
  kMaxillaryFirstPremolarTwoRoots,
};
std::string to_string(MultiRootType type);
// Throws InputError (key "tooth.type") naming the accepted identifiers.
MultiRootType multi_root_type_from_string(const std::string& name);
std::vector<MultiRootType> all_multi_root_types();

enum class RootProfile { kTapered, kCylinder };

struct RootSpec {
  std::string name;      // "mesial", "distal", "mesiobuccal", "distobuccal", "palatal", "buccal"
  double foot_x_mm = 0;  // centre of the foot on the furcation plane
  double foot_y_mm = 0;
  double half_x_mm = 1;           // buccolingual half-width of the foot
  double half_y_mm = 1;           // mesiodistal half-width of the foot
  double length_mm = 10;          // furcation plane to apex, vertical extent
  double tilt_deg = 0;            // divergence of the root axis from the vertical
  double tilt_direction_deg = 0;  // polar angle the apex moves toward (0 buccal, 90 mesial)
  double taper_fullness = 2.0;    // m of rho(u); unused for a cylinder
  RootProfile profile = RootProfile::kTapered;
  // Concave furcal face (a kidney-shaped section): the face toward furcal_side_deg (0 buccal,
  // 90 mesial, 180 lingual, 270 distal; a multiple of 90) is drawn in by furcal_concavity_mm at
  // its middle (at the foot; scaled by rho down the root), the corners keep the ellipse:
  // v = b (q - f q^4) on that half, q the ellipse's sine across the face, b the half-width
  // across it and f = furcal_concavity_mm / b (at most 0.6). f > 1/4 makes the face concave
  // (a flute between two lobes); on a tapered root it fades linearly to the apex. 0: the plain
  // ellipse.
  double furcal_concavity_mm = 0;
  double furcal_side_deg = 0;
};

// Offset from the section's centre of the point at parameter theta (radians, 0 buccal, pi/2
// mesial) of a root's section t_mm below the furcation plane, at the foot's size (multiply by
// rho for the tapered root's size there): the ellipse of half_x_mm, half_y_mm with the furcal
// concavity above, which on a tapered root fades linearly from the foot to the apex (a cylinder
// keeps it). d_dtheta and d_dt (optional) receive the derivatives in theta and t_mm.
Eigen::Vector2d root_section_offset(const RootSpec& root, double theta, double t_mm = 0,
                                    Eigen::Vector2d* d_dtheta = nullptr,
                                    Eigen::Vector2d* d_dt = nullptr);
// Area of the foot's section (the ellipse less the concavity), mm^2.
double root_foot_area_mm2(const RootSpec& root);

struct MultiRootTooth {
  MultiRootType type = MultiRootType::kMandibularFirstMolar;
  double crown_length_mm = 7.5;
  double trunk_length_mm = 3.0;                           // CEJ to the furcation plane (root trunk)
  double cervix_half_x_mm = 4.5, cervix_half_y_mm = 4.5;  // at the CEJ
  double furcation_half_x_mm = 4.4, furcation_half_y_mm = 4.4;  // trunk at the furcation plane
  std::vector<RootSpec> roots;
};

// Handbook-based dimensions (docs/molars.md lists each value with its status and source).
MultiRootTooth multi_root_handbook(MultiRootType type);
// Status of the dimensions, as in check-values.md ("mem", "pub"), with the sources named.
std::string multi_root_handbook_status(MultiRootType type);
// Jepsen 1963 whole-root area (mm^2, from memory, check-values.md section 11; the maxillary first
// premolar's is section 4's, for both root forms).
double jepsen_root_area_mm2(MultiRootType type);

// Calibration as for the single roots (tooth_model.h, root_taper_fullness_for_area): the common
// taper fullness of all roots at which the whole root surface (trunk, roof, roots) has the area
// root_area_mm2, by bisection in [kMinRootTaperFullness, kMaxRootTaperFullness] to 1e-6. When
// the area lies beyond what that range reaches, returns the nearer end (the shortfall is the
// geometry's: docs/molars.md). multi_root_handbook() stores the values this gives for Jepsen's
// areas.
double multi_root_fullness_for_area(MultiRootTooth tooth, double root_area_mm2);

// Furcation involvement by horizontal probing depth into the furcation from an entrance
// (Hamp, Nyman and Lindhe 1975, J Clin Periodontol 2:126, from memory): degree I up to 3 mm,
// degree II beyond 3 mm but not through, degree III through and through.
enum class FurcationEntrance { kBuccal, kLingual, kMesial, kDistal };
std::string to_string(FurcationEntrance e);
FurcationEntrance furcation_entrance_from_string(const std::string& name);

struct FurcationInvolvement {
  int degree = 0;  // 0 none, 1, 2, 3
  // Horizontal depth from the entrance, mm; <= 0 takes the degree's representative depth
  // (I: 2 mm, II: 4 mm; III: through). Must lie in the degree's range.
  double horizontal_mm = 0;
  // Inside the lesion the inter-radicular bone is lost from the furcation roof down to this depth
  // below the roof (a modelling choice, no published value; docs/molars.md).
  double vertical_mm = 3.0;
  std::vector<FurcationEntrance> entrances = {FurcationEntrance::kBuccal};
};

// Bone around a multi-rooted tooth: the outer crest (healthy crest_below_cej_mm plus horizontal
// loss, lowered by the angular defect of `loss` at the point's polar angle around the tooth axis,
// as for single roots) bounds the attachment on the outer root surfaces; the inter-radicular
// septum reaches the furcation roof unless the furcation lesion removes it.
struct MultiRootBone {
  double crest_below_cej_mm = 1.5;
  BoneLoss loss;  // horizontal loss and one angular defect (tooth_model.h)
  FurcationInvolvement furcation;
  // true: the inter-radicular septum reaches the furcation roof (outside a furcation lesion);
  // false: the inter-radicular surfaces follow the outer crest like the rest (a level crest
  // through the furcation; used by the verification against a single root).
  bool septum_to_roof = true;
  PdlSpec pdl;  // width profile per root: from the outer crest (or the furcation plane, whichever
                // is lower) to the root's apex
};

// Throws InputError naming the value and the fix: 1 to 3 roots (one root only to verify against
// the single-rooted model), positive sizes, feet inside the furcation
// ellipse and apart, the crest above the lowest apex, a furcation depth inside its degree's range
// and an entrance that exists for this tooth.
void validate(const MultiRootTooth& tooth, const MultiRootBone& bone);

// Surface quadrature of the root (trunk from the CEJ down, furcation roof, roots): points with
// outward unit normals and area weights; part = -1 trunk, -2 roof, r >= 0 the root index.
struct RootSurfacePoint {
  Eigen::Vector3d x = Eigen::Vector3d::Zero();
  Eigen::Vector3d normal = Eigen::Vector3d::UnitX();
  double area_mm2 = 0;
  int part = -1;
  double angle_rad = 0;  // section parameter around the part's own centre (0 buccal, pi/2 mesial)
  bool inter_radicular = false;  // faces the furcation (inside the roots' convex hull)
  bool attached = true;          // below the bone (set by attach())
  double pdl_width_mm = 0.2;     // set by attach()
};
constexpr int kTrunkPart = -1;
constexpr int kRoofPart = -2;

// n_around points around each section, n_along sections along each part (Gauss-Legendre along,
// trapezoidal around); the default resolves areas to better than 0.1 %.
std::vector<RootSurfacePoint> root_surface_points(const MultiRootTooth& tooth, int n_around = 96,
                                                  int n_along = 48);

// Marks the points below the bone as attached and sets their PDL width (validates first).
void attach(const MultiRootTooth& tooth, const MultiRootBone& bone,
            std::vector<RootSurfacePoint>* points);

// Areas per part, mm^2: whole surface and attached surface.
struct RootAreas {
  double trunk_mm2 = 0, roof_mm2 = 0, total_mm2 = 0;
  std::vector<double> root_mm2;  // per root, furcation plane to apex
  double attached_trunk_mm2 = 0, attached_roof_mm2 = 0, attached_total_mm2 = 0;
  std::vector<double> attached_root_mm2;
};
RootAreas root_areas(const MultiRootTooth& tooth, const std::vector<RootSurfacePoint>& points);

// Lowest apex z (negative) and the outer crest z of `bone`.
double lowest_apex_z_mm(const MultiRootTooth& tooth);
double outer_crest_z_mm(const MultiRootBone& bone);

// Through-and-through depth of the furcation from `entrance` at the furcation plane: the width of
// the roots' convex hull along the probing direction, mm. Throws InputError when the entrance does
// not lead between two roots of this tooth.
double furcation_through_depth_mm(const MultiRootTooth& tooth, FurcationEntrance entrance);

// Finite-element mesh of a multi-rooted tooth, its PDL and a bone block. Faceted (straight-sided)
// surfaces: the tooth's rings (crown dome, trunk, roots) and the planar furcation roof
// (constrained Delaunay, detail/planar_triangulation.h); the PDL a structured prism layer over the
// attached triangles (trunk below the crest, roof, roots), each vertex offset along its averaged
// normal by the requested width (mitred at the roof's corners so both faces keep the width); one
// bone region (no cortical shell) in a box around the socket, its mesial, distal and basal faces
// kFixedBone, the others kFreeBone; TetGen for tooth and bone with the PDL as a hole. Regions
// kTooth, kPdl, kCancellousBone; face markers as build_tooth_model's. Midside nodes of 10-node
// elements at edge midpoints.
// Covered so far: the outer crest at least 0.3 mm above the furcation plane, or below it with a
// level crest through the furcation (septum_to_roof false), with the septum at the roof (the roof
// attached inside the roots' hull, free outside it), with a degree I or II lesion on a
// mandibular molar or on the maxillary first molar up to 0.7 mm short of its third root (the
// lesion's columns and roof from each entrance to the horizontal depth, its back edge a straight
// cut across the roof, split on the roots' hull where it crosses it), or with a degree III lesion
// (the septum's top vertical_mm below the roof, at least 0.3 mm from the crest: each root's
// ring columns on the roots' hull attached below the crest, the others below the septum's top;
// free PDL faces, kPdlCrest, along the lesion's edge; docs/molars.md); an angular defect whose
// floor stays at least 0.3 mm above the furcation plane (the crest ring and the bone's top follow
// the profile), without a lesion, or one on the roots under an outer crest at least 0.3 mm below
// the furcation plane (the septum at the roof, or a lesion whose septum's top lies below the
// crest or at least 0.6 mm below the defect's floor). No degree I or II lesion on the maxillary
// second molar or the premolar, no defect reaching the roots from a crest above the furcation
// plane;
// anything else throws InputError naming what is not yet meshed.
struct MultiRootMeshSizing {
  double edge_mm = 0.9;       // along the root surfaces
  double bone_edge_mm = 3.0;  // inside the bone block
  int pdl_layers = 1;         // elements across the PDL
  bool second_order = true;
};
struct MultiRootMesh {
  VolumeMesh mesh;
  // Per element: the part a PDL element lies over (kTrunkPart, kRoofPart or the root index);
  // INT_MIN for tooth and bone elements.
  std::vector<int> element_part;
  // Per node: the part a tooth-surface node lies on (as element_part), INT_MIN elsewhere.
  std::vector<int> node_part;
};
// The checks build_multi_root_mesh makes before meshing (InputError naming what is not meshed).
void validate_multi_root_mesh(const MultiRootTooth& tooth, const MultiRootBone& bone,
                              const MultiRootMeshSizing& sizing = {});
MultiRootMesh build_multi_root_mesh(const MultiRootTooth& tooth, const MultiRootBone& bone,
                                    const MultiRootMeshSizing& sizing = {},
                                    const std::atomic<bool>* cancel = nullptr);

}  // namespace sharpey::mesh
