// sharpey-batch sweep over multi-rooted cases: the invented sample design (mandibular first molar,
// furcation degrees 0 to III at 0, 3 and 5 mm loss, thin-layer estimate) through the sweep
// machinery: one row per sample, the same figures as a direct `molar` run of each combination's
// case to the printed digits, the CRes moving apically and the allowance falling with the degree;
// invalid combinations as failure records; two MPI ranks and a killed or interrupted run resumed
// give the same bytes; `run` of a multi-rooted case writes what `molar` writes. mpirun as root
// needs OMPI_ALLOW_RUN_AS_ROOT(_CONFIRM), set in the ctest entry's ENVIRONMENT.
#include <gtest/gtest.h>
#include <signal.h>

#include <algorithm>
#include <nlohmann/json.hpp>
#include <sstream>
#include <string>
#include <vector>

#include "sharpey/analysis/study.h"
#include "sharpey/output/report_output.h"
#include "support/batch_process.h"

namespace sharpey::test {
namespace {

using Json = nlohmann::json;

const std::string kCase = "invented_mandibular_first_molar_uprighting.json";
const std::string kDesign = "invented_study_design_molar_furcation.json";

// The rows of a sweep.csv (after the two comment lines and the header).
std::vector<std::string> csv_rows(const std::string& csv) {
  std::vector<std::string> rows;
  std::istringstream in(csv);
  int n_before = 3;
  for (std::string line; std::getline(in, line);)
    if (n_before-- <= 0) rows.push_back(line);
  return rows;
}

// The sample design's sweep, run once for the checks below.
class SweepMolarSample : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    folder_ = new TempFolder("sweep-molar");
    const ProcessResult r = run_batch(
        {"sweep", sample_path(kCase), "--design", sample_path(kDesign), "--out", *folder_ / "one"});
    ASSERT_EQ(r.exit_code, 0) << r.err;
    csv_ = read_file(*folder_ / "one/sweep.csv");
    json_ = Json::parse(read_file(*folder_ / "one/sweep.json"));
  }
  static void TearDownTestSuite() { delete folder_; }
  // The design's row for `loss_mm` and `degree`.
  static const Json& row(double loss_mm, int degree) {
    for (const Json& r : json_["rows"])
      if (r["scenarios[0].horizontal_loss_mm"] == loss_mm &&
          r["scenarios[0].furcation.degree"] == degree)
        return r;
    throw std::runtime_error("no row for this loss and degree");
  }
  static TempFolder* folder_;
  static std::string csv_;
  static Json json_;
};
TempFolder* SweepMolarSample::folder_ = nullptr;
std::string SweepMolarSample::csv_;
Json SweepMolarSample::json_;

TEST_F(SweepMolarSample, OneRowPerSampleWithTheCaution) {
  // 3 losses x 4 degrees, one scenario each: 12 rows, in the design's order (loss slower).
  const std::vector<std::string> rows = csv_rows(csv_);
  ASSERT_EQ(rows.size(), 12u) << csv_;
  EXPECT_EQ(csv_.rfind("# " + analysis::caution_text() + "\n", 0), 0u);
  EXPECT_EQ(json_["caution"], analysis::caution_text());
  ASSERT_EQ(json_["rows"].size(), 12u);
  EXPECT_EQ(rows[0].rfind("1,mandibular_first_molar,0,0,varied by the design,ok,", 0), 0u)
      << rows[0];
  EXPECT_EQ(rows[11].rfind("12,mandibular_first_molar,5,3,varied by the design,ok,", 0), 0u)
      << rows[11];
  // The JSON holds the CSV's cells: every figure of every row, as printed.
  const std::vector<std::string> columns = json_["columns"];
  for (size_t i = 0; i < rows.size(); ++i) {
    std::vector<std::string> cells;
    std::istringstream in(rows[i]);
    for (std::string cell; std::getline(in, cell, ',');) cells.push_back(cell);
    if (rows[i].back() == ',') cells.emplace_back();
    ASSERT_EQ(cells.size(), columns.size()) << rows[i];
    const Json& r = json_["rows"][i];
    EXPECT_EQ(cells[columns.size() - 1], "");  // no failure
    for (size_t c = 0; c < columns.size(); ++c)
      if (r[columns[c]].is_number()) {
        EXPECT_EQ(analysis::csv_number(r[columns[c]].get<double>()), cells[c]) << columns[c];
      }
  }
}

