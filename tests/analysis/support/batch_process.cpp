#include "batch_process.h"

#include <fcntl.h>
#include <signal.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <atomic>
#include <chrono>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <stdexcept>
#include <thread>

extern char** environ;  // POSIX: the environment of this process

namespace sharpey::test {

namespace fs = std::filesystem;

std::string batch_binary() { return std::string(SHARPEY_BINARY_DIR) + "/app/batch/sharpey-batch"; }

std::string sample_path(const std::string& name) {
  return std::string(SHARPEY_SOURCE_DIR) + "/samples/" + name;
}

namespace {

std::string unique_name(const std::string& tag) {
  static std::atomic<int> counter{0};
  return "sharpey-" + tag + "-" + std::to_string(::getpid()) + "-" + std::to_string(counter++);
}

}  // namespace

ChildProcess::ChildProcess(const std::string& program, const std::vector<std::string>& args,
                           const std::vector<std::string>& environment) {
  const fs::path base = fs::temp_directory_path() / unique_name("proc");
  out_path_ = base.string() + ".out";
  err_path_ = base.string() + ".err";
  std::vector<std::string> argv_storage = {program};
  argv_storage.insert(argv_storage.end(), args.begin(), args.end());
  std::vector<char*> argv;
  for (std::string& a : argv_storage) argv.push_back(a.data());
  argv.push_back(nullptr);
  std::vector<std::string> env_storage;
  for (char** e = environ; *e; ++e) env_storage.emplace_back(*e);
  env_storage.insert(env_storage.end(), environment.begin(), environment.end());
  std::vector<char*> envp;
  for (std::string& e : env_storage) envp.push_back(e.data());
  envp.push_back(nullptr);
  pid_ = ::fork();
  if (pid_ < 0) throw std::runtime_error("fork failed");
  if (pid_ == 0) {
    const int out = ::open(out_path_.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0644);
    const int err = ::open(err_path_.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0644);
    if (out < 0 || err < 0) ::_exit(127);
    ::dup2(out, 1);
    ::dup2(err, 2);
    ::close(out);
    ::close(err);
    ::execve(program.c_str(), argv.data(), envp.data());
    ::_exit(127);
  }
}

ChildProcess::~ChildProcess() {
  if (!reaped_ && pid_ > 0) {
    ::kill(pid_, SIGKILL);
    int status = 0;
    ::waitpid(pid_, &status, 0);
  }
  std::error_code ignored;
  fs::remove(out_path_, ignored);
  fs::remove(err_path_, ignored);
}

void ChildProcess::send(int signal) {
  if (!reaped_) ::kill(pid_, signal);
}

ProcessResult ChildProcess::wait(double timeout_s) {
  ProcessResult r;
  const auto deadline = std::chrono::steady_clock::now() + std::chrono::duration<double>(timeout_s);
  while (!reaped_) {
    const pid_t done = ::waitpid(pid_, &status_, WNOHANG);
    if (done == pid_) {
      reaped_ = true;
      break;
    }
    if (std::chrono::steady_clock::now() > deadline) {
      ::kill(pid_, SIGKILL);
      ::waitpid(pid_, &status_, 0);
      reaped_ = true;
      break;
    }
    std::this_thread::sleep_for(std::chrono::milliseconds(20));
  }
  if (WIFEXITED(status_)) r.exit_code = WEXITSTATUS(status_);
  if (WIFSIGNALED(status_)) r.signal = WTERMSIG(status_);
  r.out = read_file(out_path_);
  r.err = read_file(err_path_);
  return r;
}

bool ChildProcess::wait_for_stderr(const std::string& text, double timeout_s) {
  const auto deadline = std::chrono::steady_clock::now() + std::chrono::duration<double>(timeout_s);
  while (std::chrono::steady_clock::now() < deadline) {
    if (stderr_so_far().find(text) != std::string::npos) return true;
    if (!reaped_ && ::waitpid(pid_, &status_, WNOHANG) == pid_) {
      reaped_ = true;
      return stderr_so_far().find(text) != std::string::npos;
    }
    std::this_thread::sleep_for(std::chrono::milliseconds(5));
  }
  return false;
}

std::string ChildProcess::stderr_so_far() const { return read_file(err_path_); }

std::string coarse_case_json(int n_scenarios) {
  std::string scenarios = R"({"name": "healthy", "horizontal_loss_mm": 0})";
  if (n_scenarios >= 2) scenarios += R"(, {"name": "3 mm loss", "horizontal_loss_mm": 3})";
  return R"({
  "schema_version": 1,
  "label": "Invented test case: maxillary central incisor, 100 g lingual",
  "tooth": {"type": "maxillary_central_incisor"},
  "pdl": {"width_mm": 0.2},
  "scenarios": [)" +
         scenarios + R"(],
  "load": {"magnitude": 100, "unit": "g", "direction": "lingual"},
  "mesh": {"preset": "coarse"}
})";
}

ProcessResult run_batch(const std::vector<std::string>& args, double timeout_s) {
  ChildProcess child(batch_binary(), args);
  return child.wait(timeout_s);
}

TempFolder::TempFolder(const std::string& tag) {
  path_ = (fs::temp_directory_path() / unique_name(tag)).string();
  fs::create_directories(path_);
}

TempFolder::~TempFolder() {
  std::error_code ignored;
  fs::remove_all(path_, ignored);
}

std::string read_file(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

void write_file(const std::string& path, const std::string& content) {
  std::ofstream out(path, std::ios::binary);
  out << content;
  if (!out) throw std::runtime_error("cannot write " + path);
}

std::vector<std::string> list_folder(const std::string& folder) {
  std::vector<std::string> names;
  std::error_code ec;
  for (fs::directory_iterator it(folder, ec), end; !ec && it != end; it.increment(ec))
    names.push_back(it->path().filename().string());
  std::sort(names.begin(), names.end());
  return names;
}

bool exists(const std::string& path) {
  std::error_code ec;
  return fs::exists(path, ec);
}

}  // namespace sharpey::test
