// Key-number table, CSV and the plain verdict (no display needed).
#include <gtest/gtest.h>

#include <cmath>

#include "core/help_text.h"
#include "core/quantity.h"
#include "core/scenario_table.h"
#include "core/verdict.h"
#include "sharpey/output/report_output.h"

namespace sharpey::app {
namespace {

analysis::ScenarioResult result(const char* name, double loss, double peak, double above_cap,
                                double above_lim) {
  analysis::ScenarioResult r;
  r.name = name;
  r.bone_loss_mm = loss;
  r.attachment_area_mm2 = 200 - 10 * loss;
  r.pressure_max_compression_kpa = peak;
  r.pressure_max_tension_kpa = 0.5 * peak;
  r.area_above_capillary_mm2 = above_cap;
  r.area_above_limit_mm2 = above_lim;
  r.cres_labiolingual.from_crest_mm = 4 + 0.5 * loss;
  r.cres_labiolingual.fraction_embedded = 0.4;
  r.cres_mesiodistal.from_crest_mm = 5 + 0.5 * loss;
  r.mf_translation_mm = 9 + loss;
  r.load.force_n = Eigen::Vector3d(-0.98, 0, 0);
  r.equivalent_force_peak_g = loss == 0 ? 100 : 100 * 3 / peak;
  r.equivalent_force_area_rule_g = -1;
  return r;
}

TEST(ScenarioTable, OneRowPerScenarioWithUnits) {
  const std::vector<analysis::ScenarioResult> results = {result("healthy", 0, 3, 0, 0),
                                                         result("4.0 mm loss", 4, 9, 12.5, 0)};
  const ScenarioTable t = make_table(results);
  ASSERT_EQ(t.row_names.size(), 2);
  ASSERT_EQ(t.values.size(), 2u);
  ASSERT_EQ(t.values[0].size(), all_key_numbers().size());
  const int peak = 2, cres = 6, eq_area = 10;
  ASSERT_EQ(t.columns[static_cast<size_t>(peak)], KeyNumber::kPeakCompression);
  EXPECT_EQ(t.cell_text(1, peak), "9.0");
  EXPECT_EQ(t.header_text(peak), "peak compression (kPa)");
  // Labiolingual force: the labiolingual CRes is reported.
  EXPECT_DOUBLE_EQ(t.values[1][static_cast<size_t>(cres)], 6.0);
  EXPECT_EQ(t.cell_text(0, eq_area), "n/a");  // -1 means not available
}

TEST(ScenarioTable, MesiodistalForceReportsTheMesiodistalCRes) {
  auto r = result("healthy", 0, 3, 0, 0);
  r.load.force_n = Eigen::Vector3d(0.1, 0.9, 0);
  EXPECT_DOUBLE_EQ(key_value(r, KeyNumber::kCresFromCrest), 5.0);
}

TEST(ScenarioTable, CsvStartsWithTheCommentLines) {
  const ScenarioTable t = make_table({result("a, b", 2, 5, 1, 0)}, {KeyNumber::kBoneLoss});
  const QString csv = t.to_csv({"Caution: model estimate"});
  const QStringList lines = csv.split('\n');
  ASSERT_GE(lines.size(), 3);
  EXPECT_EQ(lines[0], "# Caution: model estimate");
  EXPECT_EQ(lines[1], "scenario,bone loss (mm)");
  EXPECT_EQ(lines[2], "\"a, b\",2.0");
}

analysis::Thresholds thresholds() {
  analysis::Thresholds t;
  t.capillary = {4.7, "test"};
  t.limit = {16.0, "test"};
  return t;
}

struct VerdictCase {
  double peak, above_cap, above_lim;
  VerdictLevel expected;
};
class Verdicts : public ::testing::TestWithParam<VerdictCase> {};

TEST_P(Verdicts, LevelFollowsTheThresholds) {
  const auto& p = GetParam();
  const Verdict v = judge(result("x", 0, p.peak, p.above_cap, p.above_lim), thresholds());
  EXPECT_EQ(v.level, p.expected);
  EXPECT_FALSE(v.headline.isEmpty());
  EXPECT_TRUE(v.detail.contains("kPa")) << v.detail.toStdString();
}
INSTANTIATE_TEST_SUITE_P(Levels, Verdicts,
                         ::testing::Values(VerdictCase{3.0, 0, 0, VerdictLevel::kBelowCapillary},
                                           VerdictCase{4.69, 0, 0, VerdictLevel::kBelowCapillary},
                                           VerdictCase{4.8, 0.3, 0, VerdictLevel::kAboveCapillary},
                                           VerdictCase{15.9, 20, 0, VerdictLevel::kAboveCapillary},
                                           VerdictCase{16.5, 40, 2.0, VerdictLevel::kAboveLimit},
                                           // At a threshold is not above it (strict rule), and
                                           // the level follows the peak even where the sampled
                                           // area is 0 (a peak at one node).
                                           VerdictCase{4.7, 0, 0, VerdictLevel::kBelowCapillary},
                                           VerdictCase{16.0, 30, 0, VerdictLevel::kAboveCapillary},
                                           VerdictCase{16.2, 30, 0, VerdictLevel::kAboveLimit}));

// Issue 12, point 3: the app's verdict, the batch summary and the library are one rule.
TEST(Verdicts, TheAppAndTheBatchSummaryReadTheSameVerdict) {
  analysis::CaseSpec spec;
  spec.thresholds = thresholds();
  const struct {
    double peak;
    const char* summary_words;  // as summary.txt writes the level
  } cases[] = {{4.7, "stays below capillary pressure"},
               {9.0, "is above capillary pressure"},
               {16.0, "is above capillary pressure"},
               {18.2, "is above the physiological limit"}};
  for (const auto& c : cases) {
    SCOPED_TRACE(c.peak);
    const analysis::ScenarioResult r = result("level", 0, c.peak, 12.0, 3.0);
    const Verdict app = judge(r, spec.thresholds);
    EXPECT_EQ(app.level, analysis::pressure_verdict(r, spec.thresholds).level);
    const std::string summary = analysis::summary_text(spec, {r});
    EXPECT_NE(summary.find(c.summary_words), std::string::npos) << summary;
    EXPECT_EQ(app.headline.toLower().toStdString(), analysis::short_label(app.level));
  }
  // The words are factual: threshold, area and share (derived: 3.0 / 200 mm^2 = 2 %).
  const Verdict above = judge(result("level", 0, 18.2, 12.0, 3.0), spec.thresholds);
  EXPECT_EQ(above.detail.toStdString(),
            "Peak compression 18.2 kPa, above the 16.0 kPa physiological limit over 3.0 mm\u00b2 "
            "(2 % of the "
            "attachment).");
}

// Issue 12, point 10: the help page explains every quantity named in the issue, with the case's
// thresholds, their sources and the caution.
TEST(Help, ThePageExplainsEveryQuantity) {
  analysis::Thresholds t = thresholds();
  t.capillary.source = "capillary source & co";
  const QString html = help_html(t);
  for (const char* term :
       {"hydrostatic pressure", "principal strain", "von Mises stress", "equivalent force",
        "area rule", "95th percentile", "CRes", "CRot", "M/F"}) {
    EXPECT_TRUE(help_terms().contains(QString::fromLatin1(term))) << term;
    EXPECT_TRUE(html.contains(QStringLiteral("<b>%1</b>").arg(QString::fromLatin1(term)))) << term;
  }
  EXPECT_TRUE(html.contains(QStringLiteral("capillary source &amp; co")));
  EXPECT_TRUE(html.contains(QStringLiteral("16.0 kPa")));
  EXPECT_TRUE(html.contains(QString::fromStdString(analysis::caution_text()).toHtmlEscaped()));
}

TEST(Quantity, ValuesFollowThePdlNodeOrderInDisplayUnits) {
  analysis::ScenarioResult r;
  r.pressure_kpa = {1.0, -2.0};
  r.max_principal_strain_field = {0.01, 0.02};
  r.equivalent_strain_field = {0.03, 0.04};
  r.von_mises_kpa = {5, 6};
  r.displacement_mm = Eigen::Matrix3Xd::Zero(3, 4);
  r.displacement_mm.col(3) = Eigen::Vector3d(0.003, 0.004, 0);  // 5 um
  const std::vector<int> pdl_nodes = {3, 0};
  EXPECT_EQ(quantity_values(r, Quantity::kPressure, pdl_nodes), (std::vector<double>{1.0, -2.0}));
  EXPECT_DOUBLE_EQ(quantity_values(r, Quantity::kMaxPrincipalStrain, pdl_nodes)[1], 2.0);  // %
  const auto d = quantity_values(r, Quantity::kDisplacement, pdl_nodes);
  EXPECT_NEAR(d[0], 5.0, 1e-12);
  EXPECT_DOUBLE_EQ(d[1], 0.0);
  // A field missing from the result stays missing rather than turning into zeros.
  r.von_mises_kpa.clear();
  EXPECT_TRUE(std::isnan(quantity_values(r, Quantity::kVonMises, pdl_nodes)[0]));
}

}  // namespace
}  // namespace sharpey::app
