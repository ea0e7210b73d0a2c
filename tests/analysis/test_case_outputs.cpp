// Report writers on hand-made results (no solve): atomic files, staged folders, the fixed keys of
// results.json, the caution line of every CSV, root-map layout, CSV quoting.
#include <gtest/gtest.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cmath>
#include <nlohmann/json.hpp>
#include <sstream>
#include <string>

#include "sharpey/output/report_output.h"
#include "support/batch_process.h"
#include "support/results_keys.h"

namespace sharpey::analysis {
namespace {

using Json = nlohmann::json;

CaseSpec two_scenario_case() {
  return parse_case(R"({
    "label": "Invented test case, with a comma",
    "tooth": {"type": "maxillary_central_incisor"},
    "scenarios": [{"name": "healthy"}, {"name": "4 mm, loss", "horizontal_loss_mm": 4}],
    "load": {"magnitude": 100, "unit": "g", "direction": "lingual"}
  })");
}

ScenarioResult made_up_result(const std::string& name, double loss, double peak) {
  ScenarioResult r;
  r.name = name;
  r.bone_loss_mm = loss;
  r.attachment_area_mm2 = 200 - 10 * loss;
  r.cres_labiolingual.from_crest_mm = 4.5;
  r.cres_labiolingual.fraction_embedded = 0.39;
  r.cres_mesiodistal.from_crest_mm = 4.1;
  r.cres_mesiodistal.fraction_embedded = 0.35;
  r.mf_translation_mm = 10 + loss;
  r.load.force_n = Eigen::Vector3d(-0.980665, 0, 0);
  r.pressure_max_compression_kpa = peak;
  r.pressure_max_tension_kpa = peak * 0.8;
  r.pressure_p95_compression_kpa = peak * 0.5;
  r.area_above_capillary_mm2 = 12;
  r.area_above_limit_mm2 = 1.5;
  r.max_principal_strain = 0.02;
  r.crown_tip_displacement_um = Eigen::Vector3d(-30, 0, 40);
  r.equivalent_force_peak_g = loss > 0 ? 60 : -1;
  r.equivalent_force_p95_g = loss > 0 ? 65 : -1;
  r.equivalent_force_area_rule_g = loss > 0 ? 80 : -1;
  r.max_von_mises_kpa = std::nan("");  // not finite: must become null, not break the JSON
  r.root_map.n_angle = 4;
  r.root_map.n_depth = 3;
  r.root_map.depth_min_mm = 1.5;
  r.root_map.depth_max_mm = 13.5;
  r.root_map.pressure_kpa = {std::nan(""), 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, -11};
  return r;
}

std::vector<std::string> lines(const std::string& text) {
  std::vector<std::string> out;
  std::istringstream in(text);
  for (std::string line; std::getline(in, line);) out.push_back(line);
  return out;
}

// ---- atomic files and staged folders ------------------------------------------------------------

TEST(AtomicFile, WritesReplacesAndLeavesNoTemporary) {
  test::TempFolder folder("atomic");
  const std::string path = folder / "a.txt";
  write_file_atomic(path, "first");
  EXPECT_EQ(test::read_file(path), "first");
  write_file_atomic(path, std::string(1 << 20, 'x'));
  EXPECT_EQ(test::read_file(path).size(), 1u << 20);
  EXPECT_EQ(test::list_folder(folder.path()), std::vector<std::string>{"a.txt"});
}

TEST(AtomicFile, FailureNamesThePath) {
  try {
    write_file_atomic("/nonexistent-folder-xyz/a.txt", "x");
    FAIL();
  } catch (const OutputError& e) {
    EXPECT_NE(std::string(e.what()).find("/nonexistent-folder-xyz/a.txt"), std::string::npos);
  }
}

TEST(StagedFolderTest, NewFolderAppearsOnlyAtCommit) {
  test::TempFolder parent("staged-new");
  const std::string out = parent / "out";
  {
    StagedFolder staged(out);
    write_file_atomic(staged.path("one.txt"), "1");
    write_file_atomic(staged.path("two.txt"), "2");
    EXPECT_FALSE(test::exists(out)) << "files must not show before commit";
    staged.commit();
  }
  EXPECT_EQ(test::list_folder(out), (std::vector<std::string>{"one.txt", "two.txt"}));
  EXPECT_EQ(test::list_folder(parent.path()), std::vector<std::string>{"out"});
}

TEST(StagedFolderTest, ExistingFolderIsReplacedAsAWhole) {
  test::TempFolder parent("staged-existing");
  const std::string out = parent / "out";
  std::filesystem::create_directories(out);
  test::write_file(out + "/one.txt", "old");
  test::write_file(out + "/s3_older_run.csv", "old");
  {
    StagedFolder staged(out);
    write_file_atomic(staged.path("one.txt"), "new");
    EXPECT_EQ(test::read_file(out + "/one.txt"), "old");
    staged.commit();
  }
  EXPECT_EQ(test::list_folder(out), std::vector<std::string>{"one.txt"});
  EXPECT_EQ(test::read_file(out + "/one.txt"), "new");
  EXPECT_EQ(test::list_folder(parent.path()), std::vector<std::string>{"out"});
}

TEST(StagedFolderTest, AFolderHoldingOtherThingsIsNotReplaced) {
  test::TempFolder parent("staged-foreign");
  const std::string out = parent / "out";
  std::filesystem::create_directories(out + "/sub");
  EXPECT_THROW(StagedFolder{out}, OutputError);
  EXPECT_TRUE(test::exists(out + "/sub"));
}

TEST(StagedFolderTest, AbandonedRunLeavesNothing) {
  test::TempFolder parent("staged-abandon");
  const std::string out = parent / "out";
  {
    StagedFolder staged(out);
    write_file_atomic(staged.path("one.txt"), "1");
  }
  EXPECT_TRUE(test::list_folder(parent.path()).empty());
}

TEST(StagedFolderTest, StagingOfADeadProcessIsCleanedUp) {
  test::TempFolder parent("staged-stale");
  const pid_t child = ::fork();
  if (child == 0) ::_exit(0);
  int status = 0;
  ::waitpid(child, &status, 0);  // `child` is now a pid with no process
  const std::string stale = parent / (".out.partial-" + std::to_string(child));
  std::filesystem::create_directories(stale);
  test::write_file(stale + "/half.vtu", "<VTKFile");
  StagedFolder staged(parent / "out");
  EXPECT_FALSE(test::exists(stale));
}

TEST(StagedFolderTest, AFileInTheWayIsAnOutputError) {
  test::TempFolder parent("staged-file");
  test::write_file(parent / "out", "I am a file");
  EXPECT_THROW(StagedFolder(parent / "out"), OutputError);
}

// ---- CSV helpers --------------------------------------------------------------------------------

TEST(CsvHelpers, QuotingNumbersAndFileStems) {
  EXPECT_EQ(csv_field("plain"), "plain");
  EXPECT_EQ(csv_field("a,b"), "\"a,b\"");
  EXPECT_EQ(csv_field("say \"hi\""), "\"say \"\"hi\"\"\"");
  EXPECT_EQ(csv_number(1.0 / 3.0), "0.333333");
  EXPECT_EQ(csv_number(std::nan("")), "");
  EXPECT_EQ(scenario_file_stem(0, "healthy"), "s1_healthy");
  EXPECT_EQ(scenario_file_stem(3, "6 mm loss"), "s4_6_mm_loss");
  EXPECT_EQ(scenario_file_stem(1, "1 mm loss + mesial defect"), "s2_1_mm_loss_mesial_defect");
  EXPECT_EQ(scenario_file_stem(0, "../../etc/passwd"), "s1_.._.._etc_passwd");
}

// ---- reports ------------------------------------------------------------------------------------

TEST(Reports, ResultsJsonHasEveryFixedKey) {
  const CaseSpec spec = two_scenario_case();
  const std::vector<ScenarioResult> results = {made_up_result("healthy", 0, 3.0),
                                               made_up_result("4 mm, loss", 4, 9.0)};
  const Json j = Json::parse(results_json(spec, results, {}));
  for (const char* key : test::kFixedTopLevelKeys) EXPECT_TRUE(j.contains(key)) << key;
  EXPECT_EQ(j["caution"], caution_text());
  ASSERT_EQ(j["scenarios"].size(), 2u);
  for (const Json& s : j["scenarios"]) {
    for (const char* key : test::kFixedScenarioKeys) EXPECT_TRUE(s.contains(key)) << key;
    for (const char* key : test::kFixedPressureKeys)
      EXPECT_TRUE(s["pdl_pressure_kpa"][key].is_number()) << key;
    EXPECT_TRUE(s["max_von_mises_kpa"].is_null());  // NaN written as null
  }
  const Json& healthy = j["scenarios"][0];
  const Json& lost = j["scenarios"][1];
  EXPECT_TRUE(healthy["equivalent_force_g"].is_null());
  EXPECT_EQ(lost["equivalent_force_g"], 60);
  EXPECT_EQ(lost["pdl_pressure_kpa"]["max_compression"], 9.0);
  EXPECT_EQ(lost["cres_from_crest_mm"], 4.5);  // lingual force: the labiolingual CRes
  EXPECT_EQ(lost["cres_direction"], "labiolingual");
  EXPECT_DOUBLE_EQ(lost["crown_tip_displacement_um"].get<double>(), 50.0);
  // The sources carry both thresholds with their citations.
  bool capillary = false;
  for (const Json& s : j["sources"])
    if (s["quantity"] == "thresholds.capillary.value_kpa") {
      capillary = true;
      EXPECT_EQ(s["value"], 4.7);
      EXPECT_NE(s["source"].get<std::string>().find("Hohmann"), std::string::npos);
    }
  EXPECT_TRUE(capillary);
  // The case echo reads back to the same case.
  EXPECT_TRUE(parse_case(j["case"].dump()) == spec);
}

TEST(Reports, MesiodistalForceReportsTheMesiodistalCres) {
  ScenarioResult r = made_up_result("healthy", 0, 3.0);
  r.load.force_n = Eigen::Vector3d(0.1, -0.9, 0);
  EXPECT_EQ(cres_direction_for(r.load), CresDirection::kMesiodistal);
  EXPECT_EQ(cres_for(r).from_crest_mm, 4.1);
}

TEST(Reports, SummaryCsvStartsWithTheCautionAndHasOneRowPerScenario) {
  const CaseSpec spec = two_scenario_case();
  const std::string csv =
      summary_csv(spec, {made_up_result("healthy", 0, 3.0), made_up_result("4 mm, loss", 4, 9.0)});
  const std::vector<std::string> l = lines(csv);
  ASSERT_GE(l.size(), 5u);
  EXPECT_EQ(l[0], "# " + caution_text());
  EXPECT_EQ(l[1].rfind("# ", 0), 0u);
  EXPECT_EQ(l[2].rfind("scenario,bone_loss_mm,", 0), 0u) << l[2];
  EXPECT_EQ(l.size(), 5u);
  EXPECT_EQ(l[3].rfind("healthy,0,", 0), 0u) << l[3];
  EXPECT_EQ(l[4].rfind("\"4 mm, loss\",4,", 0), 0u) << l[4];
  // Same number of fields in the header and each row (the name's comma is quoted).
  auto fields = [](const std::string& row) {
    int n = 1;
    bool quoted = false;
    for (char c : row) {
      if (c == '"') quoted = !quoted;
      if (c == ',' && !quoted) ++n;
    }
    return n;
  };
  EXPECT_EQ(fields(l[3]), fields(l[2]));
  EXPECT_EQ(fields(l[4]), fields(l[2]));
}

TEST(Reports, RootMapCsvHasCellCentresAndBlankCellsWithoutPdl) {
  const CaseSpec spec = two_scenario_case();
  const std::vector<std::string> l = lines(root_map_csv(spec, made_up_result("healthy", 0, 3)));
  ASSERT_EQ(l.size(), 3u + 1u + 3u);
  EXPECT_EQ(l[0], "# " + caution_text());
  // Derived: 4 angle cells of 90 deg -> centres 45, 135, 225, 315; 3 depth cells over
  // 1.5..13.5 mm -> centres 3.5, 7.5, 11.5.
  EXPECT_EQ(l[3], "depth_below_cej_mm,45,135,225,315");
  EXPECT_EQ(l[4], "3.5,,1,2,3");
  EXPECT_EQ(l[5], "7.5,4,5,6,7");
  EXPECT_EQ(l[6], "11.5,8,9,10,-11");
}

TEST(Reports, SummaryTextCarriesCautionSourcesAndAReadingPerScenario) {
  const CaseSpec spec = two_scenario_case();
  const std::string text = summary_text(
      spec, {made_up_result("healthy", 0, 3.0), made_up_result("4 mm, loss", 4, 18.0)});
  // Sentences are wrapped over lines; compare with every run of white space made one space.
  auto words_of = [](const std::string& s) {
    std::istringstream words(s);
    std::string out;
    for (std::string w; words >> w;) out += (out.empty() ? "" : " ") + w;
    return out;
  };
  const std::string flat = words_of(text);
  const std::string caution_words = words_of(caution_text());
  EXPECT_NE(flat.find(caution_words), std::string::npos);
  EXPECT_NE(flat.find("Hohmann"), std::string::npos);
  EXPECT_NE(flat.find("healthy: peak compression 3.00 kPa stays below capillary pressure"),
            std::string::npos)
      << text;
  EXPECT_NE(flat.find("4 mm, loss: peak compression 18.00 kPa is above the physiological limit"),
            std::string::npos)
      << text;
  EXPECT_NE(flat.find("about 60 g"), std::string::npos) << text;
}

TEST(Reports, SweepTableRowsAndCaution) {
  SweepTable table({"load.magnitude", "pdl.material.young_modulus_mpa"});
  table.add(1, {"50", "0.47"}, made_up_result("healthy", 0, 1.5));
  table.add(1, {"50", "0.47"}, made_up_result("4 mm, loss", 4, 4.5));
  EXPECT_EQ(table.n_rows(), 2);
  const std::vector<std::string> l = lines(table.csv());
  ASSERT_EQ(l.size(), 5u);
  EXPECT_EQ(l[0], "# " + caution_text());
  EXPECT_EQ(l[2].rfind("combination,load.magnitude,pdl.material.young_modulus_mpa,scenario,"
                       "bone_loss_mm,",
                       0),
            0u);
  EXPECT_EQ(l[4].rfind("1,50,0.47,\"4 mm, loss\",4,", 0), 0u) << l[4];
}

}  // namespace
}  // namespace sharpey::analysis
