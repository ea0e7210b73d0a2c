// sharpey-batch sweep: a full factorial over two keys on a one-scenario coarse case. Checks the
// table's shape, linearity in the force, the PDL-modulus behaviour expected when tooth and bone
// are far stiffer than the ligament, and agreement with a plain `run` of the same case.
#include <gtest/gtest.h>

#include <cmath>
#include <map>
#include <nlohmann/json.hpp>
#include <sstream>
#include <string>

#include "sharpey/analysis/study.h"
#include "support/batch_process.h"

namespace sharpey::test {
namespace {

using Json = nlohmann::json;

std::vector<std::string> split_csv_row(const std::string& row) {
  std::vector<std::string> fields;
  std::string field;
  bool quoted = false;
  for (char c : row) {
    if (c == '"') {
      quoted = !quoted;
    } else if (c == ',' && !quoted) {
      fields.push_back(field);
      field.clear();
    } else {
      field += c;
    }
  }
  fields.push_back(field);
  return fields;
}

struct Table {
  std::vector<std::string> comments, header;
  std::vector<std::map<std::string, std::string>> rows;
  double number(size_t row, const std::string& column) const {
    return std::stod(rows.at(row).at(column));
  }
};

Table read_table(const std::string& path) {
  Table t;
  std::istringstream in(read_file(path));
  for (std::string line; std::getline(in, line);) {
    if (line.rfind("# ", 0) == 0) {
      t.comments.push_back(line);
    } else if (t.header.empty()) {
      t.header = split_csv_row(line);
    } else {
      const std::vector<std::string> f = split_csv_row(line);
      std::map<std::string, std::string> row;
      for (size_t i = 0; i < f.size() && i < t.header.size(); ++i) row[t.header[i]] = f[i];
      EXPECT_EQ(f.size(), t.header.size()) << line;
      t.rows.push_back(row);
    }
  }
  return t;
}

TEST(BatchSweep, FactorialTableWithLinearForceAndModulusBehaviour) {
  TempFolder folder("batch-sweep");
  const std::string case_path = folder / "case.json";
  write_file(case_path, coarse_case_json(1));
  const std::string out = folder / "sweep";
  // The model key is given last on purpose: the batch reorders so load keys vary fastest.
  const ProcessResult r =
      run_batch({"sweep", case_path, "--out", out, "--vary", "load.magnitude=50,100", "--vary",
                 "pdl.material.young_modulus_mpa=0.47,0.94"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_NE(r.err.find("4 combinations, 2 models solved"), std::string::npos) << r.err;
  EXPECT_EQ(list_folder(out), (std::vector<std::string>{"sweep.csv", "sweep_case.json"}));

  const Table t = read_table(out + "/sweep.csv");
  ASSERT_FALSE(t.comments.empty());
  EXPECT_EQ(t.comments[0], "# " + analysis::caution_text());
  ASSERT_EQ(t.rows.size(), 4u);  // 2 x 2 combinations x 1 scenario
  // Row order: the model key slowest, the load key fastest.
  const char* expected[4][2] = {{"0.47", "50"}, {"0.47", "100"}, {"0.94", "50"}, {"0.94", "100"}};
  for (size_t i = 0; i < 4; ++i) {
    EXPECT_EQ(t.rows[i].at("pdl.material.young_modulus_mpa"), expected[i][0]);
    EXPECT_EQ(t.rows[i].at("load.magnitude"), expected[i][1]);
    EXPECT_EQ(t.rows[i].at("scenario"), "healthy");
    EXPECT_EQ(t.rows[i].at("combination"), std::to_string(i + 1));
  }
  const std::string peak = "pdl_max_compression_kpa", tip = "crown_tip_displacement_um";
  for (size_t e = 0; e < 4; e += 2) {
    // Linear elasticity (derived): doubling the force doubles pressure and displacement.
    // The CSV keeps 6 significant digits, hence the tolerance.
    EXPECT_NEAR(t.number(e + 1, peak) / t.number(e, peak), 2.0, 2e-5);
    EXPECT_NEAR(t.number(e + 1, tip) / t.number(e, tip), 2.0, 2e-5);
    EXPECT_NEAR(t.number(e + 1, "force_g") / t.number(e, "force_g"), 2.0, 2e-5);
  }
  // Tooth and bone thousands of times stiffer than the PDL (check-values.md section 1,
  // consequence stated there): doubling E_pdl leaves the peak pressure nearly unchanged and about
  // halves the displacement.
  const double peak_change = t.number(3, peak) / t.number(1, peak);
  EXPECT_NEAR(peak_change, 1.0, 0.10) << "peak pressure ratio for E x2: " << peak_change;
  const double tip_ratio = t.number(3, tip) / t.number(1, tip);
  EXPECT_NEAR(tip_ratio, 0.5, 0.05) << "displacement ratio for E x2: " << tip_ratio;
  std::cout << "[ measured ] E_pdl x2: peak pressure ratio " << peak_change
            << ", crown-tip displacement ratio " << tip_ratio << "\n";

  // Agreement with an independent `run` of the base case (E 0.47, 100 g).
  const std::string run_out = folder / "run";
  const ProcessResult run = run_batch({"run", case_path, "--out", run_out, "--quiet"});
  ASSERT_EQ(run.exit_code, 0) << run.err;
  const Json j = Json::parse(read_file(run_out + "/results.json"));
  const Json& s = j["scenarios"][0];
  const double run_peak = s["pdl_pressure_kpa"]["max_compression"].get<double>();
  const double run_tip = s["crown_tip_displacement_um"].get<double>();
  EXPECT_NEAR(t.number(1, peak), run_peak, 1e-5 * run_peak);
  EXPECT_NEAR(t.number(1, tip), run_tip, 1e-5 * run_tip);
  EXPECT_NEAR(t.number(1, "area_above_capillary_mm2"), s["area_above_capillary_mm2"].get<double>(),
              1e-5 * s["area_above_capillary_mm2"].get<double>());
}

TEST(BatchSweep, ThresholdAndDirectionKeysReuseOneModel) {
  TempFolder folder("batch-sweep-reuse");
  const std::string case_path = folder / "case.json";
  write_file(case_path, coarse_case_json(1));
  const std::string out = folder / "sweep";
  const ProcessResult r =
      run_batch({"sweep", case_path, "--out", out, "--vary", "thresholds.capillary.value_kpa=2,4.7",
                 "--vary", "load.direction=lingual,labial"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_NE(r.err.find("4 combinations, 1 model solved"), std::string::npos) << r.err;
  const Table t = read_table(out + "/sweep.csv");
  ASSERT_EQ(t.rows.size(), 4u);
  const std::string area = "area_above_capillary_mm2", peak = "pdl_max_compression_kpa";
  // Same load, lower threshold: at least as much area above it; pressures unchanged.
  for (size_t i = 0; i < 2; ++i) {
    SCOPED_TRACE(t.rows[i].at("load.direction"));
    const size_t low = t.rows[i].at("thresholds.capillary.value_kpa") == "2" ? i : i + 2;
    const size_t high = low == i ? i + 2 : i;
    EXPECT_GE(t.number(low, area), t.number(high, area));
    EXPECT_EQ(t.rows[low].at(peak), t.rows[high].at(peak));
  }
  // Lingual and labial pushes are mirror loads: the ligament sees about the same peak (the
  // anatomy is not exactly symmetric labio-lingually, hence the loose bound).
  EXPECT_NEAR(t.number(0, peak) / t.number(1, peak), 1.0, 0.35);
}

}  // namespace
}  // namespace sharpey::test