TEST_F(SweepMolarSample, FiguresEqualADirectMolarRunOfTheSameCase) {
  const Json base = Json::parse(read_file(sample_path(kCase)));
  const std::string printed[][2] = {
      {"attachment_area_mm2", "attachment_area_mm2"},
      {"root_area_mm2", "root_area_mm2"},
      {"cres_mesiodistal_below_cej_mm", "cres_mesiodistal_below_cej_mm"},
      {"cres_buccolingual_below_cej_mm", "cres_buccolingual_below_cej_mm"},
      {"cres_mesiodistal_below_furcation_mm", "cres_mesiodistal_below_furcation_mm"},
      {"allowance_capillary", "allowance_capillary_nmm"},
      {"allowance_limit", "allowance_limit_nmm"}};
  for (const Json& r : json_["rows"]) {
    // The combination's case written by hand: the sample with one scenario of this loss and
    // degree (the design keeps the first scenario and varies it).
    Json c = base;
    c["scenarios"] =
        Json::array({{{"name", "direct"},
                      {"horizontal_loss_mm", r["scenarios[0].horizontal_loss_mm"]},
                      {"furcation", {{"degree", r["scenarios[0].furcation.degree"]}}}}});
    const std::string path = *folder_ / "direct.json", out = *folder_ / "direct";
    write_file(path, c.dump());
    const ProcessResult m = run_batch({"molar", path, "--out", out});
    ASSERT_EQ(m.exit_code, 0) << m.err;
    const Json s = Json::parse(read_file(out + "/multi_root_results.json"))["scenarios"][0];
    const std::string trace = "combination " + r["combination"].dump();
    // derived: the sweep reports what the molar command computes, to the digits it prints.
    for (const auto& [sweep_column, molar_key] : printed)
      EXPECT_EQ(analysis::csv_number(r[sweep_column].get<double>()),
                analysis::csv_number(s[molar_key].get<double>()))
          << trace << " " << sweep_column;
    for (const char* key : {"peak_compression_kpa", "peak_tension_kpa", "area_above_capillary_mm2",
                            "area_above_limit_mm2"})
      EXPECT_EQ(analysis::csv_number(r["tooth_" + std::string(key)].get<double>()),
                analysis::csv_number(s["tooth"][key].get<double>()))
          << trace << " tooth " << key;
    ASSERT_EQ(s["roots"].size(), 2u);  // mesial and distal
    EXPECT_TRUE(r["root3_name"].get<std::string>().empty());
    for (size_t k = 0; k < s["roots"].size(); ++k) {
      const std::string p = "root" + std::to_string(k + 1) + "_";
      EXPECT_EQ(r[p + "name"], s["roots"][k]["name"]) << trace;
      for (const char* key : {"attachment_area_mm2", "peak_compression_kpa", "peak_tension_kpa",
                              "area_above_capillary_mm2", "area_above_limit_mm2"})
        EXPECT_EQ(analysis::csv_number(r[p + key].get<double>()),
                  analysis::csv_number(s["roots"][k][key].get<double>()))
            << trace << " " << p << key;
    }
  }
}

TEST_F(SweepMolarSample, CresMovesApicallyAndTheAllowanceFallsWithTheFurcationDegree) {
  // derived: a furcation lesion removes attachment next to the furcation, coronal to the CRes,
  // so the centre of the remaining springs moves apically and the peak per unit load rises
  // (issue 15's acceptance; docs/molars.md, "Loss and furcation degree").
  for (double loss : {0.0, 3.0, 5.0}) {
    for (int degree = 1; degree <= 3; ++degree) {
      const Json& before = row(loss, degree - 1);
      const Json& now = row(loss, degree);
      const std::string trace = std::to_string(loss) + " mm, degree " + std::to_string(degree);
      EXPECT_GT(now["cres_mesiodistal_below_cej_mm"].get<double>(),
                before["cres_mesiodistal_below_cej_mm"].get<double>())
          << trace;
      EXPECT_LT(now["allowance_limit"].get<double>(), before["allowance_limit"].get<double>())
          << trace;
      EXPECT_LT(now["allowance_capillary"].get<double>(),
                before["allowance_capillary"].get<double>())
          << trace;
      EXPECT_LT(now["attachment_area_mm2"].get<double>(),
                before["attachment_area_mm2"].get<double>())
          << trace;
    }
  }
}

