// sharpey-batch run's force-allowance outputs on a small invented coarse case: the "allowance"
// section of results.json (existing keys unchanged), allowance.csv and summary.txt's paragraph with
// the caution; the band only with --band (or allowance.band); bad band input refused with exit 2
// before any solve.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <nlohmann/json.hpp>
#include <sstream>

#include "sharpey/analysis/study.h"
#include "support/batch_process.h"
#include "support/results_keys.h"

namespace sharpey::test {
namespace {

using Json = nlohmann::json;

std::string healthy_case(const std::string& allowance) {
  std::string text = coarse_case_json(1);
  if (!allowance.empty()) {
    const size_t end = text.rfind('}');
    text = text.substr(0, end) + ",\n  \"allowance\": " + allowance + "\n}";
  }
  return text;
}

std::vector<std::string> data_lines(const std::string& csv) {
  std::vector<std::string> lines;
  std::istringstream in(csv);
  std::string line;
  while (std::getline(in, line))
    if (!line.empty() && line[0] != '#') lines.push_back(line);
  return lines;
}

size_t count_fields(const std::string& line) {
  return static_cast<size_t>(std::count(line.begin(), line.end(), ',')) + 1;
}

TEST(BatchAllowance, BandOnRequestWithEveryOutput) {
  TempFolder dir("allowance-band");
  write_file(dir / "case.json", healthy_case(R"({"samples": 3, "sensitivity": false})"));
  const ProcessResult r = run_batch({"run", dir / "case.json", "--out", dir / "out", "--band"});
  ASSERT_EQ(r.exit_code, 0) << r.err;

  const Json j = Json::parse(read_file(dir / "out/results.json"));
  for (const char* key : kFixedTopLevelKeys) EXPECT_TRUE(j.contains(key)) << key;
  for (const char* key : kFixedScenarioKeys) EXPECT_TRUE(j["scenarios"][0].contains(key)) << key;
  ASSERT_TRUE(j.contains("allowance"));
  const Json& a = j["allowance"];
  EXPECT_EQ(a["caution"], analysis::caution_text());
  ASSERT_EQ(a["nominal"].size(), 1u);
  ASSERT_EQ(a["nominal"][0]["movements"].size(), 7u);
  const double limit = a["limit_kpa"];
  for (const Json& m : a["nominal"][0]["movements"]) {
    SCOPED_TRACE(m["movement"].get<std::string>());
    EXPECT_EQ(m["common_practice_g"]["status"], "common practice");
    if (!m["limited_by_compression"].get<bool>()) {
      EXPECT_TRUE(m["allowance_n"]["peak_limit"].is_null());
      continue;
    }
    const double n = m["allowance_n"]["peak_limit"], per_n = m["peak_kpa_per_n"];
    EXPECT_NEAR(n * per_n, limit, 1e-9 * limit);  // derived: linearity
    EXPECT_NEAR(m["allowance_g"]["peak_limit"].get<double>(), n / 0.00980665, 1e-9 * n / 0.0098);
  }
  const Json& band = a["band"];
  ASSERT_TRUE(band.is_object());
  EXPECT_EQ(band["samples"], 3);
  EXPECT_EQ(band["ranges"].size(), 7u);
  EXPECT_EQ(band["sample_inputs"]["rows"].size(), 3u);
  EXPECT_TRUE(band["sensitivity"].empty());  // allowance.sensitivity false
  for (const Json& m : band["scenarios"][0]["movements"]) {
    const Json& p = m["percentiles_n"]["peak_limit"];
    if (p["p10"].is_null()) continue;
    EXPECT_LE(p["p10"].get<double>(), p["p50"].get<double>());
    EXPECT_LE(p["p50"].get<double>(), p["p90"].get<double>());
    EXPECT_EQ(m["conservative_n"]["peak_limit"], p["p10"]);
  }

  const std::string csv = read_file(dir / "out/allowance.csv");
  EXPECT_EQ(csv.rfind("# " + analysis::caution_text(), 0), 0u);
  const auto lines = data_lines(csv);
  ASSERT_EQ(lines.size(), 1u + 7u);  // header, one row per movement
  for (const std::string& line : lines) EXPECT_EQ(count_fields(line), count_fields(lines[0]));
  EXPECT_NE(lines[0].find("band_peak_limit_p10_g"), std::string::npos);
  EXPECT_NE(csv.find("extrusion"), std::string::npos);

  const std::string summary = read_file(dir / "out/summary.txt");
  const size_t at = summary.find("Force allowance");
  ASSERT_NE(at, std::string::npos);
  EXPECT_NE(summary.find("conservative allowance", at), std::string::npos);
  EXPECT_NE(summary.find("common practice", at), std::string::npos);
  // The caution follows the allowance paragraph (words wrapped: look for its start).
  EXPECT_NE(summary.find(analysis::caution_text().substr(0, 20), at), std::string::npos);
}

TEST(BatchAllowance, NominalAlwaysBandOnlyWhenAsked) {
  TempFolder dir("allowance-nominal");
  write_file(dir / "case.json", healthy_case(""));
  const ProcessResult r = run_batch({"run", dir / "case.json", "--out", dir / "out"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const Json j = Json::parse(read_file(dir / "out/results.json"));
  ASSERT_TRUE(j.contains("allowance"));
  EXPECT_EQ(j["allowance"]["nominal"][0]["movements"].size(), 7u);
  EXPECT_TRUE(j["allowance"]["band"].is_null());
  const std::string summary = read_file(dir / "out/summary.txt");
  EXPECT_NE(summary.find("nominal allowance"), std::string::npos);
  EXPECT_NE(summary.find("band was not computed"), std::string::npos);
  const auto lines = data_lines(read_file(dir / "out/allowance.csv"));
  ASSERT_EQ(lines.size(), 8u);
  EXPECT_EQ(lines[1].substr(lines[1].size() - 3), ",,,");  // band columns empty
}

TEST(BatchAllowance, BadBandInputIsRefusedBeforeAnySolve) {
  TempFolder dir("allowance-bad");
  write_file(dir / "case.json", healthy_case(R"({"band": true, "samples": -3})"));
  ProcessResult r = run_batch({"run", dir / "case.json", "--out", dir / "out"});
  EXPECT_EQ(r.exit_code, 2);
  EXPECT_NE(r.err.find("allowance.samples"), std::string::npos) << r.err;
  EXPECT_NE(r.err.find("-3"), std::string::npos) << r.err;
  // A reading error that moves the crest past the root's end: the extreme geometry is invalid.
  write_file(dir / "case.json",
             healthy_case(R"({"bone_level_error_mm": 3, "root_length_error_mm": 5})"));
  write_file(
      dir / "case.json",
      std::string(read_file(dir / "case.json"))
          .replace(read_file(dir / "case.json").find("\"horizontal_loss_mm\": 0"),
                   std::string("\"horizontal_loss_mm\": 0").size(), "\"horizontal_loss_mm\": 5"));
  r = run_batch({"run", dir / "case.json", "--out", dir / "out", "--band"});
  EXPECT_EQ(r.exit_code, 2) << r.err;
  EXPECT_NE(r.err.find("extreme geometry"), std::string::npos) << r.err;
  EXPECT_FALSE(exists(dir / "out"));
}

}  // namespace
}  // namespace sharpey::test
