// StagedFolder: outputs appear in their folder only complete (see report_output.h).
#include <fcntl.h>
#include <signal.h>
#include <stdio.h>  // renameat2, RENAME_EXCHANGE
#include <unistd.h>

#include <cerrno>
#include <cstdlib>
#include <cstring>
#include <filesystem>
#include <string>
#include <system_error>

#include "sharpey/output/report_output.h"

namespace sharpey::analysis {

namespace fs = std::filesystem;

namespace {

constexpr const char* kPartialTag = ".partial-";
constexpr const char* kReplacedTag = ".replaced-";

[[noreturn]] void fail(const std::string& what, const fs::path& path, const std::error_code& ec) {
  throw OutputError(what + " \"" + path.string() + "\" failed (" + ec.message() +
                    "); check that the folder is writable and the disk is not full");
}

// Removes staging folders (and old folders set aside by a replacement) of `name` whose process
// no longer exists.
void remove_stale(const fs::path& parent, const std::string& name) {
  std::error_code ec;
  for (fs::directory_iterator it(parent, ec), end; !ec && it != end; it.increment(ec)) {
    const std::string entry = it->path().filename().string();
    std::string pid_text;
    for (const char* tag : {kPartialTag, kReplacedTag}) {
      const std::string prefix = "." + name + tag;
      if (entry.rfind(prefix, 0) == 0) pid_text = entry.substr(prefix.size());
    }
    if (pid_text.empty() || pid_text.find_first_not_of("0123456789") != std::string::npos) continue;
    const long pid = std::stol(pid_text);
    if (pid <= 0 || pid == ::getpid()) continue;
    if (::kill(static_cast<pid_t>(pid), 0) == 0 || errno != ESRCH) continue;  // still running
    std::error_code ignored;
    fs::remove_all(it->path(), ignored);
  }
}

// Testing aid: SHARPEY_TEST_KILL_OUTPUT_AT=<point> kills the process with SIGKILL at that point
// of commit() ("before-swap", "after-swap"), so tests can stop a replacement part-way without
// relying on timing (tests/analysis/test_batch_kill.cpp).
void test_kill_point(const char* point) {
  const char* wanted = std::getenv("SHARPEY_TEST_KILL_OUTPUT_AT");
  if (wanted && std::strcmp(wanted, point) == 0) ::kill(::getpid(), SIGKILL);
}

// What commit() replaces as a whole must be an earlier run's output, not a folder of the user's
// that happens to be given as --out (their home folder, say): only regular files with the
// extensions Sharpey writes.
void check_replaceable(const fs::path& folder) {
  std::error_code ec;
  for (fs::directory_iterator it(folder, ec), end; !ec && it != end; it.increment(ec)) {
    const fs::path& entry = it->path();
    const std::string extension = entry.extension().string();
    const bool ours =
        it->is_regular_file(ec) && !it->is_symlink(ec) &&
        (extension == ".json" || extension == ".csv" || extension == ".txt" || extension == ".vtu");
    if (!ours)
      throw OutputError("the output folder \"" + folder.string() + "\" holds \"" +
                        entry.filename().string() +
                        "\", which is not a file of an earlier run; an output folder is replaced "
                        "as a whole, so give a new or empty folder, or one that holds only "
                        "results of an earlier run (.json, .csv, .txt, .vtu files)");
  }
  if (ec) fail("listing the output folder", folder, ec);
}

}  // namespace

StagedFolder::StagedFolder(const std::string& folder) {
  fs::path target = fs::absolute(fs::path(folder)).lexically_normal();
  if (target.has_filename() == false) target = target.parent_path();  // trailing slash
  folder_ = target.string();
  std::error_code ec;
  if (fs::exists(target, ec) && !fs::is_directory(target, ec))
    throw OutputError("the output path \"" + folder_ +
                      "\" exists and is not a folder; choose another --out");
  const fs::path parent = target.parent_path();
  fs::create_directories(parent, ec);
  if (ec) fail("creating the folder", parent, ec);
  const std::string name = target.filename().string();
  if (fs::is_directory(target, ec)) check_replaceable(target);
  remove_stale(parent, name);
  const fs::path staging = parent / ("." + name + kPartialTag + std::to_string(::getpid()));
  fs::remove_all(staging, ec);
  fs::create_directory(staging, ec);
  if (ec) fail("creating the staging folder", staging, ec);
  staging_ = staging.string();
}

StagedFolder::~StagedFolder() {
  if (committed_) return;
  std::error_code ignored;
  fs::remove_all(staging_, ignored);
}

std::string StagedFolder::path(const std::string& file_name) const {
  return (fs::path(staging_) / file_name).string();
}

void StagedFolder::commit() {
  std::error_code ec;
  const fs::path target(folder_);
  test_kill_point("before-swap");
  if (::rename(staging_.c_str(), folder_.c_str()) == 0) {  // `folder` did not exist: one step
    committed_ = true;
    return;
  }
  if (errno != EEXIST && errno != ENOTEMPTY)
    fail("renaming the staging folder to", target, std::error_code(errno, std::generic_category()));
  // `folder` exists: swap the two folders in one step, then remove the old one (now at the staging
  // path; a run killed before removing it leaves it to remove_stale).
  check_replaceable(target);
  if (::renameat2(AT_FDCWD, staging_.c_str(), AT_FDCWD, folder_.c_str(), RENAME_EXCHANGE) == 0) {
    committed_ = true;
    test_kill_point("after-swap");
    fs::remove_all(staging_, ec);
    return;
  }
  if (errno != EINVAL && errno != ENOSYS)
    fail("swapping the staging folder with", target,
         std::error_code(errno, std::generic_category()));
  // A file system without RENAME_EXCHANGE: set the old folder aside, then rename the new one in.
  // A run killed in between leaves no --out folder (never a mix of two runs).
  const fs::path old = target.parent_path() / ("." + target.filename().string() + kReplacedTag +
                                               std::to_string(::getpid()));
  fs::rename(target, old, ec);
  if (ec) fail("setting aside the earlier output folder", target, ec);
  test_kill_point("after-swap");
  fs::rename(staging_, target, ec);
  if (ec) {
    std::error_code ignored;
    fs::rename(old, target, ignored);  // put the earlier run back
    fail("renaming the staging folder to", target, ec);
  }
  committed_ = true;
  fs::remove_all(old, ec);
}

}  // namespace sharpey::analysis
