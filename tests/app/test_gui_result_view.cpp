// The 3D result view on a solved coarse incisor: colour-mapped pixels, colour bar range, threshold
// iso-lines, sections and quantities.
#include <gtest/gtest.h>

#include <QTest>
#include <algorithm>
#include <cmath>

#include "core/load_controls.h"
#include "core/colour_map.h"
#include "support/image_checks.h"
#include "support/solved_sample.h"
#include "view/colour_bar.h"
#include "view/result_view.h"
#include "view/vtk_view.h"

namespace sharpey::app {
namespace {

using testing::count_pixels;

// Pixels close to a colour of the diverging map away from its neutral middle (the PDL colours).
int colour_map_pixels(const QImage& image) {
  std::vector<QColor> palette;
  for (int i = -20; i <= 20; ++i)
    if (std::abs(i) >= 4) palette.push_back(to_qcolor(diverging_colour(i / 20.0)));
  return count_pixels(image, [&](const QColor& c) {
    // Saturated enough to be neither background grey nor tooth ivory.
    if (c.hsvSaturationF() < 0.25f) return false;
    for (const QColor& p : palette)
      if (std::abs(c.red() - p.red()) + std::abs(c.green() - p.green()) + std::abs(c.blue() - p.blue()) < 60)
        return true;
    return false;
  });
}

class ResultViewTest : public ::testing::Test {
 protected:
  void SetUp() override {
    study_ = testing::solved_incisor(1);
    view_ = std::make_unique<ResultView>();
    view_->resize(900, 650);
    view_->show();
    ASSERT_TRUE(QTest::qWaitForWindowExposed(view_.get()));
  }
  analysis::ScenarioResult evaluate(double magnitude_g) {
    analysis::LoadSpec load = study_->spec().load;
    load.magnitude = magnitude_g;
    return analysis::evaluate(*study_->solutions()[0], load, study_->spec().thresholds, nullptr);
  }
  void show(const analysis::ScenarioResult& r) {
    view_->show_result(*study_->solutions()[0], r, study_->spec().thresholds, QStringLiteral("test"));
    QApplication::processEvents();
  }
  std::shared_ptr<const analysis::Study> study_;
  std::unique_ptr<ResultView> view_;
};

TEST_F(ResultViewTest, TheLigamentIsColouredAndTheBarShowsTheComputedRange) {
  const analysis::ScenarioResult r = evaluate(100);
  show(r);
  const QImage image = view_->grab_image();
  testing::keep_image(image, "test_result_view");
  const int coloured = colour_map_pixels(image);
  EXPECT_GT(coloured, 500) << "colour-map pixels in a " << image.width() << "x" << image.height() << " view";
  const auto [lo, hi] = std::minmax_element(r.pressure_kpa.begin(), r.pressure_kpa.end());
  EXPECT_DOUBLE_EQ(view_->colour_bar()->range().min, *lo);
  EXPECT_DOUBLE_EQ(view_->colour_bar()->range().max, *hi);
  EXPECT_EQ(view_->colour_bar()->unit(), "kPa");
  // The summary peak is the largest nodal compression (same field, two places).
  EXPECT_NEAR(*hi, r.pressure_max_compression_kpa, 1e-9 * r.pressure_max_compression_kpa);
}

TEST_F(ResultViewTest, DoublingTheForceDoublesTheDisplayedPeak) {
  show(evaluate(100));
  const ValueRange single = view_->colour_bar()->range();
  show(evaluate(200));
  // Linear elasticity: the whole pressure field scales with the force (derived).
  EXPECT_NEAR(view_->colour_bar()->range().max, 2 * single.max, 1e-9 * single.max);
  EXPECT_NEAR(view_->colour_bar()->range().min, 2 * single.min, 1e-9 * single.max);
}

TEST_F(ResultViewTest, ThresholdIsoLinesOnlyForPressure) {
  const analysis::ScenarioResult r = evaluate(100);
  show(r);
  ASSERT_GT(r.pressure_max_compression_kpa, study_->spec().thresholds.limit.value_kpa)
      << "the 100 g sample passes both thresholds";
  EXPECT_GT(view_->scene()->n_iso_segments(), 10);
  view_->set_quantity(Quantity::kDisplacement);
  EXPECT_EQ(view_->scene()->n_iso_segments(), 0);
  EXPECT_EQ(view_->colour_bar()->unit(), QString::fromUtf8("\u00b5m"));
  EXPECT_GE(view_->colour_bar()->range().min, 0.0);
}

TEST_F(ResultViewTest, SectionShowsTheCutFace) {
  show(evaluate(100));
  const auto ivory = [](const QColor& c) {
    return std::abs(c.red() - 237) < 25 && std::abs(c.green() - 229) < 25 && std::abs(c.blue() - 209) < 30;
  };
  view_->set_bone_style(BoneStyle::kOpaque);
  QApplication::processEvents();
  const int tooth_before = count_pixels(view_->vtk_view()->grabFramebuffer(), ivory);
  view_->set_section(SectionPlane::kLabiolingual);
  QApplication::processEvents();
  const QImage cut = view_->grab_image();
  testing::keep_image(cut, "test_result_view_section");
  // Looking at the cut face, the tooth's section (root included) shows in full.
  EXPECT_GT(count_pixels(cut, ivory), tooth_before);
  EXPECT_GT(colour_map_pixels(cut), 200);
}

}  // namespace
}  // namespace sharpey::app
