// Thin-layer (Winkler) estimate for a multi-rooted tooth: a rigid tooth on the ligament's attached
// surface (trunk, furcation roof, roots), each point a thin elastic layer of width w with normal
// stiffness (lambda + 2 mu) / w and shear stiffness mu / w per unit area (derived; the same
// idealisation the single-root CRes tests compare the finite-element model with,
// tests/analysis/support/thin_layer.h). It gives the rigid-body stiffness, the centre of
// resistance, the tooth's motion under a force system and, per root, the attachment area, the
// share of the load and the layer's hydrostatic pressure K (v . n) / w (K the bulk modulus, v the
// displacement of the root surface, compression positive).
//
// What it is not: a finite-element solution. The bone and the tooth are rigid, the layer's
// pressure at a point depends on that point's displacement only, and there is no free-edge
// effect at the crest. On one anatomical root, where both can be built, its peak pressure came
// within 4 % of the finite-element model's (coarse preset) for tipping and translation
// (tests/analysis/test_multi_root_thin_layer_fe.cpp); on the mandibular first molar's mesh its
// per-root peaks came within 14 % and its CRes within 0.11 mm (analysis/multi_root_fe.h,
// tests/analysis/test_multi_root_fe*.cpp). docs/molars.md gives the method, the checks and the
// limits. Every output of these figures
// carries analysis::caution_text().
#pragma once

#include <Eigen/Core>
#include <string>
#include <vector>

#include "sharpey/analysis/case_spec.h"
#include "sharpey/fem/material.h"
#include "sharpey/mesh/multi_root_tooth.h"

namespace sharpey::analysis {

// A force (N) through `point` (mm) and a couple (N mm), in the tooth coordinate system.
struct MultiRootLoad {
  Eigen::Vector3d force_n = Eigen::Vector3d::Zero();
  Eigen::Vector3d point_mm = Eigen::Vector3d::Zero();
  Eigen::Vector3d couple_nmm = Eigen::Vector3d::Zero();
};

// Movements that matter for molars. Uprighting: a couple about the buccolingual axis that moves
// the crown distally (a mesially tipped molar uprights), magnitude in N mm. Intrusion: a force
// toward the apex along the vertical line through the CRes for vertical forces, N. Translation:
// a mesial force through the CRes for mesiodistal forces (bodily), N.
enum class MolarMovement { kUprighting, kIntrusion, kTranslation };
std::string to_string(MolarMovement m);  // "uprighting", "intrusion", "translation"
MolarMovement molar_movement_from_string(const std::string& name);  // InputError, key "movement"

struct MultiRootCres {
  Eigen::Vector3d point_mm = Eigen::Vector3d::Zero();  // a point of the line of action
  double below_cej_mm = 0;                             // -point.z
  double below_furcation_mm = 0;  // below the furcation plane (negative: above it)
  double residual_rad_per_n = 0;  // rotation left about the force's own direction (asymmetric
                                  // teeth twist; 0 for a tooth symmetric about that direction)
};

struct RootFigures {
  std::string name;                     // root name, "tooth" for the whole
  double attachment_area_mm2 = 0;       // attached surface of the part
  double peak_compression_kpa = 0;      // largest hydrostatic pressure (compression > 0)
  double peak_tension_kpa = 0;          // largest tension, as a positive number
  double area_above_capillary_mm2 = 0;  // attached area compressed beyond thresholds.capillary
  double area_above_limit_mm2 = 0;      // ... beyond thresholds.limit
  Eigen::Vector3d reaction_n = Eigen::Vector3d::Zero();  // force the ligament carries on it
};

struct MultiRootResult {
  Eigen::Vector3d translation_mm = Eigen::Vector3d::Zero();  // of the tooth at the origin
  Eigen::Vector3d rotation_rad = Eigen::Vector3d::Zero();
  RootFigures tooth;               // all attached surface (trunk, roof and roots)
  std::vector<RootFigures> roots;  // per root (furcation plane to apex), in the tooth's order
  // Sum of the ligament's forces and moments (about the origin) on the tooth: minus the load.
  Eigen::Vector3d reaction_force_n = Eigen::Vector3d::Zero();
  Eigen::Vector3d reaction_moment_nmm = Eigen::Vector3d::Zero();
};

class MultiRootThinLayer {
 public:
  // Validates tooth and bone (InputError) and the PDL material (InputError, key
  // "materials.pdl"); throws InputError (key "bone_loss_mm") when less than 10 mm^2 stays
  // attached.
  MultiRootThinLayer(const mesh::MultiRootTooth& tooth, const mesh::MultiRootBone& bone,
                     const fem::Material& pdl);

  const mesh::MultiRootTooth& tooth() const { return tooth_; }
  const mesh::RootAreas& areas() const { return areas_; }
  // 6 x 6 about the origin, (translation mm, rotation rad) -> (force N, moment N mm).
  const Eigen::Matrix<double, 6, 6>& stiffness() const { return K_; }

  // Centre of resistance for forces along `direction` (normalised inside).
  MultiRootCres cres(const Eigen::Vector3d& direction) const;

  MultiRootResult evaluate(const MultiRootLoad& load, const Thresholds& thresholds) const;

  // The attached surface points and the layer's hydrostatic pressure at each under `load`, kPa
  // (compression > 0), in the same order.
  const std::vector<mesh::RootSurfacePoint>& attached_points() const { return points_; }
  std::vector<double> pressure_kpa(const MultiRootLoad& load) const;

  // The preset's load of the given magnitude (N, or N mm for uprighting).
  MultiRootLoad preset(MolarMovement movement, double magnitude) const;

  // Largest magnitude of the preset that keeps the tooth's peak compression at or below
  // threshold_kpa (linear: threshold over the peak per unit); +infinity when it compresses nothing.
  double allowance(MolarMovement movement, double threshold_kpa) const;

 private:
  mesh::MultiRootTooth tooth_;
  std::vector<mesh::RootSurfacePoint> points_;  // attached points only
  mesh::RootAreas areas_;
  double k_n_ = 0, k_s_ = 0, k_bulk_ = 0;  // MPa (times 1 / width per point)
  Eigen::Matrix<double, 6, 6> K_ = Eigen::Matrix<double, 6, 6>::Zero();
};

}  // namespace sharpey::analysis
