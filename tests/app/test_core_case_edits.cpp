// Case-panel edits that change the model (materials, angular defects) reach the CaseSpec, mark the
// case modified and the results stale, survive a save and reload, and bad values are refused with
// the case-file key and the allowed range named, leaving the case as it was (no display needed).
#include <gtest/gtest.h>

#include <QTemporaryDir>
#include <string>

#include "core/case_session.h"
#include "sharpey/error.h"

namespace sharpey::app {
namespace {

struct MaterialCase {
  MaterialPart part;
  const char* key;  // case-file key of the material
};

class MaterialEdit : public ::testing::TestWithParam<MaterialCase> {};

TEST_P(MaterialEdit, ReachesTheSpecAndMarksTheResultsStale) {
  const MaterialCase c = GetParam();
  CaseSession session;
  int stale_signals = 0;
  QObject::connect(&session, &CaseSession::geometry_changed, [&]() { ++stale_signals; });
  const fem::Material before = session.material(c.part);
  const fem::Material edited{before.young_modulus_mpa * 1.5, 0.28};
  session.set_material(c.part, edited);
  EXPECT_EQ(session.material(c.part).young_modulus_mpa, edited.young_modulus_mpa);
  EXPECT_EQ(session.material(c.part).poisson_ratio, edited.poisson_ratio);
  EXPECT_TRUE(session.document().modified());
  EXPECT_TRUE(session.geometry_stale());
  EXPECT_EQ(stale_signals, 1);
  // The same value again is no edit.
  session.set_material(c.part, edited);
  EXPECT_EQ(stale_signals, 1);
  // Other materials untouched.
  for (MaterialPart other :
       {MaterialPart::kPdl, MaterialPart::kCorticalBone, MaterialPart::kCancellousBone}) {
    if (other == c.part) continue;
    CaseSession fresh;
    EXPECT_EQ(session.material(other).young_modulus_mpa, fresh.material(other).young_modulus_mpa);
  }
}

TEST_P(MaterialEdit, OutOfRangeIsRefusedWithTheKeyAndTheCaseIsUnchanged) {
  const MaterialCase c = GetParam();
  CaseSession session;
  const fem::Material before = session.material(c.part);
  struct Bad {
    fem::Material m;
    std::string key_suffix;
    std::string range;  // words of the allowed range in the message
  };
  const Bad bad[] = {{{0.0, 0.3}, ".young_modulus_mpa", "0 < E <= 1e6 MPa"},
                     {{-1.0, 0.3}, ".young_modulus_mpa", "0 < E <= 1e6 MPa"},
                     {{2e6, 0.3}, ".young_modulus_mpa", "0 < E <= 1e6 MPa"},
                     {{1.0, 0.5}, ".poisson_ratio", "0 <= nu < 0.5"},
                     {{1.0, -0.1}, ".poisson_ratio", "0 <= nu < 0.5"}};
  for (const Bad& b : bad) {
    SCOPED_TRACE(b.key_suffix + " E=" + std::to_string(b.m.young_modulus_mpa) +
                 " nu=" + std::to_string(b.m.poisson_ratio));
    try {
      session.set_material(c.part, b.m);
      ADD_FAILURE() << "accepted";
    } catch (const InputError& e) {
      EXPECT_EQ(e.key(), std::string(c.key) + b.key_suffix);
      EXPECT_NE(std::string(e.what()).find(b.range), std::string::npos) << e.what();
    }
    EXPECT_EQ(session.material(c.part).young_modulus_mpa, before.young_modulus_mpa);
    EXPECT_EQ(session.material(c.part).poisson_ratio, before.poisson_ratio);
    EXPECT_FALSE(session.document().modified());
  }
}

INSTANTIATE_TEST_SUITE_P(
    Parts, MaterialEdit,
    ::testing::Values(MaterialCase{MaterialPart::kPdl, "pdl.material"},
                      MaterialCase{MaterialPart::kCorticalBone, "bone.cortical_material"},
                      MaterialCase{MaterialPart::kCancellousBone, "bone.cancellous_material"}),
    [](const ::testing::TestParamInfo<MaterialCase>& p) {
      return std::string(p.param.key).substr(0, std::string(p.param.key).find('.')) +
             std::to_string(static_cast<int>(p.param.part));
    });

TEST(DefectEdit, ReachesTheLevelAndSurvivesSaveAndReload) {
  CaseSession session;  // new case: healthy and 3.0 mm loss
  ASSERT_EQ(session.levels().size(), 2);
  session.set_defect(1, 2.5, mesh::ToothSurface::kDistal, 90);
  const mesh::BoneLoss& loss = session.levels().at(1).loss;
  EXPECT_EQ(loss.defect_depth_mm, 2.5);
  EXPECT_EQ(loss.defect_surface, mesh::ToothSurface::kDistal);
  EXPECT_EQ(loss.defect_width_deg, 90);
  EXPECT_EQ(loss.horizontal_mm, 3.0);  // the horizontal loss stays
  EXPECT_EQ(session.spec().scenarios[1].loss.defect_depth_mm, 2.5);
  EXPECT_EQ(session.levels().at(0).loss.defect_depth_mm, 0);  // the other level untouched
  EXPECT_TRUE(session.geometry_stale());
  EXPECT_TRUE(session.document().modified());
  session.set_material(MaterialPart::kPdl, {0.2, 0.40});

  QTemporaryDir dir;
  ASSERT_TRUE(dir.isValid());
  const QString path = dir.filePath("edited.json");
  session.save(path);
  CaseSession reopened;
  reopened.open(path);
  const mesh::BoneLoss& back = reopened.levels().at(1).loss;
  EXPECT_EQ(back.defect_depth_mm, 2.5);
  EXPECT_EQ(back.defect_surface, mesh::ToothSurface::kDistal);
  EXPECT_EQ(back.defect_width_deg, 90);
  EXPECT_EQ(reopened.material(MaterialPart::kPdl).young_modulus_mpa, 0.2);
  EXPECT_EQ(reopened.material(MaterialPart::kPdl).poisson_ratio, 0.40);

  // Removing the defect: depth 0.
  reopened.set_defect(1, 0, mesh::ToothSurface::kDistal, 90);
  EXPECT_EQ(reopened.levels().at(1).loss.defect_depth_mm, 0);
}

struct BadDefect {
  int level;
  double depth_mm, width_deg;
  const char* key;  // case-file key named in the error
};

class DefectRefused : public ::testing::TestWithParam<BadDefect> {};

TEST_P(DefectRefused, NamesTheKeyAndLeavesTheCase) {
  const BadDefect b = GetParam();
  CaseSession session;
  const analysis::CaseSpec before = session.spec();
  try {
    session.set_defect(b.level, b.depth_mm, mesh::ToothSurface::kMesial, b.width_deg);
    ADD_FAILURE() << "accepted";
  } catch (const InputError& e) {
    EXPECT_EQ(e.key(), b.key) << e.what();
  }
  EXPECT_TRUE(session.spec() == before);
  EXPECT_FALSE(session.document().modified());
}

INSTANTIATE_TEST_SUITE_P(
    Values, DefectRefused,
    ::testing::Values(BadDefect{1, -1.0, 60, "scenarios[1].angular_defect.depth_mm"},
                      BadDefect{1, 2.0, 10, "scenarios[1].angular_defect.width_deg"},
                      BadDefect{1, 2.0, 200, "scenarios[1].angular_defect.width_deg"},
                      // deeper than the root allows (the root must stay attached)
                      BadDefect{1, 14.0, 60, "scenarios[1].angular_defect.depth_mm"},
                      BadDefect{5, 1.0, 60, "scenarios"}));

}  // namespace
}  // namespace sharpey::app

namespace sharpey::app {
namespace {

// The invented sample scan opens in the app's session with its surface; choosing a tooth from
// the list replaces the scan by that tooth's handbook surface (no stale scan left behind).
TEST(ScannedToothCase, OpensAndChoosingATypeDropsTheScan) {
  CaseSession session;
  session.open(QString::fromStdString(std::string(SHARPEY_SOURCE_DIR) +
                                      "/samples/invented_scan_maxillary_canine.json"));
  ASSERT_TRUE(session.spec().model.tooth.scan);
  EXPECT_EQ(session.spec().surface.file, "invented_scan_maxillary_canine.stl");
  session.set_tooth(mesh::ToothType::kMaxillaryCanine);
  EXPECT_FALSE(session.spec().model.tooth.scan);
  EXPECT_TRUE(session.spec().surface.file.empty());
  EXPECT_TRUE(session.geometry_stale());
}

}  // namespace
}  // namespace sharpey::app
