// Atomic file writing: temporary file in the destination folder, flushed to disk, then renamed
// over the destination (rename is atomic within one file system on POSIX).
#include "sharpey/analysis/write_file_atomic.h"

#include <fcntl.h>
#include <unistd.h>

#include <atomic>
#include <cerrno>
#include <cstring>
#include <filesystem>
#include <string>

namespace sharpey::analysis {

namespace {

std::string system_reason(int error) { return std::strerror(error); }

[[noreturn]] void fail(const std::string& path, const std::string& step, int error) {
  throw OutputError("cannot write \"" + path + "\" (" + step + ": " + system_reason(error) +
                    "); check that the folder exists, is writable and the disk is not full");
}

// Gives up after a failed `step`: keeps its errno, closes `fd` when it is still open (>= 0),
// removes the temporary file and throws. `step` is a plain C string so that nothing runs between
// the failed call and reading errno.
[[noreturn]] void abandon(const std::string& path, const std::string& temp, int fd,
                          const char* step) {
  const int error = errno;
  if (fd >= 0) ::close(fd);
  ::unlink(temp.c_str());
  fail(path, step, error);
}

}  // namespace

void write_file_atomic(const std::string& path, const std::string& content) {
  static std::atomic<unsigned> counter{0};
  const std::filesystem::path target(path);
  // Hidden temporary name in the same folder, unique per process and call.
  const std::string temp =
      (target.parent_path() / ("." + target.filename().string() + ".tmp-" +
                               std::to_string(::getpid()) + "-" + std::to_string(counter++)))
          .string();
  const int fd = ::open(temp.c_str(), O_WRONLY | O_CREAT | O_TRUNC | O_CLOEXEC, 0644);
  if (fd < 0) fail(path, "creating a temporary file", errno);
  const char* data = content.data();
  size_t left = content.size();
  while (left > 0) {
    const ssize_t n = ::write(fd, data, left);
    if (n < 0) {
      if (errno == EINTR) continue;
      abandon(path, temp, fd, "writing");
    }
    data += n;
    left -= static_cast<size_t>(n);
  }
  if (::fsync(fd) != 0) abandon(path, temp, fd, "flushing to disk");
  if (::close(fd) != 0) abandon(path, temp, -1, "closing");
  if (::rename(temp.c_str(), path.c_str()) != 0)
    abandon(path, temp, -1, "renaming the temporary file");
}

}  // namespace sharpey::analysis
