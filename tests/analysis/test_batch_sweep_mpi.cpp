// sharpey-batch sweep over MPI ranks, restarts from checkpoints and study designs. The rank runs
// start Open MPI's mpirun (path found by CMake, SHARPEY_MPIEXEC); as root it needs
// OMPI_ALLOW_RUN_AS_ROOT(_CONFIRM), set in the ctest entry's ENVIRONMENT. The restarts stop a run
// with SHARPEY_TEST_KILL_AFTER_MODELS=k (rank 0 kills itself with SIGKILL right after its k-th
// checkpoint), so where it stops does not depend on timing.
#include <gtest/gtest.h>
#include <signal.h>

#include <algorithm>
#include <sstream>
#include <string>
#include <vector>

#include "support/batch_process.h"

namespace sharpey::test {
namespace {

// An invented design: two teeth x two bone levels x two movements x two forces, on the coarse
// mesh of the base case: 2 models (of 2 bone levels each), 8 combinations, 16 rows.
constexpr const char* kDesign = R"({
  "design_version": 1,
  "label": "Invented test design",
  "teeth": ["maxillary_central_incisor", "mandibular_canine"],
  "bone_levels_mm": [0, 3],
  "movements": ["uncontrolled_tipping", "translation"],
  "forces": [50, 100],
  "force_unit": "g"
})";

ProcessResult run_mpi(int n_ranks, const std::vector<std::string>& batch_args,
                      const std::vector<std::string>& environment = {}) {
  std::vector<std::string> args = {"-n", std::to_string(n_ranks), "--oversubscribe",
                                   batch_binary()};
  args.insert(args.end(), batch_args.begin(), batch_args.end());
  ChildProcess child(SHARPEY_MPIEXEC, args, environment);
  return child.wait(600);
}

std::vector<std::string> lines(const std::string& text) {
  std::vector<std::string> out;
  std::istringstream in(text);
  for (std::string line; std::getline(in, line);) out.push_back(line);
  return out;
}

size_t count_checkpoints(const std::string& folder) {
  const std::vector<std::string> names = list_folder(folder);
  return static_cast<size_t>(std::count_if(names.begin(), names.end(), [](const std::string& n) {
    return n.rfind("sweep_checkpoint_", 0) == 0;
  }));
}

TEST(SweepMpi, TwoRanksWriteTheSingleProcessFileOfADesign) {
  TempFolder folder("sweep-mpi");
  const std::string case_path = folder / "case.json", design = folder / "design.json";
  write_file(case_path, coarse_case_json(1));
  write_file(design, kDesign);

  const ProcessResult one =
      run_batch({"sweep", case_path, "--design", design, "--out", folder / "one"});
  ASSERT_EQ(one.exit_code, 0) << one.err;
  EXPECT_NE(one.err.find("8 combinations, 2 models solved"), std::string::npos) << one.err;
  const std::string single = read_file(folder / "one/sweep.csv");

  // The table the design expands to: header, then 16 rows (combination x bone level), the tooth
  // slowest, the force fastest, the bone levels as the scenarios.
  const std::vector<std::string> rows = lines(single);
  ASSERT_EQ(rows.size(), 2u + 1u + 16u) << single;
  EXPECT_EQ(rows[2].rfind("combination,tooth.type,load.movement,load.magnitude,scenario,", 0), 0u)
      << rows[2];
  EXPECT_EQ(rows[3].rfind("1,maxillary_central_incisor,uncontrolled_tipping,50,healthy,", 0), 0u)
      << rows[3];
  EXPECT_EQ(rows[4].rfind("1,maxillary_central_incisor,uncontrolled_tipping,50,3 mm loss,", 0), 0u)
      << rows[4];
  EXPECT_EQ(rows[18].rfind("8,mandibular_canine,translation,100,3 mm loss,", 0), 0u) << rows[18];

  const ProcessResult two =
      run_mpi(2, {"sweep", case_path, "--design", design, "--out", folder / "two"});
  ASSERT_EQ(two.exit_code, 0) << two.err << two.out;
  EXPECT_NE(two.err.find("8 combinations, 2 models solved on 2 ranks"), std::string::npos)
      << two.err;
  // Rank 0 prints the stages of the models it solves: model 1 only, so rank 1 solved model 2.
  EXPECT_NE(two.err.find("model 1 of 2 (combination 1 of 8)"), std::string::npos) << two.err;
  EXPECT_EQ(two.err.find("model 2 of 2 (combination 5 of 8)"), std::string::npos) << two.err;
  // Progress for the whole study, with an estimate of the time left while models remain.
  const size_t first_done = two.err.find("study: 1 of 2 models done, 2 ranks, ");
  ASSERT_NE(first_done, std::string::npos) << two.err;
  const std::string first_line =
      two.err.substr(first_done, two.err.find('\n', first_done) - first_done);
  EXPECT_NE(first_line.find("models/min, about "), std::string::npos) << first_line;
  EXPECT_NE(first_line.find(" left"), std::string::npos) << first_line;
  EXPECT_NE(two.err.find("study: 2 of 2 models done, 2 ranks"), std::string::npos) << two.err;
  EXPECT_EQ(read_file(folder / "two/sweep.csv"), single);  // byte for byte
  EXPECT_EQ(list_folder(folder / "two"),
            (std::vector<std::string>{"sweep.csv", "sweep_case.json"}));
}

