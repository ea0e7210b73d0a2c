// Running the sharpey-batch executable from tests: synchronously with captured output, or as a
// child process that a test can signal. Also small file helpers for checking output folders.
#pragma once

#include <sys/types.h>

#include <string>
#include <vector>

namespace sharpey::test {

// SHARPEY_BINARY_DIR "/app/batch/sharpey-batch".
std::string batch_binary();
// SHARPEY_SOURCE_DIR "/samples/<name>".
std::string sample_path(const std::string& name);

struct ProcessResult {
  int exit_code = -1;  // -1 when ended by a signal
  int signal = 0;      // the signal that ended it, 0 if it exited
  std::string out, err;
};

// A child process whose stdout and stderr go to files.
class ChildProcess {
 public:
  // `environment`: extra "NAME=value" entries added to this process's environment.
  ChildProcess(const std::string& program, const std::vector<std::string>& args,
               const std::vector<std::string>& environment = {});
  ~ChildProcess();  // kills (SIGKILL) and reaps the child if still running
  ChildProcess(const ChildProcess&) = delete;
  ChildProcess& operator=(const ChildProcess&) = delete;

  pid_t pid() const { return pid_; }
  void send(int signal);
  // Waits for the end (at most timeout_s, then SIGKILL) and returns the result.
  ProcessResult wait(double timeout_s = 900);
  // Polls the child's stderr until it contains `text` or the child ends; true if found.
  bool wait_for_stderr(const std::string& text, double timeout_s);
  std::string stderr_so_far() const;

 private:
  pid_t pid_ = -1;
  bool reaped_ = false;
  int status_ = 0;  // waitpid status once reaped
  std::string out_path_, err_path_;
};

// A small invented incisor case on the coarse mesh: "healthy" and, when n_scenarios is 2, "3 mm
// loss".
std::string coarse_case_json(int n_scenarios);

// Runs sharpey-batch with `args` and waits for it.
ProcessResult run_batch(const std::vector<std::string>& args, double timeout_s = 900);

// A fresh empty folder under the system temporary folder, removed by the destructor.
class TempFolder {
 public:
  explicit TempFolder(const std::string& tag);
  ~TempFolder();
  TempFolder(const TempFolder&) = delete;
  TempFolder& operator=(const TempFolder&) = delete;
  const std::string& path() const { return path_; }
  std::string operator/(const std::string& name) const { return path_ + "/" + name; }

 private:
  std::string path_;
};

std::string read_file(const std::string& path);
void write_file(const std::string& path, const std::string& content);
// Names of the entries of `folder` (no "." or ".."), sorted; empty if it does not exist.
std::vector<std::string> list_folder(const std::string& folder);
bool exists(const std::string& path);

}  // namespace sharpey::test