// Two MPI ranks write the single process's bytes; a run killed after 5 of its 12 models resumes
// from the checkpoints and writes them too.
TEST_F(SweepMolarSample, TwoRanksAndAResumedRunWriteTheSameBytes) {
  std::vector<std::string> args = {"-n",
                                   "2",
                                   "--oversubscribe",
                                   batch_binary(),
                                   "sweep",
                                   sample_path(kCase),
                                   "--design",
                                   sample_path(kDesign),
                                   "--out",
                                   *folder_ / "two"};
  ChildProcess mpi(SHARPEY_MPIEXEC, args);
  const ProcessResult two = mpi.wait(600);
  ASSERT_EQ(two.exit_code, 0) << two.err << two.out;
  EXPECT_NE(two.err.find("12 combinations, 12 models solved on 2 ranks"), std::string::npos)
      << two.err;
  EXPECT_EQ(read_file(*folder_ / "two/sweep.csv"), csv_);
  EXPECT_EQ(read_file(*folder_ / "two/sweep.json"), read_file(*folder_ / "one/sweep.json"));

  const std::vector<std::string> sweep = {
      "sweep", sample_path(kCase), "--design", sample_path(kDesign), "--out", *folder_ / "killed"};
  ChildProcess killed(batch_binary(), sweep, {"SHARPEY_TEST_KILL_AFTER_MODELS=5"});
  EXPECT_EQ(killed.wait(600).signal, SIGKILL);
  EXPECT_FALSE(exists(*folder_ / "killed/sweep.csv"));
  const ProcessResult resumed = run_batch(sweep);
  ASSERT_EQ(resumed.exit_code, 0) << resumed.err;
  EXPECT_NE(resumed.err.find("resuming: 5 models of 12 already solved"), std::string::npos)
      << resumed.err;
  EXPECT_EQ(read_file(*folder_ / "killed/sweep.csv"), csv_);
  EXPECT_EQ(list_folder(*folder_ / "killed"),
            (std::vector<std::string>{"sweep.csv", "sweep.json", "sweep_case.json"}));
}

// Ctrl-C (SIGINT to itself after its third checkpoint) stops the sweep with the interrupted code,
// keeping the checkpoints; the rerun resumes from them.
TEST_F(SweepMolarSample, InterruptedRunKeepsItsCheckpointsAndResumes) {
  const std::vector<std::string> sweep = {
      "sweep", sample_path(kCase), "--design", sample_path(kDesign), "--out", *folder_ / "stopped"};
  ChildProcess stopped(batch_binary(), sweep,
                       {"SHARPEY_TEST_KILL_AFTER_MODELS=3", "SHARPEY_TEST_KILL_SIGNAL=INT"});
  const ProcessResult r = stopped.wait(600);
  EXPECT_EQ(r.exit_code, 6) << r.err;  // interrupted (exit_codes.h)
  EXPECT_NE(r.err.find("run the same command again to resume"), std::string::npos) << r.err;
  const ProcessResult resumed = run_batch(sweep);
  ASSERT_EQ(resumed.exit_code, 0) << resumed.err;
  EXPECT_NE(resumed.err.find("resuming: 3 models of 12 already solved"), std::string::npos)
      << resumed.err;
  EXPECT_EQ(read_file(*folder_ / "stopped/sweep.csv"), csv_);
}

