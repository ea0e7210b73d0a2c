// sharpey-batch on bad input: every malformed case file or option exits with its documented code
// and a message naming the key, and leaves no output behind.
#include <gtest/gtest.h>
#include <sys/stat.h>

#include <filesystem>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "support/batch_process.h"

namespace sharpey::test {
namespace {

using Json = nlohmann::ordered_json;

struct BadRun {
  const char* name;
  // The case file: "" = the valid coarse case; otherwise "path=value" applied to it (JSON value),
  // or "raw:" followed by the whole text.
  const char* case_change;
  // CASE and OUT stand for the case file and the output folder, DIR for the case file's folder
  std::vector<std::string> args;
  int exit_code;
  const char* fragment;  // expected in stderr
};

std::ostream& operator<<(std::ostream& os, const BadRun& b) {
  os << b.name << " [case: " << (*b.case_change ? b.case_change : "valid") << "; args:";
  for (const std::string& a : b.args) os << ' ' << a;
  return os << "] -> exit " << b.exit_code;
}

std::string case_text(const std::string& change) {
  if (change.empty()) return coarse_case_json(2);
  if (change.rfind("raw:", 0) == 0) return change.substr(4);
  const size_t eq = change.find('=');
  Json j = Json::parse(coarse_case_json(2));
  Json* node = &j;
  std::string path = change.substr(0, eq), step;
  std::vector<std::string> steps;
  for (char c : path + ".") {
    if (c == '.') {
      steps.push_back(step);
      step.clear();
    } else {
      step += c;
    }
  }
  for (const std::string& s : steps) {
    const size_t bracket = s.find('[');
    node = &(*node)[s.substr(0, bracket)];
    if (bracket != std::string::npos) node = &(*node)[std::stoul(s.substr(bracket + 1))];
  }
  *node = Json::parse(change.substr(eq + 1));
  return j.dump(2);
}

class BatchBadInput : public ::testing::TestWithParam<BadRun> {};

TEST_P(BatchBadInput, ExitsWithTheCodeNamesTheKeyWritesNothing) {
  const BadRun& b = GetParam();
  TempFolder folder("batch-bad");
  const std::string case_path = folder / "case.json";
  write_file(case_path, case_text(b.case_change));
  const std::string out = folder / "out";
  std::vector<std::string> args;
  for (const std::string& a : b.args)
    args.push_back(a == "CASE" ? case_path : a == "OUT" ? out : a == "DIR" ? folder.path() : a);
  const ProcessResult r = run_batch(args, 120);
  EXPECT_EQ(r.exit_code, b.exit_code) << "stderr: " << r.err;
  EXPECT_NE(r.err.find(b.fragment), std::string::npos)
      << "expected \"" << b.fragment << "\" in stderr: " << r.err;
  // No output folder, no staging folder, no stray file: only the case file is there.
  EXPECT_EQ(list_folder(folder.path()), std::vector<std::string>{"case.json"});
}

const std::vector<std::string> kRun = {"run", "CASE", "--out", "OUT"};

const BadRun kBadRuns[] = {
    {"syntax_error",
     "raw:{\"tooth\": {\"type\": \"maxillary_canine\"},\n \"load\": {\"magnitude\": }}", kRun, 2,
     "line 2, column"},
    {"wrong_type", "load.magnitude=\"strong\"", kRun, 2, "load.magnitude"},
    {"unknown_key", "load.magnitudes=50", kRun, 2, "did you mean \"magnitude\""},
    {"out_of_range", "load.magnitude=-10", kRun, 2, "load.magnitude"},
    {"out_of_range_threshold", "thresholds={\"limit\": {\"value_kpa\": 1}}", kRun, 2,
     "thresholds.limit.value_kpa"},
    {"impossible_geometry", "scenarios[1].horizontal_loss_mm=14", kRun, 2,
     "scenarios[1].horizontal_loss_mm"},
    {"impossible_defect", "scenarios[1].angular_defect={\"surface\": \"distal\", \"depth_mm\": 12}",
     kRun, 2, "scenarios[1].angular_defect.depth_mm"},
    {"mesh_command_checks_too",
     "pdl.width_mm=0",
     {"mesh", "CASE", "--out", "OUT"},
     2,
     "pdl.width_mm"},
    {"vary_without_equals",
     "",
     {"sweep", "CASE", "--out", "OUT", "--vary", "load.magnitude"},
     2,
     "--vary load.magnitude: there is no '='"},
    {"vary_bad_value",
     "",
     {"sweep", "CASE", "--out", "OUT", "--vary", "load.magnitude=50,abc"},
     2,
     "load.magnitude"},
    {"vary_out_of_range",
     "",
     {"sweep", "CASE", "--out", "OUT", "--vary", "load.magnitude=50,9000"},
     2,
     "load.magnitude"},
    {"vary_unknown_key",
     "",
     {"sweep", "CASE", "--out", "OUT", "--vary", "load.magnitde=50"},
     2,
     "did you mean \"magnitude\""},
    {"vary_missing_index",
     "",
     {"sweep", "CASE", "--out", "OUT", "--vary", "scenarios[7].horizontal_loss_mm=1"},
     2,
     "no element [7]"},
    {"vary_twice",
     "",
     {"sweep", "CASE", "--out", "OUT", "--vary", "load.magnitude=50", "--vary",
      "load.magnitude=60"},
     2,
     "varied twice"},
    {"sweep_without_vary", "", {"sweep", "CASE", "--out", "OUT"}, 2, "--vary"},
    {"missing_case_file", "", {"run", "no-such-case.json", "--out", "OUT"}, 2, "no-such-case.json"},
    {"missing_out", "", {"run", "CASE"}, 2, "--out"},
    {"no_subcommand", "", {"--out", "OUT"}, 2, "A subcommand is required"},
    {"unknown_subcommand", "", {"solve", "CASE", "--out", "OUT"}, 2, "unknown command \"solve\""},
    {"bad_preset_option",
     "",
     {"run", "CASE", "--out", "OUT", "--mesh-preset", "ultra"},
     2,
     "ultra"},
    {"number_overflow", "raw:{\"load\": {\"magnitude\": 1e400}}", kRun, 2,
     "bad input (key load.magnitude)"},
    {"empty_out", "", {"run", "CASE", "--out", ""}, 2, "--out is empty"},
    {"out_holds_the_case", "", {"run", "CASE", "--out", "DIR"}, 2, "holds the case file"},
    {"out_holds_the_case_sweep",
     "",
     {"sweep", "CASE", "--out", "DIR", "--vary", "load.magnitude=50"},
     2,
     "holds the case file"},
    {"out_is_a_file", "", {"run", "CASE", "--out", "CASE"}, 5, "is not a folder"},
};

INSTANTIATE_TEST_SUITE_P(Batch, BatchBadInput, ::testing::ValuesIn(kBadRuns),
                         [](const ::testing::TestParamInfo<BadRun>& p) {
                           return std::string(p.param.name);
                         });

// Bounded input: cases that crashed (deep nesting), hung (a FIFO without a writer; even SIGTERM
// did not end it) or exhausted memory (/dev/zero) are refused with exit code 2.
TEST(BatchBoundedInput, HostileCaseFilesExitWithBadInput) {
  TempFolder folder("batch-bounded");
  const std::string deep = folder / "deep.json", fifo = folder / "case.fifo";
  write_file(deep, "{\"notes\": " + std::string(100000, '[') + std::string(100000, ']') + "}");
  ASSERT_EQ(::mkfifo(fifo.c_str(), 0600), 0);
  const std::pair<std::string, const char*> cases[] = {
      {deep, "nested deeper than 64 levels"},
      {fifo, "is not a regular file (a pipe)"},
      {"/dev/zero", "is not a regular file (a character device)"},
  };
  for (const auto& [path, fragment] : cases) {
    SCOPED_TRACE(path);
    const ProcessResult r = run_batch({"run", path, "--out", folder / "out"}, 120);
    EXPECT_EQ(r.exit_code, 2) << r.err;
    EXPECT_NE(r.err.find(fragment), std::string::npos) << r.err;
  }
  EXPECT_FALSE(std::filesystem::exists(folder / "out"));
}

TEST(BatchCli, HelpListsExamplesAndExitCodes) {
  const ProcessResult r = run_batch({"--help"}, 60);
  EXPECT_EQ(r.exit_code, 0);
  for (const char* text :
       {"Examples:", "Exit codes:", "2  bad input", "3  mesher failure", "4  solver failure",
        "5  output failure", "6  interrupted", "sweep", "Caution"})
    EXPECT_NE(r.out.find(text), std::string::npos) << text << " missing from:\n" << r.out;
  const ProcessResult sub = run_batch({"sweep", "--help"}, 60);
  EXPECT_EQ(sub.exit_code, 0);
  EXPECT_NE(sub.out.find("--vary"), std::string::npos) << sub.out;
}

}  // namespace
}  // namespace sharpey::test