// A sweep of three single-scenario models (bone loss 0, 2, 4 mm) with two forces each.
const std::vector<std::string> kVary = {"--vary", "load.magnitude=50,100", "--vary",
                                        "scenarios[0].horizontal_loss_mm=0,2,4"};

std::vector<std::string> sweep_args(const std::string& case_path, const std::string& out,
                                    const std::vector<std::string>& vary = kVary) {
  std::vector<std::string> args = {"sweep", case_path, "--out", out};
  args.insert(args.end(), vary.begin(), vary.end());
  return args;
}

TEST(SweepMpi, KilledRunResumesAndSolvesOnlyTheRest) {
  TempFolder folder("sweep-restart");
  const std::string case_path = folder / "case.json";
  write_file(case_path, coarse_case_json(1));
  const ProcessResult whole = run_batch(sweep_args(case_path, folder / "whole"));
  ASSERT_EQ(whole.exit_code, 0) << whole.err;
  EXPECT_NE(whole.err.find("6 combinations, 3 models solved"), std::string::npos) << whole.err;

  // One process killed after its first model, resumed by one process.
  const std::string out = folder / "out";
  ChildProcess killed(batch_binary(), sweep_args(case_path, out),
                      {"SHARPEY_TEST_KILL_AFTER_MODELS=1"});
  const ProcessResult k = killed.wait(600);
  EXPECT_EQ(k.signal, SIGKILL) << k.err;
  EXPECT_EQ(count_checkpoints(out), 1u);
  EXPECT_FALSE(exists(out + "/sweep.csv"));
  const ProcessResult resumed = run_batch(sweep_args(case_path, out));
  ASSERT_EQ(resumed.exit_code, 0) << resumed.err;
  EXPECT_NE(resumed.err.find("resuming: 1 model of 3 already solved"), std::string::npos)
      << resumed.err;
  EXPECT_NE(resumed.err.find("6 combinations, 2 models solved, 1 resumed from checkpoints"),
            std::string::npos)
      << resumed.err;
  EXPECT_EQ(resumed.err.find("model 1 of 3"), std::string::npos) << "model 1 solved again";
  EXPECT_EQ(read_file(out + "/sweep.csv"), read_file(folder / "whole/sweep.csv"));
  // Committed: the checkpoints went with the swap of the folder.
  EXPECT_EQ(list_folder(out), (std::vector<std::string>{"sweep.csv", "sweep_case.json"}));
}

TEST(SweepMpi, RunKilledOnThreeRanksResumesOnOneAndIgnoresAnotherSweepsCheckpoints) {
  TempFolder folder("sweep-restart-mpi");
  const std::string case_path = folder / "case.json";
  write_file(case_path, coarse_case_json(1));
  const ProcessResult whole = run_batch(sweep_args(case_path, folder / "whole"));
  ASSERT_EQ(whole.exit_code, 0) << whole.err;

  // Three ranks for three models: one each; rank 0 kills the job after saving two of them.
  const std::string out = folder / "out";
  const ProcessResult k =
      run_mpi(3, sweep_args(case_path, out), {"SHARPEY_TEST_KILL_AFTER_MODELS=2"});
  EXPECT_NE(k.exit_code, 0) << k.err;
  ASSERT_EQ(count_checkpoints(out), 2u) << k.err;

  // Another sweep (one bone level changed) started into the same folder and killed after one
  // model takes none of those rows: it starts afresh, and leaves its own checkpoint beside them.
  const std::vector<std::string> other = {"--vary", "load.magnitude=50,100", "--vary",
                                          "scenarios[0].horizontal_loss_mm=0,2,5"};
  ChildProcess other_run(batch_binary(), sweep_args(case_path, out, other),
                         {"SHARPEY_TEST_KILL_AFTER_MODELS=1"});
  const ProcessResult o = other_run.wait(600);
  EXPECT_EQ(o.signal, SIGKILL) << o.err;
  EXPECT_EQ(o.err.find("resuming"), std::string::npos) << o.err;
  EXPECT_EQ(count_checkpoints(out), 3u);

  const ProcessResult resumed = run_batch(sweep_args(case_path, out));
  ASSERT_EQ(resumed.exit_code, 0) << resumed.err;
  EXPECT_NE(resumed.err.find("6 combinations, 1 model solved, 2 resumed from checkpoints"),
            std::string::npos)
      << resumed.err;
  EXPECT_EQ(read_file(out + "/sweep.csv"), read_file(folder / "whole/sweep.csv"));
}

