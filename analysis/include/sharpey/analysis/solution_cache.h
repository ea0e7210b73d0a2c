// Solved scenarios kept on disk, so a case solved once opens again without meshing or solving.
//
// A solved scenario (ScenarioSolution) is saved as its mesh and model geometry, its six unit load
// cases (displacements and PDL fields) and the solver's statistics; everything else (centres of
// resistance, node sets, samplers) is derived again when it is read, as after a solve, so the
// results are the same bit for bit. The file format is the library's own (little-endian binary):
//
//   "SHARPEY-SOLVED\r\n" (16 bytes)  magic
//   u32 format version (kSolutionFileVersion), u32 0x01020304 (byte-order check)
//   u64 key length, key text          solution_cache_key(): what determined the solution
//   u64 payload length, payload       geometry, mesh, solver statistics, unit load basis
//   u64 checksum                      of every byte before it (64-bit word hash)
//
// No Qt and no printing: the app chooses the folder (a per-user cache folder), the library keeps
// the entries. Safe against corruption (a damaged, truncated or foreign entry is a miss, removed,
// and the scenario is solved again) and against several programs using one folder at once (each
// entry is written to a temporary file of a name unique to the process and call, then renamed
// over its final name, so a reader sees a whole entry or none; a program killed while writing
// leaves only a temporary file, which lookups never read and clean-up removes after a day).
#pragma once

#include <cstdint>
#include <memory>
#include <string>
#include <string_view>

#include "sharpey/analysis/study.h"

namespace sharpey::analysis {

// Version of the file layout below; a file of another version is a miss.
constexpr std::uint32_t kSolutionFileVersion = 1;
// Revision of the numerics that produce a solution (mesher, elements, solver, recovery). Part of
// every key: raise it with any change that alters a solved scenario, so older entries stop
// matching (the program version is part of the key as well).
constexpr int kSolutionNumericsRevision = 2;  // 2: graded standard preset (issue 18)

// What determines scenario `scenario_index` of `spec` once solved, as text (exact: numbers in
// hexadecimal floating point): the program version and numerics revision, the tooth, ligament,
// bone, bracket and mesh-sizing parameters, that scenario's bone loss, the four materials and the
// root-map grid. Not the load, the thresholds, the label or the scenario's name, which a solution
// does not depend on. Throws InputError for an index out of range.
std::string solution_cache_key(const CaseSpec& spec, int scenario_index,
                               const ScenarioOptions& options = {});

// The saved form of `solution` (the format above) under `key` (solution_cache_key() of the case
// and scenario it was solved for).
std::string write_solution(const ScenarioSolution& solution, const std::string& key);

// Reads back a solution saved by write_solution for scenario `scenario_index` of `spec`. Throws
// Error saying what is wrong when `bytes` is not a whole entry of this format and version, its
// checksum does not match, it was saved under another key than solution_cache_key(spec,
// scenario_index, options), or its content is inconsistent. Never solves anything.
std::unique_ptr<ScenarioSolution> read_solution(std::string_view bytes, const CaseSpec& spec,
                                                int scenario_index,
                                                const ScenarioOptions& options = {});

// SolutionCache::load's reason when there is no entry (a plain miss, not a damaged entry).
inline constexpr char kSolutionNotSaved[] = "not saved yet";

// A folder of saved solutions, bounded in size: after each store, the entries used longest ago
// (file modification time, renewed by every hit) are removed until the total is within
// max_bytes. Entries are named by a hash of their key (16 hex digits, ".solved"); the key inside
// is compared on every read. Every operation on the folder is best effort and never throws for
// a file-system problem: the cache is only a shortcut, the scenario can always be solved.
// Several objects and programs may use one folder at once.
class SolutionCache {
 public:
  // `folder` is created when needed. max_bytes: the bound on the entries' total size.
  SolutionCache(std::string folder, std::uint64_t max_bytes);

  const std::string& folder() const { return folder_; }
  std::uint64_t max_bytes() const { return max_bytes_; }

  // The saved solution of scenario `scenario_index` of `spec`, or null when there is none or it
  // cannot be used (then `why`, when given, says why in a sentence; a damaged entry is removed).
  std::unique_ptr<ScenarioSolution> load(const CaseSpec& spec, int scenario_index,
                                         std::string* why = nullptr,
                                         const ScenarioOptions& options = {}) const;
  // Saves `solution`, solved for scenario `scenario_index` of `spec`, then trims the folder to
  // max_bytes. False (and `why`) when it could not be written.
  bool store(const CaseSpec& spec, int scenario_index, const ScenarioSolution& solution,
             std::string* why = nullptr, const ScenarioOptions& options = {}) const;
  // The same with the entry already written (write_solution(solution, key)), e.g. on another
  // thread while the solution itself is in use.
  bool store_entry(const std::string& key, const std::string& bytes,
                   std::string* why = nullptr) const;
  // Removes the entries used longest ago until the total is within max_bytes, and temporary
  // files older than a day (left by a program killed while writing).
  void trim() const;
  // The file an entry with this key has (whether or not it exists).
  std::string entry_path(const std::string& key) const;
  // The entries' total size in bytes and their number.
  std::uint64_t total_bytes() const;
  int entry_count() const;

 private:
  std::string folder_;
  std::uint64_t max_bytes_;
};

}  // namespace sharpey::analysis
