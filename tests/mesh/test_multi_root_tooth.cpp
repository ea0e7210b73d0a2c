// Multi-rooted teeth (mesh/multi_root_tooth.h): handbook teeth validate, the surface quadrature
// reproduces closed-form areas, root areas against published and recalled figures, furcation
// degrees and their validation, attachment with bone loss and furcation involvement.
#include <gtest/gtest.h>

#include <Eigen/Geometry>
#include <cmath>
#include <iostream>

#include "sharpey/core/constants.h"
#include "sharpey/error.h"
#include "sharpey/mesh/multi_root_tooth.h"

namespace sharpey::mesh {
namespace {

using sharpey::core::kPi;

class HandbookMultiRoot : public ::testing::TestWithParam<MultiRootType> {};

TEST_P(HandbookMultiRoot, ValidatesAndHasItsStatus) {
  const MultiRootTooth t = multi_root_handbook(GetParam());
  EXPECT_NO_THROW(validate(t, MultiRootBone{}));
  EXPECT_FALSE(multi_root_handbook_status(GetParam()).empty());
  EXPECT_EQ(multi_root_type_from_string(to_string(GetParam())), GetParam());
}

TEST_P(HandbookMultiRoot, AreasConvergeWithTheQuadrature) {
  // derived: the default rule against one twice as fine, within 0.2 %.
  const MultiRootTooth t = multi_root_handbook(GetParam());
  const RootAreas a = root_areas(t, root_surface_points(t));
  const RootAreas f = root_areas(t, root_surface_points(t, 192, 96));
  EXPECT_NEAR(a.total_mm2, f.total_mm2, 0.002 * f.total_mm2);
  for (size_t r = 0; r < t.roots.size(); ++r)
    EXPECT_NEAR(a.root_mm2[r], f.root_mm2[r], 0.002 * f.root_mm2[r]);
}

// Calibration set: Jepsen 1963 (from memory, check-values.md sections 4 and 11). The handbook's
// taper fullness is the calibration's result; the validation against other sources is below
// (MultiRootAreaValidation), kept apart.
TEST_P(HandbookMultiRoot, TaperFullnessIsTheCalibrationOnJepsen) {
  // derived: multi_root_fullness_for_area recomputed from the handbook's outline.
  const MultiRootTooth t = multi_root_handbook(GetParam());
  const double m = multi_root_fullness_for_area(t, jepsen_root_area_mm2(GetParam()));
  for (const RootSpec& r : t.roots) EXPECT_NEAR(r.taper_fullness, m, 1e-5) << r.name;
}

TEST_P(HandbookMultiRoot, RootAreaWithinTheSpreadOfJepsen) {
  // Jepsen 1963 (from memory). Bound: the 10 to 25 % spread between published sources
  // (check-values.md section 4). The premolar reaches Jepsen's area exactly (calibrated); the
  // molars reach the fullest taper in range and fall short by their outlines (docs/molars.md).
  const MultiRootTooth t = multi_root_handbook(GetParam());
  const RootAreas a = root_areas(t, root_surface_points(t));
  const double jepsen = jepsen_root_area_mm2(GetParam());
  std::cout << to_string(GetParam()) << ": root area " << a.total_mm2 << " mm^2 (trunk "
            << a.trunk_mm2 << ", roof " << a.roof_mm2;
  for (size_t r = 0; r < t.roots.size(); ++r)
    std::cout << ", " << t.roots[r].name << " " << a.root_mm2[r];
  std::cout << "); Jepsen 1963 (mem) " << jepsen << " mm^2, " << 100 * (a.total_mm2 / jepsen - 1)
            << " %\n";
  RecordProperty("root_area_mm2", std::to_string(a.total_mm2));
  EXPECT_NEAR(a.total_mm2, jepsen, 0.25 * jepsen);
  if (t.roots.front().taper_fullness < kMaxRootTaperFullness) {
    EXPECT_NEAR(a.total_mm2, jepsen, 1e-3);
  }
}

INSTANTIATE_TEST_SUITE_P(Teeth, HandbookMultiRoot, ::testing::ValuesIn(all_multi_root_types()),
                         [](const ::testing::TestParamInfo<MultiRootType>& p) {
                           return to_string(p.param);
                         });

TEST(MultiRootAreas, MandibularFirstMolarMesialRootLargerThanDistalAsPublished) {
  // source: Dunlap and Gher 1985, J Periodontol 56:234 (abstract): mesial to distal root surface
  // 1.0 : 0.88. Bound widened to +-0.08: the abstract gives the mean ratio only.
  const MultiRootTooth t = multi_root_handbook(MultiRootType::kMandibularFirstMolar);
  const RootAreas a = root_areas(t, root_surface_points(t));
  const double ratio = a.root_mm2[1] / a.root_mm2[0];
  std::cout << "mandibular first molar distal / mesial root area " << ratio << "\n";
  EXPECT_NEAR(ratio, 0.88, 0.08);
}

TEST(MultiRootAreas, MandibularFirstMolarHalfTheAreaInTheCoronalSixMillimetres) {
  // source: Dunlap and Gher 1985, J Periodontol 56:234 (abstract): 48.7 % of the root surface
  // lies in the coronal 6 mm (mean root length 14.4 mm; ours 14.0 mm). Bound widened to +-6
  // points: the abstract gives the mean only, and our root is 0.4 mm shorter.
  const MultiRootTooth t = multi_root_handbook(MultiRootType::kMandibularFirstMolar);
  const std::vector<RootSurfacePoint> p = root_surface_points(t);
  double coronal = 0, total = 0;
  for (const RootSurfacePoint& q : p) {
    total += q.area_mm2;
    if (q.x.z() > -6.0) coronal += q.area_mm2;
  }
  std::cout << "mandibular first molar: " << 100 * coronal / total
            << " % of the root surface in the coronal 6 mm (published 48.7 %)\n";
  EXPECT_NEAR(coronal / total, 0.487, 0.06);
}

TEST(MultiRootAreas, CalibrationReachesAReachableArea) {
  // derived: bisection on a monotone area; the two-rooted premolar reaches Jepsen's 234 mm^2
  // (from memory); the molars do not within the fullness range (docs/molars.md).
  MultiRootTooth t = multi_root_handbook(MultiRootType::kMaxillaryFirstPremolarTwoRoots);
  const double m = multi_root_fullness_for_area(t, 234.0);
  for (RootSpec& r : t.roots) r.taper_fullness = m;
  EXPECT_NEAR(root_areas(t, root_surface_points(t)).total_mm2, 234.0, 1e-3);
  const MultiRootTooth molar = multi_root_handbook(MultiRootType::kMandibularFirstMolar);
  EXPECT_EQ(multi_root_fullness_for_area(molar, 431.0), kMaxRootTaperFullness);
}

// Validation set, apart from the calibration: Limsiriwong et al. 2019, Chiang Mai Dent J 40:57
// (published, abstract; CBCT, Class I skeletal pattern): maxillary first molar 447.41, second
// molar 386.26, first premolar 258.70 mm^2 (all root forms). Bound: the 10 to 25 % spread between
// sources (check-values.md section 4), its upper end.
struct PublishedArea {
  MultiRootType type;
  double area_mm2;
};
class MultiRootAreaValidation : public ::testing::TestWithParam<PublishedArea> {};

TEST_P(MultiRootAreaValidation, WithinTheSpreadOfACbctStudy) {
  const MultiRootTooth t = multi_root_handbook(GetParam().type);
  const double a = root_areas(t, root_surface_points(t)).total_mm2;
  const double published = GetParam().area_mm2;
  std::cout << to_string(GetParam().type) << ": " << a << " mm^2 against " << published
            << " (Limsiriwong 2019), " << 100 * (a / published - 1) << " %\n";
  EXPECT_NEAR(a, published, 0.25 * published);
}

INSTANTIATE_TEST_SUITE_P(
    Limsiriwong2019, MultiRootAreaValidation,
    ::testing::Values(PublishedArea{MultiRootType::kMaxillaryFirstMolar, 447.41},
                      PublishedArea{MultiRootType::kMaxillarySecondMolar, 386.26},
                      PublishedArea{MultiRootType::kMaxillaryFirstPremolarTwoRoots, 258.70}),
    [](const ::testing::TestParamInfo<PublishedArea>& p) { return to_string(p.param.type); });

TEST(RootSection, FootAreaAndPerimeterFromTheShape) {
  // derived, two computations: the closed-form foot area (ellipse less (16/15) a b f) against the
  // polygon of 20 000 section points; a cylinder's lateral area from the quadrature (analytic
  // derivatives) against the polygon's perimeter times the length.
  RootSpec r;
  r.profile = RootProfile::kCylinder;
  r.half_x_mm = 3.0;
  r.half_y_mm = 1.6;
  r.length_mm = 10;
  r.foot_y_mm = 2.2;
  r.furcal_concavity_mm = 0.6;
  r.furcal_side_deg = -90;
  double area = 0, perimeter = 0;
  const int n = 20000;
  Eigen::Vector2d prev = root_section_offset(r, 0);
  for (int i = 1; i <= n; ++i) {
    const Eigen::Vector2d p = root_section_offset(r, 2 * kPi * i / n);
    area += 0.5 * (prev.x() * p.y() - prev.y() * p.x());
    perimeter += (p - prev).norm();
    prev = p;
  }
  EXPECT_NEAR(root_foot_area_mm2(r), area, 1e-6 * area);
  EXPECT_LT(root_foot_area_mm2(r), kPi * 3.0 * 1.6);
  // The middle of the furcal (distal) face is drawn in by the concavity, the opposite face not.
  EXPECT_NEAR(root_section_offset(r, -kPi / 2).y(), -1.6 + 0.6, 1e-12);
  EXPECT_NEAR(root_section_offset(r, kPi / 2).y(), 1.6, 1e-12);
  MultiRootTooth t;
  t.furcation_half_x_mm = t.furcation_half_y_mm = 4.4;
  t.roots = {r};
  const RootAreas a = root_areas(t, root_surface_points(t, 384, 48));
  EXPECT_NEAR(a.root_mm2[0], perimeter * 10 + area, 1e-4 * a.root_mm2[0]);
  EXPECT_NEAR(a.roof_mm2, kPi * 4.4 * 4.4 - root_foot_area_mm2(r), 1e-9 * a.roof_mm2);
}

TEST(RootSection, TaperedConcaveRootAreaAgreesWithAFineTriangulation) {
  // derived, two computations: the quadrature (analytic derivatives, including the concavity's
  // fade along the root) against the area of a fine triangulated surface through the section
  // points (2000 around, 3000 rings crowding toward the apex), the mandibular first molar's
  // mesial root.
  const MultiRootTooth t = multi_root_handbook(MultiRootType::kMandibularFirstMolar);
  const RootSpec& r = t.roots[0];
  const double quadrature = root_areas(t, root_surface_points(t)).root_mm2[0];
  const int n_around = 2000, n_rings = 3000;
  const double slope = std::tan(r.tilt_deg * kPi / 180);
  auto point = [&](int i, int j) {
    const double v = static_cast<double>(j) / n_rings;
    const double depth = r.length_mm * (1 - (1 - v) * (1 - v));
    const double rho =
        std::sqrt(std::max(0.0, 1 - std::pow(depth / r.length_mm, r.taper_fullness)));
    const Eigen::Vector2d o = root_section_offset(r, 2 * kPi * i / n_around, depth);
    const double cy = r.foot_y_mm + slope * std::sin(r.tilt_direction_deg * kPi / 180) * depth;
    const double cx = r.foot_x_mm + slope * std::cos(r.tilt_direction_deg * kPi / 180) * depth;
    return Eigen::Vector3d(cx + rho * o.x(), cy + rho * o.y(), -depth);
  };
  double area = 0;
  for (int j = 0; j < n_rings; ++j)
    for (int i = 0; i < n_around; ++i) {
      const Eigen::Vector3d a = point(i, j), b = point(i + 1, j), c = point(i + 1, j + 1),
                            d = point(i, j + 1);
      area += 0.5 * ((b - a).cross(c - a).norm() + (c - a).cross(d - a).norm());
    }
  EXPECT_NEAR(quadrature, area, 2e-3 * area);
}

TEST(RootSection, ConcavityOutOfRangeIsRefused) {
  MultiRootTooth t = multi_root_handbook(MultiRootType::kMandibularFirstMolar);
  t.roots[0].furcal_concavity_mm = 1.5;  // more than 0.6 of the 1.8 mm half-width
  EXPECT_THROW(validate(t, MultiRootBone{}), InputError);
  t.roots[0].furcal_concavity_mm = 0.5;
  t.roots[0].furcal_side_deg = 45;
  EXPECT_THROW(validate(t, MultiRootBone{}), InputError);
}

TEST(MultiRootAreas, CylindersAndFrustumMatchClosedForms) {
  // derived: circular frustum pi (R1 + R2) sqrt((R1 - R2)^2 + T^2); cylinder 2 pi R L + pi R^2;
  // roof pi A B minus the feet.
  MultiRootTooth t;
  t.trunk_length_mm = 3;
  t.cervix_half_x_mm = t.cervix_half_y_mm = 5;
  t.furcation_half_x_mm = t.furcation_half_y_mm = 4.5;
  RootSpec r;
  r.profile = RootProfile::kCylinder;
  r.half_x_mm = r.half_y_mm = 1.5;
  r.length_mm = 10;
  r.name = "mesial";
  r.foot_y_mm = 2.2;
  t.roots.push_back(r);
  r.name = "distal";
  r.foot_y_mm = -2.2;
  t.roots.push_back(r);
  ASSERT_NO_THROW(validate(t, MultiRootBone{}));
  const RootAreas a = root_areas(t, root_surface_points(t));
  EXPECT_NEAR(a.trunk_mm2, kPi * 9.5 * std::sqrt(0.25 + 9.0), 1e-6 * a.trunk_mm2);
  EXPECT_NEAR(a.root_mm2[0], 2 * kPi * 1.5 * 10 + kPi * 1.5 * 1.5, 1e-6 * a.root_mm2[0]);
  EXPECT_NEAR(a.roof_mm2, kPi * (4.5 * 4.5 - 2 * 1.5 * 1.5), 1e-9 * a.roof_mm2);
}

MultiRootBone bone_with(double loss_mm, int degree, double depth_mm = 0) {
  MultiRootBone b;
  b.loss.horizontal_mm = loss_mm;
  b.furcation.degree = degree;
  b.furcation.horizontal_mm = depth_mm;
  return b;
}

double attached(MultiRootType type, const MultiRootBone& bone) {
  const MultiRootTooth t = multi_root_handbook(type);
  std::vector<RootSurfacePoint> p = root_surface_points(t);
  attach(t, bone, &p);
  return root_areas(t, p).attached_total_mm2;
}

TEST(MultiRootAttachment, HealthyToothIsAttachedBelowTheCrestOnly) {
  const MultiRootTooth t = multi_root_handbook(MultiRootType::kMandibularFirstMolar);
  std::vector<RootSurfacePoint> p = root_surface_points(t);
  attach(t, MultiRootBone{}, &p);
  const RootAreas a = root_areas(t, p);
  for (size_t r = 0; r < t.roots.size(); ++r)
    EXPECT_DOUBLE_EQ(a.attached_root_mm2[r], a.root_mm2[r]);
  EXPECT_DOUBLE_EQ(a.attached_roof_mm2, a.roof_mm2);
  // derived: the trunk is attached from the crest (1.5 mm) to the furcation (3 mm), about half
  // of it (its sections shrink a little with depth).
  EXPECT_NEAR(a.attached_trunk_mm2 / a.trunk_mm2, 0.5, 0.02);
  // Between the roots the surface is inter-radicular; the trunk never is.
  int n_inter = 0;
  for (const RootSurfacePoint& q : p) {
    if (q.part == kTrunkPart) {
      EXPECT_FALSE(q.inter_radicular);
    }
    n_inter += q.inter_radicular;
  }
  EXPECT_GT(n_inter, 0);
}

TEST(MultiRootAttachment, FallsWithLossAndFurcationDegree) {
  // derived: each step removes bone, none adds any.
  for (MultiRootType type :
       {MultiRootType::kMandibularFirstMolar, MultiRootType::kMaxillaryFirstMolar}) {
    const double healthy = attached(type, MultiRootBone{});
    const double loss = attached(type, bone_with(3, 0));
    const double d1 = attached(type, bone_with(3, 1));
    const double d2 = attached(type, bone_with(3, 2));
    const double d3 = attached(type, bone_with(3, 3));
    std::cout << to_string(type) << ": attached " << healthy << ", 3 mm loss " << loss
              << ", furcation I " << d1 << ", II " << d2 << ", III " << d3 << " mm^2\n";
    EXPECT_LT(loss, healthy);
    EXPECT_LT(d1, loss);
    EXPECT_LT(d2, d1);
    EXPECT_LT(d3, d2);
  }
}

TEST(MultiRootAttachment, PdlWidthFollowsTheProfileOnEveryRoot) {
  // Hourglass widths crest 0.20, mid-root 0.14, apex 0.19 mm (Coolidge 1937, from memory;
  // check-values.md section 2), per root from the bone level at its top to its own apex
  // (derived: the piecewise-linear profile recomputed here).
  const MultiRootTooth t = multi_root_handbook(MultiRootType::kMaxillaryFirstMolar);
  MultiRootBone bone;
  bone.pdl = {0.20, 0.14, 0.19};
  std::vector<RootSurfacePoint> p = root_surface_points(t);
  attach(t, bone, &p);
  const double zf = -t.trunk_length_mm;
  for (size_t r = 0; r < t.roots.size(); ++r) {
    const double apex = zf - t.roots[r].length_mm;
    double lo = 1, hi = 0;
    for (const RootSurfacePoint& q : p) {
      if (q.part != static_cast<int>(r)) continue;
      const double f = (zf - q.x.z()) / (zf - apex);
      const double w = f <= 0.5 ? 0.20 + (0.14 - 0.20) * 2 * f : 0.14 + (0.19 - 0.14) * (2 * f - 1);
      EXPECT_NEAR(q.pdl_width_mm, w, 1e-12);
      lo = std::min(lo, q.pdl_width_mm);
      hi = std::max(hi, q.pdl_width_mm);
    }
    std::cout << t.roots[r].name << " root: PDL width " << lo << " to " << hi << " mm\n";
    EXPECT_NEAR(lo, 0.14, 0.002);  // the quadrature's nearest point to mid-root
    EXPECT_NEAR(hi, 0.20, 0.002);
  }
}

TEST(MultiRootValidation, FurcationDepthMustFitItsDegree) {
  const MultiRootTooth t = multi_root_handbook(MultiRootType::kMandibularFirstMolar);
  const double through = furcation_through_depth_mm(t, FurcationEntrance::kBuccal);
  EXPECT_GT(through, 6.0);
  auto key_of = [&](const MultiRootBone& b) {
    try {
      validate(t, b);
    } catch (const InputError& e) {
      std::cout << "  " << e.key() << ": " << e.what() << "\n";
      return e.key();
    }
    return std::string("accepted");
  };
  EXPECT_EQ(key_of(bone_with(0, 1, 2.5)), "accepted");
  EXPECT_EQ(key_of(bone_with(0, 1, 4.0)), "furcation.horizontal_mm");          // I is at most 3 mm
  EXPECT_EQ(key_of(bone_with(0, 2, 2.0)), "furcation.horizontal_mm");          // II is beyond 3 mm
  EXPECT_EQ(key_of(bone_with(0, 2, through + 1)), "furcation.horizontal_mm");  // that is III
  EXPECT_EQ(key_of(bone_with(0, 3, 2.0)), "furcation.horizontal_mm");          // III goes through
  EXPECT_EQ(key_of(bone_with(0, 4)), "furcation.degree");
  MultiRootBone b = bone_with(0, 2);
  b.furcation.entrances = {FurcationEntrance::kMesial};  // no mesial furcation on this tooth
  EXPECT_EQ(key_of(b), "furcation.entrances");
  EXPECT_EQ(key_of(bone_with(12, 0)), "bone_loss_mm");
  MultiRootTooth wide = t;
  wide.roots[0].half_x_mm = 4.5;  // reaches outside the trunk
  EXPECT_THROW(validate(wide, MultiRootBone{}), InputError);
  MultiRootTooth touching = t;
  touching.roots[0].foot_y_mm = 0.0;  // overlaps the distal root (concave faces and all)
  EXPECT_THROW(validate(touching, MultiRootBone{}), InputError);
  EXPECT_THROW(multi_root_type_from_string("third_molar"), InputError);
  // The maxillary molar has its furcations buccally, mesially and distally, not palatally.
  const MultiRootTooth upper = multi_root_handbook(MultiRootType::kMaxillaryFirstMolar);
  EXPECT_NO_THROW(furcation_through_depth_mm(upper, FurcationEntrance::kMesial));
  EXPECT_NO_THROW(furcation_through_depth_mm(upper, FurcationEntrance::kBuccal));
  EXPECT_THROW(furcation_through_depth_mm(upper, FurcationEntrance::kLingual), InputError);
}

}  // namespace
}  // namespace sharpey::mesh
