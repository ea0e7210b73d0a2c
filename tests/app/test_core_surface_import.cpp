// The surface import's logic (core/surface_import.h) on the invented sample scan: the landmarks
// the built case carries place the tooth exactly as the dialog showed it, for every way the user
// can turn the axis; a case file's own landmarks are kept as given; a bad file is refused with the
// library's message.
#include <gtest/gtest.h>

#include <QFile>
#include <QTemporaryDir>

#include "core/surface_import.h"
#include "sharpey/error.h"

namespace sharpey::app {
namespace {

const QString kScan =
    QStringLiteral(SHARPEY_SOURCE_DIR "/samples/invented_scan_maxillary_canine.stl");
const QString kCase =
    QStringLiteral(SHARPEY_SOURCE_DIR "/samples/invented_scan_maxillary_canine.json");

struct Turn {
  bool crown, labial, mesial;
};
std::ostream& operator<<(std::ostream& os, const Turn& t) {
  return os << "crown/apex " << t.crown << ", labial/lingual " << t.labial << ", mesial/distal "
            << t.mesial;
}

class DerivedLandmarks : public ::testing::TestWithParam<Turn> {};

// Derived: the six landmarks written to the case give back, through the library's
// placement_from_landmarks, the placement shown (rotation, translation and mirroring), so the
// solved tooth is the one the user confirmed.
TEST_P(DerivedLandmarks, PlaceTheToothAsShown) {
  SurfaceImport import;
  ASSERT_TRUE(import.read_surface(kScan)) << import.error().toStdString();
  EXPECT_EQ(import.axis_source(), AxisSource::kPrincipalAxes);
  import.set_swap_crown_apex(GetParam().crown);
  import.set_swap_labial_lingual(GetParam().labial);
  import.set_swap_mesial_distal(GetParam().mesial);
  const mesh::ToothPlacement shown = import.placement();
  const mesh::ToothPlacement back =
      mesh::placement_from_landmarks(import.case_landmarks(), "tooth.surface.landmarks");
  EXPECT_LT((back.rotation - shown.rotation).norm(), 1e-9);
  EXPECT_LT((back.translation - shown.translation).norm(), 1e-7);
  EXPECT_EQ(back.mirrored, shown.mirrored);
  // Swapping crown and apex puts the CEJ 40 % of the length below the new crown end (the
  // proposal's rule): the crown end is at +0.4 L.
  const auto marks = import.shown_landmarks();
  ASSERT_EQ(marks.size(), 6u);
  EXPECT_NEAR(marks[1].point_mm.z(), 0.4 * import.length_mm(), 1e-9);
  // The CEJ points lie on the surface's sides: labial at +x, mesial at +y (derived).
  EXPECT_GT(marks[2].point_mm.x(), 0);
  EXPECT_LT(marks[3].point_mm.x(), 0);
  EXPECT_GT(marks[4].point_mm.y(), 0);
  EXPECT_LT(marks[5].point_mm.y(), 0);
}

INSTANTIATE_TEST_SUITE_P(EveryTurn, DerivedLandmarks,
                         ::testing::Values(Turn{false, false, false}, Turn{true, false, false},
                                           Turn{false, true, false}, Turn{false, false, true},
                                           Turn{true, true, true}));

// A case file's landmarks are carried over unchanged, and the case built from them imports the
// same tooth as the sample case file itself (the same file and landmarks: equal radius tables).
TEST(SurfaceImport, CaseFileLandmarksGiveTheSampleTooth) {
  SurfaceImport import;
  ASSERT_TRUE(import.read_surface(kScan));
  ASSERT_TRUE(import.read_landmarks(kCase)) << import.error().toStdString();
  EXPECT_EQ(import.axis_source(), AxisSource::kLandmarks);
  import.set_tooth_type(mesh::ToothType::kMaxillaryCanine);
  EXPECT_THROW(import.build_case(), InputError);  // not confirmed yet
  import.set_confirmed(true);
  const analysis::CaseSpec built = import.build_case();
  const analysis::CaseSpec sample = analysis::load_case(kCase.toStdString());
  ASSERT_TRUE(built.model.tooth.scan && sample.model.tooth.scan);
  EXPECT_EQ(built.model.tooth.type, mesh::ToothType::kMaxillaryCanine);
  EXPECT_EQ(built.model.tooth.scan->radius_mm, sample.model.tooth.scan->radius_mm);
  EXPECT_EQ(built.model.tooth.scan->source_sha256, sample.model.tooth.scan->source_sha256);
  EXPECT_EQ(built.scenarios.size(), 2u);
}

// A file the library refuses: read_surface is false with its message, nothing is kept.
TEST(SurfaceImport, GarbageIsRefusedWithTheLibrarysMessage) {
  QTemporaryDir dir;
  const QString path = dir.filePath("garbage.stl");
  QFile f(path);
  ASSERT_TRUE(f.open(QIODevice::WriteOnly));
  f.write("this is not a surface at all, just some words\n");
  f.close();
  SurfaceImport import;
  EXPECT_FALSE(import.read_surface(path));
  EXPECT_FALSE(import.has_surface());
  EXPECT_TRUE(import.error().contains(QStringLiteral("not a readable stl surface")))
      << import.error().toStdString();
  EXPECT_FALSE(import.read_landmarks(kCase));  // needs a surface first
  EXPECT_THROW(import.build_case(), InputError);
}

}  // namespace
}  // namespace sharpey::app
