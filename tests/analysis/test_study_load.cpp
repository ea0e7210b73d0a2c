// Centre of resistance and load resolution on a rigid root held by a bed of springs: a model whose
// rigid response is known in closed form, so the analysis formulas can be checked exactly before
// they meet a finite-element model (test_cres_* and test_clinical_* do that).
#include <gtest/gtest.h>

#include <Eigen/Dense>
#include <cmath>

#include "sharpey/analysis/detail/centre_of_resistance.h"
#include "sharpey/analysis/detail/load_resolution.h"
#include "sharpey/core/constants.h"
#include "sharpey/error.h"

namespace sharpey::analysis::detail {
namespace {

using sharpey::core::kPi;

Eigen::Matrix3d cross_matrix(const Eigen::Vector3d& r) {
  Eigen::Matrix3d m;
  m << 0, -r.z(), r.y(), r.z(), 0, -r.x(), -r.y(), r.x(), 0;
  return m;
}

// A rigid body on springs at points p_i with stiffness tensors K_i; 6 x 6 stiffness about `centre`.
struct SpringBed {
  std::vector<Eigen::Vector3d> points;
  std::vector<Eigen::Matrix3d> stiffness;

  Eigen::Matrix<double, 6, 6> stiffness_about(const Eigen::Vector3d& centre) const {
    Eigen::Matrix<double, 6, 6> K = Eigen::Matrix<double, 6, 6>::Zero();
    for (size_t i = 0; i < points.size(); ++i) {
      Eigen::Matrix<double, 3, 6> B;
      B << Eigen::Matrix3d::Identity(), -cross_matrix(points[i] - centre);
      K += B.transpose() * stiffness[i] * B;
    }
    return K;
  }
  // The rigid response as the analysis builds it: motion of `centre` per (F, M about reference).
  RigidResponse response(const Eigen::Vector3d& reference, const Eigen::Vector3d& centre) const {
    Eigen::Matrix<double, 6, 6> T = Eigen::Matrix<double, 6, 6>::Identity();
    T.bottomLeftCorner<3, 3>() = cross_matrix(reference - centre);  // M_c = M_r + (r - c) x F
    RigidResponse r;
    r.reference_point = reference;
    r.centre = centre;
    r.matrix = stiffness_about(centre).inverse() * T;
    return r;
  }
};

// Springs on a root of revolution from the crest (z = z_crest) down to depth L, radius rho(d),
// one spring per (ring, angle) cell weighted by its lateral area rho dphi dd; normal stiffness
// k_n and tangential k_t per unit area.
SpringBed root_bed(double z_crest, double L, const std::function<double(double)>& rho, double k_n,
                   double k_t, int n_rings = 200, int n_phi = 72) {
  SpringBed bed;
  for (int i = 0; i < n_rings; ++i) {
    const double d = (i + 0.5) * L / n_rings, r = rho(d);
    for (int j = 0; j < n_phi; ++j) {
      const double phi = (j + 0.5) * 2 * kPi / n_phi;
      const Eigen::Vector3d n(std::cos(phi), std::sin(phi), 0);
      const double area = r * (2 * kPi / n_phi) * (L / n_rings);
      bed.points.emplace_back(r * n.x(), r * n.y(), z_crest - d);
      bed.stiffness.push_back(area * (k_n * n * n.transpose() +
                                      k_t * (Eigen::Matrix3d::Identity() - n * n.transpose())));
    }
  }
  return bed;
}

const Eigen::Vector3d kBracket(3.5, 0, 5.0);
constexpr double kCrest = -1.5, kLength = 12.0;

LoadContext context_for(const SpringBed& bed) {
  LoadContext c;
  c.response = bed.response(kBracket, Eigen::Vector3d(0.2, 0.1, -4));
  c.cres_x_z_mm = centre_of_resistance_height(c.response, Eigen::Vector3d::UnitX());
  c.cres_y_z_mm = centre_of_resistance_height(c.response, Eigen::Vector3d::UnitY());
  c.crown_tip_z_mm = 10.5;
  c.apex_z_mm = kCrest - kLength;
  c.crown_mesiodistal_mm = 8.5;
  return c;
}

SpringBed cylinder_bed() {
  return root_bed(
      kCrest, kLength, [](double) { return 3.0; }, 10.0, 1.0);
}

// Derived: with isotropic springs the CRes is the stiffness-weighted mean height, so a cylinder
// gives L/2 and a cone (radius R (1 - d/L), stiffness per depth proportional to the radius) L/3
// below the crest (thin-layer theory, check-values.md section 7).
TEST(CentreOfResistance, IsotropicBedGivesWeightedMeanDepth) {
  for (const bool cone : {false, true}) {
    SCOPED_TRACE(cone ? "cone" : "cylinder");
    const SpringBed bed = root_bed(
        kCrest, kLength, [cone](double d) { return cone ? 3.0 * (1.0 - d / kLength) : 3.0; }, 1.0,
        1.0);
    double sum_k = 0, sum_kz = 0;
    for (size_t i = 0; i < bed.points.size(); ++i) {
      sum_k += bed.stiffness[i](0, 0);
      sum_kz += bed.stiffness[i](0, 0) * bed.points[i].z();
    }
    const RigidResponse r = bed.response(kBracket, Eigen::Vector3d(0, 0, -5));
    for (const Eigen::Vector3d& d :
         {Eigen::Vector3d::UnitX().eval(), Eigen::Vector3d::UnitY().eval()}) {
      const double z = centre_of_resistance_height(r, d);
      EXPECT_NEAR(z, sum_kz / sum_k, 1e-9);
      EXPECT_NEAR((kCrest - z) / kLength, cone ? 1.0 / 3.0 : 0.5, 2e-3);
    }
  }
}

// Two independent computations: the CRes from the rotation formula equals the point about which
// the compliance has no force-to-rotation coupling (anisotropic springs, so not a plain centroid).
TEST(CentreOfResistance, MatchesDecoupledCompliancePoint) {
  const SpringBed bed = root_bed(
      kCrest, kLength,
      [](double d) { return 3.0 * std::sqrt(std::max(0.0, 1.0 - d / kLength)) + 0.05; }, 11.0, 1.0);
  const RigidResponse r = bed.response(kBracket, Eigen::Vector3d(0.3, -0.2, -6));
  const double zx = centre_of_resistance_height(r, Eigen::Vector3d::UnitX());
  const double zy = centre_of_resistance_height(r, Eigen::Vector3d::UnitY());
  const Eigen::Matrix<double, 6, 6> Cx = bed.stiffness_about(Eigen::Vector3d(0, 0, zx)).inverse();
  const Eigen::Matrix<double, 6, 6> Cy = bed.stiffness_about(Eigen::Vector3d(0, 0, zy)).inverse();
  EXPECT_LT(std::abs(Cx(4, 0)), 1e-9 * std::abs(Cx(4, 4)));  // F_x -> rotation about y
  EXPECT_LT(std::abs(Cy(3, 1)), 1e-9 * std::abs(Cy(3, 3)));  // F_y -> rotation about x
  EXPECT_LT(zx, kCrest);
  EXPECT_GT(zx, kCrest - kLength);
}

LoadSpec lingual_100g(MovementPreset preset) {
  LoadSpec l;
  l.magnitude = 100;
  l.unit = ForceUnit::kGram;
  l.direction = -Eigen::Vector3d::UnitX();
  l.preset = preset;
  return l;
}

// Derived: translation has no rotation, and its moment-to-force ratio is the distance from the
// bracket to the CRes along the axis (check-values.md section 9, common practice: "equal to the
// bracket-to-CRes distance").
TEST(LoadResolution, TranslationCancelsRotation) {
  const LoadContext c = context_for(cylinder_bed());
  const ResolvedLoad tip = resolve_load(lingual_100g(MovementPreset::kUncontrolledTipping), c);
  const ResolvedLoad t = resolve_load(lingual_100g(MovementPreset::kTranslation), c);
  const double w_tip = c.response.motion(tip.force_n, tip.moment_nmm).rotation_rad.norm();
  const double w_t = c.response.motion(t.force_n, t.moment_nmm).rotation_rad.norm();
  EXPECT_GT(w_tip, 0);
  EXPECT_LT(w_t, 1e-12 * w_tip);
  EXPECT_NEAR(t.moment_to_force_mm, kBracket.z() - c.cres_x_z_mm, 1e-9);
  EXPECT_NEAR(translation_moment_to_force(lingual_100g(MovementPreset::kNone), c),
              t.moment_to_force_mm, 1e-12);
  EXPECT_NEAR(t.force_n.norm(), 100 * 0.00980665, 1e-12);  // 1 gram-force = 0.00980665 N
  Eigen::Vector3d p;
  EXPECT_FALSE(centre_of_rotation(c.response.motion(t.force_n, t.moment_nmm), &p));
}

// Derived: controlled tipping pivots about the apex, root movement about the bracket level; the
// ratios order as uncontrolled (0) < controlled < translation < root movement.
TEST(LoadResolution, TippingAndRootMovementPlaceTheCentreOfRotation) {
  const LoadContext c = context_for(cylinder_bed());
  const ResolvedLoad ct = resolve_load(lingual_100g(MovementPreset::kControlledTipping), c);
  const ResolvedLoad rm = resolve_load(lingual_100g(MovementPreset::kRootMovement), c);
  const ResolvedLoad tr = resolve_load(lingual_100g(MovementPreset::kTranslation), c);
  const ResolvedLoad ut = resolve_load(lingual_100g(MovementPreset::kUncontrolledTipping), c);
  const RigidMotion m_ct = c.response.motion(ct.force_n, ct.moment_nmm);
  const RigidMotion m_rm = c.response.motion(rm.force_n, rm.moment_nmm);
  const double scale = m_ct.displacement_at(Eigen::Vector3d(0, 0, kBracket.z())).norm();
  EXPECT_LT(std::abs(m_ct.displacement_at(Eigen::Vector3d(0, 0, c.apex_z_mm)).x()), 1e-12 * scale);
  EXPECT_LT(std::abs(m_rm.displacement_at(Eigen::Vector3d(0, 0, kBracket.z())).x()), 1e-12 * scale);
  Eigen::Vector3d p;
  ASSERT_TRUE(centre_of_rotation(m_ct, &p));
  EXPECT_NEAR(p.z(), c.apex_z_mm, 1e-9);
  ASSERT_TRUE(centre_of_rotation(m_rm, &p));
  EXPECT_NEAR(p.z(), kBracket.z(), 1e-9);
  EXPECT_EQ(ut.moment_to_force_mm, 0.0);
  EXPECT_EQ(ut.couple_nmm, Eigen::Vector3d::Zero());
  EXPECT_LT(0.0, ct.moment_to_force_mm);
  EXPECT_LT(ct.moment_to_force_mm, tr.moment_to_force_mm);
  EXPECT_LT(tr.moment_to_force_mm, rm.moment_to_force_mm);
  // The couple opposes the lingual force's tipping (crown lingual): about +y.
  EXPECT_GT(tr.couple_nmm.y(), 0);
}

// source: Naegerl H, Burstone CJ, Becker B, Kubein-Meesenburg D, 1991, "Centers of rotation with
// transverse forces: an experimental study", Am J Orthod Dentofacial Orthop 99:337-345 (measured
// on a physical model of an upper canine; check-values.md section 9, pub): the distance from the
// CRes to the line of force times the distance from the CRes to the centre of rotation is constant
// for a tooth; derived here for the rigid root on springs.
TEST(LoadResolution, CentreOfRotationProductIsConstant) {
  const LoadContext c = context_for(cylinder_bed());
  double product = 0;
  for (double height : {2.0, 5.0, 9.0}) {
    SCOPED_TRACE(height);
    LoadSpec l = lingual_100g(MovementPreset::kNone);
    l.bracket_height_mm = height;
    const ResolvedLoad r = resolve_load(l, c);
    EXPECT_EQ(r.application_point.z(), height);
    EXPECT_LT((r.moment_nmm - (r.application_point - kBracket).cross(r.force_n)).norm(), 1e-15);
    Eigen::Vector3d p;
    ASSERT_TRUE(centre_of_rotation(c.response.motion(r.force_n, r.moment_nmm), &p));
    const double a = height - c.cres_x_z_mm, b = c.cres_x_z_mm - p.z();
    EXPECT_GT(b, 0);  // below the CRes
    if (product == 0) product = a * b;
    EXPECT_NEAR(a * b, product, 1e-9 * product);
  }
}

// Derived: intrusion and extrusion are vertical forces whose couple leaves the tooth unrotated.
TEST(LoadResolution, IntrusionAndExtrusion) {
  const LoadContext c = context_for(cylinder_bed());
  for (const auto preset : {MovementPreset::kIntrusion, MovementPreset::kExtrusion}) {
    SCOPED_TRACE(to_string(preset));
    const ResolvedLoad r = resolve_load(lingual_100g(preset), c);
    const double sign = preset == MovementPreset::kIntrusion ? -1 : 1;
    EXPECT_LT((r.force_n - sign * 0.980665 * Eigen::Vector3d::UnitZ()).norm(), 1e-12);
    const RigidMotion m = c.response.motion(r.force_n, r.moment_nmm);
    EXPECT_LT(m.rotation_rad.norm(), 1e-12 * m.translation_mm.norm());
    EXPECT_GT(sign * m.translation_mm.z(), 0);
    // The labial bracket's offset from the axis is what the couple cancels: M/F = x offset.
    EXPECT_NEAR(std::abs(r.moment_to_force_mm), kBracket.x(), 1e-9);
  }
}

// Derived: the rotation preset is a pure couple F x half the mesiodistal crown width about +z.
TEST(LoadResolution, RotationIsAPureCouple) {
  const LoadContext c = context_for(cylinder_bed());
  const ResolvedLoad r = resolve_load(lingual_100g(MovementPreset::kRotation), c);
  EXPECT_EQ(r.force_n, Eigen::Vector3d::Zero());
  EXPECT_NEAR(r.moment_nmm.z(), 0.980665 * 4.25, 1e-12);
  EXPECT_NEAR(r.moment_nmm.head<2>().norm(), 0, 1e-15);
  EXPECT_NEAR(r.moment_to_force_mm, 4.25, 1e-15);
  Eigen::Vector3d p;
  EXPECT_FALSE(centre_of_rotation(c.response.motion(r.force_n, r.moment_nmm), &p));
}

// Derived: a ratio gives the couple kappa |F| opposing the tipping; a given moment is applied as is
// and its opposing component reported as the ratio.
TEST(LoadResolution, RatioAndMomentCouples) {
  const LoadContext c = context_for(cylinder_bed());
  LoadSpec l = lingual_100g(MovementPreset::kNone);
  l.couple = CoupleKind::kRatio;
  l.moment_to_force_mm = 7.0;
  const ResolvedLoad r = resolve_load(l, c);
  EXPECT_NEAR(r.couple_nmm.y(), 7.0 * 0.980665, 1e-12);
  EXPECT_NEAR(r.moment_to_force_mm, 7.0, 1e-12);
  l.couple = CoupleKind::kMoment;
  l.moment_nmm = Eigen::Vector3d(1.0, 5.0, -2.0);
  const ResolvedLoad m = resolve_load(l, c);
  EXPECT_LT((m.couple_nmm - l.moment_nmm).norm(), 1e-12);
  EXPECT_NEAR(m.moment_to_force_mm, 5.0 / 0.980665, 1e-9);
  l.couple = CoupleKind::kNone;
  EXPECT_EQ(resolve_load(l, c).couple_nmm, Eigen::Vector3d::Zero());
}

// A mesiodistal force uses the mesiodistal CRes and tips about x.
TEST(LoadResolution, MesialTranslation) {
  const LoadContext c = context_for(root_bed(
      kCrest, kLength, [](double d) { return 3.0 * (1.0 - 0.5 * d / kLength); }, 10.0, 1.0));
  LoadSpec l = lingual_100g(MovementPreset::kTranslation);
  l.direction = Eigen::Vector3d(0, 2, 0);  // not normalised on purpose
  const ResolvedLoad r = resolve_load(l, c);
  EXPECT_NEAR(r.force_n.y(), 0.980665, 1e-12);
  const RigidMotion m = c.response.motion(r.force_n, r.moment_nmm);
  // No tipping about x and no turn about the long axis (the labial bracket's torque is cancelled).
  EXPECT_LT(m.rotation_rad.norm(), 1e-12 * m.translation_mm.norm());
  // The reported ratio is the tipping part only: the bracket height above the CRes.
  EXPECT_NEAR(r.moment_to_force_mm, kBracket.z() - c.cres_y_z_mm, 1e-9);
  EXPECT_NEAR(r.couple_nmm.z(), -kBracket.x() * r.force_n.y(), 1e-9);
}

template <class F>
void expect_input_error(F&& f, const std::string& key) {
  try {
    f();
    ADD_FAILURE() << "no InputError for " << key;
  } catch (const InputError& e) {
    EXPECT_EQ(e.key(), key);
    EXPECT_FALSE(std::string(e.what()).empty());
  }
}

TEST(LoadResolution, BadInputNamesTheKey) {
  const LoadContext c = context_for(cylinder_bed());
  LoadSpec l = lingual_100g(MovementPreset::kNone);
  l.direction.setZero();
  expect_input_error([&] { resolve_load(l, c); }, "load.direction");
  l = lingual_100g(MovementPreset::kTranslation);
  l.magnitude = -5;
  expect_input_error([&] { resolve_load(l, c); }, "load.magnitude");
  l.preset = MovementPreset::kRotation;
  expect_input_error([&] { resolve_load(l, c); }, "load.magnitude");
  l = lingual_100g(MovementPreset::kNone);
  l.bracket_height_mm = 30;
  expect_input_error([&] { resolve_load(l, c); }, "load.bracket_height_mm");
}

}  // namespace
}  // namespace sharpey::analysis::detail
