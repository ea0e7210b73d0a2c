// sharpey-batch molar: the invented mandibular first molar sample runs and reports per-root
// figures with the caution; bad multi-rooted cases exit 2 with a message naming the key.
#include <gtest/gtest.h>

#include <nlohmann/json.hpp>

#include "sharpey/analysis/study.h"
#include "support/batch_process.h"

namespace sharpey::test {
namespace {

TEST(BatchMolar, SampleRunsAndReportsEveryRoot) {
  TempFolder out("molar");
  const ProcessResult r =
      run_batch({"molar", sample_path("invented_mandibular_first_molar_uprighting.json"), "--out",
                 out.path()});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const nlohmann::json j = nlohmann::json::parse(read_file(out / "multi_root_results.json"));
  EXPECT_EQ(j["caution"], analysis::caution_text());
  ASSERT_EQ(j["scenarios"].size(), 3u);
  double last_allowance = 1e9;
  for (const auto& s : j["scenarios"]) {
    ASSERT_EQ(s["roots"].size(), 2u);
    EXPECT_EQ(s["roots"][0]["name"], "mesial");
    EXPECT_EQ(s["roots"][1]["name"], "distal");
    EXPECT_TRUE(exists(out / s["root_map"].get<std::string>()));
    // derived: each step of the sample removes bone, so the allowance falls.
    const double allowance = s["allowance_limit_nmm"].get<double>();
    EXPECT_LT(allowance, last_allowance);
    last_allowance = allowance;
  }
  EXPECT_EQ(j["scenarios"][2]["furcation_degree"], 2);
  const std::string summary = read_file(out / "multi_root_summary.txt");
  EXPECT_NE(summary.find("Caution"), std::string::npos);
  EXPECT_NE(summary.find("distal"), std::string::npos);
}

TEST(BatchMolar, BadCasesNameTheKey) {
  TempFolder dir("molar_bad");
  const std::string base =
      R"({"kind": "multi_root_estimate", "tooth": {"type": "mandibular_first_molar"},
          "load": {"movement": "uprighting", "magnitude": 10}, "scenarios": [%s]})";
  auto run_with = [&](const std::string& scenario) {
    std::string text = base;
    text.replace(text.find("%s"), 2, scenario);
    write_file(dir / "case.json", text);
    return run_batch({"molar", dir / "case.json", "--out", dir / "out"});
  };
  struct Bad {
    const char* scenario;
    const char* key;
  };
  for (const Bad& b : {
           Bad{R"({"name": "a", "furcation": {"degree": 1, "horizontal_mm": 5}})",
               "furcation.horizontal_mm"},
           Bad{R"({"name": "a", "furcation": {"degree": 2, "entrances": ["mesial"]}})",
               "furcation.entrances"},
           Bad{R"({"name": "a", "furcation": {"degree": 5}})", "furcation.degree"},
           Bad{R"({"name": "a", "horizontal_loss_mm": 14})", "bone_loss_mm"},
           Bad{R"({"name": "a", "furcaton": {"degree": 1}})", "furcaton"},
       }) {
    const ProcessResult r = run_with(b.scenario);
    EXPECT_EQ(r.exit_code, 2) << b.scenario << "\n" << r.err;
    EXPECT_NE(r.err.find(b.key), std::string::npos) << r.err;
  }
  write_file(dir / "case.json",
             R"({"kind": "multi_root_estimate", "tooth": {"type": "mandibular_first_molar"},
                 "pdl": {"poisson_ratio": 0.5}, "scenarios": [{"name": "a"}],
                 "load": {"movement": "intrusion", "magnitude": 1, "unit": "N mm"}})");
  ProcessResult r = run_batch({"molar", dir / "case.json", "--out", dir / "out"});
  EXPECT_EQ(r.exit_code, 2);
  EXPECT_NE(r.err.find("load.unit"), std::string::npos) << r.err;  // a force in N mm
  write_file(dir / "case.json",
             R"({"kind": "multi_root_estimate", "tooth": {"type": "mandibular_first_molar"},
                 "pdl": {"poisson_ratio": 0.5}, "scenarios": [{"name": "a"}],
                 "load": {"movement": "intrusion", "magnitude": 1}})");
  r = run_batch({"molar", dir / "case.json", "--out", dir / "out"});
  EXPECT_EQ(r.exit_code, 2);
  EXPECT_NE(r.err.find("key pdl"), std::string::npos) << r.err;
}

TEST(BatchMolar, FiniteElementsBesideTheEstimate) {
  TempFolder dir("molar_fe");
  write_file(dir / "case.json",
             R"({"kind": "multi_root_estimate", "label": "invented check",
                 "tooth": {"type": "mandibular_first_molar"}, "finite_elements": true,
                 "scenarios": [{"name": "healthy"}],
                 "load": {"movement": "uprighting", "magnitude": 10}})");
  const ProcessResult r = run_batch({"molar", dir / "case.json", "--out", dir / "out"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const nlohmann::json j = nlohmann::json::parse(read_file(dir / "out/multi_root_results.json"));
  const auto& fe = j["scenarios"][0]["finite_elements"];
  ASSERT_EQ(fe["roots"].size(), 2u);
  // derived: both models of the same tooth put the CRes within 0.5 mm (the thin layer has a
  // rigid tooth and bone; here dentin and bone are finite; docs/molars.md).
  EXPECT_NEAR(fe["cres_mesiodistal_below_cej_mm"].get<double>(),
              j["scenarios"][0]["cres_mesiodistal_below_cej_mm"].get<double>(), 0.5);
  EXPECT_NE(read_file(dir / "out/multi_root_summary.txt").find("finite elements"),
            std::string::npos);
  // A scenario the mesher does not cover yet is refused before anything runs.
  write_file(dir / "bad.json",
             R"({"kind": "multi_root_estimate", "tooth": {"type": "mandibular_first_molar"},
                 "finite_elements": true,
                 "scenarios": [{"name": "II", "furcation": {"degree": 2}}],
                 "load": {"movement": "uprighting", "magnitude": 10}})");
  const ProcessResult bad = run_batch({"molar", dir / "bad.json", "--out", dir / "out2"});
  EXPECT_EQ(bad.exit_code, 2);
  EXPECT_NE(bad.err.find("finite_elements"), std::string::npos) << bad.err;
}

}  // namespace
}  // namespace sharpey::test
