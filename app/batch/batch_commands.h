// The sub-commands of sharpey-batch. Each throws the library's typed errors (mapped to exit
// codes in main.cpp) and writes its output folder through analysis::StagedFolder.
#pragma once

#include <cstddef>
#include <string>
#include <vector>

#include "mpi_world.h"

namespace sharpey::batch {

struct CommonOptions {
  std::string case_path;
  std::string out_dir;
  std::string mesh_preset;  // empty: the case file's preset
  bool quiet = false;
  bool band = false;  // run: compute the allowance band even when the case does not ask for it
};

// Meshes and solves every scenario; writes results.json, summary.csv, summary.txt, case.json,
// allowance.csv and per scenario <stem>_model.vtu, <stem>_pdl.vtu, <stem>_root_map.csv. The nominal
// force allowances are always reported; the variability band when the case's allowance.band is
// true or options.band is set (checked before any solve).
void run_command(const CommonOptions& options);

struct SweepOptions {
  std::vector<std::string> vary;  // "KEY=V1,V2,..." options
  std::string design_path;        // study design file (JSON), or empty
  int threads = 1;                // threads per model solve (see solver_threads.h)
};

// The most combinations one sweep takes. Every combination is read and checked as a case before
// anything is solved, and rank 0 keeps every row in memory; 20000 combinations of a few
// scenarios are a few seconds of checks and tens of MB of rows.
constexpr size_t kMaxSweepCombinations = 20000;

// Full factorial over the --vary options and the study design; writes sweep.csv (one row per
// combination and scenario) and sweep_case.json (the base case). Distributed over the ranks of
// `world`: each solves a share of the models, rank 0 checkpoints every model's rows in the output
// folder (a rerun of the same sweep resumes from them) and writes the files, the same bytes for
// any number of ranks. On ranks other than 0 it returns without writing anything.
void sweep_command(const CommonOptions& options, const SweepOptions& sweep, MpiWorld& world);

// Meshes every scenario; writes <stem>_mesh.vtu, <stem>_boundary.vtu and mesh_statistics.json.
void mesh_command(const CommonOptions& options);

// Multi-rooted tooth case (docs/molars.md): the thin-layer estimate of every scenario; writes
// multi_root_results.json, multi_root_summary.txt and <n>_root_map.csv. No mesh, no solve.
void molar_command(const CommonOptions& options);

}  // namespace sharpey::batch
