// Where the app keeps solved bone levels (analysis::SolutionCache) and how much room they get.
// QtCore only.
#pragma once

#include <QString>
#include <cstdint>
#include <memory>

#include "sharpey/analysis/solution_cache.h"

namespace sharpey::app {

// Default bound on the saved solutions, MB: about a dozen four-level cases on the standard mesh.
constexpr std::uint64_t kDefaultSolutionCacheMb = 1024;

// The folder: SHARPEY_CACHE_DIR when set (tests, or another disk), else "solutions" in the
// per-user cache folder (QStandardPaths::CacheLocation, which follows XDG_CACHE_HOME).
QString solution_cache_folder();
// The bound in bytes: SHARPEY_CACHE_MAX_MB when set to a whole number, else
// kDefaultSolutionCacheMb.
std::uint64_t solution_cache_max_bytes();
// The cache the app uses: `folder` (empty: solution_cache_folder()) bounded by
// solution_cache_max_bytes(); null when SHARPEY_CACHE_MAX_MB is 0 (cache switched off).
std::shared_ptr<const analysis::SolutionCache> make_solution_cache(const QString& folder = {});

}  // namespace sharpey::app
