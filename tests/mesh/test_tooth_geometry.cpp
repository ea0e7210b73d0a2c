// The parametric tooth model without a mesh: closed-form areas and volumes of the idealised roots
// (derived), attachment and exposed areas under bone loss, root sections, the PDL width profile and
// the attachment level of a defect. The anatomical root areas against published tables are in
// test_root_calibration.cpp (calibration set) and test_root_validation.cpp (validation set).
#include <gtest/gtest.h>

#include <cmath>
#include <string>

#include "sharpey/core/constants.h"
#include "sharpey/error.h"
#include "sharpey/mesh/tooth_model.h"

namespace sharpey::mesh {
namespace {

using sharpey::core::kPi;

ModelSpec ideal(IdealRoot root) {
  ModelSpec s;
  s.tooth.ideal_root = root;
  s.tooth.ideal_radius_mm = 3.0;
  s.tooth.ideal_length_mm = 12.0;
  return s;
}

// Half the surface of an oblate spheroid with equatorial radius a and polar half-axis c < a.
// source: derived (surface of revolution of an ellipse, standard closed form)
double half_oblate_area(double a, double c) {
  const double e = std::sqrt(1 - c * c / (a * a));
  return kPi * a * a + kPi * c * c / (2 * e) * std::log((1 + e) / (1 - e));
}

// Cylinder crown of radius r and length Lc closed by a half-ellipsoid cap of height min(r, 0.3 Lc).
double cylinder_crown_volume(double r, double Lc) {
  const double cap = std::min(r, 0.3 * Lc);
  return kPi * r * r * (Lc - cap) + 2.0 / 3.0 * kPi * r * r * cap;
}

TEST(ToothGeometry, CylinderRootAreaAndVolumeMatchClosedForm) {
  const ModelSpec s = ideal(IdealRoot::kCylinder);
  const ModelGeometry g = model_geometry(s);
  const double R = 3, L = 12, c = R / 3, Lc = s.tooth.dimensions.crown_length_mm;
  // source: derived (cylinder plus half-ellipsoid of height R/3)
  const double area = 2 * kPi * R * (L - c) + half_oblate_area(R, c);
  const double volume =
      kPi * R * R * (L - c) + 2.0 / 3.0 * kPi * R * R * c + cylinder_crown_volume(R, Lc);
  EXPECT_NEAR(g.root_area_mm2, area, 1e-5 * area);
  EXPECT_NEAR(g.tooth_volume_mm3, volume, 1e-5 * volume);
  // Bone loss leaves the straight part: attachment = root area - 2 pi R (crest depth).
  const double crest_depth = s.bone.crest_below_cej_mm;
  EXPECT_NEAR(g.attachment_area_mm2, area - 2 * kPi * R * crest_depth, 1e-5 * area);
  EXPECT_NEAR(g.exposed_root_area_mm2, 2 * kPi * R * crest_depth, 1e-5 * area);
  EXPECT_NEAR(g.crest_z_mm, -crest_depth, 1e-12);
  EXPECT_NEAR(g.apex_z_mm, -L, 1e-9);
  EXPECT_NEAR(g.embedded_length_mm, L - crest_depth, 1e-9);
  EXPECT_NEAR(g.crown_tip.z(), Lc, 1e-9);
  EXPECT_NEAR(g.bracket_center.x(), R, 1e-9);
  EXPECT_NEAR(g.bracket_center.z(), 0.5 * Lc, 1e-6);
  EXPECT_NEAR(g.bracket_normal.x(), 1.0, 1e-9);
}

TEST(ToothGeometry, ParaboloidRootAreaAndVolumeMatchClosedForm) {
  const ModelSpec s = ideal(IdealRoot::kParaboloid);
  const ModelGeometry g = model_geometry(s);
  const double R = 3, L = 12, crest_height = L - s.bone.crest_below_cej_mm;
  const double k2 = R * R / crest_height;  // r^2 = k^2 h
  const double r_top = std::sqrt(k2 * L);
  // source: derived (paraboloid of revolution r^2 = k^2 h: volume pi k^2 L^2 / 2, lateral area
  // pi r / (6 L^2) ((r^2 + 4 L^2)^1.5 - r^3))
  const double area =
      kPi * r_top / (6 * L * L) * (std::pow(r_top * r_top + 4 * L * L, 1.5) - std::pow(r_top, 3));
  const double volume =
      kPi * k2 * L * L / 2 + cylinder_crown_volume(r_top, s.tooth.dimensions.crown_length_mm);
  EXPECT_NEAR(g.root_area_mm2, area, 1e-5 * area);
  EXPECT_NEAR(g.tooth_volume_mm3, volume, 1e-5 * volume);
  EXPECT_NEAR(root_section(s, -s.bone.crest_below_cej_mm).labiolingual_half_mm, R, 1e-9);
}

TEST(ToothGeometry, ConeRootWithRoundedTipMatchesClosedForm) {
  const ModelSpec s = ideal(IdealRoot::kCone);
  const ModelGeometry g = model_geometry(s);
  const double R = 3, L = 12, rho = 0.05 * R, cb = s.bone.crest_below_cej_mm;
  const double delta = cone_virtual_tip_below_apex_mm(s);
  const double k = R / (L - cb + delta), alpha = std::atan(k);
  // The rounding sphere touches the cone and its lowest point is the apex (derived).
  EXPECT_NEAR(delta, rho * (1 / std::sin(alpha) - 1), 1e-9);
  EXPECT_GT(delta, 0.0);
  EXPECT_LT(delta, 0.05 * L);
  // Heights above the virtual tip: apex delta, tangent circle h_t, CEJ L + delta.
  const double h_t = rho * std::cos(alpha) * std::cos(alpha) / std::sin(alpha);
  const double h_top = L + delta, cap = h_t - delta;
  // source: derived (spherical segment of height `cap` plus a conical frustum)
  const double volume = kPi * cap * cap * (3 * rho - cap) / 3 +
                        kPi * k * k * (std::pow(h_top, 3) - std::pow(h_t, 3)) / 3 +
                        cylinder_crown_volume(k * h_top, s.tooth.dimensions.crown_length_mm);
  const double area =
      2 * kPi * rho * cap + kPi * k * std::sqrt(1 + k * k) * (h_top * h_top - h_t * h_t);
  EXPECT_NEAR(g.tooth_volume_mm3, volume, 1e-5 * volume);
  EXPECT_NEAR(g.root_area_mm2, area, 1e-5 * area);
  // r(d) = R (1 - d / (L_e + delta)) at depth d below the crest (derived).
  const double embedded = L - cb;
  for (double d : {0.0, 2.0, 5.0, 9.0}) {
    SCOPED_TRACE("depth below crest " + std::to_string(d));
    EXPECT_NEAR(root_section(s, -cb - d).mesiodistal_half_mm, R * (1 - d / (embedded + delta)),
                1e-9);
  }
}

TEST(ToothGeometry, AttachmentAreaFallsWithHorizontalLoss) {
  ModelSpec s;
  double previous = 1e300;
  const double root = model_geometry(s).root_area_mm2;
  for (double loss : {0.0, 2.0, 4.0, 6.0, 8.0}) {
    SCOPED_TRACE("loss " + std::to_string(loss));
    s.loss.horizontal_mm = loss;
    const ModelGeometry g = model_geometry(s);
    EXPECT_LT(g.attachment_area_mm2, previous);
    EXPECT_NEAR(g.root_area_mm2, root, 1e-9 * root);  // the tooth does not change
    EXPECT_NEAR(g.crest_z_mm, -(s.bone.crest_below_cej_mm + loss), 1e-12);
    EXPECT_NEAR(g.embedded_length_mm,
                s.tooth.dimensions.root_length_mm - s.bone.crest_below_cej_mm - loss, 1e-9);
    previous = g.attachment_area_mm2;
  }
}

TEST(ToothGeometry, AttachmentAreaIsTheIntegralOfTheSectionPerimeter) {
  // Independent computation: integrate the ellipse perimeter (Ramanujan) times the meridian
  // stretch over depth, from root_section() alone. source: derived
  ModelSpec s;
  s.loss.horizontal_mm = 3;
  const ModelGeometry g = model_geometry(s);
  const int n = 1000;
  double area = 0;
  const double z0 = g.apex_z_mm + 1e-7, z1 = g.crest_z_mm;
  for (int i = 0; i < n; ++i) {
    const double za = z0 + (z1 - z0) * i / n, zb = z0 + (z1 - z0) * (i + 1) / n;
    const RootSection a = root_section(s, za), b = root_section(s, zb);
    const double ma = 0.5 * (a.labiolingual_half_mm + b.labiolingual_half_mm);
    const double mb = 0.5 * (a.mesiodistal_half_mm + b.mesiodistal_half_mm);
    const double h = (ma - mb) * (ma - mb) / ((ma + mb) * (ma + mb));
    const double perimeter = kPi * (ma + mb) * (1 + 3 * h / (10 + std::sqrt(4 - 3 * h)));
    const double dr = 0.5 * ((b.labiolingual_half_mm - a.labiolingual_half_mm) +
                             (b.mesiodistal_half_mm - a.mesiodistal_half_mm));
    area += perimeter * std::hypot(zb - za, dr);
  }
  // The slant is taken from the mean radius, exact only for circles: allow 1 %.
  EXPECT_NEAR(area, g.attachment_area_mm2, 0.01 * g.attachment_area_mm2);
}

TEST(ToothGeometry, HourglassWidthProfile) {
  ModelSpec s;
  s.pdl = {0.20, 0.14, 0.19};  // source: Coolidge 1937 (from memory, check-values.md section 2)
  s.loss.horizontal_mm = 2;
  const double crest = -(s.bone.crest_below_cej_mm + 2), apex = -s.tooth.dimensions.root_length_mm;
  EXPECT_NEAR(requested_pdl_width_mm(s, crest), 0.20, 1e-12);
  EXPECT_NEAR(requested_pdl_width_mm(s, 0.5 * (crest + apex)), 0.14, 1e-12);
  EXPECT_NEAR(requested_pdl_width_mm(s, apex), 0.19, 1e-12);
  EXPECT_NEAR(requested_pdl_width_mm(s, 0.75 * crest + 0.25 * apex), 0.17, 1e-12);
}

TEST(ToothGeometry, AngularDefectLowersTheAttachmentOnItsSurfaceOnly) {
  ModelSpec s;
  s.loss.defect_depth_mm = 3;
  s.loss.defect_width_deg = 60;
  const double crest = -s.bone.crest_below_cej_mm;
  const struct {
    ToothSurface surface;
    double angle;
  } cases[] = {{ToothSurface::kLabial, 0},
               {ToothSurface::kMesial, kPi / 2},
               {ToothSurface::kLingual, kPi},
               {ToothSurface::kDistal, -kPi / 2}};
  for (const auto& c : cases) {
    SCOPED_TRACE(to_string(c.surface));
    s.loss.defect_surface = c.surface;
    EXPECT_NEAR(attachment_level_z_mm(s, c.angle), crest - 3, 1e-12);
    EXPECT_NEAR(attachment_level_z_mm(s, c.angle + kPi / 6), crest, 1e-12);  // edge of 60 deg
    EXPECT_NEAR(attachment_level_z_mm(s, c.angle + kPi), crest, 1e-12);
    // cos^2 profile: half depth at a quarter of the width from the centre (derived)
    EXPECT_NEAR(attachment_level_z_mm(s, c.angle - kPi / 12), crest - 1.5, 1e-9);
    const ModelGeometry g = model_geometry(s);
    EXPECT_NEAR(g.defect_bottom_z_mm, crest - 3, 1e-12);
  }
  ModelSpec healthy;
  EXPECT_LT(model_geometry(s).attachment_area_mm2, model_geometry(healthy).attachment_area_mm2);
}

TEST(ToothGeometry, RootSectionsTaperToTheApex) {
  const ModelSpec s;
  const ToothDimensions& d = s.tooth.dimensions;
  const RootSection cervix = root_section(s, 0);
  EXPECT_NEAR(2 * cervix.labiolingual_half_mm, d.cervix_labiolingual_mm, 1e-9);
  EXPECT_NEAR(2 * cervix.mesiodistal_half_mm, d.cervix_mesiodistal_mm, 1e-9);
  double previous = 1e300;
  for (double z = 0; z >= -d.root_length_mm; z -= 0.5) {
    const RootSection r = root_section(s, z);
    EXPECT_LE(r.labiolingual_half_mm, previous);
    previous = r.labiolingual_half_mm;
  }
  EXPECT_NEAR(root_section(s, -d.root_length_mm).labiolingual_half_mm, 0.0, 1e-6);
  EXPECT_THROW(root_section(s, 1.0), InputError);
}

}  // namespace
}  // namespace sharpey::mesh
