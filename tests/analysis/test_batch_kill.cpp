// sharpey-batch killed or interrupted mid-run: the output folder holds only complete files or
// nothing, an older folder's files survive intact, SIGINT / SIGTERM end with exit code 6 and clean
// up, and the staging left by a SIGKILL is removed by the next run for the same folder.
#include <gtest/gtest.h>
#include <signal.h>
#include <sys/stat.h>

#include <algorithm>
#include <cerrno>
#include <chrono>
#include <cstdio>
#include <filesystem>
#include <nlohmann/json.hpp>
#include <string>
#include <thread>

#include "support/batch_process.h"

namespace sharpey::test {
namespace {

// Pauses the batch after each report file so a signal can land while it writes
// (app/batch/batch_commands.cpp, pause_after_write).
const std::vector<std::string> kSlowWriting = {"SHARPEY_BATCH_WRITE_DELAY_MS=400"};

bool ends_with(const std::string& s, const std::string& tail) {
  return s.size() >= tail.size() && s.compare(s.size() - tail.size(), tail.size(), tail) == 0;
}

// Every file in `folder` is complete: JSON parses, CSV and text end with a line break, .vtu
// files are closed. No hidden or temporary file.
void expect_only_complete_files(const std::string& folder) {
  for (const std::string& name : list_folder(folder)) {
    SCOPED_TRACE(name);
    EXPECT_NE(name[0], '.') << "hidden (temporary) file in the output folder";
    EXPECT_EQ(name.find("tmp"), std::string::npos);
    const std::string text = read_file(folder + "/" + name);
    if (ends_with(name, ".json")) {
      EXPECT_FALSE(nlohmann::json::parse(text, nullptr, false).is_discarded()) << "incomplete JSON";
    } else if (ends_with(name, ".vtu")) {
      EXPECT_NE(text.rfind("</VTKFile>"), std::string::npos) << "incomplete .vtu";
    } else {
      EXPECT_TRUE(ends_with(text, "\n")) << "incomplete text file";
    }
  }
}

// Entries of `parent` that are staging folders of `name`.
std::vector<std::string> staging_folders(const std::string& parent, const std::string& name) {
  std::vector<std::string> found;
  for (const std::string& entry : list_folder(parent))
    if (entry.rfind("." + name + ".partial-", 0) == 0) found.push_back(entry);
  return found;
}

class KillAfter : public ::testing::TestWithParam<double> {};

TEST_P(KillAfter, OutputFolderHoldsOnlyCompleteFilesOrNothing) {
  const double seconds = GetParam();
  TempFolder folder("batch-kill-time");
  const std::string case_path = folder / "case.json";
  write_file(case_path, coarse_case_json(2));
  const std::string out = folder / "out";
  ChildProcess child(batch_binary(), {"run", case_path, "--out", out});
  std::this_thread::sleep_for(std::chrono::duration<double>(seconds));
  child.send(SIGKILL);
  const ProcessResult r = child.wait();
  SCOPED_TRACE("stderr at the kill:\n" + r.err);
  if (r.signal == SIGKILL) {
    EXPECT_FALSE(exists(out)) << "a killed run must not leave its output folder";
  } else {
    EXPECT_EQ(r.exit_code, 0);  // it finished before the kill: the folder is complete
    expect_only_complete_files(out);
  }
}

INSTANTIATE_TEST_SUITE_P(Batch, KillAfter, ::testing::Values(0.05, 0.5, 2.0, 6.0),
                         [](const ::testing::TestParamInfo<double>& p) {
                           return "after_" + std::to_string(static_cast<int>(p.param * 1000)) +
                                  "_ms";
                         });

TEST(BatchKill, KillWhileWritingKeepsTheOlderFolderIntact) {
  TempFolder folder("batch-kill-writing");
  const std::string case_path = folder / "case.json";
  write_file(case_path, coarse_case_json(1));
  const std::string out = folder / "out";
  std::filesystem::create_directories(out);
  write_file(out + "/results.json", "{\"older\": true}\n");
  ChildProcess child(batch_binary(), {"run", case_path, "--out", out}, kSlowWriting);
  ASSERT_TRUE(child.wait_for_stderr("writing s1_healthy files", 600)) << child.stderr_so_far();
  std::this_thread::sleep_for(std::chrono::milliseconds(500));  // one file written, more to come
  child.send(SIGKILL);
  const ProcessResult r = child.wait();
  ASSERT_EQ(r.signal, SIGKILL) << "the run ended before the kill:\n" << r.err;
  EXPECT_EQ(list_folder(out), std::vector<std::string>{"results.json"});
  EXPECT_EQ(read_file(out + "/results.json"), "{\"older\": true}\n");
  // The half-filled staging folder sits beside the output, hidden, and the next run for the same
  // folder removes it (the mesh command is the quickest such run); that run replaces the folder
  // as a whole, so the older run's file goes too.
  ASSERT_EQ(staging_folders(folder.path(), "out").size(), 1u);
  const ProcessResult next = run_batch({"mesh", case_path, "--out", out, "--quiet"});
  ASSERT_EQ(next.exit_code, 0) << next.err;
  EXPECT_TRUE(staging_folders(folder.path(), "out").empty());
  EXPECT_FALSE(exists(out + "/results.json"));
  EXPECT_TRUE(exists(out + "/mesh_statistics.json"));
  expect_only_complete_files(out);
}

// The names a successful run lists on stdout ("sharpey-batch: wrote N files to DIR: a b c").
std::vector<std::string> announced_files(const std::string& out) {
  std::vector<std::string> names;
  const size_t colon = out.find(": ", out.find(" files to "));
  std::string name;
  for (char c : out.substr(colon + 2) + " ") {
    if (c == ' ' || c == '\n') {
      if (!name.empty()) names.push_back(name);
      name.clear();
    } else {
      name += c;
    }
  }
  std::sort(names.begin(), names.end());
  return names;
}

// Replacing a folder of an earlier 3-scenario run by a 1-scenario run, killed at the two points of
// the swap through the library's test hook (no timing): before the swap the folder is the earlier
// run untouched, after it the new run complete; never a mix. The next run cleans up.
TEST(BatchKill, ReplacingAnEarlierRunNeverMixesTheTwo) {
  TempFolder folder("batch-kill-swap");
  const std::string case_path = folder / "case.json";
  write_file(case_path, coarse_case_json(1));
  const std::string out = folder / "out";
  std::filesystem::create_directories(out);
  const std::vector<std::string> earlier = {"results.json", "s1_healthy_model.vtu",
                                            "s2_2_mm_loss_model.vtu", "s3_4_mm_loss_root_map.csv"};
  for (const std::string& name : earlier) write_file(out + "/" + name, "earlier run\n");

  const ProcessResult before = ChildProcess(batch_binary(), {"run", case_path, "--out", out},
                                            {"SHARPEY_TEST_KILL_OUTPUT_AT=before-swap"})
                                   .wait();
  ASSERT_EQ(before.signal, SIGKILL) << before.err;
  EXPECT_EQ(list_folder(out), earlier);
  for (const std::string& name : earlier) EXPECT_EQ(read_file(out + "/" + name), "earlier run\n");

  const ProcessResult after = ChildProcess(batch_binary(), {"run", case_path, "--out", out},
                                           {"SHARPEY_TEST_KILL_OUTPUT_AT=after-swap"})
                                  .wait();
  ASSERT_EQ(after.signal, SIGKILL) << after.err;
  const std::vector<std::string> swapped = list_folder(out);
  for (const char* name : {"s2_2_mm_loss_model.vtu", "s3_4_mm_loss_root_map.csv"})
    EXPECT_EQ(std::count(swapped.begin(), swapped.end(), name), 0) << name << " of the earlier run";
  EXPECT_NE(read_file(out + "/results.json"), "earlier run\n");
  expect_only_complete_files(out);

  const ProcessResult next = run_batch({"run", case_path, "--out", out, "--quiet"});
  ASSERT_EQ(next.exit_code, 0) << next.err;
  EXPECT_EQ(list_folder(out), announced_files(next.out));
  EXPECT_EQ(swapped, list_folder(out)) << "the killed run had written the same files";
  // Staging folders of the killed runs (one holding the earlier run after the swap) are gone.
  EXPECT_TRUE(staging_folders(folder.path(), "out").empty());
  EXPECT_EQ(list_folder(folder.path()), (std::vector<std::string>{"case.json", "out"}));
}

// An existing folder that is not an earlier run's output is refused, not replaced.
TEST(BatchKill, AFolderOfOtherFilesIsNotReplaced) {
  TempFolder folder("batch-foreign-out");
  const std::string case_path = folder / "case.json";
  write_file(case_path, coarse_case_json(1));
  const std::string out = folder / "out";
  std::filesystem::create_directories(out + "/photos");
  write_file(out + "/notes.txt", "mine\n");
  const ProcessResult r = run_batch({"mesh", case_path, "--out", out, "--quiet"});
  EXPECT_EQ(r.exit_code, 5) << r.err;
  EXPECT_NE(r.err.find("which is not a file of an earlier run"), std::string::npos) << r.err;
  EXPECT_EQ(list_folder(out), (std::vector<std::string>{"notes.txt", "photos"}));
}

TEST(BatchKill, InterruptWhileWritingExitsSixAndLeavesNothing) {
  TempFolder folder("batch-int-writing");
  const std::string case_path = folder / "case.json";
  write_file(case_path, coarse_case_json(1));
  const std::string out = folder / "out";
  ChildProcess child(batch_binary(), {"run", case_path, "--out", out}, kSlowWriting);
  ASSERT_TRUE(child.wait_for_stderr("writing s1_healthy files", 600)) << child.stderr_so_far();
  child.send(SIGINT);
  const ProcessResult r = child.wait(120);
  EXPECT_EQ(r.exit_code, 6) << r.err;
  EXPECT_NE(r.err.find("interrupted"), std::string::npos) << r.err;
  EXPECT_EQ(list_folder(folder.path()), std::vector<std::string>{"case.json"});
}

TEST(BatchKill, TerminateDuringTheSolveExitsSixAndLeavesNothing) {
  TempFolder folder("batch-term-solve");
  const std::string case_path = folder / "case.json";
  write_file(case_path, coarse_case_json(2));
  const std::string out = folder / "out";
  ChildProcess child(batch_binary(), {"run", case_path, "--out", out});
  ASSERT_TRUE(child.wait_for_stderr("scenario 1/2", 600)) << child.stderr_so_far();
  child.send(SIGTERM);
  const ProcessResult r = child.wait(300);
  EXPECT_EQ(r.exit_code, 6) << r.err;
  EXPECT_EQ(list_folder(folder.path()), std::vector<std::string>{"case.json"});
}

// Ctrl-C while meshing: the mesher (SHARPEY_MESHER) is a program that never finishes and writes
// its process id once it runs. SIGINT to sharpey-batch stops it: exit code 6, the mesher process
// killed and reaped, nothing written. No timing assertion: the test waits for each event.
TEST(BatchKill, InterruptWhileMeshingStopsTheMesher) {
  TempFolder folder("batch-int-mesher");
  const std::string case_path = folder / "case.json";
  write_file(case_path, coarse_case_json(1));
  const std::string marker = folder / "mesher.pid", script = folder / "mesher.sh";
  write_file(script, "#!/bin/sh\necho $$ > '" + marker + ".tmp'\nmv '" + marker + ".tmp' '" +
                         marker + "'\nexec sleep 100000\n");
  ASSERT_EQ(::chmod(script.c_str(), 0755), 0);
  const std::string out = folder / "out";
  ChildProcess child(batch_binary(), {"mesh", case_path, "--out", out},
                     {"SHARPEY_MESHER=" + script});
  while (!exists(marker)) std::this_thread::sleep_for(std::chrono::milliseconds(20));
  const pid_t mesher = static_cast<pid_t>(std::stol(read_file(marker)));
  const auto interrupted_at = std::chrono::steady_clock::now();
  child.send(SIGINT);
  const ProcessResult r = child.wait(300);
  // A figure, not a check (no timed tests): how long the command took to stop.
  std::printf(
      "SIGINT to exit while meshing: %.0f ms\n",
      std::chrono::duration<double, std::milli>(std::chrono::steady_clock::now() - interrupted_at)
          .count());
  EXPECT_EQ(r.exit_code, 6) << r.err;
  EXPECT_NE(r.err.find("interrupted"), std::string::npos) << r.err;
  EXPECT_TRUE(::kill(mesher, 0) != 0 && errno == ESRCH) << "the mesher process is still there";
  EXPECT_FALSE(exists(out));
}

// A mesher that crashes (SHARPEY_MESHER: a program that ends itself with SIGSEGV, as TetGen does
// when memory runs out part-way) is a mesher failure naming the signal, not a crash of the command.
TEST(BatchKill, ACrashingMesherIsAMesherFailure) {
  TempFolder folder("batch-mesher-crash");
  const std::string case_path = folder / "case.json";
  write_file(case_path, coarse_case_json(1));
  const std::string script = folder / "mesher.sh";
  write_file(script, "#!/bin/sh\nkill -SEGV $$\n");
  ASSERT_EQ(::chmod(script.c_str(), 0755), 0);
  const ProcessResult r = ChildProcess(batch_binary(), {"mesh", case_path, "--out", folder / "out"},
                                       {"SHARPEY_MESHER=" + script})
                              .wait(300);
  EXPECT_EQ(r.exit_code, 3) << r.err;
  EXPECT_NE(r.err.find("TetGen crashed (SIGSEGV"), std::string::npos) << r.err;
  EXPECT_FALSE(exists(folder / "out"));
}

}  // namespace
}  // namespace sharpey::test
