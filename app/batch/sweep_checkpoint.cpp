#include "sweep_checkpoint.h"

#include <cstdint>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "sharpey/output/report_output.h"

namespace sharpey::batch {

namespace fs = std::filesystem;

namespace {

constexpr const char* kPrefix = "sweep_checkpoint_";

std::uint64_t fnv1a(std::uint64_t hash, const std::string& text) {
  for (unsigned char c : text) {
    hash ^= c;
    hash *= 1099511628211ull;
  }
  // A separator that no text holds, so ("ab", "c") and ("a", "bc") differ.
  hash ^= 0xffu;
  return hash * 1099511628211ull;
}

}  // namespace

SweepCheckpoint::SweepCheckpoint(std::string folder, std::string fingerprint, int n_models)
    : folder_(std::move(folder)), fingerprint_(std::move(fingerprint)), n_models_(n_models) {}

void SweepCheckpoint::remove_stale_temporaries(const std::string& folder) {
  std::error_code ec;
  const std::string hidden = std::string(".") + kPrefix;
  for (fs::directory_iterator it(folder, ec), end; !ec && it != end; it.increment(ec)) {
    const std::string name = it->path().filename().string();
    if (name.rfind(hidden, 0) == 0 && name.find(".csv.tmp-") != std::string::npos) {
      std::error_code ignored;
      fs::remove(it->path(), ignored);
    }
  }
}

std::string SweepCheckpoint::file_name(int model) const {
  char index[16];
  std::snprintf(index, sizeof index, "%06d", model + 1);
  return kPrefix + fingerprint_ + "_model" + index + ".csv";
}

std::string SweepCheckpoint::header(int model) const {
  return "# sharpey-batch sweep checkpoint: sweep " + fingerprint_ + ", model " +
         std::to_string(model + 1) + " of " + std::to_string(n_models_) + "\n";
}

std::map<int, std::string> SweepCheckpoint::load() const {
  std::map<int, std::string> saved;
  for (int m = 0; m < n_models_; ++m) {
    const fs::path path = fs::path(folder_) / file_name(m);
    std::error_code ec;
    if (!fs::is_regular_file(path, ec)) continue;
    std::ifstream in(path, std::ios::binary);
    std::ostringstream text;
    text << in.rdbuf();
    const std::string content = text.str();
    const std::string expected = header(m);
    // Written atomically, so a file is whole; the header still guards against a file of another
    // sweep given the same name by hand.
    if (!in.bad() && content.compare(0, expected.size(), expected) == 0 &&
        content.size() > expected.size() && content.back() == '\n')
      saved[m] = content.substr(expected.size());
  }
  return saved;
}

void SweepCheckpoint::save(int model, const std::string& rows) const {
  analysis::write_file_atomic((fs::path(folder_) / file_name(model)).string(),
                              header(model) + rows);
}

std::string sweep_fingerprint(const std::vector<std::string>& keys,
                              const std::vector<std::vector<std::string>>& values,
                              const std::vector<std::string>& case_json) {
  std::uint64_t hash = 14695981039346656037ull;
  for (const std::string& k : keys) hash = fnv1a(hash, k);
  for (size_t c = 0; c < values.size(); ++c) {
    for (const std::string& v : values[c]) hash = fnv1a(hash, v);
    hash = fnv1a(hash, case_json[c]);
  }
  char text[17];
  std::snprintf(text, sizeof text, "%016llx", static_cast<unsigned long long>(hash));
  return text;
}

}  // namespace sharpey::batch
