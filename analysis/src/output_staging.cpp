// StagedFolder: outputs appear in their folder only complete (see report_output.h).
#include <signal.h>
#include <unistd.h>

#include <cerrno>
#include <filesystem>
#include <string>
#include <system_error>

#include "sharpey/analysis/report_output.h"

namespace sharpey::analysis {

namespace fs = std::filesystem;

namespace {

constexpr const char* kPartialTag = ".partial-";

[[noreturn]] void fail(const std::string& what, const fs::path& path, const std::error_code& ec) {
  throw OutputError(what + " \"" + path.string() + "\" failed (" + ec.message() +
                    "); check that the folder is writable and the disk is not full");
}

// Removes staging folders of `name` whose process no longer exists.
void remove_stale(const fs::path& parent, const std::string& name) {
  std::error_code ec;
  const std::string prefix = "." + name + kPartialTag;
  for (fs::directory_iterator it(parent, ec), end; !ec && it != end; it.increment(ec)) {
    const std::string entry = it->path().filename().string();
    if (entry.rfind(prefix, 0) != 0) continue;
    const std::string pid_text = entry.substr(prefix.size());
    if (pid_text.empty() || pid_text.find_first_not_of("0123456789") != std::string::npos) continue;
    const long pid = std::stol(pid_text);
    if (pid <= 0 || pid == ::getpid()) continue;
    if (::kill(static_cast<pid_t>(pid), 0) == 0 || errno != ESRCH) continue;  // still running
    std::error_code ignored;
    fs::remove_all(it->path(), ignored);
  }
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
  if (!fs::exists(target, ec)) {
    fs::rename(staging_, target, ec);
    if (!ec) {
      committed_ = true;
      return;
    }
    // Another process created the folder meanwhile: fall through to moving file by file.
    fs::create_directories(target, ec);
    if (ec) fail("creating the output folder", target, ec);
  }
  for (fs::directory_iterator it(staging_, ec), end; !ec && it != end; it.increment(ec)) {
    std::error_code move_ec;
    fs::rename(it->path(), target / it->path().filename(), move_ec);
    if (move_ec) fail("moving the finished file to", target / it->path().filename(), move_ec);
  }
  if (ec) fail("listing the staging folder", staging_, ec);
  fs::remove_all(staging_, ec);
  committed_ = true;
}

}  // namespace sharpey::analysis