// Ctrl-C reaches every rank (the launcher passes it on); here rank 0 alone is interrupted after
// its first checkpoint, the harder case: it says so and ends with the interrupted code (6), and
// the launcher ends the other rank. No MPI_Abort banner, no crash report; a rerun resumes.
TEST(SweepMpi, InterruptedRankEndsTheJobWithTheInterruptedCodeAndARerunResumes) {
  TempFolder folder("sweep-interrupt-mpi");
  const std::string case_path = folder / "case.json";
  write_file(case_path, coarse_case_json(1));
  const ProcessResult whole = run_batch(sweep_args(case_path, folder / "whole"));
  ASSERT_EQ(whole.exit_code, 0) << whole.err;

  const std::string out = folder / "out";
  const ProcessResult stopped =
      run_mpi(2, sweep_args(case_path, out),
              {"SHARPEY_TEST_KILL_AFTER_MODELS=1", "SHARPEY_TEST_KILL_SIGNAL=INT"});
  EXPECT_EQ(stopped.exit_code, 6) << stopped.err;
  EXPECT_NE(stopped.err.find("interrupted (rank 0 of 2)"), std::string::npos) << stopped.err;
  EXPECT_NE(stopped.err.find("run the same command again to resume"), std::string::npos)
      << stopped.err;
  EXPECT_EQ(stopped.err.find("MPI_ABORT"), std::string::npos) << stopped.err;
  EXPECT_EQ(stopped.err.find("Segmentation"), std::string::npos) << stopped.err;
  EXPECT_FALSE(exists(out + "/sweep.csv"));
  const size_t kept = count_checkpoints(out);
  ASSERT_GE(kept, 1u) << stopped.err;

  const ProcessResult resumed = run_mpi(2, sweep_args(case_path, out));
  ASSERT_EQ(resumed.exit_code, 0) << resumed.err;
  EXPECT_NE(resumed.err.find("resuming: " + std::to_string(kept) + " model"), std::string::npos)
      << resumed.err;
  EXPECT_EQ(read_file(out + "/sweep.csv"), read_file(folder / "whole/sweep.csv"));
}

size_t count(const std::string& text, const std::string& what) {
  size_t n = 0;
  for (size_t at = text.find(what); at != std::string::npos; at = text.find(what, at + 1)) ++n;
  return n;
}

TEST(SweepMpi, BadInputOnSeveralRanksIsSaidOnceAndRunStaysOneProcess) {
  TempFolder folder("sweep-mpi-bad");
  const std::string case_path = folder / "case.json", design = folder / "design.json";
  write_file(case_path, coarse_case_json(1));
  write_file(design, R"({"teeth": ["maxillary_canine"], "movements": ["sideways"]})");
  const ProcessResult bad =
      run_mpi(2, {"sweep", case_path, "--design", design, "--out", folder / "out"});
  EXPECT_EQ(bad.exit_code, 2) << bad.err;
  EXPECT_EQ(count(bad.err, "movement \"sideways\" is unknown"), 1u) << bad.err;
  EXPECT_FALSE(exists(folder / "out"));

  const ProcessResult run = run_mpi(2, {"run", case_path, "--out", folder / "run"});
  EXPECT_EQ(run.exit_code, 2) << run.err;
  EXPECT_EQ(count(run.err, "only sweep runs over several MPI ranks"), 1u) << run.err;
  EXPECT_FALSE(exists(folder / "run"));
}

}  // namespace
}  // namespace sharpey::test
