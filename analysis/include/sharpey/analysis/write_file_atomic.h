// Atomic file writing, for the case files and saved solutions this library writes and for the
// report files of the output library (sharpey/output/report_output.h).
#pragma once

#include <string>

#include "sharpey/error.h"

namespace sharpey::analysis {

// Writes `content` to `path` through a temporary file in the same folder and a rename, so `path`
// is either absent, its old content or the complete new content, even if the process is killed.
// Throws OutputError naming the path and the system's reason.
void write_file_atomic(const std::string& path, const std::string& content);

}  // namespace sharpey::analysis