TEST(SweepMolar, InvalidCombinationsAreFailureRecordsNamingTheKey) {
  TempFolder folder("sweep-molar-bad");
  // Degree 5 does not exist; degree II on the maxillary second molar cannot be meshed yet
  // (finite_elements), while on the mandibular molar it can: one finite-element solve.
  write_file(folder / "design.json", R"({"label": "Invented test design",
      "teeth": ["mandibular_first_molar", "maxillary_second_molar"], "bone_levels_mm": [3],
      "furcation_degrees": [2, 5], "also_vary": {"finite_elements": [true]}})");
  const ProcessResult r = run_batch(
      {"sweep", sample_path(kCase), "--design", folder / "design.json", "--out", folder / "out"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_NE(r.err.find("3 combinations of 4 invalid, kept as failure records"), std::string::npos)
      << r.err;
  const Json j = Json::parse(read_file(folder / "out/sweep.json"));
  ASSERT_EQ(j["rows"].size(), 4u);
  EXPECT_EQ(j["rows"][0]["status"], "ok");
  EXPECT_GT(j["rows"][0]["fe_dofs"].get<int>(), 0);
  // derived: both models of the same tooth put the CRes within 0.5 mm (test_batch_molar.cpp).
  EXPECT_NEAR(j["rows"][0]["fe_cres_mesiodistal_below_cej_mm"].get<double>(),
              j["rows"][0]["cres_mesiodistal_below_cej_mm"].get<double>(), 0.5);
  for (int i : {1, 3}) {
    EXPECT_EQ(j["rows"][i]["status"], "invalid");
    const std::string failure = j["rows"][i]["failure"];
    EXPECT_NE(failure.find("key scenarios[0].furcation.degree"), std::string::npos) << failure;
    EXPECT_NE(failure.find("degree 5 is not 0 (none), 1, 2 or 3"), std::string::npos) << failure;
  }
  EXPECT_EQ(j["rows"][2]["status"], "invalid");
  const std::string fe_failure = j["rows"][2]["failure"];
  EXPECT_NE(fe_failure.find("finite_elements"), std::string::npos) << fe_failure;

  // Nothing valid: refused as bad input, naming the key.
  write_file(folder / "none.json", R"({"furcation_degrees": [5, 6]})");
  const ProcessResult none = run_batch(
      {"sweep", sample_path(kCase), "--design", folder / "none.json", "--out", folder / "none"});
  EXPECT_EQ(none.exit_code, 2) << none.err;
  EXPECT_NE(none.err.find("key scenarios[0].furcation.degree"), std::string::npos) << none.err;
  EXPECT_NE(none.err.find("every combination of the sweep is invalid"), std::string::npos)
      << none.err;
  EXPECT_FALSE(exists(folder / "none"));
}

TEST(SweepMolar, RunOfAMultiRootedCaseWritesWhatMolarWrites) {
  TempFolder folder("run-molar");
  const ProcessResult run = run_batch({"run", sample_path(kCase), "--out", folder / "run"});
  ASSERT_EQ(run.exit_code, 0) << run.err;
  const ProcessResult molar = run_batch({"molar", sample_path(kCase), "--out", folder / "molar"});
  ASSERT_EQ(molar.exit_code, 0) << molar.err;
  const std::vector<std::string> files = list_folder(folder / "run");
  EXPECT_EQ(files, list_folder(folder / "molar"));
  EXPECT_EQ(files.size(), 5u);  // results, summary and three root maps
  for (const std::string& f : files)
    EXPECT_EQ(read_file(folder / "run/" + f), read_file(folder / "molar/" + f)) << f;
  // What only a single-rooted case takes is refused, naming the option.
  for (const char* option : {"--band", "--mesh-preset"}) {
    std::vector<std::string> args = {"run", sample_path(kCase), "--out", folder / "x", option};
    if (std::string(option) == "--mesh-preset") args.push_back("coarse");
    const ProcessResult bad = run_batch(args);
    EXPECT_EQ(bad.exit_code, 2) << bad.err;
    EXPECT_NE(bad.err.find(std::string("key ") + option), std::string::npos) << bad.err;
  }
}

}  // namespace
}  // namespace sharpey::test
